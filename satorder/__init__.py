"""satorder: pairwise evidence about items in, a certified partial order (or a checkable reason
why none exists) out.

>>> import satorder
>>> p = satorder.Problem.from_lists(comparable=[("kiln", "loom"), ("loom", "quay")])
>>> satorder.solve(p).status
'feasible'
"""

from .answer import Answer
from .count import count_answers
from .errors import CertificateError, InputError
from .explain import explain
from .modular import modular_decomposition
from .problem import Problem
from .readers import problem_from_dict, read_problem
from .solve import solve

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
