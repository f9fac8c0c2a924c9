"""Station files: YAML with units in, a validated `Station` in SI floats out.

The document is checked against an explicit schema before anything is built: unknown keys are
errors, and every error names its file, line and key path (`StationError`).
"""
from __future__ import annotations

import math
from pathlib import Path

import numpy as np
import yaml

from . import bands as band_table
from .budget import Station
from .cables import CONDUCTIVITY_S_PER_M, cable_from_points, coax_from_geometry, two_wire_from_geometry
from .elements import Line
from .loads import ImpedanceTable, SwrTable, outside_table
from .units import UnitError, parse_impedance, parse_loss_db_per_m, parse_quantity


class StationError(ValueError):
    """Bad input, with where it is: rendered as ``FILE:LINE: what is wrong (at key.path)``."""

    def __init__(self, file, line, message, path=""):
        self.file, self.line, self.message, self.path = str(file), line, message, path
        where = f" (at {path})" if path else ""
        super().__init__(f"{self.file}:{line}: {message}{where}")


class _Mapping(dict):
    """A YAML mapping that remembers the line of each key and of itself."""

    line = 0
    key_lines: dict


class _Sequence(list):
    """A YAML sequence that remembers the line of each item and of itself."""

    line = 0
    item_lines: list


class _LineLoader(yaml.SafeLoader):
    """Safe YAML loader that records lines and refuses duplicate keys."""


def _construct_mapping(loader, node):
    loader.flatten_mapping(node)
    result = _Mapping()
    result.line, result.key_lines = node.start_mark.line + 1, {}
    for key_node, value_node in node.value:
        key = loader.construct_object(key_node, deep=True)
        try:
            hash(key)
        except TypeError:
            raise StationError(loader.name, key_node.start_mark.line + 1, "a mapping key must be a plain value") from None
        if key in result:
            raise StationError(loader.name, key_node.start_mark.line + 1, f"duplicate key {key!r}")
        result[key] = loader.construct_object(value_node, deep=True)
        result.key_lines[key] = key_node.start_mark.line + 1
    return result


def _construct_sequence(loader, node):
    result = _Sequence(loader.construct_object(child, deep=True) for child in node.value)
    result.line = node.start_mark.line + 1
    result.item_lines = [child.start_mark.line + 1 for child in node.value]
    return result


_LineLoader.add_constructor(yaml.resolver.BaseResolver.DEFAULT_MAPPING_TAG, _construct_mapping)
_LineLoader.add_constructor(yaml.resolver.BaseResolver.DEFAULT_SEQUENCE_TAG, _construct_sequence)


class _Context:
    """Where a value sits: the file, the key path and the line; raises `StationError`s there."""

    def __init__(self, file, path="", line=1):
        self.file, self.path, self.line = file, path, line

    def child(self, parent, key):
        if isinstance(parent, _Mapping):
            line = parent.key_lines.get(key, parent.line)
        elif isinstance(parent, _Sequence) and isinstance(key, int) and key < len(parent.item_lines):
            line = parent.item_lines[key]
        else:
            line = self.line
        path = f"{self.path}[{key}]" if isinstance(key, int) else (f"{self.path}.{key}" if self.path else str(key))
        return _Context(self.file, path, line)

    def error(self, message):
        return StationError(self.file, self.line, message, self.path)


def _mapping(value, ctx, required=(), optional=()):
    """Check that ``value`` is a mapping with exactly the allowed keys."""
    if not isinstance(value, dict):
        raise ctx.error(f"expected a mapping with keys {', '.join(required + optional)}")
    for key in value:
        if key not in required and key not in optional:
            allowed = ", ".join(required + optional)
            raise ctx.child(value, key).error(f"unknown key {key!r}; allowed here: {allowed}")
    for key in required:
        if key not in value:
            raise ctx.error(f"missing key {key!r}")
    return value


def _quantity(parent, key, ctx, unit, *, positive=True, bare_unit=None):
    """Read ``parent[key]`` as a quantity in ``unit``."""
    where = ctx.child(parent, key)
    try:
        result = parse_quantity(parent[key], unit, bare_unit=bare_unit)
    except UnitError as exc:
        raise where.error(str(exc)) from None
    if positive and not result > 0:
        raise where.error(f"must be greater than zero, got {parent[key]!r}")
    return result


