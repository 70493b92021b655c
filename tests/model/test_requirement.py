"""The typed requirement, the status enum and the one JSON conversion of requirements."""

from __future__ import annotations

import itertools
import json
import pickle

import pytest

from satorder import Problem, explain, solve
from satorder.generate import generate
from satorder.io.readers import parse_json
from satorder.model.answer import Answer
from satorder.model.requirement import (
    ARC_KINDS,
    KINDS,
    PAIR_KINDS,
    Kind,
    Requirement,
    Status,
    items_of,
)

NAMES = ["kiln", "loom", "quay", "weir", "mill"]
INDEX = {name: k for k, name in enumerate(NAMES)}


def test_kinds_are_the_four_of_the_contract():
    assert [str(k) for k in KINDS] == ["comparable", "incomparable", "fixed", "forbidden"]
    assert set(PAIR_KINDS) | set(ARC_KINDS) == set(KINDS)
    assert not set(PAIR_KINDS) & set(ARC_KINDS)


@pytest.mark.parametrize("kind", ["comparable", "incomparable"])
def test_pair_kinds_store_the_pair_ascending(kind):
    assert Requirement(kind, (3, 1)) == Requirement(kind, (1, 3))
    assert Requirement(kind, (3, 1)).pair == (1, 3)


@pytest.mark.parametrize("kind", ["fixed", "forbidden"])
def test_arc_kinds_keep_their_direction(kind):
    assert Requirement(kind, (3, 1)).pair == (3, 1)
    assert Requirement(kind, (3, 1)) != Requirement(kind, (1, 3))


def test_kind_is_typed_and_ids_are_plain_ints():
    import numpy as np

    r = Requirement("fixed", (np.int64(2), np.int32(0)))
    assert r.kind is Kind.FIXED
    assert type(r.pair[0]) is int and type(r.pair[1]) is int
    kind, (a, b) = r  # unpacks like the (kind, pair) tuples the SAT encoding keys on
    assert (kind, a, b) == ("fixed", 2, 0)


def test_bad_requirements_are_refused():
    with pytest.raises(ValueError, match="unknown requirement kind 'before'"):
        Requirement("before", (0, 1))
    with pytest.raises(ValueError, match="two different items"):
        Requirement("comparable", (2, 2))
    with pytest.raises(ValueError):
        Requirement("fixed", (0, 1, 2))


def test_equal_and_hash_like_the_plain_key_tuples():
    keys = {("comparable", (1, 3)): "a", ("forbidden", (4, 0)): "b"}
    assert keys[Requirement("comparable", (3, 1))] == "a"
    assert keys[Requirement(Kind.FORBIDDEN, (4, 0))] == "b"
    assert Requirement("forbidden", (0, 4)) not in keys


def test_pickles_and_sorts():
    reqs = [Requirement(k, p) for k in KINDS for p in ((0, 2), (2, 0))]
    assert pickle.loads(pickle.dumps(reqs)) == reqs
    assert sorted(reqs)[0] == Requirement("comparable", (0, 2))


def test_json_round_trip_for_every_kind_and_pair():
    for kind in KINDS:
        for a, b in itertools.permutations(range(len(NAMES)), 2):
            r = Requirement(kind, (a, b))
            doc = r.to_json(NAMES)
            # exactly the contract's shape: plain strings, a two-name list
            assert json.dumps(doc) == json.dumps({"kind": str(kind),
                                                  "pair": [NAMES[r.pair[0]], NAMES[r.pair[1]]]})
            assert type(doc["kind"]) is str
            assert Requirement.from_json(json.loads(json.dumps(doc)), INDEX) == r


def test_from_json_names_the_bad_entry():
    with pytest.raises(ValueError, match="'pond'"):
        Requirement.from_json({"kind": "fixed", "pair": ["kiln", "pond"]}, INDEX)
    with pytest.raises(ValueError, match="unknown requirement kind"):
        Requirement.from_json({"kind": "after", "pair": ["kiln", "loom"]}, INDEX)
    with pytest.raises(ValueError, match="not a requirement"):
        Requirement.from_json({"pair": ["kiln", "loom"]}, INDEX)


