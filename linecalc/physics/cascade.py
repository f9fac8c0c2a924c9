"""Chain-matrix cascade and power flow along the feed path, over numpy arrays.

Nodes are numbered from the radio (0) to the antenna (n), element k sits between node k and
node k + 1. Voltages and currents are RMS phasors, so net power is Re(V I*).
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from linecalc.errors import LinecalcError


# Net power below this fraction of the apparent power |V||I| at the radio end is rounding
# residue: the path accepts no power (a lossless path into a pure reactance, a short or an open).
NO_POWER_FRACTION = 1e-12


# Elements cascaded between renormalisations of the state. A line's matrix comes with its
# exp(alpha l) taken out (`ScaledAbcd`), so one element can change the state's size only by
# about the ratio of its impedances: sixteen of them stay far inside the range of a float.
NORMALIZE_EVERY = 16


class NoNetPowerError(LinecalcError, ValueError):
    """The path accepts no net power at some frequencies, so no radio power can be delivered.

    ``mask`` marks those frequencies (over the frequency axis, any leading axis reduced).
    """

    def __init__(self, mask):
        self.mask = mask
        super().__init__("the path accepts no net power: a lossless path into a pure reactance, a short or an open")


@dataclass(frozen=True)
class ScaledAbcd:
    """A chain matrix written as ``matrix * exp(log_scale)``, so that a long lossy line, whose
    cosh and sinh overflow beyond 710 Np, stays representable. ``log_scale`` has shape (..., nf)."""

    matrix: np.ndarray
    log_scale: np.ndarray


@dataclass(frozen=True)
class PathSolution:
    """Voltage, current and power at every node, dissipation in every element.

    Shapes: nodes (..., n + 1, nf), elements (..., n, nf); node 0 is the radio end.
    ``db_below_radio`` is 10 log10(P_radio / P_node), computed in the log domain so that it
    stays finite where a node's power underflows; ``state_v`` and ``state_i`` are each node's
    V and I up to a real factor, for reflections and impedances on such paths.
    """

    voltage_v: np.ndarray
    current_a: np.ndarray
    power_w: np.ndarray
    dissipated_w: np.ndarray
    db_below_radio: np.ndarray
    state_v: np.ndarray  # each node's (V, I) divided by a power of two of its own size:
    state_i: np.ndarray  # for reflections and impedances, which do not depend on scale


def split_entries(abcd):
    """The four entries A, B, C, D of chain matrices (..., 2, 2), each of shape (...)."""
    return abcd[..., 0, 0], abcd[..., 0, 1], abcd[..., 1, 0], abcd[..., 1, 1]


def apply_abcd(abcd, voltage, current):
    """The port state at a two-port's input from the state at its output: [V, I] <- ABCD [V, I].

    The 2x2 product is written out: numpy's matmul is slow on stacks of tiny matrices. Every
    cascade of linecalc goes through this function or `cascade_entries`.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 4.4 (ABCD matrix).
    """
    a, b, c, d = split_entries(abcd)
    return a * voltage + b * current, c * voltage + d * current


def walk_to_input(abcd_list, voltage, current):
    """Carry a port state from the load end of a cascade to its input (the last matrix first).

    A `ScaledAbcd` is applied without its scale: impedances and reflections do not depend on it.
    """
    for abcd in reversed(abcd_list):
        voltage, current = apply_abcd(abcd.matrix if isinstance(abcd, ScaledAbcd) else abcd, voltage, current)
    return voltage, current


def cascade_entries(abcd_list):
    """The four entries of the product of the chain matrices (identity for an empty list)."""
    a, b, c, d = 1.0 + 0j, 0j, 0j, 1.0 + 0j
    for abcd in abcd_list:
        e11, e12, e21, e22 = split_entries(abcd)
        a, b, c, d = a * e11 + b * e21, a * e12 + b * e22, c * e11 + d * e21, c * e12 + d * e22
    return a, b, c, d


def cascade_abcd(abcd_list):
    """Chain matrix of a cascade of two-ports, the first element nearest the input.

    Parameters
    ----------
    abcd_list : sequence of ndarray, each (..., nf, 2, 2), at least one
        Chain matrices from the input toward the load; leading axes broadcast.

    Returns
    -------
    ndarray, shape (..., nf, 2, 2)
        The product M_1 M_2 ... M_n.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 4.4 (cascading ABCD matrices).
    """
    if not abcd_list:
        raise ValueError("cascade_abcd needs at least one chain matrix")
    a, b, c, d = np.broadcast_arrays(*cascade_entries(abcd_list))
    return np.stack([np.stack([a, b], -1), np.stack([c, d], -1)], -2)


def solve_path(abcd_list, rho_load, z_ref_load_ohm, radio_power_w) -> PathSolution:
    """Cascade the elements from the antenna back to the radio and scale to the radio's power.

    Parameters
    ----------
    abcd_list : sequence of ndarray, each (..., nf, 2, 2), or of ScaledAbcd
        Chain matrices from the radio to the antenna; leading axes broadcast.
    rho_load : array_like of complex, (..., nf)
        Reflection coefficient of the antenna against ``z_ref_load_ohm`` (so that an open,
        rho = 1, and a short, rho = -1, need no infinite impedance).
    z_ref_load_ohm : float
        Real reference impedance of ``rho_load`` [ohm].
    radio_power_w : float
        Net power into the path at the radio end [W].

    Returns
    -------
    PathSolution

    Raises
    ------
    NoNetPowerError
        Where the net power at the radio end is rounding residue (below ``NO_POWER_FRACTION`` of
        |V||I|): no power can flow, and scaling to the radio's power would divide by noise.

    Notes
    -----
    At the antenna V = 1 + rho, I = (1 - rho)/Z_ref; each element maps its output to its input,
    [V_in, I_in] = ABCD [V_out, I_out]. Net power P = Re(V I*) at every node; all phasors are then
    scaled by sqrt(P_radio / P_0). Element k dissipates P_k - P_(k+1), so the energy balance
    P_radio = P_antenna + sum(dissipated) holds by construction to rounding. Every
    `NORMALIZE_EVERY` elements the state is divided by a power of two near its size and the
    exponent is carried along, so a path of thousands of dB neither overflows nor loses its loss
    figure (``db_below_radio``).

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 4.4 (cascading ABCD matrices).
    """
    rho_load = np.asarray(rho_load, dtype=complex)
    v, i = 1 + rho_load, (1 - rho_load) / z_ref_load_ohm
    # sizes carried as logarithms (from scaled lines) and powers of two (from renormalising);
    # plain zeros until a path needs them, which most paths never do
    log_scale, exponent = 0.0, 0
    voltages, currents, log_scales, exponents = [v], [i], [log_scale], [exponent]
    for count, abcd in enumerate(reversed(abcd_list), 1):
        if isinstance(abcd, ScaledAbcd):
            abcd, log_scale = abcd.matrix, log_scale + abcd.log_scale
        v, i = apply_abcd(abcd, v, i)
        if count % NORMALIZE_EVERY == 0:
            # bring the state back near unit size by a power of two (exact) and count the powers
            _, shift = np.frexp(np.maximum(np.abs(v), np.abs(i) * z_ref_load_ohm))
            factor = np.ldexp(1.0, -shift)
            v, i, exponent = v * factor, i * factor, exponent + shift
        voltages.append(v)
        currents.append(i)
        log_scales.append(log_scale)
        exponents.append(exponent)
    shape = np.broadcast_shapes(*(np.shape(x) for x in voltages + log_scales + exponents))

    def nodes(values):
        return np.stack([np.broadcast_to(x, shape) for x in reversed(values)], -2)  # (..., n+1, nf)

    voltage, current = nodes(voltages), nodes(currents)
    power_raw = (voltage * current.conj()).real
    no_power = power_raw[..., 0, :] <= NO_POWER_FRACTION * np.abs(voltage[..., 0, :]) * np.abs(current[..., 0, :])
    if np.any(no_power):
        raise NoNetPowerError(np.any(no_power.reshape(-1, no_power.shape[-1]), axis=0))
    scale = np.sqrt(radio_power_w / power_raw[..., :1, :])
    positive = power_raw > 0
    db_below_radio = np.where(positive, 10 * np.log10(power_raw[..., :1, :] / np.where(positive, power_raw, 1.0)),
                              np.inf)
    if any(np.any(x) for x in log_scales + exponents):
        # each node's size relative to the radio end: <= 0 toward the antenna on a lossy path
        log_scale, exponent = nodes(log_scales), nodes(exponents)
        relative_log = log_scale - log_scale[..., :1, :]
        relative_exponent = exponent - exponent[..., :1, :]
        scale = np.ldexp(scale * np.exp(relative_log), relative_exponent)
        db_below_radio = db_below_radio - 20 * np.log10(np.e) * (relative_log + relative_exponent * np.log(2.0))
    power = power_raw * scale**2
    return PathSolution(voltage * scale, current * scale, power, power[..., :-1, :] - power[..., 1:, :], db_below_radio,
                        voltage, current)


def rescaled(solution: PathSolution, factor) -> PathSolution:
    """The same path driven with ``factor`` times the power at every node (..., nf), factor > 0.

    The path is linear: every phasor scales by sqrt(factor), every power and heat by factor;
    losses in dB and the unscaled state stay as they are.
    """
    factor = np.asarray(factor, dtype=float)[..., None, :]
    root = np.sqrt(factor)
    return PathSolution(solution.voltage_v * root, solution.current_a * root, solution.power_w * factor,
                        solution.dissipated_w * factor, solution.db_below_radio, solution.state_v, solution.state_i)


def input_impedance(abcd_list, rho_load, z_ref_load_ohm):
    """Impedance looking into a cascade toward its load [ohm] (the load itself for an empty list).

    Parameters
    ----------
    abcd_list : sequence of ndarray, each (..., nf, 2, 2)
        Chain matrices from the input toward the load.
    rho_load, z_ref_load_ohm
        The load, as in `solve_path`.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 4.4 (cascading ABCD matrices).
    """
    rho_load = np.asarray(rho_load, dtype=complex)
    v, i = walk_to_input(abcd_list, 1 + rho_load, (1 - rho_load) / z_ref_load_ohm)
    return v / i


def reflection(voltage_v, current_a, z0_ohm):
    """Voltage reflection coefficient rho = (V - Z0 I)/(V + Z0 I) of the node state against Z0.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 2.3 (rho = (ZL - Z0)/(ZL + Z0), written in V and I).
    """
    return (voltage_v - z0_ohm * current_a) / (voltage_v + z0_ohm * current_a)


def swr_from_rho(rho):
    """SWR = (1 + |rho|)/(1 - |rho|); infinite where |rho| >= 1 (a short, an open or a pure reactance).

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 2.3, equation (2.41).
    """
    magnitude = np.abs(rho)
    inside = magnitude < 1
    return np.where(inside, (1 + magnitude) / np.where(inside, 1 - magnitude, 1.0), np.inf)


def wave_powers(voltage_v, current_a, z_ref_ohm):
    """Forward and reflected power against a real reference, as a directional coupler reads them.

    Returns
    -------
    forward_w, reflected_w : ndarray
        |V + Z I|^2 / (4 Z) and |V - Z I|^2 / (4 Z); their difference is Re(V I*) exactly.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 2.3 (incident and reflected waves on a line
    of real characteristic impedance).
    """
    forward = np.abs(voltage_v + z_ref_ohm * current_a) ** 2 / (4 * z_ref_ohm)
    reflected = np.abs(voltage_v - z_ref_ohm * current_a) ** 2 / (4 * z_ref_ohm)
    return forward, reflected
