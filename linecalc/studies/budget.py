"""The orchestrator: a Station in, a BudgetResult per band or frequency out.

It composes the physics below (elements, solver, loads) in a short linear list of stages and
holds no formulas of its own.
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from linecalc.studies import stress as safety
from linecalc.physics.loads import ImpedanceTable, MeasuredAntenna, SwrTable, rho_from_impedance
from linecalc.physics.cascade import (NoNetPowerError, PathSolution, input_impedance, reflection, rescaled, solve_path,
                                      swr_from_rho)
from linecalc.physics.source import RadioDrive, port_mismatch_loss_db, radio_drive
from linecalc.physics.exposure import CAUTIONS
from linecalc.studies.json_values import finite_or_none, json_value, pair
from linecalc.studies.measured import PHASE_SAMPLES, measured_antenna_load
from linecalc.studies import work_size
from linecalc.studies.station import BudgetError, Station
from linecalc.physics import wire_antenna
from linecalc.physics.wire_antenna import WireAntenna
from linecalc.elements.base import named



@dataclass(frozen=True)
class ElementBudget:
    """One element's share of the budget, per row: loss [dB], heat [W], SWR at each port."""

    kind: str
    label: str
    loss_db: np.ndarray
    matched_loss_db: np.ndarray
    dissipated_w: np.ndarray
    swr_in: np.ndarray
    swr_out: np.ndarray
    readings: dict = field(default_factory=dict)  # element-specific arrays: a meter's SWR and powers


