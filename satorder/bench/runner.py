"""Benchmark runner: every (instance, back end) pair in a worker process of its own.

* Each run happens in a fresh process that is killed at the timeout (status ``timeout``); a
  back end that raises gives status ``error`` and one that dies (signal, abort, out of memory)
  gives ``crash`` — a row either way, never a dead runner.  Local runs fork from a preloaded
  server process (multiprocessing ``forkserver``), so starting one costs milliseconds; inside a
  daemonic process (a Dask worker) a fresh interpreter is started instead.
* Rows go to a JSON Lines file, one ``os.write`` of one complete line per row, flushed to disk
  as it is written.  An interrupted run therefore leaves only complete rows (a torn last line
  from a hard kill is cut off on the next start), and rerunning with the same ``--out`` skips
  every (instance, back end) already there.
* Every answer is checked by :func:`satorder.solve.verify` (the independent checks in
  :mod:`satorder.certify`) in the worker, timed apart from the solve.
* At the end: a summary per back end, and loud flags for disagreements between back ends, with
  a suite's ``manifest.json``, or with an answer's certificate check.

Back ends: ``forcing`` (plain problems only; others get status ``skipped``), the name of any
python-sat solver (``cadical195``, ``glucose4``, ``minisat22`` …) for the SAT engine, or
``module:function`` naming a Python function ``f(problem, time_limit) -> Answer``, so that a
new solver can be compared without touching this module.

>>> from satorder.bench import summarize
>>> rows = [{"instance": "a", "backend": "forcing", "status": "feasible", "seconds": 0.5},
...         {"instance": "b", "backend": "forcing", "status": "timeout", "seconds": 10.0}]
>>> s = summarize(rows)["forcing"]
>>> s["solved"], s["timeouts"], s["median_seconds"], s["total_seconds"]
(1, 1, 0.5, 10.5)
"""

from __future__ import annotations

import importlib
import json
import math
import multiprocessing as mp
import os
import resource
import signal
import socket
import statistics
import subprocess
import sys
import tempfile
import threading
import time
import traceback
from collections.abc import Callable, Iterable
from concurrent.futures import ThreadPoolExecutor, as_completed
from dataclasses import dataclass

from satorder.errors import CertificateError, InputError

SOLVED = ("feasible", "infeasible")
UNSOLVED = ("timeout", "unknown")
FAILED = ("error", "crash")
PROBLEM_EXTENSIONS = (".json", ".txt", ".edges", ".g6", ".graph6")
EXPECTED_KEYS = ("family", "expected_status", "expected_count", "expected_cost", "cost_at_most")


# --------------------------------------------------------------------------- instances
@dataclass
class Run:
    """One (instance, back end) to run; ``instance`` is the key written in rows."""

    instance: str
    path: str
    backend: str
    expected: dict

    @property
    def key(self) -> tuple[str, str]:
        return (self.instance, self.backend)


def discover(args: Iterable[str]) -> list[tuple[str, str, dict]]:
    """Problems named by folders and files: ``(instance key, absolute path, manifest entry)``.

    A folder with a ``manifest.json`` contributes the files its manifest lists, with their
    expectations; any other folder contributes its problem files (by extension), sorted.
    The key is the path as given, normalised.
    """
    found: list[tuple[str, str, dict]] = []
    seen: set[str] = set()
    for arg in args:
        if os.path.isdir(arg):
            manifest = _read_manifest(arg)
            if manifest is not None:
                pairs = []
                for k, entry in enumerate(manifest):
                    if not isinstance(entry, dict) or not isinstance(entry.get("file"), str):
                        raise InputError(f"{arg}/manifest.json: instances[{k}]: needs a \"file\"")
                    pairs.append((entry["file"], entry))
            else:
                pairs = [(f, {}) for f in sorted(os.listdir(arg))
                         if f.lower().endswith(PROBLEM_EXTENSIONS) and f != "manifest.json"
                         and os.path.isfile(os.path.join(arg, f))]
            for f, entry in pairs:
                path = os.path.join(arg, f)
                if not os.path.isfile(path):
                    raise InputError(f"{path}: listed in {arg}/manifest.json but missing; "
                                     "regenerate the suite")
                _add(found, seen, path, entry)
        elif os.path.isfile(arg):
            folder, name = os.path.split(arg)
            manifest = _read_manifest(folder or ".") or []
            entry = next((e for e in manifest if isinstance(e, dict) and e.get("file") == name),
                         {})
            _add(found, seen, arg, entry)
        else:
            raise InputError(f"{arg}: no such file or folder; give suite folders or problem files")
    if not found:
        raise InputError("no problems found in " + ", ".join(args) +
                         f"; a folder needs a manifest.json or files ending in "
                         f"{', '.join(PROBLEM_EXTENSIONS)}")
    return found


