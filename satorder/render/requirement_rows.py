"""The rows of a report's requirements table: a count per kind and one row per requirement,
worded for people, with the requirement's state in the answer.

Rows come lazily (a problem may hold a million pairs): members of a core first, then fixed
arcs, forbidden arcs, pairs that must be ordered, listed pairs that must stay unordered, open
pairs, and preferences.  Under ``"incomparable": "others"`` the pairs that must stay unordered
are counted but not listed (there are about n²/2 of them), except those in a core.

>>> from satorder import Problem
>>> p = Problem.from_lists(comparable=[("kiln", "loom")])
>>> for row in requirement_rows(p, succ=[{1}, set()]):
...     print(*row, sep=" | ")
... # doctest: +NORMALIZE_WHITESPACE
comparable | comparable: kiln and loom must be ordered, one way or the other |
holds: kiln before loom
"""

from __future__ import annotations

from collections.abc import Iterator

from satorder.model.outcome import open_pairs, state
from satorder.model.requirement import Kind, Requirement
from satorder.model.wording import requirement_text

MEANING = {kind: requirement_text((kind, (0, 1)), ["a", "b"], form="clause", weight="w")
           for kind in ("comparable", "incomparable", "fixed", "forbidden", "open", "prefer")}


def requirement_counts(problem) -> list[tuple[str, int, str]]:
    """``(kind, count, meaning)`` for every kind the problem has (the meaning in the one
    wording, over two items a and b)."""
    fixed_pairs = {frozenset(a) for a in problem.fixed}
    comparable = problem.num_comparable - sum(1 for a, b in fixed_pairs if b in problem.adj[a])
    rows = [("comparable", comparable, MEANING["comparable"])]
    if problem.incomparable is None:
        rows.append(("incomparable", problem.num_incomparable,
                     "every pair not listed as comparable must stay unordered"))
    else:
        rows.append(("incomparable", problem.num_incomparable, MEANING["incomparable"]))
        rows.append(("open", problem.num_open, MEANING["open"]))
    rows += [("fixed", len(problem.fixed), MEANING["fixed"]),
             ("forbidden", len(problem.forbidden), MEANING["forbidden"])]
    if problem.prefer:
        rows.append(("prefer", len(problem.prefer), MEANING["prefer"]))
    return [r for r in rows if r[1] or r[0] in ("comparable", "incomparable")]


def requirement_rows(problem, succ=None, core=None, unmet=None) -> Iterator[tuple[str, str, str]]:
    """``(kind, requirement in words, state)`` for each requirement (see the module doc); the
    words come from :func:`satorder.model.wording.requirement_text` and the state from
    :func:`satorder.model.outcome.state`, as in ``solve``'s own table and JSON.  ``unmet`` is
    accepted for callers that have it; a preference's state is read off the order itself."""
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
                yield kind.value, requirement_text(r, names), state(kind, a, b, succ, names)[1]

    fixed_pairs = {frozenset(a) for a in problem.fixed}
    yield from rows(Kind.FIXED, problem.fixed)
    yield from rows(Kind.FORBIDDEN, problem.forbidden)
    yield from rows(Kind.COMPARABLE, ((a, b) for a, b in problem.comparable_pairs()
                                      if frozenset((a, b)) not in fixed_pairs))
    if problem.incomparable is not None:
        yield from rows(Kind.INCOMPARABLE, problem.incomparable_pairs())
        for a, b in open_pairs(problem):
            yield "open", requirement_text(("open", (a, b)), names), \
                state("open", a, b, succ, names)[1]
    for a, b, w in problem.prefer:
        yield ("prefer", requirement_text(("prefer", (a, b)), names, weight=w),
               state("prefer", a, b, succ, names, weight=w)[1])
