"""Tests of linecalc.render.plots: each file is a valid PNG or SVG of the stated size, the drawn data are
the computed data (read back from the artists), and files are written atomically.

File formats are checked against their specifications: PNG, ISO/IEC 15948:2004 (W3C PNG
Specification, 2nd ed.), section 5.2 (signature) and 11.2.2 (IHDR: width and height, 4-byte
big-endian); SVG, W3C SVG 1.1 (2nd ed.), section 5.1 (the svg element, its width and height).
"""
from __future__ import annotations

import struct
import subprocess
import sys
from xml.etree import ElementTree

import numpy as np
import pytest

from linecalc.studies.station import Station
from linecalc.physics import length_scan as advisor
from linecalc.physics import bands
from linecalc.studies import budget
from linecalc.physics import cables
from linecalc import elements
from linecalc.physics import loads
from linecalc.render import plots
from linecalc.physics import matching as tuner

PNG_SIGNATURE = b"\x89PNG\r\n\x1a\n"  # ISO/IEC 15948, section 5.2
DB_PER_NEPER = 20 * np.log10(np.e)    # 20 log10(e) dB per neper (definition of the neper)
# Sensible sizes for a 1000 x 600 chart: a blank PNG of that size is about 3 kB, a photograph
# several MB; line art with text lands between.
PNG_BYTES = (10_000, 1_000_000)
SVG_BYTES = (10_000, 3_000_000)

COAX = cables.cable_from_points("test-coax", "50-ohm test coax", "coax", 50.0, 0.66, [1e6, 10e6, 100e6],
                                [0.007, 0.022, 0.072])
LADDER = cables.two_wire_from_geometry("test-ladder", "two-wire test line", wire_diameter_m=1.6e-3,
                                       spacing_m=25e-3, relative_permittivity=1.2, loss_tangent=1e-4)
PARTS = tuner.TunerParts(10e-12, 500e-12, 0.05e-6, 30e-6)
BANDS = [bands.band(name, 1) for name in ("80m", "40m", "30m", "20m", "17m", "15m", "12m", "10m")]
CENTRES_HZ = np.array([b.centre_hz for b in BANDS])
LABELS = tuple(b.name for b in BANDS)


def invented_doublet_ohm(frequency_hz):
    """Invented demo data with the usual shape of a 40 m long doublet: 600 ohm x coth(gamma h),
    h = 20 m. Not a model of a real antenna and not a measurement."""
    beta = 2 * np.pi * frequency_hz / 299_792_458.0
    alpha = 0.117 / 20.0 * np.sqrt(frequency_hz / 3.75e6)
    return 600.0 / np.tanh((alpha + 1j * beta) * 20.0)


def solve(frequency_hz, feed, labels=None):
    table_hz = np.linspace(1.8e6, 30e6, 400)
    station = Station(
        name="Orchard doublet (invented)", radio_power_w=100.0, reference_impedance_ohm=50.0,
        labels=labels or tuple(f"{f / 1e6:.4f} MHz" for f in frequency_hz), frequency_hz=frequency_hz,
        antenna=loads.ImpedanceTable(table_hz, invented_doublet_ohm(table_hz)), feed=tuple(feed))
    return budget.solve_budget(station)


COAX_FEED = (elements.Meter("meter", 50.0), elements.Tuner("tuner", "T", PARTS, 50.0),
             elements.Line(COAX, 25.0, "coax"), elements.Connector("connectors", 0.05, 50.0, 2))
LADDER_FEED = (elements.Tuner("tuner", "T", PARTS, 50.0, output_balanced=True),
               elements.Line(LADDER, 18.0, "window line"))


@pytest.fixture(scope="module")
def coax_result():
    return solve(CENTRES_HZ, COAX_FEED, LABELS)


@pytest.fixture(scope="module")
def ladder_result():
    return solve(CENTRES_HZ, LADDER_FEED, LABELS)


