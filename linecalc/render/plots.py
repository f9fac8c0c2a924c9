"""Figures of computed results: SWR across bands, the loss budget, a Smith chart, the voltage along
a feedline and a comparison of alternatives. PNG or SVG, written atomically.

matplotlib is imported inside the functions that draw (never at import time), with the Agg
backend, and figures are made without pyplot, so nothing here opens a window or keeps global
figure state. Every function takes results already computed, draws them, writes ``path`` and
returns the matplotlib Figure, whose artists hold the plotted data. A file that exists is
refused (`PlotExistsError`) unless ``force`` is true.
"""
from __future__ import annotations

import errno
from pathlib import Path

import numpy as np
from linecalc.errors import InputError
from linecalc.io import atomic
from linecalc.render import smith_chart
from linecalc.render.loss_shares import OWN_BAR_SHARE, LossShares, loss_shares  # noqa: F401 (for callers)
from linecalc.render.smith_chart import SMITH_R, SMITH_X  # noqa: F401 (the chart's grid, for callers)
from linecalc.studies import figure_data

FIGURE_SIZE_IN = (10.0, 6.0)
DPI = 100
FORMATS = (".png", ".svg")
# Font sizes [pt] at 100 dpi: readable at 100 % zoom.
_RC = {"font.size": 11, "axes.titlesize": 12, "axes.labelsize": 11, "legend.fontsize": 10,
       "xtick.labelsize": 10, "ytick.labelsize": 10, "figure.titlesize": 13, "svg.hashsalt": "linecalc"}
# Colour-blind-safe palette (Okabe and Ito, Color Universal Design, 2008), then matplotlib's.
# The palette's yellow is left out: too pale on white.
_COLOURS = ("#0072B2", "#E69F00", "#009E73", "#CC79A7", "#56B4E9", "#D55E00", "#000000",
            "#d62728", "#9467bd", "#8c564b", "#7f7f7f", "#bcbd22", "#17becf")
# Bottom of the SWR axis: 1 is the least SWR, the axis starts just below it.
SWR_AXIS_BOTTOM = 0.93
VOLTAGE_CAUTION = ("RMS volts; peaks are 1.41 times higher. Lines at high SWR carry voltages that arc, burn "
                   "and can kill: keep clear while transmitting.")


class PlotExistsError(FileExistsError, InputError):
    """The plot file exists and ``force`` was not given."""


class PlotInputError(InputError):
    """A plot asked for in a format other than PNG or SVG, or with data that do not fit together."""


def _colour(n):
    return _COLOURS[n % len(_COLOURS)]


def _target(path, force):
    """The checked output path: .png or .svg, not an existing file unless ``force``."""
    path = Path(path)
    if path.suffix.lower() not in FORMATS:
        raise PlotInputError(f"a plot file ends in .png or .svg, got {str(path)!r}")
    try:
        atomic.check_output(path, force=force)  # also: never over a device, a FIFO or a folder
    except atomic.OutputExistsError:
        raise PlotExistsError(errno.EEXIST, "the plot file exists (force to overwrite it)", str(path)) from None
    return path


def _figure(rows=1, columns=1, **subplot_kw):
    """A new Figure (no pyplot) of FIGURE_SIZE_IN at DPI with constrained layout, and its axes."""
    import matplotlib

    matplotlib.use("Agg")
    from matplotlib.figure import Figure

    figure = Figure(figsize=FIGURE_SIZE_IN, dpi=DPI, layout="constrained")
    axes = figure.subplots(rows, columns, squeeze=False, **subplot_kw)
    return figure, axes


def _save(figure, path, force):
    """Write the figure whole or not at all (`linecalc.io.atomic.write_atomically`)."""
    path = _target(path, force)
    metadata = {"Date": None} if path.suffix.lower() == ".svg" else {"Software": None}
    try:
        atomic.write_atomically(path, lambda out: figure.savefig(out, format=path.suffix[1:].lower(), dpi=DPI,
                                                                  metadata=metadata), binary=True, force=force)
    except atomic.OutputExistsError:  # appeared while drawing
        raise PlotExistsError(errno.EEXIST, "the plot file exists (force to overwrite it)", str(path)) from None
    return figure


def _rc():
    import matplotlib

    return matplotlib.rc_context(_RC)


