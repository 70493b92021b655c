"""Order dimension: brute force on small orders, published values (standard examples, Boolean
lattices), permutation orders, the disjoint-sum rule, bounded answers, and the checker."""

from __future__ import annotations

import itertools
import random
import time

import pytest
from order_reference import random_order

from satorder.certify.measure import check_dimension, check_dimension_at_least, check_realizer
from satorder.errors import CertificateError
from satorder.measure.dimension import conjugate, dimension, greedy, sat_realizer
from satorder.measure.dimension import search as dimension_module
from satorder.model.order import transitive_closure


def linear_extension_masks(succ):
    """Each linear extension as a bitmask over ordered pairs (x, y): bit set when x before y."""
    n = len(succ)
    masks = []
    for perm in itertools.permutations(range(n)):
        pos = {x: i for i, x in enumerate(perm)}
        if all(pos[a] < pos[b] for a in range(n) for b in succ[a]):
            masks.append(sum(1 << (x * n + y) for x in range(n) for y in range(n)
                             if x != y and pos[x] < pos[y]))
    return masks


def brute_dimension(succ):
    """Least k such that k linear extensions intersect to the order (tries every k-subset of
    linear extensions; common practice for tiny orders)."""
    n = len(succ)
    if n == 0:
        return 0
    target = sum(1 << (a * n + b) for a in range(n) for b in succ[a])
    masks = linear_extension_masks(succ)
    for k in range(1, n + 1):
        for combo in itertools.combinations(masks, k):
            m = combo[0]
            for c in combo[1:]:
                m &= c
            if m == target:
                return k
    raise AssertionError("unreachable")


def standard_example(k):
    """S_k: a_i < b_j exactly when i != j (items a_i = i, b_j = k + j)."""
    return [set(range(k, 2 * k)) - {k + i} for i in range(k)] + [set() for _ in range(k)]


def boolean_lattice(k):
    return [{b for b in range(1 << k) if a != b and a & b == a} for a in range(1 << k)]


def permutation_order(perm):
    """i < j in the order exactly when i < j and perm[i] < perm[j]."""
    n = len(perm)
    return [{j for j in range(i + 1, n) if perm[i] < perm[j]} for i in range(n)]


def test_dimension_matches_brute_force_on_random_small_orders():
    rng = random.Random(7)
    for _ in range(60):
        n = rng.randint(0, 6)
        succ = random_order(n, rng.random() * 0.8, rng)
        d = dimension(succ)
        assert d.status == "exact"
        assert d.value == brute_dimension(succ)
        check_dimension(succ, d)


def test_standard_example_has_dimension_n():
    # Dushnik & Miller (1941): the standard example S_n has dimension n
    for k in (3, 4, 5):
        succ = standard_example(k)
        d = dimension(succ)
        assert d.status == "exact" and d.value == k
        check_dimension(succ, d)  # realizer of k orders, and k − 1 refuted independently


def test_boolean_lattice_dimension():
    # the subsets of a k-set ordered by inclusion have dimension k (from memory); verified by
    # brute force for k <= 3 below, by SAT (and the checker's own SAT re-solve) for k = 4
    for k in (1, 2, 3):
        succ = boolean_lattice(k)
        assert brute_dimension(succ) == k
        assert dimension(succ).value == k
    succ = boolean_lattice(4)
    d = dimension(succ)
    assert d.value == 4
    check_dimension(succ, d)


def test_permutation_orders_have_dimension_at_most_two():
    # permutation graphs are exactly the comparability graphs of orders of dimension <= 2
    # (Dushnik & Miller 1941)
    rng = random.Random(2)
    for n in (5, 40, 400):
        perm = list(range(n))
        rng.shuffle(perm)
        succ = permutation_order(perm)
        d = dimension(succ)
        assert d.status == "exact" and d.value <= 2
        check_realizer(succ, d.realizer)
    # the identity permutation gives a chain: dimension 1
    assert dimension(permutation_order(list(range(6)))).value == 1


