"""The result of a dimension search: exact with a realizer, or bounded with witnesses."""

from __future__ import annotations

from dataclasses import dataclass, field


@dataclass
class Dimension:
    """Result of :func:`dimension`.

    ``status``: ``"exact"`` (``value`` is the dimension, ``realizer`` has ``value`` linear
    orders, bottom first) or ``"bounded"`` (``value`` None; ``lower`` ≤ dimension ≤ ``upper``;
    ``realizer``, when present, has ``upper`` orders and proves the upper bound, otherwise the
    upper bound comes from the theorems cited in the module doc).
    ``witness``: items of a sub-order whose dimension is at least ``witness_lower`` (the lower
    bound's certificate when that is ≥ 3), ``witness_chain`` a forcing chain in its
    incomparability graph (Γ steps, see :mod:`satorder.graph.forcing`) when ``witness_lower`` is 3.
    """

    status: str
    lower: int
    upper: int
    realizer: list[list[int]] | None = None
    witness: list[int] | None = None
    witness_lower: int | None = None
    witness_pairs: list[tuple[int, int]] | None = None
    witness_chain: list | None = None
    # incomparable pairs (a, b) that pairwise form alternating two-cycles: a lower bound of
    # their number, checked pair by pair (Trotter 1992)
    witness_pairs: list[tuple[int, int]] | None = None
    notes: list[str] = field(default_factory=list)
    stats: dict = field(default_factory=dict)

    @property
    def value(self) -> int | None:
        return self.lower if self.status == "exact" else None

    def to_json(self, names: list[str]) -> dict:
        doc = {
            "dimension_status": self.status,
            "dimension_bounds": [self.lower, self.upper],
            "realizer": None if self.realizer is None
            else [[names[i] for i in lin] for lin in self.realizer],
        }
        if self.witness is not None:
            doc["dimension_witness"] = {"items": [names[i] for i in self.witness],
                                        "dimension_at_least": self.witness_lower}
            if self.witness_pairs is not None:
                doc["dimension_witness"]["pairs"] = [[names[a], names[b]]
                                                     for a, b in self.witness_pairs]
        if self.notes:
            doc["dimension_notes"] = self.notes
        return doc


@dataclass
class Part:
    """What is known of one part: bounds, a realizer proving the upper one, a witness."""

    lower: int
    upper: int
    realizer: list[list[int]] | None  # item ids; ``upper`` orders when present
    witness: list[int] | None = None
    witness_lower: int | None = None
    witness_pairs: list[tuple[int, int]] | None = None
