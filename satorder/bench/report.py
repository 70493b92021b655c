"""What a benchmark's rows say: a summary per back end, disagreements, unverified answers,
verdicts that contradict a manifest, and the cactus and scaling plots.
"""

from __future__ import annotations

import os
import statistics
import tempfile

from satorder.bench.rows import FAILED, SOLVED, UNSOLVED
from satorder.errors import InputError


# --------------------------------------------------------------------------- results
def summarize(rows: list[dict]) -> dict[str, dict]:
    """Per back end: runs, solved, timeouts (incl. ``unknown`` at the limit), failed (error or
    crash), skipped, median seconds over solved runs, total seconds over all runs (timeouts
    count the full limit)."""
    out: dict[str, dict] = {}
    for row in rows:
        s = out.setdefault(row["backend"], {"runs": 0, "solved": 0, "timeouts": 0, "failed": 0,
                                            "skipped": 0, "_times": [], "total_seconds": 0.0})
        s["runs"] += 1
        st = row.get("status")
        secs = row.get("seconds") or 0.0
        if st in SOLVED:
            s["solved"] += 1
            s["_times"].append(secs)
        elif st in UNSOLVED:
            s["timeouts"] += 1
        elif st in FAILED:
            s["failed"] += 1
        elif st == "skipped":
            s["skipped"] += 1
        if st != "skipped":
            s["total_seconds"] += secs
    for s in out.values():
        times = s.pop("_times")
        s["median_seconds"] = statistics.median(times) if times else None
        s["total_seconds"] = round(s["total_seconds"], 6)
    return out


def find_problems(rows: list[dict]) -> list[str]:
    """Disagreements that must not pass quietly: back ends with different verdicts or optimal
    costs on one instance, verdicts or costs against the manifest, and failed checks."""
    msgs: list[str] = []
    by_instance: dict[str, list[dict]] = {}
    for row in rows:
        by_instance.setdefault(row["instance"], []).append(row)
    for inst, group in by_instance.items():
        solved = [r for r in group if r.get("status") in SOLVED]
        verdicts = {r["status"] for r in solved}
        if len(verdicts) > 1:
            said = ", ".join(f"{r['backend']} says {r['status']}" for r in solved)
            msgs.append(f"{inst}: back ends disagree: {said}")
        for r in solved:
            exp = r.get("expected_status")
            if exp and r["status"] != exp:
                msgs.append(f"{inst}: {r['backend']} says {r['status']}, the manifest expects "
                            f"{exp}")
            if r.get("check_error"):
                msgs.append(f"{inst}: {r['backend']}'s answer failed its check: "
                            f"{r['check_error']}")
        optimal = [r for r in solved if r.get("optimal") and r.get("cost") is not None]
        costs = {r["cost"] for r in optimal}
        if len(costs) > 1:
            said = ", ".join(f"{r['backend']} {r['cost']}" for r in optimal)
            msgs.append(f"{inst}: back ends disagree on the optimal cost: {said}")
        for r in optimal:
            if r.get("expected_cost") is not None and r["cost"] != r["expected_cost"]:
                msgs.append(f"{inst}: {r['backend']} finds optimal cost {r['cost']}, the "
                            f"manifest expects {r['expected_cost']}")
            if r.get("cost_at_most") is not None and r["cost"] > r["cost_at_most"]:
                msgs.append(f"{inst}: {r['backend']} finds optimal cost {r['cost']}, but the "
                            f"generating order costs only {r['cost_at_most']}")
    return msgs


def find_unverified(rows: list[dict]) -> list[str]:
    """Verdicts that came without a certificate to check (e.g. a core search cut short by the
    time limit): not wrong, but not trusted either."""
    return [f"{r['instance']}: {r['backend']} says {r['status']} without a certificate"
            for r in rows if r.get("status") in SOLVED and not r.get("verified")
            and not r.get("check_error")]


def cactus_series(rows: list[dict]) -> dict[str, list[float]]:
    """Per back end, the sorted times of its solved runs (the cactus plot: the k-th point is
    the time within which k instances were solved)."""
    series: dict[str, list[float]] = {}
    for row in rows:
        series.setdefault(row["backend"], [])
        if row.get("status") in SOLVED and row.get("seconds") is not None:
            series[row["backend"]].append(row["seconds"])
    return {b: sorted(t) for b, t in series.items()}


def plot(rows: list[dict], path: str) -> None:
    """Cactus plot (instances solved vs time) and scaling plot (time vs comparable pairs,
    log-log), one line or marker set per back end, as one PNG written atomically."""
    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt

    fig, (ax1, ax2) = plt.subplots(1, 2, figsize=(11, 4.5))
    floor = 1e-4
    for backend, times in sorted(cactus_series(rows).items()):
        ax1.step(range(1, len(times) + 1), [max(t, floor) for t in times], where="post",
                 marker="o", markersize=3, label=f"{backend} ({len(times)})")
        pts = sorted((r["comparable_pairs"], max(r["seconds"], floor)) for r in rows
                     if r["backend"] == backend and r.get("status") in SOLVED
                     and r.get("comparable_pairs"))
        if pts:
            ax2.plot([p for p, _ in pts], [t for _, t in pts], marker="o", linestyle="",
                     markersize=4, label=backend)
    ax1.set(xlabel="instances solved", ylabel="time (s)", yscale="log",
            title="cactus: solved within time")
    ax2.set(xlabel="comparable pairs", ylabel="time (s)", xscale="log", yscale="log",
            title="scaling: time against pairs")
    for ax in (ax1, ax2):
        ax.grid(True, which="both", alpha=0.3)
        if ax.get_legend_handles_labels()[0]:
            ax.legend(fontsize=8)
    fig.tight_layout()
    folder = os.path.dirname(os.path.abspath(path))
    if not os.path.isdir(folder):
        raise InputError(f"{path}: folder {folder} does not exist; create it first")
    fd, tmp = tempfile.mkstemp(prefix=".satorder-", suffix=".png", dir=folder)
    os.close(fd)
    try:
        fig.savefig(tmp, format="png", dpi=110)
        os.replace(tmp, path)
    except BaseException:
        if os.path.exists(tmp):
            os.unlink(tmp)
        raise
    finally:
        plt.close(fig)
