"""Suites: named recipes of (family, sizes, seeds, parameters) written to a folder with a
``manifest.json`` that records each file's family, seed, size and expectations.
"""

from __future__ import annotations

import json
import os

from satorder.errors import InputError
from satorder.generate.families import generate
from satorder.io.files import atomic_write


# --------------------------------------------------------------------------- suites
def suite_specs(family: str, sizes, seeds, fmt: str = "json", **params) -> list[dict]:
    """One entry of a suite recipe per (size, seed): the family, its parameters and the format."""
    return [{"family": family, "items": n, "seed": s, "params": dict(params), "format": fmt}
            for n in sizes for s in seeds]


RECIPES: dict[str, list[dict]] = {
    # a handful of items: every family, expected counts small enough to check by brute force
    "small": (
        suite_specs("complete", [3, 4, 5, 6], [1])
        + suite_specs("bipartite", [6, 8, 12], [1, 2], degree=2.0)
        + suite_specs("series-parallel", [5, 7, 10], [1, 2, 3])
        + suite_specs("order", [8, 12, 20], [1, 2], degree=1.5)
        + suite_specs("order", [12, 20], [1], degree=6.0)
        + suite_specs("permutation", [8, 12], [1, 2])
        + suite_specs("interval-complement", [8, 12, 20], [1], length=0.2)
        + suite_specs("gnp", [12, 24], [1, 2], c=1.5)
        + suite_specs("gnp", [12, 24], [1, 2], c=3.0)
        + suite_specs("planted-hole", [12, 20], [1], length=5, joins=2)
        + suite_specs("planted-hole", [20], [1], length=7, joins=2)
        + suite_specs("planted-antihole", [14], [1], length=6, joins=1)
        + suite_specs("planted-antihole", [15], [1], length=7, joins=1)
        + suite_specs("side-constraints", [10, 15], [1, 2])
        + suite_specs("side-constraints", [12], [1], conflict="transitivity")
        + suite_specs("side-constraints", [12], [1], conflict="cycle", degree=5.0)
        + suite_specs("side-constraints", [12], [1], conflict="forcing")
        + suite_specs("open-pairs", [10, 15], [1])
        + suite_specs("open-pairs", [12], [1], conflict=True)
        + suite_specs("preferences", [8, 12], [1], count=5, consistent=True)
        + suite_specs("preferences", [8, 12], [1], count=5)
        + suite_specs("merged-evidence", [12, 16], [1])
        + suite_specs("merged-evidence", [12], [1, 2], disagree=1)
        + suite_specs("merged-evidence", [16], [1], disagree=4)
        + suite_specs("merged-evidence", [20], [1], disagree=2)
    ),
    # hundreds to a few thousand items, still small files
    "medium": (
        suite_specs("order", [300, 1000], [1], degree=1.5)
        + suite_specs("order", [120], [1], degree=8.0)
        + suite_specs("permutation", [200], [1], width=15)
        + suite_specs("bipartite", [2000], [1], degree=4.0)
        + suite_specs("interval-complement", [120], [1], length=0.3)
        + suite_specs("series-parallel", [60], [1, 2])
        + suite_specs("gnp", [300], [1], c=1.0)
        + suite_specs("gnp", [300], [1], c=2.0)
        + suite_specs("gnp", [1000], [1], c=0.6)
        + suite_specs("planted-hole", [1000], [1], base="bipartite", degree=4.0, length=5, joins=3)
        + suite_specs("planted-hole", [400], [1], base="order", degree=1.5, length=9, joins=3)
        + suite_specs("side-constraints", [80], [1], fixed=10, forbidden=10)
        + suite_specs("side-constraints", [80], [2], fixed=10, forbidden=10, conflict="forcing")
        + suite_specs("open-pairs", [40], [1], keep=0.6)
        + suite_specs("open-pairs", [40], [2], keep=0.6, conflict=True)
        + suite_specs("preferences", [60], [1], count=30, consistent=True)
        + suite_specs("preferences", [60], [2], count=30)
    ),
    # generated on demand (tens of MB): performance and scaling work
    "large": (
        suite_specs("bipartite", [50_000], [1], "edges", pairs=10_000)
        + suite_specs("bipartite", [50_000], [1], "edges", pairs=100_000)
        + suite_specs("bipartite", [50_000], [1], "edges", pairs=1_000_000)
        + suite_specs("blocks", [50_000], [1], "edges", block_size=100, degree=12.0)
        + suite_specs("planted-hole", [50_005], [1], "edges", base="blocks", block_size=100,
                 degree=12.0, length=5, joins=3)
        + suite_specs("order", [20_000], [1], "edges", degree=1.0)
        + suite_specs("permutation", [3000], [1], "edges", width=40)
        + suite_specs("open-pairs", [300], [1], keep=0.5)
        + suite_specs("side-constraints", [2000], [1], fixed=50, forbidden=50, conflict="forcing")
    ),
    # random graphs around the density where orientability stops
    "threshold": [
        spec for c in (0.5, 0.75, 0.9, 1.0, 1.1, 1.2, 1.3, 1.5, 2.0)
        for spec in suite_specs("gnp", [500], [1, 2, 3, 4, 5], "edges", c=c)
    ],
}


def instance_file_name(k: int, spec: dict) -> str:
    ext = "txt" if spec.get("format", "json") == "edges" else "json"
    return f"{k:03d}-{spec['family']}-n{spec['items']}-s{spec['seed']}.{ext}"


def make_suite(out_dir: str, specs: list[dict], name: str, command: str = "",
               progress=None) -> dict:
    """Generate every spec into ``out_dir`` and write its ``manifest.json``; return the manifest.

    Files named in an older manifest of the folder and no longer produced are removed.
    ``progress(k, total, file)`` is called after each file.
    """
    if os.path.exists(out_dir) and not os.path.isdir(out_dir):
        raise InputError(f"{out_dir}: exists and is not a folder; choose another output folder")
    os.makedirs(out_dir, exist_ok=True)
    old_files: set[str] = set()
    mpath = os.path.join(out_dir, "manifest.json")
    if os.path.exists(mpath):
        try:
            with open(mpath, encoding="utf-8") as f:
                old_files = {e["file"] for e in json.load(f).get("instances", [])}
        except (OSError, ValueError, KeyError, TypeError, AttributeError):
            old_files = set()
    entries = []
    for k, spec in enumerate(specs):
        inst = generate(spec["family"], spec["items"], spec["seed"], **spec.get("params", {}))
        file = instance_file_name(k, spec)
        text = inst.to_edge_list() if spec.get("format") == "edges" else inst.to_json_text()
        atomic_write(os.path.join(out_dir, file), text)
        entry = inst.manifest_entry(file)
        if spec.get("format") == "edges":  # isolated items do not appear in an edge list
            entry["items_in_file"] = len(set(inst.us) | set(inst.vs))
        entries.append(entry)
        if progress is not None:
            progress(k + 1, len(specs), file)
    for stale in old_files - {e["file"] for e in entries}:
        path = os.path.join(out_dir, os.path.basename(stale))
        if os.path.isfile(path):
            os.unlink(path)
    manifest = {"suite": name, "command": command, "instances": entries}
    atomic_write(mpath, json.dumps(manifest, indent=1) + "\n")
    return manifest
