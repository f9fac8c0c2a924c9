"""One writer for every output file: written whole or not at all, never over an input, over an
existing file only when asked.

The text goes to a temporary file in the output's folder, is flushed to disk, then renamed over
the output (``os.replace``, atomic on one file system): a reader never sees half a file. Without
``force`` the rename is a hard link, which fails if the output has appeared in the meantime.
``force`` replaces only a regular file or a symlink to one, never a device, a FIFO, a socket or a
folder. The temporary name is short (``.lc`` and 8 characters), so an output name up to the
file system's limit works, and the temporary file is removed however the write ends (the command
turns SIGTERM and SIGHUP into an exception, so this holds for them too).
"""
from __future__ import annotations

import os
import stat
import tempfile
from pathlib import Path

from linecalc.errors import InputError
from linecalc.io.input_file import file_kind


class OutputExistsError(InputError, FileExistsError):
    """The output exists and ``force`` was not given."""


class OutputNotFileError(InputError):
    """The output exists and is not a regular file (a device, a FIFO, a folder): never replaced."""

    def __init__(self, path, what):
        self.what = what
        super().__init__(f"{path} is {what}, not a regular file; it is never replaced")


class OutputWriteError(InputError):
    """The system refused to write the output (no such folder, no permission, name too long, disk full)."""

    def __init__(self, path, reason):
        self.reason = reason
        super().__init__(f"{path}: cannot be written: {reason}")


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
    if not str(path) or path.name in ("", ".", ".."):
        raise OutputWriteError(path, "an output needs a file name")
    for other in protected:
        other = Path(other)
        if _same_file(path, other) or path.resolve() == other.resolve():
            raise OutputIsInputError(path, other)
    if os.path.lexists(path):
        if not force:
            raise OutputExistsError(path)
        try:
            mode = os.stat(path).st_mode
        except OSError:  # a symlink that leads nowhere: replacing it destroys nothing
            mode = stat.S_IFREG
        if not stat.S_ISREG(mode):
            raise OutputNotFileError(path, file_kind(mode))
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
    OutputIsInputError, OutputExistsError, OutputNotFileError
        As `check_output`.
    OutputWriteError
        The system refused (no such folder, no permission, a name too long, disk full); no file
        is left behind.
    """
    path = check_output(path, force=force, protected=protected)
    folder = path.parent if str(path.parent) else Path(".")
    try:
        _write(path, folder, write, binary, force)
    except OSError as exc:
        if isinstance(exc, InputError):
            raise
        raise OutputWriteError(path, exc.strerror or str(exc)) from None
    return path


def _write(path, folder, write, binary, force):
    handle, temporary = tempfile.mkstemp(prefix=".lc", suffix=".tmp", dir=folder)
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
        if os.path.lexists(temporary):
            os.unlink(temporary)
