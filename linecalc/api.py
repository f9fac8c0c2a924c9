"""The public Python API: load a station, run a study, get a result whose ``to_dict()`` is the
JSON document the command prints. The `linecalc` command is a thin shell over these functions.

Every function raises a `linecalc.LinecalcError`; bad input is a `linecalc.InputError`, and a
station that loads but cannot be solved as described is a `linecalc.StationError` naming its
file, line and key path, as the command prints it.
"""
from __future__ import annotations

import dataclasses

from pathlib import Path

from linecalc.errors import InputError, StationError
from linecalc.io import cable_library, station_file
from linecalc.physics.swr_curve import DEFAULT_SWEEP_POINTS
from linecalc.studies import antenna_report, budget, length_advice, measured, pair_advice
from linecalc.studies import compare as compare_study
from linecalc.studies import explain as explain_study
from linecalc.studies import figure_data, line_report, work_size
from linecalc.studies import uncertainty as uncertainty_study
from linecalc.studies.band_sweep import solve_band_sweeps
from linecalc.studies.cable_listing import LISTING_FREQUENCIES_HZ, CableListing, cable_listing
from linecalc.studies.station import CompareSpec, Station, errors_located, located


def load_station(source) -> Station:
    """Read and validate a station.

    Parameters
    ----------
    source : str or os.PathLike
        A station file's path, or the YAML text itself (a ``str`` holding a line break).

    Returns
    -------
    Station
        SI floats throughout; its ``compare`` holds the file's ``compare:`` key (or None).
    """
    if isinstance(source, str) and "\n" in source:
        return station_file.parse_station_text(source)
    return station_file.load_station(source)


def solve_budget(station: Station, *, sweep_points: int | None = None, explain: bool = False,
                 uncertainty=None) -> budget.BudgetResult:
    """The loss budget of every row (band or frequency): SWR at both ends, losses, watts.

    With ``sweep_points``, each band is also swept edge to edge at that many points (the
    command's ``--sweep N``), and the result's ``sweeps`` holds one `BandSweep` per row. With
    ``explain``, its ``explanations`` hold the reasoning in words (the command's ``--explain``);
    the station's own alternatives (the tuner at the other end of the main line, the cables of
    its ``compare:`` key) are solved for it. With ``uncertainty`` (a `Tolerances`), the result's
    ``uncertainty`` holds the spread of every figure over that many drawn stations
    (``--uncertainty``). ``to_dict()`` equals ``linecalc budget --format json`` with the same
    options.
    """
    if sweep_points is not None:
        _check_sweep_points(station, sweep_points)
    with errors_located(station):
        result = budget.solve_budget(station)
        if sweep_points is not None:
            result = _with_sweeps(result, *solve_band_sweeps(station, sweep_points))
        if uncertainty is not None:
            spread = _spread(uncertainty_study.budget_spread, station, result, uncertainty)
            result = dataclasses.replace(result, uncertainty=spread,
                                         warnings=result.warnings + tuple(uncertainty_study.spread_warnings(spread)))
        if explain:
            result = explain_study.with_explanations(
                result, explain_study.explain_budget(result, explain_study.own_alternatives(station)))
    return result


class UncertaintyError(InputError):
    """An uncertainty run too large for memory (the message gives the estimate)."""


def _spread(solve_spread, *args):
    """``solve_spread(*args)``, the spread of an uncertainty run; one too large for memory is an
    `UncertaintyError` (the message gives the estimate)."""
    try:
        return solve_spread(*args)
    except work_size.WorkTooLarge as exc:
        raise UncertaintyError(str(exc)) from None


class SweepPointsError(InputError):
    """A number of sweep points that cannot be used: fewer than 2, or a sweep too large for memory
    (the message gives the estimate)."""


def _check_sweep_points(station, sweep_points):
    """Refuse ``sweep_points`` below 2, or whose sweep of the station would not fit `work_size.MAX_WORK_BYTES`."""
    if isinstance(sweep_points, bool) or not isinstance(sweep_points, int) or sweep_points < 2:
        raise SweepPointsError(f"at least 2 points per band, got {sweep_points!r}")
    try:
        work_size.check_sweep(station, sweep_points, f"{sweep_points:,} points per band")
    except work_size.WorkTooLarge as exc:
        raise SweepPointsError(str(exc)) from None


def _with_sweeps(result, swept, sweeps):
    """The budget with its band sweeps, and the warnings of the sweep (a tuner that cannot match
    at some of its points) after its own."""
    return dataclasses.replace(result, sweeps=tuple(sweeps), warnings=result.warnings + swept.warnings)


