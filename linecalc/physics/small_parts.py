"""Physical models of the small parts of a feed path: a connector's series resistance, the short
line section that is the differential path of a choke or the winding of a current balun, and the
winding resistance and finite-Q magnetising inductance of a voltage balun.

Each model is set by one number, the part's matched loss at the reference impedance (the `loss`
key of the station file), and by a stated length and velocity factor for the line section. The
heat at a mismatched point then follows the physics: a series resistance and a line section whose
loss is in its conductors heat with the current, so they run cool where the current is small (a
high-impedance point) and hot where it is large.

Pure functions over numpy arrays in SI units.
"""
from __future__ import annotations

import numpy as np

from linecalc.physics.cables import SPEED_OF_LIGHT, Rlgc, line_constants
from linecalc.physics.cascade import cascade_abcd
from linecalc.physics.lumped import series_abcd, shunt_abcd
from linecalc.physics.twoports import line_abcd, terminated_loss_db, transformer_abcd


def series_resistance_for_loss_ohm(loss_db, z_ref_ohm):
    """The series resistance that loses ``loss_db`` between terminations of ``z_ref_ohm``.

    Parameters
    ----------
    loss_db : float
        Matched loss at the reference impedance [dB], zero or more.
    z_ref_ohm : float
        Reference impedance, real [ohm].

    Returns
    -------
    float
        R = Z_ref (10^(L/10) - 1) [ohm]: with a source of Z_ref and a load of Z_ref, the series
        resistance R takes R |I|^2 and the load Z_ref |I|^2, so P_in / P_out = (Z_ref + R) / Z_ref.

    Notes
    -----
    A connector's loss is in its contacts and in the conductors of its short body: a resistance in
    series with the path (its shunt conductance, through a PTFE or PE insulator a few millimetres
    long, is negligible at HF). Through a load Z the loss is 10 log10((Re Z + R)/Re Z) in the
    current that flows: large at a low-impedance point, small at a high-impedance one.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 4.4 (ABCD of a series impedance; power
    Re(V I*) at a port); a connector's loss as contact and conductor resistance: Ramo, Whinnery
    and Van Duzer, Fields and Waves in Communication Electronics, 3rd ed., section 5.6 (conductor
    loss in the skin-effect regime).
    """
    return z_ref_ohm * (10 ** (loss_db / 10) - 1)


def connector_abcd(loss_db, z_ref_ohm, frequency_hz):
    """Chain matrix (nf, 2, 2) of a connector (or several together) of matched loss ``loss_db``.

    A series resistance `series_resistance_for_loss_ohm`, the same at every frequency.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 4.4, Table 4.1 (series impedance).
    """
    resistance = series_resistance_for_loss_ohm(loss_db, z_ref_ohm)
    return series_abcd(np.full(np.shape(frequency_hz), complex(resistance)))


# Bisection of the winding resistance: each halving of the bracket gains one bit, so 64 halvings
# reach the resolution of a float (53 bits) from any bracket; the bracket is found by doubling the
# lumped estimate at most 64 times (2^64 times the estimate is past any part's loss).
BISECTION_STEPS = 64
BRACKET_DOUBLINGS = 64
# Below this loss [dB] the section's loss is found by scaling: the loss of a section grows as R'
# to first order (its second-order term is of relative size L, under 1e-6 here), while the
# bisection cannot resolve a loss whose 10^(L/10) - 1 falls near the float resolution (2.2e-16).
LINEAR_BELOW_DB = 1e-6


def _section_abcd(frequency_hz, z0_nominal_ohm, velocity_factor, length_m, r_ohm_per_m):
    """Chain matrix of a line section with series resistance R' [ohm/m] (and its internal
    inductance R'/omega) and no shunt loss."""
    rlgc = rlgc_for_resistance(frequency_hz, z0_nominal_ohm, velocity_factor, r_ohm_per_m)
    z0, gamma = line_constants(frequency_hz, rlgc)
    return line_abcd(z0, gamma, length_m)


def rlgc_for_resistance(frequency_hz, z0_nominal_ohm, velocity_factor, r_ohm_per_m) -> Rlgc:
    """Per-metre constants of a line of nominal impedance and velocity factor with conductor
    resistance R' [ohm/m]: L' = Z0/(VF c) + R'/omega, C' = 1/(Z0 VF c), G' = 0.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 2.1 (the RLGC line); Ramo, Whinnery and Van
    Duzer, 3rd ed., section 5.6 (internal reactance equal to the skin-effect resistance).
    """
    frequency_hz = np.asarray(frequency_hz, dtype=float)
    omega = 2 * np.pi * frequency_hz
    velocity = velocity_factor * SPEED_OF_LIGHT
    r = np.broadcast_to(np.asarray(r_ohm_per_m, dtype=float), frequency_hz.shape)
    return Rlgc(r, z0_nominal_ohm / velocity + r / omega, np.zeros(frequency_hz.shape),
                np.full(frequency_hz.shape, 1.0 / (z0_nominal_ohm * velocity)))


