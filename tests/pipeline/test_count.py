"""Counting answers against published counts and brute force over all labelled posets."""

from __future__ import annotations

import itertools
import json
import math
import random

import networkx as nx
import pytest
from order_reference import brute_count, count_orientations, random_requirements

from satorder import Problem
from satorder.cli.main import main
from satorder.graph.modular import PRIME, modular_decomposition
from satorder.pipeline.count import DECOMPOSITION, ENUMERATION, check_count, count_answers

# OEIS A001035, "Number of partially ordered sets with n labeled elements"
A001035 = [1, 1, 3, 19, 219, 4231, 130023]


def graphs(n):
    pairs = list(itertools.combinations(range(n), 2))
    for mask in range(1 << len(pairs)):
        yield [pairs[k] for k in range(len(pairs)) if mask >> k & 1]


def plain(n, edges) -> Problem:
    return Problem.from_lists(comparable=[(str(a), str(b)) for a, b in edges],
                              items=[str(i) for i in range(n)])


@pytest.mark.parametrize("n", range(0, 6))
def test_sum_of_counts_over_all_labelled_graphs_is_a001035(n):
    # OEIS A001035: each labelled poset is the unique transitive orientation answer counted for
    # exactly one graph (its comparability graph), so the counts add up to the poset count
    total = sum(count_answers(plain(n, edges)).count for edges in graphs(n))
    assert total == A001035[n]


@pytest.mark.parametrize("n", [6, pytest.param(7, marks=pytest.mark.slow)])
def test_a001035_through_unlabelled_graphs(n):
    # The same sum over labelled graphs, grouped by isomorphism class: each graph of the
    # networkx atlas (all graphs up to 7 nodes, Read & Wilson, "An Atlas of Graphs") stands for
    # n!/|Aut(G)| labelled copies.  OEIS A001035: 130023 for n = 6; 6129859 for n = 7 (the
    # value for 7 recalled from memory).
    from networkx.algorithms.isomorphism import GraphMatcher

    expected = {6: 130023, 7: 6129859}[n]
    total = 0
    for g in nx.graph_atlas_g():
        if g.number_of_nodes() != n:
            continue
        automorphisms = sum(1 for _ in GraphMatcher(g, g).isomorphisms_iter())
        total += math.factorial(n) // automorphisms * count_answers(Problem.from_networkx(g)).count
    assert total == expected


@pytest.mark.parametrize("n", [1, 2, 3, 7, 12, 100])
def test_complete_graph_has_n_factorial_answers(n):
    # K_n: every linear order is a transitive orientation (common practice)
    res = count_answers(plain(n, itertools.combinations(range(n), 2)))
    assert res.method == DECOMPOSITION and res.exact
    assert res.count == math.factorial(n)


def test_prime_comparability_graphs_have_exactly_two():
    # Gallai 1967 (from memory): a prime comparability graph has exactly two transitive
    # orientations; checked here by brute force over all labelled graphs on 4 and 5 items
    seen = 0
    for n in (4, 5):
        for edges in graphs(n):
            p = plain(n, edges)
            tree = modular_decomposition(p.adj)
            if tree.kind != PRIME or any(c.children for c in tree.children):
                continue  # a prime graph: the root is prime and every child a single item
            b = count_orientations(n, edges)
            if b:
                seen += 1
                assert b == 2
                assert count_answers(p).count == 2
    assert seen > 10


def test_bipartite_and_odd_cycles():
    # even cycles are comparability graphs, odd cycles of length >= 5 are not (Golumbic 1980)
    for k in (6, 8, 10):
        res = count_answers(Problem.from_networkx(nx.cycle_graph(k)))
        assert res.count == 2
    for k in (5, 7, 9):
        assert count_answers(Problem.from_networkx(nx.cycle_graph(k))).count == 0


