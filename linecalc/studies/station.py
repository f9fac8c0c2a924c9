"""What a station file describes, in SI floats: the `Station` every study takes, and the errors
of a station that loads but cannot be solved as described.

Data only: the loader (`linecalc.io.station_file`) builds these, the studies read them.
"""
from __future__ import annotations

from contextlib import contextmanager
from dataclasses import dataclass, field

import numpy as np

from linecalc.errors import InputError, StationError
from linecalc.physics.loads import ImpedanceTable, MeasuredAntenna, SwrTable, outside_table
from linecalc.physics.swr_curve import sweep_frequencies_hz
from linecalc.physics.wire_antenna import WireAntenna


@dataclass(frozen=True)
class CompareSpec:
    """What a station file asks to compare (its ``compare:`` key), already read into SI values.

    ``cables`` holds (name, Cable) pairs for the main line; ``lengths_m`` the lengths to try for
    the line labelled ``line`` (or the main line).
    """

    main_line: str | None = None
    cables: tuple = ()
    tuner_positions: bool = False
    line: str | None = None
    lengths_m: tuple = ()


@dataclass(frozen=True)
class Station:
    """A validated station in SI units, ready to solve.

    ``feed`` is ordered from the radio to the antenna; ``labels`` name each requested row
    (band name or frequency) and ``frequency_hz`` gives its frequency. ``compare`` is the
    station file's ``compare:`` key, if it has one. ``radio_holds`` says which power the
    radio's control holds at ``radio_power_w`` (``forward`` or ``net``); ``radio_foldback_swr``
    and ``radio_max_power_w`` are its reflected-power limit and largest forward power (None:
    none); see `linecalc.physics.source.radio_drive`.
    """

    name: str
    radio_power_w: float
    reference_impedance_ohm: float
    labels: tuple[str, ...]
    frequency_hz: np.ndarray
    antenna: ImpedanceTable | SwrTable | MeasuredAntenna | WireAntenna
    feed: tuple = ()
    region: int = 2
    mode: str = "carrier"
    duty_factor: float = 1.0
    transmit_fraction: float = 1.0
    antenna_gain_dbi: float | None = 2.15  # None for a wire antenna, whose model gives a gain per row
    radio_holds: str = "forward"
    radio_foldback_swr: float | None = None
    radio_max_power_w: float | None = None
    # per row, the index of the row at whose frequency a tuner that adjusts once is set (a band
    # sweep: the point nearest the band's row frequency); None: every row is set at its own
    tuner_set_at: np.ndarray | None = field(default=None, compare=False)
    band_edges_hz: tuple = ()  # per row: (low, high) of its band [Hz], or None for an explicit frequency
    source_file: str = "<station>"
    key_lines: dict = field(default_factory=dict, compare=False)  # key path -> line in the source file
    compare: CompareSpec | None = field(default=None, compare=False)
    # warnings of reading the station's inputs (a Touchstone sweep without an option line), text
    # for people; every solved result repeats them in its warnings
    input_warnings: tuple = field(default=(), compare=False)


class BudgetError(InputError):
    """A station that loads but cannot be solved as described; ``key`` is the key path at fault."""

    def __init__(self, message, key):
        self.key = key
        super().__init__(message)


def located(station: Station, error: BudgetError, line: int | None = None) -> StationError:
    """``error`` as a `StationError` at the line of its key in the station's file (or ``line``)."""
    return StationError(station.source_file, line or station.key_lines.get(error.key, 1), str(error), error.key)


@contextmanager
def errors_located(station: Station):
    """Turn a `BudgetError` raised inside the block into a `StationError` naming file and line."""
    try:
        yield
    except BudgetError as exc:
        raise located(station, exc) from None


def row_frequencies(station: Station, points: int) -> list[np.ndarray]:
    """The frequencies that stand for each row [Hz]: a band's ``points`` frequencies from edge
    to edge (both included, at least 2), an explicit frequency as itself."""
    return [sweep_frequencies_hz(*edges, points) if edges is not None else np.array([centre])
            for centre, edges in zip(station.frequency_hz, station.band_edges_hz or (None,) * len(station.labels))]


def rows_outside_antenna_data(station: Station, frequencies: list[np.ndarray]) -> list[str]:
    """Labels of the rows whose ``frequencies`` reach outside the antenna's data (its table or
    sweep, which is never extrapolated)."""
    if isinstance(station.antenna, WireAntenna):  # a model answers at every frequency
        return []
    table_hz = station.antenna.frequency_hz
    return [label for label, f in zip(station.labels, frequencies) if np.any(outside_table(table_hz, f))]
