"""The `linecalc` command: parse arguments, call the library, render, map errors to exit codes.

Exit status: 0 success (warnings on stderr), 2 bad input or usage, 1 an internal error.
"""
from __future__ import annotations

import argparse
import contextlib
import sys
import warnings
from linecalc import __version__
from linecalc.errors import InputError, StationError, printable

EXIT_OK, EXIT_INTERNAL, EXIT_BAD_INPUT = 0, 1, 2
DEFAULT_SWEEP_POINTS = 101  # points per band for --sweep: 2 kHz steps on 40 m in region 1



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

    safety = commands.add_parser("safety", help="voltages on lines and tuner parts at PEP, RF-exposure distances, "
                                 "with the cautions")
    safety.add_argument("station", help="station file (YAML)")
    safety.add_argument("--format", choices=("table", "json"), default="table", help="output format (default: table)")

    feedpoint = commands.add_parser("feedpoint", help="move a measured sweep from the shack (or a meter) to the "
                                    "antenna feedpoint: impedance and SWR across the sweep")
    feedpoint.add_argument("station", help="station file whose antenna is a touchstone: sweep with measured_at:")
    feedpoint.add_argument("--format", choices=("table", "json", "csv"), default="table",
                           help="output format (default: table)")
    feedpoint.add_argument("--output", metavar="FILE.s1p", help="also write the feedpoint sweep as a Touchstone file")
    feedpoint.add_argument("--force", action="store_true", help="overwrite an existing --output file")

    advise = commands.add_parser("advise", help="scan the feeder length: where can the tuner match on every band")
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
                        help="allow more than 2,000,000 length x frequency evaluations")
    advise.add_argument("--max-loss", type=float, metavar="DB",
                        help="count only lengths whose worst-case tuner loss is at most DB dB (default: no limit)")
    advise.add_argument("--top", type=int, default=8, metavar="N", help="windows to list (default: 8)")
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

    antenna = commands.add_parser("antenna", help="a wire antenna on its own: impedance, SWR, nearest resonance, "
                                  "peak gain and wire loss per band; the length to cut for resonance")
    antenna.add_argument("station", help="station file whose antenna is a wire: {...}")
    antenna.add_argument("--cut-for", metavar="FREQUENCY",
                         help="also give the length to cut for resonance at this frequency, such as 14.1MHz")
    antenna.add_argument("--format", choices=("table", "json"), default="table", help="output format (default: table)")

    cables = commands.add_parser("cables", help="list the cable library with its matched loss")
    cables.add_argument("--format", choices=("table", "json"), default="table", help="output format (default: table)")
    return parser


def _station_paths(arguments):
    """The files named, with each folder replaced by its *.yaml files in name order."""
    from pathlib import Path

    paths = []
    for argument in arguments:
        path = Path(argument)
        paths += sorted(path.glob("*.yaml")) if path.is_dir() else [path]
    return paths


def _export_radio(args, station, result):
    """--radio-s1p: the impedance the radio sees, across the sweep if there is one."""
    import numpy as np

    from linecalc import api

    if result.z_radio_ohm is None:
        raise OptionError("--radio-s1p: an antenna given by SWR alone has no phase, so no impedance at the radio")
    if result.sweeps:
        frequency = np.concatenate([s.frequency_hz for s in result.sweeps])
        z = np.concatenate([s.z_radio_ohm for s in result.sweeps])
    else:
        frequency, z = result.frequency_hz, result.z_radio_ohm
    order = np.argsort(frequency, kind="stable")
    frequency, z = frequency[order], z[order]
    keep = np.concatenate([[True], np.diff(frequency) > 0])  # a band centre may repeat a sweep point
    _write_s1p(args.radio_s1p, frequency[keep], z[keep], station.reference_impedance_ohm,
               f"impedance at the radio of {station.name}, computed by linecalc", args.force,
               api.input_files(station))


