"""The rows of a report's requirements table: a count per kind and one row per requirement,
worded for people, with the requirement's state in the answer.

Rows come lazily (a problem may hold a million pairs): members of a core first, then fixed
arcs, forbidden arcs, pairs that must be ordered, listed pairs that must stay unordered, and
preferences.  Under ``"incomparable": "others"`` the pairs that must stay unordered are counted
but not listed (there are about n²/2 of them), except those in a core.

>>> from satorder import Problem
>>> p = Problem.from_lists(comparable=[("kiln", "loom")])
>>> list(requirement_rows(p, succ=[{1}, set()]))
[('comparable', 'kiln, loom must be ordered', 'holds: kiln first')]
"""

from __future__ import annotations

from collections.abc import Iterator

from satorder.model.requirement import Kind, Requirement
from satorder.render.explanation_text import requirement_text

MEANING = {
    "comparable": "must be ordered, one way or the other",
    "incomparable": "must stay unordered",
    "fixed": "the first must come before the second",
    "forbidden": "the first may not come before the second",
    "open": "free: ordered either way or left unordered",
    "prefer": "wished-for arc, given up only at its weight",
}


def requirement_counts(problem) -> list[tuple[str, int, str]]:
    """``(kind, count, meaning)`` for every kind the problem has."""
    n = problem.n
    fixed_pairs = {frozenset(a) for a in problem.fixed}
    comparable = problem.num_comparable - sum(1 for a, b in fixed_pairs if b in problem.adj[a])
    rows = [("comparable", comparable, MEANING["comparable"])]
    if problem.incomparable is None:
        rows.append(("incomparable", problem.num_incomparable,
                     "every pair not listed as comparable must stay unordered"))
    else:
        rows.append(("incomparable", problem.num_incomparable, MEANING["incomparable"]))
        free = n * (n - 1) // 2 - problem.num_comparable - problem.num_incomparable
        rows.append(("open", free, MEANING["open"]))
    rows += [("fixed", len(problem.fixed), MEANING["fixed"]),
             ("forbidden", len(problem.forbidden), MEANING["forbidden"])]
    if problem.prefer:
        rows.append(("prefer", len(problem.prefer), MEANING["prefer"]))
    return [r for r in rows if r[1] or r[0] in ("comparable", "incomparable")]


def _state(kind: Kind, a: int, b: int, succ, names) -> str:
    if succ is None:
        return "—"
    ab, ba = b in succ[a], a in succ[b]
    if kind == Kind.COMPARABLE:
        if ab or ba:
            return f"holds: {names[a] if ab else names[b]} first"
        return "broken: left unordered"
    if kind == Kind.INCOMPARABLE:
        return "broken: ordered" if ab or ba else "holds"
    if kind == Kind.FIXED:
        return "holds" if ab else "broken"
    return "broken" if ab else "holds"  # forbidden


def requirement_rows(problem, succ=None, core=None, unmet=None) -> Iterator[tuple[str, str, str]]:
    """``(kind, requirement in words, state)`` for each requirement (see the module doc)."""
    names = problem.items
    in_core = set()
    for r in core or ():
        r = Requirement(*r)
        in_core.add(r)
        yield r.kind.value, requirement_text(r, names), "in the core"

    def rows(kind, pairs):
        for a, b in pairs:
            r = Requirement(kind, (a, b))
            if r not in in_core:
                yield kind.value, requirement_text(r, names), _state(kind, a, b, succ, names)

    fixed_pairs = {frozenset(a) for a in problem.fixed}
    yield from rows(Kind.FIXED, problem.fixed)
    yield from rows(Kind.FORBIDDEN, problem.forbidden)
    yield from rows(Kind.COMPARABLE, ((a, b) for a, b in problem.comparable_pairs()
                                      if frozenset((a, b)) not in fixed_pairs))
    if problem.incomparable is not None:
        yield from rows(Kind.INCOMPARABLE, problem.incomparable_pairs())
    given_up = {(a, b) for a, b, _ in unmet or ()}
    for a, b, w in problem.prefer:
        state = "—" if succ is None else (
            f"given up (costs {w})" if (a, b) in given_up else "met")
        yield "prefer", f"{names[a]} before {names[b]} (weight {w})", state
