"""The front door: choose an engine for a problem, run it, and certify what it returns
(:func:`~satorder.pipeline.solve.solve`, :func:`~satorder.pipeline.count.count_answers`).

May import: engines (:mod:`satorder.graph`, :mod:`satorder.sat`), :mod:`satorder.certify`,
:mod:`satorder.model`, :mod:`satorder.errors`.
"""
