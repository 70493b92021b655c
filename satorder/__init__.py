"""satorder: pairwise evidence about items in, a certified partial order (or a checkable reason
why none exists) out.

The names below are imported on first use (PEP 562 module ``__getattr__``), so that
``import satorder`` and the command line start quickly; ``satorder.solve`` and the rest behave
as plain attributes.

>>> import satorder
>>> p = satorder.Problem.from_lists(comparable=[("kiln", "loom"), ("loom", "quay")])
>>> satorder.solve(p).status
'feasible'
"""

from __future__ import annotations

import importlib

__version__ = "0.1.0"

# public name → the module that defines it
_EXPORTS = {
    "Answer": "satorder.model.answer",
    "CertificateError": "satorder.errors",
    "InputError": "satorder.errors",
    "count_answers": "satorder.pipeline.count",
    "explain": "satorder.explanation.explain",
    "modular_decomposition": "satorder.graph.modular",
    "Problem": "satorder.model.problem",
    "problem_from_dict": "satorder.io.readers",
    "read_problem": "satorder.io.readers",
    "sample_answers": "satorder.pipeline.sample",
    "settled": "satorder.pipeline.settled",
    "solve": "satorder.pipeline.solve",
    "why_settled": "satorder.explanation.settled_why",
}
__all__ = list(_EXPORTS)


def __getattr__(name: str):
    module = _EXPORTS.get(name)
    if module is None:
        raise AttributeError(f"module 'satorder' has no attribute {name!r}")
    value = getattr(importlib.import_module(module), name)
    globals()[name] = value  # later look-ups skip this function
    return value


def __dir__():
    return sorted(set(globals()) | set(_EXPORTS))
