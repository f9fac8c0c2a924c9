"""Voltage and current along lines and across tuner parts, and what they mean for ratings.

Pure functions over numpy arrays in SI units. Phasors are RMS, as in the solver; a sinusoid's
peak is sqrt(2) times its RMS value. Solved at the radio's peak envelope power (PEP), the node
phasors give the RMS voltage and current at the envelope peak, so ``peak = sqrt(2) * RMS`` is the
crest voltage that arcs a line or a capacitor. Heating follows the average power instead: scale
current-limited checks by the average-to-PEP fraction (duty factor times transmit fraction).

These figures are estimates for a line of uniform cable: connectors, feedthroughs, the
spreaders of open-wire line and everything near a balanced line are often rated lower than the
cable, and altitude, heat and humidity lower every rating. See ``exposure.CAUTIONS``.
"""
from __future__ import annotations

from dataclasses import dataclass
from typing import NamedTuple

import numpy as np

PEAK_PER_RMS = np.sqrt(2.0)  # crest factor of a sinusoid
# Sampling: at least this many points per half wavelength of the standing wave (its period
# along the line). 32 put the sampled maximum within 0.12 % of the true one (the worst sampling
# offset, 1/64 of a half wave, moves the phase of rho exp(-2 j beta d) by pi/32, and
# |1 + e^(j pi/32)| = 2 cos(pi/64)); `line_extremes` then refines it to rounding. A profile of
# the whole line (`line_profile`, for display) has never fewer than MIN_SAMPLES points and never
# more than MAX_SAMPLES (bounds memory: 100 m at 450 MHz would need about 14,600). The
# extremes sample only the half wavelength at each end, WINDOW_SAMPLES points each: a half
# wave holds one lobe of the standing wave, 16 steps find it (within 1 - cos(pi/32) = 0.5 %) and
# the parabola refinement then evaluates the line exactly at the vertex.
POINTS_PER_HALF_WAVE = 32
WINDOW_SAMPLES = 17
MIN_SAMPLES = 65
MAX_SAMPLES = 8193


@dataclass(frozen=True)
class LineProfile:
    """RMS magnitudes along a line. ``position_m`` (..., ns) from the radio end (input) to the
    antenna end (output); ``voltage_rms_v`` [V] and ``current_rms_a`` [A] (..., ns, nf)."""

    position_m: np.ndarray
    voltage_rms_v: np.ndarray
    current_rms_a: np.ndarray


@dataclass(frozen=True)
class LineExtremes:
    """Largest voltage and current on a line and where they occur, each (..., nf).

    RMS and peak (crest, sqrt(2) RMS) values [V], [A]; positions [m] from the radio end of the
    line (its input). Where the largest value recurs (a lossless line, every half wavelength), the
    position is one of those maxima.
    """

    voltage_rms_v: np.ndarray
    voltage_peak_v: np.ndarray
    voltage_position_m: np.ndarray
    current_rms_a: np.ndarray
    current_peak_a: np.ndarray
    current_position_m: np.ndarray


class PartStress(NamedTuple):
    """RMS voltage across a tuner part [V] and RMS current through it [A], (..., nf); NaN where
    the part is not in circuit. Peak values are ``PEAK_PER_RMS`` times these: a variable
    capacitor's voltage rating is usually a crest (breakdown) value, a coil's current rating
    RMS (common practice, from memory)."""

    voltage_rms_v: np.ndarray
    current_rms_a: np.ndarray


def _phasors_at(z0_ohm, gamma_per_m, voltage_out_v, current_out_a, distance_m):
    """V and I at ``distance_m`` from the output toward the input (broadcasting)."""
    # the two travelling waves, V(d) = V+ e^(gd) + V- e^(-gd): one exponential instead of cosh and sinh
    forward = (voltage_out_v + z0_ohm * current_out_a) / 2
    reflected = (voltage_out_v - z0_ohm * current_out_a) / 2
    grow = np.exp(gamma_per_m * distance_m)
    fade = 1 / grow
    return forward * grow + reflected * fade, (forward * grow - reflected * fade) / z0_ohm


