"""The `linecalc` command: parse arguments, call the library, render, map errors to exit codes.

Exit status: 0 success (warnings on stderr), 2 bad input or usage, 1 an internal error.
"""
from __future__ import annotations

import contextlib
import sys
import warnings

from linecalc.cli_parser import DEFAULT_SWEEP_POINTS, EXIT_BAD_INPUT, EXIT_INTERNAL, EXIT_OK, build_parser
from linecalc.errors import InputError, StationError, printable


def _explain_checked(args):
    """--explain, refused with --format csv (a CSV has no place for paragraphs)."""
    if args.explain and args.format == "csv":
        raise OptionError("--explain: the explanations are printed with the table or in JSON "
                          "(--format table or json)")
    return args.explain


def _explanations(result) -> str:
    """A result's explanations as text, wrapped to the terminal (78 columns when not a terminal)."""
    import shutil

    from linecalc.render import explanations

    width = shutil.get_terminal_size().columns if sys.stdout.isatty() else explanations.DEFAULT_WIDTH
    return explanations.explanations_text(result.explanations, width) if result.explanations is not None else ""


def _tolerances(args):
    """The `Tolerances` of the uncertainty options, or None without --uncertainty."""
    import math

    from linecalc.physics.tolerance import Tolerances

    if not args.uncertainty:
        return None
    try:
        low, high = (float(x) for x in args.tol_cable_loss.split(":"))
    except ValueError:
        raise OptionError(f"--tol-cable-loss: two percentages LOW:HIGH such as 0:30, got {args.tol_cable_loss!r}") \
            from None
    if not (math.isfinite(low) and math.isfinite(high) and -100 < low <= high):
        raise OptionError(f"--tol-cable-loss: LOW:HIGH with LOW above -100 and not above HIGH, got {args.tol_cable_loss!r}")
    checks = (("--tol-velocity-factor", args.tol_velocity_factor, 0.5), ("--tol-length", args.tol_length, 99.0),
              ("--tol-rho", args.tol_rho, 1.0), ("--tol-antenna", args.tol_antenna, 99.0),
              ("--tol-parts", args.tol_parts, 100.0))
    for name, value, most in checks:
        if not 0 <= value <= most:
            raise OptionError(f"{name}: from 0 to {most:g}, got {value:g}")
    if not 2 <= args.draws <= 1_000_000:
        raise OptionError(f"--draws: from 2 to 1,000,000, got {args.draws}")
    if args.seed < 0:
        raise OptionError(f"--seed: 0 or more, got {args.seed}")
    return Tolerances((low, high), args.tol_velocity_factor, args.tol_length, args.tol_rho, args.tol_antenna,
                      args.tol_parts, args.draws, args.seed)


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
    from pathlib import Path

    from linecalc import api
    from linecalc.render import csv_text, json_text, tables

    paths = _station_paths(args.station)
    if not paths:
        raise OptionError(f"no station files (*.yaml) in {', '.join(args.station)}")
    # a batch (an array in JSON, a station column in CSV, errors reported and passed over) is any
    # folder, or more than one file, whatever number of stations it holds: the form of the output
    # follows the command line, not the folder's contents
    batch = len(args.station) > 1 or any(Path(a).is_dir() for a in args.station)
    if args.radio_s1p is not None and len(paths) > 1:
        raise OptionError("--radio-s1p: give exactly one station")
    if args.sweep is not None and args.sweep < 2:
        raise OptionError("--sweep: at least 2 points per band")
    if args.sweep is not None and args.format == "csv":
        raise OptionError("--sweep: the sweep is printed as a table or in JSON (--format table or json)")
    explain = _explain_checked(args)
    tolerances = _tolerances(args)
    if tolerances is not None and args.format == "csv":
        raise OptionError("--uncertainty: the spread is printed as a table or in JSON (--format table or json)")
    results, failed, internal = [], False, False
    for path in paths:
        try:
            station = api.load_station(path)
            try:
                results.append(api.solve_budget(station, sweep_points=args.sweep, explain=explain,
                                                uncertainty=tolerances))
            except api.SweepPointsError as exc:
                raise OptionError(f"--sweep: {exc}") from None
            except api.UncertaintyError as exc:
                raise OptionError(f"--draws: {exc}") from None
        except StationError as exc:
            if not batch:
                raise
            print(str(exc), file=sys.stderr)
            failed = True
        except Exception as exc:  # a fault of linecalc's on one station of a batch: named, the others go on
            if not batch or isinstance(exc, InputError) or _Interrupt.received:
                raise
            print(printable(f"{path}: internal error: {type(exc).__name__}: {exc}"), file=sys.stderr)
            internal = True
    if args.radio_s1p is not None and results:  # a folder of one station that failed: nothing to export
        _export_radio(args, station, results[0])
    if args.format == "json":
        documents = [r.to_dict() for r in results]
        sys.stdout.write(json_text.to_json(documents if batch else documents[0]))
    else:
        if args.format == "csv":
            sys.stdout.write(csv_text.budgets_csv(results) if batch else csv_text.budget_csv(results[0]))
        else:
            from linecalc.render import uncertainty_text

            sys.stdout.write("\n".join(tables.budget_table(r) + (tables.sweep_table(r.sweeps) if r.sweeps else "")
                                       + (uncertainty_text.spread_table(r.uncertainty) if r.uncertainty else "")
                                       + _explanations(r) for r in results))
    for result in results:
        for warning in result.warnings:
            prefix = f"{result.station}: " if batch else ""
            print(f"warning: {prefix}{warning}", file=sys.stderr)
    if internal:
        return EXIT_INTERNAL
    return EXIT_BAD_INPUT if batch and failed else EXIT_OK


