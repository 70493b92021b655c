"""``satorder orders FILE``: stream the answers as JSON lines, each one certified.

Each line is one answer: ``{"index": k, "order": [[lower, upper], ...], "verified": true}``.
A last line ``{"end": true, "found": N, "complete": true|false, "stopped": reason}`` says
whether every answer was listed.
"""

from __future__ import annotations

import sys

from satorder.cli.common import UsageError, dumps, err, load
from satorder.pipeline.orders import EnumerationEnd, certified_orders


def add_parser(sub):
    p = sub.add_parser("orders", help="list answers one per line (JSON lines), each certified",
                       description=__doc__)
    p.add_argument("file", help="problem file: JSON, edge list (a b per line) or graph6")
    p.add_argument("--limit", type=int, default=None, metavar="N",
                   help="stop after N answers")
    p.add_argument("--time-limit", type=float, default=None, metavar="SECONDS",
                   help="stop after SECONDS")
    p.add_argument("--solver", default=None, help="SAT solver name (python-sat), e.g. cadical195")
    return p


def run(args) -> int:
    if args.limit is not None and args.limit < 1:
        raise UsageError(f"--limit must be at least 1, got {args.limit}")
    problem = load(args.file)
    names = problem.items
    end = EnumerationEnd()
    write = sys.stdout.write
    for found in certified_orders(problem, limit=args.limit, solver=args.solver,
                                  time_limit=args.time_limit, end=end):
        order = sorted([names[a], names[b]] for a, b in found.pairs)
        write(dumps({"index": found.index, "order": order, "verified": True}))
        sys.stdout.flush()
    write(dumps({"end": True, "found": end.found, "complete": end.complete,
                 "stopped": end.reason, "seconds": end.seconds}))
    sys.stdout.flush()
    if sys.stderr.isatty():
        state = "all of them" if end.complete else f"stopped at the {end.reason}"
        err.print(f"{end.found} answers listed ({state}).", markup=False)
    return 0
