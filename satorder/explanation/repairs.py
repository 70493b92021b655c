"""Repairs: minimal sets of requirements whose removal makes the problem feasible (minimal
correction sets, found by an implicit-hitting-set loop around the core), each shown with an
order the repaired problem admits that :func:`satorder.certify.order.check_order` accepts.
"""

from __future__ import annotations

import time
from dataclasses import dataclass
from itertools import product

from satorder import certify
from satorder.explanation import derivation as derivation
from satorder.explanation.requirements import requirements
from satorder.graph.forcing import transitive_orientation
from satorder.graph.obstruction import (
    find_obstruction,
)
from satorder.model.problem import Problem
from satorder.model.requirement import FEASIBLE, INFEASIBLE, PAIR_KINDS, Kind, Requirement, items_of
from satorder.model.wording import requirement_text
from satorder.sat.mus import (
    RequirementOracle,
    correction_sets,
)

REPAIR_SAT_ITEMS = 3000  # side-constraint repairs re-solved (unordered pairs listed) up to this


@dataclass
class Repair:
    """A minimal correction set: requirements to drop, and an order the repaired problem admits."""

    drop: list[Requirement]
    succ: list[set[int]] | None
    verified: bool
    note: str = ""


def repair_text(drop: list[Requirement], names: list[str]) -> str:
    """A repair in words: each requirement to drop, "drop the requirement that …" in the one
    wording of :func:`satorder.model.wording.requirement_text`, joined by semicolons."""
    return "; ".join(requirement_text(r, names, form="drop") for r in drop)


# ---------------------------------------------------------------------- repairs
def repaired_problem(problem: Problem, drop: list[Requirement]) -> Problem:
    """``problem`` with the requirements in ``drop`` removed (their pairs become open).  The
    unordered pairs are listed explicitly, so this is for problems of modest size."""
    adj = [set(s) for s in problem.adj]
    if problem.incomparable is None:
        inc = [set(range(problem.n)) - adj[a] - {a} for a in range(problem.n)]
    else:
        inc = [set(s) for s in problem.incomparable]
    fixed, forbidden = list(problem.fixed), list(problem.forbidden)
    for kind, (a, b) in drop:
        if kind == Kind.COMPARABLE:
            adj[a].discard(b)
            adj[b].discard(a)
        elif kind == Kind.INCOMPARABLE:
            inc[a].discard(b)
            inc[b].discard(a)
        elif kind == Kind.FIXED:
            fixed.remove((a, b))
            if not any({a, b} == {x, y} for x, y in fixed):
                adj[a].discard(b)
                adj[b].discard(a)
        else:
            forbidden.remove((a, b))
    return problem.with_requirements(adj=adj, incomparable=inc, fixed=fixed,
                                     forbidden=forbidden, prefer=[])


def _closure(n: int, arcs) -> list[set[int]]:
    succ: list[set[int]] = [set() for _ in range(n)]
    for a, b in arcs:
        succ[a].add(b)
    return succ


def _verify_small_repair(problem: Problem, oracle, universe, mcs) -> Repair:
    drop = [oracle.requirements[k] for k in mcs]
    ok, arcs = oracle.check([k for k in universe if k not in set(mcs)])
    if not ok:
        return Repair(drop, None, False, "the repaired problem is still infeasible")
    succ = _closure(problem.n, arcs)  # the oracle's model is transitively closed
    certify.check_order(repaired_problem(problem, drop), succ)
    return Repair(drop, succ, True)


