"""Antenna loads: a complex feedpoint-impedance table, or an SWR-only table with unknown phase.

Tables are interpolated between their points and never extrapolated.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

# A frequency this close (relative) to a table edge counts as on it: unit conversion rounding.
EDGE_TOLERANCE = 1e-9


def _interpolate(table_hz, values, at_hz):
    """Shape-preserving piecewise-cubic (PCHIP) interpolation; exact at a one-point table."""
    at_hz = np.asarray(at_hz, dtype=float)
    if table_hz.size == 1:
        return np.broadcast_to(values[0], at_hz.shape).astype(values.dtype)
    from scipy.interpolate import PchipInterpolator

    clipped = np.clip(at_hz, table_hz[0], table_hz[-1])  # only rounding-level excursions reach here
    return PchipInterpolator(table_hz, values)(clipped)


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
