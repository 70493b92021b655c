"""Independent certificate checks.

Written separately from every engine and sharing no code with them: an answer is trusted only
after these checks pass.  Each check raises :class:`~satorder.errors.CertificateError` with a
message naming the offending items.

* :func:`check_order` — a claimed answer is a strict partial order (irreflexive, transitive,
  hence antisymmetric) meeting every hard requirement of the problem.  Transitivity is checked by
  successor-set inclusion: for every ``a < b``, every item above ``b`` is above ``a``.
* :func:`check_forcing_chain` — a claimed conflict is a chain of Γ forcing steps (Golumbic 1980,
  ch. 5) over comparable pairs, each justified by a pair that must stay unordered, ending in the
  reverse of its first arc.
"""

from __future__ import annotations

import importlib.util
import sys
from itertools import chain

import numpy as np

from satorder.errors import CertificateError

# a compiled inner loop for large orders, written here separately from any engine; numba is
# imported on first use so that importing satorder stays quick
_HAVE_NUMBA = importlib.util.find_spec("numba") is not None
_kernel = None


def _first_intransitive(succ: list[set[int]]):
    """``(a, a, a)`` for an item above itself, ``(a, b, c)`` for ``a < b < c`` without
    ``a < c``, or ``None``.  Successor-set inclusion, compiled when numba is present."""
    n = len(succ)
    if _HAVE_NUMBA and n > 64:
        deg = np.fromiter((len(s) for s in succ), dtype=np.int64, count=n)
        indptr = np.zeros(n + 1, dtype=np.int64)
        np.cumsum(deg, out=indptr[1:])
        indices = np.fromiter(chain.from_iterable(succ), dtype=np.int64, count=int(indptr[-1]))
        global _kernel
        if _kernel is None:
            try:
                from numba import njit
            except BaseException:  # an interrupted import must not leave half of numba loaded
                for key in [k for k in sys.modules if k == "numba" or k.startswith("numba.")]:
                    del sys.modules[key]
                raise
            _kernel = njit(cache=True)(_intransitive_kernel)
        a, b, c = _kernel(indptr, indices)
        return None if a < 0 else (int(a), int(b), int(c))
    for a in range(n):
        sa = succ[a]
        if a in sa:
            return (a, a, a)
        # everything above an item above a is above a (one C-level pass)
        if sa and not sa.issuperset(chain.from_iterable(map(succ.__getitem__, sa))):
            for b in sa:
                if not succ[b] <= sa:
                    return (a, b, next(iter(succ[b] - sa)))
    return None


def _intransitive_kernel(indptr, indices):  # pragma: no cover - compiled
    n = len(indptr) - 1
    mark = np.full(n, -1, dtype=np.int64)
    for a in range(n):
        for t in range(indptr[a], indptr[a + 1]):
            mark[indices[t]] = a
        if mark[a] == a:
            return a, a, a
        for t in range(indptr[a], indptr[a + 1]):
            b = indices[t]
            for u in range(indptr[b], indptr[b + 1]):
                c = indices[u]
                if mark[c] != a:
                    return a, b, c
    return -1, -1, -1


def check_order(problem, succ: list[set[int]]) -> None:
    """Verify that ``succ`` (items strictly above each item) answers ``problem``."""
    n = problem.n
    names = problem.items
    if len(succ) != n:
        raise CertificateError(f"order covers {len(succ)} items, problem has {n}")
    top = max((max(s) for s in succ if s), default=-1)
    low = min((min(s) for s in succ if s), default=0)
    if top >= n or low < 0:
        raise CertificateError(f"order names an unknown item id ({top if top >= n else low})")
    bad = _first_intransitive(succ)
    if bad is not None:
        a, b, c = bad
        if a == b:
            raise CertificateError(f"order is not irreflexive: {names[a]} < {names[a]}")
        raise CertificateError(
            f"order is not transitive: {names[a]} < {names[b]} < {names[c]} "
            f"but not {names[a]} < {names[c]}"
        )
    adj = problem.adj
    if problem.incomparable is None:
        # every ordered pair must be a comparable pair; with transitivity and irreflexivity
        # (so antisymmetry) the counts then match exactly when every comparable pair is ordered
        total = 0
        for a in range(n):
            if not succ[a] <= adj[a]:
                b = next(iter(succ[a] - adj[a]))
                raise CertificateError(
                    f"{names[a]} < {names[b]} but the pair must stay unordered"
                )
            total += len(succ[a])
        if total != problem.num_comparable:
            for a in range(n):
                for b in adj[a]:
                    if b not in succ[a] and a not in succ[b]:
                        raise CertificateError(
                            f"comparable pair {names[a]}, {names[b]} is left unordered"
                        )
    else:
        for a in range(n):
            for b in adj[a]:
                if a < b and b not in succ[a] and a not in succ[b]:
                    raise CertificateError(
                        f"comparable pair {names[a]}, {names[b]} is left unordered"
                    )
            for b in problem.incomparable[a]:
                if b in succ[a]:
                    raise CertificateError(
                        f"{names[a]} < {names[b]} but the pair must stay unordered"
                    )
    for a, b in problem.fixed:
        if b not in succ[a]:
            raise CertificateError(f"fixed arc {names[a]} < {names[b]} does not hold")
    for a, b in problem.forbidden:
        if b in succ[a]:
            raise CertificateError(f"forbidden arc {names[a]} < {names[b]} holds")


