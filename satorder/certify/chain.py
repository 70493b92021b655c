"""Check a forcing-chain certificate: a chain of Γ steps (Golumbic 1980, ch. 5) over comparable
pairs, each justified by a pair that must stay unordered, ending in the reverse of its first
arc — proof that the comparable pairs admit no transitive orientation."""

from __future__ import annotations

from satorder.errors import CertificateError


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
