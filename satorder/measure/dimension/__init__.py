"""Order dimension with a realizer, exact where it can be, bounded beyond.

The *dimension* of an order P is the least number of linear orders (a *realizer*) whose
intersection is P (Dushnik & Miller 1941).  How it is found here:

1. **Split by series and parallel modules.**  Items are split into the connected components of
   the comparability graph (a *disjoint sum*) and, inside a connected part, into the components
   of its complement (a *linear sum*: every item of one part lies below every item of the next).
   A linear sum has dimension ``max(parts)`` and a disjoint sum of at least two parts
   ``max(2, parts)``: each part is a sub-order (so no less), and realizers of the parts, padded
   to equal length, concatenate into one of the whole — for a disjoint sum the second order
   lists the parts in reverse, which separates items of different parts.  Components of the
   complement are found without building it (each step scans only the items still unvisited).
2. **Dimension ≤ 2 test on each remaining part** (connected, co-connected).  P has dimension
   ≤ 2 exactly when its incomparability graph is a comparability graph (Dushnik & Miller 1941);
   the part's incomparability graph is built and handed to the forcing algorithm
   (:mod:`satorder.graph.forcing`).  A transitive orientation Q of it gives the realizer
   ``L1 = P ∪ Q`` and ``L2 = P ∪ Q⁻¹``: an item's position in ``L1`` is the number of items
   below it in P plus the number before it in Q.  When no orientation exists, the forcing
   chain names a sub-order of dimension ≥ 3, which is then shrunk item by item to a small one.
3. **SAT for dimension ≥ 3** on parts of at most ``sat_limit`` items (150): the lazy search
   over critical pairs of :mod:`satorder.measure.dimension.lazy` (each critical pair reversed
   in one of ``k`` linear extensions, alternating cycles cut as the solver meets them; Trotter
   1992), ``k = 3, 4, …`` until satisfiable.  Each "no" leaves a checked lower-bound witness:
   pairs that pairwise form alternating two-cycles, or a small sub-order re-solved by the
   checker.  Parts of up to ``3 · sat_limit`` items get one short try (5 s) for three orders,
   which settles dimension 3 when it succeeds and proves dimension ≥ 4 (with such a witness)
   when it fails.  (:func:`sat_realizer`, the textbook encoding over item triples, is kept as
   an independent formulation for the tests.)
4. **Large parts** (incomparability graph too large to build): first a quick search for a small
   sub-order of dimension ≥ 3 among random connected pieces; if none, *ordered vertex
   partitioning* (McConnell & Spinrad 2000) on the incomparability graph, driven by the
   comparability lists alone (:func:`refine_conjugate`), proposes a conjugate order; the
   resulting pair of linear orders is accepted only when it passes the realizer check.
   Unsplit classes that are modules are realized recursively and substituted.
5. **Beyond reach** (a large part where neither succeeds, or a part of dimension ≥ 3 with too
   many items for SAT): the answer is *bounded*.  Lower bound: 3 when a sub-order of
   dimension ≥ 3 is found (by the chain above, or by sampling small connected pieces of the
   part), else 2.  Upper bound: ``min(width, max(2, ⌊n/2⌋))`` — dimension is at most the width
   (Dilworth 1950) and at most ``⌊n/2⌋`` for n ≥ 4 (Hiraguchi 1951), both from memory — or,
   on parts of up to :data:`GREEDY_LIMIT` items, the size of a realizer built greedily (each
   linear extension reverses what critical pairs it can), which is checked like any realizer
   and gives the exact value when it meets the lower bound.

>>> dimension([{3, 4}, {3, 5}, {4, 5}, set(), set(), set()]).value  # standard example S_3
3
"""

from satorder.measure.dimension.result import Dimension
from satorder.measure.dimension.sat import sat_realizer
from satorder.measure.dimension.search import dimension

__all__ = ["Dimension", "dimension", "sat_realizer"]
