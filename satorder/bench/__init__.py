"""Benchmarking instance suites: discovery, back ends, isolated runs, rows on disk, reports.

May import: :mod:`satorder.explanation`, :mod:`satorder.measure`, :mod:`satorder.pipeline`,
:mod:`satorder.sat`, :mod:`satorder.graph`, :mod:`satorder.certify`, :mod:`satorder.io`,
:mod:`satorder.model`, :mod:`satorder.errors`, :mod:`satorder.jit`.  Not
:mod:`satorder.generate` nor :mod:`satorder.render` (same layer, independent).
"""

from satorder.bench.backends import check_backend, execute, sat_solver_names
from satorder.bench.discover import EXPECTED_KEYS, PROBLEM_EXTENSIONS, Run, discover, plan
from satorder.bench.isolate import run_cluster, run_isolated, run_local, start_workers
from satorder.bench.report import cactus_series, find_problems, find_unverified, plot, summarize
from satorder.bench.rows import FAILED, SOLVED, UNSOLVED, RowWriter, read_rows

__all__ = ["EXPECTED_KEYS", "FAILED", "PROBLEM_EXTENSIONS", "SOLVED", "UNSOLVED", "RowWriter",
           "Run", "cactus_series", "check_backend", "discover", "execute", "find_problems",
           "find_unverified", "plan", "plot", "read_rows", "run_cluster", "run_isolated",
           "run_local", "sat_solver_names", "start_workers", "summarize"]