def profile_samples(gamma_per_m, length_m):
    """Number of points (ends included) that resolves the standing wave on a line.

    Parameters
    ----------
    gamma_per_m : array_like of complex, (nf,)
        Propagation constant [1/m].
    length_m : float or array_like
        Length [m].

    Returns
    -------
    int
        ``POINTS_PER_HALF_WAVE`` per half wavelength pi/beta over the longest line and highest
        frequency, plus one, kept within [MIN_SAMPLES, MAX_SAMPLES].

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 2.3: |V| along a mismatched line repeats
    every half wavelength.
    """
    half_waves = np.max(np.abs(np.imag(gamma_per_m))) * np.max(np.asarray(length_m, dtype=float)) / np.pi
    wanted = int(np.ceil(POINTS_PER_HALF_WAVE * half_waves)) + 1
    return min(max(wanted, MIN_SAMPLES), MAX_SAMPLES)


def line_profile(z0_ohm, gamma_per_m, length_m, voltage_out_v, current_out_a, samples=None) -> LineProfile:
    """RMS voltage and current along a line from the phasors at its output (antenna side).

    Parameters
    ----------
    z0_ohm : array_like of complex, (nf,)
        Characteristic impedance [ohm].
    gamma_per_m : array_like of complex, (nf,)
        Propagation constant [1/m].
    length_m : float or array_like, (...)
        Length [m]; extra axes lead and broadcast with those of the phasors.
    voltage_out_v, current_out_a : array_like of complex, (..., nf)
        RMS phasors at the output node [V], [A] (the solver's node k + 1 for element k).
    samples : int, optional
        Number of points, ends included (at least 2); default `profile_samples`.

    Returns
    -------
    LineProfile
        Positions x = l t for t evenly spaced on [0, 1], from the radio end; |V| and |I| there.

    Notes
    -----
    With d = l - x the distance from the output,
    V(d) = V_out cosh(gamma d) + Z0 I_out sinh(gamma d) and
    I(d) = I_out cosh(gamma d) + (V_out / Z0) sinh(gamma d): the line's chain matrix applied to
    the output state.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 2.1 (wave solution of the lossy line) and
    section 4.4, Table 4.1 (chain matrix of a line).
    """
    gamma_per_m = np.asarray(gamma_per_m, dtype=complex)
    length_m = np.asarray(length_m, dtype=float)
    n = profile_samples(gamma_per_m, length_m) if samples is None else int(samples)
    if n < 2:
        raise ValueError(f"samples must be at least 2 (both ends), got {n}")
    position = length_m[..., None] * np.linspace(0.0, 1.0, n)  # (..., ns)
    distance = (length_m[..., None] - position)[..., None]  # (..., ns, 1)
    v, i = _phasors_at(z0_ohm, gamma_per_m, np.asarray(voltage_out_v)[..., None, :],
                       np.asarray(current_out_a)[..., None, :], distance)
    return LineProfile(position, np.abs(v), np.abs(i))


def line_profile_from_both_ends(z0_ohm, gamma_per_m, length_m, voltage_in_v, current_in_a, voltage_out_v,
                                current_out_a, samples) -> LineProfile:
    """RMS voltage and current along a line from the phasors at both of its ends, for any length.

    Parameters
    ----------
    z0_ohm, gamma_per_m : array_like of complex, (nf,)
        Characteristic impedance [ohm] and propagation constant [1/m].
    length_m : float
        Length [m].
    voltage_in_v, current_in_a, voltage_out_v, current_out_a : array_like of complex, (nf,)
        RMS phasors at the input (radio end) and at the output (antenna end) [V], [A], toward
        the load (the solver's nodes k and k + 1 for element k).
    samples : int
        Number of points, ends included (at least 2).

    Returns
    -------
    LineProfile
        ``position_m`` (samples,) from the radio end; |V| and |I| (samples, nf).

    Notes
    -----
    The forward wave is taken at the input and the reflected wave at the output, so that both
    exponentials decay: V(x) = A e^(-gamma x) + B e^(-gamma (l - x)) and
    I(x) = (A e^(-gamma x) - B e^(-gamma (l - x))) / Z0 with A = (V_in + Z0 I_in) / 2 and
    B = (V_out - Z0 I_out) / 2. It stays finite on a line thousands of dB long, where
    `line_profile` (both waves from the output) overflows.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 2.1 (the travelling-wave solution of the
    lossy line, V(z) = V+ e^(-gamma z) + V- e^(gamma z)).
    """
    n = int(samples)
    if n < 2:
        raise ValueError(f"samples must be at least 2 (both ends), got {n}")
    z0_ohm, gamma_per_m = np.asarray(z0_ohm, dtype=complex), np.asarray(gamma_per_m, dtype=complex)
    position = np.linspace(0.0, float(length_m), n)
    forward = (np.asarray(voltage_in_v) + z0_ohm * np.asarray(current_in_a)) / 2 * np.exp(-gamma_per_m * position[:, None])
    reflected = ((np.asarray(voltage_out_v) - z0_ohm * np.asarray(current_out_a)) / 2
                 * np.exp(-gamma_per_m * (float(length_m) - position[:, None])))
    return LineProfile(position, np.abs(forward + reflected), np.abs((forward - reflected) / z0_ohm))


