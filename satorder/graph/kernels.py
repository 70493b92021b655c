"""Compiled inner loops (numba) for the hot paths at tens of thousands of items.

Each kernel works on a graph in CSR form (``indptr``, ``indices``) and has a pure-Python twin in
the module that uses it; the tests compare the two on random graphs.  When numba is missing the
twins are used, slower but with identical results.  Compiling happens on first use
(:mod:`satorder.jit`).
"""

from __future__ import annotations

import numpy as np

from satorder.jit import HAVE_NUMBA, run
from satorder.model.adjacency import csr_arrays

__all__ = ["HAVE_NUMBA", "co_component_ties", "csr", "doubled_components", "orient_classes"]


def co_component_ties(indptr, indices, uindptr, uindices, explicit):
    return run(_co_component_ties, indptr, indices, uindptr, uindices, explicit)


def doubled_components(m, e1, e2, flip):
    return run(_doubled_components, m, e1, e2, flip)


TABLE_EDGES = 1 << 21  # above this many edges the orientation kernel keeps a lookup table


def orient_classes(indptr, indices):
    return run(_orient_classes, indptr, indices, len(indices) // 2 > TABLE_EDGES)


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
    """CSR arrays (indptr, indices) of an adjacency list of integer sets (rows sorted), or
    the arrays of a compact :class:`~satorder.model.adjacency.CsrSets` as they are."""
    return csr_arrays(adj)


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


def _orient_classes(indptr, indices, table):  # pragma: no cover - compiled
    """Implication classes and the transitive orientation in one pass, without tie arrays.

    Input: a simple undirected graph as symmetric CSR with each row sorted.  Edge ``e`` joins
    ``lo < hi`` (edges numbered by the key ``lo * n + hi``: row by row, the entries above the
    row's own item); the edge of an entry below the row's item is found by binary search in the
    other row, or with ``table`` in a lookup table (4 bytes per edge, for large graphs).  The
    Γ steps are those of :func:`_co_component_ties` (a spanning forest of the co-components of
    each neighbourhood); each is applied at once to a union-find with parity over the edges
    (``uf[e] = parent << 1 | parity``, parity 0: same sense lo→hi as the parent), so an
    implication class and its reverse share a root, and a step that closes an odd parity cycle
    puts an arc in the class of its reverse: no transitive orientation exists (Gallai 1967;
    Golumbic 1980, ch. 5).  Classes are then oriented by the rule of
    :func:`satorder.graph.forcing.transitive_orientation` (smallest tail below smallest head;
    on a tie, the class whose first node in the doubled numbering 2e, 2e+1 comes first).
    Memory besides input and output: 5 bytes per edge (9 with ``table``) and 8 per class.

    Returns (orientable, number of classes, successor indptr, successor indices); the arrays
    are empty when not orientable.
    """
    n = len(indptr) - 1
    first_up = np.empty(n, dtype=np.int64)  # first entry of row v above v
    before = np.zeros(n + 1, dtype=np.int64)  # edges whose lower end is below v
    for v in range(n):
        t = indptr[v]
        while t < indptr[v + 1] and indices[t] < v:
            t += 1
        first_up[v] = t
        before[v + 1] = before[v] + indptr[v + 1] - t
    m = before[n]
    # low_edge[t - indptr[v] + low_before[v]]: edge of the entry t of row v below v
    low_before = np.zeros(n + 1 if table else 1, dtype=np.int64)
    low_edge = np.empty(m if table else 0, dtype=np.int32)
    if table:
        for v in range(n):
            low_before[v + 1] = low_before[v] + first_up[v] - indptr[v]
        cursor = low_before[:n].copy()
        for v in range(n):
            for t in range(first_up[v], indptr[v + 1]):
                u = indices[t]
                low_edge[cursor[u]] = before[v] + t - first_up[v]
                cursor[u] += 1
    uf = np.empty(m, dtype=np.int32)
    for f in range(m):
        uf[f] = 2 * f
    tag = np.full(n, -1, dtype=np.int64)  # == stamp: next to the item popped last
    slot_of = np.empty(n, dtype=np.int64)
    unreached = np.empty(n, dtype=np.int32)
    queue = np.empty(n, dtype=np.int32)
    stamp = 0
    ok = True
    for v in range(n):
        lo_t = indptr[v]
        hi_t = indptr[v + 1]
        if hi_t - lo_t < 2:
            continue
        cnt = 0
        for t in range(lo_t, hi_t):
            u = indices[t]
            slot_of[u] = t
            unreached[cnt] = u
            cnt += 1
        while cnt > 0 and ok:
            cnt -= 1
            r = unreached[cnt]
            qh = 0
            qt = 1
            queue[0] = r
            while qh < qt and cnt > 0 and ok:
                y = queue[qh]
                qh += 1
                stamp += 1
                for t in range(indptr[y], indptr[y + 1]):  # only unreached items are read
                    tag[indices[t]] = stamp
                if y > v:  # edge of {v, y}
                    e1 = before[v] + slot_of[y] - first_up[v]
                elif table:
                    e1 = low_edge[low_before[v] + slot_of[y] - lo_t]
                else:
                    a = first_up[y]
                    b = indptr[y + 1]
                    while a < b:
                        mid = (a + b) // 2
                        if indices[mid] < v:
                            a = mid + 1
                        else:
                            b = mid
                    e1 = before[y] + a - first_up[y]
                keep = 0
                for i in range(cnt):
                    x = unreached[i]
                    if tag[x] == stamp:
                        unreached[keep] = x
                        keep += 1
                        continue
                    queue[qt] = x
                    qt += 1
                    # Γ step: arcs v→y and v→x alike, as {y, x} must stay unordered
                    if x > v:
                        e2 = before[v] + slot_of[x] - first_up[v]
                    elif table:
                        e2 = low_edge[low_before[v] + slot_of[x] - lo_t]
                    else:
                        a = first_up[x]
                        b = indptr[x + 1]
                        while a < b:
                            mid = (a + b) // 2
                            if indices[mid] < v:
                                a = mid + 1
                            else:
                                b = mid
                        e2 = before[x] + a - first_up[x]
                    flip = 1 if (v < y) != (v < x) else 0
                    # find with parity, then compress (written inline: kernels call no
                    # other kernels)
                    ra = e1
                    pa = 0
                    while (uf[ra] >> 1) != ra:
                        pa ^= uf[ra] & 1
                        ra = uf[ra] >> 1
                    cur = e1
                    cp = pa
                    while cur != ra:
                        nxt = uf[cur] >> 1
                        nxp = cp ^ (uf[cur] & 1)
                        uf[cur] = (ra << 1) | cp
                        cur = nxt
                        cp = nxp
                    rb = e2
                    pb = 0
                    while (uf[rb] >> 1) != rb:
                        pb ^= uf[rb] & 1
                        rb = uf[rb] >> 1
                    cur = e2
                    cp = pb
                    while cur != rb:
                        nxt = uf[cur] >> 1
                        nxp = cp ^ (uf[cur] & 1)
                        uf[cur] = (rb << 1) | cp
                        cur = nxt
                        cp = nxp
                    if ra == rb:
                        if (pa ^ pb) != flip:
                            ok = False
                            break
                    elif ra < rb:  # the smaller id is the root: roots are class minima
                        uf[rb] = (ra << 1) | (pa ^ pb ^ flip)
                    else:
                        uf[ra] = (rb << 1) | (pa ^ pb ^ flip)
                cnt = keep
        if not ok:
            break
    if not ok:
        return False, 0, np.zeros(1, dtype=np.int64), np.empty(0, dtype=np.int32)
    # settle every edge to -1 - (2 * class + parity to the class's root): parents have smaller
    # ids, so one ascending pass (each edge after its parent) does it
    classes = 0
    for f in range(m):
        p = uf[f] >> 1
        if p == f:
            uf[f] = -1 - 2 * classes
            classes += 1
        else:
            code = -1 - uf[p]
            uf[f] = -1 - ((code & ~1) | ((code & 1) ^ (uf[f] & 1)))
    big = np.iinfo(np.int32).max
    mintail = np.full(classes, big, dtype=np.int32)  # of the class (root, parity 0)
    minhead = np.full(classes, big, dtype=np.int32)
    for v in range(n):
        for t in range(first_up[v], indptr[v + 1]):
            code = -1 - uf[before[v] + t - first_up[v]]
            c = code >> 1
            if code & 1 == 0:
                a = v
                b = indices[t]
            else:
                a = indices[t]
                b = v
            if a < mintail[c]:
                mintail[c] = a
            if b < minhead[c]:
                minhead[c] = b
    up = np.empty(m, dtype=np.bool_)
    for f in range(m):
        code = -1 - uf[f]
        c = code >> 1
        if code & 1 == 0:
            k0 = mintail[c]
            h0 = minhead[c]
        else:
            k0 = minhead[c]
            h0 = mintail[c]
        # the root is its class's smallest edge, so 2 * root is the first node of the pair
        up[f] = k0 < h0 or (k0 == h0 and code & 1 == 0)
    uf = mintail = minhead = np.empty(0, dtype=np.int32)
    sptr = np.zeros(n + 1, dtype=np.int64)
    sidx = np.empty(m, dtype=np.int32)
    k = 0
    for v in range(n):
        lo_t = indptr[v]
        for t in range(lo_t, indptr[v + 1]):
            u = indices[t]
            if u > v:
                keep_arc = up[before[v] + t - first_up[v]]
            elif table:
                keep_arc = not up[low_edge[low_before[v] + t - lo_t]]
            else:
                a = first_up[u]
                b = indptr[u + 1]
                while a < b:
                    mid = (a + b) // 2
                    if indices[mid] < v:
                        a = mid + 1
                    else:
                        b = mid
                keep_arc = not up[before[u] + a - first_up[u]]
            if keep_arc:
                sidx[k] = u
                k += 1
        sptr[v + 1] = k
    return True, classes, sptr, sidx
