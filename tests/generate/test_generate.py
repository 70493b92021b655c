"""Generators: determinism, and what each family is known to be, checked against published
facts, networkx and brute force."""

from __future__ import annotations

import json
import os

import networkx as nx
import pytest
from order_reference import brute_force_orientable, count_orientations, reference_feasible

from satorder import Problem, certify
from satorder.cli.main import main
from satorder.generate import (
    FAMILIES,
    RECIPES,
    generate,
    make_suite,
    write_dense_orders,
    write_random_bipartite,
)
from satorder.io.readers import parse_edge_list, parse_json
from satorder.model.requirement import Requirement
from satorder.pipeline.solve import solve


def _problem(inst) -> Problem:
    return parse_json(inst.to_json_text(), f"<{inst.family}>")


def _graph(inst) -> nx.Graph:
    g = nx.Graph()
    g.add_nodes_from(range(inst.n))
    g.add_edges_from(zip(inst.us, inst.vs))
    return g


def _orientable(inst) -> bool:
    """Forcing engine verdict, certified by the independent checks."""
    return solve(_problem(inst), engine="forcing").status == "feasible"


@pytest.mark.parametrize("family", sorted(FAMILIES))
def test_same_seed_same_text_other_seed_other_text(family):
    # common practice: a benchmark generator must be reproducible from (family, size, seed)
    kw = {"blocks": {"block_size": 10}}.get(family, {})
    n = 40
    a = generate(family, n, seed=7, **kw).to_json_text()
    b = generate(family, n, seed=7, **kw).to_json_text()
    c = generate(family, n, seed=8, **kw).to_json_text()
    assert a == b
    if family != "complete":  # K_n differs by its labels only when labels differ
        assert a != c
    p = parse_json(a)  # every generated file reads back under the contract
    assert p.n == (generate(family, n, seed=7, **kw).n)


@pytest.mark.parametrize("n", [1, 2, 3, 4, 5])
def test_complete_graph_count_is_n_factorial(n):
    # K_n has n! transitive orientations, one per linear order (common practice)
    inst = generate("complete", n, seed=1)
    assert inst.expected_count == count_orientations(n, list(zip(inst.us, inst.vs)))
    assert inst.expected_count == [1, 1, 2, 6, 24, 120][n]


def test_bipartite_count_two_per_component_matches_brute_force():
    # Golumbic 1980, ch. 5: in a triangle-free graph all arcs at an item are Γ-related, so each
    # component with an edge has exactly two transitive orientations.
    checked = 0
    for seed in range(40):
        inst = generate("bipartite", 10, seed=seed, degree=1.6)
        if inst.num_pairs > 14:
            continue
        assert nx.is_bipartite(_graph(inst))
        assert inst.expected_count == count_orientations(10, list(zip(inst.us, inst.vs)))
        checked += 1
    assert checked >= 10


def test_series_parallel_count_matches_brute_force():
    # counting from the modular decomposition (Golumbic 1980, ch. 5): a series node with k
    # children contributes k!; the canonical cotree of a cograph has no other factors.
    checked = 0
    for n in (4, 5, 6, 7):
        for seed in range(25):
            inst = generate("series-parallel", n, seed=seed)
            if inst.num_pairs > 14:
                continue
            edges = list(zip(inst.us, inst.vs))
            assert inst.expected_count == count_orientations(n, edges), (n, seed)
            # a cograph has no induced path on four items (Corneil, Lerchs & Stewart 1981)
            g = _graph(inst)
            assert not any(
                nx.is_isomorphic(g.subgraph(s), nx.path_graph(4))
                for s in _four_sets(n)
            )
            checked += 1
    assert checked >= 30


def _four_sets(n):
    import itertools

    return itertools.combinations(range(n), 4)


def test_interval_complement_is_cocomparability_of_chordal():
    # Gilmore & Hoffman (1964): a graph is an interval graph iff it is chordal and its
    # complement is a comparability graph; the generated graph is that complement.
    for seed in range(5):
        inst = generate("interval-complement", 40, seed=seed, length=0.15)
        assert nx.is_chordal(nx.complement(_graph(inst)))
        assert _orientable(inst)


