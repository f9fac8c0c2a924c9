"""Checks of linecalc.render.tables: the text tables of the budget, safety, sweep, compare,
feedpoint, advice and cable commands.

The results are real solves of tiny test stations (tests/render/conftest.py). Each table is read
back column by column (`parse_table`, from the dashed rule under its headers) and every number
checked against the result it was made from, to within half a unit of its last printed digit;
physical checks of what the numbers mean name their source.
"""
from __future__ import annotations

import dataclasses
import math
import re

import numpy as np
import pytest

import linecalc
from linecalc.physics.exposure import CAUTIONS
from linecalc.render import tables

FOOT_M = 0.3048  # exactly: NIST SP 811 (2008), appendix B.8 (foot, international)


def parse_table(text, header):
    """The table whose header line holds ``header``: (headers, rows), each row a list of cells,
    cut at the dashed rule under the headers (tabulate's plain layout). The rows end at a blank
    line or at a line with text where the columns have their gaps (a note under the table)."""
    lines = text.splitlines()
    for i, line in enumerate(lines[:-1]):
        if header in line and re.fullmatch(r"[- ]+", lines[i + 1]):
            spans = [m.span() for m in re.finditer(r"-+", lines[i + 1])]
            break
    else:
        raise AssertionError(f"no table with the header {header!r} in\n{text}")

    def cells(row):
        return [row[start:end].strip() for start, end in spans]

    gaps = [position for (_, end), (start, _) in zip(spans, spans[1:]) for position in range(end, start)]
    rows = []
    for line in lines[i + 2:]:
        if not line.strip() or any(position < len(line) and line[position] != " " for position in gaps):
            break
        rows.append(cells(line))
    return cells(lines[i]), rows


def shown(cell, value, decimals):
    """The cell reads back as ``value`` to within half a unit of its last digit; inf as "inf"."""
    if math.isinf(value):
        return cell == "inf"
    return abs(float(cell) - value) <= 0.5 * 10 ** -decimals + 1e-9 * abs(value)


# --- budget ------------------------------------------------------------------------------------

BUDGET_HEADERS = ["row", "MHz", "SWR antenna", "SWR radio", "radio fwd / refl W", "radio mismatch dB",
                  "matched loss dB", "mismatch loss dB", "total loss dB", "antenna W", "path heat W"]


def test_budget_table_heads_with_the_station_its_power_and_reference(plain_result):
    first = tables.budget_table(plain_result).splitlines()[0]
    assert first.startswith("Render test: ") and "100 W forward power held by the radio" in first and "50 ohm" in first


def test_budget_table_headers_carry_their_units(plain_result):
    headers, rows = parse_table(tables.budget_table(plain_result), "SWR antenna")
    assert headers == BUDGET_HEADERS
    for header in headers[1:]:  # every quantity names its unit; an SWR is a plain ratio
        assert header.startswith("SWR") or header.split()[-1] in ("MHz", "dB", "W"), header
    assert [row[0] for row in rows] == list(plain_result.labels)


def test_budget_table_numbers_are_the_result_rounded(plain_result):
    r = plain_result
    _, rows = parse_table(tables.budget_table(r), "SWR antenna")
    for i, row in enumerate(rows):
        assert abs(float(row[1]) - r.frequency_hz[i] / 1e6) <= 5e-4 * r.frequency_hz[i] / 1e6  # 4 significant digits
        for column, values in ((2, r.swr_antenna), (3, r.swr_radio), (5, r.radio_mismatch_loss_db),
                               (6, r.matched_loss_db), (7, r.mismatch_loss_db), (8, r.total_loss_db)):
            assert shown(row[column], values[i], 2), (row, column)
        forward, reflected = row[4].split(" / ")
        assert shown(forward, r.radio_forward_w[i], 1) and shown(reflected, r.radio_reflected_w[i], 1)
        assert shown(row[9], r.power_antenna_w[i], 1)
        # the heat in the path is the radio's net watts less the antenna's (energy balance: README,
        # How linecalc computes, Path)
        assert shown(row[10], r.power_radio_w[i] - r.power_antenna_w[i], 1)


