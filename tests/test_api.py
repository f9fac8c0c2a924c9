"""The public API (``import linecalc``): every study's ``to_dict()`` is the JSON document that
the command prints for the same station (README, Python use), `load_station` takes a path or
the YAML text itself, and what it raises is linecalc's own error classes, a station that cannot
be solved as a `StationError` naming file, line and key path as the command prints them.

The command runs in-process (``linecalc.cli.main``); the JSON of both sides is compared whole.
"""
from __future__ import annotations

import json
import re

import pytest

import linecalc


def command_json(cli, *args):
    code, out, err = cli(*args, "--format", "json")
    assert code == 0, err
    return json.loads(out)



# --- every study equals its command ------------------------------------------------------------

def test_solve_budget_is_the_budget_command(data_station, cli):
    result = linecalc.solve_budget(linecalc.load_station(data_station))
    assert isinstance(result, linecalc.BudgetResult)
    assert result.to_dict() == command_json(cli, "budget", data_station)


def test_solve_budget_with_sweep_points_is_budget_sweep(data_path, cli):
    path = data_path("hilltop-dipole.yaml")
    result = linecalc.solve_budget(linecalc.load_station(path), sweep_points=11)
    assert result.to_dict() == command_json(cli, "budget", path, "--sweep", "11")


def test_solve_safety_is_the_safety_command(data_station, cli):
    result = linecalc.solve_safety(linecalc.load_station(data_station))
    assert result.to_dict() == command_json(cli, "safety", data_station)


@pytest.mark.parametrize("name, options, arguments", [
    ("orchard-doublet.yaml", [], {}),  # the file's compare: key alone
    ("doublet-wall-coax.yaml", [], {}),
    ("hilltop-dipole.yaml", ["--cable", "rg-58", "--cable", "window-line-450"], {"cables": ["rg-58", "window-line-450"]}),
    ("tuner-in-shack.yaml", ["--tuner-positions"], {"tuner_positions": True}),
    ("hilltop-dipole.yaml", ["--lengths", "20 m", "98 ft"], {"lengths_m": (20.0, 98 * 0.3048)}),  # NIST SP 811: ft
    ("orchard-doublet.yaml", ["--cable", "rg-58"], {"cables": ["rg-58"]}),  # added to the compare: key
], ids=["compare key", "line study", "cables", "tuner positions", "lengths", "key and option"])
def test_solve_compare_is_the_compare_command(name, options, arguments, data_path, cli):
    path = data_path(name)
    comparison = linecalc.solve_compare(linecalc.load_station(path), **arguments)
    assert isinstance(comparison, linecalc.Comparison)
    assert comparison.to_dict() == command_json(cli, "compare", path, *options)


def test_solve_feedpoint_is_the_feedpoint_command(data_path, cli):
    path = data_path("shack-sweep-dipole.yaml")
    result = linecalc.solve_feedpoint(linecalc.load_station(path))
    assert isinstance(result, linecalc.FeedpointResult)
    assert result.to_dict() == command_json(cli, "feedpoint", path)


def test_solve_advice_is_the_advise_command(data_path, cli):
    path = data_path("orchard-doublet.yaml")
    result = linecalc.solve_advice(linecalc.load_station(path), length_from_m=10.0, length_to_m=14.0, step_m=0.5)
    assert isinstance(result, linecalc.AdviceResult)
    assert result.to_dict(3) == command_json(cli, "advise", path, "--from", "10 m", "--to", "14 m", "--step", "50 cm",
                                             "--top", "3")


def test_list_cables_is_the_cables_command(cli):
    assert linecalc.list_cables().to_dict() == command_json(cli, "cables")


# --- load_station ------------------------------------------------------------------------------

def test_load_station_takes_a_path_or_the_yaml_text(data_path):
    path = data_path("orchard-doublet.yaml")
    from_path, from_str = linecalc.load_station(path), linecalc.load_station(str(path))
    from_text = linecalc.load_station(path.read_text(encoding="utf-8"))  # a str holding a line break
    for station in (from_path, from_str, from_text):
        assert isinstance(station, linecalc.Station)
    assert from_path.source_file == from_str.source_file == str(path)
    assert from_text.source_file == "<station>"
    assert from_text.name == from_path.name and from_text.labels == from_path.labels
    assert from_text.feed == from_path.feed and from_text.compare == from_path.compare
    assert linecalc.solve_budget(from_text).to_dict() == linecalc.solve_budget(from_path).to_dict()


