"""`satorder solve` and the readers: JSON contract, exit codes, every bad-input case."""

from __future__ import annotations

import json
import os
import subprocess
import sys

import pytest

from satorder import InputError, read_problem
from satorder.cli.main import main


def run(*args, cwd=None):
    """Run the CLI in a subprocess (so exit codes and stderr are exactly what users see)."""
    proc = subprocess.run(
        [sys.executable, "-m", "satorder", *args], capture_output=True, text=True, cwd=cwd
    )
    return proc.returncode, proc.stdout, proc.stderr


def write(tmp_path, name, content, mode="w"):
    path = tmp_path / name
    if mode == "wb":
        path.write_bytes(content)
    else:
        path.write_text(content)
    return str(path)


@pytest.mark.slow
def test_json_contract_for_a_feasible_edge_list(tmp_path):
    f = write(tmp_path, "g.txt", "# a path\nkiln loom\nloom quay\n")
    code, out, err = run("solve", f, "--json")
    assert code == 0, err
    doc = json.loads(out)
    assert doc["status"] == "feasible"
    order = {tuple(p) for p in doc["order"]}
    # a plain graph's answer is exactly its edges, oriented
    expected = {frozenset(("kiln", "loom")), frozenset(("loom", "quay"))}
    assert {frozenset(p) for p in order} == expected
    assert len(order) == 2 and doc["verified"] is True


@pytest.mark.slow
def test_json_contract_for_an_infeasible_cycle(tmp_path):
    f = write(tmp_path, "c5.txt", "a b\nb c\nc d\nd e\ne a\n")
    code, out, _ = run("solve", f, "--json")
    assert code == 0
    doc = json.loads(out)
    assert doc["status"] == "infeasible" and "order" not in doc
    chain = doc["conflict"]
    assert chain[-1]["arc"] == chain[0]["arc"][::-1]
    assert all(step["because"] for step in chain[1:])


@pytest.mark.slow
def test_human_output_shows_chain_and_points_to_explain(tmp_path):
    f = write(tmp_path, "c5.txt", "a b\nb c\nc d\nd e\ne a\n")
    code, out, _ = run("solve", f)
    assert code == 0
    assert "INFEASIBLE" in out and "minimal core" in out and "explain" in out
    assert "Forcing chain" in out and "reverse of step 1" in out


@pytest.mark.slow
def test_out_file_is_written_whole(tmp_path):
    f = write(tmp_path, "g.json", json.dumps({"comparable": [["x", "y"]]}))
    target = tmp_path / "answer.json"
    code, out, _ = run("solve", f, "--out", str(target))
    assert code == 0 and "FEASIBLE" in out
    assert json.loads(target.read_text())["status"] == "feasible"
    assert [p for p in os.listdir(tmp_path) if p.endswith(".tmp")] == []


def test_graph6_reader(tmp_path):
    import networkx as nx

    f = write(tmp_path, "c6.g6", nx.to_graph6_bytes(nx.cycle_graph(6), header=False).decode())
    p = read_problem(f)
    assert p.n == 6 and p.num_comparable == 6


BAD = [
    ("bad.json", '{"comparable": [["a", "b"],]}', "line 1 column"),
    ("key.json", '{"comparables": [["a", "b"]]}', 'did you mean "comparable"'),
    ("twice.json", '{"comparable": [["a", "a"]]}', "twice"),
    ("misspelt.json", '{"items": ["a", "b", "c"], "comparable": [["a", "cc"]]}',
     "comparable[0]: 'cc' is not in \"items\"; did you mean 'c'?"),
    ("weightname.json", '{"items": ["kiln"], "weights": {"klin": 2}}', "did you mean 'kiln'?"),
    ("weight.json", '{"prefer": [{"before": "a", "after": "b", "weight": 0}]}', "positive"),
    ("weight2.json", '{"prefer": [{"before": "a", "after": "b", "weight": 1.5}]}', "positive"),
    ("empty.txt", "", "empty"),
    ("blank.json", "   \n", "empty"),
    ("one.txt", "a b\nc\n", "line 2"),
    ("three.txt", "a b\nc d e\n", "line 2"),
    ("loop.txt", "a b\nc c\n", "line 2"),
    ("top.json", "[1, 2]", "top level"),
    ("incstr.json", '{"incomparable": "all"}', '"others"'),
    ("pairshape.json", '{"comparable": [["a", "b", "c"]]}', "comparable[0]"),
    ("prefkey.json", '{"prefer": [{"before": "a", "after": "b", "wieght": 2}]}', "weight"),
]


