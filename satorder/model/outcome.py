"""How each requirement came out in an answer: the ``requirements`` rows of ``solve --json``,
the requirements table that ``solve`` prints, and the state column of a report.

For a feasible answer the rows cover what the answer had to choose or could not promise: each
fixed arc, each forbidden arc, each open pair (a pair the problem leaves free: how the answer
settled it) and each preference (met or given up).  Comparable pairs are all in ``order``, and
pairs that must stay unordered are exactly the ones ``order`` leaves out, so they get no row.
Every row is worded by :func:`satorder.model.wording.requirement_text`; :func:`state` words
how one requirement came out.

The relation of a pair in an answer is one of ``"before"`` (the first item comes first),
``"after"`` or ``"unordered"``.

>>> from satorder.model.problem import Problem
>>> p = Problem.from_lists(comparable=[("kiln", "loom")], incomparable=[],
...                        forbidden=[("loom", "kiln")], items=["kiln", "loom", "quay"])
>>> succ = [{1}, set(), set()]
>>> for r in requirement_rows(p, succ):
...     print(r["kind"], r["relation"], r["state"], sep=" | ")
forbidden | after | holds: kiln before loom
open | unordered | left unordered
open | unordered | left unordered
>>> requirement_rows(p, succ)[0]["text"]
'forbidden: loom must not come before kiln'
"""

from __future__ import annotations

from collections.abc import Iterator, Sequence
from typing import Any

from satorder.model.wording import requirement_text

OPEN_ROWS = 100_000  # open pairs listed in the rows before the rest are only counted


def relation(succ: list[set[int]], a: int, b: int) -> str:
    """``"before"`` when a < b in the order, ``"after"`` when b < a, else ``"unordered"``."""
    if b in succ[a]:
        return "before"
    if a in succ[b]:
        return "after"
    return "unordered"


def state(kind: str, a: int, b: int, succ: list[set[int]] | None, names: Sequence[str],
          weight: int | None = None) -> tuple[bool | None, str]:
    """``(holds, words)``: whether requirement ``kind`` on ``(a, b)`` holds in the order
    ``succ`` and how the pair came out, e.g. ``(True, "holds: kiln before loom")``.  For an
    open pair ``holds`` is None (nothing was required); a preference holds when it is met.
    Without an order: ``(None, "—")``."""
    if succ is None:
        return None, "—"
    rel = relation(succ, a, b)
    how = {"before": f"{names[a]} before {names[b]}", "after": f"{names[b]} before {names[a]}",
           "unordered": "left unordered"}[rel]
    kind = str(kind)
    if kind == "open":
        return None, how
    if kind == "prefer":
        ok = rel == "before"
        return ok, "met" if ok else f"given up (costs {weight}): {how}"
    if kind == "comparable":
        ok = rel != "unordered"
    elif kind == "incomparable":
        ok = rel == "unordered"
    elif kind == "fixed":
        ok = rel == "before"
    elif kind == "forbidden":
        ok = rel != "before"
    else:
        raise ValueError(f"unknown requirement kind {kind!r}")
    return ok, ("holds: " if ok else "broken: ") + how


def open_pairs(problem, limit: int | None = None) -> Iterator[tuple[int, int]]:
    """The open pairs ``(a, b)``, ``a < b``, of a problem with an explicit list of pairs that
    must stay unordered (none under ``"others"``), at most ``limit`` of them."""
    if problem.incomparable is None or (limit is not None and limit <= 0):
        return
    adj, inc, n = problem.adj, problem.incomparable, problem.n
    count = 0
    for a in range(n):
        named = adj[a] | inc[a]
        if len(named) >= n - 1 - a and all(b in named for b in range(a + 1, n)):
            continue
        for b in range(a + 1, n):
            if b not in named:
                yield a, b
                count += 1
                if limit is not None and count >= limit:
                    return


def requirement_rows(problem, succ: list[set[int]],
                     open_limit: int = OPEN_ROWS) -> list[dict[str, Any]]:
    """One JSON-ready row per fixed arc, forbidden arc, open pair (up to ``open_limit``) and
    preference: ``kind``, ``pair`` (item names; the arc's direction for arcs), ``weight``
    (preferences), ``text`` (the requirement in words), ``relation`` (how the pair came out:
    before / after / unordered, relative to ``pair``), ``holds`` (null for open pairs) and
    ``state`` (the outcome in words)."""
    names = problem.items
    rows: list[dict[str, Any]] = []

    def add(kind: str, a: int, b: int, weight=None) -> None:
        holds, words = state(kind, a, b, succ, names, weight=weight)
        row: dict[str, Any] = {"kind": kind, "pair": [names[a], names[b]]}
        if weight is not None:
            row["weight"] = weight
        row.update(text=requirement_text((kind, (a, b)), names, weight=weight),
                   relation=relation(succ, a, b), holds=holds, state=words)
        rows.append(row)

    for a, b in problem.fixed:
        add("fixed", a, b)
    for a, b in problem.forbidden:
        add("forbidden", a, b)
    for a, b in open_pairs(problem, open_limit):
        add("open", a, b)
    for a, b, w in problem.prefer:
        add("prefer", a, b, weight=w)
    return rows
