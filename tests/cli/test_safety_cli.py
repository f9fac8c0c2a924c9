"""Safety end to end (issue 5): the `safety` command and its cautions, the voltage on a line
against the standing-wave closed form, exposure distances worked by hand from FCC OET Bulletin 65
and 47 CFR 1.1310, ratings, and bad radio and antenna settings.

Runs call `linecalc.cli.main` in-process (fast); one test goes through the installed entry
point. Expected values are closed forms written out here, never linecalc's own functions.
"""
from __future__ import annotations

import json
import math
import re
from pathlib import Path

import numpy as np
import pytest


ROOT = Path(__file__).resolve().parent.parent.parent
SPEED_OF_LIGHT_M_PER_S = 299_792_458.0  # exact, SI definition of the metre
ETA0_OHM = 376.730313  # free-space impedance, CODATA 2018 (mu0 c)


def budget_json(cli, station):
    code, out, err = cli("budget", station, "--format", "json")
    assert code == 0, err
    return json.loads(out)


# --------------------------------------------------------------------------------------------
# Cautions
# --------------------------------------------------------------------------------------------

# issue 5, "Cautions": each topic and words that state it
CAUTION_TOPICS = {
    "estimate": r"estimate",
    "near field": r"near field",
    "licensing authority's method": r"licensing authority",
    "high voltage and RF burns": r"arc, burn and kill|RF burns",
    "power lines": r"power lines",
    "lightning and grounding": r"[Ll]ightning.*grounding",
}


@pytest.mark.parametrize("topic", CAUTION_TOPICS, ids=list(CAUTION_TOPICS))
def test_safety_command_and_readme_carry_the_cautions(topic, cli, data_path):
    code, out, err = cli("safety", data_path("shack-sweep-dipole.yaml"))
    assert code == 0, err
    assert re.search(CAUTION_TOPICS[topic], out, re.DOTALL)
    readme = " ".join((ROOT / "README.md").read_text().split())  # lines joined: phrases may wrap
    assert re.search(CAUTION_TOPICS[topic], readme, re.DOTALL)


def test_safety_json_carries_the_cautions_and_the_entry_point_works(linecalc_command, data_path):
    result = linecalc_command("safety", data_path("shack-reading.yaml"), "--format", "json")
    assert result.returncode == 0, result.stderr
    doc = json.loads(result.stdout)
    cautions = " ".join(doc["cautions"])
    for pattern in CAUTION_TOPICS.values():
        assert re.search(pattern, cautions, re.DOTALL)
    assert "exposure" in doc["rows"][0]


# --------------------------------------------------------------------------------------------
# Voltage on a low-loss line against the standing-wave maximum
# --------------------------------------------------------------------------------------------

# Pozar, Microwave Engineering, 4th ed., Table 2.1: a two-wire line in air has
# Z0 = (eta0/pi) acosh(D/d), D the spacing and d the wire diameter.
TWO_WIRE_Z0_OHM = ETA0_OHM / math.pi * math.acosh(152.0 / 2.05)

LOW_LOSS_LINES = {
    # cable, Z0 [ohm], velocity factor, load [ohm]
    "coax, tiny loss": ("{impedance: 50 ohm, velocity_factor: 0.66, loss: {1 MHz: 0.01 dB/100m, 100 MHz: 0.1 dB/100m}}",
                        50.0, 0.66, 150.0),
    "two-wire copper in air": ("{geometry: two-wire, wire_diameter: 2.05 mm, spacing: 152 mm}",
                               TWO_WIRE_Z0_OHM, 1.0, 200.0),
}


