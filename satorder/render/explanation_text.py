"""Human-readable rendering of an explanation with rich: core, obstruction, numbered
derivation (cases indented), smallest-core note and repairs."""

from __future__ import annotations

from rich.console import Console
from rich.table import Table

from satorder.explanation.derivation import describe
from satorder.explanation.repairs import repair_text
from satorder.model.requirement import FEASIBLE, INFEASIBLE, Requirement, items_of
from satorder.model.wording import requirement_text
from satorder.render.headline import print_headline

MAX_STEPS = 120
MAX_ORDER_PAIRS = 12


def print_core(core: list[Requirement], names: list[str], console: Console,
               limit: int = 40) -> None:
    """The core as a table: one numbered requirement per row (rows count from 1, as the
    derivation cites them)."""
    table = Table(show_header=True, header_style="bold")
    table.add_column("row", justify="right")
    table.add_column("requirement")
    for k, r in enumerate(core[:limit], 1):
        table.add_row(str(k), requirement_text(r, names))
    console.print(table)
    if len(core) > limit:
        console.print(f"… and {len(core) - limit} more (use --json).")


def print_derivation(console: Console, steps, core, names, rows: str) -> None:
    """A replayed derivation, one numbered step a line (cases indented), each citing earlier
    steps and the ``rows`` of the table above; at most :data:`MAX_STEPS` steps."""
    console.print("\n[bold]Derivation[/] (cases are indented; each step cites earlier steps "
                  f"and {rows}):")
    for st in steps[:MAX_STEPS]:
        claim, why = describe(st, core, names)
        style = "bold red" if st.arc is None else ("cyan" if st.rule == "assume" else "")
        body = f"[{style}]{claim}[/]" if style else claim
        console.print(f"  {st.number:>3}. {'    ' * st.depth}{body}   [dim]{why}[/]",
                      highlight=False)
    if len(steps) > MAX_STEPS:
        console.print(f"  … {len(steps) - MAX_STEPS} more steps (use --json).")
    console.print("  [dim]Every step was replayed by the independent checker.[/]")


def print_explanation(expl, console: Console, file: str | None = None) -> None:
    p = expl.problem
    names = p.items
    print_headline(console, expl.status, expl.verified, p)
    if expl.status == FEASIBLE:
        hint = f" Run [bold]satorder solve {file}[/] to see it." if file else ""
        console.print(f"An order meeting every requirement exists; nothing to explain.{hint}")
        return
    if expl.status != INFEASIBLE:
        console.print("No verdict within the limits.")
        return
    core = expl.core or []
    if getattr(expl, "minimal", True):
        console.print(f"\n[bold]Minimal core[/]: these {len(core)} requirements cannot all "
                      "hold (on their own, every other pair left open); drop any one and the "
                      "rest can.")
    else:
        console.print(f"\n[bold]Core, not minimal[/]: these {len(core)} requirements cannot "
                      "all hold (on their own, every other pair left open); shrinking stopped "
                      "early, so some may be dropped.")
    print_core(core, names, console)
    if expl.obstruction is not None:
        console.print(
            f"\n[bold]Obstruction[/]: the comparable pairs alone admit no order. The "
            f"{len(expl.obstruction)} items {', '.join(names[v] for v in expl.obstruction)} "
            "induce a subgraph with no transitive orientation; leave out any one of them and "
            "one exists.")
    if expl.steps is not None:
        print_derivation(console, expl.steps, core, names, "core rows")
    if expl.smallest is not None:
        s = expl.smallest
        if s.get("proved"):
            console.print(f"\nSmallest core: {s['size']} requirements, proven minimum "
                          f"({s['scope']}).")
        if s.get("note"):
            console.print(f"[yellow]Smallest core: {s['note']}[/]")
    if expl.repairs is not None and not expl.repairs:
        console.print("\n[bold]Repairs[/]: none found and verified within the limits.")
    elif expl.repairs is not None:
        console.print(f"\n[bold]Repairs[/] ({len(expl.repairs)}; each is a minimal set of "
                      "requirements to drop, checked by finding an order after the change):")
        focus = set(items_of(core))
        for k, rep in enumerate(expl.repairs, 1):
            console.print(f"  {k}. {repair_text(rep.drop, names)}")
            if rep.succ is not None:
                cover = sorted((a, b) for a in focus for b in rep.succ[a] if b in focus)
                total = sum(len(s) for s in rep.succ)
                shown = ", ".join(f"{names[a]} < {names[b]}" for a, b in cover[:MAX_ORDER_PAIRS])
                more = " …" if len(cover) > MAX_ORDER_PAIRS else ""
                console.print(f"     then an order with {total} ordered pairs exists; among "
                              f"the core's items: {shown or 'nothing ordered'}{more}")
    for note in expl.notes:
        console.print(f"[yellow]Note: {note}[/]")
