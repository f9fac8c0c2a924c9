"""`linecalc cables` shows both ratings of every cable: the matched average power rating against
frequency (from the library's thermal model) and the voltage rating, in the table and the JSON."""
from __future__ import annotations

import json

import numpy as np
import pytest


def test_cables_json_gives_power_ratings_at_the_listing_frequencies(cli, library):
    code, out, err = cli("cables", "--format", "json")
    assert code == 0, err
    listing = {cable["id"]: cable for cable in json.loads(out)}
    assert set(listing) == set(library)
    for cable_id, entry in listing.items():
        ratings = entry["power_rating_w"]
        assert list(ratings) == list(entry["loss_db_per_100m"])  # the same frequency keys
        f = np.array([float(key) for key in ratings])
        np.testing.assert_allclose(list(ratings.values()), library[cable_id].power_rating_w(f), rtol=1e-12)
        values = np.array(list(ratings.values()))
        # heat per metre grows with the loss, so the rating falls with frequency
        assert np.all(values > 0) and np.all(np.diff(values) < 0)


def test_cables_json_gives_the_listing_frequencies_as_numbers_beside_the_keys(cli, library):
    # docs/json.md, cables: the keys stay strings (the contract), frequencies_hz gives them as
    # numbers in the same order: 3.6, 14.2, 28.5, 146 and 435 MHz (80 m, 20 m, 10 m, 2 m, 70 cm)
    code, out, err = cli("cables", "--format", "json")
    assert code == 0, err
    for entry in json.loads(out):
        assert entry["frequencies_hz"] == [3.6e6, 14.2e6, 28.5e6, 146e6, 435e6]
        assert all(type(f) is float for f in entry["frequencies_hz"])
        assert [float(key) for key in entry["loss_db_per_100m"]] == entry["frequencies_hz"]
        if entry["power_rating_w"] is not None:
            assert [float(key) for key in entry["power_rating_w"]] == entry["frequencies_hz"]
        # read by position, as a script would: the loss at each number is the keyed value
        np.testing.assert_allclose(list(entry["loss_db_per_100m"].values()),
                                   100 * library[entry["id"]].matched_loss_db_per_m(np.array(entry["frequencies_hz"])),
                                   rtol=1e-12)


def test_cables_table_lists_power_and_voltage_ratings(cli, library):
    code, out, err = cli("cables")
    assert code == 0, err
    section = out[out.index("Ratings:"):]
    rows = {line.split()[0]: line.split() for line in section.splitlines()[3:] if line.strip()
            and line.split()[0] in library}
    assert set(rows) == set(library)
    rg213 = rows["rg-213"]
    assert rg213[-1] == "5000"  # the voltage rating of cable_data/rg-213.yaml
    # 14.2 MHz is the second listing frequency; the rating as the library computes it, to the watt
    assert float(rg213[2]) == pytest.approx(library["rg-213"].power_rating_w(np.array([14.2e6]))[0], abs=0.5)
    assert rows["rg-8x"][-1] == "none"
