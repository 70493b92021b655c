"""Modular decomposition against brute force and networkx.

Facts used: the strong modules of a graph (modules overlapping no other module) form a tree whose
internal nodes are parallel (graph disconnected: children are the components), series
(complement disconnected: children are the co-components) or prime (quotient has only trivial
modules) — Gallai 1967, as restated in McConnell & Spinrad 2000.  Components are taken from
networkx as the reference library.
"""

from __future__ import annotations

import itertools
import random

import networkx as nx
import pytest

from satorder.graph.modular import (
    LEAF,
    PARALLEL,
    PRIME,
    SERIES,
    count_transitive_orientations,
    modular_decomposition,
    quotient,
)


def random_graph(n: int, p: float, rng: random.Random) -> list[set[int]]:
    adj: list[set[int]] = [set() for _ in range(n)]
    for a, b in itertools.combinations(range(n), 2):
        if rng.random() < p:
            adj[a].add(b)
            adj[b].add(a)
    return adj


def nested_graph(n: int, rng: random.Random) -> list[set[int]]:
    """A graph built by repeated substitution of random small graphs (many nested modules)."""
    adj: list[set[int]] = [set() for _ in range(n)]

    def build(items):
        if len(items) <= 1:
            return
        k = rng.randint(2, min(5, len(items)))
        rng.shuffle(items)
        cuts = sorted(rng.sample(range(1, len(items)), k - 1))
        groups = [items[i:j] for i, j in zip([0] + cuts, cuts + [len(items)])]
        p = rng.random()
        for a, b in itertools.combinations(range(k), 2):
            if rng.random() < p:
                for x in groups[a]:
                    for y in groups[b]:
                        adj[x].add(y)
                        adj[y].add(x)
        for g in groups:
            build(g)

    build(list(range(n)))
    return adj


def brute_modules(adj: list[set[int]], universe=None) -> list[frozenset[int]]:
    """Every nonempty module of adj restricted to ``universe`` (by the definition)."""
    items = sorted(range(len(adj)) if universe is None else universe)
    out = []
    for r in range(1, len(items) + 1):
        for sub in itertools.combinations(items, r):
            m = set(sub)
            if all(len(adj[u] & m) in (0, len(m)) for u in items if u not in m):
                out.append(frozenset(m))
    return out


def brute_strong_modules(adj: list[set[int]]) -> set[frozenset[int]]:
    ms = brute_modules(adj)
    return {m for m in ms if all(m <= x or x <= m or not (m & x) for x in ms)}


def check_tree(adj: list[set[int]], seed: int = 0) -> None:
    tree = modular_decomposition(adj, seed=seed)
    assert {node.items for node in tree.nodes()} == brute_strong_modules(adj)
    g = nx.Graph()
    g.add_nodes_from(range(len(adj)))
    g.add_edges_from((a, b) for a in range(len(adj)) for b in adj[a])
    for node in tree.nodes():
        if node.kind == LEAF:
            assert len(node.items) == 1 and not node.children
            continue
        kids = {c.items for c in node.children}
        assert len(kids) == len(node.children) >= 2
        sub = g.subgraph(node.items)
        comps = {frozenset(c) for c in nx.connected_components(sub)}
        cocomps = {frozenset(c) for c in nx.connected_components(nx.complement(sub))}
        if node.kind == PARALLEL:
            assert comps == kids
        elif node.kind == SERIES:
            assert cocomps == kids
        else:
            assert node.kind == PRIME
            assert len(comps) == 1 and len(cocomps) == 1
            q = quotient(adj, node)
            # a prime quotient has only the trivial modules (single vertices and everything)
            assert len(q) >= 4
            assert all(len(m) in (1, len(q)) for m in brute_modules(q))


@pytest.mark.parametrize("n", range(1, 8))
def test_random_graphs_against_brute_force(n):
    rng = random.Random(100 + n)
    for trial in range(60):
        check_tree(random_graph(n, rng.random(), rng), seed=trial)


@pytest.mark.parametrize("n", [6, 8, 10, 11])
def test_nested_substitution_graphs_against_brute_force(n):
    rng = random.Random(n)
    for trial in range(25 if n < 10 else 8):
        check_tree(nested_graph(n, rng), seed=trial)


def test_complete_graph_is_one_series_node():
    # K_n: every subset is a module; the strong ones are the singletons and the whole
    adj = [set(range(300)) - {i} for i in range(300)]
    tree = modular_decomposition(adj)
    assert tree.kind == SERIES and len(tree.children) == 300


