"""Minimal cores, smallest cores and minimal correction sets over a set of requirements.

A *requirement* is a :class:`~satorder.model.requirement.Requirement` ``(kind, pair)`` over item
ids, of kind ``comparable``, ``incomparable``, ``fixed`` or ``forbidden``.  A set of
requirements is *feasible* when
some strict partial order meets every member, all pairs it does not name being open.

* A **core** (minimal unsatisfiable subset, MUS) is an infeasible set from which dropping any one
  member makes it feasible.  :func:`minimal_core` uses deletion-based extraction with clause-set
  refinement (Marques-Silva, Janota & Belov, "Minimal sets over monotone predicates in Boolean
  formulae", CAV 2013; Belov & Marques-Silva, "Accelerating MUS extraction with recursive model
  rotation", FMCAD 2011): drop a member; if the rest stays infeasible keep only the solver's
  core of the rest, otherwise mark the member necessary.
* A **smallest core** has the fewest members.  :func:`smallest_core` uses hitting-set duality
  (Reiter 1987; Ignatiev, Previti, Liffiton & Marques-Silva, "Smallest MUS extraction with
  minimal hitting set dualization", CP 2015): every core hits every minimal correction set, so a
  minimum hitting set of the correction sets found so far is either infeasible (then it is a
  smallest core) or grows into a maximal satisfiable subset whose complement is a new
  correction set.
* A **minimal correction set** (MCS) is a set whose removal makes the rest feasible while
  removing any proper subset does not.  :func:`correction_sets` enumerates them smallest first by
  MaxSAT over selector variables (RC2, Ignatiev, Morgado & Marques-Silva, JSAT 2019), blocking
  each one found (Liffiton & Sakallah, "Algorithms for computing minimal unsatisfiable subsets
  of constraints", JAR 2008).

The feasibility oracle here, :class:`RequirementOracle`, encodes "a strict partial order on the
items named" with one variable per ordered pair and transitivity over every triple, each
requirement guarded by its own selector literal, so it is meant for the small item sets of a
core; larger universes plug in any object with the same ``check`` method.

>>> from satorder.model.requirement import Requirement as R
>>> reqs = [R("fixed", (0, 1)), R("fixed", (1, 2)), R("incomparable", (0, 2)),
...         R("comparable", (2, 3))]
>>> oracle = RequirementOracle(reqs)
>>> minimal_core(oracle, range(4))
[0, 1, 2]
"""

from __future__ import annotations

import time
from collections.abc import Iterable
from itertools import permutations

from pysat.examples.rc2 import RC2
from pysat.formula import WCNF
from pysat.solvers import Solver

from satorder.errors import TimeLimitReached
from satorder.model.requirement import Kind, Requirement, items_of
from satorder.sat import runner

SOLVER = "glucose42"  # the independent checks in certify.py use a different solver (MiniSat)


class RequirementOracle:
    """Incremental feasibility of subsets of ``requirements`` (indices into the list).

    ``check(active)`` returns ``(True, arcs)`` with the arcs ``(a, b)`` of an order meeting the
    active requirements, or ``(False, core)`` with a subset of ``active`` that is infeasible;
    it raises :class:`~satorder.errors.TimeLimitReached` once the ``deadline`` (a
    ``time.monotonic()`` value, or None) has passed.
    """

    def __init__(self, requirements: list[Requirement], deadline: float | None = None):
        self.requirements = list(requirements)
        items = items_of(self.requirements)
        self.items = items
        var: dict[tuple[int, int], int] = {}
        for a, b in permutations(items, 2):
            var[a, b] = len(var) + 1
        self.var = var
        top = len(var)
        self.selector = list(range(top + 1, top + 1 + len(self.requirements)))
        self._by_selector = {s: k for k, s in enumerate(self.selector)}
        clauses = [[-var[a, b], -var[b, a]] for a, b in permutations(items, 2) if a < b]
        clauses += [[-var[a, b], -var[b, c], var[a, c]] for a, b, c in permutations(items, 3)]
        for s, (kind, (a, b)) in zip(self.selector, self.requirements):
            if kind == Kind.COMPARABLE:
                clauses.append([-s, var[a, b], var[b, a]])
            elif kind == Kind.INCOMPARABLE:
                clauses += [[-s, -var[a, b]], [-s, -var[b, a]]]
            elif kind == Kind.FIXED:
                clauses.append([-s, var[a, b]])
            else:  # Kind.FORBIDDEN
                clauses.append([-s, -var[a, b]])
        self.clauses = clauses
        self.solver = Solver(name=SOLVER, bootstrap_with=clauses)
        self.deadline = deadline
        self.calls = 0

    def check(self, active: Iterable[int]):
        self.calls += 1
        active = list(active)
        on = set(active)
        assumptions = [
            s if k in on else -s for k, s in enumerate(self.selector)
        ]
        res = runner.solve(self.solver, assumptions, self.deadline)
        if res is None:
            raise TimeLimitReached("the core search reached its time limit")
        if res:
            model = self.solver.get_model()
            arcs = [ab for ab, v in self.var.items() if model[v - 1] > 0]
            return True, arcs
        core = self.solver.get_core() or []
        found = sorted({self._by_selector[s] for s in core if s in self._by_selector})
        return False, [k for k in found if k in on]

    def satisfied(self, arcs) -> list[int]:
        """Indices of the requirements met by the order with these arcs (transitively closed)."""
        present = set(arcs)
        out = []
        for k, (kind, (a, b)) in enumerate(self.requirements):
            ab, ba = (a, b) in present, (b, a) in present
            if (
                (kind == Kind.COMPARABLE and (ab or ba))
                or (kind == Kind.INCOMPARABLE and not (ab or ba))
                or (kind == Kind.FIXED and ab)
                or (kind == Kind.FORBIDDEN and not ab)
            ):
                out.append(k)
        return out

    def close(self) -> None:
        self.solver.delete()

    def __enter__(self):
        return self

    def __exit__(self, *exc):
        self.close()


