"""Compiled reading of plain edge lists: from the file's bytes to item names and CSR adjacency.

Two passes over the bytes, each a compiled loop (numba, :mod:`satorder.jit`), and no Python
object per pair:

1. count the fields of every line (``#`` starts a comment; fields are separated by the ASCII
   white space ``str.split`` uses) and stop at the first line with other than 0 or 2 fields;
2. intern every token: a hash table with open addressing and linear probing (Knuth, *The Art
   of Computer Programming* vol. 3, sec. 6.4) keyed by the token's bytes themselves when
   they fit in 7 bytes, else by their FNV-1a hash (Fowler–Noll–Vo), slots chosen by the
   64-bit finaliser of MurmurHash3 (Appleby 2011), gives item ids ``0..n-1`` in order of
   first appearance, exactly the ids ``dict.fromkeys(tokens)`` gives;

then the pairs become symmetric compressed sparse rows by a counting sort, each row sorted and
stripped of repeated pairs.  Files with non-ASCII white space (which ``str.split`` also splits
on) are left to the text reader in :mod:`satorder.io.readers`, which is also the twin used when
numba is missing; the tests compare the two.

>>> items, ids = scan_tokens(b"kiln loom  # a comment\\nloom quay\\n\\nquay kiln\\nkiln loom\\n")
>>> items, ids.tolist()
(['kiln', 'loom', 'quay'], [0, 1, 1, 2, 2, 0, 0, 1])
>>> p = compact_problem(items, ids)
>>> p.num_comparable, sorted(p.adj[0])
(3, [1, 2])
"""

from __future__ import annotations

import numpy as np

from satorder.errors import InputError
from satorder.jit import run
from satorder.model.adjacency import CsrSets
from satorder.model.problem import Problem


def scan_tokens(data: bytes, source: str = "<edges>") -> tuple[list[str], np.ndarray]:
    """Item names (by first appearance) and the item id of every token (int32, two per pair)
    of an edge list's bytes (valid UTF-8 without non-ASCII white space;
    :func:`satorder.io.readers.read_problem` makes sure of that)."""
    raw = np.frombuffer(data, dtype=np.uint8)
    ntok, bad_line, bad_fields = run(_count_fields, raw)
    if bad_line >= 0:
        raise InputError(
            f"{source}: line {bad_line}: expected two item names, found {bad_fields} field"
            f"{'s' if bad_fields != 1 else ''}; write one pair per line as 'a b'"
        )
    if ntok == 0:
        raise InputError(f"{source}: no pairs found; write one pair per line as 'a b'")
    ids, starts, ends, loop_line, loop_id = run(_intern_tokens, raw, ntok)
    del raw
    items = [data[s:e].decode("utf-8") for s, e in zip(starts.tolist(), ends.tolist())]
    del starts, ends
    if loop_line >= 0:
        raise InputError(
            f"{source}: line {loop_line}: pair names {items[loop_id]!r} twice; "
            "a pair needs two different items"
        )
    return items, ids


def compact_problem(items: list[str], ids: np.ndarray, source: str = "<edges>") -> Problem:
    """The plain problem whose comparable pairs are ``(ids[2k], ids[2k+1])``, adjacency kept
    as compact arrays (repeated pairs count once)."""
    indptr, indices = run(_symmetric_csr, len(items), ids)
    return Problem(items=items, adj=CsrSets(indptr, indices), source=source)


# --------------------------------------------------------------------------- compiled loops
def _count_fields(raw):  # pragma: no cover - compiled
    """(tokens, first bad line or -1, its field count): every line must have 0 or 2 fields."""
    ntok = 0
    line = 1
    fields = 0
    in_token = False
    comment = False
    for i in range(len(raw)):
        c = raw[i]
        if c == 10:
            if fields != 0 and fields != 2:
                return ntok, line, fields
            line += 1
            fields = 0
            in_token = False
            comment = False
        elif comment:
            continue
        elif c == 35:
            comment = True
            in_token = False
        elif c == 32 or (c >= 9 and c <= 13) or (c >= 28 and c <= 31):
            in_token = False
        elif not in_token:
            in_token = True
            fields += 1
            ntok += 1
    if fields != 0 and fields != 2:
        return ntok, line, fields
    return ntok, -1, 0


