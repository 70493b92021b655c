"""Showing results to people: rich text tables and SVG pictures.

May import: :mod:`satorder.explanation`, :mod:`satorder.measure`, :mod:`satorder.pipeline`,
:mod:`satorder.sat`, :mod:`satorder.graph`, :mod:`satorder.certify`, :mod:`satorder.io`,
:mod:`satorder.model`, :mod:`satorder.errors`, :mod:`satorder.jit`.  Only the command line
imports it.
"""
