"""Readers: JSON problems (version 1), plain edge lists and graph6.

Every reader validates as it goes and raises :class:`~satorder.errors.InputError` with a single
line naming the file and the line or entry at fault.  The format is chosen by extension
(``.json``, ``.g6``/``.graph6``; anything else is an edge list), except that a file whose first
non-blank character is ``{`` is always read as JSON.
"""

from __future__ import annotations

import difflib
import json
import os
import re
from itertools import chain, repeat
from typing import TYPE_CHECKING

from satorder.errors import InputError
from satorder.jit import HAVE_NUMBA
from satorder.model.problem import Problem, ProblemBuilder

MAX_BYTES = 1 << 30  # 1 GiB: beyond this a file is refused rather than exhausting memory
SCAN_BYTES = 1 << 20  # edge lists from 1 MiB up go to the compiled scanner (numba loads)
JSON_KEYS = ("items", "comparable", "incomparable", "fixed", "forbidden", "prefer", "weights",
             "version", "comment")
PREFER_KEYS = ("before", "after", "weight")
SMALL_TEXT = 1 << 16  # edge lists up to this many characters are read line by line, no numpy

if TYPE_CHECKING:
    import numpy as np


def read_problem(path: str | os.PathLike) -> Problem:
    """Read a problem file, choosing the format by extension or content."""
    path = os.fspath(path)
    data = _read_bytes(path)
    ext = os.path.splitext(path)[1].lower()
    head = data[:256].lstrip()
    if ext == ".json" or head.startswith(b"{") or (
        not head.isascii() and head.decode("utf-8", "ignore").lstrip().startswith("{")
    ):
        return parse_json(_decode(data, path), path)
    if ext in (".g6", ".graph6"):
        return parse_graph6(_decode(data, path), path)
    scanned = _scan_edge_list(data, path)
    del data  # the file's bytes go before the adjacency arrays are built
    if isinstance(scanned, Problem):
        return scanned
    return _compact(scanned, lambda: _decode(_read_bytes(path), path))


def _read_bytes(path: str) -> bytes:
    try:
        size = os.path.getsize(path)
        if size > MAX_BYTES:
            raise InputError(
                f"{path}: file is {size:,} bytes, more than the {MAX_BYTES:,} this tool reads; "
                "split the problem"
            )
        with open(path, "rb") as f:
            data = f.read()
    except FileNotFoundError:
        raise InputError(f"{path}: no such file; check the path") from None
    except IsADirectoryError:
        raise InputError(f"{path}: is a directory; give a problem file") from None
    except PermissionError:
        raise InputError(f"{path}: permission denied; check the file's permissions") from None
    except OSError as exc:
        raise InputError(f"{path}: cannot read ({exc.strerror}); check the file") from None
    if not data or data.isspace():  # (no stripped copy of a large file)
        raise InputError(f"{path}: file is empty; give at least one pair or item")
    if b"\x00" in data[:8192]:
        raise InputError(f"{path}: looks like a binary file; give a JSON problem or an edge list")
    return data


def _decode(data: bytes, path: str) -> str:
    try:
        return data.decode("utf-8")
    except UnicodeDecodeError as exc:
        line = data[: exc.start].count(b"\n") + 1
        raise InputError(
            f"{path}: line {line}: not UTF-8 text (byte {exc.start}); save the file as UTF-8"
        ) from None


# --------------------------------------------------------------------------- JSON
def parse_json(text: str, source: str = "<json>") -> Problem:
    """Parse a JSON problem (format version 1, described in docs/problems.md)."""
    try:
        doc = json.loads(text)
    except json.JSONDecodeError as exc:
        raise InputError(
            f"{source}: line {exc.lineno} column {exc.colno}: malformed JSON ({exc.msg})"
        ) from None
    return problem_from_dict(doc, source)


def _name(value, where: str, source: str) -> str:
    if isinstance(value, str) and value:
        return value
    if isinstance(value, int) and not isinstance(value, bool):
        return str(value)
    raise InputError(f"{source}: {where}: item names must be non-empty strings, got {value!r}")


