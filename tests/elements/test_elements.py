"""Station elements in the path: meter, balun, connector, lumped parts, stub, choke, tuner.

Expected values come from methods independent of linecalc's elements and cascade: scikit-rf
networks (its own lumped parts, attenuator and line media, compared through S-parameters),
closed forms written out here (Pozar, Microwave Engineering, 4th ed.; the ARRL Antenna Book's
transmission-line chapter) and circuit arithmetic by hand. The bad-input and JSON checks through
the command line are in tests/cli/test_elements_cli.py.
"""
from __future__ import annotations

import re
from dataclasses import dataclass

import numpy as np
import pytest
import skrf
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from linecalc.studies import budget
from linecalc.physics import cables
from linecalc import elements
from linecalc.physics import loads
from linecalc.physics import matching as tuner
from linecalc.physics import small_parts
from linecalc.io.station_file import parse_station_text

DB_PER_NEPER = 20 * np.log10(np.e)
SPEED_OF_LIGHT = 299_792_458.0  # m/s, exact (SI definition)
Z_REF_OHM = 50.0
HF_HZ = np.array([1.84e6, 3.6e6, 7.1e6, 14.2e6, 21.2e6, 28.5e6])
LOADS_OHM = [50 + 0j, 12 - 30j, 300 + 400j, 5000 + 0j, 75 + 0j, 20 + 200j]

# Invented cable constants, inputs for the checks (not claims about any product): a 50-ohm coax
# with conductor and dielectric loss (1.1 dB/100 m at 3.6 MHz, 2.3 dB/100 m at 14.2 MHz) whose Z0
# is complex (50.6 - j0.6 ohm at 3.6 MHz), and a lossless line.
COAX = cables.Cable(id="test-coax", description="invented 50-ohm coax", kind="coax",
                    z0_nominal_ohm=50.0, velocity_factor=0.66, k_conductor=7.0e-7, k_dielectric=2.0e-12)
LOSSLESS = cables.Cable(id="test-lossless", description="ideal line", kind="coax",
                        z0_nominal_ohm=50.0, velocity_factor=0.66)


@dataclass(frozen=True)
class DistortionlessCable(cables.Cable):
    """A line on Heaviside's condition R'/L' = G'/C': Z0 = sqrt(L'/C') is exactly real at every
    loss, alpha = sqrt(R'G'), beta = omega sqrt(L'C') (Pozar, Microwave Engineering, 4th ed.,
    section 2.7, the distortionless line). Written out here, so it is independent of the cable
    model; ``alpha_np_per_m`` sets the loss."""

    alpha_np_per_m: float = 0.0

    def constants(self, frequency_hz):
        omega = 2 * np.pi * np.asarray(frequency_hz, dtype=float)
        beta = omega / (self.velocity_factor * SPEED_OF_LIGHT)
        return (np.full(omega.shape, complex(self.z0_nominal_ohm)),
                self.alpha_np_per_m + 1j * beta)


def rho_of(z_ohm, z0_ohm):
    """(Z - Z0)/(Z + Z0): Pozar, 4th ed., section 2.3."""
    return (z_ohm - z0_ohm) / (z_ohm + z0_ohm)


def skrf_frequency(frequency_hz):
    return skrf.Frequency.from_f(np.atleast_1d(frequency_hz), unit="hz")


def s_from_abcd(abcd, z0_ports=Z_REF_OHM):
    """scikit-rf's ABCD to S conversion (Pozar, 4th ed., Table 4.2) at real port impedances."""
    return skrf.network.a2s(np.asarray(abcd), np.asarray(z0_ports, dtype=float))


def input_impedance_from_s(s_two_port, z_load_ohm, z0_ports_ohm=(Z_REF_OHM, Z_REF_OHM)):
    """Input impedance of a two-port given by S at real port impedances with a load on port 2:
    rho_in = S11 + S12 S21 rho_L / (1 - S22 rho_L) (Pozar, 4th ed., section 12.1), then
    Z = Z0 (1 + rho)/(1 - rho) (section 2.3). (scikit-rf's own Z and renormalisation routines
    regularise their matrices at the 1e-8 level, too coarse for the comparisons here.)"""
    s = np.asarray(s_two_port)
    z0_in, z0_out = z0_ports_ohm
    rho_load = rho_of(z_load_ohm, z0_out)
    rho_in = s[:, 0, 0] + s[:, 0, 1] * s[:, 1, 0] * rho_load / (1 - s[:, 1, 1] * rho_load)
    return z0_in * (1 + rho_in) / (1 - rho_in)


def energy_balanced(result, rtol=1e-9):
    heat = sum(e.dissipated_w for e in result.elements)
    np.testing.assert_allclose(result.power_antenna_w + heat, result.power_radio_w, rtol=rtol)


# --- meter ---------------------------------------------------------------------------------

METER_PATHS = {
    "meter only": lambda: [elements.Meter("m", 50.0)],
    "meter, coax, meter": lambda: [elements.Meter("shack", 50.0), elements.Line(COAX, 30.0),
                                   elements.Meter("feedpoint", 50.0)],
    "75-ohm meter behind a balun": lambda: [elements.Transformer("b", 1.5, 0.2, 50.0),
                                            elements.Meter("m75", 75.0), elements.Line(COAX, 10.0)],
}


@pytest.mark.parametrize("z_antenna", LOADS_OHM, ids=str)
@pytest.mark.parametrize("path", list(METER_PATHS))
def test_meter_forward_minus_reflected_is_the_net_power(path, z_antenna, make_station):
    # A directional coupler's forward and reflected power differ by the net power Re(V I*) at its
    # port, whatever the load (Pozar, 4th ed., section 2.3: P = |V+|^2 (1 - |rho|^2) / Z0 with RMS
    # phasors and a real Z0); rounding only, 1e-9 of the radio power.
    feed = METER_PATHS[path]()
    result = budget.solve_budget(make_station(feed, HF_HZ, z_antenna))
    for k, element in enumerate(result.elements):
        if element.kind != "meter":
            continue
        readings = element.readings
        net_at_port = result.solution.power_w[k]
        np.testing.assert_allclose(readings["forward_w"] - readings["reflected_w"], net_at_port,
                                   rtol=0, atol=1e-9 * 100.0)
        np.testing.assert_allclose(readings["net_w"], net_at_port, rtol=0, atol=1e-9 * 100.0)
        # and its SWR is that of |rho| = sqrt(reflected / forward) (Pozar, 4th ed., section 2.3)
        rho = np.sqrt(readings["reflected_w"] / readings["forward_w"])
        np.testing.assert_allclose(readings["swr"], (1 + rho) / (1 - rho), rtol=1e-9)
        np.testing.assert_allclose(element.dissipated_w, 0.0, atol=1e-9 * 100.0)  # a meter is lossless


