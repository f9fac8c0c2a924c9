"""Station elements through the installed `linecalc` command: bad element settings (exit 2, one
line naming file, line and key path) and the JSON contract of each element."""
from __future__ import annotations

import json
import math
import re

import pytest


# Every element kind in one path. Line numbers matter below: 7 connector, 8 choke, 9 series,
# 10 shunt, 11 meter, 12 balun, 13 stub, 14 tuner, 15-17 its keys, 18 line, 19 meter.
GOOD = """\
name: Element test station
radio: {power: 100 W}
frequencies: [3.6 MHz, 7.1 MHz, 14.2 MHz]
antenna:
  impedance: {3.6 MHz: 60+j20, 7.1 MHz: 2400-j1700, 14.2 MHz: 1800+j1250}
feed:
  - connector: {count: 2, loss: 0.05 dB}
  - choke: {loss: 0.1 dB, common_mode: {3 MHz: 300, 15 MHz: 2000}}
  - series: {l: 0.5 uH, inductor_q: 100}
  - shunt: {c: 20 pF, capacitor_q: 500}
  - meter: {label: shack meter}
  - balun: {ratio: "1:1", loss: 0.2 dB, output: unbalanced}
  - stub: {cable: rg-213, length: 3 m, end: short}
  - tuner:
      network: T
      capacitance: {min: 10 pF, max: 500 pF}
      inductance: {min: 0.05 uH, max: 30 uH}
  - line: {label: coax, cable: rg-213, length: 20 m}
  - meter: {label: feedpoint meter}
"""

# (replace this, with that, expected line, expected key path, words in the message)
BAD = {
    "inductor q zero": ("inductor_q: 100", "inductor_q: 0", 9, "feed[2].series.inductor_q", "above 0"),
    "capacitor q negative": ("capacitor_q: 500", "capacitor_q: -5", 10, "feed[3].shunt.capacitor_q", "above 0"),
    "tuner q zero": ("network: T\n", "network: T\n      inductor_q: 0\n", 16, "feed[7].tuner.inductor_q", "above 0"),
    "tuner capacitance inverted": ("{min: 10 pF, max: 500 pF}", "{min: 500 pF, max: 10 pF}", 16,
                                   "feed[7].tuner.capacitance", "empty or inverted"),
    "tuner inductance empty": ("{min: 0.05 uH, max: 30 uH}", "{min: 2 uH, max: 2 uH}", 17,
                               "feed[7].tuner.inductance", "empty or inverted"),
    "connector loss negative": ("loss: 0.05 dB", "loss: -0.05 dB", 7, "feed[0].connector.loss", "zero or more"),
    "connector loss of thousands of dB": ("loss: 0.05 dB", "loss: 3000 dB", 7, "feed[0].connector.loss",
                                          "at most 20 dB"),
    "choke loss negative": ("loss: 0.1 dB", "loss: -0.1 dB", 8, "feed[1].choke.loss", "zero or more"),
    "balun loss negative": ("loss: 0.2 dB", "loss: -0.2", 12, "feed[5].balun.loss", "zero or more"),
    "choke length zero": ("loss: 0.1 dB, common", "loss: 0.1 dB, length: 0 m, common", 8, "feed[1].choke.length",
                          "greater than zero"),
    "choke winding too long": ("loss: 0.1 dB, common", "loss: 0.1 dB, length: 200 m, common", 8,
                               "feed[1].choke.length", "at most 100 m"),
    "choke velocity factor over 1": ("loss: 0.1 dB, common", "loss: 0.1 dB, velocity_factor: 1.5, common", 8,
                                     "feed[1].choke.velocity_factor", ""),
    "balun length negative": ("loss: 0.2 dB, output", "loss: 0.2 dB, length: -1 m, output", 12,
                              "feed[5].balun.length", "greater than zero"),
    "ratio zero": ('ratio: "1:1"', "ratio: 0", 12, "feed[5].balun.ratio", "greater than zero"),
    "ratio negative": ('ratio: "1:1"', 'ratio: "-4:1"', 12, "feed[5].balun.ratio", "greater than zero"),
    "ratio zero to one": ('ratio: "1:1"', 'ratio: "0:1"', 12, "feed[5].balun.ratio", "greater than zero"),
    "ratio over zero": ('ratio: "1:1"', 'ratio: "4:0"', 12, "feed[5].balun.ratio", "ratio is written"),
    "stub without length": ("length: 3 m, end: short", "end: short", 13, "feed[6].stub", "missing key 'length'"),
    "stub length zero": ("length: 3 m, end: short", "length: 0 m, end: short", 13, "feed[6].stub.length",
                         "greater than zero"),
    "negative resistance": ("series: {l: 0.5 uH", "series: {r: -20 ohm, l: 0.5 uH", 9, "feed[2].series.r",
                            "zero or more"),
    "shunt dead short": ("shunt: {c: 20 pF, capacitor_q: 500}", "shunt: {r: 0 ohm}", 10, "feed[3].shunt",
                         "short"),
}