def _number(parent, key, ctx, *, low=None, high=None, low_open=True):
    """Read ``parent[key]`` as a plain finite number inside (low, high]."""
    value = parent[key]
    where = ctx.child(parent, key)
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value):
        raise where.error(f"expected a number, got {value!r}")
    if low is not None and (value <= low if low_open else value < low):
        raise where.error(f"must be {'above' if low_open else 'at least'} {low:g}, got {value!r}")
    if high is not None and value > high:
        raise where.error(f"must be at most {high:g}, got {value!r}")
    return float(value)


def _text(parent, key, ctx):
    value = parent[key]
    if not isinstance(value, str) or not value.strip():
        raise ctx.child(parent, key).error(f"expected text, got {value!r}")
    return value.strip()


def _frequency_table(table, ctx, read_value):
    """Read ``{frequency: value}`` into increasing frequencies [Hz] and values."""
    if not isinstance(table, dict) or not table:
        raise ctx.error("expected a table of frequency: value, for example {7.15 MHz: 58+j12}")
    rows = []
    for key, value in table.items():
        where = ctx.child(table, key)
        try:
            frequency = parse_quantity(key, "Hz")
        except UnitError as exc:
            raise where.error(str(exc)) from None
        if not frequency > 0:
            raise where.error(f"frequency must be greater than zero, got {key!r}")
        rows.append((frequency, read_value(value, where), where))
    rows.sort(key=lambda row: row[0])
    for (f1, _, _), (f2, _, where) in zip(rows, rows[1:]):
        if f2 == f1:
            raise where.error(f"frequency {f2 / 1e6:g} MHz appears twice")
    return np.array([r[0] for r in rows]), [r[1] for r in rows]


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
    _mapping(doc, ctx, optional=("impedance", "swr"))
    if ("impedance" in doc) == ("swr" in doc):
        raise ctx.error("give the antenna as exactly one of impedance: {...} or swr: {...}")
    if "impedance" in doc:
        f, z = _frequency_table(doc["impedance"], ctx.child(doc, "impedance"), _read_impedance)
        return ImpedanceTable(f, np.array(z, dtype=complex)), ctx.child(doc, "impedance")
    f, swr = _frequency_table(doc["swr"], ctx.child(doc, "swr"), _read_swr)
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
        _mapping(doc, ctx, required=_POINTS_KEYS, optional=("kind", "geometry") + common)
    elif geometry == "coax":
        _mapping(doc, ctx, required=("geometry",) + _COAX_KEYS,
                 optional=("inner_material", "outer_material", "inner_factor", "outer_factor") + common)
    elif geometry == "two-wire":
        _mapping(doc, ctx, required=("geometry",) + _TWO_WIRE_KEYS,
                 optional=("permittivity", "velocity_factor", "loss_tangent", "material", "conductor_factor") + common)
    else:
        raise ctx.child(doc, "geometry").error(f"geometry is coax or two-wire, got {geometry!r}")
    description = _text(doc, "description", ctx) if "description" in doc else f"inline cable of {label}"
    max_voltage = _quantity(doc, "max_voltage", ctx, "V") if "max_voltage" in doc else None
    cable_id = f"inline:{ctx.path}"

    if geometry is None:
        kind = doc.get("kind", "coax")
        if kind not in ("coax", "balanced"):
            raise ctx.child(doc, "kind").error(f"kind is coax or balanced, got {kind!r}")
        z0 = _quantity(doc, "impedance", ctx, "ohm", bare_unit="ohm")
        vf = _number(doc, "velocity_factor", ctx, low=0, high=1)

        def read_loss(value, where):
            try:
                loss = parse_loss_db_per_m(value)
            except UnitError as exc:
                raise where.error(str(exc)) from None
            if not loss > 0:
                raise where.error(f"a cable loss is greater than zero, got {value!r}")
            return loss

        f, loss = _frequency_table(doc["loss"], ctx.child(doc, "loss"), read_loss)
        return cable_from_points(cable_id, description, kind, z0, vf, f, loss, max_voltage)

    def material(key):
        name = doc.get(key, "copper")
        if name not in CONDUCTIVITY_S_PER_M:
            raise ctx.child(doc, key).error(f"unknown material {name!r}; known: {', '.join(CONDUCTIVITY_S_PER_M)}")
        return name

    def factor(key):
        return _number(doc, key, ctx, low=1, low_open=False) if key in doc else 1.0

    def tangent():
        return _number(doc, "loss_tangent", ctx, low=0, high=1, low_open=False) if "loss_tangent" in doc else 0.0

    if geometry == "coax":
        d = _quantity(doc, "inner_diameter", ctx, "m")
        big_d = _quantity(doc, "dielectric_diameter", ctx, "m")
        if not big_d > d:
            raise ctx.child(doc, "dielectric_diameter").error("must be larger than the inner diameter")
        return coax_from_geometry(cable_id, description, d, big_d, _number(doc, "permittivity", ctx, low=1, low_open=False),
                                  tangent(), material("inner_material"), material("outer_material"),
                                  factor("inner_factor"), factor("outer_factor"), max_voltage)
    d = _quantity(doc, "wire_diameter", ctx, "m")
    spacing = _quantity(doc, "spacing", ctx, "m")
    if not spacing > d:
        raise ctx.child(doc, "spacing").error("the centre spacing must be larger than the wire diameter")
    if "permittivity" in doc and "velocity_factor" in doc:
        raise ctx.error("give permittivity or velocity_factor, not both")
    if "velocity_factor" in doc:
        permittivity = _number(doc, "velocity_factor", ctx, low=0, high=1) ** -2
    elif "permittivity" in doc:
        permittivity = _number(doc, "permittivity", ctx, low=1, low_open=False)
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
    _mapping(doc, ctx, required=("cable", "length"), optional=("label",))
    label = _text(doc, "label", ctx) if "label" in doc else f"line {index + 1}"
    cable = _cable(doc["cable"], ctx.child(doc, "cable"), label)
    length = _quantity(doc, "length", ctx, "m")
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
            frequency = _quantity(values, i, where, "Hz")
            labels.append(f"{frequency / 1e6:g} MHz")
            frequencies.append(frequency)
    if not labels:
        raise ctx.error("give bands: [...] (with region:) or frequencies: [...], or both")
    return tuple(labels), np.array(frequencies)


