"""Independent checks for the figures of :mod:`satorder.measure` and
:mod:`satorder.measure.dimension`.

Written apart from the code that finds the figures and sharing none of it: each figure is
confirmed from its witness and its dual certificate only, using the order's successor sets.
Every check raises :class:`~satorder.errors.CertificateError` naming what is wrong.

* height h: a chain of h items, and a partition of all items into h antichains (Mirsky 1971:
  a chain meets each antichain at most once, so both are optimal);
* width w: an antichain of w items, and a partition of all items into w chains (Dilworth 1950);
* maximum-weight chain H: the chain, and potentials ``s ≥ 0`` with ``s(y) ≥ s(x) + w(x)`` for
  every ``x < y`` and ``s(x) + w(x) ≤ H`` (so no chain weighs more than H);
* maximum-weight antichain A: the antichain, and a flow on ordered pairs with at most ``w(x)``
  leaving and at most ``w(x)`` entering each item, of value ``W − w(A)`` (its units string the
  items' weight copies into ``W − |f|`` chains, which an antichain meets once each);
* Hasse diagram: exactly the ordered pairs with nothing between them;
* linear extension and realizer: permutations extending the order; a realizer's orders agree
  on exactly as many pairs as the order has (counted in O(n log n) for two orders), so their
  intersection is the order;
* dimension lower bounds: ≥ 2 unless the order is a chain; ≥ 3 by a sub-order whose
  incomparability graph is not a comparability graph (brute force over its linear extensions
  when small, else a Γ forcing chain checked by :func:`satorder.certify.chain.check_forcing_chain`);
  ≥ d ≥ 4 by re-solving "d − 1 orders realize the sub-order" with an encoding and SAT solver
  of this module's own, or by d incomparable pairs that pairwise form alternating cycles of
  length two (:func:`check_two_cycle_pairs`).
"""

from __future__ import annotations

import itertools

import numpy as np

from satorder.errors import CertificateError


def _preds(succ):
    pred = [set() for _ in succ]
    for a, s in enumerate(succ):
        for b in s:
            pred[b].add(a)
    return pred


def check_chain(succ, chain, what="chain") -> None:
    """Consecutive items strictly increase (the order is transitive, so it is a chain)."""
    if len(set(chain)) != len(chain):
        raise CertificateError(f"{what} repeats an item")
    for a, b in zip(chain, chain[1:]):
        if b not in succ[a]:
            raise CertificateError(f"{what}: item {a} is not below item {b}")


def check_antichain(succ, items, what="antichain") -> None:
    s = set(items)
    if len(s) != len(items):
        raise CertificateError(f"{what} repeats an item")
    for a in items:
        if not succ[a].isdisjoint(s):
            b = next(iter(succ[a] & s))
            raise CertificateError(f"{what}: items {a} < {b} are comparable")


def check_partition(n, parts, what) -> None:
    seen = [False] * n
    for p in parts:
        for x in p:
            if not 0 <= x < n or seen[x]:
                raise CertificateError(f"{what}: item {x} is missing from the order or repeated")
            seen[x] = True
    if not all(seen):
        raise CertificateError(f"{what}: item {seen.index(False)} is not covered")


def _check_dual(succ, fig, figure, one, many, check_one, check_many) -> None:
    """A figure with a witness (``one``) and a partition of every item into as many parts of
    the other kind (``many``): the witness meets each part at most once, so both are optimal."""
    v = fig.value
    if len(fig.witness) != v or len(fig.partition) != v:
        raise CertificateError(f"{figure} {v}: {one} has {len(fig.witness)} items, partition "
                               f"{len(fig.partition)} {many}s")
    check_one(succ, fig.witness, one)
    check_partition(len(succ), fig.partition, f"{many} partition")
    for k, part in enumerate(fig.partition):
        check_many(succ, part, f"{many} {k} of the partition")


def check_height(succ, fig) -> None:
    """A longest chain and a partition into as many antichains (Mirsky 1971)."""
    _check_dual(succ, fig, "height", "longest chain", "antichain", check_chain, check_antichain)


def check_width(succ, fig) -> None:
    """A largest antichain and a partition into as many chains (Dilworth 1950)."""
    _check_dual(succ, fig, "width", "largest antichain", "chain", check_antichain, check_chain)


