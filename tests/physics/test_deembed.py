"""Checks of de-embedding, embedding, shack readings and the sensitivity multiplier.

Independent references: scikit-rf's network cascade (``**``) and inverse (``Network.inv``)
on the same networks; numpy's general matrix inverse and linear solver; the closed-form
relation of the ARRL Antenna Book between |rho| at the two ends of a line of real
characteristic impedance; dense sampling and finite differences for the closed-form circle
extremes and derivative.
"""
from __future__ import annotations

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from scipy.optimize import minimize_scalar

from linecalc.physics import cascade, deembed
from linecalc import elements
from linecalc.physics import twoports
from linecalc.physics.cables import Cable

skrf = pytest.importorskip("skrf")

PROPERTY_SETTINGS = settings(derandomize=True, database=None, max_examples=100, deadline=None,
                             suppress_health_check=[HealthCheck.too_slow])
Z_REF_OHM = 50.0
DB_PER_NEPER = 20 * np.log10(np.e)
SPEED_OF_LIGHT = 299_792_458.0
FREQUENCY_HZ = np.array([1.85e6, 3.6e6, 7.1e6, 14.2e6, 21.2e6, 28.5e6, 50.2e6])
# A 50-ohm coax of the RG-213 class described by its loss terms (inputs for these checks, the
# same size as in tests/physics/test_cascade.py): its Z0 is complex, as a real cable's is.
COAX = Cable(id="coax-50", description="RG-213 class coax", kind="coax", z0_nominal_ohm=50.0,
             velocity_factor=0.66, k_conductor=2.0e-6, k_dielectric=3.2e-12)
LOADS_OHM = np.array([12 - 30j, 50 + 0j, 73 + 40j, 300 - 450j, 2 + 1j, 1500 + 800j, 35 - 5j])


def coax_line(length_m):
    return elements.Line(COAX, length_m)


def real_z0_line_abcd(frequency_hz, alpha_np_per_m, length_m, z0_ohm=Z_REF_OHM):
    """A line of real Z0 (a distortionless line: R'/L' = G'/C') with attenuation alpha."""
    beta = 2 * np.pi * frequency_hz / (0.66 * SPEED_OF_LIGHT)
    return twoports.line_abcd(z0_ohm, alpha_np_per_m + 1j * beta, length_m)


def mixed_path():
    """Coax, a lossy series inductor, a shunt capacitor, a 4:1 balun with loss, more coax."""
    f = FREQUENCY_HZ
    return [
        coax_line(18.0).abcd(f),
        elements.LumpedPart("L", "series", Z_REF_OHM, resistance_ohm=0.4, inductance_h=0.35e-6).abcd(f),
        elements.LumpedPart("C", "shunt", Z_REF_OHM, capacitance_f=60e-12).abcd(f),
        twoports.transformer_abcd(4.0, f) * np.ones((1, 1)),
        coax_line(7.0).abcd(f),
    ]


def skrf_mixed_path():
    """The same path built from scikit-rf's own element models, all ports referred to 50 ohm."""
    frequency = skrf.Frequency.from_f(FREQUENCY_HZ, unit="hz")
    z0, gamma = COAX.constants(FREQUENCY_HZ)
    coax = skrf.media.DefinedGammaZ0(frequency, z0_port=Z_REF_OHM, z0=z0, gamma=gamma)
    lumped = skrf.media.DefinedGammaZ0(frequency, z0=Z_REF_OHM)
    # ideal 4:1 (impedance) transformer, turns ratio 2 toward the antenna: ABCD [[1/N, 0], [0, N]]
    # for an N:1 step-down seen from the input (Pozar, Microwave Engineering, 4th ed., Table 4.1)
    turns = 2.0
    ideal = np.zeros((FREQUENCY_HZ.size, 2, 2), dtype=complex)
    ideal[:, 0, 0], ideal[:, 1, 1] = 1 / turns, turns
    transformer = skrf.Network(frequency=frequency, s=skrf.network.a2s(ideal, Z_REF_OHM), z0=Z_REF_OHM)
    return (coax.line(18.0, unit="m") ** lumped.resistor(0.4) ** lumped.inductor(0.35e-6)
            ** lumped.shunt_capacitor(60e-12) ** transformer ** coax.line(7.0, unit="m"))


