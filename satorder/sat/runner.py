"""The one place a python-sat solver call runs: back-end names, a deadline, Ctrl-C, and the
back ends that cannot be interrupted.

Every SAT call in the package goes through :func:`solve` (one call of a solver) or
:func:`drive` (a callable that drives a solver; :func:`maxsat` runs RC2's ``compute`` so).
Each takes a ``deadline``, a :func:`time.monotonic` value (:func:`deadline_after` turns a time
limit in seconds into one), and gives no answer (``None``) when the deadline passes first.

How a call is stopped depends on what python-sat offers for the back end (:func:`family`):

* ``"interrupt"`` (MiniSat, Glucose, Maple, MergeSat, MiniCard, GlueCard): the solver runs in a
  worker thread (python-sat releases the GIL for ``solve_limited(expect_interrupt=True)``) while
  the calling thread keeps the clock; at the deadline, or when Ctrl-C arrives, it calls
  ``interrupt()``, waits for the worker and clears the interrupt.
* ``"budget"`` (CaDiCaL): python-sat cannot interrupt these from another thread, so the worker
  solves in conflict-budget slices and checks the clock (and a stop flag set by Ctrl-C) between
  slices.  The budget adapts so that a slice lasts at most about :data:`SLICE_SECONDS` (less
  when the deadline is near): a call stops within one slice of its deadline or of Ctrl-C.
  Without a deadline the slices still run, so that Ctrl-C works the same way.
* ``"none"`` (Lingeling): neither.  Such a back end is refused up front when a deadline is
  given (:class:`~satorder.errors.InputError` naming the back ends that can stop, see
  :func:`resolve_solver`): a limit that cannot be kept is not offered.  Without a deadline it
  runs to the end in a worker thread, and Ctrl-C takes effect when the call returns.
  (python-sat's own Ctrl-C handler, which it installs for a solve in the main thread, jumps
  out of the C code and leaves the solver broken: measured here, 2 runs in 10 hung at exit.)

Ctrl-C: while the calling (main) thread waits for the worker, SIGINT stops the solver as above
instead of raising at an arbitrary line; once the worker has returned (and the interrupt flag
is cleared) the runner raises :class:`KeyboardInterrupt`.  Since no thread is left inside the
solver and no C frame was unwound, the solver stays usable (and may be deleted safely) after
the interrupt.

>>> from pysat.solvers import Solver
>>> with Solver(name="cadical195", bootstrap_with=[[1, 2], [-1], [-2, 3]]) as s:
...     family(s), solve(s), solve(s, assumptions=[-3]), solve(s, deadline=deadline_after(0))
('budget', True, False, None)
"""

from __future__ import annotations

import queue
import signal
import threading
import time
from collections.abc import Callable, Iterable
from contextlib import contextmanager
from functools import cache
from typing import Any

from satorder.errors import InputError

DEFAULT_SOLVER = "cadical195"
# the back ends python-sat ships that the engine supports; the first three are the ones tests
# and benchmarks use most
SOLVERS = ("cadical195", "glucose4", "minisat22", "cadical153", "cadical103", "glucose3",
           "glucose42", "gluecard3", "gluecard4", "lingeling", "maplechrono", "maplecm",
           "maplesat", "mergesat3", "minicard")
_ALIASES = {"cadical": "cadical195", "glucose": "glucose4", "minisat": "minisat22"}

SLICE_SECONDS = 1.0  # longest conflict-budget slice of a back end that cannot be interrupted
_FIRST_BUDGET = 1000  # conflicts in the first slice
_POLL = 0.1  # seconds between looks at the clock while a worker runs


def resolve_solver(name: str | None, time_limit: float | None = None) -> str:
    """The canonical back-end name for ``name`` (None → the default).  InputError if the name
    is unknown, or if a ``time_limit`` is given and the back end cannot be stopped at one."""
    if name is None:
        key = DEFAULT_SOLVER
    else:
        key = _ALIASES.get(name.strip().lower(), name.strip().lower())
        if key not in SOLVERS:
            raise InputError(f"unknown SAT solver {name!r}; choose one of {', '.join(SOLVERS)}")
    if time_limit is not None and family(key) == "none":
        raise _cannot_stop(key)
    return key


@cache
def working_solvers() -> tuple[str, ...]:
    """The back ends of :data:`SOLVERS` that python-sat can start in this installation, each
    tried on a one-clause formula (microseconds each; a build without a back end fails here
    instead of in the middle of a benchmark)."""
    from pysat.solvers import Solver

    able = []
    for name in SOLVERS:
        try:
            with Solver(name=name, bootstrap_with=[[1]]) as s:
                if s.solve():
                    able.append(name)
        except Exception:  # python-sat raises its own errors for a back end it lacks
            continue
    return tuple(able)


