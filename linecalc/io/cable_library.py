"""The cable library: the YAML files of ``cable_data/`` read into fitted `Cable` objects.

Each entry states its matched attenuation at three or more frequencies; the library fits
a(f) = k_c sqrt(f) + k_d f to those points (`cables.cable_from_points`) and keeps the span of
the points as the range where the data are valid. The geometry and materials in an entry are
documentation and the input of ``cable_data/derive_attenuation.py``; here they only split a
coax's conductor heat between its inner and outer conductor for the thermal build
(``thermal:``, `cable_heating.CableThermal`), from which its power rating follows.

Units are read once, here, with `linecalc.io.units`; what leaves this module is SI floats.
"""
from __future__ import annotations

import copy
import difflib
import functools
import os
from importlib import resources
from pathlib import Path
from typing import TYPE_CHECKING

import numpy as np
import yaml

from linecalc.physics.cable_heating import CableThermal, layer_thermal_resistance_k_m_per_w
from linecalc.physics.cables import Cable, cable_from_points
from linecalc.io.units import UnitError, parse_loss_db_per_m, parse_quantity
from linecalc.errors import LinecalcError

if TYPE_CHECKING:
    from importlib.resources.abc import Traversable

# The YAML files live in the top-level folder cable_data/ of the repository, which pyproject.toml
# maps to the package ``linecalc.cable_data``: they are package data, found the same way in an
# installed wheel and in the editable install of a checkout (where this is that folder itself).
# None in an install made before that mapping (a stale editable install): then only the
# commands that need a cable fail, with a LibraryError that says to reinstall.
try:
    CABLE_DATA_DIR: Traversable | None = resources.files("linecalc.cable_data")
except ModuleNotFoundError:
    CABLE_DATA_DIR = None
KINDS = ("coax", "balanced")
MIN_POINTS = 3
# The frequency at which the listing order compares losses [Hz] (inside every entry's range).
_ORDER_FREQUENCY_HZ = 100e6


# libyaml's safe loader where pyyaml was built with it (eight times faster on the library), else
# the pure-Python one: the same documents either way.
_FAST_SAFE_LOADER = getattr(yaml, "CSafeLoader", yaml.SafeLoader)


class LibraryError(LinecalcError, RuntimeError):
    """A cable-library file that cannot be read: a fault in the shipped data, not in user input."""


def _read_files(folder: Traversable | str | os.PathLike) -> list[tuple[Traversable, dict]]:
    """Every entry of every ``*.yaml`` file in ``folder``, with the file it came from.

    ``folder`` is a folder of package data (a `Traversable`) or a path on disk.
    A file holds one entry (a mapping) or a family of entries (a list of mappings).
    """
    if isinstance(folder, (str, os.PathLike)):
        folder = Path(folder)
    if not folder.is_dir():
        return []
    entries = []
    files = [item for item in folder.iterdir() if item.name.endswith(".yaml") and item.is_file()]
    for path in sorted(files, key=lambda item: item.name):
        with path.open(encoding="utf-8") as stream:
            doc = yaml.load(stream, Loader=_FAST_SAFE_LOADER)
        docs = doc if isinstance(doc, list) else [doc]
        for entry in docs:
            if not isinstance(entry, dict) or "id" not in entry:
                raise LibraryError(f"{path}: every entry is a mapping with an 'id'")
            entries.append((path, entry))
    return entries


@functools.lru_cache(maxsize=1)
def _parsed_entries() -> tuple[tuple[Traversable, dict], ...]:
    if CABLE_DATA_DIR is None:
        raise LibraryError("the cable library (package linecalc.cable_data) is not installed: "
                           "reinstall linecalc (in a checkout: pip install -e .)")
    entries = _read_files(CABLE_DATA_DIR)
    if not entries:
        raise LibraryError(f"no cable files (*.yaml) in {CABLE_DATA_DIR}")
    seen: dict[str, Traversable] = {}
    for path, entry in entries:
        if entry["id"] in seen:
            raise LibraryError(f"{path}: cable id {entry['id']!r} is also in {seen[entry['id']]}")
        seen[entry["id"]] = path
    return tuple(entries)


