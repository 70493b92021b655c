"""explain: cores, derivations, smallest cores and repairs against brute force over every strict
partial order on a handful of items."""

from __future__ import annotations

import itertools
import json
import random

import networkx as nx
import numpy as np
import pytest
from order_reference import all_posets

from satorder import Problem, certify
from satorder.certify.derivation import check_derivation
from satorder.cli.main import main
from satorder.errors import CertificateError
from satorder.explanation.derivation import build_derivation
from satorder.explanation.explain import explain
from satorder.explanation.requirements import requirements
from satorder.model.requirement import Requirement
from satorder.sat.mus import RequirementOracle, minimal_core


def meets(arcs, r) -> bool:
    kind, (a, b) = r
    if kind == "comparable":
        return (a, b) in arcs or (b, a) in arcs
    if kind == "incomparable":
        return (a, b) not in arcs and (b, a) not in arcs
    if kind == "fixed":
        return (a, b) in arcs
    return (a, b) not in arcs


def brute_feasible(n: int, reqs) -> bool:
    return any(all(meets(P, r) for r in reqs) for P in all_posets(n))


def random_problem(rnd: random.Random, n: int) -> Problem:
    names = [f"i{k}" for k in range(n)]
    comp, inc, fixed, forb = [], [], [], []
    for a, b in itertools.combinations(names, 2):
        x = rnd.random()
        if x < 0.45:
            comp.append((a, b))
        elif x < 0.8:
            inc.append((a, b))
        elif x < 0.95:
            fixed.append((a, b) if rnd.random() < 0.5 else (b, a))
    for a, b in itertools.permutations(names, 2):
        if rnd.random() < 0.1 and (a, b) not in fixed:
            forb.append((a, b))
    others = rnd.random() < 0.3
    return Problem.from_lists(comparable=comp, incomparable="others" if others else inc,
                              fixed=fixed, forbidden=forb, items=names)


def _cases(count, seed, sizes=(3, 4, 5)):
    rnd = random.Random(seed)
    return [random_problem(rnd, rnd.choice(sizes)) for _ in range(count)]


def test_status_and_cores_against_brute_force():
    infeasible = 0
    for p in _cases(150, 11):
        reqs = requirements(p)
        e = explain(p)
        assert e.status == ("feasible" if brute_feasible(p.n, reqs) else "infeasible")
        if e.status == "feasible":
            continue
        infeasible += 1
        core = e.core
        # every member is a requirement of the problem; infeasible alone; minimal
        assert all(isinstance(r, Requirement) for r in core)
        assert set(core) <= set(reqs)
        assert not brute_feasible(p.n, core)
        for k in range(len(core)):
            assert brute_feasible(p.n, core[:k] + core[k + 1:])
        certify.check_core_infeasible(p, core, minimal=True)
        check_derivation(e.core_json(), e.derivation_json())
    assert infeasible > 30


def test_smallest_cores_are_minimum_by_brute_force():
    checked = 0
    for p in _cases(40, 12, sizes=(4, 5)):
        reqs = requirements(p)
        if brute_feasible(p.n, reqs):
            continue
        e = explain(p, smallest=True)
        assert e.smallest["proved"]
        size = e.smallest["size"]
        assert len(e.core) == size
        # brute force: the smallest infeasible subset, via the set of requirements each poset
        # meets (a subset is infeasible iff no poset meets all of it)
        met = np.array([sum(1 << k for k, r in enumerate(reqs) if meets(P, r))
                        for P in all_posets(p.n)], dtype=object)
        best = None
        for s in range(1, size + 1):
            for combo in itertools.combinations(range(len(reqs)), s):
                m = sum(1 << k for k in combo)
                if not any((x & m) == m for x in met):
                    best = s
                    break
            if best is not None:
                break
        assert best == size
        checked += 1
        if checked >= 8:
            break
    assert checked >= 5


