"""Checks of linecalc.physics.exposure: duty factors, exposure limits, far-field distances.

Expected values are the published tables evaluated by hand (numbers written out below) and the
OET Bulletin 65 far-field formula worked by hand; the budget checks use the loss budget, a
different part of linecalc, as the source of the antenna power.
"""
from __future__ import annotations

import numpy as np
import pytest

from linecalc.studies import budget
from linecalc.physics import cables
from linecalc import elements
from linecalc.physics import exposure

# 1 mW/cm^2 = 1e-3 W / 1e-4 m^2 = 10 W/m^2 (SI prefixes).
W_PER_M2_PER_MW_PER_CM2 = 10.0


# --- 47 CFR 1.1310 Table 1 ---------------------------------------------------------------
# 47 CFR 1.1310(e)(1), Table 1 (from memory; the same figures appear in secondary
# reproductions of the table), f in MHz, power density in mW/cm^2:
# (A) occupational/controlled: 0.3-3.0: 100; 3.0-30: 900/f^2; 30-300: 1.0; 300-1500: f/300;
#     1500-100,000: 5.
# (B) general population/uncontrolled: 0.3-1.34: 100; 1.34-30: 180/f^2; 30-300: 0.2;
#     300-1500: f/1500; 1500-100,000: 1.0.
# Every range edge, and one value inside each range, evaluated by hand:
CONTROLLED_MW_PER_CM2 = [
    (0.3, 100.0), (1.0, 100.0), (3.0, 100.0),     # edge 3: 900/3^2 = 100 as well
    (10.0, 9.0),                                  # 900/100
    (30.0, 1.0),                                  # 900/900
    (100.0, 1.0), (300.0, 1.0),                   # 300/300
    (600.0, 2.0),                                 # 600/300
    (1500.0, 5.0),                                # 1500/300
    (10_000.0, 5.0), (100_000.0, 5.0),
]
UNCONTROLLED_MW_PER_CM2 = [
    (0.3, 100.0), (1.0, 100.0), (1.34, 100.0),    # edge: the 0.3-1.34 row (180/1.34^2 = 100.2)
    (2.0, 45.0),                                  # 180/4
    (10.0, 1.8),                                  # 180/100
    (30.0, 0.2),                                  # 180/900
    (100.0, 0.2), (300.0, 0.2),                   # 300/1500
    (750.0, 0.5),                                 # 750/1500
    (1500.0, 1.0),                                # 1500/1500
    (10_000.0, 1.0), (100_000.0, 1.0),
]


@pytest.mark.parametrize("environment, table", [("controlled", CONTROLLED_MW_PER_CM2),
                                                ("uncontrolled", UNCONTROLLED_MW_PER_CM2)])
def test_fcc_mpe_against_47_cfr_1_1310_table_1(environment, table):
    mhz, expected_mw_per_cm2 = (np.array(column) for column in zip(*table))
    limit = exposure.fcc_mpe_w_per_m2(mhz * 1e6, environment)
    np.testing.assert_allclose(limit, expected_mw_per_cm2 * W_PER_M2_PER_MW_PER_CM2, rtol=1e-12)


def test_fcc_mpe_just_above_1_34_mhz_uses_the_180_over_f2_row():
    # 47 CFR 1.1310 Table 1 (B): 1.341^2 = 1.798281, 180/1.798281 = 100.0956 mW/cm^2.
    np.testing.assert_allclose(exposure.fcc_mpe_w_per_m2(1.341e6, "uncontrolled"), 1000.956, rtol=1e-5)


@pytest.mark.parametrize("mhz", [0.29, 100_001.0])
def test_fcc_mpe_refuses_frequencies_outside_the_table(mhz):
    with pytest.raises(ValueError, match="1.1310"):
        exposure.fcc_mpe_w_per_m2(np.array([14.0, mhz]) * 1e6, "uncontrolled")


def test_fcc_mpe_refuses_an_unknown_environment():
    with pytest.raises(ValueError, match="controlled"):
        exposure.fcc_mpe_w_per_m2(14e6, "public")


# --- ICNIRP 2020 ---------------------------------------------------------------------------

@pytest.mark.parametrize("mhz, expected_w_per_m2", [
    (100.0, 2.0), (400.0, 2.0),          # >30-400 MHz: 2 W/m^2
    (1000.0, 5.0), (2000.0, 10.0),       # >400-2000 MHz: f/200
    (6000.0, 10.0), (300_000.0, 10.0),   # >2-300 GHz: 10 W/m^2
])
def test_icnirp_2020_general_public_power_density(mhz, expected_w_per_m2):
    # ICNIRP 2020 guidelines, Health Phys. 118(5):483-524, Table 5, general public (from memory).
    np.testing.assert_allclose(exposure.icnirp_general_public_w_per_m2(mhz * 1e6), expected_w_per_m2, rtol=1e-12)