def library_entries() -> list[dict]:
    """The raw parsed entries of the library, in file order, for listing and checks.

    Returns
    -------
    list of dict
        A copy of each entry as written (values still text with units); each carries the
        name of its file under the extra key ``_file``.
    """
    result = []
    for path, entry in _parsed_entries():
        item = copy.deepcopy(entry)
        item["_file"] = path.name
        result.append(item)
    return result


def _value(entry: dict, key: str, where: str):
    node = entry.get(key)
    if not isinstance(node, dict) or "value" not in node:
        raise LibraryError(f"{where}: {key} is a mapping {{value: ..., source: ...}}")
    return node["value"]


def _thermal(entry: dict, kind: str, where: str) -> CableThermal | None:
    """The thermal build of an entry (its ``thermal:`` mapping), or None where it has none.

    Coax: ``insulation_thermal_resistivity`` [K m/W] of the dielectric, ``shield_diameter`` (over
    the outer conductor), ``jacket_diameter`` and ``jacket_thermal_resistivity``; the inner's
    share of the conductor heat is that of its skin-effect resistance, resistance factor over
    diameter, against the outer's (`cables.coax_rlgc`). Balanced: each wire with a round
    ``covering_diameter`` of ``insulation_thermal_resistivity`` (both left out for a bare wire).
    Both: ``max_temperature``, a bare number in degrees Celsius.
    """
    node = entry.get("thermal")
    if node is None:
        return None
    if not isinstance(node, dict):
        raise LibraryError(f"{where}: thermal is a mapping of {{value: ..., source: ...}} entries")
    max_temperature_c = float(_value(node, "max_temperature", where))
    geometry = entry.get("geometry") or {}
    if kind == "coax":
        inner, dielectric, outer = (geometry.get(key) or {} for key in ("inner", "dielectric", "outer"))
        inner_d = parse_quantity(_value(inner, "diameter", where), "m")
        dielectric_d = parse_quantity(_value(dielectric, "diameter", where), "m")
        shield_d = parse_quantity(_value(node, "shield_diameter", where), "m")
        jacket_d = parse_quantity(_value(node, "jacket_diameter", where), "m")
        if not 0 < inner_d < dielectric_d <= shield_d < jacket_d:
            raise LibraryError(f"{where}: the diameters of the inner, dielectric, shield and jacket must grow outward")
        inner_r = float(_value(inner, "resistance_factor", where)) / inner_d
        outer_r = float(_value(outer, "resistance_factor", where)) / dielectric_d
        insulation = layer_thermal_resistance_k_m_per_w(
            parse_quantity(_value(node, "insulation_thermal_resistivity", where), "K*m/W"), inner_d, dielectric_d)
        jacket = layer_thermal_resistance_k_m_per_w(
            parse_quantity(_value(node, "jacket_thermal_resistivity", where), "K*m/W"), shield_d, jacket_d)
        return CableThermal(float(insulation), float(jacket), jacket_d, inner_r / (inner_r + outer_r), 1,
                            max_temperature_c)
    wire_d = parse_quantity(_value(geometry.get("wires") or {}, "diameter", where), "m")
    if "covering_diameter" not in node:
        return CableThermal(0.0, 0.0, wire_d, 1.0, 2, max_temperature_c)
    covering_d = parse_quantity(_value(node, "covering_diameter", where), "m")
    if not covering_d > wire_d:
        raise LibraryError(f"{where}: the covering diameter must exceed the wire's")
    insulation = layer_thermal_resistance_k_m_per_w(
        parse_quantity(_value(node, "insulation_thermal_resistivity", where), "K*m/W"), wire_d, covering_d)
    return CableThermal(float(insulation), 0.0, covering_d, 1.0, 2, max_temperature_c)


