"""The compare study: alternative feedlines, tuner positions and line lengths, ranked per band.
Through the command: tests/cli/test_compare_cli.py."""
from __future__ import annotations

import numpy as np
import pytest

from linecalc.studies.budget import solve_budget
from linecalc.studies.compare import CompareError, alternatives_from_spec, compare
from linecalc.studies.station import CompareSpec
from linecalc.physics.twoports import closed_form_line_loss_db
from linecalc.io.station_file import load_station, parse_station_text


@pytest.fixture
def doublet(data_path):
    """A doublet on 18 m of window line behind a balanced tuner (SWR 5 to 60 on most bands)."""
    return load_station(data_path("orchard-doublet.yaml"))


@pytest.fixture
def dipole(data_path):
    """A resonant dipole on 25 m of RG-213 class coax, with no compare: key."""
    return load_station(data_path("hilltop-dipole.yaml"))


def _arrl_total_loss_db(matched_loss_db, swr):
    """ARRL Antenna Book, transmission-line chapter: total loss of a line of real Z0 with SWR at
    its load, written out here independently of linecalc: a = 10^(ML/10), |rho| = (S-1)/(S+1),
    loss = 10 log10[(a^2 - |rho|^2) / (a (1 - |rho|^2))]."""
    a = 10 ** (np.asarray(matched_loss_db) / 10)
    rho = (np.asarray(swr) - 1) / (np.asarray(swr) + 1)
    return 10 * np.log10((a * a - rho * rho) / (a * (1 - rho * rho)))


def test_open_wire_beats_coax_where_the_doublet_swr_is_high(doublet, library):
    spec = CompareSpec(cables=(("rg-213", library["rg-213"]),))
    comparison = compare(doublet, alternatives_from_spec(doublet, spec))
    as_built, coax = comparison.results
    high_swr = as_built.swr_antenna > 5
    assert high_swr.sum() >= 3
    # The standing-wave loss grows with matched loss (ARRL Antenna Book, transmission-line chapter):
    # a low-loss balanced line beats coax of the same length wherever the SWR is high.
    assert np.all(as_built.power_antenna_w[high_swr] > coax.power_antenna_w[high_swr])
    assert np.all(comparison.winner[high_swr] == 0)


def test_open_wire_line_loss_agrees_with_the_closed_form_formula(doublet, library):
    # 600-ohm open-wire line: Z0 nearly real (Im/Re about alpha/beta, a few thousandths), so its
    # exact loss is the ARRL closed form (transmission-line chapter) within 0.02 dB whatever the
    # phase of the load. (Window line, with twice the loss, departs by up to 0.05 dB on 80 m.)
    spec = CompareSpec(cables=(("open-wire-600", library["open-wire-600"]),))
    result = solve_budget(alternatives_from_spec(doublet, spec)[1].station)
    line = next(e for e in result.elements if e.kind == "line")
    np.testing.assert_allclose(line.loss_db, _arrl_total_loss_db(line.matched_loss_db, line.swr_out), atol=0.02)


def test_coax_formula_equals_the_phase_average_not_each_phase():
    # For coax (complex Z0 from conductor loss), single loads sit on either side of the formula;
    # the formula is the average over the load's phase (ARRL closed form vs exact phase average).
    text = """
name: phase test
frequencies: [3.6 MHz, 7.1 MHz, 14.2 MHz]
radio: {power: 100 W}
antenna:
  swr: {3.6 MHz: 6, 7.1 MHz: 6, 14.2 MHz: 6}
feed:
  - line: {cable: rg-58, length: 30 m}
"""
    result = solve_budget(parse_station_text(text))
    line = result.elements[0]
    formula = _arrl_total_loss_db(line.matched_loss_db, 6.0)
    np.testing.assert_allclose(result.total_loss_db, formula, atol=0.02)
    low, high = result.total_loss_db_range.T
    assert np.all(low < formula - 0.01) and np.all(high > formula + 0.01)


def test_tuner_at_the_feedpoint_line_loses_only_its_matched_loss(data_path):
    station = load_station(data_path("tuner-in-shack.yaml"))
    comparison = compare(station, alternatives_from_spec(station, CompareSpec(tuner_positions=True)))
    at_antenna = comparison.results[1]
    coax = next(e for e in at_antenna.elements if e.kind == "line")
    # a line terminated in its own Z0 loses exactly its matched loss (Pozar, 4th ed., 2.7);
    # the tuner's match holds to SWR 1.02 at its input, hence 0.01 dB
    np.testing.assert_allclose(coax.loss_db, coax.matched_loss_db, atol=0.01)
    in_shack = comparison.results[0]
    assert np.all(at_antenna.power_antenna_w > in_shack.power_antenna_w)


def test_short_coax_exact_loss_moves_with_its_length_around_the_formula(data_path):
    station = load_station(data_path("doublet-wall-coax.yaml"))
    spec = station.compare
    comparison = compare(station, alternatives_from_spec(station, spec))
    study = comparison.line_study
    assert study.label == "wall coax"
    np.testing.assert_allclose(study.length_m, [1, 2, 3, 4, 5, 6])
    # the exact figure departs from the phase-averaged formula by more than rounding somewhere
    assert np.max(np.abs(study.exact_loss_db - study.closed_form_loss_db)) > 0.1
    # the closed form used in the study is the ARRL formula (written out independently above)
    np.testing.assert_allclose(
        study.closed_form_loss_db,
        _arrl_total_loss_db(np.array([r.elements[2].matched_loss_db for r in
                                      (comparison.results[k] for k in study.alternatives)]), study.swr_load),
        rtol=1e-9)


