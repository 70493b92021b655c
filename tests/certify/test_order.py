"""The independent order check: its compiled and set-based paths on planted faults."""

from __future__ import annotations

import random

from satorder.certify import order as certify
from satorder.model.order import transitive_closure


def test_compiled_transitivity_check_finds_the_same_faults():
    # the compiled check (orders over 64 items) against the set-based one on planted faults
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
