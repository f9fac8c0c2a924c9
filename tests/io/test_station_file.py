"""Checks of linecalc.io.station_file, the loader: ``load_station``, ``parse_station_text``,
``station_from_document`` and ``input_files``.

Every top-level key of a station file and its defaults, unit invariance, band names to
frequencies per ITU region, the ``compare:`` key, the lines the loader records, and bad input:
each a `StationError` whose text is ``FILE:LINE: ... (at key.path)`` with the line of the key at
fault. What is valid comes from the README's station-file section. The expected lines are found
in the test's own text (`line_of`), never taken from the loader; the feed's elements have their
own bad-input checks in tests/cli/test_elements_cli.py.
"""
from __future__ import annotations

import re

import numpy as np
import pytest
import yaml

from linecalc import elements
from linecalc.errors import InputError, LinecalcError, StationError
from linecalc.io.station_file import input_files, load_station, parse_station_text, station_from_document
from linecalc.physics.loads import ImpedanceTable, MeasuredAntenna, SwrTable
from linecalc.studies.budget import solve_budget
from linecalc.studies.station import CompareSpec, Station

FOOT_M = 0.3048  # exactly: NIST SP 811 (2008), appendix B.8 (foot, international)


METRES = """\
name: Unit test
frequencies: [7.1 MHz, 14.2 MHz]
radio: {power: 100 W, impedance: 50 ohm}
antenna:
  impedance: {7.1 MHz: 58+j12, 14.2 MHz: 180-j220}
feed:
  - line:
      length: 30.48 m
      cable: {impedance: 50 ohm, velocity_factor: 0.66,
              loss: {1 MHz: 0.525 dB/100m, 10 MHz: 1.804 dB/100m, 100 MHz: 6.562 dB/100m}}
  - line: {length: 12 m, cable: {geometry: two-wire, wire_diameter: 2.05 mm, spacing: 152 mm}}
"""

# The same station in feet, kHz, kilowatts and dB per 100 ft (1 ft = 0.3048 m exactly, NIST SP 811,
# appendix B): the answers must not move.
FEET = (METRES.replace("30.48 m", "100 ft").replace("7.1 MHz", "7100 kHz").replace("100 W", "0.1 kW")
        .replace("0.525 dB/100m", "0.16002 dB/100ft").replace("1.804 dB/100m", "0.5498592 dB/100 ft")
        .replace("6.562 dB/100m", "0.02000098 dB/ft").replace("12 m", "472.4409448818898 in")
        .replace("2.05 mm", "0.205 cm").replace("152 mm", "0.152 m"))


def test_feet_and_metres_give_the_same_answer():
    a = solve_budget(parse_station_text(METRES))
    b = solve_budget(parse_station_text(FEET))
    np.testing.assert_allclose(b.power_antenna_w, a.power_antenna_w, rtol=1e-6)
    np.testing.assert_allclose(b.swr_radio, a.swr_radio, rtol=1e-6)
    np.testing.assert_allclose(b.total_loss_db, a.total_loss_db, rtol=1e-6)


def test_swr_only_antenna_reports_phase_average_and_range():
    text = METRES.replace("impedance: {7.1 MHz: 58+j12, 14.2 MHz: 180-j220}", "swr: {7.1 MHz: 2.5, 14.2 MHz: 4}")
    result = solve_budget(parse_station_text(text))
    assert result.z_antenna_ohm is None and result.z_radio_ohm is None
    low, high = result.total_loss_db_range.T
    assert np.all(low <= result.total_loss_db) and np.all(result.total_loss_db <= high)


def test_single_point_table_only_answers_at_its_frequency():
    text = METRES.replace("frequencies: [7.1 MHz, 14.2 MHz]", "frequencies: [7.1 MHz]").replace(
        "{7.1 MHz: 58+j12, 14.2 MHz: 180-j220}", "{7.1 MHz: 58+j12}")
    result = solve_budget(parse_station_text(text))
    assert result.z_antenna_ohm[0] == pytest.approx(58 + 12j)
    with pytest.raises(StationError, match="outside the antenna table"):
        parse_station_text(text.replace("frequencies: [7.1 MHz]", "frequencies: [7.2 MHz]"))


def test_bands_and_frequencies_both_give_rows():
    text = METRES.replace("frequencies: [7.1 MHz, 14.2 MHz]", "region: 2\nbands: [40m]\nfrequencies: [14.2 MHz]").replace(
        "7.1 MHz: 58+j12", "7.0 MHz: 50-j30, 7.3 MHz: 70+j30")
    station = parse_station_text(text)
    assert station.labels == ("40m", "14.2 MHz")
    # ITU Radio Regulations, Article 5: 40 m in Region 2 is 7.0-7.3 MHz, centre 7.15 MHz (ITU_EDGES_HZ below)
    assert station.frequency_hz[0] == pytest.approx(7.15e6)


