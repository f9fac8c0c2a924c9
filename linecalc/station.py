"""Station files: YAML with units in, a validated `Station` in SI floats out.

The document is checked against an explicit schema before anything is built: unknown keys are
errors, and every error names its file, line and key path (`StationError`).
"""
from __future__ import annotations

import math
from pathlib import Path

import numpy as np

from . import bands as band_table
from .budget import Station
from .cables import CONDUCTIVITY_S_PER_M, cable_from_points, coax_from_geometry, two_wire_from_geometry
from .elements import Line
from .loads import ImpedanceTable, SwrTable, outside_table
from .schema import (Context, StationError, frequency_table, load_yaml_text, mapping, number,
                     quantity, string)
from .units import UnitError, parse_impedance, parse_loss_db_per_m


def _read_impedance(value, ctx):
    try:
        z = parse_impedance(value)
    except UnitError as exc:
        raise ctx.error(str(exc)) from None
    if z.real < 0:
        raise ctx.error(f"a passive antenna has a resistance of zero or more, got {value!r}")
    return z


def _read_swr(value, ctx):
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value):
        raise ctx.error(f"an SWR is a plain number such as 1.8, got {value!r}")
    if value < 1:
        raise ctx.error(f"an SWR is 1 or more, got {value!r}")
    return float(value)


def _antenna(doc, ctx):
    mapping(doc, ctx, optional=("impedance", "swr"))
    if ("impedance" in doc) == ("swr" in doc):
        raise ctx.error("give the antenna as exactly one of impedance: {...} or swr: {...}")
    if "impedance" in doc:
        f, z = frequency_table(doc["impedance"], ctx.child(doc, "impedance"), _read_impedance)
        return ImpedanceTable(f, np.array(z, dtype=complex)), ctx.child(doc, "impedance")
    f, swr = frequency_table(doc["swr"], ctx.child(doc, "swr"), _read_swr)
    return SwrTable(f, np.array(swr)), ctx.child(doc, "swr")


_POINTS_KEYS = ("impedance", "velocity_factor", "loss")
_COAX_KEYS = ("inner_diameter", "dielectric_diameter", "permittivity", "loss_tangent")
_TWO_WIRE_KEYS = ("wire_diameter", "spacing")


def _inline_cable(doc, ctx, label):
    """A cable given in the station file: loss points, or coax or two-wire geometry."""
    if not isinstance(doc, dict):
        raise ctx.error("a cable is a library id or a mapping")
    geometry = doc.get("geometry")
    common = ("description", "max_voltage")
    if geometry is None:
        mapping(doc, ctx, required=_POINTS_KEYS, optional=("kind", "geometry") + common)
    elif geometry == "coax":
        mapping(doc, ctx, required=("geometry",) + _COAX_KEYS,
                 optional=("inner_material", "outer_material", "inner_factor", "outer_factor") + common)
    elif geometry == "two-wire":
        mapping(doc, ctx, required=("geometry",) + _TWO_WIRE_KEYS,
                 optional=("permittivity", "velocity_factor", "loss_tangent", "material", "conductor_factor") + common)
    else:
        raise ctx.child(doc, "geometry").error(f"geometry is coax or two-wire, got {geometry!r}")
    description = string(doc, "description", ctx) if "description" in doc else f"inline cable of {label}"
    max_voltage = quantity(doc, "max_voltage", ctx, "V") if "max_voltage" in doc else None
    cable_id = f"inline:{ctx.path}"

    if geometry is None:
        kind = doc.get("kind", "coax")
        if kind not in ("coax", "balanced"):
            raise ctx.child(doc, "kind").error(f"kind is coax or balanced, got {kind!r}")
        z0 = quantity(doc, "impedance", ctx, "ohm", bare_unit="ohm")
        vf = number(doc, "velocity_factor", ctx, low=0, high=1)

        def read_loss(value, where):
            try:
                loss = parse_loss_db_per_m(value)
            except UnitError as exc:
                raise where.error(str(exc)) from None
            if not loss > 0:
                raise where.error(f"a cable loss is greater than zero, got {value!r}")
            return loss

        f, loss = frequency_table(doc["loss"], ctx.child(doc, "loss"), read_loss)
        return cable_from_points(cable_id, description, kind, z0, vf, f, loss, max_voltage)

    def material(key):
        name = doc.get(key, "copper")
        if name not in CONDUCTIVITY_S_PER_M:
            raise ctx.child(doc, key).error(f"unknown material {name!r}; known: {', '.join(CONDUCTIVITY_S_PER_M)}")
        return name

    def factor(key):
        return number(doc, key, ctx, low=1, low_open=False) if key in doc else 1.0

    def tangent():
        return number(doc, "loss_tangent", ctx, low=0, high=1, low_open=False) if "loss_tangent" in doc else 0.0

    if geometry == "coax":
        d = quantity(doc, "inner_diameter", ctx, "m")
        big_d = quantity(doc, "dielectric_diameter", ctx, "m")
        if not big_d > d:
            raise ctx.child(doc, "dielectric_diameter").error("must be larger than the inner diameter")
        return coax_from_geometry(cable_id, description, d, big_d, number(doc, "permittivity", ctx, low=1, low_open=False),
                                  tangent(), material("inner_material"), material("outer_material"),
                                  factor("inner_factor"), factor("outer_factor"), max_voltage)
    d = quantity(doc, "wire_diameter", ctx, "m")
    spacing = quantity(doc, "spacing", ctx, "m")
    if not spacing > d:
        raise ctx.child(doc, "spacing").error("the centre spacing must be larger than the wire diameter")
    if "permittivity" in doc and "velocity_factor" in doc:
        raise ctx.error("give permittivity or velocity_factor, not both")
    if "velocity_factor" in doc:
        permittivity = number(doc, "velocity_factor", ctx, low=0, high=1) ** -2
    elif "permittivity" in doc:
        permittivity = number(doc, "permittivity", ctx, low=1, low_open=False)
    else:
        permittivity = 1.0
    return two_wire_from_geometry(cable_id, description, d, spacing, permittivity, tangent(),
                                  material("material"), factor("conductor_factor"), max_voltage)


