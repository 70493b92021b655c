"""The one wording of a requirement for people: every table, derivation step, repair, JSON
``text`` field and picture that shows a requirement words it through :func:`requirement_text`.

The kind is always named, an arc always reads in its direction (the first item comes first),
and the same clause serves three forms:

==========  ================================================================================
form        example
==========  ================================================================================
``label``   ``fixed: kiln must come before loom`` (tables, lists, JSON ``text`` fields)
``clause``  ``kiln must come before loom`` (inside a sentence that names the kind itself)
``drop``    ``drop the requirement that kiln must come before loom (fixed)`` (repairs)
==========  ================================================================================

Besides the four kinds of :class:`~satorder.model.requirement.Requirement` it words an
``open`` pair (not a requirement: a pair the problem leaves free) and a ``prefer`` arc (a
wish with a weight), so that a table of everything the problem says reads alike.

>>> names = ["kiln", "loom", "quay"]
>>> requirement_text(("fixed", (0, 1)), names)
'fixed: kiln must come before loom'
>>> requirement_text(("incomparable", (2, 0)), names)
'incomparable: quay and kiln must stay unordered'
>>> requirement_text(("forbidden", (1, 2)), names, form="drop")
'drop the requirement that loom must not come before quay (forbidden)'
>>> requirement_text(("prefer", (0, 2)), names, weight=3)
'prefer: kiln should come before quay (weight 3)'
"""

from __future__ import annotations

from collections.abc import Sequence

CLAUSES = {
    "comparable": "{a} and {b} must be ordered, one way or the other",
    "incomparable": "{a} and {b} must stay unordered",
    "fixed": "{a} must come before {b}",
    "forbidden": "{a} must not come before {b}",
    "open": "{a} and {b} may be ordered or not",
    "prefer": "{a} should come before {b} (weight {w})",
}
FORMS = ("label", "clause", "drop")


def requirement_text(requirement, names: Sequence[str], form: str = "label",
                     weight: int | None = None) -> str:
    """Words for ``requirement`` — a :class:`~satorder.model.requirement.Requirement` or any
    ``(kind, (a, b))`` over item ids, ``kind`` one of :data:`CLAUSES` — with ``names[id]``
    the name of an item; ``form`` as in the module docstring; ``weight`` for ``prefer``."""
    kind, (a, b) = requirement
    kind = str(kind)
    template = CLAUSES.get(kind)
    if template is None:
        raise ValueError(f"no wording for requirement kind {kind!r}")
    clause = template.format(a=names[a], b=names[b], w=weight)
    if form == "label":
        return f"{kind}: {clause}"
    if form == "clause":
        return clause
    if form == "drop":
        return f"drop the requirement that {clause} ({kind})"
    raise ValueError(f"unknown form {form!r}; one of {', '.join(FORMS)}")