def test_repairs_make_the_problem_feasible_and_are_minimal():
    checked = 0
    for p in _cases(60, 13):
        reqs = requirements(p)
        if brute_feasible(p.n, reqs):
            continue
        e = explain(p, repairs=3)
        assert 1 <= len(e.repairs) <= 3
        sizes = []
        for rep in e.repairs:
            assert rep.verified
            kept = [r for r in reqs if r not in set(rep.drop)]
            assert brute_feasible(p.n, kept)
            # minimal: putting back any one dropped requirement makes it infeasible again
            for r in rep.drop:
                assert not brute_feasible(p.n, kept + [r])
            # the order shown meets every kept requirement
            arcs = {(a, b) for a, s in enumerate(rep.succ) for b in s}
            assert all(meets(arcs, r) for r in kept)
            sizes.append(len(rep.drop))
        assert sizes == sorted(sizes)  # smallest first
        # the first repair is a smallest correction set (brute force over smaller sets)
        for s in range(sizes[0]):
            for combo in itertools.combinations(reqs, s):
                chosen = {id(r) for r in combo}
                assert not brute_feasible(p.n, [r for r in reqs if id(r) not in chosen])
        checked += 1
        if checked >= 10:
            break
    assert checked >= 5


def test_plain_core_uses_only_witness_pairs_on_a_large_graph():
    # an odd cycle inside a 2,000-item bipartite graph: the core stays on the cycle
    g = nx.bipartite.random_graph(1000, 1000, 0.005, seed=2)
    cyc = [5000 + k for k in range(7)]
    g.add_edges_from(zip(cyc, cyc[1:] + cyc[:1]))
    g.add_edge(cyc[0], 3)
    p = Problem.from_networkx(g)
    e = explain(p, repairs=2)
    assert sorted(p.names(e.obstruction)) == sorted(str(v) for v in cyc)
    assert {p.items[v] for r in e.core for v in r.pair} == {str(v) for v in cyc}
    # C7 needs its 7 edges and 7 unordered witnesses (one forcing step each)
    assert sorted(r.kind for r in e.core) == ["comparable"] * 7 + ["incomparable"] * 7
    assert e.repairs and all(r.verified for r in e.repairs)
    for rep in e.repairs:
        assert len(rep.drop) == 1
        certify.check_order(Problem(items=p.items, adj=_apply(p, rep.drop)), rep.succ)


def _apply(p: Problem, drop):
    """Comparability graph of the repair's order must lie between kept and kept + dropped."""
    adj = [set(s) for s in p.adj]
    for kind, (a, b) in drop:
        if kind == "comparable":
            adj[a].discard(b)
            adj[b].discard(a)
        else:
            adj[a].add(b)
            adj[b].add(a)
    return adj


# ---------------------------------------------------------------------- derivation checker
def _c5_core():
    p = Problem.from_networkx(nx.cycle_graph(5))
    e = explain(p)
    return e.core_json(), e.derivation_json()


def test_replay_accepts_printed_derivations_and_rejects_tampering():
    core, deriv = _c5_core()
    check_derivation(core, deriv)
    arc_steps = [k for k, s in enumerate(deriv) if s["arc"] is not None and s["rule"] != "assume"]

    def broken(edit):
        d = json.loads(json.dumps(deriv))
        edit(d)
        with pytest.raises(CertificateError):
            check_derivation(core, d)

    # flip a derived arc
    broken(lambda d: d[arc_steps[1]].__setitem__("arc", d[arc_steps[1]]["arc"][::-1]))
    # drop the final contradiction
    broken(lambda d: d.pop())
    # cite a requirement of the wrong kind
    broken(lambda d: d[arc_steps[1]].__setitem__("requirements",
                                                d[arc_steps[1]]["requirements"][::-1]))
    # use a fact from inside a closed case after it closed
    def cite_closed(d):
        closing = next(k for k, s in enumerate(d) if s["rule"] == "other way")
        later = next(k for k in range(closing + 1, len(d)) if d[k]["rule"] == "forcing")
        d[later]["steps"] = [2]
    broken(cite_closed)
    # a core that is not the one the derivation speaks about
    with pytest.raises(CertificateError):
        check_derivation(core[1:], deriv)


