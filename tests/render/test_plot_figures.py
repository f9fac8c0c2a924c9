"""What each figure of ``linecalc plot`` shows, read back from the matplotlib artists in-process:
no empty panels, ticks and labels that do not overlap, the Smith chart's sweep, spiral and
reference, the voltage scale, legends of the parts that exist, SI power labels, tuner marks, and
compare options. Overlap is judged on the drawn figure's bounding boxes (Agg renderer)."""
from __future__ import annotations

import numpy as np
import pytest

import linecalc
from linecalc.render import plots
from linecalc.studies import figure_data as fd

# A station with a choke losing 9.9 dB (a burnt one) and no tuner, at legal-limit power.
CHOKED = """\
name: Lossy choke test
radio: {power: 1.5 kW}
frequencies: [7.1 MHz, 14.2 MHz]
antenna:
  impedance: {7.1 MHz: 50+j0, 14.2 MHz: 55+j10}
feed:
  - connector: {label: plugs, count: 2, loss: 0.05 dB}
  - line: {label: coax, cable: rg-213, length: 20 m}
  - choke: {label: burnt choke, loss: 9.9 dB}
"""

LONG = """\
name: Very long line test
region: 1
radio: {power: 100 W}
bands: [40m]
antenna:
  impedance: {7.0 MHz: 50+j0, 7.3 MHz: 50+j0}
feed:
  - line: {label: very long coax, cable: rg-213, length: 1000 km}
"""

SHORTED = LONG.replace("50+j0", "0+j0").replace("1000 km", "20 m")


def station(text, name="figure-test.yaml"):
    from linecalc.io.station_file import parse_station_text

    return parse_station_text(text, name)


def draw(kind, st, tmp_path, **options):
    return linecalc.draw_figure(kind, st, tmp_path / f"{kind}.png", force=True, **options)


def boxes_overlap(a, b):
    return a.x0 < b.x1 and b.x0 < a.x1 and a.y0 < b.y1 and b.y0 < a.y1


def rendered(figure):
    from matplotlib.backends.backend_agg import FigureCanvasAgg

    canvas = FigureCanvasAgg(figure)
    canvas.draw()
    return canvas.get_renderer()


# --- swr -----------------------------------------------------------------------------------

@pytest.mark.parametrize("name", ["hilltop-dipole.yaml", "shack-reading.yaml"])
def test_swr_of_explicit_frequencies_has_no_empty_panel(tmp_path, data_path, name):
    figure = draw("swr", linecalc.load_station(data_path(name)), tmp_path, sweep_points=11)
    panels = [ax for ax in figure.axes if ax.get_visible()]
    assert panels
    for ax in panels:
        drawn = [line for line in ax.lines if np.isfinite(np.asarray(line.get_ydata(), dtype=float)).any()]
        # a single point shows only as a marker; a curve needs two points
        assert any(line.get_marker() not in ("None", "", None) or len(line.get_ydata()) > 1 for line in drawn), \
            ax.get_title()
    assert panels[0].get_ylabel() == "SWR"


def test_swr_of_a_shorted_antenna_draws_the_radio_end(tmp_path):
    # a short at the antenna: the SWR there is infinite (not drawn); through 20 m of lossy coax
    # the radio sees a finite one, which is drawn
    figure = draw("swr", station(SHORTED), tmp_path, sweep_points=5)
    antenna, radio = figure.axes[0].lines[:2]
    assert not np.isfinite(antenna.get_ydata()).any() and np.isfinite(radio.get_ydata()).all()


def test_swr_nothing_to_draw_in_the_renderer(tmp_path):
    with pytest.raises(plots.PlotInputError, match="nothing to draw"):
        plots.plot_swr(tmp_path / "x.png", ["40m"], [np.array([7.0e6, 7.2e6])], [np.array([np.inf, np.inf])],
                       [np.array([np.inf, np.inf])])


def test_swr_tick_labels_do_not_overlap_in_small_panels(tmp_path):
    # eight panels in two rows, SWR up to 40: ticks 1, 1.5, 2, 3 crowd a short log axis
    f = [np.linspace(7.0e6, 7.2e6, 5)] * 8
    swr = [np.array([1.0, 1.4, 2.1, 9.0, 40.0])] * 8
    figure = plots.plot_swr(tmp_path / "swr.png", [f"b{n}" for n in range(8)], f, swr, swr)
    renderer = rendered(figure)
    for ax in figure.axes:
        if not ax.get_visible():
            continue
        labels = [t for t in ax.yaxis.get_ticklabels() if t.get_visible() and t.get_text()]
        assert len(labels) >= 2
        extents = [t.get_window_extent(renderer) for t in labels]
        for i in range(len(extents)):
            for j in range(i + 1, len(extents)):
                assert not boxes_overlap(extents[i], extents[j]), (labels[i].get_text(), labels[j].get_text())
        assert "[1]" not in ax.get_ylabel()


