"""The compiled half of :class:`satorder.model.json_stream.PairList`: the pairs of a large
order held as compact arrays (:class:`~satorder.model.adjacency.CsrSets`) written as JSON bytes
by a numba loop that copies each name's JSON string into place, chunk by chunk.  Kept apart so
that writing a small answer never imports numpy.
"""

from __future__ import annotations

import json

import numpy as np

from satorder.jit import run


def write_pairs(names, succ, write, chunk_pairs: int) -> None:
    """Write the pairs of compact successor sets ``succ`` as ``["a","b"],...`` in pieces of
    about ``chunk_pairs`` pairs (whole rows each)."""
    sptr, sidx = succ.csr()
    buf, off = _quoted(names)
    n = len(sptr) - 1
    row = 0
    first = True
    while row < n:
        # rows up to about chunk_pairs pairs (at least one row)
        stop = int(np.searchsorted(sptr, sptr[row] + chunk_pairs, side="right")) - 1
        stop = min(n, max(stop, row + 1))
        if sptr[stop] > sptr[row]:
            write(run(_pairs_bytes, buf, off, sptr, sidx, row, stop, first))
            first = False
        row = stop


def _quoted(names) -> tuple[np.ndarray, np.ndarray]:
    """Every name's JSON string (quotes included) as one byte buffer and offsets."""
    quoted = [json.dumps(name).encode() for name in names]
    off = np.zeros(len(quoted) + 1, dtype=np.int64)
    np.cumsum(np.fromiter(map(len, quoted), dtype=np.int64, count=len(quoted)),
              out=off[1:])
    return np.frombuffer(b"".join(quoted), dtype=np.uint8), off


def _pairs_bytes(buf, off, sptr, sidx, row0, row1, first):  # pragma: no cover - compiled
    """The bytes ``["a","b"],["a","c"],...`` of rows ``row0..row1-1`` (a leading comma unless
    ``first``).  Every pair's position is computed first, so the copies that follow do not
    wait on one another."""
    t0 = sptr[row0]
    count = sptr[row1] - t0
    pos = np.empty(count + 1, dtype=np.int64)
    pos[0] = 0 if first else 1
    for a in range(row0, row1):
        la = off[a + 1] - off[a]
        for t in range(sptr[a], sptr[a + 1]):
            b = sidx[t]
            pos[t - t0 + 1] = la + off[b + 1] - off[b] + 4  # [a,b] and a comma
    for j in range(count):
        pos[j + 1] += pos[j]
    out = np.empty(pos[count] - 1, dtype=np.uint8)  # no comma after the last pair
    if not first:
        out[0] = 44  # ,
    for a in range(row0, row1):
        oa = off[a]
        la = off[a + 1] - oa
        for t in range(sptr[a], sptr[a + 1]):
            b = sidx[t]
            k = pos[t - t0]
            out[k] = 91  # [
            for i in range(la):
                out[k + 1 + i] = buf[oa + i]
            k += 1 + la
            out[k] = 44
            ob = off[b]
            lb = off[b + 1] - ob
            for i in range(lb):
                out[k + 1 + i] = buf[ob + i]
            k += 1 + lb
            out[k] = 93  # ]
            if k + 1 < len(out):
                out[k + 1] = 44
    return out
