"""Independent check of a claimed preference cost.

Shares no code with the MaxSAT solver (:mod:`satorder.sat.prefer`): it walks the problem's
preferences against the order itself.
"""

from __future__ import annotations

from collections import Counter

from satorder.errors import CertificateError


def check_cost(problem, succ: list[set[int]], cost: int, unmet) -> None:
    """Verify that exactly the listed preferences are unmet by ``succ`` and that their weights
    add up to ``cost``.  ``unmet`` is a list of ``(before, after, weight)`` item-id triples."""
    names = problem.items
    really = Counter((a, b, w) for a, b, w in problem.prefer if b not in succ[a])
    claimed = Counter((a, b, w) for a, b, w in (unmet or []))
    if really != claimed:
        extra = claimed - really
        missing = really - claimed
        if extra:
            a, b, _ = next(iter(extra))
            raise CertificateError(f"preference {names[a]} before {names[b]} is listed as unmet "
                                   "but the order meets it (or it is no preference)")
        a, b, _ = next(iter(missing))
        raise CertificateError(f"preference {names[a]} before {names[b]} is unmet but not listed")
    total = sum(w * k for (_, _, w), k in really.items())
    if total != cost:
        raise CertificateError(f"unmet preferences weigh {total}, the answer claims {cost}")