def check_weighted_chain(succ, weights, fig) -> None:
    top = fig.value
    check_chain(succ, fig.witness, "maximum-weight chain")
    if sum(weights[x] for x in fig.witness) != top:
        raise CertificateError("maximum-weight chain: its weight differs from the figure")
    s = fig.potentials
    for x, sx in enumerate(succ):
        if s[x] < 0 or s[x] + weights[x] > top:
            raise CertificateError(f"potential of item {x} out of range")
        for y in sx:
            if s[y] < s[x] + weights[x]:
                raise CertificateError(f"potentials do not increase along {x} < {y}")


def check_weighted_antichain(succ, weights, fig) -> None:
    check_antichain(succ, fig.witness, "maximum-weight antichain")
    if sum(weights[x] for x in fig.witness) != fig.value:
        raise CertificateError("maximum-weight antichain: its weight differs from the figure")
    n = len(succ)
    out = [0] * n
    inn = [0] * n
    total = 0
    for x, y, f in fig.flow:
        if y not in succ[x] or f <= 0:
            raise CertificateError(f"flow on {x}, {y} is not a positive flow on an ordered pair")
        out[x] += f
        inn[y] += f
        total += f
    for x in range(n):
        if out[x] > weights[x] or inn[x] > weights[x]:
            raise CertificateError(f"flow through item {x} exceeds its weight")
    if sum(weights) - total != fig.value:
        raise CertificateError("flow value does not match the antichain's weight")


def check_hasse(succ, hasse) -> None:
    pred = _preds(succ)
    got = set(hasse)
    if len(got) != len(hasse):
        raise CertificateError("Hasse diagram repeats a pair")
    for a, sa in enumerate(succ):
        # only items above a that have something above them can lie strictly between
        middle = {c for c in sa if succ[c]}
        for b in sa:
            covers = middle.isdisjoint(pred[b])
            if covers != ((a, b) in got):
                where = "missing from" if covers else "in"
                raise CertificateError(f"pair {a} < {b} is wrongly {where} the Hasse diagram")
    for a, b in got:
        if b not in succ[a]:
            raise CertificateError(f"Hasse pair {a}, {b} is not an ordered pair")


def _positions(n, lin, what):
    if len(lin) != n or sorted(lin) != list(range(n)):
        raise CertificateError(f"{what} is not a permutation of the items")
    pos = np.empty(n, dtype=np.int64)
    pos[np.asarray(lin, dtype=np.int64)] = np.arange(n)
    return pos


def check_linear_extension(succ, lin, what="linear extension"):
    pos = _positions(len(succ), lin, what)
    at = pos.tolist()
    for a, sa in enumerate(succ):
        pa = at[a]
        for b in sa:
            if pa > at[b]:
                raise CertificateError(f"{what} puts {b} before {a} though {a} < {b}")
    return pos


def _inversions(seq) -> int:
    """Number of pairs i < j with seq[i] > seq[j], for a permutation of 0..n-1 (Fenwick tree)."""
    n = len(seq)
    tree = [0] * (n + 1)
    count = 0
    for seen, v in enumerate(seq.tolist()):
        # items already seen that are larger than v
        i, smaller = v + 1, 0
        while i > 0:
            smaller += tree[i]
            i -= i & -i
        count += seen - smaller
        i = v + 1
        while i <= n:
            tree[i] += 1
            i += i & -i
    return count


def agreeing_pairs(positions: list[np.ndarray]) -> int:
    """Unordered pairs {x, y} put the same way by every order (positions per order)."""
    n = len(positions[0])
    if n < 2:
        return 0
    if len(positions) == 1:
        return n * (n - 1) // 2
    if len(positions) == 2:
        seq = positions[1][np.argsort(positions[0])]
        return n * (n - 1) // 2 - _inversions(seq)
    total = 0
    pos = np.stack(positions)  # k × n
    for lo in range(0, n, 512):
        block = pos[:, lo:lo + 512]  # k × B
        ahead = np.ones((block.shape[1], n), dtype=bool)
        for i in range(len(positions)):
            ahead &= block[i][:, None] < pos[i][None, :]
        total += int(ahead.sum())
    return total


