"""Wire antennas solved by the method of moments: a dipole (doublet, off-centre fed), an
inverted-V or a vertical with elevated radials, over free space, perfect ground or real soil.

The solver is nec2++ (a C++ implementation of the Numerical Electromagnetics Code, NEC-2),
through its Python interface PyNEC, an optional extra (``pip install 'linecalc[antenna]'``,
GPL-3.0). It is imported only when a wire antenna is solved. This module takes SI floats and
returns numpy arrays; it knows nothing of units or station files.

What the model leaves out, stated plainly: the feedline (balanced, radiating nothing), insulators,
nearby objects and the sag of the wire. The feed is a one-segment source (a chord across the feed
point, so an inverted-V loses the top half-segment of its apex). Real ground is the
Sommerfeld-Norton ground of NEC-2, flat and uniform; its loss is not counted as wire loss.

References
----------
Burke and Poggio, Numerical Electromagnetics Code (NEC) - Method of Moments, Part III: User's
Guide, Lawrence Livermore National Laboratory (1981), section 2 (wire modelling guidelines:
segment length under 0.1 wavelength, 0.05 preferred; segment length over 8 wire radii for the
thin-wire kernel, over 2 with the extended kernel), and the GN, LD, EX, FR and RP cards.
"""
from __future__ import annotations

import math
import os
from dataclasses import dataclass

import numpy as np

from linecalc.errors import InputError
from linecalc.physics import process_split

SPEED_OF_LIGHT = 299_792_458.0  # m/s, exact

# Segmentation (NEC-2 User's Guide, section 2): segments of at most a twentieth of the shortest
# wavelength solved (the guide's preferred 0.05 wavelength), a fortieth on a vertical (fed on
# the segment that meets its radials or the ground, whose impedance converges more slowly: at
# a twentieth it moves 2 % from N to 2N segments, at a fortieth under 1 %); a segment at least
# 8 radii long for the thin-wire kernel, and at least 2 radii with the extended kernel, below
# which the model is refused.
SEGMENTS_PER_WAVELENGTH = {"dipole": 20, "inverted-v": 20, "vertical": 40}
THIN_WIRE_RATIO = 8.0
EXTENDED_KERNEL_RATIO = 2.0
# A frequency above the one the segments were chosen for may still be solved up to segments
# of 0.1 wavelength, the guide's upper limit.
LARGEST_SEGMENT_WAVELENGTHS = 0.1
# The far-field grid for the peak gain: the sky above ground (the whole sphere in free space)
# in 5 degree steps of elevation and 10 degree steps of azimuth. Between grid points a lobe can
# peak a little higher than the largest sample: under about 0.2 dB for the lobes of wire
# antennas up to a few wavelengths long (their lobes are over 20 degrees wide).
THETA_STEP_DEG = 5.0
PHI_STEP_DEG = 10.0

# The most segments a model may have: the engine's matrix grows with their square (2,000
# segments: 64 MB and seconds per frequency), so a larger model is refused, not attempted.
MAX_SEGMENTS = 2000

# Engine runs shared between processes (`linecalc.physics.process_split`): each frequency is
# solved on its own and deterministically, so a run cut into parts, one per process, gives the
# uncut run's numbers bit for bit. At most `DEFAULT_PROCESSES` processes unless the environment
# variable `PROCESSES_VARIABLE` says otherwise (1: every run in this process), never more than
# the machine's processors. A worker costs about 5 ms (the fork, the pickled result, the child's
# first writes to memory it shares with its parent; measured on the 2-core development machine:
# a run of 4 frequencies of 0.3 ms each took 1.1 ms serially and 5.6 ms split), so a run is
# split only where that is paid back: at least `MIN_FREQUENCIES_PER_PROCESS` frequencies per
# process, each costing several milliseconds, which is the case over Sommerfeld-Norton ground
# (20 to 90 ms per frequency measured), with the far field (5 ms or more per frequency on the
# 5 x 10 degree grid), or with at least `MIN_SEGMENTS_TO_SPLIT` segments (the matrix grows with
# the square of the segments: 11 ms per frequency at 139 segments over perfect ground, so about
# 2 ms at 60, and 0.1 ms at 11). Elsewhere the run stays in this process.
DEFAULT_PROCESSES = 2
PROCESSES_VARIABLE = "LINECALC_ENGINE_PROCESSES"
MIN_FREQUENCIES_PER_PROCESS = 2
MIN_SEGMENTS_TO_SPLIT = 60

