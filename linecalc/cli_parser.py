"""The `linecalc` command's options: every subcommand, its arguments and their help (argparse).
The command itself (linecalc/cli.py) parses with `build_parser`, calls the API and renders."""
from __future__ import annotations

import argparse

from linecalc import __version__

EXIT_OK, EXIT_INTERNAL, EXIT_BAD_INPUT = 0, 1, 2
DEFAULT_SWEEP_POINTS = 101  # points per band for --sweep: 2 kHz steps on 40 m in region 1
EXPLAIN_HELP = "also say in words, row by row, what the figures mean (after the table, or in JSON)"


class _Parser(argparse.ArgumentParser):
    """argparse that exits with status 2 and one line on a usage error (its default, made explicit)."""

    def error(self, message):
        self.exit(EXIT_BAD_INPUT, f"{self.prog}: {message}\n")


def build_parser() -> argparse.ArgumentParser:
    parser = _Parser(prog="linecalc", description="Feedline and station loss budgets, band by band.")
    parser.add_argument("--version", action="version", version=f"linecalc {__version__}")
    commands = parser.add_subparsers(dest="command", required=True, parser_class=_Parser)

    budget = commands.add_parser("budget", help="SWR at both ends, losses and watts at the antenna, per band")
    budget.add_argument("station", nargs="+",
                        help="station files (YAML) or folders of them (*.yaml); one result set each")
    budget.add_argument("--format", choices=("table", "json", "csv"), default="table",
                        help="output format (default: table)")
    budget.add_argument("--sweep", type=int, nargs="?", const=DEFAULT_SWEEP_POINTS, metavar="N",
                        help=f"also sweep each band edge to edge at N points (default {DEFAULT_SWEEP_POINTS})")
    budget.add_argument("--radio-s1p", metavar="FILE.s1p",
                        help="write the impedance the radio sees (across the sweep with --sweep) as a Touchstone file")
    budget.add_argument("--force", action="store_true", help="overwrite an existing --radio-s1p file")
    budget.add_argument("--explain", action="store_true", help=EXPLAIN_HELP)
    _add_uncertainty_options(budget)

    safety = commands.add_parser("safety", help="voltages on lines and tuner parts at PEP, RF-exposure distances, "
                                 "with the cautions")
    safety.add_argument("station", help="station file (YAML)")
    safety.add_argument("--format", choices=("table", "json"), default="table", help="output format (default: table)")
    safety.add_argument("--explain", action="store_true", help=EXPLAIN_HELP)

    feedpoint = commands.add_parser("feedpoint", help="move a measured sweep from the shack (or a meter) to the "
                                    "antenna feedpoint: impedance and SWR across the sweep")
    feedpoint.add_argument("station", help="station file whose antenna is a touchstone: sweep with measured_at:")
    feedpoint.add_argument("--format", choices=("table", "json", "csv"), default="table",
                           help="output format (default: table)")
    feedpoint.add_argument("--output", metavar="FILE.s1p", help="also write the feedpoint sweep as a Touchstone file")
    feedpoint.add_argument("--force", action="store_true", help="overwrite an existing --output file")
    _add_uncertainty_options(feedpoint)

    advise = commands.add_parser("advise", help="scan the feeder length: where can the tuner match on every band, "
                                   "ranked by the watts at the antenna")
    advise.add_argument("station", help="station file with a tuner on the radio side of its feeder")
    advise.add_argument("--line", metavar="LABEL", help="the feeder to cut (default: the longest line)")
    advise.add_argument("--from", dest="length_from", default="5 m", metavar="LENGTH",
                        help="shortest length to try (default: 5 m)")
    advise.add_argument("--to", dest="length_to", default="60 m", metavar="LENGTH",
                        help="longest length to try (default: 60 m)")
    advise.add_argument("--step", default="1 cm", metavar="LENGTH", help="length step (default: 1 cm)")
    advise.add_argument("--points", type=int, default=3, metavar="N",
                        help="points per band, edges included (default: 3, the edges and the centre)")
    advise.add_argument("--allow-large-scan", action="store_true",
                        help="allow more than 2,000,000 length x frequency evaluations per feeder scan, "
                             "and more than 200 antenna lengths")
    advise.add_argument("--max-loss", type=float, metavar="DB",
                        help="count only lengths whose worst-case tuner loss is at most DB dB (default: no limit)")
    advise.add_argument("--top", type=int, default=8, metavar="N", help="windows to list (default: 8)")
    advise.add_argument("--antenna-from", metavar="LENGTH",
                        help="with --antenna-to: also scan a wire antenna's length from LENGTH (tip to tip, or "
                             "legs as 2x10m; a vertical's height)")
    advise.add_argument("--antenna-to", metavar="LENGTH", help="the last antenna length of that scan")
    advise.add_argument("--antenna-step", default="1 m", metavar="LENGTH",
                        help="antenna length step (default: 1 m)")
    advise.add_argument("--jobs", type=int, default=1, metavar="N",
                        help="worker processes that solve the antenna lengths (default: 1, this process)")
    advise.add_argument("--rank", choices=("sum", "worst"), default="sum",
                        help="rank lengths by the watts at the antenna summed over the rows (sum, the default) "
                             "or in the worst row (worst)")
    advise.add_argument("--format", choices=("table", "json"), default="table", help="output format (default: table)")

    plot = commands.add_parser("plot", help="draw a station: SWR across each band, loss budget, Smith chart, "
                               "voltage along the feedline, or a comparison")
    plot.add_argument("station", help="station file (YAML)")
    plot.add_argument("kind", choices=("swr", "budget", "smith", "voltage", "compare"), help="what to draw")
    plot.add_argument("output", metavar="FILE", help="the image to write, .png or .svg")
    plot.add_argument("--sweep", type=int, metavar="N",
                      help=f"points per band for swr (default {DEFAULT_SWEEP_POINTS}); smith draws each band "
                      "swept at N points only when given")
    plot.add_argument("--line", metavar="LABEL", help="the line for voltage (default: the longest); for compare, "
                      "the line whose length --lengths varies")
    plot.add_argument("--cable", action="append", default=[], metavar="ID",
                      help="compare: a library cable for the main line (repeat for more)")
    plot.add_argument("--tuner-positions", action="store_true",
                      help="compare: the tuner at the radio end and at the antenna end of the main line")
    plot.add_argument("--main-line", metavar="LABEL", help="compare: the line to replace or move around "
                      "(default: the longest)")
    plot.add_argument("--lengths", nargs="+", metavar="LENGTH", help="compare: lengths to try for the main line "
                      "(or --line), each with its unit")
    plot.add_argument("--force", action="store_true", help="overwrite an existing image")

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
    compare.add_argument("--explain", action="store_true", help=EXPLAIN_HELP)
    _add_uncertainty_options(compare)

    antenna = commands.add_parser("antenna", help="a wire antenna on its own: impedance, SWR, nearest resonance, "
                                  "peak gain and wire loss per band; the length to cut for resonance")
    antenna.add_argument("station", help="station file whose antenna is a wire: {...}")
    antenna.add_argument("--cut-for", metavar="FREQUENCY",
                         help="also give the length to cut for resonance at this frequency, such as 14.1MHz")
    antenna.add_argument("--format", choices=("table", "json"), default="table", help="output format (default: table)")

    report = commands.add_parser("report", help="one self-contained HTML page of a station: budget, figures, "
                                 "safety, warnings and the station file, to read offline, print or share")
    report.add_argument("station", help="station file (YAML)")
    report.add_argument("--output", required=True, metavar="FILE.html", help="the page to write")
    report.add_argument("--force", action="store_true", help="overwrite an existing --output file")

    line = commands.add_parser("line", help="characterise a line from open and short sweeps of its near end: "
                               "impedance, electrical length, velocity factor or length, loss, with intervals")
    line.add_argument("station", help="station file whose line has sweeps: {open: FILE.s1p, short: FILE.s1p}")
    line.add_argument("--line", metavar="LABEL", help="the line to characterise (default: the only line with sweeps)")
    line.add_argument("--format", choices=("table", "json"), default="table", help="output format (default: table)")
    line.add_argument("--write-cable", metavar="FILE.yaml",
                      help="also write the fitted line as a feed entry with an inline cable (station format)")
    line.add_argument("--force", action="store_true", help="overwrite an existing --write-cable file")

    cables = commands.add_parser("cables", help="list the cable library with its matched loss")
    cables.add_argument("--format", choices=("table", "json"), default="table", help="output format (default: table)")
    return parser


