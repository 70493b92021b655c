"""The dimension search over the parts of an order: split, test dimension two, SAT on small
parts, bounds beyond (see the package docstring for the whole method).
"""

from __future__ import annotations

import time

from satorder.measure.dimension.conjugate import (
    _witness_chain,
    conjugate_realizer,
    sample_witness,
    shrink_witness,
)
from satorder.measure.dimension.greedy import GREEDY_LIMIT, _greedy_bound
from satorder.measure.dimension.lazy import (
    MAX_CRITICAL_PAIRS,
    below_or_equal,
    lazy_realizer,
    lower_witness,
)
from satorder.measure.dimension.partition import large_part_realizer
from satorder.measure.dimension.result import Dimension, Part
from satorder.measure.dimension.split import _co_components, _components, _hiraguchi, _join, _local
from satorder.sat import runner

#: largest incomparability graph (pairs) built for the exact dimension-2 test of one part
MAX_INCOMPARABLE_PAIRS = 3_000_000
#: largest part (items) whose dimension ≥ 3 is searched exactly (lazy critical-pair SAT)
SAT_LIMIT = 150


def dimension_of_items(succ, items, sat_limit=SAT_LIMIT, deadline=None):
    """:func:`dimension` of the sub-order on ``items``, answers in item ids."""
    sub = _local(succ, items)
    d = dimension(sub, sat_limit=sat_limit, time_limit=None, deadline=deadline)
    if d.realizer is not None:
        d.realizer = [[items[i] for i in lin] for lin in d.realizer]
    return d


def _bounded(succ, items, lower, upper, witness, witness_lower, sub=None,
             deadline=None, pairs=None) -> Part:
    """A part known only within bounds: try a greedy realizer to lower the upper bound (it
    settles the dimension when it has ``lower`` orders), for at most 10 s and never past the
    ``deadline``."""
    seconds = 10.0 if deadline is None else min(10.0, runner.seconds_left(deadline))
    if len(items) <= GREEDY_LIMIT and seconds > 0:
        r = _greedy_bound(sub if sub is not None else _local(succ, items), items, upper,
                          seconds=seconds)
        if r is not None:
            return Part(lower, len(r), r, witness, witness_lower, pairs)
    return Part(lower, upper, None, witness, witness_lower, pairs)


def _at_most(seconds: float, deadline: float | None) -> float:
    """``seconds``, or less when the ``deadline`` is nearer."""
    return seconds if deadline is None else min(seconds, runner.seconds_left(deadline))


def _part_width(succ, items):
    from satorder.measure.figures import width

    return width(succ if len(items) == len(succ) else _local(succ, items)).value


def _solve_part(succ, pred, items, sat_limit, deadline, notes) -> Part:
    k = len(items)
    if k == 1:
        return Part(1, 1, [list(items)])
    member = set(items)
    pairs = sum(len(succ[x] & member) for x in items)
    incomparable = k * (k - 1) // 2 - pairs
    if incomparable > MAX_INCOMPARABLE_PAIRS:
        # a quick look for a small sub-order of dimension >= 3 first: when one exists the
        # refinement below cannot succeed
        found = sample_witness(succ, pred, items, tries=20, seconds=_at_most(3.0, deadline))
        if found is None:
            real = large_part_realizer(succ, pred, items, sat_limit, deadline, notes,
                                       realize=dimension_of_items)
            if real is not None:
                return Part(2, 2, real)
            found = sample_witness(succ, pred, items, seed=1,
                                   seconds=_at_most(5.0, deadline))
        upper = min(_part_width(succ, items), _hiraguchi(k))
        notes.append(f"a part of {k} items has {incomparable} incomparable pairs, too many for "
                     "the exact dimension-2 test; dimension bounded"
                     + ("" if found is None else " (a sub-order of dimension ≥ 3 was found)"))
        if found is not None:
            found = shrink_witness(succ, found)
            return _bounded(succ, items, 3, max(3, upper), found, 3, deadline=deadline)
        return _bounded(succ, items, 2, upper, None, None, deadline=deadline)
    sub = _local(succ, items)
    real, chain = conjugate_realizer(sub)
    if real is not None:
        return Part(2, 2, [[items[i] for i in lin] for lin in real])
    wit = sorted({x for s in chain for x in (s.arc + (s.because or ()))})
    wit = shrink_witness(succ, [items[i] for i in wit])
    upper = min(_part_width(succ, items), _hiraguchi(k))
    if k > sat_limit:
        if k <= 3 * sat_limit:
            # the witness proves ≥ 3; three orders found within a short budget settle it
            r = lazy_realizer(sub, 3, runner.deadline_after(5.0, deadline))
            if r.status == "yes":
                return Part(3, 3, [[items[i] for i in lin] for lin in r.realizer], wit, 3)
            if r.status == "no":  # proven: no 3 orders; claimed with a checkable witness
                lower, found, pairs = _lower_from_no(sub, items, 3, r, deadline)
                if found is not None:
                    part = _bounded(succ, items, lower, max(lower, upper), found, lower, sub,
                                    deadline, pairs)
                    if part.upper > part.lower:
                        notes.append(f"a part of {k} items has dimension ≥ {lower} and more "
                                     f"than {sat_limit} items (the SAT limit); dimension "
                                     "bounded")
                    return part
        part = _bounded(succ, items, 3, max(3, upper), wit, 3, sub, deadline)
        if part.upper > 3:
            notes.append(f"a part of {k} items has dimension ≥ 3 and more than {sat_limit} "
                         "items (the SAT limit); dimension bounded")
        return part
    return _exact_part(succ, items, sub, wit, upper, deadline, notes)