def test_permutation_graph_and_its_complement_are_comparability_graphs():
    # Pnueli, Lempel & Even (1971): G is a permutation graph iff G and its complement are
    # both comparability graphs.
    for seed, width in [(1, None), (2, None), (3, 6)]:
        inst = generate("permutation", 30, seed=seed, width=width)
        assert _orientable(inst)
        comp = nx.complement(_graph(inst))
        assert solve(Problem.from_networkx(comp), engine="forcing").status == "feasible"


@pytest.mark.parametrize("family,params", [
    ("order", {"degree": 1.5}), ("order", {"degree": 8.0}), ("blocks", {"block_size": 20}),
])
def test_random_orders_are_comparability_graphs_sparse_and_dense(family, params):
    # a comparability graph by construction (transitive closure of a DAG); certified answer
    for seed in range(3):
        inst = generate(family, 60, seed=seed, **params)
        assert inst.expected_status == "feasible" and _orientable(inst)
    sparse = generate("order", 60, seed=1, degree=1.5).num_pairs
    dense = generate("order", 60, seed=1, degree=8.0).num_pairs
    assert dense > 3 * sparse


@pytest.mark.parametrize("kind,length", [("hole", 5), ("hole", 7), ("hole", 9),
                                         ("antihole", 6), ("antihole", 7)])
def test_planted_obstruction_is_induced_and_rest_is_comparability(kind, length):
    # odd holes of length >= 5 (Golumbic 1980, ch. 5) and the complements of C6 and C7 (in
    # Gallai's 1967 list) are not comparability graphs: confirmed here by brute force.
    inst = generate(f"planted-{kind}", 60, seed=3, length=length, joins=4)
    g = _graph(inst)
    core = g.subgraph(inst.planted)
    expected = nx.cycle_graph(length) if kind == "hole" else nx.complement(nx.cycle_graph(length))
    assert nx.is_isomorphic(core, expected)
    assert not brute_force_orientable(nx.convert_node_labels_to_integers(core))
    rest = g.subgraph(set(g) - set(inst.planted))
    assert solve(Problem.from_networkx(rest), engine="forcing").status == "feasible"
    assert not _orientable(inst)
    assert inst.expected_status == "infeasible" and inst.expected_count == 0


@pytest.mark.parametrize("conflict", [None, "transitivity", "cycle", "forcing"])
def test_side_constraints_feasible_or_planted_conflict(conflict):
    for seed in range(3):
        inst = generate("side-constraints", 14, seed=seed, degree=5.0, conflict=conflict)
        p = _problem(inst)
        assert p.fixed and p.forbidden and not p.is_plain
        assert reference_feasible(p) == (conflict is None)
        if conflict:
            # the planted requirements alone are infeasible (independent core check)
            ids = set(inst.planted)
            fx = [a for a in inst.fixed if set(a) <= ids]
            fb = [a for a in inst.forbidden if set(a) <= ids]
            core = [("fixed", a) for a in fx] + [("forbidden", a) for a in fb]
            if conflict == "transitivity":  # a<b, b<c fixed, {a, c} must stay unordered
                core.append(("incomparable", (fx[0][0], fx[1][1])))
            if conflict == "forcing":  # b<x fixed, {b, d} comparable but b<d forbidden,
                core.append(("incomparable", (fx[0][1], fb[0][1])))  # {x, d} unordered
                core.append(("comparable", fb[0]))
            rid = [p.index[name] for name in inst.names]  # generator id -> reader id
            core_ids = [Requirement(k, (rid[a], rid[b])) for k, (a, b) in core]
            certify.check_core_infeasible(p, core_ids, minimal=True)


@pytest.mark.parametrize("conflict", [False, True])
def test_open_pairs_have_open_pairs_and_known_status(conflict):
    for seed in range(3):
        inst = generate("open-pairs", 16, seed=seed, conflict=conflict)
        p = _problem(inst)
        assert p.has_open_pairs
        assert reference_feasible(p) == (not conflict)


def test_preferences_consistent_cost_zero_and_bound():
    inst = generate("preferences", 12, seed=4, count=6, consistent=True)
    assert inst.expected_cost == 0 and inst.cost_at_most == 0
    mixed = generate("preferences", 12, seed=4, count=6)
    p = _problem(mixed)
    assert len(p.prefer) == 6 and mixed.expected_status == "feasible"
    assert reference_feasible(p)  # hard requirements hold for the hidden order
    assert mixed.cost_at_most == sum(w for a, b, w in mixed.prefer
                                     if (b, a) in set(zip(mixed.us, mixed.vs)))


