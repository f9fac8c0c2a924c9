"""Ctrl-C ends a command with status 130 and one line, even where a compiled module's
initialisation turns the KeyboardInterrupt into an ImportError (matplotlib's, while `plot`
imports it, reports 'initialization failed')."""
from __future__ import annotations

import os
import signal
import subprocess
import sys

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
