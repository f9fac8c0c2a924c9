"""Chain matrices of the feed path's building blocks: a uniform line, a matched attenuator, an
ideal transformer, a stub's input impedance, and the loss of a terminated two-port.

Pure functions over numpy arrays in SI units; chain matrices have shape (..., nf, 2, 2) and map
a two-port's output (antenna side) to its input (radio side).
"""
from __future__ import annotations

import numpy as np

from linecalc.physics.cascade import ScaledAbcd

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


def line_abcd_scaled(z0_ohm, gamma_per_m, length_m) -> ScaledAbcd:
    """The line chain matrix of `line_abcd` with exp(|alpha l|) taken out, for any length.

    Returns
    -------
    ScaledAbcd
        matrix = [[c, Z0 s], [s/Z0, c]] with c = (e^(gl - a) + e^(-gl - a))/2,
        s = (e^(gl - a) - e^(-gl - a))/2, a = |Re(gl)|, and log_scale = a: no exponent has a
        positive real part, so nothing overflows however long or lossy the line.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 4.4, Table 4.1 (the same matrix, unscaled).
    """
    gl = np.asarray(length_m, dtype=float)[..., None] * gamma_per_m
    a = np.abs(gl.real)
    up, down = np.exp(gl - a), np.exp(-gl - a)
    cosh, sinh = (up + down) / 2, (up - down) / 2
    z0 = np.broadcast_to(z0_ohm, gl.shape)
    matrix = np.stack([np.stack([cosh, z0 * sinh], -1), np.stack([sinh / z0, cosh], -1)], -2)
    return ScaledAbcd(matrix, a)


def closed_form_line_loss_db(matched_loss_db, rho_load_magnitude):
    """Total loss of a line with a mismatched load, by the closed-form formula for a line of real
    characteristic impedance.

    Parameters
    ----------
    matched_loss_db : array_like
        The line's matched loss ML [dB].
    rho_load_magnitude : array_like
        |rho| of the load against the line's characteristic impedance [1].

    Returns
    -------
    ndarray
        10 log10[(a^2 - |rho|^2) / (a (1 - |rho|^2))] with a = 10^(ML/10) [dB]. Exact for a real
        Z0; through a real cable (complex Z0) it is the average over the load's phase, while the
        exact loss of one load depends on where the current peaks fall along the line.

    References
    ----------
    ARRL Antenna Book, transmission-line chapter (total loss with SWR), from memory of its form;
    it follows from P(z) = (|V+(z)|^2 - |V-(z)|^2)/Z0 on a line of real Z0 (Pozar, 4th ed., 2.7).
    """
    # written as ML + 10 log10(1 - |rho|^2 / a^2) - 10 log10(1 - |rho|^2), the same figure, so that
    # a line of thousands of dB (a^2 beyond a float) gives its loss instead of overflowing
    matched = np.asarray(matched_loss_db, dtype=float)
    rho2 = np.asarray(rho_load_magnitude, dtype=float) ** 2
    return matched + 10 * np.log10(1 - rho2 * 10 ** (-matched / 5)) - 10 * np.log10(1 - rho2)


def stack_abcd(a, b, c, d):
    """Assemble a chain matrix (..., nf, 2, 2) from its four broadcastable entries."""
    a, b, c, d = np.broadcast_arrays(*(np.asarray(x, dtype=complex) for x in (a, b, c, d)))
    return np.stack([np.stack([a, b], -1), np.stack([c, d], -1)], -2)


def attenuator_abcd(loss_db, z0_ohm, frequency_hz):
    """Chain matrix of a matched, phase-free attenuator in a real ``z0_ohm`` system.

    Parameters
    ----------
    loss_db : float
        Insertion loss when terminated in ``z0_ohm`` [dB].
    z0_ohm : float
        Reference impedance [ohm].
    frequency_hz : ndarray, shape (nf,)
        Frequency [Hz]; the loss is the same at every frequency.

    Returns
    -------
    ndarray, shape (nf, 2, 2)
        A line section with gamma*l = loss/8.686 Np and no phase: [[cosh, Z0 sinh], [sinh/Z0, cosh]].

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 4.4, Table 4.1 (line ABCD; a matched
    attenuator is a line section with a real propagation term).
    """
    gl = np.full(np.shape(frequency_hz), loss_db / DB_PER_NEPER)
    return stack_abcd(np.cosh(gl), z0_ohm * np.sinh(gl), np.sinh(gl) / z0_ohm, np.cosh(gl))


def transformer_abcd(impedance_ratio, frequency_hz):
    """Chain matrix of an ideal transformer that raises impedance by ``impedance_ratio`` toward its output.

    Parameters
    ----------
    impedance_ratio : float
        Output impedance over input impedance, n for an n:1 balun (a 4:1 balun turns 50 ohm
        into 200 ohm toward the antenna) [1].
    frequency_hz : ndarray, shape (nf,)

    Returns
    -------
    ndarray, shape (nf, 2, 2)
        [[1/N, 0], [0, N]] with turns ratio N = sqrt(n).

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 4.4, Table 4.1 (ideal transformer).
    """
    turns = np.sqrt(impedance_ratio)
    zeros = np.zeros(np.shape(frequency_hz))
    return stack_abcd(zeros + 1 / turns, zeros, zeros, zeros + turns)


def terminated_loss_db(abcd, z_load_ohm):
    """Dissipative loss of a two-port terminated in ``z_load_ohm``: 10 log10(P_in / P_out).

    Parameters
    ----------
    abcd : ndarray, shape (..., 2, 2)
    z_load_ohm : complex or ndarray
        Termination at the output [ohm].

    Returns
    -------
    ndarray
        With I_out = 1 and V_out = Z_load: V_in = A Z_load + B, I_in = C Z_load + D, and
        10 log10(Re(V_in I_in*) / Re(Z_load)) [dB]. Unlike insertion loss, this counts only the
        heat, not the power a reactive part turns back; for a line terminated in its own Z0 it is
        20 log10(e) alpha l.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 4.4 (ABCD parameters; power Re(V I*) at a port).
    """
    z = np.asarray(z_load_ohm, dtype=complex)
    v_in = abcd[..., 0, 0] * z + abcd[..., 0, 1]
    i_in = abcd[..., 1, 0] * z + abcd[..., 1, 1]
    return 10 * np.log10((v_in * i_in.conj()).real / z.real)


def stub_input_impedance_ohm(z0_ohm, gamma_per_m, length_m, shorted):
    """Input impedance of a line section ended in a short (Z0 tanh(gl)) or left open (Z0 coth(gl)).

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 2.3, equations (2.45) and (2.47), with gamma
    in place of j beta for a lossy line.
    """
    t = np.tanh(np.asarray(length_m, dtype=float)[..., None] * gamma_per_m)
    return z0_ohm * t if shorted else z0_ohm / t
