"""``satorder bench DIR... --backend NAME ... --out FILE.jsonl``: run suites on back ends.

One JSON row per (instance, back end), appended as each run ends; rerun the same command to
finish an interrupted run (rows already in the file are skipped).  Back-end names, the plot's
optional dependency and every output path are checked before the first run.  Ctrl-C prints the
summary of the runs that finished (exit status 130).  Exit status 1 when a run ended in
``error`` or ``crash``, back ends disagree, an answer fails its check or a verdict contradicts a
suite's manifest.
"""

from __future__ import annotations

import importlib.util
import os

import satorder.bench as bench
from satorder.cli import options
from satorder.cli.common import (
    UsageError,
    check_output_path,
    check_report_path,
    command_line,
    err,
    out,
    print_json,
    write_report,
)


def add_parser(sub):
    p = sub.add_parser("bench", description=__doc__)
    p.add_argument("dirs", nargs="+", metavar="DIR",
                   help="suite folders (with manifest.json) or problem files")
    p.add_argument("--backend", nargs="+", action="extend", metavar="NAME",
                   help="forcing, a python-sat solver (cadical195, glucose4, minisat22, ...) or "
                        "module:function; repeatable (default: forcing)")
    options.add_time_limit(p, default=60.0, extra="per run: its worker is killed then "
                           "(status timeout)")
    options.add_hidden_alias(p, "--timeout", dest="time_limit", type=options.positive_seconds)
    p.add_argument("--jobs", type=int, default=1, metavar="N",
                   help="runs at the same time (default 1: timings undisturbed)")
    options.add_out(p, "the rows, one JSON line per run appended as it ends; an existing file "
                    "is resumed", metavar="FILE.jsonl", required=True)
    options.add_json(p, "the summary per back end and the problems found, instead of the table")
    p.add_argument("--plot", metavar="FILE.png",
                   help="cactus plot and scaling plot of every row of this benchmark "
                        "(needs matplotlib: pip install 'satorder[draw]')")
    p.add_argument("--cluster", metavar="ADDRESS",
                   help="send the runs to a Dask distributed scheduler (e.g. tcp://host:8786)")
    options.add_report(p)
    return p


def _check_plot(path: str) -> None:
    """``--plot`` needs matplotlib (the ``draw`` extra): say so before anything runs."""
    if not path.lower().endswith(".png"):
        raise UsageError(f"{path}: --plot writes PNG; give a file name ending in .png")
    if importlib.util.find_spec("matplotlib") is None:
        raise UsageError("--plot needs matplotlib, which is not installed; install the draw "
                         "extra (pip install 'satorder[draw]') or use --report FILE.html, "
                         "whose plots need nothing more")


def run(args) -> int:
    if args.jobs < 1:
        raise UsageError(f"--jobs must be at least 1, got {args.jobs}")
    backends = list(dict.fromkeys(args.backend or ["forcing"]))
    for b in backends:
        bench.check_backend(b)
    if args.plot:
        _check_plot(args.plot)
    instances = bench.discover(args.dirs)
    check_output_path(args.out, *[path for _, path, _ in instances])
    if args.plot:
        check_output_path(args.plot, *[path for _, path, _ in instances])
    check_report_path(args.report, *[path for _, path, _ in instances])
    old = bench.read_rows(args.out)
    todo = bench.plan(instances, backends, ((r["instance"], r["backend"]) for r in old))
    wanted = {(key, b) for key, _, _ in instances for b in backends}
    rows = [r for r in old if (r["instance"], r["backend"]) in wanted]
    if rows:
        err.print(f"{args.out}: {len(rows)} runs already done, {len(todo)} to go", markup=False)
    writer = bench.RowWriter(args.out)
    try:
        _run_all(args, todo, rows, writer)
    except KeyboardInterrupt:
        err.print(f"satorder: interrupted; {len(rows)} complete rows in {args.out} — rerun the "
                  "same command to finish; the summary of the finished runs follows",
                  markup=False)
        _report(args, rows, backends, interrupted=True)
        return 130
    finally:
        writer.close()
    return _report(args, rows, backends)


