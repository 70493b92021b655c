"""Enumeration of answers against brute force over all labelled posets."""

from __future__ import annotations

import itertools
import json
import random

from order_reference import all_posets, brute_count, random_requirements

from satorder import Problem
from satorder.certify.order import check_order
from satorder.cli.main import main
from satorder.errors import CertificateError
from satorder.sat.enumeration import EnumerationEnd, enumerate_orders


def brute_answers(p: Problem) -> set[frozenset]:
    n = p.n
    out = set()
    for rel in all_posets(n):
        succ = [set() for _ in range(n)]
        for a, b in rel:
            succ[a].add(b)
        try:
            check_order(p, succ)
        except CertificateError:
            continue
        out.add(rel)
    return out


def test_enumeration_lists_exactly_the_brute_force_answers():
    rng = random.Random(31)
    for trial in range(40):
        n = rng.randint(1, 5)
        p = random_requirements(n, rng, open_pairs=trial % 2 == 0)
        end = EnumerationEnd()
        got = [frozenset(o.pairs) for o in enumerate_orders(p, end=end)]
        assert end.complete and end.found == len(got)
        assert len(set(got)) == len(got)  # no answer twice
        assert set(got) == brute_answers(p)
        assert len(got) == brute_count(p)


def test_all_posets_on_four_items_from_the_empty_problem():
    # four items, every pair open: every labelled poset is an answer (OEIS A001035: 219)
    p = Problem.from_lists(items=list("abcd"), incomparable=[])
    end = EnumerationEnd()
    assert sum(1 for _ in enumerate_orders(p, end=end)) == 219 and end.complete


def test_limit_stops_early_and_knows_when_the_list_is_complete():
    k4 = Problem.from_lists(comparable=list(itertools.combinations("abcd", 2)))
    end = EnumerationEnd()
    assert len(list(enumerate_orders(k4, limit=7, end=end))) == 7
    assert not end.complete and end.reason == "limit"
    path = Problem.from_lists(comparable=[("a", "b"), ("b", "c")])
    end = EnumerationEnd()
    assert len(list(enumerate_orders(path, limit=2, end=end))) == 2
    assert end.complete  # exactly two answers: the limit happened to be the end


def test_cli_orders_streams_json_lines(tmp_path, capsys):
    path = tmp_path / "k3.txt"
    path.write_text("a b\nb c\na c\n")
    assert main(["orders", str(path), "--limit", "4"]) == 0
    lines = [json.loads(x) for x in capsys.readouterr().out.splitlines()]
    answers, end = lines[:-1], lines[-1]
    # K3: 3! = 6 linear orders (common practice); the limit keeps 4
    assert len(answers) == 4 and end == {**end, "end": True, "found": 4, "complete": False}
    seen = set()
    for doc in answers:
        assert doc["verified"] is True and len(doc["order"]) == 3
        seen.add(tuple(map(tuple, doc["order"])))
    assert len(seen) == 4
    assert main(["orders", str(path)]) == 0
    lines = [json.loads(x) for x in capsys.readouterr().out.splitlines()]
    assert lines[-1]["found"] == 6 and lines[-1]["complete"] is True
