"""A station's report as one self-contained HTML page (``linecalc report``): the budget, the
element heat, meter readings and tuner settings, the figures inline as SVG, the safety figures
with their cautions, the warnings, and the station file itself.

The page is built from the results' JSON documents (``to_dict()``), so it shows what ``--format
json`` prints, through a Jinja2 template (``templates/report.html.j2``, package data) with
autoescaping on: every string from the station (names, labels, the file's text) reaches the page
as text, never as markup. The only markup passed through unescaped is the SVG that matplotlib
drew, with its element ids prefixed per figure so that several figures can share one page.

Nothing is loaded from anywhere: the style is inline, there is no script, and the page's
Content-Security-Policy forbids every fetch. Jinja2 is imported here only, when a report is made.
"""
from __future__ import annotations

import math
import re
from dataclasses import dataclass

from linecalc.render.explanations import TOPIC_HEADINGS
from linecalc.render.tables import HEAT_NOTE

# What each figure shows, in the order of the page: (kind, title, caption).
FIGURES = (
    ("swr", "SWR across each band",
     "SWR at the antenna and at the radio, swept across each band."),
    ("smith", "Smith chart",
     "The impedance at the antenna and at the radio on a Smith chart (its reference is stated on the chart)."),
    ("voltage", "Voltage along the feedline",
     "RMS voltage along the longest line at the radio's PEP, one curve per row."),
    ("budget", "Where the loss goes",
     "The loss budget per row, in dB and in watts of heat."),
    ("compare", "Alternatives compared",
     "Watts at the antenna for each alternative of the station's compare: key."),
)
TEMPLATE = "report.html.j2"
SWR_ONLY_NOTE = ("The antenna is given by its SWR only: its phase is unknown, so powers, losses and the "
                 "radio-end SWR are averages over every phase, and the loss range shows least and most.")
NEAR_FIELD_NOTE = ("* inside the reactive near field (about a sixth of a wavelength), where the far-field "
                   "formula does not hold: indicative only.")


@dataclass(frozen=True)
class Figure:
    """One figure of the page: its ``kind`` (swr, smith, voltage, budget, compare), and either
    its ``svg`` text or the reason it does not apply to this station (``skipped``)."""

    kind: str
    svg: str | None = None
    skipped: str | None = None


def _swr(value):
    return "inf" if value is None else f"{value:.2f}"


def _db(value):
    """A figure in dB to two decimals (inf for null); a residue below zero prints as 0.00."""
    if value is None:
        return "inf"
    text = f"{value:.2f}"
    return "0.00" if text == "-0.00" else text


def _watts(value, digits=1):
    return "n/a" if value is None or not math.isfinite(value) else f"{value:.{digits}f}"


def _margin(value):
    """A rating margin to one decimal; n/a for null (a line that carries no current does not heat)."""
    return "n/a" if value is None else f"{value:.1f}"


def _distance(value, near_field_m):
    """A distance [m] to 0.1 m, starred inside the reactive near field; n/a for null."""
    if value is None:
        return "n/a"
    return f"{value:.1f}{' *' if near_field_m is not None and value < near_field_m else ''}"


def _impedance(pair):
    """An [R, X] pair [ohm] as R+jX; n/a for null, inf for an infinite component."""
    if pair is None:
        return "n/a"
    r, x = pair
    r_text = "inf" if r is None else f"{r:.1f}"
    if x is None:
        return f"{r_text}+j inf"
    return f"{r_text}{'+' if x >= 0 else '-'}j{abs(x):.1f}"


def _part_name(key, suffix):
    return key[:-len(suffix)].replace("_", " ")


def _tuner_setting(element):
    """A tuner's setting on one row, from its JSON entry: (match, arrangement, part values)."""
    values = []
    for key, value in element.items():
        for suffix, unit, digits in (("_pf", "pF", 0), ("_uh", "uH", 2)):
            if key.endswith(suffix) and value is not None:
                values.append(f"{_part_name(key, suffix)} {value:.{digits}f} {unit}")
            elif key.endswith(suffix + "_least") and value is not None:
                most = element.get(key[:-len("_least")] + "_most")
                most_text = "n/a" if most is None else f"{most:.{digits}f}"
                values.append(f"{_part_name(key, suffix + '_least')} {value:.{digits}f} to {most_text} {unit}")
    if "matched_share" in element:
        share = element["matched_share"]
        match = "matched" if share == 1 else f"matched at {100 * share:.0f} % of phases"
    else:
        match = "matched" if element.get("matched") else "CANNOT MATCH"
    return match, str(element.get("arrangement", "")), ", ".join(values)


def _by_element(rows, kind):
    """The elements of ``kind`` (position, label) and, per row, each one's JSON entry."""
    first = rows[0]["elements"] if rows else []
    found = [(n, e["label"]) for n, e in enumerate(first) if e["kind"] == kind]
    return [{"label": label, "rows": [(row["label"], row["elements"][n]) for row in rows]} for n, label in found]


