"""``--explain``: the reasoning behind a budget, a safety report or a comparison, in plain words.

A study over results already solved: it reads a `BudgetResult` (or a `Comparison`) and returns
`Explanation` entries, one per row and topic, or per group of rows where the text is the same.
Every number in a text is a figure of that same result (or of the station's own comparison, for
what would deliver more), rounded as its table rounds it, and each entry's ``figures`` holds those
numbers at full precision. The sentences are the named templates of `explain_templates`.

Topics (in this order on a row):

- ``compare``: which alternative wins the row, and by how much (``compare`` only).
- ``swr``: the SWR at the radio against the antenna's, through a path without a tuner.
- ``tuner``: what each tuner fixes (the radio's SWR) and what it does not (the line's).
- ``alternative``: the tuner at the other end of the main line, or another cable or length from
  the station's ``compare:`` key, that would put more watts on the antenna.
- ``radio``: the radio holding its forward power into a mismatch, folding back, or capped.
- ``watts``: where the watts go: the largest heat sinks, and what the standing waves add.
- ``safety``: the largest line or tuner voltage, with the caution, and the exposure distances.
"""
from __future__ import annotations

import dataclasses
from dataclasses import dataclass

import numpy as np

from linecalc.physics.cascade import swr_from_rho
from linecalc.physics.source import rho_from_swr
from linecalc.studies import explain_templates as t
from linecalc.studies.budget import RADIO_SWR_WARNING, BudgetResult
from linecalc.studies.compare import CompareError, Comparison, alternatives_from_spec, compare, main_line_index
from linecalc.studies.json_values import json_value
from linecalc.studies.number_text import db_text, watts_text
from linecalc.studies.station import BudgetError, CompareSpec, Station

TOPICS = ("compare", "swr", "tuner", "alternative", "radio", "watts", "safety")

# |rho| at the radio may differ from |rho_antenna| 10^(-ML/10) by this much and still be told as
# the loss of the reflected wave: the closed form takes every impedance as real, and a lossy
# coax's Z0 (50.5-j0.6 ohm for a 50-ohm cable at HF) moves |rho| by up to about 0.01. A larger
# difference means the path's impedances transform the load (a 450-ohm line read against 50 ohm).
CLOSED_FORM_RHO_TOLERANCE = 0.02
# Where even an open or a short at the antenna would read no more than this SWR at the radio, the
# line hides the antenna: a 3:1 ceiling is 3 dB of matched loss (common practice: a reading
# below 3:1 through such a line is no sign of a good antenna).
HIDDEN_SWR = 3.0
# A gain under this is hard to notice on the air (common practice: about 1 dB is the smallest
# change in signal strength a listener notices; an S unit is about 6 dB).
NOTICEABLE_DB = 1.0
# Above this peak voltage a spark can cross a small gap in air: the minimum of Paschen's curve
# for air, about 327 V (Paschen's law, in any gas-discharge text; from memory). Below it the
# danger named is the RF burn on contact.
ARC_VOLTAGE_PEAK_V = 327.0
# The heat sinks named, largest first.
MAX_SINKS = 3


@dataclass(frozen=True)
class Explanation:
    """One paragraph: the rows it speaks for (labels), its topic, its text and its numbers."""

    rows: tuple[str, ...]
    topic: str
    text: str
    figures: dict

    def to_dict(self) -> dict:
        """One entry of a document's ``explanations`` (docs/json.md)."""
        return {"row": ", ".join(self.rows), "rows": list(self.rows), "topic": self.topic, "text": self.text,
                "figures": {key: _figure_json(value) for key, value in self.figures.items()}}


def _figure_json(value):
    """A figure as JSON: a number (null where infinite), or a list of {label, number} objects."""
    if isinstance(value, list):
        return [{key: v if isinstance(v, str) else json_value(v) for key, v in item.items()} for item in value]
    return json_value(value)


def _paragraph(parts):
    """The text and the figures of a topic from its (template, figures) sentences."""
    text = " ".join(t.sentence(template, **figures) for template, figures in parts)
    merged = {}
    for _, figures in parts:
        merged.update({key: value for key, value in figures.items() if not isinstance(value, str)})
    return text, merged


def _tuner_name(label):
    """How a sentence names a tuner: by its label where that already says tuner, else 'tuner LABEL'."""
    return t.sentence(t.TUNER_NAMED if "tuner" in label.lower() else t.TUNER_UNNAMED, label=label)