def test_icnirp_2020_below_30_mhz_is_the_plane_wave_equivalent_of_the_e_field_level():
    # ICNIRP 2020 Table 5, general public, 0.1-30 MHz: E = 300 f^-0.7 V/m, H = 2.2/f A/m (from
    # memory). At 10 MHz: 10^0.7 = 5.0119, E = 59.858 V/m; plane wave S = E^2/eta0 with
    # eta0 = 376.73 ohm (Pozar, Microwave Engineering, 4th ed., section 1.4): 3582.9/376.73 =
    # 9.5106 W/m^2; from H: 376.73 * 0.22^2 = 18.234 W/m^2, so E governs.
    np.testing.assert_allclose(exposure.icnirp_general_public_w_per_m2(10e6), 9.5106, rtol=1e-4)
    # Continuity at 30 MHz, the table against itself: 300 * 30^-0.7 = 27.74 V/m beside the 27.7 V/m
    # (2 W/m^2) of the row above 30 MHz.
    below, above = exposure.icnirp_general_public_w_per_m2(np.array([30e6, 30.001e6]))
    assert above == 2.0 and abs(below / above - 1) < 0.02


def test_icnirp_refuses_frequencies_outside_100_khz_to_300_ghz():
    with pytest.raises(ValueError, match="ICNIRP"):
        exposure.icnirp_general_public_w_per_m2(90e3)


# --- OET Bulletin 65 far-field distance, by hand --------------------------------------------

def test_distance_worked_by_hand_from_oet_65():
    # FCC OET Bulletin 65 (Edition 97-01), section 2, far field with ground reflection (from
    # memory): S = 2.56 EIRP / (4 pi R^2), so R = sqrt(2.56 EIRP / (4 pi S)).
    # 14.2 MHz, 100 W average into a half-wave dipole, 2.15 dBi (Balanis, Antenna Theory,
    # 3rd ed., section 4.6: D = 1.643), uncontrolled limit (47 CFR 1.1310 Table 1 (B)):
    #   S = 180 / 14.2^2 = 180 / 201.64 = 0.892680 mW/cm^2 = 8.92680 W/m^2
    #   G = 10^(2.15/10) = 1.640590, EIRP = 164.0590 W
    #   2.56 * 164.0590 = 419.991;  4 pi * 8.92680 = 112.1775
    #   R^2 = 419.991 / 112.1775 = 3.74399 m^2;  R = 1.93494 m
    result = exposure.exposure_distances(np.array([14.2e6]), np.array([100.0]), 2.15)
    np.testing.assert_allclose(result["fcc_uncontrolled_limit_w_per_m2"], 8.92680, rtol=1e-6)
    np.testing.assert_allclose(result["eirp_w"], 164.0590, rtol=1e-6)
    np.testing.assert_allclose(result["fcc_uncontrolled_m"], 1.93494, rtol=1e-5)
    # Controlled (A): S = 900/201.64 = 4.46340 mW/cm^2, five times the limit: R / sqrt(5) = 0.865330 m.
    np.testing.assert_allclose(result["fcc_controlled_m"], 0.865330, rtol=1e-5)
    # Free space (no ground reflection) divides R by 1.6: 1.93494 / 1.6 = 1.209338 m.
    free = exposure.exposure_distances(np.array([14.2e6]), np.array([100.0]), 2.15, ground_reflection=False)
    np.testing.assert_allclose(free["fcc_uncontrolled_m"], 1.209338, rtol=1e-5)
    # lambda/2pi at 14.2 MHz: 299.792458 / 14.2 / (2 pi) = 3.36010 m (Balanis, section 4.2).
    np.testing.assert_allclose(result["near_field_m"], 3.36010, rtol=1e-5)


@pytest.mark.parametrize("factor", [0.25, 2.0, 4.0, 10.0])
def test_distance_grows_as_the_square_root_of_power(factor):
    # OET Bulletin 65, section 2: S ~ P / R^2 in the far field, so R ~ sqrt(P).
    frequency_hz = np.array([3.6e6, 7.1e6, 14.2e6, 28.5e6, 50.1e6, 146e6, 435e6])
    base = exposure.exposure_distances(frequency_hz, np.full(frequency_hz.shape, 50.0), 2.15)
    scaled = exposure.exposure_distances(frequency_hz, np.full(frequency_hz.shape, 50.0 * factor), 2.15)
    for key in ("fcc_controlled_m", "fcc_uncontrolled_m", "icnirp_general_public_m"):
        np.testing.assert_allclose(scaled[key] / base[key], np.sqrt(factor), rtol=1e-12)


