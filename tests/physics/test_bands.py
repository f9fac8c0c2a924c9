"""Checks of linecalc.physics.bands: the amateur bands and their edges per ITU region.

Expected values are worked by hand from the definitions named beside each assertion.
"""
from __future__ import annotations

import pytest

from linecalc.physics import bands

MHZ = 1e6  # SI prefix mega = 10^6: SI Brochure, 9th ed. (2019), table 7


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
