"""`linecalc line`: a line characterised from open and short sweeps, through the command.

The sweeps are made with scikit-rf's own media and line functions (DefinedGammaZ0, delay_open,
delay_short) from per-metre constants written out here (Pozar, Microwave Engineering, 4th ed.,
section 2.1), and written with scikit-rf's own Touchstone writer.
"""
from __future__ import annotations

import json

import numpy as np
import pytest

skrf = pytest.importorskip("skrf")
SPEED_OF_LIGHT = 299_792_458.0  # m/s, exact (SI)
LENGTH_M, VF, Z0N = 30.0, 0.66, 50.0


def textbook_line(f, z0n=Z0N, vf=VF, r1=2.0e-5, g1=4e-14):
    """Z0 [ohm], gamma [1/m] of a skin-effect coax (Pozar, 4th ed., section 2.1; invented constants)."""
    omega, v, r = 2 * np.pi * f, vf * SPEED_OF_LIGHT, r1 * np.sqrt(f)
    z = r + 1j * omega * (z0n / v + r / omega)
    y = g1 * f + 1j * omega / (z0n * v)
    return np.sqrt(z / y), np.sqrt(z * y)


def write_sweeps(folder, f, length_m=LENGTH_M, open_name="open", short_name="short", f_short=None):
    """Write scikit-rf's open and short sweeps of the test line as FOLDER/NAME.s1p."""
    for name, grid, end in ((open_name, f, "delay_open"), (short_name, f if f_short is None else f_short,
                                                           "delay_short")):
        z0, gamma = textbook_line(grid)
        media = skrf.media.DefinedGammaZ0(skrf.Frequency.from_f(grid, unit="hz"), z0_port=50, z0=z0, gamma=gamma)
        network = getattr(media, end)(length_m, "m")
        network.name = name
        network.write_touchstone(name, dir=str(folder))


STATION = """\
name: Test shack, coax swept open and shorted
radio: {power: 100 W}
frequencies: [7.1 MHz]
antenna: {impedance: {7.1 MHz: 50}}
feed:
  - line:
      label: main coax
      cable: rg-213
      length: 30 m
      sweeps: {open: open.s1p, short: short.s1p}
"""


@pytest.fixture
def swept(tmp_path, write_file):
    write_sweeps(tmp_path, np.linspace(1e6, 30e6, 101))
    return write_file("station.yaml", STATION)


def test_json_has_the_promised_figures_and_matches_the_line(swept, cli):
    code, out, err = cli("line", swept, "--format", "json")
    assert code == 0, err
    doc = json.loads(out)
    z0, _ = textbook_line(np.array([doc["centre_frequency_hz"]]))
    # the generating line (Pozar, section 2.1), within 0.5 %
    assert complex(*doc["z0_ohm"]) == pytest.approx(z0[0], rel=5e-3)
    assert doc["velocity_factor"] == pytest.approx(VF, rel=5e-3)
    assert doc["length_m"] == LENGTH_M and doc["given"] == "length" and doc["length_m_interval"] is None
    f = np.array([p[0] for p in doc["loss_db_per_100m"]])
    loss_true = 20 * np.log10(np.e) * textbook_line(f)[1].real * 100
    np.testing.assert_allclose([p[1] for p in doc["loss_db_per_100m"]], loss_true, rtol=5e-3)
    for key in ("z0_nominal_ohm", "velocity_factor", "electrical_length_s", "loss_k1_db_per_100m",
                "loss_k2_db_per_100m"):
        low, high = doc[f"{key}_interval"]
        assert low <= doc[key] <= high
    assert len(doc["loss_db_per_100m_interval"]) == len(doc["loss_db_per_100m"])
    assert any("disconnected" in c for c in doc["cautions"])


def test_to_dict_equals_the_json_document(swept, cli):
    import linecalc

    _, out, _ = cli("line", swept, "--format", "json")
    assert json.loads(out) == json.loads(json.dumps(linecalc.solve_line(linecalc.load_station(swept)).to_dict()))


