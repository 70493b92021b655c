"""Approximate model counting of the answers, with stated (ε, δ) guarantees.

Method: ApproxMC (Chakraborty, Meel & Vardi, "Algorithmic improvements in approximate
counting for probabilistic inference: from linear to logarithmic SAT calls", IJCAI 2016; the
version shipped by pyapproxmc 4 is the one of Soos, Gocht & Meel, "Tinted, detached, and lazy
CNF-XOR solving and its applications to counting and sampling", CAV 2020) on the formula whose
models projected on the order literals are exactly the answers
(:class:`satorder.sat.answer_formula.AnswerFormula`).  Random XOR constraints over the
projection cut the answers into cells; counting one small cell exactly and scaling by the
number of cells gives an estimate ``c`` with the PAC guarantee

    Pr[ |answers| / (1 + ε)  ≤  c  ≤  (1 + ε) · |answers| ]  ≥  1 − δ.

When the answers are few (a single cell) the count is exact.  The defaults ε = 0.8, δ = 0.2
are ApproxMC's own.  ApproxMC cannot be interrupted, so it runs in a forked child process
(:mod:`satorder.sat.forked`) that a deadline or Ctrl-C ends.

>>> from satorder.model.problem import Problem
>>> from satorder.sat.answer_formula import AnswerFormula
>>> p = Problem.from_lists(items=["a", "b", "c"], incomparable=[])   # 19 labelled posets
>>> approximate_count(AnswerFormula(p), seed=1).estimate               # one cell: exact
19
"""

from __future__ import annotations

import time
from dataclasses import dataclass

from satorder.sat.answer_formula import AnswerFormula
from satorder.sat.forked import run_forked

EPSILON = 0.8  # tolerance: the estimate is within a factor 1 + ε of the true count ...
DELTA = 0.2  # ... with probability at least 1 − δ


@dataclass
class ApproxCount:
    """An estimate of the number of answers: ``cells × 2^hashes``, within a factor
    ``1 + epsilon`` of the truth with probability at least ``1 - delta``; ``exact`` when no
    hashing was needed.  ``estimate`` is ``None`` when the deadline came first."""

    estimate: int | None
    epsilon: float
    delta: float
    seed: int
    cells: int = 0
    hashes: int = 0
    free: int = 0  # order variables in no clause: each doubles the count exactly
    seconds: float = 0.0

    @property
    def exact(self) -> bool:
        return self.estimate is not None and self.hashes == 0


def approximate_count(formula: AnswerFormula, epsilon: float = EPSILON, delta: float = DELTA,
                      seed: int = 1, deadline: float | None = None) -> ApproxCount:
    """Estimate the number of answers of ``formula`` (see the module docstring)."""
    if not 0 < epsilon or not 0 < delta < 1:
        raise ValueError(f"need epsilon > 0 and 0 < delta < 1, got {epsilon}, {delta}")
    t0 = time.perf_counter()
    out = ApproxCount(None, epsilon, delta, seed)
    if formula.unsat:
        out.estimate = 0
        return out
    out.free = len(formula.free)
    if not formula.projection:  # every variable free: 2^free answers
        out.estimate, out.cells = 2 ** out.free, 1
        return out

    def call():
        import pyapproxmc

        counter = pyapproxmc.Counter(seed=seed, epsilon=epsilon, delta=delta)
        for clause in formula.clauses:
            counter.add_clause(clause)
        return counter.count(formula.projection)

    result, stopped = run_forked(call, deadline)
    out.seconds = round(time.perf_counter() - t0, 6)
    if stopped:
        return out
    cells, hashes = result
    out.cells, out.hashes = int(cells), int(hashes)
    out.estimate = out.cells * 2 ** (out.hashes + out.free)
    return out
