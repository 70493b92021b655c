"""Order dimension with a realizer, exact where it can be, bounded beyond.

The *dimension* of an order P is the least number of linear orders (a *realizer*) whose
intersection is P (Dushnik & Miller 1941).  How it is found here:

1. **Split by series and parallel modules.**  Items are split into the connected components of
   the comparability graph (a *disjoint sum*) and, inside a connected part, into the components
   of its complement (a *linear sum*: every item of one part lies below every item of the next).
   A linear sum has dimension ``max(parts)`` and a disjoint sum of at least two parts
   ``max(2, parts)``: each part is a sub-order (so no less), and realizers of the parts, padded
   to equal length, concatenate into one of the whole — for a disjoint sum the second order
   lists the parts in reverse, which separates items of different parts.  Components of the
   complement are found without building it (each step scans only the items still unvisited).
2. **Dimension ≤ 2 test on each remaining part** (connected, co-connected).  P has dimension
   ≤ 2 exactly when its incomparability graph is a comparability graph (Dushnik & Miller 1941);
   the part's incomparability graph is built and handed to the forcing algorithm
   (:mod:`satorder.forcing`).  A transitive orientation Q of it gives the realizer
   ``L1 = P ∪ Q`` and ``L2 = P ∪ Q⁻¹``: an item's position in ``L1`` is the number of items
   below it in P plus the number before it in Q.  When no orientation exists, the forcing
   chain names a sub-order of dimension ≥ 3, which is then shrunk item by item to a small one.
3. **SAT for dimension ≥ 3** on parts of at most ``sat_limit`` items: ``k`` linear orders, each
   extending P (transitivity clauses over item triples), that together reverse every
   incomparable pair; ``k = 3, 4, …`` until satisfiable.  Parts of up to ``3 · sat_limit``
   items get one short try (5 s) for three orders, which settles dimension 3 when it succeeds
   and, on parts of at most 60 items, proves dimension ≥ 4 when it fails.
4. **Large parts** (incomparability graph too large to build): first a quick search for a small
   sub-order of dimension ≥ 3 among random connected pieces; if none, *ordered vertex
   partitioning* (McConnell & Spinrad 2000) on the incomparability graph, driven by the
   comparability lists alone (:func:`refine_conjugate`), proposes a conjugate order; the
   resulting pair of linear orders is accepted only when it passes the realizer check.
   Unsplit classes that are modules are realized recursively and substituted.
5. **Beyond reach** (a large part where neither succeeds, or a part of dimension ≥ 3 with too
   many items for SAT): the answer is *bounded*.  Lower bound: 3 when a sub-order of
   dimension ≥ 3 is found (by the chain above, or by sampling small connected pieces of the
   part), else 2.  Upper bound: ``min(width, max(2, ⌊n/2⌋))`` — dimension is at most the width
   (Dilworth 1950) and at most ``⌊n/2⌋`` for n ≥ 4 (Hiraguchi 1951), both from memory — or,
   on parts of up to :data:`GREEDY_LIMIT` items, the size of a realizer built greedily (each
   linear extension reverses what critical pairs it can), which is checked like any realizer
   and gives the exact value when it meets the lower bound.

>>> dimension([{3, 4}, {3, 5}, {4, 5}, set(), set(), set()]).value  # standard example S_3
3
"""

from __future__ import annotations

import random
import time
from dataclasses import dataclass, field

#: largest incomparability graph (pairs) built for the exact dimension-2 test of one part
MAX_INCOMPARABLE_PAIRS = 3_000_000


@dataclass
class Dimension:
    """Result of :func:`dimension`.

    ``status``: ``"exact"`` (``value`` is the dimension, ``realizer`` has ``value`` linear
    orders, bottom first) or ``"bounded"`` (``value`` None; ``lower`` ≤ dimension ≤ ``upper``;
    ``realizer``, when present, has ``upper`` orders and proves the upper bound, otherwise the
    upper bound comes from the theorems cited in the module doc).
    ``witness``: items of a sub-order whose dimension is at least ``witness_lower`` (the lower
    bound's certificate when that is ≥ 3), ``witness_chain`` a forcing chain in its
    incomparability graph (Γ steps, see :mod:`satorder.forcing`) when ``witness_lower`` is 3.
    """

    status: str
    lower: int
    upper: int
    realizer: list[list[int]] | None = None
    witness: list[int] | None = None
    witness_lower: int | None = None
    witness_chain: list | None = None
    notes: list[str] = field(default_factory=list)
    stats: dict = field(default_factory=dict)

    @property
    def value(self) -> int | None:
        return self.lower if self.status == "exact" else None

    def to_json(self, names: list[str]) -> dict:
        doc = {
            "dimension_status": self.status,
            "dimension_bounds": [self.lower, self.upper],
            "realizer": None if self.realizer is None
            else [[names[i] for i in lin] for lin in self.realizer],
        }
        if self.witness is not None:
            doc["dimension_witness"] = {"items": [names[i] for i in self.witness],
                                        "dimension_at_least": self.witness_lower}
        if self.notes:
            doc["dimension_notes"] = self.notes
        return doc