def _cable(value, ctx, label):
    if isinstance(value, str):
        from . import library  # the library is read only when a station names one of its cables

        cables = library.load_library()
        if value not in cables:
            near = library.nearest_ids(value)
            hint = f"; did you mean {', '.join(near)}?" if near else "; `linecalc cables` lists the library"
            raise ctx.error(f"unknown cable id {value!r}{hint}")
        return cables[value]
    return _inline_cable(value, ctx, label)


def _line(doc, ctx, index):
    mapping(doc, ctx, required=("cable", "length"), optional=("label",))
    label = string(doc, "label", ctx) if "label" in doc else f"line {index + 1}"
    cable = _cable(doc["cable"], ctx.child(doc, "cable"), label)
    length = quantity(doc, "length", ctx, "m")
    return Line(cable=cable, length_m=length, label=label)


# Element builders by key in the feed list; each takes (mapping, context, index).
ELEMENT_BUILDERS = {"line": _line}


def _feed(doc, ctx):
    if not isinstance(doc, list):
        raise ctx.error("feed is a list of elements from the radio to the antenna, for example - line: {...}")
    feed = []
    for index, item in enumerate(doc):
        where = ctx.child(doc, index)
        if not isinstance(item, dict) or len(item) != 1:
            raise where.error(f"each feed element is one key ({', '.join(ELEMENT_BUILDERS)}) with its settings")
        (kind, settings), = item.items()
        if kind not in ELEMENT_BUILDERS:
            raise where.error(f"unknown element {kind!r}; known: {', '.join(ELEMENT_BUILDERS)}")
        feed.append(ELEMENT_BUILDERS[kind](settings, where.child(item, kind), index))
    return tuple(feed)


def _rows(doc, ctx):
    """Row labels and frequencies [Hz]: the bands first, then the explicit frequencies."""
    labels, frequencies = [], []
    if "bands" in doc:
        where = ctx.child(doc, "bands")
        if "region" not in doc:
            raise ctx.error("bands need the ITU region of their edges: region: 1, 2 or 3")
        region = doc["region"]
        if region not in band_table.REGIONS or isinstance(region, bool):
            raise ctx.child(doc, "region").error(f"region must be 1, 2 or 3, got {region!r}")
        names = doc["bands"]
        if not isinstance(names, list) or not names:
            raise where.error("bands is a list of band names such as [40m, 20m]")
        for i, name in enumerate(names):
            try:
                band = band_table.band(str(name), region)
            except band_table.BandError as exc:
                raise where.child(names, i).error(str(exc)) from None
            labels.append(band.name)
            frequencies.append(band.centre_hz)
    if "frequencies" in doc:
        where = ctx.child(doc, "frequencies")
        values = doc["frequencies"]
        if not isinstance(values, list) or not values:
            raise where.error("frequencies is a list such as [7.15 MHz, 14.2 MHz]")
        for i in range(len(values)):
            frequency = quantity(values, i, where, "Hz")
            labels.append(f"{frequency / 1e6:g} MHz")
            frequencies.append(frequency)
    if not labels:
        raise ctx.error("give bands: [...] (with region:) or frequencies: [...], or both")
    return tuple(labels), np.array(frequencies)


def station_from_document(doc, file="<station>") -> Station:
    """Validate a parsed station document and build the `Station`."""
    ctx = Context(file, "", getattr(doc, "line", 1))
    mapping(doc, ctx, required=("name", "radio", "antenna", "feed"),
             optional=("region", "bands", "frequencies"))
    name = string(doc, "name", ctx)
    radio_ctx = ctx.child(doc, "radio")
    radio = mapping(doc["radio"], radio_ctx, required=("power",), optional=("impedance",))
    power_w = quantity(radio, "power", radio_ctx, "W")
    z_ref = quantity(radio, "impedance", radio_ctx, "ohm", bare_unit="ohm") if "impedance" in radio else 50.0
    labels, frequency_hz = _rows(doc, ctx)
    antenna, table_ctx = _antenna(doc["antenna"], ctx.child(doc, "antenna"))
    outside = outside_table(antenna.frequency_hz, frequency_hz)
    if outside.any():
        span = f"{antenna.frequency_hz[0] / 1e6:g} to {antenna.frequency_hz[-1] / 1e6:g} MHz"
        asked = ", ".join(f"{label} ({f / 1e6:g} MHz)" for label, f, out in zip(labels, frequency_hz, outside) if out)
        raise table_ctx.error(f"{asked} outside the antenna table, which spans {span}; it is never extrapolated")
    feed = _feed(doc["feed"], ctx.child(doc, "feed"))
    region = doc.get("region", 2)
    return Station(name=name, radio_power_w=power_w, reference_impedance_ohm=z_ref, labels=labels,
                   frequency_hz=frequency_hz, antenna=antenna, feed=feed, region=region)


def parse_station_text(text, file="<station>") -> Station:
    """Parse station YAML text; errors are `StationError` naming ``file``."""
    return station_from_document(load_yaml_text(text, file), file)


def load_station(path) -> Station:
    """Read and validate a station file."""
    path = Path(path)
    try:
        text = path.read_text(encoding="utf-8")
    except (OSError, UnicodeDecodeError) as exc:
        raise StationError(path, 0, f"cannot read the station file: {exc.strerror if isinstance(exc, OSError) else exc}") from None
    return parse_station_text(text, path)
