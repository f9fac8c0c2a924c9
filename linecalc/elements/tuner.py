"""The tuner as an element: a matching network whose setting depends on the load it sees."""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from linecalc.elements.base import PartDefaults
from linecalc.physics.matching import (BUILTIN_MAX_SWR, TunerParts, TunerSolution, component_dissipation_w,
                                       design_builtin_tuner, design_l_network, design_t_network)


@dataclass(frozen=True)
class Tuner(PartDefaults):
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
    adapts_to_load = True

    def abcd(self, frequency_hz):
        raise TypeError(f"tuner {self.label}: its chain matrix depends on its load; call design()")

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
