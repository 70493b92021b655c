"""The result of :func:`satorder.pipeline.settled.settled`: pair shares held in blocks, read
pair by pair, and written as the JSON of ``satorder settled`` (the contract in docs/cli.md).

A *block* (:class:`~satorder.graph.pair_shares.ShareBlock`) gives the same shares to every pair
``left × right``.  On a problem without open pairs only the nodes of the modular decomposition
that carry fixed or forbidden arcs get blocks; every other comparable pair is *free at one
half* (``rest_half``): its node's choices are all admissible, and reversing them is a bijection
between the answers that turns ``a`` before ``b`` into ``b`` before ``a`` (the usual symmetry
argument — common practice).  So 50,000 items and millions of pairs cost as many blocks as the
arcs touch nodes, and the JSON text is written from precomputed pieces.

>>> from fractions import Fraction
>>> from satorder.graph.pair_shares import ShareBlock
>>> from satorder.model.problem import Problem
>>> p = Problem.from_lists(comparable=[("a", "b"), ("b", "c")])
>>> res = SettledResult(p, "feasible", "modular-decomposition", 2, True, rest_half=True)
>>> res.counts(), res.share(0, 1)
({'settled_before': 0, 'settled_unordered': 0, 'free': 2}, (0.5, 0.5, 0.0))
>>> res.blocks = [ShareBlock([0], [1], Fraction(1), Fraction(0))]
>>> [(a, b, x, s) for a, b, x, _, _, s in res.pairs()]
[(0, 1, 1.0, True), (1, 2, 0.5, False)]
"""

from __future__ import annotations

from dataclasses import dataclass, field
from fractions import Fraction
from typing import Any

from satorder.graph.pair_shares import HALF, ShareBlock
from satorder.model.answer import Answer
from satorder.model.problem import Problem
from satorder.model.requirement import INFEASIBLE, Status

APPROXIMATE = "approximate"
_HALF_TAIL = ('],"before":0.5,"after":0.5,"unordered":0.0,"settled":false}')


