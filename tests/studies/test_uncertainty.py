"""The uncertainty run (linecalc.studies.uncertainty): its spread against first-order propagation
worked by hand, and its reproducibility."""
from __future__ import annotations

import numpy as np
import pytest

from linecalc.elements import Connector, Line
from linecalc.physics.loads import SwrTable
from linecalc.physics.tolerance import Tolerances
from linecalc.studies.budget import solve_budget
from linecalc.studies.station import BudgetError
from linecalc.studies.uncertainty import budget_spread, draw_station

NONE = dict(cable_loss_percent=(0.0, 0.0), velocity_factor=0.0, length_percent=0.0, rho_error=0.0,
            antenna_percent=0.0, part_loss_percent=0.0)


@pytest.fixture
def matched_line(make_station, library):
    """50 m of RG-213 class coax into 50 ohm at 14.2 MHz: nearly matched, so its total loss is its
    matched loss ML, proportional to its length and to its attenuation."""
    return make_station([Line(library["rg-213"], 50.0, label="coax")], [14.2e6], 50.0)


@pytest.mark.parametrize("tolerance, std_share, mean_share", [
    # length uniform on +-0.5 %: d(loss)/d(l) = ML / l, so sigma = ML x 0.005 / sqrt(3) and no shift
    ({"length_percent": 0.5}, 0.005 / np.sqrt(3), 0.0),
    # attenuation uniform on +0 to +2 %: sigma = ML x 0.02 / sqrt(12), the mean shifted by ML x 0.01
    ({"cable_loss_percent": (0.0, 2.0)}, 0.02 / np.sqrt(12), 0.01),
])
def test_spread_of_total_loss_equals_first_order_propagation(matched_line, tolerance, std_share, mean_share):
    # by hand: the law of propagation of uncertainty, JCGM 100:2008 (GUM) section 5.1.2, with the
    # standard deviation of a rectangular distribution of half-width a, a / sqrt(3) (section 4.3.7)
    nominal = solve_budget(matched_line)
    ml = nominal.matched_loss_db[0]
    drawn = draw_station(matched_line, Tolerances(**{**NONE, **tolerance}, draws=4000, seed=3))
    loss = drawn["total_loss_db"][:, 0]
    # 4000 draws estimate a standard deviation to about 0.7 % (uniform draws): 3 % tolerance
    assert loss.std() == pytest.approx(ml * std_share, rel=3e-2)
    assert loss.mean() - nominal.total_loss_db[0] == pytest.approx(ml * mean_share, abs=ml * std_share / 10)


def test_a_seeded_run_reproduces_itself_exactly(make_station, library):
    station = make_station([Connector("plug", 0.1, 50.0), Line(library["rg-58"], 20.0, label="coax")],
                           [3.6e6, 7.1e6, 14.2e6], [40 + 20j, 60 - 30j, 80 + 10j])
    first = budget_spread(station, solve_budget(station), Tolerances(draws=500, seed=7)).to_dict()
    again = budget_spread(station, solve_budget(station), Tolerances(draws=500, seed=7)).to_dict()
    other = budget_spread(station, solve_budget(station), Tolerances(draws=500, seed=8)).to_dict()
    assert first == again
    assert first != other


def test_chunks_give_the_same_draws_as_one_solve(make_station, library, monkeypatch):
    from linecalc.studies import uncertainty

    station = make_station([Line(library["rg-58"], 20.0, label="coax")], [7.1e6, 14.2e6], 60 - 30j)
    whole = draw_station(station, Tolerances(draws=300, seed=2))
    monkeypatch.setattr(uncertainty, "CHUNK_BYTES", 50_000)  # about 25 draws per chunk
    chunked = draw_station(station, Tolerances(draws=300, seed=2))
    for key in ("power_antenna_w", "total_loss_db", "swr_radio"):
        np.testing.assert_array_equal(whole[key], chunked[key])


def test_an_swr_only_antenna_is_refused(make_station, library):
    station = make_station([Line(library["rg-58"], 20.0)], [7.1e6],
                           SwrTable(np.array([7.1e6]), np.array([1.8])))
    with pytest.raises(BudgetError, match="SWR reading has no phase"):
        draw_station(station, Tolerances(draws=10))


def test_a_tuner_matched_by_the_fast_closed_forms_agrees_with_its_full_design(make_station, library, monkeypatch):
    # the same drawn stations solved twice: the L or T tuner at its least loss by
    # physics.matching_fast, and by the full design of physics.matching (which the budget uses);
    # matching_fast's docstring promises the loss within 1e-3 dB of the full design's
    from linecalc.elements import Tuner
    from linecalc.io.feed_file import TUNER_CAPACITANCE_F, TUNER_INDUCTANCE_H
    from linecalc.physics.matching import TunerParts
    from linecalc.studies import uncertainty

    parts = TunerParts(*TUNER_CAPACITANCE_F, *TUNER_INDUCTANCE_H, 100.0, 1000.0)
    station = make_station([Tuner("tuner", "T", parts, 50.0, 3.0, False, None, None),
                            Line(library["rg-213"], 20.0, label="coax")], [3.6e6, 7.1e6, 14.2e6],
                           [200 - 300j, 30 + 80j, 900 + 400j], holds="forward")
    tolerances = Tolerances(draws=40, seed=4)
    fast = draw_station(station, tolerances)
    monkeypatch.setattr(uncertainty, "FAST_NETWORKS", ())
    full = draw_station(station, tolerances)
    assert fast["valid"].all() and full["valid"].all()
    np.testing.assert_allclose(fast["total_loss_db"], full["total_loss_db"], atol=2e-3)
    np.testing.assert_allclose(fast["swr_antenna"], full["swr_antenna"], rtol=1e-9)
    np.testing.assert_allclose(fast["swr_radio"], full["swr_radio"], atol=2e-3)
