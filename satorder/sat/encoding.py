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
  ``selector_of[requirement]`` and its inverse ``requirement_of[literal]``.  Keys are
  :class:`~satorder.model.requirement.Requirement` values, exactly the members of a core (a
  plain ``(kind, pair)`` tuple in the same form finds the same entry).  Every clause that
  stands for a requirement contains ``-selector``; assuming the selector switches the
  requirement on, leaving it unassumed drops it (the pair becomes open).
* ``decode(model)`` → successor sets of the ordered pairs true in the model (a relation,
  transitively closed once ``violations`` finds nothing); ``violations(succ)`` → violated
  triples ``(a, b, c)``; ``refine(triples)`` → adds their clauses, returns how many.
* ``pair_literals()`` → ``(a, b, lit a<b, lit b<a)`` for every pair with variables;
  ``has_pair(a, b)``; ``num_classes`` → implication classes merged; ``phase_hints`` → preferred
  literals for a solver's phases (comparable pairs upwards by id, other pairs unordered).
* ``unsat_reason`` → requirement keys of an implication class holding an arc and its reverse,
  or the two requirements of a clash on one pair (:meth:`Problem.contradictions`), when
  selectors are off (the CNF then holds the empty clause); ``origin[k]`` → why clause
  ``hard[k]`` is there; ``requirements_behind(clause_ids)`` → requirements implying those
  clauses (cores without selectors: see :mod:`satorder.sat`).
* ``to_dimacs()`` → DIMACS CNF text with ``c`` lines naming each variable and selector.