def _add(found, seen, path, entry) -> None:
    key = os.path.normpath(path)
    if key not in seen:
        seen.add(key)
        found.append((key, os.path.abspath(path),
                      {k: entry[k] for k in EXPECTED_KEYS if entry.get(k) is not None}))


def _read_manifest(folder: str) -> list | None:
    path = os.path.join(folder, "manifest.json")
    if not os.path.isfile(path):
        return None
    try:
        with open(path, encoding="utf-8") as f:
            doc = json.load(f)
    except (OSError, ValueError) as exc:
        raise InputError(f"{path}: not a readable JSON manifest ({exc}); fix or remove it"
                         ) from None
    if not isinstance(doc, dict) or not isinstance(doc.get("instances"), list):
        raise InputError(f'{path}: a manifest needs an "instances" list')
    return doc["instances"]


# --------------------------------------------------------------------------- back ends
def sat_solver_names() -> dict[str, str]:
    """Every python-sat solver name and alias, mapped to its canonical name."""
    from pysat.solvers import SolverNames

    names = {}
    for canon, aliases in vars(SolverNames).items():
        if not canon.startswith("_") and isinstance(aliases, tuple):
            names[canon] = canon
            for a in aliases:
                names[a] = canon
    return names


def check_backend(name: str) -> str:
    """Validate a back end name; raise :class:`InputError` naming the choices."""
    if name == "forcing":
        return name
    if ":" in name:
        module, _, func = name.partition(":")
        try:
            fn = getattr(importlib.import_module(module), func)
        except (ImportError, AttributeError) as exc:
            raise InputError(f"back end {name!r}: cannot import ({exc}); give module:function "
                             "importable on the Python path") from None
        if not callable(fn):
            raise InputError(f"back end {name!r} is not a function")
        return name
    names = sat_solver_names()
    if name not in names:
        raise InputError(f"unknown back end {name!r}; choose forcing, a python-sat solver "
                         f"({', '.join(sorted(set(names.values())))}) or module:function")
    return name


def _call_backend(backend: str, problem, time_limit: float):
    from satorder.pipeline.solve import solve

    if backend == "forcing":
        return solve(problem, engine="forcing", verify_answer=False)
    if ":" in backend:
        module, _, func = backend.partition(":")
        return getattr(importlib.import_module(module), func)(problem, time_limit)
    return solve(problem, engine="sat", solver=backend, time_limit=time_limit,
                 verify_answer=False)


def _side_constraints(problem) -> str:
    kinds = []
    if problem.fixed:
        kinds.append(f"{len(problem.fixed)} fixed arcs")
    if problem.forbidden:
        kinds.append(f"{len(problem.forbidden)} forbidden arcs")
    if problem.prefer:
        kinds.append(f"{len(problem.prefer)} preferences")
    if problem.incomparable is not None:
        kinds.append("an explicit unordered list (open pairs)")
    return ", ".join(kinds)


