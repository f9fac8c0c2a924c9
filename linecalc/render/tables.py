"""Results as text tables (tabulate) for the terminal: budget, safety, sweeps, compare,
feedpoint, advice and the cable library. Formatting only: nothing here solves."""
from __future__ import annotations

import math

import numpy as np
from tabulate import tabulate

from linecalc.studies.budget import BudgetResult
from linecalc.studies import number_text
from linecalc.physics.cable_heating import AMBIENT_C
from linecalc.physics.exposure import CAUTIONS
from linecalc.elements.base import column_name, named_first

SWR_ONLY_NOTE = ("The antenna is given by its SWR only: its phase is unknown, so powers, losses and the "
                 "radio-end SWR are averages over every phase, and the loss range shows least and most.")


_swr_text = number_text.swr_text  # one rounding for tables and explanations (studies/number_text.py)
_db = number_text.db_text


HOLDS_TEXT = {"forward": "forward power held by the radio", "net": "net power held by the radio"}


def _impedance_text(z):
    """An impedance [ohm] as R+jX."""
    return f"{z.real:.1f}{'+' if z.imag >= 0 else '-'}j{abs(z.imag):.1f}"


def _tuner_cells(element, i):
    """A tuner's setting on one row: arrangement, part values and whether it matched. For an
    SWR-only antenna each part shows its range over the phases of the unknown reflection."""
    readings = element.readings
    values = []
    for key, array in readings.items():
        for suffix, unit, digits in (("_pf", "pF", 0), ("_uh", "uH", 2)):
            if key.endswith(suffix) and np.isfinite(array[i]):
                values.append(f"{key[:-3].replace('_', ' ')} {array[i]:.{digits}f} {unit}")
            elif key.endswith(suffix + "_least") and np.isfinite(array[i]):
                most = readings[key[:-len("_least")] + "_most"][i]
                values.append(f"{key[:-len(suffix + '_least')].replace('_', ' ')} {array[i]:.{digits}f} to "
                              f"{most:.{digits}f} {unit}")
    if "matched_share" in readings:
        share = readings["matched_share"][i]
        matched = "matched" if share == 1 else f"matched at {100 * share:.0f} % of phases"
    else:
        matched = "matched" if readings["matched"][i] else "CANNOT MATCH"
    return [matched, str(readings["arrangement"][i]), ", ".join(values)]


TUNER_PHASE_NOTE = ("The antenna's phase is unknown, so the tuner's settings are given as their range over every "
                    "phase: where you set it depends on the real impedance at the feedpoint.")


