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
    if "items" in doc:
        b.close_items()
    for k, (a, c) in enumerate(doc["comparable"]):
        b.comparable(a, c, f"comparable[{k}]")
    for k, (a, c) in enumerate(doc.get("fixed", [])):
        b.fixed(a, c, f"fixed[{k}]")
    return b.build()


@pytest.mark.parametrize("listed", [False, True])
@pytest.mark.parametrize("repeats", [0, 3])
def test_bulk_comparable_equals_entry_by_entry(monkeypatch, listed, repeats):
    # with or without an explicit item list, with or without repeated pairs (which the
    # one-by-one path merges with a note): the same problem and the same notes
    rng = random.Random(4)
    pairs = set()
    while len(pairs) < 3000:
        a, c = rng.sample(range(400), 2)
        if (f"u{c}", f"u{a}") not in pairs:
            pairs.add((f"u{a}", f"u{c}"))
    comparable = [list(p) for p in pairs] + [["u1", "u2"]] * repeats
    doc = {"comparable": comparable, "fixed": [["u3", "u1"]]}
    if listed:
        doc["items"] = ["lone", "u7"] + sorted({x for p in comparable for x in p} - {"u7"})
    from satorder.io import readers

    took = []
    bulk = readers._bulk_comparable
    monkeypatch.setattr(readers, "_bulk_comparable",
                        lambda b, v: took.append(bulk(b, v)) or took[-1])
    fast, slow = problem_from_dict(doc, "<slow>"), _slow(doc)
    assert took == [repeats == 0]  # repeats go the entry-by-entry way, for the note
    assert fast.items == slow.items and fast.adj == slow.adj and fast.fixed == slow.fixed
    assert fast.index == slow.index and fast.notes == slow.notes
    assert bool(fast.notes) == (repeats > 0)


def test_bulk_path_leaves_a_name_missing_from_items_to_the_entry_by_entry_reader():
    doc = {"items": [f"a{k}" for k in range(1500)] + [f"b{k}" for k in range(1499)],
           "comparable": [[f"a{k}", f"b{k}"] for k in range(1500)]}
    with pytest.raises(InputError, match=r"comparable\[1499\]: 'b1499' is not in \"items\""):
        problem_from_dict(doc, "<doc>")


@pytest.mark.parametrize("bad, message", [
    (["u1", "u1"], "comparable[1500]: pair names 'u1' twice"),
    (["u1"], "comparable[1500]: expected a pair"),
    (["u1", ""], "comparable[1500]: item names must be non-empty strings"),
])
def test_bulk_path_leaves_errors_to_the_entry_by_entry_reader(bad, message):
    doc = {"comparable": [[f"a{k}", f"b{k}"] for k in range(1500)] + [bad]}
    with pytest.raises(InputError, match=message.replace("[", r"\[").replace("]", r"\]")):
        problem_from_dict(doc, "<doc>")
