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
from dataclasses import dataclass
from pathlib import Path

import numpy as np
from linecalc.errors import InputError
from linecalc.io import atomic
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
# Smith-chart grid: constant resistance circles and constant reactance arcs (normalised).
SMITH_R = (0.2, 0.5, 1.0, 2.0, 5.0)  # r = 0 is the rim
SMITH_X = (0.2, 0.5, 1.0, 2.0, 5.0)
# Smallest angle between two point labels around a Smith chart [rad] (about 9 degrees).
SMITH_LABEL_GAP = 0.16
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


def plot_swr(path, labels, frequency_hz, swr_antenna, swr_radio, *, tuner_set_hz=None, force=False):
    """SWR across each band, at the antenna and at the radio, one panel per band.

    Parameters
    ----------
    path : str or Path
        Output file, .png or .svg.
    labels : sequence of str
        Band names, one per panel.
    frequency_hz, swr_antenna, swr_radio : sequence of array_like
        Per band: frequencies [Hz] and the SWR at each end [1] (inf for a total reflection,
        which is not drawn).
    tuner_set_hz : sequence of (float or None), optional
        Per band, where a tuner held across the band was set [Hz] (a dotted vertical line), or None.
    force : bool
        Overwrite an existing file.

    Returns
    -------
    matplotlib.figure.Figure
        Each panel holds two lines, antenna then radio, x in MHz.
    """
    _target(path, force)
    count = len(labels)
    frequency_hz, swr_antenna, swr_radio = (_arrays(name, values, count) for name, values in
                                            (("frequency_hz", frequency_hz), ("swr_antenna", swr_antenna),
                                             ("swr_radio", swr_radio)))
    with _rc():
        from matplotlib.ticker import (
            FixedLocator,
            FuncFormatter,
            MaxNLocator,
            NullLocator,
        )

        columns = min(count, 4)
        rows = -(-count // columns)
        figure, axes = _figure(rows, columns)
        finite = np.concatenate([s[np.isfinite(s)] for s in swr_antenna + swr_radio] + [np.array([2.0])])
        steps = (1, 1.5, 2, 3, 5, 10, 20, 50, 100, 200, 500)
        # the axis ends on the first tick above the data, so that the top of every curve is labelled
        top = next((t for t in steps if t >= float(finite.max()) * 1.05), float(finite.max()) * 1.15)
        ticks = [t for t in steps if t <= top]
        for n, ax in enumerate(axes.flat):
            if n >= count:
                ax.set_visible(False)
                continue
            mhz = frequency_hz[n] / 1e6
            ax.plot(mhz, swr_antenna[n], color=_colour(0), linewidth=2, label="at the antenna")
            ax.plot(mhz, swr_radio[n], color=_colour(1), linewidth=2, linestyle="--", label="at the radio")
            if tuner_set_hz is not None and tuner_set_hz[n] is not None:
                ax.axvline(tuner_set_hz[n] / 1e6, color="black", linewidth=1, linestyle=":",
                           label="tuner set here, then held")
            ax.set_yscale("log")
            ax.set_ylim(SWR_AXIS_BOTTOM, top)  # a little below 1 so that a matched curve shows
            ax.yaxis.set_major_locator(FixedLocator(ticks))
            ax.yaxis.set_major_formatter(FuncFormatter(lambda value, _: f"{value:g}"))
            ax.yaxis.set_minor_locator(NullLocator())
            ax.xaxis.set_major_locator(MaxNLocator(3))
            ax.grid(True, alpha=0.3)
            ax.set_title(labels[n])
            if n % columns == 0:
                ax.set_ylabel("SWR [1]")
            if n >= count - columns:
                ax.set_xlabel("frequency [MHz]")
        legend = {}
        for ax in axes.flat[:count]:
            legend.update(zip(*reversed(ax.get_legend_handles_labels())))
        figure.legend(list(legend.values()), list(legend), loc="outside upper right", ncols=len(legend))
        figure.suptitle("SWR across each band", x=0.02, ha="left")
        return _save(figure, path, force)


@dataclass(frozen=True)
class LossShares:
    """Where the loss goes, per category and row: ``categories`` names; ``loss_db`` and
    ``heat_w`` have shape (categories, rows) [dB], [W]. Columns of ``loss_db`` sum to the total
    loss, columns of ``heat_w`` to the radio's power minus the antenna's."""

    categories: tuple[str, ...]
    loss_db: np.ndarray
    heat_w: np.ndarray


def loss_shares(result) -> LossShares:
    """Split a budget into line matched loss, line mismatch loss, tuner loss and everything else.

    Parameters
    ----------
    result : linecalc.studies.budget.BudgetResult

    Returns
    -------
    LossShares
        In dB: the lines' matched loss; the lines' loss beyond it (their standing waves); the
        tuners' loss; every other element's loss in place. In watts: a line whose output
        carries P_out heats P_out (10^(ML/10) - 1) when matched (ML its matched loss), the rest
        of its heat is the mismatch share; tuners and the other elements, their heat.
    """
    categories = ("line matched loss", "line mismatch loss", "tuner loss", "everything else")
    rows = len(result.labels)
    loss_db, heat_w = np.zeros((4, rows)), np.zeros((4, rows))
    power_out = np.asarray(result.power_radio_w, dtype=float).copy()
    for element in result.elements:
        power_out = power_out - element.dissipated_w
        if element.kind == "line":
            matched_heat = power_out * (10 ** (element.matched_loss_db / 10) - 1)
            loss_db[0] += element.matched_loss_db
            loss_db[1] += element.loss_db - element.matched_loss_db
            heat_w[0] += matched_heat
            heat_w[1] += element.dissipated_w - matched_heat
        else:
            share = 2 if element.kind == "tuner" else 3
            loss_db[share] += element.loss_db
            heat_w[share] += element.dissipated_w
    return LossShares(categories, loss_db, heat_w)


def _stacked(ax, labels, values, categories):
    """Stacked bars, positive shares upward from 0 and negative shares downward; returns the tops."""
    x = np.arange(len(labels))
    up, down = np.zeros(len(labels)), np.zeros(len(labels))
    for n, (name, heights) in enumerate(zip(categories, values)):
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
        downward from zero. The watts panel writes the watts at the antenna above each bar.
    """
    _target(path, force)
    shares = loss_shares(result)
    labels = list(result.labels)
    with _rc():
        figure, axes = _figure(2, 1, sharex=True)
        db_ax, w_ax = axes[:, 0]
        db_tops = _stacked(db_ax, labels, shares.loss_db, shares.categories)
        if np.max(db_tops) > 0:
            db_ax.set_ylim(top=1.1 * float(np.max(db_tops)))
        db_ax.set_ylabel("loss [dB]")
        db_ax.set_title(f"Where the loss goes: {result.station}", loc="left")
        totals = _stacked(w_ax, labels, shares.heat_w, shares.categories)
        w_ax.set_ylabel("heat [W]")
        w_ax.set_title(f"Heat from {result.radio_power_w:g} W at the radio; watts at the antenna above each bar",
                       loc="left")
        for x, (total, delivered) in enumerate(zip(totals, result.power_antenna_w)):
            w_ax.annotate(f"{delivered:.3g} W", (x, max(total, 0.0)), xytext=(0, 3), textcoords="offset points",
                          ha="center", va="bottom", fontsize=10)
        # room for the labels: a fifth above the highest bar (a hundredth of the power if none)
        highest = float(np.max(totals))
        w_ax.set_ylim(top=1.2 * highest if highest > 0 else 0.01 * result.radio_power_w)
        w_ax.set_xlabel("band")
        figure.legend(*db_ax.get_legend_handles_labels(), loc="outside upper center", ncols=4)
        return _save(figure, path, force)


def _smith_grid(ax):
    """Constant-r circles and constant-x arcs of the normalised impedance z = r + jx in the
    reflection plane rho = (z - 1)/(z + 1) (Pozar, Microwave Engineering, 4th ed., section 2.4)."""
    t = np.linspace(0, 2 * np.pi, 361)
    style = {"color": "0.7", "linewidth": 0.7}
    for r in SMITH_R:
        centre, radius = r / (1 + r), 1 / (1 + r)
        ax.plot(centre + radius * np.cos(t), radius * np.sin(t), gid=f"smith-r-{r:g}", **style)
        ax.annotate(f"{r:g}", (centre - radius, 0), xytext=(2, -3), textcoords="offset points",
                    ha="left", va="top", fontsize=10, color="0.35")
    ax.plot(np.cos(t), np.sin(t), color="0.3", linewidth=1.2, gid="smith-rim")
    resistance = np.concatenate([[0.0], np.geomspace(1e-3, 1e3, 300)])
    for x in SMITH_X:
        for sign in (1, -1):
            z = resistance + 1j * sign * x
            rho = (z - 1) / (z + 1)
            ax.plot(rho.real, rho.imag, gid=f"smith-x-{sign * x:+g}", **style)
            edge = (1j * sign * x - 1) / (1j * sign * x + 1)  # where the arc meets the rim
            ax.annotate(f"{sign * x:+g}j", (0.9 * edge.real, 0.9 * edge.imag), ha="center", va="center",
                        fontsize=10, color="0.35")
    ax.plot([-1, 1], [0, 0], **style)


def _spread_angles(angles, gap):
    """Label angles near ``angles`` [rad] at least ``gap`` apart (neighbours pushed apart evenly)."""
    order = np.argsort(angles)
    spread = np.array(angles, dtype=float)[order]
    for _ in range(200):
        deficit = gap - np.diff(spread)
        if np.all(deficit <= 1e-9):
            break
        push = np.where(deficit > 0, deficit / 2, 0.0)
        spread[:-1] -= push
        spread[1:] += push
    out = np.empty_like(spread)
    out[order] = spread
    return out


def _label_around(ax, rho, labels):
    """Each label outside the chart's rim, near its point's direction, with a leader line."""
    angles = _spread_angles(np.angle(rho), SMITH_LABEL_GAP)
    for point, angle, label in zip(rho, angles, labels):
        anchor, text = 1.06 * np.exp(1j * angle), 1.1 * np.exp(1j * angle)
        ax.plot([point.real, anchor.real], [point.imag, anchor.imag], color="0.45", linewidth=0.7)
        ha = "left" if np.cos(angle) > 0.3 else "right" if np.cos(angle) < -0.3 else "center"
        va = "bottom" if np.sin(angle) > 0.3 else "top" if np.sin(angle) < -0.3 else "center"
        ax.annotate(label, (text.real, text.imag), ha=ha, va=va, fontsize=10)


def plot_smith(path, z_antenna_ohm, z_radio_ohm, z_ref_ohm, labels=None, *, force=False):
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
        One per point: the points are markers, the antenna's labelled, each joined to its radio
        point by a dotted line; the labels sit outside the rim, joined to their points. None: the
        points are a sweep, drawn as two curves, each with a dot at its first point.
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
    rho_antenna = (np.asarray(z_antenna_ohm, dtype=complex) - z_ref_ohm) / (np.asarray(z_antenna_ohm) + z_ref_ohm)
    rho_radio = (np.asarray(z_radio_ohm, dtype=complex) - z_ref_ohm) / (np.asarray(z_radio_ohm) + z_ref_ohm)
    if rho_antenna.shape != rho_radio.shape or (labels is not None and len(labels) != rho_antenna.size):
        raise PlotInputError("z_antenna_ohm, z_radio_ohm and labels must have one entry per point")
    with _rc():
        figure, axes = _figure()
        ax = axes[0, 0]
        _smith_grid(ax)
        if labels is not None:
            for a, r in zip(rho_antenna, rho_radio):
                ax.plot([a.real, r.real], [a.imag, r.imag], color=_colour(5), linewidth=0.8, linestyle=":")
            _label_around(ax, rho_antenna, labels)
            style_antenna = {"linestyle": "none", "marker": "o", "markersize": 8}
            style_radio = {"linestyle": "none", "marker": "s", "markersize": 7, "markerfacecolor": "white",
                           "markeredgewidth": 2}
        else:
            # a dot marks where each curve starts (the first frequency)
            style_antenna = {"linewidth": 2, "marker": "o", "markevery": [0]}
            style_radio = {"linewidth": 2, "linestyle": "--", "marker": "o", "markevery": [0]}
        ax.plot(rho_antenna.real, rho_antenna.imag, color=_colour(0), label="at the antenna", **style_antenna)
        ax.plot(rho_radio.real, rho_radio.imag, color=_colour(5), label="at the radio", **style_radio)
        ax.set_aspect("equal")
        ax.set_xlim(-1.32, 1.32)
        ax.set_ylim(-1.25, 1.25)
        ax.set_xlabel(f"Re ρ [1], ρ = (Z − {z_ref_ohm:g} Ω)/(Z + {z_ref_ohm:g} Ω)")
        ax.set_ylabel("Im ρ [1]")
        ax.set_title(f"Impedance on a Smith chart, normalised to {z_ref_ohm:g} Ω (circles: r, arcs: x)")
        ax.legend(loc="upper left", bbox_to_anchor=(1.02, 1.0))
        return _save(figure, path, force)


def plot_line_voltage(path, labels, position_m, voltage_v, *, rating_v=None, line_label="feedline",
                      force=False):
    """RMS voltage magnitude along a feedline, one curve per band.

    Parameters
    ----------
    path : str or Path
        Output file, .png or .svg.
    labels : sequence of str
        Band names, one per curve.
    position_m, voltage_v : sequence of array_like
        Per band: distance from the radio end of the line [m] and |V| there [V, RMS] (see
        `linecalc.physics.length_scan.voltage_along_line`).
    rating_v : float or None
        The cable's voltage rating [V], drawn as a dashed line when given.
    line_label : str
        Name of the line, for the title.
    force : bool
        Overwrite an existing file.

    Returns
    -------
    matplotlib.figure.Figure
        One line per band in order, then the rating line if any.
    """
    _target(path, force)
    count = len(labels)
    position_m, voltage_v = _arrays("position_m", position_m, count), _arrays("voltage_v", voltage_v, count)
    with _rc():
        figure, axes = _figure()
        ax = axes[0, 0]
        for n in range(count):
            ax.plot(position_m[n], voltage_v[n], color=_colour(n), linewidth=2, label=labels[n])
        if rating_v is not None:
            ax.axhline(rating_v, color="black", linestyle="--", linewidth=1.2, label=f"cable rating {rating_v:g} V")
        ax.set_ylim(bottom=0)
        ax.set_xlim(min(float(p.min()) for p in position_m), max(float(p.max()) for p in position_m))
        ax.set_xlabel("distance from the radio end of the line [m]")
        ax.set_ylabel("voltage [V RMS]")
        ax.set_title(f"Voltage along the {line_label}", loc="left")
        ax.grid(True, alpha=0.3)
        ax.legend(loc="upper left", bbox_to_anchor=(1.01, 1.0))
        figure.text(0.01, 0.005, VOLTAGE_CAUTION, fontsize=10, color="0.25", ha="left", va="bottom")
        figure.get_layout_engine().set(h_pad=0.3)
        return _save(figure, path, force)


def plot_compare(path, labels, power_antenna_w, *, radio_power_w=None, force=False):
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
    force : bool
        Overwrite an existing file.

    Returns
    -------
    matplotlib.figure.Figure
        One BarContainer per alternative, in the mapping's order.
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
        for n, (name, watts) in enumerate(zip(names, values)):
            ax.bar(x + (n - (len(names) - 1) / 2) * width, watts, width, color=_colour(n), label=name)
        if radio_power_w is not None:
            ax.axhline(radio_power_w, color="black", linestyle="--", linewidth=1.2,
                       label=f"radio {radio_power_w:g} W")
            ax.set_ylim(top=radio_power_w * 1.12)
        ax.set_xticks(x, labels)
        ax.set_xlabel("band")
        ax.set_ylabel("power at the antenna [W]")
        ax.set_title("Watts at the antenna for each alternative", loc="left")
        ax.grid(True, axis="y", alpha=0.3)
        ax.legend(loc="upper left", bbox_to_anchor=(1.01, 1.0))
        return _save(figure, path, force)


def draw(data, path, *, force=False):
    """Draw what `linecalc.studies.figure_data.figure_data` computed into ``path`` (.png or .svg).

    Raises `PlotProblem` where the file cannot be written (it exists without ``force``, its
    format is not PNG or SVG, its folder is missing).
    """
    try:
        if isinstance(data, figure_data.SwrCurves):
            return plot_swr(path, data.labels, data.frequency_hz, data.swr_antenna, data.swr_radio,
                            tuner_set_hz=data.tuner_set_hz, force=force)
        if isinstance(data, figure_data.SmithPoints):
            return plot_smith(path, data.z_antenna_ohm, data.z_radio_ohm, data.z_ref_ohm, data.labels, force=force)
        if isinstance(data, figure_data.LineVoltage):
            return plot_line_voltage(path, data.labels, data.position_m, data.voltage_v, rating_v=data.rating_v,
                                     line_label=data.line_label, force=force)
        if isinstance(data, figure_data.CompareWatts):
            return plot_compare(path, data.labels, data.power_antenna_w, radio_power_w=data.radio_power_w,
                                force=force)
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