def check_realizer(succ, realizer) -> None:
    """Each order extends ``succ`` and together they agree exactly on its ordered pairs."""
    if not realizer:
        if succ:
            raise CertificateError("empty realizer for a non-empty order")
        return
    pos = [check_linear_extension(succ, lin, f"realizer order {i + 1}")
           for i, lin in enumerate(realizer)]
    pairs = sum(len(s) for s in succ)
    agree = agreeing_pairs(pos)
    if agree != pairs:
        raise CertificateError(f"the realizer's orders agree on {agree} pairs, the order has "
                               f"{pairs}: their intersection is larger than the order")


# ---------------------------------------------------------------- dimension lower bounds

def _sub(succ, items):
    index = {x: i for i, x in enumerate(items)}
    return [{index[y] for y in succ[x] if y in index} for x in items]


def _two_dimensional_brute(sub) -> bool:
    """Some linear extension L1 whose 'conjugate' (order pairs kept, other pairs reversed) is
    again a linear order, tried over every permutation."""
    n = len(sub)
    for perm in itertools.permutations(range(n)):
        pos = [0] * n
        for i, x in enumerate(perm):
            pos[x] = i
        if any(pos[a] > pos[b] for a in range(n) for b in sub[a]):
            continue

        def before2(x, y, pos=pos):
            if y in sub[x]:
                return True
            if x in sub[y]:
                return False
            return pos[y] < pos[x]

        if all(not (before2(x, y) and before2(y, z)) or before2(x, z)
               for x in range(n) for y in range(n) for z in range(n)
               if x != y and y != z and x != z):
            return True
    return False


def _two_cycle_clique(sub) -> list[tuple[int, int]]:
    """Ordered incomparable pairs ``(a, b)`` that pairwise form alternating two-cycles
    (``a ≤ d`` and ``c ≤ b`` for any two ``(a, b)``, ``(c, d)``), grown greedily: no linear
    extension puts ``b`` before ``a`` for two of them (see :func:`check_two_cycle_pairs`)."""
    n = len(sub)
    le = np.eye(n, dtype=bool)
    for a, s in enumerate(sub):
        le[a, list(s)] = True
    a, b = np.nonzero(~(le | le.T))
    if not len(a):
        return []
    m = le[np.ix_(a, b)]
    conflict = m & m.T
    cand = np.arange(len(a))
    clique = []
    while len(cand):
        best = int(cand[int(np.argmax(conflict[np.ix_(cand, cand)].sum(axis=1)))])
        clique.append((int(a[best]), int(b[best])))
        cand = cand[conflict[best, cand]]
    return clique


def _realizable(sub, k) -> bool:
    """Do ``k`` linear orders realize ``sub``?  Encoding over ordered pairs (both directions
    as variables, exactly one true), transitivity over ordered triples; Glucose 4.  Symmetry
    is broken by a clique of pairwise two-cycles: its pairs need distinct orders, so the i-th
    pair may be taken to be reversed in the i-th order (and more pairs than orders settle it).
    """
    from pysat.solvers import Solver

    n = len(sub)
    clique = _two_cycle_clique(sub)
    if len(clique) > k:
        return False
    ids = {}
    for i in range(k):
        for x in range(n):
            for y in range(n):
                if x != y:
                    ids[i, x, y] = len(ids) + 1
    cl = []
    for i in range(k):
        for x in range(n):
            for y in range(x + 1, n):
                cl.append([ids[i, x, y], ids[i, y, x]])
                cl.append([-ids[i, x, y], -ids[i, y, x]])
        for x, y, z in itertools.permutations(range(n), 3):
            cl.append([-ids[i, x, y], -ids[i, y, z], ids[i, x, z]])
    for x in range(n):
        for y in range(n):
            if x == y:
                continue
            if y in sub[x]:
                cl.extend([ids[i, x, y]] for i in range(k))
            elif x not in sub[y]:
                cl.append([ids[i, x, y] for i in range(k)])
    for i, (x, y) in enumerate(clique):
        cl.append([ids[i, y, x]])
    with Solver(name="glucose4", bootstrap_with=cl) as s:
        return s.solve()