# ---------------------------------------------------------------- series / parallel splitting

def _components(items: list[int], succ, pred, mark: list[int], tag: int) -> list[list[int]]:
    """Connected components of the comparability graph induced on ``items``
    (``mark[x] == tag`` exactly for members)."""
    seen = set()
    comps = []
    for x in items:
        if x in seen:
            continue
        seen.add(x)
        comp = [x]
        stack = [x]
        while stack:
            v = stack.pop()
            for nb in (succ[v], pred[v]):
                for u in nb:
                    if mark[u] == tag and u not in seen:
                        seen.add(u)
                        comp.append(u)
                        stack.append(u)
        comps.append(comp)
    return comps


def _co_components(items: list[int], succ, pred, mark: list[int], tag: int) -> list[list[int]]:
    """Connected components of the complement of the induced comparability graph, without
    building it: each step keeps only the unvisited items adjacent to the current one."""
    unvisited = set(items)
    comps = []
    while unvisited:
        x = unvisited.pop()
        comp = [x]
        stack = [x]
        while stack:
            v = stack.pop()
            keep = {u for u in succ[v] if u in unvisited}
            keep.update(u for u in pred[v] if u in unvisited)
            found = unvisited - keep
            unvisited = keep
            comp.extend(found)
            stack.extend(found)
        comps.append(comp)
    return comps


