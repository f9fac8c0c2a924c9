"""--explain (studies/explain.py): every number in a sentence is a figure of the same run's JSON,
rounded as the table rounds it; the SWR-at-the-radio sentence against the closed form; the
"would deliver more" sentence exactly where the comparison says so; no topic where it does not
apply."""
from __future__ import annotations

import math
import re
from dataclasses import dataclass
from pathlib import Path

import numpy as np
import pytest

import linecalc
from linecalc import elements
from linecalc.physics import cables, matching
from linecalc.physics.cables import SPEED_OF_LIGHT
from linecalc.physics.loads import ImpedanceTable

DATA = Path(__file__).resolve().parent.parent / "data"
STATIONS = sorted(p.name for p in DATA.glob("*.yaml"))
DB_PER_NEPER = 20 / math.log(10)  # 8.686 dB per neper (Pozar, Microwave Engineering, 4th ed., section 2.7)
NUMBER = re.compile(r"(?<![\w.\[-])-?\d+(?:\.\d+)?(?![\w\]-])")  # not [2], the table's alternative number


@pytest.fixture(scope="module")
def solved():
    """Per test station: (station, budget document, safety document, the comparison the budget's
    own alternatives stand for, as `linecalc compare [--tuner-positions]` gives it, or None)."""
    cache = {}

    def get(name):
        if name not in cache:
            station = linecalc.load_station(DATA / name)
            one_tuner = sum(e.kind == "tuner" for e in station.feed) == 1
            try:
                comparison = linecalc.solve_compare(station, tuner_positions=one_tuner).to_dict()
            except linecalc.LinecalcError:  # nothing to compare
                comparison = None
            cache[name] = (station, linecalc.solve_budget(station, explain=True).to_dict(),
                           linecalc.solve_safety(station, explain=True).to_dict(), comparison)
        return cache[name]

    return get


def _numbers(text, names):
    """The numbers a sentence states, with the labels and names it quotes (which may hold digits:
    rg-213, open-wire-600, ICNIRP 2020) taken out first."""
    for name in sorted(names, key=len, reverse=True):
        text = text.replace(name, " ")
    return [m.group(0) for m in NUMBER.finditer(text.replace("ICNIRP 2020", " "))]


def _printed_as(value, text):
    """Whether ``value`` printed with as many decimals as ``text`` has reads ``text``."""
    decimals = len(text.split(".")[1]) if "." in text else 0
    if value is None or not math.isfinite(value):
        return False
    printed = f"{value:.{decimals}f}"
    return printed == text or (printed == "-" + text and float(text) == 0) or (decimals == 0 and f"{value:g}" == text)


def _names(station, document):
    names = {e.label for e in station.feed} | {row["label"] for row in document["rows"]}
    names |= {cable.id for e in station.feed if (cable := getattr(e, "cable", None)) is not None}
    if station.compare:
        names |= {cable_id for cable_id, _ in station.compare.cables}
    return names


