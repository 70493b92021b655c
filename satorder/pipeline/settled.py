"""What the evidence settles: for every pair that may be ordered, the share of the answers
putting ``a`` before ``b``, ``b`` before ``a``, or neither, and whether the pair is *settled*
(one of the three shares is 1).

Three methods, and the result says which one was used (``method``):

* ``"modular-decomposition"`` — problems without open pairs, exact at any size: the shares
  are read off the modular decomposition, one formula per pair of children of a node that
  carries fixed or forbidden arcs (:mod:`satorder.graph.pair_shares`); every other comparable
  pair has share 1/2 each way (:mod:`satorder.pipeline.settled_result`), so 50,000 items and
  millions of pairs cost one decomposition.
* ``"listing"`` — problems with open pairs and at most :data:`EXACT_LIMIT` answers, exact:
  every answer is counted by inserting the items one at a time
  (:mod:`satorder.graph.insertion`), each pair's count added up on the way.
* ``"approximate"`` — more answers: their number is estimated by ApproxMC with stated
  (ε, δ) (:mod:`satorder.sat.modelcount`) and the shares by the fractions among ``samples``
  answers drawn almost uniformly by UniGen (:mod:`satorder.sat.sampling`); ``exact`` is False.

Whether a pair is settled is exact in every method: with open pairs, the relations each pair
takes in some answer are decided by SAT calls with assumptions (:mod:`satorder.sat.support`),
every witness answer certified.

Checks by code that did not produce the result (their list is in ``checks``): for the
decomposition, the tree (:mod:`satorder.certify.decomposition`, up to its size budget) and the
answer of :func:`satorder.pipeline.solve.solve`, certified by
:func:`satorder.certify.order.check_order`, which must meet every settled pair; for the listing,
every relation with a positive share has a certified witness and every other one is refuted by
the SAT engine; up to :data:`RECOUNT` answers, every share is recounted by another engine (the
listing engine for the decomposition, a SAT enumeration of certified orders for the listing).
An infeasible problem gets the verified answer of ``solve``, whose core (or forcing chain) says
why.

>>> from satorder.model.problem import Problem
>>> p = Problem.from_lists(comparable=[("a", "b"), ("b", "c"), ("a", "c")], fixed=[("a", "b")])
>>> res = settled(p)
>>> res.answers, res.exact, [(p.names((a, b)), before) for a, b, before, *_ in res.pairs()][:1]
(3, True, [(['a', 'b'], 1.0)])
"""

from __future__ import annotations

import gc
import time
from contextlib import contextmanager
from fractions import Fraction

from satorder.certify.decomposition import check_tree_count
from satorder.certify.order import check_order
from satorder.errors import CertificateError, InputError, TimeLimitReached
from satorder.graph.node_choices import TooManyStates, constrain
from satorder.graph.pair_shares import ShareBlock, shares
from satorder.model.problem import Problem
from satorder.model.requirement import FEASIBLE, INFEASIBLE, UNKNOWN
from satorder.pipeline.settled_result import APPROXIMATE, SettledResult
from satorder.sat import runner
from satorder.sat.support import AFTER, BEFORE, UNORDERED, pair_support, relation

DECOMPOSITION, LISTING = "modular-decomposition", "listing"
METHODS = ("auto", DECOMPOSITION, LISTING, APPROXIMATE)
EXACT_LIMIT = 100_000  # answers up to which problems with open pairs get exact shares
NODE_BUDGET = 20 * EXACT_LIMIT  # search nodes the listing may spend before giving way
SAMPLES = 200  # answers drawn for approximate shares (each costs UniGen a hashed search)
RECOUNT = 300  # exact results with at most this many answers are recounted by SAT enumeration
# comparable pairs up to which the decomposition tree is checked: its check costs about 2.3 s at
# a million pairs (500 dense orders of 100 items: 2.3 s at 971,021 pairs) and passes its step
# budget, giving no verdict, well before 1.6 million
TREE_CHECK_PAIRS = 1_000_000
FLIP = {BEFORE: AFTER, AFTER: BEFORE, UNORDERED: UNORDERED}


