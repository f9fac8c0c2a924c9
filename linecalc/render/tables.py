"""Render results as text: tables (tabulate), the JSON document of DESIGN.md, and CSV."""
from __future__ import annotations

import csv
import io
import json
import math

import numpy as np
from tabulate import tabulate

from linecalc.studies.budget import BudgetResult
from linecalc.physics.exposure import CAUTIONS

SWR_ONLY_NOTE = ("The antenna is given by its SWR only: its phase is unknown, so powers, losses and the "
                 "radio-end SWR are averages over every phase, and the loss range shows least and most.")


def _finite_or_none(value):
    """A float for JSON, or None where it is infinite or undefined (JSON has no infinity)."""
    value = float(value)
    return value if math.isfinite(value) else None


def _json_value(value):
    """A reading as JSON: booleans and text as they are, numbers finite or None."""
    if isinstance(value, (bool, np.bool_)):
        return bool(value)
    if isinstance(value, (str, np.str_)):
        return str(value)
    return _finite_or_none(value)


def _pair(z):
    if z is None:
        return None
    return [_finite_or_none(z.real), _finite_or_none(z.imag)]


def budget_document(result: BudgetResult) -> dict:
    """The budget as the JSON document fixed in DESIGN.md (plus ``total_loss_db_range``)."""
    rows = []
    for i, label in enumerate(result.labels):
        row = {
            "label": label,
            "frequency_hz": float(result.frequency_hz[i]),
            "swr_antenna": _finite_or_none(result.swr_antenna[i]),
            "swr_radio": _finite_or_none(result.swr_radio[i]),
            "z_antenna_ohm": _pair(None if result.z_antenna_ohm is None else result.z_antenna_ohm[i]),
            "z_radio_ohm": _pair(None if result.z_radio_ohm is None else result.z_radio_ohm[i]),
            "matched_loss_db": _finite_or_none(result.matched_loss_db[i]),
            "mismatch_loss_db": _finite_or_none(result.mismatch_loss_db[i]),
            "total_loss_db": _finite_or_none(result.total_loss_db[i]),
            "power_radio_w": _finite_or_none(result.power_radio_w[i]),
            "power_antenna_w": _finite_or_none(result.power_antenna_w[i]),
            "elements": [
                {"kind": e.kind, "label": e.label, "loss_db": _finite_or_none(e.loss_db[i]),
                 "matched_loss_db": _finite_or_none(e.matched_loss_db[i]),
                 "dissipated_w": _finite_or_none(e.dissipated_w[i]),
                 "swr_in": _finite_or_none(e.swr_in[i]), "swr_out": _finite_or_none(e.swr_out[i]),
                 **{key: _json_value(values[i]) for key, values in e.readings.items()}}
                for e in result.elements
            ],
        }
        if result.total_loss_db_range is not None:
            row["total_loss_db_range"] = [_finite_or_none(v) for v in result.total_loss_db_range[i]]
        if result.measured:
            row["measured"] = {key: _finite_or_none(values[i]) for key, values in result.measured.items()}
        if result.exposure:
            row["exposure"] = {key: _finite_or_none(values[i]) for key, values in result.exposure.items()}
        rows.append(row)
    return {
        "station": result.station,
        "reference_impedance_ohm": float(result.reference_impedance_ohm),
        "radio_power_w": float(result.radio_power_w),
        "mode": result.mode, "duty_factor": result.duty_factor, "transmit_fraction": result.transmit_fraction,
        "antenna_gain_dbi": result.antenna_gain_dbi,
        "rows": rows,
        "warnings": list(result.warnings),
        "cautions": list(CAUTIONS),
    }


def to_json(document) -> str:
    """JSON text of a document built by this module (no NaN or infinity: those are null already)."""
    return json.dumps(document, indent=2, allow_nan=False) + "\n"


def budget_json(result: BudgetResult) -> str:
    return to_json(budget_document(result))


def _swr_text(swr):
    return "inf" if not math.isfinite(swr) else f"{swr:.2f}"


def _tuner_cells(element, i):
    """A tuner's setting on one row: arrangement, part values and whether it matched."""
    readings = element.readings
    values = []
    for key, array in readings.items():
        value = array[i]
        if key.endswith(("_pf", "_uh")) and not np.isfinite(value):
            continue  # a part that this row's arrangement leaves out
        if key.endswith("_pf"):
            values.append(f"{key[:-3].replace('_', ' ')} {value:.0f} pF")
        elif key.endswith("_uh"):
            values.append(f"{key[:-3].replace('_', ' ')} {value:.2f} uH")
    matched = "matched" if readings["matched"][i] else "CANNOT MATCH"
    return [matched, str(readings["arrangement"][i]), ", ".join(values)]


