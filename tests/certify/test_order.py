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
