"""Where a budget's loss goes, split into the categories the budget figure stacks: the lines'
matched and mismatch loss, the tuners' loss, the parts that lose most, the other parts.

Arithmetic on a computed `linecalc.studies.budget.BudgetResult` for the figure; no formulas of
the physics.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np


@dataclass(frozen=True)
class LossShares:
    """Where the loss goes, per category and row: ``categories`` names; ``loss_db`` and
    ``heat_w`` have shape (categories, rows) [dB], [W]. Columns of ``loss_db`` sum to the total
    loss, columns of ``heat_w`` to the radio's power minus the antenna's."""

    categories: tuple[str, ...]
    loss_db: np.ndarray
    heat_w: np.ndarray


# A part (not a line or a tuner) with more than this share of the total loss in dB on any row
# gets a bar of its own, named by its label, instead of going into "other parts".
OWN_BAR_SHARE = 0.1


def loss_shares(result) -> LossShares:
    """Split a budget into the lines' matched and mismatch loss, the tuners' loss, every part
    with more than OWN_BAR_SHARE of the total loss on a row of its own, and the other parts.

    Parameters
    ----------
    result : linecalc.studies.budget.BudgetResult

    Returns
    -------
    LossShares
        Only categories with an element in the feed that loses something (a lossless meter
        adds none). In dB: the lines' matched loss; the lines'
        loss beyond it (their standing waves); the tuners' loss; each part's loss in place. In
        watts: a line of loss L and matched loss ML fed P_in heats P_in (10^(-(L - ML)/10) -
        10^(-L/10)) when matched, which is P_out (10^(ML/10) - 1) written so that it stays
        finite on a line thousands of dB long; the rest of its heat is the mismatch share.
        Tuners and the parts, their heat.
    """
    rows = len(result.labels)
    total = np.asarray(result.total_loss_db, dtype=float)
    categories, loss_db, heat_w = {}, {}, {}

    def add(name, db, watts):
        categories.setdefault(name, len(categories))
        loss_db[name] = loss_db.get(name, np.zeros(rows)) + db
        heat_w[name] = heat_w.get(name, np.zeros(rows)) + watts

    power_in = np.asarray(result.power_radio_w, dtype=float).copy()
    for element in result.elements:
        if element.kind == "line":
            loss, matched = np.asarray(element.loss_db), np.asarray(element.matched_loss_db)
            matched_heat = power_in * (10 ** (-(loss - matched) / 10) - 10 ** (-loss / 10))
            add("line matched loss", matched, matched_heat)
            add("line mismatch loss", loss - matched, element.dissipated_w - matched_heat)
        elif element.kind == "tuner":
            add("tuner loss", element.loss_db, element.dissipated_w)
        else:
            share = np.divide(element.loss_db, total, out=np.zeros(rows), where=np.isfinite(total) & (total > 0))
            add(element.label if np.any(share > OWN_BAR_SHARE) else "other parts", element.loss_db,
                element.dissipated_w)
        power_in = power_in - element.dissipated_w
    first, last = ("line matched loss", "line mismatch loss", "tuner loss"), ("other parts",)
    # parts that lose nothing at all (a meter, taken as lossless) add a legend entry but no bar
    present = [n for n in categories if np.any(loss_db[n] != 0) or np.any(heat_w[n] != 0)]
    names = tuple(sorted(present, key=lambda n: (first.index(n) if n in first else 3 + (n in last),
                                                 categories[n])))
    if not names:
        return LossShares((), np.zeros((0, rows)), np.zeros((0, rows)))
    return LossShares(names, np.array([loss_db[n] for n in names]), np.array([heat_w[n] for n in names]))