def solve_safety(station: Station, *, explain: bool = False) -> budget.BudgetResult:
    """The budget with its safety figures (voltage and current maxima on lines and tuner parts
    at PEP, RF-exposure distances): ``linecalc safety``. Its ``to_dict()`` is the same document
    as the budget's, which carries those figures; with ``explain``, its ``explanations`` hold the
    safety topic in words (``linecalc safety --explain``)."""
    result = solve_budget(station)
    if explain:
        result = explain_study.with_explanations(result, explain_study.explain_safety(result))
    return result


def solve_compare(station: Station, *, cables=(), tuner_positions=False, main_line=None, line=None,
                  lengths_m=(), explain=False, uncertainty=None) -> compare_study.Comparison:
    """Alternatives of the station ranked band by band: ``linecalc compare``.

    The station file's ``compare:`` key is extended by these arguments, as by the command's
    options: ``cables`` library ids for the main line, ``tuner_positions`` the tuner at either
    end of the main line, ``main_line`` the line to replace (default the longest), ``line`` and
    ``lengths_m`` [m] other lengths of a line. With ``explain``, its ``explanations`` say row by
    row which alternative wins and by how much (``linecalc compare --explain``). With
    ``uncertainty`` (a `Tolerances`) every alternative is also drawn, and the result's
    ``uncertainty`` names a winner per row only where it wins in at least 97.5 % of the draws
    (``--uncertainty``).
    """
    spec = _compare_spec(station.compare, cables, tuner_positions, main_line, line, lengths_m)
    try:
        with errors_located(station):
            alternatives = compare_study.alternatives_from_spec(station, spec)
            comparison = compare_study.compare(station, alternatives)
            if explain:
                comparison = explain_study.with_explanations(comparison, explain_study.explain_compare(comparison))
            if uncertainty is None:
                return comparison
            return dataclasses.replace(comparison, uncertainty=_spread(uncertainty_study.compare_spread, comparison,
                                                                       alternatives, uncertainty))
    except compare_study.CompareError as exc:
        raise located(station, budget.BudgetError(str(exc), "compare"),
                      station.key_lines.get("compare") or station.key_lines.get("feed", 1)) from None


class UnknownCableError(InputError):
    """A cable id that the library does not hold (the message suggests the nearest ones)."""


class LengthError(InputError):
    """A length that is zero or negative."""


def _compare_spec(spec, cables, tuner_positions, main_line, line, lengths_m) -> CompareSpec:
    """The station file's compare: spec extended by the arguments of `solve_compare`."""
    chosen = tuple(spec.cables) if spec else ()
    if cables:
        known = cable_library.load_library()
        for cable_id in cables:
            if cable_id not in known:
                near = cable_library.nearest_ids(cable_id)
                hint = f"; did you mean {', '.join(near)}?" if near else ""
                raise UnknownCableError(f"unknown cable id {cable_id!r}{hint}")
            chosen += ((cable_id, known[cable_id]),)
    lengths = tuple(spec.lengths_m) if spec else ()
    if lengths_m:
        if any(length <= 0 for length in lengths_m):
            raise LengthError("every length must be greater than zero")
        lengths = tuple(lengths_m)
    return CompareSpec(main_line=main_line or (spec.main_line if spec else None), cables=chosen,
                       tuner_positions=tuner_positions or bool(spec and spec.tuner_positions),
                       line=line or (spec.line if spec else None), lengths_m=lengths)


def solve_feedpoint(station: Station, *, uncertainty=None) -> measured.FeedpointResult:
    """A sweep measured away from the feedpoint (``measured_at:``) moved to the antenna:
    ``linecalc feedpoint``. With ``uncertainty`` (a `Tolerances`), the result's ``uncertainty``
    holds the spread of R, X and SWR at every point over the drawn stations (``--uncertainty``)."""
    with errors_located(station):
        result = measured.solve_feedpoint(station)
        if uncertainty is None:
            return result
        return dataclasses.replace(result, uncertainty=_spread(uncertainty_study.feedpoint_spread, station, result,
                                                               uncertainty))


def solve_advice(station: Station, *, line=None, length_from_m=5.0, length_to_m=60.0, step_m=0.01,
                 points_per_band=length_advice.POINTS_PER_BAND, max_loss_db=None, allow_large_scan=False,
                 progress=None, rank="sum") -> length_advice.AdviceResult:
    """Which lengths of the feeder (``line``, default the longest) let the tuner match on every
    band, ranked by the watts at the antenna (``rank``: ``"sum"`` over the rows, or ``"worst"``
    row): ``linecalc advise``. Lengths in metres; ``progress(done, total)`` is called as the
    scan runs. ``to_dict(top)`` equals ``linecalc advise --top N --format json``."""
    with errors_located(station):
        return length_advice.advise_station(station, line, length_from_m, length_to_m, step_m,
                                            points_per_band=points_per_band, allow_large_scan=allow_large_scan,
                                            progress=progress, max_loss_db=max_loss_db, rank=rank)


