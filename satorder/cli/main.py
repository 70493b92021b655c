"""``satorder`` entry point: parses the command line and dispatches to one command module.

Exit status: 0 answered, 2 bad input or usage, 3 no answer within the time limit (status
``unknown``), 1 internal error (an answer failed its certificate check), 130 interrupted.
"""

from __future__ import annotations

import argparse
import importlib
import os
import sys

from satorder.cli.common import err
from satorder.errors import CertificateError, InputError
from satorder.sat.runner import is_keyboard_error

# one module per command; each has add_parser(subparsers) and run(args) -> int
COMMANDS = ["solve", "demo", "measure", "explain", "generate", "bench", "cnf", "count", "orders"]


class _Parser(argparse.ArgumentParser):
    def error(self, message):  # one line, exit status 2
        err.print(f"satorder: error: {message} (see 'satorder --help')", markup=False)
        raise SystemExit(2)


def build_parser(only: str | None = None) -> argparse.ArgumentParser:
    """The command-line parser; with ``only``, just that command's (its module alone is
    imported, so a large ``solve`` does not carry every other command's libraries)."""
    parser = _Parser(
        prog="satorder",
        description="Turn pairwise evidence about items into a certified partial order, "
        "or a checkable reason why none exists.",
    )
    from satorder import __version__

    parser.add_argument("--version", action="version", version=f"satorder {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)
    sub.required = True
    for name in COMMANDS if only is None else [only]:
        module = importlib.import_module(f".{name}", __package__)
        p = module.add_parser(sub)
        p.set_defaults(run=module.run)
    return parser


def main(argv: list[str] | None = None) -> int:
    argv = sys.argv[1:] if argv is None else list(argv)
    first = next((a for a in argv if not a.startswith("-")), None)
    parser = build_parser(first if first in COMMANDS else None)
    args = parser.parse_args(argv)
    args.argv = argv  # the command as typed, for reports
    try:
        return int(args.run(args) or 0)
    except InputError as exc:
        err.print(f"satorder: error: {exc}", markup=False)
        return 2
    except CertificateError as exc:
        err.print(f"satorder: internal error: an answer failed its check: {exc}", markup=False)
        return 1
    except KeyboardInterrupt:
        err.print("satorder: interrupted", markup=False)
        return 130
    except BrokenPipeError:
        sys.stderr.close()
        return 0
    except Exception as exc:  # a bug: one line for users, the traceback on request
        if is_keyboard_error(exc):  # Ctrl-C inside a checker's own solver call
            err.print("satorder: interrupted", markup=False)
            return 130
        if os.environ.get("SATORDER_DEBUG"):
            raise
        err.print(f"satorder: internal error: {type(exc).__name__}: {exc} "
                  "(rerun with SATORDER_DEBUG=1 for details and please report it)", markup=False)
        return 1


if __name__ == "__main__":
    raise SystemExit(main())
