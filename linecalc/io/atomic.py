"""One writer for every output file: written whole or not at all, never over an input, over an
existing file only when asked.

The text goes to a temporary file in the output's folder, is flushed to disk, then renamed over
the output (``os.replace``, atomic on one file system): a reader never sees half a file. Without
``force`` the rename is a hard link, which fails if the output has appeared in the meantime.
"""
from __future__ import annotations

import os
import tempfile
from pathlib import Path

from linecalc.errors import InputError


class OutputExistsError(InputError, FileExistsError):
    """The output exists and ``force`` was not given."""


class OutputIsInputError(InputError):
    """The output is one of the run's inputs, which are never overwritten (``other`` names it)."""

    def __init__(self, path, other):
        self.other = other
        super().__init__(f"{path} is an input of this run ({other})")


def _current_umask():
    mask = os.umask(0)
    os.umask(mask)
    return mask


def _same_file(a: Path, b: Path) -> bool:
    try:
        return a.exists() and b.exists() and os.path.samefile(a, b)
    except OSError:
        return False


def check_output(path, *, force=False, protected=()) -> Path:
    """The output ``path``, checked before any work: not one of ``protected`` (by path or by
    file), not an existing file unless ``force``.

    Raises `OutputIsInputError` or `OutputExistsError`.
    """
    path = Path(path)
    for other in protected:
        other = Path(other)
        if _same_file(path, other) or path.resolve() == other.resolve():
            raise OutputIsInputError(path, other)
    if path.exists() and not force:
        raise OutputExistsError(path)
    return path


def write_atomically(path, write, *, binary=False, force=False, protected=()) -> Path:
    """Write a file whole or not at all.

    Parameters
    ----------
    path : str or Path
        The output file.
    write : callable
        Called with the open temporary file (text in ASCII with ``\\n`` line ends, or bytes if
        ``binary``); it writes the whole content.
    binary : bool
        Open the temporary file in binary mode.
    force : bool
        Replace an existing file; without it an existing output is refused, also one that
        appears while ``write`` runs.
    protected : iterable of str or Path
        Files that must never be replaced, even with ``force`` (the inputs of the run).

    Returns
    -------
    Path

    Raises
    ------
    OutputIsInputError, OutputExistsError
        As `check_output`.
    OSError
        The system refused (no such folder, no permission, disk full); no file is left behind.
    """
    path = check_output(path, force=force, protected=protected)
    folder = path.parent if str(path.parent) else Path(".")
    handle, temporary = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=folder)
    try:
        with (os.fdopen(handle, "wb") if binary else os.fdopen(handle, "w", encoding="ascii", newline="\n")) as out:
            write(out)
            out.flush()
            os.fsync(out.fileno())
        os.chmod(temporary, 0o666 & ~_current_umask())
        if force:
            os.replace(temporary, path)
        else:
            try:
                os.link(temporary, path)  # fails if the output appeared meanwhile
            except FileExistsError:
                raise OutputExistsError(path) from None
            except OSError:  # a file system without hard links: check, then rename
                if path.exists():
                    raise OutputExistsError(path) from None
                os.replace(temporary, path)
    finally:
        if os.path.exists(temporary):
            os.unlink(temporary)
    return path
