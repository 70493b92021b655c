"""The encoding: exported CNF read back by python-sat, comment lines, the baseline encoding,
and the ``cnf`` command."""

from __future__ import annotations

import json
import random
import re

import networkx as nx
import pytest
from order_reference import brute_force_feasible, random_problem
from pysat.formula import CNF
from pysat.solvers import Solver

from satorder import Problem, certify
from satorder.cli.main import main
from satorder.sat.direct import direct_encoding
from satorder.sat.encoding import Encoding
from satorder.sat.engine import solve_sat


def _read_back(text: str, problem: Problem):
    """Solve exported DIMACS with MiniSat (not the engine's default) and decode the model from
    the comment lines alone: ``c LIT a<b``."""
    cnf = CNF(from_string=text)
    meaning = []
    for line in text.splitlines():
        m = re.fullmatch(r"c (-?\d+) (\S+)<(\S+)", line)
        if m:
            meaning.append((int(m.group(1)), m.group(2), m.group(3)))
    with Solver(name="minisat22", bootstrap_with=cnf.clauses) as s:
        if not s.solve():
            return None
        model = set(s.get_model())
    idx = problem.index
    succ = [set() for _ in range(problem.n)]
    for lit, a, b in meaning:
        if lit in model or (lit < 0 and -lit not in model):  # a variable in no clause: false
            succ[idx[a]].add(idx[b])
    return succ


def test_exported_cnf_is_equisatisfiable_and_models_read_back():
    rnd = random.Random(404)
    for k in range(200):
        p = random_problem(rnd, rnd.randint(2, 6))
        verdict = solve_sat(p).feasible
        for selectors in (False, True):
            text = Encoding(p, selectors=selectors, lazy=False).to_dimacs()
            succ = _read_back(text, p)
            assert (succ is not None) == verdict, (k, selectors)
            if succ is not None:
                certify.check_order(p, succ)  # the comment lines decode to a valid answer


def test_exported_cnf_of_plain_graphs_matches_forcing():
    # Golumbic 1980, ch. 5: C5 is not a comparability graph; C6 and K4 are
    for g, ok in [(nx.cycle_graph(5), False), (nx.cycle_graph(6), True),
                  (nx.complete_graph(4), True), (nx.petersen_graph(), False)]:
        p = Problem.from_networkx(g)
        assert (_read_back(Encoding(p, lazy=False).to_dimacs(), p) is not None) == ok


def test_implication_classes_collapse_comparable_pairs():
    # a path a-b-c-d with every other pair unordered has one implication class (Γ forcing),
    # and K4 has one class per edge (no two of its arcs are Γ-related)
    path = Problem.from_networkx(nx.path_graph(4))
    enc = Encoding(path)
    assert enc.num_classes == 1 and enc.nv == 1
    k4 = Encoding(Problem.from_networkx(nx.complete_graph(4)))
    assert k4.num_classes == 6


def test_collapsed_class_with_reverse_arc_is_empty_clause():
    enc = Encoding(Problem.from_networkx(nx.cycle_graph(5)))
    assert [] in enc.hard


def test_selectors_name_requirements_and_lazy_pairs():
    p = Problem.from_lists(comparable=[("a", "b"), ("b", "c")], fixed=[("a", "b")],
                           forbidden=[("c", "b")])
    enc = Encoding(p, selectors=True)
    a, b, c = (p.index[x] for x in "abc")
    assert set(enc.selector_of) == {("comparable", (a, b)), ("comparable", (b, c)),
                                    ("fixed", (a, b)), ("forbidden", (c, b))}
    assert not enc.has_pair(a, c)  # must-stay-unordered pairs get variables only on demand
    lit = enc.lt(a, c)
    assert lit is not None and ("incomparable", (a, c)) in enc.selector_of
    for key, s in enc.selector_of.items():
        assert enc.requirement_of[s] == key


def test_violations_finds_missing_transitive_pairs():
    succ = [{1}, {2}, set()]
    assert Encoding.violations(succ) == [(0, 1, 2)]
    assert Encoding.violations([{1, 2}, {2}, set()]) == []


def test_direct_encoding_counts_and_verdicts():
    rnd = random.Random(9)
    for _ in range(60):
        p = random_problem(rnd, rnd.randint(2, 5))
        d = direct_encoding(p)
        n = p.n
        clauses = [cl for chunk in d.chunks(50) for cl in chunk]
        assert len(clauses) == d.num_clauses
        assert d.nv == n * (n - 1)
        assert len({d.lt(a, b) for a in range(n) for b in range(n) if a != b}) == d.nv
        with Solver(name="minisat22", bootstrap_with=clauses) as s:
            ok = s.solve()
            assert ok == brute_force_feasible(p)
            if ok:
                certify.check_order(p, d.decode(s.get_model()))


def test_compact_encoding_is_smaller_than_direct():
    # a planted order with open pairs: the compact lazy CNF is far below the n(n-1)(n-2) baseline
    rnd = random.Random(2)
    n = 40
    rank = list(range(n))
    rnd.shuffle(rank)
    comparable, incomparable = [], []
    for a in range(n):
        for b in range(a + 1, n):
            r = rnd.random()
            if abs(rank[a] - rank[b]) > n // 3 and r < 0.3:
                comparable.append((f"x{a}", f"x{b}"))
            elif abs(rank[a] - rank[b]) <= n // 3 and r < 0.3:
                incomparable.append((f"x{a}", f"x{b}"))
    p = Problem.from_lists(comparable=comparable, incomparable=incomparable,
                           items=[f"x{a}" for a in range(n)])
    ans = solve_sat(p)
    assert ans.feasible
    assert ans.stats["clauses"] * 10 < direct_encoding(p).num_clauses


