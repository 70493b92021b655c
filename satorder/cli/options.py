"""The shared option vocabulary: ``--json``, ``--out``, ``--time-limit``, ``--solver``,
``--seed`` and ``--report`` are defined here once and mean the same in every command that
takes them (the README's table of shared options lists which ones each command takes).

Each ``add_*`` function adds one option to a command's parser with the shared wording
(:data:`MEANING`), optionally followed by a clause about what the option covers in that command,
and validates values in argparse itself, so a bad value is a one-line usage error (exit 2) in
every command alike.  Only :mod:`argparse` is imported here: the parser is built before any
command runs, and start-up must stay quick.
"""

from __future__ import annotations

import argparse
import math

# the first words of each shared option's help, the same in every command
MEANING = {
    "--json": "print one JSON object on standard output (the contract in docs/cli.md)",
    "--out": "write the result to FILE, a whole file or none",
    "--time-limit": "stop after SECONDS and print what was found so far (exit 3 when "
                    "incomplete)",
    "--solver": "SAT back end, a python-sat solver name (default cadical195)",
    "--seed": "seed of every random choice the command makes (same seed, same output)",
    "--report": "also write one self-contained HTML report (tables, pictures, requirements) "
                "to share; opens offline in any browser",
}


def _help(option: str, extra: str | None) -> str:
    return MEANING[option] + (f"; {extra}" if extra else "")


def positive_seconds(text: str) -> float:
    """argparse type of ``--time-limit``: a positive, finite number of seconds."""
    try:
        value = float(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"expected seconds, got {text!r}") from None
    if not value > 0 or math.isinf(value):
        raise argparse.ArgumentTypeError(f"must be positive, got {text}")
    return value


def add_json(parser, extra: str | None = None) -> None:
    """``--json``: machine-readable output on standard output, progress on standard error."""
    parser.add_argument("--json", action="store_true", help=_help("--json", extra))


def add_out(parser, extra: str | None = None, metavar: str = "FILE", required: bool = False):
    """``--out FILE``: the command's result written to FILE (besides, or instead of, what is
    printed: ``extra`` says which)."""
    parser.add_argument("--out", metavar=metavar, required=required,
                        help=_help("--out", extra))


def add_time_limit(parser, default: float | None = None, extra: str | None = None) -> None:
    """``--time-limit SECONDS``: stop in time and print what was found so far."""
    if default is not None:
        extra = f"{extra}; default {default:g}" if extra else f"default {default:g}"
    parser.add_argument("--time-limit", type=positive_seconds, default=default,
                        metavar="SECONDS", help=_help("--time-limit", extra))


def add_hidden_alias(parser, alias: str, dest: str, type=None) -> None:
    """An old spelling kept working for a release, left out of ``--help``."""
    parser.add_argument(alias, dest=dest, type=type, default=argparse.SUPPRESS,
                        help=argparse.SUPPRESS)


def add_solver(parser, extra: str | None = None) -> None:
    """``--solver NAME``: the python-sat back end of every SAT call the command makes."""
    parser.add_argument("--solver", default=None, metavar="NAME", help=_help("--solver", extra))


def add_seed(parser, default: int = 1, extra: str | None = None) -> None:
    """``--seed N``: the seed of every random choice (a non-negative integer)."""
    parser.add_argument("--seed", type=_seed, default=default, metavar="N",
                        help=_help("--seed", f"{extra}; default {default}" if extra
                                   else f"default {default}"))


def _seed(text: str) -> int:
    try:
        value = int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"expected a whole number, got {text!r}") from None
    if value < 0:
        raise argparse.ArgumentTypeError(f"must be 0 or more, got {text}")
    return value


def add_report(parser, extra: str | None = None) -> None:
    """``--report FILE.html``: one self-contained HTML page besides the normal output."""
    parser.add_argument("--report", metavar="FILE.html", help=_help("--report", extra))


SHARED = tuple(MEANING)  # the options of the vocabulary, in the README table's order
