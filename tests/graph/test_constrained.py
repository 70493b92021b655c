"""Fixed and forbidden arcs decided through the modular decomposition
(satorder.graph.constrained), cross-checked against the SAT engine, brute force and the
independent checks."""

from __future__ import annotations

import random

import networkx as nx
from hypothesis import given, settings
from hypothesis import strategies as st
from order_reference import reference_feasible

from satorder import certify
from satorder.explanation.explain import explain
from satorder.graph.arcs import place_arcs
from satorder.graph.modular import modular_decomposition
from satorder.model.problem import Problem
from satorder.model.requirement import Kind
from satorder.pipeline.solve import solve, solve_forcing, verify
from satorder.sat.engine import solve_sat


def random_order_graph(n: int, p: float, rng: random.Random) -> tuple[nx.Graph, list[set[int]]]:
    """The comparability graph of a random order (i < j kept with probability p, closed)."""
    succ = [set() for _ in range(n)]
    for i in range(n):
        for j in range(i + 1, n):
            if rng.random() < p:
                succ[i].add(j)
    for i in reversed(range(n)):
        for j in list(succ[i]):
            succ[i] |= succ[j]
    g = nx.Graph()
    g.add_nodes_from(range(n))
    g.add_edges_from((i, j) for i in range(n) for j in succ[i])
    return g, succ


def _cross_check(p: Problem) -> str:
    """Decomposition and SAT must agree; each answer passes the independent checks."""
    a = verify(solve_forcing(p))
    b = verify(solve_sat(p))
    assert a.verified and b.verified
    assert a.status == b.status, (a.status, b.status, p)
    if a.feasible:
        certify.check_order(p, a.succ)
    elif a.engine == "decomposition":
        certify.check_core_infeasible(p, a.core)
    return a.status


@settings(max_examples=80, deadline=None)
@given(st.integers(min_value=2, max_value=8).flatmap(lambda n: st.tuples(
    st.just(n),
    st.sets(st.tuples(st.integers(0, n - 1), st.integers(0, n - 1))),
    st.lists(st.tuples(st.integers(0, n - 1), st.integers(0, n - 1)), max_size=4),
    st.lists(st.tuples(st.integers(0, n - 1), st.integers(0, n - 1)), max_size=3))))
def test_hypothesis_decomposition_verdict_equals_sat_verdict(data):
    n, pairs, fixed, forbidden = data
    g = nx.Graph()
    g.add_nodes_from(range(n))
    g.add_edges_from((a, b) for a, b in pairs if a != b)
    base = Problem.from_networkx(g)
    fixed = list(dict.fromkeys((a, b) for a, b in fixed if a != b))
    fixed = [(a, b) for a, b in fixed if (b, a) not in fixed or a < b]
    forbidden = [(a, b) for a, b in dict.fromkeys(forbidden) if a != b and (a, b) not in fixed]
    adj = [set(s) for s in base.adj]
    for a, b in fixed:  # a fixed arc makes its pair comparable, as the readers do
        adj[a].add(b)
        adj[b].add(a)
    p = base.with_requirements(adj=adj, fixed=fixed, forbidden=forbidden)
    status = _cross_check(p)
    assert (status == "feasible") == reference_feasible(p)


def test_random_orders_with_arcs_match_sat_on_both_verdicts():
    # comparability graphs of random orders (always orientable), arcs drawn at random: every
    # infeasible case is a clash of arcs at a series or prime node, never the graph itself
    rng = random.Random(16)
    seen = {"feasible": 0, "infeasible": 0}
    clashes = set()
    for _ in range(150):
        n = rng.randint(4, 14)
        g, _ = random_order_graph(n, rng.uniform(0.15, 0.6), rng)
        edges = list(g.edges())
        if not edges:
            continue
        fixed = []
        for a, b in rng.sample(edges, min(len(edges), rng.randint(1, 4))):
            fixed.append((a, b) if rng.random() < 0.5 else (b, a))
        forbidden = [e for e in rng.sample(edges, min(len(edges), rng.randint(0, 2)))
                     if e not in fixed and e[::-1] not in fixed]
        p = Problem.from_networkx(g).with_requirements(
            fixed=[(int(a), int(b)) for a, b in fixed],
            forbidden=[(int(a), int(b)) for a, b in forbidden])
        status = _cross_check(p)
        seen[status] += 1
        if status == "infeasible":
            clashes.add(solve_forcing(p).stats.get("clash"))
    assert min(seen.values()) > 20
    assert {"series", "prime"} <= clashes


