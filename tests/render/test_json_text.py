"""Checks of linecalc.render.json_text: a result document as JSON text.

JSON has no infinity and no NaN (RFC 8259, section 6): docs/json.md promises ``null`` wherever
a value is infinite or undefined and never `NaN` or `Infinity`; every result's ``to_dict()``
goes through `to_json` unchanged and comes back equal from ``json.loads``; and the budget
document carries the fixed contract of docs/json.md (budget, Fixed contract).
"""
from __future__ import annotations

import json
import math

import pytest

import linecalc
from linecalc.render.json_text import to_json

CONTRACT = {"station", "reference_impedance_ohm", "radio_power_w", "rows", "warnings"}
ROW_CONTRACT = {"label", "frequency_hz", "swr_antenna", "swr_radio", "z_antenna_ohm", "z_radio_ohm", "matched_loss_db",
                "mismatch_loss_db", "total_loss_db", "power_radio_w", "power_antenna_w", "elements"}
ELEMENT_CONTRACT = {"kind", "label", "loss_db", "dissipated_w"}


def numbers(document):
    """Every number in a JSON document."""
    if isinstance(document, dict):
        return [n for value in document.values() for n in numbers(value)]
    if isinstance(document, list):
        return [n for value in document for n in numbers(value)]
    return [document] if isinstance(document, (int, float)) and not isinstance(document, bool) else []


@pytest.fixture(scope="module")
def documents(plain_result, swr_only_result, tuner_result, comparison, feedpoint_result, data_path):
    advice = linecalc.solve_advice(linecalc.load_station(data_path("orchard-doublet.yaml")), length_from_m=10,
                                   length_to_m=14, step_m=0.5)
    return {"budget": plain_result.to_dict(), "swr only": swr_only_result.to_dict(), "tuner": tuner_result.to_dict(),
            "compare": comparison.to_dict(), "feedpoint": feedpoint_result.to_dict(),
            "advice": advice.to_dict(3), "cables": linecalc.list_cables().to_dict()}


@pytest.mark.parametrize("kind", ["budget", "swr only", "tuner", "compare", "feedpoint", "advice", "cables"])
def test_every_document_round_trips_through_json(documents, kind):
    document = documents[kind]
    text = to_json(document)
    assert json.loads(text) == document
    assert text.endswith("}\n") or text.endswith("]\n")  # one document, then a line break
    assert "NaN" not in text and "Infinity" not in text
    assert all(math.isfinite(n) for n in numbers(json.loads(text)))


def test_an_infinite_value_is_null(plain_result):
    # the second row is a dead short: infinite SWR at the antenna and infinite total loss
    row = json.loads(to_json(plain_result.to_dict()))["rows"][1]
    assert row["swr_antenna"] is None and row["total_loss_db"] is None and row["mismatch_loss_db"] is None
    assert row["power_antenna_w"] == 0.0
    assert json.loads(to_json(plain_result.to_dict()))["rows"][0]["swr_antenna"] >= 1.0  # the matched row: a number


def test_a_missing_impedance_is_null(swr_only_result):
    for row in json.loads(to_json(swr_only_result.to_dict()))["rows"]:
        assert row["z_antenna_ohm"] is None and row["z_radio_ohm"] is None
        least, most = row["total_loss_db_range"]
        assert least <= row["total_loss_db"] <= most


@pytest.mark.parametrize("bad", [math.nan, math.inf, -math.inf])
def test_to_json_refuses_a_number_json_cannot_hold(bad):
    with pytest.raises(ValueError):
        to_json({"rows": [{"total_loss_db": bad}]})


@pytest.mark.parametrize("kind", ["budget", "swr only", "tuner"])
def test_the_budget_document_carries_the_fixed_contract(documents, kind):
    document = json.loads(to_json(documents[kind]))
    assert CONTRACT <= set(document)
    assert isinstance(document["station"], str) and isinstance(document["warnings"], list)
    assert document["reference_impedance_ohm"] == 50.0 and document["radio_power_w"] == 100.0
    assert document["rows"]
    for row in document["rows"]:
        assert ROW_CONTRACT <= set(row)
        for key in ("z_antenna_ohm", "z_radio_ohm"):  # an [R, X] pair, or null
            assert row[key] is None or (isinstance(row[key], list) and len(row[key]) == 2)
        assert row["elements"]
        for element in row["elements"]:
            assert ELEMENT_CONTRACT <= set(element)
            assert isinstance(element["kind"], str) and isinstance(element["label"], str)


def test_the_tuner_document_names_its_warning(tuner_result):
    # the tuner that cannot match on 3.6 MHz says so in the warnings (README, Tuners)
    document = json.loads(to_json(tuner_result.to_dict()))
    assert any("cannot match on 3.6 MHz" in warning for warning in document["warnings"])
    matched = [next(e for e in row["elements"] if e["kind"] == "tuner")["matched"] for row in document["rows"]]
    assert matched == [False, True, True]
