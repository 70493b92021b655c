"""Figures of an order: height, width, chain and antichain partitions, weighted chains and
antichains, the Hasse diagram, a linear extension, and the order dimension with a realizer.

:mod:`~satorder.measure.figures` and :mod:`~satorder.measure.dimension` compute;
:mod:`~satorder.measure.summary` assembles their results and has them checked.

May import: :mod:`satorder.pipeline`, :mod:`satorder.sat`, :mod:`satorder.graph`,
:mod:`satorder.certify`, :mod:`satorder.io`, :mod:`satorder.model`, :mod:`satorder.errors`,
:mod:`satorder.jit`.  The engines inside (figures, dimension) import neither the checkers nor
the file layer; only the summary calls the checkers.
"""

__all__ = ["Measures", "measure"]


def __getattr__(name: str):
    """``Measures`` and ``measure`` are imported on first use, so that code needing only
    :mod:`~satorder.measure.figures` (the text rendering of an answer) starts quickly."""
    if name in __all__:
        from satorder.measure import summary

        return getattr(summary, name)
    raise AttributeError(f"module 'satorder.measure' has no attribute {name!r}")
