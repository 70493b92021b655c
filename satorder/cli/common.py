"""Pieces every command shares: loading problems, atomic output files, JSON printing."""

from __future__ import annotations

import json
import os
import sys
import tempfile

from rich.console import Console

from satorder.errors import InputError
from satorder.io.readers import read_problem

out = Console(highlight=False, soft_wrap=True)
err = Console(stderr=True, highlight=False, soft_wrap=True)


class UsageError(InputError):
    """Bad command-line usage (exit status 2)."""


def load(path: str):
    """Read a problem file; errors surface as InputError (exit 2)."""
    return read_problem(path)


def atomic_write(path: str, text: str) -> None:
    """Write ``text`` to ``path`` through a temporary file in the same folder and a rename, so a
    failure never leaves half a file and an existing file is replaced only when complete."""
    folder = os.path.dirname(os.path.abspath(path)) or "."
    if not os.path.isdir(folder):
        raise InputError(f"{path}: folder {folder} does not exist; create it or choose another")
    fd, tmp = tempfile.mkstemp(prefix=".satorder-", suffix=".tmp", dir=folder)
    try:
        with os.fdopen(fd, "w", encoding="utf-8") as f:
            f.write(text)
        try:  # keep the mode of the file replaced, else the usual umask-based mode
            mode = os.stat(path).st_mode & 0o7777
        except FileNotFoundError:
            umask = os.umask(0)
            os.umask(umask)
            mode = 0o666 & ~umask
        os.chmod(tmp, mode)
        os.replace(tmp, path)
    except BaseException:
        try:
            os.unlink(tmp)
        except OSError:
            pass
        raise


def dumps(doc) -> str:
    return json.dumps(doc, separators=(",", ":")) + "\n"


def print_json(doc) -> None:
    """Exactly one JSON object on standard output."""
    sys.stdout.write(dumps(doc))
    sys.stdout.flush()


def check_output_path(path: str | None, *inputs: str) -> None:
    """Refuse to overwrite an input file with an output file."""
    if path is None:
        return
    for src in inputs:
        if src and os.path.exists(path) and os.path.samefile(path, src):
            raise UsageError(f"{path}: output would overwrite the input file; choose another name")
