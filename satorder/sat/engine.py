"""The SAT engine: python-sat back ends behind one small interface, the lazy transitivity loop,
time limits, clean Ctrl-C, and cores over selector literals.

Method: a CDCL solver (CaDiCaL 1.9.5 by default; Biere et al., SAT Competition 2023 system
descriptions) decides the compact CNF of :mod:`satorder.sat.encoding`; each model is decoded into a
relation, and every transitivity clause the relation violates is added before solving again
(lazy clause generation, common practice for order encodings) until the model is a strict
partial order.  Infeasible problems get a *core* of requirements, found in three ways, cheapest
first: an implication class holding an arc and its reverse names its Γ chain; otherwise each
clause of the refuted CNF is guarded by a literal and the solver's core over those literals
(assumption-based core extraction, Eén & Sörensson, "An extensible SAT-solver", SAT 2003) is
mapped to the requirements behind its clauses; only if that fails is the problem re-encoded
with one selector per requirement.  The candidate is then shrunk on the small problem made of
its requirements alone, by clause-set refinement and deletion (Marques-Silva, Janota & Belov,
CAV 2013) while time allows (``stats["core"]["minimal"]`` says whether it finished).

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

``solve_sat(problem, solver=None, time_limit=None) -> Answer`` — the engine behind
``satorder solve --engine sat``.  ``SOLVERS`` lists the back-end names; ``resolve_solver(name)``
validates one.

>>> from satorder.model.problem import Problem
>>> p = Problem.from_lists(comparable=[("a", "b")], incomparable=[("b", "c")],
...                        fixed=[("b", "a")])
>>> ans = solve_sat(p)
>>> ans.status, ans.named_pairs()
('feasible', [['b', 'a']])
"""

from __future__ import annotations

import threading
import time
from collections.abc import Collection, Iterable

from satorder.errors import InputError
from satorder.model.answer import Answer
from satorder.model.problem import Problem
from satorder.model.requirement import FEASIBLE, INFEASIBLE, UNKNOWN, Requirement
from satorder.sat.encoding import Encoding, Key

DEFAULT_SOLVER = "cadical195"
# the back ends python-sat ships that this engine supports; the first three are the ones
# tests and benchmarks use most
SOLVERS = ("cadical195", "glucose4", "minisat22", "cadical153", "cadical103", "glucose3",
           "glucose42", "gluecard3", "gluecard4", "lingeling", "maplechrono", "maplecm",
           "maplesat", "mergesat3", "minicard")
_ALIASES = {"cadical": "cadical195", "glucose": "glucose4", "minisat": "minisat22"}
SHRINK_SECONDS = 10.0  # default time spent shrinking a core when no time limit is given


def resolve_solver(name: str | None) -> str:
    """The canonical back-end name for ``name`` (None → the default); InputError if unknown."""
    if name is None:
        return DEFAULT_SOLVER
    key = name.strip().lower()
    key = _ALIASES.get(key, key)
    if key not in SOLVERS:
        raise InputError(f"unknown SAT solver {name!r}; choose one of {', '.join(SOLVERS)}")
    return key


def _is_keyboard(exc: BaseException) -> bool:
    return "keyboard" in str(exc).lower()


