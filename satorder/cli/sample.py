"""``satorder sample FILE -k K``: K answers drawn at random from all the answers, as JSON lines
like ``satorder orders``, each one certified; the same ``--seed`` gives the same sample.

Each line is one answer: ``{"index": k, "order": [[lower, upper], ...], "verified": true}``;
a last line ``{"end": true, "found", "method", "uniform", "seed", "answers", ...}`` says how
they were drawn (``uniform``: ``exact``, or ``almost`` for UniGen's samples).
"""

from __future__ import annotations

import sys

from satorder.cli import options
from satorder.cli.common import UsageError, check_output_path, dumps, err, load
from satorder.io.files import atomic_write
from satorder.model.requirement import UNKNOWN
from satorder.pipeline.sample import METHODS


def add_parser(sub):
    p = sub.add_parser("sample", description=__doc__)
    p.add_argument("file", help="problem file: JSON, edge list (a b per line) or graph6")
    p.add_argument("-k", type=int, default=1, metavar="K", help="how many answers (default 1)")
    options.add_seed(p, default=0, extra="the answers drawn")
    p.add_argument("--method", choices=METHODS, default="auto",
                   help="modular decomposition (no open pairs), listing (open pairs, few "
                        "answers), unigen (almost uniform), or auto (default)")
    options.add_time_limit(p, extra="status unknown and no answers when they are not drawn "
                                     "by then")
    options.add_solver(p, "the check that an answer exists before UniGen samples")
    options.add_out(p, "the same JSON lines, instead of standard output")
    options.add_json(p, "the output is JSON lines with or without it")
    return p


def run(args) -> int:
    check_output_path(args.out, args.file)
    if args.k < 0:
        raise UsageError(f"-k must be 0 or more, got {args.k}")
    problem = load(args.file)
    from satorder.pipeline.sample import sample_answers

    res = sample_answers(problem, args.k, seed=args.seed, method=args.method,
                         time_limit=args.time_limit, solver=args.solver)
    names = problem.items
    lines = []
    for k, succ in enumerate(res.orders, 1):
        order = sorted([names[a], names[b]] for a, s in enumerate(succ) for b in s)
        lines.append(dumps({"index": k, "order": order, "verified": True}))
    lines.append(dumps(res.end_json()))
    if args.out:
        atomic_write(args.out, "".join(lines))
        err.print(f"wrote {args.out}", markup=False)
    else:
        sys.stdout.write("".join(lines))
        sys.stdout.flush()
    return 3 if res.status == UNKNOWN else 0