def _budget_view(doc):
    """Everything the template shows of a budget document, formatted."""
    rows = doc["rows"]
    tuners = _by_element(rows, "tuner")
    swr_only = any("total_loss_db_range" in row for row in rows)
    budget_rows = []
    for row in rows:
        tuner_loss = [e["loss_db"] for e in row["elements"] if e["kind"] == "tuner"]
        budget_rows.append({
            "label": row["label"], "mhz": f"{row['frequency_hz'] / 1e6:.4g}",
            "swr_antenna": _swr(row["swr_antenna"]), "swr_radio": _swr(row["swr_radio"]),
            "radio": f"{row['radio_forward_w']:.1f} / {row['radio_reflected_w']:.1f}",
            "radio_mismatch": _db(row["radio_mismatch_loss_db"]),
            "matched": _db(row["matched_loss_db"]), "mismatch": _db(row["mismatch_loss_db"]),
            "total": _db(row["total_loss_db"]),
            "tuner": _db(None if None in tuner_loss else sum(tuner_loss)) if tuners else None,
            "antenna_w": _watts(row["power_antenna_w"]),
            "heat_w": _watts(row["power_radio_w"] - row["power_antenna_w"]),
            "loss_range": (" to ".join(_db(v) for v in row["total_loss_db_range"]) if swr_only else None),
            "z_antenna": _impedance(row["z_antenna_ohm"]), "z_radio": _impedance(row["z_radio_ohm"]),
        })
    first = rows[0]["elements"] if rows else []
    elements = {"headers": [f"{e['kind']}: {e['label']}" for e in first],
                "rows": [(row["label"], [f"{_db(e['loss_db'])} dB / {e['dissipated_w']:.1f} W"
                                         for e in row["elements"]]) for row in rows]}
    meters = [{"label": m["label"], "rows": [(label, _swr(e["swr"]), _watts(e["forward_w"]), _watts(e["reflected_w"]))
                                            for label, e in m["rows"]]} for m in _by_element(rows, "meter")]
    tuner_views = [{"label": t["label"], "rows": [(label, *_tuner_setting(e)) for label, e in t["rows"]]}
                   for t in tuners]
    measured = [(row["label"], _swr(row["measured"].get("swr_antenna_least")),
                 _swr(row["measured"].get("swr_antenna_most")), _swr(row["measured"]["sensitivity"]))
                for row in rows if "measured" in row]
    wire = [(row["label"], _impedance(row["z_antenna_ohm"]), f"{row['wire']['peak_gain_dbi']:.1f}",
             f"{row['wire']['wire_loss_db']:.3f}", f"{row['wire']['wire_heat_w']:.2f}") for row in rows if "wire" in row]
    return {"rows": budget_rows, "elements": elements, "meters": meters, "tuners": tuner_views,
            "swr_only": swr_only, "has_tuner": bool(tuners), "measured": measured,
            "measured_reading": any("swr_antenna_least" in row.get("measured", {}) for row in rows), "wire": wire,
            **_safety_view(doc)}


def _safety_view(doc):
    """Line stress, tuner part stress and exposure distances of a budget document, formatted."""
    rows = doc["rows"]
    lines = []
    for line in _by_element(rows, "line"):
        lines.append({"label": line["label"], "rows": [
            (label, f"{e['voltage_max_rms_v']:.0f}", f"{e['voltage_max_peak_v']:.0f}", f"{e['voltage_max_at_m']:.1f}",
             f"{e['current_max_rms_a']:.2f}", f"{e['current_max_at_m']:.1f}",
             f"{e['voltage_margin']:.1f}" if "voltage_margin" in e else "no rating",
             _margin(e["power_margin"]) if "power_margin" in e else "no rating",
             f"{e['heat_max_w_per_m']:.2f} / " + (f"{e['heat_rating_w_per_m']:.2f}" if "heat_rating_w_per_m" in e
                                                  else "no rating"))
            for label, e in line["rows"]]})
    parts = []
    for tuner in _by_element(rows, "tuner"):
        names = list(dict.fromkeys(key[:-len("_voltage_peak_v")] for _, e in tuner["rows"] for key in e
                                   if key.endswith("_voltage_peak_v")))  # radio side first, as the budget
        if names:
            parts.append({"label": tuner["label"], "parts": [n.replace("_", " ") for n in names], "rows": [
                (label, [f"{e[n + '_voltage_peak_v']:.0f} V / {e[n + '_current_rms_a']:.2f} A"
                         if e.get(n + "_dissipated_w") is not None else "" for n in names])  # "": not in the network
                for label, e in tuner["rows"]]})
    exposure = []
    for row in rows:
        x = row["exposure"]
        if "near_field_m" not in x:
            continue
        near = x["near_field_m"]
        exposure.append((row["label"], _watts(x["power_average_w"]), _watts(x["eirp_w"]),
                         _distance(x["fcc_uncontrolled_m"], near), _distance(x["fcc_controlled_m"], near),
                         _distance(x["icnirp_general_public_m"], near), _distance(near, None)))
    return {"line_stress": lines, "tuner_stress": parts, "exposure": exposure}


