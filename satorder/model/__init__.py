"""The model: what a problem, a requirement, an answer and an order are.

Holds :mod:`~satorder.model.problem` (items and requirements, validated on construction),
:mod:`~satorder.model.requirement` (the typed requirement, its kinds and JSON form, and the
status enum), :mod:`~satorder.model.answer` (what every engine returns, and its JSON form),
:mod:`~satorder.model.order` (small operations on orders stored as successor sets),
:mod:`~satorder.model.order_views` (levels, covering pairs and a sequence of an order, and their
JSON text), :mod:`~satorder.model.outcome` (how each requirement came out in an answer) and
:mod:`~satorder.model.wording` (the one wording of a requirement for people); for answers
with millions of pairs :mod:`~satorder.model.adjacency` (integer sets as compact arrays behind
a list-of-sets face), :mod:`~satorder.model.json_stream` (JSON documents written in chunks) and
:mod:`~satorder.model.views_compact` (the views of a compact order in one compiled loop).

May import: :mod:`satorder.errors`, :mod:`satorder.jit`.  Everything else may import the model.
"""