INSTALL_HINT = "python -m pip install 'linecalc[antenna]' (in the clone: .venv/bin/python -m pip install -e '.[antenna]')"

SHAPES = ("dipole", "inverted-v", "vertical")


class EngineMissing(InputError):
    """The method-of-moments engine (PyNEC) is not installed."""


@dataclass(frozen=True)
class Ground:
    """What the antenna stands over: ``kind`` is free-space, perfect or real; a real ground has
    a conductivity [S/m] and a relative permittivity."""

    kind: str
    conductivity_s_per_m: float = 0.0
    relative_permittivity: float = 1.0


@dataclass(frozen=True)
class WireAntenna:
    """A wire antenna in SI units.

    ``length_m`` is tip to tip (dipole, inverted-V) or the height of the radiator (vertical);
    ``height_m`` the height of the wire, of the apex (inverted-V) or of the base (vertical);
    ``feed_at`` the share of the length from one end where it is fed (a vertical is fed at its
    base); ``apex_angle_rad`` the angle between the legs of an inverted-V (pi: a straight wire);
    ``highest_frequency_hz`` the frequency the segments are chosen for; a conductivity of
    ``math.inf`` is a lossless wire.
    """

    shape: str
    length_m: float
    height_m: float
    radius_m: float
    conductivity_s_per_m: float
    ground: Ground
    highest_frequency_hz: float
    feed_at: float = 0.5
    apex_angle_rad: float = math.pi
    radial_count: int = 0
    radial_length_m: float = 0.0
    segments_per_wavelength: int | None = None  # None: SEGMENTS_PER_WAVELENGTH of the shape

    @property
    def segment_m(self) -> float:
        """The longest segment [m]: a ``segments_per_wavelength``-th of the shortest wavelength
        (`SEGMENTS_PER_WAVELENGTH` of the shape by default)."""
        per_wavelength = self.segments_per_wavelength or SEGMENTS_PER_WAVELENGTH[self.shape]
        return SPEED_OF_LIGHT / self.highest_frequency_hz / per_wavelength

    def impedance_at(self, frequency_hz):
        """Feedpoint impedance [ohm] at ``frequency_hz`` [Hz] (solved, or from this process's cache)."""
        return solve(self, frequency_hz, pattern=False).impedance_ohm  # a solved pattern is cached too


@dataclass(frozen=True)
class WireSolution:
    """What the engine gives per frequency: feedpoint impedance [ohm], the share of the input
    power lost as heat in the wire [dB], and the peak power gain over the sky [dBi] (wire loss
    included, ground loss included over real ground)."""

    frequency_hz: np.ndarray
    impedance_ohm: np.ndarray
    wire_loss_db: np.ndarray
    peak_gain_dbi: np.ndarray


class GeometryError(InputError):
    """A wire antenna that cannot be modelled as described; ``key`` names the key at fault."""

    def __init__(self, message, key):
        self.key = key
        super().__init__(message)


def engine_available() -> bool:
    """Whether PyNEC can be imported."""
    try:
        import PyNEC  # noqa: F401
    except ImportError:
        return False
    return True


def _polyline(antenna):
    """The antenna's wire as points (k, 3) [m] and the distance of its feed along it [m]."""
    length, height = antenna.length_m, antenna.height_m
    if antenna.shape == "vertical":
        return np.array([[0.0, 0.0, height], [0.0, 0.0, height + length]]), None
    if antenna.shape == "dipole":
        left = antenna.feed_at * length
        return np.array([[0.0, -left, height], [0.0, length - left, height]]), left
    droop = (math.pi - antenna.apex_angle_rad) / 2  # each leg below the horizontal
    half = length / 2
    end = np.array([0.0, half * math.cos(droop), height - half * math.sin(droop)])
    return np.array([end * [1, -1, 1], [0.0, 0.0, height], end]), antenna.feed_at * length


