"""Small defects found by trying the commands as a new user would: each fixed and kept fixed."""
from __future__ import annotations

import csv
import io
import json

from linecalc.render import tables

MISMATCHED = """\
name: {name}
radio: {{power: 100 W}}
frequencies: [7.1 MHz]
antenna:
  impedance: {{7.1 MHz: 150+j0}}
feed:
  - line: {{label: coax, cable: {cable}, length: 10 m}}
compare:
  cables: [rg-58]
"""


def test_feedpoint_output_over_an_existing_file_prints_nothing_on_stdout(cli, data_path, tmp_path):
    # README, exit status 2: one line on stderr, nothing on stdout
    existing = tmp_path / "feedpoint.s1p"
    existing.write_text("! not to be replaced\n")
    code, out, err = cli("feedpoint", data_path("shack-sweep-dipole.yaml"), "--output", existing)
    assert code == 2 and out == "" and "exists" in err
    assert existing.read_text() == "! not to be replaced\n"


def test_a_rounding_residue_below_zero_prints_as_zero():
    assert tables._db(-0.0004) == "0.00" and tables._db(-0.006) == "-0.01" and tables._db(0.0) == "0.00"


def test_the_open_wire_caution_is_left_off_a_coax_feeder(cli, data_path):
    code, out, err = cli("advise", data_path("tuner-in-shack.yaml"), "--step", "10cm")
    assert code == 0, err
    assert "open-wire" not in out and "coax feeder" in out
    code, out, err = cli("advise", data_path("orchard-doublet.yaml"), "--step", "10cm")
    assert code == 0, err
    assert "open-wire feeders carry high voltage" in out


def test_compare_warnings_name_the_alternative(cli, write_file):
    station = write_file("mismatch.yaml", MISMATCHED.format(name="Mismatch", cable="rg-213"))
    code, out, err = cli("compare", station, "--format", "json")
    assert code == 0, err
    warnings = json.loads(out)["warnings"]
    radio = [w for w in warnings if "more than 2:1" in w]
    # each alternative sees its own SWR, so each warning is its own, led by the alternative's name
    assert len(radio) == 2 and radio[0].startswith("coax: rg-213") and radio[1].startswith("coax: rg-58"), radio


def test_a_csv_of_several_stations_has_a_station_column(cli, write_file, tmp_path):
    write_file("a.yaml", MISMATCHED.format(name="First, with a comma", cable="rg-213"))
    write_file("b.yaml", MISMATCHED.format(name="Second", cable="rg-58"))
    code, out, err = cli("budget", tmp_path, "--format", "csv")
    assert code == 0, err
    rows = list(csv.reader(io.StringIO(out)))
    headers = [row for row in rows if row[0] == "station"]
    assert len(headers) == 2 and headers[0][1] == "label"
    assert [row[0] for row in rows if row[0] != "station"] == ["First, with a comma", "Second"]


def test_a_folder_of_one_station_is_a_batch_and_a_file_is_one_document(cli, write_file, tmp_path):
    # README and docs/json.md, Several stations: the form follows the command line (a folder or
    # several files: an array), not the number of files the folder holds
    folder = tmp_path / "one"
    folder.mkdir()
    station = folder / "a.yaml"
    station.write_text(MISMATCHED.format(name="Only", cable="rg-213"))
    code, out, err = cli("budget", folder, "--format", "json")
    assert code == 0, err
    documents = json.loads(out)
    assert isinstance(documents, list) and [d["station"] for d in documents] == ["Only"]
    assert err and all(line.startswith("warning: Only: ") for line in err.splitlines())  # named, as in a batch
    code, out, err = cli("budget", station, "--format", "json")
    assert code == 0, err
    assert isinstance(json.loads(out), dict) and json.loads(out)["station"] == "Only"
    code, out, err = cli("budget", folder, "--format", "csv")
    assert code == 0 and out.startswith("station,label,"), err
    code, out, err = cli("budget", station, station, "--format", "json")  # two files: an array
    assert code == 0 and [d["station"] for d in json.loads(out)] == ["Only", "Only"]


def test_a_folder_of_one_broken_station_reports_it_and_prints_an_empty_array(cli, tmp_path):
    # docs/json.md, Several stations: a failed file is left out of the array, exit status 2
    folder = tmp_path / "broken"
    folder.mkdir()
    (folder / "a.yaml").write_text(MISMATCHED.format(name="Broken", cable="no-such-cable"))
    code, out, err = cli("budget", folder, "--format", "json")
    assert code == 2 and json.loads(out) == [] and err.startswith(str(folder / "a.yaml") + ":")
    code, out, err = cli("budget", folder / "a.yaml", "--format", "json")  # one file: its error alone
    assert code == 2 and out == "" and len(err.splitlines()) == 1


def test_cables_json_gives_the_voltage_rating(cli):
    code, out, err = cli("cables", "--format", "json")
    assert code == 0, err
    listing = json.loads(out)
    assert all("max_voltage_v" in cable for cable in listing)
    assert any(isinstance(cable["max_voltage_v"], float) for cable in listing)


def test_cable_ids_are_read_in_any_case(cli, write_file):
    station = write_file("upper.yaml", MISMATCHED.format(name="Upper", cable="RG-213").replace("compare:\n  cables: [rg-58]\n", ""))
    code, out, err = cli("budget", station, "--format", "json")
    assert code == 0, err
    assert json.loads(out)["rows"][0]["elements"][0]["kind"] == "line"
