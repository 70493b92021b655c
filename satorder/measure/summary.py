"""The figures of one order gathered in one place: :func:`measure` runs every figure of
:mod:`satorder.measure.figures` and the dimension search of :mod:`satorder.measure.dimension`
(it sits above both, so neither imports the other's assembly).

>>> m = measure([{1, 2}, {2}, set(), set()])
>>> m.height.value, m.width.value, m.dimension.value, m.verified
(3, 2, 2, True)
"""

from __future__ import annotations

import time
from dataclasses import dataclass, field

from satorder.certify.measure import check_measures
from satorder.measure.dimension import dimension
from satorder.measure.figures import (
    Figure,
    height,
    linear_extension,
    max_weight_antichain,
    max_weight_chain,
    width,
)
from satorder.model import order as order_ops

#: share of the time limit the dimension search may use; the rest is kept for the independent
#: check, which re-proves the search's lower bound with an encoding of its own and so takes
#: about as long as the search's last refutation (measured on the standard examples S_8 to S_11:
#: 0.5 to 2.5 times as long)
SEARCH_SHARE = 0.5


@dataclass
class Measures:
    """Everything :func:`measure` computes for one order (item ids; see :meth:`to_json`)."""

    n: int
    pairs: int
    height: Figure
    width: Figure
    hasse: list[tuple[int, int]]
    linear_extension: list[int]
    dimension: object  # satorder.measure.dimension.Dimension
    weighted_chain: Figure | None = None
    weighted_antichain: Figure | None = None
    stats: dict = field(default_factory=dict)
    verified: bool = False

    def hasse_graph(self, names: list[str] | None = None):
        """The Hasse diagram as a networkx DiGraph (arc lower → upper), each node carrying its
        ``level`` (1 = minimal items), on item ids or on ``names``."""
        import networkx as nx

        label = (lambda i: i) if names is None else names.__getitem__
        g = nx.DiGraph()
        for k, part in enumerate(self.height.partition, 1):
            g.add_nodes_from((label(i) for i in part), level=k)
        g.add_edges_from((label(a), label(b)) for a, b in self.hasse)
        return g

    def to_json(self, names: list[str]) -> dict:
        def nm(items):
            return [names[i] for i in items]

        doc = {
            "height": self.height.value,
            "width": self.width.value,
            "dimension": self.dimension.value,
            "item_count": self.n,
            "ordered_pairs": self.pairs,
            "longest_chain": nm(self.height.witness),
            "largest_antichain": nm(self.width.witness),
            "antichain_partition": [nm(p) for p in self.height.partition],
            "chain_partition": [nm(p) for p in self.width.partition],
            "hasse": [[names[a], names[b]] for a, b in self.hasse],
            "linear_extension": nm(self.linear_extension),
        }
        doc.update(self.dimension.to_json(names))
        if self.weighted_chain is not None:
            doc["max_weight_chain"] = {"weight": self.weighted_chain.value,
                                       "items": nm(self.weighted_chain.witness)}
            doc["max_weight_antichain"] = {"weight": self.weighted_antichain.value,
                                           "items": nm(self.weighted_antichain.witness)}
        doc["verified"] = self.verified
        doc["stats"] = self.stats
        return doc


def measure(succ, weights: dict[int, int] | None = None,
            sat_limit: int = 150, time_limit: float | None = 60.0, progress=None,
            verify: bool = True) -> Measures:
    """Height, width, partitions, Hasse diagram, a linear extension and the dimension of an
    order (plus weighted chain and antichain when ``weights`` is given; missing items weigh 1).

    ``succ`` is an order's successor sets, or a feasible :class:`satorder.Answer` (its order is
    measured and its problem's ``weights`` used unless ``weights`` is given).

    ``progress(stage)`` is called before each stage, if given.  With ``verify`` (the default)
    every witness is re-checked by :func:`satorder.certify.measure.check_measures` before the
    result is returned (``verified`` is then True).

    ``time_limit`` (seconds, or None) covers the whole call: the figures other than the
    dimension take polynomial time; the dimension search stops at :data:`SEARCH_SHARE` of the
    time then left and reports bounds, keeping the rest for the independent check.

    >>> m = measure([{1, 2}, {2}, set(), set()])
    >>> m.height.value, m.width.value, m.dimension.value, m.hasse
    (3, 2, 2, [(0, 1), (1, 2)])
    """
    if hasattr(succ, "succ") and hasattr(succ, "problem"):
        if succ.succ is None:
            raise ValueError(f"no order to measure: the answer is {succ.status}")
        weights = succ.problem.weights if weights is None else weights
        succ = succ.succ

    def stage(name):
        if progress is not None:
            progress(name)
        return time.perf_counter()

    end = None if time_limit is None else time.monotonic() + time_limit
    stats = {}
    t = stage("height")
    h = height(succ)
    t2 = stage("width")
    stats["height_seconds"] = round(t2 - t, 4)
    w = width(succ)
    t = stage("hasse diagram")
    stats["width_seconds"] = round(t - t2, 4)
    hasse = order_ops.covering_pairs(succ)
    lin = linear_extension(succ)
    t2 = stage("dimension")
    stats["hasse_seconds"] = round(t2 - t, 4)
    search = None if end is None else SEARCH_SHARE * max(0.0, end - time.monotonic())
    dim = dimension(succ, sat_limit=sat_limit, time_limit=search)
    t = time.perf_counter()
    stats["dimension_seconds"] = round(t - t2, 4)
    m = Measures(len(succ), sum(len(s) for s in succ), h, w, hasse, lin, dim, stats=stats)
    if weights is not None:
        stage("weighted chain and antichain")
        wl = [weights.get(i, 1) for i in range(len(succ))]
        m.weighted_chain = max_weight_chain(succ, wl)
        m.weighted_antichain = max_weight_antichain(succ, wl)
        stats["weighted_seconds"] = round(time.perf_counter() - t, 4)
    if verify:
        stage("independent check")
        t = time.perf_counter()
        check_measures(succ, m, weights)
        stats["check_seconds"] = round(time.perf_counter() - t, 4)
    return m
