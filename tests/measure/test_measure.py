"""Height, width, partitions, weighted chain/antichain, Hasse diagram: brute force, networkx as
a reference library, Dilworth's and Mirsky's theorems, and the independent checker."""

from __future__ import annotations

import itertools
import json
import random
import time

import networkx as nx
import pytest
from order_reference import random_order

from satorder import Problem, solve
from satorder.certify.measure import (
    check_height,
    check_measures,
    check_weighted_antichain,
    check_weighted_chain,
    check_width,
)
from satorder.cli.main import main
from satorder.errors import CertificateError
from satorder.measure.figures import (
    Figure,
    hasse_diagram,
    height,
    max_weight_antichain,
    max_weight_chain,
    width,
)
from satorder.measure.summary import measure


def is_chain(succ, items):
    return all(b in succ[a] or a in succ[b] for a, b in itertools.combinations(items, 2))


def is_antichain(succ, items):
    return all(b not in succ[a] and a not in succ[b] for a, b in itertools.combinations(items, 2))


def brute_best(succ, weights, test):
    """Largest total weight of an item set passing ``test``, over all subsets."""
    n = len(succ)
    best = 0
    for mask in range(1 << n):
        items = [i for i in range(n) if mask >> i & 1]
        w = sum(weights[i] for i in items)
        if w > best and test(succ, items):
            best = w
    return best


def to_digraph(succ):
    g = nx.DiGraph()
    g.add_nodes_from(range(len(succ)))
    g.add_edges_from((a, b) for a, s in enumerate(succ) for b in s)
    return g


def test_figures_match_brute_force_on_random_small_orders():
    # brute force over all item subsets (common practice for tiny cases)
    rng = random.Random(11)
    for _ in range(120):
        n = rng.randint(1, 9)
        succ = random_order(n, rng.random() * 0.7, rng)
        weights = [rng.randint(1, 6) for _ in range(n)]
        m = measure(succ, weights=dict(enumerate(weights)))
        ones = [1] * n
        assert m.height.value == brute_best(succ, ones, is_chain)
        assert m.width.value == brute_best(succ, ones, is_antichain)
        assert m.weighted_chain.value == brute_best(succ, weights, is_chain)
        assert m.weighted_antichain.value == brute_best(succ, weights, is_antichain)
        # witnesses are what they claim (the checker's own test, repeated here plainly)
        assert is_chain(succ, m.height.witness) and len(m.height.witness) == m.height.value
        assert is_antichain(succ, m.width.witness) and len(m.width.witness) == m.width.value
        # Mirsky (1971): height = least number of antichains covering the order;
        # Dilworth (1950): width = least number of chains covering the order
        assert len(m.height.partition) == m.height.value
        assert all(is_antichain(succ, p) for p in m.height.partition)
        assert len(m.width.partition) == m.width.value
        assert all(is_chain(succ, c) for c in m.width.partition)
        assert sorted(x for c in m.width.partition for x in c) == list(range(n))
        check_measures(succ, m, dict(enumerate(weights)))
        assert m.verified


def test_against_networkx_reference_results():
    # networkx transitive_reduction, antichains and dag_longest_path as reference results
    rng = random.Random(5)
    for _ in range(40):
        n = rng.randint(2, 11)
        succ = random_order(n, rng.random() * 0.5, rng)
        g = to_digraph(succ)
        m = measure(succ)
        assert set(m.hasse) == set(nx.transitive_reduction(g).edges())
        assert set(hasse_diagram(succ).edges()) == set(m.hasse)
        assert m.width.value == max(len(a) for a in nx.antichains(g))
        assert m.height.value == len(nx.dag_longest_path(g))
        pos = {x: i for i, x in enumerate(m.linear_extension)}
        assert all(pos[a] < pos[b] for a, b in g.edges())


def test_width_and_height_at_moderate_size_agree_with_networkx():
    # networkx dag_longest_path (height) and a second matching route (networkx Hopcroft–Karp
    # on the same bipartite graph; Fulkerson 1956: width = n − maximum matching)
    rng = random.Random(3)
    n = 300
    succ = random_order(n, 0.02, rng)
    g = to_digraph(succ)
    m = measure(succ)
    assert m.height.value == len(nx.dag_longest_path(g))
    b = nx.Graph()
    left = [("L", x) for x in range(n)]
    b.add_nodes_from(left)
    b.add_nodes_from(("R", x) for x in range(n))
    b.add_edges_from((("L", a), ("R", c)) for a, c in g.edges())
    matching = nx.bipartite.hopcroft_karp_matching(b, top_nodes=left)
    assert m.width.value == n - len(matching) // 2
    check_measures(succ, m)


def test_known_orders():
    # a chain of 5: height 5, width 1; an antichain of 4: height 1, width 4 (common practice)
    chain = [set(range(i + 1, 5)) for i in range(5)]
    assert (height(chain).value, width(chain).value) == (5, 1)
    anti = [set() for _ in range(4)]
    assert (height(anti).value, width(anti).value) == (1, 4)
    # the Boolean lattice of subsets of a 3-set: height 4, width C(3,1) = 3 (Sperner 1928)
    subsets = list(range(8))
    succ = [{b for b in subsets if a != b and a & b == a} for a in subsets]
    assert (height(succ).value, width(succ).value) == (4, 3)


def test_weighted_figures_prefer_heavy_items():
    # 0 < 1 and 2 unrelated: weights make the chain {0,1} lighter than item 2 alone
    succ = [{1}, set(), set()]
    w = [1, 1, 5]
    assert max_weight_chain(succ, w).value == 5
    a = max_weight_antichain(succ, w)
    assert a.value == 6 and sorted(a.witness) in ([0, 2], [1, 2])


