"""The errors linecalc raises on purpose, under one base class.

`LinecalcError` is the base of them all. `InputError` is bad input or usage (exit status 2);
`StationError`, its main kind, names the file, line and key path at fault. Any other exception
out of linecalc is a bug (exit status 1).
"""
from __future__ import annotations

# A message shows the value at fault; one that aliases expand, or a long list of rows, is cut here.
MAX_MESSAGE_CHARS = 500


class LinecalcError(Exception):
    """Base class of every error linecalc raises on purpose."""


class InputError(LinecalcError, ValueError):
    """Bad input or usage: a station, a sweep, a cable or an option that cannot be used as given."""


class StationError(InputError):
    """Bad input, with where it is: rendered as ``FILE:LINE: what is wrong (at key.path)``.

    ``file``, ``line``, ``message`` and ``path`` (the key path) stay available as attributes.
    """

    def __init__(self, file, line, message, path=""):
        self.file, self.line, self.message, self.path = str(file), line, message, path
        where = f" (at {path})" if path else ""
        shown = message if len(message) <= MAX_MESSAGE_CHARS else (
            f"{message[:MAX_MESSAGE_CHARS]}... ({len(message) - MAX_MESSAGE_CHARS:,} more characters)")
        super().__init__(printable(f"{self.file}:{line}: {shown}{where}"))


def printable(text):
    """``text`` with each unprintable character (a line break in a key, say) escaped: one line, always."""
    return "".join(c if c.isprintable() else c.encode("unicode_escape").decode("ascii") for c in text)
