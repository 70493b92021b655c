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

Samples are drawn in runs of :data:`CHUNK` from a fresh sampler each (seeded from the seed and
the run's number): one sampler's cost per sample grows with the samples it has already drawn
(measured here on the 219 answers of four items with every pair open: 50 samples 0.47 s,
400 samples 8.4 s from one sampler), and separate runs are independent draws all the same.

>>> from satorder.model.problem import Problem
>>> from satorder.sat.answer_formula import AnswerFormula
>>> f = AnswerFormula(Problem.from_lists(items=["a", "b"], incomparable=[]))
>>> drawn = almost_uniform_samples(f, 6, seed=3)          # three answers: {}, a<b, b<a
>>> len(drawn), all(sum(map(len, succ)) <= 1 for succ in drawn)
(6, True)
>>> drawn == almost_uniform_samples(f, 6, seed=3)          # same seed, same samples
True
"""

from __future__ import annotations

from satorder.sat.answer_formula import AnswerFormula
from satorder.sat.forked import run_forked

KAPPA = 0.638  # UniGen's default uniformity parameter
CHUNK = 50  # samples drawn from one sampler before a fresh one takes over


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
    import random

    coin = random.Random(seed)  # order variables in no clause are fair coins

    def with_free(sample: list[int]) -> list[int]:
        return list(sample) + [v if coin.random() < 0.5 else -v for v in formula.free]

    if not formula.projection:
        return [formula.decode(with_free([])) for _ in range(k)]

    def call():
        import pyunigen

        out = []
        for run in range((k + CHUNK - 1) // CHUNK):
            sampler = pyunigen.Sampler(seed=seed * 7919 + run, kappa=kappa)
            for clause in formula.clauses:
                sampler.add_clause(clause)
            want = min(CHUNK, k - len(out))
            _, _, samples = sampler.sample(num=want, sampling_set=formula.projection)
            if len(samples) < want:
                raise RuntimeError(f"the sampler returned {len(samples)} of {want} samples")
            out += samples[:want]
        return out

    samples, stopped = run_forked(call, deadline)
    if stopped:
        return None
    return [formula.decode(with_free(s)) for s in samples]
