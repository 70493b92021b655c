"""Independent check that a core is minimal, by witness orders.

A core is minimal when dropping any one member makes the rest feasible.  Instead of re-solving,
the extractor hands over one *witness* per member: a relation on the core's items that is a
strict partial order and meets every other member.  This module checks each witness directly
from the definitions (irreflexive; transitive, hence antisymmetric; each requirement met) and
that every member is a requirement of the problem.  It shares no code with the extractor
(:mod:`satorder.sat.mus`).  Infeasibility of the core itself is shown separately, by the replayed
derivation (:mod:`satorder.certify.derivation`) or
:func:`satorder.certify.core.check_core_infeasible`.

>>> from satorder.model.requirement import Requirement as R
>>> core = [R("fixed", (0, 1)), R("fixed", (1, 0))]
>>> check_minimality_witnesses(None, core, {0: [(1, 0)], 1: [(0, 1)]})
"""

from __future__ import annotations

from satorder.errors import CertificateError
from satorder.model.requirement import Kind, Requirement


def _member_of(problem, r: Requirement) -> bool:
    kind, (a, b) = r
    if not (0 <= a < problem.n and 0 <= b < problem.n) or a == b:
        return False
    if kind == Kind.COMPARABLE:
        return b in problem.adj[a]
    if kind == Kind.INCOMPARABLE:
        return b not in problem.adj[a] if problem.incomparable is None \
            else b in problem.incomparable[a]
    if kind == Kind.FIXED:
        return (a, b) in set(problem.fixed)
    if kind == Kind.FORBIDDEN:
        return (a, b) in set(problem.forbidden)
    return False


def _meets(arcs: set, r: Requirement) -> bool:
    kind, (a, b) = r
    if kind == Kind.COMPARABLE:
        return (a, b) in arcs or (b, a) in arcs
    if kind == Kind.INCOMPARABLE:
        return (a, b) not in arcs and (b, a) not in arcs
    if kind == Kind.FIXED:
        return (a, b) in arcs
    return (a, b) not in arcs


def check_minimality_witnesses(problem, core: list[Requirement], witnesses: dict) -> None:
    """Raise :class:`CertificateError` unless every member of ``core`` is a requirement of
    ``problem`` (skipped when ``problem`` is None) and ``witnesses[k]`` (a collection of arcs
    ``(a, b)`` meaning ``a < b``) is a strict partial order meeting every member except ``k``."""
    if problem is not None:
        for r in core:
            if not _member_of(problem, r):
                raise CertificateError(f"core entry {r.kind} {r.pair} is not a requirement "
                                       "of the problem")
    for k in range(len(core)):
        if k not in witnesses:
            raise CertificateError(f"no witness that core member {k} is needed")
        arcs = set(map(tuple, witnesses[k]))
        above: dict = {}
        for a, b in arcs:
            if a == b:
                raise CertificateError(f"witness {k} is not irreflexive")
            above.setdefault(a, set()).add(b)
        for a, b in arcs:
            missing = above.get(b, set()) - above[a]
            if missing:
                raise CertificateError(f"witness {k} is not transitive at {a} < {b}")
        for j, r in enumerate(core):
            if j != k and not _meets(arcs, r):
                raise CertificateError(f"witness {k} does not meet core member {j}")
