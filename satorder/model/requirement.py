"""Requirements and statuses: the words every core, repair, derivation and answer is written in.

A *requirement* is one hard constraint of a problem on a pair of items (item ids):

============  =============================================================================
kind          meaning (``pair`` = ``(a, b)``)
============  =============================================================================
comparable    a and b must be ordered, one way or the other (stored with ``a < b``)
incomparable  a and b must stay unordered (stored with ``a < b``)
fixed         the arc a → b: a must come before b
forbidden     the arc a → b is ruled out: a may not come before b
============  =============================================================================

:class:`Requirement` is a named tuple ``(kind, pair)``, so ``kind, (a, b) = r`` works and a
requirement equals (and hashes like) the plain tuple ``("fixed", (a, b))`` the SAT encoding
uses as a key.  Building one checks the kind and puts the pair of an unordered kind in
ascending order, so the same requirement always has the same form.

Its JSON form (the command-line contract of ``solve --json`` and ``explain --json``) is
``{"kind": kind, "pair": [name_a, name_b]}``: :meth:`Requirement.to_json` writes it and
:meth:`Requirement.from_json` reads it back, given the item names.

:class:`Status` is the verdict of an answer: ``feasible``, ``infeasible`` or ``unknown`` (no
verdict within the limits).  :class:`Kind` and :class:`Status` are string-valued enums that
print, format, compare, hash and serialise as their plain strings, so ``answer.status ==
"feasible"`` and ``json.dumps(answer.status)`` keep working.

>>> r = Requirement("comparable", (3, 1))
>>> r
Requirement(kind='comparable', pair=(1, 3))
>>> r.to_json(["kiln", "loom", "quay", "weir"])
{'kind': 'comparable', 'pair': ['loom', 'weir']}
>>> Requirement.from_json({"kind": "fixed", "pair": ["weir", "kiln"]},
...                       {"kiln": 0, "loom": 1, "quay": 2, "weir": 3})
Requirement(kind='fixed', pair=(3, 0))
>>> Status.FEASIBLE == "feasible", f"{Status.UNKNOWN}"
(True, 'unknown')
"""

from __future__ import annotations

from collections.abc import Iterable, Mapping, Sequence
from enum import Enum
from typing import Any, NamedTuple


class _Word(str, Enum):
    """A string-valued enum member that reads exactly like its string: ``str``, ``format``,
    ``repr``, equality, hashing and JSON all see the plain value."""

    def __str__(self) -> str:
        return self.value

    def __format__(self, spec: str) -> str:
        return format(self.value, spec)

    def __repr__(self) -> str:
        return repr(self.value)


class Kind(_Word):
    """The four kinds of requirement (see the module docstring)."""

    COMPARABLE = "comparable"
    INCOMPARABLE = "incomparable"
    FIXED = "fixed"
    FORBIDDEN = "forbidden"

    @classmethod
    def _missing_(cls, value: object):
        raise ValueError(f"unknown requirement kind {value!r}; one of "
                         + ", ".join(k.value for k in cls))


class Status(_Word):
    """The verdict of an answer or an explanation."""

    FEASIBLE = "feasible"
    INFEASIBLE = "infeasible"
    UNKNOWN = "unknown"


KINDS = tuple(Kind)
# kinds about an unordered pair {a, b} (stored with a < b); the others are about the arc a → b
PAIR_KINDS = (Kind.COMPARABLE, Kind.INCOMPARABLE)
ARC_KINDS = (Kind.FIXED, Kind.FORBIDDEN)

# shorthands for the three statuses (the same objects as the members of Status)
FEASIBLE, INFEASIBLE, UNKNOWN = Status.FEASIBLE, Status.INFEASIBLE, Status.UNKNOWN


class _Fields(NamedTuple):
    kind: Kind
    pair: tuple[int, int]


class Requirement(_Fields):
    """One requirement ``(kind, pair)`` over item ids; see the module docstring.

    Raises ``ValueError`` for an unknown kind or a pair that is not two different items.
    """

    __slots__ = ()

    def __new__(cls, kind: Kind | str, pair: Iterable[int]) -> Requirement:
        if kind.__class__ is not Kind:
            kind = Kind(kind)
        a, b = pair
        a, b = int(a), int(b)
        if a == b:
            raise ValueError(f"a {kind} requirement needs two different items, got {a} twice")
        if a > b and (kind is Kind.COMPARABLE or kind is Kind.INCOMPARABLE):
            a, b = b, a
        return tuple.__new__(cls, (kind, (a, b)))

    def to_json(self, names: Sequence[str]) -> dict[str, Any]:
        """The JSON form ``{"kind": ..., "pair": [name_a, name_b]}`` (``names[id]`` is the
        name of item ``id``)."""
        a, b = self.pair
        return {"kind": self.kind.value, "pair": [names[a], names[b]]}

    @classmethod
    def from_json(cls, doc: Mapping[str, Any], index: Mapping[str, int]) -> Requirement:
        """Read the JSON form back (``index[name]`` is the id of the item named ``name``).

        Raises ``ValueError`` naming the entry when it is not a requirement over known items.
        """
        try:
            kind, (x, y) = doc["kind"], doc["pair"]
            return cls(kind, (index[x], index[y]))
        except (KeyError, TypeError, ValueError) as exc:
            raise ValueError(f"not a requirement over the problem's items: {doc!r} "
                             f"({exc})") from None


def items_of(requirements: Iterable[Requirement]) -> list[int]:
    """The items the requirements name, ascending."""
    return sorted({v for r in requirements for v in r.pair})
