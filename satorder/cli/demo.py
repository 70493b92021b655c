"""``satorder demo``: solve the embedded demo problem (an invented festival set-up)."""

from __future__ import annotations

import json
from importlib import resources

from ..readers import problem_from_dict
from ..render import print_answer
from ..solve import solve
from .common import out


def add_parser(sub):
    return sub.add_parser("demo", help="solve a small embedded example and show the answer",
                          description=__doc__)


def load_demo():
    text = resources.files("satorder").joinpath("data/demo.json").read_text(encoding="utf-8")
    doc = json.loads(text)
    return doc, problem_from_dict(doc, source="demo.json")


def run(args) -> int:
    doc, problem = load_demo()
    out.rule("[bold]satorder demo[/]")
    out.print(doc.get("comment", ""))
    out.print(f"{problem.n} jobs, {problem.num_comparable} pairs that must be sequenced.\n")
    ans = solve(problem)
    print_answer(ans, out)
    return 0
