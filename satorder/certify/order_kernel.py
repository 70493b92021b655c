"""The compiled loop of :func:`satorder.certify.order.check_order` for large orders: the same
successor-set inclusion test over CSR arrays, written for the checker alone (it shares nothing
with the engines' kernels) and compiled with numba on first use (:mod:`satorder.jit`).  Kept
apart so that checking a small order never imports numpy.
"""

from __future__ import annotations

from itertools import chain

import numpy as np

from satorder.jit import run


def first_intransitive(succ: list[set[int]]):
    """``(a, a, a)``, ``(a, b, c)`` with ``a < b < c`` but not ``a < c``, or ``None``."""
    n = len(succ)
    deg = np.fromiter((len(s) for s in succ), dtype=np.int64, count=n)
    indptr = np.zeros(n + 1, dtype=np.int64)
    np.cumsum(deg, out=indptr[1:])
    indices = np.fromiter(chain.from_iterable(succ), dtype=np.int64, count=int(indptr[-1]))
    a, b, c = run(_intransitive_kernel, indptr, indices)
    return None if a < 0 else (int(a), int(b), int(c))


def _intransitive_kernel(indptr, indices):  # pragma: no cover - compiled
    n = len(indptr) - 1
    mark = np.full(n, -1, dtype=np.int64)
    for a in range(n):
        for t in range(indptr[a], indptr[a + 1]):
            mark[indices[t]] = a
        if mark[a] == a:
            return a, a, a
        for t in range(indptr[a], indptr[a + 1]):
            b = indices[t]
            for u in range(indptr[b], indptr[b + 1]):
                c = indices[u]
                if mark[c] != a:
                    return a, b, c
    return -1, -1, -1


def first_intransitive_arrays(indptr, indices):
    """:func:`first_intransitive` on an order already held as CSR arrays."""
    a, b, c = run(_intransitive_kernel, indptr, indices)
    return None if a < 0 else (int(a), int(b), int(c))


def first_outside(sptr, sidx, aptr, aidx) -> tuple[int, int, int]:
    """First ``(a, b, kind)`` with ``b`` listed above ``a`` but not a comparable pair of ``a``
    (kind 0), or listed twice above ``a`` (kind 1); ``(-1, -1, -1)`` if none."""
    a, b, kind = run(_outside_kernel, sptr, sidx, aptr, aidx)
    return int(a), int(b), int(kind)


def _outside_kernel(sptr, sidx, aptr, aidx):  # pragma: no cover - compiled
    n = len(aptr) - 1
    comparable = np.full(n, -1, dtype=np.int64)
    listed = np.full(n, -1, dtype=np.int64)
    for a in range(n):
        for t in range(aptr[a], aptr[a + 1]):
            comparable[aidx[t]] = a
        for t in range(sptr[a], sptr[a + 1]):
            b = sidx[t]
            if comparable[b] != a:
                return a, b, 0
            if listed[b] == a:
                return a, b, 1
            listed[b] = a
    return -1, -1, -1
