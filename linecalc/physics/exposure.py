"""RF exposure: mode duty factors, exposure limits and far-field compliance distances.

Pure functions over numpy arrays in SI units (Hz, W, m, W/m^2). The method is the far-field
estimate of FCC OET Bulletin 65 with its ground-reflection factor, applied to the average power
that reaches the antenna (the budget's output), against the FCC maximum permissible exposure
limits (47 CFR 1.1310, Table 1) and the ICNIRP 2020 reference levels for the general public.

It is an estimate, not an evaluation: read ``CAUTIONS`` before trusting a figure, and show them
with every report.
"""
from __future__ import annotations

import numpy as np

from linecalc.physics.cables import EPSILON_0, MU_0, SPEED_OF_LIGHT

CAUTIONS = (
    "These figures are estimates, not a measurement or a formal evaluation.",
    ("The far-field formula does not hold in the reactive near field that surrounds HF antennas at "
     "these distances (within about a sixth of a wavelength, and further around large antennas): "
     "treat close-in distances as indicative only."),
    ("Where the licensing authority requires an RF-exposure evaluation, it follows that "
     "authority's own method and limits."),
    ("Feedlines, tuners and antenna ends carry voltages that can arc, burn and kill at amateur "
     "power levels; RF burns happen on contact with antennas and with lines carrying common-mode "
     "current. Keep them out of reach while transmitting."),
    ("Keep antennas and feedlines well clear of power lines. Lightning protection, grounding and "
     "bonding follow local electrical code and licensed practice, not this program."),
)

MW_PER_CM2_IN_W_PER_M2 = 10.0  # 1 mW/cm^2 = 1e-3 W / 1e-4 m^2
FREE_SPACE_IMPEDANCE_OHM = float(np.sqrt(MU_0 / EPSILON_0))  # 376.73 ohm
# OET Bulletin 65 (Edition 97-01), section 2: a ground reflection can add to the direct field,
# at most doubling it; the bulletin uses 1.6 (the EPA's figure for typical ground), so the power
# density is 1.6^2 = 2.56 times the free-space figure (from memory).
GROUND_REFLECTION_FACTOR = 2.56
# Antenna gain defaults [dBi]: an isotropic radiator, and a half-wave dipole in free space,
# directivity 1.64 (Balanis, Antenna Theory, 3rd ed., section 4.6). Ground gain is not added:
# the ground-reflection factor stands for it.
GAIN_DEFAULTS_DBI = {"isotropic": 0.0, "half-wave dipole": 2.15}
# Gains outside this span are more likely a slip than an antenna (common practice).
PLAUSIBLE_GAIN_DBI = (-10.0, 30.0)

# Duty factor of each mode: average power over PEP during transmission. FCC OET Bulletin 65
# Supplement B (Edition 97-01), table of operating duty factors of amateur modes; values from
# memory, the SSB, CW, FM, FSK/RTTY, AFSK and carrier rows agreeing with secondary summaries of
# that table; the AM row from memory only.
MODE_DUTY_FACTORS = {
    "ssb": 0.2,            # conversational SSB, no speech processing
    "ssb-processed": 0.4,  # conversational SSB, heavy speech processing
    "cw": 0.4,             # conversational CW
    "fm": 1.0,             # voice FM
    "am": 0.5,             # voice AM with carrier, 50 % modulation (the higher of the AM rows)
    "rtty": 1.0,           # FSK or RTTY
    "afsk": 1.0,           # AFSK through an SSB transmitter
    "digital": 1.0,        # the AFSK/FSK rows: a data mode with a constant envelope
    "carrier": 1.0,        # key-down carrier, tune-up
}


