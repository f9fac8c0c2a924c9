"""Two-port elements of the feed path. Each one only has to give its chain matrix.

An element has a ``kind`` and a ``label``, and three methods over a frequency array [Hz]:
``abcd`` (chain matrix, shape (..., nf, 2, 2)), ``port_z0_ohm`` (the characteristic impedance
that SWR is measured against at its input and at its output) and ``matched_loss_db`` (its loss
when terminated in its own characteristic impedance). The solver does the rest.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from linecalc.physics.cables import Cable
from linecalc.physics.lumped import part_impedance_ohm, series_abcd, shunt_abcd
from linecalc.physics.cascade import ScaledAbcd, swr_from_rho, wave_powers
from linecalc.physics.matching import (BUILTIN_MAX_SWR, TunerParts, TunerSolution, component_dissipation_w, design_builtin_tuner,
                    design_l_network, design_t_network)

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
    a = 10 ** (np.asarray(matched_loss_db, dtype=float) / 10)
    rho2 = np.asarray(rho_load_magnitude, dtype=float) ** 2
    return 10 * np.log10((a * a - rho2) / (a * (1 - rho2)))


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

    def scaled_abcd(self, frequency_hz) -> ScaledAbcd:
        z0, gamma = self.cable.constants(frequency_hz)
        return line_abcd_scaled(z0, gamma, self.length_m)

    def port_z0_ohm(self, frequency_hz):
        z0, _ = self.cable.constants(frequency_hz)
        return z0, z0

    def matched_loss_db(self, frequency_hz):
        """Matched loss [dB]: 20 log10(e) alpha l."""
        _, gamma = self.cable.constants(frequency_hz)
        return DB_PER_NEPER * gamma.real * np.asarray(self.length_m, dtype=float)[..., None]



def _stack_abcd(a, b, c, d):
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
    return _stack_abcd(np.cosh(gl), z0_ohm * np.sinh(gl), np.sinh(gl) / z0_ohm, np.cosh(gl))


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
    return _stack_abcd(zeros + 1 / turns, zeros, zeros, zeros + turns)


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


@dataclass(frozen=True)
class Attenuating:
    """A connector, a choke's differential path or any matched loss: ``loss_db`` each, ``count`` of them.

    The loss is frequency independent and phase free, in the reference impedance.
    """

    kind: str
    label: str
    loss_db: float
    z_ref_ohm: float
    count: int = 1
    common_mode_table: tuple = ()  # choke only: ((frequency_hz, |Z| ohm), ...) in increasing frequency
    common_mode_threshold_ohm: float = 0.0

    def common_mode_ohm(self, frequency_hz):
        """Common-mode impedance magnitude [ohm] from the table, linear between its points; NaN outside it."""
        if not self.common_mode_table:
            return np.full(np.shape(frequency_hz), np.nan)
        table_hz, table_ohm = (np.array(column) for column in zip(*self.common_mode_table))
        inside = (frequency_hz >= table_hz[0]) & (frequency_hz <= table_hz[-1])
        return np.where(inside, np.interp(frequency_hz, table_hz, table_ohm), np.nan)

    def notices(self, frequency_hz, labels):
        """Warnings for the rows where a choke's common-mode impedance is below its threshold."""
        z_cm = self.common_mode_ohm(frequency_hz)
        weak = [f"{label} ({z:.0f} ohm)" for label, z in zip(labels, z_cm) if z < self.common_mode_threshold_ohm]
        if not weak:
            return []
        return [f"choke {self.label}: common-mode impedance below {self.common_mode_threshold_ohm:g} ohm on "
                f"{', '.join(weak)}; it may not stop current on the outside of the coax there"]

    def abcd(self, frequency_hz):
        return attenuator_abcd(self.loss_db * self.count, self.z_ref_ohm, frequency_hz)

    def port_z0_ohm(self, frequency_hz):
        z = np.full(np.shape(frequency_hz), complex(self.z_ref_ohm))
        return z, z

    def matched_loss_db(self, frequency_hz):
        return np.full(np.shape(frequency_hz), self.loss_db * self.count)


@dataclass(frozen=True)
class Transformer:
    """A balun or transformer: impedance ratio n (output over input), insertion loss on its input side.

    ``input_balanced`` and ``output_balanced`` say which sides are balanced (default: a balun,
    unbalanced toward the radio, balanced toward the antenna).
    """

    label: str
    impedance_ratio: float
    loss_db: float
    z_ref_ohm: float
    input_balanced: bool = False
    output_balanced: bool = True
    kind: str = "balun"

    def abcd(self, frequency_hz):
        return attenuator_abcd(self.loss_db, self.z_ref_ohm, frequency_hz) @ transformer_abcd(self.impedance_ratio, frequency_hz)

    def port_z0_ohm(self, frequency_hz):
        z = np.full(np.shape(frequency_hz), complex(self.z_ref_ohm))
        return z, z * self.impedance_ratio

    def matched_loss_db(self, frequency_hz):
        return np.full(np.shape(frequency_hz), self.loss_db)


