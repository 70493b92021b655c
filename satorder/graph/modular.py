"""Modular decomposition of an undirected graph by vertex partition refinement.

A *module* of a graph is a set of items that every outside item sees alike (adjacent to all of
them or to none).  A module is *strong* when it overlaps no other module; the strong modules form
a tree (Gallai 1967), whose internal nodes are of three kinds:

* ``parallel`` — the node's graph is disconnected; its children are the components;
* ``series`` — the complement is disconnected; its children are the co-components;
* ``prime`` — neither; its children are the maximal proper modules, and the *quotient* graph
  (one representative per child) has no modules but the trivial ones.

Method.  The recursion of Ehrenfeucht, Gabow, McConnell & Sullivan (J. Algorithms 16, 1994)
with the partition-refinement accounting of McConnell & Spinrad, "Ordered vertex partitioning"
(DMTCS 4, 2000):

1. For a strong module ``S`` pick an item ``v`` and compute ``P(S, v)``, the maximal modules of
   ``G[S]`` not containing ``v``, by refining ``{N(v), S - N[v]}``: whenever a part splits in
   two, every item of the *smaller* half is used as a pivot (its neighbours split the parts they
   touch) and, through the same edge scan, every outside item splits the smaller half.  A split
   by an outside item never cuts a module that avoids ``v``, and once every split has been paid
   for, every part is uniform to every outside item, so the parts are exactly ``P(S, v)``.  Each
   item is in the smaller half at most ``log2 n`` times over the whole run, so the refinement
   costs O(m log n) in total.
2. In the quotient ``Q = G[S] / P(S, v)`` every module avoiding ``v`` is a single vertex, so the
   strong modules containing ``v`` form a chain ``{v} = M0 < M1 < ... < Mt = S`` (the *spine*).
   Part ``X`` *forces* part ``Y`` when ``Y`` sees ``v`` and ``X`` differently; the smallest
   module containing ``v`` and ``X`` is ``v`` plus everything ``X`` reaches.  Hence the strongly
   connected components of the forcing digraph are the layers ``Mi - M(i-1)``, ordered by
   reachability.  A layer with one part is a series node (the part is adjacent to ``v``) or a
   parallel node; a layer with three or more parts is a prime node.  The digraph is dense in
   general, so reachability is explored with the complement trick (scan the unvisited set,
   skip neighbours), charging every step to an edge or to a newly reached part.
3. Each part is decomposed the same way; a part decomposed into a node of the same kind as its
   series or parallel spine node is merged into it.

:func:`modular_decomposition` returns the tree of :class:`ModuleNode` objects;
:func:`quotient` gives the quotient graph of a node, and :func:`count_transitive_orientations`
the number of transitive orientations, the product over nodes (series with k children: k!,
prime: 2 when the quotient is a comparability graph).

>>> adj = [{1, 2}, {0, 2}, {0, 1, 3}, {2}]          # a triangle 0-1-2 with a pendant 3 at 2
>>> tree = modular_decomposition(adj)
>>> tree.kind, sorted(sorted(c.items) for c in tree.children)
('series', [[0, 1, 3], [2]])
>>> count_transitive_orientations(adj)
4
"""

from __future__ import annotations

import random
from dataclasses import dataclass, field
from functools import cached_property

SERIES, PARALLEL, PRIME, LEAF = "series", "parallel", "prime", "leaf"