def budget_table(result: BudgetResult) -> str:
    """One row per band or frequency, with the path's losses and the watts that reach the antenna;
    then each element's loss and heat, each meter's reading and each tuner's setting."""
    tuners = [e for e in result.elements if e.kind == "tuner"]
    meters = [e for e in result.elements if e.kind == "meter"]
    swr_only = result.total_loss_db_range is not None
    headers = ["row", "MHz", "SWR antenna", "SWR radio", "matched loss dB", "mismatch loss dB", "total loss dB"]
    if tuners:
        headers.append("tuner loss dB")
    headers += ["antenna W", "path heat W"]
    if swr_only:
        headers.append("loss range dB")
    body = []
    for i, label in enumerate(result.labels):
        row = [label, f"{result.frequency_hz[i] / 1e6:.4g}", _swr_text(result.swr_antenna[i]), _swr_text(result.swr_radio[i]),
               f"{result.matched_loss_db[i]:.2f}", f"{result.mismatch_loss_db[i]:.2f}", f"{result.total_loss_db[i]:.2f}"]
        if tuners:
            row.append(f"{sum(e.loss_db[i] for e in tuners):.2f}")
        row += [f"{result.power_antenna_w[i]:.1f}", f"{result.power_radio_w[i] - result.power_antenna_w[i]:.1f}"]
        if swr_only:
            low, high = result.total_loss_db_range[i]
            row.append(f"{low:.2f} to {high:.2f}")
        body.append(row)
    lines = [f"{result.station}: {result.radio_power_w:g} W from the radio, "
             f"SWR at the radio against {result.reference_impedance_ohm:g} ohm", ""]
    lines.append(tabulate(body, headers=headers, disable_numparse=True, stralign="right"))
    if result.elements:
        element_rows = [[label] + [f"{e.loss_db[i]:.2f} dB / {e.dissipated_w[i]:.1f} W" for e in result.elements]
                        for i, label in enumerate(result.labels)]
        lines += ["", "Loss and heat in each element, radio to antenna:",
                  tabulate(element_rows, headers=["row", *(f"{e.kind}: {e.label}" for e in result.elements)],
                           disable_numparse=True)]
    if meters:
        meter_rows = [[label] + [f"SWR {_swr_text(e.readings['swr'][i])}, fwd {e.readings['forward_w'][i]:.1f} W, "
                                 f"refl {e.readings['reflected_w'][i]:.1f} W" for e in meters]
                      for i, label in enumerate(result.labels)]
        lines += ["", "What each in-line meter reads:",
                  tabulate(meter_rows, headers=["row", *(e.label for e in meters)], disable_numparse=True)]
    for tuner in tuners:
        rows = [[label] + _tuner_cells(tuner, i) for i, label in enumerate(result.labels)]
        lines += ["", f"Tuner {tuner.label} (parts from the radio side to the antenna side):",
                  tabulate(rows, headers=["row", "match", "arrangement", "settings"], disable_numparse=True)]
    if "swr_antenna_least" in result.measured:
        m = result.measured
        rows = [[label, f"{_swr_text(m['swr_antenna_least'][i])} to {_swr_text(m['swr_antenna_most'][i])}",
                 f"{m['sensitivity'][i]:.2f}"] for i, label in enumerate(result.labels)]
        lines += ["", "The SWR reading moved to the antenna (its phase is unknown, so a range):",
                  tabulate(rows, headers=["row", "SWR at the antenna", "error multiplier"], disable_numparse=True)]
    elif "sensitivity" in result.measured:
        rows = [[label, f"{result.measured['sensitivity'][i]:.2f}"] for i, label in enumerate(result.labels)]
        lines += ["", "The measured sweep moved to the antenna; a reflection error at the instrument is multiplied by:",
                  tabulate(rows, headers=["row", "error multiplier"], disable_numparse=True)]
    if swr_only:
        lines += ["", SWR_ONLY_NOTE]
    lines += ["", "Voltages on the line and RF-exposure distances: linecalc safety (read its cautions)."]
    return "\n".join(lines) + "\n"


def _distance(value, near_field_m):
    """A distance [m], starred where it falls inside the reactive near field."""
    if not math.isfinite(value):
        return "n/a"
    return f"{value:.1f}{' *' if value < near_field_m else ''}"