def _pairs(doc: dict, key: str, source: str):
    value = doc.get(key, [])
    if not isinstance(value, list):
        raise InputError(f'{source}: "{key}" must be a list of [item, item] pairs')
    for k, pair in enumerate(value):
        where = f"{key}[{k}]"
        if not isinstance(pair, list) or len(pair) != 2:
            raise InputError(f"{source}: {where}: expected a pair [item, item], got {pair!r}")
        yield _name(pair[0], where, source), _name(pair[1], where, source), where


def problem_from_dict(doc, source: str = "<dict>") -> Problem:
    """Build a problem from an already-parsed JSON object (the version 1 contract)."""
    if not isinstance(doc, dict):
        raise InputError(f"{source}: the top level must be a JSON object with problem keys")
    for key in doc:
        if key not in JSON_KEYS:
            near = difflib.get_close_matches(key, JSON_KEYS, n=1)
            valid = ", ".join(JSON_KEYS)
            hint = f'; did you mean "{near[0]}"?' if near else f"; valid keys: {valid}"
            raise InputError(f'{source}: unknown key "{key}"{hint}')
    version = doc.get("version", 1)
    if version != 1:
        raise InputError(f"{source}: version {version!r} is not supported; this tool reads 1")
    b = ProblemBuilder(source)
    items = doc.get("items", [])
    if not isinstance(items, list):
        raise InputError(f'{source}: "items" must be a list of item names')
    for k, name in enumerate(items):
        b.item(_name(name, f"items[{k}]", source), f"items[{k}]")
    if "items" in doc:  # an explicit list: every name used elsewhere must be in it
        b.close_items()
    incomp = doc.get("incomparable", "others")
    if not (incomp == "others" and _bulk_comparable(b, doc.get("comparable"))):
        for a, c, where in _pairs(doc, "comparable", source):
            b.comparable(a, c, where)
    if isinstance(incomp, str):
        if incomp != "others":
            raise InputError(
                f'{source}: "incomparable" must be "others" or a list of pairs, got {incomp!r}'
            )
        b.incomparable_others()
    else:
        b.incomparable_list()
        for a, c, where in _pairs(doc, "incomparable", source):
            b.incomparable(a, c, where)
    for a, c, where in _pairs(doc, "fixed", source):
        b.fixed(a, c, where)
    for a, c, where in _pairs(doc, "forbidden", source):
        b.forbidden(a, c, where)
    prefer = doc.get("prefer", [])
    if not isinstance(prefer, list):
        raise InputError(f'{source}: "prefer" must be a list of {{"before", "after", "weight"}}')
    for k, entry in enumerate(prefer):
        where = f"prefer[{k}]"
        if not isinstance(entry, dict):
            raise InputError(
                f'{source}: {where}: expected {{"before": ..., "after": ..., "weight": ...}}'
            )
        for key in entry:
            if key not in PREFER_KEYS:
                near = difflib.get_close_matches(key, PREFER_KEYS, n=1)
                hint = f'; did you mean "{near[0]}"?' if near else ""
                raise InputError(f'{source}: {where}: unknown key "{key}"{hint}')
        for key in ("before", "after"):
            if key not in entry:
                raise InputError(f'{source}: {where}: missing "{key}"')
        b.prefer(
            _name(entry["before"], where, source),
            _name(entry["after"], where, source),
            entry.get("weight", 1),
            where,
        )
    weights = doc.get("weights")
    if weights is not None:
        if not isinstance(weights, dict):
            raise InputError(f'{source}: "weights" must be an object mapping items to integers')
        for name, w in weights.items():
            b.weight(name, w, f"weights[{name!r}]")
    return b.build()


