"""Explaining infeasibility: a minimal core, a derivation, an obstruction and repairs.

``explain(problem)`` answers "why is there no order, in my own requirements, and what could I
change?":

* **core** — a minimal infeasible subset of the requirements (every other requirement dropped,
  unnamed pairs open; dropping any one member makes it feasible), found by deletion-based MUS
  extraction (:mod:`satorder.sat.mus`); two requirements that clash on one pair
  (:meth:`~satorder.model.problem.Problem.contradictions`) are such a core at once.  For
  problems whose non-comparable pairs must all stay unordered, the search starts from the
  forcing chain of a minimal obstruction, so only the unordered pairs that justify forcing
  steps ever get a selector — never one per non-edge.
* **obstruction** — when the comparable pairs alone admit no order: a minimal set of items whose
  induced subgraph has no transitive orientation (:mod:`satorder.graph.obstruction`).
* **derivation** — numbered steps from the core to a contradiction
  (:mod:`satorder.explanation.derivation`), replayed by the independent checker
  :mod:`satorder.certify.derivation`.
* **smallest** (optional) — a minimum-cardinality core by hitting-set duality, on small problems.
* **repairs** (optional) — minimal correction sets, each verified by exhibiting an order for the
  repaired problem that :func:`satorder.certify.order.check_order` accepts.

Every core is checked by code that did not find it: its infeasibility by the replayed
derivation (and, on up to 40 items, by :func:`satorder.certify.core.check_core_infeasible`, an
all-triples encoding with another solver), its minimality by one witness order per member
(:mod:`satorder.certify.minimality`).

>>> from satorder import Problem
>>> p = Problem.from_lists(comparable=[("a", "b"), ("b", "c"), ("c", "d"), ("d", "e"), ("e", "a")])
>>> e = explain(p)
>>> e.status, sorted(p.names(e.obstruction)), e.verified
('infeasible', ['a', 'b', 'c', 'd', 'e'], True)
"""

from __future__ import annotations

import time
from dataclasses import dataclass, field, replace
from typing import Any

from satorder import certify
from satorder.certify import derivation as replay
from satorder.errors import CertificateError, TimeLimitReached
from satorder.explanation import derivation as derivation
from satorder.explanation.checks import (
    MINIMALITY_CHECK_ITEMS,
    check_core,
    check_obstruction,
    minimality_witnesses,
)
from satorder.explanation.repairs import (
    REPAIR_SAT_ITEMS,
    Repair,
    _closure,
    _local_repairs,
    _verify_small_repair,
    repair_text,
)
from satorder.explanation.requirements import requirements
from satorder.graph.constrained import orient_with_arcs
from satorder.graph.forcing import ForcingResult, transitive_orientation
from satorder.graph.obstruction import (
    chain_items,
    find_obstruction,
    induced_adjacency,
    minimise_obstruction,
)
from satorder.model.problem import Problem
from satorder.model.requirement import (
    FEASIBLE,
    INFEASIBLE,
    UNKNOWN,
    Kind,
    Requirement,
    Status,
    items_of,
)
from satorder.model.wording import requirement_text
from satorder.sat.mus import (
    CutShort,
    RequirementOracle,
    core_oracle,
    correction_sets,
    minimal_core,
    smallest_core,
)

WHOLE_PROBLEM_ITEMS = 24  # up to this many items, smallest cores and repairs range over all


ORACLE_ITEMS = 60  # up to this many items, the core is found by the all-triples oracle


SUMMARY_ITEMS = 200  # solve's summary shows a minimal core spanning up to this many items