def _watts(value):
    """A power [W], or n/a where there is none (a row outside the exposure tables)."""
    return f"{value:.1f}" if math.isfinite(value) else "n/a"


def safety_table(result: BudgetResult) -> str:
    """Voltage and current maxima on each line and tuner part at PEP, exposure distances per row,
    and the cautions."""
    lines = [f"{result.station}: {result.radio_power_w:g} W PEP from the radio, mode {result.mode} "
             f"(duty factor {result.duty_factor:g}), transmitting {100 * result.transmit_fraction:g} % of the time, "
             f"antenna gain {result.antenna_gain_dbi:g} dBi", ""]
    for e in result.elements:
        if e.kind == "line":
            r = e.readings
            body = [[label, f"{r['voltage_max_rms_v'][i]:.0f}", f"{r['voltage_max_peak_v'][i]:.0f}",
                     f"{r['voltage_max_at_m'][i]:.1f}", f"{r['current_max_rms_a'][i]:.2f}", f"{r['current_max_at_m'][i]:.1f}",
                     f"{r['voltage_margin'][i]:.1f}" if "voltage_margin" in r else "no rating",
                     f"{r['power_margin'][i]:.1f}" if "power_margin" in r else "no rating"]
                    for i, label in enumerate(result.labels)]
            lines += [f"Line {e.label} at PEP (positions from its radio end; margins are rating / stress, below 1 "
                      "is over the rating):",
                      tabulate(body, headers=["row", "V max RMS", "V max peak", "at m", "I max RMS A", "at m",
                                              "voltage margin", "power margin"], disable_numparse=True,
                               stralign="right"), ""]
        elif e.kind == "tuner":
            parts = sorted({key.rsplit("_voltage_peak_v", 1)[0] for key in e.readings if key.endswith("_voltage_peak_v")})
            body = [[label] + [f"{e.readings[p + '_voltage_peak_v'][i]:.0f} V / {e.readings[p + '_current_rms_a'][i]:.2f} A"
                               for p in parts] for i, label in enumerate(result.labels)]
            lines += [f"Tuner {e.label} parts at PEP (peak volts across / RMS amperes through):",
                      tabulate(body, headers=["row", *(p.replace("_", " ") for p in parts)], disable_numparse=True), ""]
    x = result.exposure
    if x:
        missing = [math.nan] * len(result.labels)
        near = x.get("near_field_m", missing)
        body = [[label, f"{x['power_average_w'][i]:.1f}", _watts(x.get("eirp_w", missing)[i]),
                 *(_distance(x.get(key, missing)[i], near[i])
                   for key in ("fcc_uncontrolled_m", "fcc_controlled_m", "icnirp_general_public_m")),
                 _distance(near[i], 0.0)]
                for i, label in enumerate(result.labels)]
        lines += ["RF exposure: least distance from the antenna that meets the limits (far-field estimate with "
                  "ground reflection, FCC OET Bulletin 65 section 2):",
                  tabulate(body, headers=["row", "avg W at antenna", "avg EIRP W", "FCC general public m",
                                          "FCC occupational m", "ICNIRP 2020 public m", "near field within m"],
                           disable_numparse=True, stralign="right"),
                  "* inside the reactive near field (about a sixth of a wavelength), where the far-field formula "
                  "does not hold: indicative only", ""]
    lines += ["Cautions:", *(f"- {text}" for text in CAUTIONS)]
    return "\n".join(lines) + "\n"


def budget_csv(result: BudgetResult) -> str:
    """A flat table: one line per row, the JSON fields plus each element's loss and heat."""
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    header = ["label", "frequency_hz", "swr_antenna", "swr_radio", "z_antenna_r_ohm", "z_antenna_x_ohm",
              "z_radio_r_ohm", "z_radio_x_ohm", "matched_loss_db", "mismatch_loss_db", "total_loss_db",
              "power_radio_w", "power_antenna_w"]
    for e in result.elements:
        header += [f"{e.label}:loss_db", f"{e.label}:dissipated_w"]
    writer.writerow(header)
    for i, label in enumerate(result.labels):
        z_a = result.z_antenna_ohm[i] if result.z_antenna_ohm is not None else complex(np.nan, np.nan)
        z_r = result.z_radio_ohm[i] if result.z_radio_ohm is not None else complex(np.nan, np.nan)
        row = [label, result.frequency_hz[i], result.swr_antenna[i], result.swr_radio[i], z_a.real, z_a.imag,
               z_r.real, z_r.imag, result.matched_loss_db[i], result.mismatch_loss_db[i], result.total_loss_db[i],
               result.power_radio_w[i], result.power_antenna_w[i]]
        for e in result.elements:
            row += [e.loss_db[i], e.dissipated_w[i]]
        writer.writerow(["" if isinstance(v, float) and math.isnan(v) else (f"{v:.10g}" if not isinstance(v, str) else v)
                         for v in row])
    return buffer.getvalue()


