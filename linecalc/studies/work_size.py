"""How much memory a solve will take, estimated from its array shapes before it starts.

Every stage of the budget holds arrays over (load phases, frequencies) per element, and a tuner's
design evaluates a grid of part settings at each frequency. A solve whose estimate passes
`MAX_WORK_BYTES` is refused with the estimate (`WorkTooLarge`), naming what sized it, rather
than left to run for a minute and die of memory exhaustion.
"""
from __future__ import annotations

from linecalc.physics.loads import MeasuredAntenna, SwrTable
from linecalc.studies.measured import PHASE_SAMPLES
from linecalc.studies.station import BudgetError, Station

# Peak working memory per frequency point (and load phase) of one element [bytes]: measured with
# tracemalloc on the budget of the test stations at 20,000 points per band (about 530 B for a
# line, 21 kB for a tuner, whose design scans a grid of part settings), rounded up.
BYTES_PER_POINT = {"tuner": 25_000}
BYTES_PER_POINT_OTHER = 1_000  # any other element, and the antenna and the path solution themselves
# The largest solve linecalc starts: 2 GB, hundreds of times a real station's sweep.
MAX_WORK_BYTES = 2_000_000_000


class WorkTooLarge(BudgetError):
    """A solve whose estimated memory passes `MAX_WORK_BYTES`; ``estimate_bytes`` holds the estimate."""

    def __init__(self, message, key, estimate_bytes):
        self.estimate_bytes = estimate_bytes
        super().__init__(message, key)


def estimate_bytes(kinds, points, phases=1) -> float:
    """Estimated peak memory [bytes] of solving elements of ``kinds`` at ``points`` frequencies
    with ``phases`` load phases each."""
    per_point = BYTES_PER_POINT_OTHER + sum(BYTES_PER_POINT.get(kind, BYTES_PER_POINT_OTHER) for kind in kinds)
    return float(per_point) * points * phases


def check_work(kinds, points, what, key="feed", phases=1):
    """Refuse (`WorkTooLarge` at ``key``) a solve of ``points`` frequencies whose estimate passes
    `MAX_WORK_BYTES`; ``what`` names what sized it."""
    estimate = estimate_bytes(kinds, points, phases)
    if estimate > MAX_WORK_BYTES:
        raise WorkTooLarge(f"{what}: {points:,} frequency points through {len(kinds):,} element(s) would need about "
                           f"{estimate / 1e9:,.1f} GB of memory, over the limit of {MAX_WORK_BYTES / 1e9:g} GB",
                           key, estimate)


def row_points(station: Station, points_per_band) -> int:
    """How many frequencies ``points_per_band`` gives the station's rows (an explicit frequency is one),
    counted without building them."""
    edges = station.band_edges_hz or (None,) * len(station.labels)
    return sum(1 if edge is None else int(points_per_band) for edge in edges)


def load_phases(station: Station) -> int:
    """The load phases the budget solves at each frequency: `PHASE_SAMPLES` for an antenna given
    by SWR alone (its phase is unknown), else 1."""
    table = station.antenna.table if isinstance(station.antenna, MeasuredAntenna) else station.antenna
    return PHASE_SAMPLES if isinstance(table, SwrTable) else 1


def check_station(station: Station, points=None, what="the station's rows", key="feed"):
    """`check_work` for the station's feed at ``points`` frequencies (default its rows)."""
    check_work([element.kind for element in station.feed], len(station.frequency_hz) if points is None else points,
               what, key, load_phases(station))


def check_sweep(station: Station, points_per_band, what):
    """`check_work` for the station swept at ``points_per_band`` points per band."""
    check_station(station, row_points(station, points_per_band), what, "bands")
