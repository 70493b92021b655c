"""Reference answers for generated problems, written apart from the product's engines.

* :func:`count_orientations` — brute force over all 2^m orientations of a small graph.
* :func:`reference_feasible` — the textbook direct CNF encoding (a variable per ordered pair,
  a clause per item triple for transitivity; common practice), solved with MiniSat.
"""

from __future__ import annotations

import itertools

from pysat.solvers import Solver


def count_orientations(n: int, edges: list[tuple[int, int]]) -> int:
    """Number of transitive orientations of a graph on items 0..n-1 (edges ≤ 16)."""
    assert len(edges) <= 16, "brute force is 2^m"
    total = 0
    for mask in range(1 << len(edges)):
        arcs = {(a, b) if mask >> k & 1 else (b, a) for k, (a, b) in enumerate(edges)}
        succ: dict[int, set[int]] = {}
        for a, b in arcs:
            succ.setdefault(a, set()).add(b)
        if all((a, c) in arcs for a, b in arcs for c in succ.get(b, ())):
            total += 1
    return total


def reference_feasible(problem) -> bool:
    """Whether some strict partial order meets every hard requirement of ``problem``."""
    n = problem.n
    var = {}
    for a, b in itertools.permutations(range(n), 2):
        var[a, b] = len(var) + 1
    with Solver(name="minisat22") as s:
        for a, b in itertools.combinations(range(n), 2):
            s.add_clause([-var[a, b], -var[b, a]])
        for a, b, c in itertools.permutations(range(n), 3):
            s.add_clause([-var[a, b], -var[b, c], var[a, c]])
        for a in range(n):
            for b in problem.adj[a]:
                if a < b:
                    s.add_clause([var[a, b], var[b, a]])
        for a, b in itertools.combinations(range(n), 2):
            if problem.must_be_unordered(a, b):
                s.add_clause([-var[a, b]])
                s.add_clause([-var[b, a]])
        for a, b in problem.fixed:
            s.add_clause([var[a, b]])
        for a, b in problem.forbidden:
            s.add_clause([-var[a, b]])
        return s.solve()
