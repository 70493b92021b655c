"""Long runs that stop well: Ctrl-C and the time limit keep what was found (count, orders,
explain, bench), a closed pipe ends quietly, and bench refuses what cannot run before it
starts."""

from __future__ import annotations

import json
import signal
import subprocess
import sys
import time

import pytest

from satorder.cli.main import main

# twelve items, one pair that must stay unordered, every other pair open: the answers are the
# strict partial orders on 12 labelled items with a and b unordered, far too many to list
# (there are already 2,567,284,433 labelled posets on 10 points — OEIS A001035, recalled from
# memory), so a listing is always cut short
MANY = {"items": list("abcdefghijkl"), "incomparable": [["a", "b"]]}


def _problem(tmp_path, doc=MANY, name="many.json"):
    path = tmp_path / name
    path.write_text(json.dumps(doc))
    return str(path)


# the command line as `satorder` runs it, with Python's Ctrl-C handler installed even when this
# test runner was started with SIGINT ignored (a child would then inherit "ignore")
_CHILD = ("import signal, sys\nsignal.signal(signal.SIGINT, signal.default_int_handler)\n"
          "from satorder.cli.main import main\nsys.exit(main(sys.argv[1:]))\n")


def _start(args, **kw):
    """The command in its own process, Ctrl-C handled as in a terminal."""
    return subprocess.Popen([sys.executable, "-c", _CHILD, *args], text=True, **kw)


def _wait_for(predicate, seconds=60.0):
    end = time.monotonic() + seconds
    while time.monotonic() < end:
        if predicate():
            return True
        time.sleep(0.05)
    return False


@pytest.mark.slow
def test_ctrl_c_two_seconds_into_count_gives_a_lower_bound(tmp_path):
    f = _problem(tmp_path)
    err = tmp_path / "err.txt"
    with open(err, "w") as err_file:
        proc = _start(["count", f, "--json", "--method", "enumeration"], stdout=subprocess.PIPE,
                      stderr=err_file)
        # the estimate of the work is printed on stderr just before the listing starts
        assert _wait_for(lambda: "exponential work" in err.read_text()), err.read_text()
        time.sleep(2.0)
        proc.send_signal(signal.SIGINT)
        out, _ = proc.communicate(timeout=60)
    assert proc.returncode == 130, err.read_text()
    doc = json.loads(out)
    assert doc["exact"] is False and doc["stopped"] == "interrupted"
    assert doc["count"] > 0 and doc["lower_bound"] == doc["count"]
    assert doc["method"] == "enumeration" and doc["verified"] is True
    assert doc["item_count"] == 12 and "items" not in doc


@pytest.mark.slow
def test_ctrl_c_two_seconds_into_orders_still_prints_the_end_line(tmp_path):
    f = _problem(tmp_path)
    listing = tmp_path / "orders.jsonl"
    with open(listing, "w") as out_file:
        proc = _start(["orders", f], stdout=out_file, stderr=subprocess.PIPE)
        assert _wait_for(lambda: listing.stat().st_size > 0)
        time.sleep(2.0)
        proc.send_signal(signal.SIGINT)
        _, err = proc.communicate(timeout=60)
    assert proc.returncode == 130, err
    lines = [json.loads(x) for x in listing.read_text().splitlines()]
    end = lines[-1]
    assert end["end"] is True and end["complete"] is False and end["stopped"] == "interrupted"
    answers = lines[:-1]
    assert answers and end["found"] == len(answers)
    assert [a["index"] for a in answers] == list(range(1, len(answers) + 1))
    assert all(a["verified"] for a in answers)


def test_count_and_orders_at_the_time_limit_exit_3_with_what_they_found(tmp_path, capsys):
    f = _problem(tmp_path)
    assert main(["count", f, "--json", "--time-limit", "0.5"]) == 3
    doc = json.loads(capsys.readouterr().out)
    assert doc["exact"] is False and doc["stopped"] == "time-limit" and doc["count"] > 0
    assert main(["orders", f, "--time-limit", "0.5"]) == 3
    lines = [json.loads(x) for x in capsys.readouterr().out.splitlines()]
    assert lines[-1]["stopped"] == "time-limit" and lines[-1]["found"] == len(lines) - 1


def test_count_with_a_limit_exits_0_and_small_counts_give_no_warning(tmp_path, capsys):
    f = _problem(tmp_path)
    assert main(["count", f, "--json", "--limit", "5", "--method", "enumeration"]) == 0
    captured = capsys.readouterr()
    doc = json.loads(captured.out)
    assert doc == {**doc, "count": 5, "exact": False, "stopped": "limit"}
    assert "exponential work" in captured.err
    # the default method lists a bounded number of answers, then counts approximately
    assert main(["count", f, "--json", "--limit", "5"]) == 0
    captured = capsys.readouterr()
    assert json.loads(captured.out)["count"] == 5
    assert "counted approximately beyond" in captured.err
    small = _problem(tmp_path, {"items": ["a", "b", "c"], "incomparable": []}, "small.json")
    assert main(["count", small, "--json"]) == 0
    captured = capsys.readouterr()
    assert json.loads(captured.out)["count"] == 19  # labelled posets on 3 points (OEIS A001035)
    assert "exponential work" not in captured.err