def _find_stat(stats: dict, *keys):
    for k in keys:
        if isinstance(stats.get(k), int):
            return stats[k]
    for v in stats.values():
        if isinstance(v, dict):
            found = _find_stat(v, *keys)
            if found is not None:
                return found
    return None


# --------------------------------------------------------------------------- one run
def _base_row(task: dict) -> dict:
    row = {"instance": task["instance"], "backend": task["backend"], "status": None,
           "seconds": None, "peak_mb": None, "verified": False, "variables": None,
           "clauses": None}
    row.update(task.get("expected") or {})
    return row


def _peak_mb_self() -> float:
    kb = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss
    return round(kb / 1024.0, 1)  # Linux reports kilobytes


def _peak_mb_of(pid: int) -> float | None:
    """Peak resident memory of a live process (``VmHWM``), read before it is killed."""
    try:
        with open(f"/proc/{pid}/status", encoding="ascii") as f:
            for line in f:
                if line.startswith("VmHWM:"):
                    return round(int(line.split()[1]) / 1024.0, 1)
    except (OSError, ValueError, IndexError):
        pass
    return None


def execute(task: dict) -> dict:
    """Read, solve and check one problem in the current process; always returns a row."""
    from satorder.io.readers import read_problem
    from satorder.pipeline.solve import verify

    row = _base_row(task)
    t_start = time.perf_counter()
    try:
        problem = read_problem(task["path"])
    except InputError as exc:
        row.update(status="error", error=f"cannot read: {exc}", peak_mb=_peak_mb_self())
        return row
    row["items"] = problem.n
    row["comparable_pairs"] = problem.num_comparable
    row["read_seconds"] = round(time.perf_counter() - t_start, 6)
    backend = task["backend"]
    if backend == "forcing" and not problem.is_plain:
        row.update(status="skipped", reason="forcing answers plain problems only; this one has "
                   + _side_constraints(problem))
        return row
    remaining = max(0.01, task["timeout"] - (time.perf_counter() - t_start) - 0.05)
    t0 = time.perf_counter()
    try:
        ans = _call_backend(backend, problem, remaining)
    except MemoryError:
        row.update(status="error", error="out of memory", peak_mb=_peak_mb_self())
        return row
    except Exception as exc:  # a back end's failure is a row, not a dead runner
        row.update(status="error", error=_one_line(exc), peak_mb=_peak_mb_self(),
                   seconds=round(time.perf_counter() - t0, 6))
        return row
    row["seconds"] = round(time.perf_counter() - t0, 6)
    row["status"] = ans.status
    stats = ans.stats if isinstance(ans.stats, dict) else {}
    row["variables"] = _find_stat(stats, "variables", "vars", "num_vars")
    row["clauses"] = _find_stat(stats, "clauses", "num_clauses")
    if ans.cost is not None:
        row["cost"] = ans.cost
        row["optimal"] = ans.optimal
    t1 = time.perf_counter()
    try:
        verify(ans)
        # an infeasible verdict is trusted only with a certificate the checks could replay
        row["verified"] = bool(ans.verified) and (
            ans.status != "infeasible" or bool(ans.chain) or bool(ans.core))
        if ans.status == "infeasible" and not row["verified"]:
            row["note"] = "infeasible without a conflict chain or core to check"
    except CertificateError as exc:
        row["verified"] = False
        row["check_error"] = _one_line(exc)
    row["check_seconds"] = round(time.perf_counter() - t1, 6)
    row["peak_mb"] = _peak_mb_self()
    return row


def _one_line(exc: BaseException) -> str:
    text = f"{type(exc).__name__}: {exc}".strip().splitlines()
    return text[0][:300] if text else type(exc).__name__


def _finish_row(row: dict, task: dict, wall: float) -> dict:
    row["wall_seconds"] = round(wall, 6)
    row["timeout"] = task["timeout"]
    row["host"] = socket.gethostname()
    return row


