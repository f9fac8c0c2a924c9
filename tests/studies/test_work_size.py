"""Sizes bounded before the work starts: a sweep, a scan or a station too large for memory is
refused with the estimate, naming the option or key that sized it, and the refusal itself
takes little memory (measured here with tracemalloc, numpy's arrays included)."""
from __future__ import annotations


import pytest

from linecalc.studies import work_size

PEAK_LIMIT_BYTES = 500_000_000


def test_the_estimate_counts_elements_points_and_phases():
    # worked by hand: (1,000 for the path + 1,000 for a line + 25,000 for a tuner) x 10 points x 2 phases
    assert work_size.estimate_bytes(["line", "tuner"], 10, phases=2) == 540_000


@pytest.mark.parametrize("args, option", [
    (["budget", "hilltop-dipole.yaml", "--sweep", "100000000"], "--sweep"),
    (["budget", "orchard-doublet.yaml", "--sweep", "50000"], "--sweep"),
    (["plot", "orchard-doublet.yaml", "swr", "out.png", "--sweep", "50000"], "--sweep"),
    (["plot", "hilltop-dipole.yaml", "smith", "out.png", "--sweep", "100000000"], "--sweep"),
    (["advise", "orchard-doublet.yaml", "--points", "100000000"], "--points"),
    (["advise", "orchard-doublet.yaml", "--points", "100000000", "--allow-large-scan"], "--points"),
])
def test_a_sweep_too_large_is_refused_before_it_starts(with_peak_memory, cli, data_path, tmp_path, args, option):
    args = [str(data_path(a)) if a.endswith(".yaml") else str(tmp_path / a) if a.endswith(".png") else a
            for a in args]
    (code, out, err), peak = with_peak_memory(cli, *args)
    assert code == 2 and out == "", err
    assert err.startswith(f"linecalc {args[0]}: {option}: ") and err.count("\n") == 1, err
    assert "GB" in err or "evaluations" in err
    assert not (tmp_path / "out.png").exists()
    assert peak < PEAK_LIMIT_BYTES


@pytest.mark.parametrize("args", [["plot", "hilltop-dipole.yaml", "swr", "out.png", "--sweep", "1"],
                                  ["advise", "orchard-doublet.yaml", "--points", "-3"],
                                  ["budget", "hilltop-dipole.yaml", "--sweep", "1"]])
def test_too_few_points_are_blamed_on_the_option(cli, data_path, tmp_path, args):
    option = "--points" if args[0] == "advise" else "--sweep"
    args = [str(data_path(a)) if a.endswith(".yaml") else str(tmp_path / a) if a.endswith(".png") else a
            for a in args]
    code, out, err = cli(*args)
    assert code == 2 and out == ""
    assert err.startswith(f"linecalc {args[0]}: {option}: ") and err.count("\n") == 1, err


def test_a_station_of_thousands_of_elements_at_thousands_of_frequencies_is_refused(with_peak_memory, tmp_path):
    # the station of 5,000 elements at 10,000 frequencies that reached 15.5 GB, built in code (a
    # YAML file of that size takes seconds to parse): refused with the estimate, at its feed: key
    import dataclasses

    import numpy as np

    from linecalc import api
    from linecalc.errors import StationError

    small = api.load_station("name: huge\nradio: {power: 100 W}\nfrequencies: [7 MHz]\n"
                             "antenna: {impedance: {7 MHz: 50 ohm, 8 MHz: 50 ohm}}\n"
                             "feed:\n  - connector: {label: c, count: 1}\n")
    f = np.linspace(7e6, 8e6, 10_000)
    station = dataclasses.replace(small, feed=small.feed * 5_000, frequency_hz=f,
                                  labels=tuple(f"{x:g}" for x in f), band_edges_hz=(None,) * f.size)
    with pytest.raises(StationError) as info:
        api.solve_budget(station)
    _, peak = with_peak_memory(_refused, api.solve_budget, station)
    # (5,000 x 1,000 + 1,000) B x 10,000 points, worked by hand from the estimate's constants
    assert "would need about 50.0 GB" in str(info.value) and info.value.line == 5 and info.value.path == "feed"
    assert peak < PEAK_LIMIT_BYTES


def _refused(run, *args):
    try:
        run(*args)
    except Exception as exc:  # noqa: BLE001 - the refusal is checked by the caller
        return exc
    raise AssertionError("not refused")
