"""``satorder`` entry point: parses the command line and dispatches to one command module.

Start-up is kept short: only the module of the command that runs is imported (the others are
listed from :data:`COMMANDS`), and nothing here imports numpy, rich or the engines.  A mistyped
command or option gets a "did you mean" suggestion.

Exit status: 0 answered, 2 bad input or usage, 3 the time limit ran out first (what was found so
far is printed), 1 internal error (an answer failed its certificate check; for ``bench`` also a
run that ended in error or crash), 130 interrupted by Ctrl-C (what was found so far is printed),
141 standard output closed early (``satorder solve FILE | head -1``), quietly.
"""

from __future__ import annotations

import argparse
import difflib
import importlib
import os
import sys

# command → (module in satorder.cli, one line for 'satorder --help'); each module has
# add_parser(subparsers) and run(args) -> int, and is imported only when its command runs
COMMANDS = {
    "solve": ("solve", "find a certified order, or show that none exists"),
    "demo": ("demo", "solve small embedded examples and show the answers"),
    "measure": ("measure", "height, width, dimension (with witnesses) of the order"),
    "explain": ("explain", "explain why no order exists, and how to repair it"),
    "make-suite": ("generate", "generate a suite of problems with a manifest"),
    "bench": ("bench", "run suites of problems on several back ends"),
    "cnf": ("cnf", "write the problem as DIMACS CNF with named variables"),
    "count": ("count", "count the answers (any size)"),
    "orders": ("orders", "list answers one per line (JSON lines), each certified"),
    "settled": ("settled", "which pairs every answer orders alike, and the shares of the free "
                           "ones"),
    "sample": ("sample", "draw answers uniformly at random (JSON lines), each certified"),
}
PIPE_CLOSED = 141  # 128 + SIGPIPE, what a shell reports for a writer whose reader went away


def say(message: str) -> None:
    """One line on standard error (no rich: it is not needed to report a usage error)."""
    sys.stderr.write(message + "\n")
    sys.stderr.flush()


class _Parser(argparse.ArgumentParser):
    def error(self, message):  # one line, exit status 2
        say(f"satorder: error: {message} (see '{self.prog} --help')")
        raise SystemExit(2)


def _command_of(argv: list[str]) -> str | None:
    """The command word: the first argument that is not an option."""
    for arg in argv:
        if not arg.startswith("-"):
            return arg
    return None


def build_parser(command: str | None = None) -> argparse.ArgumentParser:
    """The parser of ``satorder``; with ``command`` that command's full parser (its module is
    imported), the others as one-line entries for the listing in ``--help``."""
    from satorder import __version__

    parser = _Parser(
        prog="satorder",
        description="Turn pairwise evidence about items into a certified partial order, "
        "or a checkable reason why none exists.",
    )
    parser.add_argument("--version", action="version", version=f"satorder {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)
    sub.required = True
    for name, (module_name, line) in COMMANDS.items():
        if name == command:
            module = importlib.import_module(f"{__package__}.{module_name}")
            p = module.add_parser(sub)
            p.set_defaults(run=module.run)
        else:
            sub.add_parser(name, help=line, add_help=False)
    return parser


def command_parser(command: str) -> argparse.ArgumentParser:
    """The full parser of one command (for tests and documentation)."""
    return _subparsers(build_parser(command)).choices[command]


def _suggest(word: str, choices, what: str) -> str:
    near = difflib.get_close_matches(word, list(choices), n=1, cutoff=0.6)
    return f"unknown {what} {word!r}; did you mean {near[0]!r}?" if near else \
        f"unknown {what} {word!r}; choose one of {', '.join(choices)}"


def parse(argv: list[str]) -> argparse.Namespace:
    """Parse ``argv``; usage errors print one line and raise ``SystemExit(2)``."""
    command = _command_of(argv)
    if command is not None and command not in COMMANDS:
        say(f"satorder: error: {_suggest(command, COMMANDS, 'command')} "
            "(see 'satorder --help')")
        raise SystemExit(2)
    parser = build_parser(command)
    args, extras = parser.parse_known_args(argv)
    if extras:
        sub = _subparsers(parser).choices[args.command]
        unknown = next((x for x in extras if x.startswith("-")), extras[0])
        if unknown.startswith("-"):
            known = [s for a in sub._actions if a.help != argparse.SUPPRESS
                     for s in a.option_strings if s.startswith("--")]
            sub.error(_suggest(unknown.split("=", 1)[0], known, "option"))
        sub.error(f"unexpected argument {unknown!r}")
    return args


def _subparsers(parser) -> argparse._SubParsersAction:
    return next(a for a in parser._actions if isinstance(a, argparse._SubParsersAction))


def main(argv: list[str] | None = None) -> int:
    argv = sys.argv[1:] if argv is None else list(argv)
    args = parse(argv)
    args.argv = argv  # the command as typed, for reports
    try:
        return int(args.run(args) or 0)
    except BrokenPipeError:
        return _pipe_closed()
    except KeyboardInterrupt:
        say("satorder: interrupted")
        return 130
    except Exception as exc:
        return _failed(exc)


def _pipe_closed() -> int:
    """The reader of standard output went away (``| head``): stop quietly.  Whatever is still
    buffered for standard output goes to /dev/null, so the flush at exit cannot fail again."""
    try:
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
        os.close(devnull)
    except (OSError, ValueError):
        pass
    return PIPE_CLOSED


def _failed(exc: Exception) -> int:
    from satorder.errors import CertificateError, InputError

    if isinstance(exc, InputError):
        say(f"satorder: error: {exc}")
        return 2
    if isinstance(exc, CertificateError):
        say(f"satorder: internal error: an answer failed its check: {exc}")
        return 1
    from satorder.sat.runner import is_keyboard_error

    if is_keyboard_error(exc):  # Ctrl-C inside a checker's own solver call
        say("satorder: interrupted")
        return 130
    if os.environ.get("SATORDER_DEBUG"):
        raise exc
    # a bug: one line for users, the traceback on request
    say(f"satorder: internal error: {type(exc).__name__}: {exc} "
        "(rerun with SATORDER_DEBUG=1 for details and please report it)")
    return 1


if __name__ == "__main__":
    raise SystemExit(main())
