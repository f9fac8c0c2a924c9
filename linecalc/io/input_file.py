"""Reading an input file that may be hostile: a regular file of bounded size, or nothing.

A station file, a file of a folder batch or a Touchstone sweep may be shared by another operator,
so its name may lead to a FIFO (a read would wait for ever), a device (``/dev/zero`` never ends)
or a file far larger than any station. The file is examined before it is opened and again once
open (the name may change in between), opened without blocking, and read only up to its limit.
"""
from __future__ import annotations

import os
import stat
from pathlib import Path

# Limits, far beyond any real file (documented in the README, section Errors and exit status):
# a station file is a few kilobytes; a sweep of 100,000 points is about 5 MB of text.
MAX_STATION_BYTES = 1_000_000
MAX_TOUCHSTONE_BYTES = 10_000_000


class InputFileError(OSError):
    """An input that is not a regular file of bounded size; ``reason`` says what it is."""

    def __init__(self, path, reason):
        self.path, self.reason = Path(path), reason
        super().__init__(reason)
        self.strerror = reason


def file_kind(mode) -> str:
    """What a non-regular file is, in words."""
    for test, name in ((stat.S_ISDIR, "a folder"), (stat.S_ISFIFO, "a FIFO (named pipe)"),
                       (stat.S_ISCHR, "a character device"), (stat.S_ISBLK, "a block device"),
                       (stat.S_ISSOCK, "a socket")):
        if test(mode):
            return name
    return "not a regular file"


def _check(path, info, max_bytes):
    if not stat.S_ISREG(info.st_mode):
        raise InputFileError(path, f"is {file_kind(info.st_mode)}, not a regular file")
    if info.st_size > max_bytes:
        raise InputFileError(path, f"is {info.st_size:,} bytes, over the limit of {max_bytes:,} bytes")


def read_bytes(path, max_bytes) -> bytes:
    """The content of ``path``, a regular file of at most ``max_bytes`` bytes.

    Raises
    ------
    InputFileError
        Not a regular file (a folder, a FIFO, a device, a socket) or larger than ``max_bytes``.
    OSError
        The system refused (no such file, no permission).
    """
    path = Path(path)
    _check(path, os.stat(path), max_bytes)  # before opening: opening a device may itself act
    descriptor = os.open(path, os.O_RDONLY | os.O_NONBLOCK | getattr(os, "O_NOCTTY", 0))
    try:
        _check(path, os.fstat(descriptor), max_bytes)  # the file opened, whatever the name leads to now
        chunks, size = [], 0
        while size <= max_bytes:
            chunk = os.read(descriptor, max_bytes + 1 - size)
            if not chunk:
                break
            chunks.append(chunk)
            size += len(chunk)
    finally:
        os.close(descriptor)
    if size > max_bytes:  # grew while read
        raise InputFileError(path, f"is over the limit of {max_bytes:,} bytes")
    return b"".join(chunks)


def is_regular_file(path) -> bool:
    """True for a regular file (following symlinks), False for anything else or nothing."""
    try:
        return stat.S_ISREG(os.stat(path).st_mode)
    except OSError:
        return False