@dataclass(frozen=True)
class BudgetResult:
    """The loss budget of a station, one entry per row (band or frequency) in every array.

    Impedances are null (None) for an SWR-only antenna, whose phase is unknown; its powers and
    losses are averages over that phase and ``total_loss_db_range`` gives least and most.
    """

    station: str
    reference_impedance_ohm: float
    radio_power_w: float
    labels: tuple[str, ...]
    frequency_hz: np.ndarray
    swr_antenna: np.ndarray
    swr_radio: np.ndarray
    z_antenna_ohm: np.ndarray | None
    z_radio_ohm: np.ndarray | None
    matched_loss_db: np.ndarray
    mismatch_loss_db: np.ndarray
    total_loss_db: np.ndarray
    power_radio_w: np.ndarray
    power_antenna_w: np.ndarray
    elements: tuple[ElementBudget, ...]
    radio_forward_w: np.ndarray | None = None
    radio_reflected_w: np.ndarray | None = None
    radio_mismatch_loss_db: np.ndarray | None = None
    radio_holds: str = "net"
    total_loss_db_range: np.ndarray | None = None
    warnings: tuple[str, ...] = ()
    solution: PathSolution | None = field(default=None, repr=False)
    exposure: dict = field(default_factory=dict)  # per-row arrays: average power, distances, limits
    measured: dict = field(default_factory=dict)  # a measured antenna: SWR range at the antenna, sensitivity
    mode: str = "carrier"
    duty_factor: float = 1.0
    transmit_fraction: float = 1.0
    antenna_gain_dbi: float | None = 2.15  # None for a wire antenna: its gain per row is in ``wire``
    sweeps: tuple | None = None  # per row, its `BandSweep` (budget --sweep), or None
    wire: dict = field(default_factory=dict)  # a wire antenna: per-row peak gain, wire loss and heat
    explanations: tuple | None = None  # --explain: `studies.explain.Explanation` entries; None: not asked
    uncertainty: object | None = None  # budget --uncertainty: a `studies.uncertainty.BudgetSpread`

    def to_dict(self) -> dict:
        """The JSON document of ``linecalc budget --format json`` (and of ``safety``); every key
        is described in the project's docs/json.md."""
        rows = []
        for i, label in enumerate(self.labels):
            row = {
                "label": label,
                "frequency_hz": float(self.frequency_hz[i]),
                "swr_antenna": finite_or_none(self.swr_antenna[i]),
                "swr_radio": finite_or_none(self.swr_radio[i]),
                "z_antenna_ohm": pair(None if self.z_antenna_ohm is None else self.z_antenna_ohm[i]),
                "z_radio_ohm": pair(None if self.z_radio_ohm is None else self.z_radio_ohm[i]),
                "matched_loss_db": finite_or_none(self.matched_loss_db[i]),
                "mismatch_loss_db": finite_or_none(self.mismatch_loss_db[i]),
                "total_loss_db": finite_or_none(self.total_loss_db[i]),
                "power_radio_w": finite_or_none(self.power_radio_w[i]),
                "power_antenna_w": finite_or_none(self.power_antenna_w[i]),
                "radio_forward_w": finite_or_none(self.radio_forward_w[i]),
                "radio_reflected_w": finite_or_none(self.radio_reflected_w[i]),
                "radio_mismatch_loss_db": finite_or_none(self.radio_mismatch_loss_db[i]),
                "elements": [
                    {"kind": e.kind, "label": e.label, "loss_db": finite_or_none(e.loss_db[i]),
                     "matched_loss_db": finite_or_none(e.matched_loss_db[i]),
                     "dissipated_w": finite_or_none(e.dissipated_w[i]),
                     "swr_in": finite_or_none(e.swr_in[i]), "swr_out": finite_or_none(e.swr_out[i]),
                     **{key: json_value(values[i]) for key, values in e.readings.items()}}
                    for e in self.elements
                ],
            }
            if self.total_loss_db_range is not None:
                row["total_loss_db_range"] = [finite_or_none(v) for v in self.total_loss_db_range[i]]
            if self.measured:
                row["measured"] = {key: finite_or_none(values[i]) for key, values in self.measured.items()}
            if self.wire:
                row["wire"] = {key: finite_or_none(values[i]) for key, values in self.wire.items()}
            if self.exposure:
                row["exposure"] = {key: finite_or_none(values[i]) for key, values in self.exposure.items()}
            if self.sweeps is not None:
                row["sweep"] = self.sweeps[i].to_dict()
            rows.append(row)
        doc = {
            "station": self.station,
            "reference_impedance_ohm": float(self.reference_impedance_ohm),
            "radio_power_w": float(self.radio_power_w),
            "radio_holds": self.radio_holds,
            "mode": self.mode, "duty_factor": self.duty_factor, "transmit_fraction": self.transmit_fraction,
            "antenna_gain_dbi": self.antenna_gain_dbi,
            "rows": rows,
            "warnings": list(self.warnings),
            "cautions": list(CAUTIONS),
        }
        if self.explanations is not None:  # only when asked for (--explain): absent otherwise
            doc["explanations"] = [e.to_dict() for e in self.explanations]
        if self.uncertainty is not None:
            doc["uncertainty"] = self.uncertainty.to_dict()
        return doc


def _antenna_rho(antenna, frequency_hz, z_ref_ohm):
    """Reflection coefficient of the antenna against ``z_ref_ohm``: (nf,), or (phases, nf) if SWR-only."""
    if isinstance(antenna, (ImpedanceTable, WireAntenna)):
        return rho_from_impedance(antenna.impedance_at(frequency_hz), z_ref_ohm)
    phase = np.exp(2j * np.pi * np.arange(PHASE_SAMPLES) / PHASE_SAMPLES)
    return antenna.rho_magnitude_at(frequency_hz)[None, :] * phase[:, None]


