"""Plain problems with fixed and forbidden arcs, decided through the modular decomposition.

A problem without open pairs and without preferences asks for a transitive orientation of its
comparability graph G that contains every *required arc* (fixed arcs, and forbidden arcs turned
round on comparable pairs; :mod:`satorder.graph.arcs`).  By Gallai's theorem (Gallai 1967;
Golumbic, *Algorithmic Graph Theory and Perfect Graphs*, 1980, ch. 5) the transitive
orientations are exactly the independent choices, one per node of the modular decomposition, of
a linear order of a series node's children and of one of the two orientations of a prime node's
quotient; the edges between two children of a series node, and the edges between the children
of a prime node, are each one *colour class* (an implication class with its reverse).  So:

1. The forcing algorithm (:mod:`satorder.graph.forcing`) gives one transitive orientation T0 and
   the colour class of every edge.
2. Only the connected components holding a required arc matter: they are decomposed
   (:mod:`satorder.graph.modular`), and each arc is placed at the node where its two items
   separate (:func:`satorder.graph.arcs.place_arcs`).
3. A *prime* node's arcs must all agree with T0 there, or all disagree (then its colour class is
   flipped).  An arc that agrees and one that disagrees clash: Γ forces the reverse of the second
   from the first.  The certificate is that forcing chain, found on a small induced subgraph (one
   item per child of the node, so every Γ step there is one of G).
4. A *series* node's arcs are a precedence problem among its children: a topological order (ties
   broken by T0's order of the children, so unconstrained children keep their place) gives the
   new order, and each pair of children that changed sides has its colour class flipped.  A
   cycle of children clashes: each arc ``a_s < b_s`` carries, by Γ steps inside a child along
   a path of pairs that must stay unordered (the child's complement is connected), to
   ``b_(s-1) < b_s``, and these close a cycle, which transitivity forbids.
5. The new orientation is T0 with the chosen colour classes flipped: a transitive orientation
   by the theorem, containing every required arc.  The caller checks it independently
   (:func:`satorder.certify.order.check_order`).

A clash is reported as a *core*: the requirements behind the arcs involved, plus the comparable
pairs and the pairs that must stay unordered of the forcing steps — a set of requirements that
admits no order on its own, which :func:`satorder.certify.core.check_core_infeasible` re-checks.

>>> from satorder.model.problem import Problem
>>> from satorder.graph.forcing import transitive_orientation
>>> p = Problem.from_lists(comparable=[("a", "b"), ("b", "c")], fixed=[("a", "b"), ("c", "b")])
>>> out = orient_with_arcs(p, transitive_orientation(p.adj))
>>> out.feasible, out.stats["constrained_nodes"]
(True, 1)
>>> q = Problem.from_lists(comparable=[("a", "b"), ("b", "c")], fixed=[("a", "b"), ("b", "c")])
>>> bad = orient_with_arcs(q, transitive_orientation(q.adj))
>>> bad.feasible, sorted((r.kind.value, q.names(r.pair)) for r in bad.core)
(False, [('fixed', ['a', 'b']), ('fixed', ['b', 'c']), ('incomparable', ['a', 'c'])])
"""

from __future__ import annotations

import heapq
from dataclasses import dataclass, field

import numpy as np

from satorder.graph.arcs import arc_requirements, place_arcs
from satorder.graph.forcing import (
    ForcingResult,
    ForcingStep,
    implication_ties,
    shortcut_chain,
    tie_graph,
)
from satorder.graph.modular import PRIME, SERIES, modular_decomposition
from satorder.model.problem import Problem
from satorder.model.requirement import Kind, Requirement

Arc = tuple[int, int]
PRIME_TRIES = 4  # clashing arc pairs tried at a prime node; the smallest certificate is kept


@dataclass
class ArcOrientation:
    """Outcome of :func:`orient_with_arcs`: the orientation ``up`` of the forcing result's edges
    (``up[e]``: edge e runs lo→hi) when every required arc fits, else a ``core``."""

    up: np.ndarray | None
    core: list[Requirement] = field(default_factory=list)
    clash: str = ""  # "prime", "series" or "unordered" when infeasible
    stats: dict = field(default_factory=dict)

    @property
    def feasible(self) -> bool:
        return self.up is not None


