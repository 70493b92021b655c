"""Independent checks: every answer, core, derivation, count and figure the tool prints is
re-checked here by code that did not produce it.

May import: :mod:`satorder.model`, :mod:`satorder.errors`, :mod:`satorder.jit` (numba
loading, no algorithm), and outside libraries (python-sat's plain solvers, numpy).  Never an
engine (graph, sat, measure, explanation, pipeline), so that a bug in an engine cannot hide in
its own check.
"""

from satorder.certify.chain import check_forcing_chain
from satorder.certify.core import check_core_infeasible
from satorder.certify.order import check_order

__all__ = ["check_core_infeasible", "check_forcing_chain", "check_order"]
