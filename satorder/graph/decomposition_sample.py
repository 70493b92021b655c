"""Answers drawn uniformly at random from a problem without open pairs, through its modular
decomposition.

The answers are independent choices at the nodes of the decomposition with the arcs placed
where their ends separate (:mod:`satorder.graph.node_choices`), each node's admissible choices
counted alike in every combination.  Drawing each node's choice uniformly among its own
admissible ones therefore draws the whole answer uniformly:

* a prime node takes one of the orientations its arcs allow, each with equal chance;
* a series node takes a uniform linear extension of the order its arcs put on the children
  they touch (:meth:`satorder.graph.linear_extensions.LinearExtensions.sample`), then the free
  children in a uniform random order at uniform random places among all ``k`` positions —
  every linear order of the children meeting the arcs arises from exactly one such draw.

The order itself is assembled from the choices: a child before another puts all of its items
before all of the other's, which is the transitive orientation the choices describe (Gallai
1967).  This is an engine: the caller checks each order
(:func:`satorder.certify.order.check_order`).

>>> import random
>>> from satorder.model.problem import Problem
>>> from satorder.graph.node_choices import constrain
>>> p = Problem.from_lists(comparable=[("a", "b"), ("b", "c"), ("a", "c")], fixed=[("a", "b")])
>>> succ = sample_order(constrain(p), random.Random(1))
>>> 1 in succ[0]                        # a before b in every answer
True
"""

from __future__ import annotations

import random

from satorder.graph.modular import SERIES
from satorder.graph.node_choices import Constrained, NodeChoices


def sample_order(con: Constrained, rng: random.Random) -> list[set[int]]:
    """One answer drawn uniformly at random, as successor sets (item ids)."""
    if con.count == 0:
        raise ValueError("the problem has no answer to draw")
    succ: list[set[int]] = [set() for _ in range(con.problem.n)]
    for choice in con.nodes:
        children = [c.items for c in choice.node.children]
        if choice.kind == SERIES:
            line = _series_line(choice, rng)
            above: set[int] = set()
            for c in reversed(line):
                if above:
                    for a in children[c]:
                        succ[a].update(above)
                above.update(children[c])
        else:
            forward, backward = choice.allowed
            up = forward if not (forward and backward) else rng.random() < 0.5
            targets: dict[int, set[int]] = {}
            for i, j in choice.up:
                lo, hi = (i, j) if up else (j, i)
                targets.setdefault(lo, set()).update(children[hi])
            for lo, items in targets.items():
                for a in children[lo]:
                    succ[a].update(items)
    return succ


def _series_line(choice: NodeChoices, rng: random.Random) -> list[int]:
    """The children of a series node in a uniformly drawn admissible order."""
    k = len(choice.node.children)
    if choice.ext is None:
        line = list(range(k))
        rng.shuffle(line)
        return line
    touched = [choice.involved[t] for t in choice.ext.sample(rng)]
    taken = set(choice.involved)
    free = [c for c in range(k) if c not in taken]
    rng.shuffle(free)
    slots = set(rng.sample(range(k), len(touched)))
    line, t_iter, f_iter = [], iter(touched), iter(free)
    for p in range(k):
        line.append(next(t_iter) if p in slots else next(f_iter))
    return line
