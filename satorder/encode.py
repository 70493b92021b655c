"""Problem → CNF: a compact propositional encoding of "a strict partial order meeting these
requirements", with optional selector literals that name each requirement.

Method.  Ordering a set of items under pairwise requirements is the comparability sandwich
problem, NP-complete (Golumbic, Kaplan & Shamir, "Graph sandwich problems", J. Algorithms 19,
1995), so it is handed to a SAT solver.  The textbook encoding has a variable per ordered pair
and a transitivity clause ``¬x_ab ∨ ¬x_bc ∨ x_ac`` per ordered item triple (:func:`direct_encoding`,
the baseline).  This module keeps the same meaning but writes far less:

* **Variables only where a pair may be ordered.**  A pair that must stay unordered has no
  variable (it is the constant *false*); a comparable pair has one variable (``a<b`` or its
  negation ``b<a``); an open pair has two (``a<b``, ``b<a``, not both).
* **Implication classes share one variable** (Golumbic, *Algorithmic Graph Theory and Perfect
  Graphs*, 1980, ch. 5; Gallai 1967): arcs ``v→x`` and ``v→y`` of comparable pairs whose other
  ends ``x, y`` must stay unordered are oriented alike in every answer (Γ forcing), so all arcs
  tied by Γ become one literal.  An implication class holding an arc and its reverse makes the
  problem infeasible at once (empty clause).  Γ forcing through a must-stay-unordered pair is
  only valid while that requirement holds, so collapsing is off when selectors are on.
* **Lazy transitivity** (the usual lazy clause generation / cutting-plane loop, common practice
  in SAT-based order encodings): transitivity clauses are added only for triples that a model
  actually violates, see :meth:`Encoding.violations` and :meth:`Encoding.refine`; a model with
  no violated triple is a strict partial order.  Variables of open pairs, and with selectors of
  must-stay-unordered pairs, are created on demand as well, the first time a clause needs them;
  a pair without a variable is unordered in the model.  :meth:`Encoding.add_all_transitivity`
  writes every clause up front instead (used for CNF export and model counting), and still only
  for triples ``a, b, c`` where both ``ab`` and ``bc`` may be ordered.

Interface (stable; explain, count, MaxSAT and benchmark code build on it)
-------------------------------------------------------------------------
``Encoding(problem, selectors=False, lazy=True, collapse=None)``

* ``lt(a, b)`` → literal meaning "a < b" (item ids); created on demand; ``None`` only when
  selectors are off and the pair must stay unordered (constant false).
* ``hard`` → every clause so far (list of lists of ints); ``take_new()`` → the clauses added
  since its last call (feed them to a solver); ``nv`` → highest variable in use;
  ``new_var()`` → a fresh auxiliary variable.
* ``selector(kind, pair)`` → the selector literal of a requirement (created on demand);
  ``selector_of[(kind, pair)]`` and its inverse ``requirement_of[literal]``.  Keys are
  ``("comparable"|"incomparable", (a, b))`` with ``a < b`` and ``("fixed"|"forbidden", (a, b))``
  for the arc a<b, exactly the ``{"kind", "pair"}`` of a core.  Every clause that stands for a
  requirement contains ``-selector``; assuming the selector switches the requirement on, leaving
  it unassumed drops it (the pair becomes open).
* ``decode(model)`` → successor sets of the ordered pairs true in the model (a relation,
  transitively closed once ``violations`` finds nothing); ``violations(succ)`` → violated
  triples ``(a, b, c)``; ``refine(triples)`` → adds their clauses, returns how many.
* ``to_dimacs()`` → DIMACS CNF text with ``c`` lines naming each variable and selector.

>>> from satorder.problem import Problem
>>> p = Problem.from_lists(comparable=[("a", "b"), ("b", "c")], incomparable=[("a", "c")])
>>> enc = Encoding(p)
>>> enc.lt(0, 1) == enc.lt(2, 1), enc.lt(0, 2)  # Γ: a<b forces c<b; a, c stay unordered
(True, None)
"""

