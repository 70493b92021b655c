"""The solving entry point: choose an engine, run it, certify the answer.

``solve(problem)`` sends plain problems (comparable pairs only, every other pair unordered) to
the forcing algorithm (:mod:`satorder.graph.forcing`); the same problems with fixed or forbidden
arcs to the forcing algorithm followed by the modular decomposition
(:mod:`satorder.graph.constrained`); everything else (open pairs, preferences) to the SAT
engine.  Every answer passes through :mod:`satorder.certify` before it is returned, unless
``verify=False``.
"""

from __future__ import annotations

import time

from satorder import certify
from satorder.errors import CertificateError, InputError
from satorder.graph.forcing import transitive_orientation
from satorder.model.answer import Answer
from satorder.model.problem import Problem
from satorder.model.requirement import FEASIBLE, INFEASIBLE, UNKNOWN, Kind, Requirement

ENGINES = ("auto", "forcing", "sat", "both")


class EngineDisagreement(CertificateError):
    """Two engines gave different verdicts on the same problem (a bug; the CLI exits 1)."""


def forcing_answers(problem: Problem) -> bool:
    """Can the forcing engine answer ``problem``: no open pairs, no preferences (fixed and
    forbidden arcs are decided through the modular decomposition)?"""
    return problem.incomparable is None and not problem.prefer


def solve_forcing(problem: Problem) -> Answer:
    """Solve a problem without open pairs and preferences with the forcing algorithm (Golumbic
    1980, ch. 5); fixed and forbidden arcs are then decided at the nodes of the modular
    decomposition (:func:`satorder.graph.constrained.orient_with_arcs`)."""
    if not forcing_answers(problem):
        raise InputError(
            f"{problem.source}: the forcing engine answers problems without open pairs and "
            "without preferences (comparable pairs, fixed and forbidden arcs, all other pairs "
            "unordered); use --engine sat or auto"
        )
    t0 = time.perf_counter()
    clash = None if problem.is_plain else problem.contradictions()
    if clash:  # two requirements clash on one pair: they are a minimal core already
        return Answer(problem, INFEASIBLE, "decomposition", core=list(clash[0]),
                      stats={"clash": "one pair",
                             "seconds": round(time.perf_counter() - t0, 6)})
    res = transitive_orientation(problem.adj, colours=not problem.is_plain)
    stats = {"implication_classes": res.num_classes, "seconds": 0.0}
    if res.orientable and not problem.is_plain:
        from satorder.graph.constrained import orient_with_arcs

        out = orient_with_arcs(problem, res)
        stats["decomposition"] = out.stats
        if out.feasible:
            res.up = out.up
            ans = Answer(problem, FEASIBLE, "decomposition", succ=res.successor_sets(),
                         stats=stats)
        else:
            stats["clash"] = out.clash
            ans = Answer(problem, INFEASIBLE, "decomposition", core=out.core, stats=stats)
    elif res.orientable:
        ans = Answer(problem, FEASIBLE, "forcing", succ=res.successor_sets(), stats=stats)
    else:
        core = [Requirement(Kind.COMPARABLE, s.arc) for s in res.chain[:-1]]
        core += [Requirement(Kind.INCOMPARABLE, s.because) for s in res.chain[1:]]
        ans = Answer(problem, INFEASIBLE, "forcing", chain=res.chain,
                     core=list(dict.fromkeys(core)), stats=stats)
    stats["seconds"] = round(time.perf_counter() - t0, 6)
    return ans


def verify(answer: Answer) -> Answer:
    """Run the independent checks on an answer; raises CertificateError on failure."""
    t0 = time.perf_counter()
    checked = False
    if answer.status == FEASIBLE:
        certify.check_order(answer.problem, answer.succ)
        checked = True
        if answer.cost is not None:
            from satorder.certify.prefer import check_cost

            check_cost(answer.problem, answer.succ, answer.cost, answer.unmet)
    elif answer.status == INFEASIBLE and answer.chain is not None:
        certify.check_forcing_chain(answer.problem, answer.chain)
        checked = True
    elif answer.status == INFEASIBLE and answer.core is not None:
        certify.check_core_infeasible(answer.problem, answer.core)
        checked = True
    answer.verified = checked  # an answer without a certificate is never called verified
    answer.stats["verify_seconds"] = round(time.perf_counter() - t0, 6)
    return answer


def solve(
    problem: Problem,
    engine: str = "auto",
    solver: str | None = None,
    time_limit: float | None = None,
    verify_answer: bool = True,
) -> Answer:
    """Find a strict partial order meeting every requirement of ``problem``, or show none exists.

    ``engine``: ``"auto"`` (forcing for plain problems, SAT otherwise), ``"forcing"``, ``"sat"``
    or ``"both"`` (run both, raise :class:`EngineDisagreement` if their verdicts differ).

    >>> from satorder import Problem, solve
    >>> ans = solve(Problem.from_lists(comparable=[("kiln", "loom"), ("loom", "quay")]))
    >>> ans.status, ans.verified, len(ans.pairs())
    ('feasible', True, 2)
    """
    if engine not in ENGINES:
        raise ValueError(f"unknown engine {engine!r}; choose one of {', '.join(ENGINES)}")
    if engine == "auto":
        engine = "forcing" if forcing_answers(problem) else "sat"
    if problem.prefer and engine == "sat":  # weighted preferences: MaxSAT (satorder.sat.prefer)
        from satorder.sat.prefer import solve_preferences

        ans = solve_preferences(problem, solver=solver, time_limit=time_limit)
        return verify(ans) if verify_answer else ans
    if engine == "both":  # _both verifies both engines' answers itself
        return _both(problem, solver, time_limit, verify_answer)
    if engine == "forcing":
        ans = solve_forcing(problem)
    else:
        from satorder.sat.engine import solve_sat

        ans = solve_sat(problem, solver=solver, time_limit=time_limit)
    if verify_answer:
        verify(ans)
    return ans


def _both(problem: Problem, solver, time_limit, verify_answer: bool) -> Answer:
    """Run the forcing engine (with the modular decomposition for fixed and forbidden arcs) and
    the SAT engine, and insist that their verdicts agree (when SAT answers in time)."""
    from satorder.sat.engine import solve_sat

    if not forcing_answers(problem):
        raise InputError(
            f"{problem.source}: --engine both needs a problem whose unnamed pairs stay unordered "
            "and without preferences (the forcing algorithm cannot answer open pairs)"
        )
    a = solve_forcing(problem)
    b = solve_sat(problem, solver=solver, time_limit=time_limit)
    if verify_answer:
        verify(a)
        verify(b)
    if b.status != UNKNOWN and b.status != a.status:
        raise EngineDisagreement(
            f"{a.engine} says {a.status}, SAT says {b.status} on {problem.source}"
        )
    a.stats["sat"] = {"status": b.status, **b.stats}
    return a