def duty_factor(mode):
    """Duty factor of a mode name or a number.

    Parameters
    ----------
    mode : str or float
        A key of ``MODE_DUTY_FACTORS`` (case and surrounding spaces ignored), or a duty factor in
        (0, 1].

    Returns
    -------
    float
        Average power over PEP while transmitting [1].

    Raises
    ------
    ValueError
        An unknown name, or a number outside (0, 1].

    References
    ----------
    FCC OET Bulletin 65, Supplement B (Edition 97-01), table of duty factors of amateur modes
    (from memory; see ``MODE_DUTY_FACTORS``).
    """
    if isinstance(mode, str):
        key = mode.strip().lower()
        if key not in MODE_DUTY_FACTORS:
            raise ValueError(f"unknown mode {mode!r}; known modes: {', '.join(MODE_DUTY_FACTORS)}, "
                             "or a duty factor in (0, 1]")
        return MODE_DUTY_FACTORS[key]
    value = float(mode)
    if not 0 < value <= 1:
        raise ValueError(f"a duty factor must be in (0, 1], got {value}")
    return value


def average_power_w(pep_w, duty, transmit_fraction):
    """Average power over the exposure averaging time: PEP x duty factor x transmit fraction.

    Parameters
    ----------
    pep_w : array_like
        Peak envelope power [W] (at the antenna, for exposure).
    duty : float
        Duty factor of the mode, in (0, 1] (`duty_factor`) [1].
    transmit_fraction : float
        Share of the averaging time spent transmitting, in (0, 1]: the FCC averages over 6 min
        for controlled and 30 min for uncontrolled exposure, ICNIRP over 30 min for the whole
        body [1].

    Returns
    -------
    ndarray
        Average power [W].

    References
    ----------
    FCC OET Bulletin 65, Supplement B (Edition 97-01), section on average power and duty
    factor (from memory); 47 CFR 1.1310, Table 1, averaging times.
    """
    for name, value in (("duty", duty), ("transmit_fraction", transmit_fraction)):
        if not 0 < value <= 1:
            raise ValueError(f"{name} must be in (0, 1], got {value}")
    return np.asarray(pep_w, dtype=float) * duty * transmit_fraction


def _refuse_outside(frequency_mhz, low_mhz, high_mhz, table):
    if np.any((frequency_mhz < low_mhz) | (frequency_mhz > high_mhz)):
        raise ValueError(f"{table} covers {low_mhz:g} MHz to {high_mhz:g} MHz; "
                         f"got {np.min(frequency_mhz):g} to {np.max(frequency_mhz):g} MHz")


def fcc_mpe_w_per_m2(frequency_hz, environment):
    """FCC maximum permissible exposure, power density [W/m^2].

    Parameters
    ----------
    frequency_hz : array_like
        Frequency [Hz], 0.3 MHz to 100 GHz.
    environment : {'controlled', 'uncontrolled'}
        Occupational/controlled (A) or general population/uncontrolled (B).

    Returns
    -------
    ndarray
        With f in MHz, in mW/cm^2 then times 10:
        (A) 0.3-3 MHz 100; 3-30 MHz 900/f^2; 30-300 MHz 1.0; 300-1500 MHz f/300;
        1500-100000 MHz 5.
        (B) 0.3-1.34 MHz 100; 1.34-30 MHz 180/f^2; 30-300 MHz 0.2; 300-1500 MHz f/1500;
        1500-100000 MHz 1.0.
        Below 300 MHz the figures are plane-wave equivalent power densities. Each range includes
        its upper edge; the two ranges agree at every edge except 1.34 MHz, where this gives the
        stricter 100 (180/1.34^2 = 100.2).

    Raises
    ------
    ValueError
        A frequency outside the table, or an unknown environment.

    References
    ----------
    47 CFR 1.1310(e)(1), Table 1, Limits for Maximum Permissible Exposure (from memory; the
    values agree with secondary reproductions of the table).
    """
    f = np.asarray(frequency_hz, dtype=float) / 1e6
    _refuse_outside(f, 0.3, 100_000.0, "47 CFR 1.1310 Table 1")
    # each range includes its upper edge (np.select takes the first condition that holds)
    if environment == "controlled":
        mw_per_cm2 = np.select([f <= 3.0, f <= 30.0, f <= 300.0, f <= 1500.0],
                               [100.0, 900.0 / f**2, 1.0, f / 300.0], 5.0)
    elif environment == "uncontrolled":
        mw_per_cm2 = np.select([f <= 1.34, f <= 30.0, f <= 300.0, f <= 1500.0],
                               [100.0, 180.0 / f**2, 0.2, f / 1500.0], 1.0)
    else:
        raise ValueError(f"environment must be 'controlled' or 'uncontrolled', got {environment!r}")
    return mw_per_cm2 * MW_PER_CM2_IN_W_PER_M2