@pytest.mark.parametrize("frequency", ["0 Hz", "-7 MHz", "0 MHz"])
def test_frequency_zero_or_below_is_refused(frequency):
    text = f"""
name: zero
frequencies: [{frequency}]
radio: {{power: 100 W}}
antenna: {{impedance: {{7 MHz: 50}}}}
feed: []
"""
    with pytest.raises(StationError, match="greater than zero"):
        parse_station_text(text, "zero.yaml")


def test_antenna_table_frequency_zero_is_refused():
    text = """
name: zero
frequencies: [7 MHz]
radio: {power: 100 W}
antenna: {impedance: {0 MHz: 50, 7 MHz: 50}}
feed: []
"""
    with pytest.raises(StationError, match="greater than zero"):
        parse_station_text(text, "zero.yaml")


# --- every top-level key -----------------------------------------------------------------------

FULL = """\
name: Loader test station
region: 3
radio: {power: 0.4 kW, impedance: 75 ohm, mode: ssb, transmit_fraction: 0.5}
bands: [80m, 40m]
frequencies: [7.05 MHz, 3.6 MHz]
antenna:
  impedance: {3.4 MHz: 58+j12, 5 MHz: 58-j12, 7 MHz: 58+12j, 7.4 MHz: [60, -5], 8 MHz: 73}
  gain: 5 dBi
feed:
  - meter: {label: shack meter}
  - line: {label: main coax, cable: rg-213, length: 98 ft}
  - connector: {count: 2}
compare:
  main_line: main coax
  cables: [rg-8x, {impedance: 50 ohm, velocity_factor: 0.8, loss: {10 MHz: 1 dB/100m}}]
  tuner_positions: true
  line: main coax
  lengths: [1 m, 2 ft]
"""


@pytest.fixture(scope="module")
def full():
    return parse_station_text(FULL, "full.yaml")


def test_name_region_and_radio(full):
    assert isinstance(full, Station)
    assert full.name == "Loader test station"
    assert full.region == 3
    assert full.radio_power_w == pytest.approx(400.0, rel=1e-15)  # kilo = 10^3, SI Brochure, 9th ed., table 7
    assert full.reference_impedance_ohm == 75.0
    # FCC OET Bulletin 65, Supplement B: conversational SSB, duty factor 0.2 (from memory; the README's figure)
    assert full.mode == "ssb" and full.duty_factor == 0.2
    assert full.transmit_fraction == 0.5
    assert full.source_file == "full.yaml"


def test_bands_then_frequencies_give_the_rows_in_order(full):
    # README (Rows): the bands first, in the order given, then the explicit frequencies, each
    # labelled by its frequency in MHz; a band stands for the centre of its edges.
    # ITU Radio Regulations, Article 5, Table of Frequency Allocations, Region 3: 3 500-3 900 kHz and
    # 7 000-7 200 kHz to the amateur service (checked against a reproduction of the table).
    assert full.labels == ("80m", "40m", "7.05 MHz", "3.6 MHz")
    np.testing.assert_allclose(full.frequency_hz, [3.7e6, 7.1e6, 7.05e6, 3.6e6], rtol=1e-15)
    assert full.band_edges_hz[:2] == ((3.5e6, 3.9e6), (7.0e6, 7.2e6))
    assert full.band_edges_hz[2:] == (None, None)


def test_antenna_impedance_forms_and_gain(full):
    # README (The antenna): 58+j12, 58-j12, 58+12j and [58, 12] are complex ohm; a bare number is ohm
    assert isinstance(full.antenna, ImpedanceTable)
    np.testing.assert_array_equal(full.antenna.frequency_hz, [3.4e6, 5e6, 7e6, 7.4e6, 8e6])
    np.testing.assert_array_equal(full.antenna.impedance_ohm, [58 + 12j, 58 - 12j, 58 + 12j, 60 - 5j, 73 + 0j])
    assert full.antenna_gain_dbi == 5.0


def test_feed_elements_in_order_with_their_settings(full):
    kinds = [e.kind for e in full.feed]
    assert kinds == ["meter", "line", "connector"]
    meter, line, connector = full.feed
    assert meter.label == "shack meter"
    assert meter.impedance_ohm == 75.0  # README (feed table): a meter's impedance defaults to the radio's
    assert isinstance(line, elements.Line) and line.label == "main coax" and line.cable.id == "rg-213"
    assert line.length_m == pytest.approx(98 * FOOT_M, rel=1e-15)
    # README (feed table): a connector loses 0.05 dB each (common practice), count 2 here
    np.testing.assert_allclose(connector.matched_loss_db(np.array([7e6])), 0.1, rtol=1e-12)