def orient_with_arcs(problem: Problem, res: ForcingResult) -> ArcOrientation:
    """A transitive orientation of ``problem.adj`` containing every required arc of ``problem``
    (see the module docstring), or a core of requirements showing that none exists.

    ``res`` is the forcing algorithm's (orientable) result on ``problem.adj``; ``problem``
    must have no open pairs (``incomparable`` is None)."""
    assert res.orientable
    if res.colour is None:  # a result without edge colours (small or one-pass path): redo
        from satorder.graph.forcing import transitive_orientation

        res = transitive_orientation(problem.adj, colours=True)
    n = problem.n
    required = arc_requirements(problem)
    for (a, b), why in required:
        if b not in problem.adj[a]:  # a fixed arc on a pair that must stay unordered
            return ArcOrientation(None, why + [Requirement(Kind.INCOMPARABLE, (a, b))],
                                  "unordered")
    if not required:
        return ArcOrientation(res.up.copy())
    ctx = _Context(problem, res)
    items = _components_of(problem.adj, {v for (a, b), _ in required for v in (a, b)})
    if len(items) == n:
        sub, ids = problem.adj, None
    else:
        pos = {v: i for i, v in enumerate(items)}
        sub = [{pos[u] for u in problem.adj[v]} for v in items]
        ids = items
    tree = modular_decomposition(sub)
    local = [((a, b) if ids is None else (pos[a], pos[b])) for (a, b), _ in required]
    placed = place_arcs(tree, local, len(sub))
    flip = np.zeros(int(res.colour.max()) + 1 if len(res.colour) else 0, dtype=bool)
    stats = {"required_arcs": len(required), "decomposed_items": len(sub),
             "constrained_nodes": len(placed), "flipped_classes": 0}
    for node in tree.nodes():
        found = placed.get(id(node))
        if not found:
            continue
        if node.kind == PRIME:
            core = ctx.prime(node, found, required, ids, flip)
        elif node.kind == SERIES:
            reps = [c.representative if ids is None else ids[c.representative]
                    for c in node.children]
            core = ctx.series(node, found, required, reps, ids, flip)
        else:  # pragma: no cover - an arc joins adjacent items, never split at a parallel node
            raise AssertionError("an arc placed at a parallel node")
        if core is not None:
            return ArcOrientation(None, core, node.kind, stats)
    stats["flipped_classes"] = int(flip.sum())
    up = res.up ^ flip[res.colour] if flip.any() else res.up.copy()
    return ArcOrientation(up, stats=stats)


def _components_of(adj: list[set[int]], starts: set[int]) -> list[int]:
    """The items of the connected components holding ``starts``, ascending."""
    seen = set(starts)
    todo = list(starts)
    while todo:
        v = todo.pop()
        new = adj[v] - seen
        if new:
            seen |= new
            todo.extend(new)
    return sorted(seen)