@dataclass(eq=False)
class ModuleNode:
    """A strong module: ``kind`` is ``"series"``, ``"parallel"``, ``"prime"`` or ``"leaf"``;
    ``children`` are the maximal strong modules inside it (empty for a leaf, whose single item
    is ``item``)."""

    kind: str
    children: list[ModuleNode] = field(default_factory=list)
    item: int | None = None

    @cached_property
    def items(self) -> frozenset[int]:
        """The items of the module (computed on first use)."""
        if self.kind == LEAF:
            return frozenset((self.item,))
        out: set[int] = set()
        stack = [self]
        while stack:
            node = stack.pop()
            if node.kind == LEAF:
                out.add(node.item)
            else:
                stack.extend(node.children)
        return frozenset(out)

    @property
    def representative(self) -> int:
        """One item of the module (the leftmost leaf)."""
        node = self
        while node.kind != LEAF:
            node = node.children[0]
        return node.item

    def nodes(self):
        """Every node of the subtree, parents before children."""
        stack = [self]
        while stack:
            node = stack.pop()
            yield node
            stack.extend(reversed(node.children))

    def to_dict(self, names: list[str] | None = None) -> dict:
        """Nested plain-data form (item names when ``names`` is given)."""
        if self.kind == LEAF:
            return {"kind": LEAF, "item": names[self.item] if names else self.item}
        return {"kind": self.kind, "children": [c.to_dict(names) for c in self.children]}

    def __repr__(self) -> str:
        if self.kind == LEAF:
            return f"ModuleNode(leaf {self.item})"
        return f"ModuleNode({self.kind}, {len(self.children)} children)"


def modular_decomposition(adj: list[set[int]], seed: int = 0) -> ModuleNode | None:
    """The modular decomposition tree of the graph ``adj`` (``adj[v]``: neighbours of ``v``).

    Returns ``None`` for the graph with no items.  ``seed`` only affects the choice of pivots,
    never the tree.
    """
    n = len(adj)
    if n == 0:
        return None
    from satorder.graph.forcing import use_kernels
    from satorder.model.problem import pair_count

    compiled = use_kernels(pair_count(adj))
    if compiled:  # the components laid out by numpy, each refined first by the kernel
        from satorder.graph.modular_kernel import component_graphs

        comps = component_graphs(adj)
    else:
        comps = [(comp, None, None) for comp in _connected_components(adj)]
    if len(comps) == 1:
        return _Decomposer(adj, random.Random(seed), compiled).run()
    # a disconnected graph: a parallel root over its components, each decomposed on its own
    # (the same tree; the refinement then never filters neighbours by context)
    children = []
    for comp, sub, csr in comps:
        if len(comp) == 1:
            children.append(ModuleNode(LEAF, item=comp[0]))
            continue
        if sub is None:
            pos = {v: i for i, v in enumerate(comp)}
            sub = [{pos[u] for u in adj[v]} for v in comp]
        tree = _Decomposer(sub, random.Random(seed), compiled, csr).run()
        for node in tree.nodes():
            if node.kind == LEAF:
                node.item = comp[node.item]
        children.append(tree)
    return ModuleNode(PARALLEL, children)


def _connected_components(adj: list[set[int]]) -> list[list[int]]:
    """The items of each connected component, in order of their smallest item."""
    seen = bytearray(len(adj))
    comps = []
    for v in range(len(adj)):
        if seen[v]:
            continue
        seen[v] = 1
        comp = [v]
        for x in comp:  # breadth-first: the list grows while it is read
            for y in adj[x]:
                if not seen[y]:
                    seen[y] = 1
                    comp.append(y)
        comps.append(comp)
    return comps