def _chain_matrices(feed, frequency_hz, rho_antenna, z_ref_ohm, set_at=None):
    """Every element's chain matrix; a tuner is first designed for the load it sees.

    Tuners are designed from the antenna toward the radio, each for the impedance looking into
    the path beyond it. With ``set_at`` (a band sweep), a tuner that adjusts once keeps at each
    row the setting designed at the row ``set_at`` names. Returns the list and a dict element
    index -> tuner design.
    """
    abcd_list = [None if element.adapts_to_load else element.scaled_abcd(frequency_hz) for element in feed]
    designs = {}
    for k in reversed(range(len(feed))):
        if abcd_list[k] is None:
            z_load = input_impedance(abcd_list[k + 1:], rho_antenna, z_ref_ohm)
            if not np.all(np.isfinite(z_load) & (z_load.real > 0)):
                raise BudgetError(f"{named('tuner', feed[k].label)} sees a load with no resistance (a short, an open or a "
                                  "pure reactance through a lossless path): there is nothing to match", "antenna")
            designs[k] = feed[k].design(frequency_hz, z_load)
            if set_at is not None and feed[k].held:
                designs[k] = feed[k].hold(designs[k], set_at)
            abcd_list[k] = designs[k].abcd
    return abcd_list, designs


def _tuner_warnings(feed, designs, labels, swr_in_by_element, set_at=None):
    """A warning for every row where a tuner cannot match, naming the band and the SWR it sees.

    A tuner held across a sweep is judged only at the rows where it was set (elsewhere its
    mismatch is the band's SWR curve at the radio, not a failure). For an SWR-only antenna the
    tuner is designed at every phase of the unknown reflection: the warning says at how many it
    fails and the worst SWR it leaves at its input there.
    """
    warnings = []
    rows = np.arange(len(labels))
    for k, design in designs.items():
        judged = rows == set_at if set_at is not None and feed[k].held else np.ones(len(labels), dtype=bool)
        load_swr = swr_from_rho(np.abs(rho_from_impedance(design.z_load_ohm, design.r0_ohm)))
        if design.matched.ndim > 1:  # phases of an SWR-only antenna lead
            failed_phases = (~design.matched).sum(axis=0)
            worst_in = np.where(design.matched, 1.0, design.swr_in).max(axis=0)
            failed = [f"{label} (at {failed_phases[i]} of {design.matched.shape[0]} phases of the antenna's unknown "
                      f"reflection, SWR up to {load_swr.max(axis=0)[i]:.1f} at its output and {worst_in[i]:.2f} at "
                      "its input there)" for i, label in enumerate(labels) if judged[i] and failed_phases[i]]
        else:
            bypassed = [design.arrangement.flat[i] == "bypass" for i in range(len(labels))]
            failed = [f"{label} (SWR {load_swr[i]:.1f} at its output, {swr_in_by_element[k][i]:.2f} at its input"
                      f"{', left in bypass' if bypassed[i] else ''})"
                      for i, label in enumerate(labels) if judged[i] and not design.matched[i]]
            if failed and all(bypassed[i] for i in rows if judged[i] and not design.matched[i]):
                warnings.append(f"{named('tuner', feed[k].label)} cannot match on {', '.join(failed)}; "
                                "the radio sees the line through the tuner in bypass there")
                continue
        if failed:
            warnings.append(f"{named('tuner', feed[k].label)} cannot match on {', '.join(failed)}; "
                            "solved at its closest setting")
    return warnings


def _port_swr(solution, feed, frequency_hz, swr_only):
    """SWR at each element's input and output against that element's own impedances.

    For an SWR-only antenna, the SWR of the phase-mean |rho| at each port.
    """
    swr_in, swr_out = [], []
    for k, element in enumerate(feed):
        z_in, z_out = element.port_z0_ohm(frequency_hz)
        for node, z0, out in ((k, z_in, swr_in), (k + 1, z_out, swr_out)):
            rho = reflection(solution.state_v[..., node, :], solution.state_i[..., node, :], z0)
            out.append(swr_from_rho(np.abs(rho).mean(axis=0) if swr_only else rho))
    return swr_in, swr_out


# Above this SWR at its port many solid-state radios begin to lower their power (common practice).
RADIO_SWR_WARNING = 2.0


