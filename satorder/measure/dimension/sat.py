"""Exact dimension on small parts by SAT: k linear extensions that together reverse every
incomparable pair; k = 3, 4, ... until satisfiable.
"""

from __future__ import annotations

from satorder.sat import runner

SOLVER = "cadical195"


def sat_realizer(sub: list[set[int]], k: int, time_limit: float | None = None,
                 deadline: float | None = None):
    """``k`` linear orders realizing ``sub`` (local ids), ``None`` if there are none, or
    ``"unknown"`` when the time limit (seconds) or the ``deadline`` (a ``time.monotonic()``
    value) came first; the solver runs under :func:`satorder.sat.runner.solve`.

    Encoding: ``x[i][a,b]`` (a < b as ids) true when a comes before b in the i-th order; unit
    clauses fix every ordered pair of ``sub``; two clauses per item triple and order keep each
    order transitive; each incomparable pair is put one way in some order and the other way in
    another.  The first incomparable pair is fixed both ways in orders 1 and 2 (symmetry).
    """
    from pysat.solvers import Solver

    deadline = runner.deadline_after(time_limit, deadline)

    n = len(sub)
    var = {}
    nxt = 1
    for i in range(k):
        for a in range(n):
            for b in range(a + 1, n):
                var[i, a, b] = nxt
                nxt += 1

    def before(i, a, b):
        return var[i, a, b] if a < b else -var[i, b, a]

    clauses = []
    for a in range(n):
        for b in sub[a]:
            for i in range(k):
                clauses.append([before(i, a, b)])
    for i in range(k):
        for a in range(n):
            for b in range(a + 1, n):
                for c in range(b + 1, n):
                    # no 3-cycle a→b→c→a nor a→c→b→a
                    clauses.append([-before(i, a, b), -before(i, b, c), -before(i, c, a)])
                    clauses.append([-before(i, a, c), -before(i, c, b), -before(i, b, a)])
    first = None
    for a in range(n):
        for b in range(a + 1, n):
            if b not in sub[a] and a not in sub[b]:
                clauses.append([var[i, a, b] for i in range(k)])
                clauses.append([-var[i, a, b] for i in range(k)])
                if first is None:
                    first = (a, b)
    if first is not None and k >= 2:
        clauses.append([var[0, first[0], first[1]]])
        clauses.append([-var[1, first[0], first[1]]])
    with Solver(name=SOLVER, bootstrap_with=clauses) as s:
        ok = runner.solve(s, deadline=deadline)
        if ok is None:
            return "unknown"
        if not ok:
            return None
        model = set(lit for lit in s.get_model() if lit > 0)
    realizer = []
    for i in range(k):
        ahead = [0] * n  # items placed before a
        for a in range(n):
            for b in range(a + 1, n):
                if var[i, a, b] in model:
                    ahead[b] += 1
                else:
                    ahead[a] += 1
        lin = [0] * n
        for a in range(n):
            lin[ahead[a]] = a
        realizer.append(lin)
    return realizer