def _point_at(points, distance):
    """The point at ``distance`` [m] along a polyline, and the index of the piece it lies on."""
    pieces = np.linalg.norm(np.diff(points, axis=0), axis=1)
    ends = np.cumsum(pieces)
    k = min(int(np.searchsorted(ends, distance)), len(pieces) - 1)
    start = ends[k] - pieces[k]
    return points[k] + (points[k + 1] - points[k]) * (distance - start) / pieces[k], k


def _sub_polyline(points, low, high):
    """The part of a polyline from distance ``low`` to ``high`` [m], as points."""
    a, ka = _point_at(points, low)
    b, kb = _point_at(points, high)
    return np.vstack([a, points[ka + 1:kb + 1], b])


def wires(antenna):
    """The straight wires of the model: a list of (start, end, segments), and the (1-based)
    index of the feed wire, whose single segment carries the source.

    The feed wire is a one-segment chord centred on the feed point (a vertical: its bottom
    segment); the rest of the wire is cut into straight pieces of segments no longer than
    `WireAntenna.segment_m`; radials run level from the base of a vertical.
    """
    delta = antenna.segment_m
    points, feed = _polyline(antenna)
    total = float(np.sum(np.linalg.norm(np.diff(points, axis=0), axis=1)))
    if feed is None:
        pieces = [None, (delta, total)]
        feed_chord = (points[0], points[0] + (points[1] - points[0]) * delta / total)
    else:
        pieces = [(0.0, feed - delta / 2), (feed + delta / 2, total)]
        feed_chord = (_point_at(points, feed - delta / 2)[0], _point_at(points, feed + delta / 2)[0])
    result = [(feed_chord[0], feed_chord[1], 1)]
    for piece in pieces:
        if piece is None:
            continue
        line = _sub_polyline(points, *piece)
        for a, b in zip(line[:-1], line[1:]):
            span = float(np.linalg.norm(b - a))
            if span > 0:
                result.append((a, b, max(1, math.ceil(span / delta))))
    for k in range(antenna.radial_count):
        angle = 2 * math.pi * k / antenna.radial_count
        base = points[0]
        tip = base + antenna.radial_length_m * np.array([math.cos(angle), math.sin(angle), 0.0])
        result.append((base, tip, max(1, math.ceil(antenna.radial_length_m / delta))))
    return result, 1


def check_geometry(antenna):
    """Refuse a geometry the engine cannot model; `GeometryError` names the key at fault.

    References
    ----------
    Burke and Poggio, NEC-2 User's Guide (1981), section 2: segments over 2 radii long (the
    extended thin-wire kernel), wires above a ground plane (or ending on a perfect one).
    """
    if antenna.shape not in SHAPES:
        raise GeometryError(f"shape is one of {', '.join(SHAPES)}, got {antenna.shape!r}", "shape")
    if not 0 < antenna.feed_at < 1:
        raise GeometryError(f"feed_at is a share of the length strictly between 0 and 1, got {antenna.feed_at:g}",
                            "feed_at")
    delta = antenna.segment_m
    if antenna.shape != "vertical":
        distance = min(antenna.feed_at, 1 - antenna.feed_at) * antenna.length_m
        if distance <= delta:
            raise GeometryError(f"the feed sits {distance:.3g} m from an end of the wire; the model needs at least "
                                f"one segment ({delta:.3g} m) on each side", "feed_at")
    if antenna.length_m <= delta:
        raise GeometryError(f"a wire of {antenna.length_m:g} m is shorter than one segment ({delta:.3g} m) at the "
                            "highest frequency", "length")
    if delta < EXTENDED_KERNEL_RATIO * antenna.radius_m:
        raise GeometryError(f"the wire is too thick for its segments: a {delta:.3g} m segment is less than "
                            f"{EXTENDED_KERNEL_RATIO:g} wire radii ({antenna.radius_m:.3g} m) long", "diameter")
    model = wires(antenna)[0]
    segments = sum(count for *_, count in model)
    if segments > MAX_SEGMENTS:
        raise GeometryError(f"the model would need {segments} segments at {antenna.highest_frequency_hz / 1e6:g} MHz; "
                            f"at most {MAX_SEGMENTS} are solved (a wire this long is beyond what this model is for)",
                            "radials" if antenna.radial_count else "length")
    if antenna.ground.kind == "free-space":
        return
    lowest = min(min(a[2], b[2]) for a, b, _ in model)
    on_perfect_ground = antenna.shape == "vertical" and antenna.ground.kind == "perfect" and antenna.height_m == 0
    if on_perfect_ground and antenna.radial_count:
        raise GeometryError("radials of a vertical standing on perfect ground would lie in the ground: "
                            "give the vertical a height above ground, or no radials", "radials")
    if not on_perfect_ground and lowest <= antenna.radius_m:
        raise GeometryError(f"part of the wire is at or below the ground (lowest point {lowest:.3g} m); NEC-2 "
                            "models wires above the ground only (a vertical on the ground only over perfect "
                            "ground)", "height")