def reflection_along_line(z0_ohm, gamma_per_m, length_m, voltage_out_v, current_out_a, z_ref_ohm, samples):
    """The reflection coefficient against ``z_ref_ohm`` seen looking toward the load from each
    point of a line: its path on a Smith chart from the antenna end to the radio end.

    Parameters
    ----------
    z0_ohm, gamma_per_m : array_like of complex, (nf,)
        Characteristic impedance [ohm] and propagation constant [1/m].
    length_m : float
        Length [m].
    voltage_out_v, current_out_a : array_like of complex, (nf,)
        Phasors at the output (antenna end), toward the load, in any common scale (only their
        ratio counts: the solver's ``state_v`` and ``state_i`` serve).
    z_ref_ohm : float
        Reference impedance of the chart [ohm].
    samples : int
        Number of points, ends included (at least 2).

    Returns
    -------
    distance_m : ndarray, (samples,)
        Distance from the output [m], 0 (the load) to ``length_m`` (the input).
    rho : ndarray of complex, (samples, nf)
        (Z(d) - Z_ref) / (Z(d) + Z_ref) with Z(d) = Z0 (1 + G(d)) / (1 - G(d)) and
        G(d) = G_L e^(-2 gamma d), G_L = (V - Z0 I) / (V + Z0 I) at the output.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 2.3 (Gamma(l) = Gamma_L e^(-2 j beta l) and
    the input impedance of a terminated line) and section 2.7 (the lossy line, gamma for j beta).
    """
    n = int(samples)
    if n < 2:
        raise ValueError(f"samples must be at least 2 (both ends), got {n}")
    z0_ohm, gamma_per_m = np.asarray(z0_ohm, dtype=complex), np.asarray(gamma_per_m, dtype=complex)
    v, i = np.asarray(voltage_out_v, dtype=complex), np.asarray(current_out_a, dtype=complex)
    gamma_load = (v - z0_ohm * i) / (v + z0_ohm * i)
    distance = np.linspace(0.0, float(length_m), n)
    reflection = gamma_load * np.exp(-2 * gamma_per_m * distance[:, None])
    # rho from G without forming Z (finite at an open end, G = 1):
    # rho = (Z0 (1 + G) - Zr (1 - G)) / (Z0 (1 + G) + Zr (1 - G))
    return distance, ((z0_ohm * (1 + reflection) - z_ref_ohm * (1 - reflection))
                      / (z0_ohm * (1 + reflection) + z_ref_ohm * (1 - reflection)))


def _end_windows(gamma_per_m, length_m):
    """Distances from the output d (..., 2 WINDOW_SAMPLES, nf): the half wavelength (or the whole
    line, if shorter) at the antenna end, increasing, then the one at the radio end, decreasing."""
    length = np.asarray(length_m, dtype=float)[..., None, None]
    half_wave = np.pi / np.abs(np.imag(gamma_per_m))  # inf where beta = 0: the window is the line
    window = np.minimum(length, half_wave)  # (..., 1, nf)
    near_load = np.linspace(0.0, 1.0, WINDOW_SAMPLES)[:, None] * window
    return np.concatenate([near_load, length - near_load], axis=-2)


