"""The one family of errors satorder raises on purpose.

Everything derives from :class:`SatorderError`, so a caller can catch the package's errors and
nothing else:

* :class:`InputError` — bad input: a malformed file, an unknown key, item or option.  Its message
  is one line naming the file, line or entry at fault and what to do; the command line turns it
  into exit status 2 without a traceback.  (Contradicting requirements are *not* bad input: they
  make a problem infeasible, and a core explains them.)
* :class:`CertificateError` — an engine produced an answer that failed its independent check: a
  bug, never the user's fault, never silently ignored (exit status 1).  It is deliberately not an
  ``AssertionError``, so that a test catching assertion failures cannot swallow it, nor it them.
* :class:`TimeLimitReached` — work stopped at its time limit before it had anything to show.
  Most engines return status ``unknown`` (or a partial result marked so) instead of raising it.

May import: nothing from satorder.
"""


class SatorderError(Exception):
    """Base of every error satorder raises on purpose."""


class InputError(SatorderError, ValueError):
    """Bad input: malformed file, unknown key, item or option (exit status 2)."""


class CertificateError(SatorderError):
    """An answer or certificate failed its independent check (a bug; exit status 1)."""


class TimeLimitReached(SatorderError):
    """The time limit passed before there was anything to show (exit status 3)."""
