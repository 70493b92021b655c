"""Figures of a strict partial order, each with a witness and a dual certificate.

An order is ``succ: list[set[int]]`` (transitively closed successor sets, see
:mod:`satorder.model.order`).  Every figure comes with something that proves it optimal, so that the
independent checker (:mod:`satorder.certify.measure`) can confirm it without re-running the
algorithm:

* **height** — items in a longest chain, with one such chain and a partition into that many
  antichains (the levels).  Mirsky (1971): the least number of antichains covering an order
  equals its height; an antichain meets a chain at most once, so chain and partition certify
  each other.  (= maximum clique and optimal colouring of the comparability graph.)
* **width** — items in a largest antichain, with one, and a partition into that many chains.
  Dilworth (1950).  The chain partition comes from a maximum matching in the bipartite graph
  ``x_left — y_right`` for ``x < y`` (Fulkerson 1956: a minimum chain partition has ``n − |M|``
  chains); the antichain comes from a minimum vertex cover of that graph (König 1931).
  (= maximum independent set and minimum clique cover of the comparability graph.)
* **maximum-weight chain** — longest-path dynamic programme; certified by potentials ``s`` with
  ``s(y) ≥ s(x) + w(x)`` for ``x < y`` and ``s(x) + w(x) ≤ H`` (LP duality for chains).
* **maximum-weight antichain** — maximum flow in the same bipartite network with capacities
  ``w`` on the source and sink arcs (Ford & Fulkerson 1962, weighted Dilworth); the antichain is
  read off a minimum cut, and the flow is the certificate: any flow ``f`` on order pairs with
  in- and out-flow at most ``w(x)`` at each item gives chains covering each item ``w(x)`` times,
  ``W − |f|`` of them, so every antichain weighs at most ``W − |f|``.
* the **Hasse diagram** (covering pairs) and a **linear extension**.

>>> from satorder.measure.figures import height, width
>>> succ = [{1, 2}, {2}, set(), set()]      # 0 < 1 < 2, item 3 unrelated
>>> height(succ).value, width(succ).value
(3, 2)
"""

from __future__ import annotations

from dataclasses import dataclass

from satorder.model import order as order_ops


@dataclass
class Figure:
    """A figure of an order with its witness and its dual certificate.

    ``value``: the figure; ``witness``: the optimal chain or antichain (items);
    ``partition``: the dual partition (list of antichains or of chains), when unweighted;
    ``potentials`` (weighted chain) or ``flow`` (weighted antichain, ``(x, y, amount)``).
    """

    value: int
    witness: list[int]
    partition: list[list[int]] | None = None
    potentials: list[int] | None = None
    flow: list[tuple[int, int, int]] | None = None


def predecessor_sets(succ: list[set[int]]) -> list[set[int]]:
    """``pred[b]`` = items strictly below ``b``."""
    pred: list[set[int]] = [set() for _ in succ]
    for a, s in enumerate(succ):
        for b in s:
            pred[b].add(a)
    return pred


def linear_extension(succ: list[set[int]]) -> list[int]:
    """Items listed so that every item comes after everything below it."""
    return order_ops.topological_order(succ)


def hasse_diagram(succ: list[set[int]], names: list[str] | None = None):
    """The covering pairs as a networkx DiGraph (arc lower → upper), on ids or on ``names``."""
    import networkx as nx

    g = nx.DiGraph()
    label = (lambda i: i) if names is None else names.__getitem__
    g.add_nodes_from(label(i) for i in range(len(succ)))
    g.add_edges_from((label(a), label(b)) for a, b in order_ops.covering_pairs(succ))
    return g


def _longest_chains(succ, weights):
    """Longest (heaviest) chain ending at each item: returns (best, back) over a topological
    order; ``best[x]`` includes ``x`` itself, ``back[x]`` the previous item of such a chain."""
    n = len(succ)
    best = list(weights)
    back = [-1] * n
    for a in order_ops.topological_order(succ):
        ba = best[a]
        for b in succ[a]:
            if ba + weights[b] > best[b]:
                best[b] = ba + weights[b]
                back[b] = a
    return best, back


def _trace(back, top):
    chain = []
    while top != -1:
        chain.append(top)
        top = back[top]
    chain.reverse()
    return chain


def height(succ: list[set[int]]) -> Figure:
    """Items in a longest chain, one such chain (bottom first) and the levels as a partition
    into that many antichains (Mirsky 1971)."""
    n = len(succ)
    if n == 0:
        return Figure(0, [], [])
    best, back = _longest_chains(succ, [1] * n)
    h = max(best)
    top = best.index(h)
    levels: list[list[int]] = [[] for _ in range(h)]
    for x in range(n):
        levels[best[x] - 1].append(x)
    return Figure(h, _trace(back, top), levels)


