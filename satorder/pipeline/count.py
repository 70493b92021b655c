"""The exact number of answers of a problem.

Two methods, and the result says which one was used:

* ``"modular-decomposition"`` — for problems without open pairs (every pair is either
  comparable or must stay unordered), the answers are the transitive orientations of the
  comparability graph that meet the fixed and forbidden arcs.  A transitive orientation is an
  independent choice at every node of the modular decomposition (Gallai 1967; McConnell &
  Spinrad 2000): a linear order of the children of a series node, one of the two transitive
  orientations of a prime node's quotient (a prime comparability graph has exactly two, one the
  reverse of the other), nothing at a parallel node.  Hence the product formula — k! for a
  series node with k children, 2 for a prime node, 0 if the graph is no comparability graph —
  and, with arcs, each arc lands on the node where its two items separate (their lowest common
  ancestor) and constrains only that node's choice: a series node then counts the linear
  orders of its children that respect its arcs (k!/r! times the linear extensions of the r
  children that carry arcs, by dynamic programming over down-sets), a prime node counts which
  of its two orientations agree with its arcs.  Python integers keep any count exact
  (K_100 has 100! answers).
* ``"enumeration"`` — problems with open pairs: every answer is produced by the SAT engine with
  blocking clauses (:mod:`satorder.sat.enumeration`) and certified
  (:mod:`satorder.pipeline.orders`); with ``limit`` or
  ``time_limit`` reached first, or Ctrl-C, the count is a lower bound (``exact`` is False,
  ``reason`` says which).  Listing is exponential work: :func:`enumeration_bound` gives, before
  it starts, the most answers the problem can have.

Preferences rank answers but rule none out, so they do not change the count.  Requirements
that clash on one pair (:meth:`~satorder.model.problem.Problem.contradictions`) admit no answer:
the count is 0 with no search (``stats["clash"]`` names the two), cross-checked like any other.

>>> from satorder.model.problem import Problem
>>> count_answers(Problem.from_lists(comparable=[("a", "b"), ("b", "c"), ("a", "c")])).count
6
>>> count_answers(Problem.from_lists(comparable=[("a", "b"), ("b", "c"), ("a", "c")],
...                                  fixed=[("a", "c")])).count
3
"""

from __future__ import annotations

import math
import time
from dataclasses import dataclass, field
from math import factorial
from typing import Any

from satorder.certify.decomposition import check_decomposition
from satorder.errors import CertificateError, InputError
from satorder.graph.arcs import place_arcs, required_arcs
from satorder.graph.forcing import transitive_orientation
from satorder.graph.modular import (
    LEAF,
    PARALLEL,
    PRIME,
    SERIES,
    ModuleNode,
    modular_decomposition,
    quotient,
)
from satorder.model.problem import Problem
from satorder.model.requirement import FEASIBLE, INFEASIBLE
from satorder.pipeline.orders import INTERRUPTED, EnumerationEnd, certified_orders
from satorder.pipeline.solve import solve

DECOMPOSITION, ENUMERATION = "modular-decomposition", "enumeration"
MAX_DOWNSETS = 2_000_000  # beyond this many states a series node's arcs are too many to count


@dataclass
class CountResult:
    """``count`` answers (a lower bound unless ``exact``), found by ``method``."""

    problem: Problem
    count: int
    exact: bool
    method: str
    reason: str = ""
    stats: dict[str, Any] = field(default_factory=dict)
    verified: bool = False
    tree: Any = field(default=None, repr=False)  # the modular decomposition used, if any

    def to_json(self) -> dict[str, Any]:
        doc: dict[str, Any] = {
            "count": self.count,
            "exact": self.exact,
            "method": self.method,
        }
        if not self.exact:
            doc["lower_bound"] = self.count
            doc["stopped"] = self.reason
        if self.problem.prefer:
            doc["note"] = "preferences rank answers but rule none out; they are not counted"
        doc["item_count"] = self.problem.n
        doc["comparable_pairs"] = self.problem.num_comparable
        doc["verified"] = self.verified
        doc["stats"] = self.stats
        return doc


class TooManyStates(RuntimeError):
    """A series node carries too many arcs for the down-set count."""


