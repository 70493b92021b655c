"""Human-readable rendering of ``satorder settled`` with rich: the settled pairs first (settled
before, settled unordered), then the free pairs with their shares, then a one-line summary;
and the explanation of ``--why A B``."""

from __future__ import annotations

from rich.console import Console
from rich.table import Table

from satorder.model.requirement import FEASIBLE, INFEASIBLE
from satorder.model.wording import requirement_text
from satorder.render.headline import print_headline

SHOW = 60  # pairs listed per group before "… and N more"


def _percent(x: float) -> str:
    return f"{100 * x:.1f}%" if 0 < x < 1 else f"{100 * x:.0f}%"


def answers_text(res) -> str:
    """How many answers, and how sure the number is."""
    if res.answers is None:
        return "an unknown number of answers"
    digits = str(res.answers)
    # past 30 digits in scientific notation, from the digits (a float overflows past 1e308)
    count = f"{res.answers:,}" if len(digits) <= 30 else \
        f"{digits[0]}.{digits[1:4]}e+{len(digits) - 1}"
    noun = "answer" if res.answers == 1 else "answers"
    if res.method == "approximate":
        return (f"about {count} {noun} (approximate count: within a factor "
                f"{1 + res.epsilon:g} with probability {1 - res.delta:g}; shares from "
                f"{res.samples} almost-uniform samples)")
    return f"{count} {noun} (exact, by {res.method})"


def print_settled(res, console: Console, show: int = SHOW) -> None:
    p = res.problem
    names = p.items
    print_headline(console, res.status, res.verified, p)
    if res.status == INFEASIBLE:
        _print_no_answer(res.answer, names, console, p.source)
        return
    if res.status != FEASIBLE:
        for note in res.notes:
            console.print(f"[yellow]Note: {note}[/]")
        console.print("No verdict within the limits; try a longer --time-limit.")
        return
    before, apart, free = [], [], []
    for a, b, x, y, z, settled in res.pairs():
        if not settled:
            free.append((a, b, x, y, z))
        elif z == 1:
            apart.append((a, b))
        else:
            before.append((a, b))

    def group(title: str, rows, line) -> None:
        console.print(f"\n[bold]{title}[/] ({len(rows):,})")
        for row in rows[:show]:
            console.print("  " + line(*row), highlight=False)
        if len(rows) > show:
            console.print(f"  … and {len(rows) - show:,} more (use --json for every pair).")

    console.print(f"{answers_text(res)}.")
    group("Settled: before in every answer", before,
          lambda a, b: f"{names[a]} < {names[b]}")
    if apart:
        group("Settled: unordered in every answer", apart,
              lambda a, b: f"{names[a]} ∥ {names[b]}")
    free.sort(key=lambda r: (-max(r[2], r[3], r[4]), names[r[0]], names[r[1]]))
    group("Free: ordered differently in different answers", free,
          lambda a, b, x, y, z: f"{names[a]} < {names[b]} {_percent(x)},  "
                                f"{names[b]} < {names[a]} {_percent(y)}"
                                + (f",  unordered {_percent(z)}" if z else ""))
    c = res.counts()
    console.print(f"\n[bold]Summary[/]: {answers_text(res)}; "
                  f"{c['settled_before'] + c['settled_unordered']:,} settled pairs "
                  f"({c['settled_before']:,} before, {c['settled_unordered']:,} unordered); "
                  f"{c['free']:,} free pairs.")
    for check_text in res.checks:
        console.print(f"  [green]checked:[/] {check_text}")
    for note in res.notes:
        console.print(f"[yellow]Note: {note}[/]")


WORDS = {"before": "{a} comes before {b}", "after": "{b} comes before {a}",
         "unordered": "{a} and {b} stay unordered"}


def print_why(why, console: Console) -> None:
    # loads the SAT layer: --why only
    from satorder.render.explanation_text import print_derivation

    names = why.problem.items
    a, b = (names[v] for v in why.pair)
    check = "[green]verified[/]" if why.verified else "[red]not verified[/]"
    if why.status == INFEASIBLE:
        console.print(f"[bold red]INFEASIBLE[/] ({check})")
        _print_no_answer(why.answer, names, console, why.problem.source)
        return
    if why.status != FEASIBLE:
        console.print(f"[bold]{why.status.upper()}[/]: {'; '.join(why.notes)}")
        return
    if not why.settled:
        ways = ", ".join(WORDS[r].format(a=a, b=b) for r in sorted(why.possible))
        console.print(f"[bold]{a}, {b} is free[/] ({check}): different answers order it "
                      f"differently — {ways}.")
        for rel, succ in sorted(why.witnesses.items()):
            order = sorted((names[x], names[y]) for x, s in enumerate(succ) for y in s)
            shown = ", ".join(f"{x} < {y}" for x, y in order[:40])
            more = f", … ({len(order)} ordered pairs)" if len(order) > 40 else ""
            console.print(f"\n  An answer in which {WORDS[rel].format(a=a, b=b)} (certified):"
                          f"\n    {shown or 'nothing ordered'}{more}")
        return
    console.print(f"[bold]Settled[/] ({check}): in every answer "
                  f"{WORDS[why.relation].format(a=a, b=b)}.")
    if why.core is None:
        return
    sn = why.scope.items
    members = why.members()
    opposite = requirement_text(why.opposite, sn)
    console.print(f"\nThese {len(members)} requirements force it: together with the opposite "
                  f"([italic]{opposite}[/]) they admit no order, and without any one of them "
                  "the opposite can hold.")
    table = Table(show_header=True, header_style="bold")
    table.add_column("row", justify="right")
    table.add_column("requirement")
    for k, r in enumerate(why.core, 1):
        mark = "  [italic](the opposite, supposed)[/]" if r == why.opposite else ""
        table.add_row(str(k), requirement_text(r, sn) + mark)
    console.print(table)
    if why.steps is not None:
        print_derivation(console, why.steps, why.core, sn, "the rows above")
    for note in why.notes:
        console.print(f"[yellow]Note: {note}[/]")



def _print_no_answer(answer, names, console: Console, source: str) -> None:
    """No answer at all: why, as ``solve`` shows it (core numbered from 1, or forcing chain)."""
    from satorder.render.answer_text import print_no_answer

    console.print("No order meets every requirement, so no pair is settled or free.")
    if answer is not None:
        print_no_answer(answer, names, console, source)