def _swr(result: BudgetResult, i):
    """The SWR at the radio against the antenna's, for a path of lines and parts with no tuner."""
    kinds = [e.kind for e in result.elements]
    swr_a, swr_r, ml = float(result.swr_antenna[i]), float(result.swr_radio[i]), float(result.matched_loss_db[i])
    if "tuner" in kinds or "line" not in kinds or not (np.isfinite(swr_a) and np.isfinite(swr_r)):
        return None
    rho_a, rho_r = float(rho_from_swr(swr_a)), float(rho_from_swr(swr_r))
    through = 10 ** (-ml / 10)  # what the two crossings of the matched loss leave of |rho|
    if abs(rho_r - rho_a * through) > CLOSED_FORM_RHO_TOLERANCE:
        parts = [(t.SWR_TRANSFORMED, {"swr_antenna": swr_a, "swr_radio": swr_r, "matched_loss_db": ml,
                                      "reference_impedance_ohm": result.reference_impedance_ohm})]
    else:
        parts = [(t.SWR_THROUGH_LOSS, {"swr_antenna": swr_a, "rho_antenna": rho_a, "swr_radio": swr_r,
                                       "rho_radio": rho_r, "matched_loss_db": ml, "two_way_loss_db": 2 * ml})]
        most = float(swr_from_rho(through))  # an open or a short at the antenna: |rho| 1 there
        if most <= HIDDEN_SWR:
            parts.append((t.SWR_HIDDEN, {"swr_radio_ceiling": most}))
    if result.total_loss_db_range is not None:
        parts.append((t.SWR_PHASE_AVERAGE, {}))
    return _paragraph(parts)


def _tuner(result: BudgetResult, i):
    """Each tuner: the radio's SWR it fixes, the line's it leaves, its own loss."""
    parts = []
    for k, e in enumerate(result.elements):
        if e.kind != "tuner":
            continue
        r = e.readings
        matched = r["matched_share"][i] == 1 if "matched_share" in r else bool(r["matched"][i])
        common = {"tuner": _tuner_name(e.label), "swr_radio": float(result.swr_radio[i])}
        if not matched:
            parts.append((t.TUNER_CANNOT_MATCH, common))
            continue
        after = [m for m in range(k + 1, len(result.elements)) if result.elements[m].kind == "line"]
        before = [m for m in range(k) if result.elements[m].kind == "line"]
        if after or before:
            m = max(after or before, key=lambda m: result.elements[m].loss_db[i])
            line = result.elements[m]
            figures = {**common, "line_label": line.label, "swr_line": float(line.swr_out[i]),
                       "line_loss_db": float(line.loss_db[i]), "line_matched_loss_db": float(line.matched_loss_db[i])}
            parts.append((t.TUNER_BEFORE_LINE if after else t.TUNER_AFTER_LINE, figures))
        else:
            parts.append((t.TUNER_ALONE, common))
        parts.append((t.TUNER_OWN_LOSS, {"tuner_loss_db": float(e.loss_db[i]), "tuner_heat_w": float(e.dissipated_w[i])}))
    return _paragraph(parts) if parts else None


def _radio(result: BudgetResult, i):
    """What the mismatch at its port costs the radio: forward power held, folded back or capped."""
    setting = result.radio_power_w
    forward, reflected = float(result.radio_forward_w[i]), float(result.radio_reflected_w[i])
    net = float(result.power_radio_w[i])
    figures = {"swr_radio": float(result.swr_radio[i]), "radio_setting_w": setting, "radio_forward_w": forward,
               "radio_reflected_w": reflected, "power_radio_w": net, "radio_cost_w": setting - net,
               "radio_mismatch_loss_db": float(result.radio_mismatch_loss_db[i])}
    if result.radio_holds == "forward":
        if watts_text(forward) != watts_text(setting):
            parts = [(t.RADIO_FOLDS_BACK, figures)]
        elif watts_text(reflected) != watts_text(0.0):
            parts = [(t.RADIO_HOLDS_FORWARD, {k: v for k, v in figures.items()
                                              if k not in ("radio_setting_w", "radio_cost_w")})]
        else:
            return None
        if all(e.kind != "tuner" for e in result.elements) and figures["swr_radio"] > RADIO_SWR_WARNING:
            parts.append((t.RADIO_FIX, {}))
        return _paragraph(parts)
    if watts_text(net) != watts_text(setting):
        return _paragraph([(t.RADIO_NET_CAPPED, {k: figures[k] for k in (
            "radio_forward_w", "power_radio_w", "radio_cost_w", "radio_setting_w")})])
    return None


