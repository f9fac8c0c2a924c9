"""advise --antenna-from/--antenna-to: the antenna's length scanned with the feeder's, on a small
wire station (two bands, perfect ground, a few lengths) so that the engine runs take milliseconds."""
from __future__ import annotations

import json

import numpy as np
import pytest

pytest.importorskip("PyNEC")

STATION = """\
name: Pair scan test doublet
region: 1
radio: {power: 100 W, impedance: 50 ohm}
bands: [40m, 20m]
antenna:
  wire: {shape: dipole, length: LENGTH, height: 10 m, diameter: 2 mm, material: copper, ground: perfect}
feed:
  - tuner: {label: tuner, network: T, output: balanced, capacitance: {min: 20 pF, max: 200 pF},
            inductance: {min: 0.2 uH, max: 15 uH}}
  - line: {label: ladder, cable: window-line-450, length: 10 m}
"""
SCAN = ("--antenna-from", "2 x 9 m", "--antenna-to", "2x11m", "--antenna-step", "2 m",
        "--from", "5 m", "--to", "25 m", "--step", "10 cm", "--jobs", "1", "--top", "50")
# As in test_advise_ranking_cli.py: the scan's T tuner within 0.05 dB of the full design's.
WATTS_RTOL = 0.015


@pytest.fixture(scope="module")
def pair_station(tmp_path_factory):
    path = tmp_path_factory.mktemp("pairs") / "doublet.yaml"
    path.write_text(STATION.replace("LENGTH", "2 x 10 m"))
    return path


@pytest.fixture(scope="module")
def document(pair_station):
    from linecalc.cli import main
    import contextlib
    import io

    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        code = main(["advise", str(pair_station), *SCAN, "--format", "json"])
    assert code == 0, err.getvalue()
    return json.loads(out.getvalue()), err.getvalue()


def test_one_progress_line_per_antenna_length_and_only_the_document_on_stdout(document):
    doc, err = document
    lines = err.splitlines()
    assert [line.split(":")[0] for line in lines] == [f"antenna length {k}/3" for k in (1, 2, 3)]
    assert all(line.endswith(" s") for line in lines)
    assert doc["antenna"] == {"shape": "dipole", "from_m": 18.0, "to_m": 22.0, "count": 3}
    assert [a["length_m"] for a in doc["antenna_lengths"]] == [18.0, 20.0, 22.0]


def test_pairs_are_ranked_and_the_first_agrees_with_compare_on_that_antenna(document, cli, write_file):
    doc, _ = document
    pairs = doc["pairs"]
    assert doc["pair_count"] == len(pairs) >= 2
    watts = [p["power_sum_w"] for p in pairs]
    assert watts == sorted(watts, reverse=True)
    # every antenna length's best window is among the pairs
    assert {p["antenna_length_m"] for p in pairs} == {a["length_m"] for a in doc["antenna_lengths"] if a["best"]}
    best = pairs[0]
    # Independent path: a station file with that antenna length, the budget's cascade, full tuner
    # design and its own engine run (with the far field) through compare --lengths.
    station = write_file("best.yaml", STATION.replace("LENGTH", f"{best['antenna_length_m']!r} m"))
    code, out, err = cli("compare", station, "--line", "ladder", "--lengths", f"{best['best_length_m']!r} m",
                         "--format", "json")
    assert code == 0, err
    compared = json.loads(out)
    name = compared["alternatives"][-1]
    row_watts = [next(x["power_antenna_w"] for x in row["alternatives"] if x["name"] == name)
                 for row in compared["rows"]]
    assert best["power_sum_w"] == pytest.approx(sum(row_watts), rel=WATTS_RTOL)
    assert best["worst_row_power_w"] == pytest.approx(min(row_watts), rel=WATTS_RTOL)


def test_each_antenna_length_is_the_single_scan_of_that_antenna(document, cli, write_file):
    doc, _ = document
    entry = doc["antenna_lengths"][1]
    station = write_file("single.yaml", STATION.replace("LENGTH", "20 m"))
    code, out, err = cli("advise", station, "--from", "5 m", "--to", "25 m", "--step", "10 cm", "--format", "json")
    assert code == 0, err
    single = json.loads(out)
    assert entry["window_count"] == single["window_count"]
    assert entry["matchable_fraction"] == pytest.approx(single["matchable_fraction"], rel=1e-12)
    best = single["windows"][0]
    assert entry["best"].keys() == best.keys()
    for key, value in best.items():  # the same scan; the chunks may round the last digit apart
        assert entry["best"][key] == (pytest.approx(value, rel=1e-12) if isinstance(value, float) else value), key


@pytest.mark.slow
def test_two_processes_give_the_same_document(pair_station, document, cli):
    code, out, err = cli("advise", pair_station, *SCAN[:-4], "--jobs", "2", "--top", "50", "--format", "json")
    assert code == 0, err
    assert json.loads(out) == document[0]


@pytest.mark.parametrize("args, words", [
    (["--antenna-from", "2 x 9 m"], "--antenna-from/--antenna-to: give both"),
    (["--antenna-from", "20 m", "--antenna-to", "18 m"], "--antenna-from/--antenna-to:"),
    (["--antenna-from", "18 m", "--antenna-to", "22 m", "--antenna-step", "5 m"], "--antenna-step:"),
    (["--antenna-from", "18 m", "--antenna-to", "22 W"], "--antenna-to:"),
    (["--antenna-from", "0.001 m", "--antenna-to", "22 m", "--antenna-step", "10 m"], "--antenna-from/--antenna-to:"),
    (["--antenna-from", "18 m", "--antenna-to", "22 m", "--jobs", "0"], "--jobs:"),
])
def test_bad_antenna_options_exit_2_naming_the_option(args, words, cli, pair_station):
    code, out, err = cli("advise", pair_station, *args)
    assert code == 2 and out == ""
    assert err.startswith(f"linecalc advise: {words}"), err
    assert len(err.splitlines()) == 1


def test_an_antenna_given_by_impedance_is_refused_at_its_key(cli, data_path):
    code, out, err = cli("advise", data_path("orchard-doublet.yaml"), "--antenna-from", "30 m", "--antenna-to", "40 m")
    assert code == 2 and out == ""
    assert "needs a wire antenna" in err and "(at antenna)" in err
