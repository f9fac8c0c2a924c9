"""What each figure of ``linecalc plot`` shows, computed from a station: the studies are run here,
the drawing is `linecalc.render.plots.draw`.

Orchestration only: solving is done by the budget, sweep and compare studies.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from linecalc.errors import InputError
from linecalc.physics.length_scan import voltage_along_line
from linecalc.studies.band_sweep import solve_band_sweeps
from linecalc.studies.budget import BudgetResult, solve_budget
from linecalc.studies.compare import CompareError, alternatives_from_spec, compare, main_line_index
from linecalc.studies.station import BudgetError, Station

# Positions along the line for the voltage plot: enough to draw a smooth standing wave.
VOLTAGE_POINTS = 801
KINDS = ("swr", "budget", "smith", "voltage", "compare")


class PlotProblem(InputError):
    """A figure that cannot be drawn from this station, or a file that cannot be written."""


@dataclass(frozen=True)
class SwrCurves:
    """SWR at the antenna and at the radio across each swept row: lists of arrays, one per row."""

    labels: list
    frequency_hz: list
    swr_antenna: list
    swr_radio: list
    tuner_set_hz: list | None = None  # per row, where a tuner held across the band was set [Hz], or None


@dataclass(frozen=True)
class SmithPoints:
    """Impedances at the antenna and at the radio per row [ohm], on a chart normalised to ``z_ref_ohm``."""

    z_antenna_ohm: np.ndarray
    z_radio_ohm: np.ndarray
    z_ref_ohm: float
    labels: list


@dataclass(frozen=True)
class LineVoltage:
    """RMS voltage [V] along one line at each row, positions [m] from its radio end."""

    labels: list
    position_m: list
    voltage_v: list
    rating_v: float | None
    line_label: str


@dataclass(frozen=True)
class CompareWatts:
    """Watts at the antenna per row for each alternative (name -> array)."""

    labels: list
    power_antenna_w: dict
    radio_power_w: float


def figure_data(kind: str, station: Station, *, sweep_points: int, line_label: str | None = None):
    """What figure ``kind`` (swr, budget, smith, voltage, compare) of ``station`` shows.

    Returns `SwrCurves`, a `BudgetResult`, `SmithPoints`, `LineVoltage` or `CompareWatts`.
    Raises `PlotProblem` where the station cannot give that figure, `BudgetError` where it
    cannot be solved.
    """
    try:
        if kind == "swr":
            sweeps = solve_band_sweeps(station, sweep_points)[1]
            return SwrCurves([s.label for s in sweeps], [s.frequency_hz for s in sweeps],
                             [s.swr_antenna for s in sweeps], [s.swr_radio for s in sweeps],
                             [s.tuner_set_hz for s in sweeps])
        if kind == "budget":
            return solve_budget(station)
        if kind == "smith":
            result = solve_budget(station)
            if result.z_antenna_ohm is None:
                raise PlotProblem("a Smith chart needs impedances: an antenna given by SWR alone has no phase")
            return SmithPoints(result.z_antenna_ohm, result.z_radio_ohm, station.reference_impedance_ohm,
                               list(result.labels))
        if kind == "voltage":
            return _line_voltage(station, line_label)
        return _compare_watts(station)
    except CompareError as exc:
        raise BudgetError(str(exc), "compare") from None


def _line_voltage(station, line_label) -> LineVoltage:
    result: BudgetResult = solve_budget(station)
    try:
        index = main_line_index(station.feed, line_label)
    except CompareError as exc:
        raise BudgetError(str(exc), "feed") from None
    line = station.feed[index]
    z0, gamma = line.cable.constants(result.frequency_hz)
    solution = result.solution
    if solution.voltage_v.ndim > 2:
        raise PlotProblem("the voltage along the line needs a known antenna: one given by SWR alone has no phase")
    position, voltage = voltage_along_line(z0, gamma, float(line.length_m), solution.voltage_v[index],
                                           solution.current_a[index], VOLTAGE_POINTS)
    return LineVoltage(list(result.labels), [position] * len(result.labels), list(np.moveaxis(voltage, -1, 0)),
                       line.cable.max_voltage_v, line.label)


def _compare_watts(station) -> CompareWatts:
    if station.compare is None:
        raise BudgetError("a comparison plot needs a compare: key in the station file", "compare")
    comparison = compare(station, alternatives_from_spec(station, station.compare))
    return CompareWatts(list(comparison.labels),
                        {name: comparison.power_antenna_w[k] for k, name in enumerate(comparison.names)},
                        station.radio_power_w)
