"""The compiled half of the modular decomposition (:mod:`satorder.graph.modular`) for large
graphs: the first refinement of every connected component, ``P(S, v)``, by a numba loop over
the component's CSR arrays; and the components themselves, each laid out in its own item ids.
The Python refinement is its twin (the tests compare the trees on random graphs).
"""

from __future__ import annotations

import numpy as np

from satorder.jit import run
from satorder.model.adjacency import csr_arrays


def first_parts(adj, v: int, first: int, fresh: int):
    """``P(S, v)`` of a connected graph (``adj``: a list of rows or CSR arrays): the maximal
    modules not holding ``v`` (step 1 of :mod:`satorder.graph.modular`), as a list of item
    lists, and each one's neighbours in the quotient (``v`` left out) as a dict of sets.  The
    parts are numbered as the caller will: the first ``first``, the others ``fresh``,
    ``fresh + 1``, ..."""
    indptr, indices = adj if isinstance(adj, tuple) else csr_arrays(adj)
    label, qptr, qidx = run(_maximal_modules, indptr, indices, v)
    order = np.argsort(label, kind="stable")
    bounds = np.searchsorted(label[order], np.arange(len(qptr))).tolist()
    items = order.tolist()
    groups = [items[bounds[k]:bounds[k + 1]] for k in range(len(qptr) - 1) if k != 1]
    ids = [first] + list(range(fresh, fresh + len(groups) - 1))
    named = np.array([first, -1] + ids[1:], dtype=np.int64)[qidx].tolist()
    ptr = qptr.tolist()
    rows = [named[ptr[k]:ptr[k + 1]] for k in range(len(ptr) - 1) if k != 1]
    return groups, {pid: set(row) for pid, row in zip(ids, rows)}


def _maximal_modules(indptr, indices, v):  # pragma: no cover - compiled
    """Partition refinement with the smaller-half rule (McConnell & Spinrad, "Ordered vertex
    partitioning", DMTCS 4, 2000), as :meth:`satorder.graph.modular._Decomposer._refine`.
    Parts are ranges of ``elems``; a split moves the marked items to the front of their part.
    A queued half ``H`` (a union of parts) is processed by letting each of its items split the
    parts outside ``H`` by its neighbours there, and each outside neighbour ``y`` split the
    parts inside ``H`` by ``N(y)`` (the items of ``H`` gathered per ``y``)."""
    n = len(indptr) - 1
    part = np.zeros(n, dtype=np.int64)
    elems = np.arange(n)
    pos = np.arange(n)
    start = np.zeros(n + 1, dtype=np.int64)
    end = np.zeros(n + 1, dtype=np.int64)
    marked = np.zeros(n + 1, dtype=np.int64)
    touched = np.empty(n + 1, dtype=np.int64)
    last = elems[n - 1]  # {v} at the end, as part 1
    elems[pos[v]], pos[last] = last, pos[v]
    elems[n - 1], pos[v] = v, n - 1
    part[v] = 1
    end[0], start[1], end[1] = n - 1, n - 1, n
    nparts = 2
    qbuf = np.empty(4 * n + 16, dtype=np.int64)  # queued halves, one after another
    qseg = np.empty(2 * n + 16, dtype=np.int64)  # (start, end) of each in qbuf
    qlen, nseg = 0, 0
    mark = np.zeros(n, dtype=np.int64)
    hstamp = np.zeros(n, dtype=np.int64)
    head = np.empty(n, dtype=np.int64)
    ys = np.empty(n, dtype=np.int64)
    token = 0
    first = True
    sbuf = np.empty(2 * len(indices) + 1, dtype=np.int64)  # the sets to split by, in a row
    sseg = np.empty(2 * n + 2, dtype=np.int64)  # where each set ends in sbuf
    nxt = np.empty(len(indices) + 1, dtype=np.int64)
    val = np.empty(len(indices) + 1, dtype=np.int64)
    while first or nseg > 0:
        ns, fill = 0, 0
        if first:  # split by N(v)
            first = False
            half = np.empty(0, dtype=np.int64)
            for t in range(indptr[v], indptr[v + 1]):
                sbuf[fill] = indices[t]
                fill += 1
            sseg[0] = fill
            ns = 1
        else:
            nseg -= 1
            half = qbuf[qseg[2 * nseg]:qseg[2 * nseg + 1]].copy()
            qlen = qseg[2 * nseg]
            token += 1
            for x in half:
                mark[x] = token
        # items of the half, each with its neighbours outside the half; then the buckets
        k, ny = 0, 0
        for x in half:
            before = fill
            for t in range(indptr[x], indptr[x + 1]):
                y = indices[t]
                if mark[y] != token:
                    sbuf[fill] = y
                    fill += 1
                    if hstamp[y] != token:
                        hstamp[y] = token
                        head[y] = -1
                        ys[ny] = y
                        ny += 1
                    nxt[k] = head[y]
                    val[k] = x
                    head[y] = k
                    k += 1
            if fill > before:
                sseg[ns] = fill
                ns += 1
        for i in range(ny):
            j = head[ys[i]]
            while j >= 0:
                sbuf[fill] = val[j]
                fill += 1
                j = nxt[j]
            sseg[ns] = fill
            ns += 1
        for r in range(ns):
            nt = 0
            for e in range(0 if r == 0 else sseg[r - 1], sseg[r]):
                u = sbuf[e]
                p = part[u]
                if end[p] - start[p] == 1:
                    continue
                if marked[p] == 0:
                    touched[nt] = p
                    nt += 1
                j = start[p] + marked[p]
                w = elems[j]
                pu = pos[u]
                elems[j], pos[u] = u, j
                elems[pu], pos[w] = w, pu
                marked[p] += 1
            for i in range(nt):
                p = touched[i]
                m = marked[p]
                marked[p] = 0
                size = end[p] - start[p]
                if m == size:
                    continue
                q = nparts
                nparts += 1
                start[q], end[q] = start[p], start[p] + m
                start[p] += m
                for j in range(start[q], end[q]):
                    part[elems[j]] = q
                a, b = (start[q], end[q]) if m <= size - m else (start[p], end[p])
                if qlen + (b - a) > len(qbuf):
                    grown = np.empty(2 * len(qbuf) + (b - a), dtype=np.int64)
                    grown[:qlen] = qbuf[:qlen]
                    qbuf = grown
                if 2 * nseg + 2 > len(qseg):
                    grown = np.empty(2 * len(qseg), dtype=np.int64)
                    grown[:2 * nseg] = qseg[:2 * nseg]
                    qseg = grown
                qbuf[qlen:qlen + (b - a)] = elems[a:b]
                qseg[2 * nseg], qseg[2 * nseg + 1] = qlen, qlen + (b - a)
                qlen += b - a
                nseg += 1
    # the quotient: the parts next to one item of each part, v's part (1) left out
    qptr = np.zeros(nparts + 1, dtype=np.int64)
    qidx = np.empty(len(indices), dtype=np.int64)
    stamp = np.full(nparts, -1, dtype=np.int64)
    k = 0
    for p in range(nparts):
        if p != 1:
            stamp[p] = p
            stamp[1] = p
            r = elems[start[p]]
            for t in range(indptr[r], indptr[r + 1]):
                q = part[indices[t]]
                if stamp[q] != p:
                    stamp[q] = p
                    qidx[k] = q
                    k += 1
        qptr[p + 1] = k
    return part, qptr, qidx[:k]


