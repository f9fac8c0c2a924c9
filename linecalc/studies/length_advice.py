"""The length advisor run on a station: which lengths of its feeder let its tuner match on every
band, ranked by the watts at the antenna. Orchestration only; the scan itself is
`linecalc.physics.length_scan.advise_length`.
"""
from __future__ import annotations

import dataclasses
from dataclasses import dataclass

import numpy as np

from linecalc.physics.exposure import CAUTIONS
from linecalc.studies.json_values import finite_or_none
from linecalc.physics.length_scan import (MAX_EVALUATIONS, AdvisorInputError, LengthAdvice, advise_length,
                                          find_windows, peak_lengths, rank_score, ranked_windows, windows_by_voltage)
from linecalc.physics.cascade import swr_from_rho
from linecalc.physics.source import RadioDrive
from linecalc.studies.budget import radio_warnings, range_warnings
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
    """The length scan of one station: the advice, the frequencies scanned [Hz] and the row of
    each, the row labels, the loss limit it was cut to (None: none) and its warnings."""

    station: str
    advice: LengthAdvice
    frequency_hz: np.ndarray
    rows: np.ndarray
    feeder_kind: str = "balanced"  # the scanned line's cable kind: coax or balanced
    labels: tuple = ()
    row_columns: np.ndarray | None = None  # per row, the index of the frequency whose watts stand for it
    radio_holds: str = "forward"
    max_loss_db: float | None = None
    qualifies: np.ndarray | None = None  # per length: matchable and within max_loss_db
    warnings: tuple = ()

    @property
    def qualifying_fraction(self) -> float:
        """The share of the scanned lengths in a window (matched everywhere, within the loss limit)."""
        return float((self.advice.matchable if self.qualifies is None else self.qualifies).mean())

    def to_dict(self, top: int = TOP_WINDOWS) -> dict:
        """The JSON document of ``linecalc advise --format json`` (``top`` windows in each list)."""
        advice = self.advice
        return {"station": self.station, "network": advice.network, "rank": advice.rank,
                "radio_power_w": advice.radio_power_w, "radio_holds": self.radio_holds,
                "length_m": {"from": float(advice.length_m[0]), "to": float(advice.length_m[-1]),
                             "count": int(advice.length_m.size)},
                "frequency_hz": [float(f) for f in advice.frequency_hz],
                "rows": [{"label": label, "frequency_hz": float(advice.frequency_hz[k]),
                          "tuner_input_power_w": float(advice.tuner_input_power_w[k])}
                         for label, k in zip(self.labels, self.columns)],
                "max_loss_db": self.max_loss_db,
                "matchable_fraction": self.qualifying_fraction,
                "window_count": len(advice.windows),
                "windows": [window_dict(w, self.labels) for w in advice.windows[:top]],
                "windows_by_voltage": [window_dict(w, self.labels) for w in advice.windows_by_voltage[:top]],
                "best_lengths": self.best_lengths(top),
                "warnings": list(self.warnings),
                "cautions": list(CAUTIONS)}

    def best_lengths(self, top: int = TOP_WINDOWS) -> list[dict]:
        """The ``top`` lengths where the watts at the antenna peak (by the rank), best first, among
        the lengths that meet the conditions: the choices inside a wide window."""
        advice = self.advice
        qualifies = advice.matchable if self.qualifies is None else self.qualifies
        peaks = peak_lengths(advice.length_m, rank_score(advice.row_power_w, advice.rank), qualifies, top)
        return [{"length_m": float(advice.length_m[k]), "power_sum_w": float(advice.power_sum_w[k]),
                 "worst_row_power_w": float(advice.worst_row_power_w[k]),
                 "worst_row": self.labels[advice.worst_row[k]] if 0 <= advice.worst_row[k] < len(self.labels) else None,
                 "worst_tuner_loss_db": float(advice.worst_tuner_loss_db[k]),
                 "worst_voltage_v": float(advice.worst_voltage_v[k])} for k in peaks]

    @property
    def columns(self) -> np.ndarray:
        return np.arange(len(self.labels)) if self.row_columns is None else self.row_columns


def window_dict(w, labels) -> dict:
    """One window of the advise document."""
    return {"start_m": w.start_m, "end_m": w.end_m, "best_length_m": w.best_length_m,
            "power_sum_w": finite_or_none(w.power_sum_w), "worst_row_power_w": finite_or_none(w.worst_row_power_w),
            "worst_row": labels[w.worst_row] if 0 <= w.worst_row < len(labels) else None,
            "best_tuner_loss_db": finite_or_none(w.best_tuner_loss_db),
            "worst_tuner_loss_db": finite_or_none(w.worst_tuner_loss_db),
            "worst_voltage_v": finite_or_none(w.worst_voltage_v),
            "at_range_start": w.at_range_start, "at_range_end": w.at_range_end}


def scan_frequencies(station: Station, points_per_band=POINTS_PER_BAND):
    """Frequencies standing for every row: a band's edges and points between; an explicit
    frequency as itself. Returns (frequency_hz, row index of each)."""
    if points_per_band < 2:
        raise AdvisorInputError(f"points_per_band must be 2 or more (the edges), got {points_per_band}")
    frequencies = row_frequencies(station, points_per_band)
    return np.concatenate(frequencies), np.concatenate([np.full(f.size, k) for k, f in enumerate(frequencies)])