def test_embed_and_deembed_match_scikit_rf_cascade_and_inverse():
    path = mixed_path()
    chain = skrf_mixed_path()
    frequency = chain.frequency
    load = skrf.Network.from_z(LOADS_OHM.reshape(-1, 1, 1), frequency=frequency, z0=Z_REF_OHM)
    measured = chain ** load  # scikit-rf's cascade
    recovered = chain.inv ** measured  # scikit-rf's de-embedding: the inverse network cascaded
    z_measured = measured.z[:, 0, 0]
    # two independent double-precision computations: agreement to rounding; 1e-9 leaves room
    # for the growth of rounding with the path's loss and the loads' SWR.
    np.testing.assert_allclose(deembed.embed_impedance(path, LOADS_OHM), z_measured, rtol=1e-9)
    np.testing.assert_allclose(deembed.deembed_impedance(path, z_measured), recovered.z[:, 0, 0], rtol=1e-9)
    np.testing.assert_allclose(deembed.deembed_impedance(path, z_measured), LOADS_OHM, rtol=1e-9)
    rho = deembed.deembed_rho(path, measured.s[:, 0, 0], Z_REF_OHM)
    np.testing.assert_allclose(rho, recovered.s[:, 0, 0], rtol=1e-9, atol=1e-12)


def test_non_reciprocal_path_against_scikit_rf_and_numpy():
    # A two-port with AD - BC != 1 (non-reciprocal): the inverse must not assume det = 1.
    rng = np.random.default_rng(4)
    abcd = rng.normal(size=(FREQUENCY_HZ.size, 2, 2)) + 1j * rng.normal(size=(FREQUENCY_HZ.size, 2, 2))
    abcd[:, 0, 1] *= 50.0
    abcd[:, 1, 0] /= 50.0
    assert np.all(np.abs(np.linalg.det(abcd) - 1) > 1e-3)
    frequency = skrf.Frequency.from_f(FREQUENCY_HZ, unit="hz")
    network = skrf.Network(frequency=frequency, s=skrf.network.a2s(abcd, Z_REF_OHM), z0=Z_REF_OHM)
    load = skrf.Network.from_z(LOADS_OHM.reshape(-1, 1, 1), frequency=frequency, z0=Z_REF_OHM)
    measured = (network ** load).z[:, 0, 0]
    path = [abcd, coax_line(10.0).abcd(FREQUENCY_HZ)]
    np.testing.assert_allclose(deembed.embed_impedance(path[:1], LOADS_OHM), measured, rtol=1e-9)
    np.testing.assert_allclose(deembed.deembed_impedance(path[:1], measured), LOADS_OHM, rtol=1e-9)
    # numpy's general inverse and solver, on the product formed by numpy's matmul
    np.testing.assert_allclose(deembed.inverse_abcd(abcd), np.linalg.inv(abcd), rtol=1e-12)
    total = path[0] @ path[1]
    np.testing.assert_allclose(cascade.cascade_abcd(path), total, rtol=1e-12)
    state = np.linalg.solve(total, np.stack([measured, np.ones_like(measured)], -1)[..., None])[..., 0]
    np.testing.assert_allclose(deembed.deembed_impedance(path, measured), state[:, 0] / state[:, 1], rtol=1e-9)


def test_singular_chain_matrix_is_refused():
    singular = np.array([[[1.0, 2.0], [2.0, 4.0]]], dtype=complex)
    with pytest.raises(ValueError, match="singular"):
        deembed.deembed_impedance([singular], np.array([50.0]))
    with pytest.raises(ValueError, match="singular"):
        deembed.inverse_abcd(singular)


