"""Benchmark: exact order dimension past 40 items (part of ``make bench``).

* 40 random orders of 60–100 items, seeded, from the suite generator's ``order`` family
  (:func:`satorder.generate.families.generate`) at four densities; each graph is oriented by
  the forcing algorithm (dimension is the same for every transitive orientation of one
  comparability graph: Trotter, Moore & Sumner 1976, from memory).  Target: exact dimension
  with a realizer accepted by the independent check for at least 90 %, each within 60 s.
* Standard examples S_n, n = 3 … 10 (dimension n: Dushnik & Miller 1941) and crowns S_n^k,
  n ≥ 3, k ≥ 1, n + k ≤ 12 (dimension ⌈2(n+k)/(k+2)⌉: Trotter, *Combinatorics and Partially
  Ordered Sets*, 1992, from memory).  Target: the known value, each within 60 s.

Every case runs in a fresh process with a 60 s limit on the search; the time reported is the
search's own (``dimension()``), the independent check's time is reported beside it.
"""

from __future__ import annotations

import json
import math
import subprocess
import sys

LIMIT = 60.0
DEGREES = (2.0, 4.0, 7.0, 12.0)

_CASE = r'''
import json, sys, time
from satorder.certify.measure import check_dimension
from satorder.measure.dimension import dimension
spec = json.loads(sys.argv[1])
if spec["kind"] == "order":
    from satorder import problem_from_dict, solve
    from satorder.generate.families import generate
    inst = generate("order", spec["items"], spec["seed"], degree=spec["degree"])
    succ = solve(problem_from_dict(inst.to_dict())).succ
elif spec["kind"] == "standard":
    k = spec["n"]
    succ = [set(range(k, 2 * k)) - {k + i} for i in range(k)] + [set() for _ in range(k)]
else:
    m = spec["n"] + spec["k"]
    succ = [{m + j for j in range(m) if (j - i) % m > spec["k"]} for i in range(m)]
    succ += [set() for _ in range(m)]
t = time.perf_counter()
d = dimension(succ, time_limit=float(sys.argv[2]))
sec = time.perf_counter() - t
t = time.perf_counter()
check_dimension(succ, d)
print(json.dumps({"status": d.status, "value": d.value, "bounds": [d.lower, d.upper],
                  "seconds": sec, "check_seconds": time.perf_counter() - t,
                  "items": len(succ), "notes": d.notes}))
'''


def cases() -> list[dict]:
    out = []
    for k in range(40):
        out.append({"kind": "order", "items": 60 + (k * 17) % 41, "seed": 1000 + k,
                    "degree": DEGREES[k % len(DEGREES)]})
    for n in range(3, 11):
        out.append({"kind": "standard", "n": n, "expected": n})
    for n in range(3, 12):
        for k in range(1, 13 - n):
            out.append({"kind": "crown", "n": n, "k": k,
                        "expected": math.ceil(2 * (n + k) / (k + 2))})
    return out


def run_case(spec: dict) -> dict:
    res = subprocess.run([sys.executable, "-c", _CASE, json.dumps(spec), str(LIMIT)],
                         capture_output=True, text=True, timeout=LIMIT * 4)
    if res.returncode != 0:
        return {"status": "error", "error": res.stderr.strip().splitlines()[-1:]}
    return json.loads(res.stdout)


def measure(console) -> dict:
    rows = []
    for spec in cases():
        name = (f"order n={spec['items']} degree={spec['degree']} seed={spec['seed']}"
                if spec["kind"] == "order" else
                f"S_{spec['n']}" if spec["kind"] == "standard" else f"S_{spec['n']}^{spec['k']}")
        with console.status(f"dimension: {name}"):
            got = run_case(spec)
        got["case"] = name
        got["kind"] = spec["kind"]
        if spec["kind"] == "order":
            got["ok"] = got["status"] == "exact" and got["seconds"] <= LIMIT
        else:
            got["expected"] = spec["expected"]
            got["ok"] = got.get("value") == spec["expected"] and got["seconds"] <= LIMIT
        rows.append(got)
        console.print(f"dimension {name}: {got.get('status')} {got.get('value')} "
                      f"{got.get('bounds')} in {got.get('seconds', 0):.2f} s "
                      f"(check {got.get('check_seconds', 0):.2f} s)")
    orders = [r for r in rows if r["kind"] == "order"]
    known = [r for r in rows if r["kind"] != "order"]
    exact = sum(r["ok"] for r in orders)
    return {"rows": rows, "random_exact": exact, "random_total": len(orders),
            "random_ok": exact >= 0.9 * len(orders),
            "known_ok": all(r["ok"] for r in known),
            "max_seconds": max(r.get("seconds", LIMIT) for r in rows)}
