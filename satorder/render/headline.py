"""The first line of every result printed for people: status, size, and the checks' verdict."""

from __future__ import annotations

from rich.console import Console

from satorder.model.requirement import FEASIBLE, INFEASIBLE


def print_headline(console: Console, status: str, verified: bool, problem,
                   detail: str = "") -> None:
    """The first line of every result: the status in its colour, the problem's size, and
    whether the independent checks accepted it (after ``detail``)."""
    check = "[green]verified[/]" if verified else "[red]not verified[/]"
    colour = {FEASIBLE: "green", INFEASIBLE: "red"}.get(status, "yellow")
    console.print(f"[bold {colour}]{status.upper()}[/]  {problem.n:,} items, "
                  f"{problem.num_comparable:,} comparable pairs  ({detail}{check})")
