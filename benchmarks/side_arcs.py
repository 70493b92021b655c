"""Benchmark: fixed arcs on the 50,000-item / 1.6M-pair dense-blocks instance, measured in one
run against ``satorder solve`` on the same graph without arcs (part of ``make bench``).

Three JSON problems are written (seeded, into the work folder) from the edge list:

* ``plain``: the comparable pairs alone (the baseline; the edge list itself is solved too, and
  the ratios to it, which add JSON parsing to the arcs' cost, are recorded beside);
* ``arcs``: the same plus 50 fixed arcs drawn from a valid answer (the reverse of the answer the
  forcing algorithm finds, itself an answer, so that every node an arc lands on has to change
  its choice);
* ``contradicting``: ``arcs`` plus one fixed arc ``c < a`` where a fixed arc ``a < b`` forces
  ``a < c`` by one Γ step (``{b, c}`` must stay unordered).

Targets (issue 16): ``solve arcs`` ≤ 1.3× ``solve plain``; ``explain contradicting`` finds a core
of at most 6 requirements within 2× ``solve plain``.  Target (issue 13): ``settled arcs --json``
(exact shares of all 1.6M pairs, written as JSON) ≤ 1.5× ``solve arcs --json`` on the same file.
Each command runs in its own process (peak memory from ``os.wait4``), one after the other in the
same run.
"""

from __future__ import annotations

import json
import os
import random
import sys

ARCS = 50


def write_problems(edges_path: str, work: str) -> dict[str, str]:
    """The three JSON problems beside ``edges_path`` (reused when present)."""
    base = os.path.splitext(os.path.basename(edges_path))[0]
    paths = {k: os.path.join(work, f"{base}-{k}.json") for k in ("plain", "arcs", "contradicting")}
    if all(os.path.exists(p) for p in paths.values()):
        return paths
    from satorder import read_problem, solve

    p = read_problem(edges_path)
    ans = solve(p)
    rng = random.Random(16)
    order = [(b, a) for a, b in ans.pairs()]  # the reverse answer: also an answer
    fixed = rng.sample(order, ARCS)
    above = set(order)
    extra = None
    for a, b in fixed:
        for c in sorted(p.adj[a]):
            if c != b and c not in p.adj[b] and (a, c) in above:
                extra = (c, a)
                break
        if extra:
            break
    assert extra is not None, "no arc forced by a single Γ step found"
    names = p.items
    comparable = [[names[a], names[b]] for a, b in p.comparable_pairs()]
    docs = {
        "plain": {"comparable": comparable},
        "arcs": {"comparable": comparable, "fixed": [[names[a], names[b]] for a, b in fixed]},
    }
    docs["contradicting"] = dict(docs["arcs"], fixed=docs["arcs"]["fixed"]
                                 + [[names[extra[0]], names[extra[1]]]])
    for key, doc in docs.items():
        with open(paths[key], "w", encoding="utf-8") as f:
            json.dump(doc, f, separators=(",", ":"))
    return paths


def measure(edges_path: str, work: str, run, console) -> dict:
    """Run the three commands; ``run(cmd, stdout_path)`` returns (seconds, peak bytes, exit)."""
    paths = write_problems(edges_path, work)
    exe = [sys.executable, "-m", "satorder"]
    paths["edges"] = edges_path
    got = {}
    for key, command, file in (("edges", "solve", "edges"), ("plain", "solve", "plain"),
                               ("arcs", "solve", "arcs"), ("contradicting", "explain",
                                                           "contradicting"),
                               ("settled", "settled", "arcs")):
        out = os.path.join(work, f"arcs-{key}.answer.json")
        with console.status(f"fixed arcs: satorder {command} {file}"):
            sec, rss, code = run(exe + [command, paths[file], "--json"], out)
        with open(out, encoding="utf-8") as f:
            doc = json.load(f)
        got[key] = {"seconds": sec, "peak_bytes": rss, "exit": code, "status": doc["status"],
                    "verified": doc.get("verified"), "engine": doc.get("engine"),
                    "core_size": len(doc.get("core") or []) or None}
        if command == "settled":
            got[key].update(method=doc.get("method"), exact=doc.get("exact"),
                            pairs=len(doc.get("pairs") or []),
                            comparable_pairs=doc.get("comparable_pairs"),
                            settled_pairs=doc.get("settled_before", 0)
                            + doc.get("settled_unordered", 0))
        console.print(f"fixed arcs, {key}: satorder {command} {sec:.2f} s, peak "
                      f"{rss / (1 << 30):.2f} GB, {doc['status']}"
                      + (f", core of {len(doc['core'])}" if doc.get("core") else ""))
    edges, plain, arcs, contra, shares = (got[k] for k in ("edges", "plain", "arcs",
                                                           "contradicting", "settled"))
    # the target compares like with like: the same JSON problem without its arcs; the ratio to
    # the edge list (no JSON parsing) is recorded beside it
    row = {"instance": os.path.basename(edges_path), "fixed_arcs": ARCS, **got,
           "arcs_ratio": arcs["seconds"] / plain["seconds"],
           "explain_ratio": contra["seconds"] / plain["seconds"],
           "arcs_ratio_to_edge_list": arcs["seconds"] / edges["seconds"],
           "explain_ratio_to_edge_list": contra["seconds"] / edges["seconds"],
           "settled_ratio": shares["seconds"] / arcs["seconds"]}
    row["ok"] = (plain["status"] == "feasible" and edges["status"] == "feasible"
                 and arcs["status"] == "feasible"
                 and arcs["verified"] and arcs["engine"] == "decomposition"
                 and contra["status"] == "infeasible" and contra["verified"]
                 and (contra["core_size"] or 99) <= 6
                 and row["arcs_ratio"] <= 1.3 and row["explain_ratio"] <= 2.0)
    row["settled_ok"] = (shares["status"] == "feasible" and shares["verified"]
                         and shares["exact"] and shares["pairs"] == shares["comparable_pairs"] > 0
                         and row["settled_ratio"] <= 1.5)
    return row
