"""Checks of the band-sweep statistics.

Independent references: the resonance of a series RLC circuit, f0 = 1/(2 pi sqrt(LC)) (Pozar,
Microwave Engineering, 4th ed., section 6.1); crossings worked out by hand on piecewise-linear
curves; and the ARRL Antenna Book, transmission-line chapter (a lossy line lowers the SWR seen
at the transmitter, so the band looks broader from the shack).
"""
from __future__ import annotations

import numpy as np
import pytest

from linecalc.physics import deembed
from linecalc import elements
from linecalc.physics import loads
from linecalc.physics import cascade as solver
from linecalc.physics import swr_curve as sweep
from linecalc.physics.cables import Cable

Z_REF_OHM = 50.0
# A 50-ohm coax of the RG-213 class by its loss terms (inputs for these checks, as in
# tests/physics/test_cascade.py); its Z0 is complex.
COAX = Cable(id="coax-50", description="RG-213 class coax", kind="coax", z0_nominal_ohm=50.0,
             velocity_factor=0.66, k_conductor=2.0e-6, k_dielectric=3.2e-12)


def series_rlc_ohm(frequency_hz, resistance_ohm, inductance_h, capacitance_f):
    omega = 2 * np.pi * frequency_hz
    return resistance_ohm + 1j * (omega * inductance_h - 1 / (omega * capacitance_f))


@pytest.mark.parametrize("resistance_ohm", [25.0, 50.0, 72.0, 140.0])
@pytest.mark.parametrize("inductance_h, capacitance_f", [(30e-6, 16.8e-12), (12e-6, 41e-12), (4e-6, 31e-12)])
def test_lowest_swr_of_a_series_rlc_is_at_its_resonance(resistance_ohm, inductance_h, capacitance_f):
    # With R fixed, |rho| = |R - 50 + jX| / |R + 50 + jX| is least where X = 0, at the
    # resonance 1/(2 pi sqrt(LC)) (Pozar, Microwave Engineering, 4th ed., section 6.1).
    resonance_hz = 1 / (2 * np.pi * np.sqrt(inductance_h * capacitance_f))
    frequency_hz = sweep.sweep_frequencies_hz(0.97 * resonance_hz, 1.04 * resonance_hz, 151)
    z = series_rlc_ohm(frequency_hz, resistance_ohm, inductance_h, capacitance_f)
    swr = solver.swr_from_rho(loads.rho_from_impedance(z, Z_REF_OHM))
    stats = sweep.sweep_statistics(frequency_hz, swr)
    step_hz = frequency_hz[1] - frequency_hz[0]
    assert abs(stats.frequency_swr_min_hz - resonance_hz) <= step_hz
    # at resonance the SWR is R/50 or 50/R (Pozar, section 2.3, a resistive load); the lowest
    # sample lies within one step of it, where the reactance is at most |X(f0 +- step)|
    at_resonance = max(resistance_ohm, 50) / min(resistance_ohm, 50)
    z_step = series_rlc_ohm(resonance_hz + np.array([-step_hz, step_hz]), resistance_ohm, inductance_h,
                            capacitance_f)
    assert at_resonance <= stats.swr_min <= solver.swr_from_rho(loads.rho_from_impedance(z_step, Z_REF_OHM)).max()


@pytest.mark.parametrize("length_m", [5.0, 20.0, 45.0, 90.0])
@pytest.mark.parametrize("resistance_ohm, inductance_h, capacitance_f",
                         [(50.0, 30e-6, 16.8e-12), (68.0, 30e-6, 16.8e-12), (40.0, 12e-6, 41e-12)])
def test_bandwidth_at_the_radio_is_never_narrower_through_a_lossy_line(length_m, resistance_ohm, inductance_h,
                                                                        capacitance_f):
    # ARRL Antenna Book, transmission-line chapter: |rho| at the transmitter is |rho| at the
    # antenna reduced by 10^(-ML/10), so the SWR curve seen from the shack is lower and broader.
    # Checked at 2:1 and 3:1, where the coax's slightly complex Z0 cannot flip the comparison.
    resonance_hz = 1 / (2 * np.pi * np.sqrt(inductance_h * capacitance_f))
    frequency_hz = sweep.sweep_frequencies_hz(0.85 * resonance_hz, 1.15 * resonance_hz, 301)
    line = elements.Line(COAX, length_m)
    z_antenna = series_rlc_ohm(frequency_hz, resistance_ohm, inductance_h, capacitance_f)
    z0_line = line.port_z0_ohm(frequency_hz)[1]
    swr_antenna = solver.swr_from_rho(loads.rho_from_impedance(z_antenna, z0_line))
    z_radio = deembed.embed_impedance([line.abcd(frequency_hz)], z_antenna)
    swr_radio = solver.swr_from_rho(loads.rho_from_impedance(z_radio, Z_REF_OHM))
    stats = sweep.sweep_statistics(frequency_hz, np.stack([swr_antenna, swr_radio]), swr_limits=(2.0, 3.0))
    antenna, radio = stats.bandwidth_hz
    assert not stats.clipped_low[0].any() and not stats.clipped_high[0].any()
    assert np.all(radio >= antenna)
    assert np.all(antenna > 0)