@PROPERTY_SETTINGS
@given(resistance=st.floats(0.5, 5000.0), reactance=st.floats(-5000.0, 5000.0),
       length_m=st.floats(0.5, 120.0), stub_pf=st.floats(1.0, 500.0))
def test_embed_then_deembed_returns_the_load(resistance, reactance, length_m, stub_pf):
    f = FREQUENCY_HZ
    path = [coax_line(length_m).abcd(f), elements.LumpedPart("C", "shunt", 50.0, capacitance_f=stub_pf * 1e-12).abcd(f),
            coax_line(3.0).abcd(f)]
    z_load = np.full(f.shape, complex(resistance, reactance))
    np.testing.assert_allclose(deembed.deembed_impedance(path, deembed.embed_impedance(path, z_load)), z_load,
                               rtol=1e-9)
    z0 = coax_line(3.0).port_z0_ohm(f)[1]
    rho = (z_load - z0) / (z_load + z0)
    np.testing.assert_allclose(deembed.deembed_rho(path, deembed.embed_rho(path, rho, 50.0, z0), 50.0, z0), rho,
                               rtol=1e-9, atol=1e-12)


def test_open_and_short_through_a_quarter_wave():
    # A lossless quarter-wave line has ABCD [[0, jZ0], [j/Z0, 0]] (Pozar, Microwave Engineering,
    # 4th ed., Table 4.1 with beta l = pi/2): it turns a short into an open and back.
    quarter = np.array([[[0, 50j], [1j / 50, 0]]])
    assert np.isinf(deembed.embed_impedance([quarter], np.array([0j]))[0])
    assert deembed.deembed_impedance([quarter], np.array([complex(np.inf, 0)]))[0] == 0
    np.testing.assert_allclose(deembed.embed_impedance([quarter], np.array([100 + 0j])), [25 + 0j])
    assert deembed.deembed_rho([quarter], np.array([1 + 0j]), 50.0)[0] == pytest.approx(-1)


@pytest.mark.parametrize("length_m", [5.0, 30.0, 80.0])
@pytest.mark.parametrize("alpha_np_per_m", [0.002, 0.01])
@pytest.mark.parametrize("rho_meter", [0.05, 0.2, 0.35])
def test_shack_reading_against_the_closed_form_for_a_line_of_real_z0(length_m, alpha_np_per_m, rho_meter):
    # ARRL Antenna Book, transmission-line chapter: on a line of real Z0 with matched loss ML dB,
    # |rho| at the antenna = |rho| at the meter * 10^(ML/10), whatever the phase.
    path = [real_z0_line_abcd(FREQUENCY_HZ, alpha_np_per_m, length_m)]
    matched_loss_db = DB_PER_NEPER * alpha_np_per_m * length_m
    expected = rho_meter * 10 ** (matched_loss_db / 10)
    result = deembed.antenna_range_from_reading(path, np.full(FREQUENCY_HZ.shape, rho_meter), Z_REF_OHM)
    for values in (result.rho_min, result.rho_max, result.rho_mean, np.abs(result.rho)):
        np.testing.assert_allclose(values, np.broadcast_to(expected, values.shape), rtol=1e-9)
    assert np.all(result.undetermined == (expected >= 1))
    # the inverse direction: |rho| at the meter = |rho| at the antenna * 10^(-ML/10)
    back = deembed.reading_range_from_antenna(path, result.rho_max, Z_REF_OHM)
    np.testing.assert_allclose(back.rho_min, rho_meter, rtol=1e-9)
    np.testing.assert_allclose(back.rho_max, rho_meter, rtol=1e-9)