def _compare_view(doc):
    """The comparison document, formatted: per row the watts of each alternative and the winner."""
    if doc is None:
        return None
    rows = [(row["label"], [_watts(a["power_antenna_w"]) for a in row["alternatives"]], row["winner"],
             "inf" if row["margin_db"] is None else f"{row['margin_db']:.2f}") for row in doc["rows"]]
    changes = [(name, "; ".join(change)) for name, change in zip(doc["alternatives"], doc["changes"]) if change]
    return {"alternatives": doc["alternatives"], "rows": rows, "changes": changes}


def _explanations(*documents):
    """The ``explanations`` lists of the documents that carry one, each entry once, in order, as
    {row, heading, text}: the heading is the topic as the text output names it; empty where none does."""
    seen, found = set(), []
    for doc in documents:
        for item in (doc or {}).get("explanations") or ():
            if not isinstance(item, dict):
                continue
            topic = str(item.get("topic") or "")
            entry = (str(item.get("row") or ""), TOPIC_HEADINGS.get(topic, topic), str(item.get("text") or ""))
            if entry not in seen:
                seen.add(entry)
                found.append(dict(zip(("row", "heading", "text"), entry)))
    return found


def page_warnings(budget_doc, compare_doc=None) -> tuple[str, ...]:
    """Every warning of the page: the budget's, then those of the comparison it lacks."""
    found = list(budget_doc.get("warnings", ()))
    found += [w for w in (compare_doc or {}).get("warnings", ()) if w not in found]
    return tuple(found)


_ID = re.compile(r'\bid="([^"]+)"')


def inline_svg(svg, prefix):
    """SVG text with every element id, and every reference to one (``#id`` in ``href`` and
    ``url()``), prefixed with ``prefix``: two figures on one page never share an id."""
    ids = set(_ID.findall(svg))
    svg = _ID.sub(lambda m: f'id="{prefix}{m.group(1)}"', svg)
    return re.sub(r'(href="#|url\(#)([^")]+)', lambda m: m.group(1) + (prefix + m.group(2) if m.group(2) in ids
                                                                      else m.group(2)), svg)


def report_html(budget_doc, *, figures, version, generated, station_text=None, source_name="",
                compare_doc=None):
    """The report page.

    Parameters
    ----------
    budget_doc : dict
        The budget's ``to_dict()`` (the document of ``linecalc budget --format json``, which
        also carries the safety figures and cautions).
    figures : sequence of Figure
        One per kind of `FIGURES` that was tried, drawn or skipped with its reason.
    version : str
        The linecalc version, shown in the header.
    generated : datetime.datetime
        When the report was made (UTC), shown in the header.
    station_text : str or None
        The station file's text, echoed at the end; None if there is no file to echo.
    source_name : str
        The station file's name as given.
    compare_doc : dict or None
        The comparison's ``to_dict()`` where the station has a ``compare:`` key.

    Returns
    -------
    str
        The whole HTML document.
    """
    import importlib.resources

    import jinja2
    from markupsafe import Markup

    environment = jinja2.Environment(autoescape=True, undefined=jinja2.StrictUndefined, trim_blocks=True,
                                     lstrip_blocks=True)
    template = environment.from_string(
        (importlib.resources.files("linecalc.render") / "templates" / TEMPLATE).read_text(encoding="utf-8"))
    titles = {kind: (title, caption) for kind, title, caption in FIGURES}
    figure_views = [{"kind": f.kind, "title": titles[f.kind][0], "caption": titles[f.kind][1],
                     "svg": Markup(inline_svg(f.svg, f"fig-{f.kind}-")) if f.svg is not None else None,
                     "skipped": f.skipped} for f in figures]
    return template.render(
        doc=budget_doc, budget=_budget_view(budget_doc), compare=_compare_view(compare_doc),
        figures=figure_views, drawn={f["kind"] for f in figure_views if f["svg"] is not None},
        warnings=list(budget_doc.get("warnings", ())),
        compare_warnings=list(page_warnings(budget_doc, compare_doc)[len(budget_doc.get("warnings", ())):]),
        cautions=list(budget_doc.get("cautions", ())),
        explanations=_explanations(budget_doc, compare_doc), version=version,
        generated=generated.strftime("%Y-%m-%d %H:%M UTC"), station_text=station_text, source_name=source_name,
        swr_only_note=SWR_ONLY_NOTE, near_field_note=NEAR_FIELD_NOTE, heat_note=HEAT_NOTE[0].upper() + HEAT_NOTE[1:] + ".")
