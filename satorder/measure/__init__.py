"""Figures of an order: height, width, chain and antichain partitions, weighted chains and
antichains, the Hasse diagram, a linear extension, and the order dimension with a realizer.

May import: :mod:`satorder.pipeline`, engines, :mod:`satorder.certify`, :mod:`satorder.model`.
"""

from satorder.measure.summary import Measures, measure

__all__ = ["Measures", "measure"]
