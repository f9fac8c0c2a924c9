"""Amateur bands from 160 m to 70 cm with their edges in ITU Regions 1, 2 and 3.

Source: ITU Radio Regulations, Article 5 (Table of Frequency Allocations), the allocations to the
amateur service, primary or secondary, recalled from the 2020 edition (from memory; national
band plans are narrower or wider in places: check your licence). A band name stands for the
centre of its edges in the chosen region.
"""
from __future__ import annotations

from dataclasses import dataclass
from linecalc.errors import InputError

# name -> {region: (low_hz, high_hz)}; a band missing from a region is not allocated there.
_KHZ = 1e3
_MHZ = 1e6
_BAND_EDGES_HZ = {
    "160m": {1: (1810 * _KHZ, 2000 * _KHZ), 2: (1800 * _KHZ, 2000 * _KHZ), 3: (1800 * _KHZ, 2000 * _KHZ)},
    "80m": {1: (3500 * _KHZ, 3800 * _KHZ), 2: (3500 * _KHZ, 4000 * _KHZ), 3: (3500 * _KHZ, 3900 * _KHZ)},
    "60m": {r: (5351.5 * _KHZ, 5366.5 * _KHZ) for r in (1, 2, 3)},
    "40m": {1: (7000 * _KHZ, 7200 * _KHZ), 2: (7000 * _KHZ, 7300 * _KHZ), 3: (7000 * _KHZ, 7200 * _KHZ)},
    "30m": {r: (10100 * _KHZ, 10150 * _KHZ) for r in (1, 2, 3)},
    "20m": {r: (14000 * _KHZ, 14350 * _KHZ) for r in (1, 2, 3)},
    "17m": {r: (18068 * _KHZ, 18168 * _KHZ) for r in (1, 2, 3)},
    "15m": {r: (21000 * _KHZ, 21450 * _KHZ) for r in (1, 2, 3)},
    "12m": {r: (24890 * _KHZ, 24990 * _KHZ) for r in (1, 2, 3)},
    "10m": {r: (28000 * _KHZ, 29700 * _KHZ) for r in (1, 2, 3)},
    "6m": {1: (50 * _MHZ, 52 * _MHZ), 2: (50 * _MHZ, 54 * _MHZ), 3: (50 * _MHZ, 54 * _MHZ)},
    "2m": {1: (144 * _MHZ, 146 * _MHZ), 2: (144 * _MHZ, 148 * _MHZ), 3: (144 * _MHZ, 148 * _MHZ)},
    "1.25m": {2: (220 * _MHZ, 225 * _MHZ)},
    "70cm": {1: (430 * _MHZ, 440 * _MHZ), 2: (420 * _MHZ, 450 * _MHZ), 3: (430 * _MHZ, 440 * _MHZ)},
}

REGIONS = (1, 2, 3)


class BandError(InputError):
    """An unknown band name, or a band not allocated in the region."""


@dataclass(frozen=True)
class Band:
    """An amateur band in one ITU region: its name and edges [Hz]."""

    name: str
    region: int
    low_hz: float
    high_hz: float

    @property
    def centre_hz(self) -> float:
        return 0.5 * (self.low_hz + self.high_hz)


def band_names() -> tuple[str, ...]:
    """All band names, from the lowest frequency to the highest."""
    return tuple(_BAND_EDGES_HZ)


def band(name: str, region: int) -> Band:
    """The band called ``name`` (``"40m"``, ``"40 m"`` and ``"40M"`` are the same) in ``region``."""
    if region not in REGIONS:
        raise BandError(f"ITU region must be 1, 2 or 3, got {region!r}")
    key = str(name).replace(" ", "").lower()
    if key not in _BAND_EDGES_HZ:
        raise BandError(f"unknown band {name!r}; known bands: {', '.join(_BAND_EDGES_HZ)}")
    edges = _BAND_EDGES_HZ[key].get(region)
    if edges is None:
        raise BandError(f"band {name!r} is not allocated to the amateur service in ITU region {region}")
    return Band(key, region, *edges)
