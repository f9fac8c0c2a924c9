"""--uncertainty on budget, compare and feedpoint, through the command."""
from __future__ import annotations

import json

import pytest

STATION = """\
name: Test station, two coax lengths
radio: {power: 100 W}
frequencies: [7.1 MHz, 14.2 MHz]
antenna: {impedance: {7.1 MHz: 60-j20, 14.2 MHz: 45+j15}}
feed:
  - connector: {count: 2}
  - line: {label: coax, cable: rg-58, length: 30 m}
"""


@pytest.fixture
def station(write_file):
    return write_file("station.yaml", STATION)


def test_budget_json_carries_the_spread_and_equals_to_dict(station, cli):
    import linecalc
    from linecalc.physics.tolerance import Tolerances

    code, out, err = cli("budget", station, "--uncertainty", "--draws", "300", "--format", "json")
    assert code == 0, err
    doc = json.loads(out)
    spread = doc["uncertainty"]
    assert spread["tolerances"]["draws"] == 300 and spread["tolerances"]["seed"] == 1
    for row, plain in zip(spread["rows"], doc["rows"]):
        watts = row["power_antenna_w"]
        assert watts["nominal"] == plain["power_antenna_w"]
        assert watts["low"] <= watts["median"] <= watts["high"]
        # cable loss only grows (+0 to +30 %): the drawn stations deliver less than the nominal one
        assert watts["median"] < watts["nominal"]
    api = linecalc.solve_budget(linecalc.load_station(station), uncertainty=Tolerances(draws=300))
    assert json.loads(json.dumps(api.to_dict())) == doc


def test_the_seed_makes_the_run_repeatable(station, cli):
    runs = [cli("budget", station, "--uncertainty", "--draws", "200", "--seed", seed, "--format", "json")[1]
            for seed in ("5", "5", "6")]
    assert runs[0] == runs[1] != runs[2]


def test_compare_says_too_close_to_call_for_a_near_identical_pair(station, cli):
    # the 30 m as built against 30.05 m of the same coax: a margin of a few thousandths of a dB, far
    # inside the spread of two lengths each measured to +-1 %; 30 m against 15 m is a clear win
    code, out, err = cli("compare", station, "--lengths", "30.05m", "--uncertainty", "--draws", "400",
                         "--format", "json")
    assert code == 0, err
    rows = json.loads(out)["uncertainty"]["rows"]
    assert all(row["verdict"] == "too close to call" for row in rows)
    assert all(row["margin_db"]["low"] < 0 < row["margin_db"]["high"] for row in rows)
    code, out, err = cli("compare", station, "--lengths", "15m", "--uncertainty", "--draws", "400",
                         "--format", "json")
    rows = json.loads(out)["uncertainty"]["rows"]
    assert all(row["verdict"] == "coax: 15 m" and row["wins_share"] == 1.0 for row in rows)


def test_feedpoint_spread_brackets_the_recovered_impedance(tmp_path, cli, data_path, write_file):
    import shutil

    for name in ("shack-sweep-dipole.yaml", "demo-shack-sweep.s1p"):
        shutil.copy(data_path(name), tmp_path / name)
    code, out, err = cli("feedpoint", tmp_path / "shack-sweep-dipole.yaml", "--uncertainty", "--draws", "300",
                         "--format", "json")
    assert code == 0, err
    doc = json.loads(out)
    for point, spread in zip(doc["points"], doc["uncertainty"]["points"]):
        assert spread["r_ohm"]["nominal"] == point["z_antenna_ohm"][0]
        assert spread["r_ohm"]["low"] < spread["r_ohm"]["high"]
    code, out, err = cli("feedpoint", tmp_path / "shack-sweep-dipole.yaml", "--uncertainty", "--draws", "50")
    assert code == 0 and "Uncertainty: the feedpoint as recovered" in out


@pytest.mark.parametrize("options, option", [
    (["--draws", "1"], "--draws"), (["--tol-cable-loss", "30"], "--tol-cable-loss"),
    (["--tol-cable-loss=30:0"], "--tol-cable-loss"), (["--tol-length", "-1"], "--tol-length"),
    (["--tol-rho", "2"], "--tol-rho"), (["--seed", "-1"], "--seed"), (["--format", "csv"], "--uncertainty"),
])
def test_bad_uncertainty_options_exit_2_naming_the_option(station, cli, options, option):
    code, out, err = cli("budget", station, "--uncertainty", *options)
    assert code == 2 and out == ""
    assert err.startswith(f"linecalc budget: {option}: ") and err.count("\n") == 1


def test_a_run_too_large_for_memory_is_refused_before_it_starts(station, cli):
    code, out, err = cli("budget", station, "--uncertainty", "--draws", "1000000")
    assert code == 2 and out == "" and err.startswith("linecalc budget: --draws: ") and "GB" in err
