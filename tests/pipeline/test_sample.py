"""``sample``: answers drawn at random, each certified, the same seed giving the same sample;
uniformity by the chi-square goodness-of-fit test (scipy.stats.chisquare) over all answers of
problems whose answers can be listed: K_3 (3! = 6 linear orders) and three items with every
pair open (19 labelled posets, OEIS A001035), through each method."""

from __future__ import annotations

import pytest
from order_reference import brute_answers
from scipy.stats import chisquare

from satorder.model.problem import Problem
from satorder.pipeline.sample import DECOMPOSITION, LISTING, UNIGEN, sample_answers

K3 = Problem.from_lists(comparable=[("a", "b"), ("b", "c"), ("a", "c")])
OPEN3 = Problem.from_lists(items=["a", "b", "c"], incomparable=[])


def _key(succ):
    return frozenset((a, b) for a, s in enumerate(succ) for b in s)


@pytest.mark.parametrize("problem,method,answers", [
    (K3, DECOMPOSITION, 6), (OPEN3, LISTING, 19), (K3, UNIGEN, 6), (OPEN3, UNIGEN, 19)])
def test_samples_pass_chi_square(problem, method, answers):
    truth = {frozenset(r) for r in brute_answers(problem)}
    assert len(truth) == answers
    res = sample_answers(problem, 40 * answers, seed=5, method=method)
    assert res.method == method and res.verified and len(res.orders) == 40 * answers
    seen: dict = {}
    for succ in res.orders:
        key = _key(succ)
        assert key in truth
        seen[key] = seen.get(key, 0) + 1
    assert set(seen) == truth
    assert chisquare(list(seen.values())).pvalue > 0.001


@pytest.mark.slow
def test_unigen_with_hashing_passes_chi_square():
    # four items, every pair open: 219 answers, more than one cell, so UniGen hashes
    p = Problem.from_lists(items=["a", "b", "c", "d"], incomparable=[])
    truth = {frozenset(r) for r in brute_answers(p)}
    assert len(truth) == 219
    res = sample_answers(p, 219 * 6, seed=2, method=UNIGEN)
    seen: dict = {}
    for succ in res.orders:
        seen[_key(succ)] = seen.get(_key(succ), 0) + 1
    assert set(seen) <= truth
    counts = [seen.get(k, 0) for k in truth]
    assert chisquare(counts).pvalue > 0.001


@pytest.mark.parametrize("problem,method", [(K3, DECOMPOSITION), (OPEN3, LISTING),
                                            (OPEN3, UNIGEN)])
def test_same_seed_same_sample(problem, method):
    one = sample_answers(problem, 12, seed=9, method=method)
    two = sample_answers(problem, 12, seed=9, method=method)
    other = sample_answers(problem, 12, seed=10, method=method)
    assert one.orders == two.orders and one.orders != other.orders


def test_infeasible_problem_draws_nothing():
    p = Problem.from_lists(fixed=[("a", "b"), ("b", "c")])  # yet a, c must stay unordered
    for method in ("auto", UNIGEN):
        res = sample_answers(p, 3, method=method)
        assert res.status == "infeasible" and res.orders == [] and res.answers == 0