@pytest.mark.parametrize("name,content,needle", BAD, ids=[b[0] for b in BAD])
def test_bad_input_gives_one_line_and_exit_2(tmp_path, capsys, name, content, needle):
    # in-process for speed; test_binary_and_missing_files covers the real process exit codes
    f = write(tmp_path, name, content)
    code = main(["solve", f, "--json"])
    out, err = capsys.readouterr()
    assert code == 2
    assert out == ""
    assert "Traceback" not in err
    assert len(err.strip().splitlines()) == 1, err
    assert needle in err and name in err


@pytest.mark.slow
def test_binary_and_missing_files(tmp_path):
    f = write(tmp_path, "blob.bin", b"\x00\x01\x02abc", mode="wb")
    code, _, err = run("solve", f)
    assert code == 2 and "binary" in err
    code, _, err = run("solve", str(tmp_path / "nope.txt"))
    assert code == 2 and "no such file" in err


def test_failed_run_leaves_existing_output_untouched(tmp_path, capsys):
    target = tmp_path / "answer.json"
    target.write_text("precious")
    f = write(tmp_path, "bad.json", "{")
    code = main(["solve", f, "--out", str(target)])
    assert code == 2 and target.read_text() == "precious"


def _exit_code(argv) -> int:
    try:
        return main(argv)
    except SystemExit as exc:  # argparse usage errors
        return exc.code


def test_usage_errors_exit_2(tmp_path, capsys):
    assert run("solve")[0] == 2  # one real process for the argparse path
    assert _exit_code(["frobnicate"]) == 2
    f = write(tmp_path, "g.txt", "a b\n")
    assert _exit_code(["solve", f, "--engine", "magic"]) == 2
    assert _exit_code(["solve", f, "--out", f]) == 2  # would overwrite the input
    assert "overwrite" in capsys.readouterr().err


def test_in_process_main_returns_codes(tmp_path, capsys):
    f = write(tmp_path, "g.txt", "a b\n")
    assert main(["solve", f, "--json"]) == 0
    assert json.loads(capsys.readouterr().out)["status"] == "feasible"


def test_python_api_builders_validate():
    import networkx as nx

    from satorder import Problem, solve

    with pytest.raises(InputError, match="two different items"):
        Problem.from_lists(comparable=[("a", "a")])
    # contradicting requirements are a problem without answers, not bad input
    clash = Problem.from_lists(comparable=[("a", "b")], incomparable=[("a", "b")])
    assert solve(clash).status == "infeasible"
    p = Problem.from_networkx(nx.path_graph(4))
    assert solve(p).to_networkx().number_of_edges() == 3


@pytest.mark.slow
def test_demo_runs():
    code, out, err = run("demo")
    assert code == 0, err
    assert "FEASIBLE" in out


def test_fast_json_text_equals_the_plain_json_document():
    import networkx as nx

    from satorder import Problem, solve

    g = nx.complement(nx.interval_graph([(0, 1), (0.5, 2), (3, 4), (1.5, 3.5), (5, 6)]))
    nx.relabel_nodes(g, {v: f'it"{v}' for v in g}, copy=False)  # names that need escaping
    ans = solve(Problem.from_networkx(g))
    fast = json.loads(ans.to_json_text())
    slow = ans.to_json()
    assert {tuple(p) for p in fast.pop("order")} == {tuple(p) for p in slow.pop("order")}
    fast["stats"].pop("verify_seconds", None)
    slow["stats"].pop("verify_seconds", None)
    assert fast == slow


def test_check_order_rejects_non_transitive_and_out_of_range():
    from satorder import CertificateError, Problem, certify

    p = Problem.from_lists(comparable=[("a", "b"), ("b", "c"), ("a", "c")])
    with pytest.raises(CertificateError, match="transitive"):
        certify.check_order(p, [{1}, {2}, set()])  # a<b<c without a<c
    with pytest.raises(CertificateError, match="unknown item"):
        certify.check_order(p, [{1, 2, 7}, {2}, set()])
    certify.check_order(p, [{1, 2}, {2}, set()])