def test_explain_cut_short_prints_the_core_so_far_marked_not_minimal(tmp_path, capsys,
                                                                     monkeypatch):
    # shrinking the core stops (as at the time limit) after the oracle's first answers: the
    # requirements reached must still be infeasible, and are reported as not minimal
    from satorder.explanation import explain as module
    from satorder.sat import mus

    real = mus.minimal_core

    def cut_after_first_step(oracle, start):
        ok, current = oracle.check(start)
        assert not ok
        raise mus.CutShort(sorted(current), "time-limit")

    monkeypatch.setattr(module, "minimal_core", cut_after_first_step)
    doc = {"items": ["a", "b", "c", "d"], "fixed": [["a", "b"], ["b", "c"], ["c", "d"]],
           "forbidden": [["a", "d"]], "incomparable": [["a", "c"]]}
    f = _problem(tmp_path, doc, "cycle.json")
    assert main(["explain", f, "--json"]) == 3
    got = json.loads(capsys.readouterr().out)
    assert got["status"] == "infeasible" and got["minimal"] is False
    assert got["stopped"] == "time-limit" and got["verified"] is True
    assert got["core"] and any("shrinking" in n for n in got["notes"])
    monkeypatch.setattr(module, "minimal_core", real)
    assert main(["explain", f, "--json"]) == 0
    whole = json.loads(capsys.readouterr().out)
    assert whole["minimal"] is True and len(whole["core"]) <= len(got["core"])


def test_minimal_core_hands_back_the_infeasible_set_reached_on_ctrl_c():
    from satorder.model.requirement import Requirement as R
    from satorder.sat.mus import CutShort, RequirementOracle, minimal_core

    reqs = [R("fixed", (0, 1)), R("fixed", (1, 2)), R("incomparable", (0, 2)),
            R("comparable", (2, 3)), R("fixed", (3, 4))]
    with RequirementOracle(reqs) as oracle:
        real = oracle.check
        calls = []

        def interrupted_second_call(active):
            calls.append(list(active))
            if len(calls) == 2:
                raise KeyboardInterrupt
            return real(active)

        oracle.check = interrupted_second_call
        with pytest.raises(CutShort) as cut:
            minimal_core(oracle, range(len(reqs)))
        assert cut.value.reason == "interrupted"
        oracle.check = real
        ok, _ = oracle.check(cut.value.current)
        assert not ok and set(cut.value.current) >= {0, 1, 2}


def test_bench_refuses_unknown_back_ends_before_any_run(tmp_path, capsys):
    suite = tmp_path / "suite"
    suite.mkdir()
    (suite / "g.txt").write_text("a b\n")
    rows = tmp_path / "rows.jsonl"
    assert main(["bench", str(suite), "--backend", "forcing", "kissat404", "cadical300",
                 "--out", str(rows)]) == 2
    err = capsys.readouterr().err
    assert "unknown back end 'kissat404'" in err and len(err.strip().splitlines()) == 1
    assert "cadical195" in err and "forcing" in err  # the names that do work here
    assert not rows.exists()  # nothing ran


def test_bench_plot_without_matplotlib_stops_before_any_run(tmp_path, capsys, monkeypatch):
    from satorder.cli import bench as command

    real = command.importlib.util.find_spec
    monkeypatch.setattr(command.importlib.util, "find_spec",
                        lambda name, *a: None if name == "matplotlib" else real(name, *a))
    suite = tmp_path / "suite"
    suite.mkdir()
    (suite / "g.txt").write_text("a b\n")
    rows = tmp_path / "rows.jsonl"
    assert main(["bench", str(suite), "--out", str(rows), "--plot", str(tmp_path / "p.png")]) == 2
    assert "satorder[draw]" in capsys.readouterr().err
    assert not rows.exists()


@pytest.mark.slow
def test_bench_unknown_back_end_exits_2_in_a_real_process(tmp_path):
    suite = tmp_path / "suite"
    suite.mkdir()
    (suite / "g.txt").write_text("a b\n")
    rows = tmp_path / "rows.jsonl"
    proc = subprocess.run([sys.executable, "-m", "satorder", "bench", str(suite), "--backend",
                           "kissat404", "--out", str(rows)], capture_output=True, text=True)
    assert proc.returncode == 2 and "Traceback" not in proc.stderr
    assert not rows.exists()


def _big_plain_problem(tmp_path) -> str:
    # complete bipartite 100 x 100: 10,000 comparable pairs, a JSON answer of about 190 kB,
    # more than a pipe holds, so the writer meets the closed pipe
    path = tmp_path / "big.txt"
    path.write_text("".join(f"l{a} r{b}\n" for a in range(100) for b in range(100)))
    return str(path)


@pytest.mark.slow
def test_solve_into_a_closed_pipe_ends_quietly(tmp_path):
    big = _big_plain_problem(tmp_path)
    # `satorder solve FILE --json | head -c 20`: the reader goes away after 20 bytes
    proc = _start(["solve", big, "--json"], stdout=subprocess.PIPE, stderr=subprocess.PIPE)
    assert proc.stdout.read(20).startswith('{"status":"feasible"')
    proc.stdout.close()
    err = proc.stderr.read()
    proc.wait(timeout=60)
    assert proc.returncode in (0, 141) and err == ""
    # the text output (rich) into a pipe closed before anything was written
    proc = _start(["solve", big], stdout=subprocess.PIPE, stderr=subprocess.PIPE)
    proc.stdout.close()
    err = proc.stderr.read()
    proc.wait(timeout=60)
    assert proc.returncode in (0, 141) and err == ""
    # and through a real shell pipeline, as users type it
    small = tmp_path / "three.txt"
    small.write_text("kiln loom\nloom quay\n")
    shell = subprocess.run(
        ["bash", "-c", f'"{sys.executable}" -m satorder solve "{small}" | head -1; '
                       'exit "${PIPESTATUS[0]}"'], capture_output=True, text=True)
    assert shell.returncode in (0, 141) and shell.stderr == ""
    assert shell.stdout.startswith("FEASIBLE")
