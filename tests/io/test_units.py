"""Checks of the edges of the physics: unit parsing, antenna-load tables, band edges.

Expected values are worked by hand from the definitions named beside each assertion.
"""
from __future__ import annotations

import numpy as np
import pytest

from linecalc.physics import bands
from linecalc.physics import loads
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


# --- loads -----------------------------------------------------------------------------------

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


# --- bands -----------------------------------------------------------------------------------

@pytest.mark.parametrize("name", bands.band_names())
@pytest.mark.parametrize("region", bands.REGIONS)
def test_band_centre_lies_inside_its_edges(name, region):
    try:
        band = bands.band(name, region)
    except bands.BandError:
        assert (name, region) in {("1.25m", 1), ("1.25m", 3)}  # only Region 2 (ITU RR Art. 5, from memory)
        return
    assert band.low_hz < band.centre_hz < band.high_hz


@pytest.mark.parametrize(("region", "low_mhz", "high_mhz"), [
    # ITU Radio Regulations, Article 5, amateur allocation at 7 MHz (from memory):
    # Regions 1 and 3 7.0-7.2 MHz, Region 2 7.0-7.3 MHz.
    (1, 7.0, 7.2), (2, 7.0, 7.3), (3, 7.0, 7.2),
])
def test_40m_edges_per_region(region, low_mhz, high_mhz):
    band = bands.band("40m", region)
    assert band.low_hz == pytest.approx(low_mhz * MHZ, rel=1e-15)
    assert band.high_hz == pytest.approx(high_mhz * MHZ, rel=1e-15)
    assert band.centre_hz == pytest.approx((low_mhz + high_mhz) / 2 * MHZ, rel=1e-15)


@pytest.mark.parametrize("spelling", ["40m", "40 m", "40M"])
def test_band_name_spellings(spelling):
    assert bands.band(spelling, 2) == bands.band("40m", 2)


@pytest.mark.parametrize(("name", "region"), [("41m", 2), ("", 1), ("40m", 4), ("40m", 0), ("1.25m", 1)])
def test_unknown_band_or_region_is_refused(name, region):
    with pytest.raises(bands.BandError):
        bands.band(name, region)