@pytest.mark.parametrize("open_pairs", [False, True])
def test_counts_match_brute_force_with_side_constraints(open_pairs):
    rng = random.Random(11 if open_pairs else 12)
    for _ in range(60):
        n = rng.randint(1, 5)
        p = random_requirements(n, rng, open_pairs)
        res = count_answers(p)
        assert res.exact
        assert res.method == (ENUMERATION if p.has_open_pairs else DECOMPOSITION)
        assert res.count == brute_count(p), p


def test_decomposition_and_enumeration_agree_on_six_items():
    rng = random.Random(5)
    for _ in range(25):
        p = random_requirements(6, rng, open_pairs=False)
        a = count_answers(p, method=DECOMPOSITION)
        b = count_answers(p, method=ENUMERATION)
        assert b.exact and a.count == b.count


def test_series_node_arcs_count_linear_extensions():
    # K_5 with a<b<c fixed: linear orders of 5 with 3 items in a given relative order: 5!/3!
    names = "abcde"
    p = Problem.from_lists(comparable=list(itertools.combinations(names, 2)),
                           fixed=[("a", "b"), ("b", "c")])
    assert count_answers(p).count == 20
    # a cycle of fixed arcs on a series node: no answer
    p = Problem.from_lists(comparable=list(itertools.combinations(names, 2)),
                           fixed=[("a", "b"), ("b", "c"), ("c", "a")])
    res = count_answers(p)
    assert res.count == 0 and res.exact


def test_enumeration_limit_gives_lower_bound():
    p = Problem.from_lists(comparable=list(itertools.combinations("abcd", 2)))
    res = count_answers(p, method=ENUMERATION, limit=5)
    assert not res.exact and res.count == 5
    assert res.to_json()["lower_bound"] == 5


def test_check_count_catches_a_wrong_count():
    from satorder.errors import CertificateError

    p = Problem.from_lists(comparable=[("a", "b"), ("b", "c")])
    res = count_answers(p)
    check_count(res)
    assert res.verified and res.count == 2
    res.count = 3
    with pytest.raises(CertificateError):
        check_count(res)


def test_cli_count_json(tmp_path, capsys):
    path = tmp_path / "k6.txt"
    path.write_text("\n".join(f"{a} {b}" for a, b in itertools.combinations("abcdef", 2)))
    assert main(["count", str(path), "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert doc["count"] == 720 and doc["exact"] and doc["method"] == DECOMPOSITION
    assert doc["verified"] is True


def test_cli_count_bad_input(tmp_path, capsys):
    path = tmp_path / "bad.json"
    path.write_text('{"comparable": [["a"]]}')
    assert main(["count", str(path), "--json"]) == 2
    assert main(["count", str(path), "--limit", "0"]) == 2


def test_cli_count_rejects_decomposition_with_open_pairs(tmp_path, capsys):
    path = tmp_path / "open.json"
    path.write_text(json.dumps({"comparable": [["a", "b"]], "incomparable": [],
                                "items": ["a", "b", "c"]}))
    assert main(["count", str(path), "--method", DECOMPOSITION]) == 2
    assert "open pairs" in capsys.readouterr().err
    # the same file by enumeration: 3 items with a, b comparable and the other pairs open;
    # brute force over all labelled posets gives the reference
    out = tmp_path / "count.json"
    assert main(["count", str(path), "--json", "--out", str(out)]) == 0
    doc = json.loads(out.read_text())
    p = Problem.from_lists(comparable=[("a", "b")], incomparable=[], items=["c"])
    assert doc["count"] == brute_count(p) and doc["method"] == ENUMERATION and doc["exact"]


def test_cli_count_draws_the_decomposition(tmp_path, capsys):
    # P4 (a-b-c-d) is prime: its picture has one prime node over four leaves
    path = tmp_path / "p4.txt"
    path.write_text("a b\nb c\nc d\n")
    svg = tmp_path / "tree.svg"
    assert main(["count", str(path), "--draw", str(svg)]) == 0
    text = svg.read_text()
    assert text.startswith("<svg") and text.count(">prime<") == 1
    assert all(f">{name}</text>" in text for name in "abcd")
    assert main(["count", str(path), "--draw", str(tmp_path / "tree.png")]) == 2
