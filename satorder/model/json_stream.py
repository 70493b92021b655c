"""JSON documents written in chunks: a list of ten million ordered pairs never sits in memory.

:func:`write_document` writes a dict as one line of compact JSON (the same text as
``json.dumps(doc, separators=(",", ":"))``) to a binary file; a value with a
``write_json(write)`` method writes itself, in pieces.  :class:`PairList` is such a value: the
``[lower, upper]`` name pairs of an order given as successor sets.  From compact successor sets
(:class:`~satorder.model.adjacency.CsrSets`) a compiled loop copies the names' JSON bytes into
one buffer per chunk of some 65,000 pairs (no Python object per pair); from a list of sets
the chunks are joined as strings.

>>> import io
>>> buf = io.BytesIO()
>>> write_document({"status": "feasible", "order": PairList(["a", "b"], [{1}, set()])},
...                buf.write)
>>> buf.getvalue()
b'{"status":"feasible","order":[["a","b"]]}\\n'
"""

from __future__ import annotations

import json
from collections.abc import Callable, Sequence

import numpy as np

from satorder.jit import HAVE_NUMBA, run
from satorder.model.adjacency import CsrSets

CHUNK_PAIRS = 1 << 16
SMALL_PAIRS = 1 << 12  # up to this many pairs plain Python writes them (no compiled loop loaded)


def write_document(doc: dict, write: Callable[[bytes], object]) -> None:
    """Write ``doc`` as compact JSON and a newline with ``write`` (bytes); values that have a
    ``write_json(write)`` method are streamed by it (use this for extra fields too)."""
    write(b"{")
    for k, (key, value) in enumerate(doc.items()):
        if isinstance(value, Members):  # members already written as JSON text: no key
            write((b"," if k else b"") + value.text.encode())
            continue
        write((b"," if k else b"") + json.dumps(key).encode() + b":")
        if hasattr(value, "write_json"):
            value.write_json(write)
        else:
            write(json.dumps(value, separators=(",", ":")).encode())
    write(b"}\n")


class Members:
    """Object members already rendered as JSON text (``"a":1,"b":[2]``, no braces), written
    as they are by :func:`write_document` in place of their entry (whose key is not used)."""

    def __init__(self, text: str):
        self.text = text


class PairList:
    """The JSON list ``[[names[a], names[b]], ...]`` for every ``b`` in ``succ[a]``, by ``a``."""

    def __init__(self, names: Sequence[str], succ):
        self.names = names
        self.succ = succ

    def write_json(self, write: Callable[[bytes], object]) -> None:
        write(b"[")
        if (isinstance(self.succ, CsrSets) and self.succ.is_compact and HAVE_NUMBA
                and self.succ.total() > SMALL_PAIRS):
            self._write_compact(write)
        else:
            self._write_sets(write)
        write(b"]")

    def _quoted(self) -> tuple[np.ndarray, np.ndarray]:
        """Every name's JSON string (quotes included) as one byte buffer and offsets."""
        quoted = [json.dumps(name).encode() for name in self.names]
        off = np.zeros(len(quoted) + 1, dtype=np.int64)
        np.cumsum(np.fromiter(map(len, quoted), dtype=np.int64, count=len(quoted)),
                  out=off[1:])
        return np.frombuffer(b"".join(quoted), dtype=np.uint8), off

    def _write_compact(self, write) -> None:
        sptr, sidx = self.succ.csr()
        buf, off = self._quoted()
        n = len(sptr) - 1
        row = 0
        first = True
        while row < n:
            # rows up to about CHUNK_PAIRS pairs (at least one row)
            stop = int(np.searchsorted(sptr, sptr[row] + CHUNK_PAIRS, side="right")) - 1
            stop = min(n, max(stop, row + 1))
            if sptr[stop] > sptr[row]:
                write(run(_pairs_bytes, buf, off, sptr, sidx, row, stop, first))
                first = False
            row = stop

    def _write_sets(self, write) -> None:
        q = [json.dumps(name) for name in self.names]
        parts: list[str] = []
        count = 0
        first = True
        rows = self.succ
        if isinstance(rows, CsrSets) and rows.is_compact:  # keep the arrays' order
            ptr, idx = (x.tolist() for x in rows.csr())
            rows = [idx[s:e] for s, e in zip(ptr[:-1], ptr[1:])]
        for a, s in enumerate(rows):
            if s:
                qa = "[" + q[a] + ","
                parts.append(",".join([qa + q[b] + "]" for b in s]))
                count += len(s)
            if count >= CHUNK_PAIRS or (a == len(rows) - 1 and parts):
                write(("" if first else ",").encode() + ",".join(parts).encode())
                first = False
                parts = []
                count = 0


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
