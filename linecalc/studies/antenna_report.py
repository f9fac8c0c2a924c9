"""The wire antenna on its own (`linecalc antenna`): per row its feedpoint impedance, SWR against
the reference and against the line that feeds it, the resonance nearest the row, peak gain and
wire loss; and, for a frequency the user gives, the length to cut for resonance there beside
the 468/f rule of thumb.

An orchestrator: the model is `linecalc.physics.wire_antenna`, solved in a few engine runs (all
rows at once, then all resonance searches at once, then the refinements at once).
"""
from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass

import numpy as np

from linecalc.physics import wire_antenna
from linecalc.physics.cascade import swr_from_rho
from linecalc.physics.loads import rho_from_impedance
from linecalc.physics.wire_antenna import WireAntenna
from linecalc.studies.json_values import finite_or_none, pair
from linecalc.studies.station import BudgetError, Station

# The resonance search: from SEARCH_SPAN below to SEARCH_SPAN above each row's frequency
# (relative), in SEARCH_POINTS frequencies; a sign change of X between two of them is refined by
# one secant step on a second engine run.
SEARCH_SPAN = 0.2
SEARCH_POINTS = 9
# The cut-length search: secant steps on the reactance against length at the chosen frequency,
# until |X| is below CUT_TOLERANCE_OHM or CUT_STEPS runs have been made.
CUT_TOLERANCE_OHM = 0.5
CUT_STEPS = 6
FEET_PER_M = 1 / 0.3048
# The rule of thumb for a half-wave dipole: 468 / f(MHz) feet; a quarter-wave vertical: 234 /
# f(MHz) feet (common practice: the free-space half wave, 492 / f, shortened by about 5 % for the
# end effect of a practical wire).
RULE_OF_THUMB_FT_MHZ = {"dipole": 468.0, "inverted-v": 468.0, "vertical": 234.0}


@dataclass(frozen=True)
class CutLength:
    """The length to cut for resonance (X = 0, the first series resonance) at ``frequency_hz``."""

    frequency_hz: float
    length_m: float
    resistance_ohm: float
    rule_of_thumb_m: float
    converged: bool

    def to_dict(self) -> dict:
        return {"frequency_hz": self.frequency_hz, "length_m": finite_or_none(self.length_m),
                "resistance_ohm": finite_or_none(self.resistance_ohm),
                "rule_of_thumb_m": self.rule_of_thumb_m, "rule_of_thumb_ft": self.rule_of_thumb_m * FEET_PER_M,
                "converged": self.converged}


@dataclass(frozen=True)
class AntennaReport:
    """Per row (band or frequency): impedance [ohm], SWR against the reference and against the
    line nearest the antenna (``line_label``; None without a line), the nearest resonance [Hz] (NaN: none within the search span),
    peak gain [dBi] and wire loss [dB]; ``cut`` the cut length, if one was asked for."""

    station: str
    shape: str
    length_m: float
    reference_impedance_ohm: float
    line_label: str | None
    labels: tuple[str, ...]
    frequency_hz: np.ndarray
    impedance_ohm: np.ndarray
    swr_reference: np.ndarray
    line_z0_ohm: np.ndarray | None
    swr_line: np.ndarray | None
    resonance_hz: np.ndarray
    peak_gain_dbi: np.ndarray
    wire_loss_db: np.ndarray
    cut: CutLength | None = None

    def to_dict(self) -> dict:
        """The JSON document of ``linecalc antenna --format json`` (keys in docs/json.md)."""
        rows = []
        for i, label in enumerate(self.labels):
            rows.append({
                "label": label, "frequency_hz": float(self.frequency_hz[i]),
                "z_antenna_ohm": pair(self.impedance_ohm[i]),
                "swr_reference": finite_or_none(self.swr_reference[i]),
                "line_z0_ohm": None if self.line_z0_ohm is None else pair(self.line_z0_ohm[i]),
                "swr_line": None if self.swr_line is None else finite_or_none(self.swr_line[i]),
                "resonance_hz": finite_or_none(self.resonance_hz[i]),
                "peak_gain_dbi": finite_or_none(self.peak_gain_dbi[i]),
                "wire_loss_db": finite_or_none(self.wire_loss_db[i]),
            })
        return {"station": self.station, "shape": self.shape, "length_m": self.length_m,
                "reference_impedance_ohm": float(self.reference_impedance_ohm), "line": self.line_label,
                "rows": rows, "cut": None if self.cut is None else self.cut.to_dict()}