def _window_phasors(z0_ohm, gamma_per_m, ends, length_m, distance_m):
    """V and I in the two end windows, each from the phasors at its own end, so that nothing
    grows by more than half a wavelength of loss however long the line.

    ``ends`` is ((v_out, i_out), (v_in, i_in)), each (..., nf); ``distance_m`` (..., 2, S, nf),
    distances from the output: window 0 at the antenna end, window 1 at the radio end. From the
    input, x = length - d and V(x) = V_in cosh(gx) - Z0 I_in sinh(gx): the output formula with
    -gamma. Returns V and I of shape (..., 2, S, nf).
    """
    (v_out, i_out), (v_in, i_in) = ends
    length = np.asarray(length_m, dtype=float)[..., None, None, None]
    v_a, i_a = _phasors_at(z0_ohm, gamma_per_m, v_out[..., None, None, :], i_out[..., None, None, :],
                           distance_m[..., :1, :, :])
    v_r, i_r = _phasors_at(z0_ohm, -gamma_per_m, v_in[..., None, None, :], i_in[..., None, None, :],
                           (length - distance_m)[..., 1:, :, :])
    return np.concatenate(np.broadcast_arrays(v_a, v_r), axis=-3), np.concatenate(np.broadcast_arrays(i_a, i_r), axis=-3)


def _refined_maximum(magnitude, distance, length_m, z0_ohm, gamma_per_m, ends, measure):
    """Largest of ``magnitude`` (..., 2 WINDOW_SAMPLES, nf) sampled at ``distance``, and where.

    In each window, a parabola through its largest interior sample and the two beside it (in
    magnitude squared) locates a maximum between samples: one inside the window always raises
    the largest interior sample or one next to it. Where the vertex lies on the line, the exact
    phasors are evaluated there. The answer is the largest of every sample and the refined
    points, so it is always a true value on the line. ``measure(v, i)`` is the magnitude that
    was sampled, from the phasors (|V|, |I| or the square root of the heat per metre).
    """
    shape = magnitude.shape[:-2] + (2, WINDOW_SAMPLES, magnitude.shape[-1])
    windows = magnitude.reshape(shape)
    places = np.broadcast_to(distance, magnitude.shape).reshape(shape)

    def at(index, values):
        return np.take_along_axis(values, index, axis=-2)[..., 0, :]

    k = np.argmax(windows[..., 1:-1, :], axis=-2)[..., None, :] + 1  # (..., 2, 1, nf)
    y0, y1, y2 = (at(j, windows) ** 2 for j in (k - 1, k, k + 1))
    d_left, d_centre, d_right = (at(j, places) for j in (k - 1, k, k + 1))
    curvature = y0 - 2 * y1 + y2
    offset = np.divide(0.5 * (y0 - y2), curvature, out=np.zeros_like(y1), where=curvature < 0)
    # a vertex beyond the three samples is not trusted: the centre sample stands instead
    d = d_centre + np.where(np.abs(offset) <= 1, offset, 0.0) * (d_right - d_left) / 2  # (..., 2, nf)
    v, i = (x[..., 0, :] for x in _window_phasors(z0_ohm, gamma_per_m, ends, length_m, d[..., None, :]))
    length = np.asarray(length_m, dtype=float)[..., None, None]
    refined = np.where((d >= 0) & (d <= length), measure(v, i), -np.inf)
    candidates = np.concatenate([magnitude, refined], axis=-2)
    where = np.concatenate([np.broadcast_to(distance, magnitude.shape), np.broadcast_to(d, refined.shape)], axis=-2)
    best = np.argmax(candidates, axis=-2)[..., None, :]
    return at(best, candidates), at(best, where)


