"""The answers of a problem without open pairs, as independent choices at the nodes of the
modular decomposition with the fixed and forbidden arcs placed where their ends separate.

When every pair is either comparable or must stay unordered, the answers are the transitive
orientations of the comparability graph that meet the arcs.  A transitive orientation is an
independent choice at every node of the modular decomposition (Gallai 1967; McConnell &
Spinrad, "Modular decomposition and transitive orientation", Discrete Math. 201, 1999): a
linear order of the children of a series node, one of the two transitive orientations of a
prime node's quotient (a prime comparability graph has exactly two, one the reverse of the
other), nothing at a parallel node.  An arc ``a → b`` is decided at the lowest common ancestor
of ``a`` and ``b`` alone, where it says "the child holding ``a`` before the child holding
``b``" (:func:`satorder.graph.arcs.place_arcs`).  So a series node with arcs among ``r`` of its
``k`` children admits ``k!/r!`` times the linear extensions of the order those arcs put on the
``r`` children (:mod:`satorder.graph.linear_extensions`), and a prime node admits those of its
two orientations that agree with all of its arcs.  The number of answers is the product.

:func:`constrain` returns a :class:`Constrained`: the tree, each series or prime node with its
arcs and its admissible choices, and the count — all the answers at once, where
:mod:`satorder.graph.constrained` finds one of them (or a core when there is none).  Counting
(:mod:`satorder.pipeline.count`), pair shares (:mod:`satorder.graph.pair_shares`) and uniform
samples (:mod:`satorder.graph.decomposition_sample`) read their answers from it.

>>> from satorder.model.problem import Problem
>>> tri = [("a", "b"), ("b", "c"), ("a", "c")]
>>> constrain(Problem.from_lists(comparable=tri)).count
6
>>> constrain(Problem.from_lists(comparable=tri, fixed=[("a", "c")])).count
3
"""

from __future__ import annotations

from dataclasses import dataclass, field
from math import prod

from satorder.graph.arcs import place_arcs, required_arcs
from satorder.graph.forcing import transitive_orientation
from satorder.graph.linear_extensions import LinearExtensions, TooManyStates
from satorder.graph.modular import (
    LEAF,
    PARALLEL,
    PRIME,
    SERIES,
    ModuleNode,
    modular_decomposition,
    quotient,
)
from satorder.model.problem import Problem

__all__ = ["Constrained", "NodeChoices", "TooManyStates", "constrain"]


@dataclass(eq=False)
class NodeChoices:
    """A series or prime node, its arcs (``(i, j)``: child ``i`` before child ``j``) and the
    choices they leave.

    Series: ``involved`` lists the children the arcs touch and ``ext`` the linear extensions
    of the order the arcs put on them (``before`` masks over positions in ``involved``).
    Prime: ``quotient`` is its quotient graph, ``up`` the arcs ``(i, j)`` of one of its two
    transitive orientations and ``allowed`` says whether ``up`` and its reverse meet the arcs.
    """

    node: ModuleNode
    arcs: list[tuple[int, int]] = field(default_factory=list)
    involved: list[int] = field(default_factory=list)
    ext: LinearExtensions | None = None
    quotient: list[set[int]] | None = None
    up: set[tuple[int, int]] | None = None
    allowed: tuple[bool, bool] = (True, True)
    count: int = 1

    @property
    def kind(self) -> str:
        return self.node.kind


@dataclass
class Constrained:
    """The decomposition of a problem without open pairs with its arcs placed (see the module
    docstring).  ``count`` is 0 when no answer exists; ``reason`` then says why."""

    problem: Problem
    tree: ModuleNode | None
    nodes: list[NodeChoices]
    count: int
    reason: str = ""
    kinds: dict[str, int] = field(default_factory=dict)


def constrain(problem: Problem, orient_primes: bool = True,
              answer: list[set[int]] | None = None) -> Constrained:
    """Decompose ``problem`` (no open pairs) and place its arcs; see the module docstring.

    Each prime node's quotient is oriented (needed for shares and samples; with
    ``orient_primes=False`` only the prime nodes that carry arcs are, which is all counting
    needs once the whole graph is known to be a comparability graph).  Given a certified
    ``answer`` (successor sets), a prime node takes its orientation from it: an answer is a
    transitive orientation, and so is its restriction to one representative per child (an
    induced subgraph isomorphic to the quotient), with no second run of the forcing algorithm.
    Raises
    :class:`~satorder.graph.linear_extensions.TooManyStates` when a series node carries too
    many arcs for the down-set count, and ``ValueError`` for a problem with open pairs.
    """
    if problem.has_open_pairs:
        raise ValueError("the decomposition describes problems without open pairs")
    arcs = required_arcs(problem)
    if arcs is None:
        return Constrained(problem, None, [], 0, "a fixed arc lies on a pair that must stay "
                                                 "unordered")
    if problem.n == 0:
        return Constrained(problem, None, [], 1)
    adj = problem.adj
    tree = modular_decomposition(adj)
    placed = {key: [(i, j) for i, j, _ in found]
              for key, found in place_arcs(tree, arcs, problem.n).items()}
    kinds = {SERIES: 0, PARALLEL: 0, PRIME: 0}
    nodes: list[NodeChoices] = []
    total = 1
    reason = ""
    for node in tree.nodes():
        if node.kind == LEAF:
            continue
        kinds[node.kind] += 1
        if node.kind == PARALLEL:
            continue
        choice = NodeChoices(node, placed.get(id(node), []))
        if node.kind == SERIES:
            _series(choice)
            if choice.count == 0:
                reason = reason or "the fixed and forbidden arcs order the parts of a series " \
                                   "node in a cycle"
        elif orient_primes or choice.arcs:
            if not _prime(adj, choice, answer):
                total, reason = 0, "the comparable pairs admit no order (not a comparability " \
                                   "graph)"
            elif choice.count == 0:
                reason = reason or "the fixed and forbidden arcs meet neither orientation of " \
                                   "a prime node"
        else:
            choice.count = 2
        nodes.append(choice)
        total *= choice.count
    return Constrained(problem, tree, nodes, total, reason if total == 0 else "", kinds)


def _series(choice: NodeChoices) -> None:
    k = len(choice.node.children)
    if not choice.arcs:
        choice.count = prod(range(2, k + 1))
        return
    involved = sorted({i for arc in choice.arcs for i in arc})
    pos = {c: t for t, c in enumerate(involved)}
    before = [0] * len(involved)
    for i, j in choice.arcs:
        before[pos[j]] |= 1 << pos[i]
    choice.involved = involved
    choice.ext = LinearExtensions(before)
    r = len(involved)
    choice.count = prod(range(r + 1, k + 1)) * choice.ext.count  # k!/r! × extensions


def _prime(adj, choice: NodeChoices, answer: list[set[int]] | None = None) -> bool:
    """Orient a prime node's quotient; False when it has no transitive orientation."""
    q = quotient(adj, choice.node)
    if answer is not None:
        reps = [c.representative for c in choice.node.children]
        up = {(i, j) for i, r in enumerate(reps) for j in q[i] if reps[j] in answer[r]}
    else:
        res = transitive_orientation(q)
        if not res.orientable:
            choice.count = 0
            return False
        up = set(res.arcs())
    forward = all((i, j) in up for i, j in choice.arcs)
    backward = all((j, i) in up for i, j in choice.arcs)
    choice.quotient, choice.up = q, up
    choice.allowed = (forward, backward)
    choice.count = int(forward) + int(backward)
    return True
