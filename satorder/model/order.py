"""Small, shared operations on strict partial orders stored as successor sets.

An order on items ``0..n-1`` is a list ``succ`` where ``succ[a]`` is the set of items strictly
above ``a`` (transitively closed).  These helpers are used by engines, renderers and analyses;
the independent checks in :mod:`satorder.certify` deliberately do not use them.
"""

from __future__ import annotations

from collections.abc import Iterable, Iterator


def pairs(succ: list[set[int]]) -> Iterator[tuple[int, int]]:
    """Every ordered pair ``(lower, upper)`` of the order."""
    for a, s in enumerate(succ):
        for b in s:
            yield (a, b)


def from_arcs(n: int, arcs: Iterable[tuple[int, int]]) -> list[set[int]]:
    """Successor sets of the arcs as given (no closure taken)."""
    succ: list[set[int]] = [set() for _ in range(n)]
    for a, b in arcs:
        succ[a].add(b)
    return succ


def topological_order(succ: list[set[int]]) -> list[int]:
    """Items in a linear extension of the order (Kahn's algorithm, smallest id first).

    Raises ``ValueError`` if the relation has a cycle.
    """
    import heapq

    n = len(succ)
    indeg = [0] * n
    for s in succ:
        for b in s:
            indeg[b] += 1
    heap = [a for a in range(n) if indeg[a] == 0]
    heapq.heapify(heap)
    out = []
    while heap:
        a = heapq.heappop(heap)
        out.append(a)
        for b in succ[a]:
            indeg[b] -= 1
            if indeg[b] == 0:
                heapq.heappush(heap, b)
    if len(out) != n:
        raise ValueError("relation has a cycle")
    return out


def transitive_closure(n: int, arcs: Iterable[tuple[int, int]]) -> list[set[int]]:
    """Successor sets of the transitive closure of an acyclic arc set.

    Processes items in reverse topological order, so each set is built once from its direct
    successors' sets.
    """
    direct = from_arcs(n, arcs)
    succ: list[set[int]] = [set() for _ in range(n)]
    for a in reversed(topological_order(direct)):
        s = succ[a]
        for b in direct[a]:
            s.add(b)
            s |= succ[b]
    return succ


def covering_pairs(succ: list[set[int]]) -> list[tuple[int, int]]:
    """The covering pairs (Hasse diagram arcs) of a transitively closed order.

    ``b`` covers ``a`` when ``a < b`` and no ``c`` has ``a < c < b``.
    """
    out = []
    for a, s in enumerate(succ):
        if not s:
            continue
        above_others: set[int] = set()
        for c in s:
            above_others |= succ[c]
        out.extend((a, b) for b in s if b not in above_others)
    return out