def _use_extended_kernel(antenna):
    return antenna.segment_m < THIN_WIRE_RATIO * antenna.radius_m


def _evenly_spaced_runs(frequency_hz):
    """Sorted frequencies cut into runs of equal steps, one frequency card each: (first, step, count)."""
    runs = []
    for f in frequency_hz:
        if runs:
            first, step, count = runs[-1]
            if count == 1:
                runs[-1] = (first, f - first, 2)
                continue
            if math.isclose(f - (first + step * (count - 1)), step, rel_tol=1e-9):
                runs[-1] = (first, step, count + 1)
                continue
        runs.append((f, 0.0, 1))
    return runs


def engine_processes() -> int:
    """How many processes an engine run may use: the whole number in the environment variable
    `PROCESSES_VARIABLE` (1 or more) if it is set, else `DEFAULT_PROCESSES`; never more than the
    machine's processors (``os.cpu_count()``, which `_engine_runs` applies to any number)."""
    text = os.environ.get(PROCESSES_VARIABLE)
    wanted = DEFAULT_PROCESSES
    if text is not None:
        try:
            wanted = int(text.strip())
        except ValueError:
            wanted = 0
        if wanted < 1:
            raise InputError(f"{PROCESSES_VARIABLE}: a whole number of processes for the antenna engine, 1 or more "
                             f"(1: no worker processes), got {text!r}")
    return wanted


def frequency_cards(frequency_hz):
    """The frequency cards of an engine run over sorted, distinct frequencies [Hz]: one per run of
    evenly spaced frequencies (`_evenly_spaced_runs`), as (first [MHz], step [MHz], count)."""
    return [(first / 1e6, step / 1e6, count) for first, step, count in _evenly_spaced_runs(frequency_hz)]