def check_one_line_error(result, station, line, path, words):
    assert result.returncode == 2, (result.stdout, result.stderr)
    assert result.stdout == ""
    assert "Traceback" not in result.stderr and "internal error" not in result.stderr
    message = result.stderr.strip()
    assert "\n" not in message, message
    match = re.match(rf"^{re.escape(str(station))}:(\d+): (.*)$", message)
    assert match, message
    assert int(match.group(1)) == line, message
    assert message.endswith(f"(at {path})"), message
    assert words in match.group(2), message


@pytest.mark.parametrize("case", BAD, ids=list(BAD))
def test_bad_element_setting_exits_2_with_file_line_and_path(case, write_file, linecalc_command):
    old, new, line, path, words = BAD[case]
    assert GOOD.count(old) == 1, old
    station = write_file("station.yaml", GOOD.replace(old, new))
    check_one_line_error(linecalc_command("budget", station), station, line, path, words)


@pytest.mark.parametrize("written, ratio", [("4:1", 4.0), ("9:1", 9.0), ("1:4", 0.25), ("49:1", 49.0)])
def test_unquoted_ratio_is_read_as_written(written, ratio):
    # README: `ratio` is written 4:1 or 4. YAML 1.1 would read an unquoted 4:1 as the base-60
    # integer 241 (and 1:4 as 64); a 4:1 balun must stay a 4:1 balun.
    from linecalc.io.station_file import parse_station_text

    station = parse_station_text(GOOD.replace('ratio: "1:1"', f"ratio: {written}"))
    balun = next(e for e in station.feed if e.kind == "balun")
    assert balun.impedance_ratio == ratio


def test_tuner_on_a_pure_reactance_is_bad_input_not_an_internal_error(write_file, linecalc_command):
    # No network delivers power into a pure reactance (R = 0): bad input (exit 2), not a crash.
    station = write_file("station.yaml", "name: reactance\nradio: {power: 100 W}\nfrequencies: [7.1 MHz]\n"
                                         "antenna:\n  impedance: {7.1 MHz: 0+j50}\nfeed:\n  - tuner: {network: L}\n")
    result = linecalc_command("budget", station)
    assert result.returncode == 2, result.stderr
    assert result.stdout == "" and "Traceback" not in result.stderr and "\n" not in result.stderr.strip()
    assert result.stderr.startswith(f"{station}:")
    assert re.search(r"\(at antenna[^)]*\)$", result.stderr.strip()), result.stderr


# --- JSON contract -----------------------------------------------------------------------------

@pytest.fixture(scope="module")
def budget_json(tmp_path_factory, linecalc_command):
    station = tmp_path_factory.mktemp("json") / "station.yaml"
    station.write_text(GOOD)
    result = linecalc_command("budget", station, "--format", "json")
    assert result.returncode == 0, result.stderr
    assert "Traceback" not in result.stderr
    return json.loads(result.stdout)