def test_meter_identity_with_an_swr_only_antenna(make_station):
    # An unknown phase averages the readings; forward - reflected is linear, so the identity holds
    # for the averages too.
    f = np.array([3.6e6, 14.2e6])
    feed = (elements.Meter("shack", 50.0), elements.Line(COAX, 30.0), elements.Meter("top", 50.0))
    result = budget.solve_budget(make_station(feed, f, loads.SwrTable(f, np.array([3.0, 6.0])), labels=("80m", "20m")))
    for k in (0, 2):
        readings = result.elements[k].readings
        np.testing.assert_allclose(readings["forward_w"] - readings["reflected_w"], readings["net_w"],
                                   rtol=0, atol=1e-9 * 100.0)
    np.testing.assert_allclose(result.elements[0].readings["net_w"], 100.0, rtol=1e-9)
    np.testing.assert_allclose(result.elements[2].readings["net_w"], result.power_antenna_w, rtol=1e-9)


@pytest.mark.parametrize("alpha_np_per_m", [0.001, 0.01, 0.03])
@pytest.mark.parametrize("z_antenna", [12 - 30j, 300 + 400j, 5000 + 0j, 150 + 0j], ids=str)
def test_meters_at_both_ends_of_a_real_z0_line_read_the_arrl_relationship(alpha_np_per_m, z_antenna, make_station):
    # ARRL Antenna Book, transmission-line chapter: the reflection loses the matched loss ML twice,
    # so |rho_radio| = |rho_antenna| 10^(-ML/10). On a line of exactly real Z0 = 50 ohm (the
    # distortionless line) this is exact (Pozar, 4th ed., section 2.7: rho(z) = rho_L e^(-2 gamma l)),
    # so only rounding is left: 1e-9.
    length_m = 40.0
    line = elements.Line(DistortionlessCable(id="distortionless", description="real-Z0 line", kind="coax",
                                             z0_nominal_ohm=50.0, velocity_factor=0.8,
                                             alpha_np_per_m=alpha_np_per_m), length_m)
    feed = [elements.Meter("shack", 50.0), line, elements.Meter("feedpoint", 50.0)]
    result = budget.solve_budget(make_station(feed, HF_HZ, z_antenna))
    matched_loss_db = DB_PER_NEPER * alpha_np_per_m * length_m
    swr_radio, swr_antenna = result.elements[0].readings["swr"], result.elements[2].readings["swr"]
    rho_radio, rho_antenna = (swr_radio - 1) / (swr_radio + 1), (swr_antenna - 1) / (swr_antenna + 1)
    np.testing.assert_allclose(rho_antenna, abs(rho_of(z_antenna, 50.0)), rtol=1e-9)
    np.testing.assert_allclose(rho_radio, rho_antenna * 10 ** (-matched_loss_db / 10), rtol=1e-9)
    np.testing.assert_allclose(result.elements[1].matched_loss_db, matched_loss_db, rtol=1e-12)


@pytest.mark.parametrize("length_m", [10.0, 40.0, 100.0])
@pytest.mark.parametrize("z_antenna", [12 - 30j, 300 + 400j, 150 + 0j], ids=str)
def test_meters_at_both_ends_of_a_complex_z0_coax(length_m, z_antenna, make_station):
    # The same relationship on a coax with a small complex Z0. Against the line's own Z0 it is
    # exact (Pozar, 4th ed., section 2.7); a 50-ohm meter reads rho' = (rho + s)/(1 + s rho) with
    # s = (Z0 - 50)/(Z0 + 50), so |rho' - rho| = |s| |1 - rho^2| / |1 + s rho| <= 2|s|/(1 - |s|) at
    # each end (algebra of the reference change, Pozar, 4th ed., section 2.3). The tolerance is
    # that bound at both ends, computed from the cable's Z0 at each frequency (|s| ~ 0.005 to 0.01
    # at HF here, so a few hundredths of |rho|, far less than the effect checked).
    feed = [elements.Meter("shack", 50.0), elements.Line(COAX, length_m), elements.Meter("feedpoint", 50.0)]
    result = budget.solve_budget(make_station(feed, HF_HZ, z_antenna))
    z0, gamma = COAX.constants(HF_HZ)
    s = np.abs(rho_of(z0, 50.0))
    assert np.all(s > 1e-3) and np.all(s < 0.02)  # really complex, and still small
    matched_loss_db = DB_PER_NEPER * gamma.real * length_m
    swr_radio, swr_antenna = result.elements[0].readings["swr"], result.elements[2].readings["swr"]
    rho_radio, rho_antenna = (swr_radio - 1) / (swr_radio + 1), (swr_antenna - 1) / (swr_antenna + 1)
    expected = rho_antenna * 10 ** (-matched_loss_db / 10)
    bound = 2 * s / (1 - s) * (1 + 10 ** (-matched_loss_db / 10))
    assert np.all(np.abs(rho_radio - expected) <= bound + 1e-12), (rho_radio, expected, bound)
    assert np.all(rho_radio < rho_antenna)  # the shack meter reads low


# --- balun / transformer ---------------------------------------------------------------------

RATIOS = [1.0, 4.0, 9.0, 49.0, 2.5]


@pytest.mark.parametrize("ratio", RATIOS)
def test_ideal_transformer_chain_matrix_is_pozar_table_4_1(ratio):
    # Pozar, 4th ed., Table 4.1: an ideal N:1 transformer has ABCD [[N, 0], [0, 1/N]] and makes
    # Z_in = N^2 Z_L. An n:1 balun (output over input impedance n) has N = 1/sqrt(n). No winding
    # (length 0, loss 0): the transformer alone.
    turns = 1 / np.sqrt(ratio)
    abcd = elements.Transformer("b", ratio, 0.0, 50.0, length_m=0.0).abcd(HF_HZ)
    np.testing.assert_allclose(abcd, np.broadcast_to([[turns, 0], [0, 1 / turns]], abcd.shape), rtol=1e-15, atol=0)
    # scikit-rf: the same two-port in S at ports 50 and 50 n is a perfect matched thru
    s = s_from_abcd(abcd, [50.0, 50.0 * ratio])
    np.testing.assert_allclose(s, np.broadcast_to([[0, 1], [1, 0]], s.shape), atol=1e-12)


