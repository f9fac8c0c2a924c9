"""How the radio drives the path, through the budget: held forward or net power, the
reflected-power limit, energy accounted for and the warnings."""
from __future__ import annotations

import math

import numpy as np
import pytest

from linecalc import elements
from linecalc.physics import matching
from linecalc.physics.loads import SwrTable
from linecalc.studies.budget import solve_budget

F_HZ = np.array([3.6e6, 7.1e6, 14.2e6])


def _path(library):
    """A jumper, a T tuner and 20 m of RG-213 class coax: loss in a tuner and on a mismatched line."""
    parts = matching.TunerParts(10e-12, 500e-12, 0.05e-6, 30e-6)
    return (elements.Line(library["rg-58"], 1.0, "jumper"),
            elements.Tuner("tuner", "T", parts, 50.0),
            elements.Line(library["rg-213"], 20.0, "coax"))


def _energy_residue(result):
    """forward - (reflected + heat in every element + antenna), over forward, per row."""
    heat = sum(e.dissipated_w for e in result.elements)
    return (result.radio_forward_w - result.radio_reflected_w - heat - result.power_antenna_w) / result.radio_forward_w


@pytest.mark.parametrize("holds", ["forward", "net"])
@pytest.mark.parametrize("antenna", ["impedance", "swr only"])
def test_every_watt_is_accounted_for(holds, antenna, library, make_station):
    # Energy conservation: what the radio launches is what comes back plus the heat in every
    # element plus what the antenna takes (Pozar, Microwave Engineering, 4th ed., section 2.3).
    load = (np.array([20 - 30j, 300 + 150j, 45 + 5j]) if antenna == "impedance"
            else SwrTable(F_HZ, np.array([4.0, 1.8, 6.0])))
    feed = (elements.Line(library["rg-213"], 30.0, "coax"),) if antenna == "swr only" else _path(library)[2:]
    station = make_station(feed, F_HZ, load, holds=holds)
    result = solve_budget(station)
    np.testing.assert_allclose(_energy_residue(result), 0.0, atol=1e-9)
    np.testing.assert_allclose(result.power_radio_w, result.radio_forward_w - result.radio_reflected_w, rtol=1e-9)


def test_energy_through_a_tuner_with_foldback(library, make_station):
    station = make_station(_path(library), F_HZ, np.array([20 - 30j, 300 + 150j, 45 + 5j]), holds="forward",
                           foldback_swr=1.5)
    np.testing.assert_allclose(_energy_residue(solve_budget(station)), 0.0, atol=1e-9)


def test_radio_port_mismatch_loss_against_the_closed_form(make_station):
    # An empty feed: the radio sees the antenna. 150 ohm against 50 ohm: rho = 0.5. Pozar,
    # Microwave Engineering, 4th ed., section 2.3: net = forward (1 - |rho|^2) = 75 W of 100 W,
    # mismatch loss 10 log10(1 / (1 - 0.25)) = 1.2494 dB.
    result = solve_budget(make_station((), [7.1e6], 150.0, holds="forward"))
    assert result.radio_forward_w[0] == pytest.approx(100.0, rel=1e-12)
    assert result.radio_reflected_w[0] == pytest.approx(25.0, rel=1e-9)
    assert result.power_antenna_w[0] == pytest.approx(75.0, rel=1e-9)
    assert result.radio_mismatch_loss_db[0] == pytest.approx(10 * math.log10(1 / 0.75), rel=1e-9)
    # holding net power instead: 100 W into the antenna, 133.3 W forward, nothing lost against the setting
    held_net = solve_budget(make_station((), [7.1e6], 150.0, holds="net"))
    assert held_net.power_antenna_w[0] == pytest.approx(100.0, rel=1e-9)
    assert held_net.radio_forward_w[0] == pytest.approx(400 / 3, rel=1e-9)
    assert held_net.radio_mismatch_loss_db[0] == pytest.approx(0.0, abs=1e-9)


def test_swr_only_antenna_holds_forward_at_every_phase(make_station):
    # An empty feed into SWR 3 (|rho| = 0.5) at unknown phase: at every phase the radio sees
    # |rho| = 0.5, so the average is the single-phase figure, 75 W of 100 W (Pozar, section 2.3).
    result = solve_budget(make_station((), [7.1e6], SwrTable(np.array([7.1e6]), np.array([3.0])), holds="forward"))
    assert result.power_antenna_w[0] == pytest.approx(75.0, rel=1e-9)
    assert result.radio_mismatch_loss_db[0] == pytest.approx(10 * math.log10(1 / 0.75), rel=1e-9)


def test_warnings_name_the_rows_above_2_to_1_and_the_foldback(make_station):
    # 150 ohm is 3:1 against 50 ohm; 60 ohm is 1.2:1. Foldback at 2:1 cuts 100 W forward to
    # (100/9) / 0.25 = 44.4 W (worked by hand: |rho_f|^2 = 1/9, |rho|^2 = 0.25).
    result = solve_budget(make_station((), [3.6e6, 7.1e6], np.array([150.0, 60.0]), labels=("80m", "40m"),
                                       holds="forward", foldback_swr=2.0))
    text = "\n".join(result.warnings)
    assert "more than 2:1 on 80m (3.00)" in text and "40m (" not in text
    assert "reflected-power limit above 2:1 on 80m (44.4 W forward)" in text
    assert result.radio_forward_w[0] == pytest.approx(400 / 9, rel=1e-9)
    assert result.power_antenna_w[0] == pytest.approx(100 / 3, rel=1e-9)


def test_json_row_carries_the_radio_port_figures(make_station):
    row = solve_budget(make_station((), [7.1e6], 150.0, holds="forward")).to_dict()["rows"][0]
    assert {"radio_forward_w", "radio_reflected_w", "radio_mismatch_loss_db"} <= row.keys()
    assert row["power_radio_w"] == pytest.approx(75.0, rel=1e-9)
