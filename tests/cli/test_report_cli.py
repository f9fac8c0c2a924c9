"""`linecalc report STATION --output FILE.html`: what it writes and the output rules it follows
(written whole, never over an input or a device, over an existing file only with --force), with
the exit statuses of every command."""
from __future__ import annotations

import os
import shutil

import pytest


@pytest.fixture
def reading(data_path, tmp_path):
    """A copy of the test shack reading (an SWR-only antenna: the quickest report) in tmp_path."""
    return shutil.copy(data_path("shack-reading.yaml"), tmp_path / "reading.yaml")


def _one_line(err):
    lines = err.strip().splitlines()
    assert len(lines) == 1, err
    assert "Traceback" not in err
    return lines[0]


def test_report_writes_one_page_and_prints_nothing(cli, reading, tmp_path, monkeypatch):
    monkeypatch.setenv("SOURCE_DATE_EPOCH", "1767225600")  # 2026-01-01 00:00 UTC
    output = tmp_path / "reading.html"
    code, out, err = cli("report", reading, "--output", output)
    assert code == 0, err
    assert out == ""
    assert err.strip().splitlines()[-1] == f"wrote {output}"
    text = output.read_text(encoding="utf-8")
    assert text.startswith("<!DOCTYPE html>") and text.rstrip().endswith("</html>")
    assert "on 2026-01-01 00:00 UTC" in text
    assert [p.name for p in tmp_path.iterdir() if p.name.startswith(".lc")] == []  # no temporary file left
    # --force replaces it (the date moves on a day)
    monkeypatch.setenv("SOURCE_DATE_EPOCH", "1767312000")
    code, _, err = cli("report", reading, "--output", output, "--force")
    assert code == 0, err
    assert "on 2026-01-02 00:00 UTC" in output.read_text(encoding="utf-8")


# Invented test station: a radio's built-in tuner (max SWR 3 by default) facing a load whose SWR
# is 4.4 at the 40 m band edges and 1.2 at the centre: it matches at the centre row, not at the
# sweep points near the edges.
BUILTIN_EDGES = """\
name: Built-in tuner at the band edges
region: 1
radio: {power: 100 W}
bands: [40m]
antenna: {impedance: {7.0 MHz: 220+j0, 7.1 MHz: 60+j0, 7.2 MHz: 220+j0}}
feed:
  - tuner: {label: radio tuner, network: builtin}
  - line: {label: coax, cable: rg-213, length: 5 m}
"""


def test_the_sweep_warnings_of_the_swr_figure_are_listed(cli, write_file, tmp_path):
    station = write_file("edges.yaml", BUILTIN_EDGES)
    code, out, err = cli("report", station, "--output", tmp_path / "edges.html")
    assert code == 0 and out == ""
    warning = "radio tuner cannot match across the band on 40m at "
    assert f"warning: {warning}" in err
    assert warning in (tmp_path / "edges.html").read_text(encoding="utf-8")


def test_an_existing_file_is_kept_without_force(cli, reading, tmp_path):
    output = tmp_path / "kept.html"
    output.write_text("mine")
    code, out, err = cli("report", reading, "--output", output)
    assert code == 2 and out == ""
    assert _one_line(err) == f"linecalc report: --output: {output}: exists; use --force to replace it"
    assert output.read_text() == "mine"


def test_never_over_the_station_file_even_with_force(cli, reading, tmp_path):
    station = tmp_path / "station.html"  # a station file may have any name
    shutil.copy(reading, station)
    before = station.read_bytes()
    code, out, err = cli("report", station, "--output", station, "--force")
    assert code == 2 and out == ""
    assert "is an input of this run" in _one_line(err)
    assert station.read_bytes() == before
    os.link(station, tmp_path / "hard.html")  # the same file under another name
    code, _, err = cli("report", station, "--output", tmp_path / "hard.html", "--force")
    assert code == 2 and "is an input of this run" in _one_line(err)
    assert station.read_bytes() == before


def test_never_over_a_device(cli, reading, tmp_path):
    (tmp_path / "null.html").symlink_to(os.devnull)
    code, out, err = cli("report", reading, "--output", tmp_path / "null.html", "--force")
    assert code == 2 and out == ""
    assert "not a regular file; it is never replaced" in _one_line(err)


@pytest.mark.parametrize("name, message", [
    ("report.txt", "a report file ends in .html"),
    ("no-such-folder/report.html", "cannot be written"),
])
def test_refused_outputs(cli, reading, tmp_path, name, message):
    code, out, err = cli("report", reading, "--output", tmp_path / name)
    assert code == 2 and out == ""
    line = _one_line(err)
    assert line.startswith("linecalc report: --output: ") and message in line
    assert not (tmp_path / name).exists()


def test_output_is_required(reading, capsys):
    from linecalc.cli import main

    with pytest.raises(SystemExit) as exit_status:
        main(["report", str(reading)])
    out, err = capsys.readouterr()
    assert exit_status.value.code == 2 and out == ""
    assert "--output" in _one_line(err)


def test_a_bad_source_date_epoch_is_refused(cli, reading, tmp_path, monkeypatch):
    monkeypatch.setenv("SOURCE_DATE_EPOCH", "yesterday")
    code, out, err = cli("report", reading, "--output", tmp_path / "r.html")
    assert code == 2 and out == ""
    assert _one_line(err) == ("linecalc report: SOURCE_DATE_EPOCH: a whole number of seconds since 1970-01-01 UTC, "
                              "got 'yesterday'")
    assert not (tmp_path / "r.html").exists()


def test_a_bad_station_writes_nothing(cli, write_file, tmp_path):
    station = write_file("bad.yaml", "name: Bad\nradio: {power: 100 W}\nfrequencies: [7.1 MHz]\nantenna: {swr: 0.5}\n")
    code, out, err = cli("report", station, "--output", tmp_path / "bad.html")
    assert code == 2 and out == ""
    assert _one_line(err).startswith(f"{station}:")
    assert not (tmp_path / "bad.html").exists()
