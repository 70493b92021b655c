"""Layered drawing of a directed acyclic graph: the layout behind the Hasse diagrams.

The method is the one of Sugiyama, Tagawa & Toda, "Methods for visual understanding of
hierarchical system structures", IEEE Trans. Systems, Man, and Cybernetics 11(2):109–125, 1981:

1. **Layers** are given (for an order: the Mirsky level, the longest chain ending at an item).
2. **Bend points**: an edge that spans several layers gets a dummy vertex in every layer it
   passes, so every edge becomes a path of edges between adjacent layers.
3. **Crossing reduction**: layer-by-layer sweeps, alternately upwards and downwards; each
   vertex of the free layer is sorted by the mean of two classic keys, the barycentre
   (Sugiyama et al.) and the median (Eades & Wormald, "Edge crossings in drawings of bipartite
   graphs", Algorithmica 11, 1994) of its neighbours' positions in the fixed layer — on the
   committed suites the mix left fewer crossings than either key alone
   (``benchmarks/hasse_crossings.py``) — vertices without neighbours keeping their place;
   after each sweep neighbouring vertices are swapped while that removes crossings
   (Gansner, Koutsofios, North & Vo, "A technique for drawing directed graphs", IEEE Trans.
   Software Eng. 19(3), 1993).  The best order seen is kept.  Crossings are counted with the
   accumulator tree of Barth, Jünger & Mutzel, "Simple and efficient bilayer cross counting",
   J. Graph Algorithms Appl. 8(2), 2004.
4. **Coordinates** minimise the sum over edges of Ω·(x_u − x_v)², with Ω = 1 between two
   vertices, 2 between a vertex and a bend point and 8 between two bend points, so long edges
   pull straight (the objective of Gansner et al. 1993), keeping each layer's order and
   spacing; each layer in turn is solved exactly as a weighted isotonic regression (pool
   adjacent violators).  Finally every long edge whose bend points can all share one x
   without crowding a neighbour is drawn straight there.

>>> lay = layered_layout([[0, 1], [2, 3]], [(0, 3), (1, 2)], widths=[10, 10, 10, 10])
>>> lay.crossings, [lay.order[0].index(0) == lay.order[1].index(3)]
(0, [True])
"""

from __future__ import annotations

import bisect
from dataclasses import dataclass

MAX_SWEEPS = 24  # crossing-reduction sweeps at most
PATIENCE = 4  # stop after this many sweeps without a better order
TRANSPOSE_LIMIT = 6000  # vertices (with bend points) up to which transpositions are tried


@dataclass
class Layout:
    """Result of :func:`layered_layout`.

    Vertices ``0 … n-1`` are the graph's own; ``n …`` are bend points.  ``order[k]`` lists the
    vertices of layer ``k`` from left to right, ``x[v]`` is the centre of vertex ``v``,
    ``paths[(a, b)]`` the vertices an edge passes from ``a`` to ``b`` (bend points only), and
    ``crossings`` the number of edge crossings of the drawing with straight segments between
    adjacent layers.
    """

    n: int
    layer: list[int]
    order: list[list[int]]
    x: list[float]
    paths: dict[tuple[int, int], list[int]]
    crossings: int

    @property
    def width(self) -> float:
        return max(self.x, default=0.0)


class _Graph:
    """The proper layered graph: bend points inserted, neighbours per direction."""

    def __init__(self, layers, edges):
        self.real = sum(len(lv) for lv in layers)
        self.layer = [0] * self.real
        for k, lv in enumerate(layers):
            for v in lv:
                self.layer[v] = k
        self.up: list[list[int]] = [[] for _ in range(self.real)]
        self.down: list[list[int]] = [[] for _ in range(self.real)]
        self.paths: dict[tuple[int, int], list[int]] = {}
        self.nlayers = len(layers)
        for a, b in edges:
            if self.layer[b] <= self.layer[a]:
                raise ValueError(f"edge {a}->{b} does not go upwards through the layers")
            prev, bends = a, []
            for k in range(self.layer[a] + 1, self.layer[b]):
                d = self._add(k)
                bends.append(d)
                self._link(prev, d)
                prev = d
            self._link(prev, b)
            self.paths[(a, b)] = bends

    @property
    def n(self) -> int:
        """Vertices including bend points."""
        return len(self.layer)

    def _add(self, k: int) -> int:
        self.layer.append(k)
        self.up.append([])
        self.down.append([])
        return len(self.layer) - 1

    def _link(self, lo: int, hi: int) -> None:
        self.up[lo].append(hi)
        self.down[hi].append(lo)