# ---------------------------------------------------------------------- entry point
def settled(problem: Problem, method: str = "auto", time_limit: float | None = None,
            solver: str | None = None, seed: int = 0, samples: int = SAMPLES,
            epsilon: float | None = None, delta: float | None = None,
            exact_limit: int = EXACT_LIMIT) -> SettledResult:
    """Pair shares and settled pairs of ``problem`` (see the module docstring).  Preferences
    rank answers but rule none out, so they are ignored.  ``seed`` fixes the random draws."""
    t0 = time.perf_counter()
    deadline = runner.deadline_after(time_limit)
    hard, method = hard_part(problem, method, METHODS)
    res = None
    if hard.contradictions():  # two requirements clash on one pair: no answer, no search
        res = SettledResult(hard, INFEASIBLE, method, 0, True)
    if res is None and method == DECOMPOSITION:
        try:
            res = _by_decomposition(hard, solver, time_limit)
        except TooManyStates:
            method = LISTING
    if res is None and method == LISTING:
        budget = None if deadline is None else time.monotonic() + (deadline -
                                                                    time.monotonic()) / 2
        res = _by_listing(hard, exact_limit, budget)
        if res is None:
            method = APPROXIMATE
    if res is None:
        res = _by_approximation(hard, samples, epsilon, delta, seed, solver, deadline)
    res.problem = problem
    if res.answer is not None:
        res.answer.problem = problem
    if res.status == INFEASIBLE or (res.status == FEASIBLE and res.answers == 0):
        res = _infeasible(problem, res, solver, time_limit)
    elif res.status == FEASIBLE:
        try:
            _check(res, hard, solver, deadline)
        except TimeLimitReached:
            res.status, res.blocks = UNKNOWN, []
            res.notes.append("the time limit was reached before the settled pairs were checked")
    res.stats["seconds"] = round(time.perf_counter() - t0, 6)
    return res


def hard_part(problem: Problem, method: str, methods: tuple[str, ...]) -> tuple[Problem, str]:
    """The problem without its preferences (they rank answers but rule none out) and the method
    ``auto`` stands for: the decomposition without open pairs, the listing with them."""
    if method not in methods:
        raise ValueError(f"unknown method {method!r}; one of {', '.join(methods)}")
    hard = problem.with_requirements(prefer=[]) if problem.prefer else problem
    if method == "auto":
        method = LISTING if hard.has_open_pairs else DECOMPOSITION
    if method == DECOMPOSITION and hard.has_open_pairs:
        raise InputError(f"{problem.source}: has open pairs, which the decomposition method "
                         f"cannot describe; use --method {', '.join(methods[2:])} or auto")
    return hard, method


# ---------------------------------------------------------------------- the three methods
def _by_decomposition(problem: Problem, solver, time_limit) -> SettledResult:
    """Shares from the decomposition; first ``solve``'s verified answer (its core when there is
    none), which every settled pair must hold in."""
    from satorder.pipeline.solve import solve

    t = time.perf_counter()
    ans = solve(problem, solver=solver, time_limit=time_limit)
    res = SettledResult(problem, ans.status, DECOMPOSITION, None, ans.status == INFEASIBLE,
                        answer=ans)
    res.stats["solve_seconds"] = round(time.perf_counter() - t, 6)
    if ans.status != FEASIBLE:
        res.answers = 0 if ans.status == INFEASIBLE else None
        return res
    if not ans.verified:  # pragma: no cover - solve certifies every answer it returns
        raise CertificateError("solve returned an answer it could not certify")
    t = time.perf_counter()
    with collector_paused():
        con = constrain(problem, orient_primes=False, answer=ans.succ)
        res.answers, res.exact = con.count, True
        res.stats["nodes"] = con.kinds
        res.stats["decomposition_seconds"] = round(time.perf_counter() - t, 6)
        if con.count == 0:
            raise CertificateError("the decomposition finds no answer, but the solver found a "
                                   "certified one")
        res.blocks = list(shares(con, arc_free_nodes=False))
    res.rest_half = True
    res.stats["blocks"] = len(res.blocks)
    t = time.perf_counter()
    _agrees(res, ans.succ, "the certified answer of solve")
    res.checks.append("the certified answer of solve meets every settled pair")
    if con.tree is not None and problem.num_comparable <= TREE_CHECK_PAIRS:
        done = check_tree_count(problem.adj, con.tree, con.count,
                                bool(problem.fixed or problem.forbidden))
        if done is not None:
            res.checks.append(done)
    elif con.tree is not None:
        res.notes.append(f"the decomposition tree is checked up to {TREE_CHECK_PAIRS:,} "
                         f"comparable pairs, and this problem has {problem.num_comparable:,}")
    res.stats["check_seconds"] = round(time.perf_counter() - t, 6)
    return res


@contextmanager
def collector_paused():
    """Python's cyclic garbage collector off for the block: the decomposition and its share
    blocks allocate a set, list or node per item and part, none in a reference cycle, and at
    50,000 items the collector's repeated passes over them cost about a third of the time."""
    if not gc.isenabled():
        yield
        return
    gc.disable()
    try:
        yield
    finally:
        gc.enable()