def line_extremes(z0_ohm, gamma_per_m, length_m, voltage_out_v, current_out_a, voltage_in_v=None,
                  current_in_a=None) -> LineExtremes:
    """Largest RMS and peak voltage and current on a line, and where they occur.

    Parameters
    ----------
    z0_ohm, gamma_per_m, length_m, voltage_out_v, current_out_a
        As for `line_profile`.
    voltage_in_v, current_in_a : array_like of complex, (..., nf), optional
        The phasors at the line's input (radio end) [V], [A]; each end window is evaluated from
        its own end, so a long lossy line does not overflow. Default: computed from the output.

    Returns
    -------
    LineExtremes
        Shapes (..., nf); positions [m] from the radio end of the line.

    Notes
    -----
    With V(d) = V+ e^(gamma d) + V- e^(-gamma d) and gamma = alpha + j beta,
    |V(d)|^2 = |V+|^2 e^(2 alpha d) + |V-|^2 e^(-2 alpha d) + 2 Re(V+ V-* e^(2 j beta d)), and
    |I(d)|^2 the same with a minus sign over |Z0|^2: a convex function plus one of period
    pi/beta, half a wavelength. Any point at least half a wavelength from both ends is then no
    higher than the larger of the two points half a wavelength either side of it, so the
    largest value lies within half a wavelength of an end. Each end window is sampled at
    ``WINDOW_SAMPLES`` points (16 steps over half a wavelength: within 0.5 % before refinement)
    and the best sample refined by a local parabola, evaluated exactly; the work does not grow
    with the length.

    On a lossless line the largest voltage is |V+|(1 + |rho|) and the largest current
    |V+|(1 + |rho|)/Z0 (if the line is at least half a wavelength long); with the net power
    P = |V+|^2 (1 - |rho|^2)/Z0, V_max^2 = P Z0 SWR and I_max^2 = P SWR / Z0. On a lossy line the
    forward wave grows toward the radio faster than the reflected one fades, so the largest
    values sit in the half wavelength at the radio end.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 2.3 (standing wave, V_max = |V+|(1 + |rho|))
    and section 2.7 (the lossy line).
    """
    gamma_per_m = np.asarray(gamma_per_m, dtype=complex)
    distance = _end_windows(gamma_per_m, length_m)
    v_out, i_out = np.asarray(voltage_out_v, dtype=complex), np.asarray(current_out_a, dtype=complex)
    if voltage_in_v is None or current_in_a is None:
        v_in, i_in = _phasors_at(z0_ohm, gamma_per_m, v_out, i_out, np.asarray(length_m, dtype=float)[..., None])
    else:
        v_in, i_in = np.asarray(voltage_in_v, dtype=complex), np.asarray(current_in_a, dtype=complex)
    ends = ((v_out, i_out), (v_in, i_in))
    windowed = distance.reshape(distance.shape[:-2] + (2, WINDOW_SAMPLES, distance.shape[-1]))
    v, i = (x.reshape(x.shape[:-3] + (2 * WINDOW_SAMPLES, x.shape[-1]))
            for x in _window_phasors(z0_ohm, gamma_per_m, ends, length_m, windowed))
    length = np.asarray(length_m, dtype=float)[..., None]
    v_max, v_d = _refined_maximum(np.abs(v), distance, length_m, z0_ohm, gamma_per_m, ends, lambda v, i: np.abs(v))
    i_max, i_d = _refined_maximum(np.abs(i), distance, length_m, z0_ohm, gamma_per_m, ends, lambda v, i: np.abs(i))
    return LineExtremes(v_max, PEAK_PER_RMS * v_max, length - v_d, i_max, PEAK_PER_RMS * i_max, length - i_d)


class HeatMaximum(NamedTuple):
    """The largest heat per metre on a line [W/m] and where it is [m from the radio end]."""

    heat_w_per_m: np.ndarray
    position_m: np.ndarray


def line_heat_maximum(z0_ohm, gamma_per_m, r_ohm_per_m, g_s_per_m, length_m, voltage_out_v, current_out_a,
                      voltage_in_v, current_in_a) -> HeatMaximum:
    """The largest heat per metre along a line, R'|I|^2 + G'|V|^2, and where it occurs.

    Parameters
    ----------
    z0_ohm, gamma_per_m : array_like of complex, (nf,)
        Characteristic impedance [ohm] and propagation constant [1/m].
    r_ohm_per_m, g_s_per_m : array_like, (nf,)
        Series resistance [ohm/m] and shunt conductance [S/m] of the cable.
    length_m, voltage_out_v, current_out_a, voltage_in_v, current_in_a
        As for `line_extremes` (RMS phasors at both ends).

    Returns
    -------
    HeatMaximum
        Shapes (..., nf): heat [W/m] at the phasors' power (at PEP when solved at PEP; scale by
        the average fraction for heating) and its position [m] from the radio end.

    Notes
    -----
    Conductor heat is R'|I|^2 and dielectric heat G'|V|^2 per metre (on a matched line their sum
    is 2 Re(gamma) P). Both |V|^2 and |I|^2 are a convex function of the position plus one of
    period pi/beta (see `line_extremes`), and so is any sum of them with positive weights: the
    largest heat lies within half a wavelength of an end, and is found there as the voltage and
    current maxima are.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 2.7 (power loss on a lossy line: R'|I|^2 and
    G'|V|^2 per unit length).
    """
    gamma_per_m = np.asarray(gamma_per_m, dtype=complex)
    r, g = np.asarray(r_ohm_per_m, dtype=float), np.asarray(g_s_per_m, dtype=float)
    distance = _end_windows(gamma_per_m, length_m)
    ends = ((np.asarray(voltage_out_v, dtype=complex), np.asarray(current_out_a, dtype=complex)),
            (np.asarray(voltage_in_v, dtype=complex), np.asarray(current_in_a, dtype=complex)))
    windowed = distance.reshape(distance.shape[:-2] + (2, WINDOW_SAMPLES, distance.shape[-1]))
    v, i = (x.reshape(x.shape[:-3] + (2 * WINDOW_SAMPLES, x.shape[-1]))
            for x in _window_phasors(z0_ohm, gamma_per_m, ends, length_m, windowed))

    def root_heat(v, i):
        return np.sqrt(r * np.abs(i) ** 2 + g * np.abs(v) ** 2)

    peak, d = _refined_maximum(root_heat(v, i), distance, length_m, z0_ohm, gamma_per_m, ends, root_heat)
    return HeatMaximum(peak ** 2, np.asarray(length_m, dtype=float)[..., None] - d)