def check_dimension_at_least(succ, items, bound, chain=None) -> None:
    """The sub-order on ``items`` has dimension at least ``bound``."""
    sub = _sub(succ, items)
    n = len(sub)
    pairs = sum(len(s) for s in sub)
    if bound <= 1:
        if bound == 1 and n == 0:
            raise CertificateError("an empty order has dimension 0")
        return
    if pairs == n * (n - 1) // 2:
        raise CertificateError("a chain has dimension 1")
    if bound == 2:
        return
    if bound == 3:
        if n <= 8:
            if _two_dimensional_brute(sub):
                raise CertificateError("the dimension-3 witness has a realizer of two orders")
            return
        if chain is None:
            raise CertificateError("a large dimension-3 witness needs a forcing chain")
        from satorder.certify.chain import check_forcing_chain
        from satorder.model.problem import Problem

        index = {x: i for i, x in enumerate(items)}
        inc = [(str(a), str(b)) for a in range(n) for b in range(a + 1, n)
               if b not in sub[a] and a not in sub[b]]
        prob = Problem.from_lists(comparable=inc, items=[str(i) for i in range(n)])
        steps = [((prob.index[str(index[s.arc[0]])], prob.index[str(index[s.arc[1]])]),
                  None if s.because is None else
                  (prob.index[str(index[s.because[0]])], prob.index[str(index[s.because[1]])]))
                 for s in chain]
        check_forcing_chain(prob, steps)
        return
    if n > 60:
        raise CertificateError(f"cannot confirm dimension ≥ {bound} on {n} items")
    if _realizable(sub, bound - 1):
        raise CertificateError(f"{bound - 1} orders realize the witness: dimension < {bound}")


def check_two_cycle_pairs(succ, pairs) -> None:
    """Dimension ≥ ``len(pairs)``: each ``(a, b)`` is an incomparable pair, and any two of them
    ``(a, b)``, ``(c, d)`` have ``a ≤ d`` and ``c ≤ b``.  A realizer puts ``b`` before ``a`` in
    some order for every pair; one linear extension doing so for two of them would have
    ``b < a ≤ d < c ≤ b``.  So the pairs need distinct orders (the argument behind the standard
    example's dimension, Dushnik & Miller 1941; alternating cycles, Trotter 1992, from memory).
    """
    def le(x, y):
        return x == y or y in succ[x]

    n = len(succ)
    for a, b in pairs:
        if not (0 <= a < n and 0 <= b < n) or a == b or le(a, b) or le(b, a):
            raise CertificateError(f"witness pair {a}, {b} is not an incomparable pair")
    for i, (a, b) in enumerate(pairs):
        for c, d in pairs[i + 1:]:
            if not (le(a, d) and le(c, b)):
                raise CertificateError(f"witness pairs ({a}, {b}) and ({c}, {d}) can be "
                                       "reversed together")


def check_dimension(succ, dim) -> None:
    """A :class:`satorder.measure.dimension.Dimension`: realizer (upper bound, when given) and
    witness
    (lower bound).  An upper bound without a realizer rests on the theorems cited in
    :mod:`satorder.measure.dimension` and is not checked here."""
    n = len(succ)
    if dim.lower > dim.upper:
        raise CertificateError("dimension lower bound exceeds the upper bound")
    if dim.status == "exact" and (dim.realizer is None or len(dim.realizer) != dim.lower):
        raise CertificateError("an exact dimension needs a realizer of that many orders")
    if dim.realizer is not None:
        if len(dim.realizer) != dim.upper:
            raise CertificateError("realizer size differs from the upper bound")
        check_realizer(succ, dim.realizer)
    pairs = getattr(dim, "witness_pairs", None)
    if dim.lower >= 3 and pairs is not None and len(pairs) >= dim.lower:
        check_two_cycle_pairs(succ, [tuple(p) for p in pairs])
    elif dim.lower >= 3:
        if dim.witness is None or (dim.witness_lower or 0) < dim.lower:
            raise CertificateError(f"dimension ≥ {dim.lower} claimed without a witness")
        check_dimension_at_least(succ, dim.witness, dim.lower, dim.witness_chain)
    else:
        check_dimension_at_least(succ, list(range(n)), dim.lower)


def check_measures(succ, m, weights=None) -> None:
    """Every figure of a :class:`satorder.measure.summary.Measures`; sets ``m.verified``."""
    check_height(succ, m.height)
    check_width(succ, m.width)
    check_hasse(succ, m.hasse)
    check_linear_extension(succ, m.linear_extension)
    check_dimension(succ, m.dimension)
    if m.weighted_chain is not None:
        wl = [(weights or {}).get(i, 1) for i in range(len(succ))]
        check_weighted_chain(succ, wl, m.weighted_chain)
        check_weighted_antichain(succ, wl, m.weighted_antichain)
    m.verified = True
