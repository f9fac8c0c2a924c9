"""Fixtures shared by the whole suite.

The tests mirror the package: ``tests/physics/``, ``tests/elements/``, ``tests/studies/``,
``tests/io/``, ``tests/render/`` and ``tests/cli/`` hold the tests of the layer of the same name,
and ``tests/data/`` the test stations (copies of the demos, so that editing a demo cannot break a
test; only ``tests/cli/test_demo_stations.py`` reads ``stations/``). Test module names are unique
across the folders (the folders are not packages).

Fixtures:

- ``data_path(name)``: a file under ``tests/data/``.
- ``data_station``: a test parametrized with it runs once for every ``tests/data/*.yaml``.
- ``cli(*args)``: ``linecalc`` in-process (``linecalc.cli.main``): (exit status, stdout, stderr).
- ``linecalc_command(*args, timeout=120, cwd=None)``: the installed ``linecalc`` entry point in a
  subprocess, a ``subprocess.CompletedProcess`` with text output.
- ``write_file(name, text)``: a file written into the test's ``tmp_path``; returns its path.
- ``one_error_line(err, file)``: the (line, message) of the one stderr line ``FILE:LINE: message``
  that bad input gives, after checking that it is one line with no traceback.
- ``line_of(text, fragment)``: the 1-based line of ``text`` that holds ``fragment`` (on exactly one
  line): where a test expects an error, found in its own text rather than taken from linecalc.
- ``make_station(feed, frequency_hz, antenna, ...)``: a `Station` built in code.
- ``library``: the cable library (id -> Cable), loaded once; do not change it.
"""
from __future__ import annotations

import re
import subprocess
import sys
from pathlib import Path

import numpy as np
import pytest

DATA = Path(__file__).resolve().parent / "data"
LINECALC = Path(sys.executable).parent / "linecalc"


def pytest_generate_tests(metafunc):
    if "data_station" in metafunc.fixturenames:
        paths = sorted(DATA.glob("*.yaml"))
        metafunc.parametrize("data_station", paths, ids=[p.name for p in paths])


@pytest.fixture(scope="session")
def data_path():
    def path(name):
        found = DATA / name
        assert found.is_file(), f"no test data file {found}"
        return found

    return path


@pytest.fixture
def cli(capsys):
    from linecalc.cli import main

    def run(*args):
        code = main([str(a) for a in args])
        out, err = capsys.readouterr()
        return code, out, err

    return run


@pytest.fixture(scope="session")
def linecalc_command():
    def run(*args, timeout=120, cwd=None):
        return subprocess.run([str(LINECALC), *map(str, args)], capture_output=True, text=True, timeout=timeout,
                              cwd=cwd)

    return run


@pytest.fixture
def write_file(tmp_path):
    def write(name, text):
        path = tmp_path / name
        path.write_text(text)
        return path

    return write


@pytest.fixture(scope="session")
def one_error_line():
    def check(err, file):
        message = err.strip()
        assert "\n" not in message and "Traceback" not in message, err
        match = re.match(rf"^{re.escape(str(file))}:(\d+): (.*)$", message)
        assert match, message
        return int(match.group(1)), match.group(2)

    return check


@pytest.fixture(scope="session")
def line_of():
    def find(text, fragment):
        lines = [n for n, line in enumerate(text.splitlines(), start=1) if fragment in line]
        assert len(lines) == 1, (fragment, lines)
        return lines[0]

    return find


@pytest.fixture(scope="session")
def make_station():
    """``make_station(feed, frequency_hz, antenna, *, power_w=100, z_ref_ohm=50, labels=None,
    name="test station", holds="net", foldback_swr=None, max_power_w=None)``: ``antenna`` is an
    impedance [ohm] (a scalar or one per frequency, made into an impedance table at the rows) or
    a load object (`ImpedanceTable`, `SwrTable`); the labels default to the frequencies in MHz.
    The radio holds its net power by default here (unlike a station file, whose radio holds its
    forward power): most tests check the path for a known net power into it."""
    from linecalc.physics.loads import ImpedanceTable, MeasuredAntenna, SwrTable
    from linecalc.studies.station import Station

    def make(feed, frequency_hz, antenna, *, power_w=100.0, z_ref_ohm=50.0, labels=None, name="test station",
             holds="net", foldback_swr=None, max_power_w=None):
        f = np.atleast_1d(np.asarray(frequency_hz, dtype=float))
        if not isinstance(antenna, (ImpedanceTable, SwrTable, MeasuredAntenna)):
            antenna = ImpedanceTable(f, np.array(np.broadcast_to(np.asarray(antenna, dtype=complex), f.shape)))
        return Station(name=name, radio_power_w=power_w, reference_impedance_ohm=z_ref_ohm,
                       labels=tuple(labels) if labels is not None else tuple(f"{x / 1e6:g} MHz" for x in f),
                       frequency_hz=f, antenna=antenna, feed=tuple(feed), radio_holds=holds,
                       radio_foldback_swr=foldback_swr, radio_max_power_w=max_power_w)

    return make


@pytest.fixture(scope="session")
def library():
    from linecalc.io.cable_library import load_library

    return load_library()


@pytest.fixture(scope="session")
def with_peak_memory():
    """``with_peak_memory(function, *args)`` -> (its result, the peak of the memory it allocated
    [bytes], numpy's arrays included, measured with tracemalloc)."""
    import tracemalloc

    def measure(function, *args):
        tracemalloc.start()
        try:
            result = function(*args)
            _, peak = tracemalloc.get_traced_memory()
        finally:
            tracemalloc.stop()
        return result, peak

    return measure
