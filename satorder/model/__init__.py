"""The model: what a problem, a requirement, an answer and an order are.

Holds :mod:`~satorder.model.problem` (items and requirements, validated on construction),
:mod:`~satorder.model.requirement` (the typed requirement, its kinds and JSON form, and the
status enum), :mod:`~satorder.model.answer` (what every engine returns, and its JSON form) and
:mod:`~satorder.model.order` (small operations on orders stored as successor sets).

May import: :mod:`satorder.errors`, :mod:`satorder.jit`.  Everything else may import the model.
"""