def solve_pair_advice(station: Station, *, antenna_from_m, antenna_to_m, antenna_step_m=1.0, line=None,
                      length_from_m=5.0, length_to_m=60.0, step_m=0.01,
                      points_per_band=length_advice.POINTS_PER_BAND, max_loss_db=None, allow_large_scan=False,
                      progress=None, rank="sum", antenna_progress=None, jobs=1) -> pair_advice.PairAdviceResult:
    """Which wire-antenna length and which feeder length together let the tuner match on every
    band, ranked by the watts at the antenna: ``linecalc advise --antenna-from A --antenna-to B``.
    Lengths in metres (the antenna's tip to tip, a vertical's height); ``antenna_progress(done,
    total, length_m, seconds)`` is called after each antenna length; ``jobs`` processes run the
    engine. ``to_dict(top)`` equals the command's ``--format json`` document."""
    with errors_located(station):
        return pair_advice.advise_pairs(station, line, antenna_from_m, antenna_to_m, antenna_step_m, length_from_m,
                                        length_to_m, step_m, points_per_band=points_per_band,
                                        allow_large_scan=allow_large_scan, progress=progress, max_loss_db=max_loss_db,
                                        rank=rank, antenna_progress=antenna_progress, jobs=jobs)


def solve_antenna(station: Station, *, cut_for_hz=None) -> antenna_report.AntennaReport:
    """A wire antenna on its own, row by row: impedance, SWR against the reference and the line,
    nearest resonance, peak gain, wire loss; with ``cut_for_hz`` [Hz] also the length to cut
    for resonance there beside the 468/f rule of thumb: ``linecalc antenna [--cut-for F]``."""
    with errors_located(station):
        return antenna_report.antenna_report(station, cut_for_hz)


def solve_line(station: Station, *, line=None) -> line_report.LineCharacterisation:
    """The line labelled ``line`` (default: the only line with sweeps) fitted to its open and short
    sweeps: impedance, electrical length, velocity factor or length, loss terms, with intervals:
    ``linecalc line [--line LABEL]``. A sweep that cannot characterise the line is a
    `StationError` at the line's ``sweeps:`` key."""
    try:
        return line_report.characterise_line(station, line)
    except budget.BudgetError as exc:
        at = [e.sweeps.line for e in station.feed if getattr(e, "sweeps", None) is not None and e.sweeps.key == exc.key]
        raise located(station, exc, at[0] if at else None) from None


def list_cables(frequency_hz=LISTING_FREQUENCIES_HZ) -> CableListing:
    """The cable library with each cable's matched loss at ``frequency_hz`` [Hz]: ``linecalc cables``."""
    return cable_listing(cable_library.load_library().values(), frequency_hz)


def draw_figure(kind: str, station: Station, path, *, sweep_points=DEFAULT_SWEEP_POINTS, line=None, force=False,
                cables=(), tuner_positions=False, main_line=None, lengths_m=(), sweep_smith=False):
    """Draw figure ``kind`` (swr, budget, smith, voltage, compare) of the station into ``path``
    (.png or .svg, written atomically): ``linecalc plot``. Returns the matplotlib Figure.

    ``line`` is the line whose voltage is drawn (default the longest), and for compare the line
    whose length ``lengths_m`` varies; ``cables``, ``tuner_positions``, ``main_line`` and
    ``lengths_m`` extend the station's ``compare:`` key as in `solve_compare`. ``sweep_smith``
    adds each band swept at ``sweep_points`` to the Smith chart (the command's ``--sweep N``)."""
    from linecalc.render import plots

    from linecalc.io import atomic

    try:  # before any work: never over an input (the station, its sweep), by path or by file
        atomic.check_output(path, force=force, protected=input_files(station))
    except (atomic.OutputIsInputError, atomic.OutputNotFileError, atomic.OutputWriteError) as exc:
        raise figure_data.PlotProblem(str(exc)) from None
    except atomic.OutputExistsError:
        raise figure_data.PlotProblem(f"{path}: exists; use --force to replace it") from None
    if kind in ("swr", "smith"):
        _check_sweep_points(station, sweep_points)
    spec = None
    if kind == "compare":
        spec = _compare_spec(station.compare, cables, tuner_positions, main_line, line, lengths_m)
    with errors_located(station):
        data = figure_data.figure_data(kind, station, sweep_points=sweep_points,
                                       line_label=None if kind == "compare" else line, compare_spec=spec,
                                       sweep_smith=sweep_smith)
    return plots.draw(data, path, force=force)


class ReportProblem(InputError):
    """A report that cannot be written: not an .html file, an existing file without ``force``,
    one of the station's inputs, a device, a folder that is missing."""


REPORT_SUFFIXES = (".html", ".htm")


