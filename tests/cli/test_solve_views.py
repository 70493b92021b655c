"""``solve --json`` says what its answer contains: on every feasible problem of the committed
suites it carries ``levels``, ``covering``, ``sequence`` and ``requirements``, each checked here
against the order it describes — the covering pairs against networkx's
``transitive_reduction`` (the outside reference; Aho, Garey & Ullman, "The transitive reduction
of a directed graph", SIAM J. Comput. 1, 1972), the levels against longest chains computed
here over networkx's topological sort, the sequence as a linear extension."""

from __future__ import annotations

import json
import os

import networkx as nx
import pytest

from satorder import read_problem
from satorder.cli.main import main
from satorder.model.order_views import covering_pairs, levels, sequence

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))


def _feasible_files(suite: str) -> list[str]:
    folder = os.path.join(ROOT, "instances", suite)
    with open(os.path.join(folder, "manifest.json")) as f:
        entries = json.load(f)["instances"]
    return [os.path.join(folder, e["file"]) for e in entries
            if e["expected_status"] in ("feasible", None)]


def check_views(doc: dict, problem) -> None:
    """Every view of a feasible ``solve --json`` answer against its ``order``."""
    names = problem.items
    order = {tuple(p) for p in doc["order"]}
    g = nx.DiGraph()
    g.add_nodes_from(names)
    g.add_edges_from(order)
    # covering pairs: exactly the transitive reduction (networkx, the outside reference)
    assert {tuple(p) for p in doc["covering"]} == set(nx.transitive_reduction(g).edges())
    assert len(doc["covering"]) == len({tuple(p) for p in doc["covering"]})
    # levels: a partition of the items, each item's level the number of items in a longest
    # chain ending at it (so level 1 holds the minimal items)
    level_of = {x: k for k, row in enumerate(doc["levels"], 1) for x in row}
    assert sorted(level_of) == sorted(names) and sum(map(len, doc["levels"])) == len(names)
    longest: dict[str, int] = {}
    for x in nx.topological_sort(g):
        longest[x] = 1 + max((longest[y] for y in g.predecessors(x)), default=0)
    assert level_of == longest
    if names:
        assert len(doc["levels"]) == nx.dag_longest_path_length(g) + 1
    # sequence: every item once, each after all its predecessors
    assert sorted(doc["sequence"]) == sorted(names)
    at = {x: k for k, x in enumerate(doc["sequence"])}
    assert all(at[a] < at[b] for a, b in order)
    # requirements: one row per fixed arc, forbidden arc, open pair and preference, each
    # with how it came out in this order
    rows = doc["requirements"]
    kinds = [r["kind"] for r in rows]
    assert kinds.count("fixed") == len(problem.fixed)
    assert kinds.count("forbidden") == len(problem.forbidden)
    assert kinds.count("open") == problem.num_open
    assert kinds.count("prefer") == len(problem.prefer)
    for r in rows:
        a, b = r["pair"]
        rel = "before" if (a, b) in order else "after" if (b, a) in order else "unordered"
        assert r["relation"] == rel, r
        assert r["text"].startswith(r["kind"] + ": "), r
        want = {"fixed": rel == "before", "forbidden": rel != "before",
                "prefer": rel == "before", "open": None}[r["kind"]]
        assert r["holds"] == want, r
        if r["kind"] in ("fixed", "forbidden"):
            assert r["holds"] is True  # a verified answer meets every hard requirement


@pytest.mark.parametrize("suite", ["small", pytest.param("medium", marks=pytest.mark.slow)])
def test_solve_json_views_on_every_feasible_instance(suite, capsys):
    checked = 0
    for path in _feasible_files(suite):
        assert main(["solve", path, "--json"]) == 0
        doc = json.loads(capsys.readouterr().out)
        if doc["status"] != "feasible":  # an unknown status in the manifest may be either
            continue
        check_views(doc, read_problem(path))
        checked += 1
    assert checked >= {"small": 40, "medium": 12}[suite]


def test_views_of_small_orders_by_hand():
    # 0 < 1 < 3, 0 < 2 < 3, item 4 alone: levels {0, 4}, {1, 2}, {3}
    succ = [{1, 2, 3}, {3}, {3}, set(), set()]
    assert levels(succ) == [[0, 4], [1, 2], [3]]
    assert sorted(covering_pairs(succ)) == [(0, 1), (0, 2), (1, 3), (2, 3)]
    assert sequence(succ) == [0, 4, 1, 2, 3]
    # a chain: every pair ordered, only consecutive ones cover
    n = 30
    chain = [set(range(a + 1, n)) for a in range(n)]
    assert sorted(covering_pairs(chain)) == [(a, a + 1) for a in range(n - 1)]
    assert levels(chain) == [[a] for a in range(n)]
    with pytest.raises(ValueError, match="cycle"):
        levels([{1}, {0}])


@pytest.mark.parametrize("arrays", [False, True], ids=["python", "arrays"])
def test_views_match_networkx_on_random_orders(arrays, monkeypatch):
    # both ways of computing the views: pure Python for small orders, numpy/scipy for large
    import random

    from order_reference import random_order

    from satorder.model import order_views

    monkeypatch.setattr(order_views, "ARRAYS_FROM", 0 if arrays else 10 ** 12)
    rng = random.Random(5)
    for _ in range(40):
        n = rng.randint(1, 25)
        succ = random_order(n, rng.uniform(0.05, 0.6), rng)
        g = nx.DiGraph()
        g.add_nodes_from(range(n))
        g.add_edges_from((a, b) for a in range(n) for b in succ[a])
        assert set(covering_pairs(succ)) == set(nx.transitive_reduction(g).edges())
        seq = sequence(succ)
        assert sorted(seq) == list(range(n))
        at = {x: k for k, x in enumerate(seq)}
        assert all(at[a] < at[b] for a, b in g.edges())
        longest = {}
        for x in nx.topological_sort(g):
            longest[x] = 1 + max((longest[y] for y in g.predecessors(x)), default=0)
        assert [longest[x] for x in range(n)] == order_views.level_numbers(succ)
        quoted = [f'"i{k}"' for k in range(n)]
        doc = json.loads("{" + order_views.views_json(succ, quoted) + "}")
        assert doc["sequence"] == [f"i{k}" for k in seq]
        assert {tuple(p) for p in doc["covering"]} == {
            (f"i{a}", f"i{b}") for a, b in nx.transitive_reduction(g).edges()}
