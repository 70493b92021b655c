"""Large parts: ordered vertex partitioning (McConnell & Spinrad 2000) on the incomparability
graph, driven by the comparability lists alone, proposes a conjugate order; the two linear
orders it gives are kept only when they pass the realizer check.
"""

from __future__ import annotations

import random

from satorder.measure.dimension.realizer import realizes
from satorder.measure.dimension.split import _is_module, _local


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
    """Does the candidate realize the part?  Decides whether the search may claim it; the
    answer is certified again later by :mod:`satorder.certify.measure`."""
    index = {x: i for i, x in enumerate(items)}
    if sub is None:
        sub = _local(succ, items)
    return realizes(sub, [[index[x] for x in lin] for lin in realizer])


def large_part_realizer(succ, pred, items, sat_limit, deadline, notes, realize,
                        tries: int = 4):
    """Try to realize a large part with two orders by ordered vertex partitioning.

    The refinement is run from a first item; the last item of its outcome is then taken as the
    start (M&S's choice of a source), then the first one, then a few minimal items.  Classes
    left unsplit are modules: each is realized on its own (recursively) and laid out in its
    first order; ``realize(succ, items, sat_limit, deadline)`` is the dimension search for a
    sub-order (passed in by :mod:`.search`).  Returns a checked 2-realizer or ``None``
    (nothing proven either way).
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
            sub = realize(succ, c, sat_limit, deadline)
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
