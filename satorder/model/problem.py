"""The problem model: items and requirements on pairs and arcs.

Semantics (docs/problems.md says the same for users):

* ``comparable`` pair {a, b}: the answer orders a and b one way or the other;
* ``incomparable`` pair {a, b}: the answer leaves them unordered;
* open pair: neither; allowed either way;
* ``fixed`` arc (a, b): a < b in the answer (so the pair is also comparable);
* ``forbidden`` arc (a, b): not a < b;
* ``prefer`` arc (a, b, w): wanted, may be given up at cost w.

Items are stored as integer ids ``0..n-1``; ``items[i]`` is the user's name.  Comparable pairs are
kept as an adjacency list of integer sets (``adj``), which is compact and fast at 50,000 items;
large edge lists are read into a :class:`~satorder.model.adjacency.CsrSets` instead, two integer
arrays that behave as that list of sets (materialised on first use) for code off the hot path.
``incomparable is None`` means ``"others"``: every pair that is not comparable must stay unordered
(the plain comparability-graph case).  Otherwise ``incomparable`` is an adjacency list of the pairs
that must stay unordered, and all remaining pairs are open.

Requirements may contradict each other on a single pair — an arc fixed both ways, an arc both
fixed and forbidden, a fixed arc on a pair that must stay unordered, a pair listed both as
comparable and as incomparable.  Such a problem is well formed and simply has no answer:
:meth:`Problem.contradictions` names each clash as two requirements, which the engines report
as a core like any other.  Exact repeats of one requirement are merged by
:class:`ProblemBuilder`, which records a note about them in ``Problem.notes`` (the command line
prints it on standard error).
"""

from __future__ import annotations

import difflib
from collections.abc import Iterable, Iterator
from dataclasses import dataclass, field

from satorder.errors import InputError
from satorder.model.requirement import Kind, Requirement

Arc = tuple[int, int]


def pair_count(adj) -> int:
    """Number of pairs in the symmetric adjacency ``adj`` (a list of sets, or compact
    :class:`~satorder.model.adjacency.CsrSets`, counted without turning it into sets)."""
    if getattr(adj, "is_compact", False):
        return adj.total() // 2
    return sum(map(len, adj)) // 2


