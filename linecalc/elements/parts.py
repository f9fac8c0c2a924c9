"""Lumped elements of the feed path: attenuating parts (connectors, a choke's differential
path), a balun or transformer, an in-line meter, and a resistor, inductor and capacitor part."""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from linecalc.elements.base import PartDefaults
from linecalc.physics.cascade import cascade_abcd, swr_from_rho, wave_powers
from linecalc.physics.lumped import part_impedance_ohm, series_abcd, shunt_abcd
from linecalc.physics.twoports import attenuator_abcd, terminated_loss_db, transformer_abcd


@dataclass(frozen=True)
class Attenuating(PartDefaults):
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
class Transformer(PartDefaults):
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
        return cascade_abcd([attenuator_abcd(self.loss_db, self.z_ref_ohm, frequency_hz),
                             transformer_abcd(self.impedance_ratio, frequency_hz)])

    def port_z0_ohm(self, frequency_hz):
        z = np.full(np.shape(frequency_hz), complex(self.z_ref_ohm))
        return z, z * self.impedance_ratio

    def matched_loss_db(self, frequency_hz):
        return np.full(np.shape(frequency_hz), self.loss_db)


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
