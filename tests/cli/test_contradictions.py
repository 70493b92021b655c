"""Contradicting evidence is a conflict to explain, not bad input: each of the four ways two
requirements can clash on one pair gives ``infeasible`` with a core of exactly those two, a
replayed derivation and repairs, and a count of 0; repeats are merged with one note; an
explicit ``items`` list catches misspelt names.  The verdict on merged random evidence is
compared with brute force over every poset (``tests/order_reference.py``)."""

from __future__ import annotations

import itertools
import json

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from order_reference import brute_count, brute_force_feasible

from satorder import certify
from satorder.certify.derivation import check_derivation
from satorder.cli.main import main
from satorder.errors import CertificateError, InputError
from satorder.io.readers import problem_from_dict
from satorder.model.requirement import Requirement
from satorder.pipeline.count import check_count, count_answers
from satorder.pipeline.solve import solve

# kiln–quay and loom–quay are ordered in every problem below, so the clash on kiln–loom is the
# only reason for infeasibility; the clashing pair and its two requirements, as JSON
CLASHES = {
    "fixed both ways": (
        {"fixed": [["kiln", "loom"], ["loom", "kiln"]]},
        [{"kind": "fixed", "pair": ["kiln", "loom"]},
         {"kind": "fixed", "pair": ["loom", "kiln"]}]),
    "fixed and forbidden": (
        {"fixed": [["kiln", "loom"]], "forbidden": [["kiln", "loom"]]},
        [{"kind": "fixed", "pair": ["kiln", "loom"]},
         {"kind": "forbidden", "pair": ["kiln", "loom"]}]),
    "fixed on an unordered pair": (
        {"fixed": [["loom", "kiln"]], "incomparable": [["kiln", "loom"]]},
        [{"kind": "fixed", "pair": ["loom", "kiln"]},
         {"kind": "incomparable", "pair": ["kiln", "loom"]}]),
    "comparable and incomparable": (
        {"comparable": [["loom", "kiln"]], "incomparable": [["kiln", "loom"]]},
        [{"kind": "comparable", "pair": ["kiln", "loom"]},
         {"kind": "incomparable", "pair": ["kiln", "loom"]}]),
}


def _write(tmp_path, doc, name="clash.json") -> str:
    base = {"items": ["kiln", "loom", "quay", "weir"],
            "comparable": [["kiln", "quay"], ["loom", "quay"]]}
    for key, value in doc.items():
        base[key] = base.get(key, []) + value if key == "comparable" else value
    path = tmp_path / name
    path.write_text(json.dumps(base))
    return str(path)


def _members(core) -> list[tuple[str, tuple[str, str]]]:
    return sorted((r["kind"], tuple(r["pair"])) for r in core)


@pytest.mark.parametrize("clash", list(CLASHES))
def test_each_clash_is_infeasible_with_a_two_member_core(tmp_path, capsys, clash):
    doc, expected = CLASHES[clash]
    path = _write(tmp_path, doc)
    assert main(["solve", path, "--json"]) == 0
    ans = json.loads(capsys.readouterr().out)
    assert ans["status"] == "infeasible" and ans["verified"]
    assert _members(ans["core"]) == _members(expected)
    assert all(r["text"].startswith(r["kind"] + ": ") for r in ans["core"])

    assert main(["explain", path, "--json", "--repairs", "3"]) == 0
    expl = json.loads(capsys.readouterr().out)
    assert expl["status"] == "infeasible" and expl["verified"]
    assert _members(expl["core"]) == _members(expected)
    check_derivation(expl["core"], expl["derivation"])  # the independent replay, again
    assert expl["derivation"][-1]["arc"] is None  # ends in a contradiction
    # dropping either member is a repair, each checked by an order of the repaired problem
    drops = sorted(_members(rep["drop"]) for rep in expl["repairs"])
    assert [[m] for m in _members(expected)] == drops[:2] or \
        all([m] in drops for m in _members(expected))
    assert all(rep["verified"] and rep["order"] is not None for rep in expl["repairs"])
    assert all(rep["text"].startswith("drop the requirement that ") for rep in expl["repairs"])

    assert main(["count", path, "--json"]) == 0
    count = json.loads(capsys.readouterr().out)
    assert count["count"] == 0 and count["exact"] and count["verified"]


