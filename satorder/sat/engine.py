"""The SAT engine behind ``satorder solve --engine sat``: a session on the compact encoding
(:mod:`satorder.sat.session`), and for infeasible problems a core of requirements
(:mod:`satorder.sat.cores`).  Every solver call runs through :mod:`satorder.sat.runner`, which
keeps the time limit and Ctrl-C and knows the back ends (``SOLVERS``, ``resolve_solver``).

``solve_sat(problem, solver=None, time_limit=None) -> Answer``

>>> from satorder.model.problem import Problem
>>> p = Problem.from_lists(comparable=[("a", "b")], incomparable=[("b", "c")],
...                        fixed=[("b", "a")])
>>> ans = solve_sat(p)
>>> ans.status, ans.named_pairs()
('feasible', [['b', 'a']])
"""

from __future__ import annotations

import time

from satorder.model.answer import Answer
from satorder.model.problem import Problem
from satorder.model.requirement import FEASIBLE, INFEASIBLE, UNKNOWN
from satorder.sat import runner
from satorder.sat.cores import core_via_clauses, find_core, shrink_candidate
from satorder.sat.session import SatSession


def solve_sat(problem: Problem, solver: str | None = None,
              time_limit: float | None = None) -> Answer:
    """Solve any problem with the SAT engine; infeasible answers carry a core.

    The answer is not yet verified; :func:`satorder.pipeline.solve.solve` runs the independent
    checks.
    """
    t0 = time.perf_counter()
    name = runner.resolve_solver(solver, time_limit)
    deadline = runner.deadline_after(time_limit)
    with SatSession(problem, solver=name) as s:
        res = s.solve(deadline=deadline)
        stats = dict(s.stats)
        stats["implication_classes"] = s.enc.num_classes
        succ = s.order() if res else None
    if res is True:
        ans = Answer(problem, FEASIBLE, "sat", succ=succ, stats=stats)
    elif res is None:
        ans = Answer(problem, UNKNOWN, "sat", stats=stats)
    else:
        if s.enc.unsat_reason is not None:  # a clash on one pair, or an implication class
            core, core_stats = shrink_candidate(problem, s.enc.unsat_reason, name, deadline)
            core_stats["method"] = ("requirements clashing on one pair"
                                    if len(s.enc.unsat_reason) == 2 and
                                    len({frozenset(r.pair) for r in s.enc.unsat_reason}) == 1
                                    else "implication class conflict")
        else:  # the session's solver is closed; its encoding is what counts
            core, core_stats = core_via_clauses(s, problem, deadline)
            core_stats["method"] = "clause provenance"
        if core is None:
            core, core_stats = find_core(problem, solver=name, deadline=deadline)
            core_stats["method"] = "selector encoding"
        stats["core"] = core_stats
        if core is None:  # refuted, but no core within the time limit: say so honestly
            stats["note"] = "refuted without a core within the time limit"
            ans = Answer(problem, UNKNOWN, "sat", stats=stats)
        else:
            ans = Answer(problem, INFEASIBLE, "sat", core=core, stats=stats)
    stats["seconds"] = round(time.perf_counter() - t0, 6)
    return ans
