"""``satorder measure FILE``: height, width, partitions, Hasse diagram and dimension of the
order found, each with a witness that an independent check has confirmed."""

from __future__ import annotations

import time

from rich.table import Table

from satorder.cli import options
from satorder.cli.common import (
    check_draw,
    check_output_path,
    check_report_path,
    command_line,
    dumps,
    err,
    load,
    out,
    print_json,
    write_pictures,
    write_report,
)
from satorder.io.files import atomic_write
from satorder.measure.summary import measure
from satorder.model.requirement import UNKNOWN
from satorder.pipeline.solve import ENGINES, solve

SHOW = 12  # items listed per witness on screen


def add_parser(sub):
    p = sub.add_parser("measure", description=__doc__)
    p.add_argument("file", help="problem file: JSON, edge list (a b per line) or graph6")
    options.add_json(p)
    options.add_out(p, "the JSON object --json prints, besides the usual output")
    p.add_argument("--draw", metavar="FILE.svg",
                   help="draw the Hasse diagram to FILE.svg (a summary by level above 150 items; "
                        "for dimension 2 also a dominance drawing to FILE-dominance.svg)")
    p.add_argument("--engine", choices=ENGINES, default="auto",
                   help="engine that finds the order (see 'satorder solve --help')")
    p.add_argument("--sat-limit", type=int, default=150, metavar="N",
                   help="largest part (items) whose dimension ≥ 3 is settled by SAT "
                        "(default 150)")
    options.add_time_limit(p, default=60.0, extra="covers finding and measuring the order; "
                           "the dimension search stops in time to report bounds")
    options.add_solver(p, "for finding the order")
    options.add_report(p)
    return p


def _names(names, items, limit=SHOW):
    shown = ", ".join(names[i] for i in items[:limit])
    return shown + (f", … ({len(items)} in all)" if len(items) > limit else "")


def run(args) -> int:
    end = time.monotonic() + args.time_limit
    check_output_path(args.out, args.file)
    check_report_path(args.report, args.file)
    problem = load(args.file)
    check_draw(args.draw, args.file)
    with err.status("finding the order…"):
        ans = solve(problem, engine=args.engine, solver=args.solver,
                    time_limit=args.time_limit)
    if not ans.feasible:
        doc = {"status": ans.status, "height": None, "width": None, "dimension": None,
               "item_count": problem.n}
        if args.out:
            atomic_write(args.out, dumps(doc))
        if args.report:
            from satorder.render.report_pages import solve_report

            write_report(args.report, solve_report(problem, ans, command_line(args),
                                                   title="satorder measure"))
        if args.json:
            print_json(doc)
        else:
            out.print(f"[bold red]{ans.status.upper()}[/]: no order to measure. Run "
                      f"[bold]satorder solve {args.file}[/] to see why.")
        return 3 if ans.status == UNKNOWN else 0
    weights = problem.weights
    with err.status("measuring…") as status:
        m = measure(ans.succ, weights=weights, sat_limit=args.sat_limit,
                    time_limit=max(0.0, end - time.monotonic()),
                    progress=lambda s: status.update(f"measuring: {s}…"))
    doc = {"status": ans.status, **m.to_json(problem.items)}
    if args.out:
        atomic_write(args.out, dumps(doc))
    if args.draw:
        write_pictures(args.draw, args.file, ans.succ, problem.items, m, weights)
    if args.report:
        from satorder.render.report_pages import measure_report

        write_report(args.report, measure_report(problem, ans, m, command_line(args)))
    if args.json:
        print_json(doc)
    else:
        _show(problem.items, m, weights is not None)
    return 0


def _show(names, m, weighted):
    dim = m.dimension
    t = Table(title=f"Figures of the order ({m.n} items, {m.pairs} ordered pairs; "
              + ("all witnesses verified" if m.verified else "NOT verified") + ")")
    t.add_column("figure")
    t.add_column("value", justify="right")
    t.add_column("witness")
    t.add_row("height", str(m.height.value), "chain: " + " < ".join(
        names[i] for i in m.height.witness[:SHOW]) + (" < …" if m.height.value > SHOW else ""))
    t.add_row("", "", f"partition into {len(m.height.partition)} antichains (levels)")
    t.add_row("width", str(m.width.value), "antichain: " + _names(names, m.width.witness))
    t.add_row("", "", f"partition into {len(m.width.partition)} chains")
    if dim.status == "exact":
        t.add_row("dimension", str(dim.value), f"realizer of {len(dim.realizer)} linear orders")
    else:
        how = (f"upper bound by a realizer of {len(dim.realizer)} linear orders"
               if dim.realizer is not None else "upper bound from width and item count")
        t.add_row("dimension", f"{dim.lower}–{dim.upper}",
                  "bounded: " + "; ".join(dim.notes + [how]))
    if dim.witness is not None:
        t.add_row("", "", f"sub-order of dimension ≥ {dim.witness_lower}: "
                  + _names(names, dim.witness))
    t.add_row("Hasse diagram", str(len(m.hasse)), "covering pairs")
    t.add_row("linear extension", "", _names(names, m.linear_extension))
    if weighted:
        wc, wa = m.weighted_chain, m.weighted_antichain
        t.add_row("max-weight chain", str(wc.value), " < ".join(names[i] for i in wc.witness))
        t.add_row("max-weight antichain", str(wa.value), _names(names, wa.witness))
    out.print(t)
