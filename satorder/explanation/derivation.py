"""Step-by-step derivations: why a core of requirements admits no order, in the user's terms.

A derivation is a numbered list of steps.  Each step states an arc ``a < b`` or a contradiction
and names the rule it applies, the earlier steps and the core requirements it uses:

==============  =====================================================================
rule            what it says
==============  =====================================================================
``fixed``       a fixed arc ``a → b`` gives ``a < b``
``assume``      a comparable pair {a, b} is ordered one way or the other: *suppose*
                ``a < b`` (opens a case, indented one level deeper)
``other way``   the case ``a < b`` ended in a contradiction, and {a, b} must be
                ordered, so ``b < a`` (closes the case)
``forcing``     ``a < b``, {b, c} comparable and {a, c} unordered give ``c < b``: both
                arcs point into b; likewise ``a < b``, {a, c} comparable and {b, c}
                unordered give ``a < c``: both arcs point out of a (Γ forcing,
                Golumbic, *Algorithmic Graph Theory and Perfect Graphs*, 1980, ch. 5)
``transitivity````a < b`` and ``b < c`` give ``a < c``
``antisymmetry``  ``a < b`` and ``b < a``: contradiction
``unordered``   ``a < b`` while {a, b} must stay unordered: contradiction
``forbidden``   ``a < b`` while the arc ``a → b`` is forbidden: contradiction
==============  =====================================================================

A derivation ends in a contradiction outside every case.  It is found by a small refutation
search: unit propagation with these rules (breadth first, so chains stay short), failed-literal
probing on comparable pairs, and case splits where probing is not enough (the DPLL scheme,
Davis, Logemann & Loveland 1962).  The search is complete for infeasible cores: a branch where
every comparable pair is oriented and no rule fires is closed under transitivity and meets every
requirement, i.e. it is an order.  Only the steps the final contradiction depends on are kept.
:mod:`satorder.certify.derivation` checks derivations independently of this module.

>>> from satorder.model.requirement import Requirement as R
>>> core = [R("fixed", (0, 1)), R("fixed", (1, 2)), R("incomparable", (0, 2))]
>>> [(s.rule, s.arc) for s in build_derivation(core)]
[('fixed', (0, 1)), ('fixed', (1, 2)), ('transitivity', (0, 2)), ('unordered', None)]
"""

from __future__ import annotations

import time
from collections import defaultdict, deque
from dataclasses import dataclass

from satorder.model.requirement import Kind, Requirement
from satorder.model.wording import requirement_text

Arc = tuple[int, int]


@dataclass(frozen=True)
class Step:
    """One line of a derivation (``arc`` is ``None`` for a contradiction)."""

    number: int
    rule: str
    arc: Arc | None
    steps: tuple[int, ...]
    requirements: tuple[int, ...]
    depth: int


class _Node:
    __slots__ = ("arc", "rule", "premises", "reqs", "scope")

    def __init__(self, arc, rule, premises, reqs, scope):
        self.arc = arc
        self.rule = rule
        self.premises = premises
        self.reqs = reqs
        self.scope = scope  # tuple of the assume-nodes this fact lives under


class DerivationBudgetExceeded(RuntimeError):
    """The refutation search gave up (too many propagation rounds)."""


