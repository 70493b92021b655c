"""Error types shared by every stage.

`InputError` is the only error a user should ever see: its message is one line naming the file,
line or entry at fault and what to do. The CLI turns it into exit status 2 without a traceback.
`CertificateError` means an engine produced an answer that failed its independent check: a bug,
never the user's fault, and never silently ignored.
"""


class InputError(ValueError):
    """Bad input: malformed file, unknown key or item, contradictory entries."""


class CertificateError(AssertionError):
    """An answer or certificate failed its independent check."""