def test_closed_form_function_is_the_arrl_formula():
    ml = np.array([0.1, 1.0, 3.0])
    rho = np.array([0.0, 0.5, 0.9])
    np.testing.assert_allclose(closed_form_line_loss_db(ml, rho), _arrl_total_loss_db(ml, (1 + rho) / (1 - rho)),
                               rtol=1e-12)


def test_coax_to_balanced_change_adds_a_balun_and_back_adds_a_choke(dipole, doublet, library):
    alternatives = alternatives_from_spec(dipole, CompareSpec(cables=(("window-line-450", library["window-line-450"]),)))
    kinds = [e.kind for e in alternatives[1].station.feed]
    assert kinds == ["balun", "line"]
    assert not solve_budget(alternatives[1].station).warnings or all(
        "balanced line" not in w for w in solve_budget(alternatives[1].station).warnings)
    coax = alternatives_from_spec(doublet, CompareSpec(cables=(("rg-213", library["rg-213"]),)))[1].station
    assert [e.kind for e in coax.feed] == ["meter", "tuner", "line", "choke"]
    assert coax.feed[1].output_balanced is False


def test_no_alternatives_is_refused(dipole):
    with pytest.raises(CompareError):
        alternatives_from_spec(dipole, CompareSpec())


# --- where chokes belong (README, Comparing alternatives) ------------------------------------

CHOKED = """\
name: Choked coax
region: 1
radio: {power: 100 W}
bands: [40m]
antenna:
  impedance: {7.0 MHz: 2600-j1500, 7.2 MHz: 2100-j1900}
feed:
  - tuner: {label: shack tuner, network: T}
  - line: {label: coax, cable: rg-8x, length: 30 m}
  - meter: {label: feedpoint meter}
  - choke: {label: feedpoint choke}
"""


def _kinds(station):
    return [(e.kind, e.label) for e in station.feed]


def test_a_tuner_moved_to_the_antenna_keeps_the_choke_on_the_coax_side():
    from linecalc.io.station_file import parse_station_text
    from linecalc.studies.compare import tuner_alternatives

    at_antenna = tuner_alternatives(parse_station_text(CHOKED))[1]
    assert _kinds(at_antenna.station) == [("line", "coax"), ("choke", "feedpoint choke"), ("tuner", "shack tuner"),
                                          ("meter", "feedpoint meter")]
    assert any("kept between coax and the tuner" in c for c in at_antenna.changes)


def test_coax_replaced_by_balanced_line_drops_the_coax_choke():
    from linecalc.io.cable_library import cable
    from linecalc.io.station_file import parse_station_text
    from linecalc.studies.compare import cable_alternatives

    window = cable_alternatives(parse_station_text(CHOKED), [("window", cable("window-line-450"))])[1]
    # the retyped line is named after its alternative: a window line is no longer "coax"
    assert window.name == "window in place of coax"
    assert _kinds(window.station) == [("tuner", "shack tuner"), ("line", "window in place of coax"),
                                      ("meter", "feedpoint meter")]
    assert window.station.feed[0].output_balanced
    assert any("dropped" in c for c in window.changes) and any("made balanced" in c for c in window.changes)


def test_balanced_line_without_a_tuner_in_front_gets_a_balun_at_its_radio_end():
    from linecalc.io.cable_library import cable
    from linecalc.io.station_file import parse_station_text
    from linecalc.studies.compare import cable_alternatives

    text = CHOKED.replace("  - tuner: {label: shack tuner, network: T}\n", "  - tuner: {label: shack tuner, network: T}\n"
                          "  - line: {label: jumper, cable: rg-8x, length: 1 m}\n")
    window = cable_alternatives(parse_station_text(text), [("window", cable("window-line-450"))], "coax")[1]
    kinds = [k for k, _ in _kinds(window.station)]
    assert kinds == ["tuner", "line", "balun", "line", "meter"]
    assert any("balun added" in c for c in window.changes)


def test_compare_ranks_by_watts_at_the_antenna():
    # the winner is the alternative with the most watts at the antenna, whatever its path loss
    from linecalc.io.station_file import parse_station_text
    from linecalc.studies.compare import compare, tuner_alternatives

    comparison = compare(parse_station_text(CHOKED), tuner_alternatives(parse_station_text(CHOKED)))
    np.testing.assert_array_equal(comparison.winner, np.argmax(comparison.power_antenna_w, axis=0))


def test_closed_form_loss_of_a_line_of_thousands_of_db():
    # As the matched loss grows, (a^2 - rho^2) / (a (1 - rho^2)) tends to a / (1 - rho^2): the
    # reflected wave never returns and the total loss is ML - 10 log10(1 - |rho|^2) (worked by hand
    # from the closed form; Pozar, Microwave Engineering, 4th ed., section 2.7). 3000 dB once overflowed.
    loss = closed_form_line_loss_db(np.array([3000.0, 10.0]), np.array([0.5, 0.5]))
    assert loss[0] == pytest.approx(3000.0 - 10 * np.log10(0.75), abs=1e-9)
    a = 10.0  # 10 dB: a = 10^(10/10), the closed form evaluated directly
    assert loss[1] == pytest.approx(10 * np.log10((a * a - 0.25) / (a * 0.75)), rel=1e-12)