@dataclass
class Explanation:
    """The outcome of :func:`explain` (requirements use item ids; see :meth:`to_json`)."""

    problem: Problem
    status: Status
    core: list[Requirement] | None = None
    obstruction: list[int] | None = None
    steps: list[derivation.Step] | None = None
    smallest: dict[str, Any] | None = None
    repairs: list[Repair] | None = None
    notes: list[str] = field(default_factory=list)
    verified: bool = False
    stats: dict[str, Any] = field(default_factory=dict)
    minimal: bool = True  # False: shrinking the core was cut short (``stopped`` says why)
    stopped: str | None = None  # "time-limit" or "interrupted" when the work was cut short

    def __post_init__(self) -> None:
        self.status = Status(self.status)

    def involved_items(self) -> list[int]:
        """Items named by the core or the obstruction."""
        return sorted(set(items_of(self.core or ())) | set(self.obstruction or ()))

    def obstruction_graph(self):
        """The subgraph the obstruction induces, as a networkx graph on item names."""
        if self.obstruction is None:
            return None
        names = self.problem.items
        return self.problem.to_networkx().subgraph(names[v] for v in self.obstruction).copy()

    def core_json(self) -> list[dict]:
        """The core's members: ``{"kind", "pair", "text"}`` (``text`` in the one wording)."""
        names = self.problem.items
        return [{**r.to_json(names), "text": requirement_text(r, names)}
                for r in self.core or []]

    def derivation_json(self) -> list[dict] | None:
        if self.steps is None:
            return None
        return derivation.to_json(self.steps, self.core, self.problem.items)

    def to_json(self) -> dict[str, Any]:
        """The machine-readable explanation (fields fixed by the CLI contract, extras welcome)."""
        names = self.problem.items
        doc: dict[str, Any] = {"status": self.status}
        if self.core is not None:
            doc["core"] = self.core_json()
            doc["minimal"] = self.minimal
        if self.stopped is not None:
            doc["stopped"] = self.stopped
        if self.obstruction is not None:
            doc["obstruction"] = [names[v] for v in self.obstruction]
        if self.steps is not None:
            doc["derivation"] = self.derivation_json()
        if self.smallest is not None:
            doc["smallest"] = self.smallest
        if self.repairs is not None:
            doc["repairs"] = [
                {
                    "drop": [r.to_json(names) for r in rep.drop],
                    "text": repair_text(rep.drop, names),
                    "order": None if rep.succ is None else
                    [[names[a], names[b]] for a, s in enumerate(rep.succ) for b in sorted(s)],
                    "verified": rep.verified,
                    **({"note": rep.note} if rep.note else {}),
                }
                for rep in self.repairs
            ]
        if self.notes:
            doc["notes"] = self.notes
        doc["item_count"] = self.problem.n
        doc["comparable_pairs"] = self.problem.num_comparable
        doc["verified"] = self.verified
        doc["stats"] = self.stats
        return doc


def _chain_core(problem: Problem, items: list[int]) -> list[Requirement]:
    """Comparable pairs and unordered witness pairs of a forcing chain inside ``items``."""
    order, sub = induced_adjacency(problem.adj, items)
    res = transitive_orientation(sub)
    assert not res.orientable
    fixed = {frozenset(arc): arc for arc in problem.fixed}  # a fixed arc stands for its pair
    core: dict[Requirement, None] = {}  # in order of first appearance
    for s in res.chain:
        a, b = order[s.arc[0]], order[s.arc[1]]
        arc = fixed.get(frozenset((a, b)))
        core[Requirement(Kind.COMPARABLE, (a, b)) if arc is None
             else Requirement(Kind.FIXED, arc)] = None
        if s.because is not None:
            core[Requirement(Kind.INCOMPARABLE, (order[s.because[0]], order[s.because[1]]))] = None
    return list(core)


def _engine_core(problem: Problem, time_limit: float, solver: str | None = None):
    """The project's solver on a problem too large for the all-triples oracle: ``"feasible"``
    (its order verified), an infeasible core and whether it is minimal, or ``None``."""
    from satorder.pipeline.solve import solve

    try:
        ans = solve(problem, solver=solver, time_limit=time_limit)
    except ImportError:
        return None
    if ans.status == FEASIBLE:
        return FEASIBLE
    if ans.status != INFEASIBLE or not ans.core:
        return None
    return list(ans.core), bool(ans.stats.get("core", {}).get("minimal"))


