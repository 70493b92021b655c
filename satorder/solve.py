"""The solving entry point: choose an engine, run it, certify the answer.

``solve(problem)`` sends plain problems (comparable pairs only, every other pair unordered) to
the forcing algorithm (:mod:`satorder.forcing`) and everything else to the SAT engine.  Every
answer passes through :mod:`satorder.certify` before it is returned, unless ``verify=False``.
"""

from __future__ import annotations

import time

from . import certify
from .answer import FEASIBLE, INFEASIBLE, Answer
from .forcing import transitive_orientation
from .problem import Problem

ENGINES = ("auto", "forcing", "sat", "both")


class EngineDisagreement(RuntimeError):
    """Two engines gave different verdicts on the same problem (a bug)."""


def solve_forcing(problem: Problem) -> Answer:
    """Solve a plain problem with the forcing algorithm (Golumbic 1980, ch. 5)."""
    if not problem.is_plain:
        raise ValueError(
            "the forcing engine answers plain problems only (comparable pairs, all other pairs "
            "unordered); use the SAT engine for side constraints or open pairs"
        )
    t0 = time.perf_counter()
    res = transitive_orientation(problem.adj)
    stats = {"implication_classes": res.num_classes, "seconds": 0.0}
    if res.orientable:
        ans = Answer(problem, FEASIBLE, "forcing", succ=res.successor_sets(), stats=stats)
    else:
        core = [{"kind": "comparable", "pair": tuple(sorted(s.arc))} for s in res.chain[:-1]]
        core += [
            {"kind": "incomparable", "pair": tuple(sorted(s.because))}
            for s in res.chain[1:]
        ]
        ans = Answer(problem, INFEASIBLE, "forcing", chain=res.chain, core=_dedup(core),
                     stats=stats)
    stats["seconds"] = round(time.perf_counter() - t0, 6)
    return ans


def _dedup(core: list[dict]) -> list[dict]:
    seen = set()
    out = []
    for r in core:
        key = (r["kind"], r["pair"])
        if key not in seen:
            seen.add(key)
            out.append(r)
    return out


def verify(answer: Answer) -> Answer:
    """Run the independent checks on an answer; raises CertificateError on failure."""
    t0 = time.perf_counter()
    if answer.status == FEASIBLE:
        certify.check_order(answer.problem, answer.succ)
        if answer.cost is not None:
            from .certify_prefer import check_cost

            check_cost(answer.problem, answer.succ, answer.cost, answer.unmet)
    elif answer.status == INFEASIBLE and answer.chain is not None:
        certify.check_forcing_chain(answer.problem, answer.chain)
    elif answer.status == INFEASIBLE and answer.core is not None:
        certify.check_core_infeasible(answer.problem, answer.core)
    answer.verified = answer.status in (FEASIBLE, INFEASIBLE)
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
        engine = "forcing" if problem.is_plain else "sat"
    if problem.prefer and engine == "sat":  # weighted preferences: MaxSAT (satorder.prefer)
        from .prefer import solve_preferences

        ans = solve_preferences(problem, solver=solver, time_limit=time_limit)
        return verify(ans) if verify_answer else ans
    if engine == "forcing":
        ans = solve_forcing(problem)
    elif engine == "sat":
        from .sat import solve_sat

        ans = solve_sat(problem, solver=solver, time_limit=time_limit)
    else:
        from .sat import solve_sat

        a = solve_forcing(problem)
        b = solve_sat(problem, solver=solver, time_limit=time_limit)
        if b.status != "unknown" and a.status != b.status:
            raise EngineDisagreement(
                f"forcing says {a.status}, SAT says {b.status} on {problem.source}"
            )
        if verify_answer:
            verify(b)
        a.stats["sat"] = {"status": b.status, **b.stats}
        ans = a
    if verify_answer:
        verify(ans)
    return ans
