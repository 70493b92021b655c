"""The views of :mod:`satorder.model.order_views` (levels, covering pairs, a sequence) computed
on compact successor sets (:class:`~satorder.model.adjacency.CsrSets`) in one compiled loop,
for answers with millions of pairs: memory is a few integers per item and one per covering
pair, with no sparse matrix product.

Same definitions and the same output as :func:`satorder.model.order_views.views_json`: levels by
Kahn's topological sort (Kahn, CACM 5, 1962), an item one level above its highest predecessor
(Mirsky 1971); the successors of ``a`` visited by increasing level, one not yet reached through
an earlier cover being a cover itself; the sequence level by level, ascending ids inside a
level.  The tests compare the two.

>>> import numpy as np
>>> v = compact_views(CsrSets(np.array([0, 3, 4, 5, 5, 5]), np.array([1, 2, 3, 3, 3])),
...                   ["a", "b", "c", "d", "e"])
>>> v["levels"], v["sequence"]
([['a', 'e'], ['b', 'c'], ['d']], ['a', 'e', 'b', 'c', 'd'])
"""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np

from satorder.jit import run
from satorder.model.adjacency import CsrSets
from satorder.model.json_stream import PairList


def compact_views(succ: CsrSets, names: Sequence[str]) -> dict:
    """``levels`` and ``sequence`` (lists of names) and ``covering`` (a streamed
    :class:`~satorder.model.json_stream.PairList`) of a transitively closed order."""
    indptr, indices = succ.csr()
    ok, level, cptr, cidx = run(_levels_and_covers, indptr, indices)
    if not ok:
        raise ValueError("the relation has a cycle")
    seq = np.argsort(level, kind="stable").tolist()
    ends = np.cumsum(np.bincount(level)[1:]).tolist()
    named = [names[a] for a in seq]
    starts = [0] + ends[:-1]
    return {"levels": [named[s:e] for s, e in zip(starts, ends)],
            "covering": PairList(names, CsrSets(cptr, cidx)),
            "sequence": named}


def _levels_and_covers(indptr, indices):  # pragma: no cover - compiled
    """(acyclic, level of each item from 1, covering pairs as CSR with rows ascending)."""
    n = len(indptr) - 1
    indeg = np.zeros(n, dtype=np.int64)
    for t in range(indptr[n]):
        indeg[indices[t]] += 1
    level = np.zeros(n, dtype=np.int64)
    queue = np.empty(n, dtype=np.int64)
    qt = 0
    for a in range(n):
        if indeg[a] == 0:
            queue[qt] = a
            qt += 1
            level[a] = 1
    qh = 0
    while qh < qt:
        a = queue[qh]
        qh += 1
        for t in range(indptr[a], indptr[a + 1]):
            b = indices[t]
            if level[a] + 1 > level[b]:
                level[b] = level[a] + 1
            indeg[b] -= 1
            if indeg[b] == 0:
                queue[qt] = b
                qt += 1
    if qt != n:
        return False, level, np.zeros(1, dtype=np.int64), np.empty(0, dtype=np.int32)
    cptr = np.zeros(n + 1, dtype=np.int64)
    cidx = np.empty(indptr[n], dtype=np.int32)
    reached = np.full(n, -1, dtype=np.int64)
    k = 0
    for a in range(n):
        s = indptr[a]
        e = indptr[a + 1]
        if e - s == 1:
            cidx[k] = indices[s]
            k += 1
        elif e > s:
            row = indices[s:e]
            by_level = row[np.argsort(level[row], kind="mergesort")]
            start = k
            for b in by_level:
                if reached[b] != a:
                    cidx[k] = b
                    k += 1
                    for u in range(indptr[b], indptr[b + 1]):
                        reached[indices[u]] = a
            cidx[start:k].sort()
        cptr[a + 1] = k
    return True, level, cptr, cidx[:k].copy()
