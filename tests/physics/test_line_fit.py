"""The line fitted from open and short sweeps (linecalc.physics.line_fit).

The sweeps are synthesised with scikit-rf from a known lossy line: its per-metre constants are
written out here from the textbook (a skin-effect conductor, R' = r1 sqrt(f) with an internal
reactance equal to R'; a dielectric G' = g1 f; Pozar, Microwave Engineering, 4th ed., section
2.1, gamma = sqrt((R' + j w L')(G' + j w C')), Z0 = sqrt((R' + j w L')/(G' + j w C'))), and
scikit-rf's own media (DefinedGammaZ0) and line functions (delay_open, delay_short) make the
input impedances of the line with its far end open and shorted.
"""
from __future__ import annotations

import numpy as np
import pytest

from linecalc.physics.line_fit import SweepFitError, electrical_phase_rad, fit_open_short, open_short_constants

skrf = pytest.importorskip("skrf")
SPEED_OF_LIGHT = 299_792_458.0  # m/s, exact (SI)
# The generating line: a 50-ohm solid-PE coax of the RG-213 class's size (invented round
# numbers, for the test only): VF 0.66, conductor term r1, dielectric term g1.
Z0_NOMINAL, VF, R1, G1 = 50.0, 0.66, 2.0e-5, 4e-14


def textbook_line(frequency_hz, z0n=Z0_NOMINAL, vf=VF, r1=R1, g1=G1):
    """Z0 [ohm] and gamma [1/m] of the test line (Pozar, 4th ed., section 2.1)."""
    omega = 2 * np.pi * frequency_hz
    v = vf * SPEED_OF_LIGHT
    r = r1 * np.sqrt(frequency_hz)
    z = r + 1j * omega * (z0n / v + r / omega)  # external inductance, and the internal one (X_int = R)
    y = g1 * frequency_hz + 1j * omega / (z0n * v)
    return np.sqrt(z / y), np.sqrt(z * y)


def skrf_sweeps(frequency_hz, length_m, **line):
    """Open and short input impedances [ohm] from scikit-rf's line functions."""
    z0, gamma = textbook_line(frequency_hz, **line)
    media = skrf.media.DefinedGammaZ0(skrf.Frequency.from_f(frequency_hz, unit="hz"), z0_port=50, z0=z0,
                                      gamma=gamma)
    return media.delay_open(length_m, "m").z[:, 0, 0], media.delay_short(length_m, "m").z[:, 0, 0]


def with_noise(z_ohm, sigma, rng):
    """``z_ohm`` with complex Gaussian noise of ``sigma`` on each part of its reflection against 50 ohm."""
    rho = (z_ohm - 50) / (z_ohm + 50)
    rho = rho + sigma * (rng.standard_normal(rho.shape) + 1j * rng.standard_normal(rho.shape))
    return 50 * (1 + rho) / (1 - rho)


