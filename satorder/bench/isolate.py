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
* Every answer is checked by :func:`satorder.pipeline.solve.verify` (the independent checks in
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
import signal
import socket
import subprocess
import sys
import tempfile
import threading
import time
import traceback
from collections.abc import Callable
from concurrent.futures import ThreadPoolExecutor, as_completed

from satorder.bench.backends import _base_row, _one_line, execute
from satorder.bench.discover import Run
from satorder.errors import InputError


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
                [sys.executable, "-m", "satorder.bench", json.dumps(task)],
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
