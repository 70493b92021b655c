"""Dimension at most two: a transitive orientation of the incomparability graph (a conjugate
order) gives a realizer of two linear orders (Dushnik & Miller 1941); when none exists, the
forcing chain names a sub-order of dimension at least three, shrunk to a small witness.
"""

from __future__ import annotations

import random
import time

from satorder.measure.dimension.split import _local


def _incomparability_adj(sub: list[set[int]]) -> list[set[int]]:
    k = len(sub)
    comp = [set(s) for s in sub]
    for a, s in enumerate(sub):
        for b in s:
            comp[b].add(a)
    everything = set(range(k))
    return [everything - comp[a] - {a} for a in range(k)]


def conjugate_realizer(sub: list[set[int]]):
    """Two linear orders realizing ``sub`` (local ids), or the forcing chain showing that its
    incomparability graph has no transitive orientation (dimension ≥ 3).

    Returns ``(realizer, None)`` or ``(None, chain)``.
    """
    from satorder.graph.forcing import transitive_orientation

    k = len(sub)
    inc = _incomparability_adj(sub)
    res = transitive_orientation(inc)
    if not res.orientable:
        return None, res.chain
    below = [0] * k
    for s in sub:
        for b in s:
            below[b] += 1
    q_before = [0] * k
    q_after = [0] * k
    for a, b in res.arcs():
        q_before[b] += 1
        q_after[a] += 1
    pos1 = [below[x] + q_before[x] for x in range(k)]
    pos2 = [below[x] + q_after[x] for x in range(k)]
    l1, l2 = [0] * k, [0] * k
    for x in range(k):
        l1[pos1[x]] = x
        l2[pos2[x]] = x
    return [l1, l2], None


def _is_two_dimensional(sub: list[set[int]]) -> bool:
    from satorder.graph.forcing import transitive_orientation

    return transitive_orientation(_incomparability_adj(sub)).orientable


def shrink_witness(succ, items: list[int], max_items: int = 400, max_tests: int = 40
                   ) -> list[int]:
    """Drop items while the sub-order keeps dimension ≥ 3: chunks of halving size, then single
    items (ddmin style).  The result is minimal (no single item can be dropped) unless the
    budget of ``max_tests`` dimension-2 tests runs out first; ``items`` with more than
    ``max_items`` members are returned unchanged."""
    if len(items) > max_items:
        return items
    cur = list(items)
    chunk = max(1, len(cur) // 2)
    tests = 0
    while True:
        i = 0
        while i < len(cur):
            trial = cur[:i] + cur[i + chunk:]
            if tests >= max_tests:
                return cur
            tests += 1
            if len(trial) >= 6 and not _is_two_dimensional(_local(succ, trial)):
                cur = trial
            else:
                i += chunk
        if chunk == 1:
            return cur
        chunk = max(1, chunk // 2)


def _witness_chain(succ, items):
    """Forcing chain (in item ids) in the incomparability graph of the sub-order on items."""
    from satorder.graph.forcing import ForcingStep

    _, chain = conjugate_realizer(_local(succ, items))
    return [ForcingStep((items[s.arc[0]], items[s.arc[1]]),
                        None if s.because is None else (items[s.because[0]], items[s.because[1]]))
            for s in chain]


def sample_witness(succ, pred, items: list[int], tries: int = 40, size: int = 120,
                   seconds: float = 5.0, seed: int = 0) -> list[int] | None:
    """Look for a sub-order of dimension ≥ 3 among small connected pieces of ``items``: a random
    breadth-first search that follows a few random neighbours of each item it reaches."""
    if len(items) <= 2 * size:  # small enough to test whole
        return None if _is_two_dimensional(_local(succ, items)) else list(items)
    rng = random.Random(seed)
    member = set(items)
    t_end = time.perf_counter() + seconds
    for _ in range(tries):
        if time.perf_counter() > t_end:
            break
        start = rng.choice(items)
        piece = [start]
        seen = {start}
        head = 0
        while head < len(piece) and len(piece) < size:
            v = piece[head]
            head += 1
            nb = [u for u in succ[v] if u in member] + [u for u in pred[v] if u in member]
            rng.shuffle(nb)
            for u in nb[:4]:
                if u not in seen and len(piece) < size:
                    seen.add(u)
                    piece.append(u)
        if len(piece) >= 6 and not _is_two_dimensional(_local(succ, piece)):
            return piece
    return None