@dataclass
class Problem:
    """Items plus hard requirements (and optional preferences) over pairs of items.

    Build one with :meth:`from_lists`, :meth:`from_networkx` or :func:`satorder.read_problem`.

    >>> p = Problem.from_lists(comparable=[("kiln", "loom"), ("loom", "quay")])
    >>> p.n, p.num_comparable, p.is_plain
    (3, 2, True)
    """

    items: list[str]
    adj: list[set[int]]
    incomparable: list[set[int]] | None = None
    fixed: list[Arc] = field(default_factory=list)
    forbidden: list[Arc] = field(default_factory=list)
    prefer: list[tuple[int, int, int]] = field(default_factory=list)
    weights: dict[int, int] | None = None
    source: str = "<problem>"
    notes: list[str] = field(default_factory=list, repr=False, compare=False)
    _index: dict[str, int] | None = field(default=None, repr=False, compare=False)

    # ------------------------------------------------------------------ basic facts
    @property
    def n(self) -> int:
        return len(self.items)

    @property
    def index(self) -> dict[str, int]:
        """Map from item name to integer id."""
        if self._index is None:
            self._index = {name: i for i, name in enumerate(self.items)}
        return self._index

    @property
    def num_comparable(self) -> int:
        return pair_count(self.adj)

    @property
    def num_incomparable(self) -> int:
        """Pairs that must stay unordered (all non-comparable pairs under ``"others"``)."""
        if self.incomparable is None:
            return self.n * (self.n - 1) // 2 - self.num_comparable
        return sum(len(s) for s in self.incomparable) // 2

    @property
    def num_open(self) -> int:
        """Pairs named nowhere, which the answer may order either way or leave unordered
        (none under ``"others"``).  A pair listed both as comparable and as incomparable is
        counted once, as named."""
        if self.incomparable is None:
            return 0
        both = sum(len(s & self.adj[a]) for a, s in enumerate(self.incomparable)) // 2
        named = self.num_comparable + self.num_incomparable - both
        return self.n * (self.n - 1) // 2 - named

    @property
    def has_open_pairs(self) -> bool:
        return self.num_open > 0

    @property
    def is_plain(self) -> bool:
        """True when only comparable pairs are given and every other pair stays unordered."""
        return (
            self.incomparable is None
            and not self.fixed
            and not self.forbidden
            and not self.prefer
        )

    def comparable_pairs(self) -> Iterator[Arc]:
        """Each comparable pair once, as ``(i, j)`` with ``i < j``."""
        for i, nb in enumerate(self.adj):
            for j in nb:
                if i < j:
                    yield (i, j)

    def incomparable_pairs(self) -> Iterator[Arc]:
        """Each pair that must stay unordered once, as ``(i, j)`` with ``i < j``.

        Under ``"others"`` this enumerates the complement graph: quadratic, for small problems.
        """
        if self.incomparable is None:
            for i in range(self.n):
                nb = self.adj[i]
                for j in range(i + 1, self.n):
                    if j not in nb:
                        yield (i, j)
        else:
            for i, nb in enumerate(self.incomparable):
                for j in nb:
                    if i < j:
                        yield (i, j)

    def must_be_unordered(self, a: int, b: int) -> bool:
        """True when the pair {a, b} must stay unordered."""
        if self.incomparable is None:
            return b not in self.adj[a]
        return b in self.incomparable[a]

    def is_open(self, a: int, b: int) -> bool:
        return b not in self.adj[a] and not self.must_be_unordered(a, b)

    def contradictions(self) -> list[tuple[Requirement, Requirement]]:
        """Pairs of requirements that clash on a single pair, with no reasoning needed: an arc
        fixed both ways, an arc both fixed and forbidden, a fixed arc on a pair that must stay
        unordered, a pair listed both as comparable and as incomparable.  Each clash is a core
        of two requirements (dropping either one removes it).  Costs one pass over the fixed
        and forbidden arcs and the listed unordered pairs.

        >>> p = Problem.from_lists(fixed=[("kiln", "loom"), ("loom", "kiln")])
        >>> [(r.kind.value, p.names(r.pair)) for r in p.contradictions()[0]]
        [('fixed', ['kiln', 'loom']), ('fixed', ['loom', 'kiln'])]
        """
        out: list[tuple[Requirement, Requirement]] = []
        fixed = set(self.fixed)
        for a, b in self.fixed:
            if a < b and (b, a) in fixed:
                out.append((Requirement(Kind.FIXED, (a, b)), Requirement(Kind.FIXED, (b, a))))
        for arc in self.forbidden:
            if arc in fixed:
                out.append((Requirement(Kind.FIXED, arc), Requirement(Kind.FORBIDDEN, arc)))
        if self.incomparable is not None:
            fixed_on: dict[Arc, Arc] = {}
            for a, b in self.fixed:
                fixed_on.setdefault((min(a, b), max(a, b)), (a, b))
            for a, s in enumerate(self.incomparable):
                for b in sorted(s & self.adj[a]):
                    if a < b:
                        arc = fixed_on.get((a, b))
                        first = (Requirement(Kind.COMPARABLE, (a, b)) if arc is None
                                 else Requirement(Kind.FIXED, arc))
                        out.append((first, Requirement(Kind.INCOMPARABLE, (a, b))))
        return out

    def name(self, i: int) -> str:
        return self.items[i]

    def names(self, pair: Iterable[int]) -> list[str]:
        return [self.items[i] for i in pair]

    # ------------------------------------------------------------------ builders
    @classmethod
    def from_lists(
        cls,
        comparable: Iterable[tuple[str, str]] = (),
        incomparable: Iterable[tuple[str, str]] | str = "others",
        fixed: Iterable[tuple[str, str]] = (),
        forbidden: Iterable[tuple[str, str]] = (),
        prefer: Iterable[tuple[str, str, int]] = (),
        items: Iterable[str] = (),
        weights: dict[str, int] | None = None,
        source: str = "<problem>",
    ) -> Problem:
        """Build and validate a problem from Python lists of item names (``items`` adds items
        that appear in no requirement).

        Raises :class:`InputError` for malformed entries; contradicting ones are kept (see
        :meth:`contradictions`).
        """
        b = ProblemBuilder(source)
        for name in items:
            b.item(name, "items")
        for k, (a, c) in enumerate(comparable):
            b.comparable(a, c, f"comparable[{k}]")
        if isinstance(incomparable, str):
            if incomparable != "others":
                raise InputError(
                    f'{source}: "incomparable" must be "others" or a list of pairs, '
                    f"got {incomparable!r}"
                )
            b.incomparable_others()
        else:
            b.incomparable_list()
            for k, (a, c) in enumerate(incomparable):
                b.incomparable(a, c, f"incomparable[{k}]")
        for k, (a, c) in enumerate(fixed):
            b.fixed(a, c, f"fixed[{k}]")
        for k, (a, c) in enumerate(forbidden):
            b.forbidden(a, c, f"forbidden[{k}]")
        for k, (a, c, w) in enumerate(prefer):
            b.prefer(a, c, w, f"prefer[{k}]")
        if weights:
            for name, w in weights.items():
                b.weight(name, w, f"weights[{name!r}]")
        return b.build()

    @classmethod
    def from_networkx(cls, graph, source: str = "<networkx>") -> Problem:
        """A plain problem whose comparable pairs are the edges of an undirected networkx graph.

        Node labels become item names via ``str``; self-loops are rejected.
        """
        b = ProblemBuilder(source)
        b.incomparable_others()
        for v in graph.nodes:
            b.item(str(v), f"node {v!r}")
        for k, (u, v) in enumerate(graph.edges()):
            b.comparable(str(u), str(v), f"edge {k} ({u!r}, {v!r})")
        return b.build()

    def to_networkx(self):
        """The comparability requirements as an undirected networkx graph on item names."""
        import networkx as nx

        g = nx.Graph()
        g.add_nodes_from(self.items)
        g.add_edges_from((self.items[a], self.items[b]) for a, b in self.comparable_pairs())
        return g

    def with_requirements(self, **changes) -> Problem:
        """A copy with some requirement lists replaced (adjacency sets are copied)."""
        p = Problem(
            items=list(self.items),
            adj=[set(s) for s in self.adj],
            incomparable=None
            if self.incomparable is None
            else [set(s) for s in self.incomparable],
            fixed=list(self.fixed),
            forbidden=list(self.forbidden),
            prefer=list(self.prefer),
            weights=None if self.weights is None else dict(self.weights),
            source=self.source,
            notes=list(self.notes),
        )
        for k, v in changes.items():
            setattr(p, k, v)
        return p


