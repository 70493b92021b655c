"""The problem model: items and requirements on pairs and arcs.

Semantics (docs/problems.md says the same for users):

* ``comparable`` pair {a, b}: the answer orders a and b one way or the other;
* ``incomparable`` pair {a, b}: the answer leaves them unordered;
* open pair: neither; allowed either way;
* ``fixed`` arc (a, b): a < b in the answer (so the pair is also comparable);
* ``forbidden`` arc (a, b): not a < b;
* ``prefer`` arc (a, b, w): wanted, may be given up at cost w.

Items are stored as integer ids ``0..n-1``; ``items[i]`` is the user's name.  Comparable pairs are
kept as an adjacency list of integer sets (``adj``), which is compact and fast at 50,000 items.
``incomparable is None`` means ``"others"``: every pair that is not comparable must stay unordered
(the plain comparability-graph case).  Otherwise ``incomparable`` is an adjacency list of the pairs
that must stay unordered, and all remaining pairs are open.
"""

from __future__ import annotations

from collections.abc import Iterable, Iterator
from dataclasses import dataclass, field

from satorder.errors import InputError

Arc = tuple[int, int]


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
        return sum(len(s) for s in self.adj) // 2

    @property
    def num_incomparable(self) -> int:
        """Pairs that must stay unordered (all non-comparable pairs under ``"others"``)."""
        if self.incomparable is None:
            return self.n * (self.n - 1) // 2 - self.num_comparable
        return sum(len(s) for s in self.incomparable) // 2

    @property
    def has_open_pairs(self) -> bool:
        if self.incomparable is None:
            return False
        return self.num_comparable + self.num_incomparable < self.n * (self.n - 1) // 2

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
        """Build and validate a problem from Python lists of item names.

        Raises :class:`InputError` for contradictory or malformed entries.
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
        )
        for k, v in changes.items():
            setattr(p, k, v)
        return p


class ProblemBuilder:
    """Incremental, validating construction of a :class:`Problem` (used by every reader).

    ``where`` strings name the entry (``"comparable[3]"``, ``"line 17"``) so that every error
    message points at the exact place in the user's input.
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
        self._comp_where: dict[Arc, str] = {}
        self._incomp_where: dict[Arc, str] = {}

    def error(self, where: str, msg: str) -> InputError:
        return InputError(f"{self.source}: {where}: {msg}")

    def item(self, name, where: str) -> int:
        if not isinstance(name, str) or not name:
            raise self.error(where, f"item names must be non-empty strings, got {name!r}")
        i = self.index.get(name)
        if i is None:
            i = self.index[name] = len(self.items)
            self.items.append(name)
            self.adj.append(set())
            if self.incomp is not None:
                self.incomp.append(set())
        return i

    def _pair(self, a, b, where: str) -> Arc:
        i, j = self.item(a, where), self.item(b, where)
        if i == j:
            raise self.error(where, f"pair names {a!r} twice; a pair needs two different items")
        return i, j

    def comparable(self, a, b, where: str) -> None:
        i, j = self._pair(a, b, where)
        key = (min(i, j), max(i, j))
        other = self._incomp_where.get(key)
        if other is not None:
            raise self.error(
                where, f"pair {a!r}, {b!r} is also listed at {other} as incomparable; keep one"
            )
        self.adj[i].add(j)
        self.adj[j].add(i)
        self._comp_where.setdefault(key, where)

    def incomparable_others(self) -> None:
        self.incomp = None

    def incomparable_list(self) -> None:
        self.incomp = [set() for _ in self.items]

    def incomparable(self, a, b, where: str) -> None:
        assert self.incomp is not None, "call incomparable_list() first"
        i, j = self._pair(a, b, where)
        key = (min(i, j), max(i, j))
        other = self._comp_where.get(key)
        if other is not None:
            kind = "a fixed arc" if other.startswith("fixed") else "comparable"
            raise self.error(
                where, f"pair {a!r}, {b!r} is also listed at {other} as {kind}; keep one"
            )
        self.incomp[i].add(j)
        self.incomp[j].add(i)
        self._incomp_where.setdefault(key, where)

    def fixed(self, a, b, where: str) -> None:
        i, j = self._pair(a, b, where)
        if (j, i) in self._fixed:
            raise self.error(
                where, f"fixed arc {a!r} before {b!r} is also fixed the other way at "
                f"{self._fixed[(j, i)]}; keep one direction"
            )
        if (i, j) in self._forbidden:
            raise self.error(
                where, f"arc {a!r} before {b!r} is both fixed and forbidden "
                f"(at {self._forbidden[(i, j)]}); keep one"
            )
        key = (min(i, j), max(i, j))
        other = self._incomp_where.get(key)
        if other is not None:
            raise self.error(
                where, f"fixed arc {a!r} before {b!r} is on a pair listed at {other} as "
                "incomparable; remove one of them"
            )
        self._fixed.setdefault((i, j), where)
        # a fixed arc makes its pair comparable
        self.adj[i].add(j)
        self.adj[j].add(i)
        self._comp_where.setdefault(key, where)

    def forbidden(self, a, b, where: str) -> None:
        i, j = self._pair(a, b, where)
        if (i, j) in self._fixed:
            raise self.error(
                where, f"arc {a!r} before {b!r} is both forbidden and fixed "
                f"(at {self._fixed[(i, j)]}); keep one"
            )
        self._forbidden.setdefault((i, j), where)

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

    def build(self) -> Problem:
        p = Problem(
            items=self.items,
            adj=self.adj,
            incomparable=self.incomp,
            fixed=list(self._fixed),
            forbidden=list(self._forbidden),
            prefer=self._prefer,
            weights=self.weights,
            source=self.source,
        )
        p._index = self.index
        return p
