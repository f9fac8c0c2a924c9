"""Line heating against the cable's power rating in the safety stage: the heat per metre at the
hottest point at average power, and the warning above the rating (derated by the SWR)."""
from __future__ import annotations

import dataclasses

import numpy as np
import pytest

from linecalc.elements import Line
from linecalc.studies.budget import solve_budget

F_40M_HZ = np.array([7.1e6])


def _line_readings(result):
    (line,) = [e for e in result.elements if e.kind == "line"]
    return line, line.readings


def test_a_kilowatt_of_heat_in_25_m_of_rg213_class_draws_a_warning(library, make_station):
    # The case of the issue: 1.5 kW (a steady carrier, always transmitting) into 25 m of RG-213
    # class coax on 40 m, far from matched (a 1 ohm load: SWR 50 at the antenna).
    result = solve_budget(make_station([Line(library["rg-213"], 25.0, label="main coax")], F_40M_HZ, 1.0,
                                       power_w=1500.0))
    line, r = _line_readings(result)
    assert line.dissipated_w[0] == pytest.approx(1000, rel=0.02)  # about 1 kW of heat in the line
    # physically: 1 kW over 25 m is 40 W/m on average, the hottest point more
    assert r["heat_max_w_per_m"][0] > 1000 / 25
    # the matched rating at 7.1 MHz is some kW (cable_data thermal build; 3.4 kW at 14 MHz worked
    # by hand in tests/physics/test_cable_heating.py, and the rating goes as 1/alpha, about
    # 1/sqrt(f) here), so the rating allows about 16 W/m: 2 alpha P with alpha = 1.45 dB/100m
    alpha_np_per_m = 1.45 / 100 / 8.686
    assert r["power_rating_w"][0] == pytest.approx(3356 * 2.06 / 1.45, rel=0.03)
    assert r["heat_rating_w_per_m"][0] == pytest.approx(2 * alpha_np_per_m * r["power_rating_w"][0], rel=0.02)
    assert r["power_margin"][0] < 0.5
    assert any("line main coax" in w and "hottest point" in w and "7.1 MHz" in w for w in result.warnings)


def test_matched_1_5_kw_stays_within_the_rating(library, make_station):
    cable = library["rg-213"]
    z0, _ = cable.constants(F_40M_HZ)  # terminated in its own (complex) Z0: no reflection at all
    result = solve_budget(make_station([Line(cable, 25.0, label="main coax")], F_40M_HZ, z0, power_w=1500.0))
    _, r = _line_readings(result)
    # matched: the hottest point is the radio end, 2 alpha P there (Pozar, Microwave Engineering,
    # 4th ed., section 2.7: dP/dz = -2 alpha P)
    alpha_np_per_m = cable.matched_loss_db_per_m(F_40M_HZ)[0] / 8.686
    assert r["heat_max_w_per_m"][0] == pytest.approx(2 * alpha_np_per_m * 1500.0, rel=1e-3)
    assert r["heat_max_at_m"][0] == pytest.approx(0.0, abs=0.1)
    assert r["power_margin"][0] == pytest.approx(r["power_rating_w"][0] / 1500.0, rel=1e-3)
    assert not any("hottest point" in w for w in result.warnings)


def test_the_rating_is_derated_by_the_swr(library, make_station):
    # SWR 3 with the current maximum at the load (16.7 ohm), through 0.5 m (0.007 dB of loss):
    # the current maximum carries SWR times the matched conductor heat, so the margin is the
    # rating over SWR times the power (common practice; ARRL Antenna Book, transmission-line
    # chapter, from memory; Pozar, Microwave Engineering, 4th ed., section 2.3: I_max^2 = P SWR / Z0).
    # 2 %: the dielectric's share of the heat (under 2 % at 7 MHz) takes 1/SWR there, not SWR.
    cable = library["rg-213"]
    result = solve_budget(make_station([Line(cable, 0.5)], F_40M_HZ, 50.0 / 3, power_w=1000.0))
    _, r = _line_readings(result)
    assert r["heat_max_at_m"][0] == pytest.approx(0.5, abs=1e-3)  # at the load end
    assert r["power_margin"][0] == pytest.approx(r["power_rating_w"][0] / (3 * 1000.0), rel=0.02)


def test_average_power_sets_the_heat(library, make_station):
    # heat follows the average power: PEP times duty factor times transmit fraction (docs/json.md)
    station = make_station([Line(library["rg-213"], 25.0)], F_40M_HZ, 1.0, power_w=1500.0)
    full = _line_readings(solve_budget(station))[1]
    speech = _line_readings(solve_budget(dataclasses.replace(station, duty_factor=0.2, transmit_fraction=0.5)))[1]
    assert speech["heat_max_w_per_m"][0] == pytest.approx(0.1 * full["heat_max_w_per_m"][0], rel=1e-12)


def test_a_line_without_a_rating_still_reports_its_hottest_point(make_station):
    # an inline cable without max_power: the heat is reported, no rating is judged (docs/json.md)
    from linecalc.physics.cables import cable_from_points

    cable = cable_from_points("inline", "test", "coax", 50.0, 0.66, np.array([1e6, 10e6, 100e6]),
                              np.array([0.005, 0.016, 0.05]))
    z0, _ = cable.constants(F_40M_HZ)
    result = solve_budget(make_station([Line(cable, 10.0)], F_40M_HZ, z0, power_w=100.0))
    _, r = _line_readings(result)
    alpha_np_per_m = cable.matched_loss_db_per_m(F_40M_HZ)[0] / 8.686
    # matched: 2 alpha P at the radio end (Pozar, Microwave Engineering, 4th ed., section 2.7)
    assert r["heat_max_w_per_m"][0] == pytest.approx(2 * alpha_np_per_m * 100.0, rel=1e-3)
    assert not {"heat_rating_w_per_m", "power_rating_w", "power_margin", "heating_power_w"} & set(r)
