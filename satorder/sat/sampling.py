"""Almost-uniform samples of the answers.

Method: UniGen (Chakraborty, Fremont, Meel, Seshia & Vardi, "On parallel scalable uniform SAT
witness generation", TACAS 2015; the version shipped by pyunigen is UniGen3 of Soos, Gocht &
Meel, CAV 2020) on the formula whose models projected on the order literals are exactly the
answers (:class:`satorder.sat.answer_formula.AnswerFormula`).  Random XOR constraints over the
projection cut the answers into cells of about the same size; a random cell is listed and one
of its answers returned.  Each answer ``y`` comes out with probability

    1 / ((1 + ε) |answers|)  ≤  Pr[y]  ≤  (1 + ε) / |answers|,

where ε follows from UniGen's uniformity parameter κ (0.638 by default) as
``ε = (1 + κ)(7.44 + 0.392 / (1 − κ)²) − 1`` (TACAS 2015, Theorem 1, recalled from memory:
about 16 for the default; in practice the samples are far closer to uniform, and when all
answers fit in one cell they are drawn exactly uniformly).  The same seed gives the same
samples.  UniGen cannot be interrupted, so it runs in a forked child process
(:mod:`satorder.sat.forked`) that a deadline or Ctrl-C ends.

>>> from satorder.model.problem import Problem
>>> from satorder.sat.answer_formula import AnswerFormula
>>> f = AnswerFormula(Problem.from_lists(items=["a", "b"], incomparable=[]))
>>> sorted(len([b for s in succ for b in s]) for succ in almost_uniform_samples(f, 6, seed=3))
[0, 0, 1, 1, 1, 1]
"""

from __future__ import annotations

from satorder.sat.answer_formula import AnswerFormula
from satorder.sat.forked import run_forked

KAPPA = 0.638  # UniGen's default uniformity parameter


def uniformity_epsilon(kappa: float = KAPPA) -> float:
    """The ε of UniGen's almost-uniformity guarantee for ``kappa`` (TACAS 2015)."""
    return (1 + kappa) * (7.44 + 0.392 / (1 - kappa) ** 2) - 1


def almost_uniform_samples(formula: AnswerFormula, k: int, seed: int = 1,
                           kappa: float = KAPPA,
                           deadline: float | None = None) -> list[list[set[int]]] | None:
    """``k`` answers of ``formula`` drawn almost uniformly (successor sets), or ``None`` when
    the deadline came first.  The formula must have at least one answer."""
    if k <= 0:
        return []
    if formula.unsat:
        raise ValueError("the formula has no answer to sample")
    if not formula.projection:
        return [[set() for _ in range(formula.problem.n)] for _ in range(k)]

    def call():
        import pyunigen

        sampler = pyunigen.Sampler(seed=seed, kappa=kappa)
        for clause in formula.clauses:
            sampler.add_clause(clause)
        _, _, samples = sampler.sample(num=k, sampling_set=formula.projection)
        return samples

    samples, stopped = run_forked(call, deadline)
    if stopped:
        return None
    if len(samples) < k:
        raise RuntimeError(f"the sampler returned {len(samples)} of {k} samples")
    return [formula.decode(s) for s in samples[:k]]
