"""Pieces every command shares: loading problems, atomic output files, JSON printing."""

from __future__ import annotations

import json
import os
import sys

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
