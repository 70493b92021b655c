"""Cores of infeasible problems from the SAT engine: requirements that cannot hold together.

Three ways, cheapest first (:func:`satorder.sat.engine.solve_sat` tries them in this order):
an implication class holding an arc and its reverse names its Γ chain
(``Encoding.unsat_reason``); otherwise each clause of the refuted CNF is guarded by a literal
and the solver's core over those literals (assumption-based core extraction, Eén & Sörensson,
"An extensible SAT-solver", SAT 2003) is mapped to the requirements behind its clauses
(:func:`core_via_clauses`); only if that fails is the problem re-encoded with one selector per
requirement (:func:`find_core`).  A candidate is then shrunk on the small problem made of its
requirements alone, by clause-set refinement and deletion (Marques-Silva, Janota & Belov, CAV
2013) while time allows (``stats["minimal"]`` says whether it finished).

>>> from satorder.model.problem import Problem
>>> p = Problem.from_lists(fixed=[("a", "b"), ("b", "c")], incomparable=[("a", "c")],
...                        comparable=[("c", "d")])
>>> core, stats = find_core(p)
>>> len(core), stats["minimal"]
(3, True)
"""

from __future__ import annotations

import time

from satorder.model.problem import Problem
from satorder.model.requirement import Requirement
from satorder.sat import runner
from satorder.sat.encoding import Key
from satorder.sat.session import SatSession

SHRINK_SECONDS = 10.0  # default time spent shrinking a core when no time limit is given


def find_core(problem: Problem, solver: str | None = None, deadline: float | None = None,
              shrink_seconds: float = SHRINK_SECONDS):
    """A core (a list of :class:`Requirement`) of an infeasible problem, shrunk while time allows
    (clause-set refinement, then deletion), or ``None`` if the deadline passes first.

    Returns ``(core, stats)``; the core is minimal when ``stats["minimal"]`` is True.
    """
    with SatSession(problem, solver=solver, selectors=True) as s:
        res = s.solve(deadline=deadline)
        if res is not False:
            return None, dict(s.stats)
        core = s.core()
        shrink_end = runner.deadline_after(shrink_seconds, deadline)
        for _ in range(8):  # clause-set refinement: re-solve on the core alone
            if time.monotonic() >= shrink_end or s.solve(keep=core, deadline=shrink_end) \
                    is not False:
                break
            smaller = s.core()
            if len(smaller) >= len(core):
                break
            core = smaller
        minimal = True
        k = 0
        while k < len(core):  # deletion-based shrinking
            trial = core[:k] + core[k + 1:]
            res = s.solve(keep=trial, deadline=shrink_end)
            if res is None:
                minimal = False
                break
            if res is False:
                kept = set(s.core())
                core = [r for r in trial if r in kept]
            else:
                k += 1
        stats = dict(s.stats)
    stats["size"] = len(core)
    stats["minimal"] = minimal
    return core, stats


def core_via_clauses(session: SatSession, problem: Problem, deadline: float | None):
    """A core from a refuted collapsed encoding, without re-encoding the whole problem with
    selectors: guard each clause by its own literal and ask the solver which clauses it needed;
    the requirements behind those clauses
    (:meth:`~satorder.sat.encoding.Encoding.requirements_behind`) form a small infeasible
    sub-problem, whose core :func:`find_core` then shrinks.  ``(None, stats)`` when
    this does not work out (the caller falls back to the full selector encoding)."""
    from pysat.solvers import Solver

    enc = session.enc
    base = enc.nv
    t0 = time.perf_counter()
    with Solver(name=session.solver_name) as t:
        for k, cl in enumerate(enc.hard):
            t.add_clause(cl + [-(base + k + 1)])
        res = runner.solve(t, [base + k + 1 for k in range(len(enc.hard))], deadline)
        if res is not False:
            return None, {"clause_core": "not refuted"}
        ids = [lit - base - 1 for lit in t.get_core() or ()]
    keys = enc.requirements_behind(ids)
    stats = {"clause_core": len(ids), "candidate": None if keys is None else len(keys),
             "clause_core_seconds": round(time.perf_counter() - t0, 6)}
    if not keys:
        return None, stats
    core, sub_stats = shrink_candidate(problem, keys, session.solver_name, deadline)
    stats.update(sub_stats)
    return core, stats


def shrink_candidate(problem: Problem, keys: list[Key], solver: str, deadline: float | None):
    """A core inside the candidate requirement set ``keys`` (believed infeasible), found on the
    small problem made of ``keys`` alone; ``(None, stats)`` if that problem is feasible."""
    sub, ids_back = _sub_problem(problem, keys)
    core, stats = find_core(sub, solver=solver, deadline=deadline)
    stats["candidate"] = len(keys)
    if core is None:
        return None, stats
    return [Requirement(r.kind, (ids_back[r.pair[0]], ids_back[r.pair[1]])) for r in core], stats


def _sub_problem(problem: Problem, keys: list[Key]):
    """The problem made of ``keys`` alone (every other pair of its items open), and the map
    from its item ids back to ``problem``'s."""
    from satorder.model.problem import ProblemBuilder

    names = problem.items
    b = ProblemBuilder(f"{problem.source} (core candidate)")
    b.incomparable_list()
    for kind, (x, y) in keys:
        getattr(b, kind)(names[x], names[y], kind)
    sub = b.build()
    index = problem.index
    return sub, [index[name] for name in sub.items]