def _arrays(name, values, count):
    values = [np.asarray(v) for v in values]
    if len(values) != count:
        raise PlotInputError(f"{name}: {len(values)} entries for {count} labels")
    return values


def _swr_ticks(top):
    """A tick locator for a log SWR axis from SWR_AXIS_BOTTOM to ``top``: 1 and the top always,
    then 2, 3, 5, 10, ..., 500, 1.5 in that order of preference, each only where its label stays at
    least 1.6 lines of tick text from every other (measured on the drawn axis, so small panels
    get fewer ticks)."""
    from matplotlib.ticker import Locator

    preference = (2, 3, 5, 10, 20, 50, 100, 200, 500, 1.5)

    class SwrLocator(Locator):
        def __call__(self):
            low, high = self.axis.get_view_interval()
            pixels = self.axis.axes.get_window_extent().height
            size_pt = _RC["ytick.labelsize"]
            gap = 1.6 * size_pt * self.axis.get_figure(root=True).dpi / 72 / max(pixels, 1.0) * np.log(high / low)
            kept = [t for t in (1.0, top) if low <= t <= high]
            for t in preference:
                if low <= t <= high and all(abs(np.log(t / k)) >= gap for k in kept):
                    kept.append(t)
            return sorted(kept)

    return SwrLocator()