@pytest.mark.parametrize("z_load", [200 + 0j, 450 - 300j, 12 + 5j, 3000 + 1500j], ids=str)
@pytest.mark.parametrize("ratio", RATIOS)
def test_ideal_balun_turns_z_into_z_over_n(ratio, z_load, make_station):
    # An ideal n:1 transformer presents Z_L / n at its input (Pozar, 4th ed., Table 4.1).
    balun = elements.Transformer("b", ratio, 0.0, 50.0, length_m=0.0)
    result = budget.solve_budget(make_station([balun], HF_HZ, z_load))
    np.testing.assert_allclose(result.z_radio_ohm, z_load / ratio, rtol=1e-12)
    np.testing.assert_allclose(result.elements[0].dissipated_w, 0.0, atol=1e-9 * 100.0)
    # scikit-rf's ABCD-to-S conversion at ports 50 and 50 n gives the matched thru [[0, 1], [1, 0]],
    # so rho at the input against 50 ohm is the load's rho against 50 n ohm (Pozar, 4th ed.,
    # section 12.1 with S11 = S22 = 0, S21 = S12 = 1), and Z_in = 50 (1 + rho)/(1 - rho) = Z_L / n
    s = s_from_abcd(balun.abcd(HF_HZ), [50.0, 50.0 * ratio])
    np.testing.assert_allclose(input_impedance_from_s(s, z_load, [50.0, 50.0 * ratio]), z_load / ratio, rtol=1e-12)


@pytest.mark.parametrize("loss_db", [0.1, 0.2, 1.0, 3.0])
@pytest.mark.parametrize("ratio", RATIOS)
def test_lossy_balun_between_its_reference_impedances_loses_its_loss(ratio, loss_db, make_station):
    # The loss key is the matched loss at the reference impedance: terminated in 50 n ohm and fed
    # from 50 ohm, the balun turns loss_db of the power into heat, at every frequency (README, feed
    # table). Rounding only: rtol 1e-9.
    balun = elements.Transformer("b", ratio, loss_db, 50.0)
    result = budget.solve_budget(make_station([balun], HF_HZ, 50.0 * ratio))
    np.testing.assert_allclose(result.elements[0].loss_db, loss_db, rtol=1e-9)
    np.testing.assert_allclose(result.total_loss_db, loss_db, rtol=1e-9)
    np.testing.assert_allclose(result.elements[0].matched_loss_db, loss_db, rtol=1e-9)


def _line_abcd_by_hand(z0, gamma, length_m):
    """[[cosh gl, Z0 sinh gl], [sinh gl / Z0, cosh gl]] (Pozar, 4th ed., Table 4.1)."""
    gl = gamma * length_m
    return np.array([[np.cosh(gl), z0 * np.sinh(gl)], [np.sinh(gl) / z0, np.cosh(gl)]])


@pytest.mark.parametrize("z_load", [200 + 0j, 2000 + 1500j, 30 - 80j], ids=str)
def test_four_to_one_current_balun_is_its_two_line_guanella_equivalent(z_load, make_station):
    # Guanella (1944); Sevick, Transmission Line Transformers, 4th ed., chapter 2: a 4:1 current
    # balun in a 50-ohm station is two identical 100-ohm lines, inputs in parallel, outputs in
    # series. Solved here by circuit arithmetic: with the same current I through both outputs and
    # the same input voltage, each output carries Z_L I / 2 (A v1 + B I = A v2 + B I), and
    # V_in = A Z_L I / 2 + B I, I_in = 2 (C Z_L I / 2 + D I). Each line is the balun's winding scaled
    # to 100 ohm: the same length and VF, per-metre series impedance twice the 50-ohm winding's
    # (the same R' per unit of impedance, so the same gamma) and shunt admittance half.
    f = np.array([3.6e6, 14.2e6])
    balun = elements.Transformer("b", 4.0, 0.3, 50.0)
    r50 = small_parts.winding_resistance_ohm_per_m(f, 50.0, balun.velocity_factor, balun.length_m, 0.3)
    omega = 2 * np.pi * f
    v = balun.velocity_factor * SPEED_OF_LIGHT
    z_series = 2 * (r50 + 1j * omega * (50.0 / v + r50 / omega))
    y_shunt = 1j * omega / (50.0 * v) / 2
    z0_line, gamma = np.sqrt(z_series / y_shunt), np.sqrt(z_series * y_shunt)
    (a, b), (c, d) = _line_abcd_by_hand(z0_line, gamma, balun.length_m)
    current = 1.0
    v_in = a * z_load * current / 2 + b * current
    i_in = 2 * (c * z_load * current / 2 + d * current)
    expected_z_in = v_in / i_in
    expected_loss_db = 10 * np.log10((v_in * np.conj(i_in)).real / (z_load.real * abs(current) ** 2))
    result = budget.solve_budget(make_station([balun], f, z_load))
    # two exact computations of the same circuit: rtol 1e-9
    np.testing.assert_allclose(result.z_radio_ohm, expected_z_in, rtol=1e-9)
    np.testing.assert_allclose(result.elements[0].loss_db, expected_loss_db, rtol=1e-9)


# --- connector -------------------------------------------------------------------------------

@pytest.mark.parametrize("count", [1, 2, 5])
@pytest.mark.parametrize("loss_db", [0.0, 0.05, 0.3])
def test_connectors_lose_count_times_loss_at_the_reference(count, loss_db, make_station):
    connector = elements.Connector("c", loss_db, 50.0, count)
    result = budget.solve_budget(make_station([connector], HF_HZ, 50.0))
    np.testing.assert_allclose(result.elements[0].loss_db, count * loss_db, rtol=1e-12, atol=1e-12)
    np.testing.assert_allclose(result.elements[0].matched_loss_db, count * loss_db, rtol=1e-12, atol=1e-12)
    np.testing.assert_allclose(result.power_antenna_w, 100.0 * 10 ** (-count * loss_db / 10), rtol=1e-12)


@pytest.mark.parametrize("z_load, expected_db", [
    # Worked by hand: 0.05 dB at 50 ohm is a series R = 50 (10^0.005 - 1) = 50 x 0.01157945 =
    # 0.578973 ohm. The same current flows in R and the load, so the loss is 10 log10((Re Z + R)/Re Z):
    (5.0, 0.475842),       # 10 log10(5.578974 / 5) = 10 log10(1.1157948) = 10 x 0.0475842 dB
    (2000.0, 0.00125704),  # 10 log10(2000.578973 / 2000) = 10 log10(1.00028949) = 10 x 1.25704e-4 dB
])
def test_connector_at_low_and_high_impedance_is_its_series_resistance(z_load, expected_db, make_station):
    # Pozar, 4th ed., section 4.4 (series impedance; power Re(V I*)); six figures written out: rtol 2e-5.
    connector = elements.Connector("c", 0.05, 50.0)
    result = budget.solve_budget(make_station([connector], HF_HZ, z_load))
    np.testing.assert_allclose(result.elements[0].loss_db, expected_db, rtol=2e-5)


STATION_HEAD = """\
name: element test
radio: {{power: 100 W, holds: net}}
frequencies: [7.1 MHz]
antenna:
  impedance: {{7.1 MHz: {antenna}}}
feed:
"""