@dataclass(frozen=True)
class Meter:
    """An in-line SWR and power meter: no loss, it reads forward, reflected and net power and SWR
    against its own impedance (default the reference impedance)."""

    label: str
    impedance_ohm: float
    kind: str = "meter"

    def abcd(self, frequency_hz):
        return attenuator_abcd(0.0, self.impedance_ohm, frequency_hz)

    def port_z0_ohm(self, frequency_hz):
        z = np.full(np.shape(frequency_hz), complex(self.impedance_ohm))
        return z, z

    def matched_loss_db(self, frequency_hz):
        return np.zeros(np.shape(frequency_hz))

    def readings(self, voltage_v, current_a, phase_mean, design=None):
        """What the meter shows, from the RMS phasors at its port: SWR against its impedance,
        forward, reflected and net power. ``phase_mean`` averages over an unknown load phase."""
        forward, reflected = wave_powers(voltage_v, current_a, self.impedance_ohm)
        # no wave at all (beyond thousands of dB, or a dead short ahead): the SWR is undefined
        rho_magnitude = np.sqrt(np.divide(reflected, forward, out=np.full(np.shape(forward), np.nan),
                                          where=forward > 0))
        return {"swr": swr_from_rho(phase_mean(rho_magnitude)), "forward_w": phase_mean(forward),
                "reflected_w": phase_mean(reflected), "net_w": phase_mean(forward - reflected)}


@dataclass(frozen=True)
class LumpedPart:
    """A resistor, inductor and capacitor in series, placed in series with the path or in shunt across it."""

    label: str
    placement: str  # "series" or "shunt"
    z_ref_ohm: float
    resistance_ohm: float = 0.0
    inductance_h: float = 0.0
    capacitance_f: float | None = None
    inductor_q: float = np.inf
    capacitor_q: float = np.inf

    @property
    def kind(self):
        return self.placement

    def impedance_ohm(self, frequency_hz):
        return part_impedance_ohm(frequency_hz, self.resistance_ohm, self.inductance_h, self.capacitance_f,
                                  self.inductor_q, self.capacitor_q)

    def abcd(self, frequency_hz):
        z = self.impedance_ohm(frequency_hz)
        return series_abcd(z) if self.placement == "series" else shunt_abcd(1 / z)

    def port_z0_ohm(self, frequency_hz):
        z = np.full(np.shape(frequency_hz), complex(self.z_ref_ohm))
        return z, z

    def matched_loss_db(self, frequency_hz):
        return terminated_loss_db(self.abcd(frequency_hz), self.z_ref_ohm)


def stub_input_impedance_ohm(z0_ohm, gamma_per_m, length_m, shorted):
    """Input impedance of a line section ended in a short (Z0 tanh(gl)) or left open (Z0 coth(gl)).

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., section 2.3, equations (2.45) and (2.47), with gamma
    in place of j beta for a lossy line.
    """
    t = np.tanh(np.asarray(length_m, dtype=float)[..., None] * gamma_per_m)
    return z0_ohm * t if shorted else z0_ohm / t


@dataclass(frozen=True)
class Stub:
    """A section of cable in shunt across the path, its far end open or shorted."""

    label: str
    cable: Cable
    length_m: float
    shorted: bool
    z_ref_ohm: float
    kind: str = "stub"

    def abcd(self, frequency_hz):
        z0, gamma = self.cable.constants(frequency_hz)
        return shunt_abcd(1 / stub_input_impedance_ohm(z0, gamma, self.length_m, self.shorted))

    def port_z0_ohm(self, frequency_hz):
        z = np.full(np.shape(frequency_hz), complex(self.z_ref_ohm))
        return z, z

    def matched_loss_db(self, frequency_hz):
        return terminated_loss_db(self.abcd(frequency_hz), self.z_ref_ohm)


@dataclass(frozen=True)
class Tuner:
    """A matching network at its place in the path: it matches what it sees toward the antenna to
    the reference impedance toward the radio. Its setting depends on that load, so it has no fixed
    chain matrix: the budget calls ``design`` with the load, then uses the design's ``abcd``.

    ``network`` is ``"L"`` (least-loss L arrangement), ``"T"`` (high-pass T) or ``"builtin"`` (a
    radio's built-in L network that tunes only loads up to ``max_swr``).
    """

    label: str
    network: str
    parts: TunerParts
    z_ref_ohm: float
    max_swr: float = BUILTIN_MAX_SWR
    output_balanced: bool = False
    max_capacitor_voltage_v: float | None = None  # peak (crest) rating of every capacitor
    max_inductor_current_a: float | None = None  # RMS rating of every inductor
    kind: str = "tuner"

    def design(self, frequency_hz, z_load_ohm) -> TunerSolution:
        if self.network == "L":
            return design_l_network(frequency_hz, z_load_ohm, self.z_ref_ohm, self.parts)
        if self.network == "T":
            return design_t_network(frequency_hz, z_load_ohm, self.z_ref_ohm, self.parts)
        return design_builtin_tuner(frequency_hz, z_load_ohm, self.z_ref_ohm, self.parts, "L", self.max_swr)

    def port_z0_ohm(self, frequency_hz):
        z = np.full(np.shape(frequency_hz), complex(self.z_ref_ohm))
        return z, z

    def matched_loss_db(self, frequency_hz):
        """Zero: terminated in the reference impedance a tuner has nothing to transform and sets
        itself to bypass, so its whole loss is the price of the mismatch it corrects and counts in
        the mismatch loss (the table shows it in a column of its own)."""
        return np.zeros(np.shape(frequency_hz))

    def readings(self, voltage_v, current_a, phase_mean, design):
        """Part values [pF, uH], heat in each part [W], whether it matched and its SWR at the input."""
        heat = component_dissipation_w(design, voltage_v, current_a)
        values = {}
        for part in design.parts:
            scale, unit = (1e12, "pf") if part.kind == "capacitor" else (1e6, "uh")
            if np.all(np.isnan(part.value)):
                continue
            values[f"{part.name}_{unit}"] = phase_mean(part.value * scale)
            values[f"{part.name}_dissipated_w"] = phase_mean(heat[part.name])
        return {"matched": np.all(design.matched, axis=0) if design.matched.ndim > 1 else design.matched,
                "arrangement": design.arrangement if design.arrangement.ndim == 1 else design.arrangement[0],
                **values}
