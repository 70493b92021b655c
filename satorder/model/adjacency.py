"""Integer sets stored compactly: compressed sparse rows behind the face of a list of sets.

At millions of pairs a list of Python sets costs about 60 bytes per entry (an int object and a
hash slot each); two numpy arrays cost 4.  :class:`CsrSets` keeps the sets ``0..n-1`` as
``indptr`` (int64, ``n + 1`` offsets) and ``indices`` (int32): row ``i`` is
``indices[indptr[i]:indptr[i + 1]]``, the compressed-sparse-row layout of sparse matrices
(common practice; described e.g. in Saad, *Iterative Methods for Sparse Linear Systems*, 2nd
ed. 2003, sec. 3.4).  The hot path (read an edge list, force, check, write JSON) works on the
arrays alone; any other code may use the object as the list of sets it stands for: the first
access to a row, or iteration, turns the whole object into a list of sets once (and drops the
arrays, so a set changed later is never contradicted by stale arrays).

>>> s = CsrSets.from_arcs(3, np.array([0, 0, 2]), np.array([1, 2, 1]))
>>> s.total(), s.row_sizes().tolist()
(3, [2, 0, 1])
>>> s[0], len(s), s.is_compact
({1, 2}, 3, False)

May import: numpy only (model layer).
"""

from __future__ import annotations

from collections.abc import Iterable, Sequence
from itertools import chain

import numpy as np


class CsrSets(Sequence):
    """Sets of integer ids ``0..n-1`` as CSR arrays, materialised as sets only on demand."""

    __slots__ = ("_indptr", "_indices", "_sets")

    def __init__(self, indptr: np.ndarray, indices: np.ndarray):
        self._indptr = np.asarray(indptr, dtype=np.int64)
        self._indices = np.asarray(indices, dtype=np.int32)
        self._sets: list[set[int]] | None = None

    # ------------------------------------------------------------------ construction
    @classmethod
    def from_arcs(cls, n: int, tails: np.ndarray, heads: np.ndarray) -> CsrSets:
        """Row ``t`` holds every ``heads[k]`` with ``tails[k] == t`` (no duplicates expected)."""
        tails = np.asarray(tails)
        order = np.argsort(tails, kind="stable")
        indices = np.asarray(heads, dtype=np.int32)[order]
        del order
        indptr = np.zeros(n + 1, dtype=np.int64)
        np.cumsum(np.bincount(tails, minlength=n), out=indptr[1:])
        return cls(indptr, indices)

    @classmethod
    def from_sets(cls, sets: Iterable[set[int]]) -> CsrSets:
        """A compact copy of a list of sets (rows sorted)."""
        indptr, indices = csr_arrays(list(sets))
        return cls(indptr, indices)

    # ------------------------------------------------------------------ compact access
    @property
    def is_compact(self) -> bool:
        """True while the arrays are authoritative (no row was asked for as a set yet)."""
        return self._sets is None

    def csr(self) -> tuple[np.ndarray, np.ndarray]:
        """``(indptr, indices)``; recomputed from the sets once they have been materialised."""
        if self._sets is None:
            return self._indptr, self._indices
        return csr_arrays(self._sets)

    def total(self) -> int:
        """Number of entries over all rows."""
        if self._sets is None:
            return int(self._indptr[-1])
        return sum(len(s) for s in self._sets)

    def row_sizes(self) -> np.ndarray:
        if self._sets is None:
            return np.diff(self._indptr)
        return np.fromiter((len(s) for s in self._sets), dtype=np.int64, count=len(self._sets))

    # ------------------------------------------------------------------ list-of-sets face
    def sets(self) -> list[set[int]]:
        """The rows as a list of sets (materialised once; the arrays are dropped)."""
        if self._sets is None:
            ptr = self._indptr.tolist()
            idx = self._indices.tolist()
            self._sets = [set(idx[s:e]) for s, e in zip(ptr[:-1], ptr[1:])]
            self._indptr = self._indices = None
        return self._sets

    def __len__(self) -> int:
        return len(self._indptr) - 1 if self._sets is None else len(self._sets)

    def __getitem__(self, i):
        return self.sets()[i]

    def __iter__(self):
        return iter(self.sets())

    def __eq__(self, other) -> bool:
        if isinstance(other, CsrSets):
            other = other.sets()
        if not isinstance(other, list):
            return NotImplemented
        return self.sets() == other

    __hash__ = None  # mutable, like the list it stands for

    def __repr__(self) -> str:
        if self._sets is None:
            return f"CsrSets(rows={len(self)}, entries={self.total()})"
        return f"CsrSets({self._sets!r})"

    def __reduce__(self):
        if self._sets is None:
            return (CsrSets, (self._indptr, self._indices))
        return (_from_sets_as_is, (self._sets,))


def _from_sets_as_is(sets: list[set[int]]) -> CsrSets:
    out = CsrSets(np.zeros(1, dtype=np.int64), np.zeros(0, dtype=np.int32))
    out._sets = sets
    out._indptr = out._indices = None
    return out


def csr_arrays(sets: Sequence[set[int]]) -> tuple[np.ndarray, np.ndarray]:
    """``(indptr int64, indices int32)`` of a list of integer sets (or of a :class:`CsrSets`,
    without copying), each row sorted."""
    if isinstance(sets, CsrSets):
        return sets.csr()
    n = len(sets)
    deg = np.fromiter((len(s) for s in sets), dtype=np.int64, count=n)
    indptr = np.zeros(n + 1, dtype=np.int64)
    np.cumsum(deg, out=indptr[1:])
    total = int(indptr[-1])
    indices = np.fromiter(chain.from_iterable(sets), dtype=np.int64, count=total)
    if total == 0:
        return indptr, indices.astype(np.int32)
    width = max(n, int(indices.max()) + 1)
    rows = np.repeat(np.arange(n, dtype=np.int64), deg)
    # sort each row: one sort of the keys row * width + entry
    indices = (np.sort(rows * width + indices) % width).astype(np.int32)
    return indptr, indices
