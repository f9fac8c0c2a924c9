"""Work shared with forked children (linecalc.physics.process_split): results in order, a
child's exception raised in the parent, and no child left behind, whatever ends the parent's
own part. Each test forks one or two children (a few milliseconds each); the one that waits for
a child is bounded by the child's own sleep."""
from __future__ import annotations

import os
import threading
import time

import pytest

from linecalc.physics import process_split

pytestmark = pytest.mark.skipif(not process_split.fork_available(), reason="work is forked on Linux only")

# The longest a test waits for a child to show itself; a child that sleeps sleeps this long at
# most, so that no test can hang past it.
WAIT_S = 30.0


def _gone(pid):
    """Whether no process has this pid any more (ended and reaped)."""
    try:
        os.kill(pid, 0)
    except ProcessLookupError:
        return True
    return False


def test_results_come_back_in_order_from_other_processes():
    results = process_split.run_split([os.getpid, os.getpid, lambda: [1.5, "x"]])
    assert results[0] == os.getpid() and results[1] != os.getpid() and results[2] == [1.5, "x"]
    assert _gone(results[1])


def test_a_childs_exception_is_raised_here_and_the_child_is_reaped(tmp_path):
    pid_file = tmp_path / "pid"

    def failing():
        pid_file.write_text(str(os.getpid()))
        raise ValueError("no such frequency")

    with pytest.raises(ValueError, match="no such frequency"):
        process_split.run_split([lambda: None, failing])
    assert _gone(int(pid_file.read_text()))


def test_a_child_that_ends_without_its_result_is_reported():
    with pytest.raises(process_split.WorkerLost, match="without its result"):
        process_split.run_split([lambda: None, lambda: os._exit(3)])


def test_an_interrupt_here_kills_the_child_that_still_runs(tmp_path):
    pid_file = tmp_path / "pid"

    def slow():
        pid_file.write_text(str(os.getpid()))
        time.sleep(WAIT_S)

    def interrupted():
        deadline = time.monotonic() + WAIT_S
        while not pid_file.exists() and time.monotonic() < deadline:
            time.sleep(0.005)
        raise KeyboardInterrupt

    with pytest.raises(KeyboardInterrupt):
        process_split.run_split([interrupted, slow])
    assert _gone(int(pid_file.read_text()))  # killed by its pid and reaped, not left to sleep


def test_no_fork_while_another_python_thread_runs():
    release = threading.Event()
    thread = threading.Thread(target=release.wait, args=(WAIT_S,))
    thread.start()
    try:
        assert not process_split.fork_available()
    finally:
        release.set()
        thread.join()
    assert process_split.fork_available()
