"""Seeded generators of problem families, suite recipes and large edge lists for benchmarks.

May import: :mod:`satorder.explanation`, :mod:`satorder.measure`, :mod:`satorder.pipeline`,
:mod:`satorder.sat`, :mod:`satorder.graph`, :mod:`satorder.certify`, :mod:`satorder.io`,
:mod:`satorder.model`, :mod:`satorder.errors`, :mod:`satorder.jit`.  (It uses only the last
few: generating needs no engine.)
"""

from satorder.generate.families import ABOUT, FAMILIES, generate
from satorder.generate.instance import Instance
from satorder.generate.large import write_dense_orders, write_random_bipartite
from satorder.generate.suites import RECIPES, instance_file_name, make_suite, suite_specs

__all__ = ["ABOUT", "FAMILIES", "RECIPES", "Instance", "generate", "instance_file_name",
           "make_suite", "suite_specs", "write_dense_orders", "write_random_bipartite"]
