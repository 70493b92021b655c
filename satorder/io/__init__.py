"""Reading problem files (JSON, edge lists, graph6) and writing output files safely.

May import: :mod:`satorder.model`, :mod:`satorder.errors`, :mod:`satorder.jit`.
"""
