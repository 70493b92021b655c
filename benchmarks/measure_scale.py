"""Scale benchmark for ``satorder.measure`` and the dimension search at 50,000 items.

Three invented orders (seeded, generated here):

* ``union``: a disjoint union of 500 random 2-dimensional orders of 100 items each;
* ``bipartite``: a random height-2 order with 1,000,000 ordered pairs (25,000 below 25,000);
* ``band``: one connected 2-dimensional order — item i at (i, 50000 − i + noise), ordered by
  dominance, so only items within a narrow band are comparable.

Run: ``python benchmarks/measure_scale.py union|bipartite|band`` (prints seconds per stage,
the figures, and the time of the independent check).  Not part of the test suite.
"""

from __future__ import annotations

import random
import sys
import time

from satorder.certify.measure import check_measures
from satorder.measure.summary import measure


def union(rng, parts=500, size=100):
    succ = [set() for _ in range(parts * size)]
    for p in range(parts):
        ids = list(range(p * size, (p + 1) * size))
        rng.shuffle(ids)
        y = list(range(size))
        rng.shuffle(y)
        for i in range(size):
            for j in range(i + 1, size):
                if y[i] < y[j]:
                    succ[ids[i]].add(ids[j])
    return succ


def bipartite(rng, n=50_000, pairs=1_000_000):
    half = n // 2
    succ = [set() for _ in range(n)]
    count = 0
    while count < pairs:
        a, b = rng.randrange(half), half + rng.randrange(n - half)
        if b not in succ[a]:
            succ[a].add(b)
            count += 1
    return succ


def band(rng, n=50_000, noise=20):
    y = [n - i + rng.uniform(-noise, noise) for i in range(n)]
    succ = [set() for _ in range(n)]
    for i in range(n):
        for j in range(i + 1, min(n, i + 2 * noise + 2)):
            if y[i] < y[j]:
                succ[i].add(j)
    return succ


def main(kind: str) -> None:
    rng = random.Random(5)
    t = time.perf_counter()
    succ = {"union": union, "bipartite": bipartite, "band": band}[kind](rng)
    print(f"{kind}: {len(succ)} items, {sum(map(len, succ))} ordered pairs "
          f"(generated in {time.perf_counter() - t:.1f}s)", flush=True)
    t, c = time.perf_counter(), time.process_time()
    m = measure(succ)
    print(f"measure {time.perf_counter() - t:.1f}s wall, {time.process_time() - c:.1f}s CPU; "
          f"stages (wall) {m.stats}", flush=True)
    d = m.dimension
    print(f"height {m.height.value}, width {m.width.value}, dimension {d.status} "
          f"[{d.lower}, {d.upper}], split {d.stats}, notes {d.notes}", flush=True)
    t, c = time.perf_counter(), time.process_time()
    check_measures(succ, m)
    print(f"independent check {time.perf_counter() - t:.1f}s wall, "
          f"{time.process_time() - c:.1f}s CPU", flush=True)


if __name__ == "__main__":
    main(sys.argv[1] if len(sys.argv) > 1 else "union")