def line_extremes_in_path(solution, index, line, frequency_hz) -> LineExtremes:
    """`line_extremes` of element ``index`` of a solved path, a line (``cable``, ``length_m``).

    Parameters
    ----------
    solution : solver.PathSolution
        Node phasors (..., n + 1, nf), scaled to the radio's power (PEP for the peak figures).
    index : int
        Position of the line in the feed (element k sits between nodes k and k + 1).
    line : elements.Line
        The line; its cable gives Z0 and gamma at ``frequency_hz``.
    frequency_hz : array_like, (nf,)
        Frequency [Hz].
    """
    z0, gamma = line.cable.constants(frequency_hz)
    return line_extremes(z0, gamma, line.length_m, solution.voltage_v[..., index + 1, :],
                         solution.current_a[..., index + 1, :], solution.voltage_v[..., index, :],
                         solution.current_a[..., index, :])


def line_heat_in_path(solution, index, line, frequency_hz) -> HeatMaximum:
    """`line_heat_maximum` of element ``index`` of a solved path, a line (as `line_extremes_in_path`)."""
    rlgc = line.cable.rlgc(frequency_hz)
    z0, gamma = line.cable.constants(frequency_hz)
    return line_heat_maximum(z0, gamma, rlgc.r_ohm_per_m, rlgc.g_s_per_m, line.length_m,
                             solution.voltage_v[..., index + 1, :], solution.current_a[..., index + 1, :],
                             solution.voltage_v[..., index, :], solution.current_a[..., index, :])


def swr_derated_power_rating_w(matched_rating_w, swr):
    """A line's matched (average) power rating derated for the SWR on it: rating / SWR.

    Parameters
    ----------
    matched_rating_w : array_like
        Average power the cable carries matched, set by conductor heating [W].
    swr : array_like
        SWR on the line (use the largest, at the antenna end) [1].

    Returns
    -------
    ndarray
        Average power that heats the current maxima as the rated power heats a matched line [W].

    Notes
    -----
    Heating is I^2 R' per metre. At a current maximum of a low-loss line,
    I_max^2 = P SWR / Z0 (see `line_extremes`) against P / Z0 matched, so the hottest spots
    carry SWR times the matched heating: the rating divided by the SWR keeps them at the rated
    temperature. This is the worst case (the heat spreads along the cable between maxima and
    minima; averaged over a standing wave the factor is (SWR^2 + 1)/(2 SWR), lower for long
    lines), and it is how the trade derates a rating (common practice; ARRL Antenna Book,
    transmission-line chapter, from memory). `line_rating_margins` applies the same criterion
    to the exact current maximum of a lossy line.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., sections 2.3 and 2.7 (standing wave on a low-loss
    line; conductor loss I^2 R').
    """
    return np.asarray(matched_rating_w, dtype=float) / np.asarray(swr, dtype=float)


