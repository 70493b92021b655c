"""Seeded, deterministic generators of problem families, and suites built from them.

Every generator takes an item count and a seed, draws from its own ``random.Random(seed)``
and returns an :class:`Instance`: the problem plus what is known about it by construction
(``expected_status``, and ``expected_count`` — the number of answers — where a published
formula gives it).  Item names are a random relabelling of ``0..n-1``, so item ids carry no hint
of the hidden order.  The same family, size, seed and parameters always give the same file.

Families (plain problems unless noted):

* ``order`` — comparability graph of a *random graph order*: the transitive closure of a
  random DAG over a hidden linear order, arcs drawn with probability ``degree/(n-1)``
  (Albert & Frieze, "Random graph orders", Order 6 (1989)); sparse or dense by ``degree``.
* ``permutation`` — permutation graph (inversion graph of a random permutation, or of a
  banded one with ``width``); comparability graphs of dimension-2 orders (Dushnik & Miller 1941).
* ``bipartite`` — random bipartite graph; every bipartite graph is a comparability graph, with
  exactly ``2^c`` transitive orientations for ``c`` components that have an edge (in a
  triangle-free graph all arcs at an item are Γ-related; Golumbic 1980, ch. 5).
* ``interval-complement`` — disjointness graph of random intervals: the complement of an
  interval graph, a comparability graph (Gilmore & Hoffman 1964).
* ``series-parallel`` — comparability graph of a random series-parallel order (a cograph);
  its answers number the product of ``k!`` over series nodes with ``k`` children of the
  canonical cotree (counting from the modular decomposition, Golumbic 1980, ch. 5).
* ``complete`` — ``K_n``: ``n!`` answers (every linear order).
* ``gnp`` — Erdős–Rényi ``G(n, c/n)`` around the density where orientability stops; status
  not known in advance.
* ``planted-hole`` / ``planted-antihole`` — a comparability graph (``base``: order, bipartite
  or blocks) plus an odd hole ``C_k`` (k ≥ 5 odd) or an antihole (complement of ``C_6`` or
  ``C_7``) on new items, optionally joined to the rest by ``joins`` edges; the obstruction stays
  induced, so the problem is infeasible while the rest stays a comparability graph.
* ``blocks`` — disjoint dense random orders (``blocks`` × ``block_size`` items).
* ``side-constraints`` — a random order's comparability graph with fixed and forbidden arcs
  that it satisfies; with ``conflict`` a small contradiction is planted (``transitivity``:
  a<b, b<c fixed with {a, c} unordered; ``cycle``: a fixed 3-cycle; ``forcing``: a<b fixed and
  a<d forbidden where {b, d} must stay unordered, so Γ forces a<d).
* ``open-pairs`` — a random order with only some comparable and some unordered pairs named,
  all others open; with ``conflict`` a fully specified 5-cycle (edges comparable, chords
  unordered) is added on new items.
* ``preferences`` — a random order's comparability graph with weighted preferences, all
  consistent with the hidden order (optimal cost 0) or random (cost at most the hidden
  order's).
* ``merged-evidence`` — two sources' reports on one hidden order, merged, with ``disagree``
  pairs on which they contradict each other (:mod:`satorder.generate.merged`).

Large edge-list instances for performance work are written by :func:`write_random_bipartite`
and :func:`write_dense_orders` in seconds.

>>> inst = generate("complete", 4, seed=1)
>>> inst.expected_status, inst.expected_count, inst.num_pairs
('feasible', 24, 6)
"""

from __future__ import annotations

import math
import random
from bisect import bisect_right

from satorder.errors import InputError
from satorder.generate.instance import (
    Instance,
    _bernoulli_pairs,
    _components_with_edges,
    _distinct_codes,
    _finish,
    _neighbours,
    _order_pairs,
)
from satorder.generate.merged import merged_evidence
from satorder.model.requirement import FEASIBLE, INFEASIBLE


# --------------------------------------------------------------------------- plain families
def random_order(items: int, seed: int = 0, degree: float = 2.0) -> Instance:
    """Comparability graph of a random graph order (closure of arcs with p = degree/(n-1))."""
    rng = random.Random(seed)
    us, vs = _order_pairs(items, degree, rng)
    return _finish("order", seed, {"degree": degree}, items, us, vs, rng,
                   expected_status=FEASIBLE)