def split_cards(cards, processes):
    """The cards of an engine run cut into up to ``processes`` parts of as equal a number of
    frequencies as may be, each of at least `MIN_FREQUENCIES_PER_PROCESS` (fewer frequencies:
    one part).

    A card cut at its k-th frequency goes on from the frequency the engine itself would reach
    there: it steps from the first by adding the step once per frequency (NEC-2's FR card,
    linear stepping), so the first of the rest is the first plus the step added k times, in
    the same double-precision arithmetic. Every frequency is then solved at the same value as
    in the uncut run.

    References
    ----------
    Burke and Poggio, NEC-2 User's Guide (1981), the FR card (linear stepping: each frequency
    the one before plus the increment).
    """
    total = sum(count for *_, count in cards)
    parts = max(1, min(processes, total // MIN_FREQUENCIES_PER_PROCESS))
    sizes = [total // parts + (1 if k < total % parts else 0) for k in range(parts)]
    queue = list(cards)
    result = []
    for size in sizes:
        part = []
        while size:
            first, step, count = queue.pop(0)
            taken = min(size, count)
            part.append((first, step, taken))
            if taken < count:
                rest = first
                for _ in range(taken):
                    rest += step
                queue.insert(0, (rest, step, count - taken))
            size -= taken
        result.append(part)
    return result


def _worth_splitting(antenna, pattern):
    """Whether each frequency costs the engine enough to pay for a worker process (see
    `MIN_SEGMENTS_TO_SPLIT`): real ground, the far field, or a large model."""
    segments = sum(count for *_, count in wires(antenna)[0])
    return antenna.ground.kind == "real" or pattern or segments >= MIN_SEGMENTS_TO_SPLIT


def _engine_runs(antenna, frequency_hz, pattern, processes):
    """`_engine_run` over sorted, distinct frequencies, its cards cut by `split_cards` into parts
    solved at the same time in this process and in forked children
    (`process_split.run_split`) where that is available and pays (`_worth_splitting`); the
    results are the uncut run's."""
    processes = min(processes, os.cpu_count() or 1)
    cards = frequency_cards(frequency_hz)
    parts = split_cards(cards, processes) if (processes > 1 and _worth_splitting(antenna, pattern)
                                              and process_split.fork_available()) else [cards]
    if len(parts) == 1:
        return _engine_run(antenna, frequency_hz, pattern)
    _import_engine()  # once, here, so that every child inherits it
    bounds = np.cumsum([0] + [sum(count for *_, count in part) for part in parts])
    works = [lambda k=k: _engine_run(antenna, frequency_hz[bounds[k]:bounds[k + 1]], pattern, parts[k])
             for k in range(len(parts))]
    results = process_split.run_split(works)
    return tuple(np.concatenate([r[k] for r in results]) for k in range(3))


def _import_engine():
    try:
        import PyNEC
    except ImportError:
        raise EngineMissing(f"a wire antenna needs the optional method-of-moments engine: {INSTALL_HINT}") from None
    return PyNEC


def _engine_run(antenna, frequency_hz, pattern, cards=None):
    """One engine run over sorted, distinct frequencies [Hz]: impedance, wire loss [dB] and, with
    ``pattern``, the peak gain [dBi] (NaN without). ``cards``: the frequency cards that give
    these frequencies, `frequency_cards` by default."""
    context = _import_engine().nec_context()
    geometry = context.get_geometry()
    model, feed_tag = wires(antenna)
    for tag, (a, b, count) in enumerate(model, start=1):
        geometry.wire(tag, count, *map(float, a), *map(float, b), antenna.radius_m, 1.0, 1.0)
    ground = antenna.ground
    context.geometry_complete(0 if ground.kind == "free-space" else 1)
    if _use_extended_kernel(antenna):
        context.set_extended_thin_wire_kernel(True)
    if ground.kind == "perfect":
        context.gn_card(1, 0, 0, 0, 0, 0, 0, 0)
    elif ground.kind == "real":  # Sommerfeld-Norton
        context.gn_card(2, 0, ground.relative_permittivity, ground.conductivity_s_per_m, 0, 0, 0, 0)
    if math.isfinite(antenna.conductivity_s_per_m):  # wire conductivity on every wire (inf: lossless)
        context.ld_card(5, 0, 0, 0, antenna.conductivity_s_per_m, 0, 0)
    context.ex_card(0, feed_tag, 1, 0, 1.0, 0, 0, 0, 0, 0)
    sky_deg = 180.0 if ground.kind == "free-space" else 90.0
    n_theta = int(round(sky_deg / THETA_STEP_DEG)) + 1
    n_phi = int(round(360.0 / PHI_STEP_DEG))
    for first_mhz, step_mhz, count in frequency_cards(frequency_hz) if cards is None else cards:
        context.fr_card(0, count, first_mhz, step_mhz)
        if pattern:
            context.rp_card(0, n_theta, n_phi, 0, 5, 0, 0, 0.0, 0.0, THETA_STEP_DEG, PHI_STEP_DEG, 0.0, 0.0)
        else:
            context.xq_card(0)
    n = len(frequency_hz)
    impedance, loss_share, gain = np.empty(n, complex), np.empty(n), np.empty(n)
    for i, f in enumerate(frequency_hz):
        parameters = context.get_input_parameters(i)
        impedance[i] = complex(parameters.get_impedance()[0])
        power_in_w = float(parameters.get_power()[0])
        currents = context.get_structure_currents(i)
        # the engine gives segment lengths in wavelengths
        segment_m = np.asarray(currents.get_current_segment_length()) * SPEED_OF_LIGHT / f
        loss_share[i] = _wire_heat_w(currents.get_current(), segment_m, f, antenna) / power_in_w
        gain[i] = context.get_gain_max(i) if pattern else math.nan
    return impedance, -10 * np.log10(1 - loss_share), gain


def _wire_heat_w(current_a, segment_m, frequency_hz, antenna):
    """Heat in the wire [W] from the segment currents (peak amplitudes) and the skin-effect
    resistance per metre Rs/(2 pi a), Rs = sqrt(pi f mu0 / sigma).

    References
    ----------
    Balanis, Antenna Theory, 3rd ed., section 2.14, equation (2-90) (the loss resistance of a
    round wire with a uniform current over its skin); Ramo, Whinnery and Van Duzer, Fields and
    Waves in Communication Electronics, 3rd ed., section 5.5.
    """
    if math.isinf(antenna.conductivity_s_per_m):
        return 0.0
    mu_0 = 4e-7 * math.pi
    surface_ohm = math.sqrt(math.pi * frequency_hz * mu_0 / antenna.conductivity_s_per_m)
    per_metre_ohm = surface_ohm / (2 * math.pi * antenna.radius_m)
    current_a = np.asarray(current_a)
    return 0.5 * float(np.sum(np.abs(current_a) ** 2 * np.asarray(segment_m) * per_metre_ohm))


_CACHE: dict = {}


def solve(antenna: WireAntenna, frequency_hz, pattern=True, processes=None) -> WireSolution:
    """The antenna at ``frequency_hz`` [Hz], any shape: what this process has not solved before
    is solved in one engine run (one frequency card per run of evenly spaced frequencies).
    Without ``pattern`` the far field is not computed (the peak gain is NaN): the impedance
    alone costs a fraction of it. A run of many frequencies is shared between this process and
    forked workers (`engine_processes`, `split_cards`), with the serial run's results.

    Parameters
    ----------
    antenna : WireAntenna
    frequency_hz : array_like
        Frequencies [Hz], each with segments of at most `LARGEST_SEGMENT_WAVELENGTHS`.
    pattern : bool
        Whether to compute the far field (the peak gain).
    processes : int, optional
        The most processes the engine run may use (1: this one only); by default
        `engine_processes` (the environment variable `PROCESSES_VARIABLE`, else 2).

    Returns
    -------
    WireSolution
        Arrays of the shape of ``frequency_hz``.

    References
    ----------
    Burke and Poggio, NEC-2 User's Guide (1981), FR and RP cards.
    """
    f = np.asarray(frequency_hz, dtype=float)
    wavelength_m = SPEED_OF_LIGHT / np.max(f, initial=0.0) if f.size else math.inf
    if antenna.segment_m > LARGEST_SEGMENT_WAVELENGTHS * wavelength_m:
        raise GeometryError(f"{np.max(f) / 1e6:g} MHz is too high for the segments chosen for "
                            f"{antenna.highest_frequency_hz / 1e6:g} MHz", "wire")
    missing = sorted({float(x) for x in f.ravel()
                      if (antenna, float(x)) not in _CACHE or (pattern and math.isnan(_CACHE[(antenna, float(x))][2]))})
    if missing:
        z, loss_db, gain = _engine_runs(antenna, missing, pattern,
                                        engine_processes() if processes is None else processes)
        for i, x in enumerate(missing):
            _CACHE[(antenna, x)] = (z[i], loss_db[i], gain[i])
    values = [_CACHE[(antenna, float(x))] for x in f.ravel()]
    shaped = [np.array([v[k] for v in values]).reshape(f.shape) for k in range(3)]
    return WireSolution(f, shaped[0].astype(complex), shaped[1].astype(float), shaped[2].astype(float))


def clear_cache():
    """Forget every solved point (for benchmarks)."""
    _CACHE.clear()