def test_an_infinite_swr_and_loss_are_shown_as_inf(plain_result):
    # the second row is a dead short: |rho| = 1, SWR (1 + |rho|)/(1 - |rho|) infinite (Pozar,
    # Microwave Engineering, 4th ed., section 2.3), and no watts reach it
    _, rows = parse_table(tables.budget_table(plain_result), "SWR antenna")
    short = rows[1]
    assert short[2] == "inf" and short[8] == "inf" and short[7] == "inf"
    # the radio holds 100 W forward: what the 10 m of coax returns is reflected, the rest is heat
    forward, reflected = (float(x) for x in short[4].split(" / "))
    assert short[9] == "0.0" and forward == 100.0 and abs(float(short[10]) - (forward - reflected)) <= 0.1
    assert "nan" not in tables.budget_table(plain_result).lower()


def test_each_element_shows_its_loss_and_heat(plain_result):
    headers, rows = parse_table(tables.budget_table(plain_result), "shack meter")
    assert headers == ["row", "shack meter", "connector: plugs, two", "line: coax"]
    for i, row in enumerate(rows):
        for cell, element in zip(row[1:], plain_result.elements):
            match = re.fullmatch(r"(\S+) dB / (\S+) W", cell)
            assert match, cell
            assert shown(match.group(1), element.loss_db[i], 2) and shown(match.group(2), element.dissipated_w[i], 1)
    # two connectors of 0.05 dB on the matched row: 0.10 dB, and of the 100 W that the lossless
    # meter passes, 100 (1 - 10^(-0.1/10)) = 2.28 W turn into heat (definition of the decibel)
    loss, heat = re.fullmatch(r"(\S+) dB / (\S+) W", rows[0][2]).groups()
    assert loss == "0.10" and abs(float(heat) - 100 * (1 - 10 ** -0.01)) <= 0.05


def test_the_meter_section_reads_forward_reflected_and_swr(plain_result):
    text = tables.budget_table(plain_result)
    assert "What each in-line meter reads:" in text
    _, rows = parse_table(text.split("What each in-line meter reads:")[1], "shack meter")
    meter = plain_result.elements[0]
    assert [row[0] for row in rows] == list(plain_result.labels)
    for i, row in enumerate(rows):
        swr, forward, reflected = re.fullmatch(r"SWR (\S+), fwd (\S+) W, refl (\S+) W", row[1]).groups()
        assert shown(swr, meter.readings["swr"][i], 2)
        # forward less reflected is the net power at the meter (Pozar, Microwave Engineering, 4th
        # ed., section 2.3): the radio's net watts, short or not; rounding of two cells, 0.1 W
        assert abs(float(forward) - float(reflected) - plain_result.power_radio_w[i]) <= 0.1


def test_a_tuner_adds_its_loss_column_and_its_settings(tuner_result):
    text = tables.budget_table(tuner_result)
    headers, rows = parse_table(text, "SWR antenna")
    assert headers == BUDGET_HEADERS[:9] + ["tuner loss dB"] + BUDGET_HEADERS[9:]
    tuner = tuner_result.elements[0]
    for i, row in enumerate(rows):
        assert shown(row[9], tuner.loss_db[i], 2)
    assert "Shack tuner (parts from the radio side to the antenna side):" in text
    headers, rows = parse_table(text, "arrangement")
    assert headers == ["row", "match", "arrangement", "settings"]
    assert [row[1] for row in rows] == ["CANNOT MATCH", "matched", "matched"]
    assert rows[0][3] == ""  # left in bypass: no parts to show
    for row in rows[1:]:
        for part in row[3].split(", "):
            match = re.fullmatch(r"[a-z ]+ (\d+) pF|[a-z ]+ (\d+\.\d\d) uH", part)
            assert match, part
            if match.group(1):  # within the station's 10 to 30 pF, to the rounding of a whole pF
                assert 9.5 <= float(match.group(1)) <= 30.5, part
            else:  # within the default 0.05 to 30 uH (README, feed table)
                assert 0.045 <= float(match.group(2)) <= 30.005, part


