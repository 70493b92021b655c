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
* Graphs with fewer than :data:`KERNELS_FROM` edges take a pure-Python path (lists, no numpy
  nor numba: milliseconds at that size, where loading those libraries costs far more); it
  computes the same ties, classes and orientation, and hands a conflict to the array path,
  which finds the chain.
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
from typing import TYPE_CHECKING, Any

from satorder.jit import HAVE_NUMBA
from satorder.model.problem import pair_count

if TYPE_CHECKING:  # numpy is imported where arrays are made: small graphs never load it
    import numpy as np

Arc = tuple[int, int]
CHAIN_TRIES = 8  # conflicting edges tried as chain starts; the shortest chain is kept
# below this many comparable pairs the pure-Python twins of the kernels run: they take
# milliseconds there, while loading numba and its compiled kernels takes about a second
KERNELS_FROM = 20_000


def use_kernels(pairs: int) -> bool:
    """Whether the compiled kernels pay off for a graph with ``pairs`` edges (numba present and
    the graph at least :data:`KERNELS_FROM` edges); small problems never load numba."""
    return HAVE_NUMBA and pairs >= KERNELS_FROM


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
    lo: Any  # lo[e] < hi[e]: the endpoints of edge e (numpy arrays, or lists on small graphs)
    hi: Any
    up: Any  # up[e] True: edge e oriented lo→hi; None when not orientable
    num_classes: int  # implication classes (each counted with its reverse as one colour class)
    chain: list[ForcingStep] | None  # conflict certificate when not orientable
    succ: Any = None  # the orientation as compact successor sets (CsrSets), when computed
    # colour[e]: the colour class of edge e (an implication class together with its reverse),
    # when orientable; flipping whole colour classes is how other orientations are reached
    colour: Any = None

    def arcs(self):
        """The arcs of the transitive orientation (orientable graphs only)."""
        assert self.orientable
        if self.succ is not None and getattr(self.succ, "is_compact", False):
            import numpy as np  # compact result: the arcs are the successor rows

            ptr, idx = self.succ.csr()
            tails = np.repeat(np.arange(self.n), np.diff(ptr)).tolist()
            yield from zip(tails, idx.tolist())
            return
        if self.succ is not None:
            for a, above in enumerate(self.succ):
                for b in above:
                    yield (a, b)
            return
        lo, hi, up = (x.tolist() if hasattr(x, "tolist") else x
                      for x in (self.lo, self.hi, self.up))
        for a, b, u in zip(lo, hi, up):
            yield (a, b) if u else (b, a)

    def successor_sets(self):
        """The orientation as successor sets (a transitive orientation is its own closure): a
        list of sets on small graphs, else a compact
        :class:`~satorder.model.adjacency.CsrSets` that acts as one."""
        assert self.orientable
        if self.succ is not None:
            return self.succ
        if isinstance(self.up, list):
            succ: list[set[int]] = [set() for _ in range(self.n)]
            for a, b in self.arcs():
                succ[a].add(b)
            return succ
        import numpy as np

        from satorder.model.adjacency import CsrSets

        tails = np.where(self.up, self.lo, self.hi)
        heads = np.where(self.up, self.hi, self.lo)
        self.succ = CsrSets.from_arcs(self.n, tails, heads)
        return self.succ


