"""Safety stages of the budget: voltage and current on every line and tuner part at the radio's
peak envelope power, against ratings; RF-exposure distances from the average power at the antenna.

Orchestration only (called by `budget.solve_budget`): the formulas live in voltage.py and
exposure.py.
"""
from __future__ import annotations

import numpy as np

from linecalc.physics.cable_heating import AMBIENT_C
from linecalc.physics.exposure import PLAUSIBLE_GAIN_DBI, average_power_w, exposure_distances
from linecalc.physics.voltage import PEAK_PER_RMS, line_extremes_in_path, line_heat_in_path, tuner_part_stress
from linecalc.elements.base import named

# The span of the exposure limit tables [Hz] (47 CFR 1.1310 Table 1 starts at 0.3 MHz).
EXPOSURE_SPAN_HZ = (0.3e6, 100e9)


def _worst(values, swr_only):
    """The largest over the unknown-phase axis of an SWR-only antenna (a no-op otherwise)."""
    return np.max(values, axis=0) if swr_only else values


def line_stress(solution, index, line, frequency_hz, labels, swr_only, average_fraction):
    """Readings (largest RMS and peak voltage and current on the line, where) and rating warnings.

    ``average_fraction`` (duty factor times transmit fraction) turns the PEP current into the
    average heating that a power rating speaks of.
    """
    extremes = line_extremes_in_path(solution, index, line, frequency_hz)
    if swr_only:
        worst_phase = np.argmax(extremes.voltage_rms_v, axis=0)
        pick = np.arange(frequency_hz.size)
        position_v = extremes.voltage_position_m[worst_phase, pick]
        worst_current = np.argmax(extremes.current_rms_a, axis=0)
        position_i = extremes.current_position_m[worst_current, pick]
    else:
        position_v, position_i = extremes.voltage_position_m, extremes.current_position_m
    readings = {
        "voltage_max_rms_v": _worst(extremes.voltage_rms_v, swr_only),
        "voltage_max_peak_v": _worst(extremes.voltage_peak_v, swr_only),
        "voltage_max_at_m": position_v,
        "current_max_rms_a": _worst(extremes.current_rms_a, swr_only),
        "current_max_at_m": position_i,
    }
    warnings = []
    rating_w = line.cable.power_rating_w(frequency_hz)
    readings.update(_heat_readings(solution, index, line, frequency_hz, swr_only, average_fraction, rating_w))
    if rating_w is not None:
        over = [f"{label} ({h:.1f} W/m at {x:.1f} m, rated {r:.1f} W/m)" for label, h, x, r, m in
                zip(labels, readings["heat_max_w_per_m"], readings["heat_max_at_m"],
                    readings["heat_rating_w_per_m"], readings["power_margin"]) if m < 1]
        if over:
            source = ("its max_power" if line.cable.max_power_w is not None else
                      f"its heating limit ({line.cable.thermal.max_temperature_c:g} degC inside at "
                      f"{AMBIENT_C:g} degC still air)")
            warnings.append(f"line {line.label}: its hottest point takes more heat per metre at average power than "
                            f"{source} allows on {', '.join(over)}: the matched power rating divided by the SWR "
                            "is exceeded, and the cable can soften and fail")
    rating = line.cable.max_voltage_v
    if rating is not None:
        readings["voltage_margin"] = rating / readings["voltage_max_rms_v"]
        over = [f"{label} ({v:.0f} V RMS at {x:.1f} m)" for label, v, x, m in
                zip(labels, readings["voltage_max_rms_v"], position_v, readings["voltage_margin"]) if m < 1]
        if over:
            warnings.append(f"line {line.label}: the voltage exceeds the cable's rating of {rating:.0f} V RMS on "
                            f"{', '.join(over)} at peak envelope power")
    return readings, warnings


