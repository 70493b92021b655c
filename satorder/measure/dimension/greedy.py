"""Upper bounds from realizers built greedily: each new linear extension reverses what critical
pairs it can (critical pairs: Trotter 1992, ch. 1, from memory).
"""

from __future__ import annotations

import random
import time

from satorder.measure.dimension.partition import _accept

#: largest part for which a realizer is built greedily to bound the dimension from above
GREEDY_LIMIT = 500


def critical_pairs(sub: list[set[int]]) -> list[tuple[int, int]]:
    """Pairs ``(a, b)`` of incomparable items with everything below ``a`` below ``b`` and
    everything above ``b`` above ``a``.  A family of linear extensions realizes the order as
    soon as each of these pairs has ``b`` before ``a`` in one of them (Trotter, *Combinatorics
    and Partially Ordered Sets*, 1992; from memory — the realizer check counts pairs anyway)."""
    n = len(sub)
    up = [0] * n
    down = [0] * n
    for a, s in enumerate(sub):
        for b in s:
            up[a] |= 1 << b
            down[b] |= 1 << a
    out = []
    for a in range(n):
        comp_a = up[a] | down[a] | (1 << a)
        for b in range(n):
            if a != b and not comp_a >> b & 1:
                if down[a] & ~down[b] == 0 and up[b] & ~up[a] == 0:
                    out.append((a, b))
    return out


def greedy_realizer(sub: list[set[int]], seed: int = 0, max_orders: int | None = None,
                    deadline: float | None = None):
    """Linear extensions built one at a time, each reversing as many not yet reversed critical
    pairs as it can (pairs tried in random order, kept when they close no cycle; the order is
    kept transitively closed as bitsets).  Returns the list of orders (local ids), or ``None``
    when more than ``max_orders`` would be needed or the ``deadline`` (a ``time.monotonic()``
    value) passes."""
    n = len(sub)
    rng = random.Random(seed)
    todo = critical_pairs(sub)
    base_up = [0] * n
    for a, s in enumerate(sub):
        for b in s:
            base_up[a] |= 1 << b
    base_down = [0] * n
    for a in range(n):
        x = base_up[a]
        while x:
            low = x & -x
            base_down[low.bit_length() - 1] |= 1 << a
            x ^= low
    realizer = []
    while todo:
        if max_orders is not None and len(realizer) >= max_orders:
            return None
        if deadline is not None and time.monotonic() > deadline:
            return None
        up, down = list(base_up), list(base_down)
        rng.shuffle(todo)
        for a, b in todo:  # want b before a
            if up[a] >> b & 1:
                continue
            new_up = up[a] | (1 << a)
            new_down = down[b] | (1 << b)
            x = new_down
            while x:
                low = x & -x
                up[low.bit_length() - 1] |= new_up
                x ^= low
            x = new_up
            while x:
                low = x & -x
                down[low.bit_length() - 1] |= new_down
                x ^= low
        # any linear extension of the grown order: sort by the number of items below
        lin = sorted(range(n), key=lambda v: (bin(down[v]).count("1"), v))
        pos = [0] * n
        for i, v in enumerate(lin):
            pos[v] = i
        todo = [(a, b) for a, b in todo if not pos[b] < pos[a]]
        realizer.append(lin)
    return realizer or [sorted(range(n), key=lambda v: (len(sub[v]) * -1, v))]


def _greedy_bound(sub, items, upper, tries=3, seconds=10.0):
    """Best greedy realizer over a few seeds (within ``seconds``), in item ids, or ``None``."""
    if len(items) > GREEDY_LIMIT:
        return None
    best = None
    deadline = time.monotonic() + seconds
    for seed in range(tries):
        r = greedy_realizer(sub, seed, max_orders=upper if best is None else len(best) - 1,
                            deadline=deadline)
        if r is not None and (best is None or len(r) < len(best)):
            best = r
    if best is None or not _accept(None, items, [[items[i] for i in lin] for lin in best],
                                   sub=sub):
        return None
    return [[items[i] for i in lin] for lin in best]