def check_png(path):
    data = path.read_bytes()
    assert data[:8] == PNG_SIGNATURE
    assert data[12:16] == b"IHDR"                       # the first chunk, section 11.2.2
    width, height = struct.unpack(">II", data[16:24])
    assert (width, height) == (1000, 600)                # 10 x 6 in at 100 dpi
    assert PNG_BYTES[0] < len(data) < PNG_BYTES[1]


def check_svg(path):
    data = path.read_bytes()
    root = ElementTree.fromstring(data)
    assert root.tag == "{http://www.w3.org/2000/svg}svg"
    assert (root.get("width"), root.get("height")) == ("720pt", "432pt")   # 10 x 6 in at 72 pt/in
    assert SVG_BYTES[0] < len(data) < SVG_BYTES[1]


def check_file(path):
    (check_png if path.suffix == ".png" else check_svg)(path)
    assert [p.name for p in path.parent.iterdir() if p.name.startswith(".")] == []  # no temporary left


# --- (a) SWR across each band --------------------------------------------------------------

@pytest.mark.parametrize("suffix", [".png", ".svg"])
def test_swr_plot(tmp_path, suffix):
    sweeps = [np.linspace(b.low_hz, b.high_hz, 21) for b in BANDS]
    results = [solve(f, LADDER_FEED) for f in sweeps]
    path = tmp_path / f"swr{suffix}"
    figure = plots.plot_swr(path, LABELS, sweeps, [r.swr_antenna for r in results], [r.swr_radio for r in results])
    check_file(path)
    panels = [ax for ax in figure.axes if ax.get_visible()]
    assert len(panels) == len(BANDS)
    for ax, f, r, label in zip(panels, sweeps, results, LABELS):
        antenna, radio = ax.lines
        np.testing.assert_array_equal(antenna.get_xdata(), f / 1e6)
        np.testing.assert_array_equal(antenna.get_ydata(), r.swr_antenna)
        np.testing.assert_array_equal(radio.get_ydata(), r.swr_radio)
        assert ax.get_title() == label
    assert "[MHz]" in panels[-1].get_xlabel() and "SWR" in panels[0].get_ylabel()


# --- (b) the loss budget -------------------------------------------------------------------

def test_loss_budget_plot(tmp_path, coax_result):
    path = tmp_path / "budget.png"
    figure = plots.plot_loss_budget(path, coax_result)
    check_file(path)
    db_ax, w_ax = figure.axes[:2]
    shares = plots.loss_shares(coax_result)
    assert len(db_ax.containers) == len(w_ax.containers) == len(shares.categories)
    assert shares.categories[:3] == ("line matched loss", "line mismatch loss", "tuner loss")
    db_heights = np.array([[bar.get_height() for bar in c] for c in db_ax.containers])
    w_heights = np.array([[bar.get_height() for bar in c] for c in w_ax.containers])
    # a stacked bar stores its top and bottom, so its height comes back to rounding
    np.testing.assert_allclose(db_heights, shares.loss_db, rtol=1e-12, atol=1e-14)
    np.testing.assert_allclose(w_heights, shares.heat_w, rtol=1e-12, atol=1e-12)
    # the stacks add up to the budget's own totals: dB to the total loss, watts to the radio's
    # power less the antenna's (energy balance)
    np.testing.assert_allclose(db_heights.sum(axis=0), coax_result.total_loss_db, atol=1e-9)
    np.testing.assert_allclose(w_heights.sum(axis=0), coax_result.power_radio_w - coax_result.power_antenna_w,
                               atol=1e-9)
    # the line's matched share is 20 log10(e) alpha l (Pozar, Microwave Engineering, 4th ed.,
    # section 2.7), alpha from the cable's own propagation constant
    _, gamma = COAX.constants(CENTRES_HZ)
    np.testing.assert_allclose(db_heights[0], DB_PER_NEPER * gamma.real * 25.0, rtol=1e-12)
    # a matched line of matched loss ML heats P_out (10^(ML/10) - 1) (definition of the dB)
    line = next(e for e in coax_result.elements if e.kind == "line")
    power_out = coax_result.power_radio_w - sum(e.dissipated_w for e in coax_result.elements[:3])
    np.testing.assert_allclose(w_heights[0], power_out * (10 ** (line.matched_loss_db / 10) - 1), rtol=1e-12)
    labels = [t.get_text() for t in w_ax.get_xticklabels()]
    assert labels == list(LABELS)
    annotations = [t.get_text() for t in w_ax.texts]
    assert annotations == [plots.si_watts(p) for p in coax_result.power_antenna_w]
    assert "[dB]" in db_ax.get_ylabel() and "[W]" in w_ax.get_ylabel()