def _bulk_comparable(b: ProblemBuilder, value) -> bool:
    """Add a long "comparable" list at once when every entry is a pair of two different
    non-empty strings and no pair is repeated (item ids by one dictionary pass, adjacency cut
    from one sorted numpy array, as for edge lists); ``False`` (nothing added) otherwise, and
    the entries are then read one by one, which names the first bad one (or merges a repeat
    with its note).  Only for ``"incomparable": "others"``:
    no pair can then be listed both ways, so the per-pair bookkeeping is not needed."""
    if not isinstance(value, list) or len(value) < 1000:
        return False
    import numpy as np

    if set(map(type, value)) != {list} or set(map(len, value)) != {2}:
        return False
    flat = list(chain.from_iterable(value))
    if set(map(type, flat)) != {str} or not all(flat):
        return False
    index = b.index
    pos = dict.fromkeys(flat)  # names in order of first appearance
    new = [x for x in pos if x not in index] if index else list(pos)
    if new and b.closed:
        return False  # a name missing from "items": the slow path names it
    ids = np.fromiter(map(index.get, flat, repeat(-1)), dtype=np.int64, count=len(flat)) \
        if index else None
    start = len(b.items)
    if ids is None or (ids < 0).any():
        fresh = dict(zip(new, range(start, start + len(new))))
        if ids is None:
            ids = np.fromiter(map(fresh.__getitem__, flat), dtype=np.int64, count=len(flat))
        else:
            miss = np.flatnonzero(ids < 0)
            ids[miss] = [fresh[flat[i]] for i in miss.tolist()]
    first, second = ids[0::2], ids[1::2]
    if (first == second).any():
        return False  # a pair naming one item twice: the slow path reports it
    # every name is a non-empty string already: register the new items in one go
    b.items.extend(new)
    index.update(zip(new, range(start, start + len(new))))
    b.adj.extend(set() for _ in new)
    adj = b.adj
    for v, row in enumerate(_neighbour_rows(first, second, len(b.items))):
        if row:
            adj[v].update(row)
    if sum(map(len, adj)) != 2 * len(first):
        # a repeated pair (the sets merged it): undo, and let the slow path merge it with a
        # note saying where (the adjacency was empty before: only items were named)
        for s in adj:
            s.clear()
        del b.items[start:], adj[start:]
        for name in new:
            del index[name]
        return False
    return True


def _neighbour_rows(first, second, n: int):
    """For each item ``0..n-1``, the list of its partners in the pairs ``(first[k],
    second[k])`` (numpy arrays), both ways round: one stable sort, no per-pair dictionary."""
    import numpy as np

    src = np.concatenate([first, second])
    dst = np.concatenate([second, first])
    dst_l = dst[np.argsort(src, kind="stable")].tolist()
    ends = np.cumsum(np.bincount(src, minlength=n)).tolist()
    return (dst_l[s:e] for s, e in zip([0] + ends[:-1], ends))


# --------------------------------------------------------------------------- edge lists
def parse_edge_list(text: str, source: str = "<edges>") -> Problem:
    """Parse ``a b`` lines (``#`` starts a comment) into a plain problem.

    A line with one or three fields is an error (typos never pass silently).  Item ids follow
    the order in which names first appear.  With numba the bytes are scanned by compiled loops
    into compact adjacency arrays (:mod:`satorder.io.edge_scan`); otherwise, and for text
    with non-ASCII white space or under :data:`SCAN_BYTES` (where loading the compiler would
    cost more than it saves), :func:`parse_edge_list_text` reads it.
    """
    scanned = _scan_edge_list(text.encode("utf-8"), source, text)
    return scanned if isinstance(scanned, Problem) else _compact(scanned, lambda: text)


def _compact(scanned, text_again) -> Problem:
    """The problem from the compiled scanner's ``(items, ids, source)``, with the note on
    repeated pairs the text reader gives (``text_again()`` re-reads the text, only then)."""
    from satorder.io.edge_scan import compact_problem

    items, ids, source = scanned
    p = compact_problem(items, ids, source)
    repeats = len(ids) // 2 - p.num_comparable
    if repeats:
        text = text_again()
        if "#" in text:
            text = "\n".join(ln.split("#", 1)[0] for ln in text.split("\n"))
        a, b = ids[0::2].astype("int64"), ids[1::2].astype("int64")
        p.notes.append(_repeat_note(text, a, b, len(items), repeats, source))
    return p


