"""The textbook encoding over every ordered pair and item triple, the baseline the compact
encoding of :mod:`satorder.sat.encoding` is measured against, and a solver on top of it.

>>> from satorder.model.problem import Problem
>>> ans = solve_direct(Problem.from_lists(comparable=[("a", "b"), ("b", "c")]))
>>> ans.status, len(ans.named_pairs())      # a and c stay unordered: two ordered pairs
('feasible', 2)
"""

from __future__ import annotations

import time
from collections.abc import Iterable, Iterator

from satorder.model.answer import Answer
from satorder.model.problem import Problem
from satorder.model.requirement import FEASIBLE, INFEASIBLE, UNKNOWN
from satorder.sat import runner


# ---------------------------------------------------------------------- baseline
class DirectEncoding:
    """The textbook encoding, the baseline the compact one is measured against: a variable per
    ordered pair of items, ``¬x_ab ∨ ¬x_ba`` per pair, ``¬x_ab ∨ ¬x_bc ∨ x_ac`` per ordered
    triple, and one or two clauses per requirement.  ``n(n-1)(n-2)`` transitivity clauses, so
    the clauses are generated in chunks (:meth:`chunks`) rather than kept in memory.
    """

    def __init__(self, problem: Problem):
        self.problem = problem
        n = self.n = problem.n
        self.nv = n * (n - 1)
        p = problem
        req: list[list[int]] = []
        for a, b in p.comparable_pairs():
            req.append([self.lt(a, b), self.lt(b, a)])
        for a, b in p.incomparable_pairs():
            req += [[-self.lt(a, b)], [-self.lt(b, a)]]
        req += [[self.lt(a, b)] for a, b in p.fixed]
        req += [[-self.lt(a, b)] for a, b in p.forbidden]
        self.requirement_clauses = req
        self.num_clauses = n * (n - 1) // 2 + n * (n - 1) * (n - 2) + len(req)

    def lt(self, a: int, b: int) -> int:
        """Variable of ``a < b``: ordered pairs numbered row by row, skipping the diagonal."""
        return a * (self.n - 1) + (b if b < a else b - 1) + 1

    def chunks(self, size: int = 200_000) -> Iterator[list[list[int]]]:
        """All clauses, in lists of about ``size`` clauses."""
        n = self.n
        lt = self.lt
        buf: list[list[int]] = []
        for a in range(n):
            for b in range(a + 1, n):
                buf.append([-lt(a, b), -lt(b, a)])
        buf += self.requirement_clauses
        for a in range(n):
            for b in range(n):
                if a == b:
                    continue
                ab = -lt(a, b)
                for c in range(n):
                    if c != a and c != b:
                        buf.append([ab, -lt(b, c), lt(a, c)])
                if len(buf) >= size:
                    yield buf
                    buf = []
        if buf:
            yield buf

    def decode(self, model: Iterable[int]) -> list[set[int]]:
        true = set(lit for lit in model if lit > 0)
        n = self.n
        return [{b for b in range(n) if b != a and self.lt(a, b) in true} for a in range(n)]


def direct_encoding(problem: Problem) -> DirectEncoding:
    """The baseline encoding over every ordered pair and item triple (see :class:`DirectEncoding`).

    >>> from satorder.model.problem import Problem
    >>> d = direct_encoding(Problem.from_lists(comparable=[("a", "b"), ("b", "c")]))
    >>> d.nv, d.num_clauses
    (6, 13)
    """
    return DirectEncoding(problem)


def solve_direct(problem: Problem, solver: str | None = None,
                 time_limit: float | None = None) -> Answer:
    """Solve with the textbook encoding (:func:`satorder.sat.direct.direct_encoding`), the baseline
    for benchmarks.  Infeasible answers carry no core (``stats["note"]`` says so), so they are
    for measuring, not for showing."""
    from pysat.solvers import Solver

    t0 = time.perf_counter()
    name = runner.resolve_solver(solver, time_limit)
    deadline = runner.deadline_after(time_limit)
    enc = direct_encoding(problem)
    stats = {"solver": name, "encoding": "direct", "variables": enc.nv,
             "clauses": enc.num_clauses}
    with Solver(name=name) as t:
        for chunk in enc.chunks():
            t.append_formula(chunk)
            if deadline is not None and time.monotonic() >= deadline:
                stats["seconds"] = round(time.perf_counter() - t0, 6)
                return Answer(problem, UNKNOWN, "sat-direct", stats=stats)
        stats["encode_seconds"] = round(time.perf_counter() - t0, 6)
        t1 = time.perf_counter()
        res = runner.solve(t, deadline=deadline)
        stats["solve_seconds"] = round(time.perf_counter() - t1, 6)
        succ = enc.decode(t.get_model()) if res else None
    stats["seconds"] = round(time.perf_counter() - t0, 6)
    if res is True:
        return Answer(problem, FEASIBLE, "sat-direct", succ=succ, stats=stats)
    if res is False:
        stats["note"] = "infeasible; the direct encoding gives no core"
        return Answer(problem, INFEASIBLE, "sat-direct", stats=stats)
    return Answer(problem, UNKNOWN, "sat-direct", stats=stats)
