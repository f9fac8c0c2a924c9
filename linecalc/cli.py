"""The `linecalc` command: parse arguments, call the library, render, map errors to exit codes.

Exit status: 0 success (warnings on stderr), 2 bad input or usage, 1 an internal error.
"""
from __future__ import annotations

import argparse
import sys

EXIT_OK, EXIT_INTERNAL, EXIT_BAD_INPUT = 0, 1, 2

# Frequencies of the `cables` listing [Hz]: 80 m, 20 m, 10 m, 2 m and 70 cm.
LISTING_FREQUENCIES_HZ = (3.6e6, 14.2e6, 28.5e6, 146e6, 435e6)


class _Parser(argparse.ArgumentParser):
    """argparse that exits with status 2 and one line on a usage error (its default, made explicit)."""

    def error(self, message):
        self.exit(EXIT_BAD_INPUT, f"{self.prog}: {message}\n")


def build_parser() -> argparse.ArgumentParser:
    parser = _Parser(prog="linecalc", description="Feedline and station loss budgets, band by band.")
    commands = parser.add_subparsers(dest="command", required=True, parser_class=_Parser)

    budget = commands.add_parser("budget", help="SWR at both ends, losses and watts at the antenna, per band")
    budget.add_argument("station", help="station file (YAML)")
    budget.add_argument("--format", choices=("table", "json", "csv"), default="table",
                        help="output format (default: table)")

    compare = commands.add_parser("compare", help="rank alternatives band by band: other feedlines, tuner "
                                  "positions, other lengths of a line")
    compare.add_argument("station", help="station file (YAML); its compare: key may list the alternatives")
    compare.add_argument("--cable", action="append", default=[], metavar="ID",
                         help="a library cable for the main line (repeat for more)")
    compare.add_argument("--tuner-positions", action="store_true",
                         help="compare the tuner at the radio end and at the antenna end of the main line")
    compare.add_argument("--main-line", metavar="LABEL", help="the line to replace or move around (default: the longest)")
    compare.add_argument("--lengths", nargs="+", metavar="LENGTH",
                         help="lengths to try for the main line (or --line), each with its unit: 1m 2.5m 10ft")
    compare.add_argument("--line", metavar="LABEL", help="the line whose length --lengths varies")
    compare.add_argument("--format", choices=("table", "json", "csv"), default="table",
                         help="output format (default: table)")

    cables = commands.add_parser("cables", help="list the cable library with its matched loss")
    cables.add_argument("--format", choices=("table", "json"), default="table", help="output format (default: table)")
    return parser


def _solve(station):
    """Solve a loaded station; a station that cannot be solved as described is bad input."""
    from .budget import BudgetError, solve_budget
    from .station import StationError

    try:
        return solve_budget(station)
    except BudgetError as exc:
        raise StationError(station.source_file, station.key_lines.get(exc.key, 1), str(exc), exc.key) from None


def _run_budget(args) -> int:
    from . import report
    from .station import load_station

    result = _solve(load_station(args.station))
    render = {"table": report.budget_table, "json": report.budget_json, "csv": report.budget_csv}[args.format]
    sys.stdout.write(render(result))
    for warning in result.warnings:
        print(f"warning: {warning}", file=sys.stderr)
    return EXIT_OK


class OptionError(ValueError):
    """A bad command-line option value: exit status 2, naming the option."""


def _compare_spec(args, spec):
    """The station file's compare: key, extended by the command-line options."""
    from .compare import CompareSpec
    from .units import UnitError, parse_quantity

    cables = tuple(spec.cables) if spec else ()
    if args.cable:
        from . import library

        known = library.load_library()
        for cable_id in args.cable:
            if cable_id not in known:
                near = library.nearest_ids(cable_id)
                hint = f"; did you mean {', '.join(near)}?" if near else ""
                raise OptionError(f"--cable: unknown cable id {cable_id!r}{hint}")
            cables += ((cable_id, known[cable_id]),)
    lengths = tuple(spec.lengths_m) if spec else ()
    if args.lengths:
        try:
            lengths = tuple(parse_quantity(text, "m") for text in args.lengths)
        except UnitError as exc:
            raise OptionError(f"--lengths: {exc}") from None
        if any(length <= 0 for length in lengths):
            raise OptionError("--lengths: every length must be greater than zero")
    return CompareSpec(main_line=args.main_line or (spec.main_line if spec else None), cables=cables,
                       tuner_positions=args.tuner_positions or bool(spec and spec.tuner_positions),
                       line=args.line or (spec.line if spec else None), lengths_m=lengths)


def _run_compare(args) -> int:
    from . import report
    from .budget import BudgetError
    from .compare import CompareError, alternatives_from_spec, compare
    from .station import StationError, load_station_and_compare

    station, spec = load_station_and_compare(args.station)
    spec = _compare_spec(args, spec)
    line = station.key_lines.get("compare") if spec else None
    try:
        comparison = compare(station, alternatives_from_spec(station, spec))
    except CompareError as exc:
        raise StationError(station.source_file, line or station.key_lines.get("feed", 1), str(exc), "compare") from None
    except BudgetError as exc:
        raise StationError(station.source_file, station.key_lines.get(exc.key, 1), str(exc), exc.key) from None
    render = {"table": report.compare_table, "json": report.compare_json, "csv": report.compare_csv}[args.format]
    sys.stdout.write(render(comparison))
    for warning in comparison.warnings:
        print(f"warning: {warning}", file=sys.stderr)
    return EXIT_OK


def _run_cables(args) -> int:
    import json

    import numpy as np

    from . import library, report

    cables = library.load_library()
    frequency_hz = np.array(LISTING_FREQUENCIES_HZ)
    rows = [(c.id, c.kind, c.z0_nominal_ohm, c.velocity_factor, c.description, c.matched_loss_db_per_m(frequency_hz),
             (frequency_hz < c.data_range_hz[0]) | (frequency_hz > c.data_range_hz[1]))
            for c in cables.values()]
    if args.format == "json":
        doc = [{"id": r[0], "kind": r[1], "z0_ohm": r[2], "velocity_factor": r[3], "description": r[4],
                "loss_db_per_100m": {f"{f:g}": 100 * float(l) for f, l in zip(frequency_hz, r[5])}} for r in rows]
        sys.stdout.write(json.dumps(doc, indent=2) + "\n")
    else:
        sys.stdout.write(report.cables_table(rows, frequency_hz))
    return EXIT_OK


def main(argv=None) -> int:
    args = build_parser().parse_args(argv)
    from .station import StationError

    try:
        return {"budget": _run_budget, "compare": _run_compare, "cables": _run_cables}[args.command](args)
    except StationError as exc:
        print(str(exc), file=sys.stderr)
        return EXIT_BAD_INPUT
    except OptionError as exc:
        print(f"linecalc {args.command}: {exc}", file=sys.stderr)
        return EXIT_BAD_INPUT
    except BrokenPipeError:
        return EXIT_OK
    except Exception as exc:  # the promise of exit status 1: an internal error, reported in one line
        print(f"linecalc: internal error: {type(exc).__name__}: {exc}", file=sys.stderr)
        return EXIT_INTERNAL


if __name__ == "__main__":
    sys.exit(main())
