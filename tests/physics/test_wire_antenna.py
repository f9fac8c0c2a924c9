"""The wire-antenna adapter (linecalc.physics.wire_antenna) against closed forms and textbook
values. Each test makes a handful of engine runs (milliseconds each over free space or perfect
ground)."""
from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.special import sici

pytest.importorskip("PyNEC")

from linecalc.physics import wire_antenna as wa  # noqa: E402
from linecalc.errors import InputError  # noqa: E402
from linecalc.physics.wire_antenna import Ground, WireAntenna  # noqa: E402
from linecalc.studies.antenna_report import cut_length  # noqa: E402

C = 299_792_458.0
F = 14e6
LAMBDA = C / F
COPPER = 5.8e7


def _antenna(shape, length_m, height_m, ground, **kw):
    kw.setdefault("radius_m", 1e-4 * LAMBDA)
    kw.setdefault("conductivity_s_per_m", COPPER)
    return WireAntenna(shape=shape, length_m=length_m, height_m=height_m, ground=ground, highest_frequency_hz=F, **kw)


def _resonance(antenna, low_hz, high_hz):
    """Frequency of X = 0 between low and high (one run on a 9-point grid, then linear)."""
    f = np.linspace(low_hz, high_hz, 9)
    z = wa.solve(antenna, f, pattern=False).impedance_ohm
    k = int(np.flatnonzero(np.sign(z.imag[:-1]) != np.sign(z.imag[1:]))[0])
    t = -z.imag[k] / (z.imag[k + 1] - z.imag[k])
    return f[k] + t * (f[k + 1] - f[k]), z.real[k] + t * (z.real[k + 1] - z.real[k])


def test_quarter_wave_vertical_over_perfect_ground_is_half_the_free_space_dipole():
    # Image theory: a monopole over a perfect ground plane has half the input impedance of the
    # dipole of twice its length in free space (Balanis, Antenna Theory, 3rd ed., section 4.7.2).
    # Both at 40 segments per wavelength, so that they differ only by the image.
    dipole = _antenna("dipole", 0.48 * LAMBDA, 0.0, Ground("free-space"), segments_per_wavelength=40)
    vertical = _antenna("vertical", 0.24 * LAMBDA, 0.0, Ground("perfect"), segments_per_wavelength=40)
    z_dipole = wa.solve(dipole, [F], pattern=False).impedance_ohm[0]
    z_vertical = wa.solve(vertical, [F], pattern=False).impedance_ohm[0]
    assert abs(2 * z_vertical - z_dipole) / abs(z_dipole) < 0.01


def test_thin_resonant_half_wave_dipole_has_about_72_ohm():
    # Kraus, Antennas, 2nd ed., section 5-6; Balanis, Antenna Theory, 3rd ed., section 4.6: the
    # thin half-wave dipole has R of 73 ohm, a little less (about 70 to 72) when shortened to
    # resonance; within 3 % of 72 ohm. A lossless wire, as in the texts (copper this thin would
    # add about 4 ohm of its own).
    dipole = _antenna("dipole", 0.5 * LAMBDA, 0.0, Ground("free-space"), radius_m=1e-5 * LAMBDA,
                      conductivity_s_per_m=math.inf)
    f0, r0 = _resonance(dipole, 0.93 * F, 1.0 * F)
    assert r0 == pytest.approx(72.0, rel=0.03)
    assert 0.94 * F < f0 < 0.99 * F  # resonant a few per cent below the half-wave frequency


def _mutual_resistance_ohm(d_m, l_m, k):
    """Mutual resistance of two parallel side-by-side dipoles of length l at spacing d, by the
    induced-EMF method (Balanis, Antenna Theory, 3rd ed., section 8.6, equation 8-71a)."""
    eta_over_4pi = 119.9169832 * math.pi / (4 * math.pi)
    u0 = k * d_m
    u1 = k * (math.sqrt(d_m ** 2 + l_m ** 2) + l_m)
    u2 = k * (math.sqrt(d_m ** 2 + l_m ** 2) - l_m)
    ci = lambda u: sici(u)[1]  # noqa: E731
    return eta_over_4pi * (2 * ci(u0) - ci(u1) - ci(u2))


@pytest.mark.parametrize("height_wavelengths", [0.15, 0.25, 0.5, 0.75, 1.0])
def test_resistance_against_height_follows_the_image_mutual_resistance(height_wavelengths):
    # A horizontal half-wave dipole over perfect ground sees its image, in antiphase, at twice
    # its height: R(h) = R_free - R_mutual(2h) (Balanis, section 8.6, induced-EMF method; the
    # image of section 4.7). Within 10 %.
    k = 2 * math.pi / LAMBDA
    free = _antenna("dipole", 0.5 * LAMBDA, 0.0, Ground("free-space"), radius_m=1e-5 * LAMBDA,
                    conductivity_s_per_m=math.inf)
    over = _antenna("dipole", 0.5 * LAMBDA, height_wavelengths * LAMBDA, Ground("perfect"), radius_m=1e-5 * LAMBDA,
                    conductivity_s_per_m=math.inf)
    r_free = wa.solve(free, [F], pattern=False).impedance_ohm[0].real
    r_over = wa.solve(over, [F], pattern=False).impedance_ohm[0].real
    expected = r_free - _mutual_resistance_ohm(2 * height_wavelengths * LAMBDA, LAMBDA / 2, k)
    assert r_over == pytest.approx(expected, rel=0.10)


