"""Shared test helpers: brute-force reference answers on tiny problems."""

from __future__ import annotations

import functools
import itertools

import networkx as nx
import pytest

from satorder import Problem


def all_graphs(n: int):
    """Every labelled simple graph on items 0..n-1, as networkx graphs."""
    pairs = list(itertools.combinations(range(n), 2))
    for mask in range(1 << len(pairs)):
        g = nx.Graph()
        g.add_nodes_from(range(n))
        g.add_edges_from(p for k, p in enumerate(pairs) if mask >> k & 1)
        yield g


def brute_force_orientable(g: nx.Graph) -> bool:
    """True if some orientation of g's edges is transitive (tries all 2^m orientations)."""
    edges = list(g.edges())
    for mask in range(1 << len(edges)):
        arcs = {(a, b) if mask >> k & 1 else (b, a) for k, (a, b) in enumerate(edges)}
        succ: dict = {}
        for a, b in arcs:
            succ.setdefault(a, set()).add(b)
        if all((a, c) in arcs for a, b in arcs for c in succ.get(b, ())):
            return True
    return False


@functools.cache
def all_posets(n: int) -> tuple[frozenset, ...]:
    """Every strict partial order on items 0..n-1 as a frozenset of arcs (brute force: each
    pair unordered / one way / the other, keep the transitive ones)."""
    pairs = list(itertools.combinations(range(n), 2))
    out = []
    for states in itertools.product((0, 1, 2), repeat=len(pairs)):
        arcs = set()
        for (a, b), s in zip(pairs, states):
            if s == 1:
                arcs.add((a, b))
            elif s == 2:
                arcs.add((b, a))
        if all((a, d) in arcs for a, b in arcs for c, d in arcs if b == c):
            out.append(frozenset(arcs))
    return tuple(out)


@pytest.fixture
def problem_of():
    return Problem.from_networkx
