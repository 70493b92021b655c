"""Back ends for the benchmark tests, named as ``bench_plugins:NAME`` (the runner's
``module:function`` form).  Each misbehaves in one deliberate way so that the runner's handling
of slowness, hangs, crashes and wrong answers can be checked."""

from __future__ import annotations

import os
import signal
import time

from satorder.model.answer import Answer
from satorder.pipeline.solve import solve


def slow_forcing(problem, time_limit):
    """The forcing engine after a pause (``SATORDER_TEST_DELAY`` seconds, default 0.3), so a
    run can be interrupted while work is still pending."""
    time.sleep(float(os.environ.get("SATORDER_TEST_DELAY", "0.3")))
    return solve(problem, engine="forcing", verify_answer=False)


def hang(problem, time_limit):
    """Never answers (ignores its time limit): must be killed at the timeout."""
    while True:
        time.sleep(1)


def segfault(problem, time_limit):
    """Dies the way a faulty native solver dies."""
    os.kill(os.getpid(), signal.SIGSEGV)
    time.sleep(10)


def raises(problem, time_limit):
    raise RuntimeError("deliberate failure inside the back end")


def wrong_order(problem, time_limit):
    """A feasible answer with one arc reversed: the certificate check must reject it."""
    ans = solve(problem, engine="forcing", verify_answer=False)
    if ans.status == "feasible":
        a = next(a for a, s in enumerate(ans.succ) if s)
        b = next(iter(ans.succ[a]))
        ans.succ[a].discard(b)
        ans.succ[b].add(a)
    return ans


def liar(problem, time_limit):
    """Claims every problem infeasible, with no certificate."""
    return Answer(problem, "infeasible", "liar")
