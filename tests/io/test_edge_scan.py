"""The compiled edge-list scanner against its pure-Python twin and against networkx."""

from __future__ import annotations

import random

import networkx as nx
import pytest

from satorder.errors import InputError
from satorder.io import readers
from satorder.io.edge_scan import compact_problem, scan_tokens
from satorder.jit import HAVE_NUMBA
from satorder.model.adjacency import CsrSets

pytestmark = pytest.mark.skipif(not HAVE_NUMBA, reason="the compiled scanner needs numba")


@pytest.fixture(autouse=True)
def _scan_every_size(monkeypatch):
    monkeypatch.setattr(readers, "SCAN_BYTES", 0)  # small files too go to the scanner here

# tokens and separators that exercise comments, CRLF, repeats, long and non-ASCII names
PIECES = ["a", "b", "c", "kiln", "loom", "quay-north-gate", "é", "naïve", "x#y", " ", "\t",
          "\n", "\r\n", "#", "  ", "\x0b", "\x1c", "a\u00a0b"]


def _outcome(parse, text):
    try:
        p = parse(text, "<t>")
    except InputError as exc:
        return str(exc)
    return p.items, [sorted(s) for s in p.adj]


def test_scanner_and_text_reader_agree_on_random_text():
    # the same items (in first-appearance order), pairs and error messages, line numbers
    # included; "a\u00a0b" sends a text to the text reader (non-ASCII white space)
    rnd = random.Random(16)
    compared = 0
    for _ in range(1500):
        text = "".join(rnd.choice(PIECES) for _ in range(rnd.randint(0, 40)))
        fast = _outcome(readers.parse_edge_list, text)
        slow = _outcome(readers.parse_edge_list_text, text)
        assert fast == slow, repr(text)
        compared += not isinstance(fast, str)
    assert compared > 100  # enough well-formed files among them


def test_scanner_agrees_with_networkx_read_edgelist(tmp_path):
    # networkx reads the same file into the same graph (names as strings)
    rnd = random.Random(3)
    names = [f"crate-{i}" if i % 4 else str(i) for i in range(300)]  # short and long names
    lines = []
    for _ in range(2000):
        a, b = rnd.sample(names, 2)
        lines.append(f"{a} {b}")
    f = tmp_path / "g.txt"
    f.write_text("\n".join(lines) + "\n")
    p = readers.read_problem(f)
    assert isinstance(p.adj, CsrSets) and p.adj.is_compact
    g = nx.read_edgelist(f)
    assert set(p.items) == set(g.nodes)
    mine = {frozenset((p.items[a], p.items[b])) for a, b in p.comparable_pairs()}
    assert mine == {frozenset(e) for e in g.edges()}
    assert p.num_comparable == g.number_of_edges()


def test_many_items_grow_the_table_and_keep_first_appearance_order():
    names = [f"v{i}" for i in range(20000)] + [f"item-with-a-long-name-{i}" for i in range(3000)]
    order = names[:]
    random.Random(5).shuffle(order)
    text = "".join(f"{a} {b}\n" for a, b in zip(order[::2], order[1::2]))
    items, ids = scan_tokens(text.encode())
    assert items == order[: len(items)] and len(items) == len(order) - len(order) % 2
    assert ids.tolist() == list(range(len(items)))


@pytest.mark.parametrize(
    "text,message",
    [
        ("a b\nb b\n", "line 2: pair names 'b' twice"),
        ("a b\nc\n", "line 2: expected two item names, found 1 field;"),
        ("a b c\n", "line 1: expected two item names, found 3 fields"),
        ("# only a comment\n\n", "no pairs found"),
    ],
)
def test_scanner_errors_name_the_line(text, message):
    with pytest.raises(InputError, match=message):
        scan_tokens(text.encode(), "<t>")


def test_repeated_pairs_count_once_and_rows_are_sorted():
    items, ids = scan_tokens(b"c a\na c\nb a\nc b\na b\n")
    p = compact_problem(items, ids)
    indptr, indices = p.adj.csr()
    assert p.num_comparable == 3
    rows = [indices[s:e].tolist() for s, e in zip(indptr[:-1], indptr[1:])]
    assert rows == [sorted(r) for r in rows] == [[1, 2], [0, 2], [0, 1]]


def test_whitespace_only_and_binary_files_are_refused(tmp_path):
    f = tmp_path / "blank.txt"
    f.write_text(" \n\t\n")
    with pytest.raises(InputError, match="file is empty"):
        readers.read_problem(f)


@pytest.mark.parametrize("text", [
    "a b\nb c\n# skip\nc a\nb a\n",
    "kiln loom  # first\nloom quay\n\nloom kiln\nquay loom\nkiln quay\n",
])
def test_compiled_path_gives_the_repeat_note_of_the_text_reader(tmp_path, monkeypatch, text):
    # both readers merge repeated pairs; the note naming the first repeat and the line it
    # repeats must be the same whichever reader read the file
    from satorder.io import readers

    f = tmp_path / "g.txt"
    f.write_text(text)
    monkeypatch.setattr(readers, "SCAN_BYTES", 1 << 40)
    plain = readers.read_problem(f)
    assert isinstance(plain.adj, list)
    monkeypatch.setattr(readers, "SCAN_BYTES", 0)
    scanned = readers.read_problem(f)
    assert scanned.adj.is_compact
    assert plain.notes and scanned.notes == plain.notes
    assert "repeats line" in plain.notes[0]
