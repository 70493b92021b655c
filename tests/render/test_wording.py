"""One wording for a requirement everywhere a person reads it — solve's text and JSON, explain's
text, JSON, derivation and repairs, the HTML report and the explanation picture — and solve's
text says what the answer contains: the requirements table and how many orders there are."""

from __future__ import annotations

import json

from satorder.cli.main import main
from satorder.model.wording import requirement_text

FIXED = "fixed: kiln must come before loom"
FORBIDDEN = "forbidden: loom must not come before quay"


def _write(tmp_path, doc, name) -> str:
    path = tmp_path / name
    path.write_text(json.dumps(doc))
    return str(path)


def test_requirement_text_forms():
    names = ["kiln", "loom"]
    assert requirement_text(("fixed", (0, 1)), names) == FIXED
    assert requirement_text(("fixed", (1, 0)), names) == "fixed: loom must come before kiln"
    assert requirement_text(("comparable", (1, 0)), names, form="clause") == \
        "loom and kiln must be ordered, one way or the other"
    assert requirement_text(("incomparable", (0, 1)), names, form="drop") == \
        "drop the requirement that kiln and loom must stay unordered (incomparable)"


def test_feasible_answer_words_each_requirement_alike(tmp_path, capsys):
    path = _write(tmp_path, {"items": ["kiln", "loom", "quay", "weir"],
                             "comparable": [["kiln", "loom"], ["loom", "quay"]],
                             "incomparable": [["kiln", "quay"]],
                             "fixed": [["kiln", "loom"]], "forbidden": [["loom", "quay"]]},
                  "ok.json")
    report = str(tmp_path / "ok.html")
    assert main(["solve", path, "--report", report]) == 0
    text = capsys.readouterr().out
    assert "Requirements and how they came out" in text
    assert FIXED in text and FORBIDDEN in text and "holds: kiln before loom" in text
    # three pairs with weir are open: the line says other orders may exist
    assert "Other orders may also meet the requirements (3 pairs are open)" in text
    assert main(["solve", path, "--json"]) == 0
    rows = json.loads(capsys.readouterr().out)["requirements"]
    assert [r["text"] for r in rows[:2]] == [FIXED, FORBIDDEN]
    html = open(report).read()
    assert f"<td>{FIXED}</td>" in html and f"<td>{FORBIDDEN}</td>" in html


def test_infeasible_answer_words_each_requirement_alike(tmp_path, capsys):
    path = _write(tmp_path, {"fixed": [["kiln", "loom"], ["loom", "kiln"]]}, "clash.json")
    picture, report = str(tmp_path / "why.svg"), str(tmp_path / "why.html")
    assert main(["explain", path, "--repairs", "2", "--draw", picture,
                 "--report", report]) == 0
    text = capsys.readouterr().out
    assert FIXED in text and "row 1 (" in text and "drop the requirement that" in text
    assert main(["explain", path, "--json", "--repairs", "2"]) == 0
    doc = json.loads(capsys.readouterr().out)
    texts = [r["text"] for r in doc["core"]]
    assert FIXED in texts
    k = texts.index(FIXED) + 1  # rows count from 1 in every list a person reads
    assert any(f"row {k} ({FIXED})" in s["text"] for s in doc["derivation"])
    assert [s["step"] for s in doc["derivation"]] == list(range(1, len(doc["derivation"]) + 1))
    assert any(rep["text"] == "drop the requirement that kiln must come before loom (fixed)"
               for rep in doc["repairs"])
    svg = open(picture).read()
    assert f"{k}. {FIXED}" in svg and f"<title>{FIXED}</title>" in svg
    html = open(report).read()
    assert f"<td>{FIXED}</td>" in html
    assert "drop the requirement that kiln must come before loom (fixed)" in html
    assert main(["solve", path]) == 0
    assert FIXED in capsys.readouterr().out


def test_solve_says_how_many_orders_the_requirements_admit(tmp_path, capsys):
    three = _write(tmp_path, {"comparable": [["kiln", "loom"], ["loom", "quay"],
                                             ["kiln", "quay"]]}, "k3.json")
    assert main(["solve", three]) == 0
    assert "The requirements admit 6 orders; this is one of them" in capsys.readouterr().out
    fixed = _write(tmp_path, {"comparable": [["kiln", "loom"], ["loom", "quay"],
                                             ["kiln", "quay"]],
                              "fixed": [["kiln", "loom"], ["loom", "quay"]]}, "chain.json")
    assert main(["solve", fixed]) == 0
    assert "This is the only order the requirements admit" in capsys.readouterr().out