def _cannot_stop(name: str) -> InputError:
    able = [s for s in SOLVERS if family(s) != "none"]
    return InputError(f"SAT solver {name} cannot be stopped at a time limit (python-sat can "
                      f"neither interrupt it nor limit its conflicts); drop the time limit or "
                      f"choose one of {', '.join(able)}")


def deadline_after(time_limit: float | None, deadline: float | None = None) -> float | None:
    """The earlier of ``deadline`` and ``time_limit`` seconds from now, as a
    :func:`time.monotonic` value (``None`` when neither is given)."""
    if time_limit is None:
        return deadline
    end = time.monotonic() + max(0.0, time_limit)
    return end if deadline is None else min(deadline, end)


def seconds_left(deadline: float | None) -> float | None:
    """Seconds until ``deadline`` (never negative; ``None`` without a deadline)."""
    return None if deadline is None else max(0.0, deadline - time.monotonic())


# ---------------------------------------------------------------------- what a back end offers
def family(solver) -> str:
    """How a back end can be stopped: ``"interrupt"``, ``"budget"`` or ``"none"`` (see the
    module docstring).  ``solver`` is a back-end name or a python-sat solver object."""
    if isinstance(solver, str):
        return _family_of_name(solver)
    backend = getattr(solver, "solver", solver)  # pysat.solvers.Solver wraps the back end
    kind = _FAMILY.get(type(backend))
    if kind is None:
        kind = _FAMILY[type(backend)] = _probe(solver)
    return kind


_FAMILY: dict[type, str] = {}


@cache
def _family_of_name(name: str) -> str:
    from pysat.solvers import Solver

    with Solver(name=name) as s:
        return family(s)


def _probe(solver) -> str:
    """Ask python-sat what it supports (on a solver that is not solving)."""
    try:
        solver.interrupt()
        solver.clear_interrupt()
        return "interrupt"
    except NotImplementedError:
        pass
    try:
        solver.conf_budget(_FIRST_BUDGET)  # harmless: every budgeted call sets its own budget
        return "budget"
    except NotImplementedError:
        return "none"


# ---------------------------------------------------------------------- running a call
def solve(solver, assumptions: Iterable[int] = (), deadline: float | None = None) -> bool | None:
    """One call of a python-sat ``solver``: True (satisfiable: ``get_model()``), False
    (refuted: ``get_core()``), or None when the ``deadline`` passed first.  Ctrl-C raises
    :class:`KeyboardInterrupt` with the solver stopped and usable (see the module docstring)."""
    assume = list(assumptions)
    kind = family(solver)
    if kind == "interrupt":
        result, _ = drive(lambda: solver.solve_limited(assumptions=assume, expect_interrupt=True),
                          solver.interrupt, deadline, clear=solver.clear_interrupt)
        return result
    if kind == "budget":
        stop = threading.Event()
        result, _ = drive(lambda: _slices(solver, assume, deadline, stop), stop.set, deadline)
        return result
    if deadline is not None:
        raise _cannot_stop(type(getattr(solver, "solver", solver)).__name__.lower())
    result, _ = drive(lambda: solver.solve(assumptions=assume), lambda: None)
    return result


def maxsat(rc2, deadline: float | None = None):
    """``rc2.compute()`` of a python-sat RC2 MaxSAT solver (which runs its own SAT oracle) under
    the same rules: its oracle is interrupted at the ``deadline`` or on Ctrl-C, the interrupt
    cleared afterwards.  Returns ``(model, stopped)``; a stopped call's model (and RC2's
    ``cost`` so far, a lower bound) is all there is.  The oracle must be interruptible."""
    if family(rc2.oracle) != "interrupt":
        raise ValueError("RC2 can be stopped only with an interruptible oracle, e.g. glucose4")
    return drive(lambda: rc2.compute(expect_interrupt=True), rc2.interrupt, deadline,
                 clear=rc2.clear_interrupt)


def is_keyboard_error(exc: BaseException) -> bool:
    """Is ``exc`` python-sat's report of a Ctrl-C caught inside a solver called in the main
    thread outside the runner (the independent checkers call their solvers directly)?"""
    return type(exc).__module__ == "pysolvers" and "keyboard" in str(exc).lower()


