"""``satorder sample FILE -k K``: K answers drawn at random from all the answers, as JSON lines
like ``satorder orders``, each one certified; the same ``--seed`` gives the same sample.

Each line is one answer: ``{"index": k, "order": [[lower, upper], ...], "verified": true}``;
a last line ``{"end": true, "found", "method", "uniform", "seed", "answers", ...}`` says how
they were drawn (``uniform``: ``exact``, or ``almost`` for UniGen's samples).
"""

from __future__ import annotations

import sys

from satorder.cli.common import UsageError, check_output_path, dumps, err, load
from satorder.io.files import atomic_write
from satorder.model.requirement import UNKNOWN
from satorder.pipeline.sample import METHODS


def add_parser(sub):
    p = sub.add_parser("sample", help="draw answers uniformly at random (JSON lines), each "
                                      "certified", description=__doc__)
    p.add_argument("file", help="problem file: JSON, edge list (a b per line) or graph6")
    p.add_argument("-k", type=int, default=1, metavar="K", help="how many answers (default 1)")
    p.add_argument("--seed", type=int, default=0, help="seed of the random draws (default 0)")
    p.add_argument("--method", choices=METHODS, default="auto",
                   help="modular decomposition (no open pairs), listing (open pairs, few "
                        "answers), unigen (almost uniform), or auto (default)")
    p.add_argument("--time-limit", type=float, default=None, metavar="SECONDS",
                   help="give status unknown instead of running longer")
    p.add_argument("--out", metavar="FILE", help="write the lines to FILE instead of the screen")
    p.add_argument("--json", action="store_true",
                   help="accepted for uniformity: the output is always JSON lines")
    return p


def run(args) -> int:
    check_output_path(args.out, args.file)
    if args.k < 0:
        raise UsageError(f"-k must be 0 or more, got {args.k}")
    if args.time_limit is not None and args.time_limit <= 0:
        raise UsageError(f"--time-limit must be positive, got {args.time_limit:g}")
    problem = load(args.file)
    from satorder.pipeline.sample import sample_answers

    res = sample_answers(problem, args.k, seed=args.seed, method=args.method,
                         time_limit=args.time_limit)
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
