"""The tuner as an element: a matching network whose setting depends on the load it sees."""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from linecalc.elements.base import PartDefaults
from linecalc.physics.matching import (BUILTIN_MAX_SWR, TunerParts, TunerSolution, component_dissipation_w,
                                       design_builtin_tuner, design_l_network, design_t_network, held_setting)


@dataclass(frozen=True)
class Tuner(PartDefaults):
    """A matching network at its place in the path: it matches what it sees toward the antenna to
    the reference impedance toward the radio. Its setting depends on that load, so it has no fixed
    chain matrix: the budget calls ``design`` with the load, then uses the design's ``abcd``.

    ``network`` is ``"L"`` (least-loss L arrangement), ``"T"`` (high-pass T) or ``"builtin"`` (a
    radio's built-in L network that tunes only loads up to ``max_swr``). ``adjust`` is
    ``"once"`` (set at a row's frequency and held across a sweep of its band, as a manual tuner
    is used), ``"automatic"`` (retuned at every frequency, as an automatic tuner does) or None,
    the network's default: automatic for ``builtin``, once for ``L`` and ``T``.
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
    adjust: str | None = None
    adapts_to_load = True

    @property
    def held(self) -> bool:
        """Whether its setting is held across a sweep (``adjust`` once, or the default of L and T)."""
        return self.adjust == "once" or (self.adjust is None and self.network != "builtin")

    def hold(self, design: TunerSolution, set_at) -> TunerSolution:
        """``design`` held at the settings of the frequencies ``set_at`` names (see `held_setting`)."""
        return held_setting(design, set_at, self.parts)

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
        """Part values [pF, uH], heat in each part [W], whether it matched and its SWR at the input.
        A part that a row's network leaves out (an L network uses two of its parts, a bypass none)
        has NaN for its value and its heat on that row."""
        heat = component_dissipation_w(design, voltage_v, current_a)
        values = {}
        phases = design.matched.ndim > 1  # an SWR-only antenna: one setting per phase of its reflection
        for part in design.parts:
            scale, unit = (1e12, "pf") if part.kind == "capacitor" else (1e6, "uh")
            if np.all(np.isnan(part.value)):
                continue
            if phases:  # the setting depends on the unknown phase: its range over the phases
                values[f"{part.name}_{unit}_least"] = np.nanmin(np.where(np.isnan(part.value), np.inf, part.value),
                                                                axis=0) * scale
                values[f"{part.name}_{unit}_most"] = np.nanmax(np.where(np.isnan(part.value), -np.inf, part.value),
                                                               axis=0) * scale
            else:
                values[f"{part.name}_{unit}"] = part.value * scale
            # a part the row's network leaves out holds no heat to report: NaN (null in JSON), as
            # its value; over the phases of an SWR-only antenna, NaN only where no phase uses it
            absent = np.isnan(part.value)
            mean = phase_mean(np.where(absent, 0.0, heat[part.name]))
            values[f"{part.name}_dissipated_w"] = np.where(np.all(absent, axis=0) if phases else absent, np.nan, mean)
        if phases:
            values["matched_share"] = design.matched.mean(axis=0)
        arrangement = design.arrangement
        if phases:  # one arrangement where every phase uses it, else say that it varies
            same = np.all(arrangement == arrangement[:1], axis=0)
            arrangement = np.where(same, arrangement[0], "depends on the phase")
        return {"matched": np.all(design.matched, axis=0) if phases else design.matched,
                "arrangement": arrangement, **values}
