"""The voltage (transformer) balun: winding resistance in series, a finite-Q magnetising
inductance across, an ideal transformer; its `loss` is the matched loss at the reference."""
from __future__ import annotations

import math

import numpy as np
import pytest
import scipy.optimize
import skrf

from linecalc import elements
from linecalc.io.station_file import parse_station_text
from linecalc.errors import StationError
from linecalc.studies import budget

ROWS_HZ = np.array([1.85e6, 7.1e6, 28.5e6])
Z_HIGH = 2000 + 1500j


def _skrf_balun_abcd(frequency_hz, winding_ohm, inductance_h, q):
    """scikit-rf's chain of a series resistor and a shunt branch omega L / Q + j omega L (as a
    shorted series resistor and inductor, connected in shunt), 50-ohm ports."""
    media = skrf.media.DefinedGammaZ0(skrf.Frequency.from_f(frequency_hz, unit="hz"), z0=50.0)
    omega = 2 * np.pi * frequency_hz
    branch = media.resistor(omega * inductance_h / q) ** media.inductor(inductance_h) ** media.short()
    return (media.resistor(winding_ohm) ** media.shunt(branch)).a


def _loss_db_into(abcd, z_load):
    """10 log10(Re(V_in I_in*) / Re(Z_L)) with I_out = 1 (Pozar, 4th ed., section 4.4)."""
    v_in = abcd[..., 0, 0] * z_load + abcd[..., 0, 1]
    i_in = abcd[..., 1, 0] * z_load + abcd[..., 1, 1]
    return 10 * np.log10((v_in * np.conj(i_in)).real / np.real(z_load))


@pytest.mark.parametrize("ratio", [1.0, 4.0])
@pytest.mark.parametrize("frequency_hz", list(ROWS_HZ))
def test_voltage_balun_at_a_high_impedance_is_its_scikit_rf_network(ratio, frequency_hz, make_station):
    # Independently: the winding resistance found with brentq on scikit-rf's network so that it
    # loses 0.2 dB between 50-ohm terminations (the ideal transformer turns the output's 50 n
    # into 50 ohm, Pozar, 4th ed., section 4.4), then that network's loss into the load referred
    # to the input, Z / n.
    f = np.array([frequency_hz])
    inductance_h, q = 20e-6, 20.0  # the README defaults

    def excess_db(r):
        return _loss_db_into(_skrf_balun_abcd(f, r, inductance_h, q), 50.0)[0] - 0.2

    winding = scipy.optimize.brentq(excess_db, 0.0, 50.0, xtol=1e-14, rtol=1e-13)
    expected = _loss_db_into(_skrf_balun_abcd(f, winding, inductance_h, q), Z_HIGH / ratio)
    balun = elements.VoltageBalun("v", ratio, 0.2, 50.0)
    result = budget.solve_budget(make_station([balun], f, Z_HIGH, power_w=1500.0))
    # two solutions of the same network to the root finder's tolerance
    np.testing.assert_allclose(result.elements[0].loss_db, expected, rtol=1e-8)
    # between its reference terminations it loses its loss key
    matched = budget.solve_budget(make_station([balun], f, 50.0 * ratio))
    np.testing.assert_allclose(matched.elements[0].loss_db, 0.2, rtol=1e-12)