# ---------------------------------------------------------------------- command line


def _write(tmp_path, doc, name="p.json"):
    path = tmp_path / name
    path.write_text(json.dumps(doc))
    return str(path)


def test_cnf_command_writes_dimacs(tmp_path, capsys):
    src = _write(tmp_path, {"comparable": [["kiln", "loom"], ["loom", "quay"]],
                            "incomparable": [["kiln", "quay"]], "fixed": [["kiln", "loom"]]})
    assert main(["cnf", src]) == 0
    text = capsys.readouterr().out
    assert re.search(r"^c \d+ kiln<loom$", text, re.M)
    assert re.search(r"^p cnf \d+ \d+$", text, re.M)
    out = str(tmp_path / "p.cnf")
    assert main(["cnf", src, "--out", out, "--selectors"]) == 0
    written = open(out).read()
    assert "c selector" in written and "fixed kiln loom" in written
    # kiln<loom fixed, loom–quay comparable, kiln–quay unordered: loom<quay would force
    # kiln<quay, so the only answer has quay<loom
    succ = _read_back(written, Problem.from_lists(comparable=[("kiln", "loom"), ("loom", "quay")]))
    assert succ is not None


@pytest.mark.parametrize("doc, msg", [
    ({"forbidden": [["a", "a"]]}, "two different items"),
    ({"fixed": "a b"}, "fixed"),
    ({"incomparable": "some"}, "others"),
    ({"items": ["a", "b"], "fixed": [["a", "c"]]}, "'c' is not in"),
])
def test_bad_input_for_side_constraint_keys_exits_2(tmp_path, capsys, doc, msg):
    src = _write(tmp_path, doc)
    for cmd in (["cnf", src], ["solve", src, "--engine", "sat"]):
        assert main(cmd) == 2
        err = capsys.readouterr().err
        assert msg in err and "Traceback" not in err and len(err.strip().splitlines()) == 1


def test_solve_command_engines_and_solver_option(tmp_path, capsys):
    src = _write(tmp_path, {"comparable": [["a", "b"], ["b", "c"], ["c", "d"]]})
    for engine in ("forcing", "sat", "both"):
        assert main(["solve", src, "--json", "--engine", engine, "--solver", "minisat22"]) == 0
        doc = json.loads(capsys.readouterr().out)
        assert doc["status"] == "feasible" and doc["verified"] and len(doc["order"]) == 3
    assert main(["solve", src, "--engine", "sat", "--solver", "nosuch"]) == 2
    assert "unknown SAT solver" in capsys.readouterr().err


def test_demo_shows_rules_open_pairs_and_a_core(capsys):
    from satorder.cli.demo import load_demo_rules
    from satorder.pipeline.solve import solve

    _, rules = load_demo_rules()
    assert rules.fixed and rules.forbidden and rules.has_open_pairs
    ans = solve(rules)
    assert ans.engine == "sat" and ans.feasible and ans.verified
    assert main(["demo"]) == 0
    text = capsys.readouterr().out
    assert "part 2" in text and "part 3" in text and "INFEASIBLE" in text
    assert "broken" not in text


def _slow_problem_file(tmp_path) -> str:
    """A dense open-pair problem (generated, feasible) that takes the SAT engine seconds."""
    from satorder.generate.families import open_pairs

    path = tmp_path / "slow.json"
    path.write_text(open_pairs(300, seed=1, degree=20.0).to_json_text())
    return str(path)


def test_time_limit_gives_unknown_and_exit_3(tmp_path, capsys):
    src = _slow_problem_file(tmp_path)
    assert main(["solve", src, "--json", "--time-limit", "0.05"]) == 3
    doc = json.loads(capsys.readouterr().out)
    assert doc["status"] == "unknown" and not doc["verified"] and "order" not in doc


@pytest.mark.parametrize("solver, limit", [("cadical195", None), ("glucose4", None),
                                           ("glucose4", 600.0), ("cadical195", 600.0)])
def test_ctrl_c_stops_cleanly(solver, limit):
    # SIGINT while the engine runs (in the solver or between rounds) surfaces as
    # KeyboardInterrupt, which the CLI turns into exit status 130; the process stays usable
    # (solver calls go through satorder.sat.runner, tested per back end in test_runner.py)
    import os
    import signal
    import threading
    import time

    from satorder.generate.families import open_pairs
    from satorder.io.readers import problem_from_dict

    p = problem_from_dict(open_pairs(300, seed=1, degree=20.0).to_dict())
    tiny = Problem.from_lists(fixed=[("a", "b")], incomparable=[("b", "c")])
    assert solve_sat(tiny, solver=solver).feasible  # compiled kernels loaded before the signal
    timer = threading.Timer(0.7, os.kill, (os.getpid(), signal.SIGINT))
    # a KeyboardInterrupt raised inside a gc callback is swallowed by Python ("Exception
    # ignored in"); hypothesis installs one once any hypothesis test has run in this process,
    # so the engine runs here without foreign gc callbacks
    import gc

    callbacks = gc.callbacks[:]
    gc.callbacks.clear()
    t0 = time.monotonic()
    timer.start()
    try:
        with pytest.raises(KeyboardInterrupt):
            for _ in range(100):  # keeps the engine busy however fast the machine is
                solve_sat(p, solver=solver, time_limit=limit)
    finally:
        timer.cancel()
        gc.callbacks[:] = callbacks
    assert time.monotonic() - t0 < 60  # a sanity bound: it returned
    assert solve_sat(tiny, solver=solver).feasible