def budget_table(result: BudgetResult) -> str:
    """One row per band or frequency, with the path's losses and the watts that reach the antenna;
    then each element's loss and heat, each meter's reading and each tuner's setting."""
    tuners = [e for e in result.elements if e.kind == "tuner"]
    meters = [e for e in result.elements if e.kind == "meter"]
    swr_only = result.total_loss_db_range is not None
    headers = ["row", "MHz", "SWR antenna", "SWR radio", "radio fwd / refl W", "radio mismatch dB",
               "matched loss dB", "mismatch loss dB", "total loss dB"]
    if tuners:
        headers.append("tuner loss dB")
    headers += ["antenna W", "path heat W"]
    if swr_only:
        headers.append("loss range dB")
    body = []
    for i, label in enumerate(result.labels):
        row = [label, f"{result.frequency_hz[i] / 1e6:.4g}", _swr_text(result.swr_antenna[i]), _swr_text(result.swr_radio[i]),
               f"{result.radio_forward_w[i]:.1f} / {result.radio_reflected_w[i]:.1f}",
               _db(result.radio_mismatch_loss_db[i]),
               _db(result.matched_loss_db[i]), _db(result.mismatch_loss_db[i]), _db(result.total_loss_db[i])]
        if tuners:
            row.append(_db(sum(e.loss_db[i] for e in tuners)))
        row += [f"{result.power_antenna_w[i]:.1f}", f"{result.power_radio_w[i] - result.power_antenna_w[i]:.1f}"]
        if swr_only:
            low, high = result.total_loss_db_range[i]
            row.append(f"{_db(low)} to {_db(high)}")
        body.append(row)
    lines = [f"{result.station}: {result.radio_power_w:g} W {HOLDS_TEXT[result.radio_holds]}, "
             f"SWR at the radio against {result.reference_impedance_ohm:g} ohm", ""]
    lines.append(tabulate(body, headers=headers, disable_numparse=True, stralign="right"))
    if result.elements:
        element_rows = [[label] + [f"{_db(e.loss_db[i])} dB / {e.dissipated_w[i]:.1f} W" for e in result.elements]
                        for i, label in enumerate(result.labels)]
        lines += ["", "Loss and heat in each element, radio to antenna:",
                  tabulate(element_rows, headers=["row", *(column_name(e.kind, e.label) for e in result.elements)],
                           disable_numparse=True)]
    if meters:
        meter_rows = [[label] + [f"SWR {_swr_text(e.readings['swr'][i])}, fwd {e.readings['forward_w'][i]:.1f} W, "
                                 f"refl {e.readings['reflected_w'][i]:.1f} W" for e in meters]
                      for i, label in enumerate(result.labels)]
        lines += ["", "What each in-line meter reads:",
                  tabulate(meter_rows, headers=["row", *(e.label for e in meters)], disable_numparse=True)]
    for tuner in tuners:
        rows = [[label] + _tuner_cells(tuner, i) for i, label in enumerate(result.labels)]
        lines += ["", f"{named_first('tuner', tuner.label)} (parts from the radio side to the antenna side):",
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
    if result.wire:
        w = result.wire
        rows = [[label, _impedance_text(result.z_antenna_ohm[i]), f"{w['peak_gain_dbi'][i]:.1f}",
                 f"{w['wire_loss_db'][i]:.3f}", f"{w['wire_heat_w'][i]:.2f}"] for i, label in enumerate(result.labels)]
        lines += ["", "The wire antenna, solved by the method of moments (NEC-2; ground loss not counted as wire loss):",
                  tabulate(rows, headers=["row", "feedpoint ohm", "peak gain dBi", "wire loss dB", "wire heat W"],
                           disable_numparse=True, stralign="right")]
    if swr_only:
        lines += ["", SWR_ONLY_NOTE] + ([TUNER_PHASE_NOTE] if tuners else [])
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


# The note under each line's stress table, in the text and on the HTML report's page.
HEAT_NOTE = ("hottest W/m: heat per metre at the line's hottest point at average power / what its rating "
             f"allows there (a library rating is for the cable alone in still air at {AMBIENT_C:g} degC)")


def safety_table(result: BudgetResult) -> str:
    """Voltage and current maxima on each line and tuner part at PEP, exposure distances per row,
    and the cautions."""
    lines = [f"{result.station}: {result.radio_power_w:g} W PEP from the radio, mode {result.mode} "
             f"(duty factor {result.duty_factor:g}), transmitting {100 * result.transmit_fraction:g} % of the time, "
             + (f"antenna gain {result.antenna_gain_dbi:g} dBi" if result.antenna_gain_dbi is not None
                else "antenna gain per row from the wire model (its peak over the sky)"), ""]
    for e in result.elements:
        if e.kind == "line":
            r = e.readings
            body = [[label, f"{r['voltage_max_rms_v'][i]:.0f}", f"{r['voltage_max_peak_v'][i]:.0f}",
                     f"{r['voltage_max_at_m'][i]:.1f}", f"{r['current_max_rms_a'][i]:.2f}", f"{r['current_max_at_m'][i]:.1f}",
                     f"{r['voltage_margin'][i]:.1f}" if "voltage_margin" in r else "no rating",
                     f"{r['power_margin'][i]:.1f}" if "power_margin" in r else "no rating",
                     f"{r['heat_max_w_per_m'][i]:.2f} / "
                     + (f"{r['heat_rating_w_per_m'][i]:.2f}" if "heat_rating_w_per_m" in r else "no rating")]
                    for i, label in enumerate(result.labels)]
            lines += [f"{named_first('line', e.label)} at PEP (positions from its radio end; margins are rating / stress, below 1 "
                      "is over the rating):",
                      tabulate(body, headers=["row", "V max RMS", "V max peak", "at m", "I max RMS A", "at m",
                                              "voltage margin", "power margin", "hottest W/m avg / rated"],
                               disable_numparse=True, stralign="right"),
                      HEAT_NOTE, ""]
        elif e.kind == "tuner":
            parts = list(dict.fromkeys(key.rsplit("_voltage_peak_v", 1)[0] for key in e.readings  # radio side first
                                        if key.endswith("_voltage_peak_v")))
            # a part the row's network leaves out (its heat is NaN) is an empty cell, not 0 V / 0 A
            body = [[label] + [f"{e.readings[p + '_voltage_peak_v'][i]:.0f} V / {e.readings[p + '_current_rms_a'][i]:.2f} A"
                               if np.isfinite(e.readings[p + "_dissipated_w"][i]) else "" for p in parts]
                    for i, label in enumerate(result.labels)]
            lines += [f"{named_first('tuner', e.label)} parts at PEP (peak volts across / RMS amperes through; "
                      "empty where the row's network leaves the part out):",
                      tabulate(body, headers=["row", *(p.replace("_", " ") for p in parts)], disable_numparse=True), ""]
    x = result.exposure
    if x:
        missing = [math.nan] * len(result.labels)
        near = x.get("near_field_m", missing)
        body = [[label, *([f"{result.wire['peak_gain_dbi'][i]:.1f}"] if result.wire else []),
                 f"{x['power_average_w'][i]:.1f}", _watts(x.get("eirp_w", missing)[i]),
                 *(_distance(x.get(key, missing)[i], near[i])
                   for key in ("fcc_uncontrolled_m", "fcc_controlled_m", "icnirp_general_public_m")),
                 _distance(near[i], 0.0)]
                for i, label in enumerate(result.labels)]
        lines += ["RF exposure: least distance from the antenna that meets the limits (far-field estimate with "
                  "ground reflection, FCC OET Bulletin 65 section 2):",
                  tabulate(body, headers=["row", *(["gain dBi"] if result.wire else []), "avg W at antenna", "avg EIRP W", "FCC general public m",
                                          "FCC occupational m", "ICNIRP 2020 public m", "near field within m"],
                           disable_numparse=True, stralign="right"),
                  "* inside the reactive near field (about a sixth of a wavelength), where the far-field formula "
                  "does not hold: indicative only", ""]
    lines += ["Cautions:", *(f"- {text}" for text in CAUTIONS)]
    return "\n".join(lines) + "\n"


def cables_table(listing) -> str:
    """The cable library (a `CableListing`): id, kind, impedance, velocity factor and matched
    loss at the listing's frequencies."""
    headers = ["id", "kind", "Z0 ohm", "VF"] + [f"{f / 1e6:g} MHz" for f in listing.frequency_hz] + ["description"]
    body = []
    for cable, loss_db_per_m, outside in zip(listing.cables, listing.loss_db_per_m, listing.outside_data):
        cells = [f"{100 * loss:.2f} / {100 * 0.3048 * loss:.2f}{' *' if out else ''}"
                 for loss, out in zip(loss_db_per_m, outside)]
        body.append([cable.id, cable.kind, f"{cable.z0_nominal_ohm:.0f}", f"{cable.velocity_factor:.2f}", *cells,
                     cable.description])
    return ("Matched loss in dB per 100 m / per 100 ft\n\n"
            + tabulate(body, headers=headers, disable_numparse=True)
            + "\n\n* outside the cable's data: extrapolated by its loss model\n\n" + _cable_ratings_table(listing))


def _cable_ratings_table(listing) -> str:
    """The ratings of the listing's cables: matched average power at each frequency, voltage."""
    headers = ["id"] + [f"{f / 1e6:g} MHz" for f in listing.frequency_hz] + ["V RMS"]
    body = []
    for cable, power_w in zip(listing.cables, listing.power_rating_w):
        cells = ["none" if not np.isfinite(p) else f"{p:.0f}" for p in power_w]
        body.append([cable.id, *cells, "none" if cable.max_voltage_v is None else f"{cable.max_voltage_v:.0f}"])
    return (f"Ratings: matched average power in W (the cable alone in still air at {AMBIENT_C:g} degC, from a thermal model; "
            "divide by the SWR on the line), and voltage\n\n"
            + tabulate(body, headers=headers, disable_numparse=True, stralign="right")
            + "\n\nA balanced line's voltage is limited by its spreaders or web, by wet weather and by what is near "
            "it long before its heating: 'none' is not unlimited.\n")


def compare_table(comparison) -> str:
    """Alternatives as columns (watts at the antenna and total loss), rows per band; winner and margin."""
    changes = comparison.changes or ((),) * len(comparison.names)
    key = [f"  [{k + 1}] {name}" + (f" ({'; '.join(c)})" if c else "") for k, (name, c) in
           enumerate(zip(comparison.names, changes))]
    headers = ["row", *(f"[{k + 1}] W / dB" for k in range(len(comparison.names))), "winner", "margin dB"]
    body = []
    for i, label in enumerate(comparison.labels):
        cells = [f"{comparison.power_antenna_w[k, i]:.1f} / {_db(comparison.total_loss_db[k, i])}"
                 for k in range(len(comparison.names))]
        body.append([label, *cells, f"[{comparison.winner[i] + 1}]", _db(comparison.margin_db[i])])
    lines = [f"{comparison.station}: watts at the antenna / total loss for each alternative", "", *key, "",
             tabulate(body, headers=headers, disable_numparse=True, stralign="right")]
    swr_rows = [[label, *(_swr_text(r.swr_radio[i]) for r in comparison.results)]
                for i, label in enumerate(comparison.labels)]
    lines += ["", "SWR at the radio for each alternative (above 2:1 many solid-state radios cut their power):",
              tabulate(swr_rows, headers=["row", *(f"[{k + 1}]" for k in range(len(comparison.names)))],
                       disable_numparse=True, stralign="right")]
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


def feedpoint_table(result) -> str:
    """A measured sweep moved to the feedpoint (a `FeedpointResult`): one line per point."""
    sweep = result.sweep
    body = [[f"{f / 1e6:.4f}", f"{z.real:.1f}", f"{z.imag:+.1f}", _swr_text(swr), f"{m:.2f}", "ACTIVE" if a else ""]
            for f, z, swr, m, a in zip(result.frequency_hz, sweep.z_antenna_ohm, sweep.swr_antenna,
                                       sweep.sensitivity, sweep.active)]
    return (f"{result.station}: {result.source} moved to the antenna feedpoint\n\n"
            + tabulate(body, headers=["MHz", "R ohm", "X ohm", "SWR", "error multiplier", ""], disable_numparse=True,
                       stralign="right") + "\n")


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
                  tabulate(body, headers=headers, disable_numparse=True, stralign="right")]
        if sweep.held_tuners:
            lines.append(f"Tuner {', '.join(sweep.held_tuners)} set once at {_mhz(sweep.tuner_set_hz)} MHz and held "
                         "across the band (adjust: once): the radio's row is what it sees as you tune away.")
        lines.append("")
    if lines:
        lines.append("+ the region reaches the band edge: the bandwidth is at least this")
    return "\n".join(lines) + "\n"


