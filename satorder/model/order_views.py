"""Three views of one order for people and programs: its levels, its covering pairs and one
sequence (a linear extension).  ``solve --json`` adds them to every feasible answer
(``levels``, ``covering``, ``sequence``; see docs/cli.md).

* **levels** — level 1 holds the minimal items; every other item sits one above its highest
  predecessor, so the level of an item is the number of items in a longest chain ending at it
  (Mirsky, "A dual of Dilworth's decomposition theorem", Amer. Math. Monthly 78, 1971: the
  levels are a partition into as many antichains as the height).  Computed by Kahn's
  topological sort (Kahn, "Topological sorting of large networks", CACM 5, 1962) run in rounds:
  an item's round is one more than its latest predecessor's.
* **covering pairs** — ``b`` covers ``a`` when ``a < b`` and nothing lies between (the arcs of
  the Hasse diagram, i.e. the transitive reduction).  The successors of ``a`` are visited by
  increasing level; one not yet reached through an earlier cover is a cover itself, and
  everything above it is then reached.  So only the successor sets of covers are merged,
  not those of every successor.
* **sequence** — the items level by level (ascending ids within a level): every item comes
  after all its predecessors, which sit on lower levels.

The order is ``succ``: transitively closed successor sets over item ids (see
:mod:`satorder.model.order`).  Nothing here checks that it is an order; engines' answers are
checked by :mod:`satorder.certify` before they are shown.

>>> succ = [{1, 2, 3}, {3}, {3}, set(), set()]   # 0 < 1, 2 < 3; item 4 stands alone
>>> levels(succ)
[[0, 4], [1, 2], [3]]
>>> sorted(covering_pairs(succ)), sequence(succ)
([(0, 1), (0, 2), (1, 3), (2, 3)], [0, 4, 1, 2, 3])
>>> views_json(succ, ['"a"', '"b"', '"c"', '"d"', '"e"'])[:36]
'"levels":[["a","e"],["b","c"],["d"]]'
"""

from __future__ import annotations

from collections.abc import Sequence


def level_numbers(succ: list[set[int]]) -> list[int]:
    """The level of each item (1 for minimal items); raises ``ValueError`` on a cycle."""
    n = len(succ)
    indeg = [0] * n
    for s in succ:
        for b in s:
            indeg[b] += 1
    level = [0] * n
    frontier = [a for a in range(n) if indeg[a] == 0]
    depth = 0
    placed = 0
    while frontier:
        depth += 1
        nxt = []
        for a in frontier:
            level[a] = depth
            for b in succ[a]:
                indeg[b] -= 1
                if indeg[b] == 0:
                    nxt.append(b)
        placed += len(frontier)
        frontier = nxt
    if placed != n:
        raise ValueError("the relation has a cycle")
    return level


def levels(succ: list[set[int]], level: list[int] | None = None) -> list[list[int]]:
    """The items of each level, level 1 first, ascending ids inside a level."""
    level = level_numbers(succ) if level is None else level
    out: list[list[int]] = [[] for _ in range(max(level, default=0))]
    for a, k in enumerate(level):
        out[k - 1].append(a)
    return out


def covering_pairs(succ: list[set[int]], level: list[int] | None = None) -> list[tuple[int, int]]:
    """The covering pairs ``(lower, upper)``, grouped by the lower item (ascending), uppers by
    level (see the module docstring)."""
    level = level_numbers(succ) if level is None else level
    key = level.__getitem__
    out: list[tuple[int, int]] = []
    for a, s in enumerate(succ):
        if not s:
            continue
        if len(s) == 1:
            out.append((a, next(iter(s))))
            continue
        reached: set[int] = set()
        for b in sorted(s, key=key):
            if b not in reached:
                out.append((a, b))
                reached |= succ[b]
    return out


def sequence(succ: list[set[int]], level: list[int] | None = None) -> list[int]:
    """One linear extension: the items level by level."""
    return [a for lv in levels(succ, level) for a in lv]


def views_json(succ: list[set[int]], quoted: Sequence[str]) -> str:
    """The JSON members ``"levels":…,"covering":…,"sequence":…`` (no braces), written straight
    from the successor sets; ``quoted[id]`` is the item's name already JSON-quoted."""
    level = level_numbers(succ)
    lv = levels(succ, level)
    parts = ['"levels":[', ",".join("[" + ",".join([quoted[a] for a in row]) + "]"
                                    for row in lv), "]"]
    parts += ['"covering":[', ",".join(["[" + quoted[a] + "," + quoted[b] + "]"
                                        for a, b in covering_pairs(succ, level)]), "]"]
    parts += ['"sequence":[', ",".join([quoted[a] for row in lv for a in row]), "]"]
    return parts[0] + parts[1] + parts[2] + "," + "".join(parts[3:6]) + "," + "".join(parts[6:])