def fitted_figures(fit, length_m):
    """Z0 at the centre, velocity factor and matched loss [dB/m] at three frequencies, each with its half-width."""
    f3 = fit.frequency_hz[[0, fit.frequency_hz.size // 2, -1]]
    z0 = fit.propagate(lambda p: np.array([abs(fit.z0_ohm(np.array([fit.centre_hz]), p)[0])]))
    vf = fit.propagate(lambda p: np.array([length_m / (p[1] / fit.centre_hz * SPEED_OF_LIGHT)]))
    loss = fit.propagate(lambda p: fit.loss_db(f3, p) / length_m)
    return f3, z0, vf, loss


@pytest.mark.parametrize("low, high, length_m", [(1e6, 30e6, 30.0), (3.5e6, 3.8e6, 200.0)])
def test_fit_recovers_the_generating_line(low, high, length_m):
    f = np.linspace(low, high, 101)
    z_open, z_short = skrf_sweeps(f, length_m)
    fit = fit_open_short(f, z_open, z_short)
    f3, (z0, _), (vf, _), (loss, _) = fitted_figures(fit, length_m)
    true_z0, true_gamma = textbook_line(np.array([fit.centre_hz]))
    # the generating line, within 0.5 % (the tolerance; the model's attenuation is
    # k1 sqrt(f) + k2 f exactly, the generating line's only to second order in the loss)
    assert z0[0] == pytest.approx(abs(true_z0[0]), rel=5e-3)
    assert vf[0] == pytest.approx(VF, rel=5e-3)
    loss_true = 20 * np.log10(np.e) * textbook_line(f3)[1].real
    np.testing.assert_allclose(loss, loss_true, rtol=5e-3)
    assert fit.residual_rms < 1e-3


def test_intervals_cover_the_truth_under_stated_noise():
    # noise of 0.003 on each part of rho (a calibrated analyser's error is about 0.01 to 0.03 in
    # |rho|, common practice); 95 % intervals should hold the truth in about 95 of 100 runs:
    # in 10 seeded runs at least 8 (the binomial chance of fewer is about 0.1 %)
    f = np.linspace(1.8e6, 30e6, 41)
    length_m = 25.0
    z_open, z_short = skrf_sweeps(f, length_m)
    true_z0 = abs(textbook_line(np.array([np.sqrt(f[0] * f[-1])]))[0][0])
    inside = np.zeros(5, int)
    for seed in range(10):
        rng = np.random.default_rng(seed)
        fit = fit_open_short(f, with_noise(z_open, 0.003, rng), with_noise(z_short, 0.003, rng))
        f3, (z0, dz0), (vf, dvf), (loss, dloss) = fitted_figures(fit, length_m)
        loss_true = 20 * np.log10(np.e) * textbook_line(f3)[1].real
        inside += [abs(z0[0] - true_z0) <= dz0[0], abs(vf[0] - VF) <= dvf[0],
                   *(np.abs(loss - loss_true) <= dloss)]
        if seed == 0:  # one run on its own: the truth inside every interval, and the figures within 0.5 %
            assert np.all(inside == 1), inside
            assert vf[0] == pytest.approx(VF, rel=5e-3)
    assert np.all(inside >= 8), inside


@pytest.mark.parametrize("low, high, length_m", [(1.8e6, 2.0e6, 500.0), (28.0e6, 29.7e6, 40.0)])
def test_branch_tracked_over_several_wavelengths_at_both_ends_of_hf(low, high, length_m):
    # 500 m at 160 m is 4.6 to 5.1 wavelengths of line, 40 m at 10 m 5.7 to 6.0: the electrical
    # phase wraps many times before the sweep starts, and its half turns must be counted right
    f = np.linspace(low, high, 41)
    wavelengths = length_m * f / (VF * SPEED_OF_LIGHT)
    assert wavelengths.min() > 4
    z_open, z_short = skrf_sweeps(f, length_m)
    z0, gamma_l = open_short_constants(z_open, z_short)
    phase, _ = electrical_phase_rad(f, gamma_l.imag)
    # beta l of the generating line, from its own gamma (Pozar, section 2.1)
    np.testing.assert_allclose(phase, textbook_line(f)[1].imag * length_m, rtol=1e-6)
    fit = fit_open_short(f, z_open, z_short)
    assert length_m / (fit.delay_s * SPEED_OF_LIGHT) == pytest.approx(VF, rel=5e-3)


def test_swapped_sweeps_are_refused():
    f = np.linspace(1e6, 30e6, 101)
    z_open, z_short = skrf_sweeps(f, 30.0)
    with pytest.raises(SweepFitError, match="swapped"):
        fit_open_short(f, z_short, z_open)


def test_too_sparse_a_sweep_is_refused():
    # 200 m at VF 0.66 turns its phase by about 110 degrees every 0.25 MHz
    f = np.linspace(1e6, 30e6, 117)
    z_open, z_short = skrf_sweeps(f, 200.0)
    with pytest.raises(SweepFitError, match="too far apart"):
        fit_open_short(f, z_open, z_short)


def test_identical_sweeps_are_refused():
    f = np.linspace(1e6, 30e6, 11)
    z_open, _ = skrf_sweeps(f, 30.0)
    with pytest.raises(SweepFitError, match="read alike"):
        fit_open_short(f, z_open, z_open)


def test_too_few_points_are_refused():
    f = np.linspace(1e6, 30e6, 4)
    with pytest.raises(SweepFitError, match="at least 5"):
        fit_open_short(f, *skrf_sweeps(f, 30.0))
