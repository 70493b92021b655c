"""A generated problem and what is known about it by construction, plus the small random
building blocks the families share (relabelling, random orders, bipartite pairs).
"""

from __future__ import annotations

import json
import math
import random
from dataclasses import dataclass, field
from typing import Any

from satorder.model.requirement import Status


@dataclass
class Instance:
    """A generated problem over items ``0..n-1`` plus what is known about it by construction.

    ``us``/``vs`` are the comparable pairs (parallel lists).  ``incomparable`` ``None`` means
    every other pair must stay unordered; otherwise it lists those pairs and the rest are open.
    ``names[i]`` is the item's written name.  The lists are written as given, repeats and
    clashes included (the ``merged-evidence`` family has both).
    """

    family: str
    seed: int
    params: dict[str, Any]
    n: int
    us: list[int]
    vs: list[int]
    names: list[str]
    incomparable: list[tuple[int, int]] | None = None
    fixed: list[tuple[int, int]] = field(default_factory=list)
    forbidden: list[tuple[int, int]] = field(default_factory=list)
    prefer: list[tuple[int, int, int]] = field(default_factory=list)
    expected_status: Status | None = None
    expected_count: int | None = None
    expected_cost: int | None = None
    cost_at_most: int | None = None
    planted: list[int] | None = None
    planted_kind: str | None = None
    comparable_pairs: int | None = None  # distinct comparable pairs, when us/vs repeat some

    @property
    def num_pairs(self) -> int:
        """Comparable pairs of the problem (``us``/``vs`` may name one twice, as merged
        evidence does; then ``comparable_pairs`` holds the distinct count)."""
        return len(self.us) if self.comparable_pairs is None else self.comparable_pairs

    @property
    def is_plain(self) -> bool:
        return self.incomparable is None and not (self.fixed or self.forbidden or self.prefer)

    def to_dict(self) -> dict[str, Any]:
        """The JSON problem (version 1 contract)."""
        nm = self.names
        doc: dict[str, Any] = {
            "comment": f"generated: family {self.family}, seed {self.seed}, "
            + ", ".join(f"{k} {v}" for k, v in self.params.items()),
            "items": sorted(nm, key=_name_key),
            "comparable": [[nm[u], nm[v]] for u, v in zip(self.us, self.vs)],
        }
        if self.incomparable is not None:
            doc["incomparable"] = [[nm[u], nm[v]] for u, v in self.incomparable]
        if self.fixed:
            doc["fixed"] = [[nm[u], nm[v]] for u, v in self.fixed]
        if self.forbidden:
            doc["forbidden"] = [[nm[u], nm[v]] for u, v in self.forbidden]
        if self.prefer:
            doc["prefer"] = [
                {"before": nm[u], "after": nm[v], "weight": w} for u, v, w in self.prefer
            ]
        return doc

    def to_json_text(self) -> str:
        doc = self.to_dict()
        # one key per line keeps files readable and diffs small
        body = ",\n".join(
            f"{json.dumps(k)}: {json.dumps(v, separators=(',', ':'))}" for k, v in doc.items()
        )
        return "{\n" + body + "\n}\n"

    def to_edge_list(self) -> str:
        if not self.is_plain:
            raise ValueError("only plain problems can be written as edge lists")
        nm = self.names
        return "".join([f"{nm[u]} {nm[v]}\n" for u, v in zip(self.us, self.vs)])

    def manifest_entry(self, file: str) -> dict[str, Any]:
        nm = self.names
        entry: dict[str, Any] = {
            "file": file,
            "family": self.family,
            "seed": self.seed,
            "params": self.params,
            "item_count": self.n,
            "comparable_pairs": self.num_pairs,
            "expected_status": self.expected_status,
            "expected_count": self.expected_count,
        }
        c = self.expected_count
        if c is not None and c.bit_length() > 3000:
            # past ~900 digits an exact integer is unwieldy in JSON (and Python refuses to
            # print integers over 4,300 digits by default): record its size instead
            entry["expected_count"] = None
            entry["expected_count_log10"] = round(_log10(c), 3)
        if self.expected_cost is not None:
            entry["expected_cost"] = self.expected_cost
        if self.cost_at_most is not None:
            entry["cost_at_most"] = self.cost_at_most
        if self.planted is not None:
            entry["planted"] = {"kind": self.planted_kind, "items": [nm[i] for i in self.planted]}
        return entry