def test_connector_defaults_from_the_station_file():
    # README: connector loss 0.05 dB each (common practice), count 1.
    station = parse_station_text(STATION_HEAD.format(antenna="50+j0") + "  - connector:\n  - connector: {count: 3}\n")
    result = budget.solve_budget(station)
    # The three together are R3 = 50 (10^0.015 - 1) = 1.757109 ohm in series with the 50-ohm load;
    # the first, R1 = 0.578973 ohm, carries the same current: 10 log10(52.336082 / 51.757109)
    # = 10 log10(1.0111864) = 0.048312 dB (worked by hand; six figures: rtol 2e-5).
    np.testing.assert_allclose([e.loss_db[0] for e in result.elements], [0.048312, 0.15], rtol=2e-5)


# --- series and shunt lumped parts -----------------------------------------------------------

PART_CASES = {  # (r ohm, l H, c F or None)
    "R": (33.0, 0.0, None),
    "L": (0.0, 2.2e-6, None),
    "C": (0.0, 0.0, 150e-12),
    "RL": (10.0, 1.0e-6, None),
    "LC": (0.0, 4.7e-6, 100e-12),
    "RLC": (5.0, 0.33e-6, 470e-12),
}


def skrf_part(media, r, l, c, placement):
    """The same parts built from scikit-rf's lumped elements."""
    branch = media.thru()
    if r:
        branch = branch ** media.resistor(r)
    if l:
        branch = branch ** media.inductor(l)
    if c is not None:
        branch = branch ** media.capacitor(c)
    return branch if placement == "series" else media.shunt(branch ** media.short())


@pytest.mark.parametrize("placement", ["series", "shunt"])
@pytest.mark.parametrize("case", list(PART_CASES))
def test_lossless_parts_match_scikit_rf(case, placement):
    r, l, c = PART_CASES[case]
    part = elements.LumpedPart("p", placement, 50.0, r, l, c)  # Q = inf by default: ideal parts
    media = skrf.media.DefinedGammaZ0(skrf_frequency(HF_HZ), z0=50.0)
    reference = skrf_part(media, r, l, c, placement)
    # two double-precision routes to the same S-parameters: rounding only
    np.testing.assert_allclose(s_from_abcd(part.abcd(HF_HZ)), reference.s, rtol=1e-9, atol=1e-12)


@pytest.mark.parametrize("placement", ["series", "shunt"])
@pytest.mark.parametrize("case", ["L", "C", "LC", "RLC"])
def test_part_q_is_a_series_resistance_x_over_q(case, placement):
    # Unloaded Q = X/R: a lossy part is its ideal reactance with X/Q in series (the definition of
    # Q; Pozar, 4th ed., section 6.1). Compared with scikit-rf parts plus resistors of X/Q.
    r, l, c = PART_CASES[case]
    inductor_q, capacitor_q = 80.0, 600.0
    part = elements.LumpedPart("p", placement, 50.0, r, l, c, inductor_q=inductor_q, capacitor_q=capacitor_q)
    omega = 2 * np.pi * HF_HZ
    loss_r = r + (omega * l / inductor_q if l else 0) + (1 / (omega * c * capacitor_q) if c is not None else 0)
    media = skrf.media.DefinedGammaZ0(skrf_frequency(HF_HZ), z0=50.0)
    branch = media.resistor(loss_r) ** skrf_part(media, 0.0, l, c, "series")
    reference = branch if placement == "series" else media.shunt(branch ** media.short())
    np.testing.assert_allclose(s_from_abcd(part.abcd(HF_HZ)), reference.s, rtol=1e-9, atol=1e-12)


def test_single_lossy_inductor_has_its_q():
    part = elements.LumpedPart("p", "series", 50.0, inductance_h=1e-6, inductor_q=120.0)
    z = part.impedance_ohm(HF_HZ)
    np.testing.assert_allclose(z.imag / z.real, 120.0, rtol=1e-12)  # Q = X/R by definition
    np.testing.assert_allclose(z.imag, 2 * np.pi * HF_HZ * 1e-6, rtol=1e-12)


@pytest.mark.parametrize("q", [20.0, 100.0, 400.0])
def test_heat_in_series_and_shunt_parts_by_hand(q, make_station):
    # A lossy inductor L (R = omega L / Q) between the radio and a 50-ohm load, net power P in:
    # series: I^2 = P / (R + 50), heat = P R / (R + 50);
    # shunt: |V|^2 = P / Re(1/Z + 1/50), heat = |V|^2 Re(1/Z). Circuit arithmetic (Ohm's law).
    inductance_h, power_w = 1.5e-6, 100.0
    omega = 2 * np.pi * HF_HZ
    z = omega * inductance_h * (1 / q + 1j)
    series = budget.solve_budget(make_station([elements.LumpedPart("s", "series", 50.0, inductance_h=inductance_h,
                                                                   inductor_q=q)], HF_HZ, 50.0, power_w=power_w))
    np.testing.assert_allclose(series.elements[0].dissipated_w, power_w * z.real / (z.real + 50.0), rtol=1e-9)
    shunt = budget.solve_budget(make_station([elements.LumpedPart("p", "shunt", 50.0, inductance_h=inductance_h,
                                                                  inductor_q=q)], HF_HZ, 50.0, power_w=power_w))
    v_squared = power_w / (1 / z + 1 / 50.0).real
    np.testing.assert_allclose(shunt.elements[0].dissipated_w, v_squared * (1 / z).real, rtol=1e-9)
    np.testing.assert_allclose(shunt.power_antenna_w, v_squared / 50.0, rtol=1e-9)


# --- stubs -------------------------------------------------------------------------------------

STUB_LENGTHS_M = [0.7, 3.3, 8.0, 17.5]


@pytest.mark.parametrize("shorted", [True, False], ids=["short", "open"])
@pytest.mark.parametrize("length_m", STUB_LENGTHS_M)
@pytest.mark.parametrize("cable", [COAX, LOSSLESS], ids=["coax", "lossless"])
def test_stub_input_impedance_closed_form_and_scikit_rf(cable, length_m, shorted):
    # Pozar, 4th ed., section 2.3 (shorted and open line sections), with gamma for j beta (section 2.7):
    # shorted Z0 tanh(gamma l), open Z0 coth(gamma l). The cable's Z0 and gamma are inputs.
    frequency_hz = HF_HZ[:-1]  # 28.5 MHz puts the 17.5 m open lossless stub too near resonance
    z0, gamma = cable.constants(frequency_hz)
    gl = gamma * length_m
    expected = z0 * np.sinh(gl) / np.cosh(gl) if shorted else z0 * np.cosh(gl) / np.sinh(gl)
    stub = elements.Stub("s", cable, length_m, shorted, 50.0)
    abcd = stub.abcd(frequency_hz)
    np.testing.assert_allclose(abcd[:, 0, 0], 1.0, atol=0)
    np.testing.assert_allclose(abcd[:, 0, 1], 0.0, atol=0)
    np.testing.assert_allclose(1 / abcd[:, 1, 0], expected, rtol=1e-9)
    # scikit-rf: a line section of that Z0 and gamma ended in a short or an open, in shunt between
    # two 50-ohm ports; compared as S-parameters
    media = skrf.media.DefinedGammaZ0(skrf_frequency(frequency_hz), z0_port=50.0, z0=z0, gamma=gamma)
    termination = media.short() if shorted else media.open()
    one_port = media.line(length_m, unit="m") ** termination
    np.testing.assert_allclose(one_port.z[:, 0, 0], expected, rtol=1e-9)
    shunt = (media.shunt_delay_short if shorted else media.shunt_delay_open)(length_m, unit="m")
    np.testing.assert_allclose(s_from_abcd(abcd), shunt.s, rtol=1e-9, atol=1e-12)