class _Context:
    """T0 look-ups and certificate building shared by the node handlers."""

    def __init__(self, problem: Problem, res: ForcingResult):
        self.problem = problem
        self.res = res
        n = max(problem.n, 1)
        self.n = n
        self.keys = res.lo * n + res.hi  # sorted: the forcing result's edge order
        self.fixed = set(problem.fixed)
        self.local: dict[int, int] | None = None  # item → id in the decomposed subgraph

    def edges(self, xs, ys) -> np.ndarray:
        xs = np.asarray(xs, dtype=np.int64)
        ys = np.asarray(ys, dtype=np.int64)
        return np.searchsorted(self.keys, np.minimum(xs, ys) * self.n + np.maximum(xs, ys))

    def t0_before(self, xs, ys) -> np.ndarray:
        """For each pair (x, y) (adjacent items): does T0 put x before y?"""
        xs = np.asarray(xs, dtype=np.int64)
        ys = np.asarray(ys, dtype=np.int64)
        return self.res.up[self.edges(xs, ys)] == (xs < ys)

    # ------------------------------------------------------------------ requirements
    def pair(self, a: int, b: int) -> Requirement:
        """The requirement that makes {a, b} comparable: its fixed arc if it has one."""
        if (a, b) in self.fixed:
            return Requirement(Kind.FIXED, (a, b))
        if (b, a) in self.fixed:
            return Requirement(Kind.FIXED, (b, a))
        return Requirement(Kind.COMPARABLE, (a, b))

    def chain_requirements(self, steps: list[ForcingStep]) -> list[Requirement]:
        out = [self.pair(*s.arc) for s in steps]
        out += [Requirement(Kind.INCOMPARABLE, s.because) for s in steps if s.because]
        return out

    # ------------------------------------------------------------------ prime nodes
    def prime(self, node, found, required, ids, flip) -> list[Requirement] | None:
        arcs = [(required[k][0], i, j, k) for i, j, k in found]
        agree = self.t0_before([t[0][0] for t in arcs], [t[0][1] for t in arcs])
        if agree.all():
            return None
        if not agree.any():
            a, b = arcs[0][0]
            flip[self.res.colour[self.edges([a], [b])[0]]] = True
            return None
        yes = [t for t, ok in zip(arcs, agree) if ok]
        no = [t for t, ok in zip(arcs, agree) if not ok]
        best = None
        for f, g in list(zip(yes, no))[:PRIME_TRIES]:
            core = self._prime_clash(node, f, g, required, ids)
            if best is None or len(core) < len(best):
                best = core
        return best

    def _prime_clash(self, node, f, g, required, ids) -> list[Requirement]:
        """Arc f agrees with T0 at this prime node, arc g does not: a forcing chain from f to
        the reverse of g in the graph induced by one item per child (f's and g's items kept)."""
        (a, b), ia, ib, kf = f
        (c, d), ic, id_, kg = g
        glob = (lambda x: x) if ids is None else ids.__getitem__
        chosen: dict[int, int] = {}
        extra: list[int] = []
        if ids is not None and self.local is None:
            self.local = {v: i for i, v in enumerate(ids)}
        for x, ix in ((a, ia), (b, ib), (c, ic), (d, id_)):
            lx = x if ids is None else self.local[x]
            if ix not in chosen:
                chosen[ix] = lx
            elif chosen[ix] != lx and lx not in extra:
                extra.append(lx)
        picked = [chosen.get(i, child.representative) for i, child in enumerate(node.children)]
        picked += extra
        items = [glob(x) for x in picked]
        steps = gamma_path(self.problem.adj, items, (a, b), (d, c))
        if steps is None:  # pragma: no cover - Gallai: the node's inter-child edges are one class
            steps = gamma_path(self.problem.adj, sorted(glob(x) for x in node.items), (a, b),
                               (d, c))
        assert steps is not None, "arcs of one colour class with no forcing chain between them"
        core = list(required[kf][1]) + list(required[kg][1]) + self.chain_requirements(steps)
        return list(dict.fromkeys(core))

    # ------------------------------------------------------------------ series nodes
    def series(self, node, found, required, reps, ids, flip) -> list[Requirement] | None:
        k = len(reps)
        after: dict[int, list[tuple[int, int]]] = {}  # child → [(later child, arc index)]
        indeg = [0] * k
        for i, j, a in found:
            after.setdefault(i, []).append((j, a))
            indeg[j] += 1
        iu, ju = np.triu_indices(k, 1)
        reps_a = np.asarray(reps, dtype=np.int64)
        before = self.t0_before(reps_a[iu], reps_a[ju])  # T0: child iu before child ju
        rank = np.zeros(k, dtype=np.int64)  # children below each child in T0
        np.add.at(rank, ju, before)
        np.add.at(rank, iu, ~before)
        heap = [(int(rank[c]), c) for c in range(k) if indeg[c] == 0]
        heapq.heapify(heap)
        newpos = np.full(k, -1, dtype=np.int64)
        t = 0
        while heap:
            _, c = heapq.heappop(heap)
            newpos[c] = t
            t += 1
            for j, _ in after.get(c, ()):
                indeg[j] -= 1
                if indeg[j] == 0:
                    heapq.heappush(heap, (int(rank[j]), j))
        if t < k:
            cycle = _shortest_cycle(after, [c for c in range(k) if newpos[c] < 0])
            return self._series_clash(node, cycle, required, ids)
        changed = before != (newpos[iu] < newpos[ju])
        if changed.any():
            e = self.edges(reps_a[iu[changed]], reps_a[ju[changed]])
            flip[self.res.colour[e]] = True
        return None

    def _series_clash(self, node, cycle, required, ids) -> list[Requirement]:
        """Arcs a_s < b_s around a cycle of children: in each child, Γ steps along a path of
        pairs that must stay unordered carry a_s < b_s to b_(s-1) < b_s."""
        glob = (lambda x: x) if ids is None else ids.__getitem__
        adj = self.problem.adj
        core: list[Requirement] = []
        arcs = [required[a][0] for a in cycle]
        where: dict[int, int] = {}  # item → index of the child holding it
        for ci, child in enumerate(node.children):
            for x in child.items:
                where[glob(x)] = ci
        for s, (a, b) in enumerate(arcs):
            core += required[cycle[s]][1]
            prev_b = arcs[s - 1][1]
            if prev_b == a:
                continue
            members = {glob(x) for x in node.children[where[a]].items}
            path = _complement_path(adj, members, a, prev_b)
            for x, y in zip(path, path[1:]):
                core.append(self.pair(y, b))
                core.append(Requirement(Kind.INCOMPARABLE, (x, y)))
        return list(dict.fromkeys(core))


