"""Elements made of cable: a line in the path, and a stub in shunt across it."""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from linecalc.elements.base import ElementDefaults
from linecalc.physics.cables import Cable
from linecalc.physics.cascade import ScaledAbcd
from linecalc.physics.line_fit import OpenShortSweeps
from linecalc.physics.lumped import shunt_abcd
from linecalc.physics.twoports import (DB_PER_NEPER, line_abcd, line_abcd_scaled, stub_input_impedance_ohm,
                                       terminated_loss_db)


@dataclass(frozen=True)
class Line(ElementDefaults):
    """A length of cable. ``length_m`` may be an array: its axes lead the results."""

    cable: Cable
    length_m: float | np.ndarray
    label: str = ""
    kind: str = "line"
    # open/short sweeps of this line's near end (`linecalc line` fits them); the path never uses them
    sweeps: OpenShortSweeps | None = field(default=None, compare=False, repr=False)

    def abcd(self, frequency_hz):
        z0, gamma = self.cable.constants(frequency_hz)
        return line_abcd(z0, gamma, self.length_m)

    def scaled_abcd(self, frequency_hz) -> ScaledAbcd:
        z0, gamma = self.cable.constants(frequency_hz)
        return line_abcd_scaled(z0, gamma, self.length_m)

    def port_z0_ohm(self, frequency_hz):
        """The cable's nominal (real) impedance at both ends: what an SWR meter made for that line
        reads against. It is finite for every passive load and the same for +jX and -jX; the
        complex Z0 of the lossy line stays inside the chain matrix."""
        z = np.full(np.shape(frequency_hz), complex(self.cable.z0_nominal_ohm))
        return z, z

    def matched_loss_db(self, frequency_hz):
        """Matched loss [dB]: 20 log10(e) alpha l."""
        _, gamma = self.cable.constants(frequency_hz)
        return DB_PER_NEPER * gamma.real * np.asarray(self.length_m, dtype=float)[..., None]


@dataclass(frozen=True)
class Stub(ElementDefaults):
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