def test_arcs_from_a_valid_answer_keep_it_feasible():
    # arcs taken from an answer: the decomposition must find an order meeting them all
    rng = random.Random(3)
    for _ in range(30):
        g, succ = random_order_graph(rng.randint(10, 40), rng.uniform(0.1, 0.4), rng)
        arcs = [(a, b) for a in range(len(succ)) for b in succ[a]]
        if not arcs:
            continue
        p = Problem.from_networkx(g)
        ans = solve(p)
        order = ans.pairs()
        fixed = rng.sample(order, min(len(order), 6))
        q = p.with_requirements(fixed=fixed, forbidden=[(b, a) for a, b in
                                                        rng.sample(order, min(len(order), 3))])
        got = solve(q)
        assert got.engine == "decomposition" and got.feasible and got.verified


def test_prime_node_clash_is_one_forcing_chain():
    # the 4-item path a-b-c-d is prime (Gallai 1967); its two transitive orientations are
    # a<b>c<d and the reverse, so fixed a<b together with fixed d<c clashes: a<b forces c<b
    # (a, c unordered: both arcs into b), which forces c<d (b, d unordered: both out of c)
    p = Problem.from_lists(comparable=[("a", "b"), ("b", "c"), ("c", "d")],
                           fixed=[("a", "b"), ("d", "c")])
    assert solve(p.with_requirements(fixed=[(0, 1), (2, 3)])).feasible
    tree = modular_decomposition(p.adj)
    assert tree.kind == "prime"
    ans = solve(p)
    assert ans.engine == "decomposition" and ans.status == "infeasible" and ans.verified
    assert ans.stats["clash"] == "prime"
    certify.check_core_infeasible(p, ans.core, minimal=True)
    kinds = sorted(r.kind.value for r in ans.core)
    assert kinds == ["comparable", "fixed", "fixed", "incomparable", "incomparable"]


def test_series_node_cycle_of_arcs_is_infeasible_with_a_small_core():
    # K_3 is one series node with three children; arcs a<b, b<c, c<a form a cycle
    p = Problem.from_lists(comparable=[("a", "b"), ("b", "c"), ("a", "c")],
                           fixed=[("a", "b"), ("b", "c"), ("c", "a")])
    ans = solve(p)
    assert ans.status == "infeasible" and ans.stats["clash"] == "series"
    assert sorted(r.kind.value for r in ans.core) == ["fixed"] * 3
    # forbidden arcs on comparable pairs are fixed arcs the other way
    q = Problem.from_lists(comparable=[("a", "b"), ("b", "c"), ("a", "c")],
                           forbidden=[("b", "a"), ("c", "b"), ("a", "c")])
    assert solve(q).status == "infeasible"
    # and forbidden arcs on pairs that stay unordered say nothing
    r = Problem.from_lists(comparable=[("a", "b")], forbidden=[("a", "c"), ("c", "a")],
                           items=["c"])
    assert solve(r).feasible


def test_arc_placement_at_the_separating_node():
    # a triangle 0-1-2 with a pendant 3 at 2: series root {2} | {0, 1, 3}; 0-1 inside
    adj = [{1, 2}, {0, 2}, {0, 1, 3}, {2}]
    tree = modular_decomposition(adj)
    placed = place_arcs(tree, [(0, 2), (3, 2), (0, 1)], 4)
    root = placed[id(tree)]
    assert sorted(k for _, _, k in root) == [0, 1]
    inner = [found for key, found in placed.items() if key != id(tree)]
    assert inner and inner[0][0][2] == 2


def test_explain_finds_a_small_core_for_a_contradicting_arc():
    # 30 disjoint random orders; 20 arcs from a valid answer, then one arc reversed against a
    # forced consequence of another: explain must find a core of at most 6 requirements
    rng = random.Random(8)
    g = nx.Graph()
    for blk in range(30):
        h, succ = random_order_graph(20, 0.3, rng)
        g.add_edges_from((blk * 20 + a, blk * 20 + b) for a, b in h.edges())
    p = Problem.from_networkx(g)
    order = solve(p).pairs()
    fixed = rng.sample(order, 20)
    a, b = fixed[0]
    # an item c above a with b, c unordered: a<b forces a<c (Γ, shared tail); fix c<a
    c = next(c for c in p.adj[a] if c != b and c not in p.adj[b] and (a, c) in set(order))
    q = p.with_requirements(fixed=fixed + [(c, a)])
    ans = solve(q)
    assert ans.status == "infeasible" and ans.verified
    e = explain(q)
    assert e.status == "infeasible" and e.verified and len(e.core) <= 6
    assert any(r.kind == Kind.FIXED for r in e.core)
    certify.check_core_infeasible(q, e.core, minimal=True)
    # without the contradicting arc the same problem is feasible, and explain says so
    ok = explain(p.with_requirements(fixed=fixed))
    assert ok.status == "feasible" and ok.verified and ok.core is None