def icnirp_general_public_w_per_m2(frequency_hz):
    """ICNIRP 2020 whole-body reference level for the general public, as a power density [W/m^2].

    Parameters
    ----------
    frequency_hz : array_like
        Frequency [Hz], 100 kHz to 300 GHz.

    Returns
    -------
    ndarray
        With f in MHz: 0.1-30 MHz, the plane-wave equivalent of the field levels, the smaller of
        E^2/eta0 with E = 300 f^-0.7 V/m and eta0 H^2 with H = 2.2/f A/m (the guidelines give
        no power density there; E is the stricter up to 29.6 MHz); above 30 to 400 MHz, 2;
        above 400 to 2000 MHz, f/200; above 2 GHz to 300 GHz, 10. eta0 = sqrt(mu0/eps0) =
        376.7 ohm.

    Raises
    ------
    ValueError
        A frequency outside 100 kHz to 300 GHz.

    Notes
    -----
    Edition: ICNIRP 2020, Table 5 (whole-body exposure, averaged over 30 min, general public),
    recalled from memory; its local-exposure Table 6 was seen reproduced in a secondary source
    and has the same structure (E and H only below 30 MHz). Below 30 MHz the guidelines apply
    the field levels near and far alike; a far-field distance from their plane-wave equivalent
    is an estimate. The result is continuous at 30 MHz to 2 % (27.7 V/m is 2.04 W/m^2).

    References
    ----------
    ICNIRP, Guidelines for limiting exposure to electromagnetic fields (100 kHz to 300 GHz),
    Health Phys. 118(5):483-524 (2020), Table 5 (from memory).
    """
    f = np.asarray(frequency_hz, dtype=float) / 1e6
    _refuse_outside(f, 0.1, 300_000.0, "ICNIRP 2020 Table 5")
    e_v_per_m = 300.0 * f ** -0.7
    h_a_per_m = 2.2 / f
    below_30 = np.minimum(e_v_per_m**2 / FREE_SPACE_IMPEDANCE_OHM, FREE_SPACE_IMPEDANCE_OHM * h_a_per_m**2)
    return np.select([f <= 30.0, f <= 400.0, f <= 2000.0], [below_30, 2.0, f / 200.0], 10.0)


def eirp_from_gain_w(power_average_w, gain_dbi):
    """Equivalent isotropically radiated power P G [W], G = 10^(gain_dbi/10).

    References
    ----------
    FCC OET Bulletin 65 (Edition 97-01), section 2 (EIRP = P G).
    """
    return np.asarray(power_average_w, dtype=float) * 10 ** (np.asarray(gain_dbi, dtype=float) / 10)


def power_density_w_per_m2(eirp_w, distance_m, ground_reflection=True):
    """Far-field power density S = F^2 EIRP / (4 pi R^2) [W/m^2].

    Parameters
    ----------
    eirp_w : array_like
        Average EIRP [W].
    distance_m : array_like
        Distance from the antenna [m].
    ground_reflection : bool
        F^2 = 2.56 (``GROUND_REFLECTION_FACTOR``) if True, 1 (free space) if False.

    References
    ----------
    FCC OET Bulletin 65 (Edition 97-01), section 2, far-field equations: S = EIRP/(4 pi R^2)
    in free space and S = 2.56 EIRP/(4 pi R^2) = 0.64 EIRP/(pi R^2) with ground reflection
    (equation numbers not verified; from memory).
    """
    factor = GROUND_REFLECTION_FACTOR if ground_reflection else 1.0
    return factor * np.asarray(eirp_w, dtype=float) / (4 * np.pi * np.asarray(distance_m, dtype=float) ** 2)