def test_checker_rejects_wrong_witnesses():
    succ = [{1, 2}, {2}, set(), set()]  # 0 < 1 < 2, 3 alone
    h, w = height(succ), width(succ)
    with pytest.raises(CertificateError):
        check_height(succ, Figure(3, [0, 2, 1], h.partition))  # not increasing
    with pytest.raises(CertificateError):
        check_height(succ, Figure(2, [0, 2], [[0, 3], [1, 2]]))  # 1 < 2 in one "antichain"
    with pytest.raises(CertificateError):
        check_width(succ, Figure(2, [0, 1], w.partition))  # 0 < 1: not an antichain
    with pytest.raises(CertificateError):
        check_width(succ, Figure(2, [0, 3], [[0, 1, 2]]))  # partition misses item 3
    ones = [1] * 4
    wc = max_weight_chain(succ, ones)
    with pytest.raises(CertificateError):
        check_weighted_chain(succ, ones, Figure(3, wc.witness, potentials=[0, 0, 0, 0]))
    wa = max_weight_antichain(succ, ones)
    with pytest.raises(CertificateError):
        check_weighted_antichain(succ, ones, Figure(3, [0, 3, 1], flow=wa.flow))


def test_measure_cli_json_with_weights(tmp_path):
    doc = {
        "comparable": [["sift", "knead"], ["knead", "bake"], ["sift", "bake"],
                       ["proof", "bake"], ["proof", "knead"]],
        "items": ["sift", "knead", "bake", "proof", "glaze"],
        "weights": {"glaze": 7, "sift": 2},
    }
    f = tmp_path / "bakery.json"
    f.write_text(json.dumps(doc))
    out = tmp_path / "figures.json"
    assert main(["measure", str(f), "--json", "--out", str(out)]) == 0
    res = json.loads(out.read_text())
    assert res["height"] == 3 and res["width"] == 3 and res["dimension"] == 2
    assert res["verified"] is True
    assert res["longest_chain"][-1] == "bake"
    assert res["max_weight_antichain"]["weight"] == 7 + 2 + 1  # glaze, sift, proof
    assert res["max_weight_chain"] == {"weight": 7, "items": ["glaze"]}


def test_measure_cli_infeasible_and_bad_draw_name(tmp_path, capsys):
    # a 5-cycle is not a comparability graph (Golumbic 1980, ch. 5: odd holes), so no order exists
    f = tmp_path / "ring.txt"
    f.write_text("".join(f"r{i} r{(i + 1) % 5}\n" for i in range(5)))
    assert main(["measure", str(f), "--json"]) == 0
    res = json.loads(capsys.readouterr().out)
    assert res["status"] == "infeasible" and res["height"] is None
    g = tmp_path / "line.txt"
    g.write_text("a b\n")
    assert main(["measure", str(g), "--draw", str(tmp_path / "x.png")]) == 2


def test_measure_cli_keeps_its_time_limit_on_the_standard_example_s11(tmp_path, capfd):
    # S_11: a_i < b_j exactly when i != j, dimension 11 (Dushnik & Miller 1941); proving that
    # takes the SAT search minutes, so with --time-limit 5 the command reports a bounded (or
    # exact) dimension that its checker confirmed, and writes nothing to stderr
    f = tmp_path / "s11.txt"
    f.write_text("".join(f"a{i} b{j}\n" for i in range(1, 12) for j in range(1, 12) if i != j))
    t0 = time.monotonic()
    assert main(["measure", str(f), "--json", "--time-limit", "5"]) == 0
    assert time.monotonic() - t0 < 60  # a sanity bound: it returned
    out, err = capfd.readouterr()
    assert err == ""
    res = json.loads(out)
    assert res["verified"] is True and res["width"] == 11 and res["height"] == 2
    if res["dimension_status"] == "exact":
        assert res["dimension"] == 11
    else:
        assert res["dimension_status"] == "bounded"
        lower, upper = res["dimension_bounds"]
        assert 3 <= lower <= 11 <= upper
        assert res["dimension_witness"]["dimension_at_least"] == lower
    with pytest.raises(SystemExit) as stop:  # not a time limit: a usage error from argparse
        main(["measure", str(f), "--time-limit", "0"])
    assert stop.value.code == 2
    assert "--time-limit: must be positive" in capfd.readouterr().err


def test_measure_on_solved_problem_matches_networkx():
    # the plain path: comparability graph in, order out, figures of that order
    g = nx.random_labeled_tree(30, seed=4)  # trees are bipartite, hence comparability graphs
    ans = solve(Problem.from_networkx(g))
    m = measure(ans.succ)
    check_measures(ans.succ, m)
    assert m.height.value <= 2
    # a maximum independent set of a bipartite graph: n − maximum matching (König 1931)
    match = nx.max_weight_matching(g, maxcardinality=True)
    assert m.width.value == 30 - len(match)


def test_python_api_takes_answers_and_returns_networkx_graphs():
    p = Problem.from_lists(comparable=[("kiln", "loom"), ("loom", "quay"), ("kiln", "quay")],
                           items=["vat"], weights={"vat": 9})
    ans = solve(p)
    m = measure(ans)
    g = m.hasse_graph(p.items)
    assert isinstance(g, nx.DiGraph) and g.number_of_edges() == 2
    assert {g.nodes[x]["level"] for x in p.items} == {1, 2, 3}
    assert m.weighted_antichain.value == 9 + 1  # weights taken from the problem
    assert nx.is_isomorphic(g, nx.transitive_reduction(ans.to_networkx()))
