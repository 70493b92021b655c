"""A python-sat solver fed by the compact encoding, with the lazy transitivity loop.

Method: a CDCL solver (CaDiCaL 1.9.5 by default; Biere et al., SAT Competition 2023 system
descriptions) decides the compact CNF of :mod:`satorder.sat.encoding`; each model is decoded into a
relation, and every transitivity clause the relation violates is added before solving again
(lazy clause generation, common practice for order encodings) until the model is a strict
partial order.  Each solver call runs through :mod:`satorder.sat.runner` (deadline, Ctrl-C).

Interface (stable)
------------------
``SatSession(problem, solver=None, selectors=False, lazy=True, phases=True)``

* ``solve(assumptions=(), keep=None, time_limit=None, deadline=None)`` → ``True`` (feasible:
  ``order()`` is the strict partial order, ``model`` the raw model), ``False`` (infeasible:
  ``core()``), ``None`` (time limit reached).  With selectors on, ``keep=None`` switches every
  requirement on; ``keep`` = a collection of requirements (:class:`Requirement`) switches on only
  those (all others are dropped, their pairs open), including selectors the loop creates later.
  ``assumptions`` are extra literals (e.g. for enumeration or MaxSAT-style search).
* ``core()`` → requirements of the last refutation; ``core_literals()`` → raw literals.
* ``add_clause(clause)`` → add a permanent clause (e.g. a blocking clause); ``enc`` is the
  :class:`~satorder.sat.encoding.Encoding`; ``stats`` counts variables, clauses, rounds, seconds.
* Close it with ``close()`` or use ``with SatSession(...) as s:``.

>>> from satorder.model.problem import Problem
>>> p = Problem.from_lists(fixed=[("a", "b"), ("b", "c")], incomparable=[("a", "c")])
>>> with SatSession(p, selectors=True) as s:          # a<b, b<c, a and c unordered: no order
...     s.solve(), len(s.core()), s.solve(keep=s.core()[1:])   # any two of them: an order
(False, 3, True)
"""

from __future__ import annotations

import time
from collections.abc import Collection, Iterable

from satorder.model.problem import Problem
from satorder.sat import runner
from satorder.sat.encoding import Encoding, Key


class SatSession:
    """A python-sat solver fed by an :class:`~satorder.sat.encoding.Encoding`, with the lazy
    transitivity loop; see the module docstring for the interface."""

    def __init__(self, problem: Problem, solver: str | None = None, selectors: bool = False,
                 lazy: bool = True, phases: bool = True, encoding: Encoding | None = None):
        from pysat.solvers import Solver

        t0 = time.perf_counter()
        self.problem = problem
        self.solver_name = runner.resolve_solver(solver)
        self.enc = encoding if encoding is not None else Encoding(problem, selectors=selectors,
                                                                  lazy=lazy)
        self.solver = Solver(name=self.solver_name)
        self._phases = phases
        self._phased = 0
        self.model: list[int] | None = None
        self._succ: list[set[int]] | None = None
        self._core: list[int] | None = None
        self.stats = {"solver": self.solver_name, "variables": 0, "clauses": 0, "rounds": 0,
                      "solver_calls": 0, "encode_seconds": 0.0, "solve_seconds": 0.0,
                      "sat_seconds": 0.0}
        self._sync()
        self.stats["encode_seconds"] = round(time.perf_counter() - t0, 6)

    # ------------------------------------------------------------------ plumbing
    def close(self) -> None:
        if self.solver is not None:
            self.solver.delete()
            self.solver = None

    def __enter__(self):
        return self

    def __exit__(self, *exc):
        self.close()

    def add_clause(self, clause: Iterable[int]) -> None:
        """Add a permanent clause (kept in the encoding too, so exports see it)."""
        self.enc.hard.append(list(clause))
        self._sync()

    def _sync(self) -> None:
        new = self.enc.take_new()
        if new:
            self.solver.append_formula(new)
        if self._phases:
            self._set_phases()
        self.stats["variables"] = self.enc.nv
        self.stats["clauses"] = len(self.enc.hard)

    def _set_phases(self) -> None:
        """Pass the encoding's new phase hints to the solver (a heuristic start that is
        acyclic; the solver changes it where it must)."""
        hints = self.enc.phase_hints[self._phased:]
        self._phased = len(self.enc.phase_hints)
        if not hints:
            return
        try:
            self.solver.set_phases(hints)
        except NotImplementedError:
            self._phases = False

    # ------------------------------------------------------------------ solving
    def _assumptions(self, keep, extra) -> list[int]:
        sel = self.enc.selector_of
        if keep is None:
            lits = list(sel.values())
        else:
            lits = [sel[k] for k in keep if k in sel]
        lits.extend(extra)
        return lits

    def solve(self, assumptions: Iterable[int] = (), keep: Collection[Key] | None = None,
              time_limit: float | None = None, deadline: float | None = None) -> bool | None:
        """Solve until the model is a strict partial order (True), the formula is refuted
        (False) or the time runs out (None).  ``deadline`` is a ``time.monotonic()`` value."""
        deadline = runner.deadline_after(time_limit, deadline)
        extra = list(assumptions)
        if keep is not None:
            keep = set(keep)
        active = None if keep is None else keep.__contains__
        self.model = self._succ = self._core = None
        t0 = time.perf_counter()
        try:
            while True:
                if deadline is not None and time.monotonic() >= deadline:
                    return None
                self._sync()
                assume = self._assumptions(keep, extra)
                self.stats["solver_calls"] += 1
                t1 = time.perf_counter()
                res = runner.solve(self.solver, assume, deadline)
                self.stats["sat_seconds"] = round(
                    self.stats["sat_seconds"] + time.perf_counter() - t1, 6)
                if res is None:
                    return None
                if res is False:
                    self._core = list(self.solver.get_core() or [])
                    return False
                model = self.solver.get_model()
                succ = self.enc.decode(model)
                bad = self.enc.violations(succ, limit=max(100_000, 20 * self.enc.n))
                if not bad:
                    self.model = model
                    self._succ = succ
                    return True
                self.stats["rounds"] += 1
                self.enc.refine(bad, active)
        finally:
            self._sync()
            self.stats["solve_seconds"] = round(
                self.stats["solve_seconds"] + time.perf_counter() - t0, 6)

    # ------------------------------------------------------------------ results
    def order(self) -> list[set[int]]:
        """The strict partial order of the last feasible solve (successor sets, closed)."""
        if self._succ is None:
            raise RuntimeError("no order: the last solve was not feasible")
        return self._succ

    def core_literals(self) -> list[int]:
        """Assumption literals of the last refutation (python-sat's core)."""
        return list(self._core or [])

    def core(self) -> list[Key]:
        """Requirements whose selectors took part in the last refutation."""
        req = self.enc.requirement_of
        return [req[lit] for lit in self._core or () if lit in req]
