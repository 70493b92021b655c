"""Answers drawn at random from all the answers of a problem, each one certified.

Three ways, and the result says which one was used (``method``) and how uniform it is:

* ``"modular-decomposition"`` — problems without open pairs, any size: each node of the
  decomposition draws its own choice uniformly (:mod:`satorder.graph.decomposition_sample`),
  so the answer is drawn exactly uniformly.
* ``"listing"`` — problems with open pairs and at most ``exact_limit`` answers: the answers
  are counted by inserting items one at a time (:mod:`satorder.graph.insertion`), ``k``
  indices are drawn uniformly and the answers at those indices listed: exactly uniform.
* ``"unigen"`` — more answers: UniGen's almost-uniform samples
  (:mod:`satorder.sat.sampling`, with its uniformity parameter κ stated).

Draws are independent (with replacement), and the same ``seed`` gives the same sample.  Every
drawn order passes :func:`satorder.certify.order.check_order` before it is returned.

>>> from satorder.model.problem import Problem
>>> p = Problem.from_lists(comparable=[("a", "b"), ("b", "c"), ("a", "c")])   # K3: 6 answers
>>> s = sample_answers(p, 4, seed=7)
>>> s.method, s.uniform, len(s.orders), s.orders == sample_answers(p, 4, seed=7).orders
('modular-decomposition', 'exact', 4, True)
"""

from __future__ import annotations

import random
import time
from dataclasses import dataclass, field
from typing import Any

from satorder.certify.order import check_order
from satorder.model.problem import Problem
from satorder.model.requirement import FEASIBLE, INFEASIBLE, UNKNOWN, Status
from satorder.pipeline.settled import EXACT_LIMIT, bounded_tally, hard_part
from satorder.sat import runner

DECOMPOSITION, LISTING, UNIGEN = "modular-decomposition", "listing", "unigen"
METHODS = ("auto", DECOMPOSITION, LISTING, UNIGEN)


@dataclass
class SampleResult:
    """``orders``: the drawn answers (successor sets, each certified); ``answers``: how many
    answers there are (``None`` when unknown); ``uniform``: ``"exact"`` or ``"almost"``."""

    problem: Problem
    status: Status
    method: str
    seed: int
    orders: list[list[set[int]]] = field(default_factory=list)
    answers: int | None = None
    uniform: str = "exact"
    kappa: float | None = None
    answer: Any = None  # infeasible problems: the verified answer of solve, with its core
    verified: bool = False
    notes: list[str] = field(default_factory=list)
    stats: dict[str, Any] = field(default_factory=dict)

    def __post_init__(self) -> None:
        self.status = Status(self.status)

    def end_json(self) -> dict[str, Any]:
        """The last line of ``satorder sample``: how the answers were drawn."""
        doc: dict[str, Any] = {"end": True, "status": self.status, "found": len(self.orders),
                               "method": self.method, "uniform": self.uniform,
                               "seed": self.seed, "answers": self.answers}
        if self.kappa is not None:
            doc["kappa"] = self.kappa
        if self.answer is not None and self.status == INFEASIBLE:
            doc.update(self.answer.refutation_json())
        if self.notes:
            doc["notes"] = self.notes
        doc["verified"] = self.verified
        doc["stats"] = self.stats
        return doc