def permutation_graph(items: int, seed: int = 0, width: int | None = None) -> Instance:
    """Inversion graph of a random permutation; with ``width``, of a banded one (each item moves
    about ``width`` places), which is sparser."""
    rng = random.Random(seed)
    if width is None:
        perm = list(range(items))
        rng.shuffle(perm)
    else:
        keys = [i + rng.random() * width for i in range(items)]
        perm = sorted(range(items), key=keys.__getitem__)
    pos = [0] * items
    for k, v in enumerate(perm):
        pos[v] = k
    us: list[int] = []
    vs: list[int] = []
    for i in range(items):
        pi = pos[i]
        for j in range(i + 1, items):
            if pos[j] < pi:
                us.append(i)
                vs.append(j)
    params = {} if width is None else {"width": width}
    return _finish("permutation", seed, params, items, us, vs, rng, expected_status=FEASIBLE)


def random_bipartite(items: int, seed: int = 0, degree: float = 3.0,
                     pairs: int | None = None) -> Instance:
    """Random bipartite graph on two halves with ``pairs`` distinct pairs (default
    ``degree * items / 2``); ``2^c`` answers for ``c`` components with an edge."""
    rng = random.Random(seed)
    left = items // 2
    right = items - left
    m = int(round(degree * items / 2)) if pairs is None else pairs
    m = min(m, left * right)
    codes = _distinct_codes(left * right, m, rng)
    us = [c // right for c in codes]
    vs = [left + c % right for c in codes]
    params = {"pairs": m} if pairs is not None else {"degree": degree}
    return _finish("bipartite", seed, params, items, us, vs, rng, expected_status=FEASIBLE,
                   expected_count=2 ** _components_with_edges(items, us, vs))


def interval_complement(items: int, seed: int = 0, length: float = 0.1) -> Instance:
    """Disjointness graph of random intervals (left end uniform in [0, 1), length exponential
    with mean ``length``): the complement of an interval graph (Gilmore & Hoffman 1964)."""
    rng = random.Random(seed)
    iv = sorted((rng.random(), rng.expovariate(1.0 / length)) for _ in range(items))
    lefts = [a for a, _ in iv]
    us: list[int] = []
    vs: list[int] = []
    for i, (a, ln) in enumerate(iv):
        k = bisect_right(lefts, a + ln)
        us.extend([i] * (items - k))
        vs.extend(range(k, items))
    return _finish("interval-complement", seed, {"length": length}, items, us, vs, rng,
                   expected_status=FEASIBLE)


def series_parallel(items: int, seed: int = 0, max_children: int = 4) -> Instance:
    """Comparability graph (a cograph) of a random series-parallel order.

    Built as a random canonical cotree (series and parallel nodes alternate, each with 2 to
    ``max_children`` children), so the number of answers is the product of ``k!`` over series
    nodes with ``k`` children.
    """
    rng = random.Random(seed)
    us: list[int] = []
    vs: list[int] = []
    count = 1
    next_item = 0

    def split(size: int) -> list[int]:
        k = rng.randint(2, min(size, max_children))
        cuts = sorted(rng.sample(range(1, size), k - 1))
        return [b - a for a, b in zip([0] + cuts, cuts + [size])]

    def children(size: int, kind: str) -> list[list[int]]:
        """Item lists of the children that ``size`` items contribute to a node of ``kind``."""
        nonlocal next_item
        if size == 1:
            next_item += 1
            return [[next_item - 1]]
        if rng.random() < 0.25:  # more children of the same node (a same-kind node, merged)
            return [g for part in split(size) for g in children(part, kind)]
        return [node(size, "parallel" if kind == "series" else "series")]

    def node(size: int, kind: str) -> list[int]:
        nonlocal count
        groups = [g for part in split(size) for g in children(part, kind)]
        if kind == "series":
            count *= math.factorial(len(groups))
            for gi in range(len(groups)):
                for gj in range(gi + 1, len(groups)):
                    for a in groups[gi]:
                        us.extend([a] * len(groups[gj]))
                        vs.extend(groups[gj])
        return [x for g in groups for x in g]

    if items > 1:
        node(items, rng.choice(["series", "parallel"]))
    return _finish("series-parallel", seed, {"max_children": max_children}, items, us, vs, rng,
                   expected_status=FEASIBLE, expected_count=count)


def complete(items: int, seed: int = 0) -> Instance:
    """``K_n``: every linear order is an answer, ``n!`` of them."""
    rng = random.Random(seed)
    us = [i for i in range(items) for _ in range(i + 1, items)]
    vs = [j for i in range(items) for j in range(i + 1, items)]
    return _finish("complete", seed, {}, items, us, vs, rng, expected_status=FEASIBLE,
                   expected_count=math.factorial(items))


def gnp(items: int, seed: int = 0, c: float = 1.0) -> Instance:
    """Erdős–Rényi ``G(n, c/n)``: around small ``c`` orientability is lost as odd holes appear;
    the status is not known in advance (the benchmark compares back ends instead)."""
    rng = random.Random(seed)
    us: list[int] = []
    vs: list[int] = []
    for w, v in _bernoulli_pairs(items, min(1.0, c / max(1, items)), rng):
        us.append(w)
        vs.append(v)
    return _finish("gnp", seed, {"c": c}, items, us, vs, rng)


def dense_blocks(items: int, seed: int = 0, block_size: int = 100,
                 degree: float = 12.0) -> Instance:
    """``items // block_size`` disjoint random graph orders of ``block_size`` items each."""
    rng = random.Random(seed)
    blocks = items // block_size
    us, vs = _blocks(blocks, block_size, degree, rng)
    params = {"block_size": block_size, "degree": degree}
    return _finish("blocks", seed, params, blocks * block_size, us, vs, rng,
                   expected_status=FEASIBLE)


def _blocks(blocks: int, block_size: int, degree: float, rng: random.Random):
    us: list[int] = []
    vs: list[int] = []
    for b in range(blocks):
        bu, bv = _order_pairs(block_size, degree, rng, offset=b * block_size)
        us.extend(bu)
        vs.extend(bv)
    return us, vs


def _base(kind: str, n: int, rng: random.Random, degree: float, block_size: int = 100):
    if kind == "order":
        return _order_pairs(n, degree, rng)
    if kind == "bipartite":
        left = n // 2
        right = n - left
        codes = _distinct_codes(left * right, min(left * right, int(degree * n / 2)), rng)
        return [c // right for c in codes], [left + c % right for c in codes]
    if kind == "blocks":
        size = block_size if n >= 2 * block_size else max(2, n // 2)
        return _blocks(n // size, size, degree, rng)
    raise ValueError(f"unknown base {kind!r}; choose order, bipartite or blocks")


def _obstruction(kind: str, k: int) -> list[tuple[int, int]]:
    if kind == "hole":
        if k < 5 or k % 2 == 0:
            raise ValueError("an odd hole needs an odd length of at least 5")
        return [(i, (i + 1) % k) for i in range(k)]
    if kind == "antihole":
        if k not in (6, 7):
            raise ValueError("planted antiholes are the complements of C6 and C7")
        cyc = {frozenset((i, (i + 1) % k)) for i in range(k)}
        return [(i, j) for i in range(k) for j in range(i + 1, k) if frozenset((i, j)) not in cyc]
    raise ValueError(kind)


def planted(items: int, seed: int = 0, kind: str = "hole", length: int = 5,
            base: str = "order", degree: float = 2.0, joins: int = 0,
            block_size: int = 100) -> Instance:
    """A comparability graph on ``items - length`` items plus an induced odd hole or antihole
    on ``length`` new items, joined to the rest by ``joins`` random edges (never chords)."""
    if items <= length:
        raise ValueError(f"needs more than {length} items (the obstruction has {length})")
    rng = random.Random(seed)
    nb = items - length
    us, vs = _base(base, nb, rng, degree, block_size)
    us, vs = list(us), list(vs)
    for a, b in _obstruction(kind, length):
        us.append(nb + a)
        vs.append(nb + b)
    if nb > 0:
        seen: set[tuple[int, int]] = set()  # joins only: the other pairs are distinct already
        for _ in range(joins):
            pair = (rng.randrange(nb), nb + rng.randrange(length))
            if pair not in seen:
                seen.add(pair)
                us.append(pair[0])
                vs.append(pair[1])
    n = nb + length
    family = "planted-hole" if kind == "hole" else "planted-antihole"
    params = {"length": length, "base": base, "degree": degree, "joins": joins}
    if base == "blocks":
        params["block_size"] = block_size
    return _finish(family, seed, params, n, us, vs, rng, expected_status=INFEASIBLE,
                   expected_count=0, planted=list(range(nb, n)),
                   planted_kind=f"{kind} of length {length}")


# --------------------------------------------------------------------------- side constraints
def side_constraints(items: int, seed: int = 0, degree: float = 3.0, fixed: int = 3,
                     forbidden: int = 3, conflict: str | None = None) -> Instance:
    """A random order's comparability graph, with fixed and forbidden arcs the hidden order
    meets (feasible), or with a planted contradiction (``conflict``: transitivity, cycle,
    forcing or any)."""
    rng = random.Random(seed)
    us, vs = _order_pairs(items, degree, rng)
    adj = _neighbours(items, us, vs)
    above = [set() for _ in range(items)]
    for u, v in zip(us, vs):
        above[u].add(v)
    plant_fixed: list[tuple[int, int]] = []
    plant_forbidden: list[tuple[int, int]] = []
    kind = None
    if conflict is not None:
        kinds = ["transitivity", "cycle", "forcing"] if conflict == "any" else [conflict]
        rng.shuffle(kinds)
        for kind in kinds:
            found = _plant_conflict(kind, items, adj, above, rng)
            if found is not None:
                plant_fixed, plant_forbidden = found
                break
        else:
            raise ValueError(
                f"no place to plant a {conflict} conflict in a {items}-item order with degree "
                f"{degree}; use more items or a larger degree"
            )
    used = {frozenset(a) for a in plant_fixed + plant_forbidden}
    pairs = [(u, v) for u, v in zip(us, vs) if frozenset((u, v)) not in used]
    chosen = rng.sample(pairs, min(len(pairs), fixed + forbidden))
    fx = [(u, v) for u, v in chosen[:fixed]]
    fb = [(v, u) for u, v in chosen[fixed:]]
    params = {"degree": degree, "fixed": fixed, "forbidden": forbidden,
              "conflict": kind if conflict else None}
    inst = _finish("side-constraints", seed, params, items, us, vs, rng,
                   fixed=fx + plant_fixed, forbidden=fb + plant_forbidden,
                   expected_status=INFEASIBLE if conflict else FEASIBLE)
    if conflict:
        inst.expected_count = 0
        inst.planted = sorted({x for a in plant_fixed + plant_forbidden for x in a})
        inst.planted_kind = f"{kind} conflict"
    return inst


def _plant_conflict(kind, n, adj, above, rng):
    order = list(range(n))
    rng.shuffle(order)
    for b in order:
        nb = sorted(adj[b])
        if len(nb) < 2:
            continue
        rng.shuffle(nb)
        if kind == "transitivity":
            # a - b - c with {a, c} unordered: fixing a<b and b<c forces a<c
            for i, a in enumerate(nb):
                for c in nb[i + 1:]:
                    if c not in adj[a]:
                        return [(a, b), (b, c)], []
        elif kind == "cycle":
            for i, a in enumerate(nb):
                for c in nb[i + 1:]:
                    if c in adj[a]:
                        return [(a, b), (b, c), (c, a)], []
        elif kind == "forcing":
            # b<x fixed; d adjacent to b but not to x: Γ forces b<d, which is forbidden
            for x in nb:
                for d in nb:
                    if d != x and d not in adj[x]:
                        return [(b, x)], [(b, d)]
        else:
            raise ValueError(f"unknown conflict {kind!r}; choose transitivity, cycle, forcing "
                             "or any")
    return None


def open_pairs(items: int, seed: int = 0, degree: float = 3.0, keep: float = 0.5,
               conflict: bool = False) -> Instance:
    """A random order with each comparable pair named with probability ``keep`` and each
    unordered pair named with probability ``keep``; all other pairs open.  With ``conflict``,
    five new items carry a fully specified 5-cycle (edges comparable, chords unordered)."""
    if conflict and items < 6:
        raise ValueError("a planted 5-cycle needs at least 6 items")
    rng = random.Random(seed)
    nb = items - 5 if conflict else items
    cu, cv = _order_pairs(nb, degree, rng)
    adj = _neighbours(nb, cu, cv)
    us: list[int] = []
    vs: list[int] = []
    for u, v in zip(cu, cv):
        if rng.random() < keep:
            us.append(u)
            vs.append(v)
    incomp = [(u, v) for u in range(nb) for v in range(u + 1, nb)
              if v not in adj[u] and rng.random() < keep]
    planted_items = None
    if conflict:
        for a, b in _obstruction("hole", 5):
            us.append(nb + a)
            vs.append(nb + b)
        incomp += [(nb + a, nb + b) for a in range(5) for b in range(a + 2, 5)
                   if (a, b) != (0, 4)]
        planted_items = list(range(nb, nb + 5))
    params = {"degree": degree, "keep": keep, "conflict": conflict}
    inst = _finish("open-pairs", seed, params, items, us, vs, rng, incomparable=incomp,
                   expected_status=INFEASIBLE if conflict else FEASIBLE)
    if conflict:
        inst.expected_count = 0
        inst.planted = planted_items
        inst.planted_kind = "5-cycle with its chords unordered"
    return inst


def preferences(items: int, seed: int = 0, degree: float = 3.0, count: int = 10,
                consistent: bool = False) -> Instance:
    """A random order's comparability graph with ``count`` weighted preferences (weights
    1..5) on comparable pairs; consistent ones agree with the hidden order (optimal cost 0),
    otherwise each points either way at random."""
    rng = random.Random(seed)
    us, vs = _order_pairs(items, degree, rng)
    pairs = list(zip(us, vs))
    chosen = rng.sample(pairs, min(len(pairs), count))
    prefer = []
    hidden_cost = 0
    for u, v in chosen:
        w = rng.randint(1, 5)
        if consistent or rng.random() < 0.5:
            prefer.append((u, v, w))
        else:
            prefer.append((v, u, w))
            hidden_cost += w
    params = {"degree": degree, "count": count, "consistent": consistent}
    inst = _finish("preferences", seed, params, items, us, vs, rng, prefer=prefer,
                   expected_status=FEASIBLE, cost_at_most=hidden_cost)
    if consistent:
        inst.expected_cost = 0
    return inst


FAMILIES = {
    "order": random_order,
    "permutation": permutation_graph,
    "bipartite": random_bipartite,
    "interval-complement": interval_complement,
    "series-parallel": series_parallel,
    "complete": complete,
    "gnp": gnp,
    "blocks": dense_blocks,
    "planted-hole": lambda items, seed=0, **kw: planted(items, seed, kind="hole", **kw),
    "planted-antihole": lambda items, seed=0, **kw: planted(
        items, seed, kind="antihole", **{"length": 6, **kw}),
    "side-constraints": side_constraints,
    "open-pairs": open_pairs,
    "preferences": preferences,
    "merged-evidence": merged_evidence,
}


ABOUT = {
    "order": "random graph order (degree: sparse 1-2, dense 8+); feasible",
    "permutation": "inversion graph of a random (or banded: width) permutation; feasible",
    "bipartite": "random bipartite graph (degree or pairs); feasible, 2^c answers",
    "interval-complement": "complement of a random interval graph (length); feasible",
    "series-parallel": "random series-parallel order (max_children); feasible, count known",
    "complete": "K_n; feasible, n! answers",
    "gnp": "G(n, c/n) around the orientability threshold (c); status unknown",
    "blocks": "disjoint dense random orders (block_size, degree); feasible",
    "planted-hole": "odd hole (length) planted in an order/bipartite/blocks base; infeasible",
    "planted-antihole": "complement of C6 or C7 (length) planted likewise; infeasible",
    "side-constraints": "fixed and forbidden arcs (fixed, forbidden); conflict=transitivity|"
                        "cycle|forcing|any makes it infeasible",
    "open-pairs": "only some pairs named (keep); conflict=true plants a 5-cycle",
    "preferences": "weighted preferences (count); consistent=true: optimal cost 0",
    "merged-evidence": "two sources' reports merged (keep, fixed_share); disagree=k plants k "
                       "pairs they contradict each other on; infeasible then",
}


def generate(family: str, items: int, seed: int = 0, **params) -> Instance:
    """Generate one instance of a named family (see the module docstring)."""
    if family not in FAMILIES:
        raise InputError(
            f"unknown family {family!r}; choose one of {', '.join(sorted(FAMILIES))}"
        )
    if not isinstance(items, int) or items < 1:
        raise InputError(f"items must be a positive integer, got {items!r}")
    try:
        return FAMILIES[family](items, seed, **params)
    except TypeError as exc:
        raise InputError(f"family {family}: bad parameter ({exc})") from None
    except ValueError as exc:
        raise InputError(f"family {family}: {exc}") from None