def test_an_swr_only_antenna_shows_the_loss_range_and_says_why(swr_only_result, plain_result):
    text = tables.budget_table(swr_only_result)
    headers, rows = parse_table(text, "SWR antenna")
    assert headers == BUDGET_HEADERS + ["loss range dB"]
    for i, row in enumerate(rows):
        least, most = re.fullmatch(r"(\S+) to (\S+)", row[11]).groups()
        assert shown(least, swr_only_result.total_loss_db_range[i, 0], 2)
        assert shown(most, swr_only_result.total_loss_db_range[i, 1], 2)
        assert float(least) <= float(row[8]) <= float(most)
    assert text.count(tables.SWR_ONLY_NOTE) == 1
    assert "SWR only" in tables.SWR_ONLY_NOTE and "phase is unknown" in tables.SWR_ONLY_NOTE
    assert tables.SWR_ONLY_NOTE not in tables.budget_table(plain_result)
    assert "nan" not in text.lower()


def test_a_reading_moved_to_the_antenna_shows_its_range(data_path):
    result = linecalc.solve_budget(linecalc.load_station(data_path("shack-reading.yaml")))
    text = tables.budget_table(result)
    assert "The SWR reading moved to the antenna" in text
    headers, rows = parse_table(text, "SWR at the antenna")
    assert headers == ["row", "SWR at the antenna", "error multiplier"]
    least, most = re.fullmatch(r"(\S+) to (\S+)", rows[0][1]).groups()
    assert shown(least, result.measured["swr_antenna_least"][0], 2)
    assert shown(most, result.measured["swr_antenna_most"][0], 2)
    assert float(least) > 1.8  # the antenna is worse than the shack meter's 1.8 (the station's reading)
    assert shown(rows[0][2], result.measured["sensitivity"][0], 2)


def test_a_sweep_moved_to_the_antenna_shows_its_error_multiplier(data_path):
    result = linecalc.solve_budget(linecalc.load_station(data_path("shack-sweep-dipole.yaml")))
    text = tables.budget_table(result)
    assert "a reflection error at the instrument is multiplied by:" in text
    headers, rows = parse_table(text, "error multiplier")
    assert headers == ["row", "error multiplier"]
    for i, row in enumerate(rows):
        assert shown(row[1], result.measured["sensitivity"][i], 2)


# --- safety ------------------------------------------------------------------------------------

# Each caution's topic, in words of its own (the safety command's list in the README, Safety)
CAUTION_TOPICS = [r"estimate", r"near field", r"licensing authority", r"arc, burn and kill|RF burns",
                  r"power lines", r"[Ll]ightning.*grounding"]


def test_safety_table_heads_with_power_mode_duty_time_and_gain(tuner_result, data_path):
    assert tables.safety_table(tuner_result).splitlines()[0] == (
        "Tuner render test: 100 W PEP from the radio, mode carrier (duty factor 1), transmitting 100 % of the "
        "time, antenna gain 2.15 dBi")
    measured = linecalc.solve_safety(linecalc.load_station(data_path("shack-sweep-dipole.yaml")))
    first = tables.safety_table(measured).splitlines()[0]
    assert "mode ssb (duty factor 0.2)" in first and "transmitting 50 % of the time" in first


def test_safety_table_line_stress_with_units_and_margins(tuner_result, data_path):
    text = tables.safety_table(tuner_result)
    assert "Line coax at PEP" in text
    headers, rows = parse_table(text, "V max RMS")
    assert headers == ["row", "V max RMS", "V max peak", "at m", "I max RMS A", "at m", "voltage margin",
                       "power margin", "hottest W/m avg / rated"]
    line = tuner_result.elements[1].readings
    assert [row[0] for row in rows] == list(tuner_result.labels)
    for i, row in enumerate(rows):
        assert shown(row[1], line["voltage_max_rms_v"][i], 0) and shown(row[4], line["current_max_rms_a"][i], 2)
        # the peak of a sine is sqrt(2) times its RMS value (crest factor; docs/json.md, units)
        assert abs(float(row[2]) - math.sqrt(2) * float(row[1])) <= 0.5 + 0.5 * math.sqrt(2)
        assert 0 <= float(row[3]) <= 30.0 and 0 <= float(row[5]) <= 30.0  # along the 30 m line
        assert row[6] == "no rating"  # the library's rg-8x states no voltage rating
        # it has a power rating from its thermal build (cable_data): margin and heat as in the readings
        assert shown(row[7], line["power_margin"][i], 1)
        heat, rated_heat = row[8].split(" / ")
        assert shown(heat, line["heat_max_w_per_m"][i], 2) and shown(rated_heat, line["heat_rating_w_per_m"][i], 2)
    rated = linecalc.solve_safety(linecalc.load_station(data_path("shack-sweep-dipole.yaml")))
    _, rows = parse_table(tables.safety_table(rated), "V max RMS")
    for i, row in enumerate(rows):  # rg-213 has a voltage rating and a power rating (cable_data)
        readings = rated.elements[0].readings
        assert shown(row[6], readings["voltage_margin"][i], 1) and shown(row[7], readings["power_margin"][i], 1)


