"""The layered Hasse diagram, read back from its SVG: no edge passes through a box it does not
end at, every edge joins the two boxes of a covering pair (checked against networkx's
transitive reduction), lower items sit below, and the crossing reduction does its job where
the answer is known."""

from __future__ import annotations

import glob
import itertools
import os
import random

import networkx as nx
import pytest
import svg_geometry

from satorder.io.readers import read_problem
from satorder.measure.figures import height, width
from satorder.model.order import covering_pairs
from satorder.pipeline.solve import solve
from satorder.render.layered import bilayer_crossings, layered_layout
from satorder.render.order_svg import SUMMARY_AT, hasse_svg, pictures
from satorder.render.summary_svg import heaviest_chains

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
SUITES = sorted(p for p in glob.glob(os.path.join(ROOT, "instances", "*", "*.json"))
                if not p.endswith("manifest.json"))


def reference_cover(succ, names):
    """Covering pairs by name from networkx's transitive reduction (the reference library)."""
    g = nx.DiGraph()
    g.add_nodes_from(range(len(succ)))
    g.add_edges_from((a, b) for a in range(len(succ)) for b in succ[a])
    return {(names[a], names[b]) for a, b in nx.transitive_reduction(g).edges()}


def check_drawing(svg, succ, names, count=True):
    """Every assertion of the geometry check; returns the number of edge crossings."""
    boxes, edges = svg_geometry.parse(svg)
    assert set(boxes) == set(names)
    drawn = set()
    for e in edges:
        first, last = svg_geometry.end_boxes(e, boxes)
        assert len(first) == 1 and len(last) == 1, f"edge {e} does not start and end at a box"
        lower, upper = first[0], last[0]
        assert boxes[lower][1] > boxes[upper][1]  # SVG y grows downwards
        hit = svg_geometry.boxes_crossed(e, boxes, {lower, upper})
        assert not hit, f"edge {lower}->{upper} passes through {hit}"
        drawn.add((lower, upper))
    assert len(drawn) == len(edges) and drawn == reference_cover(succ, names)
    return svg_geometry.count_crossings(edges) if count else None


@pytest.mark.slow
def test_every_suite_hasse_diagram_has_no_edge_through_a_box():
    drawn = summaries = 0
    for path in SUITES:
        problem = read_problem(path)
        if problem.n > SUMMARY_AT:
            summaries += 1
            continue
        ans = solve(problem)
        if not ans.feasible:
            continue
        h, w = height(ans.succ), width(ans.succ)
        check_drawing(hasse_svg(ans.succ, problem.items, h.witness, w.witness), ans.succ,
                      problem.items, count=False)
        drawn += 1
    assert drawn >= 50 and summaries >= 5  # small + medium suites as committed


def test_geometric_crossings_match_the_layout_count():
    rng = random.Random(4)
    n = 40
    perm = list(range(n))
    rng.shuffle(perm)
    succ = [{j for j in range(i + 1, n) if perm[i] < perm[j] and rng.random() < 0.6}
            for i in range(n)]
    for i in reversed(range(n)):  # close transitively
        for j in list(succ[i]):
            succ[i] |= succ[j]
    names = [f"stall-{i}" for i in range(n)]
    levels = [sorted(lv) for lv in height(succ).partition]
    lay = layered_layout(levels, covering_pairs(succ), [max(7.0 * len(s) + 14, 30) for s in names])
    assert check_drawing(hasse_svg(succ, names), succ, names) == lay.crossings


def test_a_tree_is_drawn_without_crossings():
    # a rooted tree has a crossing-free layered drawing (common practice); the sweeps find one
    rng = random.Random(3)
    parent = {v: rng.randrange(v) for v in range(1, 60)}
    succ = [set() for _ in range(60)]
    for v in range(59, 0, -1):  # v's ancestors come before v
        u = v
        while u in parent:
            u = parent[u]
            succ[u].add(v)
    names = [f"post {i}" for i in range(60)]
    _, edges = svg_geometry.parse(hasse_svg(succ, names))
    assert len(edges) == 59
    assert svg_geometry.count_crossings(edges) == 0


def test_long_edges_run_straight_through_their_bend_points():
    # 0 < 4 is a covering pair from level 1 to level 4 (4 sits above 5 < 6 < 7): two bends
    succ = [{4}, set(), set(), set(), set(), {6, 7, 4}, {7, 4}, {4}]
    levels = [sorted(lv) for lv in height(succ).partition]
    lay = layered_layout(levels, covering_pairs(succ), [40.0] * 8)
    bends = lay.paths[(0, 4)]
    assert len(bends) == 2
    assert len({round(lay.x[d], 6) for d in bends}) == 1


def test_bilayer_crossings_match_brute_force():
    rng = random.Random(9)
    for _ in range(30):
        lo, hi = list(range(rng.randint(1, 8))), list(range(8, 8 + rng.randint(1, 8)))
        up = [[] for _ in range(16)]
        edges = [(a, b) for a in lo for b in hi if rng.random() < 0.4]
        for a, b in edges:
            up[a].append(b)
        brute = sum(1 for (a, b), (c, d) in itertools.combinations(edges, 2)
                    if (a - c) * (b - d) < 0)
        assert bilayer_crossings(lo, hi, up) == brute


def test_large_orders_get_a_summary_with_disjoint_heaviest_chains():
    rng = random.Random(5)
    n = SUMMARY_AT + 50
    succ = [{j for j in range(i + 1, n) if rng.random() < 0.03} for i in range(n)]
    for i in reversed(range(n)):
        for j in list(succ[i]):
            succ[i] |= succ[j]
    names = [f"crate <{i}>" for i in range(n)]
    files = pictures("big.svg", succ, names)
    assert list(files) == ["big.svg"]
    svg = files["big.svg"]
    assert "too many for a readable Hasse diagram" in svg and "crate &lt;" in svg
    weights = {v: rng.randint(1, 9) for v in range(n)}
    levels = [sorted(lv) for lv in height(succ).partition]
    chains = heaviest_chains(succ, levels, weights)
    assert len(chains) == 3
    assert len({v for c in chains for v in c}) == sum(len(c) for c in chains)  # disjoint
    for c in chains:
        assert all(b in succ[a] for a, b in zip(c, c[1:]))
    # the first chain is a heaviest one: networkx's longest path in the order's DAG, with a
    # source whose arcs carry the first item's weight and every arc the weight of its head
    g = nx.DiGraph()
    g.add_weighted_edges_from((a, b, weights[b]) for a in range(n) for b in succ[a])
    g.add_weighted_edges_from(("source", v, weights[v]) for v in range(n))
    best = nx.dag_longest_path_length(g)
    assert sum(weights[v] for v in chains[0]) == best
    assert len(heaviest_chains(succ, levels)[0]) == len(levels)  # unweighted: a longest chain
