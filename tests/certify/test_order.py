"""The independent order check: its compiled and set-based paths on planted faults."""

from __future__ import annotations

import random

import pytest

from satorder.certify import order as certify
from satorder.model.order import transitive_closure


@pytest.mark.parametrize("compiled_from", [0, 10**12])  # compiled loop, then the set-based one
def test_compiled_transitivity_check_finds_the_same_faults(monkeypatch, compiled_from):
    # both paths of the check on the same planted faults (the same seed for each)
    monkeypatch.setattr(certify, "COMPILED_FROM", compiled_from)
    rnd = random.Random(8)
    for _ in range(40):
        n = rnd.randint(65, 120)
        arcs = [(a, b) for a in range(n) for b in range(a + 1, n) if rnd.random() < 0.03]
        succ = transitive_closure(n, arcs)
        assert certify._first_intransitive(succ) is None
        a = rnd.choice([x for x in range(n) if succ[x]] or [0])
        if succ[a] and any(succ[b] for b in succ[a]):
            b = next(b for b in succ[a] if succ[b])
            c = next(iter(succ[b]))
            succ[a].discard(c)
            x, y, z = certify._first_intransitive(succ)
            assert y in succ[x] and z in succ[y] and z not in succ[x]
        else:
            succ[a].add(a)
            assert certify._first_intransitive(succ) == (a, a, a)


def test_array_check_and_set_check_agree_on_planted_faults():
    # compact answers of compact problems are checked on the arrays (own compiled loops);
    # every planted fault must be caught there as it is by the set-based check
    import numpy as np
    import pytest

    from satorder.errors import CertificateError
    from satorder.jit import HAVE_NUMBA
    from satorder.model.adjacency import CsrSets
    from satorder.model.problem import Problem

    if not HAVE_NUMBA:
        pytest.skip("the array check needs numba")

    def verdict(problem, succ):
        try:
            certify.check_order(problem, succ)
        except CertificateError as exc:
            return str(exc).split(":")[0].split(" ")[0:3]
        return "ok"

    rnd = random.Random(9)
    seen = set()
    for trial in range(120):
        n = rnd.randint(2, 40)
        arcs = [(a, b) for a in range(n) for b in range(a + 1, n) if rnd.random() < 0.15]
        succ = [set(s) for s in transitive_closure(n, arcs)]
        adj = [set() for _ in range(n)]
        for a, s in enumerate(succ):
            for b in s:
                adj[a].add(b)
                adj[b].add(a)
        names = [f"item{i}" for i in range(n)]
        fault = trial % 5
        a = rnd.randrange(n)
        if fault == 1:  # drop an ordered pair (leaves it unordered, or breaks transitivity)
            if succ[a]:
                succ[a].discard(next(iter(succ[a])))
        elif fault == 2:  # order a pair that must stay unordered
            b = next((b for b in range(n) if b != a and b not in adj[a]), None)
            if b is not None:
                succ[a].add(b)
        elif fault == 3:  # a loop
            succ[a].add(a)
        tails = [x for x, s in enumerate(succ) for _ in s]
        heads = [y for s in succ for y in s]
        if fault == 4 and heads:  # a pair listed twice in the arrays
            tails.insert(0, tails[0])
            heads.insert(0, heads[0])
        compact = CsrSets.from_arcs(n, np.array(tails, dtype=np.int64), np.array(heads))
        sets_problem = Problem(items=names, adj=adj)
        compact_problem = Problem(items=names, adj=CsrSets.from_sets(adj))
        fast = verdict(compact_problem, compact)
        if fault == 4 and heads:
            assert fast != "ok"
            continue
        slow = verdict(sets_problem, succ)
        assert (fast == "ok") == (slow == "ok"), (trial, fault, fast, slow)
        seen.add(fast == "ok")
    assert seen == {True, False}
