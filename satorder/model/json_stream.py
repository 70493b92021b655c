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

from satorder.jit import HAVE_NUMBA

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
        if (getattr(self.succ, "is_compact", False) and HAVE_NUMBA
                and self.succ.total() > SMALL_PAIRS):
            from satorder.model.json_pairs_compact import write_pairs

            write_pairs(self.names, self.succ, write, CHUNK_PAIRS)
        else:
            self._write_sets(write)
        write(b"]")

    def _write_sets(self, write) -> None:
        q = [json.dumps(name) for name in self.names]
        parts: list[str] = []
        count = 0
        first = True
        rows = self.succ
        if getattr(rows, "is_compact", False):  # keep the arrays' order
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