def _watts(result: BudgetResult, i):
    """Where the radio's net watts go: the antenna, the largest heat sinks, the standing waves' share."""
    if not result.elements:
        return None
    p_radio, p_antenna = float(result.power_radio_w[i]), float(result.power_antenna_w[i])
    ml, mismatch = float(result.matched_loss_db[i]), float(result.mismatch_loss_db[i])
    if not (p_radio > 0 and np.all(np.isfinite([p_antenna, ml, mismatch]))):
        return None  # no net power into the path, or a loss beyond a short: no split to tell
    heat = p_radio - p_antenna
    ranked = sorted(result.elements, key=lambda e: -e.dissipated_w[i])[:MAX_SINKS]
    sinks = [e for e in ranked if watts_text(e.dissipated_w[i]) != watts_text(0.0)] or ranked[:1]
    named = [t.sentence(t.WATTS_SINK, label=e.label, dissipated_w=float(e.dissipated_w[i])) for e in sinks]
    sink_text = named[0] if len(named) == 1 else t.sentence(t.WATTS_LAST_SINK, sinks=", ".join(named[:-1]),
                                                            last=named[-1])
    split = {"power_radio_w": p_radio, "power_antenna_w": p_antenna, "heat_w": heat, "sinks": sink_text}
    if db_text(mismatch) == db_text(0.0):
        rest = (t.WATTS_MATCHED, {"matched_loss_db": ml})
    elif mismatch > 0:
        standing = p_radio * 10 ** (-ml / 10) - p_antenna  # heat above what a matched path would make
        tuned = any(e.kind == "tuner" for e in result.elements)
        rest = (t.WATTS_MISMATCH_TUNED if tuned else t.WATTS_STANDING_WAVES, {"mismatch_loss_db": mismatch, "matched_loss_db": ml,
                                         "standing_wave_heat_w": standing,
                                         "standing_wave_share_pct": 100 * standing / heat})
    else:
        rest = (t.WATTS_STANDING_WAVES_LESS, {"mismatch_loss_db_below": -mismatch, "matched_loss_db": ml})
    text, figures = _paragraph([(t.WATTS_SPLIT, split), rest])
    figures["sinks"] = [{"label": e.label, "dissipated_w": float(e.dissipated_w[i])} for e in sinks]
    return text, figures


def _safety(result: BudgetResult, i):
    """The largest voltage on a line or across a tuner part, with its caution; the exposure distances."""
    parts = []
    candidates = []  # (peak volts, template, figures)
    for e in result.elements:
        r = e.readings
        if e.kind == "line" and "voltage_max_peak_v" in r:
            at_m = float(r["voltage_max_at_m"][i])
            at_start = t.sentence("{at_m}", at_m=at_m) == t.sentence("{at_m}", at_m=0.0)
            candidates.append((float(r["voltage_max_peak_v"][i]),
                               *((t.SAFETY_LINE_VOLTAGE_AT_RADIO_END, {"label": e.label}) if at_start else
                                 (t.SAFETY_LINE_VOLTAGE, {"label": e.label, "at_m": at_m}))))
        for key in r:
            if e.kind == "tuner" and key.endswith("_voltage_peak_v"):
                part = key[:-len("_voltage_peak_v")]
                candidates.append((float(r[key][i]), t.SAFETY_TUNER_VOLTAGE,
                                   {"tuner": _tuner_name(e.label), "part": part.replace("_", " ")}))
    candidates = [c for c in candidates if np.isfinite(c[0])]
    if candidates:
        volts, template, where = max(candidates, key=lambda c: c[0])
        danger = t.DANGER_ARC if volts > ARC_VOLTAGE_PEAK_V else t.DANGER_BURN
        parts.append((template, {"voltage_peak_v": volts, "radio_setting_w": result.radio_power_w, "danger": danger,
                                 **where}))
    x = result.exposure
    keys = ("fcc_uncontrolled_m", "icnirp_general_public_m")
    if all(key in x and np.isfinite(x[key][i]) for key in keys):
        parts.append((t.SAFETY_EXPOSURE, {"power_average_w": float(x["power_average_w"][i]),
                                          **{key: float(x[key][i]) for key in keys}}))
        near = float(x["near_field_m"][i])
        if min(float(x[key][i]) for key in keys) < near:
            parts.append((t.SAFETY_NEAR_FIELD, {"near_field_m": near}))
    return _paragraph(parts) if parts else None