def _expected_figures(row, doc, figures):
    """Each figure of an explanation from the JSON document alone: a key of the row, of its
    exposure or of an element, or a closed form written out here from those keys."""
    elements_ = row["elements"]
    x = row.get("exposure", {})
    expected = {}
    for key, value in figures.items():
        if key in row:
            expected[key] = [row[key]]
        elif key in x:
            expected[key] = [x[key]]
        elif key == "rho_antenna":  # |rho| = (SWR - 1) / (SWR + 1) (Pozar, 4th ed., section 2.3)
            expected[key] = [(row["swr_antenna"] - 1) / (row["swr_antenna"] + 1)]
        elif key == "rho_radio":
            expected[key] = [(row["swr_radio"] - 1) / (row["swr_radio"] + 1)]
        elif key == "two_way_loss_db":  # the reflection crosses the matched loss twice (ARRL Antenna Book)
            expected[key] = [2 * row["matched_loss_db"]]
        elif key == "swr_radio_ceiling":  # an open or short at the far end: |rho| = 10^(-ML/10)
            r = 10 ** (-row["matched_loss_db"] / 10)
            expected[key] = [(1 + r) / (1 - r)]
        elif key == "heat_w":  # the table's path heat: radio watts less antenna watts
            expected[key] = [row["power_radio_w"] - row["power_antenna_w"]]
        elif key == "standing_wave_heat_w":  # the antenna watts of a matched path, less the real ones
            expected[key] = [row["power_radio_w"] * 10 ** (-row["matched_loss_db"] / 10) - row["power_antenna_w"]]
        elif key == "standing_wave_share_pct":
            heat = row["power_radio_w"] - row["power_antenna_w"]
            expected[key] = [100 * (row["power_radio_w"] * 10 ** (-row["matched_loss_db"] / 10)
                                    - row["power_antenna_w"]) / heat]
        elif key == "mismatch_loss_db_below":
            expected[key] = [-row["mismatch_loss_db"]]
        elif key == "reference_impedance_ohm":
            expected[key] = [doc["reference_impedance_ohm"]]
        elif key == "radio_setting_w":
            expected[key] = [doc["radio_power_w"]]
        elif key == "radio_cost_w":
            expected[key] = [doc["radio_power_w"] - row["power_radio_w"]]
        elif key in ("tuner_loss_db", "tuner_heat_w"):
            field = {"tuner_loss_db": "loss_db", "tuner_heat_w": "dissipated_w"}[key]
            expected[key] = [e[field] for e in elements_ if e["kind"] == "tuner"]
        elif key in ("line_loss_db", "line_matched_loss_db", "swr_line"):
            field = {"line_loss_db": "loss_db", "line_matched_loss_db": "matched_loss_db", "swr_line": "swr_out"}[key]
            expected[key] = [e[field] for e in elements_ if e["kind"] == "line"]
        elif key == "voltage_peak_v":  # the largest of every line's and tuner part's peak voltage
            expected[key] = [max(v for e in elements_ for k, v in e.items()
                                 if k == "voltage_max_peak_v" or (e["kind"] == "tuner" and k.endswith("_voltage_peak_v")))]
        elif key == "at_m":
            expected[key] = [e["voltage_max_at_m"] for e in elements_ if "voltage_max_at_m" in e]
        elif key == "sinks":
            expected[key] = None
        elif key in ("noticeable_limit_db", "power_better_w", "gain_db", "length_m"):
            expected[key] = None  # the comparison's: checked in the test of the alternative topic
        else:
            raise AssertionError(f"figure {key!r} has no counterpart in the JSON document")
    return expected


@pytest.mark.parametrize("name", STATIONS)
@pytest.mark.parametrize("command", ["budget", "safety"])
def test_every_number_in_an_explanation_is_a_figure_of_the_same_json(name, command, solved):
    station, budget_doc, safety_doc, _ = solved(name)
    doc = budget_doc if command == "budget" else safety_doc
    assert doc["explanations"], "every test station has something to explain"
    rows = {row["label"]: row for row in doc["rows"]}
    names = _names(station, doc)
    for entry in doc["explanations"]:
        assert entry["row"] == ", ".join(entry["rows"])
        row = rows[entry["rows"][0]]
        figures = entry["figures"]
        # each figure is the JSON's own (rtol 1e-12: the same float, or one closed form step)
        for key, candidates in _expected_figures(row, doc, figures).items():
            if candidates is None:
                continue
            assert any(math.isclose(figures[key], c, rel_tol=1e-9, abs_tol=1e-12) for c in candidates), (key, entry)
        for item in figures.get("sinks", []):
            assert any(e["label"] == item["label"] and e["dissipated_w"] == item["dissipated_w"]
                       for e in row["elements"])
        # and each number the text states is one of the figures, as printed
        values = [v for v in figures.values() if isinstance(v, (int, float))]
        values += [item["dissipated_w"] for item in figures.get("sinks", [])]
        for number in _numbers(entry["text"], names):
            assert any(_printed_as(v, number) for v in values), (number, entry["text"])