def _resonances(antenna, frequency_hz):
    """The frequency of X = 0 nearest each of ``frequency_hz`` within the search span (NaN if none)."""
    grids = frequency_hz[:, None] * np.linspace(1 - SEARCH_SPAN, 1 + SEARCH_SPAN, SEARCH_POINTS)[None, :]
    searched = dataclasses.replace(antenna, highest_frequency_hz=float(grids.max()))
    x = wire_antenna.solve(searched, grids, pattern=False).impedance_ohm.imag
    crossings = np.sign(x[:, :-1]) != np.sign(x[:, 1:])
    estimates = np.full(frequency_hz.shape, np.nan)
    brackets = []
    for i, row in enumerate(crossings):
        found = np.flatnonzero(row)
        if found.size == 0:
            continue
        f0, f1, x0, x1 = grids[i, found], grids[i, found + 1], x[i, found], x[i, found + 1]
        guesses = f0 - x0 * (f1 - f0) / (x1 - x0)
        k = int(np.argmin(np.abs(guesses - frequency_hz[i])))
        estimates[i] = guesses[k]
        brackets.append((i, f0[k], x0[k], f1[k], x1[k]))
    if not brackets:
        return estimates
    found_at = wire_antenna.solve(searched, estimates[[b[0] for b in brackets]], pattern=False).impedance_ohm.imag
    for (i, f0, x0, f1, x1), xe in zip(brackets, found_at):
        # one secant step from the estimate toward the grid point on the other side of the zero
        fb, xb = (f0, x0) if np.sign(xe) == np.sign(x1) else (f1, x1)
        if xe != xb:
            estimates[i] = estimates[i] - xe * (estimates[i] - fb) / (xe - xb)
    return estimates


def cut_length(antenna: WireAntenna, frequency_hz: float) -> CutLength:
    """The length at which the antenna (its shape, height, feed, wire and ground kept) is resonant
    at ``frequency_hz``: secant steps on X against length, starting from the rule of thumb."""
    rule_m = RULE_OF_THUMB_FT_MHZ[antenna.shape] / (frequency_hz / 1e6) / FEET_PER_M
    lengths, reactances, resistance = [rule_m, 1.04 * rule_m], [], math.nan
    for _ in range(CUT_STEPS):
        trial = dataclasses.replace(antenna, length_m=lengths[len(reactances)], highest_frequency_hz=frequency_hz)
        z = complex(wire_antenna.solve(trial, [frequency_hz], pattern=False).impedance_ohm[0])
        reactances.append(z.imag)
        resistance = z.real
        if abs(z.imag) < CUT_TOLERANCE_OHM:
            return CutLength(frequency_hz, lengths[len(reactances) - 1], resistance, rule_m, True)
        if len(reactances) >= 2:
            (l0, l1), (x0, x1) = lengths[-2:], reactances[-2:]
            step = l1 - x1 * (l1 - l0) / (x1 - x0)
            if not step > 0:
                break
            lengths.append(step)
    return CutLength(frequency_hz, lengths[len(reactances) - 1], resistance, rule_m, False)


def antenna_report(station: Station, cut_for_hz: float | None = None) -> AntennaReport:
    """The wire antenna of ``station``, row by row (see `AntennaReport`)."""
    antenna = station.antenna
    if not isinstance(antenna, WireAntenna):
        raise BudgetError("linecalc antenna describes a wire antenna (antenna: wire: {...}); this station gives "
                          "its antenna as data", "antenna")
    f = np.asarray(station.frequency_hz, dtype=float)
    model = wire_antenna.solve(antenna, f)
    z = model.impedance_ohm
    z_ref = station.reference_impedance_ohm
    line_label, z0, swr_line = None, None, None
    lines = [element for element in station.feed if element.kind == "line"]
    if lines:  # the line nearest the antenna
        line_label = lines[-1].label
        z0 = np.broadcast_to(lines[-1].port_z0_ohm(f)[1], f.shape)
        swr_line = swr_from_rho(rho_from_impedance(z, z0))
    cut = None if cut_for_hz is None else cut_length(antenna, cut_for_hz)
    return AntennaReport(station=station.name, shape=antenna.shape, length_m=antenna.length_m,
                         reference_impedance_ohm=z_ref, line_label=line_label, labels=tuple(station.labels),
                         frequency_hz=f, impedance_ohm=z, swr_reference=swr_from_rho(rho_from_impedance(z, z_ref)),
                         line_z0_ohm=z0, swr_line=swr_line, resonance_hz=_resonances(antenna, f),
                         peak_gain_dbi=model.peak_gain_dbi, wire_loss_db=model.wire_loss_db, cut=cut)