def test_the_compare_key_is_read_into_station_compare(full, library):
    spec = full.compare
    assert isinstance(spec, CompareSpec)
    assert spec.main_line == "main coax" and spec.line == "main coax" and spec.tuner_positions is True
    (first, cable), (second, inline) = spec.cables
    assert first == "rg-8x" and cable == library["rg-8x"]
    assert second == "inline cable 2"
    # the inline cable as written: 50 ohm, velocity factor 0.8, 1 dB per 100 m at its one point
    # (to the 2 % that the README's limits of the models grant the two-term fit at HF)
    assert inline.z0_nominal_ohm == 50.0 and inline.velocity_factor == 0.8
    np.testing.assert_allclose(inline.matched_loss_db_per_m(np.array([10e6])), 0.01, rtol=0.02)
    np.testing.assert_allclose(spec.lengths_m, [1.0, 2 * FOOT_M], rtol=1e-15)


def test_key_lines_give_the_lines_of_antenna_feed_and_compare(full, line_of):
    for key in ("antenna", "feed", "compare"):
        assert full.key_lines[key] == line_of(FULL, f"{key}:"), key


def test_defaults_of_a_minimal_station():
    text = ("name: Minimal\nradio: {power: 100 W}\nfrequencies: [7.1 MHz]\n"
            "antenna: {impedance: {7.1 MHz: 50}}\nfeed: []\n")
    station = parse_station_text(text)
    assert station.reference_impedance_ohm == 50.0  # README: "impedance is optional, default 50 ohm"
    assert station.region == 2  # no region given: the default of Station.region (studies/station.py)
    # README (The radio): both default to the cautious 1, a continuous carrier, always transmitting
    assert station.mode == "carrier" and station.duty_factor == 1.0
    assert station.transmit_fraction == 1.0
    # README (The antenna): gain default 2.15 dBi, a half-wave dipole (Balanis, Antenna Theory,
    # 3rd ed., section 4.6: directivity 1.643, that is 2.16 dBi; from memory)
    assert station.antenna_gain_dbi == 2.15
    assert station.compare is None and station.feed == ()
    assert station.labels == ("7.1 MHz",) and station.band_edges_hz == (None,)
    assert station.source_file == "<station>"
    # README (The radio): it holds its forward power, no reflected-power limit, no largest power
    assert station.radio_holds == "forward"
    assert station.radio_foldback_swr is None and station.radio_max_power_w is None


@pytest.mark.parametrize("written, expected", [
    ("{power: 100 W, impedance: 75}", 75.0),        # the radio's impedance takes a bare number of ohm
    ("{power: 100 W, impedance: 0.3 kohm}", 300.0),
])
def test_radio_impedance_units(written, expected):
    text = f"name: Z\nradio: {written}\nfrequencies: [7.1 MHz]\nantenna: {{impedance: {{7.1 MHz: 50}}}}\nfeed: []\n"
    assert parse_station_text(text).reference_impedance_ohm == pytest.approx(expected, rel=1e-15)


@pytest.mark.parametrize("written, mode, duty", [
    ("0.35", "duty factor 0.35", 0.35),  # README: a number in (0, 1] is the duty factor itself
    ("CW", "cw", 0.4),                    # FCC OET Bulletin 65, Supplement B (from memory; the README's figure)
    ("am", "am", 0.5),
])
def test_radio_mode_by_name_or_number(written, mode, duty):
    text = (f"name: M\nradio: {{power: 100 W, mode: {written}}}\nfrequencies: [7.1 MHz]\n"
            "antenna: {impedance: {7.1 MHz: 50}}\nfeed: []\n")
    station = parse_station_text(text)
    assert station.mode == mode and station.duty_factor == duty


def _radio(written):
    return f"name: R\nradio: {written}\nfrequencies: [7.1 MHz]\nantenna: {{impedance: {{7.1 MHz: 50}}}}\nfeed: []\n"


def test_radio_holds_foldback_and_largest_power():
    station = parse_station_text(_radio("{power: 100 W, holds: net, foldback_swr: 2.5, max_power: 0.12 kW}"))
    assert station.radio_holds == "net" and station.radio_foldback_swr == 2.5
    assert station.radio_max_power_w == pytest.approx(120.0, rel=1e-15)


