"""`linecalc line` as text: the fitted figures with their intervals, and the fitted line as a
feed entry of the station format (an inline cable). Formatting only: nothing here solves."""
from __future__ import annotations

from tabulate import tabulate


def _pm(value, interval, digits):
    """``value +- half`` from a [low, high] interval (None: given, not fitted)."""
    if interval is None:
        return f"{value:.{digits}f} (given)"
    return f"{value:.{digits}f} +- {(interval[1] - interval[0]) / 2:.{digits}f}"


def line_table(result) -> str:
    """A `LineCharacterisation` as a table of figures, then the loss against frequency."""
    d = result.to_dict()
    percent = f"{d['confidence'] * 100:g} %"
    r, x = d["z0_ohm"]
    (r_lo, r_hi), (x_lo, x_hi) = d["z0_ohm_interval"]
    cable = d["station_cable"]
    rows = [
        ["characteristic impedance at "
         f"{d['centre_frequency_hz'] / 1e6:.3g} MHz", f"{r:.2f} +- {(r_hi - r_lo) / 2:.2f}  "
         f"{'+' if x >= 0 else '-'}j{abs(x):.2f} +- {(x_hi - x_lo) / 2:.2f} ohm", ""],
        ["nominal impedance (high frequency)", _pm(d["z0_nominal_ohm"], d["z0_nominal_ohm_interval"], 2) + " ohm",
         f"{cable['z0_nominal_ohm']:.2f} ohm"],
        ["electrical length (one-way delay)", _pm(d["electrical_length_s"] * 1e9, [
            v * 1e9 for v in d["electrical_length_s_interval"]], 3) + " ns", ""],
        ["electrical length at the centre", _pm(d["electrical_length_wavelengths"],
                                                d["electrical_length_wavelengths_interval"], 4) + " wavelengths", ""],
        ["velocity factor", _pm(d["velocity_factor"], d["velocity_factor_interval"], 4),
         f"{cable['velocity_factor']:.4f}"],
        ["physical length", _pm(d["length_m"], d["length_m_interval"], 3) + " m", ""],
        ["loss term k1 (x sqrt(f/MHz))", _pm(d["loss_k1_db_per_100m"], d["loss_k1_db_per_100m_interval"], 4)
         + " dB/100 m", ""],
        ["loss term k2 (x f/MHz)", _pm(d["loss_k2_db_per_100m"], d["loss_k2_db_per_100m_interval"], 5)
         + " dB/100 m", ""],
        ["residual |rho|, RMS and largest", f"{d['residual_rms_rho']:.4f}, {d['residual_max_rho']:.4f}", ""],
    ]
    head = (f"{d['station']}: line {d['line']} fitted from {d['sweeps']['open']} (far end open) and "
            f"{d['sweeps']['short']} (shorted), {d['points']} points, {d['frequency_hz'][0] / 1e6:g} to "
            f"{d['frequency_hz'][1] / 1e6:g} MHz; intervals at {percent} confidence\n\n")
    figures = tabulate(rows, headers=["", "fitted", f"station cable ({cable['id']})"], disable_numparse=True)
    loss_rows = [[f"{f / 1e6:.3f}", _pm(loss, interval, 3), _pm(whole, whole_interval, 3), f"{station:.3f}"]
                 for (f, loss), interval, (_, whole), whole_interval, (_, station)
                 in zip(d["loss_db_per_100m"], d["loss_db_per_100m_interval"], d["matched_loss_db"],
                        d["matched_loss_db_interval"], cable["loss_db_per_100m"])]
    losses = tabulate(loss_rows, headers=["MHz", "fitted dB/100 m", "this line dB", "station cable dB/100 m"],
                      disable_numparse=True, stralign="right")
    cautions = "\n".join(f"- {c}" for c in d["cautions"])
    return (head + figures + "\n\nMatched loss against frequency\n\n" + losses
            + "\n\nThe fitted line as a feed entry (--write-cable FILE writes it):\n\n" + fitted_cable_yaml(result)
            + "\nCautions:\n" + cautions + "\n")


def _quoted(text):
    """A YAML double-quoted scalar (a label may hold a colon, a quote or a backslash)."""
    return '"' + text.replace("\\", "\\\\").replace('"', '\\"') + '"'


def fitted_cable_yaml(result) -> str:
    """The fitted line as a ``- line:`` entry of a station file's feed, with an inline cable."""
    cable = result.inline_cable()
    loss = ", ".join(f"{f / 1e6:.6g} MHz: {db:.6g} dB/100m" for f, db in cable["loss_db_per_100m"])
    return (f"# {result.label}: fitted by linecalc from open and short sweeps; paste into the station's feed\n"
            f"- line:\n"
            f"    label: {_quoted(cable['label'])}\n"
            f"    length: {cable['length_m']:.6g} m\n"
            f"    cable: {{impedance: {cable['impedance_ohm']:.6g} ohm, velocity_factor: {cable['velocity_factor']:.6g}, "
            f"kind: {cable['kind']},\n"
            f"            description: {_quoted(cable['description'])},\n"
            f"            loss: {{{loss}}}}}\n")
