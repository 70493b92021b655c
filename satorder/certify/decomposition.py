"""Independent check of a modular decomposition tree and of the count read from it.

Written apart from :mod:`satorder.graph.modular` (which builds the tree) and from every other
engine, sharing no code with them: it only walks the tree's nodes and the graph.  For every
internal node with children ``C1 … Ck`` it checks that

* the leaves below the root are every item exactly once;
* each child is a module of the node (all of a child's items see the other children alike,
  each other child wholly or not at all) — with the node itself a module of its parent, the
  child is then a module of the graph;
* a ``series`` node's children are pairwise joined, a ``parallel`` node's pairwise apart, and a
  ``prime`` node has at least four children whose quotient is connected, has a connected
  complement, and is a comparability graph whose edges form a single colour class (an
  implication class together with its reverse), so it has exactly two transitive orientations
  (Golumbic 1980, ch. 5: the orientations of a comparability graph are the independent choices
  of a direction per colour class).

The colour classes of a quotient are found here by a union-find of its edges with a parity bit,
written for this check alone (it does not call the forcing engine): around each item ``v``, the
edges to two neighbours that are not adjacent are Γ-related (Golumbic 1980, §5.1), so edges to
all neighbours in one connected component of the complement of ``G[N(v)]`` fall into one class,
each pointing away from ``v`` exactly when the others do.  The parity records, for each edge,
whether "away from ``v``" means from its smaller to its larger item; two constraints that
disagree mean some implication class holds an arc and its reverse, so the quotient is not a
comparability graph (Golumbic 1980, Theorem 5.4 as recalled from memory: a graph is a
comparability graph exactly when no implication class meets its own reverse).

Children of a series node are then co-connected (a parallel child is disconnected and a prime
child co-connected), so they are the co-components and contribute k!; the count of transitive
orientations is the product of the factors (Gallai 1967), recomputed here.

The work is the sum over items of degree × depth, plus the set scans and unions of the colour
class search in each prime quotient (counted as it goes); a tree whose work exceeds ``budget``
is not checked (the function returns None).
"""

from __future__ import annotations

from itertools import chain
from math import factorial

from satorder.errors import CertificateError
from satorder.jit import HAVE_NUMBA, run


def check_decomposition(adj: list[set[int]], tree, budget: int = 30_000_000) -> int | None:
    """Check ``tree`` against the graph ``adj``; returns the number of transitive orientations
    it implies, or None when the check would exceed ``budget`` steps.  Raises
    :class:`CertificateError` on any defect."""
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
    budget -= sum(len(adj[x]) * (leaf_depth[x] + 1) + leaf_depth[x] for x in range(n))
    if budget < 0:
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
            found = _colour_classes(q, budget)
            if found is None:
                return None
            classes, budget = found
            if classes == 0:  # an implication class meets its reverse
                return 0
            if classes != 1:
                raise CertificateError("a prime node's quotient has more than one implication "
                                       "class, so it has a nontrivial module")
            total *= 2
        else:
            raise CertificateError(f"unknown node kind {node.kind!r}")
    return total


def check_tree_count(adj: list[set[int]], tree, count: int, arcs: bool) -> str | None:
    """Check ``tree`` (:func:`check_decomposition`) and, for a problem without fixed or
    forbidden ``arcs``, that the count it implies is ``count``; returns what was checked, in
    words, or None when the tree is too large to check.  Raises :class:`CertificateError`."""
    implied = check_decomposition(adj, tree)
    if implied is None:
        return None
    if not arcs and implied != count:
        raise CertificateError(f"the checked decomposition implies {implied} answers, "
                               f"not {count}")
    return ("decomposition tree checked: every child a module, node kinds, prime quotients "
            "with one implication class")


