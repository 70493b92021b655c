"""The hard requirements of a problem listed one by one, the unit every core, repair and
derivation is written in.
"""

from __future__ import annotations

from itertools import combinations

from satorder.model.problem import Problem
from satorder.model.requirement import Kind, Requirement


def requirements(problem: Problem, items=None) -> list[Requirement]:
    """The hard requirements of ``problem``, optionally only those whose two items lie in
    ``items``.  A fixed arc stands for its own pair: the pair is not listed again as
    comparable.  Under ``"others"`` the unordered pairs are enumerated, so without ``items``
    this is for small problems."""
    keep = None if items is None else set(items)
    fixed_pairs = {frozenset(a) for a in problem.fixed}
    out: list[Requirement] = []

    def inside(a, b):
        return keep is None or (a in keep and b in keep)

    if keep is None:
        comp = problem.comparable_pairs()
    else:
        comp = ((a, b) for a in sorted(keep) for b in problem.adj[a] if a < b and b in keep)
    for a, b in comp:
        if frozenset((a, b)) not in fixed_pairs:
            out.append(Requirement(Kind.COMPARABLE, (a, b)))
    if keep is None:
        inc = problem.incomparable_pairs()
    else:
        inc = ((a, b) for a, b in combinations(sorted(keep), 2)
               if problem.must_be_unordered(a, b))
    out += [Requirement(Kind.INCOMPARABLE, (a, b)) for a, b in inc]
    out += [Requirement(Kind.FIXED, arc) for arc in problem.fixed if inside(*arc)]
    out += [Requirement(Kind.FORBIDDEN, arc) for arc in problem.forbidden if inside(*arc)]
    return out
