"""The forcing algorithm: Γ relation, implication classes and a transitive orientation.

Method (Golumbic, *Algorithmic Graph Theory and Perfect Graphs*, 1980, ch. 5; Gallai 1967):
two arcs ``a→b`` and ``a'→b'`` of a graph are in the relation Γ when they share their tail
(``a = a'``) or their head (``b = b'``) and their other ends are *not* adjacent.  In any
transitive orientation, Γ-related arcs are oriented alike, so the reflexive-transitive closure of
Γ splits the arcs into *implication classes*.  A graph is a comparability graph exactly when no
implication class contains an arc together with its reverse (Gallai 1967; Golumbic 1980, ch. 5,
the theorem behind the TRO algorithm, which we recall from memory as Theorem 5.4: G is a
comparability graph iff A ∩ A⁻¹ = ∅ for every implication class A).

How it is computed here (near-linear work in practice):

* Around each item ``v``, arcs ``v→x`` and ``v→y`` are tied by Γ (directly or through other
  arcs at ``v``) exactly when ``x`` and ``y`` lie in the same connected component of the
  *complement* of the neighbourhood ``G[N(v)]``.  A breadth-first search in that complement
  (compiled; work per centre is the sum of its neighbours' degrees, not the square of its own)
  gives a spanning forest of each co-component; each forest edge ``{y, x}`` is one Γ step.
* Each undirected edge ``e`` gets two nodes, one per direction; a Γ step links the matching
  directions.  Connected components of this doubled graph (scipy) are the implication classes.
  An edge whose two directions fall in one component is a *conflict*: a breadth-first path
  between them (each tie is a single Γ step, from a spanning forest of the co-components),
  shortcut wherever an arc forces a later one directly, is a chain of forcing steps from an arc
  to its own reverse, each step naming its witness pair (a pair that must stay unordered) —
  the conflict certificate.
* Without conflict, each class is oriented by a consistent rule: keep the class whose smallest
  tail item is smaller than its smallest head item.  By Gallai's modular decomposition theorem
  the classes are the pairs of children of series nodes (where this rule orders the children
  linearly by their smallest item) and the edge sets of prime nodes (where either orientation
  works), so the result is a transitive orientation.  The caller checks it independently
  (:mod:`satorder.certify`) anyway.

>>> from satorder.model.problem import Problem
>>> res = transitive_orientation(Problem.from_lists(comparable=[("a", "b"), ("b", "c")]).adj)
>>> res.orientable, sorted(res.arcs())
(True, [(0, 1), (2, 1)])
"""

from __future__ import annotations

from dataclasses import dataclass
from itertools import chain

import numpy as np

from satorder.graph import kernels as _kernels

Arc = tuple[int, int]
CHAIN_TRIES = 8  # conflicting edges tried as chain starts; the shortest chain is kept


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
    # colour[e]: the colour class of edge e (an implication class together with its reverse),
    # when orientable; flipping whole colour classes is how other orientations are reached
    colour: np.ndarray | None = None

    def arcs(self):
        """The arcs of the transitive orientation (orientable graphs only)."""
        assert self.up is not None
        lo, hi, up = self.lo.tolist(), self.hi.tolist(), self.up.tolist()
        for a, b, u in zip(lo, hi, up):
            yield (a, b) if u else (b, a)

    def successor_sets(self) -> list[set[int]]:
        """The orientation as successor sets (a transitive orientation is its own closure)."""
        assert self.up is not None
        tails = np.where(self.up, self.lo, self.hi)
        heads = np.where(self.up, self.hi, self.lo)
        order = np.argsort(tails, kind="stable")
        heads_l = heads[order].tolist()
        ends = np.cumsum(np.bincount(tails, minlength=self.n)).tolist()
        starts = [0] + ends[:-1]
        return [set(heads_l[s:e]) for s, e in zip(starts, ends)]


