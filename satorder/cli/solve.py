"""``satorder solve FILE``: find an order meeting every requirement, or show none exists."""

from __future__ import annotations

import sys
import time

from satorder.cli import options
from satorder.cli.common import (
    check_output_path,
    check_report_path,
    command_line,
    load,
    out,
    write_pictures,
    write_report,
)
from satorder.io.files import atomic_binary
from satorder.model.requirement import INFEASIBLE, UNKNOWN
from satorder.pipeline.solve import ENGINES, solve


def add_parser(sub):
    p = sub.add_parser("solve", description=__doc__)
    p.add_argument("file", help="problem file: JSON, edge list (a b per line) or graph6")
    options.add_json(p)
    options.add_out(p, "the JSON object --json prints, besides the usual output")
    p.add_argument("--engine", choices=ENGINES, default="auto",
                   help="forcing (no open pairs, no preferences), sat, both (cross-check), "
                        "auto (default)")
    options.add_solver(p)
    options.add_time_limit(p, extra="status unknown when no verdict was reached")
    p.add_argument("--draw", metavar="FILE.svg", help="draw the order's Hasse diagram to FILE.svg")
    options.add_report(p)
    return p


def run(args) -> int:
    end = None if args.time_limit is None else time.monotonic() + args.time_limit
    check_output_path(args.out, args.file)
    check_report_path(args.report, args.file)
    problem = load(args.file)
    ans = solve(problem, engine=args.engine, solver=args.solver, time_limit=args.time_limit)
    if args.out:  # streamed: the answer's JSON is never held in memory whole
        with atomic_binary(args.out) as f:
            ans.write_json(f.write)
    if args.json:  # the answer as found (before a minimal core is sought for the summary)
        _print_json(ans, args.out)
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
    if not args.json:
        from satorder.render.answer_text import print_answer

        admitted = _admitted(problem, args.file) if ans.feasible else None
        print_answer(ans, out, hint_file=args.file, admitted=admitted)
    return 3 if ans.status == UNKNOWN else 0


def _admitted(problem, file: str) -> str:
    """One line: how many orders the requirements admit, when that is cheap to know (counted
    by modular decomposition and checked), or that other answers may exist."""
    from satorder.pipeline.count import answers_admitted

    res = answers_admitted(problem)
    hard = "hard requirements" if problem.prefer else "requirements"
    if res is None:
        why = (f" ({problem.num_open} pairs are open)" if problem.has_open_pairs else "")
        return (f"Other orders may also meet the {hard}{why}; satorder count {file} says how "
                "many.")
    if res.count == 1:
        return f"This is the only order the {hard} admit (counted by modular decomposition, " \
               "checked)."
    return (f"The {hard} admit {res.count:,} orders; this is one of them (counted by modular "
            f"decomposition, checked; satorder orders {file} lists them).")


def _print_json(ans, written: str | None) -> None:
    """The JSON answer on standard output: a copy of the file just written, or streamed."""
    sys.stdout.flush()
    binary = getattr(sys.stdout, "buffer", None)
    write = binary.write if binary is not None else (
        lambda data: sys.stdout.write(data.decode("utf-8")))
    if written:
        with open(written, "rb") as f:
            for block in iter(lambda: f.read(1 << 20), b""):
                write(block)
    else:
        ans.write_json(write)
    (binary or sys.stdout).flush()
