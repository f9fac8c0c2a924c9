"""The HTML report (`linecalc.render.html_report`, `linecalc.render_report`): its structure and
text, parsed with the standard library's html.parser (not pixels: the browser test looks at
those), the escaping of every string from the station, and the explanations it lights up when a
document carries them."""
from __future__ import annotations

import copy
import datetime
import html
import json
from html.parser import HTMLParser

import pytest

import linecalc
from linecalc import api
from linecalc.render import html_report

GENERATED = datetime.datetime(2026, 1, 1, tzinfo=datetime.timezone.utc)
SECTIONS = ["warnings", "budget", "figures", "safety", "station-file", "about"]


class Page(HTMLParser):
    """What a test needs of a page: every start tag with its attributes, the text under each
    heading, each table's rows of cell texts (by the table's id or class), the figures."""

    def __init__(self, text):
        super().__init__(convert_charrefs=True)
        self.tags, self.headings, self.tables, self.pre, self.text = [], [], {}, [], ""
        self._heading, self._table, self._row, self._cell, self._in_pre, self._svg_depth = None, None, None, None, 0, 0
        self.feed(text)
        self.close()

    def handle_starttag(self, tag, attrs):
        attrs = dict(attrs)
        self.tags.append((tag, attrs))
        if tag == "svg":
            self._svg_depth += 1
        if self._svg_depth:
            return
        if tag in ("h1", "h2", "h3"):
            self._heading = [tag, ""]
        elif tag == "table":
            self._table = self.tables.setdefault(attrs.get("id") or attrs.get("class"), [])
        elif tag == "tr" and self._table is not None:
            self._row = []
        elif tag in ("td", "th") and self._row is not None:
            self._cell = ""
        elif tag == "pre":
            self._in_pre = True
            self.pre.append("")

    def handle_endtag(self, tag):
        if tag == "svg":
            self._svg_depth -= 1
        if self._svg_depth:
            return
        if tag in ("h1", "h2", "h3") and self._heading:
            self.headings.append((self._heading[0], self._heading[1].strip()))
            self._heading = None
        elif tag in ("td", "th") and self._cell is not None:
            self._row.append(self._cell.strip())
            self._cell = None
        elif tag == "tr" and self._row is not None:
            self._table.append(self._row)
            self._row = None
        elif tag == "table":
            self._table = None
        elif tag == "pre":
            self._in_pre = False

    def handle_data(self, data):
        if self._svg_depth:
            return
        self.text += data
        if self._heading:
            self._heading[1] += data
        if self._cell is not None:
            self._cell += data
        if self._in_pre:
            self.pre[-1] += data

    def ids(self):
        return [attrs["id"] for tag, attrs in self.tags if "id" in attrs]

    def count(self, tag, **attrs):
        return sum(1 for t, a in self.tags if t == tag and all(a.get(k) == v for k, v in attrs.items()))


@pytest.fixture(scope="module")
def doublet(report_pages):
    text = report_pages["orchard-doublet"].read_text(encoding="utf-8")
    return text, Page(text)


@pytest.fixture(scope="module")
def doublet_doc(data_path):
    return linecalc.solve_budget(linecalc.load_station(data_path("orchard-doublet.yaml"))).to_dict()


def test_the_page_holds_every_section_in_order(doublet):
    _, page = doublet
    ids = page.ids()
    expected = SECTIONS[:4] + ["compare"] + SECTIONS[4:]
    assert [i for i in ids if i in expected] == expected
    assert page.headings[0] == ("h1", "Orchard house, 40 m doublet on 450-ohm window line")
    h2 = [text for level, text in page.headings if level == "h2"]
    assert h2 == ["Warnings", "Loss budget", "Figures", "Safety", "Alternatives", "Explanations",
                  "The station file",
                  "About these figures"]


def test_header_states_the_version_the_date_and_the_file(doublet):
    text, _ = doublet
    assert f"made by linecalc {linecalc.__version__} on 2026-01-01 00:00 UTC" in text
    assert "orchard-doublet.yaml" in text


def test_budget_table_shows_every_row_of_the_budget_document(doublet, doublet_doc):
    _, page = doublet
    header, *body = page.tables["budget-table"]
    assert header[:4] == ["row", "MHz", "SWR antenna", "SWR radio"]
    assert "tuner loss dB" in header  # the station has a tuner
    assert [cells[0] for cells in body] == [row["label"] for row in doublet_doc["rows"]]
    total = header.index("total loss dB")
    antenna = header.index("antenna W")
    for cells, row in zip(body, doublet_doc["rows"]):
        assert cells[total] == f"{row['total_loss_db']:.2f}"
        assert cells[antenna] == f"{row['power_antenna_w']:.1f}"