def _log10(x: int) -> float:
    shift = max(0, x.bit_length() - 64)
    return math.log10(x >> shift) + shift * math.log10(2)


def _name_key(name: str):
    return (len(name), name)


# --------------------------------------------------------------------------- building blocks
def _relabel(n: int, rng: random.Random) -> list[str]:
    perm = list(range(n))
    rng.shuffle(perm)
    return [str(p) for p in perm]


def _bernoulli_pairs(n: int, p: float, rng: random.Random):
    """Each pair ``(w, v)``, ``w < v < n``, independently with probability ``p``, in time
    proportional to the pairs drawn (geometric skipping; Batagelj & Brandes, "Efficient
    generation of large random networks", Phys. Rev. E 71 (2005))."""
    if p <= 0 or n < 2:
        return
    if p >= 1:
        for v in range(1, n):
            for w in range(v):
                yield w, v
        return
    lp = math.log(1.0 - p)
    v, w = 1, -1
    while v < n:
        w += 1 + int(math.log(1.0 - rng.random()) / lp)
        while w >= v and v < n:
            w -= v
            v += 1
        if v < n:
            yield w, v


def _order_closure(n: int, p: float, rng: random.Random) -> list[int]:
    """Random graph order on hidden positions ``0..n-1``: ``up[w]`` is the bitset of items above
    ``w`` in the transitive closure of random arcs ``w→v`` (``w < v``) drawn with probability
    ``p``."""
    direct: list[list[int]] = [[] for _ in range(n)]
    for w, v in _bernoulli_pairs(n, p, rng):
        direct[w].append(v)
    up = [0] * n
    for w in range(n - 1, -1, -1):
        acc = 0
        for v in direct[w]:
            acc |= up[v] | (1 << v)
        up[w] = acc
    return up


def _bits(x: int) -> list[int]:
    out = []
    while x:
        low = x & -x
        out.append(low.bit_length() - 1)
        x ^= low
    return out


def _order_pairs(n: int, degree: float, rng: random.Random, offset: int = 0):
    """Comparable pairs (lower, upper) of a random graph order on ``n`` hidden positions."""
    p = min(1.0, degree / max(1, n - 1))
    up = _order_closure(n, p, rng)
    us: list[int] = []
    vs: list[int] = []
    for w in range(n):
        above = _bits(up[w])
        us.extend([w + offset] * len(above))
        vs.extend([a + offset for a in above])
    return us, vs


def _finish(family, seed, params, n, us, vs, rng, **known) -> Instance:
    return Instance(family, seed, params, n, us, vs, _relabel(n, rng), **known)


def _neighbours(n: int, us: list[int], vs: list[int]) -> list[set[int]]:
    adj: list[set[int]] = [set() for _ in range(n)]
    for u, v in zip(us, vs):
        adj[u].add(v)
        adj[v].add(u)
    return adj


def _components_with_edges(n: int, us: list[int], vs: list[int]) -> int:
    """Number of connected components that contain at least one edge (scipy)."""
    if not us:
        return 0
    import numpy as np
    from scipy.sparse import coo_matrix
    from scipy.sparse.csgraph import connected_components

    u = np.asarray(us, dtype=np.int64)
    v = np.asarray(vs, dtype=np.int64)
    g = coo_matrix((np.ones(len(u), dtype=np.int8), (u, v)), shape=(n, n))
    _, label = connected_components(g, directed=False)
    return len(np.unique(label[u]))


def _distinct_codes(total: int, m: int, rng: random.Random) -> list[int]:
    if m > total // 2:
        return sorted(rng.sample(range(total), m))
    seen: set[int] = set()
    rnd = rng.random
    while len(seen) < m:
        seen.update([int(rnd() * total) for _ in range(m - len(seen))])
    return sorted(seen)