def _edge_arrays(adj: list[set[int]]):
    """Endpoints ``lo < hi`` of every edge, sorted by the key ``lo * n + hi`` (the edge id is
    the rank of its key, found with ``searchsorted``: no per-pair dictionary)."""
    n = len(adj)
    deg = np.fromiter((len(s) for s in adj), dtype=np.int64, count=n)
    src = np.repeat(np.arange(n, dtype=np.int64), deg)
    dst = np.fromiter(chain.from_iterable(adj), dtype=np.int64, count=int(deg.sum()))
    keep = src < dst
    key = src[keep] * n + dst[keep]
    key.sort()
    return key // n, key % n, key


def _co_components_py(adj: list[set[int]], unordered: list[set[int]] | None = None):
    """For each item v, a spanning forest of the pairs of neighbours that must stay unordered
    (non-neighbours, or the pairs listed in ``unordered``): breadth-first search in that
    relation restricted to ``N(v)``.  Yields flat lists (centre v, parent y, member x): the
    pair {y, x} must stay unordered, so arcs at v of edges {v, y} and {v, x} are Γ-related.
    """
    vs: list[int] = []
    ys: list[int] = []
    xs: list[int] = []
    for v, nb in enumerate(adj):
        if len(nb) < 2:
            continue
        unvisited = set(nb)
        while unvisited:
            queue = [unvisited.pop()]
            for y in queue:
                found = unvisited - adj[y] if unordered is None else unvisited & unordered[y]
                if found:
                    unvisited -= found
                    queue += found
                    k = len(found)
                    vs += [v] * k
                    ys += [y] * k
                    xs += found
                    if not unvisited:
                        break
    return vs, ys, xs


def gamma_steps(adj: list[set[int]], unordered: list[set[int]] | None = None,
                compiled: bool | None = None):
    """Arrays (v, y, x), one row per spanning Γ step around each item v: arcs at v of edges
    {v, y} and {v, x} are oriented alike because {y, x} must stay unordered (every non-adjacent
    pair, or only the pairs of ``unordered``).  Compiled kernel when numba is available."""
    if compiled is None:
        compiled = _kernels.HAVE_NUMBA
    if compiled:
        indptr, indices = _kernels.csr(adj)
        if unordered is None:
            uptr, uidx = indptr[:1], indices[:0]
        else:
            uptr, uidx = _kernels.csr(unordered)
        return _kernels.co_component_ties(indptr, indices, uptr, uidx, unordered is not None)
    vs, ys, xs = _co_components_py(adj, unordered)
    return (np.asarray(vs, dtype=np.int64), np.asarray(ys, dtype=np.int64),
            np.asarray(xs, dtype=np.int64))


def implication_ties(adj: list[set[int]], unordered: list[set[int]] | None = None):
    """Edges and Γ ties in array form: ``lo, hi, keys`` (edge e joins lo[e] < hi[e], sorted by
    ``keys = lo * n + hi``) and ``e1, e2, flip`` (edges e1 and e2 tied; ``flip`` when "alike"
    means opposite lo→hi senses).  The tie graph's components are the implication classes."""
    n = len(adj)
    lo, hi, keys = _edge_arrays(adj)
    vs, ys, xs = gamma_steps(adj, unordered)
    e1 = np.searchsorted(keys, np.minimum(vs, ys) * n + np.maximum(vs, ys))
    e2 = np.searchsorted(keys, np.minimum(vs, xs) * n + np.maximum(vs, xs))
    fl = ((vs < ys) != (vs < xs)).astype(np.int64)
    return lo, hi, keys, e1, e2, fl


