"""Every answer of a problem, one at a time, each certified before it is handed on.

The SAT engine lists the answers (:func:`satorder.sat.enumeration.enumerate_orders`, blocking
clauses over the order variables); each one goes through the independent order check
(:func:`satorder.certify.order.check_order`) before the caller sees it, so ``satorder orders``
and counting by enumeration only ever report checked orders.  A failed check raises
:class:`~satorder.errors.CertificateError`.

>>> from satorder.model.problem import Problem
>>> p = Problem.from_lists(comparable=[("a", "b"), ("b", "c")])      # a path: 2 answers
>>> end = EnumerationEnd()
>>> sorted(sorted(o.pairs) for o in certified_orders(p, end=end)), end.complete
([[(0, 1), (2, 1)], [(1, 0), (1, 2)]], True)
"""

from __future__ import annotations

from collections.abc import Iterator

from satorder.certify.order import check_order
from satorder.model.problem import Problem
from satorder.sat.enumeration import (
    COMPLETE,
    INTERRUPTED,
    LIMIT,
    TIME_LIMIT,
    EnumerationEnd,
    FoundOrder,
    enumerate_orders,
)

__all__ = ["COMPLETE", "INTERRUPTED", "LIMIT", "TIME_LIMIT", "EnumerationEnd", "FoundOrder",
           "certified_orders"]


def certified_orders(problem: Problem, limit: int | None = None, solver: str | None = None,
                     time_limit: float | None = None,
                     end: EnumerationEnd | None = None) -> Iterator[FoundOrder]:
    """Yield the answers of ``problem`` (hard requirements only), each one checked, at most
    ``limit`` of them and none after ``time_limit`` seconds.  Pass an
    :class:`~satorder.sat.enumeration.EnumerationEnd` as ``end`` to learn whether the list was
    complete."""
    for found in enumerate_orders(problem, limit=limit, solver=solver, time_limit=time_limit,
                                  end=end):
        check_order(problem, found.succ)
        yield found