def test_derivation_of_a_feasible_set_is_none():
    # kiln < loom, loom < quay with kiln, quay open: an order exists
    core = [Requirement("fixed", (0, 1)), Requirement("fixed", (1, 2)),
            Requirement("comparable", (0, 2))]
    assert build_derivation(core) is None


def test_derivation_with_nested_cases():
    # a 5-cycle of pairs that must be ordered whose non-adjacent pairs are kept apart by two
    # forbidden arcs each instead of an unordered requirement: no forcing rule applies, so
    # the refutation needs a case inside a case (infeasible: Golumbic 1980, ch. 5, C5 has no
    # transitive orientation; confirmed here by brute force)
    ring = ["kiln", "loom", "quay", "mill", "dock"]
    comp = list(zip(ring, ring[1:] + ring[:1]))
    apart = [(a, b) for a, b in itertools.permutations(ring, 2)
             if (a, b) not in comp and (b, a) not in comp]
    p = Problem.from_lists(comparable=comp, incomparable=[], forbidden=apart)
    e = explain(p)
    assert e.status == "infeasible" and not brute_feasible(5, e.core)
    assert max(s.depth for s in e.steps) >= 2
    check_derivation(e.core_json(), e.derivation_json())


def test_minimal_core_from_the_oracle_is_minimal():
    reqs = [Requirement("fixed", (0, 1)), Requirement("fixed", (1, 2)),
            Requirement("fixed", (2, 0)), Requirement("incomparable", (0, 2)),
            Requirement("comparable", (3, 0))]
    with RequirementOracle(reqs) as oracle:
        core = minimal_core(oracle, range(5))
    assert core in ([0, 1, 2], [0, 1, 3])  # a cycle of fixed arcs, or a<b<c with a, c unordered
    chosen = [reqs[k] for k in core]
    assert not brute_feasible(4, chosen)
    assert all(brute_feasible(4, chosen[:k] + chosen[k + 1:]) for k in range(3))


# ---------------------------------------------------------------------- command line
def _write(tmp_path, name, text):
    f = tmp_path / name
    f.write_text(text)
    return str(f)


