"""Showing results to people: rich text tables and SVG pictures.

May import: everything below the command line; nothing imports it but :mod:`satorder.cli`,
:mod:`satorder.bench` reports and the demo.
"""
