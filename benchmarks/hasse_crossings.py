"""Edge crossings and edges through boxes in the Hasse diagrams of the committed suites, for
the current layout and for the layout of an earlier revision, counted by the same code.

    python benchmarks/hasse_crossings.py [--before REV]

Every feasible problem of ``instances/small`` and ``instances/medium`` with at most
``SUMMARY_AT`` items (larger orders are drawn as a summary by level) is solved, and its Hasse
diagram drawn by ``satorder.render.order_svg.hasse_svg`` of this tree and of revision ``REV``
(default: the last revision before the layered layout).  The SVG texts are read back by
``tests/render/svg_geometry.py``, which counts the points where two edges cross and the edges
that pass through a box they do not end at.
"""

from __future__ import annotations

import argparse
import glob
import importlib.util
import os
import subprocess
import sys
import tempfile

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
sys.path.insert(0, os.path.join(ROOT, "tests", "render"))

import svg_geometry  # noqa: E402

from satorder.io.readers import read_problem  # noqa: E402
from satorder.measure.figures import height, width  # noqa: E402
from satorder.pipeline.solve import solve  # noqa: E402
from satorder.render.order_svg import SUMMARY_AT, hasse_svg  # noqa: E402

OLD_LAYOUT = "c9251b8"  # last revision with the barycentre-only layout and straight edges


def old_module(rev: str):
    text = subprocess.run(["git", "-C", ROOT, "show", f"{rev}:satorder/render/order_svg.py"],
                          check=True, capture_output=True, text=True).stdout
    folder = tempfile.mkdtemp(prefix="satorder-old-layout-")
    path = os.path.join(folder, "old_order_svg.py")
    with open(path, "w", encoding="utf-8") as f:
        f.write(text)
    spec = importlib.util.spec_from_file_location("old_order_svg", path)
    mod = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(mod)
    return mod


def figures(svg: str) -> tuple[int, int]:
    """(edge crossings, edges passing through a box other than their ends)."""
    boxes, edges = svg_geometry.parse(svg)
    through = 0
    for e in edges:
        first, last = svg_geometry.end_boxes(e, boxes)
        through += bool(svg_geometry.boxes_crossed(e, boxes, set(first) | set(last)))
    return svg_geometry.count_crossings(edges), through


def old_svg(mod, succ, names, chain, anti) -> str:
    svg = mod.hasse_svg(succ, names, chain, anti)
    # the old drawing has plain <line> edges without a class: mark them for the parser
    return svg.replace("<line ", '<line class="edge" ')


def main(argv=None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--before", default=OLD_LAYOUT, help="revision of the earlier layout")
    args = ap.parse_args(argv)
    old = old_module(args.before)
    tot = {"before": [0, 0], "after": [0, 0]}
    drawn = 0
    print(f"{'instance':48} {'items':>5} {'cross before':>12} {'after':>6} "
          f"{'through before':>14} {'after':>6}")
    for path in sorted(glob.glob(os.path.join(ROOT, "instances", "*", "*"))):
        if path.endswith("manifest.json") or path.endswith(".md"):
            continue
        problem = read_problem(path)
        if problem.n > SUMMARY_AT:
            continue
        ans = solve(problem)
        if not ans.feasible:
            continue
        h, w = height(ans.succ), width(ans.succ)
        a = figures(hasse_svg(ans.succ, problem.items, h.witness, w.witness))
        b = figures(old_svg(old, ans.succ, problem.items, h.witness, w.witness))
        drawn += 1
        for key, val in (("before", b), ("after", a)):
            tot[key][0] += val[0]
            tot[key][1] += val[1]
        name = os.path.relpath(path, os.path.join(ROOT, "instances"))
        print(f"{name:48} {problem.n:>5} {b[0]:>12} {a[0]:>6} {b[1]:>14} {a[1]:>6}")
    print(f"{drawn} Hasse diagrams; edge crossings: before {tot['before'][0]}, after "
          f"{tot['after'][0]}; edges through a box they do not end at: before "
          f"{tot['before'][1]}, after {tot['after'][1]}")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