def _shortest_cycle(after: dict[int, list[tuple[int, int]]], nodes: list[int]) -> list[int]:
    """The arc indices of a shortest cycle through the precedence edges among ``nodes``."""
    inside = set(nodes)
    best = None
    for start in nodes[:64]:
        prev = {start: None}
        queue = [start]
        found = None
        for v in queue:
            for w, arc in after.get(v, ()):
                if w not in inside:
                    continue
                if w == start:
                    found = (v, arc)
                    break
                if w not in prev:
                    prev[w] = (v, arc)
                    queue.append(w)
            if found:
                break
        if found is None:
            continue
        v, arc = found
        arcs = [arc]
        while prev[v] is not None:
            v, a = prev[v]
            arcs.append(a)
        arcs.reverse()
        if best is None or len(arcs) < len(best):
            best = arcs
    assert best is not None, "no cycle among the children left by the topological sort"
    return best


def _complement_path(adj: list[set[int]], members: set[int], a: int, b: int) -> list[int]:
    """A shortest path from a to b inside ``members`` whose consecutive items are not adjacent
    (the complement of a series node's child is connected)."""
    prev = {a: None}
    unvisited = set(members) - {a}
    queue = [a]
    for v in queue:
        found = unvisited - adj[v]
        for w in found:
            prev[w] = v
        unvisited -= found
        queue.extend(found)
        if b in prev:
            break
    path = [b]
    while path[-1] != a:
        path.append(prev[path[-1]])
    path.reverse()
    return path


def gamma_path(adj: list[set[int]], items: list[int], src: Arc, dst: Arc):
    """A chain of Γ steps from arc ``src`` to arc ``dst`` in the subgraph induced on ``items``
    (which hold both arcs' ends), as :class:`~satorder.graph.forcing.ForcingStep` objects in
    item ids — every step is one of the whole graph, since non-adjacency is inherited — or
    ``None`` when the two arcs are not in one implication class there.  Breadth-first search in
    the tie graph, then shortcut wherever an arc forces a later one directly."""
    from scipy.sparse.csgraph import breadth_first_order

    items = list(dict.fromkeys(items))
    pos = {v: i for i, v in enumerate(items)}
    sub = [{pos[u] for u in adj[v] if u in pos} for v in items]
    if src == dst:
        return [ForcingStep(src, None)]
    lo, hi, keys, e1, e2, fl = implication_ties(sub)
    k = len(items)

    def node_of(arc):
        x, y = pos[arc[0]], pos[arc[1]]
        e = int(np.searchsorted(keys, min(x, y) * k + max(x, y)))
        return 2 * e + (0 if x < y else 1)

    graph = tie_graph(len(lo), e1, e2, fl)
    start, goal = node_of(src), node_of(dst)
    _, pred = breadth_first_order(graph, start, directed=False, return_predecessors=True)
    if goal != start and pred[goal] < 0:
        return None
    path = [goal]
    while path[-1] != start:
        path.append(int(pred[path[-1]]))
    path.reverse()

    def arc(node: int) -> Arc:
        e = node // 2
        x, y = items[int(lo[e])], items[int(hi[e])]
        return (x, y) if node % 2 == 0 else (y, x)

    return shortcut_chain(adj, [arc(v) for v in path])
