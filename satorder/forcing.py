"""The forcing algorithm: Γ relation, implication classes and a transitive orientation.

Method (Golumbic, *Algorithmic Graph Theory and Perfect Graphs*, 1980, ch. 5; Gallai 1967):
two arcs ``a→b`` and ``a'→b'`` of a graph are in the relation Γ when they share their tail
(``a = a'``) or their head (``b = b'``) and their other ends are *not* adjacent.  In any
transitive orientation, Γ-related arcs are oriented alike, so the reflexive-transitive closure of
Γ splits the arcs into *implication classes*.  A graph is a comparability graph exactly when no
implication class contains an arc together with its reverse (Golumbic, Thm 5.?; Gallai 1967).

How it is computed here (near-linear work in practice):

* Around each item ``v``, arcs ``v→x`` and ``v→y`` are Γ-related exactly when ``x`` and ``y`` lie
  in the same connected component of the *complement* of the neighbourhood ``G[N(v)]``.  A
  breadth-first search in that complement (set differences per item, not per pair of
  neighbours) yields a spanning tree per co-component; each tree edge is one Γ step with its
  witness pair ``{x, y}`` (a pair that must stay unordered).
* Each undirected edge ``e`` gets two nodes, one per direction; a Γ step links the matching
  directions.  Connected components of this doubled graph (scipy) are the implication classes.
  An edge whose two directions fall in one component is a *conflict*: a breadth-first path
  between them is a chain of forcing steps from an arc to its own reverse, each step naming its
  witness — the conflict certificate.
* Without conflict, each class is oriented by a consistent rule: keep the class whose smallest
  tail item is smaller than its smallest head item.  By Gallai's modular decomposition theorem
  the classes are the pairs of children of series nodes (where this rule orders the children
  linearly by their smallest item) and the edge sets of prime nodes (where either orientation
  works), so the result is a transitive orientation.  The caller checks it independently
  (:mod:`satorder.certify`) anyway.

>>> from satorder.problem import Problem
>>> res = transitive_orientation(Problem.from_lists(comparable=[("a", "b"), ("b", "c")]).adj)
>>> res.orientable, sorted(res.arcs())
(True, [(0, 1), (2, 1)])
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from scipy.sparse import coo_matrix
from scipy.sparse.csgraph import breadth_first_order, connected_components

Arc = tuple[int, int]


@dataclass
class ForcingStep:
    """One arc of a forcing chain; ``because`` is the unordered pair that forces it from the
    previous arc (``None`` for the first arc)."""

    arc: Arc
    because: Arc | None


@dataclass
class ForcingResult:
    """Outcome of the forcing algorithm on a graph given as adjacency sets."""

    n: int
    orientable: bool
    lo: np.ndarray  # lo[e] < hi[e]: the endpoints of edge e
    hi: np.ndarray
    up: np.ndarray | None  # up[e] True: edge e oriented lo→hi
    num_classes: int  # implication classes (each counted with its reverse as one colour class)
    chain: list[ForcingStep] | None  # conflict certificate when not orientable

    def arcs(self):
        """The arcs of the transitive orientation (orientable graphs only)."""
        assert self.up is not None
        lo, hi, up = self.lo.tolist(), self.hi.tolist(), self.up.tolist()
        for a, b, u in zip(lo, hi, up):
            yield (a, b) if u else (b, a)

    def successor_sets(self) -> list[set[int]]:
        """The orientation as successor sets (a transitive orientation is its own closure)."""
        succ: list[set[int]] = [set() for _ in range(self.n)]
        for a, b in self.arcs():
            succ[a].add(b)
        return succ


def _edge_ids(adj: list[set[int]]):
    n = len(adj)
    lo: list[int] = []
    hi: list[int] = []
    for v in range(n):
        for u in adj[v]:
            if v < u:
                lo.append(v)
                hi.append(u)
    eid = {a * n + b: k for k, (a, b) in enumerate(zip(lo, hi))}
    return lo, hi, eid


def _gamma_steps(adj: list[set[int]], eid: dict[int, int]):
    """Spanning Γ steps: for each item v, a spanning forest of the complement of G[N(v)].

    Yields three parallel lists (e1, e2, flip): edges e1 = {v, y} and e2 = {v, x} with x, y
    non-adjacent; ``flip`` is True when "same direction at v" means opposite lo→hi senses.
    """
    n = len(adj)
    e1: list[int] = []
    e2: list[int] = []
    flip: list[bool] = []
    for v in range(n):
        nb = adj[v]
        if len(nb) < 2:
            continue
        unvisited = set(nb)
        while unvisited:
            queue = [unvisited.pop()]
            for y in queue:
                found = unvisited - adj[y]
                if not found:
                    continue
                unvisited -= found
                queue.extend(found)
                ey = eid[v * n + y] if v < y else eid[y * n + v]
                vy = v < y
                for x in found:
                    e1.append(ey)
                    e2.append(eid[v * n + x] if v < x else eid[x * n + v])
                    flip.append(vy != (v < x))
    return e1, e2, flip


def transitive_orientation(adj: list[set[int]]) -> ForcingResult:
    """Decide whether the graph ``adj`` is a comparability graph; orient it or certify why not.

    ``adj[v]`` is the set of neighbours of ``v``; the graph is simple and undirected.
    Returns a :class:`ForcingResult` with the orientation (``up``) or a forcing ``chain``.
    """
    n = len(adj)
    lo_l, hi_l, eid = _edge_ids(adj)
    m = len(lo_l)
    lo = np.asarray(lo_l, dtype=np.int64)
    hi = np.asarray(hi_l, dtype=np.int64)
    if m == 0:
        return ForcingResult(n, True, lo, hi, np.zeros(0, dtype=bool), 0, None)
    e1_l, e2_l, flip_l = _gamma_steps(adj, eid)
    e1 = np.asarray(e1_l, dtype=np.int64)
    e2 = np.asarray(e2_l, dtype=np.int64)
    fl = np.asarray(flip_l, dtype=np.int64)
    del e1_l, e2_l, flip_l
    # node 2e+0: edge e oriented lo→hi; node 2e+1: hi→lo
    src = np.concatenate([2 * e1, 2 * e1 + 1])
    dst = np.concatenate([2 * e2 + fl, 2 * e2 + 1 - fl])
    graph = coo_matrix(
        (np.ones(len(src), dtype=np.int8), (src, dst)), shape=(2 * m, 2 * m)
    ).tocsr()
    ncomp, comp = connected_components(graph, directed=False)
    c0 = comp[0::2]
    c1 = comp[1::2]
    bad = np.flatnonzero(c0 == c1)
    if len(bad):
        chain = _conflict_chain(graph, int(bad[0]), lo, hi)
        return ForcingResult(n, False, lo, hi, None, ncomp // 2, chain)
    # orient each class: keep the direction whose smallest tail < smallest head
    big = np.iinfo(np.int64).max
    mintail = np.full(ncomp, big, dtype=np.int64)
    minhead = np.full(ncomp, big, dtype=np.int64)
    np.minimum.at(mintail, c0, lo)
    np.minimum.at(minhead, c0, hi)
    np.minimum.at(mintail, c1, hi)
    np.minimum.at(minhead, c1, lo)
    k0 = mintail[c0]
    h0 = minhead[c0]
    up = (k0 < h0) | ((k0 == h0) & (c0 < c1))
    return ForcingResult(n, True, lo, hi, up, ncomp // 2, None)


def _conflict_chain(graph, e: int, lo: np.ndarray, hi: np.ndarray) -> list[ForcingStep]:
    """Shortest chain of Γ steps from arc lo[e]→hi[e] to its reverse, with witnesses."""
    _, pred = breadth_first_order(graph, 2 * e, directed=False, return_predecessors=True)
    path = [2 * e + 1]
    while path[-1] != 2 * e:
        path.append(int(pred[path[-1]]))
    path.reverse()

    def arc(node: int) -> Arc:
        k = node // 2
        a, b = int(lo[k]), int(hi[k])
        return (a, b) if node % 2 == 0 else (b, a)

    steps = [ForcingStep(arc(path[0]), None)]
    for node in path[1:]:
        (a, b), (c, d) = steps[-1].arc, arc(node)
        witness = (b, d) if a == c else (a, c)
        steps.append(ForcingStep((c, d), witness))
    return steps
