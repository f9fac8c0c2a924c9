"""Which antenna length and which feeder length together let the tuner match on every band,
ranked by the watts at the antenna: the length advisor run over a range of lengths of a wire
antenna. Orchestration only: each antenna length is one engine run over every frequency
(`linecalc.physics.wire_antenna.solve`, impedance only, cached within the process that runs it), then the
vectorised feeder scan (`linecalc.studies.length_advice.scan_feeder`).
"""
from __future__ import annotations

import dataclasses
import multiprocessing
import signal
import time
from concurrent.futures import ProcessPoolExecutor
from contextlib import contextmanager
from dataclasses import dataclass

import numpy as np

from linecalc.physics.exposure import CAUTIONS
from linecalc.physics.length_scan import (RANKS, AdvisorInputError, LengthRangeError, StepError, ranked_windows,
                                          scan_lengths_m)
from linecalc.physics import wire_antenna
from linecalc.physics.wire_antenna import GeometryError, WireAntenna
from linecalc.studies.length_advice import (POINTS_PER_BAND, TOP_WINDOWS, AdviceResult, prepare_scan, scan_feeder,
                                           window_dict)
from linecalc.studies.station import BudgetError, Station

# Antenna lengths scanned at most without the large-scan override: each is an engine run and a
# whole feeder scan (seconds each for a doublet on 9 bands: bench/bench_pairs.py, README Performance).
MAX_ANTENNA_LENGTHS = 200


class AntennaRangeError(AdvisorInputError):
    """An antenna-length range that cannot be scanned (empty, inverted, not above zero, too many
    lengths, or a length the wire model refuses)."""


class AntennaStepError(AntennaRangeError):
    """An antenna-length step that is zero, negative, not finite or larger than the range."""


@dataclass(frozen=True, eq=False)
class PairAdviceResult:
    """The feeder scan at each antenna length: ``antenna_length_m`` (A,) [m] and one
    `AdviceResult` per length in ``scans``; ``shape`` the wire antenna's shape."""

    station: str
    shape: str
    antenna_length_m: np.ndarray
    scans: tuple[AdviceResult, ...]

    @property
    def rank(self) -> str:
        return self.scans[0].advice.rank

    def pairs(self):
        """Every (antenna length [m], window) pair, best first by the scan's rank."""
        order = {id(w): a for a, scan in zip(self.antenna_length_m, self.scans) for w in scan.advice.windows}
        windows = ranked_windows([w for scan in self.scans for w in scan.advice.windows], self.rank)
        return [(float(order[id(w)]), w) for w in windows]

    def to_dict(self, top: int = TOP_WINDOWS) -> dict:
        """The JSON document of ``linecalc advise --antenna-from ... --format json``."""
        first = self.scans[0]
        labels = first.labels
        document = first.to_dict(top)
        for key in ("matchable_fraction", "window_count", "windows", "windows_by_voltage", "best_lengths", "rows",
                    "warnings", "cautions"):
            document.pop(key)
        per_length = []
        for length, scan in zip(self.antenna_length_m, self.scans):
            windows = scan.advice.windows
            per_length.append({"length_m": float(length), "matchable_fraction": scan.qualifying_fraction,
                               "window_count": len(windows),
                               "best": window_dict(windows[0], labels) if windows else None})
        warnings = []
        for scan in self.scans:
            warnings += [w for w in scan.warnings if w not in warnings]
        document.update({
            "antenna": {"shape": self.shape, "from_m": float(self.antenna_length_m[0]),
                        "to_m": float(self.antenna_length_m[-1]), "count": int(self.antenna_length_m.size)},
            "rows": [{"label": label, "frequency_hz": float(first.advice.frequency_hz[k])}
                     for label, k in zip(labels, first.columns)],
            "antenna_lengths": per_length,
            "pair_count": sum(len(scan.advice.windows) for scan in self.scans),
            "pairs": [dict(window_dict(w, labels), antenna_length_m=a) for a, w in self.pairs()[:top]],
            "warnings": warnings, "cautions": list(CAUTIONS)})
        return document


def antenna_lengths_m(antenna: WireAntenna, length_min_m, length_max_m, step_m, allow_large_scan=False):
    """The antenna lengths of a scan [m] (see `linecalc.physics.length_scan.scan_lengths_m`), each
    checked by the wire model's geometry rules.

    Raises
    ------
    AntennaRangeError, AntennaStepError
    """
    if not length_min_m > 0:
        raise AntennaRangeError(f"an antenna is longer than 0 m, got a range starting at {length_min_m:g} m")
    try:
        lengths = scan_lengths_m(length_min_m, length_max_m, step_m)
    except LengthRangeError as exc:
        raise AntennaRangeError(str(exc)) from None
    except StepError as exc:
        raise AntennaStepError(str(exc)) from None
    if lengths.size > MAX_ANTENNA_LENGTHS and not allow_large_scan:
        raise AntennaRangeError(f"{lengths.size:,} antenna lengths, more than the {MAX_ANTENNA_LENGTHS} scanned "
                                "without the override (each is an engine run and a whole feeder scan); use a "
                                "coarser step or a shorter range, or allow a large scan")
    for length in (lengths[0], lengths[-1]):  # the segments grow with the length: the ends bound the rest
        try:
            wire_antenna.check_geometry(dataclasses.replace(antenna, length_m=float(length)))
        except GeometryError as exc:
            raise AntennaRangeError(f"at {length:g} m: {exc}") from None
    return lengths