def minimal_core_of(answer) -> list[Requirement] | None:
    """A verified minimal core for an infeasible :class:`~satorder.model.answer.Answer`, computed
    from
    its forcing chain (shrunk to a minimal obstruction first) or from the engine's core; ``None``
    when the answer carries neither, or the core spans too many items to re-check."""
    p = answer.problem
    if answer.chain is not None:
        start = _chain_core(p, minimise_obstruction(p.adj, chain_items(answer.chain)))
    elif answer.core:
        start = list(answer.core)
    else:
        return None
    if len(items_of(start)) > SUMMARY_ITEMS:
        return None
    with core_oracle(start) as oracle:
        core = [start[k] for k in minimal_core(oracle, range(len(start)))]
    try:
        steps = derivation.build_derivation(core)
    except derivation.DerivationBudgetExceeded:
        steps = None
    if steps is not None:
        replay.check_derivation([r.to_json(p.items) for r in core],
                                derivation.to_json(steps, core, p.items))
    check_core(p, core, replayed=steps is not None)
    return core


# ---------------------------------------------------------------------- main entry
def _shrink(start: list[Requirement], deadline: float | None):
    """A minimal core inside the infeasible ``start`` and ``None``, or, when the deadline or
    Ctrl-C cut the shrinking short, the smallest infeasible subset reached and the reason."""
    try:
        with core_oracle(start, deadline=deadline) as oracle:
            return [start[k] for k in minimal_core(oracle, range(len(start)))], None
    except CutShort as cut:
        return [start[k] for k in cut.current], cut.reason


def _cut_short(expl: Explanation, core: list[Requirement], reason: str, t0: float):
    """Report a core whose shrinking stopped early: infeasible (shown by the oracle, and
    re-checked independently on few items) but perhaps not minimal."""
    problem = expl.problem
    expl.status, expl.core, expl.minimal, expl.stopped = INFEASIBLE, core, False, reason
    why = "the time limit" if reason == "time-limit" else "Ctrl-C"
    expl.notes.append(f"{why} stopped the shrinking of the core: these {len(core)} "
                      "requirements cannot all hold, but some may be dropped")
    if len(items_of(core)) <= MINIMALITY_CHECK_ITEMS:
        certify.check_core_infeasible(problem, core)
        expl.verified = True
    else:
        expl.notes.append("the core spans too many items for the independent re-check")
    expl.stats["seconds"] = round(time.perf_counter() - t0, 6)
    return expl