def test_negative_share_drawn_downward(tmp_path):
    # A short coax into a high impedance: its current is small all along, so it heats less than
    # when matched and its mismatch share is negative (the closed-form total-loss formula,
    # ARRL Antenna Book, transmission-line chapter, averages this phase effect away).
    result = solve(np.array([7.1e6]), (elements.Line(COAX, 0.5, "jumper"),), ("40m",))
    shares = plots.loss_shares(result)
    assert shares.loss_db[1, 0] < 0
    figure = plots.plot_loss_budget(tmp_path / "short.svg", result)
    mismatch_bar = figure.axes[0].containers[1][0]
    assert mismatch_bar.get_height() < 0 and mismatch_bar.get_y() == 0.0


# --- (c) the Smith chart -------------------------------------------------------------------

def test_smith_chart(tmp_path, ladder_result):
    path = tmp_path / "smith.png"
    figure = plots.plot_smith(path, ladder_result.z_antenna_ohm, ladder_result.z_radio_ohm, 50.0, LABELS)
    check_file(path)
    ax = figure.axes[0]
    antenna, radio = ax.lines[-2:]
    # rho = (Z - Z0)/(Z + Z0), Pozar, Microwave Engineering, 4th ed., section 2.3
    z = ladder_result.z_antenna_ohm
    np.testing.assert_allclose(antenna.get_xdata(), ((z - 50) / (z + 50)).real, atol=1e-15)
    np.testing.assert_allclose(antenna.get_ydata(), ((z - 50) / (z + 50)).imag, atol=1e-15)
    z = ladder_result.z_radio_ohm
    np.testing.assert_allclose(radio.get_xdata(), ((z - 50) / (z + 50)).real, atol=1e-15)
    assert sorted(t.get_text() for t in ax.texts if t.get_text() in LABELS) == sorted(LABELS)


def test_smith_grid_is_the_chart(tmp_path, ladder_result):
    # Every point of a constant-r circle maps back to z = (1 + rho)/(1 - rho) with Re z = r,
    # every point of a constant-x arc to Im z = x (Pozar, 4th ed., section 2.4, the Smith chart).
    figure = plots.plot_smith(tmp_path / "grid.svg", ladder_result.z_antenna_ohm, ladder_result.z_radio_ohm, 50.0)
    grid = {line.get_gid(): line for line in figure.axes[0].lines if line.get_gid()}
    assert {f"smith-r-{r:g}" for r in plots.SMITH_R} <= set(grid)
    for gid, line in grid.items():
        rho = line.get_xdata() + 1j * line.get_ydata()
        away = np.abs(1 - rho) > 1e-3   # the open circuit, where every circle and arc meets
        z = (1 + rho[away]) / (1 - rho[away])
        if gid.startswith("smith-r-"):
            np.testing.assert_allclose(z.real, float(gid[8:]), rtol=1e-9)
        elif gid.startswith("smith-x-"):
            np.testing.assert_allclose(z.imag, float(gid[8:]), rtol=1e-9)
        else:
            np.testing.assert_allclose(np.abs(rho), 1.0, rtol=1e-12)


