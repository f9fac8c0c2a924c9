"""Moving a measurement along the feed path: de-embedding, embedding, and shack SWR readings.

A measurement taken at the radio end (or at a meter) looks into the cascade of every element
between that point and the antenna. Removing the cascade (de-embedding) recovers what the antenna
presents at its feedpoint; adding it (embedding) predicts what an instrument would read.

Conventions. ``abcd_list`` holds chain matrices from the measuring point toward the antenna,
each of shape (..., nf, 2, 2), as the elements give them (`linecalc.elements`). A reflection
coefficient at the measuring point, ``rho_measured``, is against the real ``z_ref_ohm`` (the
instrument's reference resistance); at the antenna, ``rho_antenna`` is against
``z0_antenna_ohm``, which may be complex (the characteristic impedance of the element that
feeds the antenna, as the budget reports ``swr_antenna``) and defaults to ``z_ref_ohm``.
rho = (Z - Z0)/(Z + Z0) throughout, written in V and I as in `linecalc.physics.cascade.reflection`.

Working in rho rather than impedance keeps opens and shorts finite; the impedance functions
accept and return an infinite impedance for an open.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from linecalc.physics.cascade import cascade_entries, split_entries, swr_from_rho

# Phase samples of a magnitude-only reading: one per degree. The least and most |rho| are exact
# (closed form); only the phase-mean |rho| comes from the samples.
DEFAULT_PHASE_SAMPLES = 360


def _inverse_entries(a, b, c, d):
    """Closed-form inverse of [[a, b], [c, d]]: [[d, -b], [-c, a]] / (ad - bc)."""
    det = a * d - b * c
    if np.any(det == 0):
        raise ValueError("a chain matrix is singular (ad - bc = 0): this path cannot be de-embedded")
    return d / det, -b / det, -c / det, a / det


def inverse_abcd(abcd):
    """Inverse of chain matrices by the closed-form 2x2 inverse, vectorised.

    Parameters
    ----------
    abcd : ndarray, shape (..., 2, 2)

    Returns
    -------
    ndarray, shape (..., 2, 2)
        [[D, -B], [-C, A]] / (AD - BC). The determinant is not assumed to be 1 (it is 1 only for
        a reciprocal network).

    Raises
    ------
    ValueError
        Where a matrix is singular.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 4.4 (ABCD matrix; AD - BC = 1 for a
    reciprocal network).
    """
    n11, n12, n21, n22 = _inverse_entries(*split_entries(np.asarray(abcd, dtype=complex)))
    return np.stack([np.stack([n11, n12], -1), np.stack([n21, n22], -1)], -2)


def _state_from_impedance(z_ohm):
    """Port state (V, I) of an impedance: (Z, 1), or (1, 0) for an open (infinite Z)."""
    z = np.asarray(z_ohm, dtype=complex)
    if np.any(np.isnan(z)):
        raise ValueError("an impedance is NaN")
    open_circuit = np.isinf(z)
    return np.where(open_circuit, 1.0 + 0j, z), np.where(open_circuit, 0j, 1.0 + 0j)


def _divide(numerator, denominator):
    """numerator / denominator; complex infinity where the denominator is zero (an open, a pole)."""
    zero = denominator == 0
    return np.where(zero, complex(np.inf, 0.0), numerator / np.where(zero, 1.0, denominator))


def _rho_from_state(v, i, z0_ohm):
    """(V - Z0 I)/(V + Z0 I); complex infinity where the impedance is -Z0."""
    return _divide(v - z0_ohm * i, v + z0_ohm * i)


def embed_impedance(abcd_list, z_load_ohm):
    """Impedance at the input of a cascade terminated in ``z_load_ohm``.

    Parameters
    ----------
    abcd_list : sequence of ndarray, each (..., nf, 2, 2)
        Chain matrices from the input toward the load.
    z_load_ohm : array_like of complex, (..., nf)
        Load impedance [ohm]; ``inf`` for an open.

    Returns
    -------
    ndarray of complex
        Input impedance [ohm]: [V_in, I_in] = ABCD [Z_load, 1]; ``inf`` where I_in = 0.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 4.4 (ABCD matrix of a cascade).
    """
    v, i = _state_from_impedance(z_load_ohm)
    a, b, c, d = cascade_entries(abcd_list)
    return _divide(a * v + b * i, c * v + d * i)


def deembed_impedance(abcd_list, z_measured_ohm):
    """Load impedance at the far end of a cascade from the impedance measured at its input.

    Parameters
    ----------
    abcd_list : sequence of ndarray, each (..., nf, 2, 2)
        Chain matrices from the measuring point toward the antenna.
    z_measured_ohm : array_like of complex, (..., nf)
        Impedance measured at the input [ohm]; ``inf`` for an open.

    Returns
    -------
    ndarray of complex
        Load impedance [ohm]: [V_out, I_out] = ABCD^-1 [Z_in, 1], Z_load = V_out / I_out;
        ``inf`` where I_out = 0. A negative real part means the described path does not match
        the measurement (an active load).

    Raises
    ------
    ValueError
        Where the total chain matrix is singular, or an impedance is NaN.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 4.4 (ABCD matrix; its inverse maps the input
    state back to the output state).
    """
    v, i = _state_from_impedance(z_measured_ohm)
    n11, n12, n21, n22 = _inverse_entries(*cascade_entries(abcd_list))
    return _divide(n11 * v + n12 * i, n21 * v + n22 * i)


def _mobius(n_entries, z_from_ohm, z_to_ohm):
    """Coefficients (a, b, c, d) of rho_to = (a rho_from + b) / (c rho_from + d).

    ``n_entries`` is the chain matrix that maps the port state at the 'from' end to the state at
    the 'to' end; rho_from is against ``z_from_ohm``, rho_to against ``z_to_ohm``. With
    V = 1 + rho, I = (1 - rho)/Z_from the state is linear in rho, so rho_to is bilinear in it.
    """
    n11, n12, n21, n22 = n_entries
    v_const, v_rho = n11 + n12 / z_from_ohm, n11 - n12 / z_from_ohm
    i_const, i_rho = n21 + n22 / z_from_ohm, n21 - n22 / z_from_ohm
    return (v_rho - z_to_ohm * i_rho, v_const - z_to_ohm * i_const,
            v_rho + z_to_ohm * i_rho, v_const + z_to_ohm * i_const)


def _apply(coefficients, rho):
    """(a rho + b)/(c rho + d); complex infinity at the pole."""
    a, b, c, d = coefficients
    return _divide(a * rho + b, c * rho + d)


def _deembedding_map(abcd_list, z_ref_ohm, z0_antenna_ohm):
    z0 = np.asarray(z_ref_ohm if z0_antenna_ohm is None else z0_antenna_ohm)
    return _mobius(_inverse_entries(*cascade_entries(abcd_list)), z_ref_ohm, z0)


def _embedding_map(abcd_list, z_ref_ohm, z0_antenna_ohm):
    z0 = np.asarray(z_ref_ohm if z0_antenna_ohm is None else z0_antenna_ohm)
    return _mobius(cascade_entries(abcd_list), z0, z_ref_ohm)


def deembed_rho(abcd_list, rho_measured, z_ref_ohm, z0_antenna_ohm=None):
    """Reflection coefficient at the antenna from the one measured at the input of the path.

    Parameters
    ----------
    abcd_list : sequence of ndarray, each (..., nf, 2, 2)
        Chain matrices from the measuring point toward the antenna.
    rho_measured : array_like of complex, (..., nf)
        Reflection coefficient measured against ``z_ref_ohm``.
    z_ref_ohm : float
        Reference resistance of the measurement [ohm].
    z0_antenna_ohm : complex or array_like (nf,), optional
        Impedance the antenna's rho is taken against [ohm]; default ``z_ref_ohm``.

    Returns
    -------
    ndarray of complex
        rho at the antenna: the state V = 1 + rho, I = (1 - rho)/Z_ref mapped through ABCD^-1,
        then (V - Z0 I)/(V + Z0 I). Complex infinity where the antenna impedance would be -Z0.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., sections 2.3 (reflection coefficient) and 4.4
    (ABCD matrix).
    """
    return _apply(_deembedding_map(abcd_list, z_ref_ohm, z0_antenna_ohm), np.asarray(rho_measured, dtype=complex))


def embed_rho(abcd_list, rho_antenna, z_ref_ohm, z0_antenna_ohm=None):
    """Reflection coefficient at the input of the path from the one at the antenna.

    The inverse of `deembed_rho`; parameters as there, with ``rho_antenna`` against
    ``z0_antenna_ohm`` and the result against ``z_ref_ohm``.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., sections 2.3 and 4.4.
    """
    return _apply(_embedding_map(abcd_list, z_ref_ohm, z0_antenna_ohm), np.asarray(rho_antenna, dtype=complex))


def sensitivity_multiplier(abcd_list, rho_measured, z_ref_ohm, z0_antenna_ohm=None):
    """How much an error in the measured rho grows on its way to the antenna: |d rho_ant / d rho_meas|.

    Parameters
    ----------
    abcd_list, rho_measured, z_ref_ohm, z0_antenna_ohm
        As in `deembed_rho`.

    Returns
    -------
    ndarray of float, (..., nf)
        |ad - bc| / |c rho + d|^2 for the bilinear map rho_ant = (a rho + b)/(c rho + d) of
        `deembed_rho` [1]. A small error e in the measured rho (in any direction, magnitude or
        phase) moves rho at the antenna by about multiplier * e, and so |rho| at the antenna by
        at most that. Through a matched line of real Z0 it is 10^(ML/10), ML the matched loss
        in dB between the two points. Infinite at the pole of the map.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 4.4 (ABCD matrix); the derivative of a
    bilinear (Moebius) map, (ad - bc)/(c z + d)^2: Ahlfors, Complex Analysis, 3rd ed.,
    chapter 3, section 3 (linear transformations; section number from memory). ARRL Antenna Book, transmission-line
    chapter (|rho| at the antenna = |rho| at the meter times 10^(ML/10) on a line of real Z0).
    """
    a, b, c, d = _deembedding_map(abcd_list, z_ref_ohm, z0_antenna_ohm)
    denominator = np.abs(c * np.asarray(rho_measured, dtype=complex) + d) ** 2
    pole = denominator == 0
    return np.where(pole, np.inf, np.abs(a * d - b * c) / np.where(pole, 1.0, denominator))


def _image_circle_extremes(coefficients, radius):
    """Least and most |w| over the image of the circle |z| = radius under w = (az + b)/(cz + d),
    and the most |dw/dz| on that circle. Exact: a bilinear map takes circles to circles.

    The image of the pole's mirror point r^2 / conj(z_pole) is the image circle's centre:
    centre = (b conj(d) - a r^2 conj(c)) / (|d|^2 - r^2 |c|^2), radius
    r |ad - bc| / ||d|^2 - r^2 |c|^2|. Where the pole lies on the circle (denominator zero) the
    image is a line: the most |w| is infinite, the least is NaN here (the caller takes it from
    its samples).
    """
    a, b, c, d = coefficients
    r = np.asarray(radius, dtype=float)
    det = np.abs(a * d - b * c)
    denominator = np.abs(d) ** 2 - r**2 * np.abs(c) ** 2
    line = denominator == 0
    safe = np.where(line, 1.0, denominator)
    centre = (b * np.conj(d) - a * r**2 * np.conj(c)) / safe
    image_radius = r * det / np.abs(safe)
    rho_max = np.where(line, np.inf, np.abs(centre) + image_radius)
    rho_min = np.where(line, np.nan, np.abs(np.abs(centre) - image_radius))
    gap = np.abs(np.abs(d) - r * np.abs(c))  # least |c z + d| on the circle
    multiplier_max = np.where(gap == 0, np.inf, det / np.where(gap == 0, 1.0, gap) ** 2)
    return rho_min, rho_max, multiplier_max


@dataclass(frozen=True)
class ReflectionRange:
    """What a magnitude-only reading at one end of the path says about |rho| at the other end.

    All arrays have the shape of the reading, (..., nf), except ``rho`` (phase samples first).
    SWR follows from |rho| by (1 + |rho|)/(1 - |rho|), infinite at |rho| >= 1.
    """

    rho: np.ndarray  # complex, (samples, ..., nf): far-end rho at each sampled phase of the reading
    rho_min: np.ndarray  # least |rho| over all phases (exact)
    rho_max: np.ndarray  # most |rho| over all phases (exact; inf if some phase reaches the map's pole)
    rho_mean: np.ndarray  # mean |rho| over the uniformly sampled phases
    swr_min: np.ndarray
    swr_max: np.ndarray
    swr_mean: np.ndarray  # SWR of the mean |rho|
    undetermined: np.ndarray  # bool: some phase reaches |rho| >= 1 at the far end (see the functions)
    sensitivity_max: np.ndarray  # most |d rho_far / d rho_near| over all phases (exact)


def _phase_circle(rho_magnitude, phase_samples):
    magnitude = np.asarray(rho_magnitude, dtype=float)
    if np.any(np.isnan(magnitude)) or np.any(magnitude < 0):
        raise ValueError("a reflection magnitude must be a number >= 0")
    if phase_samples < 1:
        raise ValueError("phase_samples must be at least 1")
    return magnitude, np.exp(2j * np.pi * np.arange(phase_samples) / phase_samples)


def _range(coefficients, magnitude, phase, extra_undetermined):
    # the phase axis leads every axis of the path and of the reading
    ndim = max(np.ndim(coefficients[0]), magnitude.ndim)
    rho = _apply(coefficients, phase.reshape((-1,) + (1,) * ndim) * magnitude)
    rho_min, rho_max, multiplier_max = _image_circle_extremes(coefficients, magnitude)
    far_magnitude = np.abs(rho)
    rho_min = np.where(np.isnan(rho_min), far_magnitude.min(axis=0), rho_min)
    rho_mean = far_magnitude.mean(axis=0)
    return ReflectionRange(
        rho=rho, rho_min=rho_min, rho_max=rho_max, rho_mean=rho_mean,
        swr_min=swr_from_rho(rho_min), swr_max=swr_from_rho(rho_max), swr_mean=swr_from_rho(rho_mean),
        undetermined=(rho_max >= 1) | extra_undetermined, sensitivity_max=multiplier_max)


def antenna_range_from_reading(abcd_list, rho_magnitude_measured, z_ref_ohm, z0_antenna_ohm=None,
                               phase_samples=DEFAULT_PHASE_SAMPLES) -> ReflectionRange:
    """|rho| at the antenna from an SWR (|rho|) read at the radio or a meter, whose phase is unknown.

    Parameters
    ----------
    abcd_list : sequence of ndarray, each (..., nf, 2, 2)
        Chain matrices from the meter toward the antenna.
    rho_magnitude_measured : array_like of float, (..., nf)
        |rho| read against ``z_ref_ohm``, (SWR - 1)/(SWR + 1) [1].
    z_ref_ohm : float
        The meter's reference resistance [ohm].
    z0_antenna_ohm : complex or array_like (nf,), optional
        What |rho| at the antenna is taken against [ohm]: pass the characteristic impedance of
        the element that feeds the antenna to match the budget's ``swr_antenna``; default
        ``z_ref_ohm``.
    phase_samples : int
        Phases of the reading sampled for ``rho`` and ``rho_mean``.

    Returns
    -------
    ReflectionRange
        Every antenna consistent with the reading lies on one circle (the image of the circle
        |rho_meas| = const under the bilinear de-embedding map); ``rho_min`` and ``rho_max``
        are its exact least and most |rho|. ``undetermined`` is True where the circle reaches
        |rho| >= 1 against ``z0_antenna_ohm`` or against ``z_ref_ohm`` (a lossless or active
        antenna, Re Z <= 0, would then fit the reading): the path loses so much that the
        reading cannot pin the antenna down. ``sensitivity_max`` is the largest error
        multiplier on the circle (see `sensitivity_multiplier`).

    Notes
    -----
    Through a matched line of real Z0 and matched loss ML dB, the circle is centred on the
    origin: |rho_antenna| = |rho_meter| 10^(ML/10) at every phase, the relation of the ARRL
    Antenna Book. A complex Z0 or lumped parts in the path make the least and most differ.

    References
    ----------
    ARRL Antenna Book, transmission-line chapter (SWR at the antenna from SWR at the
    transmitter and the matched loss). Pozar, Microwave Engineering, 4th ed., sections 2.3 and
    4.4. Ahlfors, Complex Analysis, 3rd ed., chapter 3, section 3 (a linear transformation
    carries circles to circles and preserves symmetry; section number from memory).
    """
    magnitude, phase = _phase_circle(rho_magnitude_measured, phase_samples)
    coefficients = _deembedding_map(abcd_list, z_ref_ohm, z0_antenna_ohm)
    # a lossless or active antenna (|rho| >= 1 against the real reference) also fits the reading
    _, passive_max, _ = _image_circle_extremes(_deembedding_map(abcd_list, z_ref_ohm, None), magnitude)
    return _range(coefficients, magnitude, phase, passive_max >= 1)


def reading_range_from_antenna(abcd_list, rho_magnitude_antenna, z_ref_ohm, z0_antenna_ohm=None,
                               phase_samples=DEFAULT_PHASE_SAMPLES) -> ReflectionRange:
    """|rho| a meter at the input of the path would read, from |rho| at the antenna of unknown phase.

    The inverse direction of `antenna_range_from_reading`: parameters as there, with
    ``rho_magnitude_antenna`` against ``z0_antenna_ohm``; the result is against ``z_ref_ohm``.
    ``undetermined`` is True where some phase reaches |rho| >= 1 at the meter (only a lossless
    path with a lossless antenna, or an active path, can do that). ``sensitivity_max`` is the
    largest |d rho_meter / d rho_antenna| on the circle: about 10^(-ML/10).

    References
    ----------
    ARRL Antenna Book, transmission-line chapter. Pozar, Microwave Engineering, 4th ed.,
    sections 2.3 and 4.4.
    """
    magnitude, phase = _phase_circle(rho_magnitude_antenna, phase_samples)
    return _range(_embedding_map(abcd_list, z_ref_ohm, z0_antenna_ohm), magnitude, phase, False)


@dataclass(frozen=True)
class DeembeddedSweep:
    """A sweep measured at the input of the path, moved to the antenna. Arrays (..., nf)."""

    z_antenna_ohm: np.ndarray  # complex; inf where open
    rho_antenna: np.ndarray  # complex, against z0_antenna_ohm
    swr_antenna: np.ndarray  # against z0_antenna_ohm; inf where |rho| >= 1
    active: np.ndarray  # bool: Re(Z) < 0, the described path does not match the measurement
    sensitivity: np.ndarray  # |d rho_antenna / d rho_measured| at each point


def deembed_sweep(abcd_list, z_measured_ohm, z_ref_ohm, z0_antenna_ohm=None) -> DeembeddedSweep:
    """De-embed a measured impedance sweep and say how far to trust it.

    Parameters
    ----------
    abcd_list : sequence of ndarray, each (..., nf, 2, 2)
        Chain matrices from the measuring point toward the antenna.
    z_measured_ohm : array_like of complex, (..., nf)
        Measured impedance [ohm]; ``inf`` for an open.
    z_ref_ohm : float
        Reference resistance the measurement's errors are thought of against (the instrument's)
        [ohm]; it sets ``sensitivity``.
    z0_antenna_ohm : complex or array_like (nf,), optional
        What the antenna's rho and SWR are taken against [ohm]; default ``z_ref_ohm``.

    Returns
    -------
    DeembeddedSweep

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., sections 2.3 and 4.4.
    """
    z_antenna = deembed_impedance(abcd_list, z_measured_ohm)
    v, i = _state_from_impedance(z_measured_ohm)
    rho_measured = _rho_from_state(v, i, z_ref_ohm)
    z0 = np.asarray(z_ref_ohm if z0_antenna_ohm is None else z0_antenna_ohm)
    rho_antenna = _rho_from_state(*_state_from_impedance(z_antenna), z0)
    return DeembeddedSweep(z_antenna_ohm=z_antenna, rho_antenna=rho_antenna, swr_antenna=swr_from_rho(rho_antenna),
                           active=np.real(z_antenna) < 0,
                           sensitivity=sensitivity_multiplier(abcd_list, rho_measured, z_ref_ohm, z0_antenna_ohm))