def _window_rows(windows, top, labels):
    rows = []
    for w in windows[:top]:
        worst = (f"{w.worst_row_power_w:.1f} ({labels[w.worst_row]})" if 0 <= w.worst_row < len(labels)
                 else f"{w.worst_row_power_w:.1f}")
        rows.append([f"{w.start_m:.2f}{' <' if w.at_range_start else ''}",
                     f"{w.end_m:.2f}{' >' if w.at_range_end else ''}", f"{w.width_m:.2f}", f"{w.best_length_m:.2f}",
                     f"{w.power_sum_w:.1f}", worst, f"{w.best_tuner_loss_db:.2f}", f"{w.worst_tuner_loss_db:.2f}",
                     f"{w.worst_voltage_v:.0f}"])
    return rows


ADVICE_HEADERS = ["from m", "to m", "width m", "best m", "W sum at best", "worst row W", "loss there dB",
                  "worst loss dB", "worst V RMS"]


def advice_summary(result) -> list[str]:
    """The first lines of the advice: what was scanned, and how much of it meets the conditions."""
    advice = result.advice
    lengths = advice.length_m
    count = len(advice.windows)
    limit = sum(w.end_m - w.start_m for w in advice.windows)
    matched = 100 * advice.matchable.mean()
    within = (f"; {100 * result.qualifying_fraction:.0f} % also within --max-loss {result.max_loss_db:g} dB"
              if result.max_loss_db is not None else "")
    return [f"{result.station}: {lengths.size} feeder lengths from {lengths[0]:g} to {lengths[-1]:g} m, "
            f"{advice.frequency_hz.size} frequencies (band edges and centres), {advice.network} tuner",
            f"The tuner matches on every frequency at {matched:.0f} % of the lengths{within}; {count} "
            f"{'window' if count == 1 else 'windows'} ({limit:.2f} m in all) {'meets' if count == 1 else 'meet'} "
            "the conditions."]