def winding_resistance_ohm_per_m(frequency_hz, z0_nominal_ohm, velocity_factor, length_m, loss_db):
    """The conductor resistance R' [ohm/m] at which a line section loses ``loss_db`` between
    terminations of its nominal impedance, at each frequency.

    Parameters
    ----------
    frequency_hz : ndarray, shape (nf,)
        Frequency [Hz], positive.
    z0_nominal_ohm : float
        Nominal characteristic impedance of the section, and the terminations [ohm].
    velocity_factor : float
        Velocity factor [1].
    length_m : float
        Length [m], positive.
    loss_db : float
        Loss between the terminations [dB], zero or more.

    Returns
    -------
    ndarray, shape (nf,)
        R' found by bisection on the loss of the section (`twoports.terminated_loss_db`), which
        grows with R'. It starts from the lumped estimate Z0 (10^(L/10) - 1) / length. Below
        `LINEAR_BELOW_DB` the loss is proportional to R' and R' is scaled from that loss.

    Notes
    -----
    The section's own Z0 is complex (sqrt((R' + j omega L')/(j omega C'))), and where R' is not small
    against omega L' (a lossy part at the low end of HF) its loss between real terminations differs
    from Re(gamma) length; calibrating on the terminations keeps the `loss` key's meaning, the
    matched loss at the reference impedance, at every frequency.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., sections 2.1 and 4.4; bisection: Press et al.,
    Numerical Recipes, 3rd ed., section 9.1.
    """
    frequency_hz = np.asarray(frequency_hz, dtype=float)
    if loss_db == 0:
        return np.zeros(frequency_hz.shape)
    if loss_db < LINEAR_BELOW_DB:  # first order in R': scaled from the least loss that bisects well
        return winding_resistance_ohm_per_m(frequency_hz, z0_nominal_ohm, velocity_factor, length_m,
                                            LINEAR_BELOW_DB) * (loss_db / LINEAR_BELOW_DB)

    def loss(r):
        return terminated_loss_db(_section_abcd(frequency_hz, z0_nominal_ohm, velocity_factor, length_m, r),
                                  z0_nominal_ohm)

    low = np.zeros(frequency_hz.shape)
    high = np.full(frequency_hz.shape, series_resistance_for_loss_ohm(loss_db, z0_nominal_ohm) / length_m)
    for _ in range(BRACKET_DOUBLINGS):
        short = loss(high) < loss_db
        if not short.any():
            break
        low, high = np.where(short, high, low), np.where(short, 2 * high, high)
    else:
        raise ValueError(f"no conductor resistance gives a loss of {loss_db} dB")
    for _ in range(BISECTION_STEPS):
        middle = (low + high) / 2
        under = loss(middle) < loss_db
        low, high = np.where(under, middle, low), np.where(under, high, middle)
    return (low + high) / 2


def winding_abcd(frequency_hz, z0_nominal_ohm, velocity_factor, length_m, loss_db):
    """Chain matrix (nf, 2, 2) of a short line section whose loss is in its conductors.

    Parameters
    ----------
    frequency_hz : ndarray, shape (nf,)
        Frequency [Hz], positive.
    z0_nominal_ohm : float
        Nominal characteristic impedance of the section [ohm].
    velocity_factor : float
        Velocity factor of the section [1].
    length_m : float
        Length [m], positive; zero only with ``loss_db`` zero (then the identity: no section).
    loss_db : float
        Loss of the section between terminations of ``z0_nominal_ohm`` [dB], the same at every
        frequency.

    Returns
    -------
    ndarray, shape (nf, 2, 2)
        The line of `twoports.line_abcd` with the per-metre constants of `rlgc_for_resistance`,
        R' from `winding_resistance_ohm_per_m`.

    Notes
    -----
    The differential path of a choke wound from coax (or of coax through ferrite beads) is that
    length of coax: the ferrite or the coiling acts on the current outside the shield only. The
    winding of a current (Guanella) balun is a pair of wires or a coax that carries equal and
    opposite currents, so the differential flux in the core cancels and its loss is that of the
    line's conductors. Both heat with the current that flows in them. The loss is taken the same
    at every frequency (a real winding's conductor loss grows about as sqrt(f)); that, and any
    core loss from imperfect cancellation, is outside the model.

    References
    ----------
    Guanella, "Novel matching systems for high frequencies", Brown Boveri Review 31 (1944) 327-329
    (the transmission-line transformer); Sevick, Transmission Line Transformers, 4th ed., chapters
    1 and 2 (a current balun is a line section; its core acts on the common mode only); Pozar,
    Microwave Engineering, 4th ed., section 4.4, Table 4.1 (line ABCD).
    """
    frequency_hz = np.asarray(frequency_hz, dtype=float)
    if length_m == 0:
        if loss_db != 0:
            raise ValueError("a line section of zero length has no loss")
        one, zero = np.ones(frequency_hz.shape, complex), np.zeros(frequency_hz.shape, complex)
        return np.stack([np.stack([one, zero], -1), np.stack([zero, one], -1)], -2)
    r = winding_resistance_ohm_per_m(frequency_hz, z0_nominal_ohm, velocity_factor, length_m, loss_db)
    return _section_abcd(frequency_hz, z0_nominal_ohm, velocity_factor, length_m, r)


