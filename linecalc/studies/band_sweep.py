"""Band sweeps: every band solved edge to edge, and what the SWR curves say at each end.

An orchestrator beside budget.py: it builds one station whose rows are every sweep point of
every band, solves it in one vectorised call, and splits the result per band.
"""
from __future__ import annotations

import dataclasses
from dataclasses import dataclass

import numpy as np

from linecalc.studies.json_values import finite_or_none, json_list
from linecalc.studies import work_size
from linecalc.studies.budget import BudgetResult, solve_budget
from linecalc.studies.station import BudgetError, Station, row_frequencies, rows_outside_antenna_data
from linecalc.physics.swr_curve import SweepStatistics, sweep_statistics
from linecalc.elements.base import named


@dataclass(frozen=True)
class BandSweep:
    """One row swept: its frequencies [Hz], SWR at the antenna and at the radio, and the
    statistics of both curves (axis 0 of every statistic: 0 antenna, 1 radio; None for a row
    of one explicit frequency)."""

    label: str
    frequency_hz: np.ndarray
    swr_antenna: np.ndarray
    swr_radio: np.ndarray
    statistics: SweepStatistics | None
    z_radio_ohm: np.ndarray | None
    held_tuners: tuple[str, ...] = ()  # labels of the tuners set once and held across the band
    tuner_set_hz: float | None = None  # where they were set [Hz]

    def to_dict(self) -> dict:
        """The ``sweep`` object of a budget row in ``linecalc budget --sweep N --format json``."""
        st = self.statistics
        curves = {"frequency_hz": [float(f) for f in self.frequency_hz],
                  "swr_antenna": json_list(self.swr_antenna), "swr_radio": json_list(self.swr_radio),
                  "held_tuners": list(self.held_tuners), "tuner_set_hz": None if self.tuner_set_hz is None else float(self.tuner_set_hz)}
        if st is None:
            return curves

        def ends(values):
            return {"antenna": json_list(values[0]), "radio": json_list(values[1])}

        return {**curves,
                "swr_min": {"antenna": finite_or_none(st.swr_min[0]), "radio": finite_or_none(st.swr_min[1])},
                "frequency_swr_min_hz": {"antenna": finite_or_none(st.frequency_swr_min_hz[0]),
                                         "radio": finite_or_none(st.frequency_swr_min_hz[1])},
                "swr_limits": list(st.swr_limits), "bandwidth_hz": ends(st.bandwidth_hz),
                "lower_hz": ends(st.lower_hz), "upper_hz": ends(st.upper_hz)}


def sweep_points(station: Station, points: int):
    """Frequencies of every band row edge to edge at ``points`` points; an explicit frequency row
    stays a single point. Returns (labels, frequency_hz, slices per row)."""
    labels, slices, start = [], [], 0
    frequencies = row_frequencies(station, points)
    for label, f in zip(station.labels, frequencies):
        labels += [f"{label} {x / 1e6:.6g} MHz" for x in f]
        slices.append(slice(start, start + f.size))
        start += f.size
    return tuple(labels), np.concatenate(frequencies), slices


def _sweep_tuner_warnings(station, result, slices):
    """Per band, the sweep points where a tuner that retunes at every point cannot match (a
    tuner held across the band is judged where it was set, by the budget)."""
    warnings = []
    for element, budget_element in zip(station.feed, result.elements):
        if element.kind != "tuner" or element.held:
            continue
        matched = np.asarray(budget_element.readings["matched"], dtype=bool)
        failed = []
        for label, part in zip(station.labels, slices):
            missed = np.flatnonzero(~matched[part])
            if missed.size:
                f = result.frequency_hz[part][missed]
                failed.append(f"{label} at {missed.size} of {part.stop - part.start} points "
                              f"({f.min() / 1e6:.4f} to {f.max() / 1e6:.4f} MHz)")
        if failed:
            warnings.append(f"{named('tuner', element.label)} cannot match across the band on {'; '.join(failed)}: "
                            "the radio sees the SWR of its closest setting there")
    return warnings


def solve_band_sweeps(station: Station, points: int) -> tuple[BudgetResult, list[BandSweep]]:
    """Solve the station over every band edge to edge (one vectorised solve) and split per row.

    A tuner that adjusts once is set at the sweep point nearest the row's frequency (the band's
    centre for an odd number of points) and held across the band; one that adjusts
    automatically is retuned at every point. The result's warnings are those of the sweep
    points' tuners that cannot match."""
    if points < 2:
        raise BudgetError("a sweep needs at least 2 points per band", "bands")
    work_size.check_sweep(station, points, f"a sweep of {points:,} points per band")
    labels, frequency_hz, slices = sweep_points(station, points)
    outside = rows_outside_antenna_data(station, [frequency_hz[part] for part in slices])
    if outside:
        table_hz = station.antenna.frequency_hz
        raise BudgetError(f"the band edges of {', '.join(outside)} lie outside the antenna data, which spans "
                          f"{table_hz[0] / 1e6:g} to {table_hz[-1] / 1e6:g} MHz: a sweep never extrapolates it",
                          "antenna")
    set_at = np.concatenate([np.full(part.stop - part.start, part.start + np.argmin(np.abs(frequency_hz[part] - f)))
                             for part, f in zip(slices, station.frequency_hz)])
    result = solve_budget(dataclasses.replace(station, labels=labels, frequency_hz=frequency_hz,
                                              band_edges_hz=(None,) * len(labels), tuner_set_at=set_at),
                          far_field=False)  # the sweep's points report no exposure
    held = tuple(e.label for e in station.feed if e.kind == "tuner" and e.held)
    sweeps = []
    for label, part in zip(station.labels, slices):
        swr = np.stack([result.swr_antenna[part], result.swr_radio[part]])
        single = part.stop - part.start < 2  # an explicit frequency: one point, no curve
        sweeps.append(BandSweep(label, frequency_hz[part], swr[0], swr[1],
                                None if single else sweep_statistics(frequency_hz[part], swr),
                                None if result.z_radio_ohm is None else result.z_radio_ohm[part],
                                held, float(frequency_hz[set_at[part.start]]) if held else None))
    result = dataclasses.replace(result, warnings=tuple(_sweep_tuner_warnings(station, result, slices)))
    return result, sweeps