def test_load_station_errors_name_the_file_and_line(tmp_path):
    with pytest.raises(linecalc.StationError, match=r"^<station>:3: .*\(at radio\.power\)$"):
        linecalc.load_station("name: x\nfrequencies: [7 MHz]\nradio: {power: 100 m}\n"
                              "antenna: {impedance: {7 MHz: 50}}\nfeed: []\n")
    missing = tmp_path / "missing.yaml"
    with pytest.raises(linecalc.StationError, match=re.escape(str(missing))):
        linecalc.load_station(missing)


# --- a station that loads but cannot be solved -------------------------------------------------

REACTANCE = """\
name: Pure reactance
radio: {power: 100 W}
frequencies: [7.1 MHz]
antenna:
  impedance: {7.1 MHz: 0+j50}
feed:
  - tuner: {network: L}
"""


@pytest.mark.parametrize("text, words", [
    # no network delivers power into a pure reactance, and no lossless path does (Pozar,
    # Microwave Engineering, 4th ed., section 2.3: |rho| = 1 reflects everything)
    (REACTANCE, "nothing to match"),
    (REACTANCE.replace("feed:\n  - tuner: {network: L}\n", "feed: []\n"), "accepts no net power"),
], ids=["tuner", "lossless path"])
def test_an_unsolvable_budget_raises_a_station_error_at_the_antenna(text, words, write_file, line_of):
    path = write_file("station.yaml", text)
    with pytest.raises(linecalc.StationError) as info:
        linecalc.solve_budget(linecalc.load_station(path))
    error = info.value
    assert isinstance(error, linecalc.InputError) and isinstance(error, linecalc.LinecalcError)
    assert re.fullmatch(rf"{re.escape(str(path))}:{line_of(text, 'antenna:')}: .*{words}.* \(at antenna\)", str(error))
    assert (error.file, error.line, error.path) == (str(path), line_of(text, "antenna:"), "antenna")


def test_feedpoint_of_an_antenna_measured_at_the_feedpoint_is_a_station_error(data_path, line_of):
    path = data_path("hilltop-dipole.yaml")
    with pytest.raises(linecalc.StationError) as info:
        linecalc.solve_feedpoint(linecalc.load_station(path))
    assert str(info.value).startswith(f"{path}:{line_of(path.read_text(), 'antenna:')}: feedpoint needs")
    assert str(info.value).endswith("(at antenna)")


def test_advice_without_a_tuner_is_a_station_error_at_the_feed(data_path, line_of):
    path = data_path("hilltop-dipole.yaml")
    with pytest.raises(linecalc.StationError) as info:
        linecalc.solve_advice(linecalc.load_station(path))
    assert str(info.value).startswith(f"{path}:{line_of(path.read_text(), 'feed:')}: ")
    assert "tuner" in str(info.value) and str(info.value).endswith("(at feed)")


def test_a_compare_key_naming_no_line_is_a_station_error_at_that_key(data_path, write_file, line_of):
    text = data_path("hilltop-dipole.yaml").read_text() + "compare: {main_line: attic run, tuner_positions: true}\n"
    path = write_file("station.yaml", text)
    with pytest.raises(linecalc.StationError) as info:
        linecalc.solve_compare(linecalc.load_station(path))
    assert str(info.value).startswith(f"{path}:{line_of(text, 'compare:')}: ")
    assert "attic run" in str(info.value) and str(info.value).endswith("(at compare)")


def test_nothing_to_compare_without_a_compare_key_names_the_feed(data_path, line_of):
    path = data_path("hilltop-dipole.yaml")
    with pytest.raises(linecalc.StationError) as info:
        linecalc.solve_compare(linecalc.load_station(path))
    assert "nothing to compare" in str(info.value)
    assert str(info.value).startswith(f"{path}:{line_of(path.read_text(), 'feed:')}: ")


@pytest.mark.parametrize("arguments, words", [
    ({"cables": ["rg-2133"]}, "did you mean rg-213"),
    ({"lengths_m": (1.0, 0.0)}, "greater than zero"),
])
def test_bad_arguments_to_solve_compare_are_input_errors(arguments, words, data_path):
    with pytest.raises(linecalc.InputError, match=words) as info:
        linecalc.solve_compare(linecalc.load_station(data_path("hilltop-dipole.yaml")), **arguments)
    assert isinstance(info.value, linecalc.LinecalcError) and not isinstance(info.value, linecalc.StationError)


def test_the_error_classes_nest():
    assert issubclass(linecalc.StationError, linecalc.InputError)
    assert issubclass(linecalc.InputError, linecalc.LinecalcError)
    assert issubclass(linecalc.LinecalcError, Exception)
    for name in linecalc.__all__:
        assert hasattr(linecalc, name), name
