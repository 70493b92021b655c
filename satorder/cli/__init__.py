"""Command-line interface: a thin layer over the Python API, one module per command."""