def test_gnp_status_unknown_but_graph_has_expected_density():
    inst = generate("gnp", 400, seed=2, c=2.0)
    assert inst.expected_status is None
    # G(n, c/n) has about c(n-1)/2 edges (Erdős & Rényi 1960); allow 6 standard deviations
    mean = 2.0 * 399 / 2
    assert abs(inst.num_pairs - mean) < 6 * mean ** 0.5


def test_large_writers_make_the_requested_shapes(tmp_path):
    f = tmp_path / "b.txt"
    inst = write_random_bipartite(str(f), items=1000, pairs=5_000, seed=3)
    p = parse_edge_list(f.read_text())
    assert p.num_comparable == 5_000 == inst.num_pairs
    assert nx.is_bipartite(p.to_networkx())
    d = tmp_path / "d.txt"
    dense = write_dense_orders(str(d), blocks=8, block_size=100, seed=3)
    pd = parse_edge_list(d.read_text())
    # 100-item blocks with degree 12 close to ≈3,200 comparable pairs each (measured)
    assert 2800 * 8 < pd.num_comparable < 3600 * 8
    assert nx.number_connected_components(pd.to_networkx()) >= 8
    assert solve(pd, engine="forcing").status == "feasible"
    c = tmp_path / "c.txt"
    planted = write_dense_orders(str(c), blocks=8, block_size=100, seed=3, plant_hole=True,
                                 joins=3)
    pc = parse_edge_list(c.read_text())
    # same seed, same blocks: the planted graph adds the 5-cycle and at most 3 joins
    assert dense.num_pairs + 5 < pc.num_comparable <= dense.num_pairs + 8
    names = [planted.names[i] for i in planted.planted]
    g = pc.to_networkx()
    assert nx.is_isomorphic(g.subgraph(names), nx.cycle_graph(5))
    assert solve(pc, engine="forcing").status == "infeasible"
    assert solve(Problem.from_networkx(g.subgraph(set(g) - set(names))),
                 engine="forcing").status == "feasible"


def test_make_suite_writes_manifest_and_removes_stale_files(tmp_path):
    specs = RECIPES["small"][:3]
    m = make_suite(str(tmp_path), specs, "t")
    assert [e["file"] for e in m["instances"]] == sorted(os.listdir(tmp_path))[:3]
    on_disk = json.loads((tmp_path / "manifest.json").read_text())
    assert on_disk["instances"] == m["instances"]
    make_suite(str(tmp_path), specs[:1], "t")
    assert sorted(os.listdir(tmp_path)) == [m["instances"][0]["file"], "manifest.json"]


def test_cli_make_suite_family_and_errors(tmp_path, capsys):
    out = tmp_path / "s"
    assert main(["make-suite", str(out), "--family", "order", "--items", "10", "20",
                 "--seeds", "1", "2", "--set", "degree=1.5", "--format", "edges"]) == 0
    m = json.loads((out / "manifest.json").read_text())
    assert len(m["instances"]) == 4
    assert all(e["params"] == {"degree": 1.5} for e in m["instances"])
    assert main(["make-suite", str(out), "--family", "order"]) == 2
    assert main(["make-suite", str(out), "--family", "side-constraints", "--items", "10",
                 "--format", "edges"]) == 2
    assert main(["make-suite", str(out), "--family", "order", "--items", "10",
                 "--set", "nonsense=1"]) == 2
    assert main(["make-suite", str(out), "--family", "planted-hole", "--items", "5"]) == 2
    assert main(["make-suite", str(out), "--family", "side-constraints", "--items", "10",
                 "--set", "conflict=sideways"]) == 2
    assert main(["make-suite", "--list"]) == 0
    assert "series-parallel" in capsys.readouterr().out


def test_huge_counts_are_recorded_by_size():
    # log10(n!) = lgamma(n + 1) / ln 10 (handbook identity); 2000! has 5,736 digits
    import math

    entry = generate("complete", 2000, seed=1).manifest_entry("k.json")
    assert entry["expected_count"] is None
    assert abs(entry["expected_count_log10"] - math.lgamma(2001) / math.log(10)) < 1e-3
    json.dumps(entry)  # writable, unlike a 5,736-digit integer under Python's default limit
    assert generate("complete", 30, seed=1).manifest_entry("k.json")["expected_count"] == \
        math.factorial(30)
