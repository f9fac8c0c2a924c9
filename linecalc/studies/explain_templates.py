"""The sentences of ``--explain``: every one a named template with its numbers passed in.

A template is a `str.format` string whose fields name the figure they take. `sentence` rounds
each number by the last part of its field's name, as the tables round it (studies/number_text.py):

| field ends in / starts with | printed as | example |
|---|---|---|
| ``swr_...`` | SWR, two decimals (``inf`` where infinite) | 1.80 |
| ``..._db`` | dB, two decimals | 2.08 |
| ``..._setting_w``, ``..._limit_db`` | a setting or a limit, as few digits as it needs | 100 |
| ``..._w`` | watts, one decimal | 48.8 |
| ``rho_...`` | \\|rho\\|, two decimals | 0.29 |
| ``..._v`` | volts, no decimals | 112 |
| ``..._m`` | metres, one decimal | 0.9 |
| ``..._pct`` | a share in per cent, no decimals | 37 |
| ``..._ohm`` | ohms, as few digits as it needs | 50 |
| anything else | text as it is (a label, a name) | main coax |

Each topic is one to three of these sentences. Plain words and the trade's own terms: SWR,
\\|rho\\|, matched loss, mismatch, forward and reflected power, PEP, near field.
"""
from __future__ import annotations

from linecalc.studies.number_text import db_text, swr_text, watts_text

# The SWR at the radio against the antenna's, through a path without a tuner.
SWR_THROUGH_LOSS = (
    "The antenna's SWR is {swr_antenna} (|rho| {rho_antenna}); the reflected wave crosses the path's "
    "{matched_loss_db} dB of matched loss twice, up and back, {two_way_loss_db} dB in all, so |rho| "
    "at the radio falls to {rho_radio} and a meter there reads {swr_radio}.")
SWR_HIDDEN = (
    "Even an open or a short at the antenna would read no more than {swr_radio_ceiling} at the radio: "
    "an SWR this low through this much loss says little about the antenna.")
SWR_TRANSFORMED = (
    "The antenna's SWR of {swr_antenna} reads {swr_radio} at the radio, a change that the path's "
    "{matched_loss_db} dB of matched loss alone does not explain: the path's impedances differ from "
    "the radio's {reference_impedance_ohm} ohm, so the SWR changes along it.")
SWR_PHASE_AVERAGE = (
    "The antenna is known by its SWR only, so these are averages over its unknown phase.")

# Where the watts go.
WATTS_SPLIT = (
    "Of the {power_radio_w} W the radio puts into the path, {power_antenna_w} W reach the antenna "
    "and {heat_w} W turn to heat, most of it in {sinks}.")
WATTS_SINK = "the {label} ({dissipated_w} W)"
WATTS_LAST_SINK = "{sinks} and {last}"
WATTS_STANDING_WAVES = (
    "The standing waves add {mismatch_loss_db} dB to the {matched_loss_db} dB of matched loss: "
    "{standing_wave_heat_w} W, {standing_wave_share_pct} % of the heat, is theirs.")
WATTS_MISMATCH_TUNED = (
    "The mismatch adds {mismatch_loss_db} dB to the {matched_loss_db} dB of matched loss, in the "
    "standing waves on the lines and in the tuner's parts: {standing_wave_heat_w} W, "
    "{standing_wave_share_pct} % of the heat.")
WATTS_STANDING_WAVES_LESS = (
    "The standing waves here lower the loss by {mismatch_loss_db_below} dB from the {matched_loss_db} dB "
    "of matched loss: their current peaks fall where the path loses least.")
WATTS_MATCHED = (
    "The path is as good as matched: its loss is its {matched_loss_db} dB of matched loss.")

# The tuner: what it fixes and what it does not.
TUNER_BEFORE_LINE = (
    "The {tuner} brings the SWR at the radio to {swr_radio}, but it cannot change the SWR on the "
    "{line_label} beyond it, {swr_line} at the line's antenna end: that line loses {line_loss_db} dB "
    "where, matched, it would lose {line_matched_loss_db} dB.")
TUNER_AFTER_LINE = (
    "The {tuner} sits at the antenna end, so it matches the {line_label} as well as the radio: the "
    "SWR on that line is {swr_line} and it loses {line_loss_db} dB against its matched "
    "{line_matched_loss_db} dB.")
TUNER_ALONE = (
    "The {tuner} brings the SWR at the radio to {swr_radio}.")
TUNER_OWN_LOSS = "The tuner's own parts lose {tuner_loss_db} dB ({tuner_heat_w} W)."
TUNER_CANNOT_MATCH = (
    "The {tuner} cannot match here: it is left at its closest setting, {swr_radio} at the radio.")
TUNER_NAMED = "{label}"  # a label that already says it is a tuner: the shack tuner
TUNER_UNNAMED = "tuner {label}"  # any other label: the tuner T1

# What would deliver more, from a comparison of the station's own alternatives.
ALTERNATIVE_TUNER = (
    "With the tuner moved to the {end} end of the {line_label}, {power_better_w} W would reach the antenna instead of {power_antenna_w} W "
    "({gain_db} dB more): linecalc compare --tuner-positions shows it.")
