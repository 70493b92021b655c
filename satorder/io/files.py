"""Writing output files so that a failure never leaves half a file and never loses what the
user had: write to a temporary file in the same folder, then rename over the target."""

from __future__ import annotations

import contextlib
import os
import tempfile

from satorder.errors import InputError


def atomic_write(path: str, text: str) -> None:
    """Write ``text`` to ``path`` through a temporary file in the same folder and a rename, so a
    failure never leaves half a file and an existing file is replaced only when complete."""
    with atomic_binary(path) as f:
        f.write(text.encode("utf-8"))


@contextlib.contextmanager
def atomic_binary(path: str):
    """A binary file to write ``path`` in pieces (streamed output) with the guarantees of
    :func:`atomic_write`: the target appears, complete, only when the block ends normally."""
    folder = os.path.dirname(os.path.abspath(path)) or "."
    if not os.path.isdir(folder):
        raise InputError(f"{path}: folder {folder} does not exist; create it or choose another")
    fd, tmp = tempfile.mkstemp(prefix=".satorder-", suffix=".tmp", dir=folder)
    try:
        with os.fdopen(fd, "wb") as f:
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
