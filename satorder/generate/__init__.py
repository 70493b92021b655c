"""Seeded generators of problem families, suite recipes and large edge lists for benchmarks.

May import: :mod:`satorder.io`, :mod:`satorder.model`, :mod:`satorder.errors`.
"""