def test_every_element_has_the_common_fields(budget_json):
    kinds = [e["kind"] for e in budget_json["rows"][0]["elements"]]
    assert kinds == ["connector", "choke", "series", "shunt", "meter", "balun", "stub", "tuner", "line", "meter"]
    for row in budget_json["rows"]:
        for element in row["elements"]:
            assert isinstance(element["kind"], str) and isinstance(element["label"], str) and element["label"]
            for key in ("loss_db", "dissipated_w"):
                assert isinstance(element[key], float) and math.isfinite(element[key])
            for key in ("swr_in", "swr_out"):  # an infinite SWR is null (README, Output)
                assert element[key] is None or (isinstance(element[key], float) and element[key] >= 1.0)
        heat = sum(e["dissipated_w"] for e in row["elements"])
        assert row["power_radio_w"] == pytest.approx(row["power_antenna_w"] + heat, rel=1e-9)


def test_tuner_fields_in_pf_and_uh_with_heat_per_part(budget_json):
    for row in budget_json["rows"]:
        element = next(e for e in row["elements"] if e["kind"] == "tuner")
        assert type(element["matched"]) is bool  # a JSON true/false, not 0/1 or a string
        assert element["matched"] is True
        values = {k: v for k, v in element.items() if k.endswith(("_pf", "_uh"))}
        assert values, element
        for key, value in values.items():
            if value is None:  # a part this row's arrangement leaves out
                continue
            low, high = (10.0, 500.0) if key.endswith("_pf") else (0.05, 30.0)  # the station's ranges
            assert low * (1 - 1e-9) <= value <= high * (1 + 1e-9), (key, value)
        # a part this row's arrangement leaves out has null heat, as its value (docs/json.md)
        heat = [v for k, v in element.items() if k.endswith("_dissipated_w") and k != "dissipated_w"
                and v is not None]
        assert heat and all(h >= 0 for h in heat)
        assert sum(heat) == pytest.approx(element["dissipated_w"], rel=1e-9, abs=1e-9)


def test_meter_fields_and_identity(budget_json):
    for row in budget_json["rows"]:
        meters = [e for e in row["elements"] if e["kind"] == "meter"]
        assert len(meters) == 2
        for meter in meters:
            for key in ("swr", "forward_w", "reflected_w", "net_w"):
                assert isinstance(meter[key], float), (key, meter)
            assert meter["forward_w"] - meter["reflected_w"] == pytest.approx(meter["net_w"], rel=1e-9, abs=1e-9)
        # the last meter sits on the antenna: its net power is the antenna's
        assert meters[1]["net_w"] == pytest.approx(row["power_antenna_w"], rel=1e-9)
        assert meters[1]["dissipated_w"] == pytest.approx(0.0, abs=1e-9)


def test_choke_below_threshold_warns_in_json(budget_json):
    # the choke table gives 300 ohm at 3 MHz, 2000 ohm at 15 MHz; linear between: 3.6 MHz ->
    # 385 ohm (< 500, common practice threshold), 7.1 MHz -> 881 ohm, 14.2 MHz -> 1887 ohm
    choke = [w for w in budget_json["warnings"] if "choke" in w]
    assert len(choke) == 1 and "3.6 MHz (385 ohm)" in choke[0]
    assert "7.1 MHz" not in choke[0] and "14.2 MHz" not in choke[0]


def test_balanced_line_from_the_radio_is_a_warning_not_an_error(write_file, linecalc_command):
    station = write_file("station.yaml", "name: ladder\nradio: {power: 100 W}\nfrequencies: [7.1 MHz]\n"
                                         "antenna:\n  impedance: {7.1 MHz: 300+j100}\n"
                                         "feed:\n  - line: {label: ladder, cable: window-line-450, length: 15 m}\n")
    result = linecalc_command("budget", station)
    assert result.returncode == 0, result.stderr
    assert re.search(r"^warning: balanced line ladder ", result.stderr, re.M), result.stderr
    with_balun = station.read_text().replace("feed:\n", 'feed:\n  - balun: {ratio: "4:1"}\n')
    station.write_text(with_balun)
    result = linecalc_command("budget", station)
    assert result.returncode == 0 and "balanced line" not in result.stderr, result.stderr
