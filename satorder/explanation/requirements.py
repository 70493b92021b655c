"""The hard requirements of a problem listed one by one, the unit every core, repair and
derivation is written in.
"""

from __future__ import annotations

from itertools import combinations

from satorder.explanation import derivation as derivation
from satorder.model.problem import Problem


# ---------------------------------------------------------------------- requirements
def requirements(problem: Problem, items=None) -> list[dict]:
    """The hard requirements of ``problem`` as ``{"kind", "pair"}`` dicts, optionally only those
    whose two items lie in ``items``.  A fixed arc stands for its own pair: the pair is not
    listed again as comparable.  Under ``"others"`` the unordered pairs are enumerated, so
    without ``items`` this is for small problems."""
    keep = None if items is None else set(items)
    fixed_pairs = {frozenset(a) for a in problem.fixed}
    out: list[dict] = []

    def inside(a, b):
        return keep is None or (a in keep and b in keep)

    if keep is None:
        comp = problem.comparable_pairs()
    else:
        comp = ((a, b) for a in sorted(keep) for b in problem.adj[a] if a < b and b in keep)
    for a, b in comp:
        if frozenset((a, b)) not in fixed_pairs:
            out.append({"kind": "comparable", "pair": (a, b)})
    if keep is None:
        inc = problem.incomparable_pairs()
    else:
        inc = ((a, b) for a, b in combinations(sorted(keep), 2)
               if problem.must_be_unordered(a, b))
    out += [{"kind": "incomparable", "pair": (a, b)} for a, b in inc]
    out += [{"kind": "fixed", "pair": (a, b)} for a, b in problem.fixed if inside(a, b)]
    out += [{"kind": "forbidden", "pair": (a, b)} for a, b in problem.forbidden if inside(a, b)]
    return out


def _items_of(reqs) -> list[int]:
    return sorted({v for r in reqs for v in r["pair"]})
