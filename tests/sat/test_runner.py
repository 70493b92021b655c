"""The solver runner: a deadline for every back-end family (interruptible, conflict budget only,
neither), Ctrl-C that leaves the solver usable, RC2 under the same rules, and the engines on top.

The hard instances are pigeonhole formulas: n + 1 pigeons in n holes is unsatisfiable and needs
resolution proofs of exponential size (Haken, "The intractability of resolution", TCS 39, 1985),
so CDCL solvers cannot refute PHP(12) within seconds (common practice for hard UNSAT tests).
No test measures speed: the only clock bound is a generous sanity check that a call returned.
"""

from __future__ import annotations

import os
import signal
import subprocess
import threading
import time

import pytest
from pysat.examples.genhard import PHP
from pysat.examples.rc2 import RC2
from pysat.formula import WCNF
from pysat.solvers import Solver

from satorder.errors import InputError
from satorder.sat import runner

SANITY = 60.0  # seconds: a call that should stop at a 1 s deadline certainly returned by then


def _switchable_php(holes: int = 12):
    """PHP(holes) with every clause guarded by a fresh literal ``g``: assuming ``-g`` poses the
    hard refutation, without it the formula is satisfied at once (``g`` true)."""
    php = PHP(holes)
    g = php.nv + 1
    return [cl + [g] for cl in php.clauses], g


@pytest.mark.parametrize("name, kind", [("glucose4", "interrupt"), ("minisat22", "interrupt"),
                                        ("cadical195", "budget"), ("lingeling", "none")])
def test_back_end_families(name, kind):
    # what python-sat offers per back end decides how the runner stops it
    assert runner.family(name) == kind
    with Solver(name=name) as s:
        assert runner.family(s) == kind


@pytest.mark.parametrize("name", ["glucose4", "minisat22", "cadical195"])
def test_deadline_stops_a_hard_call_and_the_solver_stays_usable(name):
    clauses, g = _switchable_php()
    with Solver(name=name, bootstrap_with=clauses) as s:
        t0 = time.monotonic()
        assert runner.solve(s, [-g], deadline=runner.deadline_after(1.0)) is None
        assert time.monotonic() - t0 < SANITY
        assert runner.solve(s, [g]) is True  # same solver, easy question: answered
        assert runner.solve(s, [-g, g]) is False  # contradicting assumptions: refuted
        assert runner.solve(s, [-g], deadline=runner.deadline_after(0.5)) is None


def test_a_passed_deadline_returns_at_once_without_solving():
    with Solver(name="glucose4", bootstrap_with=[[1], [-1]]) as s:
        assert runner.solve(s, deadline=time.monotonic() - 1) is None  # unsat, but not asked
        assert runner.solve(s) is False


def test_back_end_without_interrupt_or_budget_is_refused_with_a_limit():
    with pytest.raises(InputError) as exc:
        runner.resolve_solver("lingeling", time_limit=5)
    msg = str(exc.value)
    assert "lingeling" in msg and "cadical195" in msg and "glucose4" in msg
    assert "\n" not in msg
    assert runner.resolve_solver("lingeling") == "lingeling"  # without a limit it is fine
    clauses, g = _switchable_php(4)
    with Solver(name="lingeling", bootstrap_with=clauses) as s:
        with pytest.raises(InputError):
            runner.solve(s, [-g], deadline=runner.deadline_after(5))
        assert runner.solve(s, [-g]) is False  # PHP(4) is small: refuted without a limit
        assert runner.solve(s, [g]) is True


def test_engines_refuse_lingeling_with_a_time_limit(tmp_path, capsys):
    import json

    from satorder.cli.main import main
    from satorder.model.problem import Problem
    from satorder.sat.engine import solve_sat

    p = Problem.from_lists(fixed=[("a", "b")], incomparable=[("b", "c")])
    with pytest.raises(InputError):
        solve_sat(p, solver="lingeling", time_limit=5)
    assert solve_sat(p, solver="lingeling").feasible
    path = tmp_path / "p.json"
    path.write_text(json.dumps({"fixed": [["a", "b"]], "incomparable": [["b", "c"]]}))
    assert main(["solve", str(path), "--solver", "lingeling", "--time-limit", "5"]) == 2
    err = capsys.readouterr().err
    assert "cannot be stopped at a time limit" in err and len(err.strip().splitlines()) == 1


def _sigint_soon(delay: float = 0.5) -> threading.Timer:
    timer = threading.Timer(delay, os.kill, (os.getpid(), signal.SIGINT))
    timer.start()
    return timer


@pytest.mark.parametrize("name", ["glucose4", "cadical195"])
def test_ctrl_c_raises_keyboard_interrupt_and_leaves_the_solver_usable(name):
    clauses, g = _switchable_php()
    with Solver(name=name, bootstrap_with=clauses) as s:
        timer = _sigint_soon()
        try:
            with pytest.raises(KeyboardInterrupt):
                # the deadline is only a backstop: Ctrl-C must come first
                runner.solve(s, [-g], deadline=runner.deadline_after(SANITY))
        finally:
            timer.cancel()
        assert signal.getsignal(signal.SIGINT) is signal.default_int_handler
        assert runner.solve(s, [g]) is True
        assert runner.solve(s, [-g], deadline=runner.deadline_after(0.5)) is None


