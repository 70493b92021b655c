"""Command-line interface: a thin layer over the Python API, one module per command.

Each command module has ``add_parser(sub)`` and ``run(args) -> int``; :mod:`satorder.cli.main`
lists them and imports a command's module only when that command runs.  The options shared by
several commands (``--json``, ``--out``, ``--time-limit``, ``--solver``, ``--seed``,
``--report``) are defined once, in :mod:`satorder.cli.options`.

May import: every other part of the package — :mod:`satorder.bench`, :mod:`satorder.generate`,
:mod:`satorder.render`, :mod:`satorder.explanation`, :mod:`satorder.measure`,
:mod:`satorder.pipeline`, :mod:`satorder.sat`, :mod:`satorder.graph`, :mod:`satorder.certify`,
:mod:`satorder.io`, :mod:`satorder.model`, :mod:`satorder.errors`, :mod:`satorder.jit`.
Nothing in the library imports it.
"""
