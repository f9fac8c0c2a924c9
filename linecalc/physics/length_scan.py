"""The length advisor: scan a feeder's length and find where its tuner matches on every frequency.

A feeder (one cable) runs from a tuner to the antenna, with optional fixed two-ports between the
tuner and the feeder (a balun, a short coax) and between the feeder and the antenna. For every
length of a scan and every frequency at once, the advisor computes what the tuner sees, whether
an L or T network can match it to the reference impedance with its parts inside their ranges,
the least tuner loss, the largest RMS voltage on the feeder at the radio's power, and the watts
that reach the antenna (`linecalc.physics.scan_power`: the radio's drive of the matched tuner, the
tuner's loss, the feeder's and the fixed two-ports' losses). Lengths are
evaluated in chunks (``chunk_plan``) so that memory stays bounded; no loop runs per frequency.

The tuner test (`linecalc.physics.matching_fast`) is the full design of `linecalc.physics.matching` without its last
resort: where no exact in-range setting exists the full design searches for the closest setting,
the advisor calls the load unmatched. A length the advisor calls matchable is matched by the full
design on every frequency; see `linecalc.physics.matching_fast.t_network_least_loss` for the losses.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from linecalc.physics.cascade import walk_to_input
from linecalc.physics.matching_fast import LEAST_LOSS
from linecalc.physics.scan_power import antenna_power_per_forward_volt, radio_into_matched_tuner
from linecalc.physics.source import RadioDrive
from linecalc.physics.swr_curve import sweep_frequencies_hz
from linecalc.errors import InputError

# Largest scan (lengths x frequencies) run without an explicit override: about 5 s for a T
# tuner on the 2-core development machine (bench/bench_advisor.py: 1.27 million in 3.3 s).
MAX_EVALUATIONS = 2_000_000
# Default memory budget of one chunk [bytes].
MEMORY_BUDGET_BYTES = 256 * 2**20
# Peak memory of one (length, frequency) evaluation inside a chunk [bytes], by network: measured
# with tracemalloc at 370 (T) and 1740 (L, whose 16 candidate settings are built at once), with a
# margin; the tests check that a scan stays inside its budget.
BYTES_PER_EVALUATION = {"T": 512, "L": 2048}
# Evaluations per chunk at most: chunks whose buffers fit the processor caches run about twice
# as fast as chunks of half a million (measured on the development machine).
CACHE_CHUNK_EVALUATIONS = 2**15
# A range that is a whole number of steps up to this relative rounding keeps its end point.
STEP_ROUNDING = 1e-9
# How lengths are ranked by the watts at the antenna: their sum over the rows, or the worst row.
RANKS = ("sum", "worst")
# Least distance between two listed peak lengths [m]: closer peaks are the ripple of the tuner's
# least loss from step to step, and a feeder is not cut, nor modelled, closer than that.
PEAK_SEPARATION_M = 1.0


class AdvisorInputError(InputError):
    """Bad input to the length advisor."""


class LengthRangeError(AdvisorInputError):
    """A length range that is empty (start = end), inverted, negative or not finite."""


class StepError(AdvisorInputError):
    """A length step that is zero, negative, not finite or larger than the range."""


class ScanTooLarge(AdvisorInputError):
    """A scan of more evaluations (lengths x frequencies) than allowed without an override."""


@dataclass(frozen=True)
class LengthWindow:
    """A run of consecutive scanned lengths on which the tuner matches on every frequency.

    ``start_m``, ``end_m`` the first and last matching length [m]; ``worst_tuner_loss_db`` and
    ``worst_voltage_v`` the largest tuner loss [dB] and RMS feeder voltage [V] over every length
    of the window and every frequency; ``best_length_m`` the length of the window whose worst
    tuner loss is least, and that loss ``best_tuner_loss_db`` [dB]; ``at_range_start`` and
    ``at_range_end`` say that the window touches an end of the scan and may continue beyond it.
    """

    start_m: float
    end_m: float
    worst_tuner_loss_db: float
    worst_voltage_v: float
    best_length_m: float
    best_tuner_loss_db: float
    at_range_start: bool
    at_range_end: bool
    power_sum_w: float = float("nan")
    worst_row_power_w: float = float("nan")
    worst_row: int = -1

    @property
    def width_m(self) -> float:
        """end_m - start_m [m]: zero for a window of a single scanned length."""
        return self.end_m - self.start_m


@dataclass(frozen=True, eq=False)
class LengthAdvice:
    """What the length scan found. Per-length arrays have shape (L,).

    ``length_m`` the scanned lengths [m]; ``frequency_hz`` (nf,) the frequencies [Hz];
    ``matchable`` True where the tuner matches on every frequency; ``unmatched_count`` the number
    of frequencies on which it cannot; ``worst_tuner_loss_db`` [dB] and ``worst_voltage_v``
    [V, RMS] the largest least-loss tuner setting and the largest feeder voltage over the
    frequencies the tuner matches (NaN where it matches none; where ``matchable`` is False they
    leave the unmatched frequencies out); ``worst_loss_frequency_hz`` and
    ``worst_voltage_frequency_hz`` where those occur [Hz] (NaN likewise); ``windows`` the runs of
    matchable lengths, least worst-case tuner loss first (then least voltage);
    ``windows_by_voltage`` the same windows, least worst-case voltage first (then least loss);
    ``radio_power_w`` net power into the tuner [W]; ``network`` 'T' or 'L'; ``chunk_lengths``
    lengths per chunk and ``chunk_peak_bytes`` the peak memory estimate of one chunk [bytes].
    """

    length_m: np.ndarray
    frequency_hz: np.ndarray
    matchable: np.ndarray
    unmatched_count: np.ndarray
    worst_tuner_loss_db: np.ndarray
    worst_voltage_v: np.ndarray
    worst_loss_frequency_hz: np.ndarray
    worst_voltage_frequency_hz: np.ndarray
    windows: tuple[LengthWindow, ...]
    windows_by_voltage: tuple[LengthWindow, ...]
    radio_power_w: float
    network: str
    chunk_lengths: int
    chunk_peak_bytes: int
    row_power_w: np.ndarray
    power_sum_w: np.ndarray
    worst_row_power_w: np.ndarray
    worst_row: np.ndarray
    rank: str
    radio: RadioDrive
    tuner_input_power_w: np.ndarray


def scan_lengths_m(length_min_m, length_max_m, step_m):
    """The lengths of a scan: ``length_min_m``, then every ``step_m`` up to ``length_max_m``.

    Parameters
    ----------
    length_min_m, length_max_m : float
        First and last length [m]; 0 <= min < max, both finite.
    step_m : float
        Step [m]; positive, finite and no larger than the range.

    Returns
    -------
    ndarray, shape (L,)
        The lengths [m]; the end is included when the range is a whole number of steps.

    Raises
    ------
    LengthRangeError, StepError
    """
    low, step, count = _length_count(length_min_m, length_max_m, step_m)
    return low + step * np.arange(count)


def _length_count(length_min_m, length_max_m, step_m):
    """Checked start [m], step [m] and number of lengths of a scan (see `scan_lengths_m`)."""
    low, high, step = (float(x) for x in (length_min_m, length_max_m, step_m))
    if not (np.isfinite(low) and np.isfinite(high)):
        raise LengthRangeError(f"length range must be finite, got {low:g} m to {high:g} m")
    if low < 0:
        raise LengthRangeError(f"a length is zero or more, got a range starting at {low:g} m")
    if high == low:
        raise LengthRangeError(f"length range {low:g} m to {high:g} m is empty")
    if high < low:
        raise LengthRangeError(f"length range {low:g} m to {high:g} m is inverted (start above end)")
    if not (np.isfinite(step) and step > 0):
        raise StepError(f"length step must be positive, got {step:g} m")
    if step > high - low:
        raise StepError(f"length step {step:g} m is larger than the range {low:g} m to {high:g} m")
    return low, step, int(np.floor((high - low) / step * (1 + STEP_ROUNDING))) + 1


def band_scan_frequencies(bands, points_per_band=3):
    """Frequencies that stand for whole bands: both edges and points evenly between them.

    Parameters
    ----------
    bands : sequence of linecalc.physics.bands.Band
    points_per_band : int
        Points per band, 2 or more; 3 gives the edges and the centre.

    Returns
    -------
    frequency_hz : ndarray, shape (len(bands) * points_per_band,)
        [Hz], band by band, each band from its lower edge up.
    band_index : ndarray of int, same shape
        Which band each frequency stands for.
    """
    if points_per_band < 2:
        raise AdvisorInputError(f"points_per_band must be 2 or more (the edges), got {points_per_band}")
    frequency_hz = np.concatenate([sweep_frequencies_hz(b.low_hz, b.high_hz, points_per_band) for b in bands])
    return frequency_hz, np.repeat(np.arange(len(bands)), points_per_band)


def feeder_peak_voltage(gamma_per_m, length_m, rho_in, forward_in_v):
    """Largest RMS voltage magnitude along a line, from the waves at its input.

    Parameters
    ----------
    gamma_per_m : array_like of complex
        Propagation constant [1/m]; broadcasts.
    length_m : array_like
        Line length [m]; broadcasts.
    rho_in : array_like of complex
        Reflection coefficient at the input against the line's characteristic impedance [1].
    forward_in_v : array_like
        |V+| of the forward wave at the input [V, RMS].

    Returns
    -------
    ndarray
        max |V(x)| over 0 <= x <= length [V]: the larger of the input, the output and the first
        standing-wave peak from the input if it lies on the line.

    Notes
    -----
    V(x) = V+ e^(-gamma x) (1 + rho_in e^(2 gamma x)) at a distance x from the input. The peaks
    sit where the phase of rho_in e^(2 j beta x) is a whole turn, and their height
    |V+| (e^(-alpha x) + |rho_in| e^(alpha x)) falls with x, so the first peak is the highest; the
    largest value on the line is there or at an end. On a lossy line the true maximum lies a
    fraction (alpha/beta)^2 away in height, far below anything this ranking needs.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., sections 2.3 (standing waves, V_max = |V+|(1 + |rho|))
    and 2.7 (the lossy line).
    """
    gl = np.asarray(length_m, dtype=float) * np.asarray(gamma_per_m, dtype=complex)
    rho_in = np.asarray(rho_in, dtype=complex)
    alpha, beta = np.real(gamma_per_m), np.imag(gamma_per_m)
    at_input = np.abs(1 + rho_in)
    at_output = np.exp(-gl.real) * np.abs(1 + rho_in * np.exp(2 * gl))
    x_peak = np.mod(-np.angle(rho_in), 2 * np.pi) / (2 * beta)
    peak = np.exp(-alpha * x_peak) + np.abs(rho_in) * np.exp(alpha * x_peak)
    on_line = x_peak <= np.asarray(length_m, dtype=float)
    largest = np.maximum(np.maximum(at_input, at_output), np.where(on_line, peak, 0.0))
    return np.asarray(forward_in_v) * largest


def voltage_along_line(z0_ohm, gamma_per_m, length_m, voltage_in_v, current_in_a, points):
    """RMS voltage magnitude along a line from the phasors at its input (the radio end).

    Parameters
    ----------
    z0_ohm, gamma_per_m : ndarray of complex, shape (nf,)
        Characteristic impedance [ohm] and propagation constant [1/m].
    length_m : float
        Line length [m].
    voltage_in_v, current_in_a : ndarray of complex, shape (nf,)
        RMS voltage [V] and current [A] at the input, toward the line (from a path solution).
    points : int
        Number of positions, 2 or more, evenly from the input to the output.

    Returns
    -------
    position_m : ndarray, shape (points,)
        Distance from the input [m].
    voltage_v : ndarray, shape (points, nf)
        |V(x)| [V, RMS].

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., sections 2.1 and 2.7: V(x) = V+ e^(-gamma x) +
    V- e^(gamma x) with V+- = (V_in +- Z0 I_in) / 2.
    """
    position_m = np.linspace(0.0, float(length_m), int(points))
    forward = (voltage_in_v + z0_ohm * current_in_a) / 2
    backward = (voltage_in_v - z0_ohm * current_in_a) / 2
    gx = position_m[:, None] * gamma_per_m
    return position_m, np.abs(forward * np.exp(-gx) + backward * np.exp(gx))


def chunk_plan(n_lengths, n_frequencies, network, memory_budget_bytes=MEMORY_BUDGET_BYTES):
    """Lengths per chunk and that chunk's peak memory estimate [bytes].

    A chunk holds at most ``memory_budget_bytes / BYTES_PER_EVALUATION[network]`` evaluations
    and at most ``CACHE_CHUNK_EVALUATIONS``, and at least one length (a budget too small for one
    length is exceeded by that one length; the estimate says by how much).
    """
    if not memory_budget_bytes > 0:
        raise AdvisorInputError(f"memory budget must be positive, got {memory_budget_bytes}")
    per_evaluation = BYTES_PER_EVALUATION[network]
    evaluations = min(memory_budget_bytes // per_evaluation, CACHE_CHUNK_EVALUATIONS)
    lengths = int(max(1, min(n_lengths, evaluations // n_frequencies)))
    return lengths, lengths * n_frequencies * per_evaluation


def _check_inputs(frequency_hz, z_antenna_ohm, network, radio_power_w, r0_ohm, fixed):
    f = np.asarray(frequency_hz, dtype=float)
    z = np.asarray(z_antenna_ohm, dtype=complex)
    if f.ndim != 1 or f.size == 0 or not np.all(np.isfinite(f) & (f > 0)):
        raise AdvisorInputError("frequency_hz must be a non-empty 1-D array of positive, finite frequencies")
    if z.shape != f.shape or not np.all(np.isfinite(z) & (z.real >= 0)):
        raise AdvisorInputError("z_antenna_ohm must be finite with a resistance of zero or more, one per frequency")
    if network not in LEAST_LOSS:
        raise AdvisorInputError(f"the advisor designs an 'L' or a 'T' network, got {network!r}")
    if not (np.isfinite(radio_power_w) and radio_power_w > 0):
        raise AdvisorInputError(f"radio power must be positive and finite, got {radio_power_w}")
    if not (np.isfinite(r0_ohm) and r0_ohm > 0):
        raise AdvisorInputError(f"reference impedance must be positive and finite, got {r0_ohm}")
    for abcd in fixed:
        if np.shape(abcd) != f.shape + (2, 2):
            raise AdvisorInputError(f"a fixed chain matrix has shape (nf, 2, 2) = {f.shape + (2, 2)}, "
                                    f"got {np.shape(abcd)}")
    return f, z


def feeder_waves(z0_ohm, gamma_per_m, length_m, rho_out, abcd_tuner_to_feeder=()):
    """The feeder's input reflection and the state at the tuner's output, per 1 V forward wave.

    Parameters
    ----------
    z0_ohm, gamma_per_m : ndarray of complex, shape (nf,)
        The feeder's characteristic impedance [ohm] and propagation constant [1/m].
    length_m : ndarray, shape (..., 1) or broadcastable with (nf,)
        Feeder lengths [m].
    rho_out : ndarray of complex, shape (nf,)
        Reflection coefficient of what the feeder drives, against ``z0_ohm`` [1].
    abcd_tuner_to_feeder : sequence of ndarray, each (nf, 2, 2)
        Fixed chain matrices between the tuner and the feeder, from the tuner side.

    Returns
    -------
    rho_in : ndarray of complex
        rho_out e^(-2 gamma l) [1].
    voltage_v, current_a : ndarray of complex
        At the tuner's output with a forward wave of 1 V at the feeder's input:
        V = 1 + rho_in, I = (1 - rho_in) / Z0 there, carried through the fixed chain matrices.
        The tuner sees V / I.

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., sections 2.3 and 2.7 (reflection along a lossy line),
    4.4 (chain matrices).
    """
    rho_in = rho_out * np.exp(-2 * gamma_per_m * length_m)
    voltage_v, current_a = walk_to_input(list(abcd_tuner_to_feeder), 1 + rho_in, (1 - rho_in) / z0_ohm)
    return rho_in, voltage_v, current_a


def find_windows(length_m, matchable, worst_tuner_loss_db, worst_voltage_v, row_power_w=None, rank="sum"):
    """Runs of consecutive matchable lengths as `LengthWindow`, in scan order.

    Parameters
    ----------
    length_m : ndarray, shape (L,)
        Scanned lengths [m], increasing.
    matchable : ndarray of bool, shape (L,)
    worst_tuner_loss_db, worst_voltage_v : ndarray, shape (L,)
        Per-length worst cases [dB], [V]; finite where ``matchable``.
    row_power_w : ndarray, shape (L, rows), or None
        Watts at the antenna per row [W], finite where ``matchable``. With it, a window's best
        length is the one with the most watts (`rank_score`); without it, the one whose worst
        tuner loss is least.
    rank : {'sum', 'worst'}
        See `rank_score`.
    """
    edges = np.diff(np.concatenate([[0], matchable.astype(np.int8), [0]]))
    starts, ends = np.flatnonzero(edges == 1), np.flatnonzero(edges == -1) - 1
    score = None if row_power_w is None else rank_score(row_power_w, rank)
    windows = []
    for first, last in zip(starts, ends):
        run = slice(first, last + 1)
        if score is None:
            best = first + int(np.argmin(worst_tuner_loss_db[run]))
            powers = {}
        else:
            best = first + int(np.argmax(score[run]))
            worst_row = int(np.argmin(row_power_w[best]))
            powers = {"power_sum_w": float(np.sum(row_power_w[best])),
                      "worst_row_power_w": float(row_power_w[best, worst_row]), "worst_row": worst_row}
        windows.append(LengthWindow(
            start_m=float(length_m[first]), end_m=float(length_m[last]),
            worst_tuner_loss_db=float(np.max(worst_tuner_loss_db[run])),
            worst_voltage_v=float(np.max(worst_voltage_v[run])),
            best_length_m=float(length_m[best]), best_tuner_loss_db=float(worst_tuner_loss_db[best]),
            at_range_start=bool(first == 0), at_range_end=bool(last == len(length_m) - 1), **powers))
    return tuple(windows)


def rank_score(row_power_w, rank):
    """What a length is ranked by [W]: the watts at the antenna summed over the rows
    (``rank='sum'``) or those of its worst row (``'worst'``); NaN where a row is NaN.

    Parameters
    ----------
    row_power_w : ndarray, shape (..., rows)
    rank : {'sum', 'worst'}
    """
    if rank not in RANKS:
        raise AdvisorInputError(f"rank is one of {', '.join(RANKS)}, got {rank!r}")
    return np.sum(row_power_w, axis=-1) if rank == "sum" else np.min(row_power_w, axis=-1)


def peak_lengths(length_m, score, qualifies, count, separation_m=PEAK_SEPARATION_M):
    """Indices of the lengths where ``score`` peaks, best first, at least ``separation_m`` apart.

    A peak is a qualifying length whose score is at least that of each qualifying neighbour (a
    window's ends count when they are); a peak closer than ``separation_m`` to a better one is
    left out (the ripple of the tuner's least loss from one step to the next is not a choice).

    Parameters
    ----------
    length_m : ndarray, shape (L,)
        Scanned lengths [m], increasing.
    score : ndarray, shape (L,)
        What the lengths are ranked by (`rank_score`) [W], finite where ``qualifies``.
    qualifies : ndarray of bool, shape (L,)
    count : int
        How many peaks at most.
    separation_m : float
        Least distance between two peaks listed [m]; `PEAK_SEPARATION_M` by default.

    Returns
    -------
    ndarray of int
        Up to ``count`` indices, highest score first.
    """
    value = np.where(qualifies, score, -np.inf)
    padded = np.concatenate([[-np.inf], value, [-np.inf]])
    index = np.flatnonzero(qualifies & (value >= padded[:-2]) & (value >= padded[2:]))
    chosen = []
    for k in index[np.argsort(-value[index], kind="stable")]:
        if len(chosen) == count:
            break
        if all(abs(length_m[k] - length_m[j]) >= separation_m for j in chosen):
            chosen.append(k)
    return np.array(chosen, dtype=int)


def ranked_windows(windows, rank):
    """``windows`` best first: most watts by ``rank`` (`rank_score`), then least worst-case tuner
    loss; windows without powers by least worst-case tuner loss, then least voltage."""
    def key(w):
        power = w.power_sum_w if rank == "sum" else w.worst_row_power_w
        return (-power if np.isfinite(power) else 0.0, w.worst_tuner_loss_db, w.worst_voltage_v, w.start_m)
    return tuple(sorted(windows, key=key))


def windows_by_voltage(windows):
    """``windows`` least worst-case feeder voltage first, then least worst-case tuner loss."""
    return tuple(sorted(windows, key=lambda w: (w.worst_voltage_v, w.worst_tuner_loss_db, w.start_m)))


def advise_length(cable, frequency_hz, z_antenna_ohm, parts, *, network, r0_ohm, radio_power_w,
                  length_min_m, length_max_m, step_m, abcd_tuner_to_feeder=(), abcd_feeder_to_antenna=(),
                  max_evaluations=MAX_EVALUATIONS, allow_large_scan=False,
                  memory_budget_bytes=MEMORY_BUDGET_BYTES, progress=None, max_swr=None,
                  abcd_radio_to_tuner=(), radio_holds="forward", foldback_swr=None, max_power_w=None,
                  row_columns=None, rank="sum") -> LengthAdvice:
    """Scan the feeder length: where the tuner matches on every frequency, and the watts at the antenna.

    Parameters
    ----------
    cable : linecalc.physics.cables.Cable
        The feeder whose length is scanned.
    frequency_hz : array_like, shape (nf,)
        Frequencies that must all be matched [Hz], e.g. from `band_scan_frequencies`.
    z_antenna_ohm : array_like of complex, shape (nf,)
        Antenna feedpoint impedance at those frequencies [ohm]; resistance >= 0.
    parts : linecalc.physics.matching.TunerParts
        Ranges and Qs of the tuner's parts.
    network : {'T', 'L'}
        The tuner's network (see `linecalc.physics.matching_fast`).
    r0_ohm : float
        Reference impedance the tuner matches to [ohm].
    radio_power_w : float
        The radio's power setting [W] (see ``radio_holds``); voltages scale with the square root
        of the power into the tuner, watts at the antenna with that power.
    length_min_m, length_max_m, step_m : float
        The scan (see `scan_lengths_m`) [m].
    abcd_tuner_to_feeder, abcd_feeder_to_antenna : sequence of ndarray, each (nf, 2, 2)
        Fixed chain matrices between the tuner and the feeder and between the feeder and the
        antenna, each list in order from the radio side; empty by default (the tuner drives
        the feeder, which drives the antenna).
    max_evaluations : int
        Largest lengths x frequencies without ``allow_large_scan``; default ``MAX_EVALUATIONS``.
    allow_large_scan : bool
        The explicit override of ``max_evaluations``.
    memory_budget_bytes : int
        Peak memory of one chunk [bytes]; see `chunk_plan`.
    progress : callable(done, total) or None
        Called after each chunk with the lengths done and the lengths in all.
    max_swr : float or None
        A radio's built-in tuner: it tunes only loads whose SWR against ``r0_ohm`` is at most
        this (as `linecalc.physics.matching.design_builtin_tuner`); None for a tuner that takes
        any load its parts can match.
    abcd_radio_to_tuner : sequence of ndarray, each (nf, 2, 2)
        Fixed chain matrices between the radio and the tuner, from the radio; empty by default.
    radio_holds, foldback_swr, max_power_w
        How the radio drives its port (`linecalc.physics.source.radio_drive`): ``'forward'``
        (the default) or ``'net'``, its reflected-power limit and its largest forward power
        (None: none).
    row_columns : array_like of int, shape (rows,), or None
        For each row of the result, the index into ``frequency_hz`` of the frequency whose watts
        stand for it; None (the default): every frequency is a row.
    rank : {'sum', 'worst'}
        Rank lengths by the watts at the antenna summed over the rows (the default) or by
        their worst row.

    Returns
    -------
    LengthAdvice

    Raises
    ------
    LengthRangeError, StepError, ScanTooLarge, AdvisorInputError

    Notes
    -----
    For each chunk of lengths, with a forward wave of 1 V at the feeder's input:
    rho_in = rho_out e^(-2 gamma l) with rho_out the reflection of the antenna (through its fixed
    two-ports) against the feeder's complex Z0; V = 1 + rho_in, I = (1 - rho_in) / Z0; through the
    fixed two-ports to the tuner's output, whose impedance the tuner must match. With its least
    loss L_t and the power P_t delivered into its output, the radio's power scales the waves by
    sqrt(P_radio / (P_t 10^(L_t/10))); the feeder's largest voltage follows from
    `feeder_peak_voltage`. The voltage is RMS: its peak is sqrt(2) times as high. P_radio is
    the net power the radio puts into the tuner's input (`radio_into_matched_tuner`); the
    watts at the antenna are that power times 10^(-L_t/10) times the share of the tuner's output
    that reaches the antenna (`antenna_power_per_forward_volt` over P_t).

    References
    ----------
    Pozar, Microwave Engineering, 4th ed., sections 2.3 and 2.7 (reflection along a lossy
    line) and 4.4 (chain matrices).
    """
    f, z_antenna = _check_inputs(frequency_hz, z_antenna_ohm, network, radio_power_w, r0_ohm,
                                 tuple(abcd_tuner_to_feeder) + tuple(abcd_feeder_to_antenna)
                                 + tuple(abcd_radio_to_tuner))
    columns = np.arange(f.size) if row_columns is None else np.asarray(row_columns, dtype=int)
    if columns.ndim != 1 or columns.size == 0 or np.any((columns < 0) | (columns >= f.size)):
        raise AdvisorInputError(f"row_columns must be a non-empty 1-D array of indices below {f.size}")
    rank_score(np.zeros(1), rank)  # an unknown rank is refused before the scan
    _, _, n_lengths = _length_count(length_min_m, length_max_m, step_m)
    evaluations = n_lengths * f.size
    if evaluations > max_evaluations and not allow_large_scan:
        raise ScanTooLarge(f"{n_lengths:,} lengths x {f.size} frequencies = {evaluations:,} evaluations, "
                           f"more than the {max_evaluations:,} allowed without the override; "
                           "use a coarser step, a shorter range or fewer frequencies, or allow a large scan")
    length_m = scan_lengths_m(length_min_m, length_max_m, step_m)
    chunk, chunk_bytes = chunk_plan(length_m.size, f.size, network, memory_budget_bytes)

    z0, gamma = cable.constants(f)
    v_out, i_out = walk_to_input(list(abcd_feeder_to_antenna), z_antenna, np.ones_like(z_antenna))
    rho_out = (v_out - z0 * i_out) / (v_out + z0 * i_out)
    least_loss = LEAST_LOSS[network]
    drive, tuner_input_w = radio_into_matched_tuner(abcd_radio_to_tuner, f, r0_ohm, radio_power_w, radio_holds,
                                                    foldback_swr, max_power_w)
    row_power = np.full((length_m.size, columns.size), np.nan)

    worst_loss = np.full(length_m.size, np.nan)
    worst_voltage = np.full(length_m.size, np.nan)
    loss_at = np.full(length_m.size, np.nan)
    voltage_at = np.full(length_m.size, np.nan)
    unmatched = np.zeros(length_m.size, dtype=int)
    for start in range(0, length_m.size, chunk):
        lengths = length_m[start:start + chunk, None]
        rho_in, v_t, i_t = feeder_waves(z0, gamma, lengths, rho_out, abcd_tuner_to_feeder)  # (chunk, nf)
        loss_db, matched = least_loss(f, v_t / i_t, r0_ohm, parts)
        if max_swr is not None:  # a built-in tuner refuses a load past its SWR limit
            z_t = v_t / i_t
            matched = matched & (np.abs((z_t - r0_ohm) / (z_t + r0_ohm)) <= (max_swr - 1) / (max_swr + 1))
        # power into the tuner per 1 V forward wave; a stand-in where unmatched (masked below)
        power_in = np.where(matched, (v_t * i_t.conj()).real * 10 ** (np.where(matched, loss_db, 0.0) / 10), 1.0)
        wave_scale2 = tuner_input_w / power_in  # |forward wave at the feeder's input|^2 [V^2]
        voltage = feeder_peak_voltage(gamma, lengths, rho_in, np.sqrt(wave_scale2))
        rows = slice(start, start + lengths.shape[0])
        antenna_w = wave_scale2[:, columns] * antenna_power_per_forward_volt(
            z0[columns], gamma[columns], lengths, v_out[columns], i_out[columns], z_antenna[columns])
        row_power[rows] = np.where(matched[:, columns], antenna_w, np.nan)
        unmatched[rows] = np.sum(~matched, axis=1)
        some = np.any(matched, axis=1)
        for values, worst, at in ((loss_db, worst_loss, loss_at), (voltage, worst_voltage, voltage_at)):
            masked = np.where(matched, values, -np.inf)
            index = np.argmax(masked, axis=1)
            worst[rows] = np.where(some, np.take_along_axis(masked, index[:, None], axis=1)[:, 0], np.nan)
            at[rows] = np.where(some, f[index], np.nan)
        if progress is not None:
            progress(rows.stop, length_m.size)

    matchable = unmatched == 0
    windows = find_windows(length_m, matchable, worst_loss, worst_voltage, row_power, rank)
    unmatched_rows = np.isnan(row_power)
    worst_row = np.where(unmatched_rows.any(axis=1), -1, np.argmin(np.where(unmatched_rows, np.inf, row_power), axis=1))
    return LengthAdvice(
        length_m=length_m, frequency_hz=f, matchable=matchable, unmatched_count=unmatched,
        worst_tuner_loss_db=worst_loss, worst_voltage_v=worst_voltage,
        worst_loss_frequency_hz=loss_at, worst_voltage_frequency_hz=voltage_at,
        windows=ranked_windows(windows, rank), windows_by_voltage=windows_by_voltage(windows),
        radio_power_w=float(radio_power_w), network=network, chunk_lengths=chunk, chunk_peak_bytes=chunk_bytes,
        row_power_w=row_power, power_sum_w=rank_score(row_power, "sum"), worst_row_power_w=rank_score(row_power, "worst"),
        worst_row=worst_row, rank=rank, radio=drive, tuner_input_power_w=tuner_input_w)