def quarter_wave_m(cable, frequency_hz):
    return cable.velocity_factor * SPEED_OF_LIGHT / (4 * frequency_hz)


@pytest.mark.parametrize("z_antenna", [50 + 0j, 120 - 80j, 20 + 30j], ids=str)
def test_lossless_shorted_quarter_wave_stub_is_transparent(z_antenna, make_station):
    # A shorted quarter-wave stub presents Z0 tan(pi/2) -> infinity across the path (Pozar, 4th
    # ed., section 2.3): the radio sees the antenna unchanged and nothing is lost. tan(pi/2) in
    # double precision is about 1.6e16, so rounding only.
    frequency_hz = np.array([7.1e6])
    stub = elements.Stub("s", LOSSLESS, quarter_wave_m(LOSSLESS, 7.1e6), True, 50.0)
    result = budget.solve_budget(make_station([stub], frequency_hz, z_antenna))
    np.testing.assert_allclose(result.z_radio_ohm, z_antenna, rtol=1e-9)
    np.testing.assert_allclose(result.total_loss_db, 0.0, atol=1e-9)
    # across a line: the same budget as the line alone
    line = elements.Line(COAX, 20.0)
    with_stub = budget.solve_budget(make_station([line, stub], frequency_hz, z_antenna))
    without = budget.solve_budget(make_station([line], frequency_hz, z_antenna))
    np.testing.assert_allclose(with_stub.z_radio_ohm, without.z_radio_ohm, rtol=1e-9)
    np.testing.assert_allclose(with_stub.power_antenna_w, without.power_antenna_w, rtol=1e-9)


def test_lossy_shorted_quarter_wave_stub_is_nearly_transparent(make_station):
    # With loss, Z_stub = Z0 coth(alpha l) (gamma l = alpha l + j pi/2; Pozar, 4th ed., section 2.7),
    # large and nearly real: the heat is P (50 / Re Z_stub) to first order, a few hundredths of a dB.
    frequency_hz = np.array([7.1e6])
    length_m = quarter_wave_m(COAX, 7.1e6)
    result = budget.solve_budget(make_station([elements.Stub("s", COAX, length_m, True, 50.0)], frequency_hz, 50.0))
    z0, gamma = COAX.constants(frequency_hz)
    z_stub = z0 * np.tanh(gamma * length_m)
    assert abs(z_stub[0]) > 1000.0
    antenna_fraction = (1 / 50.0) / ((1 / 50.0) + (1 / z_stub).real)  # current divider in a parallel pair
    np.testing.assert_allclose(result.power_antenna_w / 100.0, antenna_fraction, rtol=1e-9)
    assert 0 < result.total_loss_db[0] < 0.2
    assert result.swr_radio[0] < 1.05


def test_lossy_open_quarter_wave_stub_shorts_the_path(make_station):
    # An open quarter-wave stub presents Z0 coth(alpha l + j pi/2) = Z0 tanh(alpha l), a few ohm
    # at most, across the path (Pozar, 4th ed., sections 2.3 and 2.7): almost all the power heats
    # the stub and the radio sees nearly a short.
    frequency_hz = np.array([7.1e6])
    length_m = quarter_wave_m(COAX, 7.1e6)
    result = budget.solve_budget(make_station([elements.Stub("s", COAX, length_m, False, 50.0)], frequency_hz, 50.0))
    z0, gamma = COAX.constants(frequency_hz)
    z_stub = z0 * np.cosh(gamma * length_m) / np.sinh(gamma * length_m)
    assert abs(z_stub[0]) < 2.0
    antenna_fraction = (1 / 50.0) / ((1 / 50.0) + (1 / z_stub).real)
    np.testing.assert_allclose(result.power_antenna_w / 100.0, antenna_fraction, rtol=1e-9)
    assert result.power_antenna_w[0] < 5.0 and result.elements[0].dissipated_w[0] > 95.0
    assert result.swr_radio[0] > 25.0
    np.testing.assert_allclose(result.z_radio_ohm, z_stub * 50.0 / (z_stub + 50.0), rtol=1e-9)


# --- choke -------------------------------------------------------------------------------------

CHOKE_STATION = """\
name: choke test
radio: {{power: 100 W, holds: net}}
frequencies: [1.9 MHz, 3.6 MHz, 7.1 MHz, 10.12 MHz, 14.2 MHz, 28.5 MHz]
antenna:
  impedance: {{1.8 MHz: 50+j0, 30 MHz: 50+j0}}
feed:
  - choke: {{label: feedpoint choke, loss: 0.1 dB{extra}}}
"""


def test_choke_differential_loss():
    result = budget.solve_budget(parse_station_text(CHOKE_STATION.format(extra="")))
    np.testing.assert_allclose(result.elements[0].loss_db, 0.1, rtol=1e-12)
    np.testing.assert_allclose(result.power_antenna_w, 100.0 * 10 ** -0.01, rtol=1e-12)
    assert result.warnings == ()  # no common-mode table: nothing to judge


def _skrf_section_abcd(frequency_hz, r_ohm_per_m, z0_ohm, velocity_factor, length_m):
    """ABCD of a line section of R' (and its internal inductance R'/omega), nominal Z0 and VF, built
    with scikit-rf's distributed-circuit media (L' = Z0/v + R'/omega, C' = 1/(Z0 v), G' = 0)."""
    v = velocity_factor * SPEED_OF_LIGHT
    omega = 2 * np.pi * frequency_hz
    media = skrf.media.DistributedCircuit(skrf_frequency(frequency_hz), z0_port=50.0, C=1 / (z0_ohm * v),
                                          L=z0_ohm / v + r_ohm_per_m / omega, R=r_ohm_per_m, G=0.0)
    return media.line(length_m, "m").a


def _loss_db_into(abcd, z_load):
    """10 log10(Re(V_in I_in*) / Re(Z_L)) with I_out = 1 (Pozar, 4th ed., section 4.4)."""
    v_in = abcd[..., 0, 0] * z_load + abcd[..., 0, 1]
    i_in = abcd[..., 1, 0] * z_load + abcd[..., 1, 1]
    return 10 * np.log10((v_in * np.conj(i_in)).real / z_load.real)