def test_the_numbers_are_the_tables_roundings(solved):
    # the budget table prints SWR and dB to two decimals and watts to one (render/tables.py);
    # the sentence for the same row prints the same strings
    _, doc, _, _ = solved("hilltop-dipole.yaml")
    row = doc["rows"][0]
    swr = next(e for e in doc["explanations"] if e["topic"] == "swr" and e["rows"][0] == row["label"])
    assert f"{row['swr_antenna']:.2f}" in swr["text"] and f"{row['swr_radio']:.2f}" in swr["text"]
    assert f"{row['matched_loss_db']:.2f} dB" in swr["text"]
    watts = next(e for e in doc["explanations"] if e["topic"] == "watts" and e["rows"][0] == row["label"])
    assert f"{row['power_antenna_w']:.1f} W" in watts["text"]


@dataclass(frozen=True)
class DistortionlessCable(cables.Cable):
    """A line on Heaviside's condition R'/L' = G'/C': Z0 = sqrt(L'/C') is exactly real at every
    loss, alpha = sqrt(R'G'), beta = omega sqrt(L'C') (Pozar, Microwave Engineering, 4th ed.,
    section 2.7, the distortionless line). Written out here, independent of the cable model."""

    alpha_np_per_m: float = 0.0

    def constants(self, frequency_hz):
        omega = 2 * np.pi * np.asarray(frequency_hz, dtype=float)
        return (np.full(omega.shape, complex(self.z0_nominal_ohm)),
                self.alpha_np_per_m + 1j * omega / (self.velocity_factor * SPEED_OF_LIGHT))


def _real_z0_station(make_station, matched_loss_db, z_antenna_ohm):
    length_m = 40.0
    cable = DistortionlessCable(id="distortionless", description="real-Z0 line", kind="coax", z0_nominal_ohm=50.0,
                                velocity_factor=0.8, alpha_np_per_m=matched_loss_db / DB_PER_NEPER / length_m)
    return make_station([elements.Line(cable, length_m, "feeder")], [7.1e6], z_antenna_ohm, holds="forward")


@pytest.mark.parametrize("matched_loss_db", [0.5, 1.5, 2.9, 3.2, 6.0])
@pytest.mark.parametrize("z_antenna_ohm", [150.0, 12 - 30j, 2000 + 900j], ids=str)
def test_the_swr_at_the_radio_sentence_against_the_closed_form(matched_loss_db, z_antenna_ohm, make_station):
    # ARRL Antenna Book, transmission-line chapter (and any RF text): on a line of real impedance
    # with matched loss ML dB the reflection loses ML twice, |rho_radio| = |rho_antenna| 10^(-ML/10).
    # Worked out here from the load alone: rho = (Z - 50) / (Z + 50) (Pozar, 4th ed., section 2.3).
    rho_antenna = abs((z_antenna_ohm - 50) / (z_antenna_ohm + 50))
    rho_radio = rho_antenna * 10 ** (-matched_loss_db / 10)
    swr_antenna, swr_radio = (1 + rho_antenna) / (1 - rho_antenna), (1 + rho_radio) / (1 - rho_radio)
    result = linecalc.solve_budget(_real_z0_station(make_station, matched_loss_db, z_antenna_ohm), explain=True)
    text = next(e.text for e in result.explanations if e.topic == "swr")
    assert f"SWR is {swr_antenna:.2f} (|rho| {rho_antenna:.2f})" in text
    assert f"|rho| at the radio falls to {rho_radio:.2f} and a meter there reads {swr_radio:.2f}" in text
    assert f"{matched_loss_db:.2f} dB of matched loss twice" in text and f"{2 * matched_loss_db:.2f} dB in all" in text
    # the line hides the antenna where even an open or a short at its end would read 3:1 or less
    # at the radio: |rho| at most 10^(-ML/10) = 1/2, ML >= 3.01 dB (common practice threshold)
    worst = 10 ** (-matched_loss_db / 10)
    hidden = (1 + worst) / (1 - worst) <= 3.0
    assert ("says little about the antenna" in text) == hidden
    if hidden:
        assert f"no more than {(1 + worst) / (1 - worst):.2f} at the radio" in text


