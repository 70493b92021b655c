"""Checking what explain claims: the engines produce certificates (a forcing chain, one witness
order per core member) and the independent checks of :mod:`satorder.certify` accept or
reject them.
"""

from __future__ import annotations

from satorder import certify
from satorder.certify.minimality import check_minimality_witnesses
from satorder.errors import CertificateError
from satorder.explanation import derivation as derivation
from satorder.graph.forcing import transitive_orientation
from satorder.graph.obstruction import (
    induced_adjacency,
)
from satorder.model.problem import Problem
from satorder.model.requirement import PAIR_KINDS, Kind, Requirement, items_of
from satorder.sat.mus import (
    core_oracle,
)

MINIMALITY_CHECK_ITEMS = 40  # all-triples re-solve of a core up to this many items


# ---------------------------------------------------------------------- obstruction check
def check_obstruction(problem: Problem, items: list[int]) -> None:
    """Independently confirm that ``items`` induce a minimal non-orientable subgraph: a forcing
    chain of the induced subgraph passes :func:`certify.check_forcing_chain`, and each
    one-item-smaller subset has an orientation that passes :func:`certify.check_order`."""

    def sub_problem(vs):
        order, sub = induced_adjacency(problem.adj, vs)
        return Problem(items=[problem.items[v] for v in order], adj=sub)

    p = sub_problem(items)
    res = transitive_orientation(p.adj)
    if res.orientable:
        raise CertificateError("the obstruction's items induce an orientable subgraph")
    certify.check_forcing_chain(p, res.chain)
    # an odd chordless cycle of length >= 5 is minimal by a published fact (Golumbic 1980,
    # ch. 5: removing an item leaves paths, which are bipartite); checked structurally here
    degrees = [len(nb) for nb in p.adj]
    if len(items) >= 5 and len(items) % 2 == 1 and set(degrees) == {2}:
        reach, todo = {0}, [0]
        while todo:
            for u in p.adj[todo.pop()]:
                if u not in reach:
                    reach.add(u)
                    todo.append(u)
        if len(reach) == len(items):
            return
    for k in range(len(items)):
        q = sub_problem(items[:k] + items[k + 1:])
        r = transitive_orientation(q.adj)
        if not r.orientable:
            raise CertificateError(
                f"the obstruction is not minimal: {problem.items[items[k]]} can be dropped")
        certify.check_order(q, r.successor_sets())


def forcing_witness(core: list[Requirement], k: int):
    """An order meeting every member of ``core`` but member ``k``, from a transitive
    orientation (Golumbic 1980, ch. 5): order exactly the pairs that must be ordered (plus the
    pair of ``k`` when it is an unordered one) and nothing else.  Only for cores made of
    comparable and unordered pairs; ``None`` when that graph has no transitive orientation."""
    if any(r.kind not in PAIR_KINDS for r in core):
        return None
    items = items_of(core)
    pos = {v: i for i, v in enumerate(items)}
    adj: list[set[int]] = [set() for _ in items]
    for j, (kind, (a, b)) in enumerate(core):
        if (kind == Kind.COMPARABLE) != (j == k):
            a, b = pos[a], pos[b]
            adj[a].add(b)
            adj[b].add(a)
    res = transitive_orientation(adj)
    if not res.orientable:
        return None
    return [(items[a], items[b]) for a, b in res.arcs()]  # transitively closed already


def minimality_witnesses(core: list[Requirement]) -> dict[int, list]:
    """One witness order per member of ``core`` (each meets all other members): from a
    transitive orientation where one exists, otherwise from a SAT call.  Raises
    :class:`CertificateError` when some member can be dropped (the core is not minimal)."""
    witnesses = {k: w for k in range(len(core))
                 if (w := forcing_witness(core, k)) is not None}
    missing = [k for k in range(len(core)) if k not in witnesses]
    if missing:
        with core_oracle(core) as oracle:
            everything = range(len(core))
            for k in missing:
                ok, arcs = oracle.check([j for j in everything if j != k])
                if not ok:
                    raise CertificateError(f"the core is not minimal: member {k} can be dropped")
                witnesses[k] = arcs
    return witnesses


def check_core(problem: Problem, core: list[Requirement], replayed: bool,
               witnesses=None) -> None:
    """Independent checks of a core: one witness order per member shows minimality
    (:func:`satorder.certify.minimality.check_minimality_witnesses`); infeasibility is shown by the
    replayed derivation (``replayed``) and, for cores on few items, also re-solved by
    :func:`satorder.certify.core.check_core_infeasible`."""
    if witnesses is None:
        witnesses = minimality_witnesses(core)
    check_minimality_witnesses(problem, core, witnesses)
    if not replayed or len(items_of(core)) <= MINIMALITY_CHECK_ITEMS:
        certify.check_core_infeasible(problem, core)
