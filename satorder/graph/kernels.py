"""Compiled inner loops (numba) for the hot paths at tens of thousands of items.

Each kernel works on a graph in CSR form (``indptr``, ``indices``) and has a pure-Python twin in
the module that uses it; the tests compare the two on random graphs.  When numba is missing the
twins are used, slower but with identical results.  Compiling happens on first use
(:mod:`satorder.jit`).
"""

from __future__ import annotations

import numpy as np

from satorder.jit import HAVE_NUMBA, run

__all__ = ["HAVE_NUMBA", "co_component_ties", "csr", "doubled_components"]


def co_component_ties(indptr, indices, uindptr, uindices, explicit):
    return run(_co_component_ties, indptr, indices, uindptr, uindices, explicit)


def doubled_components(m, e1, e2, flip):
    return run(_doubled_components, m, e1, e2, flip)


def _co_component_ties(indptr, indices, uindptr, uindices, explicit):  # pragma: no cover
    """For each item v, a spanning forest of the pairs of ``N(v)`` that must stay unordered:
    the non-adjacent pairs, or with ``explicit`` the pairs listed in the CSR (uindptr, uindices).

    Breadth-first search with an "unreached" list: popping ``y`` marks its neighbours (or its
    must-stay-unordered partners), and every unreached item left unmarked (or marked) joins the
    tree below ``y``.  Work is ``sum over y in N(v) of deg(y)`` per centre v.
    Returns arrays (v, y, x): {y, x} must stay unordered, so arcs at v of {v, y} and {v, x}
    are oriented alike (a Γ step).
    """
    n = len(indptr) - 1
    total = indptr[n]
    out_v = np.empty(total, dtype=np.int64)
    out_r = np.empty(total, dtype=np.int64)
    out_x = np.empty(total, dtype=np.int64)
    k = 0
    in_nb = np.full(n, -1, dtype=np.int32)
    mark = np.full(n, -1, dtype=np.int64)
    unreached = np.empty(n, dtype=np.int32)
    queue = np.empty(n, dtype=np.int32)
    stamp = 0
    for v in range(n):
        lo = indptr[v]
        hi = indptr[v + 1]
        if hi - lo < 2:
            continue
        cnt = 0
        for t in range(lo, hi):
            u = indices[t]
            in_nb[u] = v
            unreached[cnt] = u
            cnt += 1
        while cnt > 0:
            cnt -= 1
            r = unreached[cnt]
            qh = 0
            qt = 1
            queue[0] = r
            while qh < qt and cnt > 0:
                y = queue[qh]
                qh += 1
                stamp += 1
                if explicit:
                    for t in range(uindptr[y], uindptr[y + 1]):
                        w = uindices[t]
                        if in_nb[w] == v:
                            mark[w] = stamp
                else:
                    for t in range(indptr[y], indptr[y + 1]):
                        w = indices[t]
                        if in_nb[w] == v:
                            mark[w] = stamp
                keep = 0
                for i in range(cnt):
                    x = unreached[i]
                    if (mark[x] == stamp) != explicit:
                        unreached[keep] = x
                        keep += 1
                    else:
                        queue[qt] = x
                        qt += 1
                        out_v[k] = v
                        out_r[k] = y
                        out_x[k] = x
                        k += 1
                cnt = keep
    return out_v[:k], out_r[:k], out_x[:k]


def csr(adj: list[set[int]]):
    """CSR arrays (indptr, indices) of an adjacency list of integer sets."""
    from itertools import chain

    n = len(adj)
    deg = np.fromiter((len(s) for s in adj), dtype=np.int64, count=n)
    indptr = np.zeros(n + 1, dtype=np.int64)
    np.cumsum(deg, out=indptr[1:])
    indices = np.fromiter(chain.from_iterable(adj), dtype=np.int32, count=int(indptr[-1]))
    return indptr, indices


def _doubled_components(m, e1, e2, flip):  # pragma: no cover - compiled
    """Connected components of the doubled tie graph (union-find, path compression).

    Node ``2e`` is edge e oriented lo→hi, ``2e+1`` the reverse; a tie between edges e1 and e2
    joins ``2*e1`` with ``2*e2 + flip`` and ``2*e1 + 1`` with ``2*e2 + 1 - flip``.
    Returns (number of components, component label of each node, labels 0..k-1).
    """
    size = 2 * m
    parent = np.arange(size)
    for i in range(2 * len(e1)):
        j = i // 2
        if i % 2 == 0:
            a, b = 2 * e1[j], 2 * e2[j] + flip[j]
        else:
            a, b = 2 * e1[j] + 1, 2 * e2[j] + 1 - flip[j]
        ra = a  # find with path halving, written inline (kernels call no other kernels)
        while parent[ra] != ra:
            parent[ra] = parent[parent[ra]]
            ra = parent[ra]
        rb = b
        while parent[rb] != rb:
            parent[rb] = parent[parent[rb]]
            rb = parent[rb]
        if ra != rb:
            if ra < rb:
                parent[rb] = ra
            else:
                parent[ra] = rb
    label = np.full(size, -1, dtype=np.int64)
    comp = np.empty(size, dtype=np.int64)
    k = 0
    for x in range(size):
        r = x
        while parent[r] != r:
            r = parent[r]
        if label[r] < 0:
            label[r] = k
            k += 1
        comp[x] = label[r]
    return k, comp
