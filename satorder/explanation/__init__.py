"""Explaining infeasibility: minimal and smallest cores, obstructions, derivations and repairs
(:func:`~satorder.explanation.explain.explain`).

May import: :mod:`satorder.pipeline`, engines, :mod:`satorder.certify`, :mod:`satorder.model`.
"""