def station_from_document(doc, file="<station>") -> Station:
    """Validate a parsed station document and build the `Station`."""
    ctx = _Context(file, "", getattr(doc, "line", 1))
    _mapping(doc, ctx, required=("name", "radio", "antenna", "feed"),
             optional=("region", "bands", "frequencies"))
    name = _text(doc, "name", ctx)
    radio_ctx = ctx.child(doc, "radio")
    radio = _mapping(doc["radio"], radio_ctx, required=("power",), optional=("impedance",))
    power_w = _quantity(radio, "power", radio_ctx, "W")
    z_ref = _quantity(radio, "impedance", radio_ctx, "ohm", bare_unit="ohm") if "impedance" in radio else 50.0
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
    loader = _LineLoader(text)
    loader.name = str(file)
    try:
        doc = loader.get_single_data()
    except yaml.MarkedYAMLError as exc:
        mark = exc.problem_mark or exc.context_mark
        line = mark.line + 1 if mark else 1
        raise StationError(file, line, f"YAML syntax error: {exc.problem or exc}") from None
    except yaml.YAMLError as exc:
        raise StationError(file, 1, f"YAML error: {exc}") from None
    finally:
        loader.dispose()
    if doc is None:
        raise StationError(file, 1, "the station file is empty")
    return station_from_document(doc, file)


def load_station(path) -> Station:
    """Read and validate a station file."""
    path = Path(path)
    try:
        text = path.read_text(encoding="utf-8")
    except (OSError, UnicodeDecodeError) as exc:
        raise StationError(path, 0, f"cannot read the station file: {exc.strerror if isinstance(exc, OSError) else exc}") from None
    return parse_station_text(text, path)