def test_elements_meter_and_tuner_tables(doublet, doublet_doc):
    _, page = doublet
    header, *body = page.tables["element-table"]
    assert header == ["row", "meter: shack meter", "tuner: balanced tuner", "line: window line"]
    assert len(body) == 8
    first_line = doublet_doc["rows"][0]["elements"][2]
    assert body[0][3] == f"{first_line['loss_db']:.2f} dB / {first_line['dissipated_w']:.1f} W"
    meter_header, *meter_rows = page.tables["meter-table"]
    assert meter_header == ["row", "SWR", "forward W", "reflected W"] and len(meter_rows) == 8
    tuner_header, *tuner_rows = page.tables["tuner-table"]
    assert tuner_header == ["row", "match", "arrangement", "settings"]
    assert {cells[2] for cells in tuner_rows} == {"series-C/shunt-L/series-C"}
    assert all("input series capacitor" in cells[3] and " pF" in cells[3] for cells in tuner_rows)


def test_every_figure_inline_as_svg(doublet):
    _, page = doublet
    assert page.count("figure") == 5
    assert page.count("svg") == 5
    assert [attrs["id"] for tag, attrs in page.tags if tag == "figure"] == [
        "figure-swr", "figure-smith", "figure-voltage", "figure-budget", "figure-compare"]


def test_figures_that_do_not_apply_are_skipped_with_a_sentence(report_pages):
    text = report_pages["shack-reading"].read_text(encoding="utf-8")
    page = Page(text)
    drawn = [attrs["id"] for tag, attrs in page.tags if tag == "figure"]
    skipped = [attrs["id"] for tag, attrs in page.tags if attrs.get("class") == "figure-skipped"]
    assert drawn == ["figure-swr", "figure-budget"]
    assert skipped == ["figure-smith", "figure-voltage", "figure-compare"]
    assert "Not drawn for this station: the station file has no compare: key." in text
    assert "SWR alone has no phase" in text
    assert "compare" not in page.ids()  # no comparison section without a compare: key


def test_a_measured_reading_shows_its_range_at_the_antenna(report_pages, data_path):
    page = Page(report_pages["shack-reading"].read_text(encoding="utf-8"))
    doc = linecalc.solve_budget(linecalc.load_station(data_path("shack-reading.yaml"))).to_dict()
    measured = doc["rows"][0]["measured"]
    header, row = page.tables["measured-table"]
    assert header == ["row", "least SWR at the antenna", "most SWR at the antenna", "error multiplier"]
    assert row == ["14.2 MHz", f"{measured['swr_antenna_least']:.2f}", f"{measured['swr_antenna_most']:.2f}",
                   f"{measured['sensitivity']:.2f}"]
    assert "loss range dB" in page.tables["budget-table"][0]  # an SWR-only antenna


def test_a_wire_antenna_row_shows_gain_loss_and_heat(plain_result):
    doc = json.loads(json.dumps(plain_result.to_dict()))
    for row in doc["rows"]:  # the keys a wire antenna adds (invented values: formatting only)
        row["wire"] = {"peak_gain_dbi": 5.04, "wire_loss_db": 0.1234, "wire_heat_w": 2.345}
    page = Page(html_report.report_html(doc, figures=[], version="0", generated=GENERATED))
    header, *body = page.tables["wire-table"]
    assert header == ["row", "feedpoint ohm", "peak gain dBi", "wire loss dB", "wire heat W"]
    assert body[0] == ["7.1 MHz", "50.0+j0.0", "5.0", "0.123", "2.35"]


def test_safety_section_holds_the_cautions_and_the_stress(doublet, doublet_doc):
    _, page = doublet
    for caution in doublet_doc["cautions"]:
        assert caution in page.text
    assert doublet_doc["cautions"]
    header, *body = page.tables["line-stress-table"]
    assert header[1] == "V max RMS" and len(body) == 8
    assert body[1][1] == f"{doublet_doc['rows'][1]['elements'][2]['voltage_max_rms_v']:.0f}"
    assert len(page.tables["tuner-stress-table"]) == 9
    exposure_header, *exposure = page.tables["exposure-table"]
    assert "ICNIRP 2020 public m" in exposure_header and len(exposure) == 8


