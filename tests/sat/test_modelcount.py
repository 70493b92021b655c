"""Approximate model counting and almost-uniform sampling of the answers (ApproxMC, UniGen),
against brute-force counts over all labelled posets (OEIS A001035 for every pair open), and the
``count`` command's switch from listing to approximate counting."""

from __future__ import annotations

import json
import random

import pytest
from order_reference import brute_count, random_requirements

from satorder.cli.main import main
from satorder.model.problem import Problem
from satorder.pipeline import count as count_module
from satorder.pipeline.count import APPROXIMATE, ENUMERATION, check_count, count_answers
from satorder.sat.answer_formula import AnswerFormula
from satorder.sat.modelcount import approximate_count
from satorder.sat.sampling import almost_uniform_samples


def test_counter_keeps_variables_left_free_by_units():
    # the reason for the version pin: x1 forced true, x2 free — two models, not one
    import pyapproxmc

    c = pyapproxmc.Counter(seed=1)
    c.add_clauses([[1], [1, 2]])
    cells, hashes = c.count([1, 2])
    assert cells * 2 ** hashes == 2


@pytest.mark.parametrize("n,posets", [(2, 3), (3, 19), (4, 219), (5, 4231)])
def test_estimate_of_labelled_posets_within_epsilon(n, posets):
    # OEIS A001035; ApproxMC's guarantee: within a factor 1 + ε with probability 1 − δ
    p = Problem.from_lists(items=[f"i{k}" for k in range(n)], incomparable=[])
    est = approximate_count(AnswerFormula(p), seed=3)
    assert posets / 1.8 <= est.estimate <= 1.8 * posets
    assert est.epsilon == 0.8 and est.delta == 0.2


@pytest.mark.parametrize("seed", range(25))
def test_small_counts_are_exact(seed):
    # up to one cell of answers ApproxMC counts exactly: compare with brute force
    rng = random.Random(seed)
    p = random_requirements(rng.randint(2, 5), rng, open_pairs=rng.random() < 0.7)
    truth = brute_count(p)
    est = approximate_count(AnswerFormula(p), seed=1)
    if est.exact:
        assert est.estimate == truth
    else:
        assert truth / 1.8 <= est.estimate <= 1.8 * truth


def test_samples_are_answers():
    p = Problem.from_lists(items=["a", "b", "c", "d"], incomparable=[("a", "d")],
                           fixed=[("a", "b")])
    for succ in almost_uniform_samples(AnswerFormula(p), 30, seed=4):
        assert 1 in succ[0] and 3 not in succ[0] and 0 not in succ[3]


def test_count_switches_to_approximate_past_the_threshold(monkeypatch):
    monkeypatch.setattr(count_module, "LISTING_THRESHOLD", 50)
    p = Problem.from_lists(items=["a", "b", "c", "d"], incomparable=[])  # 219 answers
    res = count_answers(p)
    assert res.method == APPROXIMATE and not res.exact
    assert 219 / 1.8 <= res.count <= 1.8 * 219
    doc = res.to_json()
    assert doc["epsilon"] == 0.8 and doc["delta"] == 0.2 and doc["lower_bound"] == 50
    assert "probability" in doc["guarantee"]
    check_count(res)
    assert res.verified
    # the user can insist on listing every answer
    again = count_answers(p, method=ENUMERATION)
    assert again.exact and again.count == 219


def test_count_cli_approximate_json(tmp_path, capsys):
    f = tmp_path / "open.json"
    f.write_text(json.dumps({"items": ["a", "b", "c", "d"], "incomparable": []}))
    assert main(["count", str(f), "--method", "approximate", "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert doc["method"] == "approximate" and doc["exact"] is False
    assert doc["epsilon"] == 0.8 and doc["delta"] == 0.2
    assert 219 / 1.8 <= doc["count"] <= 1.8 * 219