def test_disjoint_sum_rule_by_brute_force():
    # dim(P + Q) = max(2, dim P, dim Q) for non-empty P, Q (from memory; checked here by brute
    # force on small parts, as the issue asks)
    rng = random.Random(4)
    for _ in range(15):
        p = random_order(rng.randint(1, 3), 0.7, rng)
        q = random_order(rng.randint(1, 3), 0.7, rng)
        k = len(p)
        union = [set(s) for s in p] + [{b + k for b in s} for s in q]
        expect = max(2, brute_dimension(p), brute_dimension(q))
        assert brute_dimension(union) == expect
        assert dimension(union).value == expect
    # a standard example beside a chain, and stacked above an antichain
    s3 = standard_example(3)
    union = [set(s) for s in s3] + [{7}, set()]
    d = dimension(union)
    assert d.value == 3 and d.stats["parallel"] == 1
    check_dimension(union, d)
    below = [set(range(2, 8)), set(range(2, 8))]  # two unrelated items under all of S_3
    stacked = below + [{2 + b for b in s} for s in s3]
    d = dimension(stacked)
    assert d.value == 3 and d.stats["series"] >= 1
    check_dimension(stacked, d)


def test_union_of_many_two_dimensional_orders():
    # 40 random permutation orders side by side: dimension 2 with a verified realizer
    rng = random.Random(9)
    succ = []
    for _ in range(40):
        perm = list(range(25))
        rng.shuffle(perm)
        base = len(succ)
        succ += [{base + j for j in s} for s in permutation_order(perm)]
    d = dimension(succ)
    assert d.value == 2
    check_realizer(succ, d.realizer)


def test_bounded_beyond_reach(monkeypatch):
    # force the 'too large' route on a random height-2 order: a sub-order of dimension >= 3 is
    # found by sampling and verified; the upper bound is min(width, n/2)
    monkeypatch.setattr(dimension_module, "MAX_INCOMPARABLE_PAIRS", 10)
    rng = random.Random(1)
    n = 60
    succ = [set() for _ in range(n)]
    for a in range(30):
        for b in range(30, 60):
            if rng.random() < 0.3:
                succ[a].add(b)
    d = dimension(succ)
    assert d.status == "bounded" and d.value is None
    assert d.lower == 3 and 3 <= d.upper <= 30
    check_dimension(succ, d)
    assert len(d.witness) < n


def test_sat_limit_gives_bounds():
    succ = standard_example(4)
    # 8 items > 6: one try for 3 orders only; it fails, which proves >= 4 (checked pair by
    # pair), and a greedy realizer of 4 orders meets that bound
    d = dimension(succ, sat_limit=6)
    assert d.status == "exact" and d.value == 4 and d.witness_lower == 4
    check_dimension(succ, d)
    succ = standard_example(5)
    # the try for 3 orders fails on five pairs that pairwise form alternating two-cycles,
    # which proves >= 5 (Dushnik & Miller 1941), and 5 orders are found greedily
    d = dimension(succ, sat_limit=4)
    assert d.status == "exact" and d.value == 5 and len(d.witness_pairs) == 5
    check_dimension(succ, d)
    succ = standard_example(3)
    d = dimension(succ, sat_limit=4)  # the one try for 3 orders settles S_3
    assert d.status == "exact" and d.value == 3
    check_dimension(succ, d)
    d = dimension(standard_example(5), sat_limit=3)  # 10 items > 3 · 3: bounds only
    assert d.status == "bounded" and (d.lower, d.upper) == (3, 5)


def test_sat_realizer_refuses_too_few_orders():
    succ = standard_example(3)
    assert sat_realizer(succ, 2) is None
    r = sat_realizer(succ, 3)
    check_realizer(succ, r)


def test_checker_rejects_bad_realizers_and_witnesses():
    succ = [{1}, set(), set()]  # 0 < 1, 2 alone: dimension 2
    with pytest.raises(CertificateError):
        check_realizer(succ, [[0, 1, 2], [0, 1, 2]])  # intersection is a chain, too big
    with pytest.raises(CertificateError):
        check_realizer(succ, [[1, 0, 2], [2, 1, 0]])  # not linear extensions
    check_realizer(succ, [[0, 1, 2], [2, 0, 1]])
    # a permutation order (dimension 2) is no witness for dimension >= 3
    perm_succ = permutation_order([2, 0, 3, 1, 5, 4, 7, 6])
    with pytest.raises(CertificateError):
        check_dimension_at_least(perm_succ, list(range(8)), 3)
    # a 10-item witness is checked through a forcing chain (Golumbic 1980, ch. 5) in its
    # incomparability graph; a chain from another order is rejected
    s5 = standard_example(5)
    chain = conjugate._witness_chain(s5, list(range(10)))
    check_dimension_at_least(s5, list(range(10)), 3, chain)
    big_perm = permutation_order([5, 0, 8, 2, 9, 1, 7, 3, 6, 4])
    with pytest.raises(CertificateError):
        check_dimension_at_least(big_perm, list(range(10)), 3, chain)
    # S_3 is a witness for 3 but not for 4
    s3 = standard_example(3)
    check_dimension_at_least(s3, list(range(6)), 3)
    with pytest.raises(CertificateError):
        check_dimension_at_least(s3, list(range(6)), 4)