def _colour_classes(adj: list[set[int]], budget: int) -> tuple[int, int] | None:
    """The number of colour classes of the graph ``adj`` (0 when it is not a comparability
    graph) and the budget left, or None once the work passes ``budget``.

    Two passes.  First the ties: around each item ``v``, a breadth-first search in the
    complement of ``G[N(v)]`` (scanning the unvisited neighbours, skipping those adjacent to the
    current one) groups the neighbours; the edge to each member of a group is tied to the edge
    to the group's first member, "both away from ``v``".  Then a union-find over the edges
    (edge ``{a, b}``, ``a < b``, numbered by the rank of ``a·n + b``) with a parity bit:
    ``bit(e)`` stands for "e points from its smaller item to its larger", and a tie between
    ``{v, s}`` and ``{v, x}`` says ``bit xor bit = [v < s] xor [v < x]``."""
    import numpy as np  # only for prime quotients; small plain problems stay light

    n = len(adj)
    centre: list[int] = []
    first: list[int] = []
    member: list[int] = []
    for v in range(n):
        if len(adj[v]) < 2:
            continue
        unvisited = set(adj[v])
        while unvisited:
            start = unvisited.pop()
            todo = [start]
            while todo and unvisited:
                y = todo.pop()
                budget -= len(unvisited) + 1
                found = unvisited - adj[y]  # neighbours of v not adjacent to y
                if found:
                    unvisited -= found
                    todo += found
                    centre += [v] * len(found)
                    first += [start] * len(found)
                    member += found
        if budget < 0:
            return None
    deg = np.fromiter(map(len, adj), dtype=np.int64, count=n)
    ends = np.fromiter(chain.from_iterable(adj), dtype=np.int64, count=int(deg.sum()))
    src = np.repeat(np.arange(n, dtype=np.int64), deg)
    keys = np.sort((src * n + ends)[src < ends])
    m = len(keys)
    budget -= len(member)  # one union each
    if budget < 0:
        return None
    v = np.asarray(centre, dtype=np.int64)
    s = np.asarray(first, dtype=np.int64)
    x = np.asarray(member, dtype=np.int64)
    query = np.concatenate([np.minimum(v, s) * n + np.maximum(v, s),
                            np.minimum(v, x) * n + np.maximum(v, x)])
    ids = np.empty(len(query), dtype=np.int64)
    by_key = np.argsort(query)  # sorted queries: a cache-friendly search
    ids[by_key] = np.searchsorted(keys, query[by_key])
    e_s, e_x = ids[:len(v)], ids[len(v):]
    flip = (v < s) != (v < x)
    parent = np.arange(m, dtype=np.int64)
    parity = np.zeros(m, dtype=np.bool_)  # bit(e) xor bit(parent[e]); False at every root
    if HAVE_NUMBA and len(member) > 1000:
        joins = run(_join_ties, parent, parity, e_s, e_x, flip)
    else:
        joins = _join_ties(parent.tolist(), parity.tolist(), e_s.tolist(), e_x.tolist(),
                           flip.tolist())
    return (0 if joins < 0 else m - joins), budget


def _join_ties(parent, parity, e_s, e_x, flip) -> int:  # compiled with numba on large inputs
    """Union-find with parity: tie ``i`` says ``bit(e_s[i]) xor bit(e_x[i]) = flip[i]``.
    Returns the number of joins made, or -1 when a tie contradicts the earlier ones (an arc and
    its reverse in one implication class)."""
    joins = 0
    for i in range(len(e_s)):
        e = e_s[i]
        f = e_x[i]
        want = flip[i]
        while parent[e] != e:  # find with path halving, keeping want = bit(e) xor bit(f) ...
            g = parent[e]
            parity[e] ^= parity[g]
            parent[e] = parent[g]
            want ^= parity[e]
            e = parent[e]
        while parent[f] != f:  # ... with e and f replaced by their roots
            g = parent[f]
            parity[f] ^= parity[g]
            parent[f] = parent[g]
            want ^= parity[f]
            f = parent[f]
        if e == f:
            if want:
                return -1
        else:
            parent[f] = e
            parity[f] = want
            joins += 1
    return joins


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
