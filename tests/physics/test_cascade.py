"""Checks of the physics core: line chain matrix, path solver, power flow.

Expected values come from methods independent of linecalc's chain-matrix cascade:
scikit-rf (scattering parameters of a line, renormalised and cascaded), the closed-form
total-loss-with-SWR formula for a real-impedance line, the matched-line power law, and the
Joule and dielectric heat integrated along the line.
"""
from __future__ import annotations

import numpy as np
import pytest
import skrf
from hypothesis import HealthCheck, assume, given, settings
from hypothesis import strategies as st

from linecalc.studies import budget
from linecalc.physics import cables
from linecalc import elements
from linecalc.physics import twoports
from linecalc.physics import loads
from linecalc.physics import cascade as solver

# Seeded, bounded property runs: the same examples every run, each test well under a second.
PROPERTY_SETTINGS = settings(derandomize=True, database=None, max_examples=150, deadline=None,
                             suppress_health_check=[HealthCheck.too_slow])

DB_PER_NEPER = 20 * np.log10(np.e)
MU_0 = 4e-7 * np.pi  # H/m
SPEED_OF_LIGHT = 299_792_458.0  # m/s, exact (SI definition)
COPPER_S_PER_M = 5.80e7  # IACS annealed copper, 100 % IACS = 58.0 MS/m (IEC 60028)
# 1 Hz surface resistance of copper, Rs = sqrt(pi f mu0 / sigma) at f = 1 Hz
# (Pozar, Microwave Engineering, 4th ed., section 1.7).
RS_COPPER_1HZ = np.sqrt(np.pi * MU_0 / COPPER_S_PER_M)


def loss_terms_from_physics(z0_ohm, velocity_factor, conductor_r_per_rs_per_m, loss_tangent):
    """Fitted-model attenuation terms of a low-loss line from its conductors and dielectric.

    a_c = R'/(2 Z0) with R' = Rs(f) * conductor_r_per_rs_per_m, so k_conductor = a_c/sqrt(f);
    a_d = pi f tan(delta) / v, so k_dielectric = pi tan(delta) / v.
    Pozar, Microwave Engineering, 4th ed., section 2.7 (low-loss line) and Table 2.1.
    """
    k_conductor = RS_COPPER_1HZ * conductor_r_per_rs_per_m / (2 * z0_ohm)
    k_dielectric = np.pi * loss_tangent / (velocity_factor * SPEED_OF_LIGHT)
    return k_conductor, k_dielectric


# RG-213 class coax: 2.26 mm stranded inner conductor, 7.24 mm over solid PE (eps_r 2.25,
# VF 0.66), dimensions from MIL-DTL-17 (from memory); braid and stranding raise the smooth-copper
# resistance by about 1.5 (common practice, from memory); PE loss tangent 2e-4 (von Hippel's dielectric
# tables, from memory). Result: about 0.5 dB/100 ft at 7 MHz, 2.4 dB/100 ft at 146 MHz. These are
# inputs for the checks below, not claims about any product.
COAX_K = loss_terms_from_physics(50.0, 0.66, 1.5 / np.pi * (1 / 2.26e-3 + 1 / 7.24e-3), 2e-4)
# 450-ohm window line class: two 1.024 mm (18 AWG, ASTM B258, from memory) copper wires,
# R' = 2 Rs/(pi d) for both wires; VF 0.91 (common practice) and an assumed effective loss
# tangent of 1e-4 for the webbing (an input for the checks, not a measured value).
LADDER_K = loss_terms_from_physics(450.0, 0.91, 2 / (np.pi * 1.024e-3), 1e-4)

COAX = cables.Cable(id="coax-50", description="RG-213 class coax", kind="coax",
                    z0_nominal_ohm=50.0, velocity_factor=0.66,
                    k_conductor=COAX_K[0], k_dielectric=COAX_K[1])
LADDER = cables.Cable(id="ladder-450", description="450-ohm window line class", kind="balanced",
                      z0_nominal_ohm=450.0, velocity_factor=0.91,
                      k_conductor=LADDER_K[0], k_dielectric=LADDER_K[1])

HF_TO_UHF_HZ = np.array([1.84e6, 3.6e6, 7.1e6, 14.2e6, 28.5e6, 50.1e6, 146e6, 435e6])
HF_TO_VHF_HZ = np.array([1.84e6, 3.6e6, 7.1e6, 14.2e6, 28.5e6, 50.1e6, 146e6])
LOADS_OHM = {"12-j30": 12 - 30j, "300+j400": 300 + 400j, "5000": 5000.0 + 0j}
Z_REF_OHM = 50.0