class OptionError(InputError):
    """A bad command-line option value: exit status 2, naming the option."""


def _spread(comparison) -> str:
    """The comparison's spread under --uncertainty as a table; empty without it."""
    if comparison.uncertainty is None:
        return ""
    from linecalc.render import uncertainty_text

    return uncertainty_text.compare_spread_table(comparison.uncertainty)


def _run_compare(args) -> int:
    from linecalc import api
    from linecalc.render import csv_text, json_text, tables

    station = api.load_station(args.station)
    lengths_m = tuple(_length_option("--lengths", text) for text in args.lengths or ())
    explain = _explain_checked(args)
    tolerances = _tolerances(args)
    if tolerances is not None and args.format == "csv":
        raise OptionError("--uncertainty: the spread is printed as a table or in JSON (--format table or json)")
    try:
        comparison = api.solve_compare(station, cables=args.cable, tuner_positions=args.tuner_positions,
                                       main_line=args.main_line, line=args.line, lengths_m=lengths_m,
                                       explain=explain, uncertainty=tolerances)
    except api.UnknownCableError as exc:
        raise OptionError(f"--cable: {exc}") from None
    except api.LengthError as exc:
        raise OptionError(f"--lengths: {exc}") from None
    except api.UncertaintyError as exc:
        raise OptionError(f"--draws: {exc}") from None
    render = {"table": lambda c: tables.compare_table(c) + _spread(c) + _explanations(c),
              "json": lambda c: json_text.to_json(c.to_dict()),
              "csv": csv_text.compare_csv}[args.format]
    sys.stdout.write(render(comparison))
    for warning in comparison.warnings:
        print(f"warning: {warning}", file=sys.stderr)
    return EXIT_OK


def _run_safety(args) -> int:
    from linecalc import api
    from linecalc.render import json_text, tables

    result = api.solve_safety(api.load_station(args.station), explain=args.explain)
    if args.format == "json":
        sys.stdout.write(json_text.to_json(result.to_dict()))
    else:
        sys.stdout.write(tables.safety_table(result) + _explanations(result))
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


def _input_warnings(station):
    """The warnings of reading a station's inputs, on stderr, for a command whose document has no
    `warnings` (the budget, safety and compare results carry them)."""
    for warning in station.input_warnings:
        print(f"warning: {warning}", file=sys.stderr)


