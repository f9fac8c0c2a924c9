"""Small elements of the feed path: a connector (a series resistance), a choke (its differential
path a short line section), a current balun or transformer (its winding a short line section, then
an ideal transformer), a voltage balun (winding resistance, finite-Q magnetising inductance, ideal
transformer), an in-line meter, and a resistor, inductor and capacitor part."""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from linecalc.elements.base import PartDefaults
from linecalc.physics.cascade import cascade_abcd, swr_from_rho, wave_powers
from linecalc.physics.lumped import part_impedance_ohm, series_abcd, shunt_abcd
from linecalc.physics.small_parts import connector_abcd, voltage_balun_abcd, voltage_balun_winding_ohm, winding_abcd
from linecalc.physics.twoports import attenuator_abcd, terminated_loss_db, transformer_abcd


# Defaults of the line-section models, documented in the README's feed table and in io/feed_file.py.
# A choke wound from coax: 1.5 m of solid-PE coax (VF 0.66), some eight turns on a 6 cm former or
# a string of beads over that length (common practice). A current balun's winding: about 1 m of
# line (ten bifilar turns on a toroid of some 6 cm, from memory), VF 0.7 for PTFE-insulated wire
# (from memory).
CHOKE_LENGTH_M = 1.5
CHOKE_VELOCITY_FACTOR = 0.66
BALUN_LENGTH_M = 1.0
BALUN_VELOCITY_FACTOR = 0.7
# A voltage balun's magnetising branch: the winding's reactance at least four times the impedance
# it works at, at the lowest frequency (common practice): 4 x 50 ohm at 1.8 MHz is 17.7 uH,
# rounded up to 20 uH; a Q of 20 for the ferrite of HF baluns (from memory: 10 to 50 at HF).
VOLTAGE_BALUN_INDUCTANCE_H = 20e-6
VOLTAGE_BALUN_CORE_Q = 20.0


@dataclass(frozen=True)
class Connector(PartDefaults):
    """``count`` connectors that together lose ``count * loss_db`` at the reference impedance: a
    resistance in series with the path (`physics.small_parts.connector_abcd`)."""

    label: str
    loss_db: float
    z_ref_ohm: float
    count: int = 1
    kind: str = "connector"

    def abcd(self, frequency_hz):
        return connector_abcd(self.loss_db * self.count, self.z_ref_ohm, frequency_hz)

    def port_z0_ohm(self, frequency_hz):
        z = np.full(np.shape(frequency_hz), complex(self.z_ref_ohm))
        return z, z

    def matched_loss_db(self, frequency_hz):
        return terminated_loss_db(self.abcd(frequency_hz), self.z_ref_ohm)


@dataclass(frozen=True)
class Choke(PartDefaults):
    """A common-mode (current) choke. Its differential path is a line section of the reference
    impedance, ``length_m`` long at ``velocity_factor``, whose conductors lose ``loss_db`` matched
    (`physics.small_parts.winding_abcd`); its common-mode impedance table serves the warning.
    """

    label: str
    loss_db: float
    z_ref_ohm: float
    length_m: float = CHOKE_LENGTH_M
    velocity_factor: float = CHOKE_VELOCITY_FACTOR
    common_mode_table: tuple = ()  # ((frequency_hz, |Z| ohm), ...) in increasing frequency
    common_mode_threshold_ohm: float = 0.0
    kind: str = "choke"

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
        return winding_abcd(frequency_hz, self.z_ref_ohm, self.velocity_factor, self.length_m, self.loss_db)

    def port_z0_ohm(self, frequency_hz):
        z = np.full(np.shape(frequency_hz), complex(self.z_ref_ohm))
        return z, z

    def matched_loss_db(self, frequency_hz):
        return np.full(np.shape(frequency_hz), self.loss_db)


@dataclass(frozen=True)
class Transformer(PartDefaults):
    """A current balun or transformer of impedance ratio n (output over input): its winding, a
    line section of the reference impedance whose conductors lose ``loss_db`` matched, then an
    ideal transformer.

    This is the exact equivalent of a Guanella transformer of k identical lines of k times the
    reference impedance, inputs in parallel and outputs in series (n = k^2: one line for 1:1, two
    100-ohm lines for 4:1 in a 50-ohm station); for other ratios it is the same form, an
    approximation. ``input_balanced`` and ``output_balanced`` say which sides are balanced
    (default: a balun, unbalanced toward the radio, balanced toward the antenna).
    """

    label: str
    impedance_ratio: float
    loss_db: float
    z_ref_ohm: float
    input_balanced: bool = False
    output_balanced: bool = True
    length_m: float = BALUN_LENGTH_M
    velocity_factor: float = BALUN_VELOCITY_FACTOR
    kind: str = "balun"

    def abcd(self, frequency_hz):
        return cascade_abcd([winding_abcd(frequency_hz, self.z_ref_ohm, self.velocity_factor, self.length_m,
                                          self.loss_db),
                             transformer_abcd(self.impedance_ratio, frequency_hz)])

    def port_z0_ohm(self, frequency_hz):
        z = np.full(np.shape(frequency_hz), complex(self.z_ref_ohm))
        return z, z * self.impedance_ratio

    def matched_loss_db(self, frequency_hz):
        return np.full(np.shape(frequency_hz), self.loss_db)


@dataclass(frozen=True)
class VoltageBalun(PartDefaults):
    """A voltage (transformer) balun of impedance ratio n: winding resistance in series, a
    magnetising inductance ``inductance_h`` of Q ``core_q`` across, then an ideal transformer
    (`physics.small_parts.voltage_balun_abcd`). The winding resistance is set at each frequency so
    that the part loses ``loss_db`` between reference terminations; where the core alone loses
    more (too little inductance for the band), the winding is taken as lossless, the part loses
    its core loss, and a notice says so.
    """

    label: str
    impedance_ratio: float
    loss_db: float
    z_ref_ohm: float
    input_balanced: bool = False
    output_balanced: bool = True
    inductance_h: float = VOLTAGE_BALUN_INDUCTANCE_H
    core_q: float = VOLTAGE_BALUN_CORE_Q
    kind: str = "balun"

    def abcd(self, frequency_hz):
        return voltage_balun_abcd(frequency_hz, self.loss_db, self.z_ref_ohm, self.impedance_ratio,
                                  self.inductance_h, self.core_q)

    def port_z0_ohm(self, frequency_hz):
        z = np.full(np.shape(frequency_hz), complex(self.z_ref_ohm))
        return z, z * self.impedance_ratio

    def matched_loss_db(self, frequency_hz):
        _, core_db = voltage_balun_winding_ohm(frequency_hz, self.loss_db, self.z_ref_ohm, self.inductance_h,
                                               self.core_q)
        return np.maximum(core_db, self.loss_db)

    def notices(self, frequency_hz, labels):
        """Warnings for the rows where the core alone loses more than the balun's ``loss``."""
        _, core_db = voltage_balun_winding_ohm(frequency_hz, self.loss_db, self.z_ref_ohm, self.inductance_h,
                                               self.core_q)
        over = [f"{label} ({db:.2f} dB)" for label, db in zip(labels, core_db) if db > self.loss_db]
        if not over:
            return []
        return [f"balun {self.label}: its core alone loses more than its {self.loss_db:g} dB on {', '.join(over)} "
                f"(magnetising inductance {self.inductance_h * 1e6:g} uH of Q {self.core_q:g} is too little "
                "for that frequency); the core loss is used there"]


@dataclass(frozen=True)
class Meter(PartDefaults):
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
class LumpedPart(PartDefaults):
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