def test_a_tuner_part_left_out_of_a_row_has_no_heat_and_an_empty_cell(l_tuner_result):
    # an L network puts two of its parts in circuit, a bypass none (README, Tuners): a part not in
    # circuit has no value and no heat on that row (null in JSON), and no stress in the table
    tuner = l_tuner_result.elements[0]
    assert list(tuner.readings["arrangement"])[0] == "bypass"
    doc = l_tuner_result.to_dict()
    names = [key[:-len("_dissipated_w")] for key in doc["rows"][0]["elements"][0] if key.endswith("_dissipated_w")]
    assert len(names) >= 3  # the two rows that tune use different pairs
    for row in doc["rows"]:
        entry = row["elements"][0]
        used = [n for n in names if (entry.get(n + "_pf") if n + "_pf" in entry else entry.get(n + "_uh")) is not None]
        assert [n for n in names if entry[n + "_dissipated_w"] is not None] == used
        assert len(used) == (0 if entry["arrangement"] == "bypass" else 2)
        # the heat of the parts in circuit is the tuner's heat (energy balance)
        assert sum(entry[n + "_dissipated_w"] for n in used) == pytest.approx(entry["dissipated_w"], rel=1e-9, abs=1e-12)
    _, rows = parse_table(tables.safety_table(l_tuner_result), "series inductor")
    for row, entry in zip(rows, (r["elements"][0] for r in doc["rows"])):
        for n, cell in zip(names, row[1:]):
            assert (cell == "") == (entry[n + "_dissipated_w"] is None), (row, n)
    assert rows[0][1:] == ["", "", ""]


def test_safety_table_tuner_parts_in_volts_and_amperes(tuner_result):
    text = tables.safety_table(tuner_result)
    assert ("Shack tuner parts at PEP (peak volts across / RMS amperes through; empty where the row's network "
            "leaves the part out):") in text
    headers, rows = parse_table(text, "shunt inductor")
    # from the radio side, as the budget's settings list them (a T: series C, shunt L, series C)
    assert headers == ["row", "input series capacitor", "shunt inductor", "output series capacitor"]
    readings = tuner_result.elements[0].readings
    assert [row[0] for row in rows] == list(tuner_result.labels)
    assert list(readings["arrangement"]).count("bypass") == 1
    for i, row in enumerate(rows):
        for header, cell in zip(headers[1:], row[1:]):
            part = header.replace(" ", "_")
            if readings["arrangement"][i] == "bypass":  # 3.6 MHz: it cannot match and stays in bypass
                assert cell == "" and np.isnan(readings[f"{part}_dissipated_w"][i])
                continue
            volts, amperes = re.fullmatch(r"(\d+) V / (\d+\.\d\d) A", cell).groups()
            assert shown(volts, readings[f"{part}_voltage_peak_v"][i], 0)
            assert shown(amperes, readings[f"{part}_current_rms_a"][i], 2)


def test_safety_table_exposure_distances_and_the_near_field_star(tuner_result):
    text = tables.safety_table(tuner_result)
    headers, rows = parse_table(text, "avg W at antenna")
    assert headers == ["row", "avg W at antenna", "avg EIRP W", "FCC general public m", "FCC occupational m",
                       "ICNIRP 2020 public m", "near field within m"]
    x = tuner_result.exposure
    assert [row[0] for row in rows] == list(tuner_result.labels)
    for i, row in enumerate(rows):
        assert shown(row[1], x["power_average_w"][i], 1) and shown(row[2], x["eirp_w"][i], 1)
        near = float(row[6])
        for cell, key in zip(row[3:6], ("fcc_uncontrolled_m", "fcc_controlled_m", "icnirp_general_public_m")):
            value, star = re.fullmatch(r"(\S+)( \*)?", cell).groups()
            assert shown(value, x[key][i], 1)
            assert bool(star) == (x[key][i] < x["near_field_m"][i]), cell
        # the reactive near field, lambda / (2 pi) (Balanis, Antenna Theory, 3rd ed., section 4.2)
        assert abs(near - 299_792_458.0 / (2 * math.pi * tuner_result.frequency_hz[i])) <= 0.05
    assert "* inside the reactive near field" in text