def radio_warnings(station, drive: RadioDrive, swr_radio, swr_only):
    """A warning naming every row where the radio sees more than `RADIO_SWR_WARNING`, and every
    row where its reflected-power limit or its largest forward power cuts its power."""
    warnings = []
    high = [f"{label} ({swr:.2f})" for label, swr in zip(station.labels, swr_radio) if swr > RADIO_SWR_WARNING]
    if high:
        warnings.append(f"the radio sees more than {RADIO_SWR_WARNING:g}:1 on {', '.join(high)}: many solid-state "
                        "radios reduce their power near there (common practice); a tuner at the radio or a better "
                        "match at the antenna keeps the watts")
    phase_note = " (at some phases of the antenna's unknown reflection)" if swr_only else ""
    limits = []
    if station.radio_foldback_swr is not None:
        limits.append((drive.folded, f"its reflected-power limit above {station.radio_foldback_swr:g}:1"))
    if station.radio_max_power_w is not None:
        limits.append((drive.limited, f"its largest forward power, {station.radio_max_power_w:g} W,"))
    for mask, what in limits:
        rows = mask.any(axis=0) if swr_only else mask
        forward = drive.forward_w.min(axis=0) if swr_only else drive.forward_w
        cut = [f"{label} ({w:.1f} W forward)" for label, w, hit in zip(station.labels, forward, rows) if hit]
        if cut:
            warnings.append(f"the radio's power is cut by {what} on {', '.join(cut)}{phase_note}")
    return warnings


def range_warnings(feed, frequency_hz, labels):
    """A warning for every cable used outside the frequency span of its data."""
    warnings = []
    for element in feed:
        cable = element.cable
        if cable is None:
            continue
        low, high = cable.data_range_hz
        outside = [label for label, f in zip(labels, frequency_hz) if f < low or f > high]
        if outside:
            warnings.append(f"cable {cable.id} has data from {low / 1e6:g} to {high / 1e6:g} MHz; "
                            f"{', '.join(outside)} lie outside and are extrapolated by its loss model")
    return warnings


def _balance_warnings(feed):
    """A warning where a balanced line is fed from an unbalanced port with no balun, choke or
    balanced tuner between them (the radio's port is unbalanced)."""
    warnings, balanced, source = [], False, "the radio"
    for element in feed:
        cable = element.cable
        if element.kind == "line" and cable is not None:
            if cable.kind == "balanced" and not balanced:
                warnings.append(f"balanced line {element.label} is fed from the unbalanced port of {source} with no "
                                "balun, choke or balanced tuner between them: expect current on the outside of "
                                "the coax and a shack that is part of the antenna")
            balanced, source = cable.kind == "balanced", element.label
        elif element.kind in ("balun", "tuner"):
            balanced, source = bool(element.output_balanced), element.label
        elif element.kind == "choke":  # a common-mode choke is a 1:1 current balun
            balanced, source = True, element.label
    return warnings


def _element_notices(feed, frequency_hz, labels):
    """Warnings that elements raise about themselves (a weak choke, say)."""
    notices = []
    for element in feed:
        notices += element.notices(frequency_hz, labels)
    return notices


def _phase_mean_db(db_below_radio, weight):
    """dB below the radio of the phase-mean power, from per-phase dB (a log-sum-exp, so that
    powers far below the radio's average without underflowing). ``weight`` (phases, nf) is each
    phase's net power at the radio over its phase mean: a radio that holds its forward power
    puts a different net power into each phase of the load."""
    level = -db_below_radio / 10 + np.log10(weight)[:, None, :]  # log10 of P / mean P_radio, per phase
    top = level.max(axis=0)
    return -10 * (top + np.log10(np.mean(10 ** (level - top), axis=0)))


def _phase_mean(values, swr_only):
    """Average over the unknown-phase axis of an SWR-only antenna (a no-op otherwise)."""
    return values.mean(axis=0) if swr_only else values


def _difference_db(after_db, before_db):
    """after - before [dB]; undefined (NaN) where no power reaches either node (beyond a short)."""
    dead = np.isinf(after_db) & np.isinf(before_db)
    return np.where(dead, np.nan, after_db - np.where(dead, 0.0, before_db))