# --- smith ---------------------------------------------------------------------------------

def test_smith_with_a_sweep_draws_each_band_across_it(tmp_path, data_path):
    st = linecalc.load_station(data_path("orchard-doublet.yaml"))
    plain = draw("smith", st, tmp_path)
    swept = draw("smith", st, tmp_path, sweep_points=11, sweep_smith=True)
    traces = [line for line in swept.axes[0].lines if (line.get_gid() or "").startswith("sweep-antenna-")]
    assert len(traces) == len(st.labels) and all(len(t.get_xdata()) == 11 for t in traces)
    assert not [line for line in plain.axes[0].lines if (line.get_gid() or "").startswith("sweep-")]


def test_smith_sweep_option_reaches_the_chart(cli, data_path, tmp_path):
    station_path = data_path("hilltop-dipole.yaml")
    assert cli("plot", station_path, "smith", tmp_path / "a.svg")[0] == 0
    assert cli("plot", station_path, "smith", tmp_path / "b.svg", "--sweep", "5")[0] == 0
    plain, swept = (tmp_path / "a.svg").read_text(), (tmp_path / "b.svg").read_text()
    assert "sweep-antenna-0" in swept and "sweep-antenna-0" not in plain  # the traces' gid in the SVG


def test_smith_path_runs_along_the_line_from_antenna_to_radio_end(tmp_path, data_path):
    st = linecalc.load_station(data_path("orchard-doublet.yaml"))
    figure = draw("smith", st, tmp_path)
    result = linecalc.solve_budget(st)
    k = next(i for i, e in enumerate(st.feed) if e.kind == "line")
    z_ref = st.feed[k].cable.z0_nominal_ohm
    # the ends of each row's path are the path solver's nodes (an independent chain-matrix
    # cascade, Pozar, Microwave Engineering, 4th ed., section 4.4): the antenna, then the line's
    # input, rho = (Z - Z_ref)/(Z + Z_ref) (section 2.3)
    z_in = result.solution.state_v[k] / result.solution.state_i[k]
    for row in range(len(st.labels)):
        path = next(line for line in figure.axes[0].lines if line.get_gid() == f"line-path-0-{row}")
        rho = path.get_xdata() + 1j * path.get_ydata()
        assert len(rho) > 20  # a curve, not a straight segment
        za = result.z_antenna_ohm[row]
        np.testing.assert_allclose(rho[0], (za - z_ref) / (za + z_ref), atol=1e-9)
        np.testing.assert_allclose(rho[-1], (z_in[row] - z_ref) / (z_in[row] + z_ref), atol=1e-9)
    # normalised to the window line the antenna feeds, and saying so
    assert "450 Ω" in figure.axes[0].get_title() and "window line" in figure.axes[0].get_title()


@pytest.mark.parametrize("spread", [0.0, 1.0])
def test_smith_labels_do_not_overlap(tmp_path, spread):
    # ten invented doublet-like impedances of 1.5 to 6 kohm near resonance, all close to the
    # open-circuit point of a 50-ohm chart, with long labels
    z = np.linspace(1500, 6000, 10) + 1j * spread * np.linspace(-900, 900, 10)
    names = [f"{f:.3f} MHz" for f in np.linspace(7.0, 7.2, 10)]
    figure = plots.plot_smith(tmp_path / "s.png", z, np.full(10, 50 + 0j), 50.0, names)
    renderer = rendered(figure)
    labels = [t for t in figure.axes[0].texts if t.get_text() in names]
    assert len(labels) == 10
    extents = [t.get_window_extent(renderer) for t in labels]
    for i in range(len(extents)):
        for j in range(i + 1, len(extents)):
            assert not boxes_overlap(extents[i], extents[j]), (labels[i].get_text(), labels[j].get_text())


def segments_cross(p, q):
    """Whether two segments ((x, y), (x, y)) cross at a point inside both (orientation test,
    Cormen et al., Introduction to Algorithms, 3rd ed., section 33.1)."""
    def side(a, b, c):
        return np.sign((b[0] - a[0]) * (c[1] - a[1]) - (b[1] - a[1]) * (c[0] - a[0]))

    (a, b), (c, d) = p, q
    return side(a, b, c) * side(a, b, d) < 0 and side(c, d, a) * side(c, d, b) < 0