def _run_budget(args) -> int:
    """One station: its result, or its error. Several: every result that can be had, each error on
    stderr, and exit status 2 if any station failed."""
    from linecalc import api
    from linecalc.render import csv_text, json_text, tables

    paths = _station_paths(args.station)
    if not paths:
        raise OptionError(f"no station files (*.yaml) in {', '.join(args.station)}")
    if args.radio_s1p is not None and len(paths) > 1:
        raise OptionError("--radio-s1p: give exactly one station")
    if args.sweep is not None and args.sweep < 2:
        raise OptionError("--sweep: at least 2 points per band")
    if args.sweep is not None and args.format == "csv":
        raise OptionError("--sweep: the sweep is printed as a table or in JSON (--format table or json)")
    results, failed, internal = [], False, False
    for path in paths:
        try:
            station = api.load_station(path)
            try:
                results.append(api.solve_budget(station, sweep_points=args.sweep))
            except api.SweepPointsError as exc:
                raise OptionError(f"--sweep: {exc}") from None
        except StationError as exc:
            if len(paths) == 1:
                raise
            print(str(exc), file=sys.stderr)
            failed = True
        except Exception as exc:  # a fault of linecalc's on one station of a batch: named, the others go on
            if len(paths) == 1 or isinstance(exc, InputError):
                raise
            print(printable(f"{path}: internal error: {type(exc).__name__}: {exc}"), file=sys.stderr)
            internal = True
    if args.radio_s1p is not None:
        _export_radio(args, station, results[0])
    if args.format == "json":
        documents = [r.to_dict() for r in results]
        sys.stdout.write(json_text.to_json(documents[0] if len(paths) == 1 else documents))
    else:
        if args.format == "csv":
            sys.stdout.write(csv_text.budgets_csv(results) if len(paths) > 1 else csv_text.budget_csv(results[0]))
        else:
            sys.stdout.write("\n".join(tables.budget_table(r) + (tables.sweep_table(r.sweeps) if r.sweeps else "")
                                       for r in results))
    for result in results:
        for warning in result.warnings:
            prefix = f"{result.station}: " if len(paths) > 1 else ""
            print(f"warning: {prefix}{warning}", file=sys.stderr)
    if internal:
        return EXIT_INTERNAL
    return EXIT_BAD_INPUT if len(paths) > 1 and failed else EXIT_OK


class OptionError(InputError):
    """A bad command-line option value: exit status 2, naming the option."""


def _run_compare(args) -> int:
    from linecalc import api
    from linecalc.render import csv_text, json_text, tables

    station = api.load_station(args.station)
    lengths_m = tuple(_length_option("--lengths", text) for text in args.lengths or ())
    try:
        comparison = api.solve_compare(station, cables=args.cable, tuner_positions=args.tuner_positions,
                                       main_line=args.main_line, line=args.line, lengths_m=lengths_m)
    except api.UnknownCableError as exc:
        raise OptionError(f"--cable: {exc}") from None
    except api.LengthError as exc:
        raise OptionError(f"--lengths: {exc}") from None
    render = {"table": tables.compare_table, "json": lambda c: json_text.to_json(c.to_dict()),
              "csv": csv_text.compare_csv}[args.format]
    sys.stdout.write(render(comparison))
    for warning in comparison.warnings:
        print(f"warning: {warning}", file=sys.stderr)
    return EXIT_OK


def _run_safety(args) -> int:
    from linecalc import api
    from linecalc.render import json_text, tables

    result = api.solve_safety(api.load_station(args.station))
    if args.format == "json":
        sys.stdout.write(json_text.to_json(result.to_dict()))
    else:
        sys.stdout.write(tables.safety_table(result))
    for warning in result.warnings:
        print(f"warning: {warning}", file=sys.stderr)
    return EXIT_OK


def _write_s1p(path, frequency_hz, z_ohm, z_ref_ohm, comment, force, inputs):
    """Write a Touchstone one-port atomically; never over an input, over an output only with --force."""
    from linecalc.io.touchstone import TouchstoneWriteError, write_one_port

    try:
        write_one_port(path, frequency_hz, z_ohm, z_ref_ohm, comment, force=force, protected=inputs)
    except TouchstoneWriteError as exc:
        raise OptionError(str(exc)) from None


def _run_feedpoint(args) -> int:
    from linecalc import api
    from linecalc.render import csv_text, json_text, tables

    station = api.load_station(args.station)
    result = api.solve_feedpoint(station)
    render = {"table": tables.feedpoint_table, "json": lambda r: json_text.to_json(r.to_dict()),
              "csv": csv_text.feedpoint_csv}[args.format]
    if args.output is not None:  # written before anything is printed: a refused write prints nothing
        _write_s1p(args.output, result.frequency_hz, result.sweep.z_antenna_ohm, station.reference_impedance_ohm,
                   f"feedpoint of {station.name}, recovered by linecalc from {result.source}", args.force,
                   api.input_files(station))
    sys.stdout.write(render(result))
    if result.sweep.active.any():
        print(f"warning: the recovered feedpoint is active (|rho| > 1) at {int(result.sweep.active.sum())} points: "
              "the described path does not match the measurement there", file=sys.stderr)
    return EXIT_OK


