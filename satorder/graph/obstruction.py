"""Obstructions: a minimal set of items whose induced subgraph has no transitive orientation.

A graph is a comparability graph exactly when no implication class of its forcing relation Γ
contains an arc together with its reverse (Golumbic, *Algorithmic Graph Theory and Perfect
Graphs*, 1980, ch. 5; Gallai 1967).  Being a comparability graph is *hereditary*: every induced
subgraph of a comparability graph is one too.  So when a graph is not one, some set of items
induces a subgraph that is not, while every set one item smaller does; that set is an
*obstruction*.  Gallai (1967) lists all such minimal forbidden induced subgraphs; odd cycles of
length at least 5 are the simplest.

Method, fast on large graphs:

1. **Localise.**  A forcing chain from an arc to its reverse (the conflict certificate of
   :func:`satorder.graph.forcing.transitive_orientation`) uses only comparable pairs and unordered
   witness pairs among its own items, so the items of the chain already induce a subgraph with
   the same chain: not orientable.  Only this step looks at the whole graph, and the caller may
   pass the forcing result it already has.
2. **Minimise** by deletion (the usual deletion filter for hereditary properties): try dropping
   each item in turn, keeping the drop when the rest still induces a non-orientable subgraph, and
   then shrinking to the items of the new, shorter chain.  An item found necessary stays
   necessary in every smaller non-orientable subset (heredity), so one pass suffices and the
   result is minimal: each one-item-smaller subset is orientable.

>>> import networkx as nx
>>> from satorder.model.problem import Problem
>>> g = nx.cycle_graph(5)
>>> g.add_edges_from([(0, 5), (5, 6)])          # a pendant path does not matter
>>> sorted(find_obstruction(Problem.from_networkx(g).adj))
[0, 1, 2, 3, 4]
"""

from __future__ import annotations

from collections.abc import Iterable

from satorder.graph.forcing import ForcingResult, transitive_orientation


def induced_adjacency(
    adj: list[set[int]], items: Iterable[int]
) -> tuple[list[int], list[set[int]]]:
    """The subgraph induced by ``items``, relabelled ``0..k-1``; returns ``(items, sub_adj)``."""
    items = list(items)
    keep = set(items)
    pos = {v: k for k, v in enumerate(items)}
    sub = [{pos[u] for u in (adj[v] & keep)} for v in items]
    return items, sub


def chain_items(chain) -> list[int]:
    """Items touched by a forcing chain, in order of first appearance."""
    seen: dict[int, None] = {}
    for step in chain:
        for v in step.arc:
            seen.setdefault(v, None)
        if step.because is not None:
            for v in step.because:
                seen.setdefault(v, None)
    return list(seen)


def find_obstruction(
    adj: list[set[int]], result: ForcingResult | None = None
) -> list[int] | None:
    """A minimal set of items inducing a subgraph with no transitive orientation, or ``None``
    when the graph ``adj`` is a comparability graph.

    ``result`` is the forcing algorithm's outcome on ``adj`` if the caller already has it (the
    one expensive step on a large graph).
    """
    if result is None:
        result = transitive_orientation(adj)
    if result.orientable:
        return None
    return minimise_obstruction(adj, chain_items(result.chain))


def _orientable(adj: list[set[int]], items: list[int]) -> tuple[bool, list[int]]:
    """Whether ``items`` induce a comparability graph; if not, the items of a forcing chain."""
    order, sub = induced_adjacency(adj, items)
    res = transitive_orientation(sub)
    if res.orientable:
        return True, []
    return False, [order[v] for v in chain_items(res.chain)]


def is_odd_hole(adj: list[set[int]], items: Iterable[int]) -> bool:
    """True when ``items`` induce a chordless cycle of odd length at least 5 — a minimal
    obstruction by itself (Golumbic 1980, ch. 5: odd holes are not comparability graphs, and
    every proper induced subgraph, a union of paths, is one)."""
    items = list(items)
    keep = set(items)
    if len(items) < 5 or len(items) % 2 == 0:
        return False
    if any(len(adj[v] & keep) != 2 for v in items):
        return False
    seen, stack = {items[0]}, [items[0]]  # 2-regular: a single cycle iff connected
    while stack:
        for u in adj[stack.pop()] & keep:
            if u not in seen:
                seen.add(u)
                stack.append(u)
    return len(seen) == len(items)


def minimise_obstruction(adj: list[set[int]], items: Iterable[int]) -> list[int]:
    """Shrink a set of items inducing a non-orientable subgraph to a minimal such set.

    Raises ``ValueError`` if ``items`` induce a comparability graph.
    """
    ok, current = _orientable(adj, list(items))
    if ok:
        raise ValueError("the items induce a comparability graph; nothing to minimise")
    needed: set[int] = set()
    while not is_odd_hole(adj, current):  # an odd hole is minimal already
        candidates = [v for v in current if v not in needed]
        if not candidates:
            break
        v = candidates[0]
        rest = [u for u in current if u != v]
        ok, chain = _orientable(adj, rest)
        if ok:
            needed.add(v)
        else:
            current = chain  # keeps every needed item (heredity), drops v and maybe more
    return sorted(current)


def is_minimal_obstruction(adj: list[set[int]], items: Iterable[int]) -> bool:
    """Check by forcing: ``items`` induce a non-orientable subgraph and every one-item-smaller
    subset induces an orientable one."""
    items = list(items)
    if _orientable(adj, items)[0]:
        return False
    if is_odd_hole(adj, items):
        return True
    return all(_orientable(adj, items[:k] + items[k + 1:])[0] for k in range(len(items)))
