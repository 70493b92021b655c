"""Writing output files so that a failure never leaves half a file and never loses what the
user had: write to a temporary file in the same folder, then rename over the target."""

from __future__ import annotations

import os
import tempfile
from contextlib import contextmanager

from satorder.errors import InputError


def atomic_write(path: str, text: str) -> None:
    """Write ``text`` to ``path`` through a temporary file in the same folder and a rename, so a
    failure never leaves half a file and an existing file is replaced only when complete."""
    with atomic_file(path) as f:
        f.write(text)


@contextmanager
def atomic_file(path: str, binary: bool = False):
    """A text file (or with ``binary``, a binary one) to write ``path`` piece by piece
    (``satorder orders --out``, the streamed JSON of ``solve --out``): it is a temporary file in
    the same folder, renamed over ``path`` when the block ends normally and deleted when it
    raises."""
    folder = os.path.dirname(os.path.abspath(path)) or "."
    if not os.path.isdir(folder):
        raise InputError(f"{path}: folder {folder} does not exist; create it or choose another")
    fd, tmp = tempfile.mkstemp(prefix=".satorder-", suffix=".tmp", dir=folder)
    try:
        with (os.fdopen(fd, "wb") if binary else os.fdopen(fd, "w", encoding="utf-8")) as f:
            yield f
        try:  # keep the mode of the file replaced, else the usual umask-based mode
            mode = os.stat(path).st_mode & 0o7777
        except FileNotFoundError:
            umask = os.umask(0)
            os.umask(umask)
            mode = 0o666 & ~umask
        os.chmod(tmp, mode)
        os.replace(tmp, path)
    except BaseException:
        try:
            os.unlink(tmp)
        except OSError:
            pass
        raise


def atomic_binary(path: str):
    """:func:`atomic_file` opened for bytes."""
    return atomic_file(path, binary=True)
