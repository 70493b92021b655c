"""Independent check of a modular decomposition tree and of the count read from it.

Written apart from :mod:`satorder.graph.modular` (which builds the tree) and sharing no code with
it:
it only walks the tree's nodes and the graph.  For every internal node with children
``C1 … Ck`` it checks that

* the leaves below the root are every item exactly once;
* each child is a module of the node (all of a child's items see the other children alike,
  each other child wholly or not at all) — with the node itself a module of its parent, the
  child is then a module of the graph;
* a ``series`` node's children are pairwise joined, a ``parallel`` node's pairwise apart, and a
  ``prime`` node has at least four children whose quotient is connected, has a connected
  complement, and is a comparability graph whose edges form a single implication class
  (decided by the forcing algorithm, :mod:`satorder.graph.forcing`), so it has exactly two
  transitive orientations (Golumbic 1980, ch. 5: the orientations of a comparability graph are
  the independent choices of a direction per implication class pair).

Children of a series node are then co-connected (a parallel child is disconnected and a prime
child co-connected), so they are the co-components and contribute k!; the count of transitive
orientations is the product of the factors (Gallai 1967), recomputed here.

The work is the sum over items of degree × depth; trees whose work exceeds ``budget`` are not
checked (the function returns False).
"""

from __future__ import annotations

from math import factorial

from satorder.errors import CertificateError


def check_decomposition(adj: list[set[int]], tree, budget: int = 30_000_000) -> int | None:
    """Check ``tree`` against the graph ``adj``; returns the number of transitive orientations
    it implies, or None when the check would exceed ``budget`` steps.  Raises
    :class:`CertificateError` on any defect."""
    from satorder.graph.forcing import transitive_orientation

    n = len(adj)
    order = []  # (node, depth), parents first
    stack = [(tree, 0)]
    leaf_depth = [-1] * n
    while stack:
        node, d = stack.pop()
        order.append((node, d))
        if not node.children:
            item = node.item
            if not (0 <= item < n) or leaf_depth[item] >= 0:
                raise CertificateError(f"item {item} is missing from or repeated in the tree")
            leaf_depth[item] = d
        elif len(node.children) < 2:
            raise CertificateError("an internal node has fewer than two children")
        stack.extend((c, d + 1) for c in node.children)
    if min(leaf_depth, default=0) < 0:
        raise CertificateError("some item is not a leaf of the tree")
    if sum(len(adj[x]) * (leaf_depth[x] + 1) + leaf_depth[x] for x in range(n)) > budget:
        return None
    members: dict[int, list[int]] = {}
    for node, _ in reversed(order):  # children before parents
        if not node.children:
            members[id(node)] = [node.item]
        else:
            members[id(node)] = [x for c in node.children for x in members[id(c)]]
    stamp = [-1] * n
    where = [0] * n
    total = 1
    for serial, (node, _) in enumerate(order):
        kids = node.children
        if not kids:
            continue
        k = len(kids)
        sizes = [len(members[id(c)]) for c in kids]
        for i, c in enumerate(kids):
            for x in members[id(c)]:
                stamp[x] = serial
                where[x] = i
        sees: list[frozenset[int]] = []
        for i, c in enumerate(kids):
            xs = members[id(c)]
            seen = frozenset(where[u] for u in adj[xs[0]] if stamp[u] == serial and where[u] != i)
            need = sum(sizes[j] for j in seen)
            for x in xs:
                count = 0
                for u in adj[x]:
                    if stamp[u] == serial and where[u] != i:
                        if where[u] not in seen:
                            raise CertificateError(f"child {i} of a {node.kind} node is not a "
                                                   f"module: item {x} sees child {where[u]}")
                        count += 1
                if count != need:
                    raise CertificateError(f"child {i} of a {node.kind} node is not a module: "
                                           f"item {x} sees only part of another child")
            sees.append(seen)
        if node.kind == "series":
            if any(len(s) != k - 1 for s in sees):
                raise CertificateError("a series node has two children not joined")
            total *= factorial(k)
        elif node.kind == "parallel":
            if any(sees):
                raise CertificateError("a parallel node has two adjacent children")
        elif node.kind == "prime":
            q = [set(s) for s in sees]
            if k < 4 or not _connected(q) or not _co_connected(q):
                raise CertificateError("a prime node's quotient is disconnected, co-disconnected "
                                       "or too small")
            res = transitive_orientation(q)
            if not res.orientable:
                return 0
            if res.num_classes != 1:
                raise CertificateError("a prime node's quotient has more than one implication "
                                       "class, so it has a nontrivial module")
            total *= 2
        else:
            raise CertificateError(f"unknown node kind {node.kind!r}")
    return total


def _connected(adj: list[set[int]]) -> bool:
    seen = {0}
    todo = [0]
    while todo:
        for u in adj[todo.pop()]:
            if u not in seen:
                seen.add(u)
                todo.append(u)
    return len(seen) == len(adj)


def _co_connected(adj: list[set[int]]) -> bool:
    """Whether the complement is connected: breadth-first search in the complement, scanning
    the unvisited set and skipping neighbours (linear in items plus pairs)."""
    unvisited = set(range(1, len(adj)))
    todo = [0]
    while todo and unvisited:
        nb = adj[todo.pop()]
        found = [u for u in unvisited if u not in nb]
        unvisited.difference_update(found)
        todo.extend(found)
    return not unvisited