def compliance_distance_m(eirp_w, limit_w_per_m2, ground_reflection=True):
    """Distance beyond which the far-field power density is within a limit [m].

    R = sqrt(F^2 EIRP / (4 pi S_limit)), the inverse of `power_density_w_per_m2`.

    References
    ----------
    FCC OET Bulletin 65 (Edition 97-01), section 2 (from memory).
    """
    factor = GROUND_REFLECTION_FACTOR if ground_reflection else 1.0
    return np.sqrt(factor * np.asarray(eirp_w, dtype=float) / (4 * np.pi * np.asarray(limit_w_per_m2, dtype=float)))


def reactive_near_field_m(frequency_hz):
    """lambda / (2 pi): inside it the reactive field of a small antenna dominates [m].

    Far-field distances shorter than this (and than the antenna's own size) are indicative only.

    References
    ----------
    Balanis, Antenna Theory, 3rd ed., section 4.2 (infinitesimal dipole: near field for
    kr << 1, far field for kr >> 1; kr = 1 at the radian distance lambda/2pi), from memory.
    """
    return SPEED_OF_LIGHT / (2 * np.pi * np.asarray(frequency_hz, dtype=float))


def exposure_distances(frequency_hz, power_average_w, gain_dbi, ground_reflection=True):
    """Minimum far-field distances meeting the FCC and ICNIRP limits, with the limits used.

    Parameters
    ----------
    frequency_hz : array_like, (nf,)
        Frequency [Hz].
    power_average_w : array_like, (..., nf)
        Average power into the antenna [W] (`average_power_w` of the budget's antenna power).
    gain_dbi : float or array_like
        Antenna gain over isotropic [dBi] (``GAIN_DEFAULTS_DBI``).
    ground_reflection : bool
        Include OET Bulletin 65's ground-reflection factor 2.56 (default True).

    Returns
    -------
    dict of str to ndarray
        ``eirp_w`` [W]; ``fcc_controlled_m``, ``fcc_uncontrolled_m``,
        ``icnirp_general_public_m`` [m]; ``fcc_controlled_limit_w_per_m2``,
        ``fcc_uncontrolled_limit_w_per_m2``, ``icnirp_general_public_limit_w_per_m2`` [W/m^2];
        ``near_field_m`` (`reactive_near_field_m`) [m]; all broadcast to (..., nf).

    Notes
    -----
    The averaging times differ (FCC controlled 6 min, uncontrolled and ICNIRP 30 min); the
    average power passed in should use the transmit fraction of the relevant period, the
    longest busy period being the cautious choice. Read ``CAUTIONS``.

    References
    ----------
    FCC OET Bulletin 65 (Edition 97-01), section 2; 47 CFR 1.1310, Table 1; ICNIRP 2020,
    Table 5 (see the functions used).
    """
    f = np.asarray(frequency_hz, dtype=float)
    eirp = eirp_from_gain_w(power_average_w, gain_dbi)
    limits = {"fcc_controlled": fcc_mpe_w_per_m2(f, "controlled"),
              "fcc_uncontrolled": fcc_mpe_w_per_m2(f, "uncontrolled"),
              "icnirp_general_public": icnirp_general_public_w_per_m2(f)}
    shape = np.broadcast_shapes(eirp.shape, f.shape)
    out = {"eirp_w": np.broadcast_to(eirp, shape)}
    for name, limit in limits.items():
        out[f"{name}_m"] = np.broadcast_to(compliance_distance_m(eirp, limit, ground_reflection), shape)
        out[f"{name}_limit_w_per_m2"] = np.broadcast_to(limit, shape)
    out["near_field_m"] = np.broadcast_to(reactive_near_field_m(f), shape)
    return out