def test_line_stress_shows_the_heat_at_the_hottest_point_against_the_rating(doublet, doublet_doc):
    # the columns `linecalc safety` prints (render/tables.py safety_table), from the same JSON keys
    _, page = doublet
    header, *body = page.tables["line-stress-table"]
    assert header[-2:] == ["power margin", "hottest W/m avg / rated"]
    for cells, row in zip(body, doublet_doc["rows"]):
        line = row["elements"][2]  # the window line (tests/data/orchard-doublet.yaml)
        assert line["kind"] == "line" and "heat_rating_w_per_m" in line
        assert cells[-2] == f"{line['power_margin']:.1f}"
        assert cells[-1] == f"{line['heat_max_w_per_m']:.2f} / {line['heat_rating_w_per_m']:.2f}"
    assert "Hottest W/m: heat per metre at the line's hottest point at average power" in page.text


def test_tuner_stress_cell_is_empty_where_the_network_leaves_the_part_out(l_tuner_result):
    doc = l_tuner_result.to_dict()  # an L tuner: in bypass on 3.6 MHz, two parts on the other rows
    page = Page(html_report.report_html(doc, figures=[], version="0", generated=GENERATED))
    header, *body = page.tables["tuner-stress-table"]
    for cells, row in zip(body, doc["rows"]):
        entry = row["elements"][0]
        for name, cell in zip(header[1:], cells[1:]):
            assert (cell == "") == (entry[name.replace(" ", "_") + "_dissipated_w"] is None), (cells, name)
    assert body[0][1:] == [""] * (len(header) - 1) and all(cells.count("") == 1 for cells in body[1:])
    assert "the row's network leaves the part out" in page.text


def test_line_stress_of_a_line_without_ratings_or_current(doublet_doc):
    doc = copy.deepcopy(doublet_doc)
    lines = [e for row in doc["rows"] for e in row["elements"] if e["kind"] == "line"]
    lines[0]["power_margin"] = None  # a line that carries no current does not heat (docs/json.md)
    for line in lines[1:]:
        for key in ("voltage_margin", "power_margin", "heat_rating_w_per_m", "power_rating_w", "heating_power_w"):
            line.pop(key, None)
    page = Page(html_report.report_html(doc, figures=[], version="0", generated=GENERATED))
    _, first, second, *_ = page.tables["line-stress-table"]
    assert first[-2] == "n/a"
    assert second[-3:] == ["no rating", "no rating", f"{lines[1]['heat_max_w_per_m']:.2f} / no rating"]


def test_warnings_are_all_on_the_page(doublet, data_path):
    _, page = doublet
    comparison = linecalc.solve_compare(linecalc.load_station(data_path("orchard-doublet.yaml")))
    assert comparison.warnings
    for warning in comparison.warnings:
        assert warning in page.text
    assert ("h3", "Warnings about the alternatives") in page.headings


def test_the_station_file_is_echoed_whole(doublet, data_path):
    _, page = doublet
    assert page.pre == [data_path("orchard-doublet.yaml").read_text(encoding="utf-8")]


def test_nothing_is_fetched_and_nothing_runs(doublet, report_pages):
    for text in (doublet[0], report_pages["shack-reading"].read_text(encoding="utf-8")):
        page = Page(text)
        assert "<script" not in text.lower()
        assert not [tag for tag, _ in page.tags if tag in ("script", "link", "iframe", "img", "object", "embed",
                                                             "base", "form")]
        for tag, attrs in page.tags:
            for key in ("src", "href", "xlink:href", "action", "srcset"):
                if key in attrs:
                    assert attrs[key].startswith("#"), (tag, key, attrs[key])
            assert "url(http" not in (attrs.get("style") or "")
        (policy,) = [a["content"] for t, a in page.tags if t == "meta" and a.get("http-equiv") ==
                     "Content-Security-Policy"]
        assert policy.startswith("default-src 'none';")


def test_figure_ids_are_unique_on_the_page(doublet):
    _, page = doublet
    ids = page.ids()
    assert len(ids) == len(set(ids))


def test_print_css_keeps_figures_whole_and_sets_the_page(doublet):
    text, _ = doublet
    style = text[text.index("<style>"):text.index("</style>")]
    assert "@page" in style and "@media print" in style
    assert "figure { margin: 1em 0; break-inside: avoid;" in style


