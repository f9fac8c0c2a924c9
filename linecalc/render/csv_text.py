"""Results as CSV text: one line per row (and per alternative for a comparison), full precision."""
from __future__ import annotations

import csv
import io
import math

import numpy as np

from linecalc.studies.budget import BudgetResult


def budget_csv(result: BudgetResult) -> str:
    """A flat table: one line per row, the JSON fields plus each element's loss and heat."""
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    header = ["label", "frequency_hz", "swr_antenna", "swr_radio", "z_antenna_r_ohm", "z_antenna_x_ohm",
              "z_radio_r_ohm", "z_radio_x_ohm", "matched_loss_db", "mismatch_loss_db", "total_loss_db",
              "power_radio_w", "power_antenna_w", "radio_forward_w", "radio_reflected_w", "radio_mismatch_loss_db"]
    for e in result.elements:
        header += [f"{e.label}:loss_db", f"{e.label}:dissipated_w"]
    writer.writerow(header)
    for i, label in enumerate(result.labels):
        z_a = result.z_antenna_ohm[i] if result.z_antenna_ohm is not None else complex(np.nan, np.nan)
        z_r = result.z_radio_ohm[i] if result.z_radio_ohm is not None else complex(np.nan, np.nan)
        row = [label, result.frequency_hz[i], result.swr_antenna[i], result.swr_radio[i], z_a.real, z_a.imag,
               z_r.real, z_r.imag, result.matched_loss_db[i], result.mismatch_loss_db[i], result.total_loss_db[i],
               result.power_radio_w[i], result.power_antenna_w[i], result.radio_forward_w[i],
               result.radio_reflected_w[i], result.radio_mismatch_loss_db[i]]
        for e in result.elements:
            row += [e.loss_db[i], e.dissipated_w[i]]
        writer.writerow(["" if isinstance(v, float) and math.isnan(v) else (f"{v:.10g}" if not isinstance(v, str) else v)
                         for v in row])
    return buffer.getvalue()


def budgets_csv(results) -> str:
    """Several stations' budgets as one table: a ``station`` column, then each station's lines
    under their own header (the element columns differ from station to station)."""
    out = []
    for result in results:
        lines = budget_csv(result).splitlines()
        name = io.StringIO()
        csv.writer(name, lineterminator="").writerow([result.station])
        out += ["station," + lines[0]] + [f"{name.getvalue()},{line}" for line in lines[1:]]
    return "\n".join(out) + "\n"


def compare_csv(comparison) -> str:
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow(["label", "frequency_hz", "alternative", "power_antenna_w", "total_loss_db", "winner", "margin_db"])
    for i, label in enumerate(comparison.labels):
        for k, name in enumerate(comparison.names):
            writer.writerow([label, f"{comparison.frequency_hz[i]:.10g}", name,
                             f"{comparison.power_antenna_w[k, i]:.10g}", f"{comparison.total_loss_db[k, i]:.10g}",
                             "yes" if comparison.winner[i] == k else "", f"{comparison.margin_db[i]:.10g}"])
    return buffer.getvalue()


def feedpoint_csv(result) -> str:
    """A measured sweep moved to the feedpoint (a `FeedpointResult`): one line per point."""
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow(["frequency_hz", "r_ohm", "x_ohm", "swr_antenna", "sensitivity", "active"])
    sweep = result.sweep
    for f, z, swr, m, a in zip(result.frequency_hz, sweep.z_antenna_ohm, sweep.swr_antenna, sweep.sensitivity,
                               sweep.active):
        writer.writerow([f"{f:.10g}", f"{z.real:.10g}", f"{z.imag:.10g}", f"{swr:.10g}", f"{m:.10g}",
                         "yes" if a else ""])
    return buffer.getvalue()
