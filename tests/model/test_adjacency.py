"""CsrSets: compact integer sets that behave as the list of sets they stand for."""

from __future__ import annotations

import pickle
import random

import numpy as np

from satorder.model.adjacency import CsrSets, csr_arrays
from satorder.model.problem import Problem


def _random_sets(rnd, n):
    return [{rnd.randrange(n) for _ in range(rnd.randint(0, 6))} for _ in range(n)]


def test_round_trip_and_list_of_sets_face():
    rnd = random.Random(2)
    for _ in range(30):
        sets = _random_sets(rnd, rnd.randint(1, 30))
        c = CsrSets.from_sets(sets)
        assert c.is_compact and len(c) == len(sets) and c.total() == sum(map(len, sets))
        assert c.row_sizes().tolist() == [len(s) for s in sets]
        indptr, indices = c.csr()
        assert all(
            indices[s:e].tolist() == sorted(r) for s, e, r in zip(indptr[:-1], indptr[1:], sets)
        )
        assert pickle.loads(pickle.dumps(c)) == sets
        assert c == sets and list(c) == sets and not c.is_compact  # now a list of sets
        c[0].add(len(sets) - 1)  # a change to a row is kept, and the arrays follow it
        sets[0].add(len(sets) - 1)
        assert c == sets and CsrSets(*c.csr()) == sets


def test_from_arcs_groups_heads_by_tail():
    c = CsrSets.from_arcs(4, np.array([3, 0, 3, 1]), np.array([0, 2, 1, 2]))
    assert c.sets() == [{2}, {2}, set(), {0, 1}]
    assert csr_arrays([{2}, {2}, set(), {1, 0}])[1].tolist() == [2, 2, 0, 1]


def test_problem_counts_pairs_without_making_sets():
    adj = CsrSets.from_sets([{1, 2}, {0}, {0}])
    p = Problem(items=["kiln", "loom", "quay"], adj=adj)
    assert p.num_comparable == 2 and adj.is_compact
    assert sorted(p.comparable_pairs()) == [(0, 1), (0, 2)]
