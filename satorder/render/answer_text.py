"""Human-readable rendering of answers with rich (tables, numbered steps)."""

from __future__ import annotations

from rich.console import Console
from rich.table import Table

from satorder.model import outcome
from satorder.model.answer import Answer
from satorder.model.order_views import covering_pairs, level_numbers, levels
from satorder.model.requirement import FEASIBLE, INFEASIBLE
from satorder.model.wording import requirement_text
from satorder.render.headline import print_headline

MAX_ROWS = 40


def _print_chain(chain, names: list[str], console: Console) -> None:
    """The forcing chain, one numbered arc per line with the pair that forces it."""
    console.print("Forcing chain: each arc forces the next, ending in the reverse of the first.")
    for k, s in enumerate(chain[:MAX_ROWS], 1):
        a, b = s.arc
        why = ("start" if s.because is None else "forced, since " +
               requirement_text(("incomparable", s.because), names))
        console.print(f"  {k:>3}. {names[a]} → {names[b]}   [dim]{why}[/]")
    if len(chain) > MAX_ROWS:
        console.print(f"  … {len(chain) - MAX_ROWS} more steps (use --json).")
    a, b = chain[0].arc
    console.print(f"  The last arc is {names[b]} → {names[a]}, the reverse of step 1.")


def print_requirements(problem, succ, console: Console, limit: int = MAX_ROWS) -> None:
    """The table of how each fixed arc, forbidden arc, open pair and preference came out in
    the order ``succ`` (nothing when the problem has none), rows numbered from 1."""
    rows = outcome.requirement_rows(problem, succ, open_limit=limit + 1)
    if not rows:
        return
    total = len(problem.fixed) + len(problem.forbidden) + problem.num_open + len(problem.prefer)
    table = Table(title="Requirements and how they came out")
    table.add_column("#", justify="right")
    table.add_column("requirement")
    table.add_column("in the answer")
    for k, row in enumerate(rows[:limit], 1):
        colour = {True: "green", False: "red"}.get(row["holds"], "")
        if row["kind"] == "prefer" and not row["holds"]:
            colour = "yellow"
        state = f"[{colour}]{row['state']}[/]" if colour else row["state"]
        table.add_row(str(k), row["text"], state)
    console.print(table)
    if total > limit:
        console.print(f"… and {total - limit} more (use --json).")


def print_answer(ans: Answer, console: Console, hint_file: str | None = None,
                 admitted: str | None = None) -> None:
    """The answer for people: status, the order's levels and covering pairs, the requirements
    table, and ``admitted`` (a line saying how many orders the requirements admit) when given;
    for an infeasible answer its core, numbered from 1."""
    p = ans.problem
    names = p.items
    print_headline(console, ans.status, ans.verified, p, f"engine: {ans.engine}, ")
    if ans.status == FEASIBLE:
        pairs = len(ans.pairs())
        level = level_numbers(ans.succ)
        cover = covering_pairs(ans.succ, level)
        console.print(f"The order has {pairs} ordered pairs; {len(cover)} of them are covering "
                      "pairs (nothing lies between).")
        if ans.cost is not None:
            state = "optimal" if ans.optimal else "best found, not proven optimal"
            console.print(f"Unmet preferences cost {ans.cost} ({state}).")
            for a, b, w in ans.unmet or []:
                console.print("  given up — " + requirement_text(("prefer", (a, b)), names,
                                                                 weight=w))
        lv = levels(ans.succ, level)  # Mirsky levels: longest chain from below
        table = Table(title="Levels (each item sits one above its highest predecessor)",
                      show_lines=False)
        table.add_column("level", justify="right")
        table.add_column("items")
        for k, items in enumerate(lv[:MAX_ROWS]):
            table.add_row(str(k + 1), ", ".join(names[i] for i in sorted(items)[:30])
                          + (" …" if len(items) > 30 else ""))
        console.print(table)
        table = Table(title="Covering pairs (lower → upper)")
        table.add_column("lower")
        table.add_column("")
        table.add_column("upper")
        for a, b in sorted(cover, key=lambda ab: (names[ab[0]], names[ab[1]]))[:MAX_ROWS]:
            table.add_row(names[a], "→", names[b])
        console.print(table)
        if len(cover) > MAX_ROWS:
            console.print(f"… and {len(cover) - MAX_ROWS} more covering pairs (use --json).")
        print_requirements(p, ans.succ, console)
        if admitted:
            console.print(admitted)
    elif ans.status == INFEASIBLE:
        print_no_answer(ans, names, console, hint_file)
    else:
        console.print("No answer within the time limit; try a longer --time-limit.")


def print_no_answer(ans, names: list[str], console: Console, hint_file: str | None = None) -> None:
    """Why an infeasible answer has no order: its core (numbered from 1; "minimal" when
    shrunk) or forcing chain, and where to read more."""
    if ans.core is not None and ans.stats.get("minimal_core"):
        from satorder.render.explanation_text import print_core

        console.print(f"No order exists. These {len(ans.core)} requirements cannot all hold "
                      "(a minimal core: drop any one and the rest can be met):")
        print_core(ans.core, names, console, limit=20)
        if ans.chain is not None:
            _print_chain(ans.chain, names, console)
    elif ans.chain is not None:
        console.print("No order exists.")
        _print_chain(ans.chain, names, console)
    elif ans.core is not None:
        from satorder.render.explanation_text import print_core

        console.print("No order exists. These requirements cannot all hold:")
        print_core(ans.core, names, console, limit=MAX_ROWS)
    if hint_file:
        console.print(f"Run [bold]satorder explain {hint_file}[/] for a minimal core and a "
                      "step-by-step derivation.")