@pytest.mark.parametrize("written, message", [
    ("{power: 100 W, holds: available}", "holds is forward or net"),
    ("{power: 100 W, foldback_swr: 1}", "must be above 1"),
    ("{power: 100 W, foldback_swr: 2 W}", "expected a number"),
    ("{power: 100 W, max_power: 50 ohm}", "W"),
    ("{power: 200 W, max_power: 100 W}", "above max_power"),
])
def test_bad_radio_drive_keys_are_refused_at_their_line(written, message):
    with pytest.raises(StationError, match=message) as info:
        parse_station_text(_radio(written), "r.yaml")
    assert info.value.line == 2


def test_a_net_holding_radio_may_be_set_above_its_largest_forward_power():
    # a tube amplifier loaded for 200 W whose forward power cannot exceed 250 W: allowed
    station = parse_station_text(_radio("{power: 200 W, holds: net, max_power: 250 W}"))
    assert station.radio_max_power_w == 250.0


def test_a_name_written_as_a_whole_number_is_text():
    text = "name: 2\nradio: {power: 100 W}\nfrequencies: [7.1 MHz]\nantenna: {impedance: {7.1 MHz: 50}}\nfeed: []\n"
    assert parse_station_text(text).name == "2"


def test_gain_as_a_bare_number_of_dbi():
    text = ("name: G\nradio: {power: 100 W}\nfrequencies: [7.1 MHz]\n"
            "antenna: {impedance: {7.1 MHz: 50}, gain: -3}\nfeed: []\n")
    assert parse_station_text(text).antenna_gain_dbi == -3.0


def test_an_swr_table_and_where_it_was_measured():
    text = """\
name: Reading at a meter
frequencies: [14.2 MHz]
radio: {power: 100 W}
antenna:
  swr: {14.0 MHz: 1.8, 14.35 MHz: 2.4}
  measured_at: attic meter
feed:
  - line: {label: shack run, cable: rg-58, length: 30 m}
  - meter: {label: attic meter}
  - line: {label: attic run, cable: rg-213, length: 12 m}
"""
    station = parse_station_text(text)
    assert isinstance(station.antenna, MeasuredAntenna)
    assert station.antenna.node == 1  # the attic meter's input: after the first element of the feed
    table = station.antenna.table
    assert isinstance(table, SwrTable)
    np.testing.assert_array_equal(table.frequency_hz, [14.0e6, 14.35e6])
    np.testing.assert_array_equal(table.swr, [1.8, 2.4])
    at_radio = parse_station_text(text.replace("measured_at: attic meter", "measured_at: radio"))
    assert at_radio.antenna.node == 0


def test_a_touchstone_sweep_is_read_relative_to_the_station_file(data_path):
    skrf = pytest.importorskip("skrf")
    path = data_path("shack-sweep-dipole.yaml")
    station = load_station(path)
    assert isinstance(station.antenna, MeasuredAntenna) and station.antenna.node == 0  # measured_at: radio
    assert "demo-shack-sweep.s1p" in station.antenna.source
    # the same file as scikit-rf reads it: its frequencies and the impedance of its S data
    network = skrf.Network(str(path.parent / "demo-shack-sweep.s1p"))
    np.testing.assert_allclose(station.antenna.table.frequency_hz, network.f, rtol=1e-15)
    np.testing.assert_allclose(station.antenna.table.impedance_ohm, network.z[:, 0, 0], rtol=1e-12)
    # and the radio of that file: ssb, transmitting half the time
    assert station.mode == "ssb" and station.transmit_fraction == 0.5


# --- unit invariance ---------------------------------------------------------------------------

MIXED_METRES = """\
name: Units
frequencies: [7.1 MHz]
radio: {power: 1500 W, impedance: 50 ohm}
antenna:
  impedance: {7 MHz: 60-j10, 7.2 MHz: 70+j10}
feed:
  - line: {label: coax, cable: rg-213, length: 30.48 m}
  - stub: {label: stub, cable: rg-213, length: 2 m, end: short}
  - series: {label: coil, l: 0.5 uH, r: 1 ohm}
  - tuner: {label: tuner, capacitance: {min: 10 pF, max: 500 pF}, inductance: {min: 0.05 uH, max: 30 uH}}
compare:
  lengths: [1 m, 2 m]
"""
# The same station in feet, inches, kHz, kilowatts, nanofarads, nanohenries and kilohms
# (1 ft = 0.3048 m and 1 in = 0.0254 m exactly, NIST SP 811, appendix B.8; SI prefixes, SI
# Brochure, 9th ed., table 7).
MIXED_FEET = (MIXED_METRES.replace("[7.1 MHz]", "[7100 kHz]").replace("1500 W", "1.5 kW")
              .replace("50 ohm", "0.05 kohm").replace("30.48 m", "100 ft").replace("2 m, end", "78.74015748031496 in, end")
              .replace("0.5 uH", "500 nH").replace("10 pF", "0.01 nF").replace("500 pF", "0.5 nF")
              .replace("0.05 uH", "50 nH").replace("[1 m, 2 m]", "[100 cm, 2000 mm]"))


