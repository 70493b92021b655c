"""The exact number of answers of a problem.

Three methods, and the result says which one was used:

* ``"modular-decomposition"`` — for problems without open pairs (every pair is either
  comparable or must stay unordered), the answers are the transitive orientations of the
  comparability graph that meet the fixed and forbidden arcs.  A transitive orientation is an
  independent choice at every node of the modular decomposition (Gallai 1967; McConnell &
  Spinrad 2000): a linear order of the children of a series node, one of the two transitive
  orientations of a prime node's quotient (a prime comparability graph has exactly two, one the
  reverse of the other), nothing at a parallel node.  Hence the product formula — k! for a
  series node with k children, 2 for a prime node, 0 if the graph is no comparability graph —
  and, with arcs, each arc lands on the node where its two items separate (their lowest common
  ancestor) and constrains only that node's choice: a series node then counts the linear
  orders of its children that respect its arcs (k!/r! times the linear extensions of the r
  children that carry arcs, by dynamic programming over down-sets), a prime node counts which
  of its two orientations agree with its arcs (:mod:`satorder.graph.node_choices`).  Python
  integers keep any count exact (K_100 has 100! answers).
* ``"enumeration"`` — problems with open pairs: every answer is produced by the SAT engine with
  blocking clauses (:mod:`satorder.sat.enumeration`) and certified
  (:mod:`satorder.pipeline.orders`); with ``limit`` or
  ``time_limit`` reached first, or Ctrl-C, the count is a lower bound (``exact`` is False,
  ``reason`` says which).  Listing is exponential work: :func:`enumeration_bound` gives, before
  it starts, the most answers the problem can have.
* ``"approximate"`` — problems with open pairs whose listing passes
  :data:`LISTING_THRESHOLD` answers (method ``auto``), or on request: ApproxMC estimates the
  number of answers within a factor ``1 + ε`` with probability at least ``1 − δ``
  (:mod:`satorder.sat.modelcount`); ``exact`` is False, ``epsilon`` and ``delta`` are stated,
  and the certified answers listed before the switch are a lower bound.

Preferences rank answers but rule none out, so they do not change the count.  Requirements
that clash on one pair (:meth:`~satorder.model.problem.Problem.contradictions`) admit no answer:
the count is 0 with no search (``stats["clash"]`` names the two), cross-checked like any other.

>>> from satorder.model.problem import Problem
>>> count_answers(Problem.from_lists(comparable=[("a", "b"), ("b", "c"), ("a", "c")])).count
6
>>> count_answers(Problem.from_lists(comparable=[("a", "b"), ("b", "c"), ("a", "c")],
...                                  fixed=[("a", "c")])).count
3
"""

from __future__ import annotations

import math
import time
from dataclasses import dataclass, field
from typing import Any

from satorder.certify.decomposition import check_tree_count
from satorder.errors import CertificateError, InputError
from satorder.graph.arcs import required_arcs
from satorder.graph.forcing import transitive_orientation
from satorder.graph.node_choices import TooManyStates, constrain
from satorder.model.problem import Problem
from satorder.model.requirement import FEASIBLE, INFEASIBLE
from satorder.pipeline.orders import (
    INTERRUPTED,
    LIMIT,
    TIME_LIMIT,
    EnumerationEnd,
    certified_orders,
)
from satorder.pipeline.solve import solve

DECOMPOSITION, ENUMERATION, APPROXIMATE = "modular-decomposition", "enumeration", "approximate"
METHODS = ("auto", DECOMPOSITION, ENUMERATION, APPROXIMATE)
LISTING_THRESHOLD = 10_000  # method auto: past this many listed answers, count approximately