def _run_feedpoint(args) -> int:
    from linecalc import api
    from linecalc.render import csv_text, json_text, tables

    tolerances = _tolerances(args)
    if tolerances is not None and args.format == "csv":
        raise OptionError("--uncertainty: the spread is printed as a table or in JSON (--format table or json)")
    station = api.load_station(args.station)
    try:
        result = api.solve_feedpoint(station, uncertainty=tolerances)
    except api.UncertaintyError as exc:
        raise OptionError(f"--draws: {exc}") from None
    render = {"table": tables.feedpoint_table, "json": lambda r: json_text.to_json(r.to_dict()),
              "csv": csv_text.feedpoint_csv}[args.format]
    if result.uncertainty is not None and args.format == "table":
        from linecalc.render import uncertainty_text

        plain = render
        render = lambda r: plain(r) + uncertainty_text.feedpoint_spread_table(r)  # noqa: E731
    if args.output is not None:  # written before anything is printed: a refused write prints nothing
        _write_s1p(args.output, result.frequency_hz, result.sweep.z_antenna_ohm, station.reference_impedance_ohm,
                   f"feedpoint of {station.name}, recovered by linecalc from {result.source}", args.force,
                   api.input_files(station))
    sys.stdout.write(render(result))
    _input_warnings(station)
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
    from linecalc.studies.pair_advice import AntennaRangeError, AntennaStepError
    from linecalc.render import json_text, tables

    if args.max_loss is not None and not 0 <= args.max_loss < float("inf"):
        raise OptionError(f"--max-loss: a finite loss of 0 dB or more, got {args.max_loss}")
    if args.top < 1:
        raise OptionError(f"--top: at least 1 window, got {args.top}")
    low, high = _length_option("--from", args.length_from), _length_option("--to", args.length_to)
    step = _length_option("--step", args.step)
    if (args.antenna_from is None) != (args.antenna_to is None):
        raise OptionError("--antenna-from/--antenna-to: give both, the first and the last antenna length")
    pairs = args.antenna_from is not None
    if args.jobs < 1:
        raise OptionError(f"--jobs: at least 1 process, got {args.jobs}")
    if pairs:
        antenna = [_antenna_length_option(name, text) for name, text in
                   (("--antenna-from", args.antenna_from), ("--antenna-to", args.antenna_to),
                    ("--antenna-step", args.antenna_step))]
    station = api.load_station(args.station)
    options = {"line": args.line, "length_from_m": low, "length_to_m": high, "step_m": step,
               "points_per_band": args.points, "allow_large_scan": args.allow_large_scan,
               "max_loss_db": args.max_loss, "rank": args.rank}
    try:
        if pairs:
            result = api.solve_pair_advice(station, antenna_from_m=antenna[0], antenna_to_m=antenna[1],
                                           antenna_step_m=antenna[2], antenna_progress=_antenna_progress,
                                           jobs=args.jobs, **options)
        else:
            result = api.solve_advice(station, progress=_Progress("scanning"), **options)
    except AntennaStepError as exc:
        raise OptionError(f"--antenna-step: {exc}") from None
    except AntennaRangeError as exc:
        raise OptionError(f"--antenna-from/--antenna-to: {exc}") from None
    except StepError as exc:
        raise OptionError(f"--step: {exc}") from None
    except LengthRangeError as exc:
        raise OptionError(f"--from/--to: {exc}") from None
    except ScanTooLarge as exc:
        raise OptionError(f"--step: {exc} (--allow-large-scan)") from None
    except AdvisorInputError as exc:
        raise OptionError(f"--points: {exc}") from None
    for warning in result.to_dict(args.top)["warnings"]:
        print(f"warning: {warning}", file=sys.stderr)
    if args.format == "json":
        sys.stdout.write(json_text.to_json(result.to_dict(args.top)))
    elif pairs:
        sys.stdout.write(tables.pair_advice_table(result, args.top))
    else:
        sys.stdout.write(tables.advice_table(result, args.top))
    _input_warnings(station)
    return EXIT_OK


def _antenna_progress(done, total, length_m, seconds):
    """One line on stderr per antenna length of a pair scan, with the time it took."""
    print(f"antenna length {done}/{total}: {length_m:g} m solved and its feeder scanned in {seconds:.2f} s",
          file=sys.stderr, flush=True)


def _antenna_length_option(name, text):
    """An antenna length on the command line [m]: a length, or legs times count (``2x10m``, ``2 x 10 m``)."""
    count, sep, leg = text.partition("x")
    if sep and count.strip().isdigit() and int(count) > 0:
        return int(count) * _length_option(name, leg.strip())
    return _length_option(name, text)


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
    _input_warnings(station)
    return EXIT_OK


