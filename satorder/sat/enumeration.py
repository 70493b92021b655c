"""Enumeration of every answer of a problem with a SAT solver and blocking clauses.

Method (common practice for all-solutions SAT, e.g. the blocking-clause scheme surveyed by
Toda & Soh, "Implementing efficient all solutions SAT solvers", ACM JEA 21, 2016): solve; turn
the model into an order; add a *blocking clause* saying "at least one pair is
ordered differently"; solve again, until the formula is refuted.

Two details make this count orders rather than models:

* The blocking clause is written over the order variables only: for a pair ordered ``a<b`` it
  holds ``¬(a<b)``, for a pair that may be ordered but is not it holds ``(a<b) ∨ (b<a)``.
  Distinct answers differ on some pair, so none is blocked by another's clause, and no answer
  comes twice.
* The encoding (:mod:`satorder.sat.encoding`) adds transitivity lazily and creates variables of open
  pairs on demand; here every open pair gets its variables up front (an open pair without a
  variable could never be ordered), and each model is refined by the session's lazy loop until it
  is a strict partial order before it is reported.

This is an engine: it does not check its own orders.  The front door
:func:`satorder.pipeline.orders.certified_orders` hands each one to
:func:`satorder.certify.order.check_order` before passing it on.

>>> from satorder.model.problem import Problem
>>> p = Problem.from_lists(comparable=[("a", "b"), ("b", "c")])      # a path: 2 answers
>>> sorted(sorted(o.pairs) for o in enumerate_orders(p))
[[(0, 1), (2, 1)], [(1, 0), (1, 2)]]
"""

from __future__ import annotations

import time
from collections.abc import Iterator
from dataclasses import dataclass

from satorder.model import order as order_ops
from satorder.model.problem import Problem


@dataclass
class FoundOrder:
    """One answer: ``succ`` (successor sets) and its index in the enumeration."""

    index: int
    succ: list[set[int]]

    @property
    def pairs(self) -> list[tuple[int, int]]:
        return list(order_ops.pairs(self.succ))


# why an enumeration stopped (``EnumerationEnd.reason``; the consumer sets INTERRUPTED when
# Ctrl-C cuts the listing short)
COMPLETE, LIMIT, TIME_LIMIT, INTERRUPTED = "complete", "limit", "time-limit", "interrupted"


@dataclass
class EnumerationEnd:
    """Why an enumeration stopped: ``complete`` (every answer was produced), or the limit or
    the time limit was reached first (``reason``, one of the names above)."""

    found: int = 0
    complete: bool = False
    reason: str = ""
    seconds: float = 0.0


def enumerate_orders(problem: Problem, limit: int | None = None, solver: str | None = None,
                     time_limit: float | None = None,
                     end: EnumerationEnd | None = None) -> Iterator[FoundOrder]:
    """Yield the answers of ``problem`` (hard requirements only), at most
    ``limit`` of them and none after ``time_limit`` seconds.  Pass an :class:`EnumerationEnd`
    as ``end`` to learn whether the enumeration was complete."""
    from satorder.sat import runner

    end = end if end is not None else EnumerationEnd()
    t0 = time.monotonic()
    deadline = runner.deadline_after(time_limit)
    solver = runner.resolve_solver(solver, time_limit)
    end.found, end.complete, end.reason = 0, False, ""
    if limit is not None and limit <= 0:
        end.reason = LIMIT
        return
    try:
        yield from _enumerate(problem, limit, solver, deadline, end)
    finally:  # also when the consumer stops early or Ctrl-C arrives
        end.seconds = round(time.monotonic() - t0, 6)


def _enumerate(problem, limit, solver, deadline, end) -> Iterator[FoundOrder]:
    from satorder.sat.session import SatSession

    with SatSession(problem, solver=solver) as s:
        enc = s.enc
        if problem.incomparable is not None:  # open pairs need their variables from the start
            for a in range(problem.n):
                for b in range(a + 1, problem.n):
                    if problem.is_open(a, b):
                        enc.lt(a, b)
        while True:
            res = s.solve(deadline=deadline)
            if res is None:
                end.reason = TIME_LIMIT
                break
            if res is False:
                end.complete, end.reason = True, COMPLETE
                break
            succ = [set(x) for x in s.order()]
            end.found += 1
            yield FoundOrder(end.found, succ)
            s.add_clause(_blocking_clause(enc, succ))
            if limit is not None and end.found >= limit:
                # one more call tells whether the list happens to be complete
                more = s.solve(deadline=deadline)
                end.complete = more is False
                end.reason = COMPLETE if more is False else LIMIT
                break


def _blocking_clause(enc, succ: list[set[int]]) -> list[int]:
    """At least one pair with variables is ordered differently from ``succ``."""
    clause: set[int] = set()
    for a, b, up, down in enc.pair_literals():
        if b in succ[a]:
            clause.add(-up)
        elif a in succ[b]:
            clause.add(-down)
        else:
            clause.add(up)
            clause.add(down)
    return sorted(clause, key=abs)
