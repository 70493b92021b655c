"""The forcing algorithm against brute force and published facts."""

from __future__ import annotations

import random

import networkx as nx
import pytest
from order_reference import all_graphs, brute_force_orientable

from satorder import Problem, certify
from satorder.errors import CertificateError
from satorder.graph.forcing import transitive_orientation
from satorder.pipeline.solve import solve


def _check(g: nx.Graph) -> bool:
    """Run forcing on g; certify whichever answer it gives; return its verdict."""
    p = Problem.from_networkx(g)
    res = transitive_orientation(p.adj)
    if res.orientable:
        certify.check_order(p, res.successor_sets())
    else:
        certify.check_forcing_chain(p, res.chain)
    return res.orientable


@pytest.mark.parametrize("n", [1, 2, 3, 4, 5])
def test_every_small_graph_matches_brute_force(n):
    for g in all_graphs(n):
        assert _check(g) == brute_force_orientable(g), sorted(g.edges())


@pytest.mark.slow
def test_random_graphs_up_to_nine_items_match_brute_force():
    rnd = random.Random(20261201)
    for _ in range(150):
        n = rnd.randint(6, 9)
        g = nx.gnp_random_graph(n, rnd.uniform(0.2, 0.8), seed=rnd.randrange(1 << 30))
        if g.number_of_edges() > 16:  # brute force is 2^m; keep it bounded
            continue
        assert _check(g) == brute_force_orientable(g), sorted(g.edges())


@pytest.mark.parametrize("k", [5, 7, 9, 11])
def test_odd_cycles_are_not_comparability_graphs(k):
    # Golumbic 1980, ch. 5: an odd cycle of length >= 5 has no transitive orientation.
    assert not _check(nx.cycle_graph(k))


@pytest.mark.parametrize("k", [4, 6, 8, 20])
def test_even_cycles_are_comparability_graphs(k):
    # Golumbic 1980, ch. 5: bipartite graphs, even cycles included, are comparability graphs.
    assert _check(nx.cycle_graph(k))


def test_random_bipartite_graphs_are_comparability_graphs():
    # Golumbic 1980, ch. 5: every bipartite graph is a comparability graph (orient side A -> B).
    for seed in range(20):
        g = nx.bipartite.random_graph(15, 20, 0.3, seed=seed)
        assert _check(g)


def test_complements_of_interval_graphs_are_comparability_graphs():
    # Gilmore & Hoffman 1964: the complement of an interval graph is a comparability graph.
    rnd = random.Random(5)
    for _ in range(30):
        intervals = []
        for _ in range(rnd.randint(3, 25)):
            a = rnd.uniform(0, 10)
            intervals.append((a, a + rnd.uniform(0, 3)))
        g = nx.complement(nx.interval_graph(intervals))
        assert _check(g)


@pytest.mark.parametrize("n", [1, 2, 5, 9])
def test_complete_graph_orientation_is_a_linear_order(n):
    # Common practice: every transitive orientation of K_n is a linear order of its n items.
    ans = solve(Problem.from_networkx(nx.complete_graph(n)))
    assert ans.verified
    heights = sorted(len(s) for s in ans.succ)
    assert heights == list(range(n))


def test_triangular_prism_has_a_forcing_conflict():
    # complement of C6; no transitive orientation (Gallai 1967; brute force confirms here)
    g = nx.complement(nx.cycle_graph(6))
    assert not brute_force_orientable(g)
    assert not _check(g)


def test_a_wrong_chain_fails_its_check():
    p = Problem.from_networkx(nx.cycle_graph(5))
    chain = transitive_orientation(p.adj).chain
    broken = list(chain[:-1])  # drop the closing step: no longer ends in the reverse
    with pytest.raises(CertificateError):
        certify.check_forcing_chain(p, broken)


def test_compiled_and_pure_python_gamma_steps_agree():
    # two independent implementations of the same step (numba kernel, set-based loop): each
    # step is a genuine Γ step, and both give the same co-components around every item
    from satorder.graph.forcing import gamma_steps

    def partition(steps, adj, unordered):
        trees: dict = {}
        for v, y, x in zip(*(t.tolist() for t in steps)):
            assert y in adj[v] and x in adj[v] and y != x
            assert (x not in adj[y]) if unordered is None else (x in unordered[y])
            trees.setdefault(v, nx.Graph()).add_edge(y, x)
        return {(v, frozenset(c)) for v, g in trees.items() for c in nx.connected_components(g)}

    rnd = random.Random(11)
    for _ in range(60):
        n = rnd.randint(2, 40)
        g = nx.gnp_random_graph(n, rnd.uniform(0.05, 0.9), seed=rnd.randrange(1 << 30))
        adj = Problem.from_networkx(g).adj
        unordered = None
        if rnd.random() < 0.5:  # an explicit list: some non-adjacent pairs, the rest open
            unordered = [set() for _ in range(n)]
            for a, b in nx.complement(g).edges():
                if rnd.random() < 0.6:
                    unordered[a].add(b)
                    unordered[b].add(a)
        fast = partition(gamma_steps(adj, unordered, compiled=True), adj, unordered)
        slow = partition(gamma_steps(adj, unordered, compiled=False), adj, unordered)
        assert fast == slow