# ---------------------------------------------------------------- crossing counting
def bilayer_crossings(order_lo: list[int], order_hi: list[int], up: list[list[int]]) -> int:
    """Crossings between two adjacent layers (Barth, Jünger & Mutzel 2004): list the edges by
    lower end, then upper end, and count the inversions of their upper ends with an
    accumulator tree."""
    pos = {v: i for i, v in enumerate(order_hi)}
    seq: list[int] = []
    for u in order_lo:
        seq.extend(sorted(pos[w] for w in up[u]))
    q = len(order_hi)
    first = 1
    while first < q:
        first <<= 1
    tree = [0] * (2 * first - 1)
    first -= 1
    cross = 0
    for p in seq:
        i = p + first
        tree[i] += 1
        while i > 0:
            if i % 2:
                cross += tree[i + 1]
            i = (i - 1) // 2
            tree[i] += 1
    return cross


def total_crossings(order: list[list[int]], up: list[list[int]]) -> int:
    return sum(bilayer_crossings(order[k], order[k + 1], up) for k in range(len(order) - 1))


# ---------------------------------------------------------------- crossing reduction
def _initial_order(g: _Graph, roots: list[int], nbr: list[list[int]]) -> list[list[int]]:
    """Depth-first placement from ``roots`` along ``nbr``: a tree-like graph starts without
    crossings (the start used by Gansner et al. 1993)."""
    order: list[list[int]] = [[] for _ in range(g.nlayers)]
    seen = [False] * g.n
    for r in roots + list(range(g.n)):
        if seen[r]:
            continue
        stack = [r]
        while stack:
            v = stack.pop()
            if seen[v]:
                continue
            seen[v] = True
            order[g.layer[v]].append(v)
            stack.extend(reversed([w for w in nbr[v] if not seen[w]]))
    return order


