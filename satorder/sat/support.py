"""Which relations each pair can take in some answer, decided exactly by SAT calls with
assumptions.

A pair that may be ordered stands in one of three relations in an answer: ``before`` (a < b),
``after`` (b < a) or ``unordered``; a comparable pair never in the last.  The *support* of a
pair is the set of relations some answer gives it; a pair is *settled* when its support is one
relation.  Given the relations already seen in known answers (samples, a listing), each
relation not yet seen is a candidate: one call of the SAT engine under assumptions (``a<b``;
``b<a``; or neither literal) either finds an answer — a witness, which rules out the
candidates it meets for every other pair too — or refutes it, and then no answer gives the pair
that relation.  This is the usual way to find the backbone of a formula with a SAT solver
(Janota, Lynce & Marques-Silva, "Algorithms for computing backbones of propositional
formulae", AI Communications 28, 2015: iterative checks, each model filtering the remaining
candidates).

An engine: the witnesses it returns are checked by the caller
(:func:`satorder.certify.order.check_order`).

>>> from satorder.model.problem import Problem
>>> p = Problem.from_lists(items=["a", "b", "c"], fixed=[("a", "b")], comparable=[("b", "c")],
...                        incomparable=[])          # a < b; b, c ordered; a, c open
>>> sup = pair_support(p, [(0, 1), (1, 2), (0, 2)])
>>> sup.possible[(0, 1)], sorted(sup.possible[(1, 2)]), sorted(sup.possible[(0, 2)])
({'before'}, ['after', 'before'], ['after', 'before', 'unordered'])
"""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import dataclass, field

from satorder.errors import TimeLimitReached
from satorder.model.problem import Problem

BEFORE, AFTER, UNORDERED = "before", "after", "unordered"


@dataclass
class Support:
    """``possible[(a, b)]``: relations some answer gives the pair; ``witnesses``: the answers
    the SAT engine found (successor sets); ``calls``: SAT calls made."""

    possible: dict[tuple[int, int], set[str]]
    witnesses: list[list[set[int]]] = field(default_factory=list)
    calls: int = 0
    refuted: int = 0


def relation(succ: list[set[int]], a: int, b: int) -> str:
    """The relation of the pair ``(a, b)`` in the order ``succ``."""
    if b in succ[a]:
        return BEFORE
    if a in succ[b]:
        return AFTER
    return UNORDERED


def pair_support(problem: Problem, pairs: Iterable[tuple[int, int]],
                 seen: dict[tuple[int, int], set[str]] | None = None, solver: str | None = None,
                 deadline: float | None = None) -> Support:
    """The support of each pair in ``pairs`` (see the module docstring); ``seen`` holds the
    relations already shown by known answers.  Raises
    :class:`~satorder.errors.TimeLimitReached` at the ``deadline``."""
    from satorder.sat.session import SatSession

    pairs = list(pairs)
    seen = {pq: set(seen.get(pq, ())) for pq in pairs} if seen else {pq: set() for pq in pairs}
    out = Support(seen)
    adj = problem.adj

    def candidates(a, b):
        rels = (BEFORE, AFTER) if b in adj[a] else (BEFORE, AFTER, UNORDERED)
        return [r for r in rels if r not in seen[(a, b)]]

    todo = [pq for pq in pairs if candidates(*pq)]
    impossible: dict[tuple[int, int], set[str]] = {}
    with SatSession(problem, solver=solver) as s:
        enc = s.enc
        while todo:
            a, b = todo.pop()
            for rel in candidates(a, b):
                if rel in impossible.get((a, b), ()):
                    continue
                up, down = enc.lt(a, b), enc.lt(b, a)
                assume = [up] if rel == BEFORE else [down] if rel == AFTER else [-up, -down]
                out.calls += 1
                res = s.solve(assumptions=assume, deadline=deadline)
                if res is None:
                    raise TimeLimitReached("the settled check reached its time limit")
                if res is False:
                    impossible.setdefault((a, b), set()).add(rel)
                    out.refuted += 1
                    continue
                succ = [set(x) for x in s.order()]
                out.witnesses.append(succ)
                for pq in todo + [(a, b)]:
                    seen[pq].add(relation(succ, *pq))
            todo = [pq for pq in todo if any(r not in impossible.get(pq, ())
                                             for r in candidates(*pq))]
    return out