@pytest.mark.parametrize("name", STATIONS)
def test_would_deliver_more_appears_exactly_when_compare_says_so(name, solved):
    station, doc, _, comparison = solved(name)
    said = {entry["rows"][0]: entry for entry in doc["explanations"] if entry["topic"] == "alternative"}
    assert all(len(entry["rows"]) == 1 for entry in said.values()) or not said
    expected = set()
    if comparison is not None:
        for row in comparison["rows"]:
            built, best = row["alternatives"][0], next(a for a in row["alternatives"] if a["name"] == row["winner"])
            # the winner is not the station as built, and its watts print higher in the table
            if row["winner"] != built["name"] and f"{best['power_antenna_w']:.1f}" != f"{built['power_antenna_w']:.1f}":
                expected.add(row["label"])
                text = said[row["label"]]["text"]
                assert f"{best['power_antenna_w']:.1f} W would reach the antenna instead of " \
                       f"{built['power_antenna_w']:.1f} W" in text
                gain_db = 10 * math.log10(best["power_antenna_w"] / built["power_antenna_w"])
                assert f"({gain_db:.2f} dB more)" in text
                assert ("hardly anyone" in text) == (gain_db < 1.0)  # common practice: about 1 dB is noticed
    assert set(said) == expected


def test_the_comparisons_own_explanations_follow_its_winner(data_path):
    station = linecalc.load_station(data_path("tuner-in-shack.yaml"))
    document = linecalc.solve_compare(station, tuner_positions=True, explain=True).to_dict()
    for row in document["rows"]:
        entry = next(e for e in document["explanations"] if e["topic"] == "compare" and row["label"] in e["rows"])
        winner = next(a for a in row["alternatives"] if a["name"] == row["winner"])
        index = [a["name"] for a in row["alternatives"]].index(row["winner"]) + 1  # the table's [k]
        if index == 1:
            assert entry["text"].startswith("The station as built")
        else:
            assert entry["text"].startswith(f"[{index}] {row['winner']} delivers the most")
        assert f"{winner['power_antenna_w']:.1f} W" in entry["text"]
    names = set(document["alternatives"]) | {row["label"] for row in document["rows"]}
    for entry in document["explanations"]:
        values = list(entry["figures"].values())
        for number in _numbers(entry["text"], names):
            assert any(_printed_as(v, number) for v in values), (number, entry["text"])
    tuned = [e for e in document["explanations"] if e["topic"] == "tuner"]
    assert sum(len(e["rows"]) for e in tuned) == len(document["rows"])  # every alternative has a tuner at 1:1


def _topics(result):
    return {e.topic for e in result.explanations}


def test_a_line_of_another_impedance_is_not_told_as_the_two_way_loss(make_station, library):
    # 450-ohm window line behind a 1:1 balun, read against 50 ohm at the radio: the line
    # transforms the load, so |rho_radio| is not |rho_antenna| 10^(-ML/10) (ARRL Antenna Book,
    # transmission-line chapter: the relation holds on a line terminated against its own Z0)
    feed = [elements.Transformer("balun", 1.0, 0.2, 50.0), elements.Line(library["window-line-450"], 18.0, "ladder")]
    result = linecalc.solve_budget(make_station(feed, [14.2e6], 600.0 + 200j, holds="forward"), explain=True)
    text = next(e.text for e in result.explanations if e.topic == "swr")
    assert "twice" not in text and "the path's impedances differ from the radio's 50 ohm" in text