class _Decomposer:
    """Iterative implementation of the three steps in the module docstring."""

    def __init__(self, adj: list[set[int]], rng: random.Random, compiled: bool = False,
                 csr=None):
        self.adj = adj
        self.compiled = compiled  # the first refinement (of the whole graph) by the kernel
        self.csr = csr  # adj as CSR arrays, when the caller has them
        self.first_nq: dict[int, set[int]] | None = None  # the first spine's quotient
        self.rng = rng
        n = len(adj)
        self.blk = [0] * n  # current part id of each item
        self.parts: list[set[int]] = [set(range(n))]
        self.owner: list[int] = [0]  # context (module being decomposed) of each part
        # a Python set never shrinks its table, and iterating it costs the table size: a part
        # is copied afresh once it holds less than a quarter of its table (amortised O(1))
        self.cap: list[int] = [n]
        self.mark = [0] * n
        self.token = 0

    # ---------------------------------------------------------------- partition refinement
    def _new_part(self, members, ctx: int) -> int:
        pid = len(self.parts)
        self.parts.append(set(members))
        self.owner.append(ctx)
        self.cap.append(len(self.parts[pid]))
        blk = self.blk
        for u in members:
            blk[u] = pid
        return pid

    def _remove(self, pid: int, members) -> set[int]:
        """Take ``members`` out of part ``pid``; returns the part (compacted when sparse)."""
        rest = self.parts[pid]
        rest.difference_update(members)
        if len(rest) * 4 < self.cap[pid]:
            rest = self.parts[pid] = set(rest)
            self.cap[pid] = len(rest)
        return rest

    def _split_by(self, touched: list[int], ctx: int, created: list[int], queue: list) -> None:
        """Split every part by the set ``touched`` (no duplicates); record new parts and the
        smaller half of each split as an obligation on ``queue``."""
        blk = self.blk
        parts = self.parts
        groups: dict[int, list[int]] = {}
        for u in touched:
            b = blk[u]
            if len(parts[b]) == 1:  # a single item cannot split
                continue
            g = groups.get(b)
            if g is None:
                groups[b] = [u]
            else:
                g.append(u)
        for pid, g in groups.items():
            rest = parts[pid]
            if len(g) == len(rest):
                continue
            rest = self._remove(pid, g)
            created.append(self._new_part(g, ctx))
            queue.append(g if len(g) <= len(rest) else list(rest))

    def _refine(self, s: int, v: int, ctx: int) -> tuple[int, list[int]]:
        """Refine part ``s`` (a module ``S`` with ``v`` in it) into ``{v}`` and ``P(S, v)``.

        Returns the id of the part ``{v}`` and the ids of the parts of ``P(S, v)``."""
        adj, blk, owner, mark = self.adj, self.blk, self.owner, self.mark
        owner[s] = ctx
        whole = len(self.parts[s]) == len(adj)  # no need to filter neighbours by context
        if whole and self.compiled and len(adj) > 2:
            return self._refine_compiled(s, v, ctx)
        self.parts[s].discard(v)
        pv = self._new_part((v,), ctx)
        created: list[int] = [s]
        queue: list[list[int]] = []
        nv = [u for u in adj[v] if owner[blk[u]] == ctx and u != v]
        self._split_by(nv, ctx, created, queue)
        parts = self.parts
        while queue:
            half = queue.pop()
            self.token += 1
            token = self.token
            for x in half:
                mark[x] = token
            # every x in the half splits the parts outside it by its neighbourhood; every item
            # outside splits the parts inside the half: grouping the half's items by their set
            # of outside neighbours gives the common refinement of all those splits at once
            groups: dict[tuple, list[int]] = {}
            for x in half:
                if whole:
                    out = [y for y in adj[x] if mark[y] != token]
                else:
                    out = [y for y in adj[x] if mark[y] != token and owner[blk[y]] == ctx]
                if out:
                    self._split_by(out, ctx, created, queue)
                key = (blk[x], frozenset(out))
                g = groups.get(key)
                if g is None:
                    groups[key] = [x]
                else:
                    g.append(x)
            by_part: dict[int, list[list[int]]] = {}
            for (pid, _), g in groups.items():
                by_part.setdefault(pid, []).append(g)
            for pid, gs in by_part.items():
                if len(gs) == 1 and len(gs[0]) == len(parts[pid]):
                    continue
                rest = parts[pid]
                covered = sum(len(g) for g in gs)
                if covered < len(rest):  # items of the part not in the half: one more group
                    gs.append(list(rest.difference(*gs)))
                big = max(range(len(gs)), key=lambda i: len(gs[i]))
                for i, g in enumerate(gs):
                    if i == big:
                        continue
                    rest = self._remove(pid, g)
                    created.append(self._new_part(g, ctx))
                    queue.append(g)
        return pv, [p for p in created if self.parts[p]]

    def _refine_compiled(self, s: int, v: int, ctx: int) -> tuple[int, list[int]]:
        """:meth:`_refine` of the whole (connected) graph by the compiled twin
        (:func:`satorder.graph.modular_kernel.first_parts`), with the quotient the spine
        needs: the same parts, in another order."""
        from satorder.graph.modular_kernel import first_parts

        pv = self._new_part((v,), ctx)
        groups, self.first_nq = first_parts(self.csr or self.adj, v, s, len(self.parts))
        self.parts[s] = set(groups[0])  # every item's part id is s until the others are made
        self.cap[s] = len(groups[0])
        return pv, [s] + [self._new_part(g, ctx) for g in groups[1:]]

    # ---------------------------------------------------------------- the spine
    def _spine(self, v: int, pids: list[int], reps: dict[int, int], ctx: int, whole: bool):
        """Layers ``M1 - M0, M2 - M1, ...`` of the strong modules containing ``v``, each a list
        of part ids, innermost first; and the set of parts adjacent to ``v``."""
        adj, blk, owner = self.adj, self.blk, self.owner
        adj_v = set(adj[v])  # rows may be lists
        nq: dict[int, set[int]] = self.first_nq or {}
        self.first_nq = None
        for p in pids:
            r = reps[p]
            if p in nq:
                continue
            if whole:
                nq[p] = {blk[u] for u in adj[r] if u != v} - {p}
            else:
                nq[p] = {blk[u] for u in adj[r] if owner[blk[u]] == ctx and u != v} - {p}
        near = {p for p in pids if reps[p] in adj_v}

        def down(x: int, allowed: set[int]) -> set[int]:
            # parts forced by x: those adjacent to v and not to x, or not adjacent to v but to x
            un_a = {p for p in allowed if p in near}
            un_b = allowed - un_a
            un_a.discard(x)
            un_b.discard(x)
            seen = {x}
            frontier = [x]
            while frontier:
                y = frontier.pop()
                ny = nq[y]
                found = [p for p in un_a if p not in ny]
                if found:
                    un_a = _without(un_a, found)
                if len(ny) < len(un_b):
                    fb = [p for p in ny if p in un_b]
                else:
                    fb = [p for p in un_b if p in ny]
                if fb:
                    un_b = _without(un_b, fb)
                for p in found + fb:
                    seen.add(p)
                    frontier.append(p)
            return seen

        def up(x: int, allowed: set[int]) -> set[int]:
            # parts forcing x: if x is adjacent to v, those not adjacent to x; else those adjacent
            un = set(allowed)
            un.discard(x)
            seen = {x}
            frontier = [x]
            while frontier:
                y = frontier.pop()
                ny = nq[y]
                if y in near:
                    found = [p for p in un if p not in ny]
                elif len(ny) < len(un):
                    found = [p for p in ny if p in un]
                else:
                    found = [p for p in un if p in ny]
                if found:
                    un = _without(un, found)
                for p in found:
                    seen.add(p)
                    frontier.append(p)
            return seen

        layers: list[list[int]] = []
        # ranges of consecutive layers still to be ordered; processed so that layers come out
        # innermost first (a range below a pivot's layer is finished before the layer itself)
        stack: list = [("range", set(pids))]
        while stack:
            tag, val = stack.pop()
            if tag == "layer":
                layers.append(val)
                continue
            if not val:
                continue
            x = self.rng.choice(sorted(val))  # a random pivot: expected O(log) rounds
            below = down(x, val)
            above = up(x, val)
            layer = below & above
            stack.append(("range", above - layer))
            stack.append(("layer", sorted(layer)))
            stack.append(("range", below - layer))
        return layers, near

    # ---------------------------------------------------------------- driver
    def run(self) -> ModuleNode:
        parts = self.parts
        # a task is (part id, key); the remainder of a refined part keeps the part's id, so
        # plans and trees are keyed by the task key instead
        plans: dict[int, tuple] = {}
        order: list[int] = []
        todo = [(0, 0)]
        key = 0
        while todo:
            s, k = todo.pop()
            members = parts[s]
            if len(members) == 1:
                continue
            v = next(iter(members))
            whole = len(members) == len(self.adj)
            pv, pids = self._refine(s, v, -(k + 1))
            reps = {p: next(iter(parts[p])) for p in pids}
            layers, near = self._spine(v, pids, reps, -(k + 1), whole)
            keyed = {}
            for p in pids:
                key += 1
                keyed[p] = key
                todo.append((p, key))
            plans[k] = (v, [[(p, keyed[p]) for p in layer] for layer in layers], near)
            order.append(k)
        trees: dict[int, ModuleNode] = {}
        for k in reversed(order):
            v, layers, near = plans.pop(k)
            node = ModuleNode(LEAF, item=v)
            for layer in layers:
                subs = [self._tree(p, kk, trees) for p, kk in layer]
                if len(layer) >= 2:
                    node = ModuleNode(PRIME, [node] + subs)
                    continue
                kind = SERIES if layer[0][0] in near else PARALLEL
                children = _spliced(node, kind) + _spliced(subs[0], kind)
                node = ModuleNode(kind, children)
            trees[k] = node
        return self._tree(0, 0, trees)

    def _tree(self, pid: int, key: int, trees: dict[int, ModuleNode]) -> ModuleNode:
        t = trees.pop(key, None)
        if t is not None:
            return t
        (item,) = self.parts[pid]
        return ModuleNode(LEAF, item=item)


