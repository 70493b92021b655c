"""Exact dimension by a lazy SAT encoding over critical pairs.

Facts used (Trotter, *Combinatorics and Partially Ordered Sets: Dimension Theory*, Johns
Hopkins 1992, ch. 1 and 3; Trotter & Moore 1977 for alternating cycles; all from memory):

* An incomparable pair ``(a, b)`` is *critical* when everything below ``a`` is below ``b`` and
  everything above ``b`` is above ``a``.  A family of linear extensions realizes P as soon as
  each critical pair ``(a, b)`` is *reversed* (``b`` before ``a``) in one of them.
* A set of incomparable pairs can be reversed by one linear extension exactly when it holds no
  *alternating cycle*: pairs ``(a_1, b_1), …, (a_m, b_m)`` with ``a_i ≤ b_(i+1)`` (indices
  cyclic).  Then P plus the reversed pairs is acyclic, and any topological order of it is the
  extension.
* Pairs that pairwise form alternating cycles of length two need as many extensions as there
  are of them (a standard example's pairs do): a lower bound with a one-line check.

So P has dimension ≤ k exactly when its critical pairs can be coloured with k colours so that
no colour class holds an alternating cycle.  The SAT model has a variable "pair p reversed in
extension c" and a clause per pair "reversed somewhere" (behind a selector literal, so an
unsatisfiable answer names the pairs it needed); alternating cycles are added lazily, as
clauses "not all of these pairs in one colour", only when a model puts one in a colour class
(the cutting-plane scheme of lazy clause generation).  A greedy clique of pairwise-conflicting
pairs (two-cycles) fixes the first colours (symmetry breaking) and, when larger than k, settles
"no" without a solver call.  Every solver call goes through :func:`satorder.sat.runner.solve`.

>>> s3 = [{4, 5}, {3, 5}, {3, 4}, set(), set(), set()]   # the standard example S_3
>>> lazy_realizer(s3, 2).status, len(lazy_realizer(s3, 3).realizer)
('no', 3)
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from satorder.sat import runner

SOLVER = "cadical195"
CYCLES_PER_CLASS = 40  # alternating cycles cut off per colour class and round
UPFRONT_TWO_CYCLES = 200_000  # two-cycles added before the first call when there are few
MAX_CRITICAL_PAIRS = 6000  # beyond this the pair matrices grow too large: answer "unknown"


@dataclass
class LazyResult:
    """``status``: ``"yes"`` (``realizer`` holds k linear orders, bottom first), ``"no"`` (no k
    linear extensions realize the order: ``pairs`` are critical pairs that already cannot be
    reversed by k extensions, ``clique`` set when they pairwise form two-cycles) or
    ``"unknown"`` (deadline)."""

    status: str
    realizer: list[list[int]] | None = None
    pairs: list[tuple[int, int]] | None = None
    clique: bool = False
    stats: dict = field(default_factory=dict)


def below_or_equal(sub: list[set[int]]) -> np.ndarray:
    """Boolean matrix ``le[a, b]``: a ≤ b in the (transitively closed) order ``sub``."""
    n = len(sub)
    le = np.eye(n, dtype=bool)
    for a, s in enumerate(sub):
        if s:
            le[a, list(s)] = True
    return le


def critical_pairs(le: np.ndarray) -> np.ndarray:
    """Critical pairs as an array of rows ``(a, b)``: a, b incomparable, D(a) ⊆ D(b) and
    U(b) ⊆ U(a) (strict down- and up-sets)."""
    n = len(le)
    if n < 2:
        return np.zeros((0, 2), dtype=np.int64)
    lt = le & ~np.eye(n, dtype=bool)
    inc = ~(le | le.T)
    # down(a) ⊆ down(b): no x with x < a and not x < b; as a matrix product over x
    lt_i = lt.astype(np.int32)
    down_ok = (lt_i.T @ (~lt).astype(np.int32)) == 0  # [a, b]: #{x: x<a, not x<b} == 0
    up_ok = ((~lt).astype(np.int32) @ lt_i.T) == 0  # [a, b]: #{y: b<y, not a<y} == 0
    a, b = np.nonzero(inc & down_ok & up_ok)
    return np.stack([a, b], axis=1).astype(np.int64)


def two_cycle_matrix(le: np.ndarray, pairs: np.ndarray) -> np.ndarray:
    """``C[p, q]``: pairs p and q form an alternating cycle of length two (a_p ≤ b_q and
    a_q ≤ b_p), so no linear extension reverses both."""
    m = le[pairs[:, 0]][:, pairs[:, 1]]  # m[p, q]: a_p ≤ b_q
    return m & m.T


def greedy_clique(conflict: np.ndarray) -> list[int]:
    """A clique of the two-cycle graph, grown greedily by degree inside the candidates."""
    cand = np.arange(len(conflict))
    clique: list[int] = []
    while len(cand):
        sub = conflict[np.ix_(cand, cand)]
        best = int(cand[int(np.argmax(sub.sum(axis=1)))])
        clique.append(best)
        cand = cand[conflict[best, cand]]
    return clique


def _short_cycles(le: np.ndarray, pairs: np.ndarray, members: np.ndarray, limit: int):
    """Alternating cycles among the pairs ``members`` (indices into ``pairs``): two-cycles
    first, then one short cycle at a time from what topological pruning leaves, each time
    dropping one pair of the cycle found so that the next one differs."""
    if len(members) < 2:
        return []
    out: list[list[int]] = []
    sel = pairs[members]
    m = le[sel[:, 0]][:, sel[:, 1]]  # m[i, j]: a_i ≤ b_j, an arc i → j of the cycle graph
    two = np.argwhere(np.triu(m & m.T, 1))
    alive = np.ones(len(members), dtype=bool)
    for i, j in two[:limit]:
        out.append([int(members[i]), int(members[j])])
        alive[i] = False
    while len(out) < limit:
        idx = np.flatnonzero(alive)
        if len(idx) < 2:
            break
        sub = m[np.ix_(idx, idx)]
        keep = np.ones(len(idx), dtype=bool)
        indeg = sub.sum(axis=0)
        outdeg = sub.sum(axis=1)
        while True:  # peel items with no arc in or none out: they lie on no cycle
            drop = keep & ((indeg == 0) | (outdeg == 0))
            if not drop.any():
                break
            keep &= ~drop
            indeg = indeg - sub[drop].sum(axis=0)
            outdeg = outdeg - sub[:, drop].sum(axis=1)
        rest = np.flatnonzero(keep)
        if not len(rest):
            break
        cyc = _cycle_in(sub, keep, int(rest[0]))
        out.append([int(members[idx[c]]) for c in cyc])
        alive[idx[cyc[0]]] = False
    return out


def _cycle_in(sub: np.ndarray, keep: np.ndarray, start: int) -> list[int]:
    """A short cycle inside the nodes ``keep`` (each with an arc in and out there): walk arcs
    until a node repeats, then the shortest cycle through that node (breadth-first)."""
    seen = {}
    v = start
    while v not in seen:
        seen[v] = len(seen)
        v = int(np.flatnonzero(sub[v] & keep)[0])
    start = v
    prev = {start: -1}
    frontier = [start]
    while frontier:
        nxt = []
        for u in frontier:
            succ = np.flatnonzero(sub[u] & keep).tolist()
            if start in succ:
                cyc = [u]
                while cyc[-1] != start:
                    cyc.append(prev[cyc[-1]])
                cyc.reverse()
                return cyc
            for w in succ:
                if w not in prev:
                    prev[w] = u
                    nxt.append(w)
        frontier = nxt
    raise AssertionError("a node reached twice lies on a cycle")  # pragma: no cover


def _extension(le: np.ndarray, reversed_pairs: np.ndarray) -> list[int] | None:
    """A linear extension of the order plus ``b < a`` for each reversed pair, or None."""
    n = len(le)
    arcs = le & ~np.eye(n, dtype=bool)
    if len(reversed_pairs):
        arcs = arcs.copy()
        arcs[reversed_pairs[:, 1], reversed_pairs[:, 0]] = True
    indeg = arcs.sum(axis=0)
    ready = [v for v in range(n) if indeg[v] == 0]
    out = []
    while ready:
        v = ready.pop()
        out.append(v)
        for w in np.flatnonzero(arcs[v]).tolist():
            indeg[w] -= 1
            if indeg[w] == 0:
                ready.append(w)
    return out if len(out) == n else None


def lazy_realizer(sub: list[set[int]], k: int, deadline: float | None = None,
                  le: np.ndarray | None = None) -> LazyResult:
    """Do ``k`` linear extensions realize the order ``sub`` (local ids, transitively closed)?
    See the module docstring for the method; ``deadline`` is a ``time.monotonic()`` value.

    Every clause but the symmetry-breaking units sits behind a selector literal (one per pair,
    one per alternating cycle), so a "no" comes with the pairs and cycles it used: the items
    they name (and the clique's) induce a sub-order that ``k`` extensions cannot realize either,
    since each of those pairs and cycles is one of that sub-order too (``pairs`` of the
    result lists the pairs of both)."""
    from pysat.solvers import Solver

    if le is None:
        le = below_or_equal(sub)
    pairs = critical_pairs(le)
    cp = len(pairs)
    stats = {"critical_pairs": cp, "rounds": 0, "cycles": 0}
    if cp == 0:
        return LazyResult("yes", [_extension(le, pairs)] * max(1, k), stats=stats)
    if k < 1:
        return LazyResult("no", pairs=[tuple(map(int, pairs[0]))], stats=stats)
    if cp > MAX_CRITICAL_PAIRS:
        return LazyResult("unknown", stats=stats)
    conflict = two_cycle_matrix(le, pairs)
    clique = greedy_clique(conflict)
    stats["clique"] = len(clique)
    if len(clique) > k:
        return LazyResult("no", pairs=[tuple(map(int, pairs[p])) for p in clique],
                          clique=True, stats=stats)

    def x(p: int, c: int) -> int:
        return 1 + p * k + c

    top = cp * k
    sel = list(range(top + 1, top + cp + 1))
    top += cp
    clauses = [[-sel[p]] + [x(p, c) for c in range(k)] for p in range(cp)]
    for c, p in enumerate(clique):  # symmetry: the clique's pairs take the first colours
        clauses.append([x(p, c)])
    cycles: list[list[int]] = []  # cycles[j] behind selector literal top + 1 + j

    def cut(cyc: list[int]) -> list[list[int]]:
        cycles.append(cyc)
        t = top + len(cycles)
        return [[-t] + [-x(p, c) for p in cyc] for c in range(k)]

    twos = np.argwhere(np.triu(conflict, 1))
    if len(twos) * k <= UPFRONT_TWO_CYCLES:
        for p, q in twos.tolist():
            clauses += cut([p, q])
    with Solver(name=SOLVER, bootstrap_with=clauses) as s:
        while True:
            stats["rounds"] += 1
            assume = sel + list(range(top + 1, top + len(cycles) + 1))
            ok = runner.solve(s, assumptions=assume, deadline=deadline)
            if ok is None:
                stats["cycles"] = len(cycles)
                return LazyResult("unknown", stats=stats)
            if not ok:
                stats["cycles"] = len(cycles)
                used = set(clique)
                for lit in s.get_core() or assume:
                    if lit <= top:
                        used.add(lit - sel[0])
                    else:
                        used.update(cycles[lit - top - 1])
                return LazyResult("no", pairs=[tuple(map(int, pairs[p])) for p in sorted(used)],
                                  stats=stats)
            colour = (np.asarray(s.get_model()[:cp * k]) > 0).reshape(cp, k)
            added = 0
            for c in range(k):
                for cyc in _short_cycles(le, pairs, np.flatnonzero(colour[:, c]),
                                         CYCLES_PER_CLASS):
                    for clause in cut(cyc):
                        s.add_clause(clause)
                    added += 1
            if added:
                continue
            stats["cycles"] = len(cycles)
            realizer = []
            for c in range(k):
                lin = _extension(le, pairs[colour[:, c]])
                assert lin is not None, "a colour class without alternating cycle is reversible"
                realizer.append(lin)
            return LazyResult("yes", realizer, stats=stats)


def _restrict(sub: list[set[int]], keep: list[int]) -> list[set[int]]:
    index = {x: i for i, x in enumerate(keep)}
    return [{index[y] for y in sub[x] if y in index} for x in keep]


def lower_witness(sub: list[set[int]], k: int, found: LazyResult,
                  deadline: float | None = None, max_items: int = 60) -> list[int] | None:
    """Items (local ids) of a small sub-order that ``k`` linear extensions cannot realize,
    from an answer ``"no"`` of :func:`lazy_realizer` on ``sub``: the items of the pairs and
    cycles it used, confirmed by solving their sub-order afresh, then shrunk item by item (a
    removal is kept when the smaller sub-order still needs more than ``k`` extensions, and the
    items its own answer used are kept) until the ``deadline`` nears.  ``None`` if not
    confirmed in time or still over ``max_items`` (the independent check's reach)."""
    import time

    items = sorted({v for pair in found.pairs for v in pair})
    r = lazy_realizer(_restrict(sub, items), k, deadline)  # confirmed afresh
    if r.status != "no":
        return None
    items = sorted({items[v] for pair in r.pairs for v in pair})
    pos = 0
    while pos < len(items):
        if deadline is not None and time.monotonic() > deadline:
            break
        trial = items[:pos] + items[pos + 1:]
        r = lazy_realizer(_restrict(sub, trial), k, deadline)
        if r.status == "no":  # the pairs and cycles used name a smaller sub-order still
            items = [trial[v] for v in sorted({v for pair in r.pairs for v in pair})]
            pos = min(pos, len(items))
        else:
            pos += 1
    return items if len(items) <= max_items else None
