"""Tuners as they are used: a manual tuner set once and held across a band sweep, an automatic
one retuned at every point, a built-in tuner's own part ranges, and an SWR-only antenna."""
from __future__ import annotations

import numpy as np
import pytest
import skrf

import linecalc
from linecalc.io.feed_file import BUILTIN_CAPACITANCE_F, BUILTIN_INDUCTANCE_H
from linecalc.physics.matching import TunerParts, design_builtin_tuner

# 80 m in region 2 is 3.5 to 4.0 MHz; 11 points edge to edge fall every 50 kHz, the centre among them.
SWEEP_HZ = np.linspace(3.5e6, 4.0e6, 11)
# Invented loads of a short doublet through its feeder across 80 m (reactance rising with frequency).
LOADS_OHM = [complex(30 + 8 * k, -420 + 70 * k) for k in range(11)]


def _station(tuner):
    table = ", ".join(f"{f / 1e6:g} MHz: {z.real:g}{z.imag:+g}j" for f, z in zip(SWEEP_HZ, LOADS_OHM))
    return linecalc.load_station(f"""\
name: Held tuner
region: 2
radio: {{power: 100 W}}
bands: [80m]
antenna:
  impedance: {{{table}}}
feed:
  - tuner: {tuner}
""")


def test_a_fixed_t_tuner_across_the_band_is_the_same_network_solved_point_by_point_with_scikit_rf():
    station = _station("{label: manual, network: T}")
    result = linecalc.solve_budget(station, sweep_points=11)
    tuner = result.elements[0].readings
    c1, l2, c3 = (tuner["input_series_capacitor_pf"][0] * 1e-12, tuner["shunt_inductor_uh"][0] * 1e-6,
                  tuner["output_series_capacitor_pf"][0] * 1e-12)
    # The same three parts, left at the centre's values, built from scikit-rf's lumped elements
    # with each part's loss as a series resistance X/Q (Q 100 inductor, 1000 capacitor: the
    # README defaults; Pozar, Microwave Engineering, 4th ed., section 6.1, unloaded Q) and
    # terminated in each point's load.
    omega = 2 * np.pi * SWEEP_HZ
    media = skrf.media.DefinedGammaZ0(skrf.Frequency.from_f(SWEEP_HZ, unit="hz"), z0=50.0)
    series_c1 = media.resistor(1 / (omega * c1 * 1000)) ** media.capacitor(c1)
    series_c3 = media.resistor(1 / (omega * c3 * 1000)) ** media.capacitor(c3)
    shunt_l2 = media.shunt(media.resistor(omega * l2 / 100) ** media.inductor(l2) ** media.short())
    network = series_c1 ** shunt_l2 ** series_c3
    s = network.s
    rho_load = (np.array(LOADS_OHM) - 50) / (np.array(LOADS_OHM) + 50)
    rho_in = s[:, 0, 0] + s[:, 0, 1] * s[:, 1, 0] * rho_load / (1 - s[:, 1, 1] * rho_load)
    swr = (1 + np.abs(rho_in)) / (1 - np.abs(rho_in))
    sweep = result.sweeps[0]
    # two double-precision routes through the same network: rounding only, and the tuner's
    # part values come back rounded to nothing (full precision in the readings)
    np.testing.assert_allclose(sweep.swr_radio, swr, rtol=1e-9)
    assert sweep.swr_radio[5] == pytest.approx(1.0, abs=0.02)  # matched where it was set
    assert sweep.swr_radio[0] > 3 and sweep.swr_radio[-1] > 3  # the band edges are far off
    assert sweep.held_tuners == ("manual",) and sweep.tuner_set_hz == pytest.approx(3.75e6)


def test_an_automatic_tuner_retunes_at_every_point():
    result = linecalc.solve_budget(_station("{label: auto, network: T, adjust: automatic}"), sweep_points=11)
    np.testing.assert_array_less(result.sweeps[0].swr_radio, 1.02)  # matched everywhere (MATCHED_SWR)
    assert result.sweeps[0].held_tuners == ()