def _element_budgets(station, solution, designs, db_below_radio, dissipated_w, swr_in, swr_out, swr_only):
    """Each element's loss, heat, SWR at its ports, readings (a meter's, a tuner's setting) and
    stress (a line's or a tuner part's voltage and current), with the warnings of the stress."""
    f = station.frequency_hz

    def phase_mean(values):
        return _phase_mean(values, swr_only)

    elements, warnings = [], []
    for k, element in enumerate(station.feed):
        v_in, i_in = solution.voltage_v[..., k, :], solution.current_a[..., k, :]
        readings = element.readings(v_in, i_in, phase_mean, designs.get(k))
        if element.kind == "line":
            stress, warned = safety.line_stress(solution, k, element, f, station.labels, swr_only,
                                                station.duty_factor * station.transmit_fraction)
        elif k in designs:
            stress, warned = safety.tuner_stress(designs[k], v_in, i_in, element, station.labels, swr_only)
        else:
            stress, warned = {}, []
        warnings += warned
        elements.append(ElementBudget(
            kind=element.kind, label=element.label, loss_db=_difference_db(db_below_radio[k + 1], db_below_radio[k]),
            matched_loss_db=np.broadcast_to(element.matched_loss_db(f), np.shape(f)), dissipated_w=dissipated_w[k],
            swr_in=swr_in[k], swr_out=swr_out[k], readings={**readings, **stress}))
    return elements, warnings


