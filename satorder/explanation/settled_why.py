"""Why a pair is settled: a minimal set of requirements that forces its relation, with a
derivation; or, for a free pair, answers that order it differently.

A pair ``a, b`` is settled when every answer gives it the same relation (``a`` before ``b``,
``b`` before ``a``, or neither).  The *opposite* of that relation is a requirement of its own:
"``a`` may not come before ``b``" (a forbidden arc) for a pair settled before, and "``a`` and
``b`` must be ordered" for a pair settled unordered.  Adding the opposite to the problem makes
it infeasible, so :func:`satorder.explanation.explain.explain` finds a minimal core of the
enlarged problem — the opposite plus the requirements that force the relation — and a
derivation of the contradiction, in the same words as ``satorder explain``.  The core is
checked like every core (its derivation replayed by :mod:`satorder.certify.derivation`; one
witness order per member, :mod:`satorder.certify.minimality`): infeasible together with the
opposite, and with any one member dropped the opposite can hold.

On large problems the search starts on the requirements among a few items around ``a`` and
``b`` (widened step by step; a core of a part is a core of the whole, since the requirements it
leaves out are simply not used), and falls back to the whole problem.

Which relations a pair can take is decided by the SAT engine under assumptions
(:mod:`satorder.sat.support`); for a free pair one certified answer per relation is shown.

>>> from satorder import Problem
>>> p = Problem.from_lists(fixed=[("kiln", "loom"), ("loom", "quay")], incomparable=[])
>>> why = why_settled(p, "kiln", "quay")
>>> why.relation, [str(r.kind) for r in why.members()], why.verified
('before', ['fixed', 'fixed'], True)
"""

from __future__ import annotations

from collections import deque
from dataclasses import dataclass, field
from typing import Any

from satorder.certify import derivation as replay
from satorder.certify.order import check_order
from satorder.errors import CertificateError, InputError
from satorder.explanation import derivation
from satorder.explanation.explain import explain
from satorder.model.problem import Problem
from satorder.model.requirement import FEASIBLE, INFEASIBLE, UNKNOWN, Kind, Requirement
from satorder.sat.support import AFTER, BEFORE, UNORDERED, pair_support

LOCAL_SIZES = (12, 40, 150)  # item counts of the neighbourhoods tried on large problems
WHOLE_ITEMS = 60  # up to this many items the whole problem is explained at once


@dataclass
class SettledWhy:
    """The outcome of :func:`why_settled`.  ``possible``: the relations some answer gives the
    pair; when settled, ``core`` (over ``scope``'s item ids) holds the forcing requirements and
    the ``opposite`` relation as a requirement, ``steps`` the derivation; ``witnesses`` holds
    certified answers per relation (successor sets over the problem's ids)."""

    problem: Problem
    pair: tuple[int, int]
    status: str
    possible: set[str] = field(default_factory=set)
    opposite: Requirement | None = None
    core: list[Requirement] | None = None
    steps: list | None = None
    scope: Problem | None = None
    witnesses: dict[str, list[set[int]]] = field(default_factory=dict)
    notes: list[str] = field(default_factory=list)
    verified: bool = False
    answer: Any = None  # infeasible problems: the verified answer of solve, with its core

    @property
    def settled(self) -> bool:
        return len(self.possible) == 1

    @property
    def relation(self) -> str | None:
        """The relation every answer gives the pair (None for a free pair)."""
        return next(iter(self.possible)) if self.settled else None

    def members(self) -> list[Requirement]:
        """The requirements of the problem that force the relation (the core minus the
        opposite)."""
        return [r for r in self.core or [] if r != self.opposite]

    def to_json(self) -> dict[str, Any]:
        names = self.problem.items
        a, b = self.pair
        doc: dict[str, Any] = {"status": self.status, "pair": [names[a], names[b]],
                               "settled": self.settled, "relation": self.relation,
                               "possible": sorted(self.possible)}
        if self.core is not None:
            sn = self.scope.items
            doc["core"] = [r.to_json(sn) for r in self.core]
            doc["opposite"] = self.core.index(self.opposite)
            doc["derivation"] = (None if self.steps is None
                                 else derivation.to_json(self.steps, self.core, sn))
        if self.answer is not None and self.status == INFEASIBLE:
            doc.update(self.answer.refutation_json())
        if self.witnesses:
            doc["witnesses"] = [
                {"relation": rel, "order": [[names[x], names[y]] for x, s in enumerate(succ)
                                            for y in sorted(s)], "verified": True}
                for rel, succ in sorted(self.witnesses.items())]
        if self.notes:
            doc["notes"] = self.notes
        doc["verified"] = self.verified
        return doc


