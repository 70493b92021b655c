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
        title = g.find(f"{NS}title").text
        out[title] = g.find(f"{NS}{shape}").attrib
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
    lines = list(root.iter(f"{NS}line"))
    cover = covering_pairs(succ)
    assert len(lines) == len(cover)
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


def test_labels_are_escaped_and_wide_levels_wrap():
    succ = [set() for _ in range(70)]  # an antichain of 70: one level, several rows
    names = [f"<crate & {i}>" for i in range(70)]
    files = pictures("pic.svg", succ, names)
    assert set(files) == {"pic.svg", "pic-dominance.svg"}
    root, boxes = items_drawn(files["pic.svg"], "rect")
    assert len(boxes) == 70
    assert len({b["y"] for b in boxes.values()}) >= 3  # wrapped onto several rows
    assert float(root.attrib["width"]) < 4000


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


def test_cli_refuses_to_draw_huge_orders(tmp_path):
    f = tmp_path / "many.txt"
    f.write_text("".join(f"u{i} v{i}\n" for i in range(1100)))  # 2200 items
    assert main(["measure", str(f), "--draw", str(tmp_path / "big.svg")]) == 2
    assert not (tmp_path / "big.svg").exists()