@dataclass
class SettledResult:
    """The outcome of :func:`~satorder.pipeline.settled.settled`.  ``blocks`` hold the shares,
    and with ``rest_half`` every comparable pair in no block has share 1/2 each way (see the
    module docstring); ``answer`` is the verified answer of ``solve`` (its core when the
    problem is infeasible)."""

    problem: Problem
    status: Status
    method: str
    answers: int | None
    exact: bool
    blocks: list[ShareBlock] = field(default_factory=list)
    rest_half: bool = False
    epsilon: float | None = None
    delta: float | None = None
    samples: int = 0
    answer: Answer | None = None
    drawn: list = field(default_factory=list, repr=False)  # sampled answers (approximate)
    verified: bool = False
    checks: list[str] = field(default_factory=list)
    notes: list[str] = field(default_factory=list)
    stats: dict[str, Any] = field(default_factory=dict)

    def __post_init__(self) -> None:
        self.status = Status(self.status)

    # ------------------------------------------------------------------ reading
    def exact_pairs(self):
        """Every pair that may be ordered as ``(a, b, before, after, unordered, settled)``
        (item ids, shares as fractions), ``a`` listed so that ``before >= after``."""
        for blk in self.blocks:
            values = (blk.before, blk.after, blk.unordered, blk.settled)
            for a in blk.left:
                for b in blk.right:
                    yield (a, b, *values)
        for a, b in self.rest_pairs():
            yield a, b, HALF, HALF, Fraction(0), False

    def pairs(self):
        """:meth:`exact_pairs` with the shares as floats."""
        for a, b, x, y, z, s in self.exact_pairs():
            yield a, b, float(x), float(y), float(z), s

    def rest_pairs(self) -> list[tuple[int, int]]:
        """The comparable pairs in no block when ``rest_half`` (each once, ``a < b``)."""
        return [(a, b) for a, later in self._rest() for b in later]

    def _rest(self):
        """``(a, [b, ...])``: the pairs of :meth:`rest_pairs` by their first item."""
        if not self.rest_half:
            return
        covered: dict[int, set[int]] = {}
        for blk in self.blocks:
            for a in blk.left:
                covered.setdefault(a, set()).update(blk.right)
            for b in blk.right:
                covered.setdefault(b, set()).update(blk.left)
        adj = self.problem.adj
        for a in range(self.problem.n):
            c = covered.get(a)
            later = [b for b in adj[a] if b > a and (c is None or b not in c)]
            if later:
                yield a, sorted(later)

    def counts(self) -> dict[str, int]:
        """Pairs settled before (one way), settled unordered, and free."""
        out = {"settled_before": 0, "settled_unordered": 0, "free": 0}
        for blk in self.blocks:
            key = ("free" if not blk.settled else
                   "settled_unordered" if blk.unordered == 1 else "settled_before")
            out[key] += blk.pairs
        if self.rest_half:
            out["free"] += self.problem.num_comparable - sum(blk.pairs for blk in self.blocks)
        return out

    def share(self, a: int, b: int) -> tuple[float, float, float] | None:
        """``(before, after, unordered)`` of the pair ``(a, b)``, or None if it is not listed
        (it must stay unordered).  Scans the blocks: for single look-ups."""
        for blk in self.blocks:
            if a in blk.left and b in blk.right:
                return float(blk.before), float(blk.after), float(blk.unordered)
            if b in blk.left and a in blk.right:
                return float(blk.after), float(blk.before), float(blk.unordered)
        if self.rest_half and b in self.problem.adj[a]:
            return 0.5, 0.5, 0.0
        return None

    # ------------------------------------------------------------------ JSON
    def _head(self) -> dict[str, Any]:
        doc: dict[str, Any] = {"status": self.status, "answers": self.answers,
                               "exact": self.exact, "method": self.method}
        if self.method == APPROXIMATE:
            doc["epsilon"], doc["delta"], doc["samples"] = self.epsilon, self.delta, self.samples
        return doc

    def _tail(self) -> dict[str, Any]:
        doc: dict[str, Any] = {**self.counts()}
        if self.answer is not None and self.status == INFEASIBLE:
            doc.update(self.answer.refutation_json())
        if self.notes:
            doc["notes"] = self.notes
        doc["item_count"] = self.problem.n
        doc["comparable_pairs"] = self.problem.num_comparable
        doc["verified"] = self.verified
        doc["checks"] = self.checks
        doc["stats"] = self.stats
        return doc

    def to_json(self) -> dict[str, Any]:
        """The machine-readable result (the contract of docs/cli.md) as a dict."""
        names = self.problem.items
        rows = [{"pair": [names[a], names[b]], "before": x, "after": y, "unordered": z,
                 "settled": s} for a, b, x, y, z, s in self.pairs()]
        return {**self._head(), "pairs": rows, **self._tail()}

    def to_json_text(self) -> str:
        """The same document as one line of text, written block by block: the part shared by
        a block's pairs is formatted once, so millions of pairs cost one string join."""
        import json

        def dumps(doc):
            return json.dumps(doc, separators=(",", ":"))

        q = [json.dumps(name) for name in self.problem.items]
        parts = []
        tails: dict[tuple, str] = {}  # the text after the pair, once per distinct shares
        for blk in self.blocks:
            # blocks of one node share their fraction objects: the key needs no hashing of
            # fractions (the blocks keep the objects alive, so an id stands for one value)
            key = (id(blk.before), id(blk.after), id(blk.unordered), blk.exact_settled)
            tail = tails.get(key)
            if tail is None:
                tail = tails[key] = (
                    f'],"before":{float(blk.before)!r},"after":{float(blk.after)!r},'
                    f'"unordered":{float(blk.unordered)!r},'
                    f'"settled":{"true" if blk.settled else "false"}}}')
            if len(blk.left) == len(blk.right) == 1:
                parts.append(f'{{"pair":[{q[blk.left[0]]},{q[blk.right[0]]}{tail}')
                continue
            right = [q[b] for b in blk.right]
            for a in blk.left:
                head = '{"pair":[' + q[a] + ","
                parts.append(head + (tail + "," + head).join(right) + tail)
        for a, later in self._rest():
            head = '{"pair":[' + q[a] + ","
            parts.append(head + (_HALF_TAIL + "," + head).join([q[b] for b in later])
                         + _HALF_TAIL)
        parts = [p for p in parts if p]
        return (dumps(self._head())[:-1] + ',"pairs":[' + ",".join(parts) + "],"
                + dumps(self._tail())[1:] + "\n")