def cables_table(rows, frequencies_hz) -> str:
    """The cable library: id, kind, impedance, velocity factor and matched loss at a few frequencies.

    ``rows`` holds (id, kind, z0_ohm, velocity_factor, description, loss_db_per_m array,
    outside-data-range mask).
    """
    headers = ["id", "kind", "Z0 ohm", "VF"] + [f"{f / 1e6:g} MHz" for f in frequencies_hz] + ["description"]
    body = []
    for cable_id, kind, z0, vf, description, loss_db_per_m, outside in rows:
        cells = [f"{100 * loss:.2f} / {100 * 0.3048 * loss:.2f}{' *' if out else ''}"
                 for loss, out in zip(loss_db_per_m, outside)]
        body.append([cable_id, kind, f"{z0:.0f}", f"{vf:.2f}", *cells, description])
    return ("Matched loss in dB per 100 m / per 100 ft\n\n"
            + tabulate(body, headers=headers, disable_numparse=True)
            + "\n\n* outside the cable's data: extrapolated by its loss model\n")


def compare_document(comparison) -> dict:
    """The comparison as JSON: per row, each alternative's watts and loss, the winner and margin."""
    rows = []
    for i, label in enumerate(comparison.labels):
        rows.append({
            "label": label,
            "frequency_hz": float(comparison.frequency_hz[i]),
            "alternatives": [{"name": name, "power_antenna_w": float(comparison.power_antenna_w[k, i]),
                              "total_loss_db": _finite_or_none(comparison.total_loss_db[k, i]),
                              "swr_radio": _finite_or_none(comparison.results[k].swr_radio[i])}
                             for k, name in enumerate(comparison.names)],
            "winner": comparison.names[comparison.winner[i]],
            "margin_db": _finite_or_none(comparison.margin_db[i]),
        })
    doc = {"station": comparison.station, "alternatives": list(comparison.names), "rows": rows,
           "warnings": list(comparison.warnings)}
    study = comparison.line_study
    if study is not None:
        doc["line_study"] = {
            "label": study.label, "length_m": [float(v) for v in study.length_m],
            "rows": [{"label": label,
                      "exact_loss_db": [_finite_or_none(v) for v in study.exact_loss_db[:, i]],
                      "closed_form_loss_db": [_finite_or_none(v) for v in study.closed_form_loss_db[:, i]],
                      "swr_load": [_finite_or_none(v) for v in study.swr_load[:, i]]}
                     for i, label in enumerate(comparison.labels)]}
    return doc


def compare_json(comparison) -> str:
    return json.dumps(compare_document(comparison), indent=2, allow_nan=False) + "\n"


def compare_table(comparison) -> str:
    """Alternatives as columns (watts at the antenna and total loss), rows per band; winner and margin."""
    key = [f"  [{k + 1}] {name}" for k, name in enumerate(comparison.names)]
    headers = ["row", *(f"[{k + 1}] W / dB" for k in range(len(comparison.names))), "winner", "margin dB"]
    body = []
    for i, label in enumerate(comparison.labels):
        cells = [f"{comparison.power_antenna_w[k, i]:.1f} / {comparison.total_loss_db[k, i]:.2f}"
                 for k in range(len(comparison.names))]
        body.append([label, *cells, f"[{comparison.winner[i] + 1}]", f"{comparison.margin_db[i]:.2f}"])
    lines = [f"{comparison.station}: watts at the antenna / total loss for each alternative", "", *key, "",
             tabulate(body, headers=headers, disable_numparse=True, stralign="right")]
    study = comparison.line_study
    if study is not None:
        headers = ["row", *(f"{length:g} m" for length in study.length_m)]
        body = [[label, *(f"{study.exact_loss_db[k, i]:.2f} ({study.closed_form_loss_db[k, i]:.2f})"
                          for k in range(len(study.length_m)))] for i, label in enumerate(comparison.labels)]
        lines += ["", f"Loss of {study.label} by its length: exact dB (closed-form formula dB in brackets)",
                  "The formula averages over where the current peaks fall; the exact figure is the one this "
                  "length gives.",
                  tabulate(body, headers=headers, disable_numparse=True, stralign="right")]
    return "\n".join(lines) + "\n"