def count_answers(problem: Problem, limit: int | None = None, solver: str | None = None,
                  time_limit: float | None = None, method: str = "auto",
                  on_progress=None, on_enumeration=None) -> CountResult:
    """Count the answers of ``problem``; see the module docstring for the two methods.

    ``method``: ``"auto"`` (decomposition when there are no open pairs), ``DECOMPOSITION`` or
    ``ENUMERATION``.  ``limit``/``time_limit`` bound the enumeration only.  ``on_progress(k)`` is
    called as enumerated answers arrive, ``on_enumeration(bound)`` once before listing starts
    (``bound`` from :func:`enumeration_bound`).  Ctrl-C during the listing ends it: the result
    is then a lower bound with ``reason`` ``"interrupted"``.
    """
    if method not in ("auto", DECOMPOSITION, ENUMERATION):
        raise ValueError(f"unknown counting method {method!r}")
    t0 = time.perf_counter()
    if method == "auto":
        method = ENUMERATION if problem.has_open_pairs else DECOMPOSITION
    clash = problem.contradictions()
    if clash:  # two requirements clash on one pair: no answer at all
        names = problem.items
        return CountResult(problem, 0, True, method, stats={
            "clash": [r.to_json(names) for r in clash[0]],
            "seconds": round(time.perf_counter() - t0, 6)})
    if method == DECOMPOSITION:
        if problem.has_open_pairs:
            raise InputError(f"{problem.source}: has open pairs, which the decomposition "
                             "method cannot count; use the enumeration method (or auto)")
        try:
            res = _count_by_decomposition(problem)
        except TooManyStates:
            res = None
        if res is not None:
            res.stats["seconds"] = round(time.perf_counter() - t0, 6)
            return res
        method = ENUMERATION
    if on_enumeration is not None:
        on_enumeration(enumeration_bound(problem))
    res = _count_by_enumeration(problem, limit, solver, time_limit, on_progress)
    res.stats["seconds"] = round(time.perf_counter() - t0, 6)
    return res


# ------------------------------------------------------------------------ enumeration
def enumeration_bound(problem: Problem) -> float:
    """log10 of the most answers ``problem`` can have, from the states each pair may take in an
    answer (common practice, a plain product): a comparable pair is ordered one of 2 ways (1
    when a fixed arc or a forbidden arc on it leaves one), an open pair is unordered or ordered
    either way (3, or 2 with a forbidden arc), a pair that must stay unordered has 1 state.
    Listing the answers one by one costs at least one SAT call per answer, so this bounds the
    work.

    >>> from satorder.model.problem import Problem
    >>> round(10 ** enumeration_bound(Problem.from_lists(comparable=[("a", "b"), ("b", "c")])))
    4
    """
    fixed = {frozenset(arc) for arc in problem.fixed}
    banned = {frozenset(arc) for arc in problem.forbidden}
    two = three = 0
    for a in range(problem.n):
        for b in problem.adj[a]:
            if a < b and frozenset((a, b)) not in fixed and frozenset((a, b)) not in banned:
                two += 1
    if problem.incomparable is not None:
        for a in range(problem.n):
            for b in range(a + 1, problem.n):
                if problem.is_open(a, b):
                    if frozenset((a, b)) in banned:
                        two += 1
                    else:
                        three += 1
    return two * math.log10(2) + three * math.log10(3)


def _count_by_enumeration(problem, limit, solver, time_limit, on_progress) -> CountResult:
    end = EnumerationEnd()
    listed = 0
    orders = certified_orders(problem, limit=limit, solver=solver, time_limit=time_limit,
                              end=end)
    try:
        for found in orders:
            listed += 1
            if on_progress is not None:
                on_progress(found.index)
    except KeyboardInterrupt:  # stop with what was found: a lower bound
        end.complete, end.reason = False, INTERRUPTED
    finally:
        orders.close()
    # every enumerated order passed certify.order.check_order; distinct by construction
    return CountResult(problem, listed, end.complete, ENUMERATION, reason=end.reason,
                       stats={"enumerated": listed}, verified=True)


# ------------------------------------------------------------------------ decomposition
def _count_by_decomposition(problem: Problem) -> CountResult:
    adj = problem.adj
    stats: dict[str, Any] = {}
    arcs = required_arcs(problem)
    if arcs is None:
        return CountResult(problem, 0, True, DECOMPOSITION, stats=stats)
    if problem.n == 0:
        return CountResult(problem, 1, True, DECOMPOSITION, stats=stats)
    if not transitive_orientation(adj).orientable:
        stats["comparability_graph"] = False
        return CountResult(problem, 0, True, DECOMPOSITION, stats=stats)
    tree = modular_decomposition(adj)
    kinds = {SERIES: 0, PARALLEL: 0, PRIME: 0}
    for node in tree.nodes():
        if node.kind != LEAF:
            kinds[node.kind] += 1
    stats["nodes"] = kinds
    result = CountResult(problem, 0, True, DECOMPOSITION, stats=stats, tree=tree)
    placed = {key: [(i, j) for i, j, _ in found]
              for key, found in place_arcs(tree, arcs, problem.n).items()}
    stats["constrained_nodes"] = len(placed)
    total = 1
    for node in tree.nodes():
        if node.kind == SERIES:
            total *= _series_count(len(node.children), placed.get(id(node), ()))
        elif node.kind == PRIME:
            total *= _prime_count(adj, node, placed.get(id(node), ()))
        if total == 0:
            break
    result.count = total
    return result


