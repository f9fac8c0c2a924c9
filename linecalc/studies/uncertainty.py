"""Uncertainty carried through: the budget (and a measured feedpoint) solved for thousands of
drawn stations at once, each element at its drawn tolerances, and the spread of every figure.

An orchestrator over `linecalc.physics.tolerance` (the draws and the drawn chain matrices) and
the path solve of the budget; the draws lead every array, (draws, nf), and are solved in chunks
of bounded memory (`work_size`). A tuner is designed again for every draw: the operator tunes
the station that is really there.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from linecalc.physics import deembed
from linecalc.physics.cascade import NoNetPowerError, input_impedance, reflection, rescaled, solve_path, swr_from_rho
from linecalc.physics.loads import ImpedanceTable, MeasuredAntenna, SwrTable, rho_from_impedance
from linecalc.physics.small_parts import winding_resistance_ohm_per_m
from linecalc.physics.source import radio_drive
from linecalc.physics.tolerance import (Tolerances, disc, drawn_connector_abcd, drawn_line_abcd, drawn_winding_abcd,
                                        generator, uniform_factor)
from linecalc.physics.wire_antenna import WireAntenna
from linecalc.studies import work_size
from linecalc.studies.json_values import finite_or_none
from linecalc.studies.station import BudgetError, Station
from linecalc.elements.base import named

# The spread reported: the central 95 % of the draws (2.5th to 97.5th percentile) and the median.
COVERAGE = 0.95
PERCENTILES = (100 * (1 - COVERAGE) / 2, 50.0, 100 * (1 + COVERAGE) / 2)
# Draws are solved in chunks whose estimated memory (`work_size.estimate_bytes`) stays below this.
CHUNK_BYTES = 200_000_000
MAX_DRAWS = 1_000_000


class DrawsError(BudgetError):
    """A number of draws that cannot be used (under 2, or over `MAX_DRAWS`)."""


def _element_draws(element, k, tolerances, draws):
    """The drawn factors of element ``k`` (a dict), from generators keyed by what it is made of:
    the same cable (or part) at the same place draws the same loss and velocity factor in two
    alternatives (it is the same stock), while a line's length error is keyed by its length too
    (two lengths are two measurements with errors of their own)."""
    if element.kind == "line":
        rng = generator(tolerances.seed, "line", element.cable.id, k)
        length_rng = generator(tolerances.seed, "length", element.cable.id, k, repr(float(element.length_m)))
        return {"loss": uniform_factor(rng, *tolerances.cable_loss_percent, draws),
                "vf": rng.uniform(-tolerances.velocity_factor, tolerances.velocity_factor, (draws, 1)),
                "length": uniform_factor(length_rng, -tolerances.length_percent, tolerances.length_percent, draws)}
    if element.kind in ("connector", "choke", "balun"):
        rng = generator(tolerances.seed, element.kind, k)
        return {"loss": uniform_factor(rng, -tolerances.part_loss_percent, tolerances.part_loss_percent, draws)}
    return {}


def _drawn_abcd(element, frequency_hz, drawn, scaled):
    """The chain matrix of ``element`` at its drawn values (an element without tolerances as it is)."""
    if element.kind == "line":
        z0, gamma = element.cable.constants(frequency_hz)
        return drawn_line_abcd(z0, gamma, element.cable.velocity_factor, float(element.length_m), drawn["loss"],
                               drawn["vf"], drawn["length"], scaled)
    if element.kind == "connector":
        return drawn_connector_abcd(frequency_hz, element.loss_db * element.count, element.z_ref_ohm, drawn["loss"])
    if element.kind in ("choke", "balun"):
        ratio = element.impedance_ratio if element.kind == "balun" else None
        return drawn_winding_abcd(frequency_hz, element.z_ref_ohm, element.velocity_factor, element.length_m,
                                  drawn["r_ohm_per_m"], drawn["loss"], ratio)
    return element.scaled_abcd(frequency_hz) if scaled else element.abcd(frequency_hz)


def _antenna_z(station, frequency_hz, tolerances, draws, path_abcd):
    """The antenna impedance of every draw (draws, nf) [ohm]: a table or model within its tolerance,
    or a measurement with the instrument's error, de-embedded through the drawn path."""
    antenna = station.antenna
    rng = generator(tolerances.seed, "antenna")
    if isinstance(antenna, MeasuredAntenna):
        z_ref = station.reference_impedance_ohm
        rho = rho_from_impedance(antenna.table.impedance_at(frequency_hz), z_ref)
        rho = rho + disc(rng, tolerances.rho_error, (draws, np.size(frequency_hz)))
        z_measured = z_ref * (1 + rho) / (1 - rho)
        return deembed.deembed_impedance(path_abcd, z_measured)
    z = antenna.impedance_at(frequency_hz)
    p = tolerances.antenna_percent
    shape = (draws, np.size(frequency_hz))
    return z.real * (1 + rng.uniform(-p, p, shape) / 100) + 1j * z.imag * (1 + rng.uniform(-p, p, shape) / 100)