def test_path_p4_is_prime_and_cycle_c4_is_series():
    # P4 is the smallest prime graph; C4 = K_{2,2} is the join of two non-edges (common practice)
    p4 = [{1}, {0, 2}, {1, 3}, {2}]
    assert modular_decomposition(p4).kind == PRIME
    c4 = [{1, 3}, {0, 2}, {1, 3}, {0, 2}]
    tree = modular_decomposition(c4)
    assert tree.kind == SERIES
    assert sorted(sorted(c.items) for c in tree.children) == [[0, 2], [1, 3]]
    assert all(c.kind == PARALLEL for c in tree.children)


def test_deep_threshold_graph_alternates_series_and_parallel():
    # a threshold graph (each new item isolated or dominating) is a cograph whose tree is a
    # caterpillar: every internal node has a leaf child and one internal child
    rng = random.Random(5)
    n = 400
    adj: list[set[int]] = [set() for _ in range(n)]
    kinds = []
    for v in range(1, n):
        dominating = rng.random() < 0.5
        kinds.append(dominating)
        if dominating:
            for u in range(v):
                adj[u].add(v)
                adj[v].add(u)
    tree = modular_decomposition(adj)
    changes = sum(1 for a, b in zip(kinds, kinds[1:]) if a != b)
    internal = [node for node in tree.nodes() if node.kind != LEAF]
    assert all(node.kind in (SERIES, PARALLEL) for node in internal)
    assert len(internal) == changes + 1
    for node in internal:
        assert sum(1 for c in node.children if c.kind != LEAF) <= 1


def test_count_transitive_orientations_matches_brute_force_all_graphs_n5():
    # brute force: try every orientation of every labelled graph on 5 items
    for g in _all_adj(5):
        edges = [(a, b) for a in range(5) for b in g[a] if a < b]
        brute = 0
        for mask in range(1 << len(edges)):
            arcs = {(a, b) if mask >> k & 1 else (b, a) for k, (a, b) in enumerate(edges)}
            if all((a, d) in arcs for (a, b) in arcs for (c, d) in arcs if b == c):
                brute += 1
        assert count_transitive_orientations(g) == brute


def _all_adj(n):
    pairs = list(itertools.combinations(range(n), 2))
    for mask in range(1 << len(pairs)):
        adj: list[set[int]] = [set() for _ in range(n)]
        for k, (a, b) in enumerate(pairs):
            if mask >> k & 1:
                adj[a].add(b)
                adj[b].add(a)
        yield adj


def test_pivot_choice_does_not_change_the_tree():
    rng = random.Random(9)
    adj = nested_graph(40, rng)
    a = {node.items for node in modular_decomposition(adj, seed=1).nodes()}
    b = {node.items for node in modular_decomposition(adj, seed=2).nodes()}
    assert a == b


def test_empty_and_single():
    assert modular_decomposition([]) is None
    t = modular_decomposition([set()])
    assert t.kind == LEAF and t.items == {0}
    assert count_transitive_orientations([]) == 1


@pytest.fixture
def kernels(monkeypatch):
    """Large-graph path at any size: components laid out by numpy, each refined first by the
    compiled loop (satorder.graph.modular_kernel)."""
    pytest.importorskip("numba")
    import satorder.graph.forcing as forcing

    def use(flag: bool) -> None:
        monkeypatch.setattr(forcing, "use_kernels", lambda pairs: flag)

    use(True)
    return use


@pytest.mark.parametrize("n", range(3, 10))
def test_compiled_first_refinement_against_brute_force(n, kernels):
    rng = random.Random(300 + n)
    for trial in range(30):
        adj = random_graph(n, rng.random(), rng) if trial % 2 else nested_graph(n, rng)
        check_tree(adj, seed=trial)


def test_compiled_and_python_trees_agree_on_larger_graphs(kernels):
    rng = random.Random(17)
    for trial in range(12):
        # several components (the layout of each by numpy) or one (the whole graph's arrays)
        parts = [nested_graph(rng.randint(1, 60), rng) if rng.random() < 0.7 else
                 random_graph(rng.randint(1, 40), rng.random(), rng)
                 for _ in range(rng.choice([1, 4]))]
        adj: list[set[int]] = []
        for part in parts:
            base = len(adj)
            adj.extend({base + u for u in row} for row in part)
        trees = []
        for flag in (True, False):
            kernels(flag)
            tree = modular_decomposition(adj, seed=trial)
            trees.append({(node.items, node.kind) for node in tree.nodes()})
        assert trees[0] == trees[1]
