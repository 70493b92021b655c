"""The JSON reader's bulk path for long "comparable" lists gives the same problem as reading
the entries one by one, and leaves every malformed entry to the one-by-one path's message."""

from __future__ import annotations

import random

import pytest

from satorder.errors import InputError
from satorder.io.readers import problem_from_dict
from satorder.model.problem import ProblemBuilder


def _slow(doc):
    b = ProblemBuilder("<slow>")
    for name in doc.get("items", []):
        b.item(name, "items")
    for k, (a, c) in enumerate(doc["comparable"]):
        b.comparable(a, c, f"comparable[{k}]")
    for k, (a, c) in enumerate(doc.get("fixed", [])):
        b.fixed(a, c, f"fixed[{k}]")
    return b.build()


def test_bulk_comparable_equals_entry_by_entry():
    rng = random.Random(4)
    pairs = set()
    while len(pairs) < 3000:
        a, c = rng.sample(range(400), 2)
        pairs.add((f"u{a}", f"u{c}"))
    doc = {"items": ["lone", "u7"], "comparable": [list(p) for p in pairs] + [["u1", "u2"]] * 3,
           "fixed": [["u3", "lone"]]}
    fast, slow = problem_from_dict(doc), _slow(doc)
    assert fast.items == slow.items and fast.adj == slow.adj and fast.fixed == slow.fixed
    assert fast.index == slow.index


@pytest.mark.parametrize("bad, message", [
    (["u1", "u1"], "comparable[1500]: pair names 'u1' twice"),
    (["u1"], "comparable[1500]: expected a pair"),
    (["u1", ""], "comparable[1500]: item names must be non-empty strings"),
])
def test_bulk_path_leaves_errors_to_the_entry_by_entry_reader(bad, message):
    doc = {"comparable": [[f"a{k}", f"b{k}"] for k in range(1500)] + [bad]}
    with pytest.raises(InputError, match=message.replace("[", r"\[").replace("]", r"\]")):
        problem_from_dict(doc, "<doc>")
