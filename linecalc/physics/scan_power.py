"""Power along a scanned feed: what the radio puts into a matched tuner, and what reaches the
antenna per forward wave on the feeder, over numpy arrays (the length advisor's power terms,
`linecalc.physics.length_scan`).
"""
from __future__ import annotations

import numpy as np

from linecalc.physics.cascade import reflection, walk_to_input
from linecalc.physics.source import radio_drive


def radio_into_matched_tuner(abcd_radio_to_tuner, frequency_hz, r0_ohm, radio_power_w, holds="forward",
                             foldback_swr=None, max_power_w=None):
    """How the radio drives a tuner that matches: its port figures and the net power into the tuner.

    Parameters
    ----------
    abcd_radio_to_tuner : sequence of ndarray, each (nf, 2, 2)
        Fixed chain matrices between the radio and the tuner (jumpers, meters), from the radio.
    frequency_hz : ndarray, shape (nf,)
        [Hz].
    r0_ohm : float
        The reference impedance [ohm]: what a matched tuner presents at its input.
    radio_power_w, holds, foldback_swr, max_power_w
        The radio's setting [W] and behaviour, as in `linecalc.physics.source.radio_drive`.

    Returns
    -------
    drive : linecalc.physics.source.RadioDrive
        Shape (nf,).
    tuner_input_power_w : ndarray, shape (nf,)
        The net power into the tuner's input [W].

    Notes
    -----
    A matched tuner presents ``r0_ohm`` at its input (to its matching tolerance, SWR 1.02,
    `linecalc.physics.matching.MATCHED_SWR`: under 5e-4 dB of mismatch loss left out), whatever
    the feeder's length; so the radio's port and the two-ports before the tuner depend on the
    frequency alone. With 1 A into the tuner, the state at the radio is (V_r, I_r); the two-ports
    pass r0 / Re(V_r I_r*) of the net power.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., sections 2.3 (power at a mismatched port) and 4.4
    (chain matrices).
    """
    current = np.ones(np.shape(frequency_hz), dtype=complex)
    v_radio, i_radio = walk_to_input(list(abcd_radio_to_tuner), r0_ohm * current, current)
    drive = radio_drive(np.abs(reflection(v_radio, i_radio, r0_ohm)), radio_power_w, holds, foldback_swr,
                        max_power_w)
    return drive, drive.net_w * r0_ohm / np.real(v_radio * np.conj(i_radio))


def antenna_power_per_forward_volt(z0_ohm, gamma_per_m, length_m, v_out, i_out, z_antenna_ohm):
    """Power into the antenna [W] per 1 V (RMS) forward wave at the feeder's input.

    Parameters
    ----------
    z0_ohm, gamma_per_m : ndarray of complex, shape (nf,)
        The feeder's characteristic impedance [ohm] and propagation constant [1/m].
    length_m : ndarray, broadcastable with (nf,)
        Feeder lengths [m].
    v_out, i_out : ndarray of complex, shape (nf,)
        The state at the feeder's output per 1 A into the antenna (through the fixed two-ports
        between the feeder and the antenna) [V], [A].
    z_antenna_ohm : ndarray of complex, shape (nf,)
        [ohm].

    Returns
    -------
    ndarray
        Re(Z_antenna) |k|^2 with k = 2 e^(-gamma l) / (v_out + Z0 i_out) [W].

    Notes
    -----
    The forward wave at the feeder's output is e^(-gamma l) for 1 V at its input, and the
    forward wave of the state k (v_out, i_out) is k (v_out + Z0 i_out) / 2; equal, they give
    the scale k of the antenna current.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., sections 2.1 and 2.7 (V+ = (V + Z0 I)/2 on a lossy
    line, its decay e^(-gamma x)).
    """
    k = 2 * np.exp(-gamma_per_m * np.asarray(length_m, dtype=float)) / (v_out + z0_ohm * i_out)
    return np.real(z_antenna_ohm) * np.abs(k) ** 2