def _grouped(per_row, labels):
    """Explanations from {(row, topic): (text, figures)}: rows of one topic with the same text are
    one entry (the figures of its first row), ordered by first row, then topic."""
    groups = {}
    for (i, topic), (text, figures) in sorted(per_row.items(), key=lambda item: (item[0][0], TOPICS.index(item[0][1]))):
        key = (topic, text)
        if key in groups:
            groups[key][0].append(labels[i])
        else:
            groups[key] = ([labels[i]], figures)
    return tuple(Explanation(tuple(rows), topic, text, figures) for (topic, text), (rows, figures) in groups.items())


@dataclass(frozen=True)
class OwnAlternatives:
    """The station's own comparison, solved for ``explain_budget``: what ``linecalc compare``
    gives for the station (its ``compare:`` key), with the tuner at either end of the main line
    for a station with one tuner (as ``--tuner-positions``). ``kinds`` per alternative:
    ("built",), ("cable", line label, cable id), ("tuner", "radio" or "antenna" end, line label) or
    ("length", line label, m)."""

    comparison: Comparison
    kinds: tuple[tuple, ...]


def own_alternatives(station: Station) -> OwnAlternatives | None:
    """Solve the alternatives a budget's explanation may point to; None where there are none.

    The alternatives of `compare.alternatives_from_spec` for the station's ``compare:`` key with
    ``tuner_positions`` set when the feed has exactly one tuner: as built, each cable, the tuner
    moved, each length, in that order.
    """
    spec = station.compare or CompareSpec()
    one_tuner = sum(e.kind == "tuner" for e in station.feed) == 1
    spec = dataclasses.replace(spec, tuner_positions=spec.tuner_positions or one_tuner)
    try:
        alternatives = alternatives_from_spec(station, spec)
        comparison = compare(station, alternatives)
    except (CompareError, BudgetError):  # nothing to compare, or an alternative that cannot be solved:
        return None                       # the budget is still explained, without this topic
    line_label = station.feed[main_line_index(station.feed, spec.main_line)].label
    varied = station.feed[main_line_index(station.feed, spec.line or spec.main_line)].label
    n_moved = len(alternatives) - 1 - len(spec.cables) - len(spec.lengths_m)
    kinds = ([("built",)] + [("cable", line_label, cable_id) for cable_id, _ in spec.cables]
             + [("tuner", _tuner_end(a.station, line_label), line_label)
                for a in alternatives[1 + len(spec.cables):1 + len(spec.cables) + n_moved]]
             + [("length", varied, float(length)) for length in spec.lengths_m])
    return OwnAlternatives(comparison, tuple(kinds))


def _tuner_end(station: Station, line_label):
    """Which end of the line ``line_label`` the feed's tuner sits at: "radio" or "antenna"."""
    kinds = [e.kind for e in station.feed]
    line = next(k for k, e in enumerate(station.feed) if e.kind == "line" and e.label == line_label)
    return "radio" if kinds.index("tuner") < line else "antenna"


def _alternative(own: OwnAlternatives | None, i):
    """What would put more watts on the antenna than the station as built, where its comparison
    says so: its winner is another alternative, whose watts print higher than the station's."""
    if own is None or own.comparison.winner[i] == 0:
        return None
    w = int(own.comparison.winner[i])
    better, built = float(own.comparison.power_antenna_w[w, i]), float(own.comparison.power_antenna_w[0, i])
    if watts_text(better) == watts_text(built):  # a win below the table's 0.1 W is no win to tell
        return None
    figures = {"power_better_w": better, "power_antenna_w": built,
               "gain_db": 10 * np.log10(better / built) if built > 0 else np.inf}
    kind = own.kinds[w]
    if kind[0] == "tuner":
        parts = [(t.ALTERNATIVE_TUNER, {"end": kind[1], "line_label": kind[2], **figures})]
    elif kind[0] == "cable":
        parts = [(t.ALTERNATIVE_CABLE, {"line_label": kind[1], "cable_id": kind[2], **figures})]
    else:
        parts = [(t.ALTERNATIVE_LENGTH, {"line_label": kind[1], "length_m": kind[2], **figures})]
    return _paragraph(parts + _small(figures["gain_db"]))