def solve_budget(station: Station, *, far_field: bool = True) -> BudgetResult:
    """Solve the station's feed path at every requested frequency and split the losses.

    Stages: antenna reflection -> chain matrices -> path solution -> per-element shares ->
    matched, mismatch and total loss. For an SWR-only antenna every stage carries an extra
    leading axis of load phases; powers and dissipations are then averaged over it.

    Parameters
    ----------
    station : Station
    far_field : bool
        For a wire antenna, whether the engine also computes the far field for the peak gain
        that the exposure distances use. A band sweep, whose points report no exposure, leaves it
        out (it is a fifth of the engine's time over real ground); its exposure figures then use
        the station's stated ``gain``.

    Returns
    -------
    BudgetResult
    """
    f = np.asarray(station.frequency_hz, dtype=float)
    z_ref = station.reference_impedance_ohm
    swr_only = isinstance(station.antenna, SwrTable)  # the phase of the antenna is unknown
    work_size.check_station(station)

    gain_dbi, wire_facts = station.antenna_gain_dbi, {}
    if isinstance(station.antenna, WireAntenna):  # first: the impedance below is then cached
        model = wire_antenna.solve(station.antenna, f, pattern=far_field)
        if far_field:
            gain_dbi = model.peak_gain_dbi
        wire_facts = {"peak_gain_dbi": model.peak_gain_dbi, "wire_loss_db": model.wire_loss_db}
    measured_facts, measured_warnings = {}, []
    if isinstance(station.antenna, MeasuredAntenna):
        load, measured_facts, measured_warnings = measured_antenna_load(station, f)
        swr_only = isinstance(station.antenna.table, SwrTable)
        rho_antenna = load if swr_only else _antenna_rho(load, f, z_ref)
    else:
        rho_antenna = _antenna_rho(station.antenna, f, z_ref)
    abcd_list, designs = _chain_matrices(station.feed, f, rho_antenna, z_ref, station.tuner_set_at)
    try:
        solution = solve_path(abcd_list, rho_antenna, z_ref, station.radio_power_w)
    except NoNetPowerError as exc:
        rows = ", ".join(label for label, dead in zip(station.labels, exc.mask) if dead)
        raise BudgetError(f"the path accepts no net power on {rows}: a lossless path into a pure reactance, "
                          "a short or an open cannot take the radio's power", "antenna") from None

    rho_radio = reflection(solution.state_v[..., 0, :], solution.state_i[..., 0, :], z_ref)
    drive = radio_drive(np.abs(rho_radio), station.radio_power_w, station.radio_holds, station.radio_foldback_swr,
                        station.radio_max_power_w)
    solution = rescaled(solution, drive.net_w / station.radio_power_w)
    swr_in, swr_out = _port_swr(solution, station.feed, f, swr_only)
    power_w = _phase_mean(solution.power_w, swr_only)
    dissipated_w = _phase_mean(solution.dissipated_w, swr_only)
    if swr_only:
        db_below_radio = _phase_mean_db(solution.db_below_radio, drive.net_w / drive.net_w.mean(axis=0))
    else:
        db_below_radio = solution.db_below_radio

    elements, stress_warnings = _element_budgets(station, solution, designs, db_below_radio, dissipated_w,
                                                 swr_in, swr_out, swr_only)

    if station.feed:
        swr_antenna = elements[-1].swr_out
    else:
        swr_antenna = swr_from_rho(np.abs(rho_antenna).mean(axis=0) if swr_only else rho_antenna)
    power_radio, power_antenna = power_w[0], power_w[-1]
    forward_w, reflected_w = _phase_mean(drive.forward_w, swr_only), _phase_mean(drive.reflected_w, swr_only)
    held_w = forward_w if station.radio_holds == "forward" else np.full(np.shape(f), station.radio_power_w)
    swr_radio = swr_from_rho(np.abs(rho_radio).mean(axis=0)) if swr_only else swr_from_rho(rho_radio)
    if wire_facts:
        wire_facts["wire_heat_w"] = power_antenna * (1 - 10 ** (-wire_facts["wire_loss_db"] / 10))
    total_loss_db = db_below_radio[-1]
    matched_loss_db = sum((e.matched_loss_db for e in elements), np.zeros_like(f))
    loss_range = None
    if swr_only:
        per_phase = solution.db_below_radio[:, -1, :]
        loss_range = np.stack([per_phase.min(axis=0), per_phase.max(axis=0)], -1)

    return BudgetResult(
        station=station.name, reference_impedance_ohm=z_ref, radio_power_w=station.radio_power_w,
        labels=tuple(station.labels), frequency_hz=f,
        swr_antenna=swr_antenna,
        swr_radio=swr_radio,
        z_antenna_ohm=None if swr_only else _impedance(solution, -1),
        z_radio_ohm=None if swr_only else _impedance(solution, 0),
        matched_loss_db=matched_loss_db, mismatch_loss_db=total_loss_db - matched_loss_db,
        total_loss_db=total_loss_db, power_radio_w=power_radio, power_antenna_w=power_antenna,
        elements=tuple(elements), total_loss_db_range=loss_range,
        radio_forward_w=forward_w, radio_reflected_w=reflected_w,
        radio_mismatch_loss_db=port_mismatch_loss_db(held_w, _phase_mean(drive.net_w, swr_only)),
        radio_holds=station.radio_holds,
        warnings=tuple(list(station.input_warnings) + radio_warnings(station, drive, swr_radio, swr_only)
                       + range_warnings(station.feed, f, station.labels) + _balance_warnings(station.feed)
                       + _tuner_warnings(station.feed, designs, station.labels, swr_in, station.tuner_set_at)
                       + _element_notices(station.feed, f, station.labels) + stress_warnings
                       + (safety.gain_warnings(gain_dbi) if not wire_facts else []) + measured_warnings),
        measured=measured_facts,
        solution=solution,
        exposure=safety.exposure(f, power_antenna, station.duty_factor, station.transmit_fraction, gain_dbi),
        wire=wire_facts,
        mode=station.mode, duty_factor=station.duty_factor, transmit_fraction=station.transmit_fraction,
        antenna_gain_dbi=station.antenna_gain_dbi,
    )


def _impedance(solution, node):
    """Impedance V/I at a node [ohm]; infinite where no current flows (an open)."""
    voltage = solution.state_v[..., node, :]
    current = solution.state_i[..., node, :]
    open_circuit = current == 0
    return np.where(open_circuit, np.inf, voltage / np.where(open_circuit, 1.0, current))
