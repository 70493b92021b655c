"""Reference answers for the tests, written apart from the product's engines.

Every test folder imports what it needs from here (``tests`` is on pytest's ``pythonpath``), so
each folder runs alone.

* :func:`all_graphs` — every labelled simple graph on a few items.
* :func:`count_orientations`, :func:`brute_force_orientable` — brute force over all 2^m
  orientations of a small graph.
* :func:`all_posets` — every strict partial order on up to six items (the counts are OEIS
  A001035, checked in ``tests/sat/test_sat.py``).
* :func:`brute_answers`, :func:`brute_force_feasible`, :func:`brute_count` — a problem's
  answers among all posets.
* :func:`reference_feasible` — the textbook direct CNF encoding (a variable per ordered pair,
  a clause per item triple for transitivity; common practice), solved with MiniSat.
* :func:`random_problem`, :func:`random_requirements` — seeded random problems;
  :func:`random_order` — a seeded random order.
"""

from __future__ import annotations

import functools
import itertools
import random

import networkx as nx
from pysat.solvers import Solver

from satorder.model.order import transitive_closure
from satorder.model.problem import Problem, ProblemBuilder


# ------------------------------------------------------------------------ graphs
def all_graphs(n: int):
    """Every labelled simple graph on items 0..n-1, as networkx graphs."""
    pairs = list(itertools.combinations(range(n), 2))
    for mask in range(1 << len(pairs)):
        g = nx.Graph()
        g.add_nodes_from(range(n))
        g.add_edges_from(p for k, p in enumerate(pairs) if mask >> k & 1)
        yield g


def _transitive_orientations(edges: list[tuple[int, int]]):
    """Each orientation of ``edges`` that is transitive (tries all 2^m)."""
    for mask in range(1 << len(edges)):
        arcs = {(a, b) if mask >> k & 1 else (b, a) for k, (a, b) in enumerate(edges)}
        succ: dict = {}
        for a, b in arcs:
            succ.setdefault(a, set()).add(b)
        if all((a, c) in arcs for a, b in arcs for c in succ.get(b, ())):
            yield arcs


def count_orientations(n: int, edges: list[tuple[int, int]]) -> int:
    """Number of transitive orientations of a graph on items 0..n-1 (edges ≤ 16)."""
    assert len(edges) <= 16, "brute force is 2^m"
    return sum(1 for _ in _transitive_orientations(list(edges)))


def brute_force_orientable(g: nx.Graph) -> bool:
    """True if some orientation of g's edges is transitive."""
    return next(_transitive_orientations(list(g.edges())), None) is not None


# ------------------------------------------------------------------------ posets
@functools.cache
def all_posets(n: int) -> tuple[frozenset[tuple[int, int]], ...]:
    """Every strict partial order on items 0..n-1 (as sets of pairs a<b), built by adding item k
    to each order on 0..k-1 with a down-set D below it and an up-set U above it, D×U ordered."""
    orders = [frozenset()]
    for k in range(n):
        nxt = []
        for rel in orders:
            below = {a: {x for x in range(k) if (x, a) in rel} for a in range(k)}
            above = {a: {x for x in range(k) if (a, x) in rel} for a in range(k)}
            for dmask in range(1 << k):
                d = {i for i in range(k) if dmask >> i & 1}
                if any(not below[a] <= d for a in d):
                    continue
                rest = [i for i in range(k) if i not in d]
                for umask in range(1 << len(rest)):
                    u = {rest[i] for i in range(len(rest)) if umask >> i & 1}
                    if any(not above[a] <= u for a in u):
                        continue
                    if any((x, y) not in rel for x in d for y in u):
                        continue
                    nxt.append(rel | {(x, k) for x in d} | {(k, y) for y in u})
        orders = nxt
    return tuple(orders)


def brute_answers(problem: Problem):
    """Each poset on the problem's items that meets every hard requirement."""
    comparable = list(problem.comparable_pairs())
    unordered = list(problem.incomparable_pairs())
    fixed, forbidden = problem.fixed, problem.forbidden
    for arcs in all_posets(problem.n):
        if all((a, b) in arcs or (b, a) in arcs for a, b in comparable) and \
                all((a, b) not in arcs and (b, a) not in arcs for a, b in unordered) and \
                all(arc in arcs for arc in fixed) and all(arc not in arcs for arc in forbidden):
            yield arcs


def brute_force_feasible(problem: Problem) -> bool:
    """Whether some poset on the problem's items meets every hard requirement."""
    return next(brute_answers(problem), None) is not None


def brute_count(problem: Problem) -> int:
    """The number of posets on the problem's items meeting every hard requirement."""
    return sum(1 for _ in brute_answers(problem))


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


# ------------------------------------------------------------------------ random problems
def random_problem(rnd: random.Random, n: int, others: bool | None = None) -> Problem:
    """A random problem: each pair comparable / must stay unordered / open, plus a few fixed
    and forbidden arcs, which may clash with the rest (an arc fixed both ways, fixed and
    forbidden, or fixed on a pair that must stay unordered), as merged evidence can."""
    names = [f"i{k}" for k in range(n)]
    b = ProblemBuilder("<random>")
    for x in names:
        b.item(x, "items")
    if others is None:
        others = rnd.random() < 0.3
    pc = rnd.uniform(0.2, 0.8)
    if others:
        b.incomparable_others()
    else:
        b.incomparable_list()
    for x, y in itertools.combinations(names, 2):
        r = rnd.random()
        if r < pc:
            b.comparable(x, y, "c")
        elif not others and rnd.random() < 0.7:
            b.incomparable(x, y, "i")
    for _ in range(rnd.randint(0, 6)):
        x, y = rnd.sample(names, 2)
        if rnd.random() < 0.5:
            b.fixed(x, y, "f")
        else:
            b.forbidden(x, y, "x")
    return b.build()


def random_requirements(n: int, rng: random.Random, open_pairs: bool) -> Problem:
    """Random requirements on n items: comparable pairs, pairs that must stay unordered (all
    others, or a list leaving some pairs open), up to two fixed and two forbidden arcs."""
    names = [f"i{k}" for k in range(n)]
    comparable, incomparable = [], []
    for a, b in itertools.combinations(names, 2):
        r = rng.random()
        if r < 0.55:
            comparable.append((a, b))
        elif r < 0.8 or not open_pairs:
            incomparable.append((a, b))
    fixed = [(a, b) if rng.random() < 0.5 else (b, a)
             for a, b in rng.sample(comparable, min(len(comparable), rng.randint(0, 2)))]
    arcs = [arc for arc in itertools.permutations(names, 2) if arc not in fixed]
    forbidden = rng.sample(arcs, min(len(arcs), rng.randint(0, 2)))
    return Problem.from_lists(comparable=comparable,
                              incomparable=incomparable if open_pairs else "others",
                              fixed=fixed, forbidden=forbidden, items=names)


def random_order(n: int, p: float, rng: random.Random) -> list[set[int]]:
    """Successor sets of the transitive closure of a random DAG (each pair an arc with
    probability p) on a shuffled labelling."""
    perm = list(range(n))
    rng.shuffle(perm)
    arcs = [(perm[i], perm[j]) for i in range(n) for j in range(i + 1, n) if rng.random() < p]
    return transitive_closure(n, arcs)