def test_items_of():
    reqs = [Requirement("fixed", (4, 1)), Requirement("incomparable", (1, 2))]
    assert items_of(reqs) == [1, 2, 4]
    assert items_of([]) == []


def test_status_reads_as_its_string():
    assert Status("feasible") is Status.FEASIBLE
    assert Status.INFEASIBLE == "infeasible" and "unknown" == Status.UNKNOWN
    assert Status.FEASIBLE in ("feasible", "infeasible")
    assert {"feasible": 1}[Status.FEASIBLE] == 1
    assert str(Status.UNKNOWN) == f"{Status.UNKNOWN}" == "unknown"
    assert (f"{Status.UNKNOWN:>8}", repr(Status.FEASIBLE)) == (" unknown", "'feasible'")
    assert json.dumps({"status": Status.INFEASIBLE}) == '{"status": "infeasible"}'
    with pytest.raises(ValueError):
        Status("timeout")


def test_answer_status_is_typed_even_when_given_a_string():
    p = Problem.from_lists(comparable=[("kiln", "loom")])
    assert Answer(p, "unknown", "sat").status is Status.UNKNOWN
    with pytest.raises(ValueError):
        Answer(p, "solved", "sat")
def _infeasible_problem() -> Problem:
    # a < b < c fixed, {a, c} must stay unordered, plus an open pair: infeasible
    return Problem.from_lists(comparable=[("loom", "weir")], incomparable=[("kiln", "quay")],
                              fixed=[("kiln", "loom"), ("loom", "quay")], items=NAMES)


def test_solve_json_core_reads_back_to_the_answers_core():
    p = _infeasible_problem()
    ans = solve(p)
    assert ans.status is Status.INFEASIBLE and ans.verified
    assert all(isinstance(r, Requirement) for r in ans.core)
    doc = json.loads(ans.to_json_text())
    assert doc["status"] == "infeasible"
    back = [Requirement.from_json(r, p.index) for r in doc["core"]]
    assert back == ans.core
    assert sorted(map(tuple, (r["pair"] for r in doc["core"]))) == \
        [("kiln", "loom"), ("kiln", "quay"), ("loom", "quay")]


def test_explain_json_core_repairs_and_derivation_read_back():
    p = _infeasible_problem()
    e = explain(p, repairs=3)
    assert e.status is Status.INFEASIBLE and e.verified
    doc = json.loads(json.dumps(e.to_json()))
    assert [Requirement.from_json(r, p.index) for r in doc["core"]] == e.core
    assert {frozenset(p.names(r.pair)) for r in e.core} == \
        {frozenset(("kiln", "loom")), frozenset(("loom", "quay")), frozenset(("kiln", "quay"))}
    # each repair drops one of the three core members: its JSON reads back to it
    assert len(doc["repairs"]) == 3
    for rep, js in zip(e.repairs, doc["repairs"]):
        assert [Requirement.from_json(r, p.index) for r in js["drop"]] == rep.drop
        assert len(rep.drop) == 1 and rep.drop[0] in e.core
    # the derivation cites core rows by index
    cited = {k for st in doc["derivation"] for k in st["requirements"]}
    assert cited <= set(range(len(doc["core"])))


def test_engine_cores_mapped_back_from_a_sub_problem_keep_pairs_in_id_order():
    # the SAT engine shrinks this core on the sub-problem of its candidate requirements and
    # maps the ids back; unordered pairs must come back in id order like every other core
    # (before requirements were typed, this path printed e.g. comparable [5, 4])
    inst = generate("side-constraints", 12, seed=1, conflict="transitivity")
    p = parse_json(inst.to_json_text(), "<side-constraints>")
    ans = solve(p, engine="sat")
    assert ans.status == "infeasible" and ans.verified
    assert ans.stats["core"]["method"] == "clause provenance"
    doc = json.loads(ans.to_json_text())
    ids = [(r["kind"], [p.index[x] for x in r["pair"]]) for r in doc["core"]]
    unordered = [pair for kind, pair in ids if kind in ("comparable", "incomparable")]
    assert len(unordered) >= 2 and all(a < b for a, b in unordered)
    assert [Requirement(kind, pair) for kind, pair in ids] == ans.core