def test_velocity_factor_given_gives_the_length(tmp_path, cli, write_file):
    write_sweeps(tmp_path, np.linspace(1e6, 30e6, 101))
    station = write_file("station.yaml", STATION.replace("short: short.s1p}",
                                                         "short: short.s1p, velocity_factor: 0.66}"))
    code, out, err = cli("line", station, "--format", "json")
    assert code == 0, err
    doc = json.loads(out)
    assert doc["given"] == "velocity_factor" and doc["velocity_factor_interval"] is None
    assert doc["length_m"] == pytest.approx(LENGTH_M, rel=5e-3)


def test_written_cable_reproduces_the_fitted_line_in_a_budget(swept, tmp_path, cli):
    import linecalc

    out_file = tmp_path / "fitted.yaml"
    code, out, err = cli("line", swept, "--write-cable", out_file)
    assert code == 0, err
    assert "main coax" in out and f"wrote {out_file}" in err
    snippet = out_file.read_text()
    station = linecalc.load_station(STATION.split("feed:")[0] + "feed:\n" + "".join(
        "  " + line + "\n" for line in snippet.splitlines()))
    line = station.feed[0]
    f = np.linspace(1e6, 30e6, 7)
    z0, gamma = line.cable.constants(f)
    z0_true, gamma_true = textbook_line(f)
    # round trip: the written cable is the fitted model, which meets the generating line within 0.5 %
    np.testing.assert_allclose(z0, z0_true, rtol=5e-3)
    np.testing.assert_allclose(gamma.imag * line.length_m, gamma_true.imag * LENGTH_M, rtol=5e-3)
    np.testing.assert_allclose(gamma.real, gamma_true.real, rtol=5e-3)
    # and it is never written over an input, nor over an output without --force
    code, out, err = cli("line", swept, "--write-cable", out_file)
    assert code == 2 and out == "" and "exists" in err
    code, out, err = cli("line", swept, "--write-cable", tmp_path / "open.s1p", "--force")
    assert code == 2 and out == "" and "input" in err


def test_sweeps_on_different_grids_exit_2_at_the_short_key(tmp_path, cli, write_file, one_error_line, line_of):
    write_sweeps(tmp_path, np.linspace(1e6, 30e6, 101), f_short=np.linspace(1e6, 30e6, 91))
    station = write_file("station.yaml", STATION)
    code, out, err = cli("line", station)
    assert code == 2 and out == ""
    line, message = one_error_line(err, station)
    assert line == line_of(STATION, "sweeps:") and "different frequencies" in message


def test_an_open_that_reads_like_a_short_exits_2_at_the_sweeps_key(tmp_path, cli, write_file, one_error_line,
                                                                  line_of):
    write_sweeps(tmp_path, np.linspace(1e6, 30e6, 101), open_name="short", short_name="open")  # swapped
    station = write_file("station.yaml", STATION)
    code, out, err = cli("line", station)
    assert code == 2 and out == ""
    line, message = one_error_line(err, station)
    assert line == line_of(STATION, "sweeps:") and "swapped" in message and "(at feed[0].line.sweeps)" in message


def test_a_two_port_file_exits_2_at_its_own_line(tmp_path, cli, write_file, one_error_line):
    write_sweeps(tmp_path, np.linspace(1e6, 30e6, 101))
    two_port = tmp_path / "short.s1p"
    two_port.write_text("# Hz S RI R 50\n1000000 0.1 0 0.9 0 0.9 0 0.1 0\n2000000 0.1 0 0.9 0 0.9 0 0.1 0\n")
    station = write_file("station.yaml", STATION)
    code, out, err = cli("line", station)
    assert code == 2 and out == ""
    line, message = one_error_line(err, two_port)
    assert line == 2 and "more than one port" in message


def test_unknown_line_and_a_line_without_sweeps_exit_2(swept, tmp_path, cli, write_file, one_error_line):
    code, out, err = cli("line", swept, "--line", "wall coax")
    assert code == 2 and out == "" and "no line labelled 'wall coax'" in one_error_line(err, swept)[1]
    plain = write_file("plain.yaml", STATION.replace("      sweeps: {open: open.s1p, short: short.s1p}\n", ""))
    code, out, err = cli("line", plain, "--line", "main coax")
    assert code == 2 and out == "" and "has no sweeps" in one_error_line(err, plain)[1]
    code, out, err = cli("line", plain)
    assert code == 2 and out == "" and "no line has sweeps" in one_error_line(err, plain)[1]
