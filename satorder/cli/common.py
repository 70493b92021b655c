"""Pieces the commands share: the two consoles, loading problems, JSON printing, output paths,
SVG pictures of an order (``solve --draw`` and ``measure --draw``).  The shared options
themselves are defined in :mod:`satorder.cli.options`."""

from __future__ import annotations

import json
import os
import sys

from satorder.cli.options import add_report as add_report_option  # noqa: F401  (older name)
from satorder.errors import InputError
from satorder.io.files import atomic_write


class _LazyConsole:
    """A rich console made on first use: a command that prints only JSON never imports rich.
    A closed standard output (``| head``) raises :class:`BrokenPipeError`, which the entry
    point turns into a quiet exit (rich's own handling exits with status 1)."""

    def __init__(self, **options):
        self._options = options
        self._console = None

    def _get(self):
        if self._console is None:
            from rich.console import Console

            class _Console(Console):
                def on_broken_pipe(self) -> None:
                    self.quiet = True
                    raise BrokenPipeError

            self._console = _Console(**self._options)
        return self._console

    @property
    def real(self):
        """The rich console itself (for rich objects that take a ``console``)."""
        return self._get()

    def __getattr__(self, name):
        return getattr(self._get(), name)


out = _LazyConsole(highlight=False, soft_wrap=True)
err = _LazyConsole(stderr=True, highlight=False, soft_wrap=True)


class UsageError(InputError):
    """Bad command-line usage (exit status 2)."""


def load(path: str):
    """Read a problem file; errors surface as InputError (exit 2).  The reader's notes (such as
    repeated requirements merged) are printed once on standard error."""
    from satorder.io.readers import read_problem

    problem = read_problem(path)
    for note in problem.notes:
        err.print(f"note: {note}", markup=False)
    return problem


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


def check_draw(path: str | None, source: str) -> None:
    """Refuse a ``--draw`` target that is not an SVG file name or would overwrite the input."""
    if path is None:
        return
    if not path.lower().endswith(".svg"):
        raise UsageError(f"{path}: --draw writes SVG; give a file name ending in .svg")
    check_output_path(path, source)


def write_pictures(path, source, succ, names, measures=None, weights=None,
                   time_limit: float = 10.0) -> None:
    """Write the SVG pictures of an order (used by ``solve --draw`` and ``measure --draw``);
    above :data:`~satorder.render.order_svg.SUMMARY_AT` items a summary by level, said in one
    line.  Without ``measures`` the order is measured first, within ``time_limit`` seconds."""
    from satorder.render.order_svg import SUMMARY_AT, pictures

    check_draw(path, source)
    if len(succ) > SUMMARY_AT:
        err.print(f"{len(succ)} items are too many for a readable Hasse diagram; drawing a "
                  "summary by level with the heaviest chains instead", markup=False)
    elif measures is None:
        from satorder.measure.summary import measure

        measures = measure(succ, time_limit=time_limit)
    for name, text in pictures(path, succ, names, measures, weights).items():
        atomic_write(name, text)
        err.print(f"wrote {name}", markup=False)


def check_report_path(path: str | None, *inputs: str) -> None:
    """Refuse a report name that is not .html, overwrites an input or lies in no folder."""
    if path is None:
        return
    if not path.lower().endswith((".html", ".htm")):
        raise UsageError(f"{path}: --report writes HTML; give a file name ending in .html")
    folder = os.path.dirname(os.path.abspath(path))
    if not os.path.isdir(folder):
        raise UsageError(f"{path}: folder {folder} does not exist; create it or choose another")
    check_output_path(path, *inputs)


def command_line(args) -> str:
    """The command as typed, for the report's header."""
    import shlex

    return "satorder " + shlex.join(getattr(args, "argv", None) or [args.command])


def write_report(path: str | None, report) -> None:
    """Write a :class:`~satorder.render.report.Report` built by a command (atomically)."""
    if path is None:
        return
    report.write(path)
    err.print(f"wrote {path}", markup=False)
