"""Violated transitivity: the triples ``a < b < c`` of a relation that lack ``a < c``.

The lazy transitivity loop (:mod:`satorder.sat.engine`) adds a clause for each triple a model
violates and solves again; this module finds those triples fast, by a boolean matrix product on
a few thousand items and by successor-set differences beyond.

>>> violations([{1}, {2}, set()])
[(0, 1, 2)]
"""

from __future__ import annotations

from itertools import chain

import numpy as np

MATRIX_ITEMS = 3000  # up to this many items, violated triples are found by matrix product


def _violations_matrix(succ: list[set[int]], limit: int | None):
    n = len(succ)
    lens = np.fromiter((len(x) for x in succ), dtype=np.int64, count=n)
    tails = np.repeat(np.arange(n), lens)
    heads = np.fromiter(chain.from_iterable(succ), dtype=np.int64, count=int(lens.sum()))
    r = np.zeros((n, n), dtype=np.float32)
    r[tails, heads] = 1.0
    two = r @ r  # two[a, c] > 0: some b with a<b<c
    miss = (two > 0.5) & (r < 0.5)
    np.fill_diagonal(miss, False)
    a_idx, c_idx = np.nonzero(miss)
    if limit is not None:
        a_idx, c_idx = a_idx[:limit], c_idx[:limit]
    out: list[tuple[int, int, int]] = []
    rb = r > 0.5
    for s in range(0, len(a_idx), 4096):  # witness b: first item with a<b and b<c
        aa, cc = a_idx[s:s + 4096], c_idx[s:s + 4096]
        b_idx = np.argmax(rb[aa] & rb[:, cc].T, axis=1)
        out.extend(zip(aa.tolist(), b_idx.tolist(), cc.tolist()))
    return out


def violations(succ: list[set[int]], limit: int | None = None) -> list[tuple[int, int, int]]:
    """Triples ``(a, b, c)`` with ``a<b``, ``b<c`` related but not ``a<c``: one witness ``b``
    per missing pair ``(a, c)``, at most ``limit`` triples.

    Uses a boolean matrix product (R·R against R) up to a few thousand items, successor-set
    differences beyond."""
    n = len(succ)
    if 0 < n <= MATRIX_ITEMS:
        # set differences cost about Σ indegree·outdegree element steps, the matrix product
        # about n³ multiply-adds at far higher speed: pick the cheaper (rough constants)
        outdeg = np.fromiter((len(x) for x in succ), dtype=np.int64, count=n)
        heads = np.fromiter(chain.from_iterable(succ), dtype=np.int64,
                            count=int(outdeg.sum()))
        paths = int(np.dot(np.bincount(heads, minlength=n), outdeg))
        if n ** 3 < 450 * paths:
            return _violations_matrix(succ, limit)
    out: list[tuple[int, int, int]] = []
    for a, sa in enumerate(succ):
        if not sa:
            continue
        covered = set(sa)
        covered.add(a)
        for b in sa:
            missing = succ[b] - covered
            if missing:
                covered |= missing
                out.extend((a, b, c) for c in missing)
        if limit is not None and len(out) >= limit:
            return out[:limit]
    return out