class SessionOracle:
    """The same ``check`` interface over the SAT engine's compact encoding with lazy
    transitivity (:class:`satorder.sat.session.SatSession` with selectors), for requirement sets
    whose
    items are too many for the all-triples :class:`RequirementOracle`.  The requirements are
    posed as a problem of their own: only their pairs are comparable or unordered, all other
    pairs open."""

    def __init__(self, requirements: list[Requirement], deadline: float | None = None):
        from satorder.model.problem import Problem
        from satorder.sat.session import SatSession

        self.requirements = list(requirements)
        self.items = items_of(self.requirements)
        pos = {v: k for k, v in enumerate(self.items)}
        n = len(self.items)
        adj: list[set[int]] = [set() for _ in range(n)]
        inc: list[set[int]] = [set() for _ in range(n)]
        fixed, forbidden = [], []
        self.keys = []
        for kind, (a, b) in self.requirements:
            a, b = pos[a], pos[b]
            if kind in (Kind.COMPARABLE, Kind.INCOMPARABLE):
                (adj if kind == Kind.COMPARABLE else inc)[a].add(b)
                (adj if kind == Kind.COMPARABLE else inc)[b].add(a)
            else:
                (fixed if kind == Kind.FIXED else forbidden).append((a, b))
                if kind == Kind.FIXED:
                    adj[a].add(b)
                    adj[b].add(a)
            self.keys.append(Requirement(kind, (a, b)))
        sub = Problem(items=[str(v) for v in self.items], adj=adj, incomparable=inc,
                      fixed=fixed, forbidden=forbidden)
        self.session = SatSession(sub, selectors=True)
        self._index = {key: k for k, key in enumerate(self.keys)}
        self.deadline = deadline
        self.calls = 0

    def check(self, active: Iterable[int]):
        self.calls += 1
        active = list(active)
        res = self.session.solve(keep=[self.keys[k] for k in active], deadline=self.deadline)
        if res is None:
            raise TimeLimitReached("the core search reached its time limit")
        if res:
            succ = self.session.order()
            return True, [(self.items[a], self.items[b]) for a, s in enumerate(succ) for b in s]
        on = set(active)
        core = sorted({self._index[key] for key in self.session.core() if key in self._index})
        return False, [k for k in core if k in on]

    def close(self) -> None:
        self.session.close()

    def __enter__(self):
        return self

    def __exit__(self, *exc):
        self.close()


def core_oracle(requirements: list[Requirement], all_triples_items: int = 30,
                deadline: float | None = None):
    """The all-triples oracle for few items, the SAT engine's session for more (when present);
    its checks raise :class:`~satorder.errors.TimeLimitReached` past ``deadline``."""
    items = len(items_of(requirements))
    if items > all_triples_items:
        try:
            return SessionOracle(requirements, deadline)
        except ImportError:
            pass
    return RequirementOracle(requirements, deadline)


