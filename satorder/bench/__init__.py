"""Benchmarking instance suites: discovery, back ends, isolated runs, rows on disk, reports.

May import: :mod:`satorder.pipeline`, :mod:`satorder.io`, engines, :mod:`satorder.certify`.
"""