def _series_count(k: int, arcs) -> int:
    """Linear orders of k children in which each arc (i, j) puts child i before child j."""
    if not arcs:
        return factorial(k)
    involved = sorted({i for arc in arcs for i in arc})
    r = len(involved)
    pos = {c: t for t, c in enumerate(involved)}
    before = [0] * r  # bitmask of the involved children that must come earlier
    for i, j in arcs:
        before[pos[j]] |= 1 << pos[i]
    return factorial(k) // factorial(r) * _linear_extensions(before)


def _linear_extensions(before: list[int]) -> int:
    """Linear extensions of a relation on r elements (``before[j]``: elements that must precede
    j), by dynamic programming over down-sets; 0 if the relation has a cycle."""
    r = len(before)
    full = (1 << r) - 1
    ways = {0: 1}
    for _ in range(r):
        nxt: dict[int, int] = {}
        for mask, w in ways.items():
            for j in range(r):
                bit = 1 << j
                if not mask & bit and before[j] & ~mask == 0:
                    m2 = mask | bit
                    nxt[m2] = nxt.get(m2, 0) + w
        if len(nxt) > MAX_DOWNSETS:
            raise TooManyStates(f"{len(nxt)} down-sets")
        ways = nxt
        if not ways:
            return 0
    return ways.get(full, 0)


def _prime_count(adj, node: ModuleNode, arcs) -> int:
    """How many of the two transitive orientations of a prime node's quotient put each arc
    (i, j) (children indices) as i before j."""
    if not arcs:
        return 2
    q = quotient(adj, node)
    res = transitive_orientation(q)
    if not res.orientable:  # cannot happen when the whole graph is a comparability graph
        return 0
    up = {(a, b) for a, b in res.arcs()}
    forward = all((i, j) in up for i, j in arcs)
    backward = all((j, i) in up for i, j in arcs)
    return int(forward) + int(backward)


# ------------------------------------------------------------------------ alongside an answer
CHEAP_PAIRS = 50_000  # comparable pairs up to which solve also counts its answers


def answers_admitted(problem: Problem, cheap_pairs: int = CHEAP_PAIRS) -> CountResult | None:
    """The number of answers, checked by :func:`check_count`, when it is cheap to know: no
    open pairs (so the modular decomposition counts them) and at most ``cheap_pairs``
    comparable pairs; otherwise ``None``.  ``solve`` prints it beside the order it found, so
    the check is the one that loads no SAT solver: the solving engine agrees that an answer
    exists and the decomposition tree passes its independent check (``satorder count``
    recounts small counts by enumeration as well)."""
    if problem.has_open_pairs or problem.num_comparable > cheap_pairs:
        return None
    try:
        res = _count_by_decomposition(problem)
    except TooManyStates:
        return None
    check_count(res, recount_up_to=0)
    return res


# ------------------------------------------------------------------------ independent check
def check_count(result: CountResult, recount_up_to: int = 64, recount_items: int = 200,
                solver: str | None = None, time_limit: float | None = None) -> None:
    """Check a count with engines that did not produce it; sets ``result.verified``.

    The solving engine (forcing or SAT, its order certified by :mod:`satorder.certify`) must
    agree on whether any answer exists (when it answers within ``time_limit``); and a
    decomposition count of at most ``recount_up_to`` on a problem of at most ``recount_items``
    items is recounted by SAT enumeration, every enumerated order certified.  Raises
    :class:`~satorder.errors.CertificateError` on disagreement.
    """
    problem = result.problem
    hard = problem.with_requirements(prefer=[]) if problem.prefer else problem
    ans = solve(hard, solver=solver, time_limit=time_limit)
    checks = []
    if ans.status == FEASIBLE:
        if result.exact and result.count == 0:
            raise CertificateError("count is 0 but the solver found a certified answer")
        checks.append("a certified answer exists")
    elif ans.status == INFEASIBLE:
        if result.count != 0:
            raise CertificateError(f"count is {result.count} but the problem is infeasible")
        checks.append("the solver certified that no answer exists")
    if result.tree is not None:
        implied = check_decomposition(problem.adj, result.tree)
        if implied is not None:
            if not (problem.fixed or problem.forbidden) and implied != result.count:
                raise CertificateError(f"the checked decomposition implies {implied} answers, "
                                       f"the count says {result.count}")
            checks.append("decomposition tree checked: every child a module, node kinds, prime "
                          "quotients with one implication class")
    if result.method == DECOMPOSITION and 0 < result.count <= recount_up_to and \
            problem.n <= recount_items:
        again = _count_by_enumeration(hard, result.count + 1, solver, None, None)
        if not again.exact or again.count != result.count:
            raise CertificateError(
                f"decomposition counts {result.count} answers, enumeration "
                f"{again.count}{'' if again.exact else ' or more'}"
            )
        checks.append("recounted by SAT enumeration, every order certified")
    result.stats["checks"] = checks
    result.verified = bool(checks)
