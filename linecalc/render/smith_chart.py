"""The Smith chart of ``linecalc plot smith``: the impedance at the antenna and at the radio, each
line's path along its spiral, and with a sweep each band's traces.

Drawn with the helpers of `linecalc.render.plots` (no pyplot; matplotlib imported inside the
functions that draw).
"""
from __future__ import annotations

import numpy as np

# Smith-chart grid: constant resistance circles and constant reactance arcs (normalised).
SMITH_R = (0.2, 0.5, 1.0, 2.0, 5.0)  # r = 0 is the rim
SMITH_X = (0.2, 0.5, 1.0, 2.0, 5.0)
# The point labels stand in two columns beside the chart, right of it for points with
# Re rho >= 0 and left of it for the others, at least this far apart vertically [in rho]: about
# 1.6 lines of 10-point text on a chart 2.5 rho high drawn some 430 pixels high.
LABEL_COLUMN_X = 1.12
LEADER_ELBOW_X = 1.03  # where a label's leader turns from level toward its label [rho]
LABEL_GAP = 0.105
# Horizontal room for the label columns [rho]: the axes span this either side of the centre.
CHART_HALF_WIDTH = 1.6
PATH_COLOURS = (2, 1, 6, 8)  # palette entries of the lines' paths (the points and sweeps use 0, 3, 4, 5)
TUNER_NOTES = {"bypassed": "tuner in bypass", "cannot match": "tuner cannot match"}


def rho_of(z_ohm, z_ref_ohm):
    """Reflection coefficient (Z - Z_ref)/(Z + Z_ref) (Pozar, Microwave Engineering, 4th ed., section 2.3)."""
    z = np.asarray(z_ohm, dtype=complex)
    return (z - z_ref_ohm) / (z + z_ref_ohm)


def smith_grid(ax):
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


def column_heights(wanted, gap, low=-1.2, high=1.2):
    """Heights near ``wanted`` (in their order), at least ``gap`` apart, inside [low, high] where
    there is room: each is pushed up past its lower neighbour, then the column is shifted down as
    a whole if it ran past ``high``."""
    order = np.argsort(wanted, kind="stable")
    placed = np.array(wanted, dtype=float)[order]
    for k in range(1, placed.size):
        placed[k] = max(placed[k], placed[k - 1] + gap)
    if placed.size and placed[-1] > high:
        placed -= min(placed[-1] - high, max(placed[0] - low, 0.0))
        for k in range(placed.size - 2, -1, -1):  # pushed down by the shift: keep the gaps
            placed[k] = min(placed[k], placed[k + 1] - gap)
    out = np.empty_like(placed)
    out[order] = placed
    return out


def label_columns(ax, rho, labels):
    """Each label in a column beside the chart (right for Re rho >= 0, left otherwise), no two
    closer than LABEL_GAP, joined to its point by a leader line that runs level to just past the
    rim, then to its label (leaders never cross). Returns the label texts."""
    texts = []
    right = rho.real >= 0
    for side, sign in ((right, 1.0), (~right, -1.0)):
        if not np.any(side):
            continue
        heights = column_heights(rho.imag[side], LABEL_GAP)
        for point, height, label in zip(rho[side], heights, np.asarray(labels, dtype=object)[side]):
            x = sign * LABEL_COLUMN_X
            # level to just past the rim, then to the label: the levels keep the order of the
            # heights, so that no two leaders cross
            ax.plot([point.real, sign * LEADER_ELBOW_X, x - sign * 0.03], [point.imag, point.imag, height],
                    color="0.45", linewidth=0.7, gid=f"smith-leader-{len(texts)}")  # ids are unique in an SVG
            texts.append(ax.annotate(label, (x, height), ha="left" if sign > 0 else "right", va="center",
                                     fontsize=10, annotation_clip=False))
    return texts


def draw_smith(ax, data, colour):
    """Draw `linecalc.studies.figure_data.SmithPoints` on ``ax``; ``colour(n)`` is the palette.

    The antenna's points are labelled (with what the tuner did where it is not simply matched),
    each line's path along its spiral joins its antenna end to its radio end, and the radio's
    points come last: the axes' last two lines are the antenna's and the radio's rho."""
    z_ref = data.z_ref_ohm
    rho_antenna, rho_radio = rho_of(data.z_antenna_ohm, z_ref), rho_of(data.z_radio_ohm, z_ref)
    smith_grid(ax)
    for n, (label, rho) in enumerate(data.line_paths):
        for k in range(rho.shape[1]):
            ax.plot(rho[:, k].real, rho[:, k].imag, color=colour(PATH_COLOURS[n % len(PATH_COLOURS)]), linewidth=1.0,
                    alpha=0.8,
                    gid=f"line-path-{n}-{k}", label=f"along {label},\nantenna end to radio end" if k == 0 else None)
    if data.sweep_labels is not None:
        for n, (za, zr) in enumerate(zip(data.sweep_z_antenna_ohm, data.sweep_z_radio_ohm)):
            a, r = rho_of(za, z_ref), rho_of(zr, z_ref)
            ax.plot(a.real, a.imag, color=colour(4), linewidth=1.6, gid=f"sweep-antenna-{n}",
                    label="across each band, at the antenna" if n == 0 else None)
            ax.plot(r.real, r.imag, color=colour(3), linewidth=1.6, linestyle="--", gid=f"sweep-radio-{n}",
                    label="across each band, at the radio" if n == 0 else None)
    state = data.tuner_state if data.tuner_state is not None else [""] * rho_antenna.size
    if data.labels is not None:
        labels = [label + (f" ({TUNER_NOTES[s]})" if s else "") for label, s in zip(data.labels, state)]
        label_columns(ax, rho_antenna, labels)
    unmatched = np.asarray([s == "cannot match" for s in state], dtype=bool)
    if np.any(unmatched):
        ax.plot(rho_radio.real[unmatched], rho_radio.imag[unmatched], linestyle="none", marker="o", markersize=15,
                markerfacecolor="none", markeredgecolor="#d62728", markeredgewidth=1.5, label="tuner cannot match")
    ax.plot(rho_antenna.real, rho_antenna.imag, color=colour(0), label="at the antenna", linestyle="none",
            marker="o", markersize=8)
    ax.plot(rho_radio.real, rho_radio.imag, color=colour(5), label="at the radio", linestyle="none", marker="s",
            markersize=7, markerfacecolor="white", markeredgewidth=2)
    ax.set_aspect("equal")
    ax.set_xlim(-CHART_HALF_WIDTH, CHART_HALF_WIDTH)
    ax.set_ylim(-1.25, 1.25)
    ax.set_xlabel(f"Re ρ, where ρ = (Z − {z_ref:g} Ω)/(Z + {z_ref:g} Ω)")
    ax.set_ylabel("Im ρ")
    against = (f"{z_ref:g} Ω, the nominal impedance of {data.reference_line}" if data.reference_line
               else f"{z_ref:g} Ω, the station's reference impedance")
    ax.set_title(f"Smith chart normalised to {against}\n(circles: constant r, arcs: constant x)", fontsize=11)