@pytest.mark.parametrize("z_ref_ohm", [50.0, 450.0])
def test_smith_label_leaders_do_not_cross(tmp_path, data_path, z_ref_ohm):
    # the test doublet's eight bands crowd the open-circuit point of a 50-ohm chart
    result = linecalc.solve_budget(linecalc.load_station(data_path("orchard-doublet.yaml")))
    figure = plots.plot_smith(tmp_path / "s.png", result.z_antenna_ohm, result.z_radio_ohm, z_ref_ohm,
                              list(result.labels))
    leaders = [line for line in figure.axes[0].lines if line.get_color() == "0.45"]  # the leaders' grey
    assert len(leaders) == len(result.labels)
    pieces = [[list(zip(line.get_xdata(), line.get_ydata()))[k:k + 2] for k in range(len(line.get_xdata()) - 1)]
              for line in leaders]
    for i in range(len(pieces)):
        for j in range(i + 1, len(pieces)):
            assert not any(segments_cross(p, q) for p in pieces[i] for q in pieces[j]), \
                (result.labels[i], result.labels[j])


# --- voltage -------------------------------------------------------------------------------

def test_voltage_curves_span_the_axis_and_current_is_drawn(tmp_path, data_path):
    st = linecalc.load_station(data_path("orchard-doublet.yaml"))
    data = fd.figure_data("voltage", st, sweep_points=11)
    # a rating far above the standing wave: a note, not the scale
    figure = plots.plot_line_voltage(tmp_path / "v.png", data.labels, data.position_m, data.voltage_v,
                                     rating_v=5000.0, line_label=data.line_label, current_a=data.current_a,
                                     power_w=data.power_w)
    ax, current_ax = figure.axes[:2]
    highest = max(float(np.max(v)) for v in data.voltage_v)
    low, top = ax.get_ylim()
    assert (highest - 0) / (top - low) > 0.8
    assert any("5,000 V" in t.get_text() for t in ax.texts)
    assert "100 W" in ax.get_title(loc="left")
    assert len(current_ax.lines) == len(data.labels) and "[A" in current_ax.get_ylabel()
    # the current is |V+ e^(-gx) - V- e^(gx)| / |Z0|: at the line's radio end it is the path
    # solver's node current (Pozar, Microwave Engineering, 4th ed., section 2.1)
    result = linecalc.solve_budget(st)
    k = next(i for i, e in enumerate(st.feed) if e.kind == "line")
    np.testing.assert_allclose([line.get_ydata()[0] for line in current_ax.lines],
                               np.abs(result.solution.current_a[k]), rtol=1e-9)


# --- budget --------------------------------------------------------------------------------

def test_budget_legend_holds_only_parts_that_exist(tmp_path, data_path):
    figure = draw("budget", linecalc.load_station(data_path("hilltop-dipole.yaml")), tmp_path)
    legend = [t.get_text() for t in figure.legends[0].get_texts()]
    assert "tuner loss" not in legend and "line matched loss" in legend
    # a meter (lossless) is in the feed but loses nothing: no "other parts" entry for it
    metered = CHOKED.replace("  - connector: {label: plugs, count: 2, loss: 0.05 dB}\n", "  - meter: {label: meter}\n")
    metered = metered.replace("  - choke: {label: burnt choke, loss: 9.9 dB}\n", "")
    figure = draw("budget", station(metered), tmp_path)
    assert [t.get_text() for t in figure.legends[0].get_texts()] == ["line matched loss", "line mismatch loss"]


def test_a_lossy_choke_has_a_bar_of_its_own_and_power_labels_are_si(tmp_path):
    figure = draw("budget", station(CHOKED), tmp_path)
    legend = [t.get_text() for t in figure.legends[0].get_texts()]
    assert "burnt choke" in legend
    assert "Heat from 1.5 kW" in figure.axes[1].get_title(loc="left")
    assert all("e+" not in t.get_text() for t in figure.axes[1].texts)
    assert plots.si_watts(1270.0) == "1.27 kW" and plots.si_watts(85.31) == "85.3 W" and \
        plots.si_watts(0.012) == "12 mW"


def test_rows_where_the_tuner_cannot_match_are_marked_on_every_figure(tmp_path, tuner_station):
    st = tuner_station  # a T tuner that cannot match on 3.6 MHz (tests/render/conftest.py)
    assert list(fd.tuner_states(linecalc.solve_budget(st))) == ["cannot match", "", ""]
    budget = draw("budget", st, tmp_path)
    assert "tuner cannot match" in budget.axes[1].get_xticklabels()[0].get_text()
    voltage = draw("voltage", st, tmp_path)
    assert "tuner cannot match" in voltage.axes[0].lines[0].get_label()
    smith = draw("smith", st, tmp_path)
    assert any("3.6 MHz (tuner cannot match)" == t.get_text() for t in smith.axes[0].texts)
    swr = draw("swr", st, tmp_path, sweep_points=5)
    assert any(line.get_label() == "tuner cannot match" for ax in swr.axes for line in ax.lines)


