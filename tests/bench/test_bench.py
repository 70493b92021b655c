"""The benchmark runner: isolation (timeouts, crashes), resumable rows, interrupts, agreement
checks, summary, plots and the Dask cluster path."""

from __future__ import annotations

import json
import os
import shutil
import signal
import subprocess
import sys
import time

import pytest

import satorder.bench as bench
from satorder.bench import isolate
from satorder.cli.main import main
from satorder.errors import InputError

HERE = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))  # tests/, for bench_plugins
ROOT = os.path.dirname(HERE)
SMALL = os.path.join(ROOT, "instances", "small")
PLAIN = ["000-complete-n3-s1.json", "006-bipartite-n8-s1.json", "011-series-parallel-n5-s2.json",
         "042-planted-hole-n12-s1.json", "045-planted-antihole-n14-s1.json",
         "019-order-n8-s1.json"]
SIDE = "047-side-constraints-n10-s1.json"


@pytest.fixture(autouse=True)
def _plugins_importable(monkeypatch):
    # back ends named bench_plugins:NAME live next to this file; workers inherit the path
    monkeypatch.syspath_prepend(HERE)
    monkeypatch.setenv("PYTHONPATH", HERE + os.pathsep + os.environ.get("PYTHONPATH", ""))


def _suite(tmp_path, files=PLAIN, name="suite"):
    """A copy of some small-suite problems with the matching part of its manifest."""
    d = tmp_path / name
    d.mkdir()
    manifest = json.loads(open(os.path.join(SMALL, "manifest.json")).read())
    keep = [e for e in manifest["instances"] if e["file"] in files]
    for e in keep:
        shutil.copy(os.path.join(SMALL, e["file"]), d / e["file"])
    (d / "manifest.json").write_text(json.dumps({"suite": name, "instances": keep}))
    assert len(keep) == len(files)
    return d


def _rows(path):
    with open(path) as f:
        return [json.loads(line) for line in f]


def _task(path, backend, timeout=20.0, expected=None):
    return {"instance": os.path.basename(path), "path": path, "backend": backend,
            "timeout": timeout, "expected": expected or {}}


# --------------------------------------------------------------------------- one run
@pytest.mark.slow
def test_forcing_run_row_has_the_contract_fields():
    row = bench.run_isolated(_task(os.path.join(SMALL, PLAIN[1]), "forcing"))
    for key in ("instance", "backend", "status", "seconds", "peak_mb", "verified",
                "variables", "clauses"):
        assert key in row
    assert row["status"] == "feasible" and row["verified"] is True
    assert row["item_count"] == 8 and row["peak_mb"] > 1


def test_forcing_skips_problems_with_side_constraints_and_says_why():
    row = bench.run_isolated(_task(os.path.join(SMALL, SIDE), "forcing"))
    assert row["status"] == "skipped"
    assert "fixed arcs" in row["reason"] and "forbidden arcs" in row["reason"]


def test_hanging_backend_is_killed_at_the_timeout():
    t0 = time.perf_counter()
    row = bench.run_isolated(_task(os.path.join(SMALL, PLAIN[0]), "bench_plugins:hang",
                                   timeout=1.0))
    elapsed = time.perf_counter() - t0
    assert row["status"] == "timeout" and row["seconds"] == 1.0
    assert elapsed < 30  # killed, not waited for (the hang never ends on its own)
    assert row["peak_mb"] is None or row["peak_mb"] > 1


def test_crash_and_exception_are_rows_not_dead_runners():
    crash = bench.run_isolated(_task(os.path.join(SMALL, PLAIN[0]), "bench_plugins:segfault"))
    assert crash["status"] == "crash" and "SIGSEGV" in crash["error"]
    err = bench.run_isolated(_task(os.path.join(SMALL, PLAIN[0]), "bench_plugins:raises"))
    assert err["status"] == "error" and "deliberate failure" in err["error"]


def test_wrong_answers_fail_their_check():
    bad = bench.run_isolated(_task(os.path.join(SMALL, PLAIN[1]), "bench_plugins:wrong_order"))
    assert bad["status"] == "feasible" and bad["verified"] is False and bad["check_error"]
    lie = bench.run_isolated(_task(os.path.join(SMALL, PLAIN[1]), "bench_plugins:liar"))
    assert lie["status"] == "infeasible" and lie["verified"] is False


@pytest.mark.slow
def test_fresh_interpreter_path_stops_at_the_timeout_too():
    # the path Dask workers take (daemonic processes may not fork workers of their own): the
    # worker's own timer ends the run; ordinary rows are compared in the cluster test below
    h = isolate._run_subprocess(_task(os.path.join(SMALL, PLAIN[0]), "bench_plugins:hang",
                                    timeout=1.0))
    assert h["status"] == "timeout" and h["seconds"] == 1.0