def bounded_tally(problem: Problem, limit: int, deadline: float | None):
    """Every answer counted by the listing engine (:func:`satorder.graph.insertion.tally`), or
    None past ``limit`` answers, :data:`NODE_BUDGET` search nodes or the ``deadline``."""
    from satorder.graph.insertion import tally

    nodes = [0]

    def should_stop() -> bool:
        nodes[0] += 4096
        return nodes[0] > NODE_BUDGET or (deadline is not None and time.monotonic() > deadline)

    tl = tally(problem, limit=limit, should_stop=should_stop)
    return tl if tl.complete else None


def _by_listing(problem: Problem, limit: int, deadline: float | None) -> SettledResult | None:
    t = time.perf_counter()
    tl = bounded_tally(problem, limit, deadline)
    if tl is None:
        return None
    res = SettledResult(problem, FEASIBLE if tl.total else INFEASIBLE, LISTING, tl.total, True)
    res.stats["listing_nodes"] = tl.nodes
    res.stats["listing_seconds"] = round(time.perf_counter() - t, 6)
    if tl.total:
        total = tl.total
        for a, b in _orderable_pairs(problem):
            x, y = Fraction(tl.before[a][b], total), Fraction(tl.before[b][a], total)
            blk = ShareBlock([a], [b], x, y, 1 - x - y)
            res.blocks.append(blk if blk.before >= blk.after else blk.flipped())
    return res


def _by_approximation(problem, samples, epsilon, delta, seed, solver, deadline):
    from satorder.sat.answer_formula import AnswerFormula, too_large
    from satorder.sat.modelcount import DELTA, EPSILON, approximate_count
    from satorder.sat.sampling import almost_uniform_samples

    epsilon = EPSILON if epsilon is None else epsilon
    delta = DELTA if delta is None else delta
    t = time.perf_counter()
    res = SettledResult(problem, UNKNOWN, APPROXIMATE, None, False, epsilon=epsilon, delta=delta)
    size = too_large(problem)
    if size:
        res.notes.append(f"too many answers to list, and too large for approximate counting "
                         f"({size})")
        return res
    formula = AnswerFormula(problem)
    est = approximate_count(formula, epsilon, delta, seed=seed + 1, deadline=deadline)
    res.stats["count_seconds"] = est.seconds
    if est.estimate is None:
        res.notes.append("the time limit was reached while counting")
        return res
    res.answers = est.estimate  # the shares come from samples: never exact
    res.stats["count_exact"] = est.exact
    if est.estimate == 0:
        res.status = INFEASIBLE
        return res
    drawn = almost_uniform_samples(formula, samples, seed=seed + 1, deadline=deadline)
    if drawn is None:
        res.notes.append("the time limit was reached while sampling")
        return res
    res.status, res.samples = FEASIBLE, len(drawn)
    pairs = _orderable_pairs(problem)
    tallies = {pq: [0, 0] for pq in pairs}
    for succ in drawn:
        check_order(problem, succ)
        for (a, b), tl in tallies.items():
            if b in succ[a]:
                tl[0] += 1
            elif a in succ[b]:
                tl[1] += 1
    k = len(drawn)
    for a, b in pairs:
        x, y = Fraction(tallies[(a, b)][0], k), Fraction(tallies[(a, b)][1], k)
        blk = ShareBlock([a], [b], x, y, 1 - x - y)
        res.blocks.append(blk if blk.before >= blk.after else blk.flipped())
    res.checks.append(f"all {k} sampled answers certified")
    res.stats["sample_seconds"] = round(time.perf_counter() - t - est.seconds, 6)
    res.drawn = drawn  # the settled check starts from the relations they show
    return res


# ---------------------------------------------------------------------- checks
def _orderable_pairs(problem: Problem) -> list[tuple[int, int]]:
    n = problem.n
    return [(a, b) for a in range(n) for b in range(a + 1, n)
            if b in problem.adj[a] or not problem.must_be_unordered(a, b)]


def _support_of(blk: ShareBlock) -> set[str]:
    return {r for r, v in ((BEFORE, blk.before), (AFTER, blk.after),
                           (UNORDERED, blk.unordered)) if v > 0}


def _agrees(res: SettledResult, succ, what: str) -> None:
    """Every settled block must hold in ``succ``."""
    for blk in res.blocks:
        if not blk.settled:
            continue
        want = BEFORE if blk.before == 1 else AFTER if blk.after == 1 else UNORDERED
        for a in blk.left:
            for b in blk.right:
                if relation(succ, a, b) != want:
                    raise CertificateError(f"{what} puts {res.problem.items[a]}, "
                                           f"{res.problem.items[b]} otherwise than settled")