def test_ctrl_c_on_a_back_end_without_interrupt_takes_effect_when_the_call_returns():
    # Lingeling cannot be stopped: a call (PHP(7): about a second) runs to its end in the
    # worker, then the interrupt is raised and the solver is intact.  The signal comes from
    # another process, since no thread of this one runs while Lingeling holds the GIL.
    clauses, g = _switchable_php(7)
    with Solver(name="lingeling", bootstrap_with=clauses) as s:
        kill = subprocess.Popen(["sh", "-c", f"sleep 0.5; kill -INT {os.getpid()}"])
        try:
            with pytest.raises(KeyboardInterrupt):
                for _ in range(30):  # busy however fast the machine is
                    assert runner.solve(s, [-g]) is False
        finally:
            kill.wait()
        assert runner.solve(s, [g]) is True


def _hard_maxsat():
    """RC2 over the switchable PHP(12) as hard clauses and the soft unit ``-g``: its first
    oracle call (assuming ``-g``) is the hard refutation; ``g`` true satisfies the hard part."""
    clauses, g = _switchable_php()
    wcnf = WCNF()
    for cl in clauses:
        wcnf.append(cl)
    wcnf.append([-g], weight=1)
    return RC2(wcnf, solver="glucose4"), g


def test_rc2_is_stopped_at_the_deadline():
    rc2, g = _hard_maxsat()
    with rc2:
        t0 = time.monotonic()
        model, stopped = runner.maxsat(rc2, runner.deadline_after(1.0))
        assert time.monotonic() - t0 < SANITY
        assert stopped and rc2.interrupted
        # the interrupt was cleared: the oracle answers an easy question again
        assert runner.solve(rc2.oracle, [g]) is True


def test_drive_passes_results_and_errors_through():
    assert runner.drive(lambda: 42, lambda: None) == (42, False)
    calls = []
    assert runner.drive(lambda: calls.append(1), lambda: None,
                        deadline=time.monotonic() - 1) == (None, True)
    assert calls == []  # a passed deadline: not even started

    def boom():
        raise ValueError("from the worker")

    with pytest.raises(ValueError, match="from the worker"):
        runner.drive(boom, lambda: None)


def test_ctrl_c_stops_rc2_and_raises_keyboard_interrupt():
    rc2, _ = _hard_maxsat()
    with rc2:
        timer = _sigint_soon()
        try:
            with pytest.raises(KeyboardInterrupt):
                runner.maxsat(rc2, runner.deadline_after(SANITY))
        finally:
            timer.cancel()
    with RC2(WCNF(), solver="cadical195") as rc2:  # an oracle the runner cannot interrupt
        with pytest.raises(ValueError, match="interruptible"):
            runner.maxsat(rc2)


def test_deadline_after_and_seconds_left():
    assert runner.deadline_after(None) is None
    assert runner.deadline_after(None, 5.0) == 5.0
    now = time.monotonic()
    assert now <= runner.deadline_after(10) <= time.monotonic() + 10
    assert runner.deadline_after(10, now) == now  # the earlier one wins
    assert runner.seconds_left(None) is None
    assert runner.seconds_left(now - 3) == 0.0


def test_ctrl_c_inside_a_checkers_own_solver_call_exits_130(monkeypatch, capsys):
    # the independent checkers call python-sat directly (they import no engine); python-sat
    # reports a Ctrl-C there as its own error type, which the command line treats as Ctrl-C
    import pysolvers

    from satorder.cli import main as cli_main
    from satorder.cli import solve as cli_solve

    def interrupted(args):
        raise pysolvers.error("Caught keyboard interrupt")

    assert runner.is_keyboard_error(pysolvers.error("Caught keyboard interrupt"))
    assert not runner.is_keyboard_error(ValueError("keyboard"))
    monkeypatch.setattr(cli_solve, "run", interrupted)
    assert cli_main.main(["solve", "unused.json"]) == 130
    assert capsys.readouterr().err.strip() == "satorder: interrupted"


def test_runner_works_in_a_forked_child():
    # calls run in a worker thread kept per calling thread; a forked child keeps only the
    # forking thread, so it must start a worker of its own (the benchmark forks its runs)
    with Solver(name="cadical195", bootstrap_with=[[1, 2], [-1]]) as s:
        assert runner.solve(s) is True
        pid = os.fork()
        if pid == 0:  # the child: exit status 0 only if the runner answered correctly
            ok = runner.solve(s, [-2]) is False and runner.solve(s) is True
            os._exit(0 if ok else 1)
        _, status = os.waitpid(pid, 0)
        assert os.waitstatus_to_exitcode(status) == 0
