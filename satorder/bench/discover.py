"""Finding the instances of a benchmark: problem files and folders, with the expectations a
suite's ``manifest.json`` records, and the plan of (instance, back end) runs.
"""

from __future__ import annotations

import json
import os
from collections.abc import Iterable
from dataclasses import dataclass

from satorder.errors import InputError

PROBLEM_EXTENSIONS = (".json", ".txt", ".edges", ".g6", ".graph6")


EXPECTED_KEYS = ("family", "expected_status", "expected_count", "expected_cost", "cost_at_most")


# --------------------------------------------------------------------------- instances
@dataclass
class Run:
    """One (instance, back end) to run; ``instance`` is the key written in rows."""

    instance: str
    path: str
    backend: str
    expected: dict

    @property
    def key(self) -> tuple[str, str]:
        return (self.instance, self.backend)


def discover(args: Iterable[str]) -> list[tuple[str, str, dict]]:
    """Problems named by folders and files: ``(instance key, absolute path, manifest entry)``.

    A folder with a ``manifest.json`` contributes the files its manifest lists, with their
    expectations; any other folder contributes its problem files (by extension), sorted.
    The key is the path as given, normalised.
    """
    found: list[tuple[str, str, dict]] = []
    seen: set[str] = set()
    for arg in args:
        if os.path.isdir(arg):
            manifest = _read_manifest(arg)
            if manifest is not None:
                pairs = []
                for k, entry in enumerate(manifest):
                    if not isinstance(entry, dict) or not isinstance(entry.get("file"), str):
                        raise InputError(f"{arg}/manifest.json: instances[{k}]: needs a \"file\"")
                    pairs.append((entry["file"], entry))
            else:
                pairs = [(f, {}) for f in sorted(os.listdir(arg))
                         if f.lower().endswith(PROBLEM_EXTENSIONS) and f != "manifest.json"
                         and os.path.isfile(os.path.join(arg, f))]
            for f, entry in pairs:
                path = os.path.join(arg, f)
                if not os.path.isfile(path):
                    raise InputError(f"{path}: listed in {arg}/manifest.json but missing; "
                                     "regenerate the suite")
                _add(found, seen, path, entry)
        elif os.path.isfile(arg):
            folder, name = os.path.split(arg)
            manifest = _read_manifest(folder or ".") or []
            entry = next((e for e in manifest if isinstance(e, dict) and e.get("file") == name),
                         {})
            _add(found, seen, arg, entry)
        else:
            raise InputError(f"{arg}: no such file or folder; give suite folders or problem files")
    if not found:
        raise InputError("no problems found in " + ", ".join(args) +
                         f"; a folder needs a manifest.json or files ending in "
                         f"{', '.join(PROBLEM_EXTENSIONS)}")
    return found


def _add(found, seen, path, entry) -> None:
    key = os.path.normpath(path)
    if key not in seen:
        seen.add(key)
        found.append((key, os.path.abspath(path),
                      {k: entry[k] for k in EXPECTED_KEYS if entry.get(k) is not None}))


def _read_manifest(folder: str) -> list | None:
    path = os.path.join(folder, "manifest.json")
    if not os.path.isfile(path):
        return None
    try:
        with open(path, encoding="utf-8") as f:
            doc = json.load(f)
    except (OSError, ValueError) as exc:
        raise InputError(f"{path}: not a readable JSON manifest ({exc}); fix or remove it"
                         ) from None
    if not isinstance(doc, dict) or not isinstance(doc.get("instances"), list):
        raise InputError(f'{path}: a manifest needs an "instances" list')
    return doc["instances"]


# --------------------------------------------------------------------------- running
def plan(instances: list[tuple[str, str, dict]], backends: list[str],
         done: Iterable[tuple[str, str]]) -> list[Run]:
    """Runs still to do: every (instance, back end) not yet in ``done``."""
    skip = set(done)
    return [Run(key, path, b, expected) for key, path, expected in instances for b in backends
            if (key, b) not in skip]