def explain(
    problem: Problem,
    smallest: bool = False,
    repairs: int = 0,
    forcing_result: ForcingResult | None = None,
    time_limit: float = 30.0,
    progress=None,
    solver: str | None = None,
) -> Explanation:
    """Explain why ``problem`` admits no order (or say that it does).

    ``problem`` may also be an undirected networkx graph (its edges the comparable pairs, every
    other pair to stay unordered).  ``smallest`` asks for a minimum-cardinality core;
    ``repairs`` for up to that many minimal correction sets.  ``forcing_result`` may pass the
    forcing algorithm's outcome on ``problem.adj`` when the caller already has it.
    ``progress(text)`` is called before each stage.  ``time_limit`` covers the whole call:
    shrinking the core first, then the smallest core and the repairs each get what is left.
    When the time limit or Ctrl-C stops the shrinking, the infeasible set reached so far is
    returned with ``minimal`` False and ``stopped`` saying why; Ctrl-C during the smallest core
    or the repairs keeps the minimal core found.  ``solver`` is the back end of the SAT
    engine's core on problems of more than :data:`ORACLE_ITEMS` items.
    """
    if not isinstance(problem, Problem):
        problem = Problem.from_networkx(problem)
    say = progress or (lambda text: None)
    t0 = time.perf_counter()
    deadline = time.monotonic() + time_limit
    stats: dict[str, Any] = {}
    expl = Explanation(problem, UNKNOWN, stats=stats)
    small = problem.n <= WHOLE_PROBLEM_ITEMS
    whole_oracle = None
    core: list[Requirement] | None = None
    core_witnesses = None

    clash = problem.contradictions()
    if clash:  # two requirements clash on one pair: they are a minimal core already
        core = list(clash[0])
    elif problem.incomparable is None:
        say("forcing")
        res = forcing_result or transitive_orientation(problem.adj, colours=not problem.is_plain)
        stats["forcing_seconds"] = round(time.perf_counter() - t0, 6)
        if not res.orientable:
            say("obstruction")
            t = time.perf_counter()
            ob = find_obstruction(problem.adj, res)
            check_obstruction(problem, ob)
            expl.obstruction = ob
            stats["obstruction_seconds"] = round(time.perf_counter() - t, 6)
            start = _chain_core(problem, ob)
            try:  # often the chain's requirements are already a minimal core
                core_witnesses = minimality_witnesses(start)
                core = start
            except CertificateError:
                core, cut = _shrink(start, deadline)
                if cut:
                    return _cut_short(expl, core, cut, t0)
        elif problem.is_plain:
            certify.check_order(problem, res.successor_sets())
            expl.status, expl.verified = FEASIBLE, True
            stats["seconds"] = round(time.perf_counter() - t0, 6)
            return expl
        elif problem.n > ORACLE_ITEMS:
            # fixed or forbidden arcs, every other pair unordered: decided on the modular
            # decomposition from the same forcing result (no second run of the engine)
            say("arcs on the decomposition")
            out = orient_with_arcs(problem, res)
            if out.feasible:
                certify.check_order(problem, replace(res, up=out.up).successor_sets())
                expl.status, expl.verified = FEASIBLE, True
                stats["seconds"] = round(time.perf_counter() - t0, 6)
                return expl
            with core_oracle(out.core) as oracle:
                core = [out.core[k] for k in minimal_core(oracle, range(len(out.core)))]

    if core is None:
        say("core")
        if problem.n > ORACLE_ITEMS:
            found_core = _engine_core(problem, max(0.0, deadline - time.monotonic()), solver)
            if found_core is None:
                expl.notes.append(f"no verdict: problems with side constraints and more than "
                                  f"{ORACLE_ITEMS} items need the SAT engine's core")
                stats["seconds"] = round(time.perf_counter() - t0, 6)
                return expl
            if found_core == FEASIBLE:
                expl.status, expl.verified = FEASIBLE, True
                stats["seconds"] = round(time.perf_counter() - t0, 6)
                return expl
            found_core, engine_minimal = found_core
            if engine_minimal:  # the SAT engine's deletion loop finished
                core = found_core
            else:
                core, cut = _shrink(found_core, deadline)
                if cut:
                    return _cut_short(expl, core, cut, t0)
    if core is None:
        reqs = requirements(problem)
        whole_oracle = RequirementOracle(reqs, deadline)
        try:
            ok, found = whole_oracle.check(range(len(reqs)))
        except TimeLimitReached:
            whole_oracle.close()
            expl.notes.append("no verdict within the time limit")
            expl.stopped = "time-limit"
            stats["seconds"] = round(time.perf_counter() - t0, 6)
            return expl
        if ok:
            certify.check_order(problem, _closure(problem.n, found))
            expl.status, expl.verified = FEASIBLE, True
            whole_oracle.close()
            stats["seconds"] = round(time.perf_counter() - t0, 6)
            return expl
        try:
            core = [reqs[k] for k in minimal_core(whole_oracle, found)]
        except CutShort as cut:
            whole_oracle.close()
            return _cut_short(expl, [reqs[k] for k in cut.current], cut.reason, t0)
        whole_oracle.deadline = None  # the smallest core and repairs keep their own clocks

    expl.status, expl.core = INFEASIBLE, core
    items = items_of(core)
    say("derivation")
    t = time.perf_counter()
    try:
        expl.steps = derivation.build_derivation(core)
    except derivation.DerivationBudgetExceeded:
        expl.notes.append("no derivation: the case-split search gave up on this core")
    if expl.steps is not None:
        replay.check_derivation(expl.core_json(), expl.derivation_json())
    stats["derivation_seconds"] = round(time.perf_counter() - t, 6)
    say("checking the core")
    t = time.perf_counter()
    check_core(problem, core, replayed=expl.steps is not None, witnesses=core_witnesses)
    stats["core_check_seconds"] = round(time.perf_counter() - t, 6)

    def left() -> float:
        return max(0.0, deadline - time.monotonic())

    try:
        if smallest or repairs:
            if small:
                universe_reqs = requirements(problem)
                scope = "whole problem"
            else:
                universe_reqs = requirements(problem, set(items) | set(expl.obstruction or ()))
                scope = f"requirements among the {len(items_of(universe_reqs))} items of the core"
            if whole_oracle is None or not small:
                if whole_oracle is not None:
                    whole_oracle.close()
                whole_oracle = RequirementOracle(universe_reqs)
            universe = list(range(len(universe_reqs)))
            if smallest:
                say("smallest core")
                t = time.perf_counter()
                given = left()
                best, proved = smallest_core(whole_oracle, universe, time_limit=given)
                info: dict[str, Any] = {"proved": proved, "scope": scope}
                if best is None and small:  # fall back to the requirements on the core's items
                    local = requirements(problem, set(items) | set(expl.obstruction or ()))
                    with RequirementOracle(local) as oracle:
                        best, proved = smallest_core(oracle, range(len(local)),
                                                     time_limit=left() / 2)
                    universe_reqs = local
                    info = {"proved": proved, "scope": "requirements among the "
                            f"{len(items_of(local))} items of the core",
                            "note": f"the whole-problem search gave up after {given:g} s"}
                if best is not None:
                    found = [universe_reqs[k] for k in best]
                    info["size"] = len(found)
                    if len(found) < len(core):  # shown only once checked
                        steps = derivation.build_derivation(found)
                        replay.check_derivation(
                            [r.to_json(problem.items) for r in found],
                            derivation.to_json(steps, found, problem.items))
                        check_core(problem, found, replayed=True)
                        expl.core, expl.steps = found, steps
                else:
                    info["note"] = f"gave up after {given:g} s; the core shown is minimal"
                if not small:
                    info["note"] = ("searched only among requirements on the core's items; "
                                    "a smaller core elsewhere in the problem is not ruled out")
                stats["smallest_seconds"] = round(time.perf_counter() - t, 6)
                expl.smallest = info
            if repairs:
                say("repairs")
                t = time.perf_counter()
                plain_like = problem.incomparable is None and not problem.fixed \
                    and not problem.forbidden
                if small and not plain_like:
                    given = left()
                    found = correction_sets(whole_oracle, universe, repairs, time_limit=given)
                    expl.repairs = [_verify_small_repair(problem, whole_oracle, universe, mcs)
                                    for mcs in found]
                    if len(found) < repairs and time.perf_counter() - t >= given:
                        expl.notes.append("repairs: time limit reached")
                elif plain_like or problem.n <= REPAIR_SAT_ITEMS:
                    expl.repairs, notes = _local_repairs(
                        problem, set(items) | set(expl.obstruction or ()), repairs,
                        deadline, say)
                    expl.notes += notes
                else:
                    expl.repairs = []
                    expl.notes.append("repairs are offered for problems whose other pairs must all "
                                      f"stay unordered, or with up to {REPAIR_SAT_ITEMS} items")
                stats["repairs_seconds"] = round(time.perf_counter() - t, 6)
    except KeyboardInterrupt:  # keep the minimal core found; say what was not finished
        expl.stopped = "interrupted"
        expl.notes.append("Ctrl-C stopped the search for a smallest core or repairs; the "
                          "core shown is minimal")
    if whole_oracle is not None:
        whole_oracle.close()
    expl.verified = True
    stats["seconds"] = round(time.perf_counter() - t0, 6)
    return expl
