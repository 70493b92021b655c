"""``satorder settled`` and ``satorder sample`` from the command line: the JSON contracts of
docs/cli.md, the text layout (settled pairs first, then free pairs, then a summary), ``--why``,
JSON lines of ``sample`` with the same seed giving the same lines, and bad input (exit 2, one
line, no output file)."""

from __future__ import annotations

import json
import os
import subprocess
import sys

import pytest

from satorder.cli.main import main

# an invented dig: layers sealed one above another, pits cut through them
DIG = {
    "items": ["topsoil", "ash-layer", "floor", "pit-a", "pit-b", "wall"],
    "fixed": [["floor", "ash-layer"], ["ash-layer", "topsoil"], ["floor", "pit-a"]],
    "comparable": [["pit-b", "wall"]],
    "incomparable": [["pit-a", "wall"]],
}


@pytest.fixture
def dig(tmp_path):
    path = tmp_path / "dig.json"
    path.write_text(json.dumps(DIG))
    return str(path)


def test_json_contract(dig, capsys):
    assert main(["settled", dig, "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert doc["status"] == "feasible" and doc["exact"] is True and doc["method"] == "listing"
    assert isinstance(doc["answers"], int) and doc["answers"] > 1 and doc["verified"]
    pairs = {tuple(p["pair"]): p for p in doc["pairs"]}
    assert pairs[("floor", "topsoil")]["before"] == 1.0 and pairs[("floor", "topsoil")]["settled"]
    assert ("pit-a", "wall") not in pairs and ("wall", "pit-a") not in pairs  # stays unordered
    for p in doc["pairs"]:
        assert set(p) == {"pair", "before", "after", "unordered", "settled"}
        assert abs(p["before"] + p["after"] + p["unordered"] - 1) < 1e-9
        assert p["settled"] == (1.0 in (p["before"], p["after"], p["unordered"]))
    assert doc["settled_before"] + doc["settled_unordered"] + doc["free"] == len(doc["pairs"])


def test_text_groups_settled_then_free_then_summary(dig, capsys):
    assert main(["settled", dig]) == 0
    text = capsys.readouterr().out
    first = text.index("Settled: before in every answer")
    assert first < text.index("Free:") < text.index("Summary")
    assert "floor < topsoil" in text[first:text.index("Free:")]
    summary = next(line for line in text.splitlines() if line.startswith("Summary"))
    assert "4 settled pairs (4 before, 0 unordered)" in summary and "10 free pairs" in summary


def test_why_settled_pair(dig, capsys):
    assert main(["settled", dig, "--why", "floor", "topsoil", "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert doc["settled"] and doc["relation"] == "before" and doc["verified"]
    kinds = [r["kind"] for r in doc["core"]]
    assert kinds.count("fixed") == 2 and doc["core"][doc["opposite"]]["kind"] == "forbidden"
    assert doc["derivation"][-1]["arc"] is None
    assert main(["settled", dig, "--why", "floor", "topsoil"]) == 0
    text = capsys.readouterr().out
    assert "in every answer floor comes before topsoil" in text and "Derivation" in text


def test_why_free_pair_shows_two_answers(dig, capsys):
    assert main(["settled", dig, "--why", "pit-b", "wall", "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert not doc["settled"] and {w["relation"] for w in doc["witnesses"]} == {"before",
                                                                                "after"}


def test_sample_lines_and_seed(dig, capsys):
    assert main(["sample", dig, "-k", "5", "--seed", "4"]) == 0
    lines = [json.loads(x) for x in capsys.readouterr().out.splitlines()]
    assert [x.get("index") for x in lines[:-1]] == [1, 2, 3, 4, 5]
    assert all(x["verified"] for x in lines[:-1])
    end = lines[-1]
    assert end["end"] and end["found"] == 5 and end["uniform"] == "exact" and end["seed"] == 4
    assert main(["sample", dig, "-k", "5", "--seed", "4"]) == 0
    again = [json.loads(x) for x in capsys.readouterr().out.splitlines()]
    assert [x["order"] for x in again[:-1]] == [x["order"] for x in lines[:-1]]


def test_out_file_and_report(dig, tmp_path, capsys):
    out, page = tmp_path / "s.json", tmp_path / "s.html"
    assert main(["settled", dig, "--out", str(out), "--report", str(page)]) == 0
    assert json.loads(out.read_text())["status"] == "feasible"
    assert "What the evidence settles" in page.read_text()


def _run(*args):
    proc = subprocess.run([sys.executable, "-m", "satorder", *args], capture_output=True,
                          text=True)
    return proc.returncode, proc.stdout, proc.stderr


@pytest.mark.slow
@pytest.mark.parametrize("args,message", [
    (["settled", "{dig}", "--why", "floor", "moat"], "no item named 'moat'"),
    (["settled", "{dig}", "--samples", "0"], "--samples must be at least 1"),
    (["settled", "{bad}"], "bad.json"),
    (["sample", "{dig}", "-k", "-1"], "-k must be 0 or more"),
    (["settled", "{dig}", "--method", "modular-decomposition"], "open pairs"),
])
def test_bad_input_exit_two_one_line(dig, tmp_path, args, message):
    bad = tmp_path / "bad.json"
    bad.write_text('{"items": ["a", "a"], "fixed": [["a"]]}')
    target = tmp_path / "never.json"
    argv = [a.format(dig=dig, bad=bad) for a in args] + ["--out", str(target)]
    code, out, err = _run(*argv)
    assert code == 2 and message in err and len(err.strip().splitlines()) == 1
    assert "Traceback" not in err and not os.path.exists(target)


def test_contradicting_problem_is_infeasible_with_its_core(tmp_path, capsys):
    # an arc fixed both ways (two sources disagreeing) is infeasibility, not bad input
    clash = tmp_path / "clash.json"
    clash.write_text(json.dumps({**DIG, "fixed": DIG["fixed"] + [["ash-layer", "floor"]]}))
    want = {("fixed", ("floor", "ash-layer")), ("fixed", ("ash-layer", "floor"))}
    assert main(["settled", str(clash), "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert doc["status"] == "infeasible" and doc["answers"] == 0 and doc["pairs"] == []
    assert {(r["kind"], tuple(r["pair"])) for r in doc["core"]} == want and doc["verified"]
    assert main(["sample", str(clash), "-k", "3"]) == 0
    lines = [json.loads(x) for x in capsys.readouterr().out.splitlines()]
    assert len(lines) == 1 and lines[0]["status"] == "infeasible" and lines[0]["found"] == 0
    assert {(r["kind"], tuple(r["pair"])) for r in lines[0]["core"]} == want
    assert main(["settled", str(clash), "--why", "pit-b", "wall", "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert doc["status"] == "infeasible" and not doc["settled"]
    assert {(r["kind"], tuple(r["pair"])) for r in doc["core"]} == want
    assert main(["settled", str(clash)]) == 0
    text = capsys.readouterr().out
    assert "fixed: ash-layer must come before floor" in text and "cannot all hold" in text


def test_too_large_for_the_counter_is_said_not_attempted(dig, monkeypatch, capsys):
    # a formula past the size limit is never built: settled and sample say so (status unknown,
    # exit 3), count lists on as the enumeration method does, or refuses --method approximate
    import satorder.sat.answer_formula as formula

    monkeypatch.setattr(formula, "MAX_CLAUSES", 1)
    assert main(["settled", dig, "--method", "approximate", "--json"]) == 3
    doc = json.loads(capsys.readouterr().out)
    assert doc["status"] == "unknown" and "too large for approximate counting" in doc["notes"][0]
    assert main(["sample", dig, "-k", "2", "--method", "unigen"]) == 3
    end = json.loads(capsys.readouterr().out)
    assert end["status"] == "unknown" and "too large for UniGen" in end["notes"][0]
    assert main(["count", dig, "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert doc["method"] == "enumeration" and doc["exact"] and doc["count"] == 588
    assert main(["count", dig, "--method", "approximate"]) == 2
    assert "too large for approximate counting" in capsys.readouterr().err


def test_readme_worked_example_is_what_the_command_prints(tmp_path, capsys):
    # the README's worked example (an invented trench) is pasted output: it must stay true
    root = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
    text = open(os.path.join(root, "README.md"), encoding="utf-8").read()
    section = text.split("## What the evidence settles", 1)[1].split("\n## ", 1)[0]
    blocks = section.split("```")
    problem = next(b for b in blocks if b.startswith("json\n"))[len("json\n"):]
    (tmp_path / "fen.json").write_text(problem)
    for block in blocks:
        if block.startswith("\n$ satorder settled fen.json"):
            command, _, shown = block[1:].partition("\n")
            argv = command[len("$ satorder "):].replace("fen.json", str(tmp_path / "fen.json"))
            assert main(argv.split()) == 0
            assert capsys.readouterr().out == shown, command


def test_answer_counts_past_float_range_print_in_scientific_notation():
    # exact counts of large problems run to hundreds of digits (a 50,000-item blocks problem
    # admits about 7e383 orders): the text must not go through a float, which overflows
    from types import SimpleNamespace

    from satorder.render.settled_text import answers_text

    res = SimpleNamespace(answers=7 * 10**383 + 12345, method="modular-decomposition")
    assert answers_text(res) == "7.000e+383 answers (exact, by modular-decomposition)"
    res.answers = 1
    assert answers_text(res) == "1 answer (exact, by modular-decomposition)"
