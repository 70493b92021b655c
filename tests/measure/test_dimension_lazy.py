"""Exact dimension by the lazy critical-pair SAT search (satorder.measure.dimension.lazy):
published values, brute force on tiny orders, the all-triples encoding on small ones, and the
independent checks of every realizer and lower-bound witness."""

from __future__ import annotations

import math
import random

import pytest
from order_reference import random_order
from test_dimension import brute_dimension, standard_example

from satorder.certify.measure import check_dimension, check_realizer, check_two_cycle_pairs
from satorder.errors import CertificateError
from satorder.measure.dimension import dimension, sat_realizer
from satorder.measure.dimension.lazy import (
    below_or_equal,
    critical_pairs,
    lazy_realizer,
    lower_witness,
)


def crown(n: int, k: int) -> list[set[int]]:
    """The crown S_n^k (Trotter 1992, from memory): minimal items a_0 … a_(m-1), maximal
    b_0 … b_(m-1), m = n + k, and a_i < b_j unless j is one of i, i+1, …, i+k (mod m);
    S_n^0 is the standard example S_n."""
    m = n + k
    return [{m + j for j in range(m) if (j - i) % m > k} for i in range(m)] + \
        [set() for _ in range(m)]


def lazy_dimension(succ) -> int:
    k = 1
    while True:
        r = lazy_realizer(succ, k)
        assert r.status in ("yes", "no")
        if r.status == "yes":
            check_realizer(succ, r.realizer)
            return k
        k += 1


def test_critical_pairs_match_their_definition():
    rng = random.Random(2)
    for _ in range(40):
        n = rng.randint(2, 9)
        succ = random_order(n, rng.random() * 0.6, rng)
        pred = [{a for a in range(n) if b in succ[a]} for b in range(n)]
        expected = sorted((a, b) for a in range(n) for b in range(n)
                          if a != b and b not in succ[a] and a not in succ[b]
                          and pred[a] <= pred[b] and succ[b] <= succ[a])
        got = sorted(map(tuple, critical_pairs(below_or_equal(succ)).tolist()))
        assert got == expected


def test_lazy_search_matches_brute_force_on_tiny_orders():
    rng = random.Random(9)
    for _ in range(40):
        n = rng.randint(1, 6)
        succ = random_order(n, rng.random() * 0.8, rng)
        assert lazy_dimension(succ) == max(1, brute_dimension(succ))


def test_lazy_search_agrees_with_the_all_triples_encoding():
    # the older encoding (every item triple, each incomparable pair reversed somewhere) is an
    # independent formulation of the same question
    rng = random.Random(5)
    for _ in range(12):
        n = rng.randint(8, 14)
        succ = random_order(n, rng.uniform(0.1, 0.35), rng)
        for k in (2, 3):
            lazy = lazy_realizer(succ, k).status == "yes"
            assert lazy == isinstance(sat_realizer(succ, k), list)


@pytest.mark.parametrize("n", [3, 5, 8])
def test_standard_examples(n):
    # Dushnik & Miller (1941): dim S_n = n; the n pairs (a_i, b_i) pairwise form two-cycles
    succ = standard_example(n)
    d = dimension(succ)
    assert d.status == "exact" and d.value == n
    if n > 3:  # (3 is proven by a forcing chain, found first)
        assert d.witness_pairs is not None and len(d.witness_pairs) == n
    check_dimension(succ, d)


@pytest.mark.parametrize("n, k", [(3, 1), (4, 1), (5, 2), (6, 1), (7, 2), (4, 4), (6, 3)])
def test_crowns_have_trotters_dimension(n, k):
    # Trotter (1992, from memory): dim S_n^k = ceil(2(n + k) / (k + 2)) for n >= 3, k >= 0
    succ = crown(n, k)
    d = dimension(succ)
    assert d.status == "exact" and d.value == math.ceil(2 * (n + k) / (k + 2))
    check_dimension(succ, d)


def test_lower_witness_is_a_small_sub_order_the_checker_confirms():
    # S_6^1 has dimension 5 and its pairs' largest two-cycle clique is smaller: the "no" for 4
    # orders comes from the solver; its witness is re-solved by the checker's own encoding
    succ = crown(6, 1)
    r = lazy_realizer(succ, 4)
    assert r.status == "no" and not r.clique
    items = lower_witness(succ, 4, r)
    assert items is not None and len(items) <= len(succ)
    from satorder.certify.measure import check_dimension_at_least

    check_dimension_at_least(succ, items, 5)


def test_two_cycle_witness_check_rejects_pairs_one_order_can_reverse():
    s4 = standard_example(4)
    pairs = [(i, 4 + i) for i in range(4)]
    check_two_cycle_pairs(s4, pairs)
    with pytest.raises(CertificateError):
        check_two_cycle_pairs(s4, pairs[:2] + [(0, 1)])  # (0, 1): not a two-cycle with (0, 4)
    with pytest.raises(CertificateError):
        check_two_cycle_pairs(s4, [(0, 5)])  # comparable, not a pair to reverse
    chain = [{1, 2}, {2}, set()]
    with pytest.raises(CertificateError):
        check_two_cycle_pairs(chain, [(0, 1)])


@pytest.mark.parametrize("n, k", [(20, 2), (17, 4)])
def test_dimension_past_forty_items_is_exact(n, k):
    # crowns of 44 and 42 items (one connected part, past the former limit of 40 items):
    # Trotter's value ceil(2(n + k) / (k + 2)) (1992, from memory), realizer and lower-bound
    # witness accepted by the independent checks
    succ = crown(n, k)
    d = dimension(succ)
    assert d.stats["parts"] == 1 and len(succ) > 40
    assert d.status == "exact" and d.value == math.ceil(2 * (n + k) / (k + 2))
    check_dimension(succ, d)