def why_settled(problem: Problem, a: str, b: str, time_limit: float = 30.0,
                solver: str | None = None) -> SettledWhy:
    """Explain the relation of the items named ``a`` and ``b`` (see the module docstring)."""
    idx = problem.index
    for name in (a, b):
        if name not in idx:
            raise InputError(f"{problem.source}: no item named {name!r}")
    if a == b:
        raise InputError(f"--why needs two different items, got {a!r} twice")
    x, y = idx[a], idx[b]
    hard = problem.with_requirements(prefer=[]) if problem.prefer else problem
    out = SettledWhy(problem, (x, y), UNKNOWN)
    if hard.contradictions():  # two requirements clash on one pair: no answer at all
        return _no_answer(out, hard, solver, time_limit)
    if y not in hard.adj[x] and hard.must_be_unordered(x, y):
        # settled by a requirement of its own: the opposite contradicts it at once
        out = _no_answer(out, hard, solver, time_limit)
        if out.status != FEASIBLE:
            return out
        out.status, out.possible = FEASIBLE, {UNORDERED}
        out.opposite = Requirement(Kind.COMPARABLE, (x, y))
        out.core = [Requirement(Kind.INCOMPARABLE, (x, y)), out.opposite]
        out.scope = hard
        out.steps = derivation.build_derivation(out.core)
        replay.check_derivation([r.to_json(hard.items) for r in out.core],
                                derivation.to_json(out.steps, out.core, hard.items))
        out.notes.append("the pair must stay unordered: a requirement of the problem")
        out.verified = True
        return out
    sup = pair_support(hard, [(x, y)], solver=solver)
    out.possible = sup.possible[(x, y)]
    if not out.possible:
        return _no_answer(out, hard, solver, time_limit)
    out.status = FEASIBLE
    for succ in sup.witnesses:
        check_order(hard, succ)
        rel = BEFORE if y in succ[x] else AFTER if x in succ[y] else UNORDERED
        out.witnesses.setdefault(rel, succ)
    if not out.settled:
        out.verified = set(out.witnesses) == out.possible
        return out
    rel = out.relation
    out.opposite = (Requirement(Kind.FORBIDDEN, (x, y)) if rel == BEFORE else
                    Requirement(Kind.FORBIDDEN, (y, x)) if rel == AFTER else
                    Requirement(Kind.COMPARABLE, (x, y)))
    for scope in _scopes(hard, x, y):
        sub, opp = _with_opposite(scope, out.opposite, hard)
        expl = explain(sub, time_limit=time_limit)
        if expl.status != INFEASIBLE:
            continue
        if opp not in expl.core:  # a part of a problem with answers has answers
            raise CertificateError("a core without the opposite relation: the problem "
                                   "itself would have no answer")
        out.scope, out.core, out.steps = sub, expl.core, expl.steps
        out.opposite = opp
        out.notes += expl.notes
        out.verified = expl.verified
        if scope is not hard:
            out.notes.append(f"found among the requirements on {sub.n} items around the pair")
        return out
    out.status = UNKNOWN
    out.notes.append("no core was found within the limits")
    return out


def _no_answer(out: SettledWhy, problem: Problem, solver, time_limit) -> SettledWhy:
    """The verdict of ``solve`` on the whole problem: when it has no answer, its verified core
    (or forcing chain) says why, and no pair is settled or free."""
    from satorder.pipeline.solve import solve

    ans = solve(problem, solver=solver, time_limit=time_limit)
    out.status = ans.status
    if ans.status == INFEASIBLE:
        out.possible, out.answer, out.verified = set(), ans, ans.verified
        out.notes.append("the problem has no answer at all; satorder explain says why")
    return out


def _scopes(problem: Problem, x: int, y: int):
    """The problem restricted to growing neighbourhoods of ``x, y`` (large problems), then the
    whole problem."""
    if problem.n > WHOLE_ITEMS:
        links: dict[int, set[int]] = {}
        for u, v in problem.fixed + problem.forbidden:
            links.setdefault(u, set()).add(v)
            links.setdefault(v, set()).add(u)
        for size in LOCAL_SIZES:
            items = _around(problem, x, y, links, size)
            if len(items) < problem.n:
                yield _restrict(problem, items)
    yield problem


def _around(problem: Problem, x: int, y: int, links, size: int) -> list[int]:
    """Up to ``size`` items nearest to ``x`` and ``y`` (breadth first over comparable pairs
    and fixed or forbidden arcs)."""
    seen = {x: None, y: None}
    queue = deque([x, y])
    while queue and len(seen) < size:
        v = queue.popleft()
        for w in sorted(problem.adj[v] | links.get(v, set())):
            if w not in seen:
                seen[w] = None
                queue.append(w)
                if len(seen) >= size:
                    break
    return sorted(seen)


def _restrict(problem: Problem, items: list[int]) -> Problem:
    """The requirements among ``items`` as a problem of its own (the same item names; pairs to
    items left out are simply not constrained)."""
    pos = {v: k for k, v in enumerate(items)}
    adj = [{pos[w] for w in problem.adj[v] if w in pos} for v in items]
    inc = None
    if problem.incomparable is not None:
        inc = [{pos[w] for w in problem.incomparable[v] if w in pos} for v in items]
    keep = [(pos[u], pos[v]) for u, v in problem.fixed if u in pos and v in pos]
    ban = [(pos[u], pos[v]) for u, v in problem.forbidden if u in pos and v in pos]
    return Problem(items=[problem.items[v] for v in items], adj=adj, incomparable=inc,
                   fixed=keep, forbidden=ban, source=problem.source)


def _with_opposite(scope: Problem, opposite: Requirement, whole: Problem):
    """``scope`` plus the opposite requirement (translated to its item ids)."""
    index = scope.index
    u, v = (index[whole.items[t]] for t in opposite.pair)
    if opposite.kind == Kind.FORBIDDEN:
        return (scope.with_requirements(forbidden=scope.forbidden + [(u, v)]),
                Requirement(Kind.FORBIDDEN, (u, v)))
    adj = [set(s) for s in scope.adj]
    adj[u].add(v)
    adj[v].add(u)
    return scope.with_requirements(adj=adj), Requirement(Kind.COMPARABLE, (u, v))
