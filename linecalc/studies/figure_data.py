"""The plot command: compute what a figure needs from a station, then draw it (plots.py).

Orchestration only: solving is done by the budget layer, drawing by plots.py, which imports
matplotlib inside its functions.
"""
from __future__ import annotations

import numpy as np

from linecalc.render import plots
from linecalc.physics.length_scan import voltage_along_line
from linecalc.studies.band_sweep import solve_band_sweeps
from linecalc.studies.budget import solve_budget
from linecalc.studies.station import BudgetError
from linecalc.studies.compare import CompareError, alternatives_from_spec, compare, main_line_index
from linecalc.errors import InputError

# Positions along the line for the voltage plot: enough to draw a smooth standing wave.
VOLTAGE_POINTS = 801


class PlotProblem(InputError):
    """A figure that cannot be drawn from this station, or a file that cannot be written."""


def _sweeps(station, sweep_points):
    return solve_band_sweeps(station, sweep_points)[1]


def draw(kind, station, spec, path, *, sweep_points, line_label=None, force=False):
    """Draw figure ``kind`` (swr, budget, smith, voltage, compare) of ``station`` into ``path``."""
    try:
        if kind == "swr":
            sweeps = _sweeps(station, sweep_points)
            return plots.plot_swr(path, [s.label for s in sweeps], [s.frequency_hz for s in sweeps],
                                  [s.swr_antenna for s in sweeps], [s.swr_radio for s in sweeps], force=force)
        if kind == "budget":
            return plots.plot_loss_budget(path, solve_budget(station), force=force)
        if kind == "smith":
            result = solve_budget(station)
            if result.z_antenna_ohm is None:
                raise PlotProblem("a Smith chart needs impedances: an antenna given by SWR alone has no phase")
            return plots.plot_smith(path, result.z_antenna_ohm, result.z_radio_ohm, station.reference_impedance_ohm,
                                    list(result.labels), force=force)
        if kind == "voltage":
            return _draw_voltage(station, path, line_label, force)
        return _draw_compare(station, spec, path, force)
    except plots.PlotExistsError as exc:
        raise PlotProblem(f"{path}: exists; use --force to replace it ({exc})") from None
    except (plots.PlotInputError, FileNotFoundError) as exc:
        raise PlotProblem(f"{path}: {exc}") from None
    except CompareError as exc:
        raise BudgetError(str(exc), "compare") from None


def _draw_voltage(station, path, line_label, force):
    result = solve_budget(station)
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
    return plots.plot_line_voltage(path, list(result.labels), [position] * len(result.labels),
                                   list(np.moveaxis(voltage, -1, 0)), rating_v=line.cable.max_voltage_v,
                                   line_label=line.label, force=force)


def _draw_compare(station, spec, path, force):
    if spec is None:
        raise BudgetError("a comparison plot needs a compare: key in the station file", "compare")
    comparison = compare(station, alternatives_from_spec(station, spec))
    return plots.plot_compare(path, list(comparison.labels),
                              {name: comparison.power_antenna_w[k] for k, name in enumerate(comparison.names)},
                              radio_power_w=station.radio_power_w, force=force)