def advice_table(result, top) -> str:
    """The length windows where the tuner matches on every band, by the watts at the antenna and
    by line voltage (an `AdviceResult`; ``top`` windows in each list)."""
    advice = result.advice
    labels = result.labels
    lines = advice_summary(result) + [""]
    if advice.windows:
        ranked = ("summed over the rows" if advice.rank == "sum" else "in the worst row (--rank worst)")
        holds = "forward" if result.radio_holds == "forward" else "net"
        lines += [f"Windows by the watts at the antenna {ranked}, the best {min(top, len(advice.windows))} "
                  f"(radio at {advice.radio_power_w:g} W {holds}; line, tuner and radio mismatch losses included):",
                  tabulate(_window_rows(advice.windows, top, labels), headers=ADVICE_HEADERS, disable_numparse=True,
                           stralign="right"),
                  "", f"Windows by worst-case voltage on the feeder at {advice.radio_power_w:g} W PEP:",
                  tabulate(_window_rows(advice.windows_by_voltage, top, labels), headers=ADVICE_HEADERS,
                           disable_numparse=True, stralign="right"),
                  "", f"Lengths where the watts at the antenna peak, {ranked} (the choices inside a window):",
                  tabulate([[f"{b['length_m']:.2f}", f"{b['power_sum_w']:.1f}",
                             f"{b['worst_row_power_w']:.1f} ({b['worst_row']})", f"{b['worst_tuner_loss_db']:.2f}",
                             f"{b['worst_voltage_v']:.0f}"] for b in result.best_lengths(top)],
                           headers=["length m", "W sum", "worst row W", "worst loss dB", "worst V RMS"],
                           disable_numparse=True, stralign="right"),
                  "", "best m: the window's length with the most watts; W sum: the watts at the antenna there, "
                      "summed over the rows",
                  "(each row at its own frequency, the band's centre), within about 1 % of budget and compare "
                  "--lengths",
                  "(their tuner design is finer); loss there: the worst-case tuner loss at that length.",
                  "< or >: the window reaches the end of the scan and may go on beyond it.",
                  "Pick a length inside a wide window: real antennas and lines differ from their models."]
    else:
        lines.append("No length in the range lets the tuner match on every band: widen the range, change the "
                     "tuner's ranges or drop a band.")
    if result.feeder_kind == "balanced":
        lines += ["", "Caution: open-wire feeders carry high voltage at high SWR; keep them out of reach."]
    else:
        lines += ["", "Caution: at high SWR a coax feeder can carry more voltage than its rating; check it with "
                      "linecalc safety."]
    return "\n".join(lines) + "\n"