def _without(s: set[int], items: list[int]) -> set[int]:
    """``s`` minus ``items``, copied afresh when the result is under a quarter of the old size
    (iterating a Python set costs its table size, which never shrinks)."""
    before = len(s)
    s.difference_update(items)
    return set(s) if len(s) * 4 < before else s


def _spliced(node: ModuleNode, kind: str) -> list[ModuleNode]:
    return list(node.children) if node.kind == kind else [node]


# ------------------------------------------------------------------------ uses of the tree
def quotient(adj: list[set[int]], node: ModuleNode) -> list[set[int]]:
    """The quotient graph of ``node``: vertex ``i`` stands for ``node.children[i]``, and two
    children are adjacent when their modules are (every edge or none, since both are modules).
    """
    reps = [c.representative for c in node.children]
    where = {}
    for i, c in enumerate(node.children):
        if c.kind == LEAF:
            where[c.item] = i
    slow = [i for i, c in enumerate(node.children) if c.kind != LEAF]
    if slow:
        for i in slow:
            for u in node.children[i].items:
                where[u] = i
    out: list[set[int]] = [set() for _ in reps]
    for i, r in enumerate(reps):
        for u in adj[r]:
            j = where.get(u)
            if j is not None and j != i:
                out[i].add(j)
                out[j].add(i)
    return out


def count_transitive_orientations(adj: list[set[int]], tree: ModuleNode | None = None) -> int:
    """Number of transitive orientations of the graph ``adj``: the product over the modular
    decomposition of k! for a series node with k children and 2 for a prime node (a prime
    comparability graph has exactly two transitive orientations, one the reverse of the other;
    Gallai 1967), or 0 when the graph is not a comparability graph (decided by the forcing
    algorithm, :mod:`satorder.graph.forcing`).

    >>> count_transitive_orientations([set(range(6)) - {i} for i in range(6)])  # K6
    720
    """
    from math import factorial

    from satorder.graph.forcing import transitive_orientation

    if not adj:
        return 1
    if not transitive_orientation(adj).orientable:
        return 0
    if tree is None:
        tree = modular_decomposition(adj)
    total = 1
    for node in tree.nodes():
        if node.kind == SERIES:
            total *= factorial(len(node.children))
        elif node.kind == PRIME:
            total *= 2
    return total