def test_cli_json_contract_for_an_infeasible_plain_problem(tmp_path, capsys):
    path = _write(tmp_path, "ring.txt", "kiln loom\nloom quay\nquay mill\nmill dock\ndock kiln\n")
    svg = str(tmp_path / "why.svg")
    assert main(["explain", path, "--json", "--repairs", "2", "--draw", svg]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert doc["status"] == "infeasible"
    assert sorted(doc["obstruction"]) == ["dock", "kiln", "loom", "mill", "quay"]
    for r in doc["core"]:
        assert r["kind"] in ("comparable", "incomparable") and len(r["pair"]) == 2
    check_derivation(doc["core"], doc["derivation"])
    assert len(doc["repairs"]) == 2 and all(r["verified"] for r in doc["repairs"])
    text = open(svg).read()
    assert text.startswith("<svg") and "kiln" in text


def test_cli_feasible_problem_says_so_and_exits_zero(tmp_path, capsys):
    path = _write(tmp_path, "ok.json", json.dumps(
        {"comparable": [["kiln", "loom"], ["loom", "quay"]], "fixed": [["kiln", "loom"]]}))
    assert main(["explain", path, "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert doc["status"] == "feasible" and "core" not in doc
    assert main(["explain", path]) == 0
    assert "FEASIBLE" in capsys.readouterr().out


def test_cli_rich_output_shows_core_derivation_and_repairs(tmp_path, capsys):
    path = _write(tmp_path, "clash.json", json.dumps({
        "comparable": [["kiln", "loom"], ["loom", "quay"]],
        "incomparable": [["kiln", "quay"]],
        "fixed": [["kiln", "loom"], ["loom", "quay"]],
    }))
    assert main(["explain", path, "--repairs", "3", "--smallest"]) == 0
    out = capsys.readouterr().out
    assert "Minimal core" in out and "contradiction" in out and "Repairs" in out
    assert "incomparable: kiln and quay must stay unordered" in out
    assert "drop the requirement that" in out and "row 1 (" in out


@pytest.mark.parametrize("argv, words", [
    (["explain", "{missing}"], "no such file"),
    (["explain", "{bad}"], "expected two item names"),
    (["explain", "{ring}", "--repairs", "-1"], "--repairs"),
    (["explain", "{ring}", "--draw", "{tmp}/pic.png"], ".svg"),
])
def test_cli_bad_input_is_one_line_and_exit_two(tmp_path, capsys, argv, words):
    files = {
        "missing": str(tmp_path / "nope.txt"),
        "bad": _write(tmp_path, "bad.txt", "kiln loom quay\n"),
        "ring": _write(tmp_path, "ring.txt", "a b\nb c\nc d\nd e\ne a\n"),
        "tmp": str(tmp_path),
    }
    argv = [a.format(**files) for a in argv]
    assert main(argv) == 2
    err = capsys.readouterr().err.strip()
    assert words in err and len(err.splitlines()) == 1


def test_solve_summary_shows_a_minimal_core_and_points_to_explain(tmp_path, capsys):
    # a 5-cycle with a pendant item: the summary's core stays on the cycle and is minimal
    path = _write(tmp_path, "ring.txt",
                  "kiln loom\nloom quay\nquay mill\nmill dock\ndock kiln\nkiln yard\n")
    assert main(["solve", path]) == 0
    out = capsys.readouterr().out
    assert "minimal core" in out and f"satorder explain {path}" in out
    assert "yard" not in out.split("minimal core")[1].split("Forcing chain")[0]


def test_repairs_on_a_larger_graph_grow_past_the_first_obstruction():
    # two 5-cycles sharing the pair kiln–loom, next to a 30-item bipartite graph (so the
    # whole-problem search is not used).  A change inside the first cycle alone leaves the
    # second; the one single change that fixes both is to free the shared pair (the rest is an
    # 8-cycle, bipartite, hence a comparability graph: Golumbic 1980, ch. 5).
    g = nx.Graph()
    g.add_edges_from([("kiln", "loom"), ("loom", "quay"), ("quay", "mill"), ("mill", "dock"),
                      ("dock", "kiln"), ("loom", "yard"), ("yard", "barn"), ("barn", "weir"),
                      ("weir", "kiln")])
    g.add_edges_from((f"a{u}", f"a{v}") for u, v in
                     nx.bipartite.random_graph(15, 15, 0.3, seed=4).edges())
    p = Problem.from_networkx(g)
    e = explain(p, repairs=3)
    assert e.repairs and all(r.verified for r in e.repairs)
    first = e.repairs[0].drop
    assert [(r.kind, sorted(p.names(r.pair))) for r in first] == \
        [("comparable", ["kiln", "loom"])]
    for rep in e.repairs:
        certify.check_order(Problem(items=p.items, adj=_apply(p, rep.drop)), rep.succ)
        # minimal: keeping any one dropped requirement leaves an obstruction (checked by
        # exhaustive search over the 8 cycle items, the only place a conflict can sit)
        for k in range(len(rep.drop)):
            back = _apply(p, rep.drop[:k] + rep.drop[k + 1:])
            h = nx.Graph((p.items[a], p.items[b]) for a in range(p.n) for b in back[a] if a < b)
            ring = h.subgraph(["kiln", "loom", "quay", "mill", "dock", "yard", "barn", "weir"])
            assert not _orientable(ring)


def _orientable(g: nx.Graph) -> bool:
    from order_reference import brute_force_orientable

    return brute_force_orientable(g)


@pytest.mark.parametrize("conflict", ["transitivity", "cycle", "forcing"])
def test_problems_beyond_the_oracle_use_the_sat_engine_core(conflict):
    # 80 items with fixed/forbidden arcs and one planted contradiction (generator of the
    # benchmark suite): the SAT engine's core is shrunk to a minimal one, re-checked
    # independently, explained step by step; repairs are checked by re-solving
    pytest.importorskip("satorder.sat.engine")
    from satorder.generate.families import side_constraints
    from satorder.io.readers import problem_from_dict

    inst = side_constraints(80, seed=3, conflict=conflict)
    p = problem_from_dict(json.loads(inst.to_json_text()))
    e = explain(p, repairs=1, time_limit=20)
    assert e.status == "infeasible"
    certify.check_core_infeasible(p, e.core, minimal=True)
    check_derivation(e.core_json(), e.derivation_json())
    for rep in e.repairs:
        assert rep.verified
        from satorder.explanation.repairs import repaired_problem

        certify.check_order(repaired_problem(p, rep.drop), rep.succ)


def test_long_odd_cycle_core_is_minimal_and_explained():
    # C31 is not a comparability graph (Golumbic 1980, ch. 5): its core is the 31 pairs plus
    # one unordered witness per forcing step; checked by witness orders and the replay
    p = Problem.from_networkx(nx.cycle_graph(31))
    e = explain(p)
    assert len(e.obstruction) == 31
    assert sorted(r.kind for r in e.core) == ["comparable"] * 31 + ["incomparable"] * 31
    check_derivation(e.core_json(), e.derivation_json())


def test_minimality_witness_checker_rejects_bad_witnesses():
    from satorder.certify.minimality import check_minimality_witnesses

    # kiln<loom<quay fixed with kiln, quay unordered
    p = Problem.from_lists(comparable=[("kiln", "loom"), ("loom", "quay")],
                           incomparable=[("kiln", "quay")],
                           fixed=[("kiln", "loom"), ("loom", "quay")])
    core = [Requirement("fixed", (0, 1)), Requirement("fixed", (1, 2)),
            Requirement("incomparable", (0, 2))]
    good = {0: [(1, 2)], 1: [(0, 1)], 2: [(0, 1), (1, 2), (0, 2)]}
    check_minimality_witnesses(p, core, good)
    with pytest.raises(CertificateError):  # not transitive
        check_minimality_witnesses(p, core, {**good, 2: [(0, 1), (1, 2)]})
    with pytest.raises(CertificateError):  # misses member 2 (orders kiln, quay)
        check_minimality_witnesses(p, core, {**good, 0: [(1, 2), (0, 2)]})
    with pytest.raises(CertificateError):  # a requirement the problem does not have
        check_minimality_witnesses(p, core + [Requirement("forbidden", (2, 0))],
                                   {**good, 3: [(0, 1)]})


def test_cli_refuses_an_illegible_picture_but_still_explains(tmp_path, capsys):
    path = str(tmp_path / "ring.txt")
    nx.write_edgelist(nx.cycle_graph(101), path, data=False)
    svg = tmp_path / "why.svg"
    assert main(["explain", path, "--json", "--draw", str(svg)]) == 0
    captured = capsys.readouterr()
    assert json.loads(captured.out)["status"] == "infeasible"
    assert "no picture" in captured.err and not svg.exists()


def test_explain_accepts_a_networkx_graph_and_returns_the_obstruction_as_one():
    # the wheel W5: a hub joined to every item of a 5-cycle.  C5 has no transitive orientation
    # (Golumbic 1980, ch. 5); an item joined to all others can always sit above them all, so it
    # never belongs to a minimal obstruction: the obstruction is the rim
    g = nx.wheel_graph(6)  # hub 0, rim 1..5
    e = explain(g)
    sub = e.obstruction_graph()
    assert nx.is_isomorphic(sub, nx.cycle_graph(5))
    assert sorted(sub.nodes) == ["1", "2", "3", "4", "5"]
