"""``satorder count FILE``: the number of answers (orders meeting every requirement).

Problems with open pairs are counted by listing every answer, which is exponential work: before
it starts, standard error says how many answers there can be at most.  Past 10,000 listed
answers the count turns approximate (ApproxMC, with ε and δ stated; ``--method enumeration``
insists on listing).  The time limit or Ctrl-C stops the listing with a lower bound
(``"exact": false``, ``"stopped": "time-limit"`` or ``"interrupted"``; exit status 3 or 130).
"""

from __future__ import annotations

from rich.progress import Progress, SpinnerColumn, TextColumn, TimeElapsedColumn

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
from satorder.io.files import atomic_write
from satorder.pipeline.count import (
    APPROXIMATE,
    DECOMPOSITION,
    ENUMERATION,
    LISTING_THRESHOLD,
    METHODS,
    check_count,
    count_answers,
)
from satorder.pipeline.orders import INTERRUPTED, LIMIT, TIME_LIMIT

TREE_LIMIT = 60  # items up to which the decomposition tree is drawn on screen
DRAW_LIMIT = 300  # items up to which --draw makes a picture


def decomposition_tree(problem):
    """The modular decomposition as a rich Tree, each node with its share of the count."""
    from math import factorial

    from rich.tree import Tree

    from satorder.graph.modular import LEAF, PRIME, SERIES, modular_decomposition

    names = problem.items

    def label(node):
        if node.kind == LEAF:
            return names[node.item]
        k = len(node.children)
        share = {SERIES: f"{k}! = {factorial(k):,} orders of its parts",
                 PRIME: "2 orientations"}.get(node.kind, "no choice")
        return f"[bold]{node.kind}[/] ({len(node.items)} items, {share})"

    root = modular_decomposition(problem.adj)
    tree = Tree("modular decomposition (choices multiply, before any fixed arcs)")
    stack = [(root, tree)]
    while stack:
        node, parent = stack.pop()
        branch = parent.add(label(node))
        stack.extend((c, branch) for c in reversed(node.children))
    return tree


def add_parser(sub):
    p = sub.add_parser("count", description=__doc__)
    p.add_argument("file", help="problem file: JSON, edge list (a b per line) or graph6")
    options.add_json(p)
    options.add_out(p, "the JSON object --json prints, besides the usual output")
    p.add_argument("--method", choices=METHODS, default="auto",
                   help="modular decomposition (problems without open pairs), enumeration by "
                        "SAT with blocking clauses (every answer, however many), approximate "
                        "(ApproxMC), or auto (default: enumeration that turns approximate past "
                        f"{LISTING_THRESHOLD:,} answers)")
    p.add_argument("--limit", type=int, default=None, metavar="N",
                   help="enumeration stops after N answers and reports a lower bound")
    options.add_time_limit(p, extra="an enumeration reports a lower bound; the check that an "
                                     "answer exists gets as long again")
    options.add_solver(p)
    options.add_seed(p, default=0, extra="ApproxMC's random hashes")
    p.add_argument("--draw", metavar="FILE.svg",
                   help=f"draw the modular decomposition tree (up to {DRAW_LIMIT} items)")
    options.add_report(p)
    return p