class ProblemBuilder:
    """Incremental, validating construction of a :class:`Problem` (used by every reader).

    ``where`` strings name the entry (``"comparable[3]"``, ``"line 17"``) so that every error
    message points at the exact place in the user's input.  Malformed entries raise
    :class:`InputError`; contradicting ones are kept (:meth:`Problem.contradictions`); an exact
    repeat of a requirement is merged and counted in one note.  After :meth:`close_items`,
    a name that is not yet an item is bad input, with the nearest known name suggested.
    """

    def __init__(self, source: str = "<problem>"):
        self.source = source
        self.items: list[str] = []
        self.index: dict[str, int] = {}
        self.adj: list[set[int]] = []
        self.incomp: list[set[int]] | None = None
        self._fixed: dict[Arc, str] = {}
        self._forbidden: dict[Arc, str] = {}
        self._prefer: list[tuple[int, int, int]] = []
        self.weights: dict[int, int] | None = None
        self._comparable: dict[Arc, str] = {}
        self._incomp_where: dict[Arc, str] = {}
        self._closed: str | None = None  # the entry that listed every item, once closed
        self._repeats: list[tuple[str, str]] = []  # (where, where first given)
        self._repeat_count = 0
        self._notes: list[str] = []

    def error(self, where: str, msg: str) -> InputError:
        return InputError(f"{self.source}: {where}: {msg}")

    def close_items(self, listed_in: str = '"items"') -> None:
        """From now on only the items already named are items: any other name is bad input."""
        self._closed = listed_in

    @property
    def closed(self) -> bool:
        """Whether :meth:`close_items` was called (only named items are items)."""
        return self._closed is not None

    def item(self, name, where: str) -> int:
        if not isinstance(name, str) or not name:
            raise self.error(where, f"item names must be non-empty strings, got {name!r}")
        i = self.index.get(name)
        if i is None:
            if self._closed is not None:
                raise self._unknown(name, where)
            i = self.index[name] = len(self.items)
            self.items.append(name)
            self.adj.append(set())
            if self.incomp is not None:
                self.incomp.append(set())
        return i

    def _unknown(self, name: str, where: str) -> InputError:
        if not self.items:
            return self.error(where, f"{name!r} is not an item: {self._closed} lists none; add "
                              "it there")
        near = difflib.get_close_matches(name, self.items, n=1, cutoff=0.6)
        hint = (f"did you mean {near[0]!r}?" if near else
                f"add it to {self._closed} or correct the name")
        return self.error(where, f"{name!r} is not in {self._closed}; {hint}")

    def _repeat(self, where: str, first: str) -> None:
        self._repeat_count += 1
        if len(self._repeats) < 3:
            self._repeats.append((where, first))

    def _pair(self, a, b, where: str) -> Arc:
        i, j = self.item(a, where), self.item(b, where)
        if i == j:
            raise self.error(where, f"pair names {a!r} twice; a pair needs two different items")
        return i, j

    def comparable(self, a, b, where: str) -> None:
        i, j = self._pair(a, b, where)
        key = (min(i, j), max(i, j))
        first = self._comparable.get(key)
        if first is not None:
            self._repeat(where, first)
            return
        self._comparable[key] = where
        self.adj[i].add(j)
        self.adj[j].add(i)

    def incomparable_others(self) -> None:
        self.incomp = None

    def incomparable_list(self) -> None:
        self.incomp = [set() for _ in self.items]

    def incomparable(self, a, b, where: str) -> None:
        assert self.incomp is not None, "call incomparable_list() first"
        i, j = self._pair(a, b, where)
        key = (min(i, j), max(i, j))
        first = self._incomp_where.get(key)
        if first is not None:
            self._repeat(where, first)
            return
        self._incomp_where[key] = where
        self.incomp[i].add(j)
        self.incomp[j].add(i)

    def fixed(self, a, b, where: str) -> None:
        i, j = self._pair(a, b, where)
        first = self._fixed.get((i, j))
        if first is not None:
            self._repeat(where, first)
            return
        self._fixed[(i, j)] = where
        # a fixed arc makes its pair comparable
        self.adj[i].add(j)
        self.adj[j].add(i)

    def forbidden(self, a, b, where: str) -> None:
        i, j = self._pair(a, b, where)
        first = self._forbidden.get((i, j))
        if first is not None:
            self._repeat(where, first)
            return
        self._forbidden[(i, j)] = where

    def prefer(self, a, b, w, where: str) -> None:
        i, j = self._pair(a, b, where)
        if isinstance(w, bool) or not isinstance(w, int) or w <= 0:
            raise self.error(where, f"weight must be a positive integer, got {w!r}")
        self._prefer.append((i, j, w))

    def weight(self, name, w, where: str) -> None:
        i = self.item(name, where)
        if isinstance(w, bool) or not isinstance(w, int) or w <= 0:
            raise self.error(where, f"item weight must be a positive integer, got {w!r}")
        if self.weights is None:
            self.weights = {}
        self.weights[i] = w

    def note(self, text: str) -> None:
        """Record a note about the input (the command line prints it on standard error)."""
        self._notes.append(text)

    def build(self) -> Problem:
        notes = list(self._notes)
        if self._repeat_count:
            k = self._repeat_count
            shown = ", ".join(f"{where} repeats {first}" for where, first in self._repeats)
            more = f" and {k - len(self._repeats)} more" if k > len(self._repeats) else ""
            notes.insert(0, f"{self.source}: {k} repeated requirement{'s' if k > 1 else ''} "
                         f"merged, each counted once ({shown}{more})")
        p = Problem(
            items=self.items,
            adj=self.adj,
            incomparable=self.incomp,
            fixed=list(self._fixed),
            forbidden=list(self._forbidden),
            prefer=self._prefer,
            weights=self.weights,
            source=self.source,
            notes=notes,
        )
        p._index = self.index
        return p