def compare_csv(comparison) -> str:
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow(["label", "frequency_hz", "alternative", "power_antenna_w", "total_loss_db", "winner", "margin_db"])
    for i, label in enumerate(comparison.labels):
        for k, name in enumerate(comparison.names):
            writer.writerow([label, f"{comparison.frequency_hz[i]:.10g}", name,
                             f"{comparison.power_antenna_w[k, i]:.10g}", f"{comparison.total_loss_db[k, i]:.10g}",
                             "yes" if comparison.winner[i] == k else "", f"{comparison.margin_db[i]:.10g}"])
    return buffer.getvalue()


def feedpoint_rows(frequency_hz, sweep):
    """(MHz, R, X, SWR, error multiplier, active) per point of a recovered feedpoint sweep."""
    return [(f / 1e6, z.real, z.imag, swr, m, bool(a)) for f, z, swr, m, a in
            zip(frequency_hz, sweep.z_antenna_ohm, sweep.swr_antenna, sweep.sensitivity, sweep.active)]


def feedpoint_table(station_name, source, frequency_hz, sweep) -> str:
    body = [[f"{mhz:.4f}", f"{r:.1f}", f"{x:+.1f}", _swr_text(swr), f"{m:.2f}", "ACTIVE" if a else ""]
            for mhz, r, x, swr, m, a in feedpoint_rows(frequency_hz, sweep)]
    return (f"{station_name}: {source} moved to the antenna feedpoint\n\n"
            + tabulate(body, headers=["MHz", "R ohm", "X ohm", "SWR", "error multiplier", ""], disable_numparse=True,
                       stralign="right") + "\n")


def feedpoint_json(station_name, source, frequency_hz, sweep) -> str:
    return to_json({"station": station_name, "source": source, "points": [
        {"frequency_hz": float(f), "z_antenna_ohm": [_finite_or_none(r), _finite_or_none(x)],
         "swr_antenna": _finite_or_none(swr), "sensitivity": _finite_or_none(m), "active": a}
        for f, (_, r, x, swr, m, a) in zip(frequency_hz, feedpoint_rows(frequency_hz, sweep))]})


def feedpoint_csv(station_name, source, frequency_hz, sweep) -> str:
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow(["frequency_hz", "r_ohm", "x_ohm", "swr_antenna", "sensitivity", "active"])
    for f, (_, r, x, swr, m, a) in zip(frequency_hz, feedpoint_rows(frequency_hz, sweep)):
        writer.writerow([f"{f:.10g}", f"{r:.10g}", f"{x:.10g}", f"{swr:.10g}", f"{m:.10g}", "yes" if a else ""])
    return buffer.getvalue()


def _mhz(value):
    return "n/a" if not math.isfinite(value) else f"{value / 1e6:.4f}"


def sweep_table(sweeps) -> str:
    """Per swept band: the lowest SWR and where, the SWR at both edges, and the bandwidth inside
    1.5:1, 2:1 and 3:1, at the antenna and at the radio."""
    lines = []
    for sweep in sweeps:
        st = sweep.statistics
        if st is None:
            continue
        body = []
        for end, name in ((0, "antenna"), (1, "radio")):
            widths = [f"{st.bandwidth_hz[end, k] / 1e3:.0f}{'+' if st.clipped_low[end, k] or st.clipped_high[end, k] else ''}"
                      for k in range(len(st.swr_limits))]
            body.append([name, f"{_swr_text(st.swr_min[end])} at {_mhz(st.frequency_swr_min_hz[end])}",
                         _swr_text(st.swr_low_edge[end]), _swr_text(st.swr_high_edge[end]), *widths])
        headers = ["SWR at", "lowest SWR at MHz", f"{_mhz(sweep.frequency_hz[0])} MHz", f"{_mhz(sweep.frequency_hz[-1])} MHz",
                   *(f"kHz within {limit:g}:1" for limit in st.swr_limits)]
        lines += [f"{sweep.label}, {sweep.frequency_hz.size} points edge to edge:",
                  tabulate(body, headers=headers, disable_numparse=True, stralign="right"), ""]
    if lines:
        lines.append("+ the region reaches the band edge: the bandwidth is at least this")
    return "\n".join(lines) + "\n"