def test_safety_table_ends_with_every_caution(tuner_result):
    text = tables.safety_table(tuner_result)
    tail = text.split("\nCautions:\n", 1)[1].splitlines()
    assert tail == [f"- {caution}" for caution in CAUTIONS]
    for topic in CAUTION_TOPICS:
        assert re.search(topic, "\n".join(tail)), topic


# --- cables ------------------------------------------------------------------------------------

def test_cables_table_lists_every_cable_per_100_m_and_per_100_ft(library):
    listing = linecalc.list_cables()
    text = tables.cables_table(listing)
    assert text.startswith("Matched loss in dB per 100 m / per 100 ft")
    headers, rows = parse_table(text, "Z0 ohm")
    assert headers == ["id", "kind", "Z0 ohm", "VF", "3.6 MHz", "14.2 MHz", "28.5 MHz", "146 MHz", "435 MHz",
                       "description"]
    assert sorted(row[0] for row in rows) == sorted(library)
    for row in rows:
        cable = library[row[0]]
        assert row[1] == cable.kind and float(row[2]) == cable.z0_nominal_ohm
        assert shown(row[3], cable.velocity_factor, 2)
        for cell, f in zip(row[4:9], (3.6e6, 14.2e6, 28.5e6, 146e6, 435e6)):
            per_100_m, per_100_ft, star = re.fullmatch(r"(\S+) / (\S+)( \*)?", cell).groups()
            loss = 100 * float(cable.matched_loss_db_per_m(np.array([f]))[0])
            assert shown(per_100_m, loss, 2)
            # 100 ft is 30.48 m (NIST SP 811): the same loss times 0.3048
            assert shown(per_100_ft, loss * FOOT_M, 2)
            low, high = cable.data_range_hz
            assert bool(star) == (not low <= f <= high), (row[0], f)
    # the 600-ohm line's data stop at 150 MHz (README, Limits of the models): 435 MHz is starred
    open_wire = next(row for row in rows if row[0] == "open-wire-600")
    assert open_wire[8].endswith(" *") and not open_wire[7].endswith(" *")
    assert "* outside the cable's data: extrapolated by its loss model" in text


# --- compare -----------------------------------------------------------------------------------

def test_compare_table_keys_alternatives_and_names_the_winner(comparison):
    text = tables.compare_table(comparison)
    assert text.splitlines()[0].startswith(comparison.station)
    for k, name in enumerate(comparison.names):
        # each key line is the name, then what the alternative added, moved or dropped in brackets
        assert any(line == f"  [{k + 1}] {name}" or line.startswith(f"  [{k + 1}] {name} (")
                   for line in text.splitlines()), name
    headers, rows = parse_table(text, "winner")
    assert headers == ["row", "[1] W / dB", "[2] W / dB", "[3] W / dB", "winner", "margin dB"]
    assert [row[0] for row in rows] == list(comparison.labels)
    for i, row in enumerate(rows):
        watts, losses = zip(*(re.fullmatch(r"(\S+) / (\S+)", cell).groups() for cell in row[1:4]))
        for k in range(3):
            assert shown(watts[k], comparison.power_antenna_w[k, i], 1)
            assert shown(losses[k], comparison.total_loss_db[k, i], 2)
        best = max(range(3), key=lambda k: float(watts[k]))
        assert row[4] == f"[{best + 1}]"
        # the margin: the winner's watts at the antenna over the runner-up's in dB (definition of
        # the decibel); the watts cells are rounded to 0.05 W, the margin to 0.005 dB
        runner_up = sorted((float(v) for v in watts), reverse=True)[1]
        expected = 10 * math.log10(float(watts[best]) / runner_up)
        assert abs(float(row[5]) - expected) <= 0.005 + 10 * math.log10(1 + 0.1 / runner_up)


