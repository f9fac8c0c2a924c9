"""Band sweeps: the statistics of an SWR curve across a band.

Pure functions over numpy arrays. A sweep is an SWR array whose last axis follows increasing
frequency; any leading axes (the antenna end and the radio end, several bands of equal point
count) are carried through.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

# The SWR limits a band's usable width is quoted at (common practice: 1.5:1 for equipment
# without a tuner, 2:1 as the usual planning limit, 3:1 for radios that fold back their power).
SWR_LIMITS = (1.5, 2.0, 3.0)
# Points per band when none are asked for: 101 puts a sample every 2 kHz across 40 m and every
# 17 kHz across the 1.7 MHz of 10 m, finer than any antenna's SWR curve changes.
DEFAULT_SWEEP_POINTS = 101


def sweep_frequencies_hz(low_hz, high_hz, points=DEFAULT_SWEEP_POINTS):
    """Evenly spaced frequencies from ``low_hz`` to ``high_hz``, both edges included [Hz].

    Parameters
    ----------
    low_hz, high_hz : float
        Band edges [Hz], low below high.
    points : int
        Number of frequencies, at least 2.

    Returns
    -------
    ndarray, shape (points,)
    """
    if int(points) != points or points < 2:
        raise ValueError(f"a sweep needs at least 2 points, got {points!r}")
    if not 0 < low_hz < high_hz:
        raise ValueError(f"band edges must satisfy 0 < low < high, got {low_hz!r}, {high_hz!r}")
    return np.linspace(low_hz, high_hz, int(points))


@dataclass(frozen=True)
class SweepStatistics:
    """Statistics of SWR curves over one sweep. Shapes: (...) per curve, (..., nl) per SWR limit.

    ``lower_hz``/``upper_hz`` are NaN and ``bandwidth_hz`` zero where the curve never comes
    down to the limit. ``clipped_low``/``clipped_high`` mark a region that reaches the first or
    last sweep point: its true edge lies outside the sweep, so the bandwidth is a lower bound.
    """

    frequency_hz: np.ndarray  # (n,)
    swr_limits: tuple[float, ...]
    swr_min: np.ndarray  # the lowest sample
    frequency_swr_min_hz: np.ndarray  # where it is (the first such sample on a tie)
    swr_low_edge: np.ndarray  # at the first sweep point
    swr_high_edge: np.ndarray  # at the last sweep point
    lower_hz: np.ndarray
    upper_hz: np.ndarray
    bandwidth_hz: np.ndarray
    clipped_low: np.ndarray
    clipped_high: np.ndarray


def _rho_magnitude(swr):
    """|rho| = (SWR - 1)/(SWR + 1); 1 for an infinite SWR."""
    finite = np.isfinite(swr)
    safe = np.where(finite, swr, 1.0)
    return np.where(finite, (safe - 1) / (safe + 1), 1.0)


def sweep_statistics(frequency_hz, swr, swr_limits=SWR_LIMITS) -> SweepStatistics:
    """Lowest SWR, SWR at the band edges and the bandwidth inside each SWR limit.

    Parameters
    ----------
    frequency_hz : array_like, shape (n,)
        Strictly increasing sweep frequencies [Hz], n >= 2.
    swr : array_like, shape (..., n)
        SWR at each frequency (>= 1; ``inf`` allowed) [1].
    swr_limits : sequence of float
        SWR limits, each above 1 [1].

    Returns
    -------
    SweepStatistics

    Notes
    -----
    The region inside a limit is the contiguous run of samples with SWR <= limit that holds the
    lowest sample; a second dip elsewhere in the band does not count. Its edges are where the
    curve crosses the limit between a sample inside and its neighbour outside, found by linear
    interpolation of |rho| = (SWR - 1)/(SWR + 1) in frequency (|rho| stays finite where SWR does
    not, and is near linear in frequency close to resonance, where SWR is not). Where the region
    reaches the end of the sweep the edge is the last sample and ``clipped_*`` says so. The
    lowest SWR is the lowest sample, not interpolated: its frequency is good to one sweep step.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 2.3, equation (2.41) (SWR and |rho|).
    ARRL Antenna Book, transmission-line chapter (SWR bandwidth of an antenna system, and why
    line loss widens it as seen from the transmitter).
    """
    f = np.asarray(frequency_hz, dtype=float)
    swr = np.asarray(swr, dtype=float)
    limits = np.asarray(swr_limits, dtype=float)
    if f.ndim != 1 or f.size < 2 or np.any(np.diff(f) <= 0) or swr.shape[-1:] != f.shape:
        raise ValueError("frequency_hz must be strictly increasing with at least 2 points, "
                         "matching the last axis of swr")
    if np.any(np.isnan(swr)) or np.any(swr < 1):
        raise ValueError("an SWR must be a number >= 1")
    if limits.ndim != 1 or np.any(~(limits > 1)) or np.any(~np.isfinite(limits)):
        raise ValueError("SWR limits must be finite numbers above 1")

    rho = _rho_magnitude(swr)  # (..., n)
    rho_limit = (limits - 1) / (limits + 1)  # (nl,)
    n = f.size
    index = np.arange(n)
    i_min = np.argmin(rho, axis=-1)  # (...)
    i_min_l = i_min[..., None, None]  # against (..., nl, n)
    outside = rho[..., None, :] > rho_limit[:, None]  # (..., nl, n)
    found = ~np.take_along_axis(outside, i_min_l, -1)[..., 0]  # the lowest sample is inside
    # nearest sample outside the limit on each side of the lowest one (-1 or n: none)
    left = np.where(outside & (index < i_min_l), index, -1).max(-1)
    right = np.where(outside & (index > i_min_l), index, n).min(-1)
    clipped_low, clipped_high = found & (left < 0), found & (right >= n)

    rho_l = rho[..., None, :]
    k = np.clip(left, 0, n - 2)[..., None]  # outside at k, inside at k + 1
    r0, r1 = np.take_along_axis(rho_l, k, -1)[..., 0], np.take_along_axis(rho_l, k + 1, -1)[..., 0]
    step = np.where(r0 > r1, r0 - r1, 1.0)
    lower = f[k[..., 0]] + (r0 - rho_limit) / step * (f[k[..., 0] + 1] - f[k[..., 0]])
    lower = np.where(clipped_low, f[0], lower)

    k = np.clip(right, 1, n - 1)[..., None]  # inside at k - 1, outside at k
    r0, r1 = np.take_along_axis(rho_l, k - 1, -1)[..., 0], np.take_along_axis(rho_l, k, -1)[..., 0]
    step = np.where(r1 > r0, r1 - r0, 1.0)
    upper = f[k[..., 0] - 1] + (rho_limit - r0) / step * (f[k[..., 0]] - f[k[..., 0] - 1])
    upper = np.where(clipped_high, f[-1], upper)

    lower, upper = np.where(found, lower, np.nan), np.where(found, upper, np.nan)
    return SweepStatistics(
        frequency_hz=f, swr_limits=tuple(float(x) for x in limits),
        swr_min=np.take_along_axis(swr, i_min[..., None], -1)[..., 0], frequency_swr_min_hz=f[i_min],
        swr_low_edge=swr[..., 0], swr_high_edge=swr[..., -1],
        lower_hz=lower, upper_hz=upper, bandwidth_hz=np.where(found, upper - lower, 0.0),
        clipped_low=clipped_low, clipped_high=clipped_high)
