"""Tolerances of what a user can only estimate, drawn for a Monte Carlo over a station: the
draws, and the chain matrices of lines and small parts at the drawn values.

Every tolerance is a range with no preferred value inside it, so each draw is uniform over its
range (a rectangular distribution, JCGM 100:2008, section 4.3.7); the instrument's reflection
error is uniform over a disc of its radius in the complex plane. Draws come from
numpy.random.default_rng seeded from the run's seed and a key per quantity, so a run reproduces
itself exactly and two stations that share a part share its draws.

Pure numpy in SI units; a leading axis of draws, shape (draws, nf), on every result.
"""
from __future__ import annotations

import zlib
from dataclasses import dataclass

import numpy as np

from linecalc.physics.cables import line_constants
from linecalc.physics.cascade import cascade_abcd
from linecalc.physics.lumped import series_abcd
from linecalc.physics.small_parts import rlgc_for_resistance, series_resistance_for_loss_ohm
from linecalc.physics.twoports import line_abcd, line_abcd_scaled, transformer_abcd

# The defaults, documented in the README (Uncertainty) where the options are:
# - new cable loses 0 to 30 % more than its figures (braid, plating, moisture; common practice);
# - a velocity factor is known to +-0.02 (common practice for a published figure);
# - a length is measured to +-1 % (common practice for a tape along a run);
# - a calibrated amateur analyser's reflection error is about 0.02 (common practice, as the
#   feedpoint warning's figure);
# - an antenna impedance table (a model or an estimate) is good to +-10 % in R and in X (common practice);
# - a connector's, choke's or balun's loss figure is good to +-50 % (common practice: a rough figure).
CABLE_LOSS_PERCENT = (0.0, 30.0)
VELOCITY_FACTOR_TOLERANCE = 0.02
LENGTH_PERCENT = 1.0
RHO_ERROR = 0.02
ANTENNA_PERCENT = 10.0
PART_LOSS_PERCENT = 50.0
DRAWS = 2000
SEED = 1


@dataclass(frozen=True)
class Tolerances:
    """The tolerances of one run (defaults above) and its draws and seed."""

    cable_loss_percent: tuple = CABLE_LOSS_PERCENT
    velocity_factor: float = VELOCITY_FACTOR_TOLERANCE
    length_percent: float = LENGTH_PERCENT
    rho_error: float = RHO_ERROR
    antenna_percent: float = ANTENNA_PERCENT
    part_loss_percent: float = PART_LOSS_PERCENT
    draws: int = DRAWS
    seed: int = SEED

    def to_dict(self) -> dict:
        return {"cable_loss_percent": list(self.cable_loss_percent), "velocity_factor": self.velocity_factor,
                "length_percent": self.length_percent, "rho_error": self.rho_error,
                "antenna_percent": self.antenna_percent, "part_loss_percent": self.part_loss_percent,
                "draws": self.draws, "seed": self.seed}


def generator(seed, *key):
    """A numpy generator for one quantity: the run's seed with a key of whole numbers or text
    (text by its CRC-32, so the same part in two stations draws the same values)."""
    words = [seed] + [zlib.crc32(k.encode("utf-8")) if isinstance(k, str) else int(k) for k in key]
    return np.random.default_rng(words)


def uniform_factor(rng, low_percent, high_percent, draws):
    """1 + u/100 with u uniform on [low, high] [%], shape (draws, 1)."""
    return 1 + rng.uniform(low_percent, high_percent, (draws, 1)) / 100


def disc(rng, radius, shape):
    """Complex numbers uniform over the disc of ``radius``: r = radius sqrt(U), angle 2 pi V."""
    return radius * np.sqrt(rng.uniform(0, 1, shape)) * np.exp(2j * np.pi * rng.uniform(0, 1, shape))


def drawn_line_abcd(z0_ohm, gamma_per_m, velocity_factor, length_m, loss_factor, vf_offset, length_factor,
                    scaled=True):
    """Chain matrices of a line at drawn loss, velocity factor and length, shape (draws, nf, 2, 2).

    Parameters
    ----------
    z0_ohm, gamma_per_m : ndarray, shape (nf,)
        The line's nominal constants [ohm], [1/m].
    velocity_factor : float
        Its nominal velocity factor.
    length_m : float
    loss_factor, vf_offset, length_factor : ndarray, shape (draws, 1)
        alpha is multiplied by ``loss_factor``, beta by VF/(VF + ``vf_offset``), the length by
        ``length_factor``.
    scaled : bool
        Return a `ScaledAbcd` (for the path solve) or the plain matrices (for de-embedding).

    Notes
    -----
    Z0 is kept at its nominal value: to first order in the loss a change of alpha or of the
    velocity factor leaves it unchanged (its small imaginary part scales with the loss; an
    approximation of the order of alpha/beta, under 1 % at HF for coax).

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., sections 2.1 (beta = omega / v_p) and 2.7 (the
    low-loss line, Z0 ~ sqrt(L/C)).
    """
    gamma = (gamma_per_m.real * loss_factor
             + 1j * gamma_per_m.imag * velocity_factor / (velocity_factor + vf_offset))
    length = length_m * length_factor[:, 0]
    return line_abcd_scaled(z0_ohm, gamma, length) if scaled else line_abcd(z0_ohm, gamma, length)


def drawn_connector_abcd(frequency_hz, loss_db, z_ref_ohm, factor):
    """A connector element (its whole loss ``loss_db``) at loss x ``factor`` (draws, 1): a series
    resistance R = Z_ref (10^(loss/10) - 1) (Pozar, 4th ed., section 4.4), shape (draws, nf, 2, 2)."""
    resistance = series_resistance_for_loss_ohm(loss_db * factor, z_ref_ohm)
    return series_abcd(np.broadcast_to(resistance, (factor.shape[0], np.size(frequency_hz))).astype(complex))


def drawn_winding_abcd(frequency_hz, z0_nominal_ohm, velocity_factor, length_m, r_ohm_per_m, factor,
                       impedance_ratio=None):
    """A choke's or balun's winding (then its ideal transformer of ``impedance_ratio``) with its
    conductor resistance ``r_ohm_per_m`` (nf,) times ``factor`` (draws, 1), shape (draws, nf, 2, 2).

    ``r_ohm_per_m`` is the winding's resistance for its nominal loss
    (`linecalc.physics.small_parts.winding_resistance_ohm_per_m`, solved once for all draws).

    Notes
    -----
    The matched loss of a short section is proportional to its resistance to first order, so the
    loss is multiplied by ``factor`` up to terms of second order in the loss (a few 1e-4 of a
    0.2 dB part).

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., sections 2.1 and 2.7; `linecalc.physics.small_parts`.
    """
    f = np.asarray(frequency_hz, dtype=float)
    if length_m == 0:
        one = np.ones((factor.shape[0], f.size), complex)
        matrix = np.stack([np.stack([one, 0 * one], -1), np.stack([0 * one, one], -1)], -2)
    else:
        r = np.asarray(r_ohm_per_m, dtype=float) * factor
        grid = np.broadcast_to(f, r.shape)
        z0, gamma = line_constants(grid, rlgc_for_resistance(grid, z0_nominal_ohm, velocity_factor, r))
        matrix = line_abcd(z0, gamma, length_m)
    if impedance_ratio is None:
        return matrix
    return cascade_abcd([matrix, transformer_abcd(impedance_ratio, f)])
