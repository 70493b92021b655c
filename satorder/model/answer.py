"""The answer object every engine returns, and its JSON form (the CLI contract)."""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

from satorder.model import order as order_ops
from satorder.model import order_views, outcome
from satorder.model.problem import Problem
from satorder.model.requirement import FEASIBLE, Requirement, Status
from satorder.model.wording import requirement_text


@dataclass
class Answer:
    """Result of solving a problem.

    ``status`` is a :class:`~satorder.model.requirement.Status` (a string given here is turned
    into one).  ``succ`` holds the order as successor sets (transitively closed) when ``status``
    is ``feasible``; ``chain`` holds a forcing-chain conflict certificate and ``core`` a list of
    requirements (:class:`~satorder.model.requirement.Requirement`, item ids) that cannot hold
    together, when infeasible.
    ``verified`` is set only by the independent checks in :mod:`satorder.certify`.
    """

    problem: Problem
    status: Status
    engine: str
    succ: list[set[int]] | None = None
    chain: list | None = None
    core: list[Requirement] | None = None
    cost: int | None = None
    optimal: bool | None = None
    lower_bound: int | None = None
    unmet: list[tuple[int, int, int]] | None = None
    stats: dict[str, Any] = field(default_factory=dict)
    verified: bool = False

    def __post_init__(self) -> None:
        self.status = Status(self.status)

    @property
    def feasible(self) -> bool:
        return self.status == FEASIBLE

    def pairs(self) -> list[tuple[int, int]]:
        """Every ordered pair (lower, upper) as item ids."""
        return list(order_ops.pairs(self.succ or []))

    def named_pairs(self) -> list[list[str]]:
        names = self.problem.items
        return [[names[a], names[b]] for a, b in order_ops.pairs(self.succ or [])]

    def covering_pairs(self) -> list[tuple[int, int]]:
        return order_ops.covering_pairs(self.succ or [])

    def views(self) -> dict[str, list]:
        """``levels`` (lists of item names, level 1 first), ``covering`` (covering pairs
        ``[lower, upper]``) and ``sequence`` (one linear extension) of a feasible answer
        (:mod:`satorder.model.order_views`)."""
        names = self.problem.items
        level = order_views.level_numbers(self.succ)
        lv = order_views.levels(self.succ, level)
        return {"levels": [[names[a] for a in row] for row in lv],
                "covering": [[names[a], names[b]]
                             for a, b in order_views.covering_pairs(self.succ, level)],
                "sequence": [names[a] for row in lv for a in row]}

    def requirement_rows(self) -> list[dict[str, Any]]:
        """How each fixed arc, forbidden arc, open pair and preference came out in a feasible
        answer (:func:`satorder.model.outcome.requirement_rows`)."""
        return outcome.requirement_rows(self.problem, self.succ)

    def to_networkx(self):
        """The order as a networkx DiGraph on item names (an arc for every ordered pair)."""
        import networkx as nx

        g = nx.DiGraph()
        g.add_nodes_from(self.problem.items)
        g.add_edges_from((a, b) for a, b in self.named_pairs())
        return g

    def to_json_text(self) -> str:
        """The JSON document as one line of text; the (possibly huge) ``order`` list is written
        directly from the successor sets instead of through millions of small lists, and so
        are the ``levels``, ``covering`` and ``sequence`` views
        (:func:`satorder.model.order_views.views_json`)."""
        import json

        doc = self.to_json(include_order=False)
        if self.succ is None:
            return json.dumps(doc, separators=(",", ":")) + "\n"
        q = [json.dumps(name) for name in self.problem.items]
        parts = []
        for a, s in enumerate(self.succ):
            if s:
                qa = "[" + q[a] + ","
                parts.append(",".join([qa + q[b] + "]" for b in s]))
        head = json.dumps({"status": doc.pop("status")}, separators=(",", ":"))[:-1]
        rest = json.dumps(doc, separators=(",", ":"))[1:]
        # --- views of the order (levels, covering, sequence): see satorder.model.order_views
        views = order_views.views_json(self.succ, q)
        return "".join((head, ',"order":[', ",".join(parts), "],", views, ",", rest, "\n"))

    def to_json(self, include_order: bool = True) -> dict[str, Any]:
        """The machine-readable answer (fields fixed by the CLI contract, extras welcome).
        ``include_order=False`` leaves out ``order`` and its views (``levels``, ``covering``,
        ``sequence``), which :meth:`to_json_text` writes straight from the successor sets."""
        p = self.problem
        names = p.items
        doc: dict[str, Any] = {"status": self.status, "engine": self.engine}
        if self.succ is not None and include_order:
            doc["order"] = self.named_pairs()
            doc.update(self.views())
        if self.succ is not None:
            # --- how each fixed / forbidden arc, open pair and preference came out
            doc["requirements"] = self.requirement_rows()
            hidden = p.num_open - outcome.OPEN_ROWS
            if hidden > 0:
                doc["requirements_omitted"] = {"open": hidden}
        if self.cost is not None:
            doc["cost"] = self.cost
        if self.optimal is not None:
            doc["optimal"] = self.optimal
        if self.lower_bound is not None:
            doc["lower_bound"] = self.lower_bound
        if self.unmet is not None:
            doc["unmet"] = [
                {"before": names[a], "after": names[b], "weight": w} for a, b, w in self.unmet
            ]
        if self.chain is not None:
            doc["conflict"] = [
                {
                    "arc": [names[s.arc[0]], names[s.arc[1]]],
                    "because": None
                    if s.because is None
                    else [names[s.because[0]], names[s.because[1]]],
                }
                for s in self.chain
            ]
        if self.core is not None:
            doc["core"] = [{**r.to_json(names), "text": requirement_text(r, names)}
                           for r in self.core]
        doc["item_count"] = p.n  # not "items": in a problem file that is the list of names
        doc["comparable_pairs"] = p.num_comparable
        doc["verified"] = self.verified
        doc["stats"] = self.stats
        return doc