def _run_all(args, todo, rows, writer) -> None:
    if not todo:
        return
    from rich.progress import (
        BarColumn,
        MofNCompleteColumn,
        Progress,
        TextColumn,
        TimeElapsedColumn,
    )

    columns = (TextColumn("{task.description}"), BarColumn(), MofNCompleteColumn(),
               TimeElapsedColumn(), TextColumn("{task.fields[last]}", style="dim"))
    with Progress(*columns, console=err.real, transient=False) as bar:
        where = f"on {args.cluster}" if args.cluster else f"{args.jobs} at a time"
        task = bar.add_task(f"bench ({where})", total=len(todo), last="")

        def on_row(row):
            writer.write(row)
            rows.append(row)
            bar.update(task, advance=1, last=f"{os.path.basename(row['instance'])} "
                       f"{row['backend']} {row['status']}")

        if args.cluster:
            bench.run_cluster(todo, args.time_limit, args.cluster, on_row)
        else:
            bench.run_local(todo, args.time_limit, args.jobs, on_row)


def _fmt(x) -> str:
    return "—" if x is None else f"{x:.3f}"


def _report(args, rows, backends, interrupted: bool = False) -> int:
    """Print the summary of ``rows`` (and write the plot and report); the exit status."""
    summary = bench.summarize(rows)
    failed = [r for r in rows if r.get("status") in bench.FAILED]
    unverified = bench.find_unverified(rows)
    problems = bench.find_problems(rows)
    if args.json:
        print_json({"runs": len(rows), "complete": not interrupted,
                    "summary": {b: summary[b] for b in backends if b in summary},
                    "failed": [{k: r.get(k) for k in ("instance", "backend", "status", "error")}
                               for r in failed],
                    "unverified": unverified, "problems": problems})
    else:
        _print_table(args, summary, backends)
    for r in failed[:10]:
        err.print(f"{r['instance']} {r['backend']}: {r['status']}: {r.get('error', '')}",
                  markup=False)
    if len(failed) > 10:
        err.print(f"... and {len(failed) - 10} more failed runs (see {args.out})", markup=False)
    if args.plot and rows and not interrupted:
        bench.plot(rows, args.plot)
        err.print(f"plots written to {args.plot}", markup=False)
    for msg in unverified[:10]:
        err.print(f"unverified: {msg}", markup=False, style="yellow")
    if args.report and not interrupted:
        from satorder.render.report_pages import bench_report

        write_report(args.report, bench_report(
            rows, backends, summary, bench.cactus_series(rows), problems, unverified,
            args.time_limit, args.dirs, command_line(args)))
    if problems:
        from rich.panel import Panel

        body = "\n".join(problems[:40])
        if len(problems) > 40:
            body += f"\n... and {len(problems) - 40} more"
        err.print(Panel(body, title=f"{len(problems)} DISAGREEMENTS / FAILED CHECKS",
                        border_style="bold red"))
    if failed:
        err.print(f"{len(failed)} runs ended in error or crash (exit status 1)", markup=False)
    return 1 if problems or failed else 0


def _print_table(args, summary, backends) -> None:
    from rich.table import Table

    runs = sum(s["runs"] for s in summary.values())
    table = Table(title=f"{runs} runs, time limit {args.time_limit:g} s per run")
    for col in ("back end", "runs", "solved", "timeouts", "failed", "skipped",
                "median s", "total s"):
        table.add_column(col, justify="left" if col == "back end" else "right",
                         no_wrap=col == "back end")
    for b in backends:
        s = summary.get(b)
        if s is None:
            continue
        table.add_row(b, str(s["runs"]), str(s["solved"]), str(s["timeouts"]),
                      str(s["failed"]), str(s["skipped"]), _fmt(s["median_seconds"]),
                      _fmt(s["total_seconds"]))
    out.print(table)
    out.print("median over solved runs; total over all runs, a timeout counting its full limit",
              style="dim")