def _slices(solver, assume: list[int], deadline: float | None, stop: threading.Event):
    """Solve in conflict-budget slices until an answer, the deadline or ``stop``; a slice aims
    at :data:`SLICE_SECONDS` (a tenth of the time left, when less), the budget doubling or
    halving to stay near it."""
    budget = _FIRST_BUDGET
    while not stop.is_set():
        target = SLICE_SECONDS
        if deadline is not None:
            left = deadline - time.monotonic()
            if left <= 0:
                return None
            target = min(target, max(0.05, left / 10))
        solver.conf_budget(budget)
        t0 = time.monotonic()
        result = solver.solve_limited(assumptions=assume)
        if result is not None:
            return result
        took = time.monotonic() - t0
        if took < target / 4:
            budget *= 2
        elif took > target and budget > 100:
            budget //= 2
    return None


def drive(call: Callable[[], Any], stop: Callable[[], Any], deadline: float | None = None,
          clear: Callable[[], Any] | None = None) -> tuple[Any, bool]:
    """Run ``call()``, which drives a solver (a solver call, RC2's ``compute``), in a worker
    thread while this thread keeps the clock and takes Ctrl-C.

    At the ``deadline`` or on Ctrl-C, ``stop()`` is called (say the solver's ``interrupt``) and
    the worker is waited for; then ``clear()``, if given, runs (say ``clear_interrupt``).
    Returns ``(result, stopped)``: ``stopped`` is True when ``stop()`` was called, and then
    ``result`` is whatever ``call()`` returned after being stopped (``None`` if the deadline had
    passed before it started).  Ctrl-C is raised as :class:`KeyboardInterrupt` only once the
    worker has returned; an exception raised by ``call()`` is re-raised here.
    """
    if deadline is not None and time.monotonic() >= deadline:
        return None, True
    box: dict[str, Any] = {}
    done = threading.Event()
    stopped = submitted = False
    with _ctrl_c_calls(stop) as pressed:
        try:
            _worker().put((call, box, done))
            submitted = True
            while not done.is_set():
                wait = _POLL
                if deadline is not None and not stopped:
                    wait = deadline - time.monotonic()
                    if wait <= 0:
                        stop()
                        stopped = True
                        continue
                done.wait(min(wait, _POLL))
        finally:
            if submitted and not done.is_set():  # left by an exception: the solver must be
                stop()                              # idle before anything else happens
                stopped = True
                done.wait()
            stopped = stopped or bool(pressed)
            if stopped and clear is not None:
                clear()
    if "error" in box:
        raise box["error"]
    return box.get("result"), stopped


class _Worker:
    """The thread that runs the solver calls of one calling thread, kept between calls:
    starting a thread per call costs 0.2 to 2 ms here (measured on a loaded 2-core machine),
    more than most solver calls of a core search, handing a call to a waiting thread about
    0.04 ms.  It ends when its calling thread does (thread-local data is then released)."""

    def __init__(self):
        self.todo: queue.SimpleQueue = queue.SimpleQueue()
        self.thread = threading.Thread(target=_serve, args=(self.todo,), name="satorder-solver",
                                       daemon=True)
        self.thread.start()

    def put(self, task) -> None:
        self.todo.put(task)

    def __del__(self):
        self.todo.put(None)


def _serve(todo: queue.SimpleQueue) -> None:
    while (task := todo.get()) is not None:
        call, box, done = task
        try:
            box["result"] = call()
        except BaseException as exc:  # handed to the waiting thread
            box["error"] = exc
        done.set()


_local = threading.local()


def _worker() -> _Worker:
    """This thread's worker (a new one after a fork, which keeps only the forking thread)."""
    worker = getattr(_local, "worker", None)
    if worker is None or not worker.thread.is_alive():
        worker = _local.worker = _Worker()
    return worker


@contextmanager
def _ctrl_c_calls(stop: Callable[[], Any]):
    """While the body runs, Ctrl-C calls ``stop()`` (and is noted in the list yielded) instead
    of raising at some arbitrary line; :class:`KeyboardInterrupt` is raised once the body is
    done.  Only in the main thread while Python's default SIGINT handler is in place: a handler
    someone else installed is left alone, and other threads never see signals."""
    pressed: list[int] = []
    if threading.current_thread() is not threading.main_thread() or \
            signal.getsignal(signal.SIGINT) is not signal.default_int_handler:
        yield pressed
        return

    def handler(signum, frame):
        pressed.append(signum)
        stop()

    signal.signal(signal.SIGINT, handler)
    try:
        yield pressed
    finally:
        signal.signal(signal.SIGINT, signal.default_int_handler)
    if pressed:
        raise KeyboardInterrupt
