"""advise and plot through the command line: windows that re-solve, bad options, valid images."""
from __future__ import annotations

import dataclasses
import json
import struct
from pathlib import Path

import numpy as np
import pytest

from linecalc.studies.budget import solve_budget
from linecalc.elements import Line
from linecalc.io.station_file import load_station


@pytest.fixture
def run(linecalc_command):
    """The installed command, with room for a long scan or a plot (matplotlib's first import)."""
    return lambda *args: linecalc_command(*args, timeout=300)


def test_advise_best_window_matches_when_re_solved_one_length_at_a_time(run, doublet):
    result = run("advise", doublet, "--from", "5 m", "--to", "25 m", "--step", "5 cm", "--max-loss", "0.35",
                 "--format", "json")
    assert result.returncode == 0, result.stderr
    doc = json.loads(result.stdout)
    assert doc["windows"], "the test doublet has windows under 0.35 dB"
    best = doc["windows"][0]
    station = load_station(doublet)
    index = next(k for k, e in enumerate(station.feed) if e.kind == "line")
    for length in np.linspace(best["start_m"], best["end_m"], 3):
        feed = list(station.feed)
        feed[index] = Line(feed[index].cable, float(length), feed[index].label)
        checked = solve_budget(dataclasses.replace(station, feed=tuple(feed)))
        tuner = next(e for e in checked.elements if e.kind == "tuner")
        assert np.all(tuner.readings["matched"])
        # the tuner's match holds to SWR 1.02 (tuner.MATCHED_SWR) at its input, on a 50-ohm radio side
        assert np.all(checked.swr_radio <= 1.02)
        assert np.all(tuner.loss_db <= best["worst_tuner_loss_db"] + 0.05)


@pytest.mark.parametrize("args, words", [
    (["--from", "10 m", "--to", "5 m"], "--from/--to:"),
    (["--from", "5 m", "--to", "5 m"], "--from/--to:"),
    (["--step", "0 m"], "--step:"),
    (["--step", "0.1 mm"], "--step:"),
    (["--step", "1 W"], "--step:"),
])
def test_advise_bad_options_exit_2_naming_the_option(args, words, run, doublet):
    result = run("advise", doublet, *args)
    assert result.returncode == 2, result.stderr
    assert result.stderr.startswith(f"linecalc advise: {words}") and "Traceback" not in result.stderr
    assert result.stdout == ""


def test_advise_without_a_tuner_names_the_feed(run, dipole):
    result = run("advise", dipole)
    assert result.returncode == 2
    assert "tuner" in result.stderr and "(at feed)" in result.stderr


def _png_size(path):
    # PNG specification (ISO/IEC 15948), section 5.2 and 11.2.2: signature, then IHDR width and height
    data = Path(path).read_bytes()
    assert data[:8] == b"\x89PNG\r\n\x1a\n"
    return struct.unpack(">II", data[16:24])


@pytest.mark.parametrize("kind", ["swr", "budget", "smith", "voltage", "compare"])
def test_plot_writes_a_png_of_sensible_size(kind, tmp_path, cli, doublet):
    # in-process (the entry point itself is run by test_plot_svg_and_bad_suffix)
    out = tmp_path / f"{kind}.png"
    code, _, err = cli("plot", doublet, kind, out, "--sweep", "11")
    assert code == 0, err
    width, height = _png_size(out)
    assert (width, height) == (1000, 600)
    assert 10_000 < out.stat().st_size < 2_000_000
    code, _, err = cli("plot", doublet, kind, out, "--sweep", "11")
    assert code == 2 and "--force" in err
    assert cli("plot", doublet, kind, out, "--sweep", "11", "--force")[0] == 0
    assert [p.name for p in tmp_path.iterdir()] == [out.name]  # no temporary file left


def test_plot_svg_and_bad_suffix(tmp_path, run, doublet):
    assert run("plot", doublet, "budget", tmp_path / "b.svg").returncode == 0
    assert (tmp_path / "b.svg").read_text().lstrip().startswith("<?xml")
    bad = run("plot", doublet, "budget", tmp_path / "b.gif")
    assert bad.returncode == 2 and "Traceback" not in bad.stderr


def test_plot_compare_without_alternatives_is_bad_input(tmp_path, run, dipole):
    result = run("plot", dipole, "compare", tmp_path / "c.png")
    assert result.returncode == 2 and "compare" in result.stderr
