"""Scale benchmark for ``satorder explain`` on a large graph with a planted odd hole.

Target (design notes): on 50,000 items and 1–1.6 million comparable pairs, ``explain`` finds a
small minimal obstruction (at most 12 items) within twice the time networkx's
``read_edgelist`` takes to load the same file, measured in the same run.

The instance is invented and seeded: :func:`satorder.generate.planted` with 500 dense random
orders of 100 items each (``blocks``) and a chordless 5-cycle on new items joined to the rest by
40 edges.  Run::

    python benchmarks/explain_scale.py [FILE] [--items 50000] [--degree 10] [--joins 40]

Without FILE the instance is written to a temporary file first.  Prints the networkx load
time, the wall time of ``satorder explain FILE --json`` in a fresh process (reading, forcing,
obstruction, core, derivation and every check included), their ratio, the peak memory of that
process, and the obstruction found.  Not part of the test suite.
"""

from __future__ import annotations

import argparse
import json
import os
import resource
import subprocess
import sys
import tempfile
import time


def main() -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("file", nargs="?")
    ap.add_argument("--items", type=int, default=50_000)
    ap.add_argument("--degree", type=float, default=10.0)
    ap.add_argument("--joins", type=int, default=40)
    ap.add_argument("--seed", type=int, default=1)
    args = ap.parse_args()
    path = args.file
    if path is None:
        from satorder.generate import planted

        inst = planted(args.items, seed=args.seed, base="blocks", degree=args.degree,
                       joins=args.joins)
        fd, path = tempfile.mkstemp(suffix=".txt", prefix="explain-scale-")
        with os.fdopen(fd, "w") as f:
            f.write(inst.to_edge_list())
        print(f"instance: {inst.n} items, {inst.num_pairs} comparable pairs, planted "
              f"{inst.planted_kind} on {sorted(inst.names[i] for i in inst.planted)}")
    import networkx as nx

    t = time.perf_counter()
    g = nx.read_edgelist(path)
    t_nx = time.perf_counter() - t
    del g
    t = time.perf_counter()
    run = subprocess.run([sys.executable, "-m", "satorder", "explain", path, "--json"],
                         capture_output=True, text=True)
    t_ex = time.perf_counter() - t
    if run.returncode != 0:
        print(run.stderr)
        return 1
    doc = json.loads(run.stdout)
    peak = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss / 1024
    print(f"networkx read_edgelist: {t_nx:.1f} s")
    print(f"satorder explain --json: {t_ex:.1f} s  (ratio {t_ex / t_nx:.2f}, target <= 2)")
    print(f"peak memory of explain: {peak:.0f} MB")
    print(f"status {doc['status']}; obstruction of {len(doc.get('obstruction') or [])} items: "
          f"{doc.get('obstruction')}; core of {len(doc.get('core') or [])} requirements")
    print(f"stages (s): {doc['stats']}")
    if args.file is None:
        os.unlink(path)
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
