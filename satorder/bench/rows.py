"""Rows on disk: JSON Lines written one complete line per ``os.write`` and flushed, read back
with a torn last line cut off, so an interrupted benchmark resumes where it stopped.
"""

from __future__ import annotations

import json
import os

from satorder.errors import InputError
from satorder.model.requirement import Status

# a row's status: a verdict (Status) or what happened to the run instead
SOLVED = (Status.FEASIBLE.value, Status.INFEASIBLE.value)


UNSOLVED = ("timeout", Status.UNKNOWN.value)


FAILED = ("error", "crash")


# --------------------------------------------------------------------------- rows on disk
def read_rows(path: str) -> list[dict]:
    """Rows already in a JSON Lines file (none if it does not exist).

    A last line without its newline (a run killed while writing) is cut off the file.
    """
    if not os.path.exists(path):
        return []
    try:
        with open(path, "rb") as f:
            data = f.read()
    except OSError as exc:
        raise InputError(f"{path}: cannot read ({exc.strerror}); check --out") from None
    if data and not data.endswith(b"\n"):
        cut = data.rfind(b"\n") + 1
        os.truncate(path, cut)
        data = data[:cut]
    rows = []
    for k, line in enumerate(data.decode("utf-8", "replace").split("\n")):
        if not line.strip():
            continue
        try:
            row = json.loads(line)
        except ValueError:
            row = None
        if not isinstance(row, dict) or "instance" not in row or "backend" not in row:
            raise InputError(f"{path}: line {k + 1}: not a result row; remove the line or "
                             "choose another --out")
        rows.append(row)
    return rows


class RowWriter:
    """Appends one complete JSON line per row with a single write, then syncs it to disk."""

    def __init__(self, path: str):
        folder = os.path.dirname(os.path.abspath(path))
        if not os.path.isdir(folder):
            raise InputError(f"{path}: folder {folder} does not exist; create it first")
        self.fd = os.open(path, os.O_WRONLY | os.O_APPEND | os.O_CREAT, 0o644)

    def write(self, row: dict) -> None:
        data = (json.dumps(row, separators=(",", ":")) + "\n").encode("utf-8")
        view = memoryview(data)
        while view:
            n = os.write(self.fd, view)
            view = view[n:]
        os.fsync(self.fd)

    def close(self) -> None:
        os.close(self.fd)
