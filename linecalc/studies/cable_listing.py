"""The cable library as a listing: each cable's matched loss and power rating at a few frequencies,
and its voltage rating."""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

# Frequencies of the listing [Hz]: 80 m, 20 m, 10 m, 2 m and 70 cm.
LISTING_FREQUENCIES_HZ = (3.6e6, 14.2e6, 28.5e6, 146e6, 435e6)


@dataclass(frozen=True, eq=False)
class CableListing:
    """Cables with their matched loss [dB/m] and matched average power rating [W] (NaN for a
    cable without one), shape (cables, nf), and where each frequency lies outside a cable's data
    (extrapolated by its loss model)."""

    frequency_hz: np.ndarray
    cables: tuple
    loss_db_per_m: np.ndarray
    outside_data: np.ndarray
    power_rating_w: np.ndarray

    def to_dict(self) -> list[dict]:
        """The JSON document of ``linecalc cables --format json``."""
        return [{"id": c.id, "kind": c.kind, "z0_ohm": c.z0_nominal_ohm, "velocity_factor": c.velocity_factor,
                 "description": c.description, "max_voltage_v": c.max_voltage_v,
                 # the keys below as numbers, in their order, for scripts that do not parse keys
                 "frequencies_hz": [float(f) for f in self.frequency_hz],
                 "loss_db_per_100m": {f"{f:g}": 100 * float(loss) for f, loss in zip(self.frequency_hz, losses)},
                 "power_rating_w": None if np.all(np.isnan(ratings)) else
                 {f"{f:g}": float(p) for f, p in zip(self.frequency_hz, ratings)}}
                for c, losses, ratings in zip(self.cables, self.loss_db_per_m, self.power_rating_w)]


def cable_listing(cables, frequency_hz=LISTING_FREQUENCIES_HZ) -> CableListing:
    """The listing of ``cables`` (an iterable of `Cable`) at ``frequency_hz`` [Hz]."""
    f = np.asarray(frequency_hz, dtype=float)
    cables = tuple(cables)
    loss = np.array([c.matched_loss_db_per_m(f) for c in cables]).reshape(len(cables), f.size)
    outside = np.array([(f < c.data_range_hz[0]) | (f > c.data_range_hz[1]) for c in cables]).reshape(loss.shape)
    ratings = np.array([np.full(f.shape, np.nan) if c.power_rating_w(f) is None else c.power_rating_w(f)
                        for c in cables]).reshape(loss.shape)
    return CableListing(f, cables, loss, outside, ratings)
