"""Linear extensions of a small strict order, by dynamic programming over its down-sets.

A *down-set* (ideal) of an order on ``r`` elements is a set closed under going down.  A linear
extension is a path from the empty down-set to the full one that adds one element at a time,
each element only once everything it must follow is in.  Counting such paths level by level
(``f(D)``: ways to reach ``D``; ``g(D)``: ways to finish from ``D``) gives

* the number of linear extensions, ``f(full) = g(empty)``;
* for every two elements ``i, j`` the number of linear extensions that put ``i`` before ``j``:
  the sum of ``f(D) · g(D + j)`` over the down-sets ``D`` that hold ``i`` and to which ``j``
  can be added next (each extension counted once, at the moment ``j`` is added);
* a linear extension drawn uniformly at random: from the empty down-set, add ``j`` with
  probability ``g(D + j) / g(D)``.

This is the lattice-of-ideals method (De Loof, De Meyer & De Baets, "Exploiting the lattice of
ideals representation of a poset", Fundamenta Informaticae 71, 2006).  Its cost is the number
of down-sets times ``r``, so it is meant for the few children of a decomposition node that
fixed or forbidden arcs touch; past :data:`MAX_DOWNSETS` states it raises
:class:`TooManyStates`.

Elements are ``0 … r-1``; ``before[j]`` is the bitmask of the elements that must precede ``j``.

>>> le = LinearExtensions([0, 0b001, 0b001])        # 0 before 1 and before 2
>>> le.count, le.precedes(1, 2), le.precedes(0, 2)
(2, 1, 2)
>>> le = LinearExtensions([0b10, 0b01])             # a cycle: no linear extension
>>> le.count
0
"""

from __future__ import annotations

import random

MAX_DOWNSETS = 2_000_000  # beyond this many states the arcs at one node are too many to count


class TooManyStates(RuntimeError):
    """The order has too many down-sets for the dynamic programme."""


class LinearExtensions:
    """The down-set tables of one small order (see the module docstring)."""

    def __init__(self, before: list[int], max_states: int = MAX_DOWNSETS):
        self.before = list(before)
        r = self.r = len(before)
        # forward pass, level by level: f[mask] = ways to reach the down-set mask
        levels: list[dict[int, int]] = [{0: 1}]
        states = 1
        for _ in range(r):
            nxt: dict[int, int] = {}
            for mask, w in levels[-1].items():
                for j in range(r):
                    bit = 1 << j
                    if not mask & bit and before[j] & ~mask == 0:
                        m2 = mask | bit
                        nxt[m2] = nxt.get(m2, 0) + w
            states += len(nxt)
            if states > max_states:
                raise TooManyStates(f"more than {max_states} down-sets")
            if not nxt:
                break
            levels.append(nxt)
        self.levels = levels
        full = (1 << r) - 1
        self.count = levels[-1].get(full, 0) if len(levels) == r + 1 else 0
        self._g: dict[int, int] | None = None

    def _addable(self, mask: int):
        before = self.before
        for j in range(self.r):
            if not mask >> j & 1 and before[j] & ~mask == 0:
                yield j

    @property
    def completions(self) -> dict[int, int]:
        """``g[mask]``: the number of ways to finish a linear extension from the down-set
        ``mask`` (only down-sets from which the full set is reachable are kept)."""
        if self._g is None:
            g: dict[int, int] = {}
            if self.count:
                g[(1 << self.r) - 1] = 1
                for level in reversed(self.levels[:-1]):
                    for mask in level:
                        w = sum(g.get(mask | 1 << j, 0) for j in self._addable(mask))
                        if w:
                            g[mask] = w
            self._g = g
        return self._g

    def precedence_counts(self) -> list[list[int]]:
        """``N[i][j]``: linear extensions putting ``i`` before ``j``."""
        r = self.r
        out = [[0] * r for _ in range(r)]
        if not self.count:
            return out
        g = self.completions
        for level in self.levels[:-1]:
            for mask, f in level.items():
                if mask not in g:
                    continue
                members = [i for i in range(r) if mask >> i & 1]
                for j in self._addable(mask):
                    w = f * g.get(mask | 1 << j, 0)
                    if w:
                        for i in members:
                            out[i][j] += w
        return out

    def precedes(self, i: int, j: int) -> int:
        """Linear extensions putting ``i`` before ``j``."""
        return self.precedence_counts()[i][j]

    def sample(self, rng: random.Random) -> list[int]:
        """One linear extension drawn uniformly at random (the elements in order)."""
        if not self.count:
            raise ValueError("the order has no linear extension")
        g = self.completions
        mask, out = 0, []
        for _ in range(self.r):
            options = [(j, g.get(mask | 1 << j, 0)) for j in self._addable(mask)]
            pick = rng.randrange(sum(w for _, w in options))
            chosen = options[-1][0]
            for j, w in options:
                if pick < w:
                    chosen = j
                    break
                pick -= w
            out.append(chosen)
            mask |= 1 << chosen
        return out