def test_shack_reading_through_a_matched_attenuator():
    # A 3 dB matched pad: |rho| doubles (10^(3/10) = 1.995) from the meter to the load (ARRL
    # Antenna Book, transmission-line chapter; an attenuator is a line with no phase).
    path = [twoports.attenuator_abcd(3.0, Z_REF_OHM, FREQUENCY_HZ)]
    result = deembed.antenna_range_from_reading(path, np.array([0.1, 0.3, 0.45, 0.49, 0.5, 0.6, 0.9]), Z_REF_OHM)
    expected = np.array([0.1, 0.3, 0.45, 0.49, 0.5, 0.6, 0.9]) * 10 ** 0.3
    np.testing.assert_allclose(result.rho_max, expected, rtol=1e-12)
    # a reading of 0.6 or more cannot pin the load down: it would need |rho| >= 1 there
    assert result.undetermined.tolist() == [False, False, False, False, False, True, True]
    assert np.all(np.isinf(result.swr_max[result.undetermined]))


@pytest.mark.parametrize("rho_meter", [0.1, 0.3, 0.55])
def test_exact_circle_extremes_against_dense_sampling(rho_meter):
    path = mixed_path()
    z0 = coax_line(7.0).port_z0_ohm(FREQUENCY_HZ)[1]
    result = deembed.antenna_range_from_reading(path, np.full(FREQUENCY_HZ.shape, rho_meter), Z_REF_OHM, z0)
    # independent method: a dense phase sweep, then a bounded scalar search around its best sample
    samples = 20_000
    phase = np.exp(2j * np.pi * np.arange(samples) / samples)[:, None]
    sampled = np.abs(deembed.deembed_rho(path, rho_meter * phase, Z_REF_OHM, z0))
    multipliers = deembed.sensitivity_multiplier(path, rho_meter * phase, Z_REF_OHM, z0)

    def refine(values, k, sign, function):
        theta = 2 * np.pi * np.argmax(sign * values[:, k]) / samples
        step = 2 * np.pi / samples
        best = minimize_scalar(lambda t: -sign * function(t), bounds=(theta - step, theta + step),
                               method="bounded", options={"xatol": 1e-13})
        return -sign * best.fun

    for k in range(FREQUENCY_HZ.size):
        def rho_at(theta, k=k):
            rho = np.full(FREQUENCY_HZ.shape, rho_meter * np.exp(1j * theta))
            return np.abs(deembed.deembed_rho(path, rho, Z_REF_OHM, z0))[k]

        def multiplier_at(theta, k=k):
            rho = np.full(FREQUENCY_HZ.shape, rho_meter * np.exp(1j * theta))
            return deembed.sensitivity_multiplier(path, rho, Z_REF_OHM, z0)[k]

        assert result.rho_max[k] == pytest.approx(refine(sampled, k, 1, rho_at), rel=1e-10)
        assert result.rho_min[k] == pytest.approx(refine(sampled, k, -1, rho_at), rel=1e-9, abs=1e-12)
        assert result.sensitivity_max[k] == pytest.approx(refine(multipliers, k, 1, multiplier_at), rel=1e-10)
    # every sampled antenna, embedded again, reads rho_meter at the meter: the two directions
    # are inverses point by point
    np.testing.assert_allclose(np.abs(deembed.embed_rho(path, result.rho, Z_REF_OHM, z0)), rho_meter, rtol=1e-9)


def test_reading_becomes_undetermined_when_the_loss_is_high():
    # 150 m of the coax at 50 MHz: several dB of matched loss, so a modest reading already maps
    # to |rho| >= 1 for some phase; a low reading stays determined.
    path = [coax_line(150.0).abcd(FREQUENCY_HZ)]
    low = deembed.antenna_range_from_reading(path, np.full(FREQUENCY_HZ.shape, 0.005), Z_REF_OHM)
    high = deembed.antenna_range_from_reading(path, np.full(FREQUENCY_HZ.shape, 0.5), Z_REF_OHM)
    assert not low.undetermined.any()
    assert high.undetermined[-1]
    assert np.all(high.rho_max[high.undetermined] >= 1) or np.all(np.isinf(high.swr_max[high.undetermined]))


