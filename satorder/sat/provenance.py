"""From clauses back to the requirements behind them, for cores without selector literals.

A collapsed encoding (:mod:`satorder.sat.encoding`) records why each clause is there
(``origin``) and which Γ steps tie the arcs sharing a class variable (``ties``).  A set of its
clauses found unsatisfiable (a clause-level core) is mapped to requirements that imply those
clauses, so the requirements are infeasible on their own: the pairs of each transitivity
clause, the fixed and forbidden arcs of unit clauses, and along the Γ chains between arcs of one
class the comparable pairs and the pairs that must stay unordered forcing each step (Golumbic,
*Algorithmic Graph Theory and Perfect Graphs*, 1980, ch. 5).
"""

from __future__ import annotations

from collections.abc import Iterable

from scipy.sparse.csgraph import breadth_first_order

Arc = tuple[int, int]
Key = tuple[str, Arc]  # a requirement: (kind, pair)


def requirements_behind(enc, clause_ids: Iterable[int]) -> list[Key] | None:
    """Requirements that imply the given clauses ``enc.hard[k]`` of a collapsed
    :class:`~satorder.sat.encoding.Encoding` (selectors off):
    if those clauses are unsatisfiable, so are these requirements on their own.

    A transitivity clause needs the pairs it names to be comparable (when they are) and its
    missing closing pair to stay unordered; a unit needs its fixed or forbidden arc; and
    arcs sharing one class variable need the Γ steps that tie them (comparable pairs and
    the unordered pairs forcing each step, Golumbic 1980, ch. 5).  ``None`` when a clause
    has no recorded origin (added by a caller).
    """
    p = enc.problem
    n = enc.n
    out: dict[Key, None] = {}
    used: list[Arc] = []

    def pair_req(a: int, b: int) -> None:
        key = (min(a, b), max(a, b))
        if b in p.adj[a]:
            out[("comparable", key)] = None
            used.append((a, b))
        elif p.must_be_unordered(a, b):
            out[("incomparable", key)] = None

    for k in clause_ids:
        origin = enc.origin.get(k)
        if origin is None:
            return None
        if origin[0] == "triple":
            a, b, c = origin[1]
            pair_req(a, b)
            pair_req(b, c)
            pair_req(a, c)
        elif origin[0] in ("fixed", "forbidden"):
            out[(origin[0], origin[1])] = None
            pair_req(*origin[1])
    if enc.ties is not None:
        graph, edges, eid = enc.ties
        by_var: dict[int, list[int]] = {}
        for a, b in used:
            lit = enc.lt(a, b)
            e = eid[min(a, b) * n + max(a, b)]
            node = 2 * e if a < b else 2 * e + 1
            if lit < 0:
                node ^= 1  # the reverse arc carries the positive literal
            by_var.setdefault(abs(lit), []).append(node)
        for nodes in by_var.values():
            targets = set(nodes[1:]) - {nodes[0]}
            if targets:
                steps = tie_paths(graph, nodes[0], targets, edges)
                if steps is None:
                    return None
                for key in steps:
                    out[key] = None
    return list(out)


def tie_paths(graph, root: int, targets: set[int], edges: list[Arc]) -> list[Key] | None:
    """Requirements along breadth-first paths of Γ steps from arc node ``root`` to each target
    (None if a target is not reachable, which would be a bug)."""
    _, pred = breadth_first_order(graph, root, directed=False, return_predecessors=True)

    def arc(node: int) -> Arc:
        a, b = edges[node // 2]
        return (a, b) if node % 2 == 0 else (b, a)

    out: dict[Key, None] = {}
    for t in targets:
        node = t
        while node != root:
            prev = int(pred[node])
            if prev < 0:
                return None
            (a, b), (c, d) = arc(prev), arc(node)
            x, y = (b, d) if a == c else (a, c)
            out[("comparable", (min(a, b), max(a, b)))] = None
            out[("comparable", (min(c, d), max(c, d)))] = None
            out[("incomparable", (min(x, y), max(x, y)))] = None
            node = prev
    return list(out)


def conflict_core(graph, e: int, edges: list[Arc]) -> list[Key]:
    """Requirements along a shortest chain of Γ steps from edge e's arc to its reverse: the
    comparable pairs of the chain and the pairs that must stay unordered forcing each step."""
    _, pred = breadth_first_order(graph, 2 * e, directed=False, return_predecessors=True)
    path = [2 * e + 1]
    while path[-1] != 2 * e:
        path.append(int(pred[path[-1]]))

    def arc(node: int) -> Arc:
        a, b = edges[node // 2]
        return (a, b) if node % 2 == 0 else (b, a)

    core: list[Key] = []
    for u, w in zip(path, path[1:]):
        (a, b), (c, d) = arc(u), arc(w)
        x, y = (b, d) if a == c else (a, c)
        core.append(("comparable", (min(a, b), max(a, b))))
        core.append(("incomparable", (min(x, y), max(x, y))))
    return list(dict.fromkeys(core))
