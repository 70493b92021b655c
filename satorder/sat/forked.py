"""Run a solver routine that cannot be interrupted in a forked child process, so that a deadline
or Ctrl-C can stop it by ending the process.

The model counter and the sampler (ApproxMC and UniGen, :mod:`satorder.sat.modelcount` and
:mod:`satorder.sat.sampling`) run inside their C++ libraries without a way to interrupt them
from Python; python-sat's solvers are stopped by :mod:`satorder.sat.runner` instead.  The child
is forked (it inherits the formula, nothing is copied up front), sends its result back through
a pipe and exits; at the deadline, on Ctrl-C, or when the caller leaves by an exception, the
parent kills it and waits for it, so no process is left behind.

>>> run_forked(lambda: sum(range(10)))
(45, False)
"""

from __future__ import annotations

import multiprocessing
import time
from collections.abc import Callable
from typing import Any

_POLL = 0.1  # seconds between looks at the clock


def _child(call: Callable[[], Any], send) -> None:
    try:
        result = ("ok", call())
    except BaseException as exc:  # handed to the parent
        result = ("error", exc)
    try:
        send.send(result)
    except Exception as exc:  # the result could not be pickled
        send.send(("error", RuntimeError(f"result could not be sent back: {exc}")))
    send.close()


def run_forked(call: Callable[[], Any], deadline: float | None = None) -> tuple[Any, bool]:
    """``(call(), False)`` computed in a forked child, or ``(None, True)`` when the
    ``deadline`` (a :func:`time.monotonic` value) passed first.  An exception raised by
    ``call`` is raised here; Ctrl-C kills the child and raises :class:`KeyboardInterrupt`."""
    if deadline is not None and time.monotonic() >= deadline:
        return None, True
    ctx = multiprocessing.get_context("fork")
    recv, send = ctx.Pipe(duplex=False)
    proc = ctx.Process(target=_child, args=(call, send), daemon=True)
    proc.start()
    send.close()
    try:
        while True:
            wait = _POLL
            if deadline is not None:
                wait = min(wait, deadline - time.monotonic())
                if wait <= 0:
                    return None, True
            if recv.poll(wait):
                try:
                    kind, value = recv.recv()
                except EOFError:
                    raise RuntimeError("the counting process ended without an answer "
                                       f"(exit status {proc.exitcode})") from None
                if kind == "error":
                    raise value
                return value, False
            if not proc.is_alive() and not recv.poll():
                raise RuntimeError("the counting process ended without an answer "
                                   f"(exit status {proc.exitcode})")
    finally:
        if proc.is_alive():
            proc.kill()
        proc.join()
        recv.close()