def _failure_row(task: dict, status: str, wall: float, message: str,
                 peak: float | None = None) -> dict:
    row = _base_row(task)
    row.update(status=status, seconds=round(task["timeout"] if status == "timeout" else wall, 6),
               peak_mb=peak)
    if message:
        row["error"] = message
    return _finish_row(row, task, wall)


def _exit_message(code: int | None, log: str) -> str:
    if code is None:
        why = "worker vanished"
    elif code < 0:
        try:
            why = f"worker killed by {signal.Signals(-code).name}"
        except ValueError:
            why = f"worker killed by signal {-code}"
    else:
        why = f"worker exited with status {code} without an answer"
    tail = _log_tail(log)
    return f"{why}: {tail}" if tail else why


def _log_tail(path: str, limit: int = 300) -> str:
    try:
        with open(path, "rb") as f:
            f.seek(0, os.SEEK_END)
            size = f.tell()
            f.seek(max(0, size - 4096))
            lines = [ln for ln in f.read().decode("utf-8", "replace").splitlines() if ln.strip()]
    except OSError:
        return ""
    return lines[-1].strip()[:limit] if lines else ""


def _child(task: dict, conn, log: str) -> None:
    """Worker process body (forkserver child)."""
    signal.signal(signal.SIGINT, signal.SIG_IGN)  # the runner decides when workers stop
    fd = os.open(log, os.O_WRONLY | os.O_APPEND)
    os.dup2(fd, 1)
    os.dup2(fd, 2)
    os.close(fd)
    signal.alarm(int(math.ceil(task["timeout"])) + 5)  # backstop should the runner vanish
    try:
        row = execute(task)
    except BaseException as exc:  # noqa: BLE001 — reported as a row
        traceback.print_exc()
        row = _base_row(task)
        row.update(status="error", error=_one_line(exc))
    conn.send(row)
    conn.close()


_CONTEXT = None
_CONTEXT_LOCK = threading.Lock()


def _context():
    global _CONTEXT
    with _CONTEXT_LOCK:
        if _CONTEXT is None:
            if "forkserver" in mp.get_all_start_methods():
                ctx = mp.get_context("forkserver")
                # the engines, and what the CLI's main module imports (workers re-import it)
                ctx.set_forkserver_preload(["satorder.bench.preload"])
            else:
                ctx = mp.get_context("spawn")
            _CONTEXT = ctx
        return _CONTEXT


def _noop() -> None:
    pass


def start_workers() -> None:
    """Start the worker server now (imports and warm-up take seconds), so that this time is
    not charged to the first run's timeout."""
    if mp.current_process().daemon:
        return
    proc = _context().Process(target=_noop, daemon=True)
    proc.start()
    proc.join()


def _temp_log() -> str:
    fd, path = tempfile.mkstemp(prefix="satorder-bench-", suffix=".log")
    os.close(fd)
    return path


def _run_forked(task: dict, live: set | None = None, stop: threading.Event | None = None):
    ctx = _context()
    log = _temp_log()
    recv, send = ctx.Pipe(duplex=False)
    proc = ctx.Process(target=_child, args=(task, send, log), daemon=True)
    t0 = time.perf_counter()
    try:
        proc.start()
        send.close()
        if live is not None:
            live.add(proc)
        if stop is not None and stop.is_set():
            proc.kill()
        row = None
        if recv.poll(task["timeout"]):
            try:
                row = recv.recv()
            except (EOFError, OSError):
                row = None
            wall = time.perf_counter() - t0
        else:
            wall = time.perf_counter() - t0
            peak = _peak_mb_of(proc.pid)
            proc.kill()
            proc.join()
            return _failure_row(task, "timeout", wall, "", peak)
        proc.join(5)
        if proc.is_alive():
            proc.kill()
            proc.join()
        if row is None:
            return _failure_row(task, "crash", wall, _exit_message(proc.exitcode, log))
        return _finish_row(row, task, wall)
    finally:
        if live is not None:
            live.discard(proc)
        recv.close()
        try:
            os.unlink(log)
        except OSError:
            pass


