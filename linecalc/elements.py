"""Two-port elements of the feed path. Each one only has to give its chain matrix.

An element has a ``kind`` and a ``label``, and three methods over a frequency array [Hz]:
``abcd`` (chain matrix, shape (..., nf, 2, 2)), ``port_z0_ohm`` (the characteristic impedance
that SWR is measured against at its input and at its output) and ``matched_loss_db`` (its loss
when terminated in its own characteristic impedance). The solver does the rest.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .cables import Cable

DB_PER_NEPER = 20 * np.log10(np.e)


def line_abcd(z0_ohm, gamma_per_m, length_m):
    """Chain (ABCD) matrix of a uniform transmission line.

    Parameters
    ----------
    z0_ohm : array_like of complex, shape (nf,)
        Characteristic impedance [ohm].
    gamma_per_m : array_like of complex, shape (nf,)
        Propagation constant [1/m].
    length_m : float or array_like, shape (...)
        Length [m]; extra axes lead the result.

    Returns
    -------
    ndarray, shape (..., nf, 2, 2)
        [[cosh(gl), Z0 sinh(gl)], [sinh(gl)/Z0, cosh(gl)]].

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 4.4, Table 4.1 (ABCD parameters of a
    transmission line, written for a lossy line with gamma in place of j beta).
    """
    gl = np.asarray(length_m, dtype=float)[..., None] * gamma_per_m
    cosh, sinh = np.cosh(gl), np.sinh(gl)
    z0 = np.broadcast_to(z0_ohm, gl.shape)
    return np.stack([np.stack([cosh, z0 * sinh], -1), np.stack([sinh / z0, cosh], -1)], -2)


@dataclass(frozen=True)
class Line:
    """A length of cable. ``length_m`` may be an array: its axes lead the results."""

    cable: Cable
    length_m: float | np.ndarray
    label: str = ""
    kind: str = "line"

    def abcd(self, frequency_hz):
        z0, gamma = self.cable.constants(frequency_hz)
        return line_abcd(z0, gamma, self.length_m)

    def port_z0_ohm(self, frequency_hz):
        z0, _ = self.cable.constants(frequency_hz)
        return z0, z0

    def matched_loss_db(self, frequency_hz):
        """Matched loss [dB]: 20 log10(e) alpha l."""
        _, gamma = self.cable.constants(frequency_hz)
        return DB_PER_NEPER * gamma.real * np.asarray(self.length_m, dtype=float)[..., None]