@dataclass
class CountResult:
    """``count`` answers (a lower bound unless ``exact``), found by ``method``."""

    problem: Problem
    count: int
    exact: bool
    method: str
    reason: str = ""
    stats: dict[str, Any] = field(default_factory=dict)
    verified: bool = False
    tree: Any = field(default=None, repr=False)  # the modular decomposition used, if any

    def to_json(self) -> dict[str, Any]:
        doc: dict[str, Any] = {
            "count": self.count,
            "exact": self.exact,
            "method": self.method,
        }
        if self.method == APPROXIMATE:
            doc["epsilon"], doc["delta"] = self.stats["epsilon"], self.stats["delta"]
            doc["guarantee"] = (f"within a factor {1 + doc['epsilon']:g} of the true count with "
                                f"probability at least {1 - doc['delta']:g}")
            doc["lower_bound"] = self.stats.get("enumerated", 0)
        elif not self.exact:
            doc["lower_bound"] = self.count
            doc["stopped"] = self.reason
        if self.problem.prefer:
            doc["note"] = "preferences rank answers but rule none out; they are not counted"
        doc["item_count"] = self.problem.n
        doc["comparable_pairs"] = self.problem.num_comparable
        doc["verified"] = self.verified
        doc["stats"] = self.stats
        return doc


def count_answers(problem: Problem, limit: int | None = None, solver: str | None = None,
                  time_limit: float | None = None, method: str = "auto",
                  on_progress=None, on_enumeration=None, seed: int = 0) -> CountResult:
    """Count the answers of ``problem``; see the module docstring for the methods.

    ``method``: ``"auto"`` (decomposition when there are no open pairs, otherwise enumeration
    that turns approximate past :data:`LISTING_THRESHOLD` answers), ``DECOMPOSITION``,
    ``ENUMERATION`` (list every answer however many) or ``APPROXIMATE``.  ``limit``/``time_limit``
    bound the enumeration (the time limit also the approximate count).  ``on_progress(k)`` is
    called as enumerated answers arrive, ``on_enumeration(bound)`` once before listing starts
    (``bound`` from :func:`enumeration_bound`).  Ctrl-C during the listing ends it: the result
    is then a lower bound with ``reason`` ``"interrupted"``.  ``seed`` fixes ApproxMC's random
    hashes.
    """
    if method not in METHODS:
        raise ValueError(f"unknown counting method {method!r}")
    t0 = time.perf_counter()
    clash = problem.contradictions()
    if clash:  # two requirements clash on one pair: no answer at all
        names = problem.items
        if method == "auto":
            method = ENUMERATION if problem.has_open_pairs else DECOMPOSITION
        return CountResult(problem, 0, True, method, stats={
            "clash": [r.to_json(names) for r in clash[0]],
            "seconds": round(time.perf_counter() - t0, 6)})
    if method == APPROXIMATE or (method == "auto" and problem.has_open_pairs):
        if on_enumeration is not None and method == "auto":
            on_enumeration(enumeration_bound(problem))
        res = _count_open(problem, limit, solver, time_limit, on_progress, seed,
                          listing=method == "auto")
        res.stats["seconds"] = round(time.perf_counter() - t0, 6)
        return res
    if method == "auto":
        method = DECOMPOSITION
    if method == DECOMPOSITION:
        if problem.has_open_pairs:
            raise InputError(f"{problem.source}: has open pairs, which the decomposition "
                             "method cannot count; use the enumeration method (or auto)")
        try:
            res = _count_by_decomposition(problem)
        except TooManyStates:
            res = None
        if res is not None:
            res.stats["seconds"] = round(time.perf_counter() - t0, 6)
            return res
        method = ENUMERATION
    if on_enumeration is not None:
        on_enumeration(enumeration_bound(problem))
    res = _count_by_enumeration(problem, limit, solver, time_limit, on_progress)
    res.stats["seconds"] = round(time.perf_counter() - t0, 6)
    return res