def sweep_document(sweep) -> dict:
    st = sweep.statistics
    if st is None:
        return {"frequency_hz": [float(f) for f in sweep.frequency_hz],
                "swr_antenna": _json_list(sweep.swr_antenna), "swr_radio": _json_list(sweep.swr_radio)}

    def pair(values):
        return {"antenna": _json_list(values[0]), "radio": _json_list(values[1])}

    return {"frequency_hz": [float(f) for f in sweep.frequency_hz],
            "swr_antenna": _json_list(sweep.swr_antenna), "swr_radio": _json_list(sweep.swr_radio),
            "swr_min": {"antenna": _finite_or_none(st.swr_min[0]), "radio": _finite_or_none(st.swr_min[1])},
            "frequency_swr_min_hz": {"antenna": _finite_or_none(st.frequency_swr_min_hz[0]),
                                     "radio": _finite_or_none(st.frequency_swr_min_hz[1])},
            "swr_limits": list(st.swr_limits), "bandwidth_hz": pair(st.bandwidth_hz),
            "lower_hz": pair(st.lower_hz), "upper_hz": pair(st.upper_hz)}


def _json_list(values):
    return [_finite_or_none(v) for v in np.ravel(values)]


def _window_rows(windows, top):
    return [[f"{w.start_m:.2f}{' <' if w.at_range_start else ''}", f"{w.end_m:.2f}{' >' if w.at_range_end else ''}",
             f"{w.width_m:.2f}", f"{w.best_length_m:.2f}", f"{w.best_tuner_loss_db:.2f}",
             f"{w.worst_tuner_loss_db:.2f}", f"{w.worst_voltage_v:.0f}"] for w in windows[:top]]


def advice_table(station, advice, top) -> str:
    """The length windows where the tuner matches on every band, by loss and by line voltage."""
    lengths = advice.length_m
    share = 100 * advice.matchable.mean()
    limit = sum(w.end_m - w.start_m for w in advice.windows)
    headers = ["from m", "to m", "width m", "best m", "loss there dB", "worst loss dB", "worst V RMS"]
    lines = [f"{station.name}: {lengths.size} feeder lengths from {lengths[0]:g} to {lengths[-1]:g} m, "
             f"{advice.frequency_hz.size} frequencies (band edges and centres), {advice.network} tuner",
             f"The tuner matches on every frequency at {share:.0f} % of the lengths; {len(advice.windows)} windows "
             f"({limit:.2f} m in all) meet the conditions.",
             ""]
    if advice.windows:
        lines += [f"Windows by worst-case tuner loss (the best {min(top, len(advice.windows))}):",
                  tabulate(_window_rows(advice.windows, top), headers=headers, disable_numparse=True, stralign="right"),
                  "", f"Windows by worst-case voltage on the feeder at {advice.radio_power_w:g} W PEP:",
                  tabulate(_window_rows(advice.windows_by_voltage, top), headers=headers, disable_numparse=True,
                           stralign="right"),
                  "", "< or >: the window reaches the end of the scan and may go on beyond it.",
                  "Pick a length inside a wide window: real antennas and lines differ from their models."]
    else:
        lines.append("No length in the range lets the tuner match on every band: widen the range, change the "
                     "tuner's ranges or drop a band.")
    lines += ["", "Caution: open-wire feeders carry high voltage at high SWR; keep them out of reach."]
    return "\n".join(lines) + "\n"


def advice_json(station, advice, top) -> str:
    def window(w):
        return {"start_m": w.start_m, "end_m": w.end_m, "best_length_m": w.best_length_m,
                "best_tuner_loss_db": _finite_or_none(w.best_tuner_loss_db),
                "worst_tuner_loss_db": _finite_or_none(w.worst_tuner_loss_db),
                "worst_voltage_v": _finite_or_none(w.worst_voltage_v),
                "at_range_start": w.at_range_start, "at_range_end": w.at_range_end}

    return to_json({"station": station.name, "network": advice.network,
                    "length_m": {"from": float(advice.length_m[0]), "to": float(advice.length_m[-1]),
                                 "count": int(advice.length_m.size)},
                    "frequency_hz": [float(f) for f in advice.frequency_hz],
                    "matchable_fraction": float(advice.matchable.mean()),
                    "windows": [window(w) for w in advice.windows],
                    "windows_by_voltage": [window(w) for w in advice.windows_by_voltage[:top]],
                    "cautions": list(CAUTIONS)})