@pytest.mark.parametrize("frequency_hz", [3.6e6, 14.2e6])
def test_choke_at_a_high_impedance_is_its_explicit_line_section(frequency_hz, make_station):
    # The choke's differential path is 1.5 m of 50-ohm coax at VF 0.66 (README defaults, common
    # practice) whose conductors lose 0.05 dB between 50-ohm terminations. Independently: R' found
    # with scipy's brentq on scikit-rf's distributed-circuit line so that it loses 0.05 dB into
    # 50 ohm, then that line's loss into 2000+j1500 ohm (Pozar, 4th ed., sections 2.1 and 4.4).
    import scipy.optimize

    f = np.array([frequency_hz])
    choke = elements.Choke("c", 0.05, 50.0)

    def excess_db(r):
        return _loss_db_into(_skrf_section_abcd(f, r, 50.0, 0.66, 1.5), 50.0)[0] - 0.05

    r = scipy.optimize.brentq(excess_db, 0.0, 10.0, xtol=1e-14, rtol=1e-12)
    z_load = 2000 + 1500j
    expected = _loss_db_into(_skrf_section_abcd(f, r, 50.0, 0.66, 1.5), z_load)
    result = budget.solve_budget(make_station([choke], f, z_load, power_w=1500.0))
    # two solutions of the same line to the root finder's tolerance: rtol 1e-7
    np.testing.assert_allclose(result.elements[0].loss_db, expected, rtol=1e-7)


@pytest.mark.parametrize("threshold, weak", [
    # table: 300 ohm at 1.9, 800 at 7.1, 1500 at 14.2, 450 at 28.5 MHz; linear between points:
    # 3.6 MHz -> 300 + 500 (1.7/5.2) = 463 ohm, 10.12 MHz -> 800 + 700 (3.02/7.1) = 1098 ohm.
    (None, ["1.9 MHz", "3.6 MHz", "28.5 MHz"]),  # default 500 ohm (common practice)
    ("1000 ohm", ["1.9 MHz", "3.6 MHz", "7.1 MHz", "28.5 MHz"]),
    ("200 ohm", []),
])
def test_choke_warns_on_each_row_below_its_common_mode_threshold(threshold, weak):
    extra = ", common_mode: {1.9 MHz: 300, 7.1 MHz: 800 ohm, 14.2 MHz: 1500, 28.5 MHz: 450}"
    if threshold:
        extra += f", min_common_mode: {threshold}"
    result = budget.solve_budget(parse_station_text(CHOKE_STATION.format(extra=extra)))
    text = " | ".join(w for w in result.warnings if "choke" in w)
    named = [label for label in result.labels if re.search(rf"(^|[ ,]){re.escape(label)} \(", text)]
    assert named == weak, text
    if weak:
        assert "feedpoint choke" in text
    for label, ohm in (("3.6 MHz", 463), ("1.9 MHz", 300)):
        if label in weak:
            assert f"{label} ({ohm} ohm)" in text
    np.testing.assert_allclose(result.elements[0].loss_db, 0.1, rtol=1e-12)  # warnings do not change the loss


# --- balance -----------------------------------------------------------------------------------

BALANCE_CASES = {  # feed between the radio and the window line, and whether a warning is expected
    "straight from the radio": ("", True),
    "through coax": ("  - line: {label: jumper, cable: rg-213, length: 2 m}\n", True),
    "4:1 balun": ('  - balun: {ratio: "4:1"}\n', False),
    "choke": ("  - line: {label: jumper, cable: rg-213, length: 2 m}\n  - choke:\n", False),
    "balanced tuner": ("  - tuner: {network: T, output: balanced}\n", False),
    "unbalanced tuner": ("  - tuner: {network: T}\n", True),
    "balun, then coax": ('  - balun: {ratio: "1:1"}\n  - line: {label: jumper, cable: rg-213, length: 2 m}\n', True),
    "meter after a balun": ('  - balun: {ratio: "1:1"}\n  - meter:\n', False),
}


@pytest.mark.parametrize("case", list(BALANCE_CASES))
def test_balanced_line_from_an_unbalanced_port_is_a_warning(case):
    between, warned = BALANCE_CASES[case]
    text = STATION_HEAD.format(antenna="300+j100") + between + \
        "  - line: {label: ladder, cable: window-line-450, length: 15 m}\n"
    result = budget.solve_budget(parse_station_text(text))  # a warning, never an error
    balance = [w for w in result.warnings if "balanced line" in w]
    assert bool(balance) == warned, result.warnings
    if warned:
        assert len(balance) == 1 and "ladder" in balance[0]
    assert np.all(np.isfinite(result.power_antenna_w))


# --- tuner in the path -------------------------------------------------------------------------

# Invented demo loads of a doublet fed off resonance (SWR 10 to 60 against 50 ohm).
TUNER_ROWS_HZ = np.array([3.6e6, 7.1e6, 14.2e6, 21.2e6])
TUNER_LOADS = "{3.6 MHz: 95+j150, 7.1 MHz: 2400-j1700, 14.2 MHz: 1800+j1250, 21.2 MHz: 300+j500}"
TUNER_STATION = """\
name: tuner placement
radio: {{power: 100 W, holds: net}}
frequencies: [3.6 MHz, 7.1 MHz, 14.2 MHz, 21.2 MHz]
antenna:
  impedance: {loads}
feed:
{feed}"""


def tuner_station(feed, loads_text=TUNER_LOADS):
    return parse_station_text(TUNER_STATION.format(loads=loads_text, feed=feed))


def skrf_line(cable, length_m, frequency_hz):
    z0, gamma = cable.constants(frequency_hz)
    media = skrf.media.DefinedGammaZ0(skrf_frequency(frequency_hz), z0_port=50.0, z0=z0, gamma=gamma)
    return media.line(length_m, unit="m"), z0, gamma


def skrf_matched_loss_db(cable, length_m, frequency_hz):
    """Loss of the line in its own Z0: S21 = e^(-gamma l) there (Pozar, 4th ed., section 2.7)."""
    z0, gamma = cable.constants(frequency_hz)
    media = skrf.media.DefinedGammaZ0(skrf_frequency(frequency_hz), z0=z0, gamma=gamma)
    return -20 * np.log10(np.abs(media.line(length_m, unit="m").s[:, 1, 0]))


