"""Checks of linecalc.render.csv_text: the budget, compare and feedpoint results as CSV.

The text is read back with Python's csv module (RFC 4180 quoting) and every field compared with
the result it was made from. README, Output: one line per row with the fields of the JSON
document and each element's loss and heat; an infinite value is `inf`; a value that does not
exist (the impedances of an SWR-only antenna) is an empty field.
"""
from __future__ import annotations

import csv
import io
import math

import numpy as np

from linecalc.render import csv_text

BUDGET_HEADER = ["label", "frequency_hz", "swr_antenna", "swr_radio", "z_antenna_r_ohm", "z_antenna_x_ohm",
                 "z_radio_r_ohm", "z_radio_x_ohm", "matched_loss_db", "mismatch_loss_db", "total_loss_db",
                 "power_radio_w", "power_antenna_w", "radio_forward_w", "radio_reflected_w", "radio_mismatch_loss_db"]


def read(text):
    """(header, rows) of CSV text, each row a dict by header."""
    rows = list(csv.reader(io.StringIO(text)))
    return rows[0], [dict(zip(rows[0], row, strict=True)) for row in rows[1:]]


def close(field, value):
    """A field printed with 10 significant digits reads back within 5e-10 of ``value``."""
    if math.isinf(value):
        return field == ("inf" if value > 0 else "-inf")
    return math.isclose(float(field), value, rel_tol=5e-10, abs_tol=1e-300)


def test_budget_csv_header_row(plain_result):
    header, _ = read(csv_text.budget_csv(plain_result))
    elements = [f"{e.label}:{field}" for e in plain_result.elements for field in ("loss_db", "dissipated_w")]
    assert header == BUDGET_HEADER + elements
    # a label with a comma is one quoted field (RFC 4180, section 2, rule 6)
    assert "plugs, two:loss_db" in header
    assert '"plugs, two:loss_db"' in csv_text.budget_csv(plain_result).splitlines()[0]


def test_budget_csv_one_line_per_row(plain_result, tuner_result):
    for result in (plain_result, tuner_result):
        text = csv_text.budget_csv(result)
        assert text.endswith("\n") and "\r" not in text
        assert len(text.splitlines()) == 1 + len(result.labels)
        _, rows = read(text)
        assert [row["label"] for row in rows] == list(result.labels)


def test_budget_csv_fields_are_the_result(plain_result):
    r = plain_result
    _, rows = read(csv_text.budget_csv(r))
    for i, row in enumerate(rows):
        for key in ("frequency_hz", "swr_antenna", "swr_radio", "matched_loss_db", "mismatch_loss_db", "total_loss_db",
                    "power_radio_w", "power_antenna_w", "radio_forward_w", "radio_reflected_w",
                    "radio_mismatch_loss_db"):
            assert close(row[key], float(getattr(r, key)[i])), (key, row[key])
        for end in ("antenna", "radio"):
            z = getattr(r, f"z_{end}_ohm")[i]
            assert close(row[f"z_{end}_r_ohm"], z.real) and close(row[f"z_{end}_x_ohm"], z.imag)
        for e in r.elements:
            assert close(row[f"{e.label}:loss_db"], e.loss_db[i]) and close(row[f"{e.label}:dissipated_w"],
                                                                             e.dissipated_w[i])


def test_budget_csv_writes_inf_for_an_infinite_value(plain_result):
    # the dead short of the second row: an infinite SWR and loss (README, Output: inf in the CSV)
    _, rows = read(csv_text.budget_csv(plain_result))
    short = rows[1]
    assert short["swr_antenna"] == "inf" and short["total_loss_db"] == "inf" and short["mismatch_loss_db"] == "inf"
    assert float(short["power_antenna_w"]) == 0.0


def test_budget_csv_leaves_a_field_empty_where_there_is_no_value(swr_only_result):
    # an SWR-only antenna has no impedance at either end (its phase is unknown): empty fields
    text = csv_text.budget_csv(swr_only_result)
    _, rows = read(text)
    for row in rows:
        for key in ("z_antenna_r_ohm", "z_antenna_x_ohm", "z_radio_r_ohm", "z_radio_x_ohm"):
            assert row[key] == "", key
        assert all(row[key] != "" for key in BUDGET_HEADER if not key.startswith("z_"))
    assert "nan" not in text.lower()


def test_compare_csv_one_line_per_row_and_alternative(comparison):
    header, rows = read(csv_text.compare_csv(comparison))
    assert header == ["label", "frequency_hz", "alternative", "power_antenna_w", "total_loss_db", "winner", "margin_db"]
    assert len(rows) == len(comparison.labels) * len(comparison.names)
    for i, label in enumerate(comparison.labels):
        block = rows[i * len(comparison.names):(i + 1) * len(comparison.names)]
        assert [row["label"] for row in block] == [label] * len(comparison.names)
        assert [row["alternative"] for row in block] == list(comparison.names)
        for k, row in enumerate(block):
            assert close(row["power_antenna_w"], comparison.power_antenna_w[k, i])
            assert close(row["total_loss_db"], comparison.total_loss_db[k, i])
            assert close(row["margin_db"], comparison.margin_db[i])
        # one winner per row: the alternative with the most watts at the antenna
        assert [row["winner"] for row in block].count("yes") == 1
        winner = next(row for row in block if row["winner"] == "yes")
        assert float(winner["power_antenna_w"]) == max(float(row["power_antenna_w"]) for row in block)
        assert all(row["winner"] in ("yes", "") for row in block)


def test_feedpoint_csv_one_line_per_point(feedpoint_result):
    header, rows = read(csv_text.feedpoint_csv(feedpoint_result))
    assert header == ["frequency_hz", "r_ohm", "x_ohm", "swr_antenna", "sensitivity", "active"]
    sweep = feedpoint_result.sweep
    assert len(rows) == feedpoint_result.frequency_hz.size == 101
    for i, row in enumerate(rows):
        assert close(row["frequency_hz"], feedpoint_result.frequency_hz[i])
        assert close(row["r_ohm"], sweep.z_antenna_ohm[i].real) and close(row["x_ohm"], sweep.z_antenna_ohm[i].imag)
        assert close(row["swr_antenna"], sweep.swr_antenna[i]) and close(row["sensitivity"], sweep.sensitivity[i])
        assert row["active"] == ("yes" if sweep.active[i] else "")
    np.testing.assert_array_equal([row["active"] for row in rows], [""] * 101)  # the demo's passive dipole
