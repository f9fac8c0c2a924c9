"""How the radio drives the path: forward, reflected and net power at its port, over numpy arrays.

A radio's power control holds one reading. A solid-state radio holds its forward power (the
wave it launches toward the path, read by its internal directional coupler); a tube amplifier
loaded for its power, or any source tuned to deliver it, holds the net power into the path. Many
radios also protect their output stage by limiting the reflected power above some SWR (they
"fold back"); real radios differ in how, and this module models the common reflected-power limit.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

HOLDS = ("forward", "net")


@dataclass(frozen=True)
class RadioDrive:
    """Powers at the radio's port per row [W], and which limits acted.

    ``folded`` marks the rows where the reflected-power limit lowered the forward power;
    ``limited`` the rows where the radio's largest forward power did. ``mismatch_loss_db`` is
    what the mismatch at the port costs against the radio's setting [dB]: 10 log10(forward /
    net) for a radio that holds forward power; for one that holds net power, 10 log10(setting /
    net), which is 0 unless a limit acted (it delivers its setting whatever the SWR).
    """

    forward_w: np.ndarray
    reflected_w: np.ndarray
    net_w: np.ndarray
    mismatch_loss_db: np.ndarray
    folded: np.ndarray
    limited: np.ndarray


def rho_from_swr(swr):
    """|rho| = (SWR - 1)/(SWR + 1).

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 2.3, equation (2.41), solved for |rho|.
    """
    swr = np.asarray(swr, dtype=float)
    return (swr - 1) / (swr + 1)


def radio_drive(rho_magnitude, power_w, holds, foldback_swr=None, max_power_w=None) -> RadioDrive:
    """Forward, reflected and net power at the radio's port for the load it sees.

    Parameters
    ----------
    rho_magnitude : array_like of float
        |rho| at the radio's port against its reference impedance, below 1 (any shape).
    power_w : float
        The radio's power setting [W]: the forward power (``holds="forward"``) or the net power
        (``holds="net"``) it holds.
    holds : {"forward", "net"}
        Which reading the radio's power control holds.
    foldback_swr : float or None
        Above this SWR at its port the radio lowers its forward power so that the reflected
        power stays at the value it has at this SWR (a reflected-power limit). None: no limit.
    max_power_w : float or None
        The largest forward power the radio can make [W]; None: no limit.

    Returns
    -------
    RadioDrive

    Notes
    -----
    With forward power F into a load of reflection rho, the reflected power is F |rho|^2 and the
    net power F (1 - |rho|^2), so the mismatch loss at the port is 10 log10(F / net) =
    10 log10(1 / (1 - |rho|^2)). Holding forward: F = P. Holding net: F = P / (1 - |rho|^2).
    The reflected-power limit at SWR S_f (|rho_f| from S_f) is R_f = F(|rho_f|) |rho_f|^2, the
    reflected power at that SWR; above it F = R_f / |rho|^2. The largest forward power then caps
    F. The port's reference impedance is real, so the three powers add exactly.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 2.3 (incident, reflected and delivered
    power; mismatch or return loss). The reflected-power limit is the usual protection of
    solid-state output stages (common practice); real radios differ in threshold and shape.
    """
    if holds not in HOLDS:
        raise ValueError(f"holds is one of {HOLDS}, got {holds!r}")
    rho2 = np.asarray(rho_magnitude, dtype=float) ** 2

    def forward_held(r2):
        return np.full(np.shape(r2), float(power_w)) if holds == "forward" else power_w / (1 - r2)

    forward = forward_held(rho2)
    folded = np.zeros(np.shape(rho2), dtype=bool)
    if foldback_swr is not None:
        rho_f2 = float(rho_from_swr(foldback_swr)) ** 2
        reflected_limit_w = float(forward_held(np.asarray(rho_f2))) * rho_f2
        folded = rho2 > rho_f2
        forward = np.where(folded, reflected_limit_w / np.where(folded, rho2, 1.0), forward)
    limited = np.zeros(np.shape(rho2), dtype=bool)
    if max_power_w is not None:
        limited = forward > max_power_w
        forward = np.minimum(forward, max_power_w)
    reflected = forward * rho2
    net = forward * (1 - rho2)
    if holds == "net":  # exactly the setting where no limit acted (not a difference of large numbers)
        net = np.where(folded | limited, net, float(power_w))
    held = forward if holds == "forward" else np.full(np.shape(net), float(power_w))
    return RadioDrive(forward, reflected, net, port_mismatch_loss_db(held, net), folded, limited)


def port_mismatch_loss_db(forward_w, net_w):
    """Mismatch loss at a port, 10 log10(forward / net) [dB]: 0 for a matched port.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 2.3 (power delivered to a mismatched load).
    """
    return 10 * np.log10(np.asarray(forward_w, dtype=float) / np.asarray(net_w, dtype=float))
