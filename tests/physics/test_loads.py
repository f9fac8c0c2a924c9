"""Checks of linecalc.physics.loads: antenna tables (impedance and SWR-only), their PCHIP
interpolation, the span test and the reflection coefficient.

Expected values are worked by hand from the definitions named beside each assertion.
"""
from __future__ import annotations

import numpy as np
import pytest

from linecalc.physics import loads

MHZ = 1e6  # SI prefix mega = 10^6: SI Brochure, 9th ed. (2019), table 7

TABLE_HZ = np.array([3.5, 7.0, 7.3, 14.0, 21.0, 28.0]) * MHZ
# a table with a resonance peak, so that some intervals rise and some fall
TABLE_OHM = np.array([15 - 400j, 60 + 5j, 75 + 40j, 800 + 900j, 120 - 200j, 90 + 150j])


def _between_points(table_hz, per_interval=200):
    """Frequencies strictly inside each interval, (intervals, per_interval)."""
    t = np.linspace(0.0, 1.0, per_interval + 2)[1:-1]
    return table_hz[:-1, None] + (table_hz[1:] - table_hz[:-1])[:, None] * t[None, :]


def test_impedance_table_is_exact_at_its_points():
    table = loads.ImpedanceTable(TABLE_HZ, TABLE_OHM)
    np.testing.assert_allclose(table.impedance_at(TABLE_HZ), TABLE_OHM, rtol=1e-13)


@pytest.mark.parametrize("part", ["real", "imag"])
def test_impedance_table_does_not_overshoot_between_points(part):
    # PCHIP keeps each interval monotone between its end values (Fritsch and Carlson, SIAM J.
    # Numer. Anal. 17 (1980) 238, section 4): every interpolated value lies between the two
    # neighbouring table values and moves in one direction. Allowance: 1e-12 of the values' scale.
    table = loads.ImpedanceTable(TABLE_HZ, TABLE_OHM)
    at_hz = _between_points(TABLE_HZ)
    values = getattr(table.impedance_at(at_hz), part)
    ends = getattr(TABLE_OHM, part)
    slack = 1e-12 * np.max(np.abs(ends))
    low, high = np.minimum(ends[:-1], ends[1:])[:, None], np.maximum(ends[:-1], ends[1:])[:, None]
    assert np.all((values >= low - slack) & (values <= high + slack))
    direction = np.sign(ends[1:] - ends[:-1])[:, None]
    assert np.all(direction * np.diff(values, axis=1) >= -slack)


def test_impedance_table_keeps_a_positive_resistance_positive():
    # a sharp parallel resonance between two low-resistance points: a spline without the
    # monotonicity limit would swing below zero (Fritsch and Carlson 1980, section 1)
    table_hz = np.array([6.9, 7.0, 7.1, 7.2]) * MHZ
    table = loads.ImpedanceTable(table_hz, np.array([4.0, 3.0, 2500.0, 3.0]) + 0j)
    assert np.all(table.impedance_at(np.linspace(6.9, 7.2, 3001) * MHZ).real > 0)


def test_impedance_table_reproduces_a_straight_line():
    # equal secants give every node the secant as slope, so the Hermite cubic is that line
    # (Fritsch and Carlson 1980, section 2); R = 10 + 5 per MHz, X = 100 - 20 per MHz
    def line(f_mhz):
        return (10 + 5 * f_mhz) + 1j * (100 - 20 * f_mhz)

    table_hz = np.array([3.0, 5.0, 9.0, 10.0]) * MHZ
    table = loads.ImpedanceTable(table_hz, line(table_hz / MHZ))
    at_mhz = np.linspace(3.0, 10.0, 71)
    np.testing.assert_allclose(table.impedance_at(at_mhz * MHZ), line(at_mhz), rtol=1e-12, atol=1e-12)


def test_one_point_table_is_constant():
    table = loads.ImpedanceTable(np.array([7.1 * MHZ]), np.array([58 + 12j]))
    np.testing.assert_array_equal(table.impedance_at(np.array([7.1 * MHZ, 7.1 * MHZ])), 58 + 12j)


def test_outside_table_flags_only_beyond_the_span():
    table_hz = np.array([7.0, 7.3]) * MHZ
    at_hz = np.array([6.99 * MHZ, 7.0 * MHZ, 7.0 * MHZ * (1 - 1e-12), 7.15 * MHZ,
                      7.3 * MHZ, 7.3 * MHZ * (1 + 1e-12), 7.31 * MHZ, 0.0])
    expected = np.array([True, False, False, False, False, False, True, True])
    np.testing.assert_array_equal(loads.outside_table(table_hz, at_hz), expected)


def test_swr_table_gives_rho_magnitude():
    # |rho| = (SWR - 1)/(SWR + 1) by hand (Pozar, Microwave Engineering, 4th ed., eq. 2.41):
    # SWR 1 -> 0, 1.5 -> 0.2, 3 -> 0.5, 9 -> 0.8.
    table_hz = np.array([1.84, 3.6, 7.1, 14.2]) * MHZ
    table = loads.SwrTable(table_hz, np.array([1.0, 1.5, 3.0, 9.0]))
    rho_by_hand = np.array([0.0, 0.2, 0.5, 0.8])
    np.testing.assert_allclose(table.rho_magnitude_at(table_hz), rho_by_hand, rtol=1e-15, atol=1e-15)
    between = table.rho_magnitude_at(_between_points(table_hz))
    # monotone data stay monotone between the points (Fritsch and Carlson 1980)
    assert np.all(np.diff(between, axis=1) >= 0)
    assert np.all((between >= rho_by_hand[:-1, None]) & (between <= rho_by_hand[1:, None]))


@pytest.mark.parametrize(("impedance", "expected"), [
    (50.0, 0.0), (150.0, 0.5), (0.0, -1.0), (50j, 1j), (16.0 + 2.0 / 3.0, -0.5),
])
def test_rho_from_impedance(impedance, expected):
    # (Z - 50)/(Z + 50) worked by hand (Pozar, Microwave Engineering, 4th ed., eq. 2.35)
    assert loads.rho_from_impedance(impedance, 50.0) == pytest.approx(expected, abs=1e-15)