def test_compare_table_line_study_shows_exact_and_closed_form(data_path):
    comparison = linecalc.solve_compare(linecalc.load_station(data_path("doublet-wall-coax.yaml")))
    text = tables.compare_table(comparison)
    study = comparison.line_study
    assert f"Loss of {study.label} by its length: exact dB (closed-form formula dB in brackets)" in text
    headers, rows = parse_table(text, "1 m")
    assert headers == ["row"] + [f"{length:g} m" for length in study.length_m]
    for i, row in enumerate(rows):
        for k, cell in enumerate(row[1:]):
            exact, closed = re.fullmatch(r"(\S+) \((\S+)\)", cell).groups()
            assert shown(exact, study.exact_loss_db[k, i], 2) and shown(closed, study.closed_form_loss_db[k, i], 2)


# --- feedpoint ---------------------------------------------------------------------------------

def test_feedpoint_table_one_line_per_point(feedpoint_result):
    text = tables.feedpoint_table(feedpoint_result)
    assert text.splitlines()[0] == (f"{feedpoint_result.station}: {feedpoint_result.source} moved to the antenna "
                                    "feedpoint")
    headers, rows = parse_table(text, "R ohm")
    assert headers == ["MHz", "R ohm", "X ohm", "SWR", "error multiplier", ""]
    sweep = feedpoint_result.sweep
    assert len(rows) == feedpoint_result.frequency_hz.size == 101
    for i, row in enumerate(rows):
        assert shown(row[0], feedpoint_result.frequency_hz[i] / 1e6, 4)
        assert shown(row[1], sweep.z_antenna_ohm[i].real, 1) and shown(row[2], sweep.z_antenna_ohm[i].imag, 1)
        assert row[2][0] in "+-"  # the reactance always with its sign
        assert shown(row[3], sweep.swr_antenna[i], 2) and shown(row[4], sweep.sensitivity[i], 2)
        assert row[5] == ""  # a passive antenna: nothing flagged


def test_feedpoint_table_flags_active_points(write_file, library):
    # near-opens measured through 60 m of thin coax: |rho| at the radio is at most 10^(-ML/10) for
    # a passive antenna (ARRL Antenna Book, transmission-line chapter), so 0.95 cannot be
    ml_db = 60 * float(library["rg-58"].matched_loss_db_per_m(np.array([14.0e6]))[0])
    assert 0.95 > 10 ** (-ml_db / 10)
    write_file("sweep.s1p", "# MHz S RI R 50\n13.9 0.2 0\n14.0 0.95 0\n14.1 0.2 0\n")
    station = write_file("active.yaml", "name: Active\nfrequencies: [14 MHz]\nradio: {power: 100 W}\n"
                                        "antenna: {touchstone: sweep.s1p, measured_at: radio}\n"
                                        "feed:\n  - line: {label: coax, cable: rg-58, length: 60 m}\n")
    result = linecalc.solve_feedpoint(linecalc.load_station(station))
    _, rows = parse_table(tables.feedpoint_table(result), "R ohm")
    assert [row[5] for row in rows] == ["", "ACTIVE", ""]
    assert rows[1][3] == "inf"  # |rho| > 1: no finite SWR


# --- band sweeps -------------------------------------------------------------------------------

def test_sweep_table_per_band_at_both_ends(data_path):
    result = linecalc.solve_budget(linecalc.load_station(data_path("hilltop-dipole.yaml")), sweep_points=11)
    text = tables.sweep_table(result.sweeps)
    # one section for the band; the explicit frequencies are single points, with no statistics
    assert text.count("points edge to edge:") == 1 and "40m, 11 points edge to edge:" in text
    headers, rows = parse_table(text, "lowest SWR at MHz")
    # 40 m in Region 1 is 7.0 to 7.2 MHz (ITU Radio Regulations, Article 5)
    assert headers == ["SWR at", "lowest SWR at MHz", "7.0000 MHz", "7.2000 MHz", "kHz within 1.5:1",
                       "kHz within 2:1", "kHz within 3:1"]
    assert [row[0] for row in rows] == ["antenna", "radio"]
    statistics = result.sweeps[0].statistics
    for end, row in enumerate(rows):
        swr, at = re.fullmatch(r"(\S+) at (\S+)", row[1]).groups()
        assert shown(swr, statistics.swr_min[end], 2) and shown(at, statistics.frequency_swr_min_hz[end] / 1e6, 4)
        assert shown(row[2], statistics.swr_low_edge[end], 2) and shown(row[3], statistics.swr_high_edge[end], 2)
        for k, cell in enumerate(row[4:]):
            width, plus = re.fullmatch(r"(\d+)(\+?)", cell).groups()
            assert shown(width, statistics.bandwidth_hz[end, k] / 1e3, 0)
            assert bool(plus) == bool(statistics.clipped_low[end, k] or statistics.clipped_high[end, k])
            assert float(width) <= 200.0 + 0.5  # never wider than the band
    assert "+ the region reaches the band edge" in text


