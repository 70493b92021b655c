"""``satorder explain FILE``: why no order exists — a minimal core of your requirements, a
step-by-step derivation, an obstruction, and repairs.

When the time limit or Ctrl-C stops the shrinking of the core, the requirements reached so far
(still unable to hold together) are printed, marked not minimal (exit status 3 or 130).
"""

from __future__ import annotations

from satorder.cli import options
from satorder.cli.common import (
    UsageError,
    check_draw,
    check_output_path,
    check_report_path,
    command_line,
    dumps,
    err,
    load,
    out,
    print_json,
    write_report,
)
from satorder.explanation.explain import explain
from satorder.io.files import atomic_write
from satorder.model.requirement import INFEASIBLE, UNKNOWN
from satorder.render.explanation_svg import MAX_ITEMS, explanation_svg
from satorder.render.explanation_text import print_explanation


def add_parser(sub):
    p = sub.add_parser("explain", description=__doc__)
    p.add_argument("file", help="problem file: JSON, edge list (a b per line) or graph6")
    options.add_json(p)
    options.add_out(p, "the JSON object --json prints, besides the usual output")
    p.add_argument("--smallest", action="store_true",
                   help="look for a core with the fewest requirements (small problems)")
    p.add_argument("--repairs", type=int, default=0, metavar="K",
                   help="list up to K minimal sets of requirements whose removal fixes it")
    p.add_argument("--draw", metavar="FILE.svg", help="write a picture of the core (SVG)")
    options.add_time_limit(p, default=30.0, extra="shrinking the core, then --smallest and "
                           "--repairs each get what is left (a core cut short is marked not "
                           "minimal)")
    options.add_solver(p, "for the SAT engine's core on problems of more than 60 items")
    options.add_report(p)
    return p


def run(args) -> int:
    if args.repairs < 0:
        raise UsageError(f"--repairs must be 0 or more, got {args.repairs}")
    check_draw(args.draw, args.file)
    check_output_path(args.out, args.file)
    check_report_path(args.report, args.file)
    problem = load(args.file)
    with err.status("explaining…") as status:
        expl = explain(problem, smallest=args.smallest, repairs=args.repairs,
                       time_limit=args.time_limit, solver=args.solver,
                       progress=lambda stage: status.update(f"explaining: {stage}…"))
    if args.out:
        atomic_write(args.out, dumps(expl.to_json()))
    drawn = False
    if args.draw:
        if expl.status != INFEASIBLE:
            err.print(f"satorder: nothing to draw: the problem is {expl.status}", markup=False)
        elif len(expl.involved_items()) > MAX_ITEMS:
            err.print(f"satorder: no picture: the core spans {len(expl.involved_items())} items, "
                      f"more than the {MAX_ITEMS} a legible picture can hold", markup=False)
        else:
            atomic_write(args.draw, explanation_svg(expl))
            drawn = True
    if args.report:
        from satorder.render.report_pages import explain_report

        write_report(args.report, explain_report(expl, command_line(args)))
    if args.json:
        print_json(expl.to_json())
    else:
        print_explanation(expl, out, file=args.file)
        if drawn:
            out.print(f"Picture written to {args.draw}")
    if expl.stopped == "interrupted":
        return 130
    return 3 if expl.status == UNKNOWN or not expl.minimal else 0
