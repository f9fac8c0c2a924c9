"""Lumped parts: lossy inductors and capacitors, and the chain matrices of a part in series or in
shunt. Shared by the station elements (`linecalc.elements`) and the matching networks (matching.py).

Every part uses the series-resistance loss model Z = R + jX, R = |X| / Q.
"""
from __future__ import annotations

import numpy as np


def inductor_impedance_ohm(frequency_hz, inductance_h, q=np.inf):
    """Impedance of a lossy inductor, Z = omega L (1/Q + j) [ohm] (R = omega L / Q in series).

    Parameters
    ----------
    frequency_hz : array_like
        Frequency [Hz].
    inductance_h : array_like
        Inductance [H]; broadcasts with ``frequency_hz``.
    q : float
        Unloaded Q, np.inf for an ideal part [1].

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 6.1 (series RLC circuit, Q = omega L / R).
    """
    reactance = 2 * np.pi * np.asarray(frequency_hz, dtype=float) * np.asarray(inductance_h, dtype=float)
    return reactance * (1 / q + 1j)


def capacitor_impedance_ohm(frequency_hz, capacitance_f, q=np.inf):
    """Impedance of a lossy capacitor, Z = (1/(omega C)) (1/Q - j) [ohm] (ESR = 1/(omega C Q)).

    Parameters
    ----------
    frequency_hz : array_like
        Frequency [Hz].
    capacitance_f : array_like
        Capacitance [F], positive; broadcasts with ``frequency_hz``.
    q : float
        Unloaded Q, np.inf for an ideal part [1].

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 6.1 (series RLC circuit, Q = 1/(omega R C)).
    """
    reactance = 1 / (2 * np.pi * np.asarray(frequency_hz, dtype=float) * np.asarray(capacitance_f, dtype=float))
    return reactance * (1 / q - 1j)


def series_abcd(z_ohm):
    """Chain matrix [[1, Z], [0, 1]] of a series impedance [ohm], shape (..., 2, 2).

    References: Pozar, Microwave Engineering, 4th ed., section 4.4, Table 4.1.
    """
    z = np.asarray(z_ohm, dtype=complex)
    one, zero = np.ones_like(z), np.zeros_like(z)
    return np.stack([np.stack([one, z], -1), np.stack([zero, one], -1)], -2)


def shunt_abcd(y_s):
    """Chain matrix [[1, 0], [Y, 1]] of a shunt admittance [S], shape (..., 2, 2).

    References: Pozar, Microwave Engineering, 4th ed., section 4.4, Table 4.1.
    """
    y = np.asarray(y_s, dtype=complex)
    one, zero = np.ones_like(y), np.zeros_like(y)
    return np.stack([np.stack([one, zero], -1), np.stack([y, one], -1)], -2)


def part_impedance_ohm(frequency_hz, resistance_ohm=0.0, inductance_h=0.0, capacitance_f=None,
                       inductor_q=np.inf, capacitor_q=np.inf):
    """Impedance of a resistor, inductor and capacitor in series, each lossy part by its Q.

    Parameters
    ----------
    frequency_hz : ndarray
    resistance_ohm : float
    inductance_h : float
    capacitance_f : float or None
        None for no capacitor (a short in its place).
    inductor_q, capacitor_q : float
        Unloaded Q; the loss is a series resistance X/Q [1].

    Returns
    -------
    ndarray of complex
        R + X_L (1/Q_L + j) + |X_C| (1/Q_C - j) [ohm].

    References
    ----------
    Terman, Radio Engineers' Handbook (1943), section 2 (Q of coils and capacitors, series
    equivalent resistance X/Q), from memory; the definition Q = X/R is standard.
    """
    z = resistance_ohm + inductor_impedance_ohm(frequency_hz, inductance_h, inductor_q)
    if capacitance_f is not None:
        z = z + capacitor_impedance_ohm(frequency_hz, capacitance_f, capacitor_q)
    return z


