"""Ctrl-C ends a command with status 130 and one line, even where a compiled module's
initialisation turns the KeyboardInterrupt into an ImportError (matplotlib's, while `plot`
imports it, reports 'initialization failed'), and while the antenna engine's forked worker runs
(which is ended with it); a bad LINECALC_ENGINE_PROCESSES, the worker's setting, is a usage error."""
from __future__ import annotations

import os
import signal
import subprocess
import sys
import time

import pytest

from linecalc import cli as cli_module

# A stand-in for matplotlib, found first on PYTHONPATH: Ctrl-C arrives while it initialises, and
# it turns the KeyboardInterrupt into the ImportError that a compiled module's init reports.
FAKE_MATPLOTLIB = """\
import os
import signal

try:
    os.kill(os.getpid(), signal.SIGINT)  # Ctrl-C, delivered to this very process
    for _ in range(1000):  # the handler runs between bytecodes, here at the latest
        pass
except KeyboardInterrupt:
    raise ImportError("initialization failed") from None
"""


def test_interrupt_turned_into_an_import_error_ends_as_interrupted(cli, monkeypatch):
    from linecalc import api

    def interrupted_import():
        try:
            signal.raise_signal(signal.SIGINT)
        except KeyboardInterrupt:
            raise ImportError("initialization failed") from None

    monkeypatch.setattr(api, "list_cables", interrupted_import)
    assert cli("cables") == (130, "", "linecalc: interrupted\n")
    assert signal.getsignal(signal.SIGINT) is signal.default_int_handler  # restored after


def test_an_import_error_without_an_interrupt_stays_an_internal_error(cli, monkeypatch):
    from linecalc import api

    def broken():
        raise ImportError("initialization failed")

    monkeypatch.setattr(api, "list_cables", broken)
    status, out, err = cli("cables")
    assert (status, out) == (1, "") and err == "linecalc: internal error: ImportError: initialization failed\n"


@pytest.mark.skipif(sys.platform == "win32", reason="POSIX signals")
def test_ctrl_c_while_plot_imports_matplotlib(tmp_path, data_path):
    fake = tmp_path / "fake" / "matplotlib"
    fake.mkdir(parents=True)
    (fake / "__init__.py").write_text(FAKE_MATPLOTLIB)
    environment = {**os.environ, "PYTHONPATH": str(tmp_path / "fake")}
    output = tmp_path / "swr.png"
    # subprocess.run waits for the process it started and, past the timeout, kills that process
    result = subprocess.run([sys.executable, "-m", "linecalc", "plot", str(data_path("hilltop-dipole.yaml")), "swr",
                             str(output)], capture_output=True, text=True, timeout=120, env=environment)
    assert (result.returncode, result.stdout, result.stderr) == (cli_module.EXIT_INTERRUPTED, "",
                                                                "linecalc: interrupted\n")
    assert not output.exists() and list(tmp_path.iterdir()) == [tmp_path / "fake"]


# A doublet over real ground on many bands: its engine runs are shared with a forked worker
# (linecalc.physics.wire_antenna). At 9 points a band (99 frequencies, about 4 s of engine work
# on 2 processors) the command is still running when the test, however late it is scheduled,
# sends Ctrl-C; it then ends after the engine card it is in (a fraction of a second).
WIRE_STATION = """\
name: Interrupted doublet
region: 1
radio: {power: 100 W}
bands: [160m, 80m, 60m, 40m, 30m, 20m, 17m, 15m, 12m, 10m, 6m]
antenna:
  wire: {shape: dipole, length: 2 x 20 m, height: 12 m, ground: average}
feed:
  - line: {label: ladder, cable: window-line-450, length: 20 m}
"""


def _children(pid):
    """The pids of the processes whose parent is ``pid`` (Linux /proc)."""
    found = []
    for entry in os.listdir("/proc"):
        if entry.isdigit():
            try:
                with open(f"/proc/{entry}/stat") as stat:
                    fields = stat.read().rsplit(")", 1)[1].split()
            except OSError:
                continue
            if int(fields[1]) == pid:
                found.append(int(entry))
    return found


@pytest.mark.skipif(not sys.platform.startswith("linux"), reason="the engine's worker is forked on Linux only")
def test_ctrl_c_while_the_engine_worker_runs_ends_both(tmp_path):
    pytest.importorskip("PyNEC")
    station = tmp_path / "doublet.yaml"
    station.write_text(WIRE_STATION)
    environment = {key: value for key, value in os.environ.items() if key != "LINECALC_ENGINE_PROCESSES"}
    # its own session, so that Ctrl-C goes to its process group as a terminal sends it
    process = subprocess.Popen([sys.executable, "-m", "linecalc", "budget", str(station), "--sweep", "9"],
                               stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True, env=environment,
                               start_new_session=True)
    try:
        deadline = time.monotonic() + 60
        workers = []
        while not workers and process.poll() is None and time.monotonic() < deadline:
            workers = _children(process.pid)
            time.sleep(0.005)
        assert workers, "no engine worker was started"
        os.killpg(process.pid, signal.SIGINT)
        out, err = process.communicate(timeout=60)
    finally:
        if process.poll() is None:
            process.kill()
            process.communicate()
    assert (process.returncode, out, err) == (cli_module.EXIT_INTERRUPTED, "", "linecalc: interrupted\n")
    assert not any(os.path.exists(f"/proc/{pid}") for pid in workers)  # killed and reaped by its parent


def test_a_bad_engine_process_count_is_a_usage_error(tmp_path, cli, monkeypatch):
    pytest.importorskip("PyNEC")
    from linecalc.physics import wire_antenna

    station = tmp_path / "doublet.yaml"
    station.write_text(WIRE_STATION)
    monkeypatch.setattr(wire_antenna, "_CACHE", {})  # nothing solved yet, so the engine must run
    monkeypatch.setenv("LINECALC_ENGINE_PROCESSES", "two")
    assert cli("budget", station) == (2, "", "linecalc budget: LINECALC_ENGINE_PROCESSES: a whole number of "
                                             "processes for the antenna engine, 1 or more (1: no worker processes), "
                                             "got 'two'\n")