def magnetizing_impedance_ohm(frequency_hz, inductance_h, core_q):
    """Impedance of a voltage balun's magnetising branch, a finite-Q inductance:
    Z_m = omega L_m (1/Q + j) [ohm] (its core loss as a resistance omega L_m / Q in series).

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 6.1 (Q = omega L / R of a series RL branch).
    """
    reactance = 2 * np.pi * np.asarray(frequency_hz, dtype=float) * inductance_h
    return reactance * (1 / core_q + 1j)


def voltage_balun_winding_ohm(frequency_hz, loss_db, z_ref_ohm, inductance_h, core_q):
    """The winding resistance of a voltage balun that, with its core, loses ``loss_db`` matched.

    Parameters
    ----------
    frequency_hz : ndarray, shape (nf,)
        Frequency [Hz], positive.
    loss_db : float
        Matched loss between terminations of the reference impedance (the output's is the ratio
        times it) [dB], zero or more.
    z_ref_ohm : float
        Reference impedance, real [ohm].
    inductance_h : float
        Magnetising inductance, referred to the input [H], positive.
    core_q : float
        Q of the magnetising inductance [1], positive.

    Returns
    -------
    tuple of ndarray, shape (nf,)
        R_w [ohm], referred to the input, and the matched loss of the core alone [dB]. Where the
        core alone loses more than ``loss_db`` R_w is 0 (the part then loses its core loss).

    Notes
    -----
    Referred to the input, the ideal transformer's load is Z_ref, in parallel with Z_m: the node
    after the winding has Z_n = 1 / (1/Z_m + 1/Z_ref). A current I through the winding puts
    |I|^2 (R_w + Re Z_n) into the part and |I Z_n|^2 / Z_ref into the load, so the loss ratio
    10^(L/10) = (R_w + Re Z_n) Z_ref / |Z_n|^2, solved for R_w in closed form; with R_w = 0 it is
    the core's own loss.

    References
    ----------
    The equivalent circuit of a real transformer (winding resistance in series, a magnetising
    branch across the ideal transformer; leakage inductance left out): Chapman, Electric Machinery
    Fundamentals, 4th ed., section 2.5 (from memory); Pozar, Microwave Engineering, 4th ed.,
    section 4.4 (power at a port).
    """
    z_m = magnetizing_impedance_ohm(frequency_hz, inductance_h, core_q)
    z_node = 1 / (1 / z_m + 1 / z_ref_ohm)
    core_ratio = z_node.real * z_ref_ohm / np.abs(z_node) ** 2
    winding = 10 ** (loss_db / 10) * np.abs(z_node) ** 2 / z_ref_ohm - z_node.real
    return np.maximum(winding, 0.0), 10 * np.log10(core_ratio)


def voltage_balun_abcd(frequency_hz, loss_db, z_ref_ohm, impedance_ratio, inductance_h, core_q):
    """Chain matrix (nf, 2, 2) of a voltage (transformer) balun: winding resistance in series,
    the finite-Q magnetising inductance across, then an ideal transformer of ``impedance_ratio``.

    Parameters
    ----------
    frequency_hz, loss_db, z_ref_ohm, inductance_h, core_q
        As for `voltage_balun_winding_ohm`.
    impedance_ratio : float
        Output over input impedance (4 for a 4:1 balun) [1].

    Returns
    -------
    ndarray, shape (nf, 2, 2)
        series(R_w) . shunt(1/Z_m) . transformer(n).

    Notes
    -----
    The winding's current heats R_w, so it runs hot at a low-impedance point; the voltage across
    the core drives its loss |V|^2 Re(1/Z_m), so it runs hot at a high-impedance point, where a
    current balun stays cool. L_m and Q are held the same at every frequency (a ferrite's
    permeability and Q change with frequency and flux), and R_w is solved at each frequency so
    that the `loss` key is met wherever the core allows it (a real winding's resistance grows
    about as sqrt(f)).

    References
    ----------
    As `voltage_balun_winding_ohm`; Pozar, Microwave Engineering, 4th ed., section 4.4, Table 4.1
    (series, shunt and ideal-transformer chain matrices).
    """
    winding, _ = voltage_balun_winding_ohm(frequency_hz, loss_db, z_ref_ohm, inductance_h, core_q)
    z_m = magnetizing_impedance_ohm(frequency_hz, inductance_h, core_q)
    return cascade_abcd([series_abcd(winding + 0j), shunt_abcd(1 / z_m), transformer_abcd(impedance_ratio, frequency_hz)])