def _scan_edge_list(data: bytes, source: str, text: str | None = None):
    """A problem (text reader), or ``(items, ids, source)`` from the compiled scanner."""
    if not data.isascii():
        if text is None:
            text = _decode(data, source)
        if _UNICODE_SPACE.search(text):
            return parse_edge_list_text(text, source)
    if not HAVE_NUMBA or len(data) < SCAN_BYTES:
        return parse_edge_list_text(data.decode("utf-8") if text is None else text, source)
    from satorder.io.edge_scan import scan_tokens

    items, ids = scan_tokens(data, source)
    return items, ids, source


# white space that str.split splits on beyond ASCII (computed, so it follows Python's tables)
_UNICODE_SPACE = re.compile(
    "[" + "".join(chr(c) for c in range(128, 0x3001) if chr(c).isspace()) + "]"
)


def parse_edge_list_text(text: str, source: str = "<edges>") -> Problem:
    """The pure-Python edge-list reader (the twin of :mod:`satorder.io.edge_scan`).

    Built for speed at millions of lines without compiled code: one ``str.split`` tokenises
    the whole text, field counts are checked on the raw bytes with numpy, item ids come from a
    dictionary built in C (``dict.fromkeys``), and adjacency sets are cut from one sorted
    numpy array.
    """
    if "#" in text:
        text = "\n".join(ln.split("#", 1)[0] for ln in text.split("\n"))
    if len(text) <= SMALL_TEXT:
        return _parse_small_edge_list(text, source)
    import numpy as np

    tokens = text.split()
    per_line = _fields_per_line(text, tokens)
    bad = np.flatnonzero((per_line != 0) & (per_line != 2))
    if len(bad):
        line = int(bad[0]) + 1
        fields = int(per_line[bad[0]])
        raise InputError(
            f"{source}: line {line}: expected two item names, found {fields} field"
            f"{'s' if fields != 1 else ''}; write one pair per line as 'a b'"
        )
    if not tokens:
        raise InputError(f"{source}: no pairs found; write one pair per line as 'a b'")
    items = list(dict.fromkeys(tokens))
    index = {name: i for i, name in enumerate(items)}
    n = len(items)
    ids = np.fromiter(map(index.__getitem__, tokens), dtype=np.int64, count=len(tokens))
    a, b = ids[0::2], ids[1::2]
    loops = np.flatnonzero(a == b)
    if len(loops):
        k = int(loops[0])
        line = _line_of_pair(text, k)
        raise InputError(
            f"{source}: line {line}: pair names {items[int(a[k])]!r} twice; "
            "a pair needs two different items"
        )
    adj = [set(row) for row in _neighbour_rows(a, b, n)]
    p = Problem(items=items, adj=adj, source=source)
    p._index = index
    repeats = len(a) - p.num_comparable
    if repeats:
        p.notes.append(_repeat_note(text, a, b, n, repeats, source))
    return p


def _repeat_note(text: str, a: np.ndarray, b: np.ndarray, n: int, repeats: int,
                 source: str) -> str:
    """The note for pairs given more than once in an edge list (either way round), naming the
    first repeat and the line it repeats."""
    import numpy as np

    keys = np.minimum(a, b) * n + np.maximum(a, b)
    _, first, inverse = np.unique(keys, return_index=True, return_inverse=True)
    k = int(np.flatnonzero(first[inverse] != np.arange(len(keys)))[0])
    line, earlier = _line_of_pair(text, k), _line_of_pair(text, int(first[inverse[k]]))
    s = "s" if repeats > 1 else ""
    return (f"{source}: {repeats} repeated pair{s} merged, each counted once (line {line} "
            f"repeats line {earlier}{' and more' if repeats > 1 else ''})")