def _intern_tokens(raw, ntok):  # pragma: no cover - compiled
    """Item id of every token (ids by first appearance), each item's byte span, and the line
    and id of the first pair naming one item twice (-1 if none).

    A token of at most 7 bytes is its own key (the bytes and the length packed in 64 bits), so
    it is found without touching the file again; a longer one is keyed by its hash with the top
    bit set and compared byte by byte.  The table interleaves keys and ids (one cache line per
    probe).  A short token equal to the one in the same column on the previous pair (files
    grouped by their first column repeat it line after line) skips the table.
    """
    ids = np.empty(ntok, dtype=np.int32)
    cap = 1 << 12
    table = np.zeros(2 * cap, dtype=np.uint64)  # (key, id) per slot; key 0 is empty
    room = 1 << 10
    keys = np.empty(room, dtype=np.uint64)
    starts = np.empty(room, dtype=np.int64)
    ends = np.empty(room, dtype=np.int64)
    n = 0
    k = 0
    line = 1
    loop_line = -1
    loop_id = -1
    comment = False
    size = len(raw)
    top = np.uint64(1) << np.uint64(63)
    last_key = np.zeros(2, dtype=np.uint64)  # per column: last short key and its id
    last_id = np.zeros(2, dtype=np.int64)
    i = 0
    while i < size:
        c = raw[i]
        if c == 10:
            line += 1
            comment = False
            i += 1
            continue
        if comment or c == 32 or (c >= 9 and c <= 13) or (c >= 28 and c <= 31):
            i += 1
            continue
        if c == 35:
            comment = True
            i += 1
            continue
        s = i
        h = np.uint64(14695981039346656037)
        packed = np.uint64(0)
        while i < size:
            c = raw[i]
            if c == 35 or c == 32 or (c >= 9 and c <= 13) or (c >= 28 and c <= 31):
                break
            if i - s < 7:
                packed |= np.uint64(c) << np.uint64(8 * (i - s))
            h = (h ^ np.uint64(c)) * np.uint64(1099511628211)
            i += 1
        e = i
        if e - s <= 7:
            key = packed | (np.uint64(e - s) << np.uint64(56))
            if last_key[k % 2] == key:
                found = last_id[k % 2]
                ids[k] = found
                if k % 2 == 1 and ids[k - 1] == found and loop_line < 0:
                    loop_line = line
                    loop_id = found
                k += 1
                continue
        else:
            key = h | top
        h = key
        h ^= h >> np.uint64(33)
        h *= np.uint64(0xFF51AFD7ED558CCD)
        h ^= h >> np.uint64(33)
        slot = np.int64(h & np.uint64(cap - 1))
        found = -1
        while True:
            tk = table[2 * slot]
            if tk == 0:
                break
            if tk == key:
                j = np.int64(table[2 * slot + 1])
                if e - s <= 7:
                    found = j
                    break
                if ends[j] - starts[j] == e - s:
                    same = True
                    sj = starts[j]
                    for t in range(e - s):
                        if raw[sj + t] != raw[s + t]:
                            same = False
                            break
                    if same:
                        found = j
                        break
            slot = (slot + 1) & (cap - 1)
        if found < 0:
            found = n
            if n == room:
                room *= 2
                nk = np.empty(room, dtype=np.uint64)
                ns = np.empty(room, dtype=np.int64)
                ne = np.empty(room, dtype=np.int64)
                nk[:n] = keys[:n]
                ns[:n] = starts[:n]
                ne[:n] = ends[:n]
                keys, starts, ends = nk, ns, ne
            keys[n] = key
            starts[n] = s
            ends[n] = e
            table[2 * slot] = key
            table[2 * slot + 1] = np.uint64(n)
            n += 1
            if 4 * n > 3 * cap:  # keep the load under 3/4: double and re-insert
                cap *= 2
                table = np.zeros(2 * cap, dtype=np.uint64)
                for j in range(n):
                    h = keys[j]
                    h ^= h >> np.uint64(33)
                    h *= np.uint64(0xFF51AFD7ED558CCD)
                    h ^= h >> np.uint64(33)
                    slot = np.int64(h & np.uint64(cap - 1))
                    while table[2 * slot] != 0:
                        slot = (slot + 1) & (cap - 1)
                    table[2 * slot] = keys[j]
                    table[2 * slot + 1] = np.uint64(j)
        ids[k] = found
        if e - s <= 7:
            last_key[k % 2] = key
            last_id[k % 2] = found
        if k % 2 == 1 and ids[k - 1] == found and loop_line < 0:
            loop_line = line
            loop_id = found
        k += 1
    return ids, starts[:n].copy(), ends[:n].copy(), loop_line, loop_id


def _symmetric_csr(n, ids):  # pragma: no cover - compiled
    """Symmetric CSR of the pairs (ids[2k], ids[2k+1]): counting sort, rows sorted, repeated
    pairs dropped.  Returns (indptr int64, indices int32)."""
    m = len(ids) // 2
    indptr = np.zeros(n + 1, dtype=np.int64)
    for k in range(m):
        indptr[ids[2 * k] + 1] += 1
        indptr[ids[2 * k + 1] + 1] += 1
    for v in range(n):
        indptr[v + 1] += indptr[v]
    pos = indptr[:n].copy()
    indices = np.empty(2 * m, dtype=np.int32)
    for k in range(m):
        a = ids[2 * k]
        b = ids[2 * k + 1]
        indices[pos[a]] = b
        pos[a] += 1
        indices[pos[b]] = a
        pos[b] += 1
    w = 0
    start = 0
    for v in range(n):
        end = indptr[v + 1]
        if end - start > 1:
            indices[start:end].sort()
        prev = -1
        for t in range(start, end):
            x = indices[t]
            if x != prev:
                indices[w] = x
                w += 1
                prev = x
        start = end
        indptr[v + 1] = w
    if w == 2 * m:
        return indptr, indices
    return indptr, indices[:w].copy()