# --------------------------------------------------------------------------- rows and checks
def test_read_rows_cuts_a_torn_last_line_and_rejects_garbage(tmp_path):
    f = tmp_path / "r.jsonl"
    good = '{"instance":"a","backend":"forcing","status":"feasible","seconds":1}\n'
    f.write_text(good + '{"instance":"b","backend":"forc')
    assert [r["instance"] for r in bench.read_rows(str(f))] == ["a"]
    assert f.read_text() == good  # the torn line is gone, so appends stay line-aligned
    f.write_text("not json\n" + good)
    with pytest.raises(InputError, match="line 1"):
        bench.read_rows(str(f))


def test_discover_uses_manifest_or_extensions_and_rejects_missing(tmp_path):
    d = _suite(tmp_path, PLAIN[:2])
    found = bench.discover([str(d)])
    assert [os.path.basename(k) for k, _, _ in found] == PLAIN[:2]
    assert found[0][2]["expected_status"] == "feasible"
    plain = tmp_path / "loose"
    plain.mkdir()
    (plain / "x.txt").write_text("a b\n")
    (plain / "notes.md").write_text("ignored")
    assert [os.path.basename(k) for k, _, _ in bench.discover([str(plain)])] == ["x.txt"]
    with pytest.raises(InputError):
        bench.discover([str(tmp_path / "nowhere")])
    os.unlink(d / PLAIN[0])
    with pytest.raises(InputError, match="missing"):
        bench.discover([str(d)])


def _row(inst, backend, status, **kw):
    return {"instance": inst, "backend": backend, "status": status, "seconds": 1.0,
            "verified": status in bench.SOLVED, **kw}


def test_agreement_checks_flag_every_kind_of_contradiction():
    assert bench.find_problems([_row("a", "x", "feasible"), _row("a", "y", "feasible"),
                                _row("a", "z", "timeout")]) == []
    msgs = bench.find_problems([_row("a", "x", "feasible"), _row("a", "y", "infeasible")])
    assert len(msgs) == 1 and "disagree" in msgs[0]
    msgs = bench.find_problems([_row("b", "x", "feasible", expected_status="infeasible")])
    assert "manifest expects infeasible" in msgs[0]
    msgs = bench.find_problems([_row("c", "x", "feasible", verified=False, check_error="oops")])
    assert "failed its check: oops" in msgs[0]
    msgs = bench.find_problems([_row("d", "x", "feasible", cost=3, optimal=True),
                                _row("d", "y", "feasible", cost=2, optimal=True)])
    assert "optimal cost" in msgs[0]
    msgs = bench.find_problems([_row("e", "x", "feasible", cost=1, optimal=True,
                                     expected_cost=0)])
    assert "expects 0" in msgs[0]


def test_summary_counts_and_times():
    rows = [_row("a", "x", "feasible"), _row("b", "x", "infeasible"),
            {**_row("c", "x", "timeout"), "seconds": 5.0}, _row("d", "x", "crash"),
            {**_row("e", "x", "skipped"), "seconds": None}]
    rows[1]["seconds"] = 3.0
    s = bench.summarize(rows)["x"]
    assert (s["runs"], s["solved"], s["timeouts"], s["failed"], s["skipped"]) == (5, 2, 1, 1, 1)
    assert s["median_seconds"] == 2.0 and s["total_seconds"] == 10.0
    assert bench.cactus_series(rows)["x"] == [1.0, 3.0]


# --------------------------------------------------------------------------- the command
@pytest.mark.slow
def test_cli_runs_resumes_and_plots(tmp_path, capsys):
    d = _suite(tmp_path, PLAIN[:4] + [SIDE])
    out = tmp_path / "r.jsonl"
    png = tmp_path / "p.png"
    args = ["bench", str(d), "--backend", "forcing", "bench_plugins:raises", "--timeout", "20",
            "--jobs", "2", "--out", str(out), "--plot", str(png)]
    assert main(args) == 1  # the back end that raises gives rows with status error: exit 1
    printed = capsys.readouterr()
    assert "5 runs ended in error or crash" in printed.err
    rows = _rows(out)
    keys = [(r["instance"], r["backend"]) for r in rows]
    assert len(keys) == len(set(keys)) == 10
    by = {(os.path.basename(r["instance"]), r["backend"]): r for r in rows}
    assert by[(SIDE, "forcing")]["status"] == "skipped"
    assert by[(PLAIN[3], "forcing")]["status"] == "infeasible"
    assert png.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    table = printed.out
    assert "forcing" in table and "solved" in table
    before = out.read_text()
    assert main(args[:-2]) == 1  # nothing left: no run repeated (and no second plot)
    assert out.read_text() == before


