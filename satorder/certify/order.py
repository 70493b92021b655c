"""Independent certificate checks.

Written separately from every engine and sharing no code with them: an answer is trusted only
after these checks pass.  Each check raises :class:`~satorder.errors.CertificateError` with a
message naming the offending items.

* :func:`check_order` — a claimed answer is a strict partial order (irreflexive, transitive,
  hence antisymmetric) meeting every hard requirement of the problem.  Transitivity is checked by
  successor-set inclusion: for every ``a < b``, every item above ``b`` is above ``a``.  When
  both the answer and the comparable pairs come as compact arrays (large plain edge lists), the
  whole check runs on the arrays in compiled loops written here, without making a set.
* :func:`satorder.certify.chain.check_forcing_chain` — a claimed conflict is a chain of Γ
  forcing steps (Golumbic 1980, ch. 5), each justified by a pair that must stay unordered.
"""

from __future__ import annotations

from itertools import chain

from satorder.errors import CertificateError
from satorder.jit import HAVE_NUMBA

# from this many ordered pairs the check runs compiled; below, the plain loop takes
# milliseconds while loading numba takes about a second
COMPILED_FROM = 20_000


def _first_intransitive(succ: list[set[int]]):
    """``(a, a, a)`` for an item above itself, ``(a, b, c)`` for ``a < b < c`` without
    ``a < c``, or ``None``.  Successor-set inclusion, compiled when numba is present and the
    order has at least :data:`COMPILED_FROM` ordered pairs."""
    n = len(succ)
    if HAVE_NUMBA and sum(map(len, succ)) >= COMPILED_FROM:
        from satorder.certify.order_kernel import first_intransitive

        return first_intransitive(succ)
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


def _compact_arrays(sets):
    """``(indptr, indices)`` of a compact :class:`~satorder.model.adjacency.CsrSets` whose
    arrays are still authoritative, else ``None`` (duck-typed, so that checking an order of
    plain sets never imports numpy)."""
    if getattr(sets, "is_compact", False):
        return sets.csr()
    return None


def check_order(problem, succ: list[set[int]]) -> None:
    """Verify that ``succ`` (items strictly above each item) answers ``problem``."""
    n = problem.n
    names = problem.items
    compact = _compact_arrays(succ)
    plain = problem.incomparable is None and not problem.fixed and not problem.forbidden
    adj_arrays = _compact_arrays(problem.adj)
    if HAVE_NUMBA and compact is not None and adj_arrays is not None and plain:
        sptr, sidx = compact
        if len(sptr) != n + 1:
            raise CertificateError(f"order covers {len(sptr) - 1} items, problem has {n}")
        if len(sidx) and (int(sidx.min()) < 0 or int(sidx.max()) >= n):
            bad = int(sidx.min()) if int(sidx.min()) < 0 else int(sidx.max())
            raise CertificateError(f"order names an unknown item id ({bad})")
        from satorder.certify.order_kernel import first_intransitive_arrays, first_outside

        bad = first_intransitive_arrays(sptr, sidx)
        if bad is not None:
            _raise_intransitive(names, *bad)
        a, b, kind = first_outside(sptr, sidx, *adj_arrays)
        if a >= 0:
            if kind == 1:
                raise CertificateError(f"order lists {names[b]} above {names[a]} twice")
            raise CertificateError(f"{names[a]} < {names[b]} but the pair must stay unordered")
        # distinct ordered pairs, all comparable, antisymmetric: all ordered iff the counts match
        if len(sidx) != len(adj_arrays[1]) // 2:
            _name_unordered_pair(problem, succ)
        return
    if len(succ) != n:
        raise CertificateError(f"order covers {len(succ)} items, problem has {n}")
    top = max((max(s) for s in succ if s), default=-1)
    low = min((min(s) for s in succ if s), default=0)
    if top >= n or low < 0:
        raise CertificateError(f"order names an unknown item id ({top if top >= n else low})")
    bad = _first_intransitive(succ)
    if bad is not None:
        _raise_intransitive(names, *bad)
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
            _name_unordered_pair(problem, succ)
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


def _raise_intransitive(names, a: int, b: int, c: int) -> None:
    if a == b:
        raise CertificateError(f"order is not irreflexive: {names[a]} < {names[a]}")
    raise CertificateError(
        f"order is not transitive: {names[a]} < {names[b]} < {names[c]} "
        f"but not {names[a]} < {names[c]}"
    )


def _name_unordered_pair(problem, succ) -> None:
    """Raise for a comparable pair that ``succ`` leaves unordered (the caller knows one is)."""
    names = problem.items
    for a in range(problem.n):
        for b in problem.adj[a]:
            if b not in succ[a] and a not in succ[b]:
                raise CertificateError(f"comparable pair {names[a]}, {names[b]} is left unordered")
    raise CertificateError("order has fewer ordered pairs than the problem has comparable pairs")
