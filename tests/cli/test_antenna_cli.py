"""Wire antennas through the command and the API: the antenna command, the budget with a wire
antenna, and bad geometry (exit status 2, one line FILE:LINE). Perfect ground keeps the engine
runs to milliseconds."""
from __future__ import annotations

import json

import pytest

pytest.importorskip("PyNEC")

import linecalc  # noqa: E402
from linecalc.physics import wire_antenna  # noqa: E402

DOUBLET = """\
name: Test doublet
region: 1
radio: {power: 100 W}
bands: [40m, 20m]
antenna:
  wire:
    shape: dipole
    length: 2 x 10.5 m
    height: 10 m
    ground: perfect
feed:
  - tuner: {label: shack tuner, output: balanced}
  - line: {label: ladder, cable: window-line-450, length: 15 m}
"""


@pytest.fixture
def doublet(write_file):
    return write_file("doublet.yaml", DOUBLET)


def test_antenna_json_equals_the_api_result(cli, doublet):
    code, out, err = cli("antenna", doublet, "--format", "json", "--cut-for", "14.1 MHz")
    assert code == 0, err
    document = json.loads(out)
    result = linecalc.solve_antenna(linecalc.load_station(doublet), cut_for_hz=14.1e6)
    assert document == json.loads(json.dumps(result.to_dict()))
    assert [row["label"] for row in document["rows"]] == ["40m", "20m"]
    assert document["line"] == "ladder"
    # a 21 m doublet is a half wave near 7 MHz: its nearest resonance lies within 10 % of 7.1 MHz
    assert document["rows"][0]["resonance_hz"] == pytest.approx(7.1e6, rel=0.1)
    cut = document["cut"]
    assert cut["converged"] and cut["rule_of_thumb_ft"] == pytest.approx(468 / 14.1)  # common practice


def test_antenna_table_names_the_columns_and_the_caution(cli, doublet):
    code, out, err = cli("antenna", doublet, "--cut-for", "7.1MHz")
    assert code == 0, err
    assert "SWR on ladder" in out and "nearest resonance MHz" in out and "rule of thumb 468/f" in out
    assert "power lines" in out


def test_budget_solves_rows_in_one_run_and_reuses_them(monkeypatch, doublet):
    wire_antenna.clear_cache()
    runs = []
    engine = wire_antenna._engine_run
    monkeypatch.setattr(wire_antenna, "_engine_run", lambda *a: runs.append((len(a[1]), a[2])) or engine(*a))
    station = linecalc.load_station(doublet)
    result = linecalc.solve_budget(station)
    assert runs == [(2, True)]  # the rows with their far field, for the exposure's peak gain
    linecalc.solve_budget(station)
    assert runs == [(2, True)]  # cached within the process
    swept = linecalc.solve_budget(station, sweep_points=3)
    # the band edges in one more run, without the far field that a sweep point does not report;
    # the centres are the rows, already solved
    assert runs == [(2, True), (4, False)]
    # and the rows themselves, peak gain included, are those of the budget without the sweep
    plain_rows = json.loads(json.dumps(result.to_dict()))["rows"]
    swept_rows = [{k: v for k, v in row.items() if k != "sweep"} for row in json.loads(json.dumps(swept.to_dict()))["rows"]]
    assert swept_rows == plain_rows
    assert set(result.to_dict()["rows"][0]["wire"]) == {"peak_gain_dbi", "wire_loss_db", "wire_heat_w"}
    assert swept.to_dict()["antenna_gain_dbi"] is None


def test_exposure_uses_the_model_gain_per_row(doublet):
    # FCC OET Bulletin 65, section 2: EIRP = P G, with G the antenna's peak gain
    result = linecalc.solve_safety(linecalc.load_station(doublet))
    gain = result.wire["peak_gain_dbi"]
    average = result.exposure["power_average_w"]
    assert result.exposure["eirp_w"] == pytest.approx(average * 10 ** (gain / 10))
    assert gain.max() > 2.15 + 3  # a doublet over ground has lobes well above the free-space dipole


@pytest.mark.parametrize("replace, key", [
    ("    height: 10 m\n", "    height: 2 m\n    apex_angle: 60 deg\n"),  # inverted-v legs underground
    ("    ground: perfect\n", "    ground: perfect\n    feed_at: 1.2\n"),
    ("    length: 2 x 10.5 m\n", "    length: 0 m\n"),
    ("    ground: perfect\n", "    ground: perfect\n    diameter: 2 m\n"),
    ("    length: 2 x 10.5 m\n", "    length: 2 x 10 km\n"),  # beyond the segment limit: refused, not run
])
def test_bad_geometry_is_exit_2_with_file_and_line(cli, write_file, one_error_line, replace, key):
    text = DOUBLET.replace(replace, key)
    if "apex_angle" in key:
        text = text.replace("shape: dipole", "shape: inverted-v")
    path = write_file("bad.yaml", text)
    code, out, err = cli("budget", path)
    assert code == 2 and out == ""
    line, message = one_error_line(err, path)
    assert "(at antenna.wire" in message
    assert line > 5


def test_without_the_engine_a_wire_antenna_names_the_install_command(cli, doublet, monkeypatch, one_error_line):
    monkeypatch.setattr(wire_antenna, "engine_available", lambda: False)
    monkeypatch.setattr("linecalc.io.wire_file.engine_available", lambda: False)
    code, out, err = cli("budget", doublet)
    assert code == 2 and out == ""
    _, message = one_error_line(err, doublet)
    assert "pip install" in message and "linecalc[antenna]" in message


def test_antenna_command_needs_a_wire_antenna(cli, write_file, one_error_line):
    path = write_file("table.yaml", DOUBLET.split("antenna:")[0] + "antenna:\n  impedance: {7 MHz: 50, 15 MHz: 60}\n"
                      "feed:\n  - line: {cable: rg-213, length: 10 m}\n")
    code, out, err = cli("antenna", path)
    assert code == 2 and out == ""
    _, message = one_error_line(err, path)
    assert "wire antenna" in message


def test_antenna_command_refuses_a_bad_frequency(cli, doublet):
    code, out, err = cli("antenna", doublet, "--cut-for", "12 m")
    assert code == 2 and out == "" and err.startswith("linecalc antenna: --cut-for:")