def test_feet_and_metres_give_the_same_station():
    a, b = parse_station_text(MIXED_METRES), parse_station_text(MIXED_FEET)
    assert a.labels == b.labels
    for name in ("radio_power_w", "reference_impedance_ohm"):
        assert getattr(b, name) == pytest.approx(getattr(a, name), rel=1e-12), name
    np.testing.assert_allclose(b.frequency_hz, a.frequency_hz, rtol=1e-12)
    assert [e.kind for e in b.feed] == [e.kind for e in a.feed]
    assert b.feed[0].length_m == pytest.approx(a.feed[0].length_m, rel=1e-12)
    assert b.feed[1].length_m == pytest.approx(a.feed[1].length_m, rel=1e-12)
    assert b.feed[2].inductance_h == pytest.approx(a.feed[2].inductance_h, rel=1e-12)
    for name in ("capacitance_min_f", "capacitance_max_f", "inductance_min_h", "inductance_max_h"):
        assert getattr(b.feed[3].parts, name) == pytest.approx(getattr(a.feed[3].parts, name), rel=1e-12), name
    np.testing.assert_allclose(b.compare.lengths_m, a.compare.lengths_m, rtol=1e-12)
    # and the elements with fixed chain matrices are the same two-ports (the tuner adapts to its load)
    f = np.array([1.8e6, 7.1e6, 30e6])
    for x, y in zip(a.feed[:3], b.feed[:3]):
        np.testing.assert_allclose(y.abcd(f), x.abcd(f), rtol=1e-12, atol=1e-15)


# --- band names per ITU region -------------------------------------------------------------------

# ITU Radio Regulations, Article 5, Table of Frequency Allocations, the allocations to the amateur
# service (checked against a reproduction of the table): 80 m is 3 500-3 800 kHz in Region 1,
# 3 500-4 000 kHz in Region 2 (its rows 3 500-3 750 and 3 750-4 000 kHz) and 3 500-3 900 kHz in
# Region 3; 40 m is 7 000-7 200 kHz everywhere since WRC-03, and 7 200-7 300 kHz is amateur in
# Region 2 as well (footnote 5.142).
ITU_EDGES_HZ = {
    1: {"80m": (3.5e6, 3.8e6), "40m": (7.0e6, 7.2e6)},
    2: {"80m": (3.5e6, 4.0e6), "40m": (7.0e6, 7.3e6)},
    3: {"80m": (3.5e6, 3.9e6), "40m": (7.0e6, 7.2e6)},
}


@pytest.mark.parametrize("region", [1, 2, 3])
def test_band_names_become_the_centres_of_their_itu_edges(region):
    text = (f"name: Bands\nregion: {region}\nradio: {{power: 100 W}}\nbands: [80m, 40 m]\n"
            "antenna: {impedance: {3.4 MHz: 50, 7.4 MHz: 50}}\nfeed: []\n")
    station = parse_station_text(text)
    edges = ITU_EDGES_HZ[region]
    assert station.labels == ("80m", "40m")
    assert station.band_edges_hz == (edges["80m"], edges["40m"])
    np.testing.assert_allclose(station.frequency_hz, [sum(edges["80m"]) / 2, sum(edges["40m"]) / 2], rtol=1e-15)


# --- input_files ---------------------------------------------------------------------------------

def test_input_files_name_the_station_and_its_sweep(data_path, write_file, tmp_path):
    sweep_station = data_path("shack-sweep-dipole.yaml")
    assert input_files(sweep_station) == [sweep_station, sweep_station.parent / "demo-shack-sweep.s1p"]
    plain = data_path("hilltop-dipole.yaml")
    assert input_files(plain) == [plain]
    # the name as written, stripped, relative to the station file; the sweep need not exist yet
    spaced = write_file("spaced.yaml", "name: x\nantenna: {touchstone: '  sweep.s1p  '}\n")
    assert input_files(spaced) == [spaced, tmp_path / "sweep.s1p"]


@pytest.mark.parametrize("content", ["name: [\n", b"name: caf\xe9\n", None, "- a list\n"])
def test_input_files_of_an_unreadable_station_name_only_itself(tmp_path, content):
    path = tmp_path / "station.yaml"
    if isinstance(content, bytes):
        path.write_bytes(content)
    elif content is not None:
        path.write_text(content)
    assert input_files(path) == [path]


