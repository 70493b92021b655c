"""Check a core: its members are requirements of the problem and admit no order on their own
(every other pair open), decided by the textbook all-triples encoding with MiniSat — not the
engine's compact encoding nor its default solver."""

from __future__ import annotations

from satorder.errors import CertificateError
from satorder.model.requirement import KINDS, Kind, Requirement, items_of


def _core_is_feasible(core: list[Requirement]) -> bool:
    """Decide a small requirement set on its own (all unnamed pairs open) by the textbook
    encoding over every ordered pair and every triple of the items it mentions, solved with
    MiniSat — deliberately not the engine's compact encoding nor its default solver."""
    from itertools import permutations

    from pysat.solvers import Solver

    items = items_of(core)
    var = {}
    for a, b in permutations(items, 2):
        var[a, b] = len(var) + 1
    clauses = [[-var[a, b], -var[b, a]] for a, b in permutations(items, 2) if a < b]
    clauses += [[-var[a, b], -var[b, c], var[a, c]] for a, b, c in permutations(items, 3)]
    for r in core:
        kind, (a, b) = r
        if kind not in KINDS or a == b:
            raise CertificateError(f"core entry {r!r} is not a requirement")
        if kind == Kind.COMPARABLE:
            clauses.append([var[a, b], var[b, a]])
        elif kind == Kind.INCOMPARABLE:
            clauses += [[-var[a, b]], [-var[b, a]]]
        elif kind == Kind.FIXED:
            clauses.append([var[a, b]])
        else:
            clauses.append([-var[a, b]])
    with Solver(name="minisat22", bootstrap_with=clauses) as s:
        return s.solve()


def check_core_infeasible(problem, core: list[Requirement], minimal: bool = False) -> None:
    """Verify that a core (requirements over item ids) belongs to the problem and admits no
    order on its own; with ``minimal``, also that dropping any one member makes it feasible
    (deletion-based MUS check)."""
    fixed, forbidden = set(problem.fixed), set(problem.forbidden)
    for kind, (a, b) in core:
        if kind == Kind.COMPARABLE:
            present = b in problem.adj[a]
        elif kind == Kind.INCOMPARABLE:
            present = problem.must_be_unordered(a, b)
        elif kind == Kind.FIXED:
            present = (a, b) in fixed
        elif kind == Kind.FORBIDDEN:
            present = (a, b) in forbidden
        else:
            present = False
        if not present:
            raise CertificateError(f"core entry {kind} {a},{b} is not a requirement of the problem")
    if _core_is_feasible(core):
        raise CertificateError("the core admits an order on its own, so it proves nothing")
    if minimal:
        for k in range(len(core)):
            if not _core_is_feasible(core[:k] + core[k + 1:]):
                raise CertificateError(f"the core is not minimal: member {k} can be dropped")