# ------------------------------------------------------------------------ enumeration
def _count_open(problem, limit, solver, time_limit, on_progress, seed, listing) -> CountResult:
    """List up to :data:`LISTING_THRESHOLD` answers (when ``listing``), then count
    approximately; a problem too large for the counter's formula is listed to the end (or to
    ``limit``, the time limit, Ctrl-C) as by the enumeration method."""
    from satorder.sat import runner
    from satorder.sat.answer_formula import too_large

    size = too_large(problem)
    if size:
        if not listing:
            raise InputError(f"{problem.source}: too large for approximate counting ({size}); "
                             "use --method enumeration with --limit or --time-limit")
        res = _count_by_enumeration(problem, limit, solver, time_limit, on_progress)
        res.stats["approximate"] = f"not tried: {size}"
        return res

    deadline = runner.deadline_after(time_limit)
    listed = None
    if listing:
        cap = LISTING_THRESHOLD if limit is None else min(limit, LISTING_THRESHOLD)
        listed = _count_by_enumeration(problem, cap, solver, time_limit, on_progress)
        if listed.exact or listed.reason != LIMIT or cap == limit:
            return listed
    try:
        res = _count_approximately(problem, seed, deadline)
    except KeyboardInterrupt:  # Ctrl-C while counting: what was listed is a lower bound
        res, reason = None, INTERRUPTED
    else:
        reason = TIME_LIMIT
    if res is None:  # the time limit or Ctrl-C came first
        if listed is not None:
            listed.reason = reason
            return listed
        return CountResult(problem, 0, False, ENUMERATION, reason=reason,
                           stats={"enumerated": 0})
    if listed is not None:
        res.stats["enumerated"] = listed.count
        res.count = max(res.count, listed.count)
    return res


def _count_approximately(problem, seed, deadline) -> CountResult | None:
    from satorder.sat.answer_formula import AnswerFormula
    from satorder.sat.modelcount import DELTA, EPSILON, approximate_count

    hard = problem.with_requirements(prefer=[]) if problem.prefer else problem
    est = approximate_count(AnswerFormula(hard), EPSILON, DELTA, seed=seed + 1,
                            deadline=deadline)
    if est.estimate is None:
        return None
    stats = {"epsilon": est.epsilon, "delta": est.delta, "cells": est.cells,
             "hashes": est.hashes, "approxmc_seconds": est.seconds, "enumerated": 0}
    return CountResult(problem, est.estimate, est.exact and est.estimate == 0, APPROXIMATE,
                       stats=stats)


def enumeration_bound(problem: Problem) -> float:
    """log10 of the most answers ``problem`` can have, from the states each pair may take in an
    answer (common practice, a plain product): a comparable pair is ordered one of 2 ways (1
    when a fixed arc or a forbidden arc on it leaves one), an open pair is unordered or ordered
    either way (3, or 2 with a forbidden arc), a pair that must stay unordered has 1 state.
    Listing the answers one by one costs at least one SAT call per answer, so this bounds the
    work.

    >>> from satorder.model.problem import Problem
    >>> round(10 ** enumeration_bound(Problem.from_lists(comparable=[("a", "b"), ("b", "c")])))
    4
    """
    fixed = {frozenset(arc) for arc in problem.fixed}
    banned = {frozenset(arc) for arc in problem.forbidden}
    two = three = 0
    for a in range(problem.n):
        for b in problem.adj[a]:
            if a < b and frozenset((a, b)) not in fixed and frozenset((a, b)) not in banned:
                two += 1
    if problem.incomparable is not None:
        for a in range(problem.n):
            for b in range(a + 1, problem.n):
                if problem.is_open(a, b):
                    if frozenset((a, b)) in banned:
                        two += 1
                    else:
                        three += 1
    return two * math.log10(2) + three * math.log10(3)


def _count_by_enumeration(problem, limit, solver, time_limit, on_progress) -> CountResult:
    end = EnumerationEnd()
    listed = 0
    orders = certified_orders(problem, limit=limit, solver=solver, time_limit=time_limit,
                              end=end)
    try:
        for found in orders:
            listed += 1
            if on_progress is not None:
                on_progress(found.index)
    except KeyboardInterrupt:  # stop with what was found: a lower bound
        end.complete, end.reason = False, INTERRUPTED
    finally:
        orders.close()
    # every enumerated order passed certify.order.check_order; distinct by construction
    return CountResult(problem, listed, end.complete, ENUMERATION, reason=end.reason,
                       stats={"enumerated": listed}, verified=True)