def test_voltage_balun_heat_worked_by_hand(make_station):
    # 1:1 at 1.85 MHz, 20 uH of Q 20, 0.2 dB: by hand (Pozar, 4th ed., sections 4.4 and 6.1)
    omega = 2 * math.pi * 1.85e6
    z_m = omega * 20e-6 * (1 / 20 + 1j)  # 11.62 + j232.5 ohm
    z_node_ref = 1 / (1 / z_m + 1 / 50)  # the node with the 50-ohm load across it
    # loss ratio 10^0.02 = (R_w + Re Z_n) 50 / |Z_n|^2, so
    winding = 10 ** 0.02 * abs(z_node_ref) ** 2 / 50 - z_node_ref.real
    # by hand: Z_n = 47.34 + j10.05 ohm, |Z_n| = 48.39 ohm: R_w = 1.0471 * 48.39^2 / 50 - 47.34
    assert winding == pytest.approx(1.705, abs=1e-3)
    # into 2000+j1500 at 1500 W net: the node sees Z_n = Z_m || Z_HIGH, the current
    # I = sqrt(P / (R_w + Re Z_n)); the winding takes |I|^2 R_w, the core |I Z_n|^2 Re(1/Z_m)
    z_node = 1 / (1 / z_m + 1 / Z_HIGH)
    current = math.sqrt(1500 / (winding + z_node.real))
    winding_w = current ** 2 * winding
    core_w = abs(current * z_node) ** 2 * (1 / z_m).real
    load_w = abs(current * z_node) ** 2 * (1 / Z_HIGH).real
    assert winding_w + core_w + load_w == pytest.approx(1500, rel=1e-12)
    result = budget.solve_budget(make_station([elements.VoltageBalun("v", 1.0, 0.2, 50.0)], np.array([1.85e6]),
                                              Z_HIGH, power_w=1500.0))
    np.testing.assert_allclose(result.elements[0].dissipated_w, winding_w + core_w, rtol=1e-9)
    # the heat is in the core, where the voltage is (a current balun would be cool here)
    assert core_w > 5 * winding_w  # 565 W against 93 W


STATION = """\
name: balun test
radio: {{power: 100 W, holds: net}}
frequencies: [1.85 MHz, 14.2 MHz]
antenna:
  impedance: {{1.8 MHz: 200+j0, 30 MHz: 200+j0}}
feed:
  - balun: {{ratio: "4:1", type: voltage{extra}}}
"""


def test_voltage_balun_defaults_from_the_station_file():
    station = parse_station_text(STATION.format(extra=""))
    (balun,) = station.feed
    assert isinstance(balun, elements.VoltageBalun)
    # README defaults: 0.2 dB (common practice), 20 uH (common practice), Q 20 (from memory)
    assert (balun.loss_db, balun.inductance_h, balun.core_q) == (0.2, 20e-6, 20.0)
    assert balun.output_balanced and not balun.input_balanced
    result = budget.solve_budget(station)
    np.testing.assert_allclose(result.elements[0].loss_db, 0.2, rtol=1e-12)  # 200 ohm = 4 x 50: matched
    assert result.warnings == ()


def test_voltage_balun_with_too_little_inductance_says_so():
    station = parse_station_text(STATION.format(extra=", inductance: 2 uH, core_q: 10"))
    result = budget.solve_budget(station)
    # at 1.85 MHz, 2 uH of Q 10: Z_m = 2.32 + j23.2 ohm across 50 ohm loses 0.84 dB, more than
    # 0.2 dB; at 14.2 MHz (Z_m = 17.8 + j178 ohm) 0.12 dB, less
    z_m = 2 * math.pi * 1.85e6 * 2e-6 * (1 / 10 + 1j)
    z_n = 1 / (1 / z_m + 1 / 50)
    core_db = 10 * math.log10(z_n.real * 50 / abs(z_n) ** 2)
    assert core_db > 0.2
    np.testing.assert_allclose(result.elements[0].matched_loss_db[0], core_db, rtol=1e-12)
    (warning,) = [w for w in result.warnings if "core alone" in w]
    assert "1.85 MHz" in warning and "14.2 MHz" not in warning


@pytest.mark.parametrize("extra, where, message", [
    (", inductance: 0.0001 uH", "balun.inductance", "magnetising inductance"),
    (", inductance: 20 ohm", "balun.inductance", "H"),
    (", core_q: 0", "balun.core_q", "Q|greater|above"),
    (", length: 1 m", "balun", "length"),
])
def test_voltage_balun_bad_keys_name_their_place(extra, where, message):
    with pytest.raises(StationError, match=message) as caught:
        parse_station_text(STATION.format(extra=extra))
    assert where in str(caught.value)


def test_balun_type_is_current_or_voltage():
    with pytest.raises(StationError, match="current or voltage"):
        parse_station_text(STATION.format(extra="").replace("type: voltage", "type: magnetic"))