def test_crossings_are_interpolated_in_rho():
    # SWR 3, 2, 1, 2, 3 at 1..5 Hz: |rho| = 0.5, 1/3, 0, 1/3, 0.5. The 1.5:1 limit is |rho| = 0.2,
    # crossed 0.4 of the way from 2 Hz to 3 Hz ((1/3 - 0.2)/(1/3)): at 2.4 Hz and, by symmetry,
    # 3.6 Hz. The 2:1 limit is met at the 2 Hz and 4 Hz samples themselves; the 3:1 region reaches
    # both ends of the sweep (SWR 3 counts as inside), so it is clipped there.
    stats = sweep.sweep_statistics([1.0, 2.0, 3.0, 4.0, 5.0], [3.0, 2.0, 1.0, 2.0, 3.0])
    np.testing.assert_allclose(stats.lower_hz, [2.4, 2.0, 1.0])
    np.testing.assert_allclose(stats.upper_hz, [3.6, 4.0, 5.0])
    np.testing.assert_allclose(stats.bandwidth_hz, [1.2, 2.0, 4.0])
    assert stats.clipped_low.tolist() == [False, False, True] == stats.clipped_high.tolist()
    assert stats.swr_min == 1.0 and stats.frequency_swr_min_hz == 3.0
    assert stats.swr_low_edge == 3.0 and stats.swr_high_edge == 3.0


def test_infinite_swr_and_a_curve_that_never_gets_inside():
    # An infinite SWR is |rho| = 1: between SWR inf at 1 Hz and SWR 2 (|rho| 1/3) at 2 Hz the 3:1
    # limit (|rho| 0.5) is crossed (1 - 0.5)/(1 - 1/3) = 0.75 of the way, at 1.75 Hz.
    stats = sweep.sweep_statistics([1.0, 2.0, 3.0, 4.0, 5.0], [[np.inf, 2.0, 1.0, 2.0, np.inf],
                                                               [4.0, 3.5, 3.2, 3.5, 4.0]])
    np.testing.assert_allclose(stats.lower_hz[0], [2.4, 2.0, 1.75])
    np.testing.assert_allclose(stats.upper_hz[0], [3.6, 4.0, 4.25])
    assert np.all(np.isnan(stats.lower_hz[1])) and np.all(np.isnan(stats.upper_hz[1]))
    assert np.all(stats.bandwidth_hz[1] == 0)
    assert not stats.clipped_low[1].any()


def test_only_the_dip_holding_the_minimum_counts():
    # two dips; the deeper one (at 7 Hz) sets the region, the other (at 2 Hz) is left out
    f = np.arange(1.0, 10.0)
    swr = np.array([3.0, 1.8, 3.0, 4.0, 4.0, 3.0, 1.2, 3.0, 4.0])
    stats = sweep.sweep_statistics(f, swr, swr_limits=(2.0,))
    assert stats.frequency_swr_min_hz == 7.0
    # |rho|: SWR 3 -> 0.5, SWR 1.2 -> 1/11; 2:1 -> 1/3, crossed (0.5 - 1/3)/(0.5 - 1/11) = 0.4074 from 6 Hz
    np.testing.assert_allclose(stats.lower_hz, [6 + (0.5 - 1 / 3) / (0.5 - 1 / 11)])
    np.testing.assert_allclose(stats.upper_hz, [8 - (0.5 - 1 / 3) / (0.5 - 1 / 11)])


def test_leading_axes_are_carried_through():
    f = sweep.sweep_frequencies_hz(7.0e6, 7.3e6, 61)
    curves = 1 + np.abs(np.subtract.outer(np.array([7.05e6, 7.15e6, 7.25e6]), f)) / 2e4
    together = sweep.sweep_statistics(f, curves.reshape(3, 1, -1))
    assert together.bandwidth_hz.shape == (3, 1, 3)
    for k in range(3):
        alone = sweep.sweep_statistics(f, curves[k])
        np.testing.assert_allclose(together.bandwidth_hz[k, 0], alone.bandwidth_hz)
        assert together.frequency_swr_min_hz[k, 0] == alone.frequency_swr_min_hz


def test_sweep_frequencies_include_both_edges():
    f = sweep.sweep_frequencies_hz(7.0e6, 7.2e6, 5)
    np.testing.assert_allclose(f, [7.0e6, 7.05e6, 7.1e6, 7.15e6, 7.2e6])
    assert sweep.sweep_frequencies_hz(7.0e6, 7.2e6).size == sweep.DEFAULT_SWEEP_POINTS
    with pytest.raises(ValueError):
        sweep.sweep_frequencies_hz(7.0e6, 7.2e6, 1)
    with pytest.raises(ValueError):
        sweep.sweep_frequencies_hz(7.2e6, 7.0e6, 11)


@pytest.mark.parametrize("frequency_hz, swr, limits", [
    ([1.0, 2.0], [1.0, 0.5], (2.0,)),  # SWR below 1
    ([1.0, 2.0], [1.0, np.nan], (2.0,)),
    ([2.0, 1.0], [1.0, 2.0], (2.0,)),  # frequencies not increasing
    ([1.0, 2.0], [1.0, 2.0, 3.0], (2.0,)),
    ([1.0, 2.0], [1.0, 2.0], (1.0,)),  # a limit of 1:1 has no width
])
def test_bad_input_is_refused(frequency_hz, swr, limits):
    with pytest.raises(ValueError):
        sweep.sweep_statistics(frequency_hz, swr, limits)
