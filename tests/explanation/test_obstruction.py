"""Minimal obstructions (minimal non-comparability induced subgraphs) against published facts and
brute force."""

from __future__ import annotations

import itertools
import random

import networkx as nx
import pytest
from order_reference import brute_force_orientable

from satorder import Problem
from satorder.explanation.checks import check_obstruction
from satorder.explanation.explain import explain
from satorder.graph.forcing import transitive_orientation
from satorder.graph.obstruction import find_obstruction, is_minimal_obstruction


def orientable_by_search(g: nx.Graph) -> bool:
    """Reference independent of forcing: backtrack over edge orientations, rejecting a partial
    orientation as soon as some a→b, b→c has a, c non-adjacent or oriented c→a (a transitive
    orientation must contain a→c).  Exhaustive, so exact."""
    edges = list(g.edges())
    arcs: set = set()

    def ok(a, b):
        for c in g[b]:
            if c != a and (b, c) in arcs and (not g.has_edge(a, c) or (c, a) in arcs):
                return False
        for c in g[a]:
            if c != b and (c, a) in arcs and (not g.has_edge(c, b) or (b, c) in arcs):
                return False
        return True

    def search(k):
        if k == len(edges):
            return True
        u, v = edges[k]
        for a, b in ((u, v), (v, u)):
            if ok(a, b):
                arcs.add((a, b))
                if search(k + 1):
                    return True
                arcs.discard((a, b))
        return False

    return search(0)


def brute_minimal(g: nx.Graph, items) -> bool:
    """Brute force: ``items`` induce a non-orientable subgraph, every one-smaller set does not."""
    items = list(items)
    sub = g.subgraph(items)
    if orientable_by_search(sub):
        return False
    return all(orientable_by_search(g.subgraph(items[:k] + items[k + 1:]))
               for k in range(len(items)))


def _obstruction_names(g: nx.Graph):
    p = Problem.from_networkx(g)
    ob = find_obstruction(p.adj)
    return None if ob is None else sorted(p.names(ob), key=int)


@pytest.mark.parametrize("k", [5, 7])
def test_odd_cycle_obstruction_is_the_whole_cycle(k):
    # Golumbic 1980, ch. 5: odd chordless cycles C5, C7 have no transitive orientation while
    # every path (any proper induced subgraph) has one, so the obstruction is the whole cycle.
    assert _obstruction_names(nx.cycle_graph(k)) == [str(v) for v in range(k)]


def test_odd_cycle_found_inside_a_larger_comparability_graph():
    # C7 glued to a bipartite graph through one item: only the cycle is an obstruction
    # (bipartite graphs are comparability graphs, Golumbic 1980, ch. 5).
    g = nx.cycle_graph(7)
    bip = nx.bipartite.random_graph(20, 20, 0.2, seed=3)
    g.add_edges_from((u + 10, v + 10) for u, v in bip.edges())
    g.add_edge(0, 10)
    assert _obstruction_names(g) == [str(v) for v in range(7)]


def test_triangular_prism_is_a_minimal_obstruction():
    # The complement of C6 (the triangular prism) has no transitive orientation (Gallai 1967,
    # recalled from memory; verified here by exhaustive search over all 2^9 orientations).
    prism = nx.complement(nx.cycle_graph(6))
    assert not brute_force_orientable(prism)
    names = _obstruction_names(prism)
    assert names == [str(v) for v in range(6)]
    assert brute_minimal(prism, range(6))


def test_even_cycles_and_bipartite_graphs_have_no_obstruction():
    # Golumbic 1980, ch. 5: bipartite graphs are comparability graphs.
    assert _obstruction_names(nx.cycle_graph(8)) is None
    assert _obstruction_names(nx.bipartite.random_graph(10, 12, 0.4, seed=1)) is None