class _Search:
    def __init__(self, core: list[Requirement], budget: int, time_limit: float):
        self.budget = budget
        self.deadline = time.monotonic() + time_limit
        self.fixed: dict[Arc, int] = {}
        self.forbidden: dict[Arc, int] = {}
        self.incomparable: dict[frozenset, int] = {}
        self.comparable: dict[frozenset, int] = {}
        self.comp_nb: dict[int, list[int]] = defaultdict(list)
        for k, (kind, (a, b)) in enumerate(core):
            if kind == Kind.FIXED:
                self.fixed.setdefault((a, b), k)
            elif kind == Kind.FORBIDDEN:
                self.forbidden.setdefault((a, b), k)
            elif kind == Kind.INCOMPARABLE:
                self.incomparable.setdefault(frozenset((a, b)), k)
            elif frozenset((a, b)) not in self.comparable:  # Kind.COMPARABLE
                self.comparable[frozenset((a, b))] = k
                self.comp_nb[a].append(b)
                self.comp_nb[b].append(a)
        self.pairs = [tuple(sorted(p)) for p in self.comparable]

    # ------------------------------------------------------------------ propagation
    def propagate(self, facts: dict[Arc, _Node], fresh: list[_Node], scope) -> _Node | None:
        """Close ``facts`` under forcing and transitivity; return a contradiction node or None."""
        self.budget -= 1
        if self.budget < 0 or time.monotonic() > self.deadline:
            raise DerivationBudgetExceeded("derivation search budget exhausted")
        out: dict[int, set[int]] = defaultdict(set)
        inn: dict[int, set[int]] = defaultdict(set)
        for a, b in facts:
            out[a].add(b)
            inn[b].add(a)
        queue = deque(fresh)
        for node in fresh:
            bad = self._conflict(facts, node, scope)
            if bad is not None:
                return bad
        while queue:
            node = queue.popleft()
            a, b = node.arc
            new: list[_Node] = []
            # forcing: both arcs into b, or both out of a
            for c in self.comp_nb.get(b, ()):
                k_inc = self.incomparable.get(frozenset((a, c)))
                if c != a and k_inc is not None:
                    new.append(_Node((c, b), "forcing", (node,),
                                     (self.comparable[frozenset((b, c))], k_inc), scope))
            for c in self.comp_nb.get(a, ()):
                k_inc = self.incomparable.get(frozenset((b, c)))
                if c != b and k_inc is not None:
                    new.append(_Node((a, c), "forcing", (node,),
                                     (self.comparable[frozenset((a, c))], k_inc), scope))
            for c in list(out[b]):
                new.append(_Node((a, c), "transitivity", (node, facts[b, c]), (), scope))
            for c in list(inn[a]):
                new.append(_Node((c, b), "transitivity", (facts[c, a], node), (), scope))
            for m in new:
                x, y = m.arc
                if x == y or m.arc in facts:
                    continue
                facts[m.arc] = m
                out[x].add(y)
                inn[y].add(x)
                bad = self._conflict(facts, m, scope)
                if bad is not None:
                    return bad
                queue.append(m)
        return None

    def _conflict(self, facts, node: _Node, scope) -> _Node | None:
        a, b = node.arc
        if (b, a) in facts:
            return _Node(None, "antisymmetry", (facts[b, a], node), (), scope)
        k = self.incomparable.get(frozenset((a, b)))
        if k is not None:
            return _Node(None, "unordered", (node,), (k,), scope)
        k = self.forbidden.get((a, b))
        if k is not None:
            return _Node(None, "forbidden", (node,), (k,), scope)
        return None

    # ------------------------------------------------------------------ refutation
    def refute(self, facts: dict[Arc, _Node], fresh: list[_Node], scope) -> _Node | None:
        """A contradiction node derivable from ``facts`` in ``scope``, or None if satisfiable."""
        facts = dict(facts)
        bad = self.propagate(facts, fresh, scope)
        while bad is None:
            open_pairs = [(a, b) for a, b in self.pairs
                          if (a, b) not in facts and (b, a) not in facts]
            if not open_pairs:
                return None  # every pair oriented and nothing fires: an order exists
            lemma = self._probe(facts, open_pairs, scope)
            if lemma is None:  # no direction fails at once: split on the first open pair
                a, b = open_pairs[0]
                lemma = self._case(facts, (a, b), scope, full=True)
                if lemma is None:
                    return None
            facts[lemma.arc] = lemma
            bad = self.propagate(facts, [lemma], scope)
        return bad

    def _probe(self, facts, open_pairs, scope) -> _Node | None:
        for a, b in open_pairs:
            for arc in ((a, b), (b, a)):
                lemma = self._case(facts, arc, scope, full=False)
                if lemma is not None:
                    return lemma
        return None

    def _case(self, facts, arc: Arc, scope, full: bool) -> _Node | None:
        """Suppose ``arc``; on a contradiction return the 'other way' lemma for the reverse."""
        k = self.comparable[frozenset(arc)]
        assume = _Node(arc, "assume", (), (k,), None)
        inner = scope + (assume,)
        assume.scope = inner
        sub = dict(facts)
        sub[arc] = assume
        if full:
            bad = self.refute(sub, [assume], inner)
        else:
            bad = self.propagate(sub, [assume], inner)
        if bad is None:
            return None
        return _Node((arc[1], arc[0]), "other way", (assume, bad), (k,), scope)

    def run(self) -> _Node | None:
        facts: dict[Arc, _Node] = {}
        fresh = []
        for arc, k in self.fixed.items():
            node = _Node(arc, "fixed", (), (k,), ())
            if arc in facts:
                continue
            facts[arc] = node
            fresh.append(node)
        return self.refute(facts, fresh, ())