@pytest.mark.parametrize("clash", list(CLASHES))
def test_each_clash_in_the_python_api(clash):
    doc, expected = CLASHES[clash]
    p = problem_from_dict({"items": ["kiln", "loom", "quay", "weir"],
                           "comparable": [["kiln", "quay"], ["loom", "quay"]]
                           + doc.get("comparable", []),
                           **{k: v for k, v in doc.items() if k != "comparable"}})
    assert not brute_force_feasible(p)  # the outside reference: no poset meets them all
    (first, second), = p.contradictions()
    assert _members([first.to_json(p.items), second.to_json(p.items)]) == _members(expected)
    # the engines: SAT on the whole problem (with and without the selector encoding)
    for engine in ("auto", "sat"):
        ans = solve(p, engine=engine)
        assert ans.status == "infeasible" and ans.verified and len(ans.core) == 2
    from satorder.explanation.requirements import requirements
    from satorder.sat.cores import find_core
    from satorder.sat.mus import RequirementOracle, SessionOracle, minimal_core

    core, stats = find_core(p)
    assert stats["minimal"] and set(core) == {first, second}
    # both feasibility oracles of the minimal-core search see the clash as a core
    reqs = requirements(p)
    for oracle in (RequirementOracle(reqs), SessionOracle(reqs)):
        with oracle:
            found = {reqs[k] for k in minimal_core(oracle, range(len(reqs)))}
        assert found == {first, second}
    # not a plain problem: with every other pair unordered the forcing engine (through the
    # modular decomposition) gives the same two-member core; with listed pairs it declines
    assert not p.is_plain
    if p.incomparable is None:
        ans = solve(p, engine="forcing")
        assert ans.status == "infeasible" and ans.verified and set(ans.core) == {first, second}
    else:
        with pytest.raises(InputError, match="without open pairs"):
            solve(p, engine="forcing")
    # preferences do not hide the clash (MaxSAT's hard part is refuted first)
    wished = p.with_requirements(prefer=[(p.index["weir"], p.index["kiln"], 2)])
    assert solve(wished).status == "infeasible"
    res = count_answers(p)
    check_count(res)
    assert res.count == 0 and res.exact and res.verified


def test_core_checker_accepts_two_member_cores_of_opposite_arcs():
    p = problem_from_dict({"fixed": [["a", "b"], ["b", "a"]]})
    core = [Requirement("fixed", (0, 1)), Requirement("fixed", (1, 0))]
    certify.check_core_infeasible(p, core, minimal=True)
    with pytest.raises(CertificateError):  # one arc alone is no core
        certify.check_core_infeasible(p, core[:1])


def test_repeats_are_merged_with_one_note(tmp_path, capsys):
    path = tmp_path / "twice.json"
    path.write_text(json.dumps({"comparable": [["kiln", "loom"], ["loom", "kiln"]],
                                "fixed": [["quay", "kiln"], ["quay", "kiln"]],
                                "incomparable": [["loom", "quay"], ["quay", "loom"]]}))
    assert main(["solve", str(path), "--json"]) == 0
    out, err = capsys.readouterr()
    assert json.loads(out)["status"] == "feasible"
    notes = [line for line in err.splitlines() if line.startswith("note:")]
    assert len(notes) == 1 and "3 repeated requirements merged" in notes[0]
    assert "comparable[1] repeats comparable[0]" in notes[0]
    # an edge list: the same pair twice, either way round
    edges = tmp_path / "e.txt"
    edges.write_text("kiln loom\nloom quay\nloom kiln\n")
    assert main(["solve", str(edges), "--json"]) == 0
    err = capsys.readouterr().err
    assert "1 repeated pair merged" in err and "line 3 repeats line 1" in err


