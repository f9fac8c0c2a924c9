"""The spread of an uncertainty run as text: one line per row and figure, the nominal value with
the central 95 % of the drawn stations beside it. Formatting only: nothing here solves."""
from __future__ import annotations

import math

from tabulate import tabulate

NAMES = {"power_antenna_w": ("antenna W", 1), "total_loss_db": ("total loss dB", 2),
         "swr_antenna": ("SWR antenna", 2), "swr_radio": ("SWR radio", 2),
         "z_antenna_r_ohm": ("feedpoint R ohm", 1), "z_antenna_x_ohm": ("feedpoint X ohm", 1)}


def _number(value, digits):
    return "n/a" if value is None or not math.isfinite(value) else f"{value:.{digits}f}"


def _cell(figure, digits):
    """``nominal (low to high)``."""
    return (f"{_number(figure['nominal'], digits)} ({_number(figure['low'], digits)} to "
            f"{_number(figure['high'], digits)})")


def spread_table(spread) -> str:
    """A `BudgetSpread` as a table: rows down, figures across."""
    document = spread.to_dict()
    tolerances = document["tolerances"]
    names = [name for name in NAMES if name in spread.figures]
    body = [[row["label"], *(_cell(row[name], NAMES[name][1]) for name in names)] for row in document["rows"]]
    low, high = tolerances["cable_loss_percent"]
    head = (f"\nUncertainty: each figure as solved, and in brackets the central {document['coverage'] * 100:g} % of "
            f"{tolerances['draws']:,} drawn stations (seed {tolerances['seed']}); tolerances: cable loss "
            f"{low:+g} to {high:+g} %, velocity factor +-{tolerances['velocity_factor']:g}, length "
            f"+-{tolerances['length_percent']:g} %, "
            + (f"instrument error {tolerances['rho_error']:g} in rho, " if spread.measured
               else f"antenna R and X +-{tolerances['antenna_percent']:g} %, ")
            + f"connector, choke and balun losses +-{tolerances['part_loss_percent']:g} %\n\n")
    return head + tabulate(body, headers=["row", *(NAMES[name][0] for name in names)], disable_numparse=True) + "\n"


def compare_spread_table(spread) -> str:
    """A `CompareSpread`: per row the verdict, the winner's margin over the runner-up across the
    draws, and each alternative's watts at the antenna across them."""
    document = spread.to_dict()
    body = []
    for row in document["rows"]:
        margin = row["margin_db"]
        watts = {p["name"]: p for p in row["power_antenna_w"]}
        body.append([row["label"], row["verdict"], row["leader"], row["runner_up"],
                     f"{_number(margin['low'], 2)} to {_number(margin['high'], 2)}",
                     _number(None if row["wins_share"] is None else 100 * row["wins_share"], 1),
                     f"{_number(watts[row['leader']]['low'], 1)} to {_number(watts[row['leader']]['high'], 1)}"])
    tolerances = document["tolerances"]
    head = (f"\nUncertainty: {tolerances['draws']:,} drawn stations (seed {tolerances['seed']}); a winner is named "
            f"only where it wins in at least {(1 + document['coverage']) / 2 * 100:g} % of the draws\n\n")
    return head + tabulate(body, headers=["row", "verdict", "leader as solved", "runner-up",
                                          "margin dB (95 % of draws)", "leader wins %", "leader antenna W"], disable_numparse=True) + "\n"


def feedpoint_spread_table(result) -> str:
    """A `FeedpointResult` with its spread: per point the recovered R, X and SWR with the central
    95 % of the draws."""
    document = result.uncertainty.to_dict()
    tolerances = document["tolerances"]
    body = [[f"{f / 1e6:.4f}", _cell(p["r_ohm"], 1), _cell(p["x_ohm"], 1), _cell(p["swr_antenna"], 2)]
            for f, p in zip(result.frequency_hz, document["points"])]
    low, high = tolerances["cable_loss_percent"]
    head = (f"\nUncertainty: the feedpoint as recovered, and in brackets the central {document['coverage'] * 100:g} % "
            f"of {tolerances['draws']:,} drawn stations (seed {tolerances['seed']}); tolerances: instrument error "
            f"{tolerances['rho_error']:g} in rho, cable loss {low:+g} to {high:+g} %, velocity factor "
            f"+-{tolerances['velocity_factor']:g}, length +-{tolerances['length_percent']:g} %, connector, choke and "
            f"balun losses +-{tolerances['part_loss_percent']:g} %\n\n")
    return head + tabulate(body, headers=["MHz", "R ohm", "X ohm", "SWR"], disable_numparse=True,
                           stralign="right") + "\n"