def _add_uncertainty_options(parser):
    """--uncertainty and its tolerances (defaults in linecalc.physics.tolerance, documented in the README)."""
    from linecalc.physics import tolerance as t

    group = parser.add_argument_group("uncertainty (a seeded Monte Carlo over every tolerance at once)")
    group.add_argument("--uncertainty", action="store_true",
                       help="show each figure with its spread over drawn stations (the central 95 %% of the draws)")
    group.add_argument("--draws", type=int, default=t.DRAWS, metavar="N", help=f"stations drawn (default {t.DRAWS})")
    group.add_argument("--seed", type=int, default=t.SEED, metavar="N", help=f"seed of the draws (default {t.SEED})")
    low, high = t.CABLE_LOSS_PERCENT
    group.add_argument("--tol-cable-loss", default=f"{low:g}:{high:g}", metavar="LOW:HIGH",
                       help=f"cable loss above its figures, in %% (default {low:g}:{high:g})")
    group.add_argument("--tol-velocity-factor", type=float, default=t.VELOCITY_FACTOR_TOLERANCE, metavar="X",
                       help=f"+- on each velocity factor (default {t.VELOCITY_FACTOR_TOLERANCE:g})")
    group.add_argument("--tol-length", type=float, default=t.LENGTH_PERCENT, metavar="PERCENT",
                       help=f"+- on each line's length, in %% (default {t.LENGTH_PERCENT:g})")
    group.add_argument("--tol-rho", type=float, default=t.RHO_ERROR, metavar="X",
                       help=f"the instrument's reflection error, |delta rho| (default {t.RHO_ERROR:g})")
    group.add_argument("--tol-antenna", type=float, default=t.ANTENNA_PERCENT, metavar="PERCENT",
                       help=f"+- on R and X of an antenna table or model, in %% (default {t.ANTENNA_PERCENT:g})")
    group.add_argument("--tol-parts", type=float, default=t.PART_LOSS_PERCENT, metavar="PERCENT",
                       help=f"+- on each connector, choke and balun loss, in %% (default {t.PART_LOSS_PERCENT:g})")