def arrl_total_loss_db(matched_loss_db, rho_magnitude):
    """Total loss of a real-Z0 line with a mismatched load.

    ARRL Antenna Book, transmission-line chapter (total loss with SWR):
    TL = 10 log10[(a^2 - |rho|^2) / (a (1 - |rho|^2))], a = 10^(ML/10).
    """
    a = 10 ** (matched_loss_db / 10)
    return 10 * np.log10((a * a - rho_magnitude**2) / (a * (1 - rho_magnitude**2)))


def arrl_input_rho(matched_loss_db, rho_magnitude):
    """|rho| at the input of a real-Z0 line: |rho_L| / a (ARRL Antenna Book, same section)."""
    return rho_magnitude / 10 ** (matched_loss_db / 10)


def arrl_input_swr(matched_loss_db, rho_magnitude):
    """SWR at the input of a real-Z0 line from |rho_in| (Pozar, 4th ed., section 2.3)."""
    rho_in = arrl_input_rho(matched_loss_db, rho_magnitude)
    return (1 + rho_in) / (1 - rho_in)


def load_rho(name, z0_ohm):
    """Reflection against the 50-ohm reference of a named load; "matched" is the line's own Z0."""
    z_load = z0_ohm if name == "matched" else np.full(z0_ohm.shape, LOADS_OHM[name])
    return (z_load - Z_REF_OHM) / (z_load + Z_REF_OHM)


# --- exact line solution against scikit-rf -------------------------------------------------

LINE_CASES = {
    "coax-30m": (COAX, 30.0, HF_TO_UHF_HZ),
    "coax-100m": (COAX, 100.0, HF_TO_UHF_HZ),
    "ladder-30m": (LADDER, 30.0, HF_TO_VHF_HZ),
}


@pytest.mark.parametrize("load_name", ["matched", *LOADS_OHM])
@pytest.mark.parametrize("case", list(LINE_CASES))
def test_line_matches_scikit_rf(case, load_name):
    cable, length_m, frequency_hz = LINE_CASES[case]
    z0, gamma = cable.constants(frequency_hz)
    assert np.all(np.abs(z0.imag) > 5e-4 * np.abs(z0.real))  # Z0 really is complex here
    rho_50 = load_rho(load_name, z0)

    solution = solver.solve_path([elements.Line(cable, length_m).abcd(frequency_hz)], rho_50,
                                 Z_REF_OHM, 100.0)
    z_in = solution.voltage_v[0] / solution.current_a[0]
    power_ratio = solution.power_w[1] / solution.power_w[0]

    # scikit-rf: S-parameters of the line in its own (complex) Z0 are [[0, e^-gl], [e^-gl, 0]],
    # renormalised to real 50-ohm ports; with real port impedances power waves and pseudo-waves
    # coincide, so net power at a port is |a|^2 - |b|^2 without any convention question.
    frequency = skrf.Frequency.from_f(frequency_hz, unit="hz")
    media = skrf.media.DefinedGammaZ0(frequency, z0_port=Z_REF_OHM, z0=z0, gamma=gamma)
    line = media.line(length_m, unit="m")
    terminated = line ** media.load(rho_50)
    z_in_skrf = terminated.z[:, 0, 0]
    s = line.s
    rho_in_skrf = terminated.s[:, 0, 0]
    # waves at the load: b2 = S21 a1 / (1 - S22 rho_L), a2 = rho_L b2; P_load = |b2|^2 (1 - |rho_L|^2),
    # P_in = |a1|^2 (1 - |rho_in|^2) with a1 = 1 (Pozar, Microwave Engineering, 4th ed., section 4.3,
    # scattering matrix, and section 12.1, two-port power gains).
    power_ratio_skrf = (np.abs(s[:, 1, 0]) ** 2 * (1 - np.abs(rho_50) ** 2)
                        / (np.abs(1 - s[:, 1, 1] * rho_50) ** 2 * (1 - np.abs(rho_in_skrf) ** 2)))

    # two independent double-precision computations: agreement to rounding, 1e-9 leaves room
    # for the growth of rounding with e^(2 alpha l) and with high SWR.
    np.testing.assert_allclose(z_in, z_in_skrf, rtol=1e-9)
    np.testing.assert_allclose(power_ratio, power_ratio_skrf, rtol=1e-9)