def with_twins(succ, rng):
    """Substitute two-item antichains for some items.  The dimension stays the same when it is
    at least 2 (common practice: a realizer lists the copies side by side, the other way round
    in its second order)."""
    n = len(succ)
    copies = {x: [x] for x in range(n)}
    nxt = n
    for x in range(n):
        if rng.random() < 0.3:
            copies[x].append(nxt)
            nxt += 1
    new = [set() for _ in range(nxt)]
    for a in range(n):
        for b in succ[a]:
            for ca in copies[a]:
                new[ca].update(copies[b])
    return new


def test_refinement_route_for_large_parts(monkeypatch):
    # force every part through ordered vertex partitioning (the route taken when a part's
    # incomparability graph is too large to build) and compare with the exact route
    rng = random.Random(21)
    exact_answers = []
    orders = [with_twins(permutation_order(rng.sample(range(n), n)), rng)
              for n in (10, 30, 60)]
    for _ in range(12):
        n = rng.randint(6, 24)
        orders.append(random_order(n, 0.15, rng))
    for succ in orders:
        exact_answers.append(dimension(succ))
    monkeypatch.setattr(dimension_module, "MAX_INCOMPARABLE_PAIRS", 0)
    found_two = 0
    for succ, exact in zip(orders, exact_answers):
        d = dimension(succ)
        check_dimension(succ, d)
        if exact.value is not None and exact.value <= 2:
            assert d.value == exact.value  # the refinement resolved every 2-dimensional case
            found_two += 1
        else:
            assert d.value is None or d.value >= 3
    assert found_two >= 3


def test_greedy_realizer_bounds_from_above():
    # every greedy family is a realizer (checked by counting pairs) and never beats the
    # brute-force dimension; on S_n it needs at least n orders (Dushnik & Miller 1941)
    rng = random.Random(17)
    for _ in range(25):
        n = rng.randint(2, 6)
        succ = random_order(n, rng.random() * 0.7, rng)
        r = greedy.greedy_realizer(succ, seed=rng.randrange(100))
        check_realizer(succ, r)
        assert len(r) >= brute_dimension(succ)
    r = greedy.greedy_realizer(standard_example(4))
    check_realizer(standard_example(4), r)
    assert len(r) >= 4


def test_bounded_part_gets_a_checked_realizer():
    # a connected 60-item order of dimension >= 3 with the SAT limit set low: the answer is
    # bounded or exact, and any realizer it carries has exactly 'upper' orders and is checked
    rng = random.Random(6)
    n = 60
    arcs = [(rng.randrange(max(0, j - 12), j), j) for j in range(1, n) for _ in range(2)]
    succ = transitive_closure(n, arcs)
    d = dimension(succ, sat_limit=5)
    assert d.lower >= 3 and d.realizer is not None and len(d.realizer) == d.upper
    check_dimension(succ, d)
    assert d.upper < min(30, dimension_module._part_width(succ, list(range(n))))


def test_dimension_of_s11_keeps_its_time_limit(capfd):
    # S_11 has dimension 11 (Dushnik & Miller 1941); refuting 10 orders takes the SAT search
    # far longer than 5 s (measured: over 100 s for 10 orders alone), so the search stops at
    # its limit and reports bounds, which the independent checker confirms.  Its solver used
    # to ignore the limit (84 s) and print tracebacks from a timer thread.
    succ = standard_example(11)
    t0 = time.monotonic()
    d = dimension(succ, time_limit=5)
    assert time.monotonic() - t0 < 60  # a sanity bound: it returned
    assert d.status in ("bounded", "exact")
    assert 3 <= d.lower <= 11 <= d.upper
    if d.status == "exact":
        assert d.value == 11
    else:
        assert any("ran out of time" in note for note in d.notes)
    check_dimension(succ, d)
    assert sat_realizer(succ, 3, deadline=time.monotonic()) == "unknown"  # deadline passed
    out, err = capfd.readouterr()
    assert err == ""