# --- the three ways in ---------------------------------------------------------------------------

def test_load_station_parse_text_and_document_give_the_same_station(data_path):
    path = data_path("orchard-doublet.yaml")
    text = path.read_text(encoding="utf-8")
    from_file = load_station(path)
    from_str_path = load_station(str(path))
    from_text = parse_station_text(text, path)
    from_document = station_from_document(yaml.safe_load(text), path)  # plain dicts and lists, no lines
    for station in (from_str_path, from_text, from_document):
        assert station.name == from_file.name and station.labels == from_file.labels
        np.testing.assert_array_equal(station.frequency_hz, from_file.frequency_hz)
        np.testing.assert_array_equal(station.antenna.impedance_ohm, from_file.antenna.impedance_ohm)
        assert station.feed == from_file.feed and station.compare == from_file.compare
        assert station.source_file == str(path)
    # a plain document has no lines to give: its errors name line 1
    with pytest.raises(StationError) as info:
        station_from_document({**yaml.safe_load(text), "colour": "red"}, "plain.yaml")
    assert str(info.value).startswith("plain.yaml:1: unknown key 'colour'")


def test_a_file_that_cannot_be_read_is_a_station_error(tmp_path):
    missing = tmp_path / "missing.yaml"
    with pytest.raises(StationError) as info:
        load_station(missing)
    assert str(info.value).startswith(f"{missing}:0: cannot read the station file")
    latin = tmp_path / "latin.yaml"
    latin.write_bytes(b"name: caf\xe9\n")
    with pytest.raises(StationError, match=r"latin.yaml:1: byte 0xe9 at column 10 is not UTF-8"):
        load_station(latin)


# --- bad input: FILE:LINE: message (at key.path) ----------------------------------------------

GOOD = """\
name: Loader test
region: 2
radio: {power: 100 W}
bands: [40m]
frequencies: [7.05 MHz]
antenna:
  impedance: {7.0 MHz: 60-j30, 7.3 MHz: 70+j30}
  gain: 2.15 dBi
feed:
  - meter: {label: shack meter}
  - line: {label: main coax, cable: rg-213, length: 30 m}
"""

