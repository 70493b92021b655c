"""Every answer of a small problem, counted or listed by inserting the items one at a time.

Any strict order on items ``x1 … xk`` restricts to a strict order on ``x1 … x(k-1)``, so the
answers form a tree: an order on the first ``k - 1`` items is extended by placing ``xk``, i.e.
by choosing the set ``D`` of items below it and the set ``U`` above it.  The result is a strict
order exactly when ``D`` is closed downwards, ``U`` upwards, and every member of ``D`` is already
below every member of ``U`` (then ``d < xk < u`` adds nothing transitivity does not already say).
Each pair's requirement (comparable, unordered, open, fixed, forbidden) restricts which side of
``xk`` an earlier item may take.  The choices for one item are found by a small search over the
earlier items in a linear extension of their order: an item may join ``D`` only if all its
predecessors did and ``U`` is still empty, must join ``U`` once one of its predecessors has,
and may join ``U`` only if all of ``D`` lies below it.  (This is the classical generation of
labelled posets by adding one element at a time — e.g. Brinkmann & McKay, "Posets on up to 16
points", Order 19, 2002, use the canonical form of the same step for unlabelled ones.)

Counting the leaves of this tree counts the answers; the subtree count of each choice, added to
the pairs the choice orders, gives for every pair the number of answers that put ``a`` before
``b`` — the exact pair shares — at a cost proportional to the size of the tree, not to the
answers times the pairs.  Items are inserted most-constrained first, which keeps the branches
that die later (orders of a prefix that no later item can join) few in practice; the search
stops after ``limit`` answers or when ``should_stop()`` says so.

This is an engine for problems with open pairs and few answers (the SAT-based methods take over
beyond): it neither checks its own answers nor touches files.

>>> from satorder.model.problem import Problem
>>> p = Problem.from_lists(items=["a", "b", "c"], incomparable=[])   # every pair open
>>> t = tally(p)
>>> t.total, t.complete, t.before[0][1]      # 19 labelled posets on 3 points; a < b in 6
(19, True, 6)
"""

from __future__ import annotations

import sys
from collections.abc import Callable, Iterator
from dataclasses import dataclass, field

from satorder.model.problem import Problem


class _Stop(Exception):
    """Raised inside the search to stop it (limit reached or asked to stop)."""


@dataclass
class Tally:
    """``total`` answers (all of them when ``complete``); ``before[a][b]``: answers putting item
    ``a`` before item ``b``.  ``reason`` says why an incomplete search stopped."""

    total: int
    before: list[list[int]]
    complete: bool
    reason: str = ""
    nodes: int = 0
    stats: dict = field(default_factory=dict)


