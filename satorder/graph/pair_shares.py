"""Exact pair shares of a problem without open pairs, read off its modular decomposition.

The *share* of ``a`` before ``b`` is the fraction of all answers in which ``a`` comes before
``b``.  Without open pairs the answers are independent choices at the nodes of the modular
decomposition with the arcs placed where their ends separate (:mod:`satorder.graph.node_choices`),
and the relation of two comparable items ``a, b`` is decided at their lowest common ancestor
``X`` alone: ``a`` is before ``b`` exactly when the child of ``X`` holding ``a`` comes before the
child holding ``b``.  Every pair between the same two children of ``X`` has the same share, so
the shares come in *blocks* (:class:`ShareBlock`: all of ``left`` × all of ``right``), one per
pair of adjacent children of a node, and a whole problem costs one formula per pair of children
— never a loop over the pairs of a dense problem:

* **prime node**: of its two orientations (``up`` and its reverse) the arcs allow ``u`` and
  ``d`` (each 0 or 1); children ``i → j`` in ``up`` are in that order in a share ``u / (u + d)``
  of the answers (1, 1/2 or 0);
* **series node** with ``k`` children, ``r`` of them touched by arcs: its answers are the linear
  orders of the children meeting the arcs, i.e. a uniform linear extension of the order the
  arcs put on the ``r`` children, with the ``k - r`` free children shuffled in uniformly.  Two
  free children: 1/2.  Two touched children ``i, j``: ``N_ij / L`` (``L`` linear extensions,
  ``N_ij`` of them with ``i`` first; :mod:`satorder.graph.linear_extensions`).  A free child
  ``x`` and a touched child ``y``: ``x`` is equally likely to fall into each of the ``r + 1``
  gaps around the touched children, so the share of ``x`` before ``y`` is ``E[ρ_y] / (r + 1)``
  where ``ρ_y = 1 + #{touched i before y}`` is the rank of ``y`` among the touched children,
  ``E[ρ_y] = 1 + Σ_i N_iy / L`` (the argument is the usual one for uniformly random
  permutations: a free element's rank among any fixed set of others is uniform — common
  practice).

Comparable pairs are always ordered, so every share of "neither" is 0 here.  Shares are exact
fractions (:class:`fractions.Fraction`); a pair is *settled* when its share is 0 or 1.

>>> from satorder.model.problem import Problem
>>> from satorder.graph.node_choices import constrain
>>> p = Problem.from_lists(comparable=[("a", "b"), ("b", "c"), ("a", "c")], fixed=[("a", "b")])
>>> sorted((p.names(b.left), p.names(b.right), str(b.before)) for b in shares(constrain(p)))
[(['a'], ['b'], '1'), (['a'], ['c'], '2/3'), (['c'], ['b'], '2/3')]
"""

from __future__ import annotations

from collections.abc import Iterator
from dataclasses import dataclass
from fractions import Fraction

from satorder.graph.modular import SERIES
from satorder.graph.node_choices import Constrained, NodeChoices

HALF = Fraction(1, 2)


@dataclass
class ShareBlock:
    """Every pair ``(a, b)`` with ``a`` in ``left`` and ``b`` in ``right`` has these shares of
    ``a`` before ``b``, ``b`` before ``a`` and neither (item ids, exact fractions)."""

    left: list[int]
    right: list[int]
    before: Fraction
    after: Fraction
    unordered: Fraction = Fraction(0)
    exact_settled: bool | None = None  # decided otherwise than by the shares (sampled shares)

    @property
    def settled(self) -> bool:
        """One relation holds in every answer."""
        if self.exact_settled is not None:
            return self.exact_settled
        return 1 in (self.before, self.after, self.unordered)

    @property
    def pairs(self) -> int:
        return len(self.left) * len(self.right)

    def flipped(self) -> ShareBlock:
        return ShareBlock(self.right, self.left, self.after, self.before, self.unordered,
                          self.exact_settled)


def shares(con: Constrained, arc_free_nodes: bool = True) -> Iterator[ShareBlock]:
    """The share blocks of every comparable pair (none when no answer exists), each oriented
    so that ``before >= after``.  With ``arc_free_nodes=False`` only the nodes that carry arcs
    give blocks: at any other node every pair's share is 1/2 (all of its choices are
    admissible, and their reverses too), which the caller states once."""
    if con.count == 0:
        return
    for choice in con.nodes:
        if not arc_free_nodes and not choice.arcs:
            continue
        items = [sorted(c.items) for c in choice.node.children]
        rest = {}  # 1 - p and whether p >= 1 - p, computed once per share
        for i, j, p in (_series(choice) if choice.kind == SERIES else _prime(choice)):
            known = rest.get(p)
            if known is None:
                known = rest[p] = (1 - p, p >= 1 - p)
            q, first = known
            yield (ShareBlock(items[i], items[j], p, q) if first else
                   ShareBlock(items[j], items[i], q, p))


def _series(choice: NodeChoices):
    k = len(choice.node.children)
    if choice.ext is None:
        for i in range(k):
            for j in range(i + 1, k):
                yield i, j, HALF
        return
    ext = choice.ext
    total = ext.count
    r = len(choice.involved)
    pos = {c: t for t, c in enumerate(choice.involved)}
    n_before = ext.precedence_counts()
    # P(a free child before touched child y) = E[rank of y among the touched] / (r + 1)
    free_first = [Fraction(total + sum(n_before[x][y] for x in range(r)), total * (r + 1))
                  for y in range(r)]
    for i in range(k):
        pi = pos.get(i)
        for j in range(i + 1, k):
            pj = pos.get(j)
            if pi is None and pj is None:
                yield i, j, HALF
            elif pi is None:
                yield i, j, free_first[pj]
            elif pj is None:
                yield i, j, 1 - free_first[pi]
            else:
                yield i, j, Fraction(n_before[pi][pj], total)


def _prime(choice: NodeChoices):
    forward, backward = choice.allowed
    p_up = Fraction(int(forward), int(forward) + int(backward))
    p_down = 1 - p_up
    for i, j in sorted(choice.up):
        if i < j:
            yield i, j, p_up
        else:
            yield j, i, p_down
