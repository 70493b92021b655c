"""Does a list of linear orders realize an order?  The search's own test, used to decide
whether a proposed realizer may be claimed (the printed answer is certified separately).

A list of linear extensions realizes P when the pairs all of them put the same way are exactly
the ordered pairs of P (Dushnik & Miller 1941).

>>> realizes([{2}, {2}, set()], [[0, 1, 2], [1, 0, 2]])
True
>>> realizes([{2}, {2}, set()], [[0, 1, 2]])
False
"""

from __future__ import annotations


def _positions(n: int, lin) -> list[int] | None:
    if len(lin) != n:
        return None
    pos = [-1] * n
    for i, x in enumerate(lin):
        if not 0 <= x < n or pos[x] >= 0:
            return None
        pos[x] = i
    return pos


def _inversions(seq: list[int]) -> int:
    """Pairs out of order in ``seq``, by merge sort."""
    if len(seq) < 2:
        return 0
    mid = len(seq) // 2
    left, right = seq[:mid], seq[mid:]
    count = _inversions(left) + _inversions(right)
    left.sort()
    right.sort()
    j = 0
    for x in left:  # for each x, the right-hand items smaller than it come after it
        while j < len(right) and right[j] < x:
            j += 1
        count += j
    return count


def realizes(sub: list[set[int]], realizer: list[list[int]]) -> bool:
    """True when every order of ``realizer`` extends ``sub`` and together they agree on no pair
    that ``sub`` leaves unordered."""
    n = len(sub)
    if not realizer:
        return not any(sub)
    positions = []
    for lin in realizer:
        pos = _positions(n, lin)
        if pos is None or any(pos[a] > pos[b] for a in range(n) for b in sub[a]):
            return False
        positions.append(pos)
    pairs = sum(len(s) for s in sub)
    if len(positions) == 1:
        return pairs == n * (n - 1) // 2
    if len(positions) == 2:
        first, second = positions
        by_first = sorted(range(n), key=first.__getitem__)
        agree = n * (n - 1) // 2 - _inversions([second[x] for x in by_first])
        return agree == pairs
    agree = 0
    for x in range(n):  # quadratic, for the few hundred items greedy realizers are tried on
        px = [p[x] for p in positions]
        agree += sum(all(p[y] > v for p, v in zip(positions, px)) for y in range(n))
    return agree == pairs
