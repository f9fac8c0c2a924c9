"""The demo folder, and only here: every demo station runs through `linecalc budget`, the demo
sweep is what its script makes, and the README's *Python use* example runs as written and gives
the command's JSON document.

These are smoke tests of the demos themselves. Every other test reads its own copies under
tests/data/, so that editing a demo cannot break it.
"""
from __future__ import annotations

import importlib.util
import json
import os
import re
import subprocess
import sys
from pathlib import Path

import numpy as np
import pytest
import yaml

ROOT = Path(__file__).resolve().parent.parent.parent
DEMOS = ROOT / "stations"


def test_every_demo_station_runs_through_budget(linecalc_command):
    # the command takes a folder: one run, every *.yaml in it, exit status 2 if any of them fails;
    # with --explain, so that every demo's paragraphs are made too
    stations = sorted(DEMOS.glob("*.yaml"))
    assert stations
    result = linecalc_command("budget", DEMOS, "--explain")
    assert result.returncode == 0, result.stderr
    assert "Traceback" not in result.stderr and "internal error" not in result.stderr
    for station in stations:  # one result set each, headed by the station's name
        name = yaml.safe_load(station.read_text(encoding="utf-8"))["name"]
        assert f"{name}: " in result.stdout, station.name
    assert result.stdout.count("\nIn words:\n") == len(stations)


def test_demo_sweep_deembeds_to_the_model_of_its_script():
    # The demo sweep is made by stations/make_demo_sweep.py from a documented dipole model seen
    # through 25 m of the library's rg-213: removing that coax again gives back the model.
    from linecalc import elements
    from linecalc.io.cable_library import load_library
    from linecalc.io.touchstone import read_one_port
    from linecalc.physics import deembed

    spec = importlib.util.spec_from_file_location("make_demo_sweep", DEMOS / "make_demo_sweep.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    path = DEMOS / "demo-shack-sweep.s1p"
    assert "SYNTHESISED DEMO DATA" in path.read_text().splitlines()[0]
    frequency_hz, z_radio = read_one_port(path)
    coax = elements.Line(load_library()["rg-213"], module.COAX_LENGTH_M)
    z_antenna = deembed.deembed_impedance([coax.abcd(frequency_hz)], z_radio)
    # the file holds 17 significant digits, so the model comes back to rounding
    np.testing.assert_allclose(z_antenna, module.dipole_impedance_ohm(frequency_hz), rtol=1e-9)
    # the model resonates at 7.1 MHz with R = 68 ohm (the script's docstring)
    at = np.argmin(np.abs(frequency_hz - 7.1e6))
    assert z_antenna[at] == pytest.approx(68 + 0j, abs=1e-6)


def _python_use_example() -> str:
    readme = (ROOT / "README.md").read_text(encoding="utf-8")
    section = readme.split("## Python use", 1)[1].split("\n## ", 1)[0]
    return re.search(r"```python\n(.*?)```", section, re.S).group(1)


def test_the_python_use_example_runs_and_equals_the_json_of_the_command(monkeypatch):
    example = _python_use_example()
    assert len(example.strip().splitlines()) == 3  # the README promises a three-line example
    monkeypatch.chdir(ROOT)
    namespace = {}
    exec(compile(example, "README.md (Python use)", "exec"), namespace)
    command = subprocess.run([str(Path(sys.executable).parent / "linecalc"), "budget", "stations/hilltop-dipole.yaml",
                              "--format", "json"], cwd=ROOT, capture_output=True, text=True, check=True,
                             env={**os.environ, "PYTHONWARNINGS": "error"})
    assert namespace["document"] == json.loads(command.stdout)


def test_demo_line_sweeps_are_what_their_script_makes_and_fit_back_to_its_model(tmp_path, cli, capsys):
    # stations/make_demo_line_sweeps.py is seeded: run again into a folder of its own, it writes
    # the committed files byte for byte; the fit of the demo coax gives back the model it states
    spec = importlib.util.spec_from_file_location("make_demo_line_sweeps", DEMOS / "make_demo_line_sweeps.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    module.main(tmp_path)
    for name in ("demo-old-coax-open.s1p", "demo-old-coax-short.s1p", "demo-barn-dipole-sweep.s1p"):
        assert (tmp_path / name).read_bytes() == (DEMOS / name).read_bytes(), name
    capsys.readouterr()  # the script's own "wrote ..." lines
    code, out, err = cli("line", DEMOS / "barn-dipole-old-coax.yaml", "--format", "json")
    assert code == 0, err
    doc = json.loads(out)
    # the script's stated model: 52 ohm, VF 0.76 (its docstring); within 0.5 %
    assert doc["z0_nominal_ohm"] == pytest.approx(module.Z0_NOMINAL_OHM, rel=5e-3)
    assert doc["velocity_factor"] == pytest.approx(module.VELOCITY_FACTOR, rel=5e-3)
