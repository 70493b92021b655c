"""``satorder demo --pictures DIR`` draws one picture of each kind and a report from the
invented festival, and the README shows committed copies of them."""

from __future__ import annotations

import os
import re
import xml.etree.ElementTree as ET

import pytest

from satorder.cli.main import main
from satorder.render.gallery import market_week

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
NS = "{http://www.w3.org/2000/svg}"
KINDS = ["hasse", "dominance", "summary", "explanation", "decomposition", "cactus"]


def framed(svg_text: str) -> bool:
    """A title, a caption and a legend are drawn."""
    root = ET.fromstring(svg_text)
    classes = [el.get("class") for el in root.iter()]
    return classes.count("title") == 1 and "caption" in classes and "legend" in classes


@pytest.mark.slow
def test_demo_draws_one_picture_of_each_kind_and_a_report(tmp_path, capsys):
    folder = tmp_path / "demo-output"
    assert main(["demo", "--pictures", str(folder)]) == 0
    assert sorted(os.listdir(folder)) == sorted([f"{k}.svg" for k in KINDS] + ["report.html"])
    for k in KINDS:
        assert framed((folder / f"{k}.svg").read_text(encoding="utf-8")), k
    assert "summary.svg" in capsys.readouterr().out


def test_market_week_is_an_order_of_the_stated_shape():
    from satorder.measure.figures import height
    from satorder.pipeline.solve import solve

    p = market_week()
    ans = solve(p)
    assert ans.verified and p.n == 240
    assert all(b in ans.succ[a] for a, b in p.fixed)
    # one row: deliver and build of each of its 10 stalls in turn, then the last stock and open
    assert height(ans.succ).value == 22


def test_readme_shows_every_kind_from_committed_copies():
    readme = open(os.path.join(ROOT, "README.md"), encoding="utf-8").read()
    shown = re.findall(r"!\[[^\]]*\]\((docs/images/[^)]+)\)", readme)
    assert sorted(os.path.basename(s) for s in shown) == sorted(f"{k}.svg" for k in KINDS)
    for rel in shown:
        assert framed(open(os.path.join(ROOT, rel), encoding="utf-8").read()), rel