def test_cli_exits_1_on_disagreement_and_2_on_bad_usage(tmp_path, capsys):
    d = _suite(tmp_path, PLAIN[:2])
    out = tmp_path / "r.jsonl"
    assert main(["bench", str(d), "--backend", "forcing", "bench_plugins:liar",
                 "--out", str(out)]) == 1
    assert "disagree" in capsys.readouterr().err
    assert main(["bench", str(d), "--backend", "nosuchsolver", "--out", str(out)]) == 2
    with pytest.raises(SystemExit) as stop:  # argparse checks the value: a usage error
        main(["bench", str(d), "--time-limit", "0", "--out", str(out)])
    assert stop.value.code == 2
    assert main(["bench", str(tmp_path / "missing"), "--out", str(out)]) == 2
    assert main(["bench", str(d), "--out", str(d / PLAIN[0])]) == 2  # would overwrite input


@pytest.mark.slow
def test_interrupt_then_resume_loses_and_repeats_nothing(tmp_path):
    files = ["000-complete-n3-s1.json", "001-complete-n4-s1.json", "002-complete-n5-s1.json",
             "003-complete-n6-s1.json", "004-bipartite-n6-s1.json", "005-bipartite-n6-s2.json",
             "006-bipartite-n8-s1.json", "007-bipartite-n8-s2.json"]
    d = _suite(tmp_path, files)
    out = tmp_path / "r.jsonl"
    cmd = [sys.executable, "-m", "satorder", "bench", str(d), "--backend",
           "bench_plugins:slow_forcing", "--jobs", "2", "--timeout", "60", "--out", str(out)]
    env = {**os.environ, "SATORDER_TEST_DELAY": "0.8"}
    # its own session, so the signal goes to the runner and its workers as Ctrl-C would
    proc = subprocess.Popen(cmd, env=env, start_new_session=True, stdout=subprocess.PIPE,
                            stderr=subprocess.PIPE, text=True)
    deadline = time.time() + 90
    while time.time() < deadline and (not out.exists() or out.read_text().count("\n") < 2):
        time.sleep(0.05)
    os.killpg(proc.pid, signal.SIGINT)
    stdout, stderr = proc.communicate(timeout=60)
    assert proc.returncode == 130, stderr
    assert "interrupted" in stderr
    assert "bench_plugins:slow_forcing" in stdout  # the summary of the runs that finished
    first = out.read_text()
    assert first.endswith("\n")
    rows = [json.loads(line) for line in first.splitlines()]  # every line a complete row
    keys = [r["instance"] for r in rows]
    assert 2 <= len(keys) < len(files) and len(keys) == len(set(keys))
    # rerun the same command: only the missing runs are done
    env["SATORDER_TEST_DELAY"] = "0"
    done = subprocess.run(cmd, env=env, capture_output=True, text=True, timeout=120)
    assert done.returncode == 0, done.stderr
    assert f"{len(rows)} runs already done" in done.stderr
    final = out.read_text()
    assert final.startswith(first)  # earlier rows untouched
    keys = [r["instance"] for r in (json.loads(x) for x in final.splitlines())]
    assert sorted(keys) == sorted(os.path.join(str(d), f) for f in files)


@pytest.mark.slow
def test_local_dask_cluster_gives_the_same_rows_and_resumes(tmp_path):
    distributed = pytest.importorskip("distributed")
    d = _suite(tmp_path, PLAIN[3:6])
    out = tmp_path / "r.jsonl"
    # one row done locally first: the cluster run must skip it and do the other two
    first = os.path.join(str(d), PLAIN[3])
    assert main(["bench", first, "--backend", "forcing", "--out", str(out)]) == 0
    with distributed.LocalCluster(n_workers=2, threads_per_worker=1, processes=True,
                                  dashboard_address=None) as cluster:
        code = main(["bench", str(d), "--backend", "forcing", "--timeout", "60",
                     "--out", str(out), "--cluster", cluster.scheduler_address])
    assert code == 0
    rows = _rows(out)
    assert len(rows) == 3 and len({r["instance"] for r in rows}) == 3
    assert rows[0]["instance"] == first
    fields = [set(r) - set(bench.EXPECTED_KEYS) for r in rows]  # manifest fields vary
    assert all(f == fields[0] for f in fields)  # the same fields as a local run
    status = {os.path.basename(r["instance"]): r["status"] for r in rows}
    assert status == {PLAIN[3]: "infeasible", PLAIN[4]: "infeasible", PLAIN[5]: "feasible"}
    assert all(r["verified"] for r in rows)
