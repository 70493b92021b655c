"""Explaining infeasibility: a minimal core, a derivation, an obstruction and repairs.

``explain(problem)`` answers "why is there no order, in my own requirements, and what could I
change?":

* **core** — a minimal infeasible subset of the requirements (every other requirement dropped,
  unnamed pairs open; dropping any one member makes it feasible), found by deletion-based MUS
  extraction (:mod:`satorder.mus`).  For problems whose non-comparable pairs must all stay
  unordered, the search starts from the forcing chain of a minimal obstruction, so only the
  unordered pairs that justify forcing steps ever get a selector — never one per non-edge.
* **obstruction** — when the comparable pairs alone admit no order: a minimal set of items whose
  induced subgraph has no transitive orientation (:mod:`satorder.obstruction`).
* **derivation** — numbered steps from the core to a contradiction
  (:mod:`satorder.derivation`), replayed by the independent checker :mod:`satorder.replay`.
* **smallest** (optional) — a minimum-cardinality core by hitting-set duality, on small problems.
* **repairs** (optional) — minimal correction sets, each verified by exhibiting an order for the
  repaired problem that :func:`satorder.certify.check_order` accepts.

Every core is checked by code that did not find it: its infeasibility by the replayed
derivation (and, on up to 40 items, by :func:`satorder.certify.check_core_infeasible`, an
all-triples encoding with another solver), its minimality by one witness order per member
(:mod:`satorder.core_check`).

>>> from satorder import Problem
>>> p = Problem.from_lists(comparable=[("a", "b"), ("b", "c"), ("c", "d"), ("d", "e"), ("e", "a")])
>>> e = explain(p)
>>> e.status, sorted(p.names(e.obstruction)), e.verified
('infeasible', ['a', 'b', 'c', 'd', 'e'], True)
"""

from __future__ import annotations

import time
from dataclasses import dataclass, field
from itertools import combinations, product
from typing import Any

from satorder.certify import derivation as replay
from satorder.certify import order as certify
from satorder.certify.minimality import check_minimality_witnesses
from satorder.errors import CertificateError
from satorder.explanation import derivation as derivation
from satorder.graph.forcing import ForcingResult, transitive_orientation
from satorder.graph.obstruction import (
    chain_items,
    find_obstruction,
    induced_adjacency,
    minimise_obstruction,
)
from satorder.model.problem import Problem
from satorder.sat.mus import (
    RequirementOracle,
    core_oracle,
    correction_sets,
    minimal_core,
    smallest_core,
)

FEASIBLE, INFEASIBLE, UNKNOWN = "feasible", "infeasible", "unknown"
WHOLE_PROBLEM_ITEMS = 24  # up to this many items, smallest cores and repairs range over all
ORACLE_ITEMS = 60  # up to this many items, the core is found by the all-triples oracle
REPAIR_SAT_ITEMS = 3000  # side-constraint repairs re-solved (unordered pairs listed) up to this
MINIMALITY_CHECK_ITEMS = 40  # all-triples re-solve of a core up to this many items
SUMMARY_ITEMS = 200  # solve's summary shows a minimal core spanning up to this many items


@dataclass
class Repair:
    """A minimal correction set: requirements to drop, and an order the repaired problem admits."""

    drop: list[dict]
    succ: list[set[int]] | None
    verified: bool
    note: str = ""


