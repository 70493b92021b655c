"""The shared option vocabulary: the README's table against the parsers, one meaning per
option, usage errors with suggestions, lazy command imports."""

from __future__ import annotations

import argparse
import os
import re
import subprocess
import sys

import pytest

from satorder.cli import options
from satorder.cli.main import COMMANDS, command_parser, main

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))


def _readme_table() -> tuple[list[str], dict[str, set[str]]]:
    """The commands of the README's shared-options table and, per option, those marked ●."""
    text = open(os.path.join(ROOT, "README.md"), encoding="utf-8").read()
    section = text.split("## Shared options and exit statuses", 1)[1].split("\n## ", 1)[0]
    rows = [line for line in section.splitlines() if line.startswith("| `--")]
    header = next(line for line in section.splitlines() if line.startswith("| option |"))
    commands = [c.strip() for c in header.strip("|").split("|")][2:]
    marks = {}
    for row in rows:
        cells = [c.strip() for c in row.strip().strip("|").split("|")]
        option = re.match(r"`(--[a-z-]+)", cells[0]).group(1)
        marks[option] = {cmd for cmd, cell in zip(commands, cells[2:]) if cell == "●"}
    return commands, marks


def _action(parser: argparse.ArgumentParser, option: str):
    return next((a for a in parser._actions if option in a.option_strings), None)


def test_readme_table_lists_every_shared_option_and_every_command_but_demo():
    commands, marks = _readme_table()
    assert set(marks) == set(options.SHARED)
    assert set(commands) | {"demo"} == set(COMMANDS)


@pytest.mark.parametrize("command", [c for c in COMMANDS if c != "demo"])
def test_each_command_takes_exactly_the_shared_options_the_readme_marks(command):
    _, marks = _readme_table()
    parser = command_parser(command)
    for option, takers in marks.items():
        action = _action(parser, option)
        if command in takers:
            assert action is not None, f"{command} lacks {option}"
            # the shared wording comes first: one meaning everywhere
            assert action.help.startswith(options.MEANING[option]), (command, option)
        else:
            assert action is None or action.help == argparse.SUPPRESS, (command, option)


def test_demo_takes_no_shared_option():
    parser = command_parser("demo")
    assert all(_action(parser, o) is None for o in options.SHARED)


@pytest.mark.parametrize("command", ["solve", "explain", "measure", "count", "orders", "bench"])
@pytest.mark.parametrize("value", ["0", "-1", "soon", "inf"])
def test_every_time_limit_refuses_what_is_not_a_positive_number(command, value, capsys, tmp_path):
    f = tmp_path / "g.txt"
    f.write_text("a b\n")
    extra = ["--out", str(tmp_path / "r.jsonl")] if command == "bench" else []
    with pytest.raises(SystemExit) as stop:
        main([command, str(f), "--time-limit", value, *extra])
    assert stop.value.code == 2
    err = capsys.readouterr().err
    assert "--time-limit" in err and len(err.strip().splitlines()) == 1


def test_time_limit_reaches_the_command_with_the_same_type_everywhere(tmp_path):
    for command in ("solve", "explain", "measure", "count", "orders", "bench"):
        args = command_parser(command).parse_args(["x.txt", "--time-limit", "2.5"]
                                                  + (["--out", "r"] if command == "bench"
                                                     else []))
        assert args.time_limit == 2.5


def test_bench_keeps_timeout_as_a_hidden_alias(capsys):
    parser = command_parser("bench")
    args = parser.parse_args(["d", "--out", "r.jsonl", "--timeout", "7"])
    assert args.time_limit == 7.0
    assert parser.parse_args(["d", "--out", "r.jsonl"]).time_limit == 60.0
    assert "--timeout" not in parser.format_help()


def test_mistyped_command_and_option_get_a_suggestion(capsys, tmp_path):
    with pytest.raises(SystemExit) as stop:
        main(["slove", "x.txt"])
    assert stop.value.code == 2
    assert "did you mean 'solve'?" in capsys.readouterr().err
    f = tmp_path / "g.txt"
    f.write_text("a b\n")
    with pytest.raises(SystemExit) as stop:
        main(["solve", str(f), "--tiem-limit", "3"])
    assert stop.value.code == 2
    assert "did you mean '--time-limit'?" in capsys.readouterr().err
    with pytest.raises(SystemExit):
        main(["count", str(f), "--jsno"])
    assert "did you mean '--json'?" in capsys.readouterr().err
    with pytest.raises(SystemExit):  # nothing close: the choices are listed instead
        main(["zzzzzz"])
    assert "choose one of solve" in capsys.readouterr().err


def test_explain_and_orders_take_out_and_json(tmp_path, capsys):
    import json

    f = tmp_path / "cycle.txt"
    f.write_text("a b\nb c\nc d\nd e\ne a\n")
    target = tmp_path / "why.json"
    assert main(["explain", str(f), "--json", "--out", str(target)]) == 0
    printed = json.loads(capsys.readouterr().out)
    written = json.loads(target.read_text())
    assert printed["status"] == written["status"] == "infeasible"
    assert written["minimal"] is True and written["item_count"] == 5
    lines = tmp_path / "orders.jsonl"
    g = tmp_path / "path.txt"
    g.write_text("a b\nb c\n")
    assert main(["orders", str(g), "--json", "--out", str(lines)]) == 0
    out = capsys.readouterr().out
    assert out == lines.read_text() and len(out.splitlines()) == 3  # two answers, the end


@pytest.mark.slow
def test_version_and_small_solve_import_no_heavy_module(tmp_path):
    # start-up: --version imports no numpy, rich or engine; a 3-item solve loads none of
    # numpy, scipy, numba, networkx or python-sat (their import is what made start-up slow)
    f = tmp_path / "three.txt"
    f.write_text("kiln loom\nloom quay\n")
    probe = ("import sys\nfrom satorder.cli.main import main\n"
             "try:\n    code = main(sys.argv[1:])\nexcept SystemExit as stop:\n"
             "    code = stop.code\n"
             "heavy = sorted({m.split('.')[0] for m in sys.modules} & "
             "{'numpy', 'scipy', 'numba', 'networkx', 'rich', 'pysat'})\n"
             "sys.stderr.write('HEAVY ' + ' '.join(heavy) + '\\n')\nraise SystemExit(code)\n")
    got = {}
    for name, argv in (("version", ["--version"]), ("solve", ["solve", str(f)]),
                       ("json", ["solve", str(f), "--json"]),
                       ("settled", ["settled", str(f), "--json"]),
                       ("sample", ["sample", str(f), "-k", "2"])):
        proc = subprocess.run([sys.executable, "-c", probe, *argv], capture_output=True,
                              text=True)
        assert proc.returncode == 0, proc.stderr
        line = [x for x in proc.stderr.splitlines() if x.startswith("HEAVY")]
        got[name] = set(line[0].split()[1:])
    assert got["version"] == set()
    assert got["solve"] == {"rich"}  # the text output uses rich
    assert got["json"] == set()
    assert got["settled"] == set() and got["sample"] == set()  # decomposition, listing check
    proc = subprocess.run([sys.executable, "-c",
                           "import sys\nfrom satorder.cli.main import parse\n"
                           "parse(['--help'])"], capture_output=True, text=True)
    assert "make-suite" in proc.stdout and "count" in proc.stdout