def voltage_limited_power_w(max_voltage_rms_v, z0_ohm, swr):
    """Largest PEP at which a low-loss line stays within its RMS voltage rating at an SWR.

    Parameters
    ----------
    max_voltage_rms_v : array_like
        Voltage rating, RMS [V] (the cable library stores RMS ratings).
    z0_ohm : array_like
        Characteristic impedance; its magnitude is used [ohm].
    swr : array_like
        SWR on the line [1].

    Returns
    -------
    ndarray
        P = V_rating^2 / (|Z0| SWR) [W], from V_max,rms^2 = P Z0 SWR. In crest values the same
        limit reads V_peak = sqrt(2 P Z0 SWR) against sqrt(2) V_rating.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 2.3 (V_max = |V+|(1 + |rho|)).
    """
    return np.asarray(max_voltage_rms_v, dtype=float) ** 2 / (np.abs(z0_ohm) * np.asarray(swr, dtype=float))


@dataclass(frozen=True)
class LineRatingCheck:
    """A line's stress against its ratings, each (..., nf): margins are rating / stress (below 1:
    over the rating), NaN without a rating. ``heating_power_w`` [W] is the average power that,
    matched, would carry the line's largest current: |Z0| I_max^2 times the average fraction."""

    voltage_margin: np.ndarray
    heating_power_w: np.ndarray
    power_margin: np.ndarray


def line_rating_margins(extremes, z0_ohm, max_voltage_rms_v=None, matched_power_rating_w=None,
                        average_fraction=1.0) -> LineRatingCheck:
    """Compare a line's largest voltage and current (at PEP) with its ratings.

    Parameters
    ----------
    extremes : LineExtremes
        From `line_extremes`, solved at PEP.
    z0_ohm : array_like of complex, (nf,)
        Characteristic impedance [ohm].
    max_voltage_rms_v : float, optional
        Voltage rating, RMS [V] (``cables.Cable.max_voltage_v``); None for none.
    matched_power_rating_w : float, optional
        Matched average power rating [W] at these frequencies; None for none
        (``cables.Cable.power_rating_w``).
    average_fraction : float
        Average power over PEP, duty factor times transmit fraction (``exposure``), in (0, 1];
        1 for key-down [1].

    Returns
    -------
    LineRatingCheck
        voltage_margin = V_rating / V_max,rms (both RMS; a breakdown happens at the crest, and
        the sqrt(2) cancels); power_margin = rating / (|Z0| I_max,rms^2 average_fraction), which
        for a low-loss line is ``swr_derated_power_rating_w`` over the average power.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., sections 2.3 and 2.7.
    """
    if not 0 < average_fraction <= 1:
        raise ValueError(f"average_fraction must be in (0, 1], got {average_fraction}")
    heating = np.abs(z0_ohm) * extremes.current_rms_a ** 2 * average_fraction
    nan = np.full(np.shape(heating), np.nan)
    voltage_margin = nan if max_voltage_rms_v is None else max_voltage_rms_v / extremes.voltage_rms_v
    power_margin = nan if matched_power_rating_w is None else matched_power_rating_w / heating
    return LineRatingCheck(voltage_margin, heating, power_margin)


def tuner_part_stress(solution, voltage_in_v, current_in_a) -> dict[str, PartStress]:
    """RMS voltage across and current through each part of a tuner setting.

    Parameters
    ----------
    solution : tuner.TunerSolution
        The setting, shapes (..., nf); ``parts`` in ladder order from input to output.
    voltage_in_v : array_like of complex
        RMS voltage at the tuner's input node (radio side) [V]; broadcasts with (..., nf).
        Solved at PEP, the results are the RMS values at the envelope peak.
    current_in_a : array_like of complex
        RMS current into the tuner's input [A].

    Returns
    -------
    dict of str to PartStress
        Part name -> (|V| across it [V], |I| through it [A]); NaN where the part is absent.

    Notes
    -----
    Walking from input to output as `tuner.component_dissipation_w` does: a series part Z
    carries the line current I and has Z I across it, and passes on V - Z I; a shunt part Y has
    the node voltage V across it and carries Y V, and passes on I - Y V.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 4.4 (chain matrices of series and shunt
    elements).
    """
    v = np.asarray(voltage_in_v, dtype=complex)
    i = np.asarray(current_in_a, dtype=complex)
    stress = {}
    for part in solution.parts:
        absent = np.isnan(part.value)
        if part.connection == "series":
            across, through = part.immittance * i, i
            v = v - across
        else:
            across, through = v, part.immittance * v
            i = i - through
        stress[part.name] = PartStress(np.where(absent, np.nan, np.abs(across)),
                                       np.where(absent, np.nan, np.abs(through)))
    return stress
