"""``satorder solve FILE``: find an order meeting every requirement, or show none exists."""

from __future__ import annotations

import sys
import time

from satorder.cli.common import (
    add_report_option,
    check_output_path,
    check_report_path,
    command_line,
    load,
    out,
    write_pictures,
    write_report,
)
from satorder.io.files import atomic_write
from satorder.model.requirement import INFEASIBLE, UNKNOWN
from satorder.pipeline.solve import ENGINES, solve
from satorder.render.answer_text import print_answer


def add_parser(sub):
    p = sub.add_parser("solve", help="find a certified order, or show that none exists",
                       description=__doc__)
    p.add_argument("file", help="problem file: JSON, edge list (a b per line) or graph6")
    p.add_argument("--json", action="store_true", help="print one JSON object (the contract)")
    p.add_argument("--out", metavar="FILE", help="also write the JSON answer to FILE")
    p.add_argument("--engine", choices=ENGINES, default="auto",
                   help="forcing (no open pairs, no preferences), sat, both (cross-check), "
                        "auto (default)")
    p.add_argument("--solver", default=None, help="SAT solver name (python-sat), e.g. cadical195")
    p.add_argument("--time-limit", type=float, default=None, metavar="SECONDS",
                   help="give status unknown instead of running longer")
    p.add_argument("--draw", metavar="FILE.svg", help="draw the order's Hasse diagram to FILE.svg")
    add_report_option(p)
    return p


def run(args) -> int:
    end = None if args.time_limit is None else time.monotonic() + args.time_limit
    check_output_path(args.out, args.file)
    check_report_path(args.report, args.file)
    problem = load(args.file)
    ans = solve(problem, engine=args.engine, solver=args.solver, time_limit=args.time_limit)
    text = ans.to_json_text() if (args.json or args.out) else None
    if args.out:
        atomic_write(args.out, text)
    if args.draw and ans.feasible:
        left = 10.0 if end is None else min(10.0, max(0.0, end - time.monotonic()))
        write_pictures(args.draw, args.file, ans.succ, problem.items, weights=problem.weights,
                       time_limit=left)
    if ans.status == INFEASIBLE and (args.report or not args.json):
        # one-screen summary: a minimal core of the requirements
        from satorder.explanation.explain import minimal_core_of

        core = minimal_core_of(ans)
        if core is not None:
            ans.core = core
            ans.stats["minimal_core"] = True
    if args.report:
        from satorder.render.report_pages import solve_report

        write_report(args.report, solve_report(problem, ans, command_line(args)))
    if args.json:
        sys.stdout.write(text)
        sys.stdout.flush()
    else:
        print_answer(ans, out, hint_file=args.file)
    return 3 if ans.status == UNKNOWN else 0