@dataclass
class Explanation:
    """The outcome of :func:`explain` (requirements use item ids; see :meth:`to_json`)."""

    problem: Problem
    status: str
    core: list[dict] | None = None
    obstruction: list[int] | None = None
    steps: list[derivation.Step] | None = None
    smallest: dict[str, Any] | None = None
    repairs: list[Repair] | None = None
    notes: list[str] = field(default_factory=list)
    verified: bool = False
    stats: dict[str, Any] = field(default_factory=dict)

    def involved_items(self) -> list[int]:
        """Items named by the core or the obstruction."""
        return sorted({v for r in self.core or () for v in r["pair"]} | set(self.obstruction or ()))

    def obstruction_graph(self):
        """The subgraph the obstruction induces, as a networkx graph on item names."""
        if self.obstruction is None:
            return None
        names = self.problem.items
        return self.problem.to_networkx().subgraph(names[v] for v in self.obstruction).copy()

    def core_json(self) -> list[dict]:
        names = self.problem.items
        return [{"kind": r["kind"], "pair": [names[r["pair"][0]], names[r["pair"][1]]]}
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
        if self.obstruction is not None:
            doc["obstruction"] = [names[v] for v in self.obstruction]
        if self.steps is not None:
            doc["derivation"] = self.derivation_json()
        if self.smallest is not None:
            doc["smallest"] = self.smallest
        if self.repairs is not None:
            doc["repairs"] = [
                {
                    "drop": [{"kind": r["kind"], "pair": [names[r["pair"][0]],
                                                          names[r["pair"][1]]]}
                             for r in rep.drop],
                    "order": None if rep.succ is None else
                    [[names[a], names[b]] for a, s in enumerate(rep.succ) for b in sorted(s)],
                    "verified": rep.verified,
                    **({"note": rep.note} if rep.note else {}),
                }
                for rep in self.repairs
            ]
        if self.notes:
            doc["notes"] = self.notes
        doc["items"] = self.problem.n
        doc["comparable_pairs"] = self.problem.num_comparable
        doc["verified"] = self.verified
        doc["stats"] = self.stats
        return doc


# ---------------------------------------------------------------------- requirements
def requirements(problem: Problem, items=None) -> list[dict]:
    """The hard requirements of ``problem`` as ``{"kind", "pair"}`` dicts, optionally only those
    whose two items lie in ``items``.  A fixed arc stands for its own pair: the pair is not
    listed again as comparable.  Under ``"others"`` the unordered pairs are enumerated, so
    without ``items`` this is for small problems."""
    keep = None if items is None else set(items)
    fixed_pairs = {frozenset(a) for a in problem.fixed}
    out: list[dict] = []

    def inside(a, b):
        return keep is None or (a in keep and b in keep)

    if keep is None:
        comp = problem.comparable_pairs()
    else:
        comp = ((a, b) for a in sorted(keep) for b in problem.adj[a] if a < b and b in keep)
    for a, b in comp:
        if frozenset((a, b)) not in fixed_pairs:
            out.append({"kind": "comparable", "pair": (a, b)})
    if keep is None:
        inc = problem.incomparable_pairs()
    else:
        inc = ((a, b) for a, b in combinations(sorted(keep), 2)
               if problem.must_be_unordered(a, b))
    out += [{"kind": "incomparable", "pair": (a, b)} for a, b in inc]
    out += [{"kind": "fixed", "pair": (a, b)} for a, b in problem.fixed if inside(a, b)]
    out += [{"kind": "forbidden", "pair": (a, b)} for a, b in problem.forbidden if inside(a, b)]
    return out


def _items_of(reqs) -> list[int]:
    return sorted({v for r in reqs for v in r["pair"]})


# ---------------------------------------------------------------------- obstruction check
def check_obstruction(problem: Problem, items: list[int]) -> None:
    """Independently confirm that ``items`` induce a minimal non-orientable subgraph: a forcing
    chain of the induced subgraph passes :func:`certify.check_forcing_chain`, and each
    one-item-smaller subset has an orientation that passes :func:`certify.check_order`."""

    def sub_problem(vs):
        order, sub = induced_adjacency(problem.adj, vs)
        return Problem(items=[problem.items[v] for v in order], adj=sub)

    p = sub_problem(items)
    res = transitive_orientation(p.adj)
    if res.orientable:
        raise CertificateError("the obstruction's items induce an orientable subgraph")
    certify.check_forcing_chain(p, res.chain)
    # an odd chordless cycle of length >= 5 is minimal by a published fact (Golumbic 1980,
    # ch. 5: removing an item leaves paths, which are bipartite); checked structurally here
    degrees = [len(nb) for nb in p.adj]
    if len(items) >= 5 and len(items) % 2 == 1 and set(degrees) == {2}:
        reach, todo = {0}, [0]
        while todo:
            for u in p.adj[todo.pop()]:
                if u not in reach:
                    reach.add(u)
                    todo.append(u)
        if len(reach) == len(items):
            return
    for k in range(len(items)):
        q = sub_problem(items[:k] + items[k + 1:])
        r = transitive_orientation(q.adj)
        if not r.orientable:
            raise CertificateError(
                f"the obstruction is not minimal: {problem.items[items[k]]} can be dropped")
        certify.check_order(q, r.successor_sets())


def _chain_core(problem: Problem, items: list[int]) -> list[dict]:
    """Comparable pairs and unordered witness pairs of a forcing chain inside ``items``."""
    order, sub = induced_adjacency(problem.adj, items)
    res = transitive_orientation(sub)
    assert not res.orientable
    fixed = {frozenset(arc): arc for arc in problem.fixed}  # a fixed arc stands for its pair
    core: dict[tuple, dict] = {}
    for s in res.chain:
        a, b = sorted((order[s.arc[0]], order[s.arc[1]]))
        arc = fixed.get(frozenset((a, b)))
        if arc is not None:
            core.setdefault(("fixed", *arc), {"kind": "fixed", "pair": arc})
        else:
            core.setdefault(("comparable", a, b), {"kind": "comparable", "pair": (a, b)})
        if s.because is not None:
            x, y = sorted((order[s.because[0]], order[s.because[1]]))
            core.setdefault(("incomparable", x, y), {"kind": "incomparable", "pair": (x, y)})
    return list(core.values())


# ---------------------------------------------------------------------- repairs
def repaired_problem(problem: Problem, drop: list[dict]) -> Problem:
    """``problem`` with the requirements in ``drop`` removed (their pairs become open).  The
    unordered pairs are listed explicitly, so this is for problems of modest size."""
    adj = [set(s) for s in problem.adj]
    if problem.incomparable is None:
        inc = [set(range(problem.n)) - adj[a] - {a} for a in range(problem.n)]
    else:
        inc = [set(s) for s in problem.incomparable]
    fixed, forbidden = list(problem.fixed), list(problem.forbidden)
    for r in drop:
        a, b = r["pair"]
        if r["kind"] == "comparable":
            adj[a].discard(b)
            adj[b].discard(a)
        elif r["kind"] == "incomparable":
            inc[a].discard(b)
            inc[b].discard(a)
        elif r["kind"] == "fixed":
            fixed.remove((a, b))
            if not any({a, b} == {x, y} for x, y in fixed):
                adj[a].discard(b)
                adj[b].discard(a)
        else:
            forbidden.remove((a, b))
    return problem.with_requirements(adj=adj, incomparable=inc, fixed=fixed,
                                     forbidden=forbidden, prefer=[])


def _closure(n: int, arcs) -> list[set[int]]:
    succ: list[set[int]] = [set() for _ in range(n)]
    for a, b in arcs:
        succ[a].add(b)
    return succ


def _verify_small_repair(problem: Problem, oracle, universe, mcs) -> Repair:
    drop = [oracle.requirements[k] for k in mcs]
    ok, arcs = oracle.check([k for k in universe if k not in set(mcs)])
    if not ok:
        return Repair(drop, None, False, "the repaired problem is still infeasible")
    succ = _closure(problem.n, arcs)  # the oracle's model is transitively closed
    certify.check_order(repaired_problem(problem, drop), succ)
    return Repair(drop, succ, True)


def _verify_plain_repair(problem: Problem, drop: list[dict], max_tries: int):
    """For problems whose other pairs must all stay unordered: the dropped pairs become open, so
    the repaired problem is feasible iff some choice of ordered/unordered for them leaves a
    comparability graph.  Choices are tried (flipping every dropped pair first); an orientation
    found is checked by :func:`certify.check_order` on that graph, which lies between the kept
    comparable pairs and the kept pairs plus the open ones.

    Returns ``(repair, blocker)``: ``blocker`` is a minimal obstruction of the first (flipped)
    choice when no choice worked, i.e. where the remaining conflict lies."""
    pairs = [tuple(r["pair"]) for r in drop if r["kind"] in ("comparable", "incomparable")]
    was_edge = [r["kind"] == "comparable" for r in drop
                if r["kind"] in ("comparable", "incomparable")]
    if len(pairs) != len(drop):
        return Repair(drop, None, False, "fixed or forbidden arcs: not checked here"), None
    blocker = None
    for tries, choice in enumerate(product((False, True), repeat=len(pairs))):
        if tries >= max_tries:
            break
        adj = list(problem.adj)
        for (a, b), edge_before, keep in zip(pairs, was_edge, choice):
            edge = edge_before == keep  # choice False flips the pair
            for x, y in ((a, b), (b, a)):
                adj[x] = set(adj[x])
                (adj[x].add if edge else adj[x].discard)(y)
        res = transitive_orientation(adj)
        if res.orientable:
            succ = res.successor_sets()
            certify.check_order(Problem(items=problem.items, adj=adj), succ)
            return Repair(drop, succ, True), None
        if blocker is None:
            blocker = find_obstruction(adj, res)
    return Repair(drop, None, False, "other conflicts remain after this change"), blocker


def _key(r: dict) -> tuple:
    return (r["kind"], tuple(r["pair"]))


def _verify_general_repair(problem: Problem, drop: list[dict], deadline: float):
    """Solve the repaired problem with the project's solver (its order is checked by
    :func:`certify.check_order` inside :func:`satorder.solve.solve`); on failure the items of
    the repaired problem's core show where the remaining conflict lies."""
    from satorder.pipeline.solve import solve

    left = deadline - time.monotonic()
    if left <= 0:
        return Repair(drop, None, False, "time limit reached"), None
    ans = solve(repaired_problem(problem, drop), engine="sat", time_limit=left)
    if ans.status == FEASIBLE:
        return Repair(drop, ans.succ, True), None
    if ans.status == INFEASIBLE and ans.core:
        return (Repair(drop, None, False, "other conflicts remain after this change"),
                _items_of(ans.core))
    return Repair(drop, None, False, "no verdict within the time limit"), None


def _local_repairs(problem: Problem, items: set[int], limit: int, deadline: float,
                   say) -> tuple[list[Repair], list[str]]:
    """Minimal correction sets for a problem too large for the whole-problem search.

    Correction sets are enumerated over the requirements among a set of items ``U`` (first the
    core's); each is checked on the whole problem.  One that works is a minimal correction set
    of the whole problem too (a proper subset already fails on ``U``).  One that does not
    reveals a further obstruction; its items join ``U`` and the enumeration restarts — an
    implicit-hitting-set loop (Davies & Bacchus, "Solving MAXSAT by solving a sequence of
    simpler MaxSAT instances", CP 2011).  The whole-problem check is the forcing algorithm
    when every other pair must stay unordered, the SAT engine otherwise."""
    items = set(items)
    offered: dict[frozenset, Repair] = {}
    rejected: set[frozenset] = set()
    notes: list[str] = []
    tries = 1 if problem.num_comparable > 200_000 else 16
    plain = problem.incomparable is None and not problem.fixed and not problem.forbidden
    while len(offered) < limit and time.monotonic() < deadline:
        reqs = requirements(problem, items)
        grew = False
        with RequirementOracle(reqs) as oracle:
            universe = list(range(len(reqs)))
            found = correction_sets(oracle, universe, limit + len(rejected) + len(offered),
                                    time_limit=max(0.1, deadline - time.monotonic()))
        for mcs in found:
            drop = [reqs[k] for k in mcs]
            key = frozenset(map(_key, drop))
            if key in offered or key in rejected:
                continue
            if time.monotonic() >= deadline or len(offered) >= limit:
                break
            say(f"checking repair {len(offered) + 1} on the whole problem")
            if plain:
                rep, blocker = _verify_plain_repair(problem, drop, tries)
            else:
                rep, blocker = _verify_general_repair(problem, drop, deadline)
            if rep.verified:
                offered[key] = rep
                continue
            rejected.add(key)
            if blocker is not None and not set(blocker) <= items and len(items) < 60:
                items |= set(blocker)
                grew = True
                break
        if not grew:
            break
    if rejected:
        notes.append(f"{len(rejected)} correction set(s) of the core's neighbourhood left out: "
                     "dropping them does not make the whole problem feasible")
    if len(offered) < limit and time.monotonic() >= deadline:
        notes.append("repairs: time limit reached")
    return sorted(offered.values(), key=lambda r: len(r.drop)), notes


def _engine_core(problem: Problem, time_limit: float):
    """The project's solver on a problem too large for the all-triples oracle: ``"feasible"``
    (its order verified), an infeasible core over requirement dicts, or ``None``."""
    from satorder.pipeline.solve import solve

    try:
        ans = solve(problem, time_limit=time_limit)
    except ImportError:
        return None
    if ans.status == FEASIBLE:
        return FEASIBLE
    if ans.status != INFEASIBLE or not ans.core:
        return None
    core = [{"kind": r["kind"], "pair": tuple(r["pair"])} for r in ans.core]
    return core, bool(ans.stats.get("core", {}).get("minimal"))


def forcing_witness(core: list[dict], k: int):
    """An order meeting every member of ``core`` but member ``k``, from a transitive
    orientation (Golumbic 1980, ch. 5): order exactly the pairs that must be ordered (plus the
    pair of ``k`` when it is an unordered one) and nothing else.  Only for cores made of
    comparable and unordered pairs; ``None`` when that graph has no transitive orientation."""
    if any(r["kind"] not in ("comparable", "incomparable") for r in core):
        return None
    items = _items_of(core)
    pos = {v: i for i, v in enumerate(items)}
    adj: list[set[int]] = [set() for _ in items]
    for j, r in enumerate(core):
        if (r["kind"] == "comparable") != (j == k):
            a, b = pos[r["pair"][0]], pos[r["pair"][1]]
            adj[a].add(b)
            adj[b].add(a)
    res = transitive_orientation(adj)
    if not res.orientable:
        return None
    return [(items[a], items[b]) for a, b in res.arcs()]  # transitively closed already


def minimality_witnesses(core: list[dict]) -> dict[int, list]:
    """One witness order per member of ``core`` (each meets all other members): from a
    transitive orientation where one exists, otherwise from a SAT call.  Raises
    :class:`CertificateError` when some member can be dropped (the core is not minimal)."""
    witnesses = {k: w for k in range(len(core))
                 if (w := forcing_witness(core, k)) is not None}
    missing = [k for k in range(len(core)) if k not in witnesses]
    if missing:
        with core_oracle(core) as oracle:
            everything = range(len(core))
            for k in missing:
                ok, arcs = oracle.check([j for j in everything if j != k])
                if not ok:
                    raise CertificateError(f"the core is not minimal: member {k} can be dropped")
                witnesses[k] = arcs
    return witnesses


def check_core(problem: Problem, core: list[dict], replayed: bool, witnesses=None) -> None:
    """Independent checks of a core: one witness order per member shows minimality
    (:func:`satorder.core_check.check_minimality_witnesses`); infeasibility is shown by the
    replayed derivation (``replayed``) and, for cores on few items, also re-solved by
    :func:`satorder.certify.check_core_infeasible`."""
    if witnesses is None:
        witnesses = minimality_witnesses(core)
    check_minimality_witnesses(problem, core, witnesses)
    if not replayed or len(_items_of(core)) <= MINIMALITY_CHECK_ITEMS:
        certify.check_core_infeasible(problem, core)


def minimal_core_of(answer) -> list[dict] | None:
    """A verified minimal core for an infeasible :class:`~satorder.answer.Answer`, computed from
    its forcing chain (shrunk to a minimal obstruction first) or from the engine's core; ``None``
    when the answer carries neither, or the core spans too many items to re-check."""
    p = answer.problem
    if answer.chain is not None:
        start = _chain_core(p, minimise_obstruction(p.adj, chain_items(answer.chain)))
    elif answer.core:
        start = [{"kind": r["kind"], "pair": tuple(r["pair"])} for r in answer.core]
    else:
        return None
    if len(_items_of(start)) > SUMMARY_ITEMS:
        return None
    with core_oracle(start) as oracle:
        core = [start[k] for k in minimal_core(oracle, range(len(start)))]
    try:
        steps = derivation.build_derivation(core)
    except derivation.DerivationBudgetExceeded:
        steps = None
    if steps is not None:
        replay.check_derivation(
            [{"kind": r["kind"], "pair": [p.items[v] for v in r["pair"]]} for r in core],
            derivation.to_json(steps, core, p.items))
    check_core(p, core, replayed=steps is not None)
    return core


# ---------------------------------------------------------------------- main entry
def explain(
    problem: Problem,
    smallest: bool = False,
    repairs: int = 0,
    forcing_result: ForcingResult | None = None,
    time_limit: float = 30.0,
    progress=None,
) -> Explanation:
    """Explain why ``problem`` admits no order (or say that it does).

    ``problem`` may also be an undirected networkx graph (its edges the comparable pairs, every
    other pair to stay unordered).  ``smallest`` asks for a minimum-cardinality core;
    ``repairs`` for up to that many minimal correction sets.  ``forcing_result`` may pass the
    forcing algorithm's outcome on ``problem.adj`` when the caller already has it.
    ``progress(text)`` is called before each stage.
    """
    if not isinstance(problem, Problem):
        problem = Problem.from_networkx(problem)
    say = progress or (lambda text: None)
    t0 = time.perf_counter()
    stats: dict[str, Any] = {}
    expl = Explanation(problem, UNKNOWN, stats=stats)
    small = problem.n <= WHOLE_PROBLEM_ITEMS
    whole_oracle = None
    core: list[dict] | None = None
    core_witnesses = None

    if problem.incomparable is None:
        say("forcing")
        res = forcing_result or transitive_orientation(problem.adj)
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
                with core_oracle(start) as oracle:
                    core = [start[k] for k in minimal_core(oracle, range(len(start)))]
        elif problem.is_plain:
            certify.check_order(problem, res.successor_sets())
            expl.status, expl.verified = FEASIBLE, True
            stats["seconds"] = round(time.perf_counter() - t0, 6)
            return expl

    if core is None:
        say("core")
        if problem.n > ORACLE_ITEMS:
            found_core = _engine_core(problem, time_limit)
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
                with core_oracle(found_core) as oracle:
                    core = [found_core[k] for k in minimal_core(oracle, range(len(found_core)))]
    if core is None:
        reqs = requirements(problem)
        whole_oracle = RequirementOracle(reqs)
        ok, found = whole_oracle.check(range(len(reqs)))
        if ok:
            certify.check_order(problem, _closure(problem.n, found))
            expl.status, expl.verified = FEASIBLE, True
            whole_oracle.close()
            stats["seconds"] = round(time.perf_counter() - t0, 6)
            return expl
        core = [reqs[k] for k in minimal_core(whole_oracle, found)]

    expl.status, expl.core = INFEASIBLE, core
    items = _items_of(core)
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

    if smallest or repairs:
        if small:
            universe_reqs = requirements(problem)
            scope = "whole problem"
        else:
            universe_reqs = requirements(problem, set(items) | set(expl.obstruction or ()))
            scope = f"requirements among the {len(_items_of(universe_reqs))} items of the core"
        if whole_oracle is None or not small:
            if whole_oracle is not None:
                whole_oracle.close()
            whole_oracle = RequirementOracle(universe_reqs)
        universe = list(range(len(universe_reqs)))
        if smallest:
            say("smallest core")
            t = time.perf_counter()
            best, proved = smallest_core(whole_oracle, universe, time_limit=time_limit)
            info: dict[str, Any] = {"proved": proved, "scope": scope}
            if best is None and small:  # fall back to the requirements on the core's items
                local = requirements(problem, set(items) | set(expl.obstruction or ()))
                with RequirementOracle(local) as oracle:
                    best, proved = smallest_core(oracle, range(len(local)),
                                                 time_limit=time_limit / 2)
                universe_reqs = local
                info = {"proved": proved, "scope": "requirements among the "
                        f"{len(_items_of(local))} items of the core",
                        "note": f"the whole-problem search gave up after {time_limit:g} s"}
            if best is not None:
                found = [universe_reqs[k] for k in best]
                info["size"] = len(found)
                if len(found) < len(core):
                    expl.core = found
                    expl.steps = derivation.build_derivation(found)
                    replay.check_derivation(expl.core_json(), expl.derivation_json())
                    check_core(problem, found, replayed=True)
            else:
                info["note"] = f"gave up after {time_limit:g} s; the core shown is minimal"
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
                found = correction_sets(whole_oracle, universe, repairs, time_limit=time_limit)
                expl.repairs = [_verify_small_repair(problem, whole_oracle, universe, mcs)
                                for mcs in found]
                if len(found) < repairs and time.perf_counter() - t >= time_limit:
                    expl.notes.append("repairs: time limit reached")
            elif plain_like or problem.n <= REPAIR_SAT_ITEMS:
                expl.repairs, notes = _local_repairs(
                    problem, set(items) | set(expl.obstruction or ()), repairs,
                    time.monotonic() + time_limit, say)
                expl.notes += notes
            else:
                expl.repairs = []
                expl.notes.append("repairs are offered for problems whose other pairs must all "
                                  f"stay unordered, or with up to {REPAIR_SAT_ITEMS} items")
            stats["repairs_seconds"] = round(time.perf_counter() - t, 6)
    if whole_oracle is not None:
        whole_oracle.close()
    expl.verified = True
    stats["seconds"] = round(time.perf_counter() - t0, 6)
    return expl
