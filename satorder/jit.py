"""Inner loops compiled with numba on first use: plumbing only, no algorithm lives here.

Engines (:mod:`satorder.graph.kernels`) and checkers (:mod:`satorder.certify`) each write their
own loops as plain Python functions over numpy arrays; :func:`run` compiles such a function the
first time it is called (or loads it from numba's on-disk cache), so importing satorder stays
quick.  Callers test :data:`HAVE_NUMBA` and keep a pure-Python path for machines without numba.

May import: nothing from satorder.
"""

from __future__ import annotations

import importlib.util
import sys

HAVE_NUMBA = importlib.util.find_spec("numba") is not None
_compiled: dict = {}


def import_njit():
    """``numba.njit``, imported on first use.  An import cut short (Ctrl-C during the first
    solve) would leave half of numba in ``sys.modules`` and break every later call, so a failed
    import removes what it loaded and lets the next call start afresh."""
    try:
        from numba import njit
    except BaseException:
        for key in [k for k in sys.modules if k == "numba" or k.startswith("numba.")]:
            del sys.modules[key]
        raise
    return njit


def compiled(fn):
    """The numba-compiled version of the plain function ``fn`` (compiled once per process)."""
    got = _compiled.get(fn)
    if got is None:
        got = _compiled[fn] = import_njit()(cache=True)(fn)
    return got


def run(fn, *args):
    """Run the compiled ``fn`` on ``args``.  A Ctrl-C that lands while compiled code runs comes
    back from numba as a ``SystemError`` caused by the ``KeyboardInterrupt``; it is raised as
    the interrupt."""
    try:
        return compiled(fn)(*args)
    except SystemError as exc:
        if isinstance(exc.__cause__ or exc.__context__, KeyboardInterrupt):
            raise KeyboardInterrupt from None
        raise