def test_random_graphs_up_to_eight_items_obstructions_are_minimal_by_brute_force():
    rnd = random.Random(20261202)
    checked = 0
    for _ in range(400):
        n = rnd.randint(5, 8)
        g = nx.gnp_random_graph(n, rnd.uniform(0.25, 0.75), seed=rnd.randrange(1 << 30))
        p = Problem.from_networkx(g)
        ob = find_obstruction(p.adj)
        assert (ob is None) == orientable_by_search(g)
        if ob is None:
            continue
        checked += 1
        labels = [int(p.items[v]) for v in ob]
        assert brute_minimal(g, labels), (sorted(g.edges()), labels)
        assert is_minimal_obstruction(p.adj, ob)
        check_obstruction(p, ob)
    assert checked > 50


def test_search_reference_agrees_with_exhaustive_orientation_on_small_graphs():
    # keeps the backtracking reference honest against the 2^m brute force of order_reference
    rnd = random.Random(7)
    for _ in range(150):
        g = nx.gnp_random_graph(rnd.randint(4, 7), 0.5, seed=rnd.randrange(1 << 30))
        if g.number_of_edges() <= 13:
            assert orientable_by_search(g) == brute_force_orientable(g)


def test_planted_five_cycle_in_a_large_graph_gives_a_small_minimal_obstruction():
    # a bipartite graph on 3,000 items (a comparability graph, Golumbic 1980, ch. 5) plus a
    # planted chordless 5-cycle on fresh items joined to it
    g = nx.bipartite.random_graph(1500, 1500, 0.004, seed=5)
    assert transitive_orientation(Problem.from_networkx(g).adj).orientable
    cyc = [3000 + k for k in range(5)]
    g.add_edges_from(zip(cyc, cyc[1:] + cyc[:1]))
    g.add_edge(cyc[0], 17)
    p = Problem.from_networkx(g)
    res = transitive_orientation(p.adj)
    ob = find_obstruction(p.adj, res)
    assert len(ob) <= 12
    assert sorted(p.names(ob)) == sorted(str(v) for v in cyc)
    assert brute_minimal(g, [int(p.items[v]) for v in ob])


def test_explain_reports_the_obstruction_and_its_core_stays_inside_it():
    g = nx.cycle_graph(5)
    g.add_edges_from([(0, 5), (5, 6), (6, 1)])  # a 4-path detour: even cycles are fine
    p = Problem.from_networkx(g)
    e = explain(p)
    assert e.status == "infeasible"
    ob = set(e.obstruction)
    assert brute_minimal(g, [int(p.items[v]) for v in ob])
    assert {v for r in e.core for v in r.pair} <= ob


def test_minimality_check_rejects_non_minimal_sets():
    g = nx.cycle_graph(5)
    g.add_edge(0, 5)
    p = Problem.from_networkx(g)
    idx = p.index
    assert is_minimal_obstruction(p.adj, [idx[str(v)] for v in range(5)])
    assert not is_minimal_obstruction(p.adj, [idx[str(v)] for v in range(6)])
    assert not is_minimal_obstruction(p.adj, [idx[str(v)] for v in range(4)])
    for pair in itertools.combinations(range(5), 2):
        assert not is_minimal_obstruction(p.adj, [idx[str(v)] for v in pair])


def test_odd_hole_recognition():
    from satorder.graph.obstruction import is_odd_hole

    def holes(g, items):
        p = Problem.from_networkx(g)
        return is_odd_hole(p.adj, [p.index[str(v)] for v in items])

    assert holes(nx.cycle_graph(7), range(7))
    assert not holes(nx.cycle_graph(6), range(6))  # even
    chord = nx.cycle_graph(7)
    chord.add_edge(0, 3)
    assert not holes(chord, range(7))  # a chord
    two = nx.disjoint_union(nx.cycle_graph(5), nx.cycle_graph(5))
    assert not holes(two, range(10))  # degree 2 everywhere but two cycles (even total)
    three = nx.disjoint_union(two, nx.cycle_graph(5))
    assert not holes(three, range(15))  # odd total, still not one cycle
    assert not holes(nx.cycle_graph(3), range(3))  # a triangle is orientable