def plot_swr(path, labels, frequency_hz, swr_antenna, swr_radio, *, tuner_set_hz=None, tuner_state=None,
             force=False):
    """SWR across each band, at the antenna and at the radio, one panel per swept band; the rows
    of a single frequency share one last panel, as points.

    Parameters
    ----------
    path : str or Path
        Output file, .png or .svg.
    labels : sequence of str
        Band names, one per row.
    frequency_hz, swr_antenna, swr_radio : sequence of array_like
        Per row: frequencies [Hz] and the SWR at each end [1] (inf for a total reflection,
        which is not drawn). A row of one frequency is drawn as a point.
    tuner_set_hz : sequence of (float or None), optional
        Per row, where a tuner held across the band was set [Hz] (a dotted vertical line), or None.
    tuner_state : sequence of array_like of str, optional
        Per row and frequency, `linecalc.studies.figure_data.tuner_states`: the points where a
        tuner cannot match or is in bypass are marked.
    force : bool
        Overwrite an existing file.

    Returns
    -------
    matplotlib.figure.Figure
        Each band panel holds two lines, antenna then radio, x in MHz; the panel of single
        frequencies two lines of markers. Raises `PlotInputError` where no SWR is finite (a total
        reflection everywhere): there is nothing to draw.
    """
    _target(path, force)
    count = len(labels)
    frequency_hz, swr_antenna, swr_radio = (_arrays(name, values, count) for name, values in
                                            (("frequency_hz", frequency_hz), ("swr_antenna", swr_antenna),
                                             ("swr_radio", swr_radio)))
    state = [np.full(f.shape, "", dtype=object) for f in frequency_hz] if tuner_state is None else \
        [np.asarray(s, dtype=object) for s in tuner_state]
    finite = np.concatenate([s[np.isfinite(s)] for s in swr_antenna + swr_radio])
    if finite.size == 0:
        raise PlotInputError("nothing to draw: the SWR is infinite at every point (a total reflection, such as "
                             "a shorted or open antenna)")
    swept = [n for n in range(count) if frequency_hz[n].size > 1]
    single = [n for n in range(count) if frequency_hz[n].size == 1]
    panels = [(labels[n], [n]) for n in swept] + ([("single frequencies", single)] if single else [])
    with _rc():
        from matplotlib.ticker import FuncFormatter, MaxNLocator, NullLocator

        columns = min(len(panels), 4)
        rows = -(-len(panels) // columns)
        figure, axes = _figure(rows, columns)
        steps = (1, 1.5, 2, 3, 5, 10, 20, 50, 100, 200, 500)
        top_data = max(float(finite.max()), 2.0)
        # the axis ends on the first tick above the data, so that the top of every curve is labelled
        top = next((t for t in steps if t >= top_data * 1.05), top_data * 1.15)
        for p, ax in enumerate(axes.flat):
            if p >= len(panels):
                ax.set_visible(False)
                continue
            title, members = panels[p]
            if len(members) == 1 and frequency_hz[members[0]].size > 1:
                n = members[0]
                mhz = frequency_hz[n] / 1e6
                ax.plot(mhz, swr_antenna[n], color=_colour(0), linewidth=2, label="at the antenna")
                ax.plot(mhz, swr_radio[n], color=_colour(1), linewidth=2, linestyle="--", label="at the radio")
                if tuner_set_hz is not None and tuner_set_hz[n] is not None:
                    ax.axvline(tuner_set_hz[n] / 1e6, color="black", linewidth=1, linestyle=":",
                               label="tuner set here, then held")
                ax.xaxis.set_major_locator(MaxNLocator(3))
            else:
                mhz = np.array([frequency_hz[n][0] for n in members]) / 1e6
                ax.plot(mhz, [swr_antenna[n][0] for n in members], color=_colour(0), linestyle="none", marker="o",
                        markersize=8, label="at the antenna")
                ax.plot(mhz, [swr_radio[n][0] for n in members], color=_colour(1), linestyle="none", marker="s",
                        markersize=7, markerfacecolor="white", markeredgewidth=2, label="at the radio")
                for n, x in zip(members, mhz):
                    for value, dy in ((swr_antenna[n][0], 6), (swr_radio[n][0], -14)):
                        if np.isfinite(value):
                            ax.annotate(f"{value:.2f}", (x, value), xytext=(6, dy), textcoords="offset points",
                                        fontsize=9)
                ax.set_xticks(mhz, [labels[n] for n in members], rotation=30 if len(members) > 3 else 0)
                ax.set_xlim(mhz.min() - 0.5 - 0.05 * np.ptp(mhz), mhz.max() + 0.5 + 0.05 * np.ptp(mhz))
            for marked, style, text in ((figure_data.TUNER_UNMATCHED, {"marker": "x", "color": "#d62728"},
                                         "tuner cannot match"),
                                        (figure_data.TUNER_BYPASSED, {"marker": "|", "color": "0.3"},
                                         "tuner in bypass")):
                x = np.concatenate([frequency_hz[n][state[n] == marked] for n in members]) / 1e6
                y = np.concatenate([swr_radio[n][state[n] == marked] for n in members])
                if x.size:
                    ax.plot(x, y, linestyle="none", markersize=6, markeredgewidth=1.2, label=text, **style)
            ax.set_yscale("log")
            ax.set_ylim(SWR_AXIS_BOTTOM, top)  # a little below 1 so that a matched curve shows
            ax.yaxis.set_major_locator(_swr_ticks(top))
            ax.yaxis.set_major_formatter(FuncFormatter(lambda value, _: f"{value:g}"))
            ax.yaxis.set_minor_locator(NullLocator())
            ax.grid(True, alpha=0.3)
            ax.set_title(title)
            if p % columns == 0:
                ax.set_ylabel("SWR")
            if p >= len(panels) - columns:
                ax.set_xlabel("frequency [MHz]" if len(members) == 1 and frequency_hz[members[0]].size > 1
                              else "frequency")
        legend = {}
        for ax in axes.flat[:len(panels)]:
            legend.update(zip(*reversed(ax.get_legend_handles_labels())))
        figure.legend(list(legend.values()), list(legend), loc="outside upper right", ncols=len(legend))
        figure.suptitle("SWR across each band" if swept else "SWR at each frequency", x=0.02, ha="left")
        return _save(figure, path, force)


def si_watts(power_w):
    """A power in watts with an SI prefix and 3 significant digits: 1.27 kW, 85.3 W, 12 mW."""
    value = float(power_w)
    if value == 0 or not np.isfinite(value):
        return f"{value:g} W"
    for scale, prefix in ((1e3, "k"), (1.0, ""), (1e-3, "m"), (1e-6, "µ")):
        if abs(value) >= scale * 0.9995:
            return f"{value / scale:.3g} {prefix}W"
    return f"{value:.3g} W"


def tuner_note(state):
    """What a row's tuner did, as marked on every figure ("" where it simply matched or there is none)."""
    return smith_chart.TUNER_NOTES.get(state, "")


def _stacked(ax, labels, values, categories):
    """Stacked bars, positive shares upward from 0 and negative shares downward; returns the tops.
    A share that is not finite (a row where no power reaches the antenna) is left out of the
    stack; the caller marks that row."""
    x = np.arange(len(labels))
    up, down = np.zeros(len(labels)), np.zeros(len(labels))
    for n, (name, heights) in enumerate(zip(categories, values)):
        heights = np.where(np.isfinite(heights), heights, 0.0)
        base = np.where(heights >= 0, up, down)
        ax.bar(x, heights, 0.6, bottom=base, color=_colour(n), label=name, edgecolor="white", linewidth=0.5)
        up, down = np.where(heights >= 0, up + heights, up), np.where(heights < 0, down + heights, down)
    ax.set_xticks(x, labels)
    ax.axhline(0, color="black", linewidth=0.8)
    ax.grid(True, axis="y", alpha=0.3)
    return up  # the top of each stack


def plot_loss_budget(path, result, *, force=False):
    """The loss budget per band as stacked bars: in dB (upper panel) and in watts (lower panel).

    Parameters
    ----------
    path : str or Path
        Output file, .png or .svg.
    result : linecalc.studies.budget.BudgetResult
    force : bool
        Overwrite an existing file.

    Returns
    -------
    matplotlib.figure.Figure
        Axes 0 (dB) and 1 (W) each hold one BarContainer per category of `loss_shares`, in its
        order; a share below zero (a short line whose current minimum lowers its heat) is drawn
        downward from zero. The watts panel writes the watts at the antenna above each bar. A
        row whose loss is infinite (no power reaches the antenna) has no dB bar and says so; a
        row whose tuner is in bypass or cannot match says so under its band.
    """
    _target(path, force)
    shares = loss_shares(result)
    state = figure_data.tuner_states(result)
    labels = [label + (f"\n{tuner_note(s)}" if tuner_note(s) else "") for label, s in zip(result.labels, state)]
    with _rc():
        figure, axes = _figure(2, 1, sharex=True)
        db_ax, w_ax = axes[:, 0]
        # a row of infinite loss (no power reaches the antenna) has no height to stack: its dB
        # bar is left out and the row says so
        dead = ~np.isfinite(np.asarray(result.total_loss_db, dtype=float))
        db_tops = _stacked(db_ax, labels, np.where(dead, 0.0, shares.loss_db), shares.categories)
        for x in np.flatnonzero(dead):
            db_ax.annotate("infinite loss:\nno power reaches\nthe antenna", (x, 0.5), xycoords=("data", "axes fraction"),
                           ha="center", va="center", fontsize=10, color="#d62728")
        if np.max(db_tops, initial=0.0) > 0:
            db_ax.set_ylim(top=1.15 * float(np.max(db_tops)))
        db_ax.set_ylabel("loss [dB]")
        db_ax.set_title(f"Where the loss goes: {result.station}", loc="left")
        totals = _stacked(w_ax, labels, shares.heat_w, shares.categories)
        w_ax.set_ylabel("heat [W]")
        w_ax.set_title(f"Heat from {si_watts(result.radio_power_w)} at the radio; watts at the antenna above each bar",
                       loc="left")
        for x, (total, delivered) in enumerate(zip(totals, result.power_antenna_w)):
            w_ax.annotate(si_watts(delivered), (x, max(total, 0.0)), xytext=(0, 3), textcoords="offset points",
                          ha="center", va="bottom", fontsize=10)
        # room for the labels: a fifth above the highest bar (a hundredth of the power if none)
        highest = float(np.max(totals))
        w_ax.set_ylim(top=1.2 * highest if highest > 0 else 0.01 * result.radio_power_w)
        w_ax.set_xlabel("band")
        if shares.categories:
            figure.legend(*db_ax.get_legend_handles_labels(), loc="outside upper center",
                          ncols=min(len(shares.categories), 4))
        return _save(figure, path, force)


def plot_smith(path, z_antenna_ohm, z_radio_ohm, z_ref_ohm, labels=None, *, reference_line=None, line_paths=(),
               sweep_labels=None, sweep_z_antenna_ohm=None, sweep_z_radio_ohm=None, tuner_state=None, force=False):
    """The impedance at the antenna and at the radio on a Smith chart normalised to ``z_ref_ohm``.

    Parameters
    ----------
    path : str or Path
        Output file, .png or .svg.
    z_antenna_ohm, z_radio_ohm : array_like of complex, shape (n,)
        Impedances [ohm] (a budget's ``z_antenna_ohm`` and ``z_radio_ohm``; an SWR-only antenna
        has none).
    z_ref_ohm : float
        Reference impedance of the chart [ohm].
    labels : sequence of str or None
        One per point, written in two columns beside the chart and joined to the antenna's
        points; None: no labels.
    reference_line : str or None
        The line whose nominal impedance ``z_ref_ohm`` is, for the title (None: the station's
        reference impedance).
    line_paths : sequence of (str, ndarray of complex (points, n))
        Per line, its label and rho along it from the antenna end to the radio end (drawn as
        its spiral).
    sweep_labels, sweep_z_antenna_ohm, sweep_z_radio_ohm : sequences or None
        With a sweep: per band, its label and the impedances [ohm] across it (drawn as traces).
    tuner_state : sequence of str or None
        Per point, `linecalc.studies.figure_data.tuner_states` (marked on the chart).
    force : bool
        Overwrite an existing file.

    Returns
    -------
    matplotlib.figure.Figure
        Its last two lines are the antenna's and the radio's rho = (Z - Z_ref)/(Z + Z_ref), real
        part on x, imaginary on y.
    """
    _target(path, force)
    if z_antenna_ohm is None or z_radio_ohm is None:
        raise PlotInputError("no impedances to draw: an SWR-only antenna has no phase")
    z_antenna, z_radio = np.asarray(z_antenna_ohm, dtype=complex), np.asarray(z_radio_ohm, dtype=complex)
    if z_antenna.shape != z_radio.shape or (labels is not None and len(labels) != z_antenna.size):
        raise PlotInputError("z_antenna_ohm, z_radio_ohm and labels must have one entry per point")
    data = figure_data.SmithPoints(z_antenna, z_radio, float(z_ref_ohm), None if labels is None else list(labels),
                                   reference_line, tuple(line_paths), sweep_labels, sweep_z_antenna_ohm,
                                   sweep_z_radio_ohm, None if tuner_state is None else np.asarray(tuner_state))
    with _rc():
        figure, axes = _figure()
        ax = axes[0, 0]
        smith_chart.draw_smith(ax, data, _colour)
        figure.legend(*ax.get_legend_handles_labels(), loc="outside right upper", fontsize=9)
        return _save(figure, path, force)


def plot_line_voltage(path, labels, position_m, voltage_v, *, rating_v=None, line_label="feedline",
                      current_a=None, power_w=None, tuner_state=None, force=False):
    """RMS voltage magnitude along a feedline, one curve per band, and the current below it.

    Parameters
    ----------
    path : str or Path
        Output file, .png or .svg.
    labels : sequence of str
        Band names, one per curve.
    position_m, voltage_v : sequence of array_like
        Per band: distance from the radio end of the line [m] and |V| there [V, RMS] (see
        `linecalc.physics.voltage.line_profile_from_both_ends`).
    rating_v : float or None
        The cable's voltage rating [V]: a margin note with the highest voltage's share of it;
        drawn as a dashed line only where the voltage reaches it (so that it never sets the scale).
    line_label : str
        Name of the line, for the title.
    current_a : sequence of array_like or None
        Per band, |I| at the same positions [A, RMS], drawn in a lower panel.
    power_w : float or None
        The radio's power the profile is solved at [W], for the title.
    tuner_state : sequence of str or None
        Per band, `linecalc.studies.figure_data.tuner_states`, marked in the legend.
    force : bool
        Overwrite an existing file.

    Returns
    -------
    matplotlib.figure.Figure
        Axes 0: one line per band in order (then the rating line, where drawn); axes 1 (with
        ``current_a``): one line per band.
    """
    _target(path, force)
    count = len(labels)
    position_m, voltage_v = _arrays("position_m", position_m, count), _arrays("voltage_v", voltage_v, count)
    if current_a is not None:
        current_a = _arrays("current_a", current_a, count)
    state = [""] * count if tuner_state is None else list(tuner_state)
    names = [label + (f" ({tuner_note(s)})" if tuner_note(s) else "") for label, s in zip(labels, state)]
    with _rc():
        figure, axes = _figure(2 if current_a is not None else 1, 1, sharex=True)
        ax = axes[0, 0]
        for n in range(count):
            ax.plot(position_m[n], voltage_v[n], color=_colour(n), linewidth=2, label=names[n])
        highest = max(float(np.max(v)) for v in voltage_v)
        if rating_v is not None:
            if highest >= rating_v:
                ax.axhline(rating_v, color="black", linestyle="--", linewidth=1.2, label=f"cable rating {rating_v:g} V")
            note = (f"cable rating {rating_v:,.0f} V RMS; the highest voltage here, {highest:,.0f} V, is "
                    f"{100 * highest / rating_v:.0f} % of it")
            ax.annotate(note, (0.99, 0.97), xycoords="axes fraction", ha="right", va="top", fontsize=10,
                        color="0.2", bbox={"boxstyle": "round", "facecolor": "white", "edgecolor": "0.7"})
        top = highest * 1.12 if highest > 0 else 1.0
        ax.set_ylim(0, max(top, rating_v * 1.05) if rating_v is not None and highest >= rating_v else top)
        ax.set_xlim(min(float(p.min()) for p in position_m), max(float(p.max()) for p in position_m))
        ax.set_ylabel("voltage [V RMS]")
        at = f" at {si_watts(power_w)} from the radio" if power_w is not None else ""
        ax.set_title(f"Voltage and current along the {line_label}{at}" if current_a is not None
                     else f"Voltage along the {line_label}{at}", loc="left")
        ax.grid(True, alpha=0.3)
        ax.legend(loc="upper left", bbox_to_anchor=(1.01, 1.0))
        bottom = ax
        if current_a is not None:
            bottom = axes[1, 0]
            for n in range(count):
                bottom.plot(position_m[n], current_a[n], color=_colour(n), linewidth=1.6, label=names[n])
            largest = max(float(np.max(i)) for i in current_a)
            bottom.set_ylim(0, largest * 1.12 if largest > 0 else 1.0)
            bottom.set_ylabel("current [A RMS]")
            bottom.grid(True, alpha=0.3)
        bottom.set_xlabel("distance from the radio end of the line [m]")
        bottom.ticklabel_format(axis="x", style="plain", useOffset=False)  # metres as written, no "1e6"
        figure.text(0.01, 0.005, VOLTAGE_CAUTION, fontsize=10, color="0.25", ha="left", va="bottom")
        figure.get_layout_engine().set(h_pad=0.3)
        return _save(figure, path, force)


def plot_compare(path, labels, power_antenna_w, *, radio_power_w=None, tuner_state=None, force=False):
    """Watts at the antenna per band for each alternative, as grouped bars.

    Parameters
    ----------
    path : str or Path
        Output file, .png or .svg.
    labels : sequence of str
        Band names.
    power_antenna_w : mapping of str to array_like, each shape (len(labels),)
        Alternative name -> watts at the antenna per band [W], in the order to draw.
    radio_power_w : float or None
        The radio's power [W], drawn as a dashed line when given.
    tuner_state : mapping of str to sequence of str, or None
        Alternative name -> per band, `linecalc.studies.figure_data.tuner_states` of that
        alternative: its bars where its tuner cannot match or is in bypass are hatched and marked
        above the bar, as on the SWR figure.
    force : bool
        Overwrite an existing file.

    Returns
    -------
    matplotlib.figure.Figure
        One BarContainer per alternative, in the mapping's order; then, after the radio's line,
        one line of markers per tuner state that occurs (labelled as `tuner_note` says).
    """
    _target(path, force)
    names = list(power_antenna_w)
    if not names:
        raise PlotInputError("nothing to compare: no alternatives")
    values = _arrays("power_antenna_w", [power_antenna_w[n] for n in names], len(names))
    if any(v.shape != (len(labels),) for v in values):
        raise PlotInputError("each alternative needs one power per band")
    with _rc():
        figure, axes = _figure()
        ax = axes[0, 0]
        x = np.arange(len(labels))
        width = 0.8 / len(names)
        marks = {figure_data.TUNER_UNMATCHED: ([], []), figure_data.TUNER_BYPASSED: ([], [])}
        for n, (name, watts) in enumerate(zip(names, values)):
            centre = x + (n - (len(names) - 1) / 2) * width
            state = np.asarray(tuner_state[name] if tuner_state is not None and name in tuner_state
                               else [""] * len(labels), dtype=object)
            bars = ax.bar(centre, watts, width, color=_colour(n), label=name)
            for bar, s in zip(bars, state):
                if s in marks:
                    bar.set_hatch("//" if s == figure_data.TUNER_UNMATCHED else "..")
                    bar.set_edgecolor("white")
                    marks[s][0].append(bar.get_x() + bar.get_width() / 2)
                    marks[s][1].append(bar.get_height())
        if radio_power_w is not None:
            ax.axhline(radio_power_w, color="black", linestyle="--", linewidth=1.2,
                       label=f"radio {radio_power_w:g} W")
            ax.set_ylim(top=radio_power_w * 1.12)
        for marked, bar_text, style in ((figure_data.TUNER_UNMATCHED, "striped bar", {"marker": "x", "color": "#d62728"}),
                                        (figure_data.TUNER_BYPASSED, "dotted bar", {"marker": "|", "color": "0.3"})):
            if marks[marked][0]:
                ax.plot(*marks[marked], linestyle="none", markersize=8, markeredgewidth=1.6,
                        label=f"{tuner_note(marked)} ({bar_text})", **style)
        ax.set_xticks(x, labels)
        ax.set_xlabel("band")
        ax.set_ylabel("power at the antenna [W]")
        ax.set_title("Watts at the antenna for each alternative", loc="left")
        ax.grid(True, axis="y", alpha=0.3)
        from matplotlib.patches import Patch

        # an alternative's legend entry is a plain patch of its colour, not its first bar (which
        # may be hatched)
        handles, texts = ax.get_legend_handles_labels()
        plain = {name: Patch(facecolor=_colour(n)) for n, name in enumerate(names)}
        ax.legend([plain.get(text, handle) for handle, text in zip(handles, texts)], texts, loc="upper left",
                  bbox_to_anchor=(1.01, 1.0))
        return _save(figure, path, force)


def draw(data, path, *, force=False):
    """Draw what `linecalc.studies.figure_data.figure_data` computed into ``path`` (.png or .svg).

    Raises `PlotProblem` where the file cannot be written (it exists without ``force``, its
    format is not PNG or SVG, its folder is missing).
    """
    try:
        if isinstance(data, figure_data.SwrCurves):
            return plot_swr(path, data.labels, data.frequency_hz, data.swr_antenna, data.swr_radio,
                            tuner_set_hz=data.tuner_set_hz, tuner_state=data.tuner_state, force=force)
        if isinstance(data, figure_data.SmithPoints):
            return plot_smith(path, data.z_antenna_ohm, data.z_radio_ohm, data.z_ref_ohm, data.labels,
                              reference_line=data.reference_line, line_paths=data.line_paths,
                              sweep_labels=data.sweep_labels, sweep_z_antenna_ohm=data.sweep_z_antenna_ohm,
                              sweep_z_radio_ohm=data.sweep_z_radio_ohm, tuner_state=data.tuner_state, force=force)
        if isinstance(data, figure_data.LineVoltage):
            return plot_line_voltage(path, data.labels, data.position_m, data.voltage_v, rating_v=data.rating_v,
                                     line_label=data.line_label, current_a=data.current_a, power_w=data.power_w,
                                     tuner_state=data.tuner_state, force=force)
        if isinstance(data, figure_data.CompareWatts):
            return plot_compare(path, data.labels, data.power_antenna_w, radio_power_w=data.radio_power_w,
                                tuner_state=data.tuner_state, force=force)
        return plot_loss_budget(path, data, force=force)
    except PlotExistsError as exc:
        raise figure_data.PlotProblem(f"{path}: exists; use --force to replace it ({exc})") from None
    except (PlotInputError, FileNotFoundError) as exc:
        raise figure_data.PlotProblem(f"{path}: {exc}") from None
    except (atomic.OutputNotFileError, atomic.OutputWriteError) as exc:
        raise figure_data.PlotProblem(str(exc)) from None


def svg_text(data) -> str:
    """The figure `draw` makes of ``data``, as SVG text to place inside an HTML page.

    The drawing functions write files, so the figure is drawn into a private temporary folder,
    read back and the folder removed. The text starts at the ``<svg`` element: the XML
    declaration, the document type and the metadata block are left out (a page does not need
    them, and the metadata names a web address that nothing should fetch).
    """
    import re
    import tempfile

    with tempfile.TemporaryDirectory(prefix="linecalc-figure-") as folder:
        path = Path(folder) / "figure.svg"
        draw(data, path)
        text = path.read_text(encoding="utf-8")
    text = text[text.index("<svg"):]
    return re.sub(r"<metadata>.*?</metadata>\s*", "", text, count=1, flags=re.DOTALL)