def component_graphs(adj):
    """The connected components of the graph ``adj`` (a list of sets or a
    :class:`~satorder.model.adjacency.CsrSets`), each as ``(items, sub, csr)``: its items
    ascending, its adjacency in local ids (position in ``items``) as a sequence of lists, and the
    same as CSR arrays; in order of their smallest item.  One relabelling of the whole graph's
    arrays, no dictionary per component."""
    from scipy.sparse import csr_matrix
    from scipy.sparse.csgraph import connected_components

    indptr, indices = csr_arrays(adj)
    n = len(indptr) - 1
    graph = csr_matrix((np.ones(len(indices), dtype=np.int8), indices, indptr), shape=(n, n))
    k, label = connected_components(graph, directed=False)
    perm = np.argsort(label, kind="stable")  # items by component, ascending within each
    bounds = np.searchsorted(label[perm], np.arange(k + 1))
    local = np.empty(n, dtype=np.int64)
    local[perm] = np.arange(n) - np.repeat(bounds[:-1], np.diff(bounds))
    deg = np.diff(indptr)[perm]
    ptr = np.zeros(n + 1, dtype=np.int64)
    np.cumsum(deg, out=ptr[1:])
    mapped = local[indices[np.repeat(indptr[perm] - ptr[:-1], deg) + np.arange(ptr[-1])]]
    flat, offsets, items = mapped.tolist(), ptr.tolist(), perm.tolist()
    out = []
    for c in range(k):
        a, b = int(bounds[c]), int(bounds[c + 1])
        csr = (ptr[a:b + 1] - ptr[a], mapped[ptr[a]:ptr[b]])
        out.append((items[a:b], _Rows(flat, offsets, a, b), csr))
    return out


class _Rows:
    """The rows ``a..b-1`` of CSR lists as a sequence of lists, each sliced when asked for
    (the decomposer reads few rows beyond the compiled first refinement)."""

    __slots__ = ("flat", "offsets", "a", "b")

    def __init__(self, flat: list[int], offsets: list[int], a: int, b: int):
        self.flat, self.offsets, self.a, self.b = flat, offsets, a, b

    def __len__(self) -> int:
        return self.b - self.a

    def __getitem__(self, i: int) -> list[int]:
        return self.flat[self.offsets[self.a + i]:self.offsets[self.a + i + 1]]