def max_weight_chain(succ: list[set[int]], weights: list[int]) -> Figure:
    """A chain of largest total weight, with potentials certifying it (see module doc)."""
    n = len(succ)
    if n == 0:
        return Figure(0, [], potentials=[])
    best, back = _longest_chains(succ, weights)
    total = max(best)
    top = best.index(total)
    potentials = [best[x] - weights[x] for x in range(n)]  # weight strictly below x
    return Figure(total, _trace(back, top), potentials=potentials)


def _bipartite(succ):
    """CSR matrix of the bipartite graph x_left — y_right for x < y."""
    import numpy as np
    from scipy.sparse import csr_matrix

    n = len(succ)
    indptr = np.zeros(n + 1, dtype=np.int64)
    indptr[1:] = np.cumsum([len(s) for s in succ])
    indices = np.fromiter((b for s in succ for b in s), dtype=np.int32, count=int(indptr[-1]))
    data = np.ones(len(indices), dtype=np.int8)
    return csr_matrix((data, indices, indptr), shape=(n, n))


def width(succ: list[set[int]]) -> Figure:
    """Items in a largest antichain, one such antichain and a partition into that many chains
    (Dilworth 1950, via Hopcroft–Karp matching in scipy and König's theorem)."""
    from scipy.sparse.csgraph import maximum_bipartite_matching

    n = len(succ)
    if n == 0:
        return Figure(0, [], [])
    g = _bipartite(succ)
    nxt = maximum_bipartite_matching(g, perm_type="column").tolist()  # x -> y matched, or -1
    prev = [-1] * n
    for x, y in enumerate(nxt):
        if y >= 0:
            prev[y] = x
    chains = []
    for x in range(n):
        if prev[x] == -1:
            chain = [x]
            while nxt[chain[-1]] >= 0:
                chain.append(nxt[chain[-1]])
            chains.append(chain)
    # König: alternating search from unmatched left vertices
    left_seen = [False] * n
    right_seen = [False] * n
    stack = [x for x in range(n) if nxt[x] == -1]
    for x in stack:
        left_seen[x] = True
    while stack:
        x = stack.pop()
        for y in succ[x]:
            if not right_seen[y]:
                right_seen[y] = True
                x2 = prev[y]
                if x2 >= 0 and not left_seen[x2]:
                    left_seen[x2] = True
                    stack.append(x2)
    antichain = [x for x in range(n) if left_seen[x] and not right_seen[x]]
    return Figure(len(chains), antichain, chains)


def max_weight_antichain(succ: list[set[int]], weights: list[int]) -> Figure:
    """An antichain of largest total weight, read off a minimum cut, with the maximum flow as
    its certificate (weighted Dilworth; Ford & Fulkerson 1962)."""
    import numpy as np
    from scipy.sparse import csr_matrix
    from scipy.sparse.csgraph import breadth_first_order, maximum_flow

    n = len(succ)
    if n == 0:
        return Figure(0, [], flow=[])
    total = int(sum(weights))
    if total >= 2**31 - 1:
        raise ValueError("item weights add up to more than 2^31 - 1; use smaller weights")
    s, t = 2 * n, 2 * n + 1
    rows, cols, caps = [], [], []
    for x in range(n):
        rows += [s, n + x]
        cols += [x, t]
        caps += [weights[x], weights[x]]
    for x, sx in enumerate(succ):
        for y in sx:
            rows.append(x)
            cols.append(n + y)
            caps.append(total)
    cap = csr_matrix((np.array(caps, dtype=np.int32), (rows, cols)), shape=(2 * n + 2,) * 2)
    res = maximum_flow(cap, s, t, method="dinic")
    flow = res.flow.tocsr()
    residual = (cap - flow).tocsr()
    residual.data[residual.data < 0] = 0
    residual.eliminate_zeros()
    reach = np.zeros(2 * n + 2, dtype=bool)
    reach[breadth_first_order(residual, s, directed=True, return_predecessors=False)] = True
    antichain = [x for x in range(n) if reach[x] and not reach[n + x]]
    f = flow.tocoo()
    pairs = [
        (int(a), int(b) - n, int(v))
        for a, b, v in zip(f.row, f.col, f.data)
        if a < n and n <= b < 2 * n and v > 0
    ]
    value = sum(weights[x] for x in antichain)
    return Figure(value, antichain, flow=pairs)