def test_distance_falls_when_the_feedline_loss_rises(make_station):
    # Same antenna, same radio, two 40 m feedlines: the lossier one delivers fewer watts to the
    # antenna (the loss budget), so every distance shrinks, as sqrt of the antenna powers.
    frequency_hz = np.array([14.2e6])
    low = cables.cable_from_points("low-loss", "test coax, low loss", "coax", 50.0, 0.85,
                                   [1e6, 10e6, 100e6], [0.005, 0.016, 0.05])
    high = cables.cable_from_points("lossy", "test coax, lossy", "coax", 50.0, 0.66,
                                    [1e6, 10e6, 100e6], [0.02, 0.07, 0.25])
    two_feedlines = [make_station([elements.Line(c, 40.0)], frequency_hz, 72.0 - 35.0j) for c in (low, high)]
    antenna_w = [budget.solve_budget(station).power_antenna_w for station in two_feedlines]
    assert antenna_w[1][0] < 0.9 * antenna_w[0][0]  # the check has teeth
    duty = exposure.duty_factor("cw")
    distances = [exposure.exposure_distances(frequency_hz, exposure.average_power_w(p, duty, 1.0), 2.15)
                 for p in antenna_w]
    for key in ("fcc_controlled_m", "fcc_uncontrolled_m", "icnirp_general_public_m"):
        assert distances[1][key][0] < distances[0][key][0]
        np.testing.assert_allclose(distances[1][key] / distances[0][key],
                                   np.sqrt(antenna_w[1] / antenna_w[0]), rtol=1e-12)


# --- duty factors and averaging ----------------------------------------------------------------

@pytest.mark.parametrize("mode, expected", [
    # FCC OET Bulletin 65 Supplement B (Edition 97-01), table of duty factors of amateur modes
    # (from memory; the rows below agree with secondary summaries of that table):
    ("ssb", 0.20),            # conversational SSB, no speech processing
    ("ssb-processed", 0.40),  # conversational SSB, heavy speech processing
    ("cw", 0.40),             # conversational CW
    ("fm", 1.00),             # voice FM
    ("rtty", 1.00),           # FSK or RTTY
    ("afsk", 1.00),           # AFSK through an SSB transmitter
    ("digital", 1.00),        # the AFSK/FSK rows
    ("carrier", 1.00),        # carrier (tune-up)
    # Same table, voice AM at 50 % modulation (from memory only): PEP is (1 + 0.5)^2 = 2.25
    # carriers, the mean 1 + 0.5^2/2 = 1.125 carriers with a sine, 1.125/2.25 = 0.5.
    ("am", 0.50),
])
def test_duty_factors_against_oet_65_supplement_b(mode, expected):
    assert exposure.duty_factor(mode) == expected
    assert exposure.duty_factor(f"  {mode.upper()} ") == expected


def test_duty_factor_takes_a_number_in_0_to_1_and_refuses_the_rest():
    assert exposure.duty_factor(0.33) == 0.33
    for bad in (0.0, -0.1, 1.01):
        with pytest.raises(ValueError, match=r"\(0, 1\]"):
            exposure.duty_factor(bad)
    with pytest.raises(ValueError, match="unknown mode 'psk'"):
        exposure.duty_factor("psk")


def test_average_power_is_pep_times_duty_times_transmit_fraction():
    # The averaging of OET Bulletin 65 Supplement B (from memory), worked here by hand:
    # 1500 W PEP SSB (duty 0.2), transmitting 20 min of 30: 1500 * 0.2 * (20/30) = 200 W.
    assert exposure.average_power_w(1500.0, exposure.duty_factor("ssb"), 20 / 30) == pytest.approx(200.0, rel=1e-12)
    with pytest.raises(ValueError, match="transmit_fraction"):
        exposure.average_power_w(100.0, 0.4, 0.0)


def test_cautions_cover_estimate_near_field_authority_voltage_power_lines_and_grounding():
    text = " ".join(exposure.CAUTIONS).lower()
    for words in ("estimate", "near field", "licensing authority", "voltages", "rf burns", "power lines",
                  "lightning", "grounding", "electrical code"):
        assert words in text