@pytest.mark.parametrize("height_wavelengths", [0.25, 0.5])
def test_resonant_length_over_average_ground_is_near_the_rule_of_thumb(height_wavelengths):
    # 468 / f(MHz) feet for a half-wave dipole of practical wire (common practice); within 5 %.
    # Average ground: 0.005 S/m, relative permittivity 13 (common practice).
    f = 14.1e6
    wire = WireAntenna(shape="dipole", length_m=10.0, height_m=height_wavelengths * C / f, radius_m=1e-3,
                       conductivity_s_per_m=COPPER, ground=Ground("real", 0.005, 13.0), highest_frequency_hz=f)
    cut = cut_length(wire, f)
    assert cut.converged
    assert cut.length_m == pytest.approx(468 / 14.1 * 0.3048, rel=0.05)


@pytest.mark.parametrize("shape, length_wavelengths, ground", [
    ("dipole", 0.48, Ground("free-space")), ("vertical", 0.24, Ground("perfect"))])
def test_impedance_moves_under_one_percent_from_n_to_2n_segments(shape, length_wavelengths, ground):
    # Convergence of the default segmentation near resonance (NEC-2 User's Guide, Burke and
    # Poggio 1981, section 2: results should not move when the segments are halved).
    coarse = _antenna(shape, length_wavelengths * LAMBDA, 0.0, ground)
    per_wavelength = wa.SEGMENTS_PER_WAVELENGTH[shape]
    fine = _antenna(shape, length_wavelengths * LAMBDA, 0.0, ground, segments_per_wavelength=2 * per_wavelength)
    z_coarse = wa.solve(coarse, [F], pattern=False).impedance_ohm[0]
    z_fine = wa.solve(fine, [F], pattern=False).impedance_ohm[0]
    assert abs(z_coarse - z_fine) / abs(z_fine) < 0.01


def test_free_space_half_wave_dipole_peak_gain_and_wire_loss():
    # Directivity 1.64 (2.15 dBi) of the half-wave dipole (Balanis, section 4.6), less its wire
    # loss; the loss of a 1 mm radius copper wire from the skin-effect resistance Rs / (2 pi a)
    # with a sinusoidal current, R_loss = R_hf * l / 2 at the centre (Balanis, section 2.14,
    # equation 2-90a for the half-wave current): about 0.14 ohm here, 0.2 % of 72 ohm.
    dipole = _antenna("dipole", 0.48 * LAMBDA, 0.0, Ground("free-space"), radius_m=1e-3)
    solution = wa.solve(dipole, [F])
    rs = math.sqrt(math.pi * F * 4e-7 * math.pi / COPPER)
    r_loss = rs / (2 * math.pi * 1e-3) * 0.48 * LAMBDA / 2
    share = r_loss / solution.impedance_ohm[0].real
    assert solution.wire_loss_db[0] == pytest.approx(-10 * math.log10(1 - share), rel=0.15)
    assert solution.peak_gain_dbi[0] == pytest.approx(2.15 - solution.wire_loss_db[0], abs=0.15)


def test_solved_points_are_cached_and_new_ones_solved_in_one_run(monkeypatch):
    antenna = _antenna("dipole", 0.48 * LAMBDA, 0.0, Ground("free-space"), feed_at=0.4)
    runs = []
    engine = wa._engine_run
    monkeypatch.setattr(wa, "_engine_run", lambda *a: runs.append(a[1]) or engine(*a))
    monkeypatch.setenv(wa.PROCESSES_VARIABLE, "1")  # each run whole in this process, where it is counted
    first = wa.solve(antenna, [13.9e6, 14.0e6, 14.2e6, 14.3e6])
    again = wa.solve(antenna, [14.0e6, 14.1e6, 14.3e6])
    assert len(runs) == 2 and runs[1] == [14.1e6]  # only the new point in the second run
    np.testing.assert_array_equal(again.impedance_ohm[[0, 2]], first.impedance_ohm[[1, 3]])


def test_frequencies_are_cut_into_evenly_spaced_runs():
    assert wa._evenly_spaced_runs([1.0, 2.0, 3.0, 5.0, 7.0, 8.0]) == [(1.0, 1.0, 3), (5.0, 2.0, 2), (8.0, 0.0, 1)]
    assert wa._evenly_spaced_runs([4.0]) == [(4.0, 0.0, 1)]


