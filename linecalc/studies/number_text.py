"""Numbers as the tables print them: the one place that decides how an SWR, a loss in dB or a
power in watts is rounded for people. The tables (render/tables.py) and the explanations
(studies/explain.py) both use these, so a figure in a sentence reads exactly as in its table."""
from __future__ import annotations

import math


def swr_text(swr) -> str:
    """An SWR to two decimals; ``inf`` where it is infinite (a short, an open, a pure reactance)."""
    return "inf" if not math.isfinite(swr) else f"{swr:.2f}"


def db_text(value) -> str:
    """A figure in dB to two decimals; a rounding residue below zero prints as 0.00, not -0.00."""
    text = f"{value:.2f}"
    return "0.00" if text == "-0.00" else text


def watts_text(value) -> str:
    """A power [W] to one decimal, as the budget table prints watts."""
    return f"{value:.1f}"