def sample_answers(problem: Problem, k: int, seed: int = 0, method: str = "auto",
                   time_limit: float | None = None, exact_limit: int = EXACT_LIMIT,
                   solver: str | None = None) -> SampleResult:
    """Draw ``k`` answers of ``problem`` at random (see the module docstring).  Preferences
    rank answers but rule none out, so they are ignored.  A problem without answers gives
    status ``infeasible`` and no orders; ``unknown`` when the time limit came first."""
    if k < 0:
        raise ValueError(f"cannot draw {k} answers")
    t0 = time.perf_counter()
    deadline = runner.deadline_after(time_limit)
    hard, method = hard_part(problem, method, METHODS)
    rng = random.Random(seed)
    res = None
    if hard.contradictions():  # two requirements clash on one pair: no answer, no search
        res = SampleResult(hard, INFEASIBLE, method, seed, answers=0)
    if res is None and method == DECOMPOSITION:
        res = _by_decomposition(hard, k, rng, seed)
    if res is None and method in (DECOMPOSITION, LISTING):
        res = _by_listing(hard, k, rng, seed, exact_limit, deadline)
    if res is None:
        res = _by_unigen(hard, k, seed, deadline, solver)
    res.problem = problem
    for succ in res.orders:
        check_order(hard, succ)
    res.verified = res.status == FEASIBLE
    if res.status == INFEASIBLE:
        _refute(res, hard, solver, time_limit)
    res.stats["seconds"] = round(time.perf_counter() - t0, 6)
    return res


def _by_decomposition(problem, k, rng, seed) -> SampleResult | None:
    from satorder.graph.decomposition_sample import sample_order
    from satorder.graph.node_choices import TooManyStates, constrain

    try:
        con = constrain(problem)
    except TooManyStates:
        return None
    if con.count == 0:
        return SampleResult(problem, INFEASIBLE, DECOMPOSITION, seed, answers=0)
    orders = [sample_order(con, rng) for _ in range(k)]
    return SampleResult(problem, FEASIBLE, DECOMPOSITION, seed, orders, con.count)


def _by_listing(problem, k, rng, seed, limit, deadline) -> SampleResult | None:
    from satorder.graph.insertion import answers

    tl = bounded_tally(problem, limit, deadline)
    if tl is None:
        return None
    if tl.total == 0:
        return SampleResult(problem, INFEASIBLE, LISTING, seed, answers=0)
    picks = [rng.randrange(tl.total) for _ in range(k)]
    found = dict(answers(problem, set(picks)))
    return SampleResult(problem, FEASIBLE, LISTING, seed, [found[i] for i in picks], tl.total)


def _by_unigen(problem, k, seed, deadline, solver) -> SampleResult:
    from satorder.sat.answer_formula import AnswerFormula, too_large
    from satorder.sat.sampling import KAPPA, almost_uniform_samples

    res = SampleResult(problem, UNKNOWN, UNIGEN, seed, uniform="almost", kappa=KAPPA)
    size = too_large(problem)
    if size:
        res.notes.append(f"too many answers to list, and too large for UniGen ({size})")
        return res
    formula = AnswerFormula(problem)
    feasible = False if formula.unsat else _feasible(problem, deadline, solver)
    if feasible is None:
        res.notes.append("the time limit came before the check that an answer exists")
        return res
    if not feasible:
        res.status, res.answers = INFEASIBLE, 0
        return res
    drawn = almost_uniform_samples(formula, k, seed=seed + 1, deadline=deadline)
    if drawn is None:
        res.notes.append("the time limit came before the samples were drawn")
    else:
        res.status, res.orders = FEASIBLE, drawn
    return res


def _refute(res: SampleResult, problem: Problem, solver, time_limit) -> None:
    """No answer to draw: the verified answer of solve, whose core (or forcing chain) says
    why, must agree."""
    from satorder.errors import CertificateError
    from satorder.pipeline.solve import solve

    ans = solve(problem, solver=solver, time_limit=time_limit)
    if ans.status == FEASIBLE:
        raise CertificateError(f"the {res.method} finds no answer, but the solver found a "
                               "certified one")
    res.status, res.answer, res.verified = ans.status, ans, ans.verified


def _feasible(problem, deadline, solver) -> bool | None:
    """Whether the problem has an answer (the SAT engine, before asking the sampler); None
    when the deadline came first."""
    from satorder.sat.session import SatSession

    with SatSession(problem, solver=solver) as s:
        return s.solve(deadline=deadline) is not False