def _bad_fields(source: str, line: int, fields: int) -> InputError:
    return InputError(
        f"{source}: line {line}: expected two item names, found {fields} field"
        f"{'s' if fields != 1 else ''}; write one pair per line as 'a b'"
    )


def _parse_small_edge_list(text: str, source: str) -> Problem:
    """:func:`parse_edge_list` for a small text (comments already removed), line by line in
    plain Python: the same problem and the same errors, without loading numpy."""
    rows = [ln.split() for ln in text.split("\n")]
    for number, fields in enumerate(rows, 1):
        if len(fields) not in (0, 2):
            raise _bad_fields(source, number, len(fields))
    pairs = [(number, fields) for number, fields in enumerate(rows, 1) if fields]
    if not pairs:
        raise InputError(f"{source}: no pairs found; write one pair per line as 'a b'")
    index: dict[str, int] = {}
    for _, (a, b) in pairs:
        index.setdefault(a, len(index))
        index.setdefault(b, len(index))
    items = list(index)
    adj: list[set[int]] = [set() for _ in items]
    first_line: dict[tuple[int, int], int] = {}
    repeats, first_repeat = 0, None
    for number, (a, b) in pairs:
        if a == b:
            raise InputError(f"{source}: line {number}: pair names {a!r} twice; "
                             "a pair needs two different items")
        i, j = index[a], index[b]
        key = (min(i, j), max(i, j))
        if key in first_line:
            repeats += 1
            if first_repeat is None:
                first_repeat = (number, first_line[key])
            continue
        first_line[key] = number
        adj[i].add(j)
        adj[j].add(i)
    p = Problem(items=items, adj=adj, source=source)
    p._index = index
    if repeats:
        line, earlier = first_repeat
        s = "s" if repeats > 1 else ""
        p.notes.append(f"{source}: {repeats} repeated pair{s} merged, each counted once (line "
                       f"{line} repeats line {earlier}{' and more' if repeats > 1 else ''})")
    return p


def _fields_per_line(text: str, tokens: list[str]) -> np.ndarray:
    """Number of whitespace-separated fields on each line, from the raw bytes with numpy (no
    per-line Python work).  Exact: if the byte-level token count differs from ``str.split``'s
    (only possible with non-ASCII white space) the lines are counted one by one."""
    import numpy as np

    raw = np.frombuffer(text.encode("utf-8"), dtype=np.uint8)
    # str.split's ASCII white space: \t \n \v \f \r, \x1c-\x1f and the space
    space = (raw == 32) | ((raw >= 9) & (raw <= 13)) | ((raw >= 28) & (raw <= 31))
    starts = ~space
    starts[1:] &= space[:-1]
    start_pos = np.flatnonzero(starts)
    if len(start_pos) != len(tokens):
        return np.array([len(ln.split()) for ln in text.split("\n")], dtype=np.int64)
    line_of = np.searchsorted(np.flatnonzero(raw == 10), start_pos)
    return np.bincount(line_of, minlength=1)


def _line_of_pair(text: str, k: int) -> int:
    """1-based line number of the k-th pair (0-based) in a well-formed edge list."""
    seen = -1
    for number, line in enumerate(text.split("\n"), 1):
        if line.split():
            seen += 1
            if seen == k:
                return number
    return 0


# --------------------------------------------------------------------------- graph6
def parse_graph6(text: str, source: str = "<graph6>") -> Problem:
    """Parse the first graph of a graph6 file (items are named ``0`` .. ``n-1``)."""
    import networkx as nx

    line = text.strip().split("\n", 1)[0].strip()
    try:
        g = nx.from_graph6_bytes(line.encode("ascii"))
    except (nx.NetworkXError, ValueError, UnicodeEncodeError) as exc:
        raise InputError(f"{source}: line 1: not valid graph6 ({exc})") from None
    return Problem.from_networkx(g, source=source)
