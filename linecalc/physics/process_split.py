"""Independent pieces of work shared between this process and forked worker processes.

The method-of-moments engine solves each frequency on its own and deterministically, so a run
over many frequencies can be cut into parts, one per process, and the parts' results put back
together are those of one run. A forked child inherits the imported engine and starts in a few
milliseconds (a fresh interpreter would re-import numpy and the engine: over 100 ms here).

How the fork is kept safe, and why no warning is silenced beyond the fork call itself:

- A fork is made only on Linux (`FORK_PLATFORMS`; on macOS the system libraries are not
  fork-safe, which is why Python starts its workers there with 'spawn') and only while this
  process runs no Python thread but the calling one (`threading.active_count() == 1`). A thread
  of Python's, a caller's thread pool or a process pool's manager, could hold a lock the child
  would then wait for for ever: with one, the work runs here, serially.
- The native threads that remain are those of libraries such as numpy's BLAS, which stops its
  thread pool around a fork (its ``pthread_atfork`` handler) and which the child never calls.
  Python 3.12 and later count those threads too and warn ('use of fork() may lead to
  deadlocks'): that one DeprecationWarning is ignored around the ``os.fork`` call alone, which is
  safe to do because no other Python thread can see the filter change meanwhile.
- A child ignores Ctrl-C (its parent answers it: the command ends with its one line and status
  130), takes the default action on SIGTERM and SIGHUP, sends its result or its exception back
  pickled over a pipe of its own (data it made itself, never read from outside), and ends with
  ``os._exit``: no exit handlers, no flushing of buffers it shares with its parent.
- The parent kills every child still running by its pid (SIGKILL) and reaps it when it leaves
  for any reason (an exception, KeyboardInterrupt): no child outlives a parent that returns or
  raises. A parent killed outright leaves its children to finish their part (a fraction of the
  run) and end on the closed pipe.
"""
from __future__ import annotations

import os
import pickle
import signal
import sys
import threading
import warnings

# Where a fork is made: Linux, where 'fork' is Python's long-standing start method.
FORK_PLATFORMS = ("linux",)

# The warning of Python 3.12 and later on a fork in a process with threads (native ones
# included), the one warning ignored around the fork call (see the module docstring).
_FORK_WARNING = r"This process \(pid=\d+\) is multi-threaded, use of fork\(\) may lead to deadlocks in the child\."


class WorkerLost(RuntimeError):
    """A worker process ended without sending its result back (killed from outside, or crashed)."""


def fork_available() -> bool:
    """Whether work can go to forked children now: a fork platform, and no Python thread running
    but the calling one."""
    return sys.platform.startswith(FORK_PLATFORMS) and hasattr(os, "fork") and threading.active_count() == 1


def _fork():
    with warnings.catch_warnings():
        warnings.filterwarnings("ignore", message=_FORK_WARNING, category=DeprecationWarning)
        return os.fork()


def _child(work, write_fd):
    """In the child: do ``work`` and send ("result", value) or ("error", exception) back; never return."""
    status = 1
    try:
        signal.signal(signal.SIGINT, signal.SIG_IGN)
        for name in ("SIGTERM", "SIGHUP"):
            signal.signal(getattr(signal, name), signal.SIG_DFL)
        try:
            payload = pickle.dumps(("result", work()))
        except BaseException as exc:  # sent to the parent, which raises it as the serial run would
            try:
                payload = pickle.dumps(("error", exc))
            except Exception:  # an exception that cannot be pickled: its text
                payload = pickle.dumps(("error", RuntimeError(f"{type(exc).__name__}: {exc}")))
        with os.fdopen(write_fd, "wb") as pipe:
            pipe.write(payload)
        status = 0
    finally:
        os._exit(status)


def run_split(works):
    """The results of ``works`` (callables without arguments), in order: the first done in this
    process, each other one in a forked child at the same time.

    Call it only where `fork_available` is true. An exception raised by a work is raised here
    (the first in order); a child that ends without its result raises `WorkerLost`. Every child
    has ended when this returns or raises.
    """
    children = []  # (pid, read end of its pipe)
    try:
        for work in works[1:]:
            read_fd, write_fd = os.pipe()
            try:
                pid = _fork()
            except BaseException:
                os.close(read_fd)
                os.close(write_fd)
                raise
            if pid == 0:
                os.close(read_fd)
                for _, other in children:
                    os.close(other)
                _child(work, write_fd)
            os.close(write_fd)
            children.append((pid, read_fd))
        outcomes = [("result", works[0]())]
        while children:
            pid, read_fd = children[0]
            with os.fdopen(read_fd, "rb") as pipe:
                children[0] = (pid, None)
                data = pipe.read()
            _, status = os.waitpid(pid, 0)
            children.pop(0)
            if not data:
                raise WorkerLost(f"a worker process ended without its result (wait status {status})")
            outcomes.append(pickle.loads(data))  # noqa: S301 (written by our own child, above)
    finally:
        for pid, read_fd in children:
            if read_fd is not None:
                os.close(read_fd)
            try:
                os.kill(pid, signal.SIGKILL)
            except ProcessLookupError:
                pass
            os.waitpid(pid, 0)
    for kind, value in outcomes:
        if kind == "error":
            raise value
    return [value for _, value in outcomes]