ALTERNATIVE_CABLE = (
    "With the {line_label} made of {cable_id}, {power_better_w} W would reach the antenna instead of "
    "{power_antenna_w} W ({gain_db} dB more): linecalc compare shows it.")
ALTERNATIVE_LENGTH = (
    "With the {line_label} cut to {length_m} m, {power_better_w} W would reach the antenna instead of "
    "{power_antenna_w} W ({gain_db} dB more): linecalc compare shows it.")

# The radio and the mismatch at its port.
RADIO_HOLDS_FORWARD = (
    "The radio holds its forward power at {radio_forward_w} W; the SWR of {swr_radio} at its port sends "
    "{radio_reflected_w} W of it back, so {power_radio_w} W go into the path (a radio mismatch "
    "loss of {radio_mismatch_loss_db} dB).")
RADIO_FOLDS_BACK = (
    "The SWR of {swr_radio} at its port makes the radio fold back from {radio_setting_w} W to "
    "{radio_forward_w} W forward; with {radio_reflected_w} W coming back it puts {power_radio_w} W into "
    "the path, {radio_cost_w} W less than its setting (a radio mismatch loss of {radio_mismatch_loss_db} dB).")
RADIO_NET_CAPPED = (
    "The source holds its net power, but a limit of its own (its reflected-power limit or its largest "
    "forward power) holds its forward power to {radio_forward_w} W: it "
    "puts {power_radio_w} W into the path, {radio_cost_w} W short of its {radio_setting_w} W setting.")
RADIO_FIX = "A tuner at the radio, or a better match at the antenna, gets those watts back."

# Safety: the largest voltage and the exposure distance.
SAFETY_LINE_VOLTAGE = (
    "The highest voltage in the path is {voltage_peak_v} V peak at {radio_setting_w} W PEP, on the "
    "{label} {at_m} m from its radio end: {danger}, so keep it out of reach while transmitting.")
SAFETY_LINE_VOLTAGE_AT_RADIO_END = (
    "The highest voltage in the path is {voltage_peak_v} V peak at {radio_setting_w} W PEP, on the "
    "{label} at its radio end: {danger}, so keep it out of reach while transmitting.")
SAFETY_TUNER_VOLTAGE = (
    "The highest voltage in the path is {voltage_peak_v} V peak at {radio_setting_w} W PEP, across the "
    "{part} of the {tuner}: {danger}, so keep the tuner closed and out of reach while transmitting.")
DANGER_ARC = "enough to arc across a small gap and to burn on contact"
DANGER_BURN = "enough for an RF burn on contact"
SAFETY_EXPOSURE = (
    "At {power_average_w} W average at the antenna, the estimated least distance for the general "
    "public is {fcc_uncontrolled_m} m by the FCC limits and {icnirp_general_public_m} m by ICNIRP 2020; "
    "the limits your licensing authority sets are the ones that apply.")
SAFETY_NEAR_FIELD = (
    "The first {near_field_m} m around the antenna are its reactive near field, where these estimates "
    "are indicative only.")

SMALL_DIFFERENCE = (
    "Under {noticeable_limit_db} dB, that is a difference hardly anyone at the other end would notice.")

# The comparison, row by row.
COMPARE_OTHER_WINS = (
    "[{index}] {winner} delivers the most here: {power_winner_w} W at the antenna against {power_as_built_w} W "
    "as built ({gain_db} dB more).")
COMPARE_TIE = (
    "The station as built does as well as any alternative here: {power_as_built_w} W at the antenna.")
COMPARE_AS_BUILT_WINS = (
    "The station as built delivers the most here: {power_winner_w} W at the antenna, {margin_db} dB "
    "ahead of [{index}] {runner_up} ({power_runner_up_w} W).")
COMPARE_SAME_RADIO = (
    "Every alternative shows an SWR at the radio of {swr_radio_least} to {swr_radio_most}: a tuner "
    "makes the radio happy wherever it sits; what differs is the loss on the way to the antenna.")
COMPARE_SAME_RADIO_ONE = (
    "Every alternative shows an SWR at the radio of {swr_radio}: a tuner makes the radio happy "
    "wherever it sits; what differs is the loss on the way to the antenna.")


def _number(field: str, value) -> str:
    """``value`` rounded as the tables round the figure that ``field`` names."""
    if field.endswith("_setting_w") or field.endswith("_limit_db") or field.endswith("_ohm"):
        return f"{value:g}"
    if field.startswith("swr_"):
        return swr_text(value)
    if field.endswith("_db") or field.endswith("_db_below"):
        return db_text(value)
    if field.endswith("_w"):
        return watts_text(value)
    if field.startswith("rho_"):
        return f"{value:.2f}"
    if field.endswith("_v") or field.endswith("_pct"):
        return f"{value:.0f}"
    if field.endswith("_m"):
        return f"{value:.1f}"
    raise KeyError(f"no rounding for the number in field {field!r}")


def sentence(template: str, **values) -> str:
    """``template`` with its fields filled: numbers rounded by their field's name, text as it is."""
    return template.format(**{field: value if isinstance(value, str) else _number(field, value)
                              for field, value in values.items()})
