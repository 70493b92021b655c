"""The engines behind ``settled`` and ``sample`` on problems small enough to list by brute force:
linear extensions by down-sets, pair shares and uniform draws through the modular
decomposition, and the count of answers by inserting items one at a time.

Sources: the numbers of labelled posets 1, 1, 3, 19, 219, 4231 (OEIS A001035); on the complete
graph K_n every one of the n! linear orders is an answer and reversing one maps the answers
with a before b onto those with b before a, so every pair has share 1/2 (common practice); the
chi-square goodness-of-fit test of scipy.stats.chisquare for uniform draws.
"""

from __future__ import annotations

import itertools
import random
from fractions import Fraction

import pytest
from order_reference import all_posets, brute_answers, random_requirements
from scipy.stats import chisquare

from satorder.graph.decomposition_sample import sample_order
from satorder.graph.insertion import answers, tally
from satorder.graph.linear_extensions import LinearExtensions, TooManyStates
from satorder.graph.node_choices import constrain
from satorder.graph.pair_shares import shares
from satorder.model.problem import Problem


def _brute_extensions(before):
    r = len(before)
    out = []
    for perm in itertools.permutations(range(r)):
        pos = {v: k for k, v in enumerate(perm)}
        if all(pos[i] < pos[j] for j in range(r) for i in range(r) if before[j] >> i & 1):
            out.append(perm)
    return out


@pytest.mark.parametrize("seed", range(12))
def test_linear_extensions_match_brute_force(seed):
    rng = random.Random(seed)
    r = rng.randint(1, 6)
    order = list(range(r))
    rng.shuffle(order)
    before = [0] * r
    for x in range(r):
        for y in range(x + 1, r):
            if rng.random() < 0.3:
                before[order[y]] |= 1 << order[x]
    le = LinearExtensions(before)
    brute = _brute_extensions(before)
    assert le.count == len(brute)
    counts = le.precedence_counts()
    for i in range(r):
        for j in range(r):
            if i != j:
                assert counts[i][j] == sum(p.index(i) < p.index(j) for p in brute)
    drawn = le.sample(random.Random(seed))
    assert tuple(drawn) in brute


def test_linear_extensions_refuse_too_many_states():
    with pytest.raises(TooManyStates):
        LinearExtensions([0] * 16, max_states=1000)  # 2^16 down-sets of an antichain


def _brute_shares(problem):
    ans = list(brute_answers(problem))
    out = {}
    for a in range(problem.n):
        for b in range(problem.n):
            if a != b:
                out[(a, b)] = Fraction(sum((a, b) in r for r in ans), len(ans)) if ans else None
    return len(ans), out


@pytest.mark.parametrize("seed", range(40))
def test_decomposition_shares_match_brute_force(seed):
    rng = random.Random(seed)
    p = random_requirements(6 if seed % 10 == 0 else rng.randint(2, 5), rng, open_pairs=False)
    total, brute = _brute_shares(p)
    con = constrain(p)
    assert con.count == total
    seen = set()
    for blk in shares(con):
        assert blk.before >= blk.after and blk.unordered == 0
        for a in blk.left:
            for b in blk.right:
                assert blk.before == brute[(a, b)] and blk.after == brute[(b, a)], (a, b)
                seen.add(frozenset((a, b)))
    assert seen == ({frozenset(e) for e in p.comparable_pairs()} if total else set())


@pytest.mark.parametrize("n", [3, 5, 8])
def test_complete_graph_every_pair_half(n):
    # K_n: the n! linear orders; reversal pairs the answers with a<b and b<a (common practice)
    names = [f"k{i}" for i in range(n)]
    p = Problem.from_lists(comparable=list(itertools.combinations(names, 2)))
    con = constrain(p)
    assert con.count == len(list(itertools.permutations(range(n))))
    blocks = list(shares(con))
    assert sum(b.pairs for b in blocks) == n * (n - 1) // 2
    assert all(b.before == b.after == Fraction(1, 2) for b in blocks)


def _key(succ):
    return frozenset((a, b) for a, s in enumerate(succ) for b in s)


@pytest.mark.parametrize("comparable,fixed,expected", [
    # K3: 3! = 6 linear orders (common practice)
    ([("a", "b"), ("b", "c"), ("a", "c")], [], 6),
    # K4 with a before b: 4!/2 = 12
    (list(itertools.combinations("abcd", 2)), [("a", "b")], 12),
    # a path on four items (prime: two orientations) beside one more pair: 2 × 2
    ([("a", "b"), ("b", "c"), ("c", "d"), ("x", "y")], [], 4),
])
def test_decomposition_draws_pass_chi_square(comparable, fixed, expected):
    p = Problem.from_lists(comparable=comparable, fixed=fixed)
    con = constrain(p)
    truth = {frozenset(r) for r in brute_answers(p)}
    assert con.count == len(truth) == expected
    rng = random.Random(11)
    draws = 200 * expected
    seen: dict = {}
    for _ in range(draws):
        key = _key(sample_order(con, rng))
        assert key in truth
        seen[key] = seen.get(key, 0) + 1
    assert set(seen) == truth
    # scipy.stats.chisquare: goodness of fit to the uniform distribution over all answers
    assert chisquare(list(seen.values())).pvalue > 0.001


@pytest.mark.parametrize("n,expected", [(0, 1), (1, 1), (2, 3), (3, 19), (4, 219), (5, 4231)])
def test_insertion_counts_labelled_posets(n, expected):
    # OEIS A001035: labelled posets on n points
    p = Problem.from_lists(items=[f"i{k}" for k in range(n)], incomparable=[])
    t = tally(p)
    assert t.complete and t.total == expected == len(all_posets(n))


@pytest.mark.parametrize("seed", range(40))
def test_insertion_tally_matches_brute_force(seed):
    rng = random.Random(100 + seed)
    p = random_requirements(6 if seed % 10 == 0 else rng.randint(2, 5), rng, open_pairs=True)
    total, brute = _brute_shares(p)
    t = tally(p)
    assert t.complete and t.total == total
    for (a, b), share in brute.items():
        if total:
            assert Fraction(t.before[a][b], total) == share
    listed = [_key(succ) for _, succ in answers(p)]
    assert len(listed) == total and set(listed) == {frozenset(r) for r in brute_answers(p)}


def test_insertion_stops_at_its_limit():
    p = Problem.from_lists(items=[f"i{k}" for k in range(5)], incomparable=[])
    t = tally(p, limit=1000)
    assert not t.complete and t.reason == "limit" and t.total > 1000