# (replace this, with that, fragment of the line at fault, key path, words of the message)
BAD = {
    "unknown top-level key": ("region: 2\n", "region: 2\ncolour: red\n", "colour:", "colour", "unknown key 'colour'"),
    "unknown radio key": ("{power: 100 W}", "{power: 100 W, colour: red}", "radio:", "radio.colour", "unknown key"),
    "unknown antenna key": ("  gain: 2.15 dBi\n", "  gain: 2.15 dBi\n  height: 10 m\n", "height:", "antenna.height",
                            "allowed here: impedance, swr, touchstone, wire, measured_at, gain"),
    "missing power": ("{power: 100 W}", "{impedance: 50 ohm}", "radio:", "radio", "missing key 'power'"),
    "missing length": ("cable: rg-213, length: 30 m", "cable: rg-213", "main coax", "feed[1].line",
                       "missing key 'length'"),
    "wrong unit of power": ("100 W", "100 m", "radio:", "radio.power", "not a quantity in W"),
    "wrong unit of frequency": ("[7.05 MHz]", "[7.05 m]", "frequencies:", "frequencies[0]", "not a quantity in Hz"),
    "wrong unit of length": ("length: 30 m", "length: 30 W", "main coax", "feed[1].line.length", "not a quantity in m"),
    "bare power": ("100 W", "100", "radio:", "radio.power", "needs a unit"),
    "power of zero": ("100 W", "0 W", "radio:", "radio.power", "greater than zero"),
    "power past the limit": ("100 W", "1e9 W", "radio:", "radio.power", "beyond what linecalc handles"),
    "frequency outside the antenna table": ("[7.05 MHz]", "[7.05 MHz, 7.35 MHz]", "impedance:", "antenna.impedance",
                                            "outside the antenna table, which spans 7 to 7.3 MHz"),
    "band outside the antenna table": ("[40m]", "[40m, 20m]", "impedance:", "antenna.impedance",
                                       "20m (14.175 MHz) outside the antenna table"),
    "region 4": ("region: 2", "region: 4", "region:", "region", "region must be 1, 2 or 3"),
    "unknown band": ("[40m]", "[41m]", "bands:", "bands[0]", "unknown band '41m'"),
    # 1.25 m is allocated in Region 2 only (ITU Radio Regulations, Article 5; from memory)
    "band not in the region": ("region: 2\nradio: {power: 100 W}\nbands: [40m]",
                               "region: 1\nradio: {power: 100 W}\nbands: [40m, 1.25m]", "bands:", "bands[1]",
                               "not allocated to the amateur service in ITU region 1"),
    "empty frequencies": ("[7.05 MHz]", "[]", "frequencies:", "frequencies", "frequencies is a list"),
    "two antenna forms": ("  gain: 2.15 dBi\n", "  gain: 2.15 dBi\n  swr: {7 MHz: 2}\n", "antenna:", "antenna",
                          "exactly one of"),
    "unknown meter": ("  gain: 2.15 dBi\n", "  gain: 2.15 dBi\n  measured_at: attic meter\n", "measured_at:",
                      "antenna.measured_at", "known: radio, shack meter"),
    "gain past the limit": ("2.15 dBi", "150 dBi", "gain:", "antenna.gain", "-100 to 100 dBi"),
    "unknown mode": ("{power: 100 W}", "{power: 100 W, mode: shouting}", "radio:", "radio.mode", "unknown mode"),
    "transmit fraction above one": ("{power: 100 W}", "{power: 100 W, transmit_fraction: 1.5}", "radio:",
                                    "radio.transmit_fraction", "at most 1"),
    "a frequency twice": ("7.3 MHz: 70+j30", "7000 kHz: 70+j30", "impedance:", "antenna.impedance.7000 kHz",
                          "appears twice"),
    "negative resistance": ("60-j30", "-60-j30", "impedance:", "antenna.impedance.7.0 MHz", "resistance of zero or more"),
    "empty name": ("name: Loader test", "name: ''", "name:", "name", "expected text"),
    "unknown element": ("  - meter:", "  - wire:", "wire:", "feed[0]", "unknown element 'wire'"),
    "missing sweep file": ("impedance: {7.0 MHz: 60-j30, 7.3 MHz: 70+j30}", "touchstone: nope.s1p", "touchstone:",
                           "antenna.touchstone", "no such file"),
    "nothing to compare": ("feed:\n", "compare: {main_line: main coax}\nfeed:\n", "compare:", "compare",
                           "nothing to compare"),
    "tuner_positions not a boolean": ("feed:\n", "compare: {tuner_positions: 'yes'}\nfeed:\n", "compare:",
                                      "compare.tuner_positions", "true or false"),
    "unknown compare cable": ("feed:\n", "compare:\n  cables: [rg-8x, rg-99]\nfeed:\n", "cables:", "compare.cables[1]",
                              "unknown cable id 'rg-99'"),
    "compare length of zero": ("feed:\n", "compare:\n  lengths: [1 m, 0 m]\nfeed:\n", "lengths:", "compare.lengths[1]",
                               "greater than zero"),
}


@pytest.mark.parametrize("case", BAD, ids=list(BAD))
def test_bad_input_is_a_station_error_at_its_line_and_key(case, write_file, line_of):
    old, new, fragment, path, words = BAD[case]
    assert GOOD.count(old) == 1, old
    text = GOOD.replace(old, new)
    station = write_file("station.yaml", text)
    with pytest.raises(StationError) as info:
        load_station(station)
    error = info.value
    message = str(error)
    assert "\n" not in message
    line = line_of(text, fragment)
    assert message.startswith(f"{station}:{line}: "), (message, line)
    assert message.endswith(f" (at {path})"), message
    assert words in message, message
    assert (error.file, error.line, error.path) == (str(station), line, path)
    assert isinstance(error, InputError) and isinstance(error, LinecalcError)


@pytest.mark.parametrize("old, new, fragment, words", [
    ("name: Loader test\n", "", None, "missing key 'name'"),
    ("region: 2\n", "", None, "bands need the ITU region"),
    ("", "", None, "the file is empty"),
    ("feed:\n", "feed: [\n", "- meter", "YAML syntax error"),  # the first token a flow sequence cannot hold
    ("{power: 100 W}", "{power: 100 W, power: 50 W}", "radio:", "duplicate key 'power'"),
])
def test_errors_of_the_whole_document_name_a_line_and_no_key(old, new, fragment, words, line_of):
    text = GOOD.replace(old, new, 1) if old else ""
    with pytest.raises(StationError) as info:
        parse_station_text(text, "doc.yaml")
    message = str(info.value)
    line = 1 if fragment is None else line_of(text, fragment)
    assert re.match(rf"^doc\.yaml:{line}: ", message), (message, line)
    assert words in message and "(at " not in message, message