def transitive_orientation(adj: list[set[int]]) -> ForcingResult:
    """Decide whether the graph ``adj`` is a comparability graph; orient it or certify why not.

    ``adj[v]`` is the set of neighbours of ``v``; the graph is simple and undirected.
    Returns a :class:`ForcingResult` with the orientation (``up``) or a forcing ``chain``.
    """
    n = len(adj)
    lo, hi, keys, e1, e2, fl = implication_ties(adj)
    m = len(lo)
    if m == 0:
        return ForcingResult(n, True, lo, hi, np.zeros(0, dtype=bool), 0, None,
                             np.zeros(0, dtype=np.int64))
    # node 2e+0: edge e oriented lo→hi; node 2e+1: hi→lo
    ncomp, comp = _components(m, e1, e2, fl)
    c0 = comp[0::2]
    c1 = comp[1::2]
    bad = np.flatnonzero(c0 == c1)
    if len(bad):
        # short certificates: try the conflicting edges whose ends have the fewest neighbours
        # (a planted odd hole's own edges rather than the big class it may be joined to)
        deg = np.fromiter((len(s) for s in adj), dtype=np.int64, count=n)
        picks = bad[np.argsort(deg[lo[bad]] + deg[hi[bad]], kind="stable")[:CHAIN_TRIES]]
        graph = tie_graph(m, e1, e2, fl)
        chain = min((_conflict_chain(adj, graph, int(e), lo, hi) for e in picks),
                    key=lambda c: (len(c), len({i for s in c for i in s.arc})))
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
    return ForcingResult(n, True, lo, hi, up, ncomp // 2, None, np.minimum(c0, c1))


def _components(m: int, e1: np.ndarray, e2: np.ndarray, fl: np.ndarray):
    """Components of the doubled tie graph: compiled union-find, or scipy without numba."""
    if _kernels.HAVE_NUMBA:
        return _kernels.doubled_components(m, e1, e2, fl)
    from scipy.sparse.csgraph import connected_components

    return connected_components(tie_graph(m, e1, e2, fl), directed=False)


def tie_graph(m: int, e1: np.ndarray, e2: np.ndarray, fl: np.ndarray):
    """The doubled tie graph as a scipy sparse matrix (2m nodes)."""
    from scipy.sparse import coo_matrix

    src = np.concatenate([2 * e1, 2 * e1 + 1])
    dst = np.concatenate([2 * e2 + fl, 2 * e2 + 1 - fl])
    return coo_matrix(
        (np.ones(len(src), dtype=np.int8), (src, dst)), shape=(2 * m, 2 * m)
    ).tocsr()


def _gamma_witness(adj: list[set[int]], first: Arc, second: Arc) -> Arc | None:
    """The pair that must stay unordered when ``first`` Γ-forces ``second``, else ``None``."""
    (a, b), (c, d) = first, second
    if a == c and b != d and d not in adj[b]:
        return (b, d)
    if b == d and a != c and c not in adj[a]:
        return (a, c)
    return None


def _conflict_chain(adj, graph, e: int, lo: np.ndarray, hi: np.ndarray) -> list[ForcingStep]:
    """A short chain of Γ steps from arc lo[e]→hi[e] to its reverse, each with its witness
    pair: a breadth-first path in the tie graph, then shortcut."""
    from scipy.sparse.csgraph import breadth_first_order

    _, pred = breadth_first_order(graph, 2 * e, directed=False, return_predecessors=True)
    path = [2 * e + 1]
    while path[-1] != 2 * e:
        path.append(int(pred[path[-1]]))
    path.reverse()

    def arc(node: int) -> Arc:
        k = node // 2
        a, b = int(lo[k]), int(hi[k])
        return (a, b) if node % 2 == 0 else (b, a)

    # every tie is a single Γ step; shortcut to the farthest later arc forced directly, since
    # a spanning forest of ties can make detours that the Γ relation itself does not need
    arcs = [arc(node) for node in path]
    steps = [ForcingStep(arcs[0], None)]
    i = 0
    while i < len(arcs) - 1:
        for j in range(len(arcs) - 1, i, -1):
            witness = _gamma_witness(adj, arcs[i], arcs[j])
            if witness is not None:
                break
        steps.append(ForcingStep(arcs[j], witness))
        i = j
    return steps
