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
from itertools import chain, repeat

import numpy as np

from satorder.errors import InputError
from satorder.model.problem import Problem, ProblemBuilder

MAX_BYTES = 1 << 30  # 1 GiB: beyond this a file is refused rather than exhausting memory
JSON_KEYS = ("items", "comparable", "incomparable", "fixed", "forbidden", "prefer", "weights",
             "version", "comment")
PREFER_KEYS = ("before", "after", "weight")


def read_problem(path: str | os.PathLike) -> Problem:
    """Read a problem file, choosing the format by extension or content."""
    path = os.fspath(path)
    text = _read_text(path)
    ext = os.path.splitext(path)[1].lower()
    if ext == ".json" or text.lstrip().startswith("{"):
        return parse_json(text, path)
    if ext in (".g6", ".graph6"):
        return parse_graph6(text, path)
    return parse_edge_list(text, path)


def _read_text(path: str) -> str:
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
    if not data.strip():
        raise InputError(f"{path}: file is empty; give at least one pair or item")
    if b"\x00" in data[:8192]:
        raise InputError(f"{path}: looks like a binary file; give a JSON problem or an edge list")
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
    non-empty strings (item ids by one dictionary pass, adjacency cut from one sorted numpy
    array, as for edge lists); ``False`` (nothing added) otherwise, and the entries are then
    read one by one, which names the first bad one.  Only for ``"incomparable": "others"``:
    no pair can then be listed both ways, so the per-pair bookkeeping is not needed."""
    if not isinstance(value, list) or len(value) < 1000:
        return False
    if set(map(type, value)) != {list} or set(map(len, value)) != {2}:
        return False
    flat = list(chain.from_iterable(value))
    if set(map(type, flat)) != {str} or not all(flat):
        return False
    index = b.index
    pos = dict.fromkeys(flat)  # names in order of first appearance
    new = [x for x in pos if x not in index] if index else list(pos)
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
    n = len(b.items)
    src = np.concatenate([first, second])
    dst = np.concatenate([second, first])
    order = np.argsort(src, kind="stable")
    dst_l = dst[order].tolist()
    ends = np.cumsum(np.bincount(src, minlength=n)).tolist()
    starts = [0] + ends[:-1]
    adj = b.adj
    for v, (s, e) in enumerate(zip(starts, ends)):
        if e > s:
            adj[v].update(dst_l[s:e])
    return True


# --------------------------------------------------------------------------- edge lists
def parse_edge_list(text: str, source: str = "<edges>") -> Problem:
    """Parse ``a b`` lines (``#`` starts a comment) into a plain problem.

    A line with one or three fields is an error (typos never pass silently).  Built for speed
    at millions of lines: a single regular-expression scan rejects malformed lines, one
    ``str.split`` tokenises the whole text, item ids come from a dictionary built in C
    (``dict.fromkeys``), and adjacency sets are cut from one sorted numpy array.
    """
    if "#" in text:
        text = "\n".join(ln.split("#", 1)[0] for ln in text.split("\n"))
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
    src = np.concatenate([a, b])
    dst = np.concatenate([b, a])
    order = np.argsort(src, kind="stable")
    dst_l = dst[order].tolist()
    ends = np.cumsum(np.bincount(src, minlength=n)).tolist()
    starts = [0] + ends[:-1]
    adj = [set(dst_l[s:e]) for s, e in zip(starts, ends)]
    p = Problem(items=items, adj=adj, source=source)
    p._index = index
    return p


def _fields_per_line(text: str, tokens: list[str]) -> np.ndarray:
    """Number of whitespace-separated fields on each line, from the raw bytes with numpy (no
    per-line Python work).  Exact: if the byte-level token count differs from ``str.split``'s
    (only possible with non-ASCII white space) the lines are counted one by one."""
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
