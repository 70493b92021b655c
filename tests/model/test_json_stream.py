"""The streamed JSON writer produces exactly the document json.dumps would."""

from __future__ import annotations

import io
import json

import numpy as np
import pytest

from satorder import Problem, solve
from satorder.model import json_stream
from satorder.model.adjacency import CsrSets


@pytest.mark.parametrize("chunk", [1, 3, 1 << 16])
def test_pair_list_from_arrays_and_from_sets_match_json_dumps(monkeypatch, chunk):
    monkeypatch.setattr(json_stream, "CHUNK_PAIRS", chunk)
    monkeypatch.setattr(json_stream, "SMALL_PAIRS", 0)
    rnd = np.random.default_rng(chunk)
    for _ in range(20):
        n = int(rnd.integers(1, 30))
        codes = np.unique(rnd.integers(0, n * n, int(rnd.integers(0, 60))))  # distinct arcs
        tails, heads = codes // n, codes % n
        names = [f'stall "{i}"' if i % 3 else f"é{i}\\" for i in range(n)]
        compact = CsrSets.from_arcs(n, tails, heads)
        want = [[names[a], names[b]] for a in range(n) for b in compact.csr()[1][
            compact.csr()[0][a]:compact.csr()[0][a + 1]].tolist()]
        for succ in (compact, [list(r) for r in CsrSets(*compact.csr()).sets()]):
            buf = io.BytesIO()
            json_stream.write_document({"order": json_stream.PairList(names, succ)}, buf.write)
            got = json.loads(buf.getvalue())["order"]
            assert sorted(map(tuple, got)) == sorted(map(tuple, want))
            if succ is compact:
                assert got == want  # row by row, in the arrays' order


def test_answer_json_text_and_extra_fields():
    # divisibility on 1..30 is a partial order, so its comparable pairs have an answer
    pairs = [(f"bay{a}", f"bay{b}") for a in range(1, 31) for b in range(a + 1, 31) if b % a == 0]
    ans = solve(Problem.from_lists(comparable=pairs))
    buf = io.BytesIO()
    ans.write_json(buf.write, extra={"note": [1, 2], "more_pairs": json_stream.PairList(
        ans.problem.items, [set() for _ in ans.problem.items])})
    doc = json.loads(buf.getvalue())
    plain = ans.to_json()
    assert list(doc)[:2] == ["status", "order"] and doc["note"] == [1, 2]
    assert doc["more_pairs"] == [] and list(doc)[-2:] == ["note", "more_pairs"]
    assert sorted(map(tuple, doc.pop("order"))) == sorted(map(tuple, plain.pop("order")))
    doc.pop("note"), doc.pop("more_pairs")
    assert doc == plain
    assert buf.getvalue().endswith(b"}\n") and buf.getvalue().count(b"\n") == 1


def test_compact_views_match_the_views_of_order_views():
    # levels, covering pairs and sequence computed on the arrays in one compiled loop against
    # satorder.model.order_views (sets below 20,000 pairs, numpy/scipy above)
    from satorder.jit import HAVE_NUMBA
    from satorder.model import order_views
    from satorder.model.order import transitive_closure
    from satorder.model.views_compact import compact_views

    if not HAVE_NUMBA:
        pytest.skip("the compiled views need numba")
    rnd = np.random.default_rng(12)
    for n, p in [(1, 0.0), (5, 0.5), (30, 0.1), (60, 0.3), (240, 0.9)]:
        for _ in range(4):
            arcs = [(a, b) for a in range(n) for b in range(a + 1, n) if rnd.random() < p]
            perm = rnd.permutation(n).tolist()  # ids in no particular order
            succ = transitive_closure(n, [(perm[a], perm[b]) for a, b in arcs])
            names = [f"stall {i}" for i in range(n)]
            quoted = [json.dumps(x) for x in names]
            want = json.loads("{" + order_views.views_json(succ, quoted) + "}")
            buf = io.BytesIO()
            json_stream.write_document(compact_views(CsrSets.from_sets(succ), names), buf.write)
            assert json.loads(buf.getvalue()) == want, (n, p)