def _report_date():
    """The date a report states: SOURCE_DATE_EPOCH (seconds since 1970-01-01 UTC, the convention of
    reproducible builds) if it is set, else None (now)."""
    import datetime
    import os

    text = os.environ.get("SOURCE_DATE_EPOCH")
    if text is None:
        return None
    try:
        seconds = int(text.strip())
        return datetime.datetime.fromtimestamp(seconds, datetime.timezone.utc)
    except (ValueError, OverflowError, OSError):
        raise OptionError(f"SOURCE_DATE_EPOCH: a whole number of seconds since 1970-01-01 UTC, got {text!r}") from None


def _run_report(args) -> int:
    from linecalc import api

    generated = _report_date()
    station = api.load_station(args.station)
    try:
        listed = api.render_report(station, args.output, generated=generated, force=args.force)
    except api.ReportProblem as exc:
        raise OptionError(f"--output: {exc}") from None
    for warning in listed:
        print(f"warning: {warning}", file=sys.stderr)
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


def _run_line(args) -> int:
    from linecalc import api
    from linecalc.io import atomic
    from linecalc.render import json_text, line_text

    station = api.load_station(args.station)
    result = api.solve_line(station, line=args.line)
    if args.write_cable is not None:  # written before anything is printed: a refused write prints nothing
        if not args.write_cable:
            raise OptionError("--write-cable: an output name may not be empty")
        data = line_text.fitted_cable_yaml(result).encode("utf-8")  # a station file is UTF-8, as a label may be
        try:
            atomic.write_atomically(args.write_cable, lambda out: out.write(data), binary=True, force=args.force,
                                    protected=api.input_files(station))
        except atomic.OutputExistsError:
            raise OptionError(f"--write-cable: {args.write_cable}: exists; use --force to replace it") from None
        except InputError as exc:
            raise OptionError(f"--write-cable: {exc}") from None
    if args.format == "json":
        sys.stdout.write(json_text.to_json(result.to_dict()))
    else:
        sys.stdout.write(line_text.line_table(result))
    if args.write_cable is not None:
        print(f"wrote {args.write_cable}", file=sys.stderr)
    for warning in result.warnings:
        print(f"warning: {warning}", file=sys.stderr)
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


class _Interrupt:
    """Ctrl-C (SIGINT) as Python's own handler gives it, a KeyboardInterrupt where the program is,
    and remembered: a C extension's module initialisation can turn that KeyboardInterrupt into an
    ImportError ('initialization failed', as matplotlib's compiled modules do while `plot`
    imports them), and the command must still end as interrupted, not as an internal error."""

    received = False

    @classmethod
    def handle(cls, signum, frame):
        cls.received = True
        raise KeyboardInterrupt


@contextlib.contextmanager
def _signals_raise():
    """SIGTERM and SIGHUP raise `_Terminated` inside the block, SIGINT a remembered
    KeyboardInterrupt (`_Interrupt`) (main thread only; restored after)."""
    import signal
    import threading

    names = [name for name in ("SIGTERM", "SIGHUP") if hasattr(signal, name)]
    if threading.current_thread() is not threading.main_thread():
        yield
        return
    _Interrupt.received = False
    previous = {name: signal.signal(getattr(signal, name), _terminate) for name in names}
    if signal.getsignal(signal.SIGINT) is signal.default_int_handler:  # not where SIGINT is ignored
        previous["SIGINT"] = signal.signal(signal.SIGINT, _Interrupt.handle)
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
                    "antenna": _run_antenna, "line": _run_line, "cables": _run_cables,
                    "report": _run_report}[args.command](args)
    except StationError as exc:
        print(str(exc), file=sys.stderr)
        return EXIT_BAD_INPUT
    except InputError as exc:  # an option's value, or input that reached no station file
        print(f"linecalc {args.command}: {exc}", file=sys.stderr)
        return EXIT_BAD_INPUT
    except BrokenPipeError:
        return EXIT_OK
    except Exception as exc:  # the promise of exit status 1: an internal error, reported in one line
        if _Interrupt.received:  # a Ctrl-C that an import turned into another exception
            raise KeyboardInterrupt from None
        print(f"linecalc: internal error: {type(exc).__name__}: {exc}", file=sys.stderr)
        return EXIT_INTERNAL


if __name__ == "__main__":
    sys.exit(main())