def run(args) -> int:
    check_output_path(args.out, args.file)
    check_report_path(args.report, args.file)
    if args.limit is not None and args.limit < 1:
        raise UsageError(f"--limit must be at least 1, got {args.limit}")
    check_draw(args.draw, args.file)
    problem = load(args.file)
    if args.draw and not 0 < problem.n <= DRAW_LIMIT:
        raise UsageError(f"{args.file}: {problem.n} items; --draw needs 1 to {DRAW_LIMIT}")
    with Progress(SpinnerColumn(), TextColumn("{task.description}"), TimeElapsedColumn(),
                  console=err.real, transient=True, disable=args.json) as bar:
        task = bar.add_task("counting…", total=None)

        def progress(k):
            bar.update(task, description=f"enumerating: {k:,} certified answers")

        res = count_answers(problem, limit=args.limit, solver=args.solver,
                            time_limit=args.time_limit, method=args.method,
                            on_progress=progress,
                            on_enumeration=lambda bound: _warn_exponential(bound, args.method),
                            seed=args.seed)
        if res.reason == INTERRUPTED:  # stop now: every order counted was certified already
            res.stats["checks"] = ["every order counted was certified; the cross-check was "
                                   "skipped after Ctrl-C"]
        else:
            bar.update(task, description="checking the count with another engine…")
            check_count(res, solver=args.solver, time_limit=args.time_limit)
    doc = res.to_json()
    status = {INTERRUPTED: 130, TIME_LIMIT: 3}.get(res.reason, 0)
    if args.draw:
        from satorder.graph.modular import modular_decomposition
        from satorder.render.decomposition_svg import decomposition_svg

        title = f"{problem.source}: modular decomposition of the comparable pairs"
        atomic_write(args.draw, decomposition_svg(modular_decomposition(problem.adj),
                                                  problem.items, title))
        err.print(f"wrote {args.draw}", markup=False)
    if args.out:
        atomic_write(args.out, dumps(doc))
    if args.report:
        from satorder.render.report_pages import count_report

        write_report(args.report, count_report(res, command_line(args)))
    if args.json:
        print_json(doc)
        return status
    how = {DECOMPOSITION: "by modular decomposition", ENUMERATION: "by SAT enumeration"}
    text = f"{res.count:,}"
    clash = res.stats.get("clash")
    if clash:
        from satorder.model.requirement import Requirement
        from satorder.model.wording import requirement_text

        words = [requirement_text(Requirement.from_json(r, problem.index), problem.items)
                 for r in clash]
        out.print(f"[bold]0[/] answers (exact): two requirements clash on one pair — "
                  f"{words[0]}; {words[1]}. Run satorder explain {args.file} for repairs.")
    elif res.method == APPROXIMATE:
        out.print(f"[bold]about {text}[/] answers (approximate model counting: {doc['guarantee']}; "
                  f"{doc['lower_bound']:,} certified answers listed first).")
    elif res.exact:
        out.print(f"[bold]{text}[/] answers ({how[res.method]}, exact).")
    else:
        why = {LIMIT: "--limit", TIME_LIMIT: "the time limit", INTERRUPTED: "Ctrl-C"}
        out.print(f"[bold]at least {text}[/] answers ({how[res.method]}; "
                  f"{why.get(res.reason, res.reason)} stopped it before the end).")
    if len(str(res.count)) > 30:
        out.print(f"  ≈ {res.count:.3e}" if res.count < 10**300 else
                  f"  a number with {len(str(res.count))} digits")
    nodes = res.stats.get("nodes")
    if nodes:
        out.print(f"  decomposition: {nodes['series']} series, {nodes['prime']} prime, "
                  f"{nodes['parallel']} parallel nodes")
        if problem.n <= TREE_LIMIT:
            out.print(decomposition_tree(problem))
    for c in res.stats.get("checks", []):
        out.print(f"  [green]checked:[/] {c}")
    if problem.prefer:
        out.print("  preferences rank answers but rule none out, so they are not counted.")
    return status


EXPONENTIAL_AT = 4.0  # log10 of the most answers from which the listing's cost is announced


def _warn_exponential(log10_bound: float, method: str) -> None:
    """Say on standard error, before listing starts, how many answers there can be."""
    if log10_bound < EXPONENTIAL_AT:
        return
    if method == "auto":
        err.print(f"satorder count: up to ~10^{log10_bound:.0f} answers are possible (every "
                  "pair's possible states multiplied); they are listed one by one up to "
                  f"{LISTING_THRESHOLD:,} and counted approximately beyond (ApproxMC; "
                  "--method enumeration lists every one)", markup=False)
        return
    err.print(f"satorder count: listing the answers one by one, exponential work: up to "
              f"~10^{log10_bound:.0f} answers are possible (every pair's possible states "
              "multiplied), each costing a SAT call; --time-limit or Ctrl-C stops with a "
              "lower bound", markup=False)
