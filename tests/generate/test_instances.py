"""The committed suites: exactly what their recipes produce, and every manifest expectation
true — checked by engines whose answers are certified, and by independent references (brute
force, the textbook CNF encoding) where the problems are small enough."""

from __future__ import annotations

import json
import os

import networkx as nx
import pytest
from order_reference import brute_force_orientable, count_orientations, reference_feasible

from satorder import read_problem
from satorder.generate import RECIPES, make_suite
from satorder.pipeline.solve import solve

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
SUITES = ["small", "medium"]


def _manifest(suite):
    with open(os.path.join(ROOT, "instances", suite, "manifest.json")) as f:
        return json.load(f)


def _has_sat() -> bool:
    try:
        import satorder.sat.engine  # noqa: F401
    except ImportError:
        return False
    return True


def _has_count() -> bool:
    try:
        import satorder.pipeline.count  # noqa: F401
    except ImportError:
        return False
    return True


def count_answers(problem):
    from satorder.pipeline.count import count_answers as count

    return count(problem)


@pytest.mark.parametrize("suite", SUITES)
def test_committed_suite_is_what_its_recipe_writes(suite, tmp_path):
    # common practice: committed benchmark data must be reproducible from its recipe
    fresh = make_suite(str(tmp_path), RECIPES[suite], suite)
    assert fresh["instances"] == _manifest(suite)["instances"]
    folder = os.path.join(ROOT, "instances", suite)
    for e in fresh["instances"]:
        with open(os.path.join(folder, e["file"]), "rb") as a, \
                open(tmp_path / e["file"], "rb") as b:
            assert a.read() == b.read(), e["file"]
    listed = {e["file"] for e in fresh["instances"]} | {"manifest.json"}
    assert set(os.listdir(folder)) == listed  # nothing stale or unlisted


def test_committed_suites_stay_small():
    total = sum(os.path.getsize(os.path.join(ROOT, "instances", s, f))
                for s in SUITES for f in os.listdir(os.path.join(ROOT, "instances", s)))
    assert total < 2_000_000


@pytest.mark.parametrize("suite", SUITES)
def test_every_manifest_expectation_holds(suite):
    folder = os.path.join(ROOT, "instances", suite)
    checked_count = 0
    for e in _manifest(suite)["instances"]:
        p = read_problem(os.path.join(folder, e["file"]))
        where = f"{suite}/{e['file']}"
        assert p.n == e["item_count"] and p.num_comparable == e["comparable_pairs"], where
        if p.is_plain:
            ans = solve(p, engine="forcing")  # certified inside solve()
        elif _has_sat():
            ans = solve(p, engine="sat")
        else:
            ans = None
        if p.n <= 40 and not p.is_plain:
            # independent reference: the direct encoding over all triples, MiniSat
            ref = "feasible" if reference_feasible(p) else "infeasible"
            assert ref == e["expected_status"], where
        if ans is not None and e["expected_status"] is not None:
            assert ans.verified and ans.status == e["expected_status"], where
        if ans is not None and ans.cost is not None and ans.optimal:
            # the hidden order meets every hard requirement, so it bounds the optimum
            if e.get("expected_cost") is not None:
                assert ans.cost == e["expected_cost"], where
            if e.get("cost_at_most") is not None:
                assert ans.cost <= e["cost_at_most"], where
        if e["expected_count"] is not None and p.num_comparable <= 14 and p.is_plain:
            edges = list(p.comparable_pairs())
            assert count_orientations(p.n, edges) == e["expected_count"], where
            checked_count += 1
        if e["expected_count"] is not None and _has_count():
            # the generator's formula (n!, 2^c, product over the cotree, 0 when planted)
            # against the count engine's modular decomposition or enumeration
            got = count_answers(p)
            assert got.exact and got.count == e["expected_count"], where
        if e.get("expected_cost") == 0:
            # cost 0 is reachable exactly when every preference can hold as a fixed arc
            hard = p.with_requirements(fixed=p.fixed + [(a, b) for a, b, _ in p.prefer],
                                       prefer=[])
            assert reference_feasible(hard) if p.n <= 40 else (
                not _has_sat() or solve(hard, engine="sat").status == "feasible"), where
        planted = e.get("planted")
        if planted and "hole" in (planted["kind"] or ""):
            g = p.to_networkx().subgraph(planted["items"])
            k = len(planted["items"])
            # odd holes (length >= 5) and antiholes of C6, C7 are not comparability graphs
            # (Golumbic 1980, ch. 5; Gallai 1967): brute force confirms the planted one
            shape = nx.cycle_graph(k) if "antihole" not in planted["kind"] else \
                nx.complement(nx.cycle_graph(k))
            assert nx.is_isomorphic(g, shape), where
            assert not brute_force_orientable(nx.convert_node_labels_to_integers(g)), where
    if suite == "small":
        assert checked_count >= 10  # enough counts small enough for brute force
