"""Explaining infeasibility: minimal and smallest cores, obstructions, derivations and repairs
(:func:`~satorder.explanation.explain.explain`).

May import: :mod:`satorder.pipeline`, :mod:`satorder.sat`, :mod:`satorder.graph`,
:mod:`satorder.certify`, :mod:`satorder.io`, :mod:`satorder.model`, :mod:`satorder.errors`,
:mod:`satorder.jit`.  Like the pipeline, it runs engines and then checks what they found.
"""