@pytest.mark.parametrize("s_def", ["power", "pseudo", "traveling"])
@pytest.mark.parametrize("load_name", ["matched", *LOADS_OHM])
def test_input_impedance_is_free_of_the_wave_convention(s_def, load_name):
    # With the line's own complex Z0 as port impedance the S-parameters depend on the wave
    # definition, the input impedance does not (Kurokawa, IEEE Trans. MTT 13 (1965) 194, power
    # waves; Marks and Williams, J. Res. NIST 97 (1992) 533, pseudo-waves).
    frequency_hz = HF_TO_UHF_HZ
    z0, gamma = COAX.constants(frequency_hz)
    z_load = z0 if load_name == "matched" else np.full(z0.shape, LOADS_OHM[load_name])
    frequency = skrf.Frequency.from_f(frequency_hz, unit="hz")
    media = skrf.media.DefinedGammaZ0(frequency, z0=z0, gamma=gamma)
    load = skrf.Network.from_z(z_load.reshape(-1, 1, 1), frequency=frequency, z0=z0, s_def=s_def)
    z_in_skrf = (media.line(30.0, unit="m", s_def=s_def) ** load).z[:, 0, 0]

    solution = solver.solve_path([elements.Line(COAX, 30.0).abcd(frequency_hz)],
                                 loads.rho_from_impedance(z_load, Z_REF_OHM), Z_REF_OHM, 100.0)
    np.testing.assert_allclose(solution.voltage_v[0] / solution.current_a[0], z_in_skrf, rtol=1e-9)


@pytest.mark.parametrize("case", list(LINE_CASES))
def test_matched_line_power_decays_as_exp_minus_2_alpha_l(case):
    # A line terminated in its own Z0 carries one travelling wave, so P(l)/P(0) = e^(-2 alpha l)
    # exactly, complex Z0 or not (Pozar, Microwave Engineering, 4th ed., section 2.7).
    cable, length_m, frequency_hz = LINE_CASES[case]
    z0, gamma = cable.constants(frequency_hz)
    solution = solver.solve_path([elements.Line(cable, length_m).abcd(frequency_hz)],
                                 load_rho("matched", z0), Z_REF_OHM, 100.0)
    np.testing.assert_allclose(solution.power_w[1] / solution.power_w[0],
                               np.exp(-2 * gamma.real * length_m), rtol=1e-12)
    # and the SWR an SWR meter for that line would read is 1 at both ends
    for node in (0, 1):
        rho = solver.reflection(solution.voltage_v[node], solution.current_a[node], z0)
        np.testing.assert_allclose(np.abs(rho), 0.0, atol=1e-12)


# --- closed-form total loss with SWR ---------------------------------------------------------

@pytest.mark.parametrize("length_m", [10.0, 30.0, 100.0])
@pytest.mark.parametrize("load_name", ["50", *LOADS_OHM])
def test_real_z0_line_total_loss_and_input_swr_are_the_arrl_closed_form(length_m, load_name):
    # A line with a real Z0 (any alpha, beta): the ARRL formula is exact, so only rounding is left;
    # 1e-9 dB and 1e-9 relative are far inside the 0.01 dB that a report shows.
    frequency_hz = HF_TO_UHF_HZ
    _, gamma = COAX.constants(frequency_hz)
    z0 = np.full(frequency_hz.shape, 50.0 + 0j)
    z_load = 50.0 if load_name == "50" else LOADS_OHM[load_name]
    rho_load = np.full(frequency_hz.shape, (z_load - 50.0) / (z_load + 50.0))
    solution = solver.solve_path([twoports.line_abcd(z0, gamma, length_m)], rho_load, 50.0, 100.0)

    total_loss_db = 10 * np.log10(solution.power_w[0] / solution.power_w[1])
    matched_loss_db = DB_PER_NEPER * gamma.real * length_m
    np.testing.assert_allclose(total_loss_db, arrl_total_loss_db(matched_loss_db, np.abs(rho_load)),
                               rtol=0, atol=1e-9)
    rho_in = solver.reflection(solution.voltage_v[0], solution.current_a[0], 50.0)
    np.testing.assert_allclose(solver.swr_from_rho(rho_in),
                               arrl_input_swr(matched_loss_db, np.abs(rho_load)), rtol=1e-9)


