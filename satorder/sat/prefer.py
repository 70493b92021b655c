"""Weighted preferences: an order meeting every hard requirement with the least total weight of
unmet preferences (MaxSAT).

Method.  Hard clauses are the compact encoding of :mod:`satorder.sat.encoding`; each preference
``a before b`` with weight ``w`` is a soft unit clause ``(a<b)`` of weight ``w``.  The weighted
MaxSAT problem is solved by RC2, the core-guided solver shipped with python-sat (Ignatiev,
Morgado & Marques-Silva, "RC2: an efficient MaxSAT solver", JSAT 11, 2019).  Transitivity is
lazy: an optimum of the formula so far may not be transitive; its violated triples are added as
hard clauses and RC2 runs again.  Every round's formula is a relaxation of the full one, so its
optimum is a lower bound, and the first optimum that is a strict partial order is optimal.

With a time limit, a greedy pass first finds a certified order and improves it (try to meet the
preferences one by one, heaviest first, keeping each one that can be met together with those
already kept), then RC2 gets the remaining time; when time runs out the best order found is
returned with ``optimal = False`` and the largest lower bound seen (RC2's cost so far: the sum of
the weights of the cores it has relaxed, a bound for the relaxation and so for the problem).

A preference on a pair that must stay unordered, or against a fixed arc, can never be met; it
simply adds its weight to every answer.

>>> from satorder.model.problem import Problem
>>> p = Problem.from_lists(comparable=[("a", "b"), ("b", "c")],
...                        prefer=[("a", "b", 2), ("b", "c", 3)])
>>> ans = solve_preferences(p)
>>> ans.cost, ans.optimal, [(p.items[a], p.items[b]) for a, b, _ in ans.unmet]
(2, True, [('a', 'b')])
"""

from __future__ import annotations

import time

from satorder.model.answer import Answer
from satorder.model.problem import Problem
from satorder.model.requirement import FEASIBLE, INFEASIBLE, UNKNOWN
from satorder.sat import runner
from satorder.sat.encoding import Encoding

MAXSAT_ORACLE = "glucose4"  # interruptible through python-sat, so time limits hold


def unmet_preferences(problem: Problem, succ: list[set[int]]) -> list[tuple[int, int, int]]:
    """The preferences ``(a, b, w)`` that ``succ`` does not meet."""
    return [(a, b, w) for a, b, w in problem.prefer if b not in succ[a]]


def solve_preferences(problem: Problem, solver: str | None = None,
                      time_limit: float | None = None) -> Answer:
    """Solve ``problem`` minimising the weight of unmet preferences; see the module docstring.

    The answer is not yet verified; :func:`satorder.pipeline.solve.solve` runs the independent
    checks
    (the order against every requirement, the cost against the preferences).
    """
    t0 = time.perf_counter()
    solver = runner.resolve_solver(solver, time_limit)
    deadline = runner.deadline_after(time_limit)
    stats: dict = {"maxsat_rounds": 0, "greedy_solves": 0}
    best: tuple[int, list[set[int]]] | None = None
    if deadline is not None:
        got = _greedy(problem, solver, t0, deadline, time_limit, stats)
        if isinstance(got, Answer):
            return got
        best = got
    enc = Encoding(problem)
    if enc.unsat_reason is not None:  # the hard requirements clash: no order at all
        return _infeasible(problem, solver, deadline, stats, t0)
    softs = []
    always = 0  # weight of preferences no answer can meet
    for a, b, w in problem.prefer:
        lit = enc.lt(a, b)
        if lit is None:
            always += w
        else:
            softs.append((lit, w))
    lower = always
    optimal = False
    with _Rc2Session(softs) as maxsat:
        while True:
            if deadline is not None and time.monotonic() >= deadline:
                break
            stats["maxsat_rounds"] += 1
            maxsat.add_hard(enc.take_new())
            model, relaxed_cost, finished = maxsat.compute(deadline)
            lower = max(lower, always + relaxed_cost)
            if not finished:
                break
            if model is None:  # the hard requirements alone admit no order
                return _infeasible(problem, solver, deadline, stats, t0)
            succ = enc.decode(model)
            bad = enc.violations(succ)
            if not bad:
                cost = sum(w for _, _, w in unmet_preferences(problem, succ))
                if best is None or cost <= best[0]:
                    best = (cost, succ)
                optimal = best[0] <= lower
                break
            enc.refine(bad)
    stats["hard_clauses"] = len(enc.hard)
    stats["seconds"] = round(time.perf_counter() - t0, 6)
    if best is None:
        stats["note"] = "no order found within the time limit"
        return Answer(problem, UNKNOWN, "maxsat", stats=stats, lower_bound=lower)
    cost, succ = best
    return Answer(problem, FEASIBLE, "maxsat", succ=succ, cost=cost, optimal=optimal,
                  lower_bound=cost if optimal else min(lower, cost),
                  unmet=unmet_preferences(problem, succ), stats=stats)


