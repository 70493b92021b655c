"""The ``merged-evidence`` family: two sources report on one hidden order, and the problem is
everything both of them said — with, optionally, a few pairs on which the sources disagree.

Evidence about items is usually gathered from several sources and merged, and the commonest
conflict in merged evidence is two sources contradicting each other about one pair.  Each
source names each comparable pair of a hidden random graph order (Albert & Frieze, "Random graph
orders", Order 6, 1989) with probability ``keep`` — as a fixed arc in its true direction with
probability ``fixed_share``, otherwise as a comparable pair — and each unordered pair with
probability ``keep`` as a pair that must stay unordered; pairs neither source names are open.
Both sources agree with the hidden order, so their union is feasible; pairs both of them name
are written twice (the reader merges the repeats and says so in a note).

With ``disagree = k``, source B contradicts source A on ``k`` pairs that A names, each in one of
the four ways two reports can clash on a single pair, taken in turn:

* ``reverse`` — A fixes a before b, B fixes b before a;
* ``forbid`` — A fixes a before b, B forbids a before b;
* ``unordered`` — A fixes a before b, B says a and b stay unordered;
* ``comparable`` — A says a and b are ordered, B says they stay unordered.

Each clash alone admits no order, so the problem is infeasible (``expected_count`` 0) and the
clashing pairs' items are recorded as ``planted``.

>>> inst = merged_evidence(12, seed=1, disagree=2)
>>> inst.expected_status, inst.planted_kind
('infeasible', 'sources disagree on 2 pairs: reverse, forbid')
"""

from __future__ import annotations

import random

from satorder.generate.instance import Instance, _finish, _order_pairs
from satorder.model.requirement import FEASIBLE, INFEASIBLE

CLASHES = ("reverse", "forbid", "unordered", "comparable")


def merged_evidence(items: int, seed: int = 0, degree: float = 3.0, keep: float = 0.6,
                    fixed_share: float = 0.3, disagree: int = 0) -> Instance:
    """Two sources' reports on one hidden random order, merged; ``disagree`` pairs on which
    source B contradicts source A (see the module docstring)."""
    if not 0 < keep <= 1 or not 0 <= fixed_share <= 1:
        raise ValueError("keep must be in (0, 1] and fixed_share in [0, 1]")
    if disagree < 0:
        raise ValueError(f"disagree must be 0 or more, got {disagree}")
    rng = random.Random(seed)
    lo, hi = _order_pairs(items, degree, rng)
    comparable = set(zip(lo, hi))
    below = {frozenset(p) for p in comparable}
    unordered = [(u, v) for u in range(items) for v in range(u + 1, items)
                 if frozenset((u, v)) not in below]
    reports = [_report(sorted(comparable), unordered, keep, fixed_share, rng) for _ in "AB"]
    clashes = _disagree(reports[0], reports[1], disagree, rng)
    us: list[int] = []
    vs: list[int] = []
    inc: list[tuple[int, int]] = []
    fixed: list[tuple[int, int]] = []
    forbidden: list[tuple[int, int]] = []
    for rep in reports:
        for u, v in rep["comparable"]:
            us.append(u)
            vs.append(v)
        inc += rep["incomparable"]
        fixed += rep["fixed"]
        forbidden += rep["forbidden"]
    pairs = {frozenset(p) for p in zip(us, vs)} | {frozenset(a) for a in fixed}
    params = {"degree": degree, "keep": keep, "fixed_share": fixed_share,
              "disagree": disagree}
    inst = _finish("merged-evidence", seed, params, items, us, vs, rng, incomparable=inc,
                   fixed=fixed, forbidden=forbidden, comparable_pairs=len(pairs),
                   expected_status=INFEASIBLE if clashes else FEASIBLE)
    if clashes:
        inst.expected_count = 0
        inst.planted = sorted({x for _, pair in clashes for x in pair})
        inst.planted_kind = (f"sources disagree on {len(clashes)} pair"
                             f"{'s' if len(clashes) > 1 else ''}: "
                             + ", ".join(kind for kind, _ in clashes))
    return inst


def _report(comparable, unordered, keep: float, fixed_share: float, rng: random.Random):
    """One source's report: each pair named with probability ``keep``, comparable pairs (the
    hidden order's arcs) as fixed arcs with probability ``fixed_share``, written either way
    round as comparable pairs otherwise."""
    rep: dict[str, list] = {"comparable": [], "incomparable": [], "fixed": [], "forbidden": []}
    for u, v in comparable:
        if rng.random() < keep:
            if rng.random() < fixed_share:
                rep["fixed"].append((u, v))
            else:
                rep["comparable"].append((u, v) if rng.random() < 0.5 else (v, u))
    for u, v in unordered:
        if rng.random() < keep:
            rep["incomparable"].append((u, v))
    return rep


def _disagree(a: dict, b: dict, count: int, rng: random.Random):
    """Make report ``b`` contradict report ``a`` on ``count`` pairs that ``a`` names, the kinds
    of clash taken in turn (a kind with no pair left to use is skipped); returns
    ``[(kind, pair)]``.  Raises ValueError when ``a`` names too few pairs."""
    used: set[frozenset] = set()
    pools = {"fixed": list(a["fixed"]), "comparable": list(a["comparable"])}
    for pool in pools.values():
        rng.shuffle(pool)
    out = []
    turn = 0
    while len(out) < count:
        for _ in CLASHES:
            kind = CLASHES[turn % len(CLASHES)]
            turn += 1
            pool = pools["comparable" if kind == "comparable" else "fixed"]
            while pool and frozenset(pool[-1]) in used:
                pool.pop()
            if pool:
                break
        else:
            raise ValueError(f"the first source names too few ordered pairs to disagree on "
                             f"{count}; use more items, a larger degree or keep")
        u, v = pool.pop()
        used.add(frozenset((u, v)))
        if kind == "reverse":
            b["fixed"].append((v, u))
        elif kind == "forbid":
            b["forbidden"].append((u, v))
        else:  # "unordered" (of a fixed arc) or "comparable" (of a comparable pair)
            b["incomparable"].append((min(u, v), max(u, v)))
        out.append((kind, (u, v)))
    return out
