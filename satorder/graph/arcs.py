"""Fixed and forbidden arcs on the modular decomposition: which arcs an answer must contain, and
the node of the decomposition tree where each arc's two items separate.

On a problem without open pairs (every pair comparable or to stay unordered) an answer is a
transitive orientation of the comparability graph that contains every fixed arc and no
forbidden one.  A forbidden arc on a comparable pair is the fixed arc the other way; a forbidden
arc on a pair that must stay unordered holds in every answer and says nothing.

A transitive orientation is an independent choice at every node of the modular decomposition
(Gallai 1967; McConnell & Spinrad, "Ordered vertex partitioning", DMTCS 4, 2000): a linear order
of a series node's children, one of the two transitive orientations of a prime node's quotient,
nothing at a parallel node.  An arc between items ``a`` and ``b`` is decided at exactly one of
these choices: the one of the lowest common ancestor of the leaves ``a`` and ``b``, between the
two children holding ``a`` and ``b`` (:func:`place_arcs`).  Counting
(:mod:`satorder.pipeline.count`) and solving (:mod:`satorder.graph.constrained`) both build on
this.

>>> from satorder.model.problem import Problem
>>> p = Problem.from_lists(comparable=[("a", "b"), ("b", "c")], fixed=[("a", "b")],
...                        forbidden=[("c", "b"), ("a", "c")])
>>> [(arc, [r.kind.value for r in why]) for arc, why in arc_requirements(p)]
[((0, 1), ['fixed']), ((1, 2), ['forbidden', 'comparable'])]
"""

from __future__ import annotations

from satorder.graph.modular import LEAF, ModuleNode
from satorder.model.problem import Problem
from satorder.model.requirement import Kind, Requirement

Arc = tuple[int, int]


def arc_requirements(problem: Problem) -> list[tuple[Arc, list[Requirement]]]:
    """Every arc an answer must contain, with the requirements that demand it: a fixed arc
    ``(a, b)`` (``[fixed (a, b)]``; also when its pair must stay unordered, which no answer can
    meet) and, for a forbidden arc ``(a, b)`` on a comparable pair, the arc ``(b, a)``
    (``[forbidden (a, b), comparable {a, b}]``).  Forbidden arcs on pairs that must stay
    unordered are left out: every answer meets them."""
    out: list[tuple[Arc, list[Requirement]]] = []
    for a, b in problem.fixed:
        out.append(((a, b), [Requirement(Kind.FIXED, (a, b))]))
    for a, b in problem.forbidden:
        if b in problem.adj[a]:
            out.append(((b, a), [Requirement(Kind.FORBIDDEN, (a, b)),
                                 Requirement(Kind.COMPARABLE, (a, b))]))
    return out


def required_arcs(problem: Problem) -> list[Arc] | None:
    """The arcs every answer must contain (see :func:`arc_requirements`), or ``None`` if some
    fixed arc lies on a pair that must stay unordered."""
    arcs = []
    for arc, _ in arc_requirements(problem):
        if arc[1] not in problem.adj[arc[0]]:
            return None
        arcs.append(arc)
    return arcs


def place_arcs(tree: ModuleNode, arcs, n: int) -> dict[int, list[tuple[int, int, int]]]:
    """For each arc ``arcs[k] = (a, b)`` (items of ``tree``, ids below ``n``), the node where a
    and b separate (their lowest common ancestor) and the indices of its children holding a and
    b: ``{id(node): [(child_a, child_b, k), ...]}``."""
    if not arcs:
        return {}
    parent: dict[int, tuple[ModuleNode, int]] = {}  # id(child) → (parent, child index)
    depth: dict[int, int] = {id(tree): 0}
    leaf: list[ModuleNode | None] = [None] * n
    for node in tree.nodes():
        if node.kind == LEAF:
            leaf[node.item] = node
        for i, c in enumerate(node.children):
            parent[id(c)] = (node, i)
            depth[id(c)] = depth[id(node)] + 1
    out: dict[int, list[tuple[int, int, int]]] = {}
    for k, (a, b) in enumerate(arcs):
        x, y = leaf[a], leaf[b]
        ix = iy = -1
        while depth[id(x)] > depth[id(y)]:
            x, ix = parent[id(x)]
        while depth[id(y)] > depth[id(x)]:
            y, iy = parent[id(y)]
        while x is not y:
            x, ix = parent[id(x)]
            y, iy = parent[id(y)]
        # x is the lowest common ancestor; ix, iy the children on the way up from a and b
        out.setdefault(id(x), []).append((ix, iy, k))
    return out


def nodes_by_id(tree: ModuleNode) -> dict[int, ModuleNode]:
    """``{id(node): node}`` for every node of the tree (the keys :func:`place_arcs` uses)."""
    return {id(node): node for node in tree.nodes()}