@pytest.mark.parametrize("network", ["L", "T"])
def test_tuner_at_the_feedpoint_leaves_the_coax_at_its_matched_loss(network, library):
    result = budget.solve_budget(tuner_station(f"  - line: {{label: coax, cable: rg-8x, length: 30 m}}\n"
                                               f"  - tuner: {{network: {network}}}\n"))
    line, tuner_element = result.elements
    assert np.all(tuner_element.readings["matched"])
    cable = library["rg-8x"]
    matched_loss_db = skrf_matched_loss_db(cable, 30.0, TUNER_ROWS_HZ)
    # The tuner terminates the coax in 50 ohm: not exactly its Z0 (about 50.5 - j0.7 ohm), so
    # the loss may move by the tiny mismatch; 0.01 dB is the resolution of a loss report.
    np.testing.assert_allclose(line.loss_db, matched_loss_db, rtol=0, atol=0.01)
    energy_balanced(result)
    # SWR at the radio: the tuner's input is within MATCHED_SWR of 50 ohm; through the coax (S
    # from scikit-rf at 50-ohm ports) rho_in = S11 + S12 S21 rho_L / (1 - S22 rho_L) (Pozar, 4th
    # ed., section 12.1), so |rho_radio| <= |S11| + |S21|^2 r / (1 - |S22| r), r the tuner's |rho|.
    s = skrf_line(cable, 30.0, TUNER_ROWS_HZ)[0].s
    r = (tuner.MATCHED_SWR - 1) / (tuner.MATCHED_SWR + 1)
    bound = np.abs(s[:, 0, 0]) + np.abs(s[:, 1, 0] * s[:, 0, 1]) * r / (1 - np.abs(s[:, 1, 1]) * r)
    rho_radio = (result.swr_radio - 1) / (result.swr_radio + 1)
    assert np.all(rho_radio <= bound), (rho_radio, bound)
    assert np.all(tuner_element.swr_in <= tuner.MATCHED_SWR)


@pytest.mark.parametrize("network", ["L", "T"])
def test_tuner_at_the_feedpoint_of_a_real_z0_line_gives_the_radio_its_match(network, make_station):
    # Over a line of exactly real 50-ohm Z0 the tuner's match reaches the radio unchanged in SWR
    # terms: |rho| only shrinks along the line (Pozar, 4th ed., section 2.7).
    line = elements.Line(DistortionlessCable(id="real-z0", description="real-Z0 line", kind="coax",
                                             z0_nominal_ohm=50.0, velocity_factor=0.8, alpha_np_per_m=0.005), 30.0)
    tuner_element = elements.Tuner("remote", network, tuner.TunerParts(10e-12, 500e-12, 0.05e-6, 30e-6), 50.0)
    z = np.array([95 + 150j, 2400 - 1700j, 1800 + 1250j, 300 + 500j])
    result = budget.solve_budget(make_station([line, tuner_element], TUNER_ROWS_HZ, z))
    assert np.all(result.elements[1].readings["matched"])
    assert np.all(result.swr_radio <= tuner.MATCHED_SWR)
    np.testing.assert_allclose(result.elements[0].loss_db, DB_PER_NEPER * 0.005 * 30.0, rtol=0, atol=0.01)


@pytest.mark.parametrize("network", ["L", "T"])
def test_tuner_in_the_shack_leaves_the_standing_waves_on_the_coax(network, library):
    result = budget.solve_budget(tuner_station(f"  - tuner: {{network: {network}}}\n"
                                               f"  - line: {{label: coax, cable: rg-8x, length: 30 m}}\n"))
    tuner_element, line = result.elements
    cable = library["rg-8x"]
    matched_loss_db = skrf_matched_loss_db(cable, 30.0, TUNER_ROWS_HZ)
    assert np.all(line.loss_db > matched_loss_db + 1.0)  # several dB more at SWR 10 to 60
    # the exact loss of the coax with the antenna on its far end, from scikit-rf: P_load/P_in =
    # |S21|^2 (1 - |rho_L|^2) / (|1 - S22 rho_L|^2 (1 - |rho_in|^2)) (Pozar, 4th ed., section 12.1)
    network_line = skrf_line(cable, 30.0, TUNER_ROWS_HZ)[0]
    rho_load = rho_of(np.array([95 + 150j, 2400 - 1700j, 1800 + 1250j, 300 + 500j]), 50.0)
    s = network_line.s
    rho_in = s[:, 0, 0] + s[:, 0, 1] * s[:, 1, 0] * rho_load / (1 - s[:, 1, 1] * rho_load)
    gain = np.abs(s[:, 1, 0]) ** 2 * (1 - np.abs(rho_load) ** 2) / (np.abs(1 - s[:, 1, 1] * rho_load) ** 2
                                                                    * (1 - np.abs(rho_in) ** 2))
    np.testing.assert_allclose(line.loss_db, -10 * np.log10(gain), rtol=1e-9)
    # where the tuner reports a match the radio sees it: SWR at the radio <= 1.02
    matched = tuner_element.readings["matched"]
    assert np.all(matched)
    assert np.all(result.swr_radio[matched] <= tuner.MATCHED_SWR)
    energy_balanced(result)


def test_out_of_range_tuner_warns_and_the_budget_still_solves():
    feed = ("  - line: {cable: rg-8x, length: 30 m}\n"
            "  - tuner: {label: tiny, network: L, capacitance: {min: 1 pF, max: 2 pF},\n"
            "            inductance: {min: 0.01 uH, max: 0.02 uH}}\n")
    result = budget.solve_budget(tuner_station(feed))
    readings = result.elements[1].readings
    assert not np.any(readings["matched"])
    warning = next(w for w in result.warnings if "tiny" in w)
    for label in result.labels:
        assert re.search(rf"{re.escape(label)} \(SWR [0-9.]+ at its output", warning), warning
    assert np.all(np.isfinite(result.power_antenna_w)) and np.all(result.power_antenna_w > 0)
    assert np.all(result.swr_radio > tuner.MATCHED_SWR)
    energy_balanced(result)


@pytest.mark.parametrize("phase_deg", [0.0, 60.0, 180.0, -120.0])
@pytest.mark.parametrize("max_swr_key", ["", ", max_swr: 3"])
def test_builtin_tuner_matches_2_9_and_refuses_3_1(phase_deg, max_swr_key):
    # A radio's built-in tuner covers loads up to 3:1: common practice (README default max_swr 3).
    # Loads of SWR 2.9 and 3.1 against 50 ohm at a given phase: Z = 50 (1 + rho)/(1 - rho),
    # |rho| = (SWR - 1)/(SWR + 1) (Pozar, 4th ed., section 2.3); written with 12 significant digits.
    def load(swr):
        rho = (swr - 1) / (swr + 1) * np.exp(1j * np.radians(phase_deg))
        z = 50 * (1 + rho) / (1 - rho)
        return f"{z.real:.12g}{'+' if z.imag >= 0 else '-'}j{abs(z.imag):.12g}"

    text = (f"name: built-in\nradio: {{power: 100 W}}\nfrequencies: [14.1 MHz, 14.3 MHz]\n"
            f"antenna:\n  impedance: {{14.1 MHz: {load(2.9)}, 14.3 MHz: {load(3.1)}}}\n"
            f"feed:\n  - tuner: {{label: inside the radio, network: builtin{max_swr_key}}}\n")
    result = budget.solve_budget(parse_station_text(text))
    readings = result.elements[0].readings
    assert readings["matched"].tolist() == [True, False]
    assert result.swr_radio[0] <= tuner.MATCHED_SWR
    np.testing.assert_allclose(result.swr_radio[1], 3.1, rtol=1e-9)  # bypassed: the load itself
    assert str(readings["arrangement"][1]) == "bypass"
    warning = " ".join(w for w in result.warnings if "inside the radio" in w)
    assert "14.3 MHz" in warning and "14.1 MHz" not in warning