def test_inverted_v_feed_chord_and_legs_keep_the_length():
    antenna = WireAntenna(shape="inverted-v", length_m=20.0, height_m=10.0, radius_m=1e-3, conductivity_s_per_m=COPPER,
                          ground=Ground("perfect"), highest_frequency_hz=30e6, apex_angle_rad=math.radians(90))
    model, feed = wa.wires(antenna)
    total = sum(float(np.linalg.norm(b - a)) for a, b, _ in model)
    # the chord across the apex is shorter than the two half-segments it replaces by (1 - sin 45 deg)
    delta = antenna.segment_m
    assert total == pytest.approx(20.0 - delta * (1 - math.sin(math.radians(45))), rel=1e-12)
    assert min(min(a[2], b[2]) for a, b, _ in model) == pytest.approx(10.0 - 10.0 * math.sin(math.radians(45)))


def _split_spy(monkeypatch):
    """The part sizes (frequencies per process) of each split engine run, in a list."""
    runs = []
    split = wa.process_split.run_split
    monkeypatch.setattr(wa.process_split, "run_split", lambda works: runs.append(len(works)) or split(works))
    monkeypatch.setattr(wa.os, "cpu_count", lambda: 2)
    return runs


@pytest.mark.parametrize("ground, pattern", [(Ground("perfect"), True), (Ground("real", 0.005, 13.0), False)])
def test_a_run_shared_with_a_worker_gives_the_serial_numbers_bit_for_bit(monkeypatch, ground, pattern):
    # The engine solves each frequency on its own: the parts' results are the serial run's,
    # exactly (two computations of the same numbers, so no tolerance). The frequencies make one
    # evenly spaced card and a lone one, so a card is cut in the middle.
    antenna = _antenna("dipole", 0.48 * LAMBDA, 0.25 * LAMBDA, ground, feed_at=0.4)
    f = [12.0e6, 12.5e6, 13.0e6, 13.5e6, 14.2e6] if pattern else [13.0e6, 13.5e6, 14.0e6, 14.3e6]
    assert [count for *_, count in wa.frequency_cards(sorted(f))] == ([4, 1] if pattern else [3, 1])
    runs = _split_spy(monkeypatch)
    serial = wa.solve(antenna, f, pattern=pattern, processes=1)
    assert runs == []
    wa.clear_cache()
    split = wa.solve(antenna, f, pattern=pattern, processes=2)
    assert runs == [2]
    for key in ("impedance_ohm", "wire_loss_db", "peak_gain_dbi"):
        np.testing.assert_array_equal(getattr(split, key), getattr(serial, key))
    assert np.all(np.isfinite(split.peak_gain_dbi)) == pattern


def test_the_environment_variable_keeps_every_run_in_this_process(monkeypatch):
    antenna = _antenna("dipole", 0.48 * LAMBDA, 0.25 * LAMBDA, Ground("perfect"), feed_at=0.45)
    runs = _split_spy(monkeypatch)
    monkeypatch.setenv(wa.PROCESSES_VARIABLE, "1")
    wa.solve(antenna, [13.0e6, 13.5e6, 14.0e6, 13.8e6])
    assert runs == []
    for bad in ("0", "two", "-1", ""):
        monkeypatch.setenv(wa.PROCESSES_VARIABLE, bad)
        with pytest.raises(InputError, match=wa.PROCESSES_VARIABLE):
            wa.engine_processes()
    monkeypatch.delenv(wa.PROCESSES_VARIABLE)
    assert wa.engine_processes() == wa.DEFAULT_PROCESSES


def test_a_run_too_small_or_too_cheap_to_pay_for_a_worker_stays_here(monkeypatch):
    runs = _split_spy(monkeypatch)
    small = _antenna("dipole", 0.48 * LAMBDA, 0.0, Ground("free-space"), feed_at=0.45)
    assert sum(count for *_, count in wa.wires(small)[0]) < wa.MIN_SEGMENTS_TO_SPLIT
    wa.solve(small, [13.0e6, 13.5e6, 14.0e6, 13.8e6], pattern=False)  # 0.1 ms a frequency
    wa.solve(small, [12.0e6, 12.5e6, 12.8e6], pattern=True)  # fewer than 2 frequencies per process
    assert runs == []


def test_cards_are_cut_into_equal_parts_where_the_engine_steps():
    cards = wa.frequency_cards([1e6, 2e6, 3e6, 4e6, 5e6, 7.5e6])
    assert cards == [(1.0, 1.0, 5), (7.5, 0.0, 1)]
    # the rest of a cut card starts where the engine's repeated addition of the step arrives
    assert wa.split_cards(cards, 2) == [[(1.0, 1.0, 3)], [(4.0, 1.0, 2), (7.5, 0.0, 1)]]
    step = 0.1
    cut = wa.split_cards([(7.0, step, 10)], 2)
    assert cut[1][0] == (7.0 + step + step + step + step + step, step, 5)  # the step added 5 times
    assert wa.split_cards(cards, 4) == [[(1.0, 1.0, 2)], [(3.0, 1.0, 2)], [(5.0, 1.0, 1), (7.5, 0.0, 1)]]
    assert wa.split_cards([(7.0, 0.0, 1)], 2) == [[(7.0, 0.0, 1)]]
