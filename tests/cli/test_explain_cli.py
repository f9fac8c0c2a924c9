"""--explain through the command (in-process `linecalc.cli.main`): the paragraphs after the table,
wrapped to 78 columns off a terminal; the JSON `explanations` equal to the API's document; refused
with --format csv (exit 2, one line, nothing on stdout); absent from the JSON without --explain."""
from __future__ import annotations

import json

import pytest

import linecalc


@pytest.mark.parametrize("command, station", [("budget", "tuner-in-shack.yaml"), ("safety", "orchard-doublet.yaml"),
                                              ("budget", "shack-reading.yaml")])
def test_the_paragraphs_follow_the_table_wrapped_to_78_columns(command, station, cli, data_path):
    code, out, err = cli(command, data_path(station), "--explain")
    assert code == 0, err
    table, _, words = out.partition("\nIn words:\n")
    assert words and table
    assert max(len(line) for line in words.splitlines()) <= 78  # not a terminal: 78 columns
    code, plain, _ = cli(command, data_path(station))
    assert out.startswith(plain) and out[len(plain):].startswith("\nIn words:\n")  # the table as without it


def test_a_number_and_its_unit_stay_on_one_line(cli, data_path):
    _, out, _ = cli("budget", data_path("tuner-in-shack.yaml"), "--explain")
    words = out.partition("\nIn words:\n")[2]
    for line in words.splitlines():
        assert not line.split() or line.split()[0] not in ("W", "dB", "V", "m", "%")


@pytest.mark.parametrize("command, args", [("budget", ()), ("safety", ()), ("compare", ("--tuner-positions",))])
def test_the_json_explanations_are_the_apis(command, args, cli, data_path):
    path = data_path("tuner-in-shack.yaml")
    code, out, err = cli(command, path, *args, "--explain", "--format", "json")
    assert code == 0, err
    document = json.loads(out)
    station = linecalc.load_station(path)
    expected = {"budget": lambda: linecalc.solve_budget(station, explain=True),
                "safety": lambda: linecalc.solve_safety(station, explain=True),
                "compare": lambda: linecalc.solve_compare(station, tuner_positions=True, explain=True)}[command]()
    assert document == json.loads(json.dumps(expected.to_dict()))
    assert document["explanations"] and all(set(e) == {"row", "rows", "topic", "text", "figures"}
                                            for e in document["explanations"])


@pytest.mark.parametrize("command, args", [("budget", ()), ("safety", ()), ("compare", ("--tuner-positions",))])
def test_without_explain_there_is_no_explanations_key(command, args, cli, data_path):
    code, out, err = cli(command, data_path("tuner-in-shack.yaml"), *args, "--format", "json")
    assert code == 0, err
    assert "explanations" not in json.loads(out)


@pytest.mark.parametrize("command, args", [("budget", ()), ("compare", ("--tuner-positions",))])
def test_explain_with_csv_is_refused(command, args, cli, data_path):
    code, out, err = cli(command, data_path("tuner-in-shack.yaml"), *args, "--explain", "--format", "csv")
    assert code == 2 and out == ""
    assert err.count("\n") == 1 and err.startswith(f"linecalc {command}: --explain: ")