from __future__ import annotations

import json
from collections.abc import Iterable, Iterator

from .problem import Problem

Arc = tuple[int, int]
Key = tuple[str, Arc]
KINDS = ("comparable", "incomparable", "fixed", "forbidden")


class Encoding:
    """A growing CNF for one problem; see the module docstring for the interface."""

    def __init__(self, problem: Problem, selectors: bool = False, lazy: bool = True,
                 collapse: bool | None = None):
        self.problem = problem
        self.n = problem.n
        self.selectors = selectors
        self.collapse = (not selectors) if collapse is None else collapse
        if self.collapse and selectors:
            raise ValueError("implication classes cannot be collapsed when selectors are on")
        self.nv = 0
        self.hard: list[list[int]] = []
        self._new_from = 0
        self._pair: dict[int, tuple[int, int]] = {}  # key a*n+b (a<b) → (lit a<b, lit b<a)
        self.selector_of: dict[Key, int] = {}
        self.requirement_of: dict[int, Key] = {}
        self.unsat_reason: list[Key] | None = None  # set when the encoding is trivially false
        self.num_classes = 0
        n = self.n
        self._forbid: dict[int, list[Arc]] = {}
        for a, b in problem.forbidden:
            self._forbid.setdefault(min(a, b) * n + max(a, b), []).append((a, b))
        if selectors:
            for a, b in problem.comparable_pairs():
                self.selector("comparable", (a, b))
            for arc in problem.fixed:
                self.selector("fixed", arc)
            for arc in problem.forbidden:
                self.selector("forbidden", arc)
        if self.collapse:
            self._collapse_classes()
        else:
            for a, b in problem.comparable_pairs():
                self._make_pair(a, b)
        for a, b in problem.fixed:
            lit = self.lt(a, b)
            if self.selectors:
                self.hard.append([-self.selector_of[("fixed", (a, b))], lit])
            else:
                self.hard.append([lit])
        if not lazy:
            self.add_all_transitivity()

    # ------------------------------------------------------------------ variables
    def new_var(self) -> int:
        """A fresh variable (for auxiliary use by callers, e.g. blocking or relaxation)."""
        self.nv += 1
        return self.nv

    def has_pair(self, a: int, b: int) -> bool:
        """True when the pair {a, b} already has variables."""
        return min(a, b) * self.n + max(a, b) in self._pair

    def lt(self, a: int, b: int) -> int | None:
        """The literal meaning ``a < b``; ``None`` if the pair must stay unordered (selectors off).

        Variables are created on demand for pairs that may be ordered.
        """
        if a < b:
            lits = self._pair.get(a * self.n + b)
            if lits is None:
                lits = self._make_pair(a, b)
                if lits is None:
                    return None
            return lits[0]
        lits = self._pair.get(b * self.n + a)
        if lits is None:
            lits = self._make_pair(b, a)
            if lits is None:
                return None
        return lits[1]

    def selector(self, kind: str, pair: Arc) -> int:
        """The selector literal of requirement ``(kind, pair)``, created on first use."""
        if kind in ("comparable", "incomparable"):
            pair = (min(pair), max(pair))
        key = (kind, (int(pair[0]), int(pair[1])))
        lit = self.selector_of.get(key)
        if lit is None:
            lit = self.new_var()
            self.selector_of[key] = lit
            self.requirement_of[lit] = key
        return lit

    def _make_pair(self, a: int, b: int):
        """Create the variables of pair a<b (item ids) with the clauses that belong to it."""
        p = self.problem
        key = a * self.n + b
        comparable = b in p.adj[a]
        unordered = not comparable and p.must_be_unordered(a, b)
        if unordered and not self.selectors:
            return None
        if comparable and not self.selectors:
            up = self.new_var()
            lits = (up, -up)
        else:
            up, down = self.new_var(), self.new_var()
            lits = (up, down)
            self.hard.append([-up, -down])
            if comparable:
                self.hard.append([-self.selector("comparable", (a, b)), up, down])
            elif unordered:
                s = self.selector("incomparable", (a, b))
                self.hard.append([-s, -up])
                self.hard.append([-s, -down])
        self._pair[key] = lits
        self._add_forbidden(key, lits, a)
        return lits

    def _add_forbidden(self, key: int, lits, a: int) -> None:
        for x, y in self._forbid.get(key, ()):
            lit = lits[0] if x == a else lits[1]
            if self.selectors:
                self.hard.append([-self.selector_of[("forbidden", (x, y))], -lit])
            else:
                self.hard.append([-lit])

    # ------------------------------------------------------------------ implication classes
    def _collapse_classes(self) -> None:
        """One variable per implication class of comparable pairs (Γ through pairs that must
        stay unordered), by union-find with parity over the comparable pairs."""
        p = self.problem
        n = self.n
        adj = p.adj
        edges = list(p.comparable_pairs())
        eid = {a * n + b: k for k, (a, b) in enumerate(edges)}
        parent = list(range(len(edges)))
        parity = [0] * len(edges)  # lit(edge) = lit(parent) xor parity (as "lo<hi" senses)
        conflict: tuple[int, int, int] | None = None

        def find(e: int) -> tuple[int, int]:
            par = 0
            path = []
            while parent[e] != e:
                path.append(e)
                par ^= parity[e]
                e = parent[e]
            acc = par
            for x in path:  # path compression: parity of x relative to the root
                rel = acc
                acc ^= parity[x]
                parent[x] = e
                parity[x] = rel
            return e, par

        def tie(e1: int, e2: int, flip: int) -> None:
            nonlocal conflict
            r1, p1 = find(e1)
            r2, p2 = find(e2)
            if r1 == r2:
                if p1 ^ p2 != flip and conflict is None:
                    conflict = (e1, e2, flip)
                return
            parent[r2] = r1
            parity[r2] = p1 ^ p2 ^ flip

        incomp = p.incomparable
        for v in range(n):
            nb = adj[v]
            if len(nb) < 2:
                continue
            unvisited = set(nb)
            while unvisited:
                queue = [unvisited.pop()]
                for y in queue:
                    if incomp is None:
                        found = unvisited - adj[y]
                    else:
                        found = unvisited & incomp[y]
                    if not found:
                        continue
                    unvisited -= found
                    queue.extend(found)
                    ey = eid[v * n + y] if v < y else eid[y * n + v]
                    vy = v < y
                    for x in found:  # arcs v→y and v→x alike: same lo<hi sense iff v<y == v<x
                        ex = eid[v * n + x] if v < x else eid[x * n + v]
                        tie(ey, ex, int(vy != (v < x)))
        var_of_root: dict[int, int] = {}
        for k, (a, b) in enumerate(edges):
            root, par = find(k)
            var = var_of_root.get(root)
            if var is None:
                var = var_of_root[root] = self.new_var()
            lit = -var if par else var
            self._pair[a * n + b] = (lit, -lit)
            self._add_forbidden(a * n + b, (lit, -lit), a)
        self.num_classes = len(var_of_root)
        if conflict is not None:
            self.hard.append([])
            self.unsat_reason = [("comparable", edges[conflict[0]])]

    # ------------------------------------------------------------------ transitivity
    def transitivity_clause(self, a: int, b: int, c: int) -> list[int] | None:
        """The clause ``a<b ∧ b<c → a<c`` over current literals (None if a tautology)."""
        x, y = self.lt(a, b), self.lt(b, c)
        if x is None or y is None:
            return None
        z = self.lt(a, c)
        lits = {-x, -y}
        if z is not None:
            lits.add(z)
        for lit in lits:
            if -lit in lits:
                return None
        return sorted(lits, key=abs)

    def refine(self, triples: Iterable[tuple[int, int, int]]) -> int:
        """Add the transitivity clause of each triple ``(a, b, c)``; returns how many."""
        count = 0
        for a, b, c in triples:
            cl = self.transitivity_clause(a, b, c)
            if cl is not None:
                self.hard.append(cl)
                count += 1
        return count

    def orderable_neighbours(self) -> list[set[int]]:
        """For each item, the items it may be ordered with (comparable or open pairs; with
        selectors every other item).  Quadratic for problems with open pairs."""
        p = self.problem
        n = self.n
        if self.selectors:
            return [set(range(n)) - {a} for a in range(n)]
        if p.incomparable is None:
            return [set(s) for s in p.adj]
        everyone = set(range(n))
        return [everyone - p.incomparable[a] - {a} for a in range(n)]

    def add_all_transitivity(self) -> int:
        """Write every transitivity clause for triples ``a, b, c`` with ``ab`` and ``bc`` both
        orderable (each once after collapsing; tautologies and repeats dropped)."""
        nbr = self.orderable_neighbours()
        seen: set[tuple[int, ...]] = set()
        count = 0
        for b in range(self.n):
            around = sorted(nbr[b])
            for i, a in enumerate(around):
                for c in around[i + 1:]:
                    for u, w in ((a, c), (c, a)):
                        cl = self.transitivity_clause(u, b, w)
                        if cl is None:
                            continue
                        t = tuple(cl)
                        if t in seen:
                            continue
                        seen.add(t)
                        self.hard.append(cl)
                        count += 1
        return count

    # ------------------------------------------------------------------ models
    def take_new(self) -> list[list[int]]:
        """Clauses added since the previous call."""
        new = self.hard[self._new_from:]
        self._new_from = len(self.hard)
        return new

    def pair_literals(self) -> Iterator[tuple[int, int, int, int]]:
        """Every pair with variables as ``(a, b, lit a<b, lit b<a)``, ``a < b``."""
        n = self.n
        for key, (up, down) in self._pair.items():
            yield key // n, key % n, up, down

    def decode(self, model: Iterable[int]) -> list[set[int]]:
        """Successor sets of the relation a model sets: ``b in succ[a]`` iff ``a<b`` is true."""
        true = set(lit for lit in model if lit > 0)
        succ: list[set[int]] = [set() for _ in range(self.n)]
        n = self.n
        for key, (up, down) in self._pair.items():
            if (up in true) if up > 0 else (-up not in true):
                succ[key // n].add(key % n)
            elif (down in true) if down > 0 else (-down not in true):
                succ[key % n].add(key // n)
        return succ

    @staticmethod
    def violations(succ: list[set[int]], limit: int | None = None) -> list[tuple[int, int, int]]:
        """Triples ``(a, b, c)`` with ``a<b``, ``b<c`` related but not ``a<c``: one witness ``b``
        per missing pair ``(a, c)``, at most ``limit`` triples."""
        out: list[tuple[int, int, int]] = []
        for a, sa in enumerate(succ):
            if not sa:
                continue
            covered = set(sa)
            covered.add(a)
            for b in sa:
                missing = succ[b] - covered
                if missing:
                    covered |= missing
                    out.extend((a, b, c) for c in missing)
            if limit is not None and len(out) >= limit:
                return out[:limit]
        return out

    # ------------------------------------------------------------------ export
    def variable_names(self) -> Iterator[tuple[int, str]]:
        """``(literal, "a<b")`` for every arc that has a literal (both directions of a pair)."""
        names = self.problem.items
        for a, b, up, down in sorted(self.pair_literals(), key=lambda t: (abs(t[2]), t[0], t[1])):
            yield up, f"{_q(names[a])}<{_q(names[b])}"
            yield down, f"{_q(names[b])}<{_q(names[a])}"

    def to_dimacs(self, assume_selectors: bool = True) -> str:
        """DIMACS CNF text of the clauses so far, with comment lines naming each literal
        (``c 17 kiln<loom``) and each selector (``c selector 57 comparable kiln loom``).

        With selectors, one unit clause per selector switches every requirement on
        (``assume_selectors``); delete a unit to drop that requirement.
        """
        names = self.problem.items
        units = [[s] for s in self.selector_of.values()] if assume_selectors else []
        lines = [
            "c satorder CNF: a model is a strict partial order meeting the hard requirements",
            f"c source {self.problem.source}",
            "c each line 'c LIT a<b' says literal LIT is true exactly when a comes before b;",
            "c pairs without a literal stay unordered",
        ]
        lines += [f"c {lit} {text}" for lit, text in self.variable_names()]
        for (kind, (a, b)), s in sorted(self.selector_of.items(), key=lambda t: t[1]):
            lines.append(f"c selector {s} {kind} {_q(names[a])} {_q(names[b])}")
        clauses = self.hard + units
        lines.append(f"p cnf {self.nv} {len(clauses)}")
        lines += [" ".join(map(str, cl)) + " 0" for cl in clauses]
        return "\n".join(lines) + "\n"


def _q(name: str) -> str:
    """An item name as written in comments: JSON-quoted if it has spaces or '<'."""
    if not name or any(ch.isspace() or ch in '<"' for ch in name):
        return json.dumps(name)
    return name


# ---------------------------------------------------------------------- baseline
class DirectEncoding:
    """The textbook encoding, the baseline the compact one is measured against: a variable per
    ordered pair of items, ``¬x_ab ∨ ¬x_ba`` per pair, ``¬x_ab ∨ ¬x_bc ∨ x_ac`` per ordered
    triple, and one or two clauses per requirement.  ``n(n-1)(n-2)`` transitivity clauses, so
    the clauses are generated in chunks (:meth:`chunks`) rather than kept in memory.
    """

    def __init__(self, problem: Problem):
        self.problem = problem
        n = self.n = problem.n
        self.nv = n * (n - 1)
        p = problem
        req: list[list[int]] = []
        for a, b in p.comparable_pairs():
            req.append([self.lt(a, b), self.lt(b, a)])
        for a, b in p.incomparable_pairs():
            req += [[-self.lt(a, b)], [-self.lt(b, a)]]
        req += [[self.lt(a, b)] for a, b in p.fixed]
        req += [[-self.lt(a, b)] for a, b in p.forbidden]
        self.requirement_clauses = req
        self.num_clauses = n * (n - 1) // 2 + n * (n - 1) * (n - 2) + len(req)

    def lt(self, a: int, b: int) -> int:
        """Variable of ``a < b``: ordered pairs numbered row by row, skipping the diagonal."""
        return a * (self.n - 1) + (b if b < a else b - 1) + 1

    def chunks(self, size: int = 200_000) -> Iterator[list[list[int]]]:
        """All clauses, in lists of about ``size`` clauses."""
        n = self.n
        lt = self.lt
        buf: list[list[int]] = []
        for a in range(n):
            for b in range(a + 1, n):
                buf.append([-lt(a, b), -lt(b, a)])
        buf += self.requirement_clauses
        for a in range(n):
            for b in range(n):
                if a == b:
                    continue
                ab = -lt(a, b)
                for c in range(n):
                    if c != a and c != b:
                        buf.append([ab, -lt(b, c), lt(a, c)])
                if len(buf) >= size:
                    yield buf
                    buf = []
        if buf:
            yield buf

    def decode(self, model: Iterable[int]) -> list[set[int]]:
        true = set(lit for lit in model if lit > 0)
        n = self.n
        return [{b for b in range(n) if b != a and self.lt(a, b) in true} for a in range(n)]


def direct_encoding(problem: Problem) -> DirectEncoding:
    """The baseline encoding over every ordered pair and item triple (see :class:`DirectEncoding`).

    >>> from satorder.problem import Problem
    >>> d = direct_encoding(Problem.from_lists(comparable=[("a", "b"), ("b", "c")]))
    >>> d.nv, d.num_clauses
    (6, 13)
    """
    return DirectEncoding(problem)