def _reorder(free: list[int], fixed: list[int], nbr: list[list[int]]) -> list[int]:
    """``free`` sorted by the mean of the median and the barycentre of neighbour positions in
    ``fixed``; vertices without neighbours stay in their slots."""
    pos = {v: i for i, v in enumerate(fixed)}
    keyed, slots = [], []
    for i, v in enumerate(free):
        ps = sorted(pos[w] for w in nbr[v])
        if not ps:
            continue
        m = len(ps)
        med = ps[m // 2] if m % 2 else (ps[m // 2 - 1] + ps[m // 2]) / 2
        keyed.append(((med + sum(ps) / m) / 2, i, v))
        slots.append(i)
    keyed.sort()
    out = list(free)
    for slot, (_, _, v) in zip(slots, keyed):
        out[slot] = v
    return out


def _pair_cross(u: list[int], w: list[int]) -> int:
    """Crossings between the edges of u and of w (u left of w) given sorted neighbour
    positions: pairs with a neighbour of u right of a neighbour of w."""
    if len(u) == 1 and len(w) == 1:
        return 1 if u[0] > w[0] else 0
    return sum(bisect.bisect_left(w, p) for p in u)


def _transpose(g: _Graph, order: list[list[int]]) -> None:
    """Swap neighbouring vertices while that lowers the crossings with both adjacent layers;
    a layer is looked at again only when it or a layer next to it changed."""
    pos = [0] * g.n
    for row in order:
        for i, v in enumerate(row):
            pos[v] = i
    dirty = set(range(len(order)))
    for _ in range(8):
        again: set[int] = set()
        for k in sorted(dirty):
            row = order[k]
            ns = [(sorted(pos[w] for w in g.down[v]), sorted(pos[w] for w in g.up[v]))
                  for v in row]
            changed = False
            for i in range(len(row) - 1):
                (dv, uv), (dw, uw) = ns[i], ns[i + 1]
                now = _pair_cross(dv, dw) + _pair_cross(uv, uw)
                if now and _pair_cross(dw, dv) + _pair_cross(uw, uv) < now:
                    row[i], row[i + 1] = row[i + 1], row[i]
                    ns[i], ns[i + 1] = ns[i + 1], ns[i]
                    pos[row[i]], pos[row[i + 1]] = i, i + 1
                    changed = True
            if changed:
                again |= {j for j in (k - 1, k, k + 1) if 0 <= j < len(order)}
        if not again:
            return
        dirty = again


def _reduce(g: _Graph, order: list[list[int]]) -> tuple[list[list[int]], int]:
    best = [list(r) for r in order]
    best_c = total_crossings(order, g.up)
    stall = 0
    for sweep in range(MAX_SWEEPS):
        if best_c == 0:
            break
        if sweep % 2 == 0:
            for k in range(1, len(order)):
                order[k] = _reorder(order[k], order[k - 1], g.down)
        else:
            for k in range(len(order) - 2, -1, -1):
                order[k] = _reorder(order[k], order[k + 1], g.up)
        if g.n <= TRANSPOSE_LIMIT:
            _transpose(g, order)
        c = total_crossings(order, g.up)
        if c < best_c:
            best, best_c, stall = [list(r) for r in order], c, 0
        else:
            stall += 1
            if stall >= PATIENCE:
                break
    return best, best_c


# ---------------------------------------------------------------- coordinates
def _isotonic(targets: list[float], weights: list[float]) -> list[float]:
    """The non-decreasing sequence closest to ``targets`` in weighted least squares, by pooling
    adjacent violators (Ayer, Brunk, Ewing, Reid & Silverman, "An empirical distribution
    function for sampling with incomplete information", Ann. Math. Statist. 26(4), 1955)."""
    blocks: list[list[float]] = []  # [weighted sum, weight, count]
    for t, w in zip(targets, weights):
        blocks.append([w * t, w, 1])
        while len(blocks) > 1 and blocks[-2][0] * blocks[-1][1] > blocks[-1][0] * blocks[-2][1]:
            s, w2, c = blocks.pop()
            blocks[-1][0] += s
            blocks[-1][1] += w2
            blocks[-1][2] += c
    out: list[float] = []
    for s, w, c in blocks:
        out += [s / w] * int(c)
    return out


def _coordinates(g: _Graph, order, width, gap, sweeps: int = 12) -> list[float]:
    """x of every vertex: minimise the sum over edges of Ω·(x_u − x_v)², Ω = 1 between two
    items, 2 between an item and a bend point, 8 between two bend points (the objective of
    Gansner et al. 1993, whose weights straighten long edges), keeping each layer's order and
    spacing.  Layers are solved one at a time, exactly, as a weighted isotonic regression,
    sweeping down and up; then every long edge whose bend points can all sit at one x without
    crowding a neighbour is made straight there."""
    def sep(u, v):
        return (width[u] + width[v]) / 2 + gap

    real = g.real
    x = [0.0] * g.n
    for row in order:
        at = 0.0
        for i, v in enumerate(row):
            at += sep(row[i - 1], v) if i else width[v] / 2
            x[v] = at
    nbrs = [[(w, 1.0 if v < real and w < real else 8.0 if v >= real and w >= real else 2.0)
             for w in g.up[v] + g.down[v]] for v in range(g.n)]

    def solve(row):
        offs, targets, weights = [], [], []
        at = 0.0
        for i, v in enumerate(row):
            at += sep(row[i - 1], v) if i else 0.0
            offs.append(at)
            tot = sum(om for _, om in nbrs[v])
            t = sum(x[w] * om for w, om in nbrs[v]) / tot if tot else x[v]
            targets.append(t - at)
            weights.append(tot or 0.01)
        for v, y, off in zip(row, _isotonic(targets, weights), offs):
            x[v] = y + off

    for k in range(sweeps):
        for row in (order if k % 2 == 0 else reversed(order)):
            if row:
                solve(row)
    pos = [0] * g.n
    for row in order:
        for i, v in enumerate(row):
            pos[v] = i
    for (a, b), bends in g.paths.items():
        if not bends:
            continue
        xs = sorted(x[d] for d in bends)
        for cand in (x[a], x[b], xs[len(xs) // 2]):
            if all(_fits(order[g.layer[d]], pos[d], cand, x, sep) for d in bends):
                for d in bends:
                    x[d] = cand
                break
    left = min((x[r[0]] - width[r[0]] / 2 for r in order if r), default=0.0)
    return [v - left for v in x]


def _fits(row, i, cand, x, sep) -> bool:
    """Vertex ``row[i]`` may move to ``cand`` keeping its spacing to both neighbours."""
    v = row[i]
    return ((i == 0 or x[row[i - 1]] + sep(row[i - 1], v) <= cand + 1e-9)
            and (i + 1 == len(row) or cand + sep(v, row[i + 1]) <= x[row[i + 1]] + 1e-9))


def layered_layout(layers: list[list[int]], edges: list[tuple[int, int]], widths: list[float],
                   gap: float = 14.0, bend_width: float = 4.0) -> Layout:
    """Lay out vertices ``0 … n-1`` given by layer (``layers[0]`` at the bottom) and edges
    ``(a, b)`` going upwards (``a``'s layer below ``b``'s); ``widths[v]`` is the width of
    vertex ``v``'s box, ``gap`` the least space between two boxes or bend points."""
    g = _Graph(layers, edges)
    roots = sorted(v for v in range(g.real) if g.layer[v] == 0)
    tops = sorted(v for v in range(g.real) if g.layer[v] == g.nlayers - 1)
    best, best_c = None, None
    for start in (_initial_order(g, roots, g.up), _initial_order(g, tops, g.down)):
        order, c = _reduce(g, start)
        if best_c is None or c < best_c:
            best, best_c = order, c
    width = list(widths) + [bend_width] * (g.n - g.real)
    x = _coordinates(g, best or [], width, gap)
    return Layout(g.real, g.layer, best or [], x, g.paths, best_c or 0)