def advise_pairs(station: Station, line_label, antenna_from_m, antenna_to_m, antenna_step_m, length_min_m,
                 length_max_m, step_m, *, points_per_band=POINTS_PER_BAND, allow_large_scan=False, progress=None,
                 max_loss_db=None, rank="sum", antenna_progress=None, jobs=1) -> PairAdviceResult:
    """Scan the wire antenna's length and, at each, the feeder's length.

    ``antenna_progress(done, total, length_m, seconds)`` is called after each antenna length
    with the wall time it took (engine run and feeder scan); ``progress`` as in the feeder scan.
    The station's antenna keeps its shape, height, feed point share, wire and ground. ``jobs``
    processes run the engine (1, the default: this process alone); the feeder scans run here.
    More than one job spawns worker processes, which import the main module: a script that
    calls this with ``jobs > 1`` needs the ``if __name__ == "__main__":`` guard.

    Returns
    -------
    PairAdviceResult
    """
    if not isinstance(station.antenna, WireAntenna):
        raise BudgetError("the antenna-length scan needs a wire antenna (antenna: wire: {...}), whose length it "
                          "varies", "antenna")
    if rank not in RANKS:
        raise AdvisorInputError(f"rank is one of {', '.join(RANKS)}, got {rank!r}")
    if not (isinstance(jobs, int) and jobs >= 1):
        raise AdvisorInputError(f"jobs is a whole number of processes, 1 or more, got {jobs!r}")
    setup = prepare_scan(station, line_label, points_per_band, allow_large_scan)
    lengths = antenna_lengths_m(station.antenna, antenna_from_m, antenna_to_m, antenna_step_m, allow_large_scan)
    antennas = [dataclasses.replace(station.antenna, length_m=float(length)) for length in lengths]
    scans = []
    with _engine_runs(antennas, setup.frequency_hz, min(jobs, len(antennas))) as solved:
        for k, (antenna, (z, engine_s)) in enumerate(zip(antennas, solved)):
            start = time.perf_counter()
            scans.append(scan_feeder(dataclasses.replace(setup, station=dataclasses.replace(station, antenna=antenna)),
                                     z, length_min_m, length_max_m, step_m, rank=rank,
                                     allow_large_scan=allow_large_scan, progress=progress, max_loss_db=max_loss_db))
            if antenna_progress is not None:
                antenna_progress(k + 1, lengths.size, antenna.length_m, engine_s + time.perf_counter() - start)
    return PairAdviceResult(station.name, station.antenna.shape, lengths, tuple(scans))


def antenna_impedance(antenna: WireAntenna, frequency_hz, processes=None):
    """The feedpoint impedance [ohm] at ``frequency_hz`` [Hz] in one engine run (impedance only,
    no far field), and the wall time it took [s]: the work of one antenna length. ``processes``:
    as in `linecalc.physics.wire_antenna.solve`."""
    start = time.perf_counter()
    z = wire_antenna.solve(antenna, frequency_hz, pattern=False, processes=processes).impedance_ohm
    return z, time.perf_counter() - start


@contextmanager
def _engine_runs(antennas, frequency_hz, jobs):
    """The impedances of ``antennas`` in order, as (z, seconds): in this process for one job (its
    engine runs shared with a forked worker as `linecalc.physics.wire_antenna.solve` does), else
    from ``jobs`` worker processes (started fresh, so that nothing of this process is copied)
    while this process scans the feeders of the lengths already solved."""
    if jobs == 1:
        yield (antenna_impedance(antenna, frequency_hz) for antenna in antennas)
        return
    with ProcessPoolExecutor(max_workers=jobs, mp_context=multiprocessing.get_context("spawn"),
                             initializer=_leave_interrupts_to_the_main_process) as pool:
        # each worker solves its engine runs alone: ``jobs`` processes in all, not twice as many
        futures = [pool.submit(antenna_impedance, antenna, frequency_hz, 1) for antenna in antennas]
        try:
            yield (future.result() for future in futures)
        finally:
            for future in futures:
                future.cancel()


def _leave_interrupts_to_the_main_process():
    """In a worker: ignore Ctrl-C, which the main process turns into its one line and status 130
    (the workers end when it shuts the pool down)."""
    signal.signal(signal.SIGINT, signal.SIG_IGN)