def test_parse_station_text_names_its_file_or_a_placeholder():
    with pytest.raises(StationError, match=r"^<station>:3: .*\(at radio\.power\)$"):
        parse_station_text(GOOD.replace("100 W", "100 m"))


CLAD_STATION = """\
name: Clad inner
radio: {{power: 100 W}}
frequencies: [0.5 MHz, 30 MHz]
antenna: {{impedance: {{0.5 MHz: 75, 30 MHz: 75}}}}
feed:
  - line:
      length: 30 m
      cable: {{geometry: coax, inner_diameter: 1.02 mm, dielectric_diameter: 4.57 mm, permittivity: 1.42, loss_tangent: 0.0001,
              inner_material: {material}{extra}}}
"""


def test_inline_copper_clad_steel_inner_by_its_cladding():
    # README (Cables, materials): inner_conductivity_iacs models a copper-clad steel inner by its
    # cladding over steel; without it the inner is copper. At 30 MHz the 0.089 mm cladding is 7.5
    # skin depths and the steel is not seen (the two agree to 0.1 %); at 0.5 MHz it is one skin
    # depth (93 um in copper) and the loss rises above copper's (the layered model against the
    # exact two-layer solution: tests/physics/test_cables.py).
    def loss(material, extra):
        line = parse_station_text(CLAD_STATION.format(material=material, extra=extra)).feed[0]
        return line.matched_loss_db(np.array([0.5e6, 30e6]))
    copper = loss("copper", "")
    assert np.array_equal(loss("copper-clad steel", ""), copper)
    clad = loss("copper-clad steel", ", inner_conductivity_iacs: 40")
    assert clad[1] == pytest.approx(copper[1], rel=1e-3)
    assert clad[0] > copper[0]
    with pytest.raises(StationError, match="belongs to inner_material: copper-clad steel"):
        loss("copper", ", inner_conductivity_iacs: 40")
    with pytest.raises(StationError, match="inner_conductivity_iacs"):
        loss("copper-clad steel", ", inner_conductivity_iacs: 5")


def test_a_frequency_just_outside_the_table_is_shown_with_its_digits(data_path):
    text = data_path("hilltop-dipole.yaml").read_text().replace("frequencies: [7.0 MHz, 7.2 MHz]",
                                                                "frequencies: [7.0 MHz, 7.2500001 MHz]")
    with pytest.raises(StationError) as info:
        parse_station_text(text, "near.yaml")
    # the table ends at 7.25 MHz (its last row, in the test station): 7.2500001 MHz is 0.1 Hz past it
    assert "7.2500001 MHz outside the antenna table" in str(info.value)
    assert "(7.25 MHz)" not in str(info.value)


@pytest.mark.parametrize("data", ["7.0 1 0\n7.1 0.2 0.1\n7.2 0.1 0\n", "7.0 0 0\n7.1 0 0\n7.2 0 0\n"],
                         ids=["one exact open in S", "all-zero Y"])
def test_a_sweep_with_an_exact_open_is_refused_at_its_key(tmp_path, data):
    # S = 1 (or Y = 0) is an infinite impedance (Pozar, Microwave Engineering, 4th ed., section 2.3:
    # Z = Z0 (1 + S) / (1 - S)); a sweep is interpolated in impedance, so the point is refused.
    parameter = "S" if data.startswith("7.0 1") else "Y"
    (tmp_path / "open.s1p").write_text(f"# MHz {parameter} RI R 50\n{data}")
    station = tmp_path / "station.yaml"
    station.write_text("name: t\nradio: {power: 100 W}\nfrequencies: [7.1 MHz]\n"
                       "antenna: {touchstone: open.s1p, measured_at: radio}\n"
                       "feed: [{line: {cable: rg-213, length: 10 m}}]\n")
    with pytest.raises(StationError) as info:
        load_station(station)
    assert str(info.value).startswith(f"{station}:4: ") and "exact open" in str(info.value)
    assert str(info.value).endswith("(at antenna.touchstone)")


@pytest.mark.parametrize("z", ["1e300", "1e308+j1e308", "2e9-j10"])
def test_an_antenna_impedance_past_one_gigohm_is_refused(z):
    # README (the limits past which input is refused): impedances up to 1 Gohm
    text = ("name: t\nradio: {power: 100 W}\nfrequencies: [7.1 MHz]\n"
            f"antenna: {{impedance: {{7.0 MHz: {z}, 7.2 MHz: 50}}}}\nfeed: []\n")
    with pytest.raises(StationError) as info:
        parse_station_text(text, "big.yaml")
    assert str(info.value).startswith("big.yaml:4: ") and "at most 1e+09 ohm" in str(info.value)