@pytest.mark.parametrize("case", LOW_LOSS_LINES, ids=list(LOW_LOSS_LINES))
def test_line_voltage_maximum_against_the_standing_wave_closed_form(case, cli, write_file):
    cable, z0_ohm, velocity_factor, load_ohm = LOW_LOSS_LINES[case]
    length_m, frequency_hz, power_w = 10.0, 14.2e6, 100.0
    station = write_file("line.yaml", f"""\
name: Low-loss line
frequencies: [14.2 MHz]
radio: {{power: {power_w:g} W, holds: net}}
antenna:
  impedance: {{14.2 MHz: {load_ohm:g}+j0}}
feed:
  - line: {{label: low-loss line, length: {length_m:g} m, cable: {cable}}}
""")
    doc = budget_json(cli, station)
    line = doc["rows"][0]["elements"][0]
    # Pozar, Microwave Engineering, 4th ed., sections 2.3 and 2.7: on a lossless line the net
    # power is |V+|^2 (1 - |rho|^2) / Z0 and the standing-wave maximum is |V+| (1 + |rho|).
    rho = abs((load_ohm - z0_ohm) / (load_ohm + z0_ohm))
    v_forward = math.sqrt(power_w * z0_ohm / (1 - rho**2))
    assert line["voltage_max_rms_v"] == pytest.approx(v_forward * (1 + rho), rel=0.005)
    assert line["voltage_max_peak_v"] == pytest.approx(math.sqrt(2) * line["voltage_max_rms_v"], rel=1e-12)
    # the current maximum: |V+| (1 + |rho|) / Z0
    assert line["current_max_rms_a"] == pytest.approx(v_forward * (1 + rho) / z0_ohm, rel=0.005)
    # where: a load above Z0 puts a voltage maximum at the load and every half wave back from it,
    # a load below Z0 a quarter wave from the load (Pozar, section 2.3)
    half_wave_m = velocity_factor * SPEED_OF_LIGHT_M_PER_S / frequency_hz / 2
    from_load_m = length_m - line["voltage_max_at_m"]
    offset = 0.0 if load_ohm > z0_ohm else half_wave_m / 2
    cycles = (from_load_m - offset) / half_wave_m
    assert abs(cycles - round(cycles)) * half_wave_m < 0.05  # within 5 cm


# --------------------------------------------------------------------------------------------
# Exposure
# --------------------------------------------------------------------------------------------

EXPOSURE_STATION = """\
name: Exposure test
frequencies: [14.2 MHz, 146 MHz, 435 MHz]
radio:
  power: {power}
  mode: {mode}
  transmit_fraction: {fraction}
antenna:
  impedance: {{14.2 MHz: 60+j10, 146 MHz: 45-j5, 435 MHz: 52+j3}}
  gain: {gain}
feed:
  - line: {{label: coax, cable: {cable}, length: {length}}}
"""


def exposure_station(write_file, name="exposure.yaml", power="100 W", mode="ssb", fraction=0.5, gain="2.15 dBi",
                     cable="rg-213", length="15 m"):
    return write_file(name, EXPOSURE_STATION.format(power=power, mode=mode, fraction=fraction, gain=gain,
                                                       cable=cable, length=length))


def fcc_mpe_mw_per_cm2(frequency_mhz, environment):
    """47 CFR 1.1310(e)(1), Table 1 (from memory, agreeing with secondary reproductions):
    (B) general population/uncontrolled: 1.34-30 MHz 180/f^2, 30-300 MHz 0.2, 300-1500 MHz f/1500;
    (A) occupational/controlled: 3-30 MHz 900/f^2, 30-300 MHz 1.0, 300-1500 MHz f/300 [mW/cm^2]."""
    if environment == "uncontrolled":
        return 180 / frequency_mhz**2 if frequency_mhz <= 30 else 0.2 if frequency_mhz <= 300 else frequency_mhz / 1500
    return 900 / frequency_mhz**2 if frequency_mhz <= 30 else 1.0 if frequency_mhz <= 300 else frequency_mhz / 300


