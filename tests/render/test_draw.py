"""SVG pictures: well-formed, every item and covering pair drawn, lower items below upper ones,
and the dominance drawing's coordinates reproduce the order."""

from __future__ import annotations

import json
import random
import xml.etree.ElementTree as ET

from satorder.cli.main import main
from satorder.measure.dimension import dimension
from satorder.model.order import covering_pairs
from satorder.render.order_svg import dominance_svg, hasse_svg, pictures

NS = "{http://www.w3.org/2000/svg}"


def permutation_order(perm):
    n = len(perm)
    return [{j for j in range(i + 1, n) if perm[i] < perm[j]} for i in range(n)]


def items_drawn(svg, shape):
    """Map item label -> the attributes of its shape (rect or circle), via each group's title."""
    root = ET.fromstring(svg)
    out = {}
    for g in root.iter(f"{NS}g"):
        if g.get("class") == "item":
            out[g.find(f"{NS}title").text] = g.find(f"{NS}{shape}").attrib
    return root, out


def test_hasse_svg_draws_every_item_and_cover_with_lower_items_below():
    rng = random.Random(8)
    perm = list(range(60))
    rng.shuffle(perm)
    succ = permutation_order(perm)
    names = [f"bay-{i}" for i in range(60)]
    svg = hasse_svg(succ, names)
    root, boxes = items_drawn(svg, "rect")
    assert set(boxes) == set(names)
    edges = {(e.get("data-from"), e.get("data-to")) for e in root.iter(f"{NS}polyline")
             if e.get("class") == "edge"}
    cover = covering_pairs(succ)
    assert edges == {(names[a], names[b]) for a, b in cover}
    for a, b in cover:  # SVG y grows downwards: the lower item has the larger y
        assert float(boxes[names[a]]["y"]) > float(boxes[names[b]]["y"])


def test_dominance_drawing_reproduces_the_order():
    # dominance drawing: x < y exactly when y is up and to the right (Dushnik & Miller 1941)
    rng = random.Random(12)
    perm = list(range(40))
    rng.shuffle(perm)
    succ = permutation_order(perm)
    names = [f"tent {i}" for i in range(40)]
    d = dimension(succ)
    _, dots = items_drawn(dominance_svg(succ, names, d.realizer), "circle")
    xy = {i: (float(dots[names[i]]["cx"]), float(dots[names[i]]["cy"])) for i in range(40)}
    for a in range(40):
        for b in range(40):
            if a != b:
                up_right = xy[b][0] > xy[a][0] and xy[b][1] < xy[a][1]
                assert up_right == (b in succ[a])


def test_labels_are_escaped_and_a_level_is_one_row():
    succ = [set() for _ in range(70)]  # an antichain of 70: one level
    names = [f"<crate & {i}>" for i in range(70)]
    files = pictures("pic.svg", succ, names)
    assert set(files) == {"pic.svg", "pic-dominance.svg"}
    root, boxes = items_drawn(files["pic.svg"], "rect")
    assert len(boxes) == 70 and "&lt;crate &amp; 3&gt;" in files["pic.svg"]
    assert len({b["y"] for b in boxes.values()}) == 1
    xs = sorted(float(b["x"]) for b in boxes.values())
    assert all(b - a >= float(next(iter(boxes.values()))["width"]) for a, b in zip(xs, xs[1:]))


def legend_labels(svg):
    root = ET.fromstring(svg)
    return [t.text for g in root.iter(f"{NS}g") if g.get("class") == "legend"
            for t in g.iter(f"{NS}text")]


def test_every_picture_has_title_caption_and_a_legend_of_what_is_drawn():
    succ = [{1, 2}, {2}, set(), set()]  # chain kiln < loom < quay, weir alone
    names = ["kiln", "loom", "quay", "weir"]
    svg = hasse_svg(succ, names, chain=[0, 1, 2], antichain=[2, 3])
    root = ET.fromstring(svg)
    assert any(t.get("class") == "title" for t in root.iter(f"{NS}text"))
    assert any(t.get("class") == "caption" for t in root.iter(f"{NS}text"))
    assert legend_labels(svg) == ["item", "covering pair", "a longest chain (3 items)",
                                  "a largest antichain (2 items)"]
    # nothing ordered: no covering pair and no chain drawn, so the legend names neither
    lone = hasse_svg([set(), set()], ["kiln", "loom"], chain=[0], antichain=[0, 1])
    assert legend_labels(lone) == ["item", "a largest antichain (2 items)"]


def test_cli_draw_writes_svg_files(tmp_path):
    doc = {"comparable": [["weigh", "pack"], ["pack", "ship"], ["weigh", "ship"],
                          ["label", "ship"]]}
    f = tmp_path / "dock.json"
    f.write_text(json.dumps(doc))
    pic = tmp_path / "dock.svg"
    assert main(["measure", str(f), "--draw", str(pic)]) == 0
    root = ET.fromstring(pic.read_text())
    assert root.tag == f"{NS}svg"
    assert (tmp_path / "dock-dominance.svg").exists()
    pic2 = tmp_path / "solved.svg"
    assert main(["solve", str(f), "--draw", str(pic2)]) == 0
    assert "ship" in pic2.read_text()


def test_cli_draws_a_summary_for_huge_orders(tmp_path, capsys):
    f = tmp_path / "many.txt"
    f.write_text("".join(f"u{i} v{i}\n" for i in range(1100)))  # 2200 items
    assert main(["measure", str(f), "--draw", str(tmp_path / "big.svg")]) == 0
    svg = (tmp_path / "big.svg").read_text()
    assert "Summary of an order of 2200 items in 2 levels" in svg
    assert "summary" in capsys.readouterr().err


def test_explanation_legend_names_only_the_kinds_drawn():
    from satorder import Problem
    from satorder.explanation.explain import explain
    from satorder.render.explanation_svg import explanation_svg

    ring = [("kiln", "loom"), ("loom", "quay"), ("quay", "weir"), ("weir", "dock"),
            ("dock", "kiln")]
    expl = explain(Problem.from_lists(comparable=ring))
    labels = legend_labels(explanation_svg(expl))
    drawn_kinds = {r.kind for r in expl.core}
    assert ("core, comparable: a and b must be ordered, one way or the other" in labels) == (
        "comparable" in drawn_kinds)
    assert ("core, incomparable: a and b must stay unordered" in labels) == (
        "incomparable" in drawn_kinds)
    assert not any("fixed" in t or "forbidden" in t for t in labels)
    core_pairs = {frozenset(r.pair) for r in expl.core}
    others = [p for p in ring if frozenset(expl.problem.index[x] for x in p) not in core_pairs]
    assert ("other comparable pair" in labels) == bool(others)
    # a comparable pair among the core's items but outside the core is drawn grey, and then,
    # only then, named in the legend (an explanation built by hand: the picture only reads it)
    from satorder.explanation.explain import Explanation
    from satorder.model.requirement import Requirement

    p = Problem.from_lists(comparable=ring + [("kiln", "quay")])
    ix = p.index
    core = [Requirement("comparable", (ix[a], ix[b])) for a, b in ring]
    svg = explanation_svg(Explanation(p, "infeasible", core=core))
    assert 'class="graph"' in svg
    assert legend_labels(svg) == ["core, comparable: a and b must be ordered, one way or the "
                                  "other", "other comparable pair"]