def _lower_from_no(sub, items, d, r, deadline):
    """From a "no" for ``d`` orders: ``(lower bound, witness items, witness pairs)`` in item
    ids — the clique of two-cycles (its size), or a small sub-order (``d + 1``) — or
    ``(d + 1, None, None)`` when no sub-order small enough for the independent check is found.
    """
    if r.clique:
        pairs = [(items[a], items[b]) for a, b in r.pairs]
        return len(pairs), sorted({v for pair in pairs for v in pair}), pairs
    small = lower_witness(sub, d, r, deadline)
    return d + 1, None if small is None else [items[v] for v in small], None


def _exact_part(succ, items, sub, wit, upper, deadline, notes) -> Part:
    """Dimension ≥ 3 (``wit`` proves it) on a part within the SAT limit: the lazy
    critical-pair search for d = 3, 4, … orders (:mod:`satorder.measure.dimension.lazy`).  Each
    "no" at d leaves a witness for ≥ d + 1: a clique of pairwise two-cycles, or a small
    sub-order confirmed afresh; the bounds are the fallback when the deadline comes first."""
    k = len(items)
    le = below_or_equal(sub)
    lower, witness, witness_lower, pairs = 3, wit, 3, None
    d = 3
    while d <= upper:
        r = lazy_realizer(sub, d, deadline, le)
        if r.status == "yes":
            return Part(d, d, [[items[i] for i in lin] for lin in r.realizer], witness,
                        witness_lower, pairs)
        if r.status == "unknown":
            why = ("has too many critical pairs" if r.stats["critical_pairs"] >
                   MAX_CRITICAL_PAIRS else "ran out of time")
            notes.append(f"the exact search for a realizer of {d} orders {why} on a part of "
                         f"{k} items")
            return _bounded(succ, items, lower, upper, witness, witness_lower, sub, deadline,
                            pairs)
        found_lower, found, found_pairs = _lower_from_no(sub, items, d, r, deadline)
        if found is None:  # proven, but no sub-order small enough for the checker
            notes.append(f"no {d} orders realize a part of {k} items, but no witness "
                         "sub-order small enough for the independent check was found in "
                         "time; that bound is not claimed")
            return _bounded(succ, items, lower, upper, witness, witness_lower, sub,
                            deadline, pairs)
        lower, witness, witness_lower, pairs = found_lower, found, found_lower, found_pairs
        d = lower
    raise AssertionError("no realizer within the proven upper bound")  # pragma: no cover


def dimension(succ: list[set[int]], sat_limit: int = SAT_LIMIT,
              time_limit: float | None = 60.0, deadline: float | None = None) -> Dimension:
    """The dimension of an order, with a realizer when exact (see module doc).

    The search stops at ``time_limit`` seconds, or at the ``deadline`` (a ``time.monotonic()``
    value) if that comes first, and then reports bounds."""
    t0 = time.perf_counter()
    n = len(succ)
    if n == 0:
        return Dimension("exact", 0, 0, [])
    pred: list[set[int]] = [set() for _ in range(n)]
    for a, s in enumerate(succ):
        for b in s:
            pred[b].add(a)

    deadline = runner.deadline_after(time_limit, deadline)
    notes: list[str] = []
    mark = [-1] * n
    tag = 0
    counts = {"parallel": 0, "series": 0, "parts": 0}

    # explicit stack: ("split", items, node) then ("join", node) once children are done
    root: dict = {}
    stack = [("split", list(range(n)), root)]
    while stack:
        kind, items, node = stack.pop()
        if kind == "join":
            _join(node)
            continue
        tag += 1
        for x in items:
            mark[x] = tag
        comps = _components(items, succ, pred, mark, tag)
        if len(comps) > 1:
            node["kind"] = "parallel"
            counts["parallel"] += 1
        else:
            comps = _co_components(items, succ, pred, mark, tag)
            if len(comps) > 1:
                node["kind"] = "series"
                counts["series"] += 1
                comps.sort(key=lambda c: sum(1 for y in pred[c[0]] if mark[y] == tag))
        if len(comps) == 1:
            counts["parts"] += 1
            node["part"] = _solve_part(succ, pred, items, sat_limit, deadline, notes)
            continue
        node["children"] = [{} for _ in comps]
        stack.append(("join", items, node))
        for comp, child in zip(comps, node["children"]):
            stack.append(("split", comp, child))
    part: Part = root["part"]
    exact = part.realizer is not None and len(part.realizer) == part.lower
    dim = Dimension("exact" if exact else "bounded", part.lower, part.upper,
                    part.realizer, part.witness, part.witness_lower,
                    witness_pairs=part.witness_pairs, notes=notes)
    if dim.witness is not None and dim.witness_lower == 3:
        dim.witness_chain = _witness_chain(succ, dim.witness)
    dim.stats = {**counts, "seconds": round(time.perf_counter() - t0, 4)}
    return dim
