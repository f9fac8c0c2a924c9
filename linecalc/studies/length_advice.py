"""The length advisor run on a station: which lengths of its feeder let its tuner match on every
band. Orchestration only; the scan itself is `linecalc.physics.length_scan.advise_length`.
"""
from __future__ import annotations

import dataclasses
from dataclasses import dataclass

import numpy as np

from linecalc.physics.exposure import CAUTIONS
from linecalc.studies.json_values import finite_or_none
from linecalc.physics.length_scan import MAX_EVALUATIONS, AdvisorInputError, LengthAdvice, advise_length, find_windows
from linecalc.studies import work_size
from linecalc.studies.station import BudgetError, Station, row_frequencies, rows_outside_antenna_data
from linecalc.studies.compare import CompareError, main_line_index
from linecalc.physics.loads import ImpedanceTable
from linecalc.physics.wire_antenna import WireAntenna

# Points per band row for the scan: both edges and the centre.
POINTS_PER_BAND = 3
# Windows listed by default (linecalc advise --top).
TOP_WINDOWS = 8


@dataclass(frozen=True, eq=False)
class AdviceResult:
    """The length scan of one station: the advice, the frequencies scanned [Hz] and the row of each."""

    station: str
    advice: LengthAdvice
    frequency_hz: np.ndarray
    rows: np.ndarray
    feeder_kind: str = "balanced"  # the scanned line's cable kind: coax or balanced

    def to_dict(self, top: int = TOP_WINDOWS) -> dict:
        """The JSON document of ``linecalc advise --format json`` (``top`` windows by voltage)."""
        advice = self.advice

        def window(w):
            return {"start_m": w.start_m, "end_m": w.end_m, "best_length_m": w.best_length_m,
                    "best_tuner_loss_db": finite_or_none(w.best_tuner_loss_db),
                    "worst_tuner_loss_db": finite_or_none(w.worst_tuner_loss_db),
                    "worst_voltage_v": finite_or_none(w.worst_voltage_v),
                    "at_range_start": w.at_range_start, "at_range_end": w.at_range_end}

        return {"station": self.station, "network": advice.network,
                "length_m": {"from": float(advice.length_m[0]), "to": float(advice.length_m[-1]),
                             "count": int(advice.length_m.size)},
                "frequency_hz": [float(f) for f in advice.frequency_hz],
                "matchable_fraction": float(advice.matchable.mean()),
                "windows": [window(w) for w in advice.windows],
                "windows_by_voltage": [window(w) for w in advice.windows_by_voltage[:top]],
                "cautions": list(CAUTIONS)}


def scan_frequencies(station: Station, points_per_band=POINTS_PER_BAND):
    """Frequencies standing for every row: a band's edges and points between; an explicit
    frequency as itself. Returns (frequency_hz, row index of each)."""
    if points_per_band < 2:
        raise AdvisorInputError(f"points_per_band must be 2 or more (the edges), got {points_per_band}")
    frequencies = row_frequencies(station, points_per_band)
    return np.concatenate(frequencies), np.concatenate([np.full(f.size, k) for k, f in enumerate(frequencies)])


def within_loss(advice: LengthAdvice, max_loss_db) -> LengthAdvice:
    """The advice with its windows cut to the lengths whose worst-case tuner loss is at most
    ``max_loss_db`` [dB] (where the tuner matches everywhere, a window may span the whole scan;
    a loss limit shows where the tuner works least hard)."""
    good = advice.matchable & (advice.worst_tuner_loss_db <= max_loss_db)
    windows = find_windows(advice.length_m, good, advice.worst_tuner_loss_db, advice.worst_voltage_v)
    return dataclasses.replace(
        advice, windows=tuple(sorted(windows, key=lambda w: (w.worst_tuner_loss_db, w.worst_voltage_v))),
        windows_by_voltage=tuple(sorted(windows, key=lambda w: (w.worst_voltage_v, w.worst_tuner_loss_db))))


def advise_station(station: Station, line_label, length_min_m, length_max_m, step_m, *,
                   points_per_band=POINTS_PER_BAND, allow_large_scan=False, progress=None, max_loss_db=None):
    """Scan the length of the station's feeder (the line called ``line_label``, or the longest).

    The feed must hold one tuner on the radio side of the feeder; the elements between them and
    between the feeder and the antenna are kept as they are.

    Returns
    -------
    AdviceResult
    """
    if not isinstance(station.antenna, (ImpedanceTable, WireAntenna)):
        raise BudgetError("the length advisor needs the antenna's impedance at its feedpoint (impedance: {...} "
                          "or a touchstone: sweep taken there)", "antenna")
    feed = station.feed
    try:
        index = main_line_index(feed, line_label)
    except CompareError as exc:
        raise BudgetError(str(exc), "feed") from None
    tuners = [k for k, element in enumerate(feed) if element.kind == "tuner"]
    if len(tuners) != 1 or tuners[0] > index:
        raise BudgetError(f"the length advisor needs exactly one tuner on the radio side of {feed[index].label}",
                          "feed")
    if points_per_band < 2:
        raise AdvisorInputError(f"points_per_band must be 2 or more (the edges), got {points_per_band}")
    points = work_size.row_points(station, points_per_band)
    if points > MAX_EVALUATIONS and not allow_large_scan:  # even one length: refused before any array is built
        raise AdvisorInputError(f"{points:,} frequencies (points per band x rows) pass the {MAX_EVALUATIONS:,} "
                                "evaluations of a scan even at a single length (allow_large_scan to try)")
    try:
        work_size.check_station(station, points, f"{points_per_band:,} points per band")
    except work_size.WorkTooLarge as exc:
        raise AdvisorInputError(str(exc)) from None
    f, rows = scan_frequencies(station, points_per_band)
    names = sorted(rows_outside_antenna_data(station, [f[rows == k] for k in range(len(station.labels))]))
    if names:
        raise BudgetError(f"the band edges of {', '.join(names)} lie outside the antenna table: the advisor "
                          "checks edges and centre and never extrapolates", "antenna")
    tuner = feed[tuners[0]]
    advice: LengthAdvice = advise_length(
        feed[index].cable, f, station.antenna.impedance_at(f), tuner.parts,
        network="L" if tuner.network == "builtin" else tuner.network, r0_ohm=station.reference_impedance_ohm,
        radio_power_w=station.radio_power_w, length_min_m=length_min_m, length_max_m=length_max_m, step_m=step_m,
        abcd_tuner_to_feeder=[e.abcd(f) for e in feed[tuners[0] + 1:index]],
        abcd_feeder_to_antenna=[e.abcd(f) for e in feed[index + 1:]],
        allow_large_scan=allow_large_scan, progress=progress,
        max_swr=tuner.max_swr if tuner.network == "builtin" else None)
    if max_loss_db is not None:
        advice = within_loss(advice, max_loss_db)
    return AdviceResult(station.name, advice, f, rows, feed[index].cable.kind)