def _build(path: Traversable, entry: dict) -> Cable:
    where = f"{path.name} ({entry['id']})"
    kind = entry.get("kind")
    if kind not in KINDS:
        raise LibraryError(f"{where}: kind is one of {', '.join(KINDS)}, got {kind!r}")
    try:
        z0_ohm = parse_quantity(_value(entry, "nominal_impedance", where), "ohm")
        velocity_factor = float(_value(entry, "velocity_factor", where))
        voltage = entry.get("max_voltage")
        max_voltage_v = None if voltage is None else parse_quantity(_value(entry, "max_voltage", where), "V")
        points = (entry.get("attenuation") or {}).get("points")
        if not isinstance(points, dict) or len(points) < MIN_POINTS:
            raise LibraryError(f"{where}: attenuation.points holds {MIN_POINTS} or more frequency: loss pairs")
        frequency_hz = np.array([parse_quantity(f, "Hz") for f in points])
        loss_db_per_m = np.array([parse_loss_db_per_m(loss) for loss in points.values()])
        thermal = _thermal(entry, kind, where)
    except UnitError as exc:
        raise LibraryError(f"{where}: {exc}") from None
    if not (z0_ohm > 0 and 0 < velocity_factor <= 1):
        raise LibraryError(f"{where}: impedance must be positive and velocity factor in (0, 1]")
    if not (np.all(frequency_hz > 0) and np.all(loss_db_per_m > 0)):
        raise LibraryError(f"{where}: attenuation points need positive frequencies and losses")
    return cable_from_points(entry["id"], str(entry.get("description", "")), kind, z0_ohm, velocity_factor,
                             frequency_hz, loss_db_per_m, max_voltage_v, thermal)


@functools.lru_cache(maxsize=1)
def _cables() -> tuple[Cable, ...]:
    cables = [_build(path, entry) for path, entry in _parsed_entries()]
    # Listing order: coax before balanced, then by impedance, then the lossiest first.
    return tuple(sorted(cables, key=lambda c: (KINDS.index(c.kind), round(c.z0_nominal_ohm),
                                               -float(c.matched_loss_db_per_m(_ORDER_FREQUENCY_HZ)), c.id)))


def load_library() -> dict[str, Cable]:
    """The cable library, by id: each entry fitted to its attenuation points (read once, cached).

    Returns
    -------
    dict of str to Cable
        A new dict on each call (the `Cable` objects are frozen and shared), ordered coax first,
        then by nominal impedance, then from the lossiest cable down.

    Raises
    ------
    LibraryError
        When a file of ``cable_data/`` is malformed.
    """
    return {cable.id: cable for cable in _cables()}


@functools.lru_cache(maxsize=None)
def cable(cable_id: str) -> Cable | None:
    """One library cable by id, built on first use (a station needs only its own), or None.

    Raises
    ------
    LibraryError
        When its file is malformed.
    """
    wanted = cable_id.lower()  # ids are lower case; RG-213 names rg-213
    for path, entry in _parsed_entries():
        if entry["id"] == wanted:
            return _build(path, entry)
    return None


def nearest_ids(name: str, n: int = 3) -> list[str]:
    """Library ids closest to ``name``, for "unknown cable id, did you mean ..." messages.

    Parameters
    ----------
    name : str
        The id that was not found.
    n : int
        At most this many suggestions.

    Returns
    -------
    list of str
        Close matches, best first (`difflib.get_close_matches`), then ids that contain ``name``
        (so that ``window`` finds ``window-line-450``); empty when nothing is close.
    """
    ids = [entry["id"] for _, entry in _parsed_entries()]
    wanted = name.strip().lower().replace("_", "-").replace(" ", "-")
    close = difflib.get_close_matches(wanted, ids, n=n, cutoff=0.6)
    containing = [i for i in ids if len(wanted) >= 3 and wanted in i and i not in close]
    return (close + containing)[:n]