class _Rc2Session:
    """One RC2 solver kept across the lazy rounds: violated transitivity clauses are added as
    hard clauses between calls (RC2 supports adding clauses between ``compute`` calls)."""

    def __init__(self, softs):
        from pysat.examples.rc2 import RC2
        from pysat.formula import WCNF

        self.rc2 = RC2(WCNF(), solver=MAXSAT_ORACLE)
        self.softs = softs
        self._soft_added = False

    def __enter__(self):
        return self

    def __exit__(self, *exc):
        self.rc2.delete()

    def add_hard(self, clauses) -> None:
        for cl in clauses:
            self.rc2.add_clause(cl)
        if not self._soft_added:  # after the first hard clauses, so every variable exists
            for lit, w in self.softs:
                self.rc2.add_clause([lit], weight=w)
            self._soft_added = True

    def compute(self, deadline: float | None):
        """``(model or None, cost of the cores relaxed so far, finished)``; RC2 runs under the
        runner (:func:`satorder.sat.runner.maxsat`), which interrupts its oracle at the
        ``deadline`` or on Ctrl-C."""
        model, stopped = runner.maxsat(self.rc2, deadline)
        if stopped:
            return None, self.rc2.cost, False
        return model, self.rc2.cost, True


def _greedy(problem, solver, t0, deadline, time_limit, stats):
    """A certified first order, improved by keeping preferences heaviest first while they can
    be met together; returns ``(cost, succ)``, or a final Answer when no order exists or none
    is found in time.  Uses at most a third of the time limit."""
    from satorder.sat.session import SatSession

    stop = runner.deadline_after(time_limit / 3, deadline)
    with SatSession(problem, solver=solver) as s:
        res = s.solve(deadline=deadline)
        stats["greedy_solves"] += 1
        if res is False:
            return _infeasible(problem, solver, deadline, stats, t0)
        if res is None:
            stats["seconds"] = round(time.perf_counter() - t0, 6)
            return Answer(problem, UNKNOWN, "maxsat", stats=stats)
        succ = [set(x) for x in s.order()]
        best = (sum(w for _, _, w in unmet_preferences(problem, succ)), succ)
        kept: list[int] = []
        for a, b, _w in sorted(problem.prefer, key=lambda t: -t[2]):
            if time.monotonic() >= stop:
                break
            lit = s.enc.lt(a, b)
            if lit is None:
                continue
            res = s.solve(assumptions=kept + [lit], deadline=stop)
            stats["greedy_solves"] += 1
            if res is None:
                break
            if res:
                kept.append(lit)
                succ = [set(x) for x in s.order()]
                cost = sum(w for _, _, w in unmet_preferences(problem, succ))
                if cost < best[0]:
                    best = (cost, succ)
    stats["greedy_cost"] = best[0]
    return best


def _infeasible(problem, solver, deadline, stats, t0) -> Answer:
    """The hard requirements admit no order: the SAT engine's answer with its core."""
    from satorder.sat.engine import solve_sat

    left = None if deadline is None else max(0.0, deadline - time.monotonic())
    ans = solve_sat(problem, solver=solver, time_limit=left)
    ans.engine = "maxsat"
    ans.stats = {**stats, "sat": ans.stats, "seconds": round(time.perf_counter() - t0, 6)}
    if ans.status not in (INFEASIBLE, UNKNOWN):  # cannot happen: both engines saw the clauses
        raise RuntimeError(f"MaxSAT found no order but the SAT engine says {ans.status}")
    return ans

