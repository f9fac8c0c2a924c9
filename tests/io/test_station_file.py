"""Station loading: unit invariance, inline cables, SWR-only antennas, rows."""
from __future__ import annotations

import numpy as np
import pytest

from linecalc.studies.budget import solve_budget
from linecalc.errors import StationError
from linecalc.io.station_file import parse_station_text

METRES = """\
name: Unit test
frequencies: [7.1 MHz, 14.2 MHz]
radio: {power: 100 W, impedance: 50 ohm}
antenna:
  impedance: {7.1 MHz: 58+j12, 14.2 MHz: 180-j220}
feed:
  - line:
      length: 30.48 m
      cable: {impedance: 50 ohm, velocity_factor: 0.66,
              loss: {1 MHz: 0.525 dB/100m, 10 MHz: 1.804 dB/100m, 100 MHz: 6.562 dB/100m}}
  - line: {length: 12 m, cable: {geometry: two-wire, wire_diameter: 2.05 mm, spacing: 152 mm}}
"""

# The same station in feet, kHz, kilowatts and dB per 100 ft (1 ft = 0.3048 m exactly, NIST SP 811,
# appendix B): the answers must not move.
FEET = (METRES.replace("30.48 m", "100 ft").replace("7.1 MHz", "7100 kHz").replace("100 W", "0.1 kW")
        .replace("0.525 dB/100m", "0.16002 dB/100ft").replace("1.804 dB/100m", "0.5498592 dB/100 ft")
        .replace("6.562 dB/100m", "0.02000098 dB/ft").replace("12 m", "472.4409448818898 in")
        .replace("2.05 mm", "0.205 cm").replace("152 mm", "0.152 m"))


def test_feet_and_metres_give_the_same_answer():
    a = solve_budget(parse_station_text(METRES))
    b = solve_budget(parse_station_text(FEET))
    np.testing.assert_allclose(b.power_antenna_w, a.power_antenna_w, rtol=1e-6)
    np.testing.assert_allclose(b.swr_radio, a.swr_radio, rtol=1e-6)
    np.testing.assert_allclose(b.total_loss_db, a.total_loss_db, rtol=1e-6)


def test_swr_only_antenna_reports_phase_average_and_range():
    text = METRES.replace("impedance: {7.1 MHz: 58+j12, 14.2 MHz: 180-j220}", "swr: {7.1 MHz: 2.5, 14.2 MHz: 4}")
    result = solve_budget(parse_station_text(text))
    assert result.z_antenna_ohm is None and result.z_radio_ohm is None
    low, high = result.total_loss_db_range.T
    assert np.all(low <= result.total_loss_db) and np.all(result.total_loss_db <= high)


def test_single_point_table_only_answers_at_its_frequency():
    text = METRES.replace("frequencies: [7.1 MHz, 14.2 MHz]", "frequencies: [7.1 MHz]").replace(
        "{7.1 MHz: 58+j12, 14.2 MHz: 180-j220}", "{7.1 MHz: 58+j12}")
    result = solve_budget(parse_station_text(text))
    assert result.z_antenna_ohm[0] == pytest.approx(58 + 12j)
    with pytest.raises(StationError, match="outside the antenna table"):
        parse_station_text(text.replace("frequencies: [7.1 MHz]", "frequencies: [7.2 MHz]"))


def test_bands_and_frequencies_both_give_rows():
    text = METRES.replace("frequencies: [7.1 MHz, 14.2 MHz]", "region: 2\nbands: [40m]\nfrequencies: [14.2 MHz]").replace(
        "7.1 MHz: 58+j12", "7.0 MHz: 50-j30, 7.3 MHz: 70+j30")
    station = parse_station_text(text)
    assert station.labels == ("40m", "14.2 MHz")
    # ITU Radio Regulations Article 5 (from memory): 40 m in Region 2 is 7.0-7.3 MHz, centre 7.15 MHz
    assert station.frequency_hz[0] == pytest.approx(7.15e6)


@pytest.mark.parametrize("frequency", ["0 Hz", "-7 MHz", "0 MHz"])
def test_frequency_zero_or_below_is_refused(frequency):
    text = f"""
name: zero
frequencies: [{frequency}]
radio: {{power: 100 W}}
antenna: {{impedance: {{7 MHz: 50}}}}
feed: []
"""
    with pytest.raises(StationError, match="greater than zero"):
        parse_station_text(text, "zero.yaml")


def test_antenna_table_frequency_zero_is_refused():
    text = """
name: zero
frequencies: [7 MHz]
radio: {power: 100 W}
antenna: {impedance: {0 MHz: 50, 7 MHz: 50}}
feed: []
"""
    with pytest.raises(StationError, match="greater than zero"):
        parse_station_text(text, "zero.yaml")