def test_exposure_rows_worked_by_hand_from_oet_65(cli, write_file):
    doc = budget_json(cli, exposure_station(write_file))
    # FCC OET Bulletin 65 Supplement B (Edition 97-01): conversational SSB, duty factor 0.2 (from memory)
    assert doc["duty_factor"] == 0.2 and doc["transmit_fraction"] == 0.5 and doc["antenna_gain_dbi"] == 2.15
    for row in doc["rows"]:
        exposure = row["exposure"]
        # average power = power at the antenna x duty factor x transmit fraction
        average_w = row["power_antenna_w"] * 0.2 * 0.5
        assert exposure["power_average_w"] == pytest.approx(average_w, rel=1e-12)
        eirp_w = average_w * 10 ** (2.15 / 10)
        assert exposure["eirp_w"] == pytest.approx(eirp_w, rel=1e-12)
        f_mhz = row["frequency_hz"] / 1e6
        for environment in ("uncontrolled", "controlled"):
            # FCC OET Bulletin 65 (Edition 97-01), section 2, far field with ground reflection:
            # S = 0.64 EIRP / (pi R^2), so R = sqrt(0.64 EIRP / (pi S)); S in W/m^2 = 10 x mW/cm^2.
            s_w_per_m2 = 10 * fcc_mpe_mw_per_cm2(f_mhz, environment)
            distance_m = math.sqrt(0.64 * eirp_w / (math.pi * s_w_per_m2))
            assert exposure[f"fcc_{environment}_m"] == pytest.approx(distance_m, rel=1e-9)
            assert exposure[f"fcc_{environment}_limit_w_per_m2"] == pytest.approx(s_w_per_m2, rel=1e-12)
        # the reactive near field, lambda / (2 pi) (Balanis, Antenna Theory, 3rd ed., section 4.2)
        assert exposure["near_field_m"] == pytest.approx(SPEED_OF_LIGHT_M_PER_S / (2 * math.pi * row["frequency_hz"]),
                                                         rel=1e-6)


def test_one_distance_written_out(cli, write_file):
    # One case in full. 20 m, 14.2 MHz: uncontrolled MPE 180 / 14.2^2 = 0.89268 mW/cm^2 =
    # 8.9268 W/m^2 (47 CFR 1.1310 Table 1). No feedline loss, 400 W carrier, 0 dBi, always on:
    # EIRP 400 W. R = sqrt(0.64 x 400 / (pi x 8.9268)) = sqrt(9.1283) = 3.0213 m (OET 65, section 2).
    station = write_file("hand.yaml", """\
name: One distance by hand
frequencies: [14.2 MHz]
radio: {power: 400 W}
antenna:
  impedance: {14.2 MHz: 50+j0}
  gain: 0 dBi
feed: []
""")
    row = budget_json(cli, station)["rows"][0]
    assert row["power_antenna_w"] == pytest.approx(400.0, rel=1e-12)
    assert row["exposure"]["fcc_uncontrolled_m"] == pytest.approx(3.0213, abs=5e-4)


def test_distance_grows_as_the_square_root_of_power(cli, write_file):
    low = budget_json(cli, exposure_station(write_file, "low.yaml", power="100 W"))
    high = budget_json(cli, exposure_station(write_file, "high.yaml", power="400 W"))
    for a, b in zip(low["rows"], high["rows"]):
        for key in ("fcc_uncontrolled_m", "fcc_controlled_m", "icnirp_general_public_m"):
            assert b["exposure"][key] / a["exposure"][key] == pytest.approx(2.0, rel=1e-9)


def test_distance_falls_when_the_feedline_loss_rises(cli, write_file):
    rows = [budget_json(cli, exposure_station(write_file, f"{cable}-{length}.yaml", cable=cable,
                                                 length=length))["rows"]
            for cable, length in (("rg-213", "5 m"), ("rg-213", "30 m"), ("rg-58", "30 m"), ("rg-58", "90 m"))]
    for i in range(3):  # each band
        distance = [r[i]["exposure"]["fcc_uncontrolled_m"] for r in rows]
        loss = [r[i]["total_loss_db"] for r in rows]
        assert all(np.diff(loss) > 0) and all(np.diff(distance) < 0)
        # by how much: the distance goes as the square root of the watts at the antenna
        for r in rows[1:]:
            assert r[i]["exposure"]["fcc_uncontrolled_m"] / rows[0][i]["exposure"]["fcc_uncontrolled_m"] == \
                pytest.approx(math.sqrt(r[i]["power_antenna_w"] / rows[0][i]["power_antenna_w"]), rel=1e-9)


def test_numeric_duty_factor_is_used_as_given(cli, write_file):
    doc = budget_json(cli, exposure_station(write_file, mode="0.35", fraction=1))
    assert doc["duty_factor"] == 0.35
    for row in doc["rows"]:
        assert row["exposure"]["power_average_w"] == pytest.approx(0.35 * row["power_antenna_w"], rel=1e-12)