def _check(station, tolerances, what="the rows"):
    if isinstance(tolerances.draws, bool) or not isinstance(tolerances.draws, int) or \
            not 2 <= tolerances.draws <= MAX_DRAWS:
        raise DrawsError(f"draws: from 2 to {MAX_DRAWS:,}, got {tolerances.draws!r}", "feed")
    table = station.antenna.table if isinstance(station.antenna, MeasuredAntenna) else station.antenna
    if isinstance(table, SwrTable):
        raise BudgetError("the uncertainty run needs an antenna with an impedance (a table, a sweep or a wire "
                          "model): an SWR reading has no phase to draw around", "antenna")
    if isinstance(station.antenna, MeasuredAntenna):
        for element in station.feed[station.antenna.node:]:
            if element.adapts_to_load:
                raise BudgetError(f"{named('tuner', element.label)} sits between the measuring point and the antenna: the "
                                  "measurement cannot be moved through it", "antenna")


def draw_station(station: Station, tolerances: Tolerances, frequency_hz=None, budget=True):
    """Solve ``tolerances.draws`` drawn copies of the station at ``frequency_hz`` (default its rows).

    Returns a dict of (draws, nf) arrays: ``z_antenna_ohm`` always; with ``budget`` also
    ``power_antenna_w``, ``total_loss_db``, ``swr_antenna``, ``swr_radio``; and ``valid``, false
    for a draw whose antenna comes out active (a measurement de-embedded through a drawn path
    that does not fit it) or whose tuner cannot match it, left out of every spread.
    """
    _check(station, tolerances)
    f = np.asarray(station.frequency_hz if frequency_hz is None else frequency_hz, dtype=float)
    kinds = [element.kind for element in station.feed]
    # held for every draw at once: the antenna of each draw (de-embedded through the measurement
    # path, one array per element there) and the results; the path itself is solved in chunks
    held = [e.kind for e in station.feed[station.antenna.node:]] if isinstance(station.antenna, MeasuredAntenna) else []
    work_size.check_work(held + ["results"], tolerances.draws * f.size,
                         f"{tolerances.draws:,} draws x {f.size:,} frequencies")
    work_size.check_work(kinds, f.size, "one draw")
    per_draw = work_size.estimate_bytes(kinds, f.size)
    chunk = max(1, int(CHUNK_BYTES // per_draw))
    drawn = [_element_draws(e, k, tolerances, tolerances.draws) for k, e in enumerate(station.feed)]
    for element, d in zip(station.feed, drawn):  # a winding's resistance for its nominal loss, solved once
        if element.kind in ("choke", "balun"):
            d["r_ohm_per_m"] = np.broadcast_to(winding_resistance_ohm_per_m(
                f, element.z_ref_ohm, element.velocity_factor, element.length_m, element.loss_db), (1, f.size))
    z_all = _antenna_z(station, f, tolerances, tolerances.draws, _measurement_path(station, f, drawn))
    parts = []
    for start in range(0, tolerances.draws, chunk):
        rows = slice(start, min(start + chunk, tolerances.draws))
        parts.append(_solve_chunk(station, f, [{key: v if key == "r_ohm_per_m" else v[rows] for key, v in d.items()}
                                               for d in drawn], z_all[rows], budget))
    result = {key: np.concatenate([p[key] for p in parts]) for key in parts[0]}
    result["z_antenna_ohm"] = z_all
    result["valid"] = np.isfinite(z_all) & (z_all.real >= 0) & result.pop("solved", True)
    return result


def _measurement_path(station, f, drawn):
    """The drawn chain matrices from the measuring point to the antenna (empty unless measured)."""
    if not isinstance(station.antenna, MeasuredAntenna):
        return []
    node = station.antenna.node
    return [_drawn_abcd(e, f, d, scaled=False) for e, d in zip(station.feed[node:], drawn[node:])]


def _solve_chunk(station, f, drawn, z_antenna, budget):
    if not budget:
        return {}
    z_ref = station.reference_impedance_ohm
    valid = np.isfinite(z_antenna) & (z_antenna.real >= 0)
    z_antenna = np.where(valid, z_antenna, z_ref)  # an active draw is solved into the reference, then left out
    rho_antenna = rho_from_impedance(z_antenna, z_ref)
    feed = station.feed
    abcd_list = [None if e.adapts_to_load else _drawn_abcd(e, f, d, scaled=True) for e, d in zip(feed, drawn)]
    tuners = [k for k, e in enumerate(feed) if e.adapts_to_load]
    if len(tuners) == 1 and feed[tuners[0]].network in FAST_NETWORKS:
        return _solve_with_fast_tuner(station, f, abcd_list, tuners[0], rho_antenna, valid)
    for k in reversed(range(len(feed))):
        if abcd_list[k] is None:
            z_load = input_impedance(abcd_list[k + 1:], rho_antenna, z_ref)
            if not np.all(np.isfinite(z_load) & (z_load.real > 0)):
                raise BudgetError(f"{named('tuner', feed[k].label)} sees a load with no resistance in some draws: there is "
                                  "nothing to match", "antenna")
            abcd_list[k] = feed[k].design(f, z_load).abcd
    try:
        solution = solve_path(abcd_list, rho_antenna, z_ref, station.radio_power_w)
    except NoNetPowerError:
        raise BudgetError("the path accepts no net power in some draws", "antenna") from None
    rho_radio = reflection(solution.state_v[..., 0, :], solution.state_i[..., 0, :], z_ref)
    drive = radio_drive(np.abs(rho_radio), station.radio_power_w, station.radio_holds, station.radio_foldback_swr,
                        station.radio_max_power_w)
    solution = rescaled(solution, drive.net_w / station.radio_power_w)
    if feed:
        z_out = feed[-1].port_z0_ohm(f)[1]
        rho_end = reflection(solution.state_v[..., -1, :], solution.state_i[..., -1, :], z_out)
    else:
        rho_end = rho_antenna
    return {"power_antenna_w": solution.power_w[..., -1, :], "total_loss_db": solution.db_below_radio[..., -1, :],
            "swr_antenna": swr_from_rho(rho_end), "swr_radio": swr_from_rho(rho_radio),
            "solved": np.ones(rho_radio.shape, bool)}


# Networks whose least-loss match has a fast twin (`physics.matching_fast`): the uncertainty run
# solves a station with one such tuner from its least loss rather than its full design.
FAST_NETWORKS = ("T", "L")


def _solve_with_fast_tuner(station, f, abcd_list, k, rho_antenna, valid):
    """The drawn path with one L or T tuner at ``k``, matched at its least loss in every draw.

    A matched tuner presents its reference resistance at its input, so the path before it is
    solved into R0 and the path after it for its share of the power; the tuner loses
    10 log10(P_in / P_load) of `physics.matching_fast` (within 1e-3 dB of the full design).
    A draw the tuner cannot match is left out (``solved`` false): the full design would leave it
    at its closest setting, which this run does not model.
    """
    from linecalc.physics.matching_fast import l_network_least_loss, t_network_least_loss

    z_ref, tuner = station.reference_impedance_ohm, station.feed[k]
    before, after = abcd_list[:k], abcd_list[k + 1:]
    z_load = input_impedance(after, rho_antenna, z_ref)
    usable = valid & np.isfinite(z_load) & (z_load.real > 0)
    z_load = np.where(usable, z_load, z_ref)
    least = t_network_least_loss if tuner.network == "T" else l_network_least_loss
    tuner_loss_db, matched = least(f, z_load, tuner.z_ref_ohm, tuner.parts)[:2]
    matched = matched & usable
    tuner_loss_db = np.where(matched, tuner_loss_db, 0.0)
    try:
        if after:
            beyond = solve_path(after, rho_antenna, z_ref, 1.0)
            share_db, rho_end = beyond.db_below_radio[..., -1, :], reflection(
                beyond.state_v[..., -1, :], beyond.state_i[..., -1, :], station.feed[-1].port_z0_ohm(f)[1])
        else:
            share_db, rho_end = np.zeros(z_load.shape), rho_antenna
        matched_input = np.zeros(z_load.shape, complex)  # the tuner's input: its reference resistance
        if before:
            ahead = solve_path(before, matched_input, tuner.z_ref_ohm, station.radio_power_w)
            rho_radio = reflection(ahead.state_v[..., 0, :], ahead.state_i[..., 0, :], z_ref)
            ahead_db = ahead.db_below_radio[..., -1, :]
        else:
            rho_radio, ahead_db = matched_input, np.zeros(z_load.shape)
    except NoNetPowerError:
        raise BudgetError("the path accepts no net power in some draws", "antenna") from None
    drive = radio_drive(np.abs(rho_radio), station.radio_power_w, station.radio_holds, station.radio_foldback_swr,
                        station.radio_max_power_w)
    total_db = ahead_db + tuner_loss_db + share_db
    return {"power_antenna_w": drive.net_w * 10 ** (-total_db / 10), "total_loss_db": total_db,
            "swr_antenna": swr_from_rho(rho_end), "swr_radio": swr_from_rho(rho_radio), "solved": matched}


def spread(values, valid):
    """Per column: (2.5th percentile, median, 97.5th percentile) and the standard deviation over the
    valid draws; NaN where no draw is valid."""
    if valid.all():  # the usual case, in one call
        return tuple(np.percentile(values, PERCENTILES, axis=0)), values.std(axis=0)
    percentiles = np.full((3,) + values.shape[1:], np.nan)
    std = np.full(values.shape[1:], np.nan)
    for j in range(values.shape[1]):
        kept = values[valid[:, j], j]
        if kept.size:
            percentiles[:, j] = np.percentile(kept, PERCENTILES)
            std[j] = kept.std()
    return tuple(percentiles), std


def _figure(values, valid, nominal):
    (low, median, high), std = spread(values, valid)
    return {"nominal": nominal, "low": low, "median": median, "high": high, "std": std}


FIGURES = ("power_antenna_w", "total_loss_db", "swr_antenna", "swr_radio")


@dataclass(frozen=True)
class BudgetSpread:
    """Per row and figure: the nominal value (the plain budget's), and over the valid draws the
    2.5th percentile, median, 97.5th percentile and standard deviation. ``invalid`` counts the
    draws left out per row."""

    labels: tuple
    tolerances: Tolerances
    figures: dict  # name -> {"nominal", "low", "median", "high", "std"}, each (nf,)
    invalid: np.ndarray
    measured: bool

    def to_dict(self) -> dict:
        """The ``uncertainty`` object of the budget document (docs/json.md)."""
        rows = []
        for i, label in enumerate(self.labels):
            row = {"label": label, "draws_left_out": int(self.invalid[i])}
            for name, figure in self.figures.items():
                row[name] = {key: finite_or_none(values[i]) for key, values in figure.items()}
            rows.append(row)
        return {"tolerances": self.tolerances.to_dict(), "coverage": COVERAGE, "rows": rows}


def budget_spread(station: Station, result, tolerances: Tolerances) -> BudgetSpread:
    """The spread of the budget's figures over the drawn stations; ``result`` is its plain budget."""
    drawn = draw_station(station, tolerances)
    valid = drawn["valid"]
    nominal = {"power_antenna_w": result.power_antenna_w, "total_loss_db": result.total_loss_db,
               "swr_antenna": result.swr_antenna, "swr_radio": result.swr_radio}
    figures = {name: _figure(drawn[name], valid, nominal[name]) for name in FIGURES}
    measured = isinstance(station.antenna, MeasuredAntenna)
    if measured:
        z = drawn["z_antenna_ohm"]
        figures["z_antenna_r_ohm"] = _figure(z.real, valid, result.z_antenna_ohm.real)
        figures["z_antenna_x_ohm"] = _figure(z.imag, valid, result.z_antenna_ohm.imag)
    return BudgetSpread(tuple(station.labels), tolerances, figures, (~valid).sum(axis=0), measured)


def spread_warnings(spread_result: BudgetSpread) -> list[str]:
    """A warning for the rows where draws were left out (an active antenna, an unmatched tuner)."""
    left = [f"{label} ({n} of {spread_result.tolerances.draws})" for label, n
            in zip(spread_result.labels, spread_result.invalid) if n]
    if not left:
        return []
    return [f"the uncertainty run left out draws on {', '.join(left)}: a de-embedded antenna that comes out "
            "active (|rho| > 1: the measurement does not fit the path at those drawn values) or a tuner that "
            "cannot match; the spread is of the others"]


TOO_CLOSE = "too close to call"


@dataclass(frozen=True)
class CompareSpread:
    """The comparison over drawn stations. Per row: the margin of the winner over the runner-up in
    every draw (both alternatives drawn with the same antenna, a shared cable or part with the same
    loss and velocity factor, each length with its own error) as its 2.5th percentile, median and 97.5th percentile [dB], the share of draws the
    winner wins, and the verdict: the winner only where it wins in at least 97.5 % of the draws
    (the margin's 2.5th percentile above zero), else `TOO_CLOSE`. ``power`` holds each
    alternative's watts at the antenna as (low, median, high), each (alternatives, rows)."""

    names: tuple
    labels: tuple
    tolerances: Tolerances
    leader: np.ndarray
    runner_up: np.ndarray
    power: tuple
    margin: tuple
    wins_share: np.ndarray
    verdict: tuple

    def to_dict(self) -> dict:
        """The ``uncertainty`` object of the compare document (docs/json.md)."""
        low, median, high = self.power
        margin_low, margin_median, margin_high = self.margin
        return {"tolerances": self.tolerances.to_dict(), "coverage": COVERAGE, "rows": [
            {"label": label, "verdict": self.verdict[i], "leader": self.names[self.leader[i]],
             "runner_up": self.names[self.runner_up[i]],
             "margin_db": {"low": finite_or_none(margin_low[i]), "median": finite_or_none(margin_median[i]),
                           "high": finite_or_none(margin_high[i])},
             "wins_share": finite_or_none(self.wins_share[i]),
             "power_antenna_w": [{"name": name, "low": finite_or_none(low[k, i]),
                                  "median": finite_or_none(median[k, i]), "high": finite_or_none(high[k, i])}
                                 for k, name in enumerate(self.names)]}
            for i, label in enumerate(self.labels)]}


def compare_spread(comparison, alternatives, tolerances: Tolerances) -> CompareSpread:
    """Every alternative drawn with the same seed; the winner's margin over the runner-up per draw."""
    drawn = [draw_station(alternative.station, tolerances) for alternative in alternatives]
    power = np.stack([d["power_antenna_w"] for d in drawn])  # (alternatives, draws, rows)
    valid = np.stack([d["valid"] for d in drawn])
    order = np.argsort(-comparison.power_antenna_w, axis=0, kind="stable")
    winner, runner_up = order[0], order[1]
    rows = power.shape[2]
    margin = np.full((3, rows), np.nan)
    wins = np.full(rows, np.nan)
    verdict = []
    for i in range(rows):
        best, second = power[winner[i], :, i], power[runner_up[i], :, i]
        kept = valid[winner[i], :, i] & valid[runner_up[i], :, i] & (best > 0) & (second > 0)
        if kept.any():
            margin_db = 10 * np.log10(best[kept] / second[kept])
            margin[:, i] = np.percentile(margin_db, PERCENTILES)
            wins[i] = np.mean(margin_db > 0)
        verdict.append(comparison.names[winner[i]] if margin[0, i] > 0 else TOO_CLOSE)
    percentiles = np.full((3,) + comparison.power_antenna_w.shape, np.nan)
    for k in range(len(alternatives)):
        (low, median, high), _ = spread(power[k], valid[k])
        percentiles[:, k] = low, median, high
    return CompareSpread(tuple(comparison.names), tuple(comparison.labels), tolerances, winner, runner_up,
                         tuple(percentiles),
                         tuple(margin), wins, tuple(verdict))


@dataclass(frozen=True)
class FeedpointSpread:
    """A measured sweep moved to the feedpoint over drawn stations: per sweep point the recovered
    R, X [ohm] and SWR as {nominal, low, median, high, std}, and the draws left out (active)."""

    tolerances: Tolerances
    figures: dict
    invalid: np.ndarray

    def to_dict(self) -> dict:
        """The ``uncertainty`` object of the feedpoint document (docs/json.md)."""
        return {"tolerances": self.tolerances.to_dict(), "coverage": COVERAGE, "points": [
            {"draws_left_out": int(self.invalid[i]),
             **{name: {key: finite_or_none(values[i]) for key, values in figure.items()}
                for name, figure in self.figures.items()}}
            for i in range(self.invalid.size)]}


def feedpoint_spread(station: Station, result, tolerances: Tolerances) -> FeedpointSpread:
    """The spread of the recovered feedpoint over the drawn stations; ``result`` is the plain
    `FeedpointResult`. The SWR is against the feeding element's nominal impedance, as there."""
    f = result.frequency_hz
    drawn = draw_station(station, tolerances, frequency_hz=f, budget=False)
    z, valid = drawn["z_antenna_ohm"], drawn["valid"]
    z0 = station.feed[-1].port_z0_ohm(f)[1] if station.feed else np.full(f.shape, station.reference_impedance_ohm)
    swr = swr_from_rho(np.where(valid, (z - z0) / np.where(valid, z + z0, 1.0), 0.0))
    nominal = result.sweep.z_antenna_ohm
    figures = {"r_ohm": _figure(z.real, valid, nominal.real), "x_ohm": _figure(z.imag, valid, nominal.imag),
               "swr_antenna": _figure(swr, valid, result.sweep.swr_antenna)}
    return FeedpointSpread(tolerances, figures, (~valid).sum(axis=0))