@pytest.mark.parametrize("length_m", [30.0, 100.0])
@pytest.mark.parametrize("load_name", ["50", *LOADS_OHM])
def test_dielectric_loss_line_budget_is_the_arrl_closed_form(length_m, load_name, make_station):
    # k_conductor = 0: R' = 0 and Z0 = 50/sqrt(1 - j tan(delta)), real to 1e-4, so the real-Z0
    # closed form holds (ARRL Antenna Book, transmission-line chapter) to 0.01 dB, except for
    # what the small angle theta of Z0 leaves at high SWR: net power at a point is
    # |V+|^2/|Z0| [(1 - |rho|^2) cos(theta) - 2 Im(rho) sin(theta)] (Re(V I*) of the wave solution,
    # Pozar, 4th ed., sections 2.1 and 2.7, with Z0 = |Z0| e^(j theta)), so each end can move the
    # loss by up to
    # 10 log10(e) 2 tan(theta) |rho| / (1 - |rho|^2): 0.04 dB for the 5000-ohm load (SWR 100).
    cable = cables.Cable(id="pe-dielectric-only", description="lossless conductors, PE dielectric",
                         kind="coax", z0_nominal_ohm=50.0, velocity_factor=0.66,
                         k_conductor=0.0, k_dielectric=COAX_K[1])
    frequency_hz = np.array([146e6, 435e6, 1296e6, 2400e6])
    z_load = 50.0 if load_name == "50" else LOADS_OHM[load_name]
    antenna = loads.ImpedanceTable(frequency_hz, np.full(frequency_hz.shape, z_load, dtype=complex))
    result = budget.solve_budget(make_station([elements.Line(cable, length_m)], frequency_hz, antenna))

    _, gamma = cable.constants(frequency_hz)
    matched_loss_db = DB_PER_NEPER * gamma.real * length_m
    assert matched_loss_db[-1] > 1.5  # the check has teeth: dB of dielectric loss
    rho = abs((z_load - 50.0) / (z_load + 50.0))
    np.testing.assert_allclose(result.matched_loss_db, matched_loss_db, rtol=1e-12)
    z0, _ = cable.constants(frequency_hz)
    tan_theta = np.max(np.abs(z0.imag / z0.real))
    assert tan_theta < 2e-4
    rho_in = arrl_input_rho(matched_loss_db, rho)
    theta_term_db = 10 * np.log10(np.e) * 2 * tan_theta * (rho / (1 - rho**2) + rho_in / (1 - rho_in**2))
    error_db = np.abs(result.total_loss_db - arrl_total_loss_db(matched_loss_db, rho))
    assert np.all(error_db <= np.maximum(0.01, theta_term_db)), (error_db, theta_term_db)
    # |rho| at the radio end, against 50 ohm rather than the line's Z0: 50 ohm is within 1e-4 of
    # Z0, which moves |rho| by less than 1e-4 (and a high SWR by SWR times that, so compare |rho|).
    rho_radio = (result.swr_radio - 1) / (result.swr_radio + 1)  # SWR definition inverted, Pozar 2.3
    np.testing.assert_allclose(rho_radio, arrl_input_rho(matched_loss_db, rho), rtol=0, atol=1e-3)


PHASE_SAMPLES = 360


@pytest.mark.parametrize("length_m", [30.0, 100.0])
@pytest.mark.parametrize("swr", [3.0, 6.0, 10.0])
def test_conductor_loss_coax_phase_average_is_the_arrl_closed_form(length_m, swr):
    # Coax with mostly conductor loss has a complex Z0 (50.8 - j0.8 ohm at 1.8 MHz here); the loss
    # then depends on the phase of the load, but its average over that phase, with |rho| fixed
    # against the line's own Z0, is the real-Z0 closed form (ARRL Antenna Book, transmission-line
    # chapter) to 0.01 dB, the resolution of a loss report (observed: at most 0.006 dB).
    frequency_hz = HF_TO_UHF_HZ
    z0, gamma = COAX.constants(frequency_hz)
    rho_magnitude = (swr - 1) / (swr + 1)
    rho_own = rho_magnitude * np.exp(2j * np.pi * np.arange(PHASE_SAMPLES) / PHASE_SAMPLES)[:, None]
    z_load = z0 * (1 + rho_own) / (1 - rho_own)  # (phases, nf)
    solution = solver.solve_path([elements.Line(COAX, length_m).abcd(frequency_hz)],
                                 loads.rho_from_impedance(z_load, Z_REF_OHM), Z_REF_OHM, 100.0)
    per_phase_db = 10 * np.log10(solution.power_w[:, 0] / solution.power_w[:, 1])
    expected_db = arrl_total_loss_db(DB_PER_NEPER * gamma.real * length_m, rho_magnitude)

    np.testing.assert_allclose(per_phase_db.mean(axis=0), expected_db, rtol=0, atol=0.01)
    # single phases spread around it: the closed form is only the average
    spread_db = per_phase_db.max(axis=0) - per_phase_db.min(axis=0)
    assert np.all(spread_db > 0.005)
    assert np.all((per_phase_db.min(axis=0) < expected_db) & (expected_db < per_phase_db.max(axis=0)))


