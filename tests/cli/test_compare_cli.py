"""compare through the installed command: the three output formats, bad options (exit 2 naming
the option) and a station with nothing to compare or a bad compare: key (exit 2, FILE:LINE)."""
from __future__ import annotations

import json

import pytest


def test_cli_compare_formats(doublet, linecalc_command):
    table = linecalc_command("compare", doublet)
    assert table.returncode == 0, table.stderr
    assert "winner" in table.stdout and "margin dB" in table.stdout
    doc = json.loads(linecalc_command("compare", doublet, "--format", "json").stdout)
    assert {"station", "alternatives", "rows"} <= set(doc)
    for row in doc["rows"]:
        best = max(row["alternatives"], key=lambda a: a["power_antenna_w"])
        assert row["winner"] == best["name"]
    csv_text = linecalc_command("compare", doublet, "--format", "csv").stdout
    assert csv_text.splitlines()[0].startswith("label,frequency_hz,alternative")


@pytest.mark.parametrize("args, words", [
    (["--cable", "rg-2133"], "--cable: unknown cable id 'rg-2133'"),
    (["--lengths", "3 W"], "--lengths:"),
    (["--lengths", "0 m"], "--lengths: a length from 1e-06 m to 1e+06 m"),
])
def test_cli_compare_bad_options_exit_2(args, words, dipole, linecalc_command):
    result = linecalc_command("compare", dipole, *args)
    assert result.returncode == 2 and words in result.stderr and "Traceback" not in result.stderr
    assert result.stdout == ""


def test_cli_compare_without_alternatives_names_file_and_line(dipole, linecalc_command):
    result = linecalc_command("compare", dipole)
    assert result.returncode == 2 and "Traceback" not in result.stderr
    assert result.stderr.startswith(str(dipole) + ":")
    assert "nothing to compare" in result.stderr


def test_compare_key_with_unknown_cable_names_its_line(dipole, write_file, linecalc_command):
    text = dipole.read_text() + "compare:\n  cables: [rg-213, rg-99]\n"
    station = write_file("s.yaml", text)
    result = linecalc_command("compare", station)
    assert result.returncode == 2
    line = text.splitlines().index("  cables: [rg-213, rg-99]") + 1
    assert result.stderr.startswith(f"{station}:{line}: unknown cable id 'rg-99'")
