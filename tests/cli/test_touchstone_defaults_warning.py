"""A Touchstone 1.x file without an option line is read with the specification's defaults (GHz,
S, MA, R 50), and the reading says so: a warning on stderr and in the document's `warnings`,
naming the file."""
from __future__ import annotations

import json

import pytest

from linecalc.io.touchstone import read_sweep

# 7.1 MHz written as 0.0071 GHz: the defaults are GHz, S, MA, R 50 (Touchstone File Format
# Specification, version 2.0, IBIS Open Forum 2009, option line; from memory)
NO_OPTION_LINE = "! no option line\n0.0071 0.5 90\n0.0072 0.5 90\n"
WITH_OPTION_LINE = "# GHz S MA R 50\n0.0071 0.5 90\n0.0072 0.5 90\n"

STATION = """\
name: Sweep without option line
frequencies: [7.1 MHz]
radio: {{power: 100 W}}
antenna:
  touchstone: {name}
feed:
  - line: {{label: coax, cable: rg-213, length: 10 m}}
"""


def test_reader_warns_without_an_option_line(write_file):
    path = write_file("bare.s1p", NO_OPTION_LINE)
    sweep = read_sweep(path)
    assert list(sweep.frequency_hz) == [7.1e6, 7.2e6]
    (warning,) = sweep.warnings
    assert str(path) in warning and "GHz" in warning and "Touchstone specification" in warning
    assert read_sweep(write_file("full.s1p", WITH_OPTION_LINE)).warnings == ()


@pytest.mark.parametrize("command", ["budget", "safety"])
def test_warning_reaches_stderr_and_the_json_warnings(command, cli, write_file):
    write_file("bare.s1p", NO_OPTION_LINE)
    station = write_file("station.yaml", STATION.format(name="bare.s1p"))
    code, out, err = cli(command, station, "--format", "json")
    assert code == 0, err
    document = json.loads(out)
    (warning,) = [w for w in document["warnings"] if "option line" in w]
    assert "bare.s1p" in warning and "GHz" in warning
    assert f"warning: {warning}" in err.splitlines()


def test_feedpoint_and_compare_show_it_too(cli, write_file):
    write_file("bare.s1p", NO_OPTION_LINE)
    station = write_file("station.yaml", STATION.format(name="bare.s1p") + "compare:\n  cables: [rg-58]\n")
    measured = write_file("measured.yaml", STATION.format(name="bare.s1p").replace(
        "  touchstone: bare.s1p\n", "  touchstone: bare.s1p\n  measured_at: radio\n"))
    for args in (("feedpoint", measured), ("compare", station, "--format", "json")):
        code, out, err = cli(*args)
        assert code == 0, err
        assert any("bare.s1p" in line and "no option line" in line for line in err.splitlines()), args


def test_no_warning_with_an_option_line(cli, write_file):
    write_file("full.s1p", WITH_OPTION_LINE)
    code, out, err = cli("budget", write_file("station.yaml", STATION.format(name="full.s1p")), "--format", "json")
    assert code == 0, err
    assert not any("option line" in w for w in json.loads(out)["warnings"])