@pytest.mark.parametrize("length_m", [30.0, 100.0])
@pytest.mark.parametrize("swr", [3.0, 6.0, 10.0])
def test_swr_only_budget_is_the_arrl_closed_form_on_average(length_m, swr, make_station):
    # The budget of an SWR-only antenna: SWR against the 50-ohm reference, phase unknown, loss
    # from the phase-mean delivered power. From 3.5 MHz up the coax's Z0 is within 2 % of 50 ohm,
    # so the closed form (ARRL Antenna Book, transmission-line chapter) holds to 0.01 dB
    # (observed: at most 0.005 dB).
    # (At 1.8 MHz Z0 = 50.8 - j0.8 ohm and SWR 10 against 50 ohm is no longer SWR 10 against Z0;
    # the test above covers that band with |rho| against Z0.)
    frequency_hz = HF_TO_UHF_HZ[1:]
    antenna = loads.SwrTable(frequency_hz, np.full(frequency_hz.shape, swr))
    result = budget.solve_budget(make_station([elements.Line(COAX, length_m)], frequency_hz, antenna))
    _, gamma = COAX.constants(frequency_hz)
    matched_loss_db = DB_PER_NEPER * gamma.real * length_m
    rho_magnitude = (swr - 1) / (swr + 1)
    expected_db = arrl_total_loss_db(matched_loss_db, rho_magnitude)

    np.testing.assert_allclose(result.total_loss_db, expected_db, rtol=0, atol=0.01)
    # |rho| at the radio from the phase-mean |rho|: |rho_L|/a to 0.01 (Z0 within 2 % of 50 ohm
    # moves |rho| by at most about half that)
    rho_radio = (result.swr_radio - 1) / (result.swr_radio + 1)  # SWR definition inverted, Pozar 2.3
    np.testing.assert_allclose(rho_radio, arrl_input_rho(matched_loss_db, rho_magnitude),
                               rtol=0, atol=0.01)
    least_db, most_db = result.total_loss_db_range[:, 0], result.total_loss_db_range[:, 1]
    assert np.all((least_db < result.total_loss_db) & (result.total_loss_db < most_db))

    # the budget's phase sampling against a dense one (0.1 degree steps): the mean of a smooth
    # periodic function by the trapezoid rule converges geometrically (Trefethen and Weideman,
    # SIAM Review 56 (2014) 385), so 1e-6 dB; least and most to the 0.005 dB that budget.py claims.
    dense = np.exp(2j * np.pi * np.arange(3600) / 3600)[:, None] * rho_magnitude
    dense_solution = solver.solve_path([elements.Line(COAX, length_m).abcd(frequency_hz)],
                                       dense * np.ones(frequency_hz.size), Z_REF_OHM, 100.0)
    dense_db = 10 * np.log10(dense_solution.power_w[:, 0] / dense_solution.power_w[:, 1])
    np.testing.assert_allclose(result.total_loss_db,
                               10 * np.log10(100.0 / dense_solution.power_w[:, 1].mean(axis=0)),
                               rtol=0, atol=1e-6)
    np.testing.assert_allclose(least_db, dense_db.min(axis=0), rtol=0, atol=0.005)
    np.testing.assert_allclose(most_db, dense_db.max(axis=0), rtol=0, atol=0.005)
    if length_m == 100.0 and swr == 10.0:  # a long lossy line at high SWR
        assert np.all(most_db - least_db > 0.005)


# --- energy balance and the identity ---------------------------------------------------------

