"""``satorder demo``: solve the embedded demo problems (an invented harbour-festival set-up).

Part 1 is the plain problem (pairs that must be sequenced, all others side by side), answered by
the forcing algorithm.  Part 2 adds hard rules (fixed and forbidden arcs) and leaves a few pairs
open, answered by the SAT engine.  Part 3 adds one rule too many and shows the core the SAT
engine reports.  Part 4 counts the answers and keeps the weightiest wishes.  Every answer is
checked independently before it is shown.  With ``--pictures DIR`` the demo also draws one
picture of each kind and a report into DIR (``make demo`` uses ``demo-output/``).
"""

from __future__ import annotations

import json
from importlib import resources

from satorder.cli.common import err, out
from satorder.io.readers import problem_from_dict
from satorder.model.wording import requirement_text
from satorder.pipeline.solve import solve
from satorder.render.answer_text import print_answer
from satorder.sat.direct import direct_encoding


def add_parser(sub):
    p = sub.add_parser("demo", description=__doc__)
    p.add_argument("--pictures", metavar="DIR",
                   help="also write one picture of each kind and a report into DIR")
    return p


def _load(name: str):
    text = resources.files("satorder").joinpath(f"data/{name}").read_text(encoding="utf-8")
    doc = json.loads(text)
    return doc, problem_from_dict(doc, source=name)


def load_demo():
    """The plain demo problem: ``(json document, Problem)``."""
    return _load("demo.json")


def load_demo_rules():
    """The demo with fixed and forbidden arcs and open pairs: ``(json document, Problem)``."""
    return _load("demo-rules.json")


def run(args) -> int:
    doc, problem = load_demo()
    out.rule("[bold]satorder demo, part 1: who must wait for whom[/]")
    out.print(doc.get("comment", ""))
    out.print(f"{problem.n} jobs, {problem.num_comparable} pairs that must be sequenced.\n")
    print_answer(solve(problem), out)
    out.print("[dim]This is one of several orders that honour these pairs (part 4 counts them); "
              "which job goes first in each pair is not yet pinned down. Part 2 adds the crews' "
              "fixed rules.[/]")

    doc, rules = load_demo_rules()
    out.rule("[bold]part 2: hard rules and undecided pairs (SAT engine)[/]")
    out.print(doc.get("comment", ""))
    n = rules.n
    opened = sum(1 for a in range(n) for b in range(a + 1, n) if rules.is_open(a, b))
    out.print(f"{len(rules.fixed)} fixed arcs, {len(rules.forbidden)} forbidden arc, "
              f"{opened} open pairs.\n")
    ans = solve(rules)
    print_answer(ans, out)  # with the table of how each rule and open pair came out
    base = direct_encoding(rules)
    out.print(f"CNF: {ans.stats.get('variables')} variables and {ans.stats.get('clauses')} "
              f"clauses, against {base.nv} variables and {base.num_clauses} clauses for the "
              "textbook encoding over every item triple.\n")

    out.rule("[bold]part 3: one rule too many[/]")
    names = rules.index
    extra = ("open-gates", "sweep-chimneys")
    out.print(f"Suppose the crews also demand {extra[0]} before {extra[1]}.\n")
    more = rules.with_requirements(fixed=rules.fixed + [(names[extra[0]], names[extra[1]])])
    more.adj[names[extra[0]]].add(names[extra[1]])
    more.adj[names[extra[1]]].add(names[extra[0]])
    print_answer(solve(more), out)
    _part_counts_and_wishes(problem, rules)
    if args.pictures:
        from satorder.render.gallery import write_gallery

        out.rule("[bold]pictures[/]")
        with err.status(f"drawing into {args.pictures}…"):
            written = write_gallery(args.pictures, problem, rules, more)
        out.print(f"One picture of each kind and a report, written to {args.pictures}/:")
        for path in written:
            out.print(f"  {path}")
    return 0


def _part_counts_and_wishes(plain, rules) -> None:
    """Part 4: how many answers each round allows, then weighted wishes (MaxSAT)."""
    from satorder.pipeline.count import check_count, count_answers

    out.rule("[bold]part 4: how many orders, and the one that keeps the weightiest wishes[/]")
    rounds = (("the plain set-up (part 1)", plain), ("the round with rules (part 2)", rules))
    for label, p in rounds:
        res = count_answers(p)
        check_count(res)
        how = "modular decomposition" if res.method == "modular-decomposition" else \
            "listing them with the SAT engine"
        out.print(f"{label} allows [bold]{res.count}[/] orders (counted by {how}, checked).")
    doc, _ = _load("demo-rules.json")
    wishes = json.loads(resources.files("satorder").joinpath("data/demo-wishes.json")
                        .read_text(encoding="utf-8"))
    wished = problem_from_dict({**doc, "prefer": wishes["prefer"]}, source="demo-wishes.json")
    out.print("\n" + wishes["comment"])
    for a, b, w in wished.prefer:
        out.print("  " + requirement_text(("prefer", (a, b)), wished.items, weight=w))
    out.print()
    print_answer(solve(wished), out)