def test_compiled_union_find_matches_scipy_components():
    # the compiled union-find and scipy's connected_components must give the same partition
    import numpy as np
    from scipy.sparse.csgraph import connected_components

    from satorder.graph import kernels as _kernels
    from satorder.graph.forcing import _doubled_components_py, tie_graph

    rnd = np.random.default_rng(3)
    for _ in range(30):
        m = int(rnd.integers(1, 60))
        k = int(rnd.integers(0, 80))
        e1, e2 = rnd.integers(0, m, k), rnd.integers(0, m, k)
        fl = rnd.integers(0, 2, k)
        _, ours = _kernels.doubled_components(m, e1, e2, fl)
        _, ref = connected_components(tie_graph(m, e1, e2, fl), directed=False)
        pairs = set(zip(ours.tolist(), ref.tolist()))
        assert len(pairs) == len(set(ours.tolist())) == len(set(ref.tolist()))
        # the pure-Python twin (small graphs) labels exactly as the kernel does
        count, twin = _doubled_components_py(m, e1.tolist(), e2.tolist(), fl.tolist())
        assert twin == ours.tolist() and count == len(set(ours.tolist()))


def test_small_graph_path_gives_the_array_path_answer(monkeypatch):
    # below KERNELS_FROM edges the forcing algorithm runs on plain lists (no numpy, no numba);
    # it must give the very same orientation, class count and verdict as the array path
    import random

    import networkx as nx

    from satorder.graph import forcing

    rnd = random.Random(11)
    graphs = [nx.gnp_random_graph(rnd.randint(2, 14), rnd.random(), seed=rnd.randint(0, 10**6))
              for _ in range(60)]
    for _ in range(20):  # comparability graphs of random orders (orientable)
        n = rnd.randint(3, 30)
        g = nx.Graph()
        g.add_nodes_from(range(n))
        g.add_edges_from(_random_dag(n, rnd).edges())
        graphs.append(g)
    for g in graphs:
        adj = [set(g[v]) for v in range(g.number_of_nodes())]
        small = forcing.transitive_orientation(adj)
        with monkeypatch.context() as m:
            m.setattr(forcing, "KERNELS_FROM", 0)
            array = forcing.transitive_orientation(adj)
        assert small.orientable == array.orientable
        assert small.num_classes == array.num_classes
        if small.orientable:
            assert isinstance(small.up, list)  # the list path answered
            assert sorted(small.arcs()) == sorted(array.arcs())
            assert small.successor_sets() == array.successor_sets()


def _random_dag(n, rnd):
    import networkx as nx

    d = nx.DiGraph()
    d.add_nodes_from(range(n))
    d.add_edges_from((a, b) for a in range(n) for b in range(a + 1, n) if rnd.random() < 0.15)
    return nx.transitive_closure_dag(d)




@pytest.mark.parametrize("table", [False, True])
def test_one_pass_orientation_kernel_matches_the_tie_array_path(monkeypatch, table):
    # the compiled one-pass kernel (union-find with parity, no tie arrays; with and without
    # its edge lookup table) against the tie arrays + scipy components path it replaces: the
    # same verdict, the same number of classes and the very same orientation
    import numpy as np

    from satorder.generate.families import generate
    from satorder.graph import forcing
    from satorder.graph import kernels as _kernels
    from satorder.jit import HAVE_NUMBA

    if not HAVE_NUMBA:
        pytest.skip("the one-pass kernel needs numba")
    monkeypatch.setattr(_kernels, "TABLE_EDGES", 0 if table else 1 << 40)
    monkeypatch.setattr(forcing, "KERNELS_FROM", 0)  # the array paths, even on small graphs
    rnd = random.Random(21 + table)
    verdicts = set()
    for trial in range(100):
        family = rnd.choice(["order", "permutation", "bipartite", "series-parallel", "gnp",
                             "interval-complement", "complete", "planted-hole"])
        inst = generate(family, rnd.randint(8 if family == "planted-hole" else 1, 45), seed=trial)
        adj = [set() for _ in range(inst.n)]
        for u, v in zip(inst.us, inst.vs):
            adj[u].add(v)
            adj[v].add(u)
        fast = forcing.transitive_orientation(adj)
        monkeypatch.setattr(forcing, "HAVE_NUMBA", False)
        slow = forcing.transitive_orientation(adj)
        monkeypatch.setattr(forcing, "HAVE_NUMBA", True)
        assert fast.orientable == slow.orientable, (family, trial)
        verdicts.add(fast.orientable)
        if fast.orientable:
            assert fast.num_classes == slow.num_classes
            assert fast.successor_sets() == slow.successor_sets()
            assert sorted(fast.arcs()) == sorted(slow.arcs())
            assert np.array_equal(np.sort(fast.successor_sets().csr()[1]),
                                  np.sort(slow.successor_sets().csr()[1]))
    assert verdicts == {True, False}