STARTUP_GRACE = 120.0  # seconds a fresh interpreter may take to import before its clock starts


def _run_subprocess(task: dict) -> dict:
    """Same as a forked run, but in a fresh interpreter (for daemonic hosts such as Dask).

    The worker's own interval timer stops it ``timeout`` seconds after its imports are done
    (killed by ``SIGALRM``: status ``timeout``), so a slow interpreter start is not charged
    to the run; the runner kills it only if that fails, with a grace for the start."""
    log = _temp_log()
    result = tempfile.TemporaryFile()
    t0 = time.perf_counter()
    try:
        with open(log, "wb") as logf:
            proc = subprocess.Popen(
                [sys.executable, "-m", "satorder.bench.runner", json.dumps(task)],
                stdin=subprocess.DEVNULL, stdout=result, stderr=logf)
        try:
            code = proc.wait(task["timeout"] + STARTUP_GRACE)
        except subprocess.TimeoutExpired:
            wall = time.perf_counter() - t0
            peak = _peak_mb_of(proc.pid)
            proc.kill()
            proc.wait()
            return _failure_row(task, "timeout", wall, "", peak)
        wall = time.perf_counter() - t0
        if code == -signal.SIGALRM:
            return _failure_row(task, "timeout", wall, "")
        result.seek(0)
        lines = result.read().decode("utf-8", "replace").strip().splitlines()
        try:
            row = json.loads(lines[-1]) if lines else None
        except ValueError:
            row = None
        if code != 0 or not isinstance(row, dict):
            return _failure_row(task, "crash", wall, _exit_message(code, log))
        return _finish_row(row, task, wall)
    finally:
        result.close()
        try:
            os.unlink(log)
        except OSError:
            pass


def run_isolated(task: dict, live: set | None = None,
                 stop: threading.Event | None = None) -> dict:
    """Run one task in a worker process killed at ``task["timeout"]``; always returns a row.

    ``task``: ``instance`` (row key), ``path``, ``backend``, ``timeout`` (seconds) and optional
    ``expected`` (manifest fields copied into the row).
    """
    try:
        if mp.current_process().daemon:
            row = _run_subprocess(task)
        else:
            row = _run_forked(task, live, stop)
    except Exception as exc:  # the runner itself failed for this task: still a row
        row = _failure_row(task, "error", 0.0, "runner: " + _one_line(exc))
    return row


def _subprocess_main(arg: str) -> int:
    signal.signal(signal.SIGINT, signal.SIG_IGN)
    task = json.loads(arg)
    importlib.import_module("satorder.bench.preload")  # imports and warm-up before the clock
    signal.setitimer(signal.ITIMER_REAL, task["timeout"])  # default action: terminate
    result_fd = os.dup(1)
    os.dup2(2, 1)  # anything a back end prints goes to the log, not into the result
    try:
        row = execute(task)
    except BaseException as exc:  # noqa: BLE001
        traceback.print_exc()
        row = _base_row(task)
        row.update(status="error", error=_one_line(exc))
    os.write(result_fd, (json.dumps(row) + "\n").encode())
    return 0


# --------------------------------------------------------------------------- rows on disk
def read_rows(path: str) -> list[dict]:
    """Rows already in a JSON Lines file (none if it does not exist).

    A last line without its newline (a run killed while writing) is cut off the file.
    """
    if not os.path.exists(path):
        return []
    try:
        with open(path, "rb") as f:
            data = f.read()
    except OSError as exc:
        raise InputError(f"{path}: cannot read ({exc.strerror}); check --out") from None
    if data and not data.endswith(b"\n"):
        cut = data.rfind(b"\n") + 1
        os.truncate(path, cut)
        data = data[:cut]
    rows = []
    for k, line in enumerate(data.decode("utf-8", "replace").split("\n")):
        if not line.strip():
            continue
        try:
            row = json.loads(line)
        except ValueError:
            row = None
        if not isinstance(row, dict) or "instance" not in row or "backend" not in row:
            raise InputError(f"{path}: line {k + 1}: not a result row; remove the line or "
                             "choose another --out")
        rows.append(row)
    return rows