def test_smith_needs_impedances(tmp_path):
    with pytest.raises(plots.PlotInputError):
        plots.plot_smith(tmp_path / "x.png", None, None, 50.0)


# --- (d) voltage along the feedline --------------------------------------------------------

def test_voltage_plot(tmp_path, ladder_result):
    z0, gamma = LADDER.constants(CENTRES_HZ)
    node = 1  # the line's input, after the tuner
    position, voltage = advisor.voltage_along_line(z0, gamma, 18.0, ladder_result.solution.voltage_v[node],
                                                   ladder_result.solution.current_a[node], 181)
    # the far end of the profile is the antenna's node of the path solution (an independent
    # chain-matrix cascade, Pozar, 4th ed., section 4.4)
    np.testing.assert_allclose(voltage[-1], np.abs(ladder_result.solution.voltage_v[-1]), rtol=1e-9)
    path = tmp_path / "voltage.png"
    figure = plots.plot_line_voltage(path, LABELS, [position] * len(LABELS), list(voltage.T), rating_v=1000.0)
    check_file(path)
    ax = figure.axes[0]
    for line, expected in zip(ax.lines, voltage.T):
        np.testing.assert_array_equal(line.get_xdata(), position)
        np.testing.assert_array_equal(line.get_ydata(), expected)
    # a rating above every voltage is a margin note, not a line on the scale
    assert len(ax.lines) == len(LABELS) and any("cable rating 1,000 V" in t.get_text() for t in ax.texts)
    assert "[m]" in ax.get_xlabel() and "[V" in ax.get_ylabel()
    assert any("kill" in t.get_text() for t in figure.texts)  # the usual caution


# --- (e) compare ---------------------------------------------------------------------------

def test_compare_plot(tmp_path, coax_result, ladder_result):
    alternatives = {"window line 18 m": ladder_result.power_antenna_w, "coax 25 m": coax_result.power_antenna_w}
    path = tmp_path / "compare.svg"
    figure = plots.plot_compare(path, LABELS, alternatives, radio_power_w=100.0)
    check_file(path)
    ax = figure.axes[0]
    assert len(ax.containers) == 2
    for container, watts in zip(ax.containers, alternatives.values()):
        np.testing.assert_array_equal([bar.get_height() for bar in container], watts)
    centres = [[bar.get_x() + bar.get_width() / 2 for bar in c] for c in ax.containers]
    assert np.all(np.array(centres[0]) < np.array(centres[1]))  # grouped side by side per band
    assert [t.get_text() for t in ax.get_legend().get_texts()][-2:] == list(alternatives)
    assert "[W]" in ax.get_ylabel()


def test_compare_needs_alternatives(tmp_path):
    with pytest.raises(plots.PlotInputError):
        plots.plot_compare(tmp_path / "x.png", LABELS, {})


# --- writing -------------------------------------------------------------------------------

def test_refuses_to_overwrite_unless_forced(tmp_path, coax_result):
    path = tmp_path / "budget.png"
    path.write_bytes(b"keep me")
    with pytest.raises(plots.PlotExistsError):
        plots.plot_loss_budget(path, coax_result)
    assert issubclass(plots.PlotExistsError, FileExistsError)
    assert path.read_bytes() == b"keep me"
    plots.plot_loss_budget(path, coax_result, force=True)
    check_file(path)


def test_bad_format_and_missing_folder(tmp_path, coax_result):
    with pytest.raises(plots.PlotInputError):
        plots.plot_loss_budget(tmp_path / "budget.pdf", coax_result)
    from linecalc.io.atomic import OutputWriteError

    with pytest.raises(OutputWriteError, match="No such file or directory"):
        plots.plot_loss_budget(tmp_path / "missing" / "budget.png", coax_result)
    assert list(tmp_path.iterdir()) == []


def test_importing_plots_does_not_import_matplotlib():
    code = "import sys, linecalc.render.plots; print('matplotlib' in sys.modules)"
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == "False"