def pair_advice_table(result, top) -> str:
    """The antenna-length and feeder-length scan (a `PairAdviceResult`): per antenna length its
    best feeder window, then the best ``top`` pairs."""
    first = result.scans[0]
    labels = first.labels
    lengths, feeder = result.antenna_length_m, first.advice.length_m
    ranked = "summed over the rows" if result.rank == "sum" else "in the worst row (--rank worst)"
    what = "height" if result.shape == "vertical" else "length, tip to tip"
    lines = [f"{result.station}: {lengths.size} antenna lengths ({what}) from {lengths[0]:g} to {lengths[-1]:g} m, "
             f"each with {feeder.size} feeder lengths from {feeder[0]:g} to {feeder[-1]:g} m, "
             f"{first.advice.frequency_hz.size} frequencies, {first.advice.network} tuner", ""]
    body = []
    for length, scan in zip(lengths, result.scans):
        windows = scan.advice.windows
        best = windows[0] if windows else None
        body.append([f"{length:.2f}", f"{100 * scan.qualifying_fraction:.0f}", str(len(windows)),
                     f"{best.best_length_m:.2f}" if best else "-", f"{best.power_sum_w:.1f}" if best else "-",
                     (f"{best.worst_row_power_w:.1f} ({labels[best.worst_row]})" if best else "-")])
    lines += [f"Per antenna length, the best feeder length (by the watts at the antenna {ranked}):",
              tabulate(body, headers=["antenna m", "feeder lengths matching %", "windows", "best feeder m",
                                      "W sum", "worst row W"], disable_numparse=True, stralign="right"), ""]
    pairs = result.pairs()
    if pairs:
        rows = [[f"{a:.2f}"] + row for (a, _), row in zip(pairs[:top], _window_rows([w for _, w in pairs], top, labels))]
        lines += [f"The best {min(top, len(pairs))} of {len(pairs)} (antenna length, feeder window) pairs, by the watts "
                  f"at the antenna {ranked} (radio at {first.advice.radio_power_w:g} W):",
                  tabulate(rows, headers=["antenna m"] + ADVICE_HEADERS, disable_numparse=True, stralign="right"), "",
                  "best m: the feeder length with the most watts in the window; W sum: the watts at the antenna "
                  "there, summed over the rows.",
                  "The antenna model leaves out the feedline, insulators and nearby objects: cut the wire a little "
                  "long and pick lengths inside wide windows."]
    else:
        lines.append("No pair of lengths in the ranges lets the tuner match on every band: widen the ranges, change "
                     "the tuner's ranges or drop a band.")
    lines += ["", "Caution: open-wire feeders carry high voltage at high SWR; keep them out of reach."
              if first.feeder_kind == "balanced" else
              "Caution: at high SWR a coax feeder can carry more voltage than its rating; check it with linecalc safety.",
              "Keep antennas well clear of power lines; lightning protection and grounding follow local code and "
              "licensed practice."]
    return "\n".join(lines) + "\n"