def check_forcing_chain(problem, chain) -> None:
    """Verify a conflict certificate: a list of ``(arc, because)`` steps (or objects with
    ``.arc`` and ``.because``) where each arc is Γ-forced by the previous one and the last arc
    is the reverse of the first.

    Γ step (Golumbic 1980, ch. 5): ``a→b`` forces ``a→d`` when ``{b, d}`` must stay unordered,
    and forces ``c→b`` when ``{a, c}`` must stay unordered.
    """
    steps = [(s.arc, s.because) if hasattr(s, "arc") else tuple(s) for s in chain]
    if len(steps) < 2:
        raise CertificateError("a forcing chain needs at least two arcs")
    names = problem.items
    adj = problem.adj

    def comparable(a, b):
        return 0 <= a < problem.n and 0 <= b < problem.n and b in adj[a]

    for k, (arc, _) in enumerate(steps):
        a, b = arc
        if not comparable(a, b):
            raise CertificateError(f"step {k}: {a}→{b} is not a comparable pair")
    for k in range(1, len(steps)):
        (a, b), _ = steps[k - 1]
        (c, d), because = steps[k]
        if because is None:
            raise CertificateError(f"step {k}: no witness pair given")
        x, y = because
        if a == c and b != d:
            ok = {x, y} == {b, d}
        elif b == d and a != c:
            ok = {x, y} == {a, c}
        else:
            raise CertificateError(
                f"step {k}: {names[a]}→{names[b]} and {names[c]}→{names[d]} share neither "
                "tail nor head"
            )
        if not ok:
            raise CertificateError(f"step {k}: witness pair is not the pair of other ends")
        if not problem.must_be_unordered(x, y):
            raise CertificateError(
                f"step {k}: witness {names[x]}, {names[y]} is not a pair that must stay unordered"
            )
    (a, b), _ = steps[0]
    if steps[-1][0] != (b, a):
        raise CertificateError("the chain does not end in the reverse of its first arc")


CORE_KINDS = ("comparable", "incomparable", "fixed", "forbidden")


def _core_is_feasible(core: list[dict]) -> bool:
    """Decide a small requirement set on its own (all unnamed pairs open) by the textbook
    encoding over every ordered pair and every triple of the items it mentions, solved with
    MiniSat — deliberately not the engine's compact encoding nor its default solver."""
    from itertools import permutations

    from pysat.solvers import Solver

    items = sorted({i for r in core for i in r["pair"]})
    var = {}
    for a, b in permutations(items, 2):
        var[a, b] = len(var) + 1
    clauses = [[-var[a, b], -var[b, a]] for a, b in permutations(items, 2) if a < b]
    clauses += [[-var[a, b], -var[b, c], var[a, c]] for a, b, c in permutations(items, 3)]
    for r in core:
        kind, (a, b) = r["kind"], r["pair"]
        if kind not in CORE_KINDS or a == b:
            raise CertificateError(f"core entry {r!r} is not a requirement")
        if kind == "comparable":
            clauses.append([var[a, b], var[b, a]])
        elif kind == "incomparable":
            clauses += [[-var[a, b]], [-var[b, a]]]
        elif kind == "fixed":
            clauses.append([var[a, b]])
        else:
            clauses.append([-var[a, b]])
    with Solver(name="minisat22", bootstrap_with=clauses) as s:
        return s.solve()


def check_core_infeasible(problem, core: list[dict], minimal: bool = False) -> None:
    """Verify that a core (requirements ``{"kind", "pair"}`` over item ids) belongs to the
    problem and admits no order on its own; with ``minimal``, also that dropping any one member
    makes it feasible (deletion-based MUS check)."""
    fixed, forbidden = set(problem.fixed), set(problem.forbidden)
    for r in core:
        kind, (a, b) = r["kind"], r["pair"]
        if kind == "comparable":
            present = b in problem.adj[a]
        elif kind == "incomparable":
            present = problem.must_be_unordered(a, b)
        elif kind == "fixed":
            present = (a, b) in fixed
        elif kind == "forbidden":
            present = (a, b) in forbidden
        else:
            present = False
        if not present:
            raise CertificateError(f"core entry {kind} {a},{b} is not a requirement of the problem")
    if _core_is_feasible(core):
        raise CertificateError("the core admits an order on its own, so it proves nothing")
    if minimal:
        for k in range(len(core)):
            if not _core_is_feasible(core[:k] + core[k + 1:]):
                raise CertificateError(f"the core is not minimal: member {k} can be dropped")
