"""The independent check of a modular decomposition and of its colour classes, against brute
force over small graphs and against the forcing engine."""

from __future__ import annotations

import itertools
import random

import networkx as nx
import pytest
from order_reference import all_graphs, count_orientations

from satorder.certify.decomposition import _colour_classes, _join_ties, check_decomposition
from satorder.errors import CertificateError
from satorder.graph.forcing import transitive_orientation
from satorder.graph.modular import LEAF, ModuleNode, modular_decomposition


def leaf(i):
    return ModuleNode(LEAF, item=i)


def adjacency(g: nx.Graph) -> list[set[int]]:
    return [set(g[v]) for v in range(g.number_of_nodes())]


def naive_colour_classes(adj: list[set[int]]) -> int:
    """Colour classes straight from the definition (Golumbic 1980, §5.1): arcs a→b and a→b'
    are Γ-related when b, b' are not adjacent, and so are a→b and a'→b when a, a' are not;
    every pair of arcs is tried.  0 when some class holds an arc and its reverse."""
    arcs = [(a, b) for a in range(len(adj)) for b in adj[a]]
    parent = {arc: arc for arc in arcs}

    def find(x):
        while parent[x] != x:
            x = parent[x]
        return x

    for (a, b), (c, d) in itertools.combinations(arcs, 2):
        if (a == c and b != d and d not in adj[b]) or (b == d and a != c and c not in adj[a]):
            parent[find((a, b))] = find((c, d))
    if any(find((a, b)) == find((b, a)) for a, b in arcs):
        return 0
    return len({find(arc) for arc in arcs}) // 2


def test_colour_classes_match_the_definition_on_every_graph_with_five_items():
    for g in all_graphs(5):
        adj = adjacency(g)
        classes, _ = _colour_classes(adj, 10**9)
        assert classes == naive_colour_classes(adj), sorted(g.edges())


def test_colour_classes_match_the_forcing_engine_on_random_graphs():
    # the engine's implication classes are counted with their reverses, as colour classes;
    # graphs large enough that the union-find runs compiled (over 1000 ties) are included
    rnd = random.Random(4)
    for trial in range(60):
        n = rnd.randint(6, 14) if trial < 50 else rnd.randint(120, 160)
        g = nx.gnp_random_graph(n, rnd.uniform(0.15, 0.6), seed=rnd.randrange(10**6))
        if trial % 3 == 0:  # comparability graphs too: the comparability graph of a random order
            g = nx.transitive_closure_dag(_random_dag(rnd, n)).to_undirected()
        adj = adjacency(g)
        res = transitive_orientation(adj)
        classes, _ = _colour_classes(adj, 10**9)
        assert classes == (res.num_classes if res.orientable else 0)


def _random_dag(rnd: random.Random, n: int) -> nx.DiGraph:
    d = nx.DiGraph()
    d.add_nodes_from(range(n))
    d.add_edges_from((a, b) for a, b in itertools.combinations(range(n), 2) if rnd.random() < 0.1)
    return d


def test_compiled_and_plain_union_find_agree():
    import numpy as np

    from satorder.jit import HAVE_NUMBA, run

    if not HAVE_NUMBA:
        pytest.skip("numba is not installed")
    rnd = np.random.default_rng(9)
    for _ in range(40):
        m = int(rnd.integers(1, 40))
        k = int(rnd.integers(0, 60))
        e_s, e_x = rnd.integers(0, m, k), rnd.integers(0, m, k)
        flip = rnd.integers(0, 2, k).astype(bool)
        plain = _join_ties(list(range(m)), [False] * m, e_s.tolist(), e_x.tolist(),
                           flip.tolist())
        compiled = run(_join_ties, np.arange(m), np.zeros(m, dtype=np.bool_), e_s, e_x, flip)
        assert plain == compiled


def test_budget_stops_the_check():
    g = nx.cycle_graph(6)
    adj = adjacency(g)
    tree = ModuleNode("prime", [leaf(i) for i in range(6)])
    assert check_decomposition(adj, tree) == 2  # an even cycle is prime with two orientations
    assert check_decomposition(adj, tree, budget=20) is None
    assert _colour_classes(adj, 3) is None


def test_odd_cycle_claimed_prime_implies_no_answer():
    # odd cycles of length >= 5 are prime and not comparability graphs (Golumbic 1980, ch. 5)
    for k in (5, 7):
        adj = adjacency(nx.cycle_graph(k))
        assert check_decomposition(adj, ModuleNode("prime", [leaf(i) for i in range(k)])) == 0


def test_decomposition_check_catches_damaged_trees():
    # C4 = K_{2,2}: series of two parallel pairs, 2! orientations (common practice)
    c4 = [{1, 3}, {0, 2}, {1, 3}, {0, 2}]
    tree = modular_decomposition(c4)
    assert check_decomposition(c4, tree) == 2

    wrong_kind = ModuleNode("parallel", tree.children)
    not_modules = ModuleNode("series", [ModuleNode("parallel", [leaf(0), leaf(1)]),
                                        ModuleNode("parallel", [leaf(2), leaf(3)])])
    missing = ModuleNode("series", [ModuleNode("parallel", [leaf(0), leaf(2)]), leaf(1)])
    for bad in (wrong_kind, not_modules, missing):
        with pytest.raises(CertificateError):
            check_decomposition(c4, bad)
    # P4 claimed prime over its items is right (2 orientations); P4 plus a true twin of an end
    # claimed prime over all five items is wrong: the twins form a module with an edge
    p4 = [{1}, {0, 2}, {1, 3}, {2}]
    assert check_decomposition(p4, ModuleNode("prime", [leaf(i) for i in range(4)])) == 2
    twin = [{1, 4}, {0, 2, 4}, {1, 3}, {2}, {0, 1}]
    with pytest.raises(CertificateError):
        check_decomposition(twin, ModuleNode("prime", [leaf(i) for i in range(5)]))


def test_decomposition_check_agrees_with_brute_force():
    for n in (4, 5):
        for g in all_graphs(n):
            edges = list(g.edges())
            adj = adjacency(g)
            if not edges or not transitive_orientation(adj).orientable:
                continue
            assert check_decomposition(adj, modular_decomposition(adj)) == \
                count_orientations(n, edges)
