"""``settled --why A B``: every settled pair's core is checked independently — infeasible
together with the opposite relation and each member necessary — by the all-triples encoding
with MiniSat (:func:`satorder.certify.core.check_core_infeasible`), its derivation replayed;
a free pair gets certified answers that order it differently."""

from __future__ import annotations

import itertools
import random

import pytest
from order_reference import brute_answers, random_requirements

from satorder.certify.core import _core_is_feasible, check_core_infeasible
from satorder.certify.derivation import check_derivation
from satorder.certify.order import check_order
from satorder.explanation import derivation
from satorder.explanation.settled_why import why_settled
from satorder.model.problem import Problem
from satorder.model.requirement import Kind


def _relations(problem, a, b):
    out = set()
    for arcs in brute_answers(problem):
        out.add("before" if (a, b) in arcs else "after" if (b, a) in arcs else "unordered")
    return out


def _check(problem, why):
    """The checks named in the module docstring."""
    assert why.verified
    if not why.settled:
        assert set(why.witnesses) == why.possible and len(why.possible) >= 2
        for succ in why.witnesses.values():
            check_order(problem, succ)
        return
    scope = why.scope
    assert why.opposite in why.core
    kind, (u, v) = why.opposite
    if kind == Kind.COMPARABLE and scope.must_be_unordered(u, v):
        # unordered by a requirement of its own: the core is that requirement and the opposite
        assert why.core == [why.opposite._replace(kind=Kind.INCOMPARABLE), why.opposite]
        assert not _core_is_feasible(why.core)
        assert _core_is_feasible(why.core[:1]) and _core_is_feasible(why.core[1:])
    else:
        # the scope's requirements plus the opposite admit no order; each member is needed
        if kind == Kind.FORBIDDEN:
            enlarged = scope.with_requirements(forbidden=scope.forbidden + [(u, v)])
        else:
            adj = [set(s) for s in scope.adj]
            adj[u].add(v)
            adj[v].add(u)
            enlarged = scope.with_requirements(adj=adj)
        check_core_infeasible(enlarged, why.core, minimal=True)
    names = scope.items
    check_derivation([r.to_json(names) for r in why.core],
                     derivation.to_json(why.steps, why.core, names))
    # the members are requirements of the original problem (same names)
    for r in why.members():
        a, b = (problem.index[names[t]] for t in r.pair)
        if r.kind == Kind.COMPARABLE:
            assert b in problem.adj[a]
        elif r.kind == Kind.INCOMPARABLE:
            assert problem.must_be_unordered(a, b)
        elif r.kind == Kind.FIXED:
            assert (a, b) in problem.fixed
        else:
            assert (a, b) in problem.forbidden


@pytest.mark.parametrize("seed", range(16))
def test_every_pair_explained_and_checked(seed):
    rng = random.Random(seed)
    p = random_requirements(rng.randint(3, 5), rng, open_pairs=seed % 2 == 0)
    feasible = bool(list(brute_answers(p)))
    for a, b in itertools.combinations(range(p.n), 2):
        why = why_settled(p, p.items[a], p.items[b])
        if not feasible:  # no answer at all: nothing to settle, solve's core says why
            assert why.status == "infeasible" and not why.possible
            assert why.verified and why.to_json()["core"]
            continue
        assert why.possible == _relations(p, a, b)
        _check(p, why)


def test_settled_before_by_transitivity():
    p = Problem.from_lists(items=["kiln", "loom", "quay"],
                           fixed=[("kiln", "loom"), ("loom", "quay")], incomparable=[])
    why = why_settled(p, "quay", "kiln")
    assert why.relation == "after"
    assert sorted(str(r.kind) for r in why.members()) == ["fixed", "fixed"]
    assert why.to_json()["relation"] == "after"


def test_pair_that_must_stay_unordered():
    p = Problem.from_lists(comparable=[("kiln", "loom")], items=["quay"])
    why = why_settled(p, "kiln", "quay")
    assert why.relation == "unordered" and why.verified
    assert [str(r.kind) for r in why.core] == ["incomparable", "comparable"]


def test_large_problem_is_explained_locally():
    # a path on 120 items has two orientations (alternating); p000 < p001 picks one, in which
    # p001 > p002 < p003: the pair p003, p002 is settled "after"
    names = [f"p{i:03d}" for i in range(120)]
    p = Problem.from_lists(comparable=list(zip(names, names[1:])), fixed=[("p000", "p001")])
    why = why_settled(p, "p003", "p002")
    assert why.relation == "after"
    assert why.scope.n < p.n and any("around the pair" in n for n in why.notes)
    _check(p, why)


def test_unknown_item_is_bad_input():
    from satorder.errors import InputError

    p = Problem.from_lists(comparable=[("kiln", "loom")])
    with pytest.raises(InputError, match="no item named 'weir'"):
        why_settled(p, "kiln", "weir")