def antenna_table(report) -> str:
    """A wire antenna (an `AntennaReport`) per row, and the cut length if one was asked for."""
    line = report.line_label
    headers = ["row", "MHz", "feedpoint ohm", f"SWR {report.reference_impedance_ohm:g} ohm"]
    if line is not None:
        headers.append(f"SWR on {line}")
    headers += ["nearest resonance MHz", "peak gain dBi", "wire loss dB"]
    body = []
    for i, label in enumerate(report.labels):
        row = [label, f"{report.frequency_hz[i] / 1e6:.4g}", _impedance_text(report.impedance_ohm[i]),
               _swr_text(report.swr_reference[i])]
        if line is not None:
            row.append(_swr_text(report.swr_line[i]))
        resonance = report.resonance_hz[i]
        row += [f"{resonance / 1e6:.3f}" if math.isfinite(resonance) else "none within 20 %",
                f"{report.peak_gain_dbi[i]:.1f}", f"{report.wire_loss_db[i]:.3f}"]
        body.append(row)
    lines = [f"{report.station}: {report.shape}, {report.length_m:g} m, solved by the method of moments (NEC-2)", "",
             tabulate(body, headers=headers, disable_numparse=True, stralign="right"), "",
             "Peak gain is the largest on a 5 x 10 degree grid of the sky (a lobe may peak up to about 0.2 dB "
             "higher); the model leaves out the feedline, insulators and nearby objects."]
    cut = report.cut
    if cut is not None:
        feet = cut.rule_of_thumb_m / 0.3048
        rule = "468" if report.shape != "vertical" else "234"
        found = (f"{cut.length_m:.2f} m ({cut.length_m / 0.3048:.1f} ft), R {cut.resistance_ohm:.1f} ohm there"
                 if cut.converged else f"not found (last try {cut.length_m:.2f} m)")
        lines += ["", f"Length for resonance at {cut.frequency_hz / 1e6:g} MHz, this shape, height, wire and ground: "
                  f"{found}; rule of thumb {rule}/f(MHz) ft: {cut.rule_of_thumb_m:.2f} m ({feet:.1f} ft). "
                  "Cut a little long and trim: the real wire's surroundings move the resonance."]
    lines += ["", "Keep antennas well clear of power lines; lightning protection and grounding follow local "
              "code and licensed practice."]
    return "\n".join(lines) + "\n"