class SatSession:
    """A python-sat solver fed by an :class:`~satorder.sat.encoding.Encoding`, with the lazy
    transitivity loop; see the module docstring for the interface."""

    def __init__(self, problem: Problem, solver: str | None = None, selectors: bool = False,
                 lazy: bool = True, phases: bool = True, encoding: Encoding | None = None):
        from pysat.solvers import Solver

        t0 = time.perf_counter()
        self.problem = problem
        self.solver_name = resolve_solver(solver)
        self.enc = encoding if encoding is not None else Encoding(problem, selectors=selectors,
                                                                  lazy=lazy)
        self.solver = Solver(name=self.solver_name)
        try:
            self.solver.interrupt()
            self.solver.clear_interrupt()
            self._interruptible = True
        except NotImplementedError:
            self._interruptible = False
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
        if time_limit is not None:
            end = time.monotonic() + max(0.0, time_limit)
            deadline = end if deadline is None else min(deadline, end)
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
                res = self._run(assume, deadline)
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

    def _run(self, assume: list[int], deadline: float | None) -> bool | None:
        """One solver call with SIGINT turned into KeyboardInterrupt and the deadline kept."""
        s = self.solver
        if deadline is None:
            try:
                return s.solve(assumptions=assume)
            except Exception as exc:  # python-sat reports Ctrl-C as its own error type
                if _is_keyboard(exc):
                    raise KeyboardInterrupt from None
                raise
        if self._interruptible:
            return self._run_interruptible(assume, deadline)
        try:
            s.conf_budget(1000)
        except NotImplementedError:
            raise InputError(
                f"solver {self.solver_name} cannot stop at a time limit through python-sat; "
                f"drop --time-limit or choose another solver, e.g. {DEFAULT_SOLVER}"
            ) from None
        return self._run_budgeted(assume, deadline)

    def _run_interruptible(self, assume: list[int], deadline: float) -> bool | None:
        """Solve in a worker thread (these back ends release the GIL) while this thread waits
        for the deadline or Ctrl-C and interrupts the solver."""
        s = self.solver
        box: dict = {}

        def work():
            try:
                box["res"] = s.solve_limited(assumptions=assume, expect_interrupt=True)
            except BaseException as exc:  # handed to the waiting thread
                box["exc"] = exc

        worker = threading.Thread(target=work, daemon=True)
        try:
            worker.start()
            while worker.is_alive():
                left = deadline - time.monotonic()
                if left <= 0:
                    s.interrupt()
                    worker.join()
                    break
                worker.join(min(left, 0.05))
        except KeyboardInterrupt:
            s.interrupt()
            if worker.is_alive() or worker.ident is not None:
                worker.join()
            s.clear_interrupt()
            raise
        s.clear_interrupt()
        if "exc" in box:
            raise box["exc"]
        return box.get("res")

    def _run_budgeted(self, assume: list[int], deadline: float) -> bool | None:
        """Solve in conflict-budget slices, checking the clock between slices (for back ends
        such as CaDiCaL that python-sat cannot interrupt from another thread)."""
        s = self.solver
        budget = 1000
        while True:
            left = deadline - time.monotonic()
            if left <= 0:
                return None
            s.conf_budget(budget)
            t0 = time.monotonic()
            try:
                res = s.solve_limited(assumptions=assume)
            except Exception as exc:
                if _is_keyboard(exc):
                    raise KeyboardInterrupt from None
                raise
            if res is not None:
                return res
            took = time.monotonic() - t0
            if took < 0.05:
                budget *= 2
            elif took > 0.3 and budget > 100:
                budget //= 2

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


# ---------------------------------------------------------------------- the engine
def solve_sat(problem: Problem, solver: str | None = None,
              time_limit: float | None = None) -> Answer:
    """Solve any problem with the SAT engine; infeasible answers carry a core.

    The answer is not yet verified; :func:`satorder.pipeline.solve.solve` runs the independent
    checks.
    """
    t0 = time.perf_counter()
    deadline = None if time_limit is None else time.monotonic() + time_limit
    name = resolve_solver(solver)
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
        if s.enc.unsat_reason is not None:  # an implication class holds an arc and its reverse
            core, core_stats = _shrink_candidate(problem, s.enc.unsat_reason, name, deadline)
            core_stats["method"] = "implication class conflict"
        else:
            core, core_stats = _core_via_clauses(s, problem, name, deadline)
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
        shrink_end = time.monotonic() + shrink_seconds
        if deadline is not None:
            shrink_end = min(shrink_end, deadline)
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


def _core_via_clauses(session: SatSession, problem: Problem, solver: str,
                      deadline: float | None):
    """A core from a refuted collapsed encoding, without re-encoding the whole problem with
    selectors: guard each clause by its own literal and ask the solver which clauses it needed;
    the requirements behind those clauses (:meth:`Encoding.requirements_behind`) form a small
    infeasible sub-problem, whose core :func:`find_core` then shrinks.  ``(None, stats)`` when
    this does not work out (the caller falls back to the full selector encoding)."""
    from pysat.solvers import Solver

    enc = session.enc
    base = enc.nv
    t0 = time.perf_counter()
    with Solver(name=solver) as t:
        for k, cl in enumerate(enc.hard):
            t.add_clause(cl + [-(base + k + 1)])
        runner = SatSession.__new__(SatSession)  # reuse the limit/interrupt plumbing only
        runner.solver, runner.solver_name = t, solver
        runner._interruptible = session._interruptible
        res = runner._run([base + k + 1 for k in range(len(enc.hard))], deadline)
        if res is not False:
            return None, {"clause_core": "not refuted"}
        ids = [lit - base - 1 for lit in t.get_core() or ()]
    keys = enc.requirements_behind(ids)
    stats = {"clause_core": len(ids), "candidate": None if keys is None else len(keys),
             "clause_core_seconds": round(time.perf_counter() - t0, 6)}
    if not keys:
        return None, stats
    core, sub_stats = _shrink_candidate(problem, keys, solver, deadline)
    stats.update(sub_stats)
    return core, stats


def _shrink_candidate(problem: Problem, keys: list[Key], solver: str, deadline: float | None):
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
