"""What each figure of ``linecalc plot`` shows, computed from a station: the studies are run here,
the drawing is `linecalc.render.plots.draw`.

Orchestration only: solving is done by the budget, sweep and compare studies.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from linecalc.errors import InputError
from linecalc.physics.voltage import line_profile_from_both_ends, profile_samples, reflection_along_line
from linecalc.studies.band_sweep import solve_band_sweeps
from linecalc.studies.budget import BudgetResult, solve_budget
from linecalc.studies.compare import CompareError, alternatives_from_spec, compare, main_line_index
from linecalc.studies.station import BudgetError, Station

# Positions along the line for the voltage plot: enough to draw a smooth standing wave.
VOLTAGE_POINTS = 801
# What a row's tuners did (`tuner_states`): "" no tuner, or all matched with a network in circuit.
TUNER_BYPASSED, TUNER_UNMATCHED = "bypassed", "cannot match"
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
    tuner_state: list | None = None  # per row, `tuner_states` of each sweep point (array of str), or None


@dataclass(frozen=True)
class SmithPoints:
    """Impedances at the antenna and at the radio per row [ohm], on a chart normalised to ``z_ref_ohm``."""

    z_antenna_ohm: np.ndarray
    z_radio_ohm: np.ndarray
    z_ref_ohm: float
    labels: list
    reference_line: str | None = None  # the line whose nominal impedance is ``z_ref_ohm``, or None (the station's)
    line_paths: tuple = ()  # per line, (label, rho (points, rows)) from its antenna end to its radio end
    sweep_labels: list | None = None  # with a sweep: per row, its label and
    sweep_z_antenna_ohm: list | None = None  # the impedances at the antenna and
    sweep_z_radio_ohm: list | None = None  # at the radio across the band [ohm]
    tuner_state: np.ndarray | None = None  # per row, `tuner_states`


@dataclass(frozen=True)
class LineVoltage:
    """RMS voltage [V] along one line at each row, positions [m] from its radio end."""

    labels: list
    position_m: list
    voltage_v: list
    rating_v: float | None
    line_label: str
    current_a: list | None = None  # RMS current [A] at the same positions
    power_w: float | None = None  # the radio's power the profile is solved at [W]
    tuner_state: np.ndarray | None = None  # per row, `tuner_states`


@dataclass(frozen=True)
class CompareWatts:
    """Watts at the antenna per row for each alternative (name -> array)."""

    labels: list
    power_antenna_w: dict
    radio_power_w: float
    tuner_state: dict | None = None  # per alternative (name -> array of str), `tuner_states` of its rows


def tuner_states(result: BudgetResult, feed=None, held_at=None) -> np.ndarray:
    """Per row, what the station's tuners did: `TUNER_UNMATCHED` where one cannot match, else
    `TUNER_BYPASSED` where one is left in bypass, else "" (matched through a network, or no tuner).

    With ``feed`` (the station's elements) and ``held_at`` (a sweep's rows, bool: where each
    band's held tuners were set), a tuner set once and held across its band is judged there
    only: elsewhere in the band it is not meant to match."""
    state = np.full(len(result.labels), "", dtype=object)
    for k, element in enumerate(result.elements):
        if element.kind != "tuner":
            continue
        held = feed is not None and held_at is not None and feed[k].held
        judged = held_at if held else np.ones(len(result.labels), dtype=bool)
        bypassed = judged & (np.asarray(element.readings["arrangement"]) == "bypass")
        state = np.where((state == "") & bypassed, TUNER_BYPASSED, state)
        state = np.where(judged & ~np.asarray(element.readings["matched"], dtype=bool), TUNER_UNMATCHED, state)
    return state


def figure_data(kind: str, station: Station, *, sweep_points: int, line_label: str | None = None,
                compare_spec=None, sweep_smith: bool = False):
    """What figure ``kind`` (swr, budget, smith, voltage, compare) of ``station`` shows.

    ``compare_spec`` (a `CompareSpec`) gives the alternatives of the compare figure (default the
    station's ``compare:`` key); ``sweep_smith`` adds each band swept at ``sweep_points`` to the
    Smith chart. Returns `SwrCurves`, a `BudgetResult`, `SmithPoints`, `LineVoltage` or
    `CompareWatts`. Raises `PlotProblem` where the station cannot give that figure,
    `BudgetError` where it cannot be solved.
    """
    try:
        if kind == "swr":
            swept, sweeps = solve_band_sweeps(station, sweep_points)
            held_at = np.concatenate([s.frequency_hz == s.tuner_set_hz if s.tuner_set_hz is not None
                                      else np.zeros(s.frequency_hz.size, dtype=bool) for s in sweeps])
            state, start = tuner_states(swept, station.feed, held_at), 0
            parts = []
            for s in sweeps:
                parts.append(state[start:start + s.frequency_hz.size])
                start += s.frequency_hz.size
            return SwrCurves([s.label for s in sweeps], [s.frequency_hz for s in sweeps],
                             [s.swr_antenna for s in sweeps], [s.swr_radio for s in sweeps],
                             [s.tuner_set_hz for s in sweeps], parts)
        if kind == "budget":
            return solve_budget(station)
        if kind == "smith":
            return _smith_points(station, sweep_points if sweep_smith else None)
        if kind == "voltage":
            return _line_voltage(station, line_label)
        return _compare_watts(station, compare_spec if compare_spec is not None else station.compare)
    except CompareError as exc:
        raise BudgetError(str(exc), "compare") from None


def _smith_points(station, sweep_points) -> SmithPoints:
    """The chart normalised to the nominal impedance of the line next to the antenna (the
    station's reference impedance if no line reaches it), with every line's path (a turn of its
    spiral is half a wavelength, sampled as `profile_samples` samples a standing wave)."""
    result = solve_budget(station)
    if result.z_antenna_ohm is None:
        raise PlotProblem("a Smith chart needs impedances: an antenna given by SWR alone has no phase")
    lines = [k for k, e in enumerate(station.feed) if e.kind == "line"]
    z_ref, reference_line = station.reference_impedance_ohm, None
    if lines:
        z_ref, reference_line = float(station.feed[lines[-1]].cable.z0_nominal_ohm), station.feed[lines[-1]].label
    solution, paths = result.solution, []
    for k in lines:
        line = station.feed[k]
        z0, gamma = line.cable.constants(result.frequency_hz)
        _, rho = reflection_along_line(z0, gamma, float(line.length_m), solution.state_v[k + 1],
                                       solution.state_i[k + 1], z_ref, profile_samples(gamma, line.length_m))
        paths.append((line.label, rho))
    sweep = {}
    if sweep_points is not None:
        swept, sweeps = solve_band_sweeps(station, sweep_points)
        slices = np.cumsum([0] + [s.frequency_hz.size for s in sweeps])
        sweep = {"sweep_labels": [s.label for s in sweeps],
                 "sweep_z_antenna_ohm": [swept.z_antenna_ohm[a:b] for a, b in zip(slices[:-1], slices[1:])],
                 "sweep_z_radio_ohm": [swept.z_radio_ohm[a:b] for a, b in zip(slices[:-1], slices[1:])]}
    return SmithPoints(result.z_antenna_ohm, result.z_radio_ohm, z_ref, list(result.labels), reference_line,
                       tuple(paths), tuner_state=tuner_states(result), **sweep)


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
    profile = line_profile_from_both_ends(z0, gamma, float(line.length_m), solution.voltage_v[index],
                                          solution.current_a[index], solution.voltage_v[index + 1],
                                          solution.current_a[index + 1], VOLTAGE_POINTS)
    rows = len(result.labels)
    return LineVoltage(list(result.labels), [profile.position_m] * rows, list(profile.voltage_rms_v.T),
                       line.cable.max_voltage_v, line.label, list(profile.current_rms_a.T), station.radio_power_w,
                       tuner_states(result))


def _compare_watts(station, spec) -> CompareWatts:
    if spec is None or not (spec.cables or spec.tuner_positions or spec.lengths_m):
        raise BudgetError("a comparison plot needs alternatives: a compare: key in the station file, or the "
                          "options --cable, --tuner-positions or --lengths", "compare")
    comparison = compare(station, alternatives_from_spec(station, spec))
    return CompareWatts(list(comparison.labels),
                        {name: comparison.power_antenna_w[k] for k, name in enumerate(comparison.names)},
                        station.radio_power_w,
                        {name: tuner_states(result) for name, result in zip(comparison.names, comparison.results)})