# --- properties: energy balance and passivity over random paths -------------------------------

PROPERTY_SETTINGS = settings(derandomize=True, database=None, max_examples=60, deadline=None,
                             suppress_health_check=[HealthCheck.too_slow])


def _log_uniform(low, high):
    return st.floats(np.log10(low), np.log10(high)).map(lambda x: 10.0 ** x)


@st.composite
def random_cable(draw, lossy=False):
    """Cable constants from open-wire line to thin lossy coax."""
    return cables.Cable(id="random", description="random constants", kind=draw(st.sampled_from(["coax", "balanced"])),
                        z0_nominal_ohm=draw(st.floats(25.0, 600.0)), velocity_factor=draw(st.floats(0.5, 1.0)),
                        k_conductor=draw(_log_uniform(1e-8, 3e-6) if lossy else
                                         st.one_of(st.just(0.0), _log_uniform(1e-8, 3e-6))),
                        k_dielectric=draw(st.one_of(st.just(0.0), _log_uniform(1e-14, 2e-11))))


@st.composite
def random_element(draw):
    kind = draw(st.sampled_from(["line", "connector", "choke", "balun", "meter", "series", "shunt", "stub", "tuner"]))
    if kind == "line":
        return elements.Line(draw(random_cable()), draw(_log_uniform(0.1, 100.0)), "line")
    if kind == "connector":
        return elements.Connector(kind, draw(st.floats(0.0, 1.0)), 50.0, draw(st.integers(1, 4)))
    if kind == "choke":
        return elements.Choke(kind, draw(st.floats(0.0, 1.0)), 50.0)
    if kind == "balun":
        return elements.Transformer("balun", draw(_log_uniform(0.25, 49.0)), draw(st.floats(0.0, 1.0)), 50.0)
    if kind == "meter":
        return elements.Meter("meter", draw(st.floats(25.0, 300.0)))
    if kind in ("series", "shunt"):
        capacitance = draw(st.one_of(st.none(), _log_uniform(5e-12, 1e-8)))
        return elements.LumpedPart(kind, kind, 50.0, resistance_ohm=draw(st.floats(0.5, 200.0)),
                                   inductance_h=draw(st.one_of(st.just(0.0), _log_uniform(1e-8, 5e-5))),
                                   capacitance_f=capacitance, inductor_q=draw(st.floats(10.0, 1000.0)),
                                   capacitor_q=draw(st.floats(100.0, 5000.0)))
    if kind == "stub":  # lossy, so that no resonance can put a dead short across the path
        return elements.Stub("stub", draw(random_cable(lossy=True)), draw(_log_uniform(0.1, 30.0)),
                             draw(st.booleans()), 50.0)
    parts = tuner.TunerParts(10e-12, 500e-12, 0.05e-6, 30e-6, draw(st.floats(20.0, 400.0)),
                             draw(st.floats(200.0, 5000.0)))
    return elements.Tuner("tuner", draw(st.sampled_from(["L", "T", "builtin"])), parts, 50.0)


@PROPERTY_SETTINGS
@given(data=st.data(),
       frequency_hz=st.lists(_log_uniform(1.8e6, 30e6), min_size=1, max_size=3, unique=True).map(sorted).map(np.array))
def test_property_energy_balance_and_passivity(data, frequency_hz, make_station):
    feed = data.draw(st.lists(random_element(), min_size=1, max_size=5))
    z_antenna = np.array([complex(data.draw(_log_uniform(1.0, 3000.0)), data.draw(st.floats(-3000.0, 3000.0)))
                          for _ in frequency_hz])
    power_w = data.draw(_log_uniform(1.0, 1500.0))
    result = budget.solve_budget(make_station(feed, frequency_hz, z_antenna, power_w=power_w))
    # radio power = antenna power + the heat in every element: the solver books each element's
    # heat as the difference of the net power at its ports, so this is rounding only
    np.testing.assert_allclose(result.power_radio_w, power_w, rtol=1e-12)
    energy_balanced(result)
    # passive: no element gives power back beyond rounding; the rounding of Re(V I*) grows with
    # the apparent power |V||I| at the element's ports (standing waves), so the allowance is 1e-9
    # of the larger of that and the radio power
    sol = result.solution
    apparent = np.abs(sol.voltage_v) * np.abs(sol.current_a)
    for k, element in enumerate(result.elements):
        allowance = 1e-9 * np.maximum(power_w, np.maximum(apparent[k], apparent[k + 1]))
        assert np.all(element.dissipated_w >= -allowance), (element.kind, element.dissipated_w)
    assert np.all(result.power_antenna_w > 0)
    for element in result.elements:
        if element.kind == "tuner":
            # a part left out of a row's network has no heat (NaN) there
            heat = np.nansum([v for key, v in element.readings.items() if key.endswith("_dissipated_w")], axis=0)
            np.testing.assert_allclose(heat, element.dissipated_w, rtol=1e-9, atol=1e-9 * power_w)


def test_choke_and_balun_winding_keys_and_defaults():
    # README feed table: choke length 1.5 m, VF 0.66 (common practice); balun 1 m, VF 0.7 (from memory).
    text = (STATION_HEAD.format(antenna="50+j0") + "  - choke:\n  - choke: {length: 3 m, velocity_factor: 0.8}\n"
            '  - balun: {ratio: "4:1"}\n  - balun: {ratio: "1:4", length: 40 cm, velocity_factor: 0.75}\n')
    feed = parse_station_text(text).feed
    assert [(e.length_m, e.velocity_factor) for e in feed] == [(1.5, 0.66), (3.0, 0.8), (1.0, 0.7), (0.4, 0.75)]


@pytest.mark.parametrize("kind, label, sentence, column", [
    ("tuner", "tuner 1", "tuner 1", "tuner 1"),            # a default label says its kind already
    ("tuner", "shack", "tuner shack", "tuner: shack"),
    ("line", "window line", "window line", "window line"),
    ("line", "coax", "line coax", "line: coax"),
    ("meter", "Shack Meter", "Shack Meter", "Shack Meter"),  # as a word, in any case
    ("line", "linear feed", "line linear feed", "line: linear feed"),  # not inside another word
])
def test_an_element_is_named_once_by_its_kind(kind, label, sentence, column):
    from linecalc.elements.base import column_name, named, named_first
    assert named(kind, label) == sentence
    assert named_first(kind, label) == sentence[0].upper() + sentence[1:]
    assert column_name(kind, label) == column