class _Progress:
    """Progress of a long scan on stderr: a bar on a terminal, a few plain lines otherwise, and
    nothing at all for a run shorter than about a second."""

    DELAY_S = 1.0

    def __init__(self, label):
        import time

        self.label, self.start, self.clock, self.shown = label, time.monotonic(), time.monotonic, -1

    def __call__(self, done, total):
        if self.clock() - self.start < self.DELAY_S:
            return
        percent = int(100 * done / total)
        if sys.stderr.isatty():
            bar = "#" * (percent // 4)
            print(f"\r{self.label} [{bar:<25}] {percent:3d} %", end="" if done < total else "\n",
                  file=sys.stderr, flush=True)
        elif percent // 25 > self.shown // 25:
            print(f"{self.label}: {percent} %", file=sys.stderr, flush=True)
        self.shown = percent


def _length_option(name, text):
    """A length given on the command line [m], held to the limits of a length in a station file."""
    from linecalc.io.units import UnitError, parse_quantity
    from linecalc.io.yaml_schema import MAGNITUDE_LIMITS, SMALLEST

    try:
        value = parse_quantity(text, "m")
    except UnitError as exc:
        raise OptionError(f"{name}: {exc}") from None
    if not SMALLEST["m"] <= value <= MAGNITUDE_LIMITS["m"]:
        raise OptionError(f"{name}: a length from {SMALLEST['m']:g} m to {MAGNITUDE_LIMITS['m']:g} m "
                          f"(1,000 km), as in a station file, got {text!r}")
    return value


def _run_advise(args) -> int:
    from linecalc import api
    from linecalc.physics.length_scan import AdvisorInputError, LengthRangeError, ScanTooLarge, StepError
    from linecalc.render import json_text, tables

    if args.max_loss is not None and not 0 <= args.max_loss < float("inf"):
        raise OptionError(f"--max-loss: a finite loss of 0 dB or more, got {args.max_loss}")
    if args.top < 1:
        raise OptionError(f"--top: at least 1 window, got {args.top}")
    low, high = _length_option("--from", args.length_from), _length_option("--to", args.length_to)
    step = _length_option("--step", args.step)
    station = api.load_station(args.station)
    try:
        result = api.solve_advice(station, line=args.line, length_from_m=low, length_to_m=high, step_m=step,
                                  points_per_band=args.points, allow_large_scan=args.allow_large_scan,
                                  progress=_Progress("scanning"), max_loss_db=args.max_loss)
    except LengthRangeError as exc:
        raise OptionError(f"--from/--to: {exc}") from None
    except StepError as exc:
        raise OptionError(f"--step: {exc}") from None
    except ScanTooLarge as exc:
        raise OptionError(f"--step: {exc} (--allow-large-scan)") from None
    except AdvisorInputError as exc:
        raise OptionError(f"--points: {exc}") from None
    if args.format == "json":
        sys.stdout.write(json_text.to_json(result.to_dict(args.top)))
    else:
        sys.stdout.write(tables.advice_table(result, args.top))
    return EXIT_OK


def _run_plot(args) -> int:
    from linecalc import api
    from linecalc.studies.figure_data import PlotProblem

    if args.sweep is not None and args.sweep < 2:
        raise OptionError(f"--sweep: at least 2 points per band, got {args.sweep}")
    lengths_m = tuple(_length_option("--lengths", text) for text in args.lengths or ())
    station = api.load_station(args.station)
    try:
        api.draw_figure(args.kind, station, args.output, sweep_points=args.sweep or DEFAULT_SWEEP_POINTS,
                        line=args.line, force=args.force, cables=args.cable, tuner_positions=args.tuner_positions,
                        main_line=args.main_line, lengths_m=lengths_m, sweep_smith=args.sweep is not None)
    except PlotProblem as exc:
        raise OptionError(str(exc)) from None
    except api.SweepPointsError as exc:
        raise OptionError(f"--sweep: {exc}") from None
    except api.UnknownCableError as exc:
        raise OptionError(f"--cable: {exc}") from None
    except api.LengthError as exc:
        raise OptionError(f"--lengths: {exc}") from None
    print(f"wrote {args.output}", file=sys.stderr)
    return EXIT_OK


def _run_antenna(args) -> int:
    from linecalc import api
    from linecalc.io.units import UnitError, parse_quantity
    from linecalc.render import json_text, tables

    cut_for_hz = None
    if args.cut_for is not None:
        try:
            cut_for_hz = parse_quantity(args.cut_for, "Hz")
        except UnitError as exc:
            raise OptionError(f"--cut-for: {exc}") from None
        if not 1e5 <= cut_for_hz <= 3e9:
            raise OptionError(f"--cut-for: a frequency from 100 kHz to 3 GHz, got {args.cut_for!r}")
    result = api.solve_antenna(api.load_station(args.station), cut_for_hz=cut_for_hz)
    if args.format == "json":
        sys.stdout.write(json_text.to_json(result.to_dict()))
    else:
        sys.stdout.write(tables.antenna_table(result))
    return EXIT_OK


def _run_cables(args) -> int:
    from linecalc import api
    from linecalc.render import json_text, tables

    listing = api.list_cables()
    if args.format == "json":
        sys.stdout.write(json_text.to_json(listing.to_dict()))
    else:
        sys.stdout.write(tables.cables_table(listing))
    return EXIT_OK


EXIT_INTERRUPTED = 130  # 128 + SIGINT, as a shell reports Ctrl-C


class _Terminated(BaseException):
    """SIGTERM or SIGHUP, raised where the program is, so that every ``finally`` runs (a temporary
    output file is removed) before the command exits with 128 + the signal's number."""

    def __init__(self, signum):
        self.signum = signum
        super().__init__(signum)


def _terminate(signum, frame):
    raise _Terminated(signum)


@contextlib.contextmanager
def _signals_raise():
    """SIGTERM and SIGHUP raise `_Terminated` inside the block (main thread only; restored after)."""
    import signal
    import threading

    names = [name for name in ("SIGTERM", "SIGHUP") if hasattr(signal, name)]
    if threading.current_thread() is not threading.main_thread():
        yield
        return
    previous = {name: signal.signal(getattr(signal, name), _terminate) for name in names}
    try:
        yield
    finally:
        for name, handler in previous.items():
            signal.signal(getattr(signal, name), handler)


def _degrade_unencodable():
    """Print what the terminal's encoding cannot show as escapes (PYTHONIOENCODING=ascii: ``\\xb0``)
    rather than stop with an encoding error."""
    for stream in (sys.stdout, sys.stderr):
        if hasattr(stream, "reconfigure") and (getattr(stream, "encoding", None) or "").lower().replace("-", "") \
                not in ("utf8", "utf8sig"):
            stream.reconfigure(errors="backslashreplace")


def main(argv=None) -> int:
    _degrade_unencodable()
    args = build_parser().parse_args(argv)
    try:
        with _signals_raise():
            return _main(args)
    except KeyboardInterrupt:
        print("linecalc: interrupted", file=sys.stderr)
        return EXIT_INTERRUPTED
    except _Terminated as exc:
        import signal

        print(f"linecalc: stopped by {signal.Signals(exc.signum).name}", file=sys.stderr)
        return 128 + exc.signum


def _main(args) -> int:
    try:
        with warnings.catch_warnings():
            # a numerical warning (overflow, 0/0) means a number that cannot be trusted: stop
            # with an internal error rather than print it
            warnings.simplefilter("error", RuntimeWarning)
            return {"budget": _run_budget, "safety": _run_safety, "feedpoint": _run_feedpoint,
                    "compare": _run_compare, "advise": _run_advise, "plot": _run_plot,
                    "antenna": _run_antenna, "cables": _run_cables}[args.command](args)
    except StationError as exc:
        print(str(exc), file=sys.stderr)
        return EXIT_BAD_INPUT
    except InputError as exc:  # an option's value, or input that reached no station file
        print(f"linecalc {args.command}: {exc}", file=sys.stderr)
        return EXIT_BAD_INPUT
    except BrokenPipeError:
        return EXIT_OK
    except Exception as exc:  # the promise of exit status 1: an internal error, reported in one line
        print(f"linecalc: internal error: {type(exc).__name__}: {exc}", file=sys.stderr)
        return EXIT_INTERNAL


if __name__ == "__main__":
    sys.exit(main())