def _small(gain_db):
    """The note that a gain is too small to notice on the air, where it is."""
    return [(t.SMALL_DIFFERENCE, {"noticeable_limit_db": NOTICEABLE_DB})] if gain_db < NOTICEABLE_DB else []


def explain_budget(result: BudgetResult, own: OwnAlternatives | None = None) -> tuple[Explanation, ...]:
    """The budget's explanations: swr, tuner, alternative (from ``own``), radio and watts topics."""
    per_row = {}
    for i in range(len(result.labels)):
        for topic, made in (("swr", _swr(result, i)), ("tuner", _tuner(result, i)),
                            ("alternative", _alternative(own, i)), ("radio", _radio(result, i)),
                            ("watts", _watts(result, i))):
            if made is not None:
                per_row[(i, topic)] = made
    return _grouped(per_row, result.labels)


def explain_safety(result: BudgetResult) -> tuple[Explanation, ...]:
    """The safety report's explanations: one safety topic per row."""
    per_row = {(i, "safety"): made for i in range(len(result.labels)) if (made := _safety(result, i)) is not None}
    return _grouped(per_row, result.labels)


def _compare_row(comparison: Comparison, i):
    """Which alternative wins row ``i`` against the station as built (alternative 0); each named
    with its number in the table, [1] for the first."""
    power = comparison.power_antenna_w[:, i]
    order = np.argsort(-power, kind="stable")
    w, built = int(comparison.winner[i]), float(power[0])
    if w != 0 and watts_text(power[w]) == watts_text(built):
        parts = [(t.COMPARE_TIE, {"power_as_built_w": built})]
    elif w != 0:
        winner = float(power[w])
        gain_db = 10 * np.log10(winner / built) if built > 0 else np.inf
        parts = [(t.COMPARE_OTHER_WINS, {"index": str(w + 1), "winner": comparison.names[w], "power_winner_w": winner,
                                         "power_as_built_w": built, "gain_db": gain_db})] + _small(gain_db)
    else:
        runner = int(order[1])
        parts = [(t.COMPARE_AS_BUILT_WINS, {"power_winner_w": built, "margin_db": float(comparison.margin_db[i]),
                                            "index": str(runner + 1), "runner_up": comparison.names[runner],
                                            "power_runner_up_w": float(power[runner])})]
    return _paragraph(parts)


def _compare_tuners(comparison: Comparison, i):
    """Where every alternative has a tuner and the radio sees at most `RADIO_SWR_WARNING`: the
    tuner keeps the radio happy in each, so the meter in the shack cannot tell them apart."""
    swr = np.array([float(r.swr_radio[i]) for r in comparison.results])
    tuned = all(any(e.kind == "tuner" for e in r.elements) for r in comparison.results)
    if not (tuned and np.all(swr <= RADIO_SWR_WARNING)):
        return None
    least, most = float(swr.min()), float(swr.max())
    if t.sentence("{swr_radio}", swr_radio=least) == t.sentence("{swr_radio}", swr_radio=most):
        return _paragraph([(t.COMPARE_SAME_RADIO_ONE, {"swr_radio": least})])
    return _paragraph([(t.COMPARE_SAME_RADIO, {"swr_radio_least": least, "swr_radio_most": most})])


def explain_compare(comparison: Comparison) -> tuple[Explanation, ...]:
    """The comparison's explanations: per row, the compare topic (who wins) and, where every
    alternative has a tuner that keeps the radio happy, the tuner topic."""
    per_row = {}
    for i in range(len(comparison.labels)):
        per_row[(i, "compare")] = _compare_row(comparison, i)
        if (made := _compare_tuners(comparison, i)) is not None:
            per_row[(i, "tuner")] = made
    return _grouped(per_row, comparison.labels)


def with_explanations(result, explanations):
    """``result`` (a `BudgetResult` or a `Comparison`) carrying ``explanations``."""
    return dataclasses.replace(result, explanations=tuple(explanations))