def _heat_readings(solution, index, line, frequency_hz, swr_only, average_fraction, rating_w):
    """The heat per metre at the line's hottest point at average power, and, where the cable has
    a power rating (``rating_w`` [W] per row, or None), the heat its rating allows there.

    The allowed heat per metre is the matched rating's heat, 2 Re(gamma) P_rating: a hot spot of
    a standing wave that takes SWR times the matched heat reaches it at the rating over the SWR.
    """
    hot = line_heat_in_path(solution, index, line, frequency_hz)
    heat = hot.heat_w_per_m * average_fraction
    if swr_only:
        worst = np.argmax(heat, axis=0)
        position = hot.position_m[worst, np.arange(frequency_hz.size)]
        heat = np.max(heat, axis=0)
    else:
        position = hot.position_m
    readings = {"heat_max_w_per_m": heat, "heat_max_at_m": position}
    if rating_w is None:
        return readings
    _, gamma = line.cable.constants(frequency_hz)
    matched_heat_per_w = 2 * gamma.real  # heat per metre per watt on a matched line [1/m]
    heat_rating = rating_w * matched_heat_per_w
    # a line that carries no current (beyond a short) heats not at all: its margin is unbounded
    margin = np.divide(heat_rating, heat, out=np.full(heat.shape, np.inf), where=heat > 0)
    return {**readings, "heat_rating_w_per_m": heat_rating, "power_rating_w": rating_w,
            "heating_power_w": heat / matched_heat_per_w, "power_margin": margin}


def tuner_stress(design, voltage_in_v, current_in_a, tuner, labels, swr_only):
    """Readings (peak voltage across and RMS current through each part) and rating warnings."""
    readings, warnings = {}, []
    for name, stress in tuner_part_stress(design, voltage_in_v, current_in_a).items():
        if np.all(np.isnan(stress.voltage_rms_v)):
            continue
        peak_v = _worst(np.nan_to_num(stress.voltage_rms_v, nan=0.0), swr_only) * PEAK_PER_RMS
        current = _worst(np.nan_to_num(stress.current_rms_a, nan=0.0), swr_only)
        readings[f"{name}_voltage_peak_v"] = peak_v
        readings[f"{name}_current_rms_a"] = current
        kind = next(p.kind for p in design.parts if p.name == name)
        if kind == "capacitor" and tuner.max_capacitor_voltage_v is not None:
            over = [f"{label} ({v:.0f} V peak)" for label, v in zip(labels, peak_v) if v > tuner.max_capacitor_voltage_v]
            if over:
                warnings.append(f"{named('tuner', tuner.label)}: {name.replace('_', ' ')} above its "
                                f"{tuner.max_capacitor_voltage_v:.0f} V peak rating on {', '.join(over)}")
        if kind == "inductor" and tuner.max_inductor_current_a is not None:
            over = [f"{label} ({a:.1f} A RMS)" for label, a in zip(labels, current) if a > tuner.max_inductor_current_a]
            if over:
                warnings.append(f"{named('tuner', tuner.label)}: {name.replace('_', ' ')} above its "
                                f"{tuner.max_inductor_current_a:.1f} A RMS rating on {', '.join(over)}")
    return readings, warnings


def exposure(frequency_hz, power_antenna_w, duty, transmit_fraction, gain_dbi):
    """Average power at the antenna and the compliance distances per row; NaN outside the tables."""
    f = np.asarray(frequency_hz, dtype=float)
    inside = (f >= EXPOSURE_SPAN_HZ[0]) & (f <= EXPOSURE_SPAN_HZ[1])
    # A passive antenna takes no negative power: a load with no resistance through a lossless
    # path leaves a net power of rounding size (|rho| = 1 to the last bit), either sign. Its
    # exposure is that of no power, so what is below zero counts as zero here.
    average_w = average_power_w(np.maximum(power_antenna_w, 0.0), duty, transmit_fraction)
    rows = {"power_average_w": average_w}
    if np.any(inside):
        distances = exposure_distances(f[inside], average_w[inside], gain_dbi)
        for key, values in distances.items():
            column = np.full(f.shape, np.nan)
            column[inside] = values
            rows[key] = column
    return rows


def gain_warnings(gain_dbi):
    """A warning for an antenna gain outside the plausible range."""
    low, high = PLAUSIBLE_GAIN_DBI
    if low <= gain_dbi <= high:
        return []
    return [f"antenna gain {gain_dbi:g} dBi is outside the plausible {low:g} to {high:g} dBi: check it"]
