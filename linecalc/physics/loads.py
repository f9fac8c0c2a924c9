"""Antenna loads: a complex feedpoint-impedance table, or an SWR-only table with unknown phase.

Tables are interpolated between their points and never extrapolated.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

# A frequency this close (relative) to a table edge counts as on it: unit conversion rounding.
EDGE_TOLERANCE = 1e-9


def _end_slope(h0, h1, delta0, delta1):
    """One-sided three-point slope at an end of a PCHIP, kept shape-preserving."""
    slope = ((2 * h0 + h1) * delta0 - h0 * delta1) / (h0 + h1)
    if np.sign(slope) != np.sign(delta0):
        return 0.0
    if np.sign(delta0) != np.sign(delta1) and abs(slope) > abs(3 * delta0):
        return 3 * delta0
    return slope


def pchip_slopes(x, y):
    """Slopes of the shape-preserving piecewise-cubic Hermite interpolant at its knots.

    Parameters
    ----------
    x : ndarray, shape (n,)
        Strictly increasing knots, n >= 2.
    y : ndarray, shape (n,)
        Values at the knots.

    Returns
    -------
    ndarray, shape (n,)
        Interior slopes are the weighted harmonic mean of the neighbouring secants (zero where
        they change sign); end slopes the one-sided three-point formula, limited.

    References
    ----------
    Fritsch and Carlson, Monotone piecewise cubic interpolation, SIAM J. Numer. Anal. 17 (1980)
    238-246; Moler, Numerical Computing with MATLAB (2004), section 3.4 (pchip), whose end
    conditions this follows.
    """
    h = np.diff(x)
    delta = np.diff(y) / h
    if x.size == 2:
        return np.array([delta[0], delta[0]])
    slopes = np.zeros_like(y)
    w1 = 2 * h[1:] + h[:-1]
    w2 = h[1:] + 2 * h[:-1]
    same_sign = np.sign(delta[:-1]) * np.sign(delta[1:]) > 0
    # the weighted harmonic mean (w1 + w2) / (w1/d0 + w2/d1), written without dividing by a
    # secant, which may be tiny
    numerator = (w1 + w2) * delta[:-1] * delta[1:]
    denominator = np.where(same_sign, w1 * delta[1:] + w2 * delta[:-1], 1.0)
    slopes[1:-1] = np.where(same_sign, numerator / denominator, 0.0)
    slopes[0] = _end_slope(h[0], h[1], delta[0], delta[1])
    slopes[-1] = _end_slope(h[-1], h[-2], delta[-1], delta[-2])
    return slopes


def _interpolate(table_hz, values, at_hz):
    """PCHIP interpolation of ``values`` over ``table_hz`` at ``at_hz``; exact at a one-point table."""
    at_hz = np.asarray(at_hz, dtype=float)
    if table_hz.size == 1:
        return np.broadcast_to(values[0], at_hz.shape).astype(values.dtype)
    slopes = pchip_slopes(table_hz, values)
    x = np.clip(at_hz, table_hz[0], table_hz[-1])  # only rounding-level excursions reach here
    k = np.clip(np.searchsorted(table_hz, x, side="right") - 1, 0, table_hz.size - 2)
    h = table_hz[k + 1] - table_hz[k]
    t = (x - table_hz[k]) / h
    # cubic Hermite basis on [0, 1]
    h00, h10 = (1 + 2 * t) * (1 - t) ** 2, t * (1 - t) ** 2
    h01, h11 = t * t * (3 - 2 * t), t * t * (t - 1)
    return h00 * values[k] + h10 * h * slopes[k] + h01 * values[k + 1] + h11 * h * slopes[k + 1]


def outside_table(table_hz, at_hz):
    """Boolean mask of the frequencies that lie outside the table's span (beyond rounding)."""
    at_hz = np.asarray(at_hz, dtype=float)
    low, high = table_hz[0] * (1 - EDGE_TOLERANCE), table_hz[-1] * (1 + EDGE_TOLERANCE)
    return (at_hz < low) | (at_hz > high)


@dataclass(frozen=True)
class ImpedanceTable:
    """Feedpoint impedance [ohm] at increasing frequencies [Hz].

    Between points, R and X are interpolated separately by PCHIP (Fritsch and Carlson, SIAM J.
    Numer. Anal. 17 (1980) 238), which does not overshoot, so a positive R stays positive.
    """

    frequency_hz: np.ndarray
    impedance_ohm: np.ndarray

    def impedance_at(self, at_hz):
        resistance = _interpolate(self.frequency_hz, self.impedance_ohm.real, at_hz)
        reactance = _interpolate(self.frequency_hz, self.impedance_ohm.imag, at_hz)
        return resistance + 1j * reactance


@dataclass(frozen=True)
class SwrTable:
    """SWR against the reference impedance at increasing frequencies [Hz]; the phase is unknown.

    Between points the magnitude of the reflection coefficient is interpolated by PCHIP.
    """

    frequency_hz: np.ndarray
    swr: np.ndarray

    def rho_magnitude_at(self, at_hz):
        magnitude = (self.swr - 1) / (self.swr + 1)
        return _interpolate(self.frequency_hz, magnitude, at_hz)


def rho_from_impedance(impedance_ohm, z_ref_ohm):
    """Reflection coefficient (Z - Z_ref)/(Z + Z_ref).

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 2.3, equation (2.35).
    """
    impedance_ohm = np.asarray(impedance_ohm, dtype=complex)
    return (impedance_ohm - z_ref_ohm) / (impedance_ohm + z_ref_ohm)


@dataclass(frozen=True)
class MeasuredAntenna:
    """A measurement taken at a point of the feed path, looking toward the antenna.

    ``node`` is where it was taken (0 the radio end, k the input of feed element k, a meter);
    ``table`` is what was measured there: a complex impedance sweep or an SWR reading against
    the reference impedance; ``source`` says where it came from, for messages.
    """

    node: int
    table: ImpedanceTable | SwrTable
    source: str

    @property
    def frequency_hz(self):
        return self.table.frequency_hz