# --- advice ------------------------------------------------------------------------------------

def test_advice_table_lists_windows_both_ways(data_path):
    result = linecalc.solve_advice(linecalc.load_station(data_path("orchard-doublet.yaml")), length_from_m=10,
                                   length_to_m=20, step_m=0.5)
    text = tables.advice_table(result, 3)
    assert "21 feeder lengths from 10 to 20 m" in text  # 10 m to 20 m in 0.5 m steps, both ends
    assert "Windows by the watts at the antenna summed over the rows" in text
    assert "Windows by worst-case voltage on the feeder" in text
    headers, rows = parse_table(text, "from m")
    assert headers == ["from m", "to m", "width m", "best m", "W sum at best", "worst row W", "loss there dB",
                       "worst loss dB", "worst V RMS"]
    window = result.advice.windows[0]
    assert shown(rows[0][4], window.power_sum_w, 1)
    assert rows[0][5] == f"{window.worst_row_power_w:.1f} ({result.labels[window.worst_row]})"
    start, end = rows[0][0], rows[0][1]
    assert shown(start.rstrip(" <"), window.start_m, 2) and shown(end.rstrip(" >"), window.end_m, 2)
    assert start.endswith(" <") == window.at_range_start and end.endswith(" >") == window.at_range_end
    assert float(start.rstrip(" <")) <= float(rows[0][3]) <= float(end.rstrip(" >"))  # the best inside it
    assert "Caution: open-wire feeders carry high voltage" in text


def test_advice_table_says_so_when_no_length_matches(data_path):
    text = data_path("orchard-doublet.yaml").read_text().replace(
        "network: T, output: balanced}", "network: T, output: balanced, capacitance: {min: 10 pF, max: 11 pF}}")
    result = linecalc.solve_advice(linecalc.load_station(text), length_from_m=10, length_to_m=12, step_m=0.5)
    table = tables.advice_table(result, 3)
    assert "No length in the range lets the tuner match on every band" in table
    assert "from m" not in table


@pytest.mark.parametrize("render", [tables.budget_table, tables.safety_table])
def test_tables_end_with_a_line_break(render, plain_result):
    assert render(plain_result).endswith("\n")


def test_advice_table_counts_one_window_in_the_singular(data_path):
    # the orchard doublet's wide-range tuner matches every length of a short scan: one window
    result = linecalc.solve_advice(linecalc.load_station(data_path("orchard-doublet.yaml")), length_from_m=15,
                                   length_to_m=16, step_m=0.5)
    assert len(result.advice.windows) == 1
    assert "1 window (1.00 m in all) meets the conditions." in tables.advice_table(result, 3)


def test_pair_advice_table_lists_antenna_lengths_and_pairs():
    from linecalc.physics.length_scan import LengthWindow
    from linecalc.studies.pair_advice import PairAdviceResult

    # Built by hand: two antenna lengths, the first with one window, the second with none.
    result = linecalc.solve_advice(linecalc.load_station(
        "name: x\nradio: {power: 100 W}\nfrequencies: [7 MHz]\nantenna: {impedance: {7 MHz: 200+j100}}\n"
        "feed:\n  - tuner: {network: T}\n  - line: {cable: window-line-450, length: 10 m}\n"),
        length_from_m=10, length_to_m=11, step_m=0.5)
    window = result.advice.windows[0]
    assert isinstance(window, LengthWindow)
    empty = dataclasses.replace(result, advice=dataclasses.replace(result.advice, windows=(), windows_by_voltage=()))
    pairs = PairAdviceResult("x", "dipole", np.array([20.0, 21.0]), (result, empty))
    text = tables.pair_advice_table(pairs, 5)
    headers, rows = parse_table(text, "antenna m")
    assert [row[0] for row in rows] == ["20.00", "21.00"] and rows[1][3] == "-"
    assert "The best 1 of 1 (antenna length, feeder window) pairs" in text
    assert f"{window.power_sum_w:.1f}" in text and "Keep antennas well clear of power lines" in text
