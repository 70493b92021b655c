"""``satorder settled FILE``: which pairs the evidence settles (ordered one way, or unordered,
in every answer) and which are free, with the share of answers for each relation; ``--why A B``
explains one pair."""

from __future__ import annotations

import sys
from contextlib import nullcontext

from satorder.cli import options
from satorder.cli.common import (
    UsageError,
    check_output_path,
    check_report_path,
    command_line,
    err,
    load,
    out,
    print_json,
    write_report,
)
from satorder.io.files import atomic_write
from satorder.model.requirement import UNKNOWN
from satorder.pipeline.settled import METHODS, SAMPLES


def add_parser(sub):
    p = sub.add_parser("settled", description=__doc__)
    p.add_argument("file", help="problem file: JSON, edge list (a b per line) or graph6")
    options.add_json(p)
    options.add_out(p, "the JSON object --json prints, besides the usual output")
    p.add_argument("--why", nargs=2, metavar=("A", "B"),
                   help="explain the pair A, B: the requirements that settle it, or two "
                        "answers that order it differently")
    p.add_argument("--method", choices=METHODS, default="auto",
                   help="modular decomposition (no open pairs), listing (open pairs, few "
                        "answers), approximate (ApproxMC and UniGen), or auto (default)")
    p.add_argument("--samples", type=int, default=SAMPLES, metavar="N",
                   help=f"answers drawn for approximate shares (default {SAMPLES})")
    p.add_argument("--epsilon", type=float, default=None, metavar="E",
                   help="approximate count within a factor 1+E (default 0.8)")
    p.add_argument("--delta", type=float, default=None, metavar="D",
                   help="... with probability at least 1-D (default 0.2)")
    options.add_time_limit(p, extra="status unknown when the shares are not known by then; "
                                     "with --why default 30")
    options.add_solver(p)
    options.add_seed(p, default=0, extra="the approximate method's hashes and samples")
    options.add_report(p, "all pairs; not with --why")
    return p


def run(args) -> int:
    check_output_path(args.out, args.file)
    check_report_path(args.report, args.file)
    if args.samples < 1:
        raise UsageError(f"--samples must be at least 1, got {args.samples}")
    if args.epsilon is not None and args.epsilon <= 0:
        raise UsageError(f"--epsilon must be positive, got {args.epsilon:g}")
    if args.delta is not None and not 0 < args.delta < 1:
        raise UsageError(f"--delta must lie between 0 and 1, got {args.delta:g}")
    problem = load(args.file)
    if args.why:
        return _why(args, problem)
    from satorder.pipeline.settled import settled

    with err.status("settling…") if not args.json else nullcontext():
        res = settled(problem, method=args.method, time_limit=args.time_limit,
                      solver=args.solver, seed=args.seed, samples=args.samples,
                      epsilon=args.epsilon, delta=args.delta)
    text = res.to_json_text() if (args.json or args.out) else None
    if args.out:
        atomic_write(args.out, text)
    if res.answer is not None and (args.report or not args.json):
        _shrink_core(res.answer)
    if args.report:
        from satorder.render.report_pages import settled_report

        write_report(args.report, settled_report(res, command_line(args)))
    if args.json:
        sys.stdout.write(text)
        sys.stdout.flush()
    else:
        from satorder.render.settled_text import print_settled

        print_settled(res, out)
    return 3 if res.status == UNKNOWN else 0


def _why(args, problem) -> int:
    from satorder.explanation.settled_why import why_settled

    if args.report:
        raise UsageError("--report describes all pairs; use it without --why")
    with err.status("explaining the pair…") if not args.json else nullcontext():
        why = why_settled(problem, *args.why, time_limit=args.time_limit or 30.0,
                          solver=args.solver)
    if why.answer is not None and not args.json:
        _shrink_core(why.answer)
    doc = why.to_json()
    if args.out:
        from satorder.cli.common import dumps

        atomic_write(args.out, dumps(doc))
    if args.json:
        print_json(doc)
    else:
        from satorder.render.settled_text import print_why

        print_why(why, out)
    return 3 if why.status == UNKNOWN else 0


def _shrink_core(ans) -> None:
    """The one-screen summary of an infeasible problem, as in ``solve``: a minimal core."""
    from satorder.explanation.explain import minimal_core_of
    from satorder.model.requirement import INFEASIBLE

    if ans.status == INFEASIBLE:
        core = minimal_core_of(ans)
        if core is not None:
            ans.core = core
            ans.stats["minimal_core"] = True