class _Search:
    def __init__(self, problem: Problem, should_stop: Callable[[], bool] | None):
        self.n = n = problem.n
        self.order = _insertion_order(problem)
        # masks over item ids: may an earlier item j go below / above / beside item k?
        self.can_below = [0] * n
        self.can_above = [0] * n
        self.can_none = [0] * n
        fixed, forbidden = set(problem.fixed), set(problem.forbidden)
        placed: list[int] = []
        for k in self.order:
            for j in placed:
                bit = 1 << j
                if k in problem.adj[j]:
                    below, above, none = True, True, False
                elif problem.must_be_unordered(j, k):
                    below, above, none = False, False, True
                else:
                    below = above = none = True
                if (j, k) in fixed or (k, j) in forbidden:
                    above = False
                if (k, j) in fixed or (j, k) in forbidden:
                    below = False
                if below:
                    self.can_below[k] |= bit
                if above:
                    self.can_above[k] |= bit
                if none:
                    self.can_none[k] |= bit
            placed.append(k)
        self.pred = [0] * n
        self.succ = [0] * n
        self.line: list[int] = []  # a linear extension of the order on the items placed
        self.before = [[0] * n for _ in range(n)]
        self.leaves = 0
        self.nodes = 0
        self.limit: int | None = None
        self.should_stop = should_stop
        self.on_leaf: Callable[[], None] | None = None

    # ------------------------------------------------------------------ one item's choices
    def choices(self, k: int) -> list[tuple[int, int]]:
        """Every ``(D, U)`` (masks) that places item ``k`` consistently."""
        out: list[tuple[int, int]] = []
        line, pred = self.line, self.pred
        cb, ca, cn = self.can_below[k], self.can_above[k], self.can_none[k]
        last = len(line)

        def walk(i: int, d: int, u: int) -> None:
            while i < last:
                j = line[i]
                bit = 1 << j
                pj = pred[j]
                if pj & u:  # a predecessor is above k: so is j
                    if not ca & bit or d & ~pj:
                        return
                    u |= bit
                    i += 1
                    continue
                options = 0
                if not u and not pj & ~d and cb & bit:
                    options |= 1
                if ca & bit and not d & ~pj:
                    options |= 2
                if cn & bit:
                    options |= 4
                if options == 0:
                    return
                if options == 1 or options == 2 or options == 4:  # no branching
                    if options == 1:
                        d |= bit
                    elif options == 2:
                        u |= bit
                    i += 1
                    continue
                if options & 1:
                    walk(i + 1, d | bit, u)
                if options & 2:
                    walk(i + 1, d, u | bit)
                if options & 4:
                    walk(i + 1, d, u)
                return
            out.append((d, u))

        walk(0, 0, 0)
        return out

    # ------------------------------------------------------------------ the tree
    def run(self, depth: int = 0) -> int:
        self.nodes += 1
        if self.nodes & 4095 == 0 and self.should_stop is not None and self.should_stop():
            raise _Stop("stopped")
        if depth == self.n:
            self.leaves += 1
            if self.on_leaf is not None:
                self.on_leaf()
            if self.limit is not None and self.leaves > self.limit:
                raise _Stop("limit")
            return 1
        k = self.order[depth]
        kbit = 1 << k
        pred, succ, line, before = self.pred, self.succ, self.line, self.before
        if depth == self.n - 1 and self.on_leaf is None:  # the last item: count its choices
            options = self.choices(k)
            self.nodes += len(options)
            self.leaves += len(options)
            if self.limit is not None and self.leaves > self.limit:
                raise _Stop("limit")
            for d, u in options:
                for j in line:
                    if d >> j & 1:
                        before[j][k] += 1
                    elif u >> j & 1:
                        before[k][j] += 1
            return len(options)
        total = 0
        for d, u in self.choices(k):
            downs = [j for j in line if d >> j & 1]
            ups = [j for j in line if u >> j & 1]
            pred[k], succ[k] = d, u
            for j in downs:
                succ[j] |= kbit
            for j in ups:
                pred[j] |= kbit
            at = 0
            for i, j in enumerate(line):
                if d >> j & 1:
                    at = i + 1
            line.insert(at, k)
            c = self.run(depth + 1)
            line.pop(at)
            for j in downs:
                succ[j] &= ~kbit
            for j in ups:
                pred[j] &= ~kbit
            if c:
                total += c
                for j in downs:
                    before[j][k] += c
                for j in ups:
                    before[k][j] += c
        pred[k] = succ[k] = 0
        return total


def _insertion_order(problem: Problem) -> list[int]:
    """Items most-constrained first: each next item has the most pairs to the items already
    placed that are not open (ties: more comparable pairs overall, then the smaller id)."""
    n = problem.n
    if n == 0:
        return []
    fixed_ends = {v for arc in problem.fixed + problem.forbidden for v in arc}

    def bound(j: int, k: int) -> bool:
        return k in problem.adj[j] or problem.must_be_unordered(j, k)

    weight = [len(problem.adj[v]) + (n if v in fixed_ends else 0) for v in range(n)]
    left = set(range(n))
    score = [0] * n
    order = []
    while left:
        k = max(left, key=lambda v: (score[v], weight[v], -v))
        order.append(k)
        left.discard(k)
        for v in left:
            if bound(v, k):
                score[v] += 1
    return order


def tally(problem: Problem, limit: int | None = None,
          should_stop: Callable[[], bool] | None = None) -> Tally:
    """Count every answer of ``problem`` and, for each pair, the answers putting ``a`` before
    ``b``; stop (``complete`` False) past ``limit`` answers or when ``should_stop()``."""
    s = _Search(problem, should_stop)
    s.limit = limit
    old = sys.getrecursionlimit()
    sys.setrecursionlimit(max(old, 4 * problem.n + 1000))
    try:
        total = s.run()
        return Tally(total, s.before, True, "complete", s.nodes)
    except _Stop as stop:
        return Tally(s.leaves, s.before, False, str(stop), s.nodes)
    finally:
        sys.setrecursionlimit(old)


def answers(problem: Problem, wanted: set[int] | None = None,
            should_stop: Callable[[], bool] | None = None) -> Iterator[tuple[int, list[set[int]]]]:
    """The answers in the search's (fixed) order as ``(index, successor sets)``; only those
    whose index is in ``wanted`` when it is given.  For problems already known to have few."""
    s = _Search(problem, should_stop)
    found: list[tuple[int, list[set[int]]]] = []
    n = problem.n

    def leaf() -> None:
        index = s.leaves - 1
        if wanted is None or index in wanted:
            found.append((index, [{j for j in range(n) if s.succ[a] >> j & 1}
                                  for a in range(n)]))

    s.on_leaf = leaf
    old = sys.getrecursionlimit()
    sys.setrecursionlimit(max(old, 4 * n + 1000))
    try:
        s.run()
    finally:
        sys.setrecursionlimit(old)
    yield from found