def _linearise(root: _Node) -> list[Step]:
    numbers: dict[int, int] = {}
    steps: list[Step] = []

    def put(node: _Node) -> None:
        depth = len(node.scope)
        steps.append(Step(len(steps) + 1, node.rule, node.arc,
                          tuple(numbers[id(p)] for p in node.premises), tuple(node.reqs), depth))
        numbers[id(node)] = len(steps)

    def outside(node: _Node, case: _Node, acc: list[_Node], seen: set[int]) -> None:
        """Nodes the case's sub-proof uses from outside the case, in no particular order."""
        todo = [node]
        while todo:
            cur = todo.pop()
            if id(cur) in seen:
                continue
            seen.add(id(cur))
            if not any(s is case for s in cur.scope):
                acc.append(cur)
            else:
                todo.extend(cur.premises)

    def emit(node: _Node) -> None:
        stack = [(node, False)]
        while stack:
            cur, ready = stack.pop()
            if id(cur) in numbers:
                continue
            if cur.rule == "other way":
                case, bad = cur.premises
                if not ready:
                    acc: list[_Node] = []
                    outside(bad, case, acc, set())
                    stack.append((cur, True))
                    for p in acc:
                        stack.append((p, False))
                    continue
                put(case)
                emit(bad)
                put(cur)
                continue
            missing = [p for p in cur.premises if id(p) not in numbers]
            if ready or not missing:
                put(cur)
                continue
            stack.append((cur, True))
            for p in reversed(missing):
                stack.append((p, False))

    emit(root)
    return steps


def build_derivation(core: list[Requirement], budget: int = 20000,
                     time_limit: float = 20.0) -> list[Step] | None:
    """A derivation of a contradiction from the requirements in ``core`` (over item ids), or
    ``None`` when the core admits an order.

    Raises :class:`DerivationBudgetExceeded` when the search needs more than ``budget``
    propagation rounds or ``time_limit`` seconds (large cores with many independent case
    splits).
    """
    root = _Search(core, budget, time_limit).run()
    if root is None:
        return None
    return _linearise(root)


# ---------------------------------------------------------------------- words
def describe(step: Step, core: list[Requirement], names: list[str]) -> tuple[str, str]:
    """The claim of a step and its justification, in plain words (item names).  Core members
    are cited as numbered rows, counted from 1 as the core is printed, each in the wording of
    :func:`satorder.model.wording.requirement_text`."""

    def req(k: int) -> str:
        return f"row {k + 1} ({requirement_text(core[k], names)})"

    claim = "contradiction" if step.arc is None else f"{names[step.arc[0]]} < {names[step.arc[1]]}"
    s = step.steps
    if step.rule == "fixed":
        why = f"fixed arc: {req(step.requirements[0])}"
    elif step.rule == "assume":
        claim = f"suppose {claim}"
        why = f"case split on {req(step.requirements[0])}"
    elif step.rule == "other way":
        why = (f"the case in steps {s[0]}–{s[1]} is impossible and the pair must be ordered: "
               f"{req(step.requirements[0])}")
    elif step.rule == "forcing":
        a, b = step.arc
        k_comp, k_inc = step.requirements
        into = b not in core[k_inc].pair
        pivot = names[b] if into else names[a]
        way = "into" if into else "out of"
        why = (f"forcing from step {s[0]}: {req(k_comp)} and {req(k_inc)}, so both arcs point "
               f"{way} {pivot}")
    elif step.rule == "transitivity":
        why = f"transitivity: steps {s[0]} and {s[1]}"
    elif step.rule == "antisymmetry":
        why = f"antisymmetry: steps {s[0]} and {s[1]} order the same pair both ways"
    elif step.rule == "unordered":
        a, b = (names[v] for v in core[step.requirements[0]].pair)
        why = f"step {s[0]} orders {a} and {b}, against {req(step.requirements[0])}"
    elif step.rule == "forbidden":
        why = f"step {s[0]} is ruled out by {req(step.requirements[0])}"
    else:
        why = step.rule
    return claim, why


def to_json(steps: list[Step], core: list[Requirement], names: list[str]) -> list[dict]:
    """The derivation as JSON-ready dicts (item names; ``requirements`` index the core list)."""
    out = []
    for st in steps:
        claim, why = describe(st, core, names)
        out.append({
            "step": st.number,
            "rule": st.rule,
            "arc": None if st.arc is None else [names[st.arc[0]], names[st.arc[1]]],
            "steps": list(st.steps),
            "requirements": list(st.requirements),
            "depth": st.depth,
            "text": f"{claim} ({why})",
        })
    return out