class RowWriter:
    """Appends one complete JSON line per row with a single write, then syncs it to disk."""

    def __init__(self, path: str):
        folder = os.path.dirname(os.path.abspath(path))
        if not os.path.isdir(folder):
            raise InputError(f"{path}: folder {folder} does not exist; create it first")
        self.fd = os.open(path, os.O_WRONLY | os.O_APPEND | os.O_CREAT, 0o644)

    def write(self, row: dict) -> None:
        data = (json.dumps(row, separators=(",", ":")) + "\n").encode("utf-8")
        view = memoryview(data)
        while view:
            n = os.write(self.fd, view)
            view = view[n:]
        os.fsync(self.fd)

    def close(self) -> None:
        os.close(self.fd)


# --------------------------------------------------------------------------- running
def plan(instances: list[tuple[str, str, dict]], backends: list[str],
         done: Iterable[tuple[str, str]]) -> list[Run]:
    """Runs still to do: every (instance, back end) not yet in ``done``."""
    skip = set(done)
    return [Run(key, path, b, expected) for key, path, expected in instances for b in backends
            if (key, b) not in skip]


def _task(run: Run, timeout: float) -> dict:
    return {"instance": run.instance, "path": run.path, "backend": run.backend,
            "timeout": timeout, "expected": run.expected}


def run_local(runs: list[Run], timeout: float, jobs: int,
              on_row: Callable[[dict], None]) -> None:
    """Run locally, ``jobs`` at a time; ``on_row`` is called in this thread for each row.

    On KeyboardInterrupt every worker is killed and no further row is reported.
    """
    live: set = set()
    stop = threading.Event()
    pool = ThreadPoolExecutor(max_workers=max(1, jobs))

    def one(run: Run):
        if stop.is_set():
            return None
        return run_isolated(_task(run, timeout), live, stop)

    try:
        start_workers()
        futures = [pool.submit(one, r) for r in runs]
        for fut in as_completed(futures):
            row = fut.result()
            if row is not None and not stop.is_set():
                on_row(row)
    except BaseException:
        stop.set()
        for proc in list(live):
            try:
                proc.kill()
            except Exception:  # noqa: BLE001 — already gone
                pass
        raise
    finally:
        pool.shutdown(wait=True, cancel_futures=True)


def run_cluster(runs: list[Run], timeout: float, address: str,
                on_row: Callable[[dict], None]) -> None:
    """Send the runs to a Dask distributed scheduler at ``address``; same rows as locally.

    Workers must see the problem files at the same absolute paths (a shared file system).
    """
    try:
        from distributed import Client
        from distributed import as_completed as dask_completed
    except ImportError:
        raise InputError("--cluster needs Dask distributed: pip install 'satorder[cluster]'"
                         ) from None
    try:
        client = Client(address, timeout="15s")
    except (OSError, TimeoutError, ValueError) as exc:
        raise InputError(f"cannot reach a Dask scheduler at {address} ({exc}); start one or "
                         "check the address") from None
    futures = []
    try:
        tasks = [_task(r, timeout) for r in runs]
        futures = [client.submit(run_isolated, t, pure=False) for t in tasks]
        index = {f.key: t for f, t in zip(futures, tasks)}
        for fut in dask_completed(futures):
            try:
                row = fut.result()
            except Exception as exc:  # noqa: BLE001 — a lost worker is a row too
                row = _failure_row(index[fut.key], "crash", 0.0, "cluster: " + _one_line(exc))
            on_row(row)
    except BaseException:
        if futures:
            client.cancel(futures)
        raise
    finally:
        client.close()


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


if __name__ == "__main__":  # worker entry for runs in a fresh interpreter
    raise SystemExit(_subprocess_main(sys.argv[1]))
