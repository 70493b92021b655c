"""The HTML report: self-contained (no scripts, no resources from elsewhere), every user
string escaped, the README's caution repeated word for word, and written atomically; bad
``--report`` names are usage errors that leave no file behind."""

from __future__ import annotations

import json
import os
import re
from html.parser import HTMLParser

import pytest

from satorder import Problem
from satorder.cli.main import main
from satorder.pipeline.solve import solve
from satorder.render.report import CAUTION, Report
from satorder.render.report_pages import solve_report
from satorder.render.requirement_rows import requirement_counts, requirement_rows

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
EVIL = '<script>alert("x")</script> & "quay"'


class Tags(HTMLParser):
    """Every start tag with its attributes, and the page's text."""

    def __init__(self):
        super().__init__()
        self.tags, self.text = [], []

    def handle_starttag(self, tag, attrs):
        self.tags.append((tag, dict(attrs)))

    def handle_data(self, data):
        self.text.append(data)


def parse(page: str) -> Tags:
    t = Tags()
    t.feed(page)
    return t


def test_caution_is_the_readme_paragraph():
    readme = open(os.path.join(ROOT, "README.md"), encoding="utf-8").read()
    section = readme.split("## Caution", 1)[1].split("\n## ", 1)[0]
    assert " ".join(section.split()) == CAUTION


def test_user_strings_are_escaped_and_nothing_is_loaded_from_elsewhere():
    p = Problem.from_lists(comparable=[(EVIL, "kiln"), ("kiln", "loom")],
                           source="<bad & name>.json")
    page = solve_report(p, solve(p), command="satorder solve '<x>'").html()
    tags = parse(page)
    assert [t for t, _ in tags.tags].count("script") == 0
    assert EVIL in "".join(tags.text)  # shown as text, not markup
    assert "<bad & name>.json" in "".join(tags.text)
    for tag, attrs in tags.tags:  # no attribute points at another resource
        for key, value in attrs.items():
            if key in ("src", "href", "xlink:href") or (value and "url(" in value):
                assert value.startswith("#") or value.startswith("url(#"), (tag, key, value)
    # the only http: string is the SVG namespace, which is a name, not a resource
    assert set(re.findall(r"https?://[^\"' )]+", page)) == {"http://www.w3.org/2000/svg"}


def test_picture_ids_are_unique_on_a_page():
    svg = '<svg xmlns="http://www.w3.org/2000/svg"><defs><marker id="m"/></defs>' \
          '<line marker-end="url(#m)"/></svg>'
    page = Report("t").picture(svg).picture(svg).html()
    ids = re.findall(r'id="([^"]+)"', page)
    assert len(ids) == len(set(ids)) == 2
    assert all(f"url(#{i})" in page for i in ids)


def test_requirements_table_states_each_requirement_in_the_answer():
    doc = {"items": ["kiln", "loom", "quay", "weir"],
           "comparable": [["kiln", "loom"]], "incomparable": [["loom", "quay"]],
           "fixed": [["loom", "weir"]], "forbidden": [["weir", "kiln"]],
           "prefer": [{"before": "quay", "after": "kiln", "weight": 3}]}
    from satorder.io.readers import problem_from_dict

    p = problem_from_dict(doc, source="t.json")
    ans = solve(p)
    assert ans.feasible
    rows = list(requirement_rows(p, ans.succ, unmet=ans.unmet))
    kinds = [r[0] for r in rows]
    assert kinds == ["fixed", "forbidden", "comparable", "incomparable", "open", "open", "open",
                     "prefer"]
    # the one wording: kind named, arcs in their direction
    assert rows[0][1] == "fixed: loom must come before weir"
    assert rows[1][1] == "forbidden: weir must not come before kiln"
    states = {r[0]: r[2] for r in rows}
    assert states["fixed"] == "holds: loom before weir"
    assert states["forbidden"].startswith("holds:")
    assert states["incomparable"] == "holds: left unordered"
    assert states["comparable"].startswith("holds:")
    succ = ans.succ
    met = 0 in succ[2]  # quay before kiln
    assert states["prefer"] == "met" if met else states["prefer"].startswith("given up (costs 3)")
    counts = {k: c for k, c, _ in requirement_counts(p)}
    assert counts == {"comparable": 1, "incomparable": 1, "open": 3, "fixed": 1,
                      "forbidden": 1, "prefer": 1}
    # a broken order is reported as broken
    bad = [set(), {0}, {0}, {1, 0}]  # loom before kiln, weir before loom and kiln
    states = {r[0]: r[2] for r in requirement_rows(p, bad)}
    assert states["fixed"] == "broken: weir before loom"
    assert states["forbidden"] == "broken: weir before kiln"


def test_long_requirement_lists_are_cut_with_a_note():
    n = 40
    p = Problem.from_lists(comparable=[(f"s{i}", f"s{j}") for i in range(n)
                                       for j in range(i + 1, n)])
    page = Report("t").requirements(p, limit=25).html()
    assert len(re.findall(r"<td>comparable: s\d+ and s\d+ must be ordered", page)) == 25
    assert "Only the first 25 requirements are listed" in page
    assert ">780<" in page  # the count covers all of them


@pytest.fixture
def plain_file(tmp_path):
    f = tmp_path / "dock.json"
    f.write_text(json.dumps({"comparable": [["weigh", "pack"], ["pack", "ship"],
                                            ["weigh", "ship"], ["label", "ship"]]}))
    return f


@pytest.mark.parametrize("command", ["solve", "measure", "count", "explain"])
def test_cli_report_is_written_and_bad_names_are_usage_errors(command, plain_file, tmp_path,
                                                              capsys):
    page = tmp_path / "r.html"
    assert main([command, str(plain_file), "--report", str(page)]) == 0
    text = page.read_text(encoding="utf-8")
    assert text.startswith("<!DOCTYPE html>") and f"satorder {command}" in text
    assert CAUTION in text and "dock.json" in text
    assert main([command, str(plain_file), "--report", str(tmp_path / "r.pdf")]) == 2
    assert main([command, str(plain_file), "--report",
                 str(tmp_path / "nowhere" / "r.html")]) == 2
    assert main([command, str(plain_file), "--report", str(plain_file)]) == 2
    assert "--report" in capsys.readouterr().err
    assert sorted(os.listdir(tmp_path)) == ["dock.json", "r.html"]  # nothing half-written


def test_a_failed_report_leaves_the_old_file_untouched(plain_file, tmp_path, monkeypatch):
    page = tmp_path / "r.html"
    page.write_text("old report")
    import satorder.io.files as files

    def no_rename(src, dst):
        raise OSError("disk full")

    monkeypatch.setattr(files.os, "replace", no_rename)  # the last step of an atomic write
    assert main(["solve", str(plain_file), "--report", str(page)]) == 1
    assert page.read_text() == "old report"
    assert sorted(os.listdir(tmp_path)) == ["dock.json", "r.html"]  # no temporary file left
