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
        """The JSON document as one line of text (see :meth:`write_json`)."""
        import io

        buf = io.BytesIO()
        self.write_json(buf.write)
        return buf.getvalue().decode("utf-8")

    def write_json(self, write, extra: dict[str, Any] | None = None) -> None:
        """Write the JSON document with ``write`` (a function taking bytes, e.g. a binary
        file's ``write``) in chunks: the (possibly huge) ``order`` list is streamed from the
        successor sets, never built in memory.  ``extra`` fields are added at the end; a value
        with a ``write_json(write)`` method is streamed by it
        (:func:`satorder.model.json_stream.write_document`)."""
        from satorder.model.json_stream import Members, PairList, write_document

        doc = self.to_json(include_order=False)
        out: dict[str, Any] = {"status": doc.pop("status")}
        if self.succ is not None:
            names = self.problem.items
            out["order"] = PairList(names, self.succ)
            # --- views of the order (levels, covering, sequence): satorder.model.order_views
            if self._compact_views():
                from satorder.model.views_compact import compact_views

                out.update(compact_views(self.succ, names))
            else:
                import json

                quoted = [json.dumps(name) for name in names]
                out["views"] = Members(order_views.views_json(self.succ, quoted))
        out.update(doc)
        if extra:
            out.update(extra)
        write_document(out, write)

    def _compact_views(self) -> bool:
        """Views computed on the arrays (:mod:`satorder.model.views_compact`): a large order
        held as compact successor sets, with numba present."""
        from satorder.jit import HAVE_NUMBA

        return (HAVE_NUMBA and getattr(self.succ, "is_compact", False)
                and self.succ.total() >= order_views.ARRAYS_FROM)

    def refutation_json(self) -> dict[str, Any]:
        """The fields of :meth:`to_json` that say why an infeasible answer has no order:
        ``conflict`` (a forcing chain) and ``core``, those it has (none when feasible)."""
        doc = self.to_json(include_order=False)
        return {key: doc[key] for key in ("conflict", "core") if key in doc}

    def to_json(self, include_order: bool = True) -> dict[str, Any]:
        """The machine-readable answer (fields fixed by the CLI contract, extras welcome).
        ``include_order=False`` leaves out ``order`` and its views (``levels``, ``covering``,
        ``sequence``), which :meth:`write_json` writes straight from the successor sets."""
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