def test_misspelt_item_with_an_items_list_is_bad_input(tmp_path, capsys):
    path = tmp_path / "typo.json"
    path.write_text(json.dumps({"items": ["kiln", "loom", "c"],
                                "comparable": [["kiln", "loom"], ["loom", "cc"]]}))
    assert main(["solve", str(path), "--json"]) == 2
    out, err = capsys.readouterr()
    assert out == "" and len(err.strip().splitlines()) == 1 and "Traceback" not in err
    assert "comparable[1]" in err and "did you mean 'c'?" in err
    # without an items list, every name used is an item, as before
    path.write_text(json.dumps({"comparable": [["kiln", "loom"], ["loom", "cc"]]}))
    assert main(["solve", str(path), "--json"]) == 0
    assert json.loads(capsys.readouterr().out)["item_count"] == 3


def test_text_output_numbers_core_rows_from_one_and_says_drop(tmp_path, capsys):
    path = _write(tmp_path, CLASHES["fixed both ways"][0])
    assert main(["solve", path]) == 0
    out = capsys.readouterr().out
    assert "fixed: kiln must come before loom" in out and "fixed: loom must come before kiln" in out
    assert "│   1 │" in out and "│   0 │" not in out
    assert main(["explain", path, "--repairs", "2"]) == 0
    out = capsys.readouterr().out
    assert "fixed arc: row 1 (fixed: kiln must come before loom)" in out
    assert "1. drop the requirement that kiln must come before loom (fixed)" in out or \
        "1. drop the requirement that loom must come before kiln (fixed)" in out


# ---------------------------------------------------------------------- merged evidence
KINDS = ["comparable", "incomparable", "fixed", "forbidden"]


def _evidence(n: int):
    """One source's evidence: a few requirements over items 0..n-1 (may contradict itself)."""
    return st.lists(st.tuples(st.sampled_from(KINDS), st.integers(0, n - 1),
                              st.integers(0, n - 1)).filter(lambda t: t[1] != t[2]),
                    max_size=6)


@pytest.mark.slow
@settings(max_examples=80, deadline=None)
@given(st.integers(min_value=2, max_value=5).flatmap(
    lambda n: st.tuples(st.just(n), _evidence(n), _evidence(n), st.booleans())))
def test_hypothesis_merged_evidence_matches_brute_force(data):
    n, first, second, others = data
    names = [f"i{k}" for k in range(n)]
    doc: dict = {"items": names, "incomparable": "others" if others else []}
    for source in (first, second):  # merging: every report of both sources, as written
        for kind, a, b in source:
            if kind == "incomparable" and others:
                continue  # under "others" unordered pairs are implied, not listed
            doc.setdefault(kind, []).append([names[a], names[b]])
    p = problem_from_dict(doc, source="<merged>")
    expected = brute_force_feasible(p)
    ans = solve(p)
    assert ans.verified and ans.feasible == expected, doc
    if not expected:
        certify.check_core_infeasible(p, ans.core, minimal=True)
    if p.n <= 4:  # at most 219 posets: the count engine against the brute-force count
        res = count_answers(p)
        assert res.exact and res.count == brute_count(p), doc


def test_every_clash_kind_pairs_up_once():
    # each clash is reported once, naming both requirements, whatever order they came in
    p = problem_from_dict({"items": ["a", "b", "c"], "incomparable": [["a", "b"], ["b", "c"]],
                           "comparable": [["b", "a"]], "fixed": [["c", "b"], ["b", "c"]],
                           "forbidden": [["c", "b"]]})
    kinds = sorted(tuple(sorted(r.kind.value for r in c)) for c in p.contradictions())
    assert kinds == [("comparable", "incomparable"), ("fixed", "fixed"),
                     ("fixed", "forbidden"), ("fixed", "incomparable")]
    assert all(len({frozenset(r.pair) for r in c}) == 1 for c in p.contradictions())
    assert list(itertools.chain(*p.contradictions()))  # non-empty