# ------------------------------------------------------------------------ decomposition
def _count_by_decomposition(problem: Problem) -> CountResult:
    """The product formula of :mod:`satorder.graph.node_choices` (see the module docstring)."""
    stats: dict[str, Any] = {}
    if required_arcs(problem) is None:
        return CountResult(problem, 0, True, DECOMPOSITION, stats=stats)
    if problem.n == 0:
        return CountResult(problem, 1, True, DECOMPOSITION, stats=stats)
    if not transitive_orientation(problem.adj).orientable:
        stats["comparability_graph"] = False
        return CountResult(problem, 0, True, DECOMPOSITION, stats=stats)
    con = constrain(problem, orient_primes=False)
    stats["nodes"] = con.kinds
    stats["constrained_nodes"] = sum(1 for c in con.nodes if c.arcs)
    return CountResult(problem, con.count, True, DECOMPOSITION, stats=stats, tree=con.tree)


# ------------------------------------------------------------------------ alongside an answer
CHEAP_PAIRS = 50_000  # comparable pairs up to which solve also counts its answers


def answers_admitted(problem: Problem, cheap_pairs: int = CHEAP_PAIRS) -> CountResult | None:
    """The number of answers, checked by :func:`check_count`, when it is cheap to know: no
    open pairs (so the modular decomposition counts them) and at most ``cheap_pairs``
    comparable pairs; otherwise ``None``.  ``solve`` prints it beside the order it found, so
    the check is the one that loads no SAT solver: the solving engine agrees that an answer
    exists and the decomposition tree passes its independent check (``satorder count``
    recounts small counts by enumeration as well)."""
    if problem.has_open_pairs or problem.num_comparable > cheap_pairs:
        return None
    try:
        res = _count_by_decomposition(problem)
    except TooManyStates:
        return None
    check_count(res, recount_up_to=0)
    return res


# ------------------------------------------------------------------------ independent check
def check_count(result: CountResult, recount_up_to: int = 64, recount_items: int = 200,
                solver: str | None = None, time_limit: float | None = None) -> None:
    """Check a count with engines that did not produce it; sets ``result.verified``.

    The solving engine (forcing or SAT, its order certified by :mod:`satorder.certify`) must
    agree on whether any answer exists (when it answers within ``time_limit``); and a
    decomposition count of at most ``recount_up_to`` on a problem of at most ``recount_items``
    items is recounted by SAT enumeration, every enumerated order certified.  Raises
    :class:`~satorder.errors.CertificateError` on disagreement.
    """
    problem = result.problem
    hard = problem.with_requirements(prefer=[]) if problem.prefer else problem
    ans = solve(hard, solver=solver, time_limit=time_limit)
    checks = []
    if ans.status == FEASIBLE:
        if result.exact and result.count == 0:
            raise CertificateError("count is 0 but the solver found a certified answer")
        checks.append("a certified answer exists")
    elif ans.status == INFEASIBLE:
        if result.count != 0:
            raise CertificateError(f"count is {result.count} but the problem is infeasible")
        checks.append("the solver certified that no answer exists")
    if result.tree is not None:
        done = check_tree_count(problem.adj, result.tree, result.count,
                                bool(problem.fixed or problem.forbidden))
        if done is not None:
            checks.append(done)
    if result.method == DECOMPOSITION and 0 < result.count <= recount_up_to and \
            problem.n <= recount_items:
        again = _count_by_enumeration(hard, result.count + 1, solver, None, None)
        if not again.exact or again.count != result.count:
            raise CertificateError(
                f"decomposition counts {result.count} answers, enumeration "
                f"{again.count}{'' if again.exact else ' or more'}"
            )
        checks.append("recounted by SAT enumeration, every order certified")
    result.stats["checks"] = checks
    result.verified = bool(checks)
