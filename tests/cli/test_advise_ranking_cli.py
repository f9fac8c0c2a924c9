"""advise ranks feeder lengths by the watts at the antenna: its first and last choices re-solved
by `compare --lengths` (the budget's own cascade and full tuner design, one length at a time),
and the small parts of its document (--top, --max-loss, warnings, the radio's power)."""
from __future__ import annotations

import json
from pathlib import Path

import numpy as np
import pytest

# The T tuner of the advisor is the full design's least-loss twin: its loss is never more than
# 1e-3 dB above the full design's and at most 0.05 dB below it
# (tests/physics/test_length_scan.py, test_best_window_matches_every_band_when_resolved_one_length_at_a_time),
# so the watts at the antenna agree to 10^(0.05/10) - 1 = 1.2 %; 1.5 % stated.
WATTS_RTOL = 0.015
SCAN = ("--from", "5 m", "--to", "30 m", "--step", "5 cm", "--top", "20", "--format", "json")


@pytest.fixture(scope="module")
def narrow(data_path):
    return data_path("advise-narrow-tuner.yaml")


def _advise(cli, station, *args):
    code, out, err = cli("advise", station, *SCAN, *args)
    assert code == 0, err
    return json.loads(out)


def _compare_watts(cli, station, lengths_m):
    """Watts at the antenna per row for each length, from compare --lengths."""
    code, out, err = cli("compare", station, "--line", "window line", "--lengths", *[f"{x!r} m" for x in lengths_m], "--format", "json")
    assert code == 0, err
    doc = json.loads(out)
    watts = []
    for length in lengths_m:
        name = next(a for a in doc["alternatives"] if a.endswith(f": {length:g} m"))
        watts.append([next(x["power_antenna_w"] for x in row["alternatives"] if x["name"] == name)
                      for row in doc["rows"]])
    return np.array(watts), [row["label"] for row in doc["rows"]]


@pytest.mark.parametrize("rank", ["sum", "worst"])
def test_first_and_last_choices_agree_with_compare_lengths(rank, cli, narrow):
    doc = _advise(cli, narrow, "--rank", rank)
    windows = doc["windows"]
    assert doc["rank"] == rank and doc["window_count"] == len(windows) >= 3, "the station is built for a choice"
    first, last = windows[0], windows[-1]
    watts, labels = _compare_watts(cli, narrow, [first["best_length_m"], last["best_length_m"]])
    for w, row_watts in zip((first, last), watts):
        np.testing.assert_allclose(w["power_sum_w"], row_watts.sum(), rtol=WATTS_RTOL)
        np.testing.assert_allclose(w["worst_row_power_w"], row_watts.min(), rtol=WATTS_RTOL)
        assert w["worst_row"] == labels[int(np.argmin(row_watts))]
    score = watts.sum(axis=1) if rank == "sum" else watts.min(axis=1)
    assert score[0] > score[1]  # the same order


def test_top_cuts_both_lists_and_window_count_counts_all(cli, narrow):
    full = _advise(cli, narrow)
    code, out, err = cli("advise", narrow, *SCAN[:-4], "--top", "2", "--format", "json")
    cut = json.loads(out)
    assert len(cut["windows"]) == len(cut["windows_by_voltage"]) == 2
    assert cut["window_count"] == full["window_count"] > 2
    assert cut["windows"] == full["windows"][:2]


def test_matchable_fraction_takes_max_loss_into_account(cli, narrow):
    full = _advise(cli, narrow)
    limited = _advise(cli, narrow, "--max-loss", "0.45")
    assert limited["max_loss_db"] == 0.45 and full["max_loss_db"] is None
    assert limited["matchable_fraction"] < full["matchable_fraction"]
    # the share of the scanned lengths inside the windows: count / (count of lengths)
    step = 0.05
    inside = sum(round((w["end_m"] - w["start_m"]) / step) + 1 for w in limited["windows"])
    assert limited["window_count"] == len(limited["windows"])
    assert limited["matchable_fraction"] == pytest.approx(inside / limited["length_m"]["count"])


def test_document_states_the_radio_power_and_carries_warnings(cli, narrow, write_file):
    doc = _advise(cli, narrow)
    assert (doc["radio_power_w"], doc["radio_holds"]) == (100.0, "forward")
    assert doc["warnings"] == []
    assert [row["label"] for row in doc["rows"]] == ["80m", "40m", "20m", "15m", "10m"]
    # A 75-ohm class jumper before the tuner makes the radio see up to 1.5:1 (a 50-ohm load on a
    # 75-ohm line), and a reflected-power limit above 1.1:1 cuts its power: said on stderr and
    # in the document, and the watts still agree with compare --lengths (the radio's mismatch
    # and its limit inside the scan).
    text = Path(narrow).read_text()
    text = text.replace("radio: {power: 100 W, impedance: 50 ohm}",
                        "radio: {power: 100 W, impedance: 50 ohm, foldback_swr: 1.1}")
    text = text.replace("feed:\n", "feed:\n  - line: {label: jumper, cable: rg-6, length: 3 m}\n")
    folded = write_file("folded.yaml", text)
    code, out, err = cli("advise", folded, *SCAN)
    assert code == 0, err
    limited = json.loads(out)
    assert any("reflected-power limit above 1.1:1" in w for w in limited["warnings"])
    assert "warning: the radio's power is cut by its reflected-power limit" in err
    best = limited["windows"][0]
    code, out, err = cli("compare", folded, "--line", "window line", "--lengths", f"{best['best_length_m']!r} m",
                         "--format", "json")
    assert code == 0, err
    compared = json.loads(out)
    name = compared["alternatives"][-1]
    watts = [next(x["power_antenna_w"] for x in row["alternatives"] if x["name"] == name) for row in compared["rows"]]
    assert best["power_sum_w"] == pytest.approx(sum(watts), rel=WATTS_RTOL)
    assert best["power_sum_w"] < doc["windows"][0]["power_sum_w"] * 0.95  # the limit costs watts


@pytest.mark.parametrize("rank", ["sum", "worst"])
def test_best_lengths_start_with_the_best_window_and_stand_apart(rank, cli, narrow):
    doc = _advise(cli, narrow, "--rank", rank)
    best = doc["best_lengths"]
    key = "power_sum_w" if rank == "sum" else "worst_row_power_w"
    assert best[0]["length_m"] == doc["windows"][0]["best_length_m"]
    assert best[0][key] == doc["windows"][0][key]
    assert [b[key] for b in best] == sorted((b[key] for b in best), reverse=True)
    lengths = np.array([b["length_m"] for b in best])
    assert np.all(np.abs(lengths[:, None] - lengths[None, :]) + np.eye(len(best)) >= 1.0)  # PEAK_SEPARATION_M
    assert len(best) <= 20  # --top
