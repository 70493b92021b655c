"""``satorder orders FILE``: stream the answers as JSON lines, each one certified.

Each line is one answer: ``{"index": k, "order": [[lower, upper], ...], "verified": true}``.
A last line ``{"end": true, "found": N, "complete": true|false, "stopped": reason}`` says
whether every answer was listed; it is printed also when the time limit or Ctrl-C stops the
listing (``"stopped": "time-limit"`` or ``"interrupted"``, exit status 3 or 130).
"""

from __future__ import annotations

import sys
from contextlib import nullcontext

from satorder.cli import options
from satorder.cli.common import UsageError, check_output_path, dumps, err, load
from satorder.io.files import atomic_file
from satorder.pipeline.orders import INTERRUPTED, TIME_LIMIT, EnumerationEnd, certified_orders


def add_parser(sub):
    p = sub.add_parser("orders", description=__doc__)
    p.add_argument("file", help="problem file: JSON, edge list (a b per line) or graph6")
    options.add_json(p, "the output is JSON lines with or without it")
    options.add_out(p, "the same JSON lines as printed, written when the listing ends")
    p.add_argument("--limit", type=int, default=None, metavar="N",
                   help="stop after N answers")
    options.add_time_limit(p, extra="the end line says so")
    options.add_solver(p)
    return p


def run(args) -> int:
    if args.limit is not None and args.limit < 1:
        raise UsageError(f"--limit must be at least 1, got {args.limit}")
    check_output_path(args.out, args.file)
    problem = load(args.file)
    with atomic_file(args.out) if args.out else nullcontext() as copy:
        end = _stream(problem, args, copy)
    if sys.stderr.isatty():
        state = "all of them" if end.complete else f"stopped: {end.reason}"
        err.print(f"{end.found} answers listed ({state}).", markup=False)
    return {INTERRUPTED: 130, TIME_LIMIT: 3}.get(end.reason, 0)


def _stream(problem, args, copy) -> EnumerationEnd:
    """Print each certified answer as it comes, then the end line, also after Ctrl-C."""
    names = problem.items
    end = EnumerationEnd()
    printed = 0

    def emit(line: str) -> None:
        sys.stdout.write(line)
        sys.stdout.flush()
        if copy is not None:
            copy.write(line)

    try:
        for found in certified_orders(problem, limit=args.limit, solver=args.solver,
                                      time_limit=args.time_limit, end=end):
            order = sorted([names[a], names[b]] for a, b in found.pairs)
            emit(dumps({"index": found.index, "order": order, "verified": True}))
            printed += 1
    except KeyboardInterrupt:
        end.complete, end.reason = False, INTERRUPTED
    end.found = printed
    emit(dumps({"end": True, "found": end.found, "complete": end.complete,
                "stopped": end.reason, "seconds": end.seconds}))
    return end
