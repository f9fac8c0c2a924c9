"""linecalc: transmission-line and station loss-budget engine.

The public API (described in the README, section *Python use*)::

    import linecalc
    station = linecalc.load_station("stations/hilltop-dipole.yaml")
    result = linecalc.solve_budget(station)   # result.to_dict() is `linecalc budget --format json`

Errors: every error linecalc raises on purpose is a `LinecalcError`; bad input is an
`InputError`, and `StationError` (one of those) names the file, line and key path at fault.
"""
__version__ = "0.1.0"

from linecalc.api import (draw_figure, list_cables, load_station, render_report, solve_advice, solve_antenna,
                          solve_budget, solve_compare, solve_feedpoint, solve_line, solve_pair_advice, solve_safety)
from linecalc.errors import InputError, LinecalcError, StationError
from linecalc.studies.antenna_report import AntennaReport
from linecalc.studies.budget import BudgetResult, ElementBudget
from linecalc.studies.compare import Comparison
from linecalc.studies.length_advice import AdviceResult
from linecalc.studies.line_report import LineCharacterisation
from linecalc.studies.measured import FeedpointResult
from linecalc.studies.pair_advice import PairAdviceResult
from linecalc.studies.station import Station

__all__ = ["AdviceResult", "AntennaReport", "BudgetResult", "Comparison", "ElementBudget", "FeedpointResult", "InputError",
           "LineCharacterisation", "LinecalcError", "PairAdviceResult", "Station", "StationError", "__version__",
           "draw_figure", "list_cables", "load_station", "render_report", "solve_advice", "solve_antenna",
           "solve_budget", "solve_compare", "solve_feedpoint", "solve_line", "solve_pair_advice", "solve_safety"]
