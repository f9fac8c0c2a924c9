"""Option values checked and blamed on the option: one line `linecalc CMD: --option: ...`, exit 2,
nothing on stdout. Lengths on the command line are held to the limits of a station file's
lengths (README, Errors and exit status: lengths up to 1,000 km, at least 1e-6 m)."""
from __future__ import annotations

import pytest


@pytest.mark.parametrize("args, option", [
    (["advise", "orchard-doublet.yaml", "--max-loss", "nan"], "--max-loss"),
    (["advise", "orchard-doublet.yaml", "--max-loss", "-1"], "--max-loss"),
    (["advise", "orchard-doublet.yaml", "--max-loss", "inf"], "--max-loss"),
    (["advise", "orchard-doublet.yaml", "--top", "-1"], "--top"),
    (["advise", "orchard-doublet.yaml", "--top", "0"], "--top"),
    (["advise", "orchard-doublet.yaml", "--to", "1e9 m"], "--to"),
    (["advise", "orchard-doublet.yaml", "--from", "-5 m"], "--from"),
    (["advise", "orchard-doublet.yaml", "--step", "0 m"], "--step"),
    (["compare", "hilltop-dipole.yaml", "--lengths", "2000km"], "--lengths"),
    (["compare", "hilltop-dipole.yaml", "--lengths", "1m", "1e-7 m"], "--lengths"),
])
def test_a_bad_option_value_is_blamed_on_the_option(cli, data_path, args, option):
    args = [str(data_path(a)) if a.endswith(".yaml") else a for a in args]
    code, out, err = cli(*args)
    assert code == 2 and out == ""
    assert err.startswith(f"linecalc {args[0]}: {option}: ") and err.count("\n") == 1, err


@pytest.mark.parametrize("name", [r"Cabin \e[2J", r"Cabin \x9b2J", r"Cabin \u202e"])
def test_a_name_with_terminal_codes_is_refused_and_shown_escaped(cli, tmp_path, data_path, one_error_line, name):
    text = data_path("hilltop-dipole.yaml").read_text()
    start = text.index("\nname: ") + 1
    end = text.index("\n", start)
    station = tmp_path / "codes.yaml"
    station.write_text(text[:start] + f'name: "{name}"' + text[end:])
    code, out, err = cli("budget", station)
    assert code == 2 and out == ""
    _, message = one_error_line(err, station)
    assert "no control or format characters" in message
    assert all(c.isprintable() for c in err.rstrip("\n"))


def test_an_ascii_terminal_degrades_characters(tmp_path, data_path):
    import os
    import subprocess
    import sys
    from pathlib import Path

    text = data_path("hilltop-dipole.yaml").read_text()
    start = text.index("\nname: ") + 1
    end = text.index("\n", start)
    station = tmp_path / "accent.yaml"
    station.write_text(text[:start] + "name: Caf\u00e9 cabin" + text[end:], encoding="utf-8")
    command = Path(sys.executable).parent / "linecalc"
    result = subprocess.run([str(command), "budget", str(station)], capture_output=True, timeout=120,
                            env={**os.environ, "PYTHONIOENCODING": "ascii"})
    assert result.returncode == 0, result.stderr
    assert result.stdout.startswith(b"Caf\\xe9 cabin")