def _verify_plain_repair(problem: Problem, drop: list[Requirement], max_tries: int):
    """For problems whose other pairs must all stay unordered: the dropped pairs become open, so
    the repaired problem is feasible iff some choice of ordered/unordered for them leaves a
    comparability graph.  Choices are tried (flipping every dropped pair first); an orientation
    found is checked by :func:`certify.check_order` on that graph, which lies between the kept
    comparable pairs and the kept pairs plus the open ones.

    Returns ``(repair, blocker)``: ``blocker`` is a minimal obstruction of the first (flipped)
    choice when no choice worked, i.e. where the remaining conflict lies."""
    pairs = [r.pair for r in drop if r.kind in PAIR_KINDS]
    was_edge = [r.kind == Kind.COMPARABLE for r in drop if r.kind in PAIR_KINDS]
    if len(pairs) != len(drop):
        return Repair(drop, None, False, "fixed or forbidden arcs: not checked here"), None
    blocker = None
    for tries, choice in enumerate(product((False, True), repeat=len(pairs))):
        if tries >= max_tries:
            break
        adj = list(problem.adj)
        for (a, b), edge_before, keep in zip(pairs, was_edge, choice):
            edge = edge_before == keep  # choice False flips the pair
            for x, y in ((a, b), (b, a)):
                adj[x] = set(adj[x])
                (adj[x].add if edge else adj[x].discard)(y)
        res = transitive_orientation(adj)
        if res.orientable:
            succ = res.successor_sets()
            certify.check_order(Problem(items=problem.items, adj=adj), succ)
            return Repair(drop, succ, True), None
        if blocker is None:
            blocker = find_obstruction(adj, res)
    return Repair(drop, None, False, "other conflicts remain after this change"), blocker


def _verify_general_repair(problem: Problem, drop: list[Requirement], deadline: float):
    """Solve the repaired problem with the project's solver (its order is checked by
    :func:`certify.check_order` inside :func:`satorder.pipeline.solve.solve`); on failure the items
    of
    the repaired problem's core show where the remaining conflict lies."""
    from satorder.pipeline.solve import solve

    left = deadline - time.monotonic()
    if left <= 0:
        return Repair(drop, None, False, "time limit reached"), None
    ans = solve(repaired_problem(problem, drop), engine="sat", time_limit=left)
    if ans.status == FEASIBLE:
        return Repair(drop, ans.succ, True), None
    if ans.status == INFEASIBLE and ans.core:
        return (Repair(drop, None, False, "other conflicts remain after this change"),
                items_of(ans.core))
    return Repair(drop, None, False, "no verdict within the time limit"), None


def _local_repairs(problem: Problem, items: set[int], limit: int, deadline: float,
                   say) -> tuple[list[Repair], list[str]]:
    """Minimal correction sets for a problem too large for the whole-problem search.

    Correction sets are enumerated over the requirements among a set of items ``U`` (first the
    core's); each is checked on the whole problem.  One that works is a minimal correction set
    of the whole problem too (a proper subset already fails on ``U``).  One that does not
    reveals a further obstruction; its items join ``U`` and the enumeration restarts — an
    implicit-hitting-set loop (Davies & Bacchus, "Solving MAXSAT by solving a sequence of
    simpler MaxSAT instances", CP 2011).  The whole-problem check is the forcing algorithm
    when every other pair must stay unordered, the SAT engine otherwise."""
    items = set(items)
    offered: dict[frozenset, Repair] = {}
    rejected: set[frozenset] = set()
    notes: list[str] = []
    tries = 1 if problem.num_comparable > 200_000 else 16
    plain = problem.incomparable is None and not problem.fixed and not problem.forbidden
    while len(offered) < limit and time.monotonic() < deadline:
        reqs = requirements(problem, items)
        grew = False
        with RequirementOracle(reqs) as oracle:
            universe = list(range(len(reqs)))
            found = correction_sets(oracle, universe, limit + len(rejected) + len(offered),
                                    time_limit=max(0.1, deadline - time.monotonic()))
        for mcs in found:
            drop = [reqs[k] for k in mcs]
            key = frozenset(drop)
            if key in offered or key in rejected:
                continue
            if time.monotonic() >= deadline or len(offered) >= limit:
                break
            say(f"checking repair {len(offered) + 1} on the whole problem")
            if plain:
                rep, blocker = _verify_plain_repair(problem, drop, tries)
            else:
                rep, blocker = _verify_general_repair(problem, drop, deadline)
            if rep.verified:
                offered[key] = rep
                continue
            rejected.add(key)
            if blocker is not None and not set(blocker) <= items and len(items) < 60:
                items |= set(blocker)
                grew = True
                break
        if not grew:
            break
    if rejected:
        notes.append(f"{len(rejected)} correction set(s) of the core's neighbourhood left out: "
                     "dropping them does not make the whole problem feasible")
    if len(offered) < limit and time.monotonic() >= deadline:
        notes.append("repairs: time limit reached")
    return sorted(offered.values(), key=lambda r: len(r.drop)), notes