@pytest.mark.parametrize("length_m", [1.0, 25.0, 100.0])
def test_sensitivity_multiplier_of_a_matched_line(length_m):
    # Matched 50-ohm line of real Z0: rho_ant = rho_meter e^(2 gamma l), so
    # |d rho_ant / d rho_meter| = e^(2 alpha l) = 10^(ML/10) at every reading (ARRL Antenna Book,
    # transmission-line chapter, for the magnitudes; the derivative follows).
    alpha = 0.004
    path = [real_z0_line_abcd(FREQUENCY_HZ, alpha, length_m)]
    expected = 10 ** (DB_PER_NEPER * alpha * length_m / 10)
    for rho in (0.0, 0.3j, -0.5 + 0.1j):
        multiplier = deembed.sensitivity_multiplier(path, np.full(FREQUENCY_HZ.shape, rho), Z_REF_OHM)
        np.testing.assert_allclose(multiplier, expected, rtol=1e-12)


def test_sensitivity_multiplier_against_finite_differences():
    # The map is holomorphic, so a central difference in any direction estimates |d rho_ant/d rho|;
    # step 1e-6, truncation error of order step^2.
    path = mixed_path()
    z0 = coax_line(7.0).port_z0_ohm(FREQUENCY_HZ)[1]
    rho = np.full(FREQUENCY_HZ.shape, 0.2 - 0.15j)
    step = 1e-6
    for direction in (1.0, 1j, np.exp(0.7j)):
        h = step * direction
        forward, backward = (deembed.deembed_rho(path, rho + h, 50.0, z0), deembed.deembed_rho(path, rho - h, 50.0, z0))
        np.testing.assert_allclose(deembed.sensitivity_multiplier(path, rho, 50.0, z0),
                                   np.abs((forward - backward) / (2 * h)), rtol=1e-6)


def test_deembed_sweep_flags_an_active_result():
    # Measure a 5-ohm load through 10 m of coax but de-embed 120 m: the extra length the path
    # claims would need gain, so the recovered antenna comes out active (Re Z < 0).
    f = FREQUENCY_HZ
    z_measured = deembed.embed_impedance([coax_line(10.0).abcd(f)], np.full(f.shape, 5 + 0j))
    right = deembed.deembed_sweep([coax_line(10.0).abcd(f)], z_measured, Z_REF_OHM)
    wrong = deembed.deembed_sweep([coax_line(120.0).abcd(f)], z_measured, Z_REF_OHM)
    np.testing.assert_allclose(right.z_antenna_ohm, 5.0, rtol=1e-9)
    assert not right.active.any()
    assert wrong.active.any()
    assert np.all(right.sensitivity >= 1)
    np.testing.assert_allclose(right.swr_antenna, 10.0, rtol=1e-9)  # 50/5, against the 50-ohm reference


def test_range_shapes_broadcast_over_leading_axes():
    lengths = np.array([5.0, 20.0, 60.0])
    path = [coax_line(lengths).abcd(FREQUENCY_HZ)]  # (3, nf, 2, 2)
    result = deembed.antenna_range_from_reading(path, np.full(FREQUENCY_HZ.shape, 0.2), Z_REF_OHM,
                                                phase_samples=36)
    assert result.rho_max.shape == (3, FREQUENCY_HZ.size)
    assert result.rho.shape == (36, 3, FREQUENCY_HZ.size)
    for k, length in enumerate(lengths):
        single = deembed.antenna_range_from_reading([coax_line(length).abcd(FREQUENCY_HZ)],
                                                    np.full(FREQUENCY_HZ.shape, 0.2), Z_REF_OHM, phase_samples=36)
        np.testing.assert_allclose(result.rho_max[k], single.rho_max, rtol=1e-12)
    assert np.all(np.diff(result.rho_max, axis=0) > 0)  # longer line, more uncertainty