def _heat_along_line_w(cable, frequency_hz, length_m, voltage_load_v, current_load_a):
    """Heat in a line, integral of R'|I|^2 + G'|V|^2 over its length.

    V(d) = V+ e^(gd) + V- e^(-gd), I(d) = (V+ e^(gd) - V- e^(-gd))/Z0 at distance d from the load
    (Pozar, Microwave Engineering, 4th ed., section 2.1, and section 2.7 for the power lost per
    metre in the perturbation method); composite 20-point Gauss-Legendre on 200 panels, exact to
    rounding for these oscillations (at most about 16 wavelengths on a line here).
    """
    rlgc = cable.rlgc(frequency_hz)
    z0, gamma = cables.line_constants(frequency_hz, rlgc)
    forward = (voltage_load_v + z0 * current_load_a) / 2
    backward = (voltage_load_v - z0 * current_load_a) / 2
    nodes, weights = np.polynomial.legendre.leggauss(20)
    edges = np.linspace(0.0, length_m, 201)
    half = np.diff(edges)[:, None] / 2
    d = ((edges[:-1, None] + half) + half * nodes[None, :]).ravel()[:, None]  # (points, 1)
    w = (half * weights[None, :]).ravel()[:, None]
    v = forward * np.exp(gamma * d) + backward * np.exp(-gamma * d)
    i = (forward * np.exp(gamma * d) - backward * np.exp(-gamma * d)) / z0
    heat_per_m = rlgc.r_ohm_per_m * np.abs(i) ** 2 + rlgc.g_s_per_m * np.abs(v) ** 2
    return (w * heat_per_m).sum(axis=0)


@pytest.mark.parametrize("load_name", ["matched", *LOADS_OHM])
def test_energy_balance_and_heat_integrated_along_the_lines(load_name, make_station):
    # Radio power = antenna power + heat in every element; and each line's heat, integrated
    # from R' and G' along it (Poynting's theorem for the line), equals what the solver booked.
    frequency_hz = HF_TO_VHF_HZ
    feed = (elements.Line(COAX, 12.0), elements.Line(LADDER, 30.0), elements.Line(COAX, 3.0))
    z0_last, _ = COAX.constants(frequency_hz)
    rho = load_rho(load_name, z0_last)
    result = budget.solve_budget(make_station(feed, frequency_hz, Z_REF_OHM * (1 + rho) / (1 - rho)))

    heat_w = sum(e.dissipated_w for e in result.elements)
    np.testing.assert_allclose(result.power_antenna_w + heat_w, result.power_radio_w, rtol=1e-9)
    np.testing.assert_allclose(result.power_radio_w, 100.0, rtol=1e-12)
    sol = result.solution
    for k, element in enumerate(feed):
        heat = _heat_along_line_w(element.cable, frequency_hz, element.length_m,
                                  sol.voltage_v[k + 1], sol.current_a[k + 1])
        np.testing.assert_allclose(result.elements[k].dissipated_w, heat, rtol=1e-9, atol=1e-9 * 100.0)


def test_zero_length_line_is_the_identity():
    frequency_hz = HF_TO_UHF_HZ
    for cable in (COAX, LADDER):
        z0, gamma = cable.constants(frequency_hz)
        abcd = twoports.line_abcd(z0, gamma, 0.0)
        assert abcd.shape == (frequency_hz.size, 2, 2)
        np.testing.assert_array_equal(abcd, np.broadcast_to(np.eye(2), abcd.shape))
        rho = load_rho("300+j400", z0)
        solution = solver.solve_path([elements.Line(cable, 0.0).abcd(frequency_hz)], rho, 50.0, 100.0)
        np.testing.assert_array_equal(solution.voltage_v[0], solution.voltage_v[1])
        np.testing.assert_array_equal(solution.current_a[0], solution.current_a[1])
        np.testing.assert_array_equal(solution.dissipated_w, 0.0)


# --- properties ------------------------------------------------------------------------------

def _log_uniform(low, high):
    return st.floats(np.log10(low), np.log10(high)).map(lambda x: 10.0**x)


@st.composite
def random_cables(draw):
    """Cable constants spanning thin lossy coax to open-wire line (k_c up to ~2x RG-58 class)."""
    return cables.Cable(
        id="random", description="random constants", kind="coax",
        z0_nominal_ohm=draw(st.floats(20.0, 600.0)),
        velocity_factor=draw(st.floats(0.5, 1.0)),
        k_conductor=draw(st.one_of(st.just(0.0), _log_uniform(1e-9, 3e-6))),
        k_dielectric=draw(st.one_of(st.just(0.0), _log_uniform(1e-14, 2e-11))),
    )


