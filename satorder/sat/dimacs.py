"""DIMACS CNF export of an :class:`~satorder.sat.encoding.Encoding`, with comment lines that
name each literal and selector so that a model from any SAT solver can be read back."""

from __future__ import annotations

import json
from collections.abc import Iterator


def _q(name: str) -> str:
    """An item name as written in comments: JSON-quoted if it has spaces or '<'."""
    if not name or any(ch.isspace() or ch in '<"' for ch in name):
        return json.dumps(name)
    return name


def variable_names(enc) -> Iterator[tuple[int, str]]:
    """``(literal, "a<b")`` for every arc that has a literal (both directions of a pair)."""
    names = enc.problem.items
    for a, b, up, down in sorted(enc.pair_literals(), key=lambda t: (abs(t[2]), t[0], t[1])):
        yield up, f"{_q(names[a])}<{_q(names[b])}"
        yield down, f"{_q(names[b])}<{_q(names[a])}"


def to_dimacs(enc, assume_selectors: bool = True) -> str:
    """DIMACS CNF text of the clauses so far, with comment lines naming each literal
    (``c 17 kiln<loom``) and each selector (``c selector 57 comparable kiln loom``).

    With selectors, one unit clause per selector switches every requirement on
    (``assume_selectors``); delete a unit to drop that requirement.
    """
    names = enc.problem.items
    units = [[s] for s in enc.selector_of.values()] if assume_selectors else []
    lines = [
        "c satorder CNF: a model is a strict partial order meeting the hard requirements",
        f"c source {enc.problem.source}",
        "c each line 'c LIT a<b' says literal LIT is true exactly when a comes before b;",
        "c pairs without a literal stay unordered",
    ]
    if enc.problem.prefer:
        lines.append("c preferences are soft wishes and are not part of this CNF")
    if enc.unsat_reason is not None:
        why = "; ".join(f"{kind} {_q(names[a])} {_q(names[b])}"
                        for kind, (a, b) in enc.unsat_reason)
        lines.append(f"c no order exists (the empty clause below): these requirements clash: "
                     f"{why}")
    lines += [f"c {lit} {text}" for lit, text in variable_names(enc)]
    for (kind, (a, b)), s in sorted(enc.selector_of.items(), key=lambda t: t[1]):
        lines.append(f"c selector {s} {kind} {_q(names[a])} {_q(names[b])}")
    clauses = enc.hard + units
    lines.append(f"p cnf {enc.nv} {len(clauses)}")
    lines += [" ".join(map(str, cl)) + " 0" for cl in clauses]
    return "\n".join(lines) + "\n"