def _check(res: SettledResult, problem: Problem, solver, deadline) -> None:
    """The checks of the module docstring for problems with open pairs (listing, approximate)
    and the recount of small exact results; sets ``verified``."""
    if res.method in (LISTING, APPROXIMATE):
        t = time.perf_counter()
        single = [blk for blk in res.blocks if len(blk.left) == len(blk.right) == 1]
        key = {(min(b.left[0], b.right[0]), max(b.left[0], b.right[0])): b for b in single}
        drawn = res.drawn
        seen = {pq: {relation(s, *pq) for s in drawn} for pq in key}
        sup = pair_support(problem, list(key), seen=seen, solver=solver, deadline=deadline)
        for succ in sup.witnesses:
            check_order(problem, succ)
        for (a, b), blk in key.items():
            possible = sup.possible[(a, b)]
            if blk.left[0] != a:  # the block lists the pair the other way round
                possible = {FLIP[r] for r in possible}
            if not _support_of(blk) <= possible or \
                    (res.method == LISTING and possible != _support_of(blk)):
                raise CertificateError(f"pair {problem.items[a]}, {problem.items[b]}: the "
                                       f"{res.method} and the SAT engine disagree on the "
                                       "relations it takes")
            blk.exact_settled = len(possible) == 1
        res.checks.append(f"settled pairs decided by {sup.calls} SAT calls with assumptions; "
                          f"{len(sup.witnesses)} witness answers certified")
        res.stats["support_seconds"] = round(time.perf_counter() - t, 6)
        res.stats["support_calls"] = sup.calls
    if res.exact and res.answers is not None and 0 < res.answers <= RECOUNT:
        if res.method == DECOMPOSITION:
            _recount(res, problem, *_listing_counts(problem, res.answers), "the listing engine")
        else:
            _recount(res, problem, *_sat_counts(problem, res.answers, solver),
                     "a SAT enumeration of certified orders")
    res.verified = bool(res.checks)


def _listing_counts(problem: Problem, answers: int):
    """Answers and per-pair counts from the listing engine (item insertion), which shares no
    code with the decomposition; plain Python, so small problems load no SAT solver."""
    from satorder.graph.insertion import tally

    tl = tally(problem, limit=answers + 1)
    before = {(a, b): k for a, row in enumerate(tl.before) for b, k in enumerate(row) if k}
    return tl.total, tl.complete, before


def _sat_counts(problem: Problem, answers: int, solver):
    """Answers and per-pair counts from a SAT enumeration, every order certified."""
    from satorder.pipeline.orders import EnumerationEnd, certified_orders

    end = EnumerationEnd()
    before: dict[tuple[int, int], int] = {}
    for found in certified_orders(problem, limit=answers + 1, solver=solver, end=end):
        for a, s in enumerate(found.succ):
            for b in s:
                before[(a, b)] = before.get((a, b), 0) + 1
    return end.found, end.complete, before


def _recount(res: SettledResult, problem: Problem, found: int, complete: bool, before,
             engine: str) -> None:
    """Every share recounted from another engine's count of the answers (``before[(a, b)]``:
    answers putting ``a`` before ``b``)."""
    if not complete or found != res.answers:
        raise CertificateError(f"{res.answers} answers claimed, {engine} finds "
                               f"{found}{'' if complete else ' or more'}")
    for a, b, bx, by, _, _ in res.exact_pairs():
        x = Fraction(before.get((a, b), 0), found)
        y = Fraction(before.get((b, a), 0), found)
        if x != bx or y != by:
            raise CertificateError(f"pair {problem.items[a]}, {problem.items[b]}: "
                                   f"shares differ from {engine}")
    res.checks.append(f"every share recounted from {engine} ({found} answers)")


def _infeasible(problem: Problem, res: SettledResult, solver, time_limit) -> SettledResult:
    """No answer: the verified answer of solve, with its core or forcing chain."""
    from satorder.pipeline.solve import solve

    hard = problem.with_requirements(prefer=[]) if problem.prefer else problem
    ans = res.answer or solve(hard, solver=solver, time_limit=time_limit)
    if ans.status == FEASIBLE:
        raise CertificateError(f"the {res.method} finds no answer, but the solver found a "
                               "certified one")
    out = SettledResult(problem, ans.status, res.method, 0 if ans.status == INFEASIBLE else None,
                        ans.status == INFEASIBLE, answer=ans, stats=res.stats,
                        notes=res.notes)
    out.verified = ans.verified
    if ans.verified:
        out.checks.append("the solver's refutation is certified")
    return out
