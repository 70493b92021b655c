"""Weighted preferences (MaxSAT) against brute force over all labelled posets."""

from __future__ import annotations

import itertools
import json
import random

import pytest
from order_reference import brute_answers, brute_count, random_requirements

from satorder import Problem, solve
from satorder.certify.prefer import check_cost
from satorder.cli.main import main
from satorder.errors import CertificateError


def brute_optimum(problem: Problem) -> int | None:
    """Least total weight of unmet preferences over every poset meeting the hard requirements
    (None if none does), by trying all labelled posets."""
    best = None
    for rel in brute_answers(problem):
        cost = sum(w for a, b, w in problem.prefer if (a, b) not in rel)
        if best is None or cost < best:
            best = cost
    return best


def with_preferences(p: Problem, rng: random.Random, k: int) -> Problem:
    arcs = list(itertools.permutations(range(p.n), 2))
    prefer = [(a, b, rng.randint(1, 6)) for a, b in
              (rng.choice(arcs) for _ in range(k))] if arcs else []
    return p.with_requirements(prefer=prefer)


@pytest.mark.parametrize("open_pairs", [False, True])
def test_cost_equals_brute_force_optimum(open_pairs):
    rng = random.Random(21 if open_pairs else 22)
    checked = 0
    for _ in range(70):
        n = rng.randint(2, 5)
        p = with_preferences(random_requirements(n, rng, open_pairs), rng, rng.randint(1, 6))
        ans = solve(p)
        best = brute_optimum(p)
        if best is None:
            assert ans.status == "infeasible" and ans.verified
            continue
        checked += 1
        assert ans.status == "feasible" and ans.verified
        assert ans.cost == best and ans.optimal and ans.lower_bound == best
    assert checked > 30


def test_unmeetable_preferences_add_their_weight():
    # a pair that must stay unordered can never be ordered: its preference is always unmet
    p = Problem.from_lists(comparable=[("a", "b")], items=["c"],
                           prefer=[("a", "c", 5), ("b", "a", 2)])
    ans = solve(p)
    assert ans.cost == 5 and ans.optimal
    assert [(p.items[a], p.items[b]) for a, b, _ in ans.unmet] == [("a", "c")]


def test_infeasible_hard_requirements_still_reported_with_core():
    # C5 is not a comparability graph (Golumbic 1980): no order, whatever the preferences
    names = "abcde"
    p = Problem.from_lists(comparable=[(names[i], names[(i + 1) % 5]) for i in range(5)],
                           prefer=[("a", "b", 1)])
    ans = solve(p)
    assert ans.status == "infeasible" and ans.verified and ans.core


def test_time_limited_runs_return_certified_orders():
    rng = random.Random(4)
    n = 40
    names = [f"x{i}" for i in range(n)]
    comparable, incomparable = [], []
    for a, b in itertools.combinations(names, 2):
        r = rng.random()
        if r < 0.03:
            comparable.append((a, b))
        elif r < 0.3:
            incomparable.append((a, b))
    prefer = [(names[a], names[b], rng.randint(1, 9))
              for a, b in (rng.sample(range(n), 2) for _ in range(200))]
    p = Problem.from_lists(comparable=comparable, incomparable=incomparable, prefer=prefer)
    ans = solve(p, time_limit=0.5)
    assert ans.status in ("feasible", "unknown")
    if ans.status == "feasible":
        assert ans.verified  # check_order and check_cost passed
        assert ans.lower_bound <= ans.cost
        if ans.optimal:
            assert ans.lower_bound == ans.cost


def test_check_cost_rejects_wrong_claims():
    p = Problem.from_lists(comparable=[("a", "b")], prefer=[("a", "b", 3), ("b", "a", 1)])
    succ = [{1}, set()]  # a < b
    check_cost(p, succ, 1, [(1, 0, 1)])
    with pytest.raises(CertificateError):
        check_cost(p, succ, 0, [(1, 0, 1)])
    with pytest.raises(CertificateError):
        check_cost(p, succ, 3, [(0, 1, 3)])


def test_cli_solve_json_reports_cost(tmp_path, capsys):
    path = tmp_path / "p.json"
    path.write_text(json.dumps({
        "comparable": [["a", "b"], ["b", "c"], ["c", "d"], ["d", "a"]],
        "prefer": [{"before": "a", "after": "b", "weight": 2},
                   {"before": "b", "after": "c", "weight": 3},
                   {"before": "d", "after": "a", "weight": 1}],
    }))
    assert main(["solve", str(path), "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    # the 4-cycle has two transitive orientations (bipartite, common practice): {a, c} below
    # costs 3 + 1, {b, d} below costs 2
    assert doc["cost"] == 2 and doc["optimal"] is True and doc["verified"] is True
    assert doc["unmet"] == [{"before": "a", "after": "b", "weight": 2}]


def test_counting_ignores_preferences():
    p = Problem.from_lists(comparable=[("a", "b"), ("b", "c")], prefer=[("a", "b", 1)])
    from satorder.pipeline.count import count_answers

    res = count_answers(p)
    assert res.count == 2 == brute_count(p.with_requirements(prefer=[]))
    assert "note" in res.to_json()


def direct_maxsat_optimum(problem: Problem) -> int | None:
    """Reference optimum: RC2 on the textbook encoding (a variable per ordered pair, every
    transitivity triple up front; common practice), with none of the engine's shortcuts."""
    from pysat.examples.rc2 import RC2
    from pysat.formula import WCNF

    n = problem.n
    var = {arc: k + 1 for k, arc in enumerate(itertools.permutations(range(n), 2))}
    w = WCNF()
    for a, b in itertools.combinations(range(n), 2):
        w.append([-var[a, b], -var[b, a]])
        if b in problem.adj[a]:
            w.append([var[a, b], var[b, a]])
        elif problem.must_be_unordered(a, b):
            w.append([-var[a, b]])
            w.append([-var[b, a]])
    for a, b, c in itertools.permutations(range(n), 3):
        w.append([-var[a, b], -var[b, c], var[a, c]])
    for arc in problem.fixed:
        w.append([var[arc]])
    for arc in problem.forbidden:
        w.append([-var[arc]])
    for a, b, weight in problem.prefer:
        w.append([var[a, b]], weight=weight)
    with RC2(w) as rc2:
        return None if rc2.compute() is None else rc2.cost


def test_cost_equals_textbook_maxsat_on_eight_items():
    rng = random.Random(8)
    rounds = []
    for _ in range(12):
        p = with_preferences(random_requirements(8, rng, open_pairs=True), rng, 14)
        ans = solve(p)
        ref = direct_maxsat_optimum(p)
        if ref is None:
            assert ans.status == "infeasible"
            continue
        assert ans.verified and ans.optimal and ans.cost == ref
        rounds.append(ans.stats["maxsat_rounds"])
    assert rounds and max(rounds) > 1  # the lazy transitivity loop was exercised