def test_no_tuner_sentence_without_a_tuner_and_no_swr_sentence_with_one(make_station, library):
    coax = elements.Line(library["rg-213"], 25.0, "coax")
    plain = linecalc.solve_budget(make_station([coax], [7.1e6], 150.0, holds="forward"), explain=True)
    assert "tuner" not in _topics(plain) and "swr" in _topics(plain)
    tuner = elements.Tuner("tuner", "T", matching.TunerParts(10e-12, 500e-12, 0.05e-6, 30e-6), 50.0)
    tuned = linecalc.solve_budget(make_station([tuner, coax], [7.1e6], 600.0 + 300j, holds="forward"), explain=True)
    assert "tuner" in _topics(tuned) and "swr" not in _topics(tuned)


def test_no_radio_sentence_where_the_radio_gives_up_nothing(make_station, library):
    coax = elements.Line(library["rg-213"], 25.0, "coax")
    # a net-power source with no limit puts its setting into any path: nothing to explain
    net = linecalc.solve_budget(make_station([coax], [7.1e6], 150.0, holds="net"), explain=True)
    assert "radio" not in _topics(net)
    # a radio that holds its forward power into a match gets nothing back
    matched = linecalc.solve_budget(make_station([coax], [7.1e6], 50.0, holds="forward"), explain=True)
    assert "radio" not in _topics(matched)
    # folding back: the forward power drops below the setting, and the sentence says so
    folded = linecalc.solve_budget(make_station([coax], [7.1e6], 400.0, holds="forward", foldback_swr=1.5),
                                   explain=True)
    text = next(e.text for e in folded.explanations if e.topic == "radio")
    assert "fold back from 100 W to" in text and f"{folded.radio_forward_w[0]:.1f} W forward" in text
    # a net-power source capped by its largest forward power: 100 W net into 400 ohm needs
    # 100 / (1 - 0.78^2) = 256 W forward (Pozar, 4th ed., section 2.3), so a 150 W cap acts
    capped = linecalc.solve_budget(make_station([coax], [7.1e6], 400.0, holds="net", max_power_w=150.0),
                                   explain=True)
    text = next(e.text for e in capped.explanations if e.topic == "radio")
    assert "forward power to 150.0 W" in text and "short of its 100 W setting" in text


def test_no_swr_or_watts_sentence_without_a_feed(make_station):
    bare = linecalc.solve_budget(make_station([], [7.1e6], 150.0), explain=True)
    assert _topics(bare) <= {"radio"}
    safety = linecalc.solve_safety(make_station([], [7.1e6], 150.0), explain=True)
    assert [e.topic for e in safety.explanations] == ["safety"]
    assert "highest voltage" not in safety.explanations[0].text  # no line, no tuner: no voltage to name


def test_rows_that_say_the_same_are_one_entry(make_station, library):
    # two rows at the same frequency say the same thing: one entry for both
    coax = elements.Line(library["rg-213"], 25.0, "coax")
    antenna = ImpedanceTable(np.array([7.0e6, 7.2e6]), np.array([150.0 + 0j, 150.0 + 0j]))
    result = linecalc.solve_budget(make_station([coax], [7.1e6, 7.1e6], antenna, labels=["a", "b"], holds="forward"),
                                   explain=True)
    assert all(e.rows == ("a", "b") for e in result.explanations)
    assert result.to_dict()["explanations"][0]["row"] == "a, b"


def test_without_explain_the_document_has_no_explanations_key(data_path):
    station = linecalc.load_station(data_path("hilltop-dipole.yaml"))
    assert "explanations" not in linecalc.solve_budget(station).to_dict()
    assert "explanations" not in linecalc.solve_safety(station).to_dict()
    assert linecalc.solve_budget(station).to_dict() == {
        key: value for key, value in linecalc.solve_budget(station, explain=True).to_dict().items()
        if key != "explanations"}