# Invented test station: every string the page shows is markup that must stay text; and its feed
# has no line (a connector pair only), so it has no voltage figure.
ESCAPE_STATION = """\
name: "<script>alert('name')</script> & <b>co</b>"
radio: {power: 100 W}
frequencies: [7.1 MHz]
antenna: {impedance: {7.1 MHz: 60+j10}}
feed:
  - connector: {label: "<img src=x onerror=alert(1)>", count: 2}
"""


@pytest.fixture(scope="module")
def escaped(tmp_path_factory):
    folder = tmp_path_factory.mktemp("escape")
    (folder / "escape.yaml").write_text(ESCAPE_STATION, encoding="utf-8")
    linecalc.render_report(linecalc.load_station(folder / "escape.yaml"), folder / "escape.html", generated=GENERATED)
    return (folder / "escape.html").read_text(encoding="utf-8")


def test_every_user_string_is_escaped(escaped):
    page = Page(escaped)
    assert "<script" not in escaped.lower()
    assert "<img" not in escaped.lower()
    assert not [tag for tag, _ in page.tags if tag in ("script", "img", "b")]
    assert page.headings[0] == ("h1", "<script>alert('name')</script> & <b>co</b>")
    assert "&lt;script&gt;alert(&#39;name&#39;)&lt;/script&gt; &amp; &lt;b&gt;co&lt;/b&gt;" in escaped
    assert page.pre == [ESCAPE_STATION]
    assert page.tables["element-table"][0][1] == "connector: <img src=x onerror=alert(1)>"


def test_a_station_without_a_line_has_no_voltage_figure(escaped):
    page = Page(escaped)
    assert [a["id"] for t, a in page.tags if t == "figure"] == ["figure-swr", "figure-smith", "figure-budget"]
    assert "Not drawn for this station: the feed has no line to draw the voltage along." in page.text
    assert "line-stress-table" not in page.tables


def test_an_empty_feed_is_said_so(plain_result):
    doc = json.loads(json.dumps(plain_result.to_dict()))
    for row in doc["rows"]:
        row["elements"] = []
    page = Page(html_report.report_html(doc, figures=[], version="0", generated=GENERATED))
    assert "The feed is empty: the antenna is connected straight to the radio." in page.text
    assert "element-table" not in page.tables


def test_explanations_are_shown_when_a_document_carries_them(plain_result):
    doc = json.loads(json.dumps(plain_result.to_dict()))
    assert "explanations" not in doc
    plain = html_report.report_html(doc, figures=[], version="0", generated=GENERATED)
    assert 'id="explanations"' not in plain
    doc["explanations"] = [{"row": "7.1 MHz", "rows": ["7.1 MHz"], "topic": "<i>why</i>",
                            "text": "The coax loses a little.", "figures": {"loss_db": 0.4}},
                           {"row": "7.1 MHz", "rows": ["7.1 MHz"], "topic": "watts", "text": "Most watts arrive.",
                            "figures": {}}]
    text = html_report.report_html(doc, figures=[], version="0", generated=GENERATED)
    page = Page(text)
    assert "explanations" in page.ids()
    assert "&lt;i&gt;why&lt;/i&gt;" in text and "The coax loses a little." in text
    # a known topic is headed as the text output heads it
    assert "7.1 MHz, where the watts go" in page.text and "Most watts arrive." in page.text


def test_the_report_explains_the_budget_and_safety(tmp_path, data_path):
    """The page carries the same paragraphs as ``budget --explain`` and ``safety --explain``."""
    station = api.load_station(data_path("tuner-in-shack.yaml"))
    out = tmp_path / "r.html"
    api.render_report(station, out)
    text = out.read_text(encoding="utf-8")
    expected = (api.solve_budget(station, explain=True).explanations
                + api.solve_safety(station, explain=True).explanations)
    assert expected
    shown = html.unescape(text)
    for entry in expected:
        assert entry.text in shown


def test_inline_svg_prefixes_ids_and_their_references():
    svg = '<svg><defs><path id="g1"/></defs><use xlink:href="#g1"/><g clip-path="url(#g1)"/><a href="#other"/></svg>'
    out = html_report.inline_svg(svg, "fig-x-")
    assert 'id="fig-x-g1"' in out and 'xlink:href="#fig-x-g1"' in out and "url(#fig-x-g1)" in out
    assert 'href="#other"' in out  # not an id of this figure: left alone