# --- compare -------------------------------------------------------------------------------

def test_compare_options_reach_the_plot_and_a_retyped_line_is_renamed(tmp_path, data_path):
    st = linecalc.load_station(data_path("hilltop-dipole.yaml"))  # no compare: key
    figure = draw("compare", st, tmp_path, cables=["rg-58", "window-line-450"])
    names = [t.get_text() for t in figure.axes[0].get_legend().get_texts()]
    comparison = linecalc.solve_compare(st, cables=["rg-58", "window-line-450"])
    assert names[-3:] == list(comparison.names)
    assert "window-line-450 in place of main coax" in names and "main coax: window-line-450" not in names


def test_compare_plot_options_on_the_command_line(cli, data_path, tmp_path):
    code, out, err = cli("plot", data_path("hilltop-dipole.yaml"), "compare", tmp_path / "c.png",
                         "--lengths", "20m", "30m")
    assert code == 0, err
    code, out, err = cli("plot", data_path("hilltop-dipole.yaml"), "compare", tmp_path / "d.png", "--cable", "nope")
    assert code == 2 and out == "" and err.startswith("linecalc plot: --cable:")


# A radio's built-in tuner (an L network that tunes up to 3:1 only): on 7.1 MHz the antenna is
# matched already (SWR 1, the tuner stays in bypass), on 14.2 MHz it is 8:1 at the antenna (far past
# 3:1 after 10 m of coax: it cannot match). Invented loads.
BUILTIN = """\
name: Built-in tuner compare test
radio: {power: 100 W}
frequencies: [7.1 MHz, 14.2 MHz]
antenna:
  impedance: {7.1 MHz: 50+j0, 14.2 MHz: 400+j0}
feed:
  - tuner: {label: radio tuner, network: builtin}
  - line: {label: coax, cable: rg-213, length: 10 m}
"""


def test_compare_marks_each_alternative_where_its_tuner_is_bypassed_or_cannot_match(tmp_path):
    st = station(BUILTIN)
    comparison = linecalc.solve_compare(st, cables=["rg-58"], tuner_positions=True)
    states = [list(fd.tuner_states(result)) for result in comparison.results]
    # RG-58 class coax is not quite 50 ohm: through it the matched antenna needs a little tuning,
    # so only the other two alternatives leave the tuner in bypass on 7.1 MHz
    assert states == [["bypassed", "cannot match"], ["", "cannot match"], ["bypassed", "cannot match"]]
    figure = draw("compare", st, tmp_path, cables=["rg-58"], tuner_positions=True)
    ax = figure.axes[0]
    hatch = {"": "", "bypassed": "..", "cannot match": "//"}
    for container, row_states in zip(ax.containers, states):
        assert [bar.get_hatch() or "" for bar in container] == [hatch[s] for s in row_states]
    marks = {line.get_label(): line for line in ax.lines}
    assert len(marks["tuner cannot match (striped bar)"].get_xdata()) == 3  # every alternative on 14.2 MHz
    bypass_x = marks["tuner in bypass (dotted bar)"].get_xdata()
    centres = [[bar.get_x() + bar.get_width() / 2 for bar in container] for container in ax.containers]
    np.testing.assert_allclose(bypass_x, [centres[0][0], centres[2][0]])  # over the bypassed bars only
    legend = [t.get_text() for t in ax.get_legend().get_texts()]
    assert legend[-3:] == list(comparison.names)
    # an alternative's legend patch stays plain even where its first bar is hatched
    assert not any(patch.get_hatch() for patch in ax.get_legend().get_patches())


def test_compare_without_tuner_marks_nothing(tmp_path, data_path):
    figure = draw("compare", linecalc.load_station(data_path("hilltop-dipole.yaml")), tmp_path, cables=["rg-58"])
    ax = figure.axes[0]
    assert not any(bar.get_hatch() for container in ax.containers for bar in container)
    assert not any("tuner" in line.get_label() for line in ax.lines)


# --- stations that budget solves never end in an internal error ----------------------------

@pytest.mark.parametrize("text", [LONG, SHORTED], ids=["1000 km line", "shorted antenna"])
@pytest.mark.parametrize("kind", ["voltage", "budget"])
def test_plot_of_a_station_that_budget_solves_is_not_an_internal_error(cli, write_file, tmp_path, text, kind):
    path = write_file("edge.yaml", text)
    assert cli("budget", path)[0] == 0
    code, out, err = cli("plot", path, kind, tmp_path / "edge.png")
    assert code == 0, err
