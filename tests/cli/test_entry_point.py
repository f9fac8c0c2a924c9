"""The command end to end, mostly through its installed entry point: every test station in every
output format, the cable listing, bad input (exit status 2, one line `FILE:LINE: ... (at key.path)`)
and the JSON of a shorted antenna."""
from __future__ import annotations

import csv
import io
import json
import math
import re

import pytest


def test_station_table_json_csv(data_station, linecalc_command):
    table = linecalc_command("budget", data_station)
    assert table.returncode == 0, table.stderr
    assert "SWR antenna" in table.stdout and "Traceback" not in table.stderr

    as_json = linecalc_command("budget", data_station, "--format", "json")
    assert as_json.returncode == 0, as_json.stderr
    doc = json.loads(as_json.stdout)
    assert set(doc) >= {"station", "reference_impedance_ohm", "radio_power_w", "rows", "warnings"}
    for row in doc["rows"]:
        assert set(row) >= {"label", "frequency_hz", "swr_antenna", "swr_radio", "z_antenna_ohm", "z_radio_ohm",
                            "matched_loss_db", "mismatch_loss_db", "total_loss_db", "power_radio_w",
                            "power_antenna_w", "elements"}
        # docs/json.md (the budget rows) and the README (How linecalc computes, Losses):
        # total = 10 log10(P_radio / P_antenna) and mismatch = total - matched
        assert row["total_loss_db"] == pytest.approx(
            10 * math.log10(row["power_radio_w"] / row["power_antenna_w"]), abs=1e-9)
        assert row["mismatch_loss_db"] == pytest.approx(row["total_loss_db"] - row["matched_loss_db"], abs=1e-9)
        heat = sum(e["dissipated_w"] for e in row["elements"])
        assert row["power_radio_w"] == pytest.approx(row["power_antenna_w"] + heat, rel=1e-9)
        for element in row["elements"]:
            assert set(element) >= {"kind", "label", "loss_db", "dissipated_w"}

    as_csv = linecalc_command("budget", data_station, "--format", "csv")
    assert as_csv.returncode == 0, as_csv.stderr
    rows = list(csv.DictReader(io.StringIO(as_csv.stdout)))
    assert len(rows) == len(doc["rows"])
    assert float(rows[0]["power_antenna_w"]) == pytest.approx(doc["rows"][0]["power_antenna_w"], rel=1e-9)


def test_cables_listing_names_every_library_cable(linecalc_command):
    result = linecalc_command("cables")
    assert result.returncode == 0, result.stderr
    for cable_id in ("rg-58", "rg-8x", "rg-213", "foam-10mm", "hardline-half-inch", "rg-6", "rg-11",
                     "twin-lead-300", "window-line-450", "open-wire-600"):
        assert cable_id in result.stdout
    assert "per 100 m" in result.stdout and "per 100 ft" in result.stdout


def test_usage_error_exits_2(linecalc_command):
    result = linecalc_command("budget")
    assert result.returncode == 2 and "Traceback" not in result.stderr


GOOD = """\
name: Test station
region: 1
radio: {power: 100 W}
bands: [40m]
antenna:
  impedance: {7.0 MHz: 60-j30, 7.2 MHz: 70+j30}
feed:
  - line: {cable: rg-213, length: 30 m}
"""

# (replace this, with that, expected line, expected key path, words in the message)
BAD = {
    "yaml syntax": ("feed:\n", "feed: [\n", None, None, "YAML syntax error"),
    "unknown key": ("radio: {power: 100 W}", "radio: {power: 100 W, colour: red}", 3, "radio.colour", "unknown key"),
    "missing key": ("radio: {power: 100 W}\n", "", 1, None, "missing key 'radio'"),
    "wrong unit": ("length: 30 m", "length: 30 W", 8, "feed[0].line.length", "not a quantity in m"),
    "bare length": ("length: 30 m", "length: 30", 8, "feed[0].line.length", "needs a unit"),
    "zero length": ("length: 30 m", "length: 0 m", 8, "feed[0].line.length", "greater than zero"),
    "negative length": ("length: 30 m", "length: -3 m", 8, "feed[0].line.length", "greater than zero"),
    "velocity factor": ("cable: rg-213", "cable: {impedance: 50 ohm, velocity_factor: 1.2, loss: {10 MHz: 1 dB/100m}}",
                        8, "feed[0].line.cable.velocity_factor", "at most 1"),
    "swr below one": ("impedance: {7.0 MHz: 60-j30, 7.2 MHz: 70+j30}", "swr: {7.0 MHz: 0.9, 7.2 MHz: 1.5}",
                      6, "antenna.swr.7.0 MHz", "SWR is 1 or more"),
    "unknown cable": ("cable: rg-213", "cable: rg-231", 8, "feed[0].line.cable", "did you mean rg-213"),
    "outside table": ("bands: [40m]", "bands: [40m, 20m]", 6, "antenna.impedance", "never extrapolated"),
    "duplicate key": ("radio: {power: 100 W}", "radio: {power: 100 W, power: 50 W}", 3, None, "duplicate key"),
    "unknown element": ("- line:", "- wire:", 8, "feed[0]", "unknown element"),
    "no region": ("region: 1\n", "", 1, None, "region"),
    "unknown band": ("bands: [40m]", "bands: [41m]", 4, "bands[0]", "unknown band"),
}


@pytest.mark.parametrize("case", BAD, ids=list(BAD))
def test_bad_input_exits_2_with_file_line_and_path(case, write_file, linecalc_command):
    old, new, line, path, words = BAD[case]
    assert old in GOOD
    station = write_file("station.yaml", GOOD.replace(old, new, 1))
    result = linecalc_command("budget", station)
    assert result.returncode == 2, (result.stdout, result.stderr)
    assert result.stdout == ""
    assert "Traceback" not in result.stderr
    message = result.stderr.strip()
    assert "\n" not in message
    match = re.match(rf"^{re.escape(str(station))}:(\d+): (.*)$", message)
    assert match, message
    if line is not None:
        assert int(match.group(1)) == line, message
    if path is not None:
        assert message.endswith(f"(at {path})"), message
    assert words in message


def test_good_station_runs(write_file, linecalc_command):
    assert linecalc_command("budget", write_file("station.yaml", GOOD)).returncode == 0


def test_missing_file_exits_2(tmp_path, linecalc_command):
    result = linecalc_command("budget", tmp_path / "nope.yaml")
    assert result.returncode == 2 and "nope.yaml" in result.stderr and "Traceback" not in result.stderr


def test_json_of_a_shorted_antenna_has_nulls_not_infinity(write_file, cli):
    # JSON has no infinity (RFC 8259, section 6): an infinite loss is written null
    station = write_file("short.yaml", "name: short\nfrequencies: [7 MHz]\nradio: {power: 100 W}\n"
                                       "antenna: {impedance: {7 MHz: 0}}\nfeed:\n  - line: {cable: rg-213, length: 10 m}\n")
    code, out, err = cli("budget", station, "--format", "json")
    assert code == 0, err
    row = json.loads(out)["rows"][0]
    assert row["total_loss_db"] is None and row["power_antenna_w"] == 0.0 and row["swr_antenna"] is None
    code, out, err = cli("compare", station, "--cable", "rg-58", "--format", "json")
    assert code == 0, err
