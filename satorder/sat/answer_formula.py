"""A CNF whose models, projected on the order literals, are exactly the answers of a problem —
the formula handed to model counters and samplers.

The compact encoding (:mod:`satorder.sat.encoding`) with every variable created up front (the
open pairs' too) and every transitivity clause written (:meth:`Encoding.add_all_transitivity`,
not the lazy loop): then every model is a strict partial order meeting every hard requirement,
and two models that agree on the order literals are the same answer.  The order literals are
all the variables of the encoding (a comparable pair's implication class shares one, an open
pair has two), so counting or sampling the models *projected on them* counts or samples the
answers (projected model counting, as in ApproxMC's "sampling set").

Writing every transitivity clause costs a clause per orderable triple, so this is for problems
of up to a few hundred items.

>>> from satorder.model.problem import Problem
>>> f = AnswerFormula(Problem.from_lists(items=["a", "b"], incomparable=[]))   # one open pair
>>> len(f.projection), f.free, f.clauses          # a<b, b<a, never both: 3 answers
(2, [], [[-1, -2]])
"""

from __future__ import annotations

from satorder.model.problem import Problem
from satorder.sat.encoding import Encoding

MAX_CLAUSES = 5_000_000  # transitivity clauses past which no formula is built for counters


def transitivity_clauses(problem: Problem) -> int:
    """About how many transitivity clauses :class:`AnswerFormula` would write: one per pair of
    items that may be ordered with a middle item, summed over the middle items.

    >>> transitivity_clauses(Problem.from_lists(items=["a", "b", "c"], incomparable=[]))
    12
    """
    n = problem.n
    total = 0
    for b in range(n):
        if problem.incomparable is None:
            d = len(problem.adj[b])
        else:
            d = n - 1 - len(problem.incomparable[b] - problem.adj[b])
        total += d * d
    return total


def too_large(problem: Problem) -> str | None:
    """Why no :class:`AnswerFormula` is built for ``problem`` (its size, in words), or None
    when it is within :data:`MAX_CLAUSES`."""
    size = transitivity_clauses(problem)
    if size <= MAX_CLAUSES:
        return None
    return f"about {size:,} transitivity clauses, at most {MAX_CLAUSES:,}"


class AnswerFormula:
    """``clauses`` over variables ``1 … nv``; ``projection`` the order variables that occur in
    some clause and ``free`` those that occur in none (each doubles the answers: counters and
    samplers take only variables of the clauses); ``decode`` turns a model (or a sample over
    the projection) into successor sets; ``unsat`` is True when the encoding already holds the
    empty clause."""

    def __init__(self, problem: Problem):
        enc = Encoding(problem)
        n = problem.n
        if problem.incomparable is not None:  # open pairs need their variables from the start
            for a in range(n):
                others = problem.incomparable[a]
                adj = problem.adj[a]
                for b in range(a + 1, n):
                    if b not in adj and b not in others:
                        enc.lt(a, b)
        enc.add_all_transitivity()
        self.problem = problem
        self.enc = enc
        self.clauses = enc.hard
        self.nv = enc.nv
        used = {abs(lit) for clause in enc.hard for lit in clause}
        self.projection = [v for v in range(1, enc.nv + 1) if v in used]
        self.free = [v for v in range(1, enc.nv + 1) if v not in used]
        self.unsat = any(not c for c in enc.hard)

    def decode(self, model) -> list[set[int]]:
        """Successor sets of the answer a model (or a projected sample) stands for."""
        return self.enc.decode(model)

    def literal(self, a: int, b: int) -> int | None:
        """The literal meaning ``a < b`` (``None``: the pair must stay unordered)."""
        return self.enc.lt(a, b)