class CutShort(Exception):
    """Shrinking a core stopped before it was minimal: ``current`` (requirement indices) is
    still infeasible, as the oracle showed; ``reason`` is ``"time-limit"`` or
    ``"interrupted"`` (Ctrl-C)."""

    def __init__(self, current: list[int], reason: str):
        super().__init__(f"core shrinking stopped ({reason}) at {len(current)} requirements")
        self.current = current
        self.reason = reason


def minimal_core(oracle, start: Iterable[int]) -> list[int]:
    """Shrink an infeasible set of requirement indices to a minimal infeasible subset.

    Deletion-based with clause-set refinement; raises ``ValueError`` if ``start`` is feasible.
    When the oracle's deadline passes or Ctrl-C arrives after the first check, raises
    :class:`CutShort` with the smallest infeasible set reached so far.
    """
    ok, current = oracle.check(start)
    if ok:
        raise ValueError("the requirements are feasible; there is no core")
    needed: set[int] = set()
    try:
        while True:
            todo = [k for k in current if k not in needed]
            if not todo:
                return sorted(current)
            k = todo[-1]
            rest = [j for j in current if j != k]
            ok, core = oracle.check(rest)
            if ok:
                needed.add(k)
            else:
                current = core  # holds every needed member: each lies in every core of `current`
    except TimeLimitReached:
        raise CutShort(sorted(current), "time-limit") from None
    except KeyboardInterrupt:
        raise CutShort(sorted(current), "interrupted") from None


def smallest_core(
    oracle, universe: Iterable[int], time_limit: float = 10.0
) -> tuple[list[int] | None, bool]:
    """A minimum-cardinality core of ``universe`` by hitting-set duality.

    Returns ``(core, True)`` when proven smallest, ``(None, False)`` when the time limit ran out
    first (the caller then keeps its minimal core and says so).
    """
    universe = list(universe)
    deadline = runner.deadline_after(time_limit)
    # minimum hitting sets of the correction sets found so far, by MaxSAT: one variable per
    # member of the universe, each unit soft clause "leave it out" of weight 1
    hvar = {k: i + 1 for i, k in enumerate(universe)}
    wcnf = WCNF()
    for k in universe:
        wcnf.append([-hvar[k]], weight=1)
    with RC2(wcnf, solver=SOLVER) as hitter:
        while time.monotonic() < deadline:
            model, stopped = runner.maxsat(hitter, deadline)
            if stopped or model is None:
                return None, False
            chosen = {v for v in model if v > 0}
            candidate = sorted(k for k in universe if hvar[k] in chosen)
            ok, arcs = oracle.check(candidate)
            if not ok:
                return candidate, True
            # grow to a maximal satisfiable subset; its complement is a correction set
            mss = set(oracle.satisfied(arcs)) & set(universe) | set(candidate)
            for k in universe:
                if k in mss:
                    continue
                if time.monotonic() >= deadline:
                    return None, False
                ok2, arcs2 = oracle.check(sorted(mss | {k}))
                if ok2:
                    mss |= set(oracle.satisfied(arcs2)) & set(universe)
                    mss.add(k)
            mcs = [k for k in universe if k not in mss]
            if not mcs:
                raise ValueError("the requirements are feasible; there is no core")
            hitter.add_clause([hvar[k] for k in mcs])
    return None, False


def correction_sets(oracle, universe: Iterable[int], limit: int, time_limit: float = 20.0):
    """Up to ``limit`` minimal correction sets of ``universe``, smallest first (MaxSAT, RC2).

    Each is a list of requirement indices; dropping it leaves a feasible set, dropping any
    proper subset does not.  Stops early at ``time_limit`` seconds.
    """
    universe = list(universe)
    wcnf = WCNF()
    for c in oracle.clauses:
        wcnf.append(c)
    outside = [oracle.selector[k] for k in range(len(oracle.selector)) if k not in set(universe)]
    for s in outside:  # requirements outside the universe are switched off
        wcnf.append([-s])
    for k in universe:
        wcnf.append([oracle.selector[k]], weight=1)
    found: list[list[int]] = []
    deadline = runner.deadline_after(time_limit)
    with RC2(wcnf, solver=SOLVER) as rc2:
        while len(found) < limit and time.monotonic() < deadline:
            model, stopped = runner.maxsat(rc2, deadline)
            if stopped or model is None:
                break
            pos = set(v for v in model if v > 0)
            mcs = [k for k in universe if oracle.selector[k] not in pos]
            if not mcs:
                break  # the whole universe is feasible: nothing to correct
            found.append(mcs)
            rc2.add_clause([oracle.selector[k] for k in mcs])  # block it and its supersets
    return found
