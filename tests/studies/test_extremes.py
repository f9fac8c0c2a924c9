"""Numerical extremes: very short and very long lines, 100 kHz to 3 GHz, shorts, opens and
|rho| near 1, hundreds of dB of matched loss, high-impedance balanced lines. Results stay finite,
energy balances, and nothing overflows (warnings are errors in this suite, so an overflow in
cosh, exp or a division fails the test)."""
from __future__ import annotations

import itertools

import numpy as np
import pytest

from linecalc.studies.budget import solve_budget
from linecalc.studies.station import BudgetError
from linecalc.physics.cables import two_wire_from_geometry
from linecalc.elements import Line

FREQUENCY_HZ = np.geomspace(100e3, 3e9, 41)
Z_REF = 50.0


def _check(result, dead_short=False):
    heat = sum(e.dissipated_w for e in result.elements)
    for values in (result.power_antenna_w, result.matched_loss_db, heat, result.swr_radio):
        assert np.all(np.isfinite(values))
    if dead_short:
        # a short takes no power: the antenna gets 0 W and the total loss is infinite (null in JSON)
        assert np.all(result.power_antenna_w == 0) and np.all(np.isinf(result.total_loss_db))
    else:
        assert np.all(np.isfinite(result.total_loss_db))
    # energy balance to 1e-9 of the radio's power, the figure the README states (How linecalc computes, Path)
    np.testing.assert_allclose(result.power_antenna_w + heat, result.power_radio_w, rtol=0, atol=1e-9 * 100.0)
    assert np.all(result.power_antenna_w >= 0) and all(np.all(e.dissipated_w >= -1e-9 * 100) for e in result.elements)
    # a passive path: total loss at least zero (rounding aside)
    assert np.all(result.total_loss_db >= -1e-9)


LOADS = {
    "short through a line": 0.0 + 0j,
    "near short": 1e-4 + 0j,
    "rho 0.9999": Z_REF * (1 + 0.9999) / (1 - 0.9999),
    "reactive": 1e-3 + 1e4j,
    "matched": Z_REF + 0j,
    "high": 5000 + 0j,
}


@pytest.mark.parametrize("length_m, cable_id, load", list(itertools.product(
    [1e-3, 1.0, 100.0, 10e3], ["rg-58", "foam-10mm", "open-wire-600"], LOADS)))
def test_lengths_loads_and_frequencies_stay_finite_and_balanced(length_m, cable_id, load, library, make_station):
    cable = library[cable_id]
    short = LOADS[load] == 0
    try:
        result = solve_budget(make_station([Line(cable, length_m)], FREQUENCY_HZ, LOADS[load]))
    except BudgetError:
        # a millimetre of nearly lossless line into a dead short accepts next to no power at the
        # low end: the plain refusal is a right answer there, noise would not be
        assert short and length_m <= 1e-3
        return
    _check(result, dead_short=short)


def test_open_circuit_load_through_a_lossy_line(library, make_station):
    # an open: rho = 1 exactly, written as an impedance far beyond any line's Z0
    cable = library["rg-213"]
    _check(solve_budget(make_station([Line(cable, 30.0)], FREQUENCY_HZ, 1e15 + 0j)))


def test_two_hundred_db_of_matched_loss(library, make_station):
    # 200 dB at 146 MHz: thin coax of the length that its own library figure (dB per 100 m at
    # 146 MHz, independent of the solver) says loses 200 dB
    cable = library["rg-58"]
    f = np.array([146e6])
    per_metre_db = float(cable.matched_loss_db_per_m(f)[0])
    length = 200.0 / per_metre_db
    result = solve_budget(make_station([Line(cable, length)], f, 5 - 40j))
    _check(result)
    assert result.matched_loss_db[0] == pytest.approx(200.0, rel=1e-9)
    assert 200 < result.total_loss_db[0] < 210


def test_thousands_of_db_do_not_overflow(library, make_station):
    # 10 km of thin coax at 3 GHz: thousands of dB; cosh and sinh of ~700 Np would overflow a
    # float, the scaled formulation must not
    cable = library["rg-58"]
    f = np.array([3e9])
    result = solve_budget(make_station([Line(cable, 10e3)], f, 0.001 - 3j))
    assert result.total_loss_db[0] > 5000 and np.isfinite(result.total_loss_db[0])
    # nothing comes back: the radio sees the line's own impedance (about 49 ohm), SWR near 1
    assert result.swr_radio[0] == pytest.approx(1.0, abs=0.05)


def test_600_ohm_line_into_5000_ohm(make_station):
    # a homebrew 600-ohm line (Pozar Table 2.1 geometry: 2.05 mm wire at 152 mm in air) into
    # 5,000 ohm: SWR about 8.3 on the line, the radio end wherever the line puts it
    line = two_wire_from_geometry("ow", "open wire", 2.05e-3, 152e-3)
    result = solve_budget(make_station([Line(line, 25.0)], np.geomspace(1.8e6, 30e6, 21), 5000 + 0j))
    _check(result)
    assert np.all(np.abs(result.swr_antenna - 5000 / 600) < 0.2)


def test_many_short_segments_equal_one_long_line(library, make_station):
    # 200 pieces of 0.5 m against one 100 m line: the cascade must not drift (the chain matrices
    # of a uniform line multiply exactly, Pozar 4th ed., 4.4)
    cable = library["rg-213"]
    f = np.geomspace(1e6, 1e9, 31)
    one = solve_budget(make_station([Line(cable, 100.0)], f, 20 + 30j))
    many = solve_budget(make_station([Line(cable, 0.5)] * 200, f, 20 + 30j))
    np.testing.assert_allclose(many.total_loss_db, one.total_loss_db, rtol=1e-9, atol=1e-9)