FREQUENCIES = st.lists(_log_uniform(1e5, 3e9), min_size=1, max_size=4).map(np.array)
LENGTHS_M = _log_uniform(1e-3, 1e3)
# Paths beyond this total matched loss are outside any station; the solver's raw cascade grows
# as e^(2 alpha l) and would overflow double precision near 700 Np (about 3000 dB).
MAX_PATH_NEPERS = 150.0


def _passive_rho(draw, size, max_magnitude):
    magnitude = np.array(draw(st.lists(st.floats(0.0, max_magnitude), min_size=size, max_size=size)))
    phase = np.array(draw(st.lists(st.floats(-np.pi, np.pi), min_size=size, max_size=size)))
    return magnitude * np.exp(1j * phase)


@PROPERTY_SETTINGS
@given(data=st.data(), frequency_hz=FREQUENCIES)
def test_property_energy_balance_for_random_paths(data, frequency_hz):
    lines = data.draw(st.lists(st.tuples(random_cables(), LENGTHS_M), min_size=1, max_size=3))
    path_nepers = sum(c.constants(frequency_hz)[1].real * length for c, length in lines)
    assume(np.all(path_nepers < MAX_PATH_NEPERS))
    rho_load = _passive_rho(data.draw, frequency_hz.size, 0.999)
    radio_power_w = data.draw(st.floats(1e-3, 1e4))

    solution = solver.solve_path([elements.Line(c, length).abcd(frequency_hz) for c, length in lines],
                                 rho_load, Z_REF_OHM, radio_power_w)
    np.testing.assert_allclose(solution.power_w[0], radio_power_w, rtol=1e-12)
    np.testing.assert_allclose(solution.power_w[-1] + solution.dissipated_w.sum(axis=0),
                               radio_power_w, rtol=1e-9)
    # every line is passive: it never gives power back (rounding allowance 1e-9 of the radio power)
    assert np.all(solution.dissipated_w >= -1e-9 * radio_power_w)
    assert np.all(solution.power_w[-1] >= -1e-9 * radio_power_w)


@PROPERTY_SETTINGS
@given(data=st.data(), frequency_hz=FREQUENCIES, length_m=LENGTHS_M)
def test_property_lossy_line_never_raises_rho(data, frequency_hz, length_m):
    # Against the line's own Z0, rho_in = rho_L e^(-2 gamma l) (Pozar, Microwave Engineering, 4th
    # ed., section 2.7): |rho| can only shrink toward the input of a lossy line.
    cable = data.draw(random_cables())
    cable = cables.Cable(id=cable.id, description=cable.description, kind=cable.kind,
                         z0_nominal_ohm=cable.z0_nominal_ohm, velocity_factor=cable.velocity_factor,
                         k_conductor=data.draw(_log_uniform(1e-9, 3e-6)),  # always lossy
                         k_dielectric=cable.k_dielectric)
    z0, gamma = cable.constants(frequency_hz)
    assume(np.all(gamma.real * length_m < MAX_PATH_NEPERS))
    rho_load_50 = _passive_rho(data.draw, frequency_hz.size, 1.0)  # any passive load, reactances too

    solution = solver.solve_path([elements.Line(cable, length_m).abcd(frequency_hz)],
                                 rho_load_50, Z_REF_OHM, 100.0)
    rho_in = np.abs(solver.reflection(solution.voltage_v[0], solution.current_a[0], z0))
    rho_out = np.abs(solver.reflection(solution.voltage_v[1], solution.current_a[1], z0))
    assert np.all(rho_in <= rho_out + 1e-12)
    np.testing.assert_allclose(rho_in, rho_out * np.exp(-2 * gamma.real * length_m), rtol=0, atol=1e-9)


@PROPERTY_SETTINGS
@given(a=st.floats(0.0, 2.0), b=st.floats(0.0, 2.0), phase=st.floats(-np.pi, np.pi))
def test_property_swr_is_monotonic_in_rho_and_at_least_one(a, b, phase):
    # SWR = (1 + |rho|)/(1 - |rho|) grows with |rho| from 1 (Pozar, 4th ed., section 2.3).
    low, high = min(a, b), max(a, b)
    swr_low, swr_high = solver.swr_from_rho(low), solver.swr_from_rho(high)
    assert swr_low >= 1.0 and swr_high >= 1.0
    assert swr_low <= swr_high
    if high >= 1.0:  # a short, open or pure reactance (or beyond): no finite SWR
        assert swr_high == np.inf
    if low == 0.0:
        assert swr_low == 1.0
    # only |rho| counts; |low e^(j phase)| differs from low by rounding, hence rtol
    rotated = solver.swr_from_rho(low * np.exp(1j * phase))
    assert rotated >= 1.0
    if low < 0.99:
        np.testing.assert_allclose(rotated, swr_low, rtol=1e-12)


