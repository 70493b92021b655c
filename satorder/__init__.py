"""satorder: pairwise evidence about items in, a certified partial order (or a checkable reason
why none exists) out.

>>> import satorder
>>> p = satorder.Problem.from_lists(comparable=[("kiln", "loom"), ("loom", "quay")])
>>> satorder.solve(p).status
'feasible'
"""

from satorder.errors import CertificateError, InputError
from satorder.explanation.explain import explain
from satorder.graph.modular import modular_decomposition
from satorder.io.readers import problem_from_dict, read_problem
from satorder.model.answer import Answer
from satorder.model.problem import Problem
from satorder.pipeline.count import count_answers
from satorder.pipeline.solve import solve

__all__ = [
    "Answer",
    "CertificateError",
    "InputError",
    "count_answers",
    "explain",
    "modular_decomposition",
    "Problem",
    "problem_from_dict",
    "read_problem",
    "solve",
]
__version__ = "0.1.0"
