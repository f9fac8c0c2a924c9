"""Checks of linecalc.io.units: quantities, cable losses and impedances as a station file writes
them. The antenna tables are checked in tests/physics/test_loads.py, the band edges in
tests/physics/test_bands.py.

Expected values are worked by hand from the definitions named beside each assertion.
"""
from __future__ import annotations

import pytest

from linecalc.io import units
from linecalc.io.units import UnitError

FOOT_M = 0.3048  # exactly: NIST SP 811 (2008), appendix B.8 (foot, international)
MHZ = 1e6  # SI prefix mega = 10^6: SI Brochure, 9th ed. (2019), table 7


# --- units.parse_quantity --------------------------------------------------------------------

@pytest.mark.parametrize(("text", "unit", "expected"), [
    ("30 m", "m", 30.0),
    ("98 ft", "m", 98 * FOOT_M),  # 29.8704 m
    ("100ft", "m", 100 * FOOT_M),
    ("7.15 MHz", "Hz", 7.15 * MHZ),
    ("100 W", "W", 100.0),
    ("1.5 kW", "W", 1500.0),  # kilo = 10^3, SI Brochure table 7
    ("50 ohm", "ohm", 50.0),
    ("50 ohms", "ohm", 50.0),
    ("30 m", "ft", 30.0 / FOOT_M),
])
def test_parse_quantity(text, unit, expected):
    # conversion factors are exact decimal ones; only the binary rounding of the product remains
    assert units.parse_quantity(text, unit) == pytest.approx(expected, rel=1e-15)


@pytest.mark.parametrize("value", [30, 30.0, "30", " 30 "])
def test_bare_number_is_refused_without_a_documented_unit(value):
    with pytest.raises(UnitError):
        units.parse_quantity(value, "m")


@pytest.mark.parametrize(("value", "bare_unit", "expected_m"), [
    (30, "m", 30.0), ("30", "m", 30.0), (98, "ft", 98 * FOOT_M), ("98", "ft", 98 * FOOT_M),
])
def test_bare_number_takes_the_documented_unit(value, bare_unit, expected_m):
    assert units.parse_quantity(value, "m", bare_unit=bare_unit) == pytest.approx(expected_m, rel=1e-15)


@pytest.mark.parametrize(("text", "unit"), [
    ("30 m", "Hz"), ("7.15 MHz", "m"), ("100 W", "ohm"), ("50 ohm", "W"), ("3 m m", "m"),
])
def test_wrong_dimension_is_refused(text, unit):
    with pytest.raises(UnitError):
        units.parse_quantity(text, unit)


@pytest.mark.parametrize("value", ["", "abc m", "nan m", "inf m", "1e400 m", None, True, [30, "m"]])
def test_unreadable_quantity_is_refused(value):
    with pytest.raises(UnitError):
        units.parse_quantity(value, "m")


# --- units.parse_loss_db_per_m ---------------------------------------------------------------

@pytest.mark.parametrize(("text", "expected_db_per_m"), [
    ("0.55 dB/100ft", 0.55 / (100 * FOOT_M)),  # 0.55 dB / 30.48 m = 0.018045 dB/m
    ("0.55 dB/100 ft", 0.55 / (100 * FOOT_M)),
    ("0.55 dB / 100 ft", 0.55 / (100 * FOOT_M)),
    ("1.8 dB/100m", 0.018),
    ("0.018 dB/m", 0.018),
    ("2 dB/km", 0.002),
])
def test_parse_loss_db_per_m(text, expected_db_per_m):
    # hand conversion with the exact foot; 1e-14 covers the rounding of one division
    assert units.parse_loss_db_per_m(text) == pytest.approx(expected_db_per_m, rel=1e-14)


@pytest.mark.parametrize("value", ["0.55/100ft", "dB/m", "0.55 dB/0ft", "0.55 dB/100 Hz",
                                   "0.55 dB/-100 ft", "0.55 dB", 0.018, None])
def test_unreadable_loss_is_refused(value):
    with pytest.raises(UnitError):
        units.parse_loss_db_per_m(value)


def test_bare_loss_takes_the_documented_length():
    assert units.parse_loss_db_per_m(0.018, bare_unit="m") == pytest.approx(0.018, rel=1e-15)


# --- units.parse_impedance -------------------------------------------------------------------

@pytest.mark.parametrize(("value", "expected"), [
    ("58+j12", 58 + 12j), ("58-j12", 58 - 12j), ("58+12j", 58 + 12j), ("58-12j", 58 - 12j),
    ("58 - j 12 ohms", 58 - 12j), ("58+j12 ohm", 58 + 12j), ("0.5+j1e3", 0.5 + 1000j),
    ([58, 12], 58 + 12j), ([58.0, -12.5], 58 - 12.5j), (50, 50 + 0j), (50.0, 50 + 0j),
    ("50", 50 + 0j), ("50 ohm", 50 + 0j),
])
def test_parse_impedance(value, expected):
    assert units.parse_impedance(value) == expected


@pytest.mark.parametrize("value", [
    "garbage", "", "ohm", "58+j", "58+12", "58+i12", "58*j12", "58+j12+3", "nan", "1e400",
    [58], [58, 12, 3], [True, 12], ["58", "12"], None, True,
])
def test_garbage_impedance_is_refused(value):
    with pytest.raises(UnitError):
        units.parse_impedance(value)