# --- vectorisation ---------------------------------------------------------------------------

def test_array_of_lengths_equals_solving_each_length():
    frequency_hz = HF_TO_VHF_HZ
    lengths_m = np.array([0.0, 1.5, 10.0, 33.3, 120.0])
    z0, _ = COAX.constants(frequency_hz)
    rho = load_rho("12-j30", z0)

    swept = elements.Line(COAX, lengths_m)
    assert swept.abcd(frequency_hz).shape == (lengths_m.size, frequency_hz.size, 2, 2)
    assert swept.matched_loss_db(frequency_hz).shape == (lengths_m.size, frequency_hz.size)
    jumper = elements.Line(COAX, 2.0)
    ladder = elements.Line(LADDER, 20.0)
    solution = solver.solve_path([jumper.abcd(frequency_hz), swept.abcd(frequency_hz),
                                  ladder.abcd(frequency_hz)], rho, Z_REF_OHM, 100.0)
    assert solution.voltage_v.shape == (lengths_m.size, 4, frequency_hz.size)
    assert solution.dissipated_w.shape == (lengths_m.size, 3, frequency_hz.size)

    for k, length_m in enumerate(lengths_m):
        single_line = elements.Line(COAX, float(length_m))
        single = solver.solve_path([jumper.abcd(frequency_hz), single_line.abcd(frequency_hz),
                                    ladder.abcd(frequency_hz)], rho, Z_REF_OHM, 100.0)
        # same arithmetic in a different array layout: equal to rounding
        for name in ("voltage_v", "current_a", "power_w", "dissipated_w"):
            np.testing.assert_allclose(getattr(solution, name)[k], getattr(single, name),
                                       rtol=1e-12, atol=1e-12, err_msg=name)
        np.testing.assert_allclose(swept.matched_loss_db(frequency_hz)[k],
                                   single_line.matched_loss_db(frequency_hz), rtol=1e-12)


def test_length_axis_broadcasts_with_a_phase_axis():
    # (lengths, 1, nf) chain matrices against (phases, nf) loads: the axes broadcast.
    frequency_hz = HF_TO_VHF_HZ
    lengths_m = np.array([5.0, 50.0])[:, None]  # (L, 1)
    rho = 0.5 * np.exp(2j * np.pi * np.arange(8) / 8)[:, None] * np.ones(frequency_hz.size)
    solution = solver.solve_path([elements.Line(COAX, lengths_m).abcd(frequency_hz)], rho,
                                 Z_REF_OHM, 100.0)
    assert solution.power_w.shape == (2, 8, 2, frequency_hz.size)
    for k in range(2):
        single = solver.solve_path([elements.Line(COAX, float(lengths_m[k, 0])).abcd(frequency_hz)],
                                   rho, Z_REF_OHM, 100.0)
        np.testing.assert_allclose(solution.power_w[k], single.power_w, rtol=1e-12)


# --- known bug -------------------------------------------------------------------------------

@pytest.mark.parametrize("line_count", [0, 1])
def test_lossless_path_into_a_reactance_is_refused_not_scaled_to_noise(line_count):
    # A lossless line dissipates nothing (R' = G' = 0; Pozar, 4th ed., section 2.1), and a pure
    # reactance (|rho| = 1) absorbs nothing: no radio power can flow. Either refuse the path
    # (ValueError), or book no heat in the line and no NaN; never 100 W of heat.
    lossless = cables.Cable(id="lossless", description="ideal line", kind="coax",
                            z0_nominal_ohm=50.0, velocity_factor=0.66)
    frequency_hz = np.array([7.1e6])
    abcd_list = [elements.Line(lossless, 10.0).abcd(frequency_hz)] * line_count
    try:
        solution = solver.solve_path(abcd_list, np.array([1j]), Z_REF_OHM, 100.0)
    except ValueError:
        return
    assert np.all(np.isfinite(solution.voltage_v)) and np.all(np.isfinite(solution.power_w))
    assert np.all(np.abs(solution.dissipated_w) <= 1e-9 * 100.0), solution.dissipated_w