def _edge_arrays(adj: list[set[int]]):
    """Endpoints ``lo < hi`` of every edge, sorted by the key ``lo * n + hi`` (the edge id is
    the rank of its key, found with ``searchsorted``: no per-pair dictionary)."""
    import numpy as np

    from satorder.model.adjacency import csr_arrays

    indptr, indices = csr_arrays(adj)
    n = len(indptr) - 1
    src = np.repeat(np.arange(n, dtype=np.int64), np.diff(indptr))
    dst = indices.astype(np.int64)
    keep = src < dst
    key = src[keep] * n + dst[keep]  # rows are sorted, so the keys are too
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
    pair, or only the pairs of ``unordered``).  Compiled kernel when numba is available and
    the graph is large enough (:func:`use_kernels`), unless ``compiled`` says otherwise."""
    import numpy as np

    if compiled is None:
        compiled = use_kernels(pair_count(adj))
    if compiled:
        from satorder.graph import kernels as _kernels

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
    import numpy as np

    n = len(adj)
    lo, hi, keys = _edge_arrays(adj)
    vs, ys, xs = gamma_steps(adj, unordered)
    e1 = np.searchsorted(keys, np.minimum(vs, ys) * n + np.maximum(vs, ys))
    e2 = np.searchsorted(keys, np.minimum(vs, xs) * n + np.maximum(vs, xs))
    fl = ((vs < ys) != (vs < xs)).astype(np.int64)
    return lo, hi, keys, e1, e2, fl


def transitive_orientation(adj: list[set[int]], colours: bool = False) -> ForcingResult:
    """Decide whether the graph ``adj`` is a comparability graph; orient it or certify why not.

    ``adj[v]`` is the set of neighbours of ``v``; the graph is simple and undirected.
    Returns a :class:`ForcingResult` with the orientation (``up``) or a forcing ``chain``;
    with ``colours``, an orientable result is given as edge arrays with the colour class of
    every edge (``lo``, ``hi``, ``up``, ``colour``: what :mod:`satorder.graph.constrained`
    needs to flip whole classes), at the cost of the tie arrays on large graphs.
    """
    n = len(adj)
    pairs = pair_count(adj)
    if pairs < KERNELS_FROM and not colours:
        res = _orient_small(adj)
        if res is not None:
            return res
    import numpy as np

    from satorder.model.adjacency import CsrSets, csr_arrays

    if use_kernels(pairs) and not colours:  # classes and orientation in one compiled pass
        from satorder.graph import kernels as _kernels

        ok, classes, sptr, sidx = _kernels.orient_classes(*csr_arrays(adj))
        if ok:
            return ForcingResult(n, True, None, None, None, classes, None, CsrSets(sptr, sidx))
        del sptr, sidx  # not orientable: the tie arrays below give the chain
    lo, hi, keys, e1, e2, fl = implication_ties(adj)
    m = len(lo)
    if m == 0:
        return ForcingResult(n, True, lo, hi, np.zeros(0, dtype=bool), 0, None,
                             colour=np.zeros(0, dtype=np.int64))
    # node 2e+0: edge e oriented lo→hi; node 2e+1: hi→lo
    ncomp, comp = tie_components(m, e1, e2, fl)
    c0 = comp[0::2]
    c1 = comp[1::2]
    bad = np.flatnonzero(c0 == c1)
    if len(bad):
        # short certificates: try the conflicting edges whose ends have the fewest neighbours
        # (a planted odd hole's own edges rather than the big class it may be joined to)
        deg = np.diff(csr_arrays(adj)[0])
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
    return ForcingResult(n, True, lo, hi, up, ncomp // 2, None, colour=np.minimum(c0, c1))


def tie_components(m: int, e1: np.ndarray, e2: np.ndarray, fl: np.ndarray):
    """Components of the doubled tie graph (node ``2e`` edge e as lo→hi, ``2e+1`` its
    reverse): ``(count, label of each node)``.  Compiled union-find on large graphs, its
    pure-Python twin on small ones, scipy on large graphs without numba."""
    import numpy as np

    if use_kernels(m):
        from satorder.graph import kernels as _kernels

        return _kernels.doubled_components(m, e1, e2, fl)
    if m < KERNELS_FROM:
        count, comp = _doubled_components_py(m, e1.tolist(), e2.tolist(), fl.tolist())
        return count, np.asarray(comp, dtype=np.int64)
    from scipy.sparse.csgraph import connected_components

    return connected_components(tie_graph(m, e1, e2, fl), directed=False)



def _doubled_components_py(m: int, e1: list[int], e2: list[int], flip: list[int]):
    """Pure-Python twin of :func:`satorder.graph.kernels.doubled_components` (the tests
    compare the two): union-find with path halving, labels 0..k-1 in order of first node."""
    parent = list(range(2 * m))

    def find(x: int) -> int:
        while parent[x] != x:
            parent[x] = parent[parent[x]]
            x = parent[x]
        return x

    for i, j, f in zip(e1, e2, flip):
        for a, b in ((2 * i, 2 * j + f), (2 * i + 1, 2 * j + 1 - f)):
            ra, rb = find(a), find(b)
            if ra != rb:
                parent[max(ra, rb)] = min(ra, rb)
    label: dict[int, int] = {}
    comp = [label.setdefault(find(x), len(label)) for x in range(2 * m)]
    return len(label), comp


def _orient_small(adj: list[set[int]]) -> ForcingResult | None:
    """The forcing algorithm on plain lists, for small graphs: the same edges (sorted by
    ``lo * n + hi``), Γ ties, classes and orientation rule as the array path, so the same
    answer; ``None`` on a conflict (the array path then finds the chain)."""
    n = len(adj)
    lo: list[int] = []
    hi: list[int] = []
    for a, nb in enumerate(adj):
        for b in sorted(nb):
            if a < b:
                lo.append(a)
                hi.append(b)
    m = len(lo)
    eid = {a * n + b: k for k, (a, b) in enumerate(zip(lo, hi))}
    vs, ys, xs = _co_components_py(adj)
    e1 = [eid[min(v, y) * n + max(v, y)] for v, y in zip(vs, ys)]
    e2 = [eid[min(v, x) * n + max(v, x)] for v, x in zip(vs, xs)]
    fl = [int((v < y) != (v < x)) for v, y, x in zip(vs, ys, xs)]
    count, comp = _doubled_components_py(m, e1, e2, fl)
    c0, c1 = comp[0::2], comp[1::2]
    if any(p == q for p, q in zip(c0, c1)):
        return None
    big = n + 1
    mintail, minhead = [big] * count, [big] * count
    for a, b, p, q in zip(lo, hi, c0, c1):
        mintail[p], minhead[p] = min(mintail[p], a), min(minhead[p], b)
        mintail[q], minhead[q] = min(mintail[q], b), min(minhead[q], a)
    up = [mintail[p] < minhead[p] or (mintail[p] == minhead[p] and p < q)
          for p, q in zip(c0, c1)]
    return ForcingResult(n, True, lo, hi, up, count // 2, None)


def tie_graph(m: int, e1: np.ndarray, e2: np.ndarray, fl: np.ndarray):
    """The doubled tie graph as a scipy sparse matrix (2m nodes)."""
    import numpy as np
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

    return shortcut_chain(adj, [arc(node) for node in path])


def shortcut_chain(adj, arcs: list[Arc]) -> list[ForcingStep]:
    """Forcing steps along ``arcs`` (each Γ-forced by the one before it), shortcut to the
    farthest later arc forced directly: a spanning forest of ties can make detours that the
    Γ relation itself does not need."""
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