def row_columns(station: Station, frequency_hz, rows):
    """Per row, the index of its scan frequency nearest the row's own frequency (the band's
    centre for an odd number of points per band): the frequency whose watts stand for the row,
    as the budget solves the row there."""
    return np.array([np.flatnonzero(rows == k)[np.argmin(np.abs(frequency_hz[rows == k] - centre))]
                     for k, centre in enumerate(station.frequency_hz)])


def within_loss(advice: LengthAdvice, max_loss_db) -> tuple[LengthAdvice, np.ndarray]:
    """The advice with its windows cut to the lengths whose worst-case tuner loss is at most
    ``max_loss_db`` [dB] (where the tuner matches everywhere, a window may span the whole scan;
    a loss limit shows where the tuner works least hard), and those lengths (L,)."""
    good = advice.matchable & (advice.worst_tuner_loss_db <= max_loss_db)
    windows = find_windows(advice.length_m, good, advice.worst_tuner_loss_db, advice.worst_voltage_v,
                           advice.row_power_w, advice.rank)
    return dataclasses.replace(advice, windows=ranked_windows(windows, advice.rank),
                               windows_by_voltage=windows_by_voltage(windows)), good


@dataclass(frozen=True)
class ScanSetUp:
    """What a station's scan needs besides the antenna's impedance: the feeder, the tuner, the
    fixed two-ports around them, the frequencies and rows (see `prepare_scan`)."""

    station: Station
    feeder_index: int
    tuner_index: int
    frequency_hz: np.ndarray
    rows: np.ndarray
    row_columns: np.ndarray


def prepare_scan(station: Station, line_label, points_per_band=POINTS_PER_BAND, allow_large_scan=False,
                 antenna_kinds=(ImpedanceTable, WireAntenna)) -> ScanSetUp:
    """Check the station for a length scan of its feeder (the line ``line_label``, or the
    longest) and choose its frequencies.

    The feed must hold one tuner on the radio side of the feeder; the elements between them and
    between the feeder and the antenna are kept as they are.
    """
    if not isinstance(station.antenna, antenna_kinds):
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
    return ScanSetUp(station, index, tuners[0], f, rows, row_columns(station, f, rows))


def scan_feeder(setup: ScanSetUp, z_antenna_ohm, length_min_m, length_max_m, step_m, *, rank="sum",
                allow_large_scan=False, progress=None, max_loss_db=None) -> AdviceResult:
    """The feeder scan of a prepared station with the antenna's impedance ``z_antenna_ohm`` at
    ``setup.frequency_hz`` [ohm]."""
    station, f, feed = setup.station, setup.frequency_hz, setup.station.feed
    tuner, index = feed[setup.tuner_index], setup.feeder_index
    builtin = tuner.network == "builtin"
    advice: LengthAdvice = advise_length(
        feed[index].cable, f, z_antenna_ohm, tuner.parts,
        network="L" if builtin else tuner.network, r0_ohm=station.reference_impedance_ohm,
        radio_power_w=station.radio_power_w, length_min_m=length_min_m, length_max_m=length_max_m, step_m=step_m,
        abcd_tuner_to_feeder=[e.abcd(f) for e in feed[setup.tuner_index + 1:index]],
        abcd_feeder_to_antenna=[e.abcd(f) for e in feed[index + 1:]],
        abcd_radio_to_tuner=[e.abcd(f) for e in feed[:setup.tuner_index]],
        radio_holds=station.radio_holds, foldback_swr=station.radio_foldback_swr,
        max_power_w=station.radio_max_power_w, row_columns=setup.row_columns, rank=rank,
        allow_large_scan=allow_large_scan, progress=progress, max_swr=tuner.max_swr if builtin else None)
    qualifies = advice.matchable
    if max_loss_db is not None:
        advice, qualifies = within_loss(advice, max_loss_db)
    return AdviceResult(station.name, advice, f, setup.rows, feed[index].cable.kind, labels=tuple(station.labels),
                        row_columns=setup.row_columns, radio_holds=station.radio_holds, max_loss_db=max_loss_db,
                        qualifies=qualifies, warnings=tuple(_warnings(station, advice, setup.row_columns)))


def _warnings(station: Station, advice: LengthAdvice, columns) -> list[str]:
    """The radio's warnings at the rows (its SWR, its limits) with a matched tuner, and the
    cables used outside their data."""
    drive = advice.radio
    at_rows = RadioDrive(*(getattr(drive, name)[columns] for name in
                           ("forward_w", "reflected_w", "net_w", "mismatch_loss_db", "folded", "limited")))
    swr = swr_from_rho(np.sqrt(at_rows.reflected_w / at_rows.forward_w))
    return (radio_warnings(station, at_rows, swr, False)
            + range_warnings(station.feed, advice.frequency_hz[columns], station.labels))


def advise_station(station: Station, line_label, length_min_m, length_max_m, step_m, *,
                   points_per_band=POINTS_PER_BAND, allow_large_scan=False, progress=None, max_loss_db=None,
                   rank="sum"):
    """Scan the length of the station's feeder (the line called ``line_label``, or the longest);
    rank its windows by the watts at the antenna (``rank``: summed over the rows, or the worst
    row; see `linecalc.physics.length_scan.RANKS`).

    Returns
    -------
    AdviceResult
    """
    setup = prepare_scan(station, line_label, points_per_band, allow_large_scan)
    return scan_feeder(setup, station.antenna.impedance_at(setup.frequency_hz), length_min_m, length_max_m, step_m,
                       rank=rank, allow_large_scan=allow_large_scan, progress=progress, max_loss_db=max_loss_db)