def render_report(station: Station, path, *, generated=None, force=False) -> tuple[str, ...]:
    """Write the station's report into ``path``: one self-contained HTML page (the budget, each
    element's heat, meter readings, tuner settings, every figure that applies as inline SVG, the
    safety figures with their cautions, every warning and the station file): ``linecalc report``.

    ``generated`` (a timezone-aware datetime) is the date the page states; None: now, in UTC.
    Written atomically, never over an input, over an existing file only with ``force``.
    Returns the warnings the page lists (the budget's, then the comparison's that it lacks).
    """
    import datetime
    import importlib.metadata

    from linecalc.io import atomic
    from linecalc.render import html_report, plots

    path = Path(path)
    if path.suffix.lower() not in REPORT_SUFFIXES:
        raise ReportProblem(f"a report file ends in .html, got {str(path)!r}")
    protected = input_files(station)
    _checked_output(path, force, protected)
    if generated is None:
        generated = datetime.datetime.now(datetime.timezone.utc)
    try:  # the budget with its band sweeps, as the swr figure draws them: their warnings too
        _check_sweep_points(station, DEFAULT_SWEEP_POINTS)
        result = solve_budget(station, sweep_points=DEFAULT_SWEEP_POINTS)
    except SweepPointsError:  # too large a sweep: no swr figure either (said there)
        result = solve_budget(station)
    with errors_located(station):  # the page explains as --explain does: budget topics, then safety
        result = explain_study.with_explanations(
            result, explain_study.explain_budget(result, explain_study.own_alternatives(station))
            + explain_study.explain_safety(result))
    comparison = solve_compare(station) if station.compare is not None else None
    figures = []
    for kind, _, _ in html_report.FIGURES:
        if kind == "compare" and station.compare is None:
            figures.append(html_report.Figure(kind, skipped="the station file has no compare: key"))
            continue
        if kind == "voltage" and not any(element.kind == "line" for element in station.feed):
            figures.append(html_report.Figure(kind, skipped="the feed has no line to draw the voltage along"))
            continue
        try:
            if kind in ("swr", "smith"):
                _check_sweep_points(station, DEFAULT_SWEEP_POINTS)
            with errors_located(station):
                data = figure_data.figure_data(kind, station, sweep_points=DEFAULT_SWEEP_POINTS)
            figures.append(html_report.Figure(kind, svg=plots.svg_text(data)))
        except (figure_data.PlotProblem, SweepPointsError, StationError) as exc:
            figures.append(html_report.Figure(kind, skipped=_reason(exc)))
    try:
        station_text = station_file.read_station_text(station.source_file)
    except StationError:
        station_text = None  # a station parsed from text, or a file gone since it was read
    budget_doc, compare_doc = result.to_dict(), comparison.to_dict() if comparison is not None else None
    page = html_report.report_html(budget_doc, figures=figures,
                                   version=importlib.metadata.version("linecalc"),
                                   generated=generated.astimezone(datetime.timezone.utc),
                                   station_text=station_text, source_name=str(station.source_file),
                                   compare_doc=compare_doc)
    try:
        atomic.write_atomically(path, lambda out: out.write(page.encode("utf-8")), binary=True,
                                       force=force, protected=protected)
    except atomic.OutputExistsError:  # appeared while the page was made
        raise ReportProblem(f"{path}: exists; use --force to replace it") from None
    except (atomic.OutputIsInputError, atomic.OutputNotFileError, atomic.OutputWriteError) as exc:
        raise ReportProblem(str(exc)) from None
    return html_report.page_warnings(budget_doc, compare_doc)


def _checked_output(path, force, protected):
    """`linecalc.io.atomic.check_output`, its refusals as `ReportProblem` (before any work)."""
    from linecalc.io import atomic

    if not Path(path).parent.is_dir():  # refused now rather than after the page is made
        raise ReportProblem(f"{path}: cannot be written: no such folder {str(Path(path).parent)!r}")
    try:
        atomic.check_output(path, force=force, protected=protected)
    except atomic.OutputExistsError:
        raise ReportProblem(f"{path}: exists; use --force to replace it") from None
    except (atomic.OutputIsInputError, atomic.OutputNotFileError, atomic.OutputWriteError) as exc:
        raise ReportProblem(str(exc)) from None


def _reason(exc):
    """Why a figure does not apply, as a sentence's clause (a StationError without its FILE:LINE)."""
    return exc.message if isinstance(exc, StationError) else str(exc)


def input_files(station: Station) -> list[Path]:
    """The files a station reads (itself and its Touchstone sweep): an output may not replace them."""
    return station_file.input_files(station.source_file)


__all__ = ["ReportProblem", "StationError", "SweepPointsError", "UncertaintyError", "draw_figure", "input_files",
           "list_cables", "load_station", "render_report", "solve_advice", "solve_antenna", "solve_budget",
           "solve_compare", "solve_feedpoint", "solve_line", "solve_pair_advice", "solve_safety"]
