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

ARRAYS_FROM = 20_000  # ordered pairs from which numpy/scipy compute the views


def level_numbers(succ: list[set[int]]) -> list[int]:
    """The level of each item (1 for minimal items); raises ``ValueError`` on a cycle."""
    if sum(map(len, succ)) >= ARRAYS_FROM:
        return _levels_arrays(_csr(succ)).tolist()
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
    """The covering pairs ``(lower, upper)``, ascending."""
    return [(a, b) for a, ups in _cover_groups(succ, level) for b in ups]


def _cover_groups(succ: list[set[int]], level: list[int] | None = None):
    """``[(a, [items covering a, ascending])]`` for each item ``a`` that something covers,
    ascending."""
    if sum(map(len, succ)) >= ARRAYS_FROM:
        cover = _covering_arrays(_csr(succ))
        ptr, ups = cover.indptr.tolist(), cover.indices.tolist()
        return [(a, ups[ptr[a]:ptr[a + 1]]) for a in range(len(succ)) if ptr[a] < ptr[a + 1]]
    level = level_numbers(succ) if level is None else level
    key = level.__getitem__
    out: list[tuple[int, list[int]]] = []
    for a, s in enumerate(succ):
        if not s:
            continue
        if len(s) == 1:
            out.append((a, list(s)))
            continue
        reached: set[int] = set()
        found = []
        for b in sorted(s, key=key):
            if b not in reached:
                found.append(b)
                reached |= succ[b]
        out.append((a, sorted(found)))
    return out


def sequence(succ: list[set[int]], level: list[int] | None = None) -> list[int]:
    """One linear extension: the items level by level."""
    return [a for lv in levels(succ, level) for a in lv]


def views_json(succ: list[set[int]], quoted: Sequence[str]) -> str:
    """The JSON members ``"levels":…,"covering":…,"sequence":…`` (no braces), written straight
    from the successor sets; ``quoted[id]`` is the item's name already JSON-quoted."""
    if sum(map(len, succ)) >= ARRAYS_FROM:
        return _views_json_arrays(succ, quoted)
    level = level_numbers(succ)
    lv = levels(succ, level)
    rows = ",".join(["[" + ",".join([quoted[a] for a in row]) + "]" for row in lv])
    pairs = []
    for a, ups in _cover_groups(succ, level):
        qa = "[" + quoted[a] + ","
        pairs.append(",".join([qa + quoted[b] + "]" for b in ups]))
    seq = ",".join([quoted[a] for row in lv for a in row])
    return f'"levels":[{rows}],"covering":[{",".join(pairs)}],"sequence":[{seq}]'


# ---------------------------------------------------------------------- large orders
def _csr(succ: list[set[int]]):
    """The order as compressed sparse rows: ``(indptr, indices)`` numpy arrays."""
    from itertools import chain

    import numpy as np

    n = len(succ)
    deg = np.fromiter(map(len, succ), dtype=np.int64, count=n)
    indptr = np.zeros(n + 1, dtype=np.int64)
    np.cumsum(deg, out=indptr[1:])
    indices = np.fromiter(chain.from_iterable(succ), dtype=np.int64, count=int(indptr[-1]))
    return indptr, indices


def _levels_arrays(csr):
    """Kahn's rounds on arrays: each round lowers the in-degrees of every successor of the
    round's items at once (``numpy.bincount``)."""
    import numpy as np

    indptr, indices = csr
    n = len(indptr) - 1
    deg = np.diff(indptr)
    indeg = np.bincount(indices, minlength=n)
    level = np.zeros(n, dtype=np.int64)
    frontier = np.flatnonzero(indeg == 0)
    depth = placed = 0
    while frontier.size:
        depth += 1
        level[frontier] = depth
        placed += frontier.size
        lens = deg[frontier]
        total = int(lens.sum())
        if not total:
            break
        ends = np.cumsum(lens)
        at = np.repeat(indptr[frontier] - (ends - lens), lens) + np.arange(total)
        indeg -= np.bincount(indices[at], minlength=n)
        frontier = np.flatnonzero((indeg == 0) & (level == 0))
    if placed != n:
        raise ValueError("the relation has a cycle")
    return level


def _covering_arrays(csr):
    """Covering pairs of a transitively closed order: the pairs ``a < b`` with no ``c`` in
    between, i.e. where the relation's square (``S·S``: paths of two steps, counted by a
    sparse matrix product in scipy) has no entry.  Returns them as a scipy CSR matrix, each
    row's uppers ascending."""
    import numpy as np
    from scipy.sparse import csr_matrix

    indptr, indices = csr
    n = len(indptr) - 1
    s = csr_matrix((np.ones(len(indices), dtype=np.int32), indices, indptr), shape=(n, n))
    s.sort_indices()
    between = (s @ s).multiply(s)  # on the order's pairs: how many items lie between
    between.eliminate_zeros()
    cover = s - between.sign().astype(np.int32)  # 1 exactly on pairs with nothing between
    cover.eliminate_zeros()
    cover.sort_indices()
    return cover


def _views_json_arrays(succ: list[set[int]], quoted: Sequence[str]) -> str:
    """:func:`views_json` for large orders: levels, covers and the sequence as arrays, each
    covering pair's text made by adding object arrays (one C loop, no Python loop per pair)."""
    import numpy as np

    n = len(succ)
    csr = _csr(succ)
    level = _levels_arrays(csr)
    cover = _covering_arrays(csr)
    seq = np.argsort(level, kind="stable")  # level by level, ascending ids inside a level
    names = [quoted[a] for a in seq.tolist()]
    rows, start = [], 0
    for end in np.cumsum(np.bincount(level)[1:]).tolist():
        rows.append("[" + ",".join(names[start:end]) + "]")
        start = end
    left = np.array(["[" + q + "," for q in quoted], dtype=object)
    right = np.array([q + "]" for q in quoted], dtype=object)
    lower = np.repeat(np.arange(n), np.diff(cover.indptr))
    pairs = ",".join((left[lower] + right[cover.indices]).tolist()) if len(lower) else ""
    return (f'"levels":[{",".join(rows)}],"covering":[{pairs}],'
            f'"sequence":[{",".join(names)}]')
