"""Which requirements a chain of Γ ties rests on.

The compact encoding (:mod:`satorder.sat.encoding`) gives all arcs of an implication class one
variable.  Arcs share a class through single Γ steps (Golumbic, *Algorithmic Graph Theory and
Perfect Graphs*, 1980, ch. 5): ``v→x`` forces ``v→y`` (and ``x→v`` forces ``y→v``) when
``{v, x}`` and ``{v, y}`` are comparable and ``{x, y}`` must stay unordered.  A step therefore
rests on three requirements: its two comparable pairs and the unordered pair forcing it.  These
functions read the steps off a breadth-first path in the tie graph (nodes ``2e`` and ``2e+1``:
edge ``e`` as ``lo<hi`` and as ``hi<lo``) and name the requirements behind them, to explain a
refutation by the requirements it used.
"""

from __future__ import annotations

from satorder.model.requirement import Kind, Requirement

Arc = tuple[int, int]
Key = Requirement  # selectors and refutations are keyed by the requirement they stand for


def _gamma_steps_back(pred, root: int, target: int, edges: list[Arc]):
    """The Γ steps of a breadth-first path (predecessors ``pred``) from arc node ``root`` to
    ``target``, walked back from the target: ``(earlier arc, later arc, the pair that must stay
    unordered forcing the step)``.  Raises LookupError if the target is not reachable."""

    def arc(node: int) -> Arc:
        a, b = edges[node // 2]
        return (a, b) if node % 2 == 0 else (b, a)

    node = target
    while node != root:
        prev = int(pred[node])
        if prev < 0:
            raise LookupError(f"arc node {target} is not tied to {root}")
        (a, b), (c, d) = arc(prev), arc(node)
        yield (a, b), (c, d), ((b, d) if a == c else (a, c))
        node = prev


def _pair_key(kind: Kind, pair: Arc) -> Key:
    return Requirement(kind, (min(pair), max(pair)))


def tie_paths(graph, root: int, targets: set[int], edges: list[Arc]) -> list[Key] | None:
    """Requirements along breadth-first paths of Γ steps from arc node ``root`` to each target
    (None if a target is not reachable, which would be a bug)."""
    from scipy.sparse.csgraph import breadth_first_order

    _, pred = breadth_first_order(graph, root, directed=False, return_predecessors=True)
    out: dict[Key, None] = {}
    try:
        for t in targets:
            for earlier, later, witness in _gamma_steps_back(pred, root, t, edges):
                out[_pair_key(Kind.COMPARABLE, earlier)] = None
                out[_pair_key(Kind.COMPARABLE, later)] = None
                out[_pair_key(Kind.INCOMPARABLE, witness)] = None
    except LookupError:
        return None
    return list(out)


def conflict_core(graph, e: int, edges: list[Arc]) -> list[Key]:
    """Requirements along a shortest chain of Γ steps from edge e's arc to its reverse: the
    comparable pairs of the chain and the pairs that must stay unordered forcing each step."""
    from scipy.sparse.csgraph import breadth_first_order

    _, pred = breadth_first_order(graph, 2 * e, directed=False, return_predecessors=True)
    core: list[Key] = []
    for _, later, witness in _gamma_steps_back(pred, 2 * e, 2 * e + 1, edges):
        core.append(_pair_key(Kind.COMPARABLE, later))
        core.append(_pair_key(Kind.INCOMPARABLE, witness))
    return list(dict.fromkeys(core))