# --------------------------------------------------------------------------------------------
# Bad input
# --------------------------------------------------------------------------------------------

# (setting, value, key path, words); line numbers from EXPOSURE_STATION: 5 mode, 6 transmit_fraction, 9 gain
BAD_SETTINGS = {
    "unknown mode": ("mode", "shouting", "radio.mode", "unknown mode"),
    "duty factor above one": ("mode", "1.5", "radio.mode", "(0, 1]"),
    "duty factor zero": ("mode", "0", "radio.mode", "(0, 1]"),
    "duty factor negative": ("mode", "-0.2", "radio.mode", "(0, 1]"),
    "transmit fraction zero": ("fraction", "0", "radio.transmit_fraction", "above 0"),
    "transmit fraction above one": ("fraction", "1.2", "radio.transmit_fraction", "at most 1"),
    "transmit fraction text": ("fraction", "half", "radio.transmit_fraction", "number"),
    "gain not a number": ("gain", "abc", "antenna.gain", "dBi"),
}
BAD_LINES = {"mode": 5, "fraction": 6, "gain": 9}


@pytest.mark.parametrize("case", BAD_SETTINGS, ids=list(BAD_SETTINGS))
@pytest.mark.parametrize("command", ["budget", "safety"])
def test_bad_radio_and_antenna_settings_exit_2_with_file_line_and_key(case, command, cli, write_file, one_error_line):
    setting, value, key, words = BAD_SETTINGS[case]
    station = exposure_station(write_file, **{setting: value})
    code, out, err = cli(command, station)
    assert code == 2 and out == ""
    line, message = one_error_line(err, station)
    assert line == BAD_LINES[setting], message
    assert message.endswith(f"(at {key})") and words in message, message


def test_implausible_gain_is_a_warning_not_an_error(cli, write_file):
    station = exposure_station(write_file, gain="45 dBi")
    code, out, err = cli("budget", station, "--format", "json")
    assert code == 0, err
    doc = json.loads(out)
    assert any("45 dBi" in w and "plausible" in w for w in doc["warnings"])
    assert "warning:" in err and "45 dBi" in err
    assert doc["antenna_gain_dbi"] == 45.0
    # the gain is used as given: EIRP = P_avg x 10^4.5
    row = doc["rows"][0]
    assert row["exposure"]["eirp_w"] == pytest.approx(row["exposure"]["power_average_w"] * 10 ** 4.5, rel=1e-12)


# --------------------------------------------------------------------------------------------
# Ratings
# --------------------------------------------------------------------------------------------

TUNER_STATION = """\
name: Tuner ratings
region: 1
radio: {{power: 100 W, holds: net}}
bands: [20m]
antenna:
  impedance: {{14.0 MHz: 150+j0, 14.35 MHz: 150+j0}}
feed:
  - tuner: {{label: shack tuner, network: T, capacitor_voltage_rating: {rating}}}
  - line: {{label: coax, cable: rg-213, length: 10 m}}
"""


def test_tuner_capacitor_below_its_peak_voltage_warns_naming_band_and_part(cli, write_file):
    station = write_file("tuner.yaml", TUNER_STATION.format(rating="5000 V"))
    row = budget_json(cli, station)["rows"][0]
    tuner = row["elements"][0]
    # Ohm's law on the matched input capacitor: all 100 W flow into 50 ohm through it, so its RMS
    # current is sqrt(P/R) and its peak voltage sqrt(2) I |Z_C|, Z_C = (1/Q - j)/(omega C) with
    # the default capacitor Q of 1000 (common practice).
    omega = 2 * math.pi * row["frequency_hz"]
    current_a = math.sqrt(100.0 / 50.0)
    z_c = abs(complex(1 / 1000, -1) / (omega * tuner["input_series_capacitor_pf"] * 1e-12))
    assert tuner["input_series_capacitor_current_rms_a"] == pytest.approx(current_a, rel=1e-6)
    assert tuner["input_series_capacitor_voltage_peak_v"] == pytest.approx(math.sqrt(2) * current_a * z_c, rel=1e-6)
    # a rating just under the highest capacitor peak: a warning naming the band and that part;
    # a rating just over it: none
    peaks = {k.removesuffix("_voltage_peak_v"): v for k, v in tuner.items() if k.endswith("capacitor_voltage_peak_v")}
    worst = max(peaks, key=peaks.get)
    for rating, warned in ((0.98 * peaks[worst], True), (1.02 * peaks[worst], False)):
        write_file("tuner.yaml", TUNER_STATION.format(rating=f"{rating:.3f} V"))
        code, out, err = cli("safety", station)
        assert code == 0, err
        warnings = [line for line in err.splitlines() if "shack tuner" in line]
        if warned:
            assert len(warnings) == 1 and "20m" in warnings[0], err
            assert worst.replace("_", " ") in warnings[0], err
        else:
            assert warnings == [], err