def _hiraguchi(n: int) -> int:
    return n if n <= 1 else max(2, n // 2)


# ---------------------------------------------------------------- dimension ≤ 2 on one part

def _local(succ, items):
    """Sub-order on ``items`` with local ids 0..k-1 (successor sets restricted)."""
    index = {x: i for i, x in enumerate(items)}
    return [{index[y] for y in succ[x] if y in index} for x in items]


def _incomparability_adj(sub: list[set[int]]) -> list[set[int]]:
    k = len(sub)
    comp = [set(s) for s in sub]
    for a, s in enumerate(sub):
        for b in s:
            comp[b].add(a)
    everything = set(range(k))
    return [everything - comp[a] - {a} for a in range(k)]


def conjugate_realizer(sub: list[set[int]]):
    """Two linear orders realizing ``sub`` (local ids), or the forcing chain showing that its
    incomparability graph has no transitive orientation (dimension ≥ 3).

    Returns ``(realizer, None)`` or ``(None, chain)``.
    """
    from satorder.graph.forcing import transitive_orientation

    k = len(sub)
    inc = _incomparability_adj(sub)
    res = transitive_orientation(inc)
    if not res.orientable:
        return None, res.chain
    below = [0] * k
    for s in sub:
        for b in s:
            below[b] += 1
    q_before = [0] * k
    q_after = [0] * k
    for a, b in res.arcs():
        q_before[b] += 1
        q_after[a] += 1
    pos1 = [below[x] + q_before[x] for x in range(k)]
    pos2 = [below[x] + q_after[x] for x in range(k)]
    l1, l2 = [0] * k, [0] * k
    for x in range(k):
        l1[pos1[x]] = x
        l2[pos2[x]] = x
    return [l1, l2], None


def _is_two_dimensional(sub: list[set[int]]) -> bool:
    from satorder.graph.forcing import transitive_orientation

    return transitive_orientation(_incomparability_adj(sub)).orientable


def shrink_witness(succ, items: list[int], max_items: int = 400, max_tests: int = 40
                   ) -> list[int]:
    """Drop items while the sub-order keeps dimension ≥ 3: chunks of halving size, then single
    items (ddmin style).  The result is minimal (no single item can be dropped) unless the
    budget of ``max_tests`` dimension-2 tests runs out first; ``items`` with more than
    ``max_items`` members are returned unchanged."""
    if len(items) > max_items:
        return items
    cur = list(items)
    chunk = max(1, len(cur) // 2)
    tests = 0
    while True:
        i = 0
        while i < len(cur):
            trial = cur[:i] + cur[i + chunk:]
            if tests >= max_tests:
                return cur
            tests += 1
            if len(trial) >= 6 and not _is_two_dimensional(_local(succ, trial)):
                cur = trial
            else:
                i += chunk
        if chunk == 1:
            return cur
        chunk = max(1, chunk // 2)


def _witness_chain(succ, items):
    """Forcing chain (in item ids) in the incomparability graph of the sub-order on items."""
    from satorder.graph.forcing import ForcingStep

    _, chain = conjugate_realizer(_local(succ, items))
    return [ForcingStep((items[s.arc[0]], items[s.arc[1]]),
                        None if s.because is None else (items[s.because[0]], items[s.because[1]]))
            for s in chain]


def sample_witness(succ, pred, items: list[int], tries: int = 40, size: int = 120,
                   seconds: float = 5.0, seed: int = 0) -> list[int] | None:
    """Look for a sub-order of dimension ≥ 3 among small connected pieces of ``items``: a random
    breadth-first search that follows a few random neighbours of each item it reaches."""
    if len(items) <= 2 * size:  # small enough to test whole
        return None if _is_two_dimensional(_local(succ, items)) else list(items)
    rng = random.Random(seed)
    member = set(items)
    t_end = time.perf_counter() + seconds
    for _ in range(tries):
        if time.perf_counter() > t_end:
            break
        start = rng.choice(items)
        piece = [start]
        seen = {start}
        head = 0
        while head < len(piece) and len(piece) < size:
            v = piece[head]
            head += 1
            nb = [u for u in succ[v] if u in member] + [u for u in pred[v] if u in member]
            rng.shuffle(nb)
            for u in nb[:4]:
                if u not in seen and len(piece) < size:
                    seen.add(u)
                    piece.append(u)
        if len(piece) >= 6 and not _is_two_dimensional(_local(succ, piece)):
            return piece
    return None


# ---------------------------------------------------------------- large parts: refinement

def refine_conjugate(succ, pred, items: list[int], start: int):
    """Ordered vertex partitioning on the incomparability graph H of the part, driven by the
    comparability lists only (McConnell & Spinrad, "Ordered vertex partitioning", 2000).

    The ordered partition starts as ``({start}, rest)``, assuming ``start`` is a source of a
    transitive orientation of H.  Pivoting on ``x`` splits every other class ``Y`` into the
    items comparable to ``x`` (``B``) and those incomparable to it (``A``): ``B`` goes first
    when ``Y`` lies after ``x``'s class and last when before, since an H-arc ``a→b`` would
    force the missing H-arc between ``x`` and ``b``.  Each split costs the degree of the pivot
    in the comparability graph, so H is never built.  Returns the classes in order (singletons
    when the refinement resolved everything; a larger class is a module left unsplit).
    """
    member = set(items)
    cls = {x: 0 for x in items}
    members = {0: set(items)}
    label = {0: 0}
    nxt, prv = {0: None}, {0: None}
    counter = [1]
    gap = 1 << 40

    def relabel():
        c = next(k for k, v in prv.items() if v is None)
        k = 0
        while c is not None:
            label[c] = k
            k += gap
            c = nxt[c]

    def insert(c, before_of=None, after_of=None):
        if before_of is not None:
            p, q = prv[before_of], before_of
        else:
            p, q = after_of, nxt[after_of]
        lo = label[p] if p is not None else label[q] - 2 * gap
        hi = label[q] if q is not None else label[p] + 2 * gap
        prv[c], nxt[c] = p, q
        if p is not None:
            nxt[p] = c
        if q is not None:
            prv[q] = c
        label[c] = (lo + hi) // 2
        if hi - lo < 4:
            relabel()

    def new_class(ys, base, first):
        c = counter[0]
        counter[0] += 1
        members[c] = set(ys)
        members[base] -= members[c]
        for y in ys:
            cls[y] = c
        if first:
            insert(c, before_of=base)
        else:
            insert(c, after_of=base)
        return c

    # initial split: {start} before everything else
    members[0].discard(start)
    c = counter[0]
    counter[0] += 1
    members[c] = {start}
    cls[start] = c
    insert(c, before_of=0)

    queue = [start]
    queued = {start}
    done_round = False
    while True:
        while queue:
            x = queue.pop()
            queued.discard(x)
            cx = cls[x]
            touched: dict[int, list[int]] = {}
            for nb in (succ[x], pred[x]):
                for y in nb:
                    if y in member:
                        cy = cls[y]
                        if cy != cx:
                            touched.setdefault(cy, []).append(y)
            for cy, ys in touched.items():
                if len(ys) == len(members[cy]):
                    continue
                c2 = new_class(ys, cy, first=label[cy] > label[cx])
                small = c2 if len(members[c2]) <= len(members[cy]) else cy
                for z in members[small]:
                    if z not in queued:
                        queued.add(z)
                        queue.append(z)
        if done_round or all(len(m) == 1 for m in members.values() if m):
            break
        # one full round of pivots catches splits the smaller-half rule may have skipped
        done_round = True
        queue = [x for x in items if x not in queued]
        queued.update(queue)
    out = []
    c = next(k for k, v in prv.items() if v is None)
    while c is not None:
        if members[c]:
            out.append(sorted(members[c]))
        c = nxt[c]
    return out


def _positions_from_conjugate(succ, pred, items, line):
    """Realizer ``(L1, L2)`` of the part from a line ordering its incomparable pairs by a
    candidate conjugate order Q: ``L1 = P ∪ Q``, ``L2 = P ∪ Q⁻¹`` (Dushnik & Miller 1941)."""
    idx = {x: i for i, x in enumerate(line)}
    member = idx
    k = len(line)
    l1, l2 = [None] * k, [None] * k
    for x in line:
        i = idx[x]
        below = sum(1 for y in pred[x] if y in member)
        comp_before = sum(1 for nb in (succ[x], pred[x]) for y in nb
                          if y in member and idx[y] < i)
        comp_after = sum(1 for nb in (succ[x], pred[x]) for y in nb
                         if y in member and idx[y] > i)
        p1 = below + i - comp_before
        p2 = below + (k - 1 - i) - comp_after
        if not (0 <= p1 < k and 0 <= p2 < k) or l1[p1] is not None or l2[p2] is not None:
            return None
        l1[p1] = x
        l2[p2] = x
    return [l1, l2]


def _accept(succ, items, realizer, sub=None) -> bool:
    """Does the candidate realize the part?  (The independent realizer check, used here only
    to decide whether to claim the answer.)"""
    from satorder.certify.measure import check_realizer
    from satorder.errors import CertificateError

    index = {x: i for i, x in enumerate(items)}
    if sub is None:
        sub = _local(succ, items)
    try:
        check_realizer(sub, [[index[x] for x in lin] for lin in realizer])
    except CertificateError:
        return False
    return True


def large_part_realizer(succ, pred, items, sat_limit, deadline, notes, tries: int = 4):
    """Try to realize a large part with two orders by ordered vertex partitioning.

    The refinement is run from a first item; the last item of its outcome is then taken as the
    start (M&S's choice of a source), then the first one, then a few minimal items.  Classes
    left unsplit are modules: each is realized on its own (recursively) and laid out in its
    first order.  Returns a verified 2-realizer or ``None`` (nothing proven either way).
    """
    rng = random.Random(len(items))
    member = set(items)
    minimal = [x for x in items if not any(y in member for y in pred[x])]
    starts = [items[0]]
    tried = set()
    while starts and len(tried) < tries:
        v = starts.pop(0)
        if v in tried:
            continue
        tried.add(v)
        classes = refine_conjugate(succ, pred, items, v)
        if len(tried) == 1:
            starts = [classes[-1][0], classes[0][0]] + rng.sample(minimal, min(3, len(minimal)))
        line = []
        ok = True
        for c in classes:
            if len(c) == 1:
                line.extend(c)
                continue
            if not _is_module(succ, pred, c, member):
                ok = False
                break
            sub = dimension_of_items(succ, c, sat_limit, deadline)
            if sub.realizer is None or len(sub.realizer) > 2:
                ok = False
                break
            line.extend(sub.realizer[0])
        if not ok:
            continue
        real = _positions_from_conjugate(succ, pred, items, line)
        if real is not None and _accept(succ, items, real):
            return real
    return None


def _is_module(succ, pred, group, member) -> bool:
    """Every item of the part outside ``group`` is above all of it, below all, or unrelated
    to all (so ``group`` can be realized on its own and substituted)."""
    inside = set(group)
    first = group[0]
    up = {y for y in succ[first] if y in member and y not in inside}
    down = {y for y in pred[first] if y in member and y not in inside}
    for x in group[1:]:
        if {y for y in succ[x] if y in member and y not in inside} != up:
            return False
        if {y for y in pred[x] if y in member and y not in inside} != down:
            return False
    return True


def dimension_of_items(succ, items, sat_limit=40, deadline=None):
    """:func:`dimension` of the sub-order on ``items``, answers in item ids."""
    sub = _local(succ, items)
    left = None if deadline is None else max(0.1, deadline - time.perf_counter())
    d = dimension(sub, sat_limit=sat_limit, time_limit=left)
    if d.realizer is not None:
        d.realizer = [[items[i] for i in lin] for lin in d.realizer]
    return d


# ---------------------------------------------------------------- upper bounds by construction

#: largest part for which a realizer is built greedily to bound the dimension from above
GREEDY_LIMIT = 500


def critical_pairs(sub: list[set[int]]) -> list[tuple[int, int]]:
    """Pairs ``(a, b)`` of incomparable items with everything below ``a`` below ``b`` and
    everything above ``b`` above ``a``.  A family of linear extensions realizes the order as
    soon as each of these pairs has ``b`` before ``a`` in one of them (Trotter, *Combinatorics
    and Partially Ordered Sets*, 1992; from memory — the realizer check counts pairs anyway)."""
    n = len(sub)
    up = [0] * n
    down = [0] * n
    for a, s in enumerate(sub):
        for b in s:
            up[a] |= 1 << b
            down[b] |= 1 << a
    out = []
    for a in range(n):
        comp_a = up[a] | down[a] | (1 << a)
        for b in range(n):
            if a != b and not comp_a >> b & 1:
                if down[a] & ~down[b] == 0 and up[b] & ~up[a] == 0:
                    out.append((a, b))
    return out


def greedy_realizer(sub: list[set[int]], seed: int = 0, max_orders: int | None = None,
                    deadline: float | None = None):
    """Linear extensions built one at a time, each reversing as many not yet reversed critical
    pairs as it can (pairs tried in random order, kept when they close no cycle; the order is
    kept transitively closed as bitsets).  Returns the list of orders (local ids), or ``None``
    when more than ``max_orders`` would be needed or the ``deadline`` passes."""
    n = len(sub)
    rng = random.Random(seed)
    todo = critical_pairs(sub)
    base_up = [0] * n
    for a, s in enumerate(sub):
        for b in s:
            base_up[a] |= 1 << b
    base_down = [0] * n
    for a in range(n):
        x = base_up[a]
        while x:
            low = x & -x
            base_down[low.bit_length() - 1] |= 1 << a
            x ^= low
    realizer = []
    while todo:
        if max_orders is not None and len(realizer) >= max_orders:
            return None
        if deadline is not None and time.perf_counter() > deadline:
            return None
        up, down = list(base_up), list(base_down)
        rng.shuffle(todo)
        for a, b in todo:  # want b before a
            if up[a] >> b & 1:
                continue
            new_up = up[a] | (1 << a)
            new_down = down[b] | (1 << b)
            x = new_down
            while x:
                low = x & -x
                up[low.bit_length() - 1] |= new_up
                x ^= low
            x = new_up
            while x:
                low = x & -x
                down[low.bit_length() - 1] |= new_down
                x ^= low
        # any linear extension of the grown order: sort by the number of items below
        lin = sorted(range(n), key=lambda v: (bin(down[v]).count("1"), v))
        pos = [0] * n
        for i, v in enumerate(lin):
            pos[v] = i
        todo = [(a, b) for a, b in todo if not pos[b] < pos[a]]
        realizer.append(lin)
    return realizer or [sorted(range(n), key=lambda v: (len(sub[v]) * -1, v))]


def _greedy_bound(sub, items, upper, tries=3, seconds=10.0):
    """Best greedy realizer over a few seeds (within ``seconds``), in item ids, or ``None``."""
    if len(items) > GREEDY_LIMIT:
        return None
    best = None
    deadline = time.perf_counter() + seconds
    for seed in range(tries):
        r = greedy_realizer(sub, seed, max_orders=upper if best is None else len(best) - 1,
                            deadline=deadline)
        if r is not None and (best is None or len(r) < len(best)):
            best = r
    if best is None or not _accept(None, items, [[items[i] for i in lin] for lin in best],
                                   sub=sub):
        return None
    return [[items[i] for i in lin] for lin in best]


# ---------------------------------------------------------------- SAT for dimension ≥ 3

def sat_realizer(sub: list[set[int]], k: int, time_limit: float | None = None):
    """``k`` linear orders realizing ``sub`` (local ids), ``None`` if there are none, or
    ``"unknown"`` when the time limit ran out.

    Encoding: ``x[i][a,b]`` (a < b as ids) true when a comes before b in the i-th order; unit
    clauses fix every ordered pair of ``sub``; two clauses per item triple and order keep each
    order transitive; each incomparable pair is put one way in some order and the other way in
    another.  The first incomparable pair is fixed both ways in orders 1 and 2 (symmetry).
    """
    import threading

    from pysat.solvers import Solver

    n = len(sub)
    var = {}
    nxt = 1
    for i in range(k):
        for a in range(n):
            for b in range(a + 1, n):
                var[i, a, b] = nxt
                nxt += 1

    def before(i, a, b):
        return var[i, a, b] if a < b else -var[i, b, a]

    clauses = []
    for a in range(n):
        for b in sub[a]:
            for i in range(k):
                clauses.append([before(i, a, b)])
    for i in range(k):
        for a in range(n):
            for b in range(a + 1, n):
                for c in range(b + 1, n):
                    # no 3-cycle a→b→c→a nor a→c→b→a
                    clauses.append([-before(i, a, b), -before(i, b, c), -before(i, c, a)])
                    clauses.append([-before(i, a, c), -before(i, c, b), -before(i, b, a)])
    first = None
    for a in range(n):
        for b in range(a + 1, n):
            if b not in sub[a] and a not in sub[b]:
                clauses.append([var[i, a, b] for i in range(k)])
                clauses.append([-var[i, a, b] for i in range(k)])
                if first is None:
                    first = (a, b)
    if first is not None and k >= 2:
        clauses.append([var[0, first[0], first[1]]])
        clauses.append([-var[1, first[0], first[1]]])
    with Solver(name="cadical195", bootstrap_with=clauses) as s:
        timer = None
        if time_limit is not None:
            timer = threading.Timer(time_limit, s.interrupt)
            timer.start()
        try:
            ok = s.solve_limited(expect_interrupt=True) if timer else s.solve()
        finally:
            if timer:
                timer.cancel()
        if ok is None:
            return "unknown"
        if not ok:
            return None
        model = set(lit for lit in s.get_model() if lit > 0)
    realizer = []
    for i in range(k):
        ahead = [0] * n  # items placed before a
        for a in range(n):
            for b in range(a + 1, n):
                if var[i, a, b] in model:
                    ahead[b] += 1
                else:
                    ahead[a] += 1
        lin = [0] * n
        for a in range(n):
            lin[ahead[a]] = a
        realizer.append(lin)
    return realizer


# ---------------------------------------------------------------- one part, then the whole

@dataclass
class _Part:
    lower: int
    upper: int
    realizer: list[list[int]] | None  # item ids; ``upper`` orders when present
    witness: list[int] | None = None
    witness_lower: int | None = None


def _bounded(succ, items, lower, upper, witness, witness_lower, sub=None,
             deadline=None) -> _Part:
    """A part known only within bounds: try a greedy realizer to lower the upper bound (it
    settles the dimension when it has ``lower`` orders), for at most 10 s and never past the
    ``deadline``."""
    seconds = 10.0 if deadline is None else min(10.0, deadline - time.perf_counter())
    if len(items) <= GREEDY_LIMIT and seconds > 0:
        r = _greedy_bound(sub if sub is not None else _local(succ, items), items, upper,
                          seconds=seconds)
        if r is not None:
            return _Part(lower, len(r), r, witness, witness_lower)
    return _Part(lower, upper, None, witness, witness_lower)


def _part_width(succ, items):
    from satorder.measure.figures import width

    return width(succ if len(items) == len(succ) else _local(succ, items)).value


def _solve_part(succ, pred, items, sat_limit, deadline, notes) -> _Part:
    k = len(items)
    if k == 1:
        return _Part(1, 1, [list(items)])
    member = set(items)
    pairs = sum(len(succ[x] & member) for x in items)
    incomparable = k * (k - 1) // 2 - pairs
    if incomparable > MAX_INCOMPARABLE_PAIRS:
        # a quick look for a small sub-order of dimension >= 3 first: when one exists the
        # refinement below cannot succeed
        found = sample_witness(succ, pred, items, tries=20, seconds=3.0)
        if found is None:
            real = large_part_realizer(succ, pred, items, sat_limit, deadline, notes)
            if real is not None:
                return _Part(2, 2, real)
            found = sample_witness(succ, pred, items, seed=1)
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
        return _Part(2, 2, [[items[i] for i in lin] for lin in real])
    wit = sorted({x for s in chain for x in (s.arc + (s.because or ()))})
    wit = shrink_witness(succ, [items[i] for i in wit])
    upper = min(_part_width(succ, items), _hiraguchi(k))
    if k > sat_limit:
        if k <= 3 * sat_limit:
            # the witness proves ≥ 3; three orders found within a short budget settle it
            left = 5.0 if deadline is None else min(5.0, deadline - time.perf_counter())
            r = sat_realizer(sub, 3, max(0.1, left)) if left > 0 else "unknown"
            if isinstance(r, list):
                return _Part(3, 3, [[items[i] for i in lin] for lin in r], wit, 3)
            if r is None and upper >= 4 and k <= 60:  # proven: no 3 orders (checkable size)
                part = _bounded(succ, items, 4, upper, list(items), 4, sub, deadline)
                notes.append(f"a part of {k} items has dimension ≥ 4 and more than "
                             f"{sat_limit} items (the SAT limit); dimension bounded")
                return part
        part = _bounded(succ, items, 3, max(3, upper), wit, 3, sub, deadline)
        if part.upper > 3:
            notes.append(f"a part of {k} items has dimension ≥ 3 and more than {sat_limit} "
                         "items (the SAT limit); dimension bounded")
        return part
    for d in range(3, upper + 1):
        left = None if deadline is None else max(0.1, deadline - time.perf_counter())
        r = sat_realizer(sub, d, left)
        if r == "unknown":
            notes.append(f"SAT search for a realizer of size {d} ran out of time on a part of "
                         f"{k} items")
            return _bounded(succ, items, d, upper, list(items) if d > 3 else wit, d, sub,
                            deadline)
        if r is not None:
            return _Part(d, d, [[items[i] for i in lin] for lin in r],
                         list(items) if d > 3 else wit, d)
    raise AssertionError("no realizer within the proven upper bound")  # pragma: no cover


def dimension(succ: list[set[int]], sat_limit: int = 40,
              time_limit: float | None = 60.0) -> Dimension:
    """The dimension of an order, with a realizer when exact (see module doc)."""
    t0 = time.perf_counter()
    n = len(succ)
    if n == 0:
        return Dimension("exact", 0, 0, [])
    pred: list[set[int]] = [set() for _ in range(n)]
    for a, s in enumerate(succ):
        for b in s:
            pred[b].add(a)

    deadline = None if time_limit is None else t0 + time_limit
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
    part: _Part = root["part"]
    exact = part.realizer is not None and len(part.realizer) == part.lower
    dim = Dimension("exact" if exact else "bounded", part.lower, part.upper,
                    part.realizer, part.witness, part.witness_lower, notes=notes)
    if dim.witness is not None and dim.witness_lower == 3:
        dim.witness_chain = _witness_chain(succ, dim.witness)
    dim.stats = {**counts, "seconds": round(time.perf_counter() - t0, 4)}
    return dim


def _pad(realizer, d):
    return realizer + [realizer[-1]] * (d - len(realizer))


def _join(node):
    parts: list[_Part] = [c["part"] for c in node["children"]]
    parallel = node["kind"] == "parallel"
    least = 2 if parallel else 1
    lower = max([least] + [p.lower for p in parts])
    upper = max([least] + [p.upper for p in parts])
    wit = max((p for p in parts if p.witness is not None), key=lambda p: p.witness_lower,
              default=None)
    realizer = None
    if all(p.realizer is not None for p in parts):
        d = max([least] + [len(p.realizer) for p in parts])
        rs = [_pad(p.realizer, d) for p in parts]
        realizer = []
        for i in range(d):
            seq = rs[::-1] if (parallel and i == 1) else rs
            realizer.append([x for r in seq for x in r[i]])
        upper = d
    node["part"] = _Part(lower, upper, realizer,
                         None if wit is None else wit.witness,
                         None if wit is None else wit.witness_lower)
    node.pop("children")
