"""The front door: choose an engine for a problem, run it, and certify what it returns
(:func:`~satorder.pipeline.solve.solve`, :func:`~satorder.pipeline.count.count_answers`).

May import: :mod:`satorder.sat`, :mod:`satorder.graph`, :mod:`satorder.certify`,
:mod:`satorder.io`, :mod:`satorder.model`, :mod:`satorder.errors`, :mod:`satorder.jit`.
"""