def test_the_sweep_table_says_where_a_held_tuner_was_set():
    from linecalc.render.tables import sweep_table

    result = linecalc.solve_budget(_station("{label: manual, network: T}"), sweep_points=11)
    assert "Tuner manual set once at 3.7500 MHz and held across the band" in sweep_table(result.sweeps)


def test_a_sweep_point_where_an_automatic_tuner_fails_is_a_warning():
    # A built-in tuner (automatic by default) that accepts only 1.5:1: it stays in bypass at
    # every point of these loads (SWR far above 1.5 against 50 ohm).
    result = linecalc.solve_budget(_station("{label: inside, network: builtin, max_swr: 1.5}"), sweep_points=11)
    document = result.to_dict()
    text = "\n".join(document["warnings"])
    assert "tuner inside cannot match across the band on 80m at 11 of 11 points (3.5000 to 4.0000 MHz)" in text


def test_builtin_default_parts_match_every_3_to_1_load_on_80_and_160_m():
    # The README's claim for the built-in tuner's own part ranges: every load on the 3:1 circle
    # (|rho| = 0.5, Pozar, section 2.3) matched at the bottom edges of 160 m and 80 m.
    parts = TunerParts(*BUILTIN_CAPACITANCE_F, *BUILTIN_INDUCTANCE_H)
    rho = 0.4999 * np.exp(2j * np.pi * np.arange(72) / 72)
    z = 50 * (1 + rho) / (1 - rho)
    for f_hz in (1.8e6, 3.5e6):
        design = design_builtin_tuner(np.full(z.size, f_hz), z, 50.0, parts, "L", 3.0)
        assert design.matched.all(), f_hz


def test_adjust_is_read_and_checked(one_error_line, write_file, cli):
    assert _station("{network: T}").feed[0].held
    assert not _station("{network: builtin}").feed[0].held
    assert not _station("{network: L, adjust: automatic}").feed[0].held
    assert _station("{network: builtin, adjust: once}").feed[0].held
    path = write_file("bad.yaml", "name: x\nradio: {power: 100 W}\nfrequencies: [7 MHz]\n"
                      "antenna: {impedance: {7 MHz: 50}}\nfeed:\n  - tuner: {adjust: sometimes}\n")
    code, out, err = cli("budget", path)
    assert code == 2 and out == ""
    line, message = one_error_line(err, path)
    assert line == 6 and "adjust is once or automatic" in message


def test_an_swr_only_antenna_gives_the_tuner_settings_as_a_range_and_no_contradiction():
    # SWR 30 through a short coax: a T with capacitors up to 40 pF matches some phases of the
    # unknown reflection and not others.
    station = linecalc.load_station("""\
name: SWR only
radio: {power: 100 W}
frequencies: [3.6 MHz]
antenna: {swr: {3.6 MHz: 30}}
feed:
  - tuner: {label: small, network: T, capacitance: {min: 10 pF, max: 40 pF}}
  - line: {label: coax, cable: rg-213, length: 5 m}
""")
    result = linecalc.solve_budget(station)
    readings = result.elements[0].readings
    assert "input_series_capacitor_pf" not in readings
    assert readings["input_series_capacitor_pf_least"][0] <= readings["input_series_capacitor_pf_most"][0]
    assert 0 < readings["matched_share"][0] < 1
    text = "\n".join(result.warnings)
    assert "phases of the antenna's unknown reflection" in text
    assert "1.00 at its input" not in text


def test_a_builtin_tuner_left_in_bypass_is_not_said_to_be_at_its_closest_setting():
    # The loads here lie far past 1.2:1: a built-in tuner that gives up goes to bypass (README,
    # Tuners), so the warning says the radio sees the line through it, not a "closest setting".
    result = linecalc.solve_budget(_station("{network: builtin, max_swr: 1.2}"))
    warning, = [w for w in result.warnings if "cannot match" in w]
    assert warning.startswith("tuner 1 cannot match on 80m (")  # the default label, named once
    assert "left in bypass" in warning and "closest setting" not in warning