@pytest.mark.parametrize(
    "text,line",
    [
        ("a b\nc\nd e f\n", 2),  # one field then three: the token count alone would balance
        ("a b\r\nc d e\r\n", 2),  # Windows line ends
        ("a b\nc\u00a0d e\n", 2),  # a non-ASCII space splits like str.split does
        ("# header\n\na b # note\nx\n", 4),
    ],
)
def test_edge_list_field_errors_name_the_right_line(tmp_path, text, line):
    f = write(tmp_path, "g.txt", text)
    with pytest.raises(InputError, match=f"line {line}:"):
        read_problem(f)


def test_edge_list_accepts_crlf_comments_and_unicode_names(tmp_path):
    f = write(tmp_path, "g.txt", "# festival\r\nkiln loom\r\n\r\nloom café  # note\r\n")
    p = read_problem(f)
    assert sorted(p.items) == ["café", "kiln", "loom"] and p.num_comparable == 2


def test_atomic_write_follows_umask_and_keeps_existing_mode(tmp_path):
    from satorder.io.files import atomic_write

    old = os.umask(0o022)
    try:
        new = tmp_path / "new.json"
        atomic_write(str(new), "x")
        assert (new.stat().st_mode & 0o777) == 0o644
        kept = tmp_path / "kept.json"
        kept.write_text("old")
        kept.chmod(0o640)
        atomic_write(str(kept), "new")
        assert kept.read_text() == "new" and (kept.stat().st_mode & 0o777) == 0o640
    finally:
        os.umask(old)


@pytest.mark.parametrize("text", [
    "a b\nb c\n", "# header\nkiln loom  # note\n\nloom quay\nquay kiln\n", "x y\ny x\nx y\n",
    "a b\r\nb c\r\n", "a b\nc\u00a0d\n", "a b\nc\n", "a b\nc d e\n", "a b\nc c\n", "# only\n",
    "p q\n" * 3 + "r r\n" + "s\n", "1 2\n2 3\n10 2\n",
])
def test_small_and_large_edge_list_paths_agree(tmp_path, monkeypatch, text):
    # small edge lists are read line by line without numpy; the numpy path reads large ones.
    # Both must build the same problem, or fail with the same one-line error.
    from satorder.io import readers

    f = write(tmp_path, "g.txt", text)

    def outcome():
        try:
            p = read_problem(f)
        except InputError as exc:
            return str(exc)
        return p.items, p.adj, p.index

    small = outcome()
    monkeypatch.setattr(readers, "SMALL_TEXT", -1)
    assert outcome() == small


@pytest.mark.parametrize("compact", [False, True])
def test_json_and_out_write_the_same_streamed_document(tmp_path, capsys, monkeypatch, compact):
    # solve --json --out: the file is written in pieces (no temporary left), standard output
    # carries the same bytes, and networkx agrees that every pair of the file is ordered; with
    # ``compact`` the file takes the large-file path (scanner, arrays, array check) end to end
    import networkx as nx

    from satorder.io import readers

    if compact:
        from satorder.model import json_stream

        monkeypatch.setattr(readers, "SCAN_BYTES", 0)
        monkeypatch.setattr(json_stream, "SMALL_PAIRS", 0)
    lines = [f"stall{a} stall{b}" for a in range(1, 41) for b in range(a + 1, 41) if b % a == 0]
    f = write(tmp_path, "g.txt", "\n".join(lines) + "\n")
    target = tmp_path / "answer.json"
    assert main(["solve", f, "--json", "--out", str(target)]) == 0
    printed = capsys.readouterr().out
    assert printed == target.read_text()
    doc = json.loads(printed)
    assert doc["status"] == "feasible" and doc["verified"]
    order = nx.DiGraph(doc["order"])
    assert nx.is_directed_acyclic_graph(order)
    assert nx.is_isomorphic(order.to_undirected(), nx.read_edgelist(f))
    assert [p for p in os.listdir(tmp_path) if p.endswith(".tmp")] == []
