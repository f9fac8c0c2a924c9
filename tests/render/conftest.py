"""Small results for the renderer's tests: real solves of tiny test stations, made once.

The renderer only formats: these results are its input, and the tests check what the text,
CSV and JSON make of them.
"""
from __future__ import annotations

import pytest

# Two rows: a matched 50-ohm antenna, and a dead short (an infinite SWR and loss, no watts at the
# antenna). A label with a comma, for the CSV quoting.
PLAIN = """\
name: Render test
radio: {power: 100 W}
frequencies: [7.1 MHz, 14.2 MHz]
antenna:
  impedance: {7.1 MHz: 50+j0, 14.2 MHz: 0+j0}
feed:
  - meter: {label: shack meter}
  - connector: {label: "plugs, two", count: 2, loss: 0.05 dB}
  - line: {label: coax, cable: rg-213, length: 10 m}
"""

# The same path to an antenna given by its SWR alone.
SWR_ONLY = PLAIN.replace("impedance: {7.1 MHz: 50+j0, 14.2 MHz: 0+j0}", "swr: {7.1 MHz: 2.5, 14.2 MHz: 4}")

# A T tuner whose capacitors stop at 30 pF: it matches on 7.1 and 14.2 MHz, not on 3.6 MHz
# (invented loads of a doublet off resonance).
TUNER = """\
name: Tuner render test
radio: {power: 100 W}
frequencies: [3.6 MHz, 7.1 MHz, 14.2 MHz]
antenna:
  impedance: {3.6 MHz: 95+j150, 7.1 MHz: 2400-j1700, 14.2 MHz: 1800+j1250}
feed:
  - tuner: {label: shack tuner, network: T, capacitance: {min: 10 pF, max: 30 pF}}
  - line: {label: coax, cable: rg-8x, length: 30 m}
"""

# An L tuner behind 5 m of coax: on 3.6 MHz the antenna is matched already (the tuner stays in
# bypass, no part in circuit), on 7.1 and 14.2 MHz it uses two of its parts, not the same two
# (invented loads).
L_TUNER = """\
name: L tuner render test
radio: {power: 100 W}
frequencies: [3.6 MHz, 7.1 MHz, 14.2 MHz]
antenna:
  impedance: {3.6 MHz: 50+j0, 7.1 MHz: 300-j200, 14.2 MHz: 12+j30}
feed:
  - tuner: {label: shack tuner, network: L}
  - line: {label: coax, cable: rg-213, length: 5 m}
"""


def _solve(text, name):
    from linecalc.io.station_file import parse_station_text
    from linecalc.studies.budget import solve_budget

    return solve_budget(parse_station_text(text, name))


@pytest.fixture(scope="session")
def plain_result():
    return _solve(PLAIN, "plain.yaml")


@pytest.fixture(scope="session")
def swr_only_result():
    return _solve(SWR_ONLY, "swr-only.yaml")


@pytest.fixture(scope="session")
def tuner_station():
    from linecalc.io.station_file import parse_station_text

    return parse_station_text(TUNER, "tuner.yaml")


@pytest.fixture(scope="session")
def tuner_result(tuner_station):
    from linecalc.studies.budget import solve_budget

    return solve_budget(tuner_station)


@pytest.fixture(scope="session")
def l_tuner_result():
    return _solve(L_TUNER, "l-tuner.yaml")


@pytest.fixture(scope="session")
def comparison(data_path):
    """The test dipole's coax against two other cables (three alternatives, three rows)."""
    import linecalc

    return linecalc.solve_compare(linecalc.load_station(data_path("hilltop-dipole.yaml")),
                                  cables=["rg-58", "window-line-450"])


@pytest.fixture(scope="session")
def feedpoint_result(data_path):
    """The test copy of the demo's shack sweep moved to the feedpoint (101 points)."""
    import linecalc

    return linecalc.solve_feedpoint(linecalc.load_station(data_path("shack-sweep-dipole.yaml")))


# A fixed date for the reports (2026-01-01 00:00 UTC), as SOURCE_DATE_EPOCH would give.
REPORT_DATE_EPOCH = 1767225600


@pytest.fixture(scope="session")
def report_pages(data_path, tmp_path_factory):
    """The HTML reports of two test copies of the demos, made once: the doublet (a meter, a T
    tuner, window line and a compare: key: every figure) and the shack reading (an SWR-only
    antenna: no Smith chart, no voltage figure, no comparison). Name -> path."""
    import datetime

    import linecalc

    folder = tmp_path_factory.mktemp("reports")
    generated = datetime.datetime.fromtimestamp(REPORT_DATE_EPOCH, datetime.timezone.utc)
    pages = {}
    for name in ("orchard-doublet", "shack-reading"):
        pages[name] = folder / f"{name}.html"
        linecalc.render_report(linecalc.load_station(data_path(f"{name}.yaml")), pages[name], generated=generated)
    return pages