>>> from satorder.model.problem import Problem
>>> p = Problem.from_lists(comparable=[("a", "b"), ("b", "c")], incomparable=[("a", "c")])
>>> enc = Encoding(p)
>>> enc.lt(0, 1) == enc.lt(2, 1), enc.lt(0, 2)  # Γ: a<b forces c<b; a, c stay unordered
(True, None)
"""

from __future__ import annotations

from collections.abc import Iterable, Iterator
from itertools import islice

import numpy as np

from satorder.graph.forcing import implication_ties, tie_components, tie_graph
from satorder.model.problem import Problem
from satorder.model.requirement import Kind, Requirement
from satorder.sat.dimacs import to_dimacs
from satorder.sat.ties import Arc, Key, conflict_core, tie_paths
from satorder.sat.violations import violations


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
        # why each clause is there (index in ``hard`` → ("triple", (a, b, c)) | ("axiom",) | the
        # fixed or forbidden Requirement it encodes); clauses added by callers have no entry
        self.origin: dict[int, tuple] = {}
        self._new_from = 0
        self._pair: dict[int, tuple[int, int]] = {}  # key a*n+b (a<b) → (lit a<b, lit b<a)
        self.selector_of: dict[Key, int] = {}
        self.requirement_of: dict[int, Key] = {}
        # requirements that cannot hold together, when collapsing finds an implication class
        # holding an arc and its reverse (the encoding then has an empty clause)
        self.unsat_reason: list[Key] | None = None
        self.num_classes = 0
        # preferred phases, in creation order: comparable pairs upwards by id, others unordered
        self.phase_hints: list[int] = []
        n = self.n
        self._forbid: dict[int, list[Arc]] = {}
        for a, b in problem.forbidden:
            self._forbid.setdefault(min(a, b) * n + max(a, b), []).append((a, b))
        if selectors:
            for a, b in problem.comparable_pairs():
                self.selector(Kind.COMPARABLE, (a, b))
            for arc in problem.fixed:
                self.selector(Kind.FIXED, arc)
            for arc in problem.forbidden:
                self.selector(Kind.FORBIDDEN, arc)
        if self.collapse:
            self._collapse_classes()
        else:
            for a, b in problem.comparable_pairs():
                self._make_pair(a, b)
        if not selectors:
            clash = problem.contradictions()
            if clash:  # two requirements clash on one pair: no order, nothing to search
                if self.unsat_reason is None:
                    self.hard.append([])
                self.unsat_reason = list(clash[0])
        for a, b in problem.fixed:
            lit = self.lt(a, b)
            if self.selectors:
                self.hard.append([-self.selector_of[Requirement(Kind.FIXED, (a, b))], lit])
            else:
                self._add([lit], Requirement(Kind.FIXED, (a, b)))
        if not lazy:
            self.add_all_transitivity()

    # ------------------------------------------------------------------ variables
    def _add(self, clause: list[int], origin: tuple) -> None:
        self.origin[len(self.hard)] = origin
        self.hard.append(clause)

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

    def selector(self, kind: Kind | str, pair: Arc) -> int:
        """The selector literal of requirement ``(kind, pair)``, created on first use."""
        key = Requirement(kind, pair)
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
        # with selectors a pair may be both (a clash, to be named by a core)
        unordered = p.must_be_unordered(a, b) and (self.selectors or not comparable)
        if unordered and not self.selectors:
            return None
        if comparable and not self.selectors:
            up = self.new_var()
            lits = (up, -up)
            self.phase_hints.append(up)
        else:
            up, down = self.new_var(), self.new_var()
            lits = (up, down)
            self._add([-up, -down], ("axiom",))
            self.phase_hints += [up, -down] if comparable else [-up, -down]
            if comparable:
                self.hard.append([-self.selector(Kind.COMPARABLE, (a, b)), up, down])
            if unordered:
                s = self.selector(Kind.INCOMPARABLE, (a, b))
                self.hard.append([-s, -up])
                self.hard.append([-s, -down])
        self._pair[key] = lits
        self._add_forbidden(key, lits, a)
        return lits

    def _add_forbidden(self, key: int, lits, a: int) -> None:
        for x, y in self._forbid.get(key, ()):
            lit = lits[0] if x == a else lits[1]
            if self.selectors:
                self.hard.append([-self.selector_of[Requirement(Kind.FORBIDDEN, (x, y))], -lit])
            else:
                self._add([-lit], Requirement(Kind.FORBIDDEN, (x, y)))

    # ------------------------------------------------------------------ implication classes
    def _collapse_classes(self) -> None:
        """One variable per implication class of comparable pairs (Γ through pairs that must
        stay unordered): connected components of the graph whose nodes are the two directions
        of each comparable pair and whose links are single Γ steps."""
        p = self.problem
        n = self.n
        lo, hi, _, src, dst, fl = implication_ties(p.adj, p.incomparable)
        edges = list(zip(lo.tolist(), hi.tolist()))
        m = len(edges)
        if m == 0:
            return
        eid = {a * n + b: k for k, (a, b) in enumerate(edges)}
        # node 2e: edge e as lo<hi; node 2e+1: hi<lo
        _, comp = tie_components(m, src, dst, fl)
        # kept to explain refutations (requirements_behind); the sparse graph is built then
        self._ties = ((m, src, dst, fl), edges, eid)
        c0, c1 = comp[0::2], comp[1::2]
        # one variable per class pair {c, reverse c}: numbered by the smaller component id
        key = np.minimum(c0, c1)
        uniq, var_idx = np.unique(key, return_inverse=True)
        self.num_classes = len(uniq)
        base = self.nv
        self.nv += len(uniq)
        lits = (var_idx + base + 1) * np.where(c0 <= c1, 1, -1)
        self.phase_hints.extend(range(base + 1, self.nv + 1))
        for (a, b), lit in zip(edges, lits.tolist()):
            self._pair[a * n + b] = (lit, -lit)
            if self._forbid:
                self._add_forbidden(a * n + b, (lit, -lit), a)
        bad = np.flatnonzero(c0 == c1)
        if len(bad):
            self.hard.append([])
            self.unsat_reason = conflict_core(tie_graph(m, src, dst, fl), int(bad[0]), edges)

    def requirements_behind(self, clause_ids: Iterable[int]) -> list[Key] | None:
        """Requirements that imply the given clauses of a collapsed encoding (selectors off):
        if those clauses are unsatisfiable, so are these requirements on their own.

        A transitivity clause needs the pairs it names to be comparable (when they are) and its
        missing closing pair to stay unordered; a unit needs its fixed or forbidden arc; and
        arcs sharing one class variable need the Γ steps that tie them (comparable pairs and
        the unordered pairs forcing each step, Golumbic 1980, ch. 5).  ``None`` when a clause
        has no recorded origin (added by a caller).
        """
        p = self.problem
        n = self.n
        out: dict[Key, None] = {}
        used: list[Arc] = []

        def pair_req(a: int, b: int) -> None:
            if b in p.adj[a]:
                out[Requirement(Kind.COMPARABLE, (a, b))] = None
                used.append((a, b))
            elif p.must_be_unordered(a, b):
                out[Requirement(Kind.INCOMPARABLE, (a, b))] = None

        for k in clause_ids:
            origin = self.origin.get(k)
            if origin is None:
                return None
            if isinstance(origin, Requirement):  # a fixed or forbidden arc
                out[origin] = None
                pair_req(*origin.pair)
            elif origin[0] == "triple":
                a, b, c = origin[1]
                pair_req(a, b)
                pair_req(b, c)
                pair_req(a, c)
        if getattr(self, "_ties", None) is not None:
            ties, edges, eid = self._ties
            graph = None
            by_var: dict[int, list[int]] = {}
            for a, b in used:
                lit = self.lt(a, b)
                e = eid[min(a, b) * n + max(a, b)]
                node = 2 * e if a < b else 2 * e + 1
                if lit < 0:
                    node ^= 1  # the reverse arc carries the positive literal
                by_var.setdefault(abs(lit), []).append(node)
            for nodes in by_var.values():
                targets = set(nodes[1:]) - {nodes[0]}
                if targets:
                    graph = tie_graph(*ties) if graph is None else graph
                    steps = tie_paths(graph, nodes[0], targets, edges)
                    if steps is None:
                        return None
                    for key in steps:
                        out[key] = None
        return list(out)

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

    def refine(self, triples: Iterable[tuple[int, int, int]], active=None) -> int:
        """Add the transitivity clause of each triple ``(a, b, c)``; returns how many.

        With selectors, a triple whose closing pair {a, c} must stay unordered and has no
        variable gets the short clause ``¬s_ac ∨ ¬(a<b) ∨ ¬(b<c)`` while that requirement is
        active (``active(key)`` true, default always); once it is dropped the pair gets its
        variables and the full clause.
        """
        n = self.n
        pair = self._pair
        p = self.problem
        adj = p.adj
        hard = self.hard
        origin = self.origin
        lt = self.lt
        count = 0
        for a, b, c in triples:
            lits = pair.get(a * n + b if a < b else b * n + a)  # usually exists: a<b holds
            x = (lits[0] if a < b else lits[1]) if lits is not None else lt(a, b)
            lits = pair.get(b * n + c if b < c else c * n + b)
            y = (lits[0] if b < c else lits[1]) if lits is not None else lt(b, c)
            if x is None or y is None:
                continue
            key = a * n + c if a < c else c * n + a
            lits = pair.get(key)
            if lits is None and c not in adj[a] and p.must_be_unordered(a, c):
                if not self.selectors:
                    origin[len(hard)] = ("triple", (a, b, c))
                    hard.append([-x, -y] if x != y else [-x])
                    count += 1
                    continue
                req = Requirement(Kind.INCOMPARABLE, (a, c))
                if active is None or active(req):
                    hard.append([-self.selector(*req), -x, -y])
                    count += 1
                    continue
            z = ((lits[0] if a < c else lits[1]) if lits is not None else lt(a, c))
            if z is None:
                cl = [-x, -y] if x != y else [-x]
            elif x != y and z != -x and z != -y:
                cl = [-x, -y, z]
            else:
                cl = list(dict.fromkeys((-x, -y, z)))
            if x == -y or z == x or z == y:
                continue  # tautology
            origin[len(hard)] = ("triple", (a, b, c))
            hard.append(cl)
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

    def add_all_transitivity(self, progress=None) -> int:
        """Write every transitivity clause for triples ``a, b, c`` with ``ab`` and ``bc`` both
        orderable (each once after collapsing; tautologies and repeats dropped).
        ``progress(done, total)`` is called after each middle item ``b``."""
        nbr = self.orderable_neighbours()
        seen: set[tuple[int, ...]] = set()
        count = 0
        for b in range(self.n):
            if progress is not None:
                progress(b, self.n)
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
                        self._add(cl, ("triple", (u, b, w)))
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

    def _pair_arrays(self):
        """The pair table as numpy arrays (key, lit a<b, lit b<a), extended incrementally."""
        cache = self.__dict__.setdefault("_arrays", [0, [], [], []])
        count = len(self._pair)
        if cache[0] < count:
            items = list(islice(self._pair.items(), cache[0], None))
            cache[1].append(np.fromiter((k for k, _ in items), dtype=np.int64, count=len(items)))
            cache[2].append(np.fromiter((u for _, (u, _) in items), dtype=np.int64,
                                        count=len(items)))
            cache[3].append(np.fromiter((d for _, (_, d) in items), dtype=np.int64,
                                        count=len(items)))
            for j in (1, 2, 3):
                cache[j] = [np.concatenate(cache[j])]
            cache[0] = count
        if not cache[1]:
            empty = np.zeros(0, dtype=np.int64)
            return empty, empty, empty
        return cache[1][0], cache[2][0], cache[3][0]

    def decode(self, model: Iterable[int]) -> list[set[int]]:
        """Successor sets of the relation a model sets: ``b in succ[a]`` iff ``a<b`` is true.

        Variables missing from the model count as false."""
        n = self.n
        keys, ups, downs = self._pair_arrays()
        m = np.asarray(list(model), dtype=np.int64)
        val = np.zeros(self.nv + 2, dtype=bool)
        pos = m[(m > 0) & (m <= self.nv)]
        val[pos] = True

        def truth(lits):
            t = val[np.abs(lits)]
            return np.where(lits > 0, t, ~t)

        t_up, t_down = truth(ups), truth(downs)
        lo, hi = keys // n, keys % n
        tails = np.concatenate([lo[t_up], hi[t_down]])
        heads = np.concatenate([hi[t_up], lo[t_down]])
        order = np.argsort(tails, kind="stable")
        heads_l = heads[order].tolist()
        ends = np.cumsum(np.bincount(tails, minlength=n)).tolist()
        starts = [0] + ends[:-1]
        return [set(heads_l[s:e]) for s, e in zip(starts, ends)]

    violations = staticmethod(violations)

    def to_dimacs(self, assume_selectors: bool = True) -> str:
        """DIMACS CNF text of the clauses so far (:func:`satorder.sat.dimacs.to_dimacs`)."""
        return to_dimacs(self, assume_selectors)