CABLE_STATION = """\
name: Cable rating
region: 1
radio: {{power: 1500 W, holds: net}}
bands: [40m, 20m]
antenna:
  impedance: {{7.0 MHz: 600+j0, 7.2 MHz: 600+j0, 14.0 MHz: 50+j0, 14.35 MHz: 50+j0}}
feed:
  - line:
      label: rated coax
      length: 12 m
      cable: {{impedance: 50 ohm, velocity_factor: 0.66, max_voltage: {rating},
              loss: {{1 MHz: 0.3 dB/100m, 10 MHz: 1 dB/100m, 100 MHz: 3.5 dB/100m}}}}
"""


def test_cable_rating_below_the_line_maximum_warns_naming_the_band(cli, write_file):
    # 1500 W into a matched 50-ohm line: V = sqrt(P Z0) = 274 V RMS (Pozar, section 2.3). On 40 m
    # the 600-ohm load (SWR 12) puts the voltage maximum at the load, shorter than a half wave
    # away: there V = sqrt(P_load R_load), several hundred volts. A rating of 500 V sits between.
    matched_v = math.sqrt(1500 * 50)
    rating = 500.0
    station = write_file("cable.yaml", CABLE_STATION.format(rating=f"{rating:.0f} V"))
    code, out, err = cli("budget", station, "--format", "json")
    assert code == 0, err
    doc = json.loads(out)
    warnings = [w for w in doc["warnings"] if "rated coax" in w]
    assert len(warnings) == 1 and "40m" in warnings[0] and "20m" not in warnings[0], warnings
    margins = [row["elements"][0]["voltage_margin"] for row in doc["rows"]]
    assert margins[0] < 1 < margins[1]
    # Ohm's law at the resistive load, where the maximum sits (to the small shift that loss gives it)
    load_v = math.sqrt(doc["rows"][0]["power_antenna_w"] * 600)
    assert doc["rows"][0]["elements"][0]["voltage_max_rms_v"] == pytest.approx(load_v, rel=0.01)
    assert load_v > rating
    assert doc["rows"][1]["elements"][0]["voltage_max_rms_v"] == pytest.approx(matched_v, rel=0.03)
    # the safety table shows the same margin and the warning
    code, out, err = cli("safety", station)
    assert code == 0 and "rated coax" in err and "40m" in err
    assert "voltage margin" in out


def test_row_outside_the_exposure_tables_shows_no_figures(cli, write_file):
    # 47 CFR 1.1310 Table 1 starts at 0.3 MHz: a 137 kHz row has no FCC distance to give
    station = write_file("lf.yaml", """\
name: Below the exposure tables
frequencies: [0.137 MHz, 1.9 MHz]
radio: {power: 100 W}
antenna:
  impedance: {0.137 MHz: 50+j0, 1.9 MHz: 50+j0}
feed: []
""")
    doc = budget_json(cli, station)
    low, high = (row["exposure"] for row in doc["rows"])
    assert low["power_average_w"] == pytest.approx(100.0, rel=1e-12)
    assert low["fcc_uncontrolled_m"] is None and low["eirp_w"] is None
    assert high["fcc_uncontrolled_m"] > 0
    code, out, err = cli("safety", station)
    assert code == 0, err
    row = next(line for line in out.splitlines() if line.strip().startswith("0.137 MHz"))
    assert "nan" not in row.lower() and row.count("n/a") == 5, row
