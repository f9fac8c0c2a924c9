"""The feed list of a station file: each element's keys, units and defaults, built into two-ports.

Defaults, all documented in the README where the key is:
- connector: ``loss`` 0.05 dB each, ``count`` 1 (common practice: a good coax connector at HF
  and VHF loses a few hundredths of a dB); modelled as a series resistance.
- choke: ``loss`` 0.05 dB differential-mode matched loss (common practice for a ferrite or
  coiled-coax current choke at HF); ``length`` 1.5 m and ``velocity_factor`` 0.66 of the line
  section that is its differential path (common practice: a coax-wound choke);
  ``min_common_mode`` 500 ohm, the common-mode impedance below which a band is flagged (common
  practice).
- balun: ``type`` current; ``loss`` 0.2 dB (common practice for a ferrite-core current balun at
  HF); ``length`` 1 m and ``velocity_factor`` 0.7 of its winding (from memory); ``input:
  unbalanced``, ``output: balanced``. ``type: voltage``: ``inductance`` 20 uH (its magnetising
  inductance: four times 50 ohm of reactance at 1.8 MHz, common practice) and ``core_q`` 20
  (from memory) in place of ``length`` and ``velocity_factor``.
- line: ``sweeps`` none (open and short sweeps for `linecalc line`); its ``velocity_factor`` none
  (the physical length is the line's ``length``).
- meter: ``impedance`` the radio's reference impedance.
- series / shunt parts: ``inductor_q`` 100, ``capacitor_q`` 1000 (common practice), the
  resistor ideal.
- tuner: ``network`` T; ``capacitance`` 10 pF to 500 pF and ``inductance`` 0.05 uH to 30 uH for
  every capacitor and inductor (common practice for a wide-range manual tuner, from memory);
  ``inductor_q`` 100, ``capacitor_q`` 1000; ``max_swr`` 3 for ``network: builtin`` (common
  practice: built-in tuners match up to about 3:1), whose parts span 5 pF to 3000 pF and
  0.05 uH to 10 uH (typical of the switched parts of a radio's built-in L network, from memory;
  enough to match 3:1 from 160 m up); ``adjust`` once for L and T (set at the row's frequency,
  held across a sweep), automatic for builtin; ``output`` unbalanced; optional ratings
  ``capacitor_voltage_rating`` (peak volts) and ``inductor_current_rating`` (RMS amperes).
"""
from __future__ import annotations

import dataclasses

import numpy as np

from linecalc.physics.cables import (CONDUCTIVITY_S_PER_M, IACS_S_PER_M, STEEL_CORE_CONDUCTIVITY_S_PER_M,
                                     cable_from_points, cladding_thickness_m, coax_from_geometry,
                                     two_wire_from_geometry)
from linecalc.elements import Choke, Connector, Line, LumpedPart, Meter, Stub, Transformer, Tuner, VoltageBalun
from linecalc.elements.parts import (BALUN_LENGTH_M, BALUN_VELOCITY_FACTOR, CHOKE_LENGTH_M, CHOKE_VELOCITY_FACTOR,
                                     VOLTAGE_BALUN_CORE_Q, VOLTAGE_BALUN_INDUCTANCE_H)
from linecalc.physics.line_fit import OpenShortSweeps
from linecalc.physics.matching import TunerParts
from linecalc.io.yaml_schema import decibels, frequency_table, mapping, number, quantity, string
from linecalc.io.units import UnitError, parse_impedance, parse_loss_db_per_m

CONNECTOR_LOSS_DB = 0.05
CHOKE_LOSS_DB = 0.05
CHOKE_MIN_COMMON_MODE_OHM = 500.0
BALUN_LOSS_DB = 0.2
INDUCTOR_Q = 100.0
CAPACITOR_Q = 1000.0
# Limits past which a value is no station's: matched loss of a cable [dB/m], part Q, connectors
# in one element, balun impedance ratio.
LOSS_DB_PER_M = (1e-9, 1e3)
Q_RANGE = (1.0, 1e6)
# A voltage balun's magnetising inductance [H]: from 1 nH (a fraction of a turn) to 1 H (far past
# any HF winding).
BALUN_INDUCTANCE_RANGE_H = (1e-9, 1.0)
MAX_CONNECTORS = 1000
# Largest loss of one connector, choke or balun, and of a connector element's count together [dB]:
# a part that loses more turns nearly all the power into heat and is no part of a feed path.
MAX_PART_LOSS_DB = 20.0
MAX_CONNECTORS_LOSS_DB = 100.0
MAX_WINDING_M = 100.0  # a choke's or balun's line section; longer is a line element
RATIO_RANGE = (1e-4, 1e4)
# Open and short sweeps are on one grid when every frequency agrees to this share (a file written
# with fewer digits than the other still matches; two different grids do not).
SWEEP_GRID_RTOL = 1e-9
TUNER_CAPACITANCE_F = (10e-12, 500e-12)
TUNER_INDUCTANCE_H = (0.05e-6, 30e-6)
TUNER_MAX_SWR = 3.0
BUILTIN_CAPACITANCE_F = (5e-12, 3000e-12)
BUILTIN_INDUCTANCE_H = (0.05e-6, 10e-6)
TUNER_ADJUST = {"L": "once", "T": "once", "builtin": "automatic"}


_POINTS_KEYS = ("impedance", "velocity_factor", "loss")
_COAX_KEYS = ("inner_diameter", "dielectric_diameter", "permittivity", "loss_tangent")
_TWO_WIRE_KEYS = ("wire_diameter", "spacing")


def _rated(cable, max_power_w):
    """The cable with its matched average power rating [W] (None: unknown)."""
    return dataclasses.replace(cable, max_power_w=max_power_w) if max_power_w is not None else cable


def _inline_cable(doc, ctx, label):
    """A cable given in the station file: loss points, or coax or two-wire geometry."""
    if not isinstance(doc, dict):
        raise ctx.error("a cable is a library id or a mapping")
    geometry = doc.get("geometry")
    common = ("description", "max_voltage", "max_power")
    if geometry is None:
        mapping(doc, ctx, required=_POINTS_KEYS, optional=("kind", "geometry") + common)
    elif geometry == "coax":
        mapping(doc, ctx, required=("geometry",) + _COAX_KEYS,
                 optional=("inner_material", "outer_material", "inner_factor", "outer_factor",
                           "inner_conductivity_iacs") + common)
    elif geometry == "two-wire":
        mapping(doc, ctx, required=("geometry",) + _TWO_WIRE_KEYS,
                 optional=("permittivity", "velocity_factor", "loss_tangent", "material", "conductor_factor") + common)
    else:
        raise ctx.child(doc, "geometry").error(f"geometry is coax or two-wire, got {geometry!r}")
    description = string(doc, "description", ctx) if "description" in doc else f"inline cable of {label}"
    max_voltage = quantity(doc, "max_voltage", ctx, "V") if "max_voltage" in doc else None
    max_power = quantity(doc, "max_power", ctx, "W") if "max_power" in doc else None
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
            if not LOSS_DB_PER_M[0] <= loss <= LOSS_DB_PER_M[1]:
                raise where.error(f"{value!r} is outside any real cable's loss ({LOSS_DB_PER_M[0]:g} to "
                                  f"{LOSS_DB_PER_M[1]:g} dB/m)")
            return loss

        f, loss = frequency_table(doc["loss"], ctx.child(doc, "loss"), read_loss)
        return _rated(cable_from_points(cable_id, description, kind, z0, vf, f, loss, max_voltage), max_power)

    def material(key):
        name = doc.get(key, "copper")
        if not isinstance(name, str) or name not in CONDUCTIVITY_S_PER_M:  # a mapping here cannot be looked up
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
        cladding = None
        if "inner_conductivity_iacs" in doc:
            if material("inner_material") != "copper-clad steel":
                raise ctx.child(doc, "inner_conductivity_iacs").error(
                    "inner_conductivity_iacs belongs to inner_material: copper-clad steel")
            low = STEEL_CORE_CONDUCTIVITY_S_PER_M / IACS_S_PER_M * 100
            iacs = number(doc, "inner_conductivity_iacs", ctx, low=low, high=100)
            cladding = cladding_thickness_m(d, iacs / 100 * IACS_S_PER_M)
        return _rated(coax_from_geometry(cable_id, description, d, big_d,
                                         number(doc, "permittivity", ctx, low=1, low_open=False), tangent(),
                                         material("inner_material"), material("outer_material"),
                                         factor("inner_factor"), factor("outer_factor"), max_voltage, cladding),
                      max_power)
    d = quantity(doc, "wire_diameter", ctx, "m")
    spacing = quantity(doc, "spacing", ctx, "m")
    if not spacing > d:
        raise ctx.child(doc, "spacing").error("the centre spacing must be larger than the wire diameter")
    if "permittivity" in doc and "velocity_factor" in doc:
        raise ctx.error("give permittivity or velocity_factor, not both")
    if "velocity_factor" in doc:
        velocity_factor = number(doc, "velocity_factor", ctx, low=0, high=1)
        try:
            permittivity = velocity_factor ** -2
        except OverflowError:  # below about 1e-154 the permittivity is past the largest float
            raise ctx.child(doc, "velocity_factor").error(f"too small to compute with, got {velocity_factor!r}") from None
    elif "permittivity" in doc:
        permittivity = number(doc, "permittivity", ctx, low=1, low_open=False)
    else:
        permittivity = 1.0
    return _rated(two_wire_from_geometry(cable_id, description, d, spacing, permittivity, tangent(),
                                         material("material"), factor("conductor_factor"), max_voltage), max_power)


def read_cable(value, ctx, label):
    """A library id or an inline cable (points or geometry) -> `Cable`."""
    if isinstance(value, str):
        from linecalc.io import cable_library as library

        found = library.cable(value)
        if found is None:
            near = library.nearest_ids(value)
            hint = f"; did you mean {', '.join(near)}?" if near else "; `linecalc cables` lists the library"
            raise ctx.error(f"unknown cable id {value!r}{hint}")
        return found
    return _inline_cable(value, ctx, label)


def _label(doc, ctx, kind, index):
    return string(doc, "label", ctx) if "label" in doc else f"{kind} {index + 1}"


def _line(doc, ctx, index, z_ref_ohm):
    mapping(doc, ctx, required=("cable", "length"), optional=("label", "sweeps"))
    label = _label(doc, ctx, "line", index)
    cable = read_cable(doc["cable"], ctx.child(doc, "cable"), label)
    length = quantity(doc, "length", ctx, "m")
    sweeps = _sweeps(doc["sweeps"], ctx.child(doc, "sweeps")) if "sweeps" in doc else None
    return Line(cable=cable, length_m=length, label=label, sweeps=sweeps)


def _sweep_file(doc, ctx, key):
    """One Touchstone one-port of ``sweeps:`` (a path relative to the station file) -> (f [Hz], Z [ohm], name)."""
    from pathlib import Path

    from linecalc.errors import StationError
    from linecalc.io.touchstone import TouchstoneError, read_one_port

    name = string(doc, key, ctx)
    where = ctx.child(doc, key)
    try:
        frequency_hz, z_ohm = read_one_port(Path(ctx.file).parent / name)
    except TouchstoneError as exc:
        if exc.line is None:
            raise where.error(str(exc)) from None
        raise StationError(exc.file, exc.line, exc.message) from None
    if not np.all(np.isfinite(z_ohm)):  # an exact open (S = 1): no line constants there
        raise where.error(f"the sweep {name} is an exact open (S = 1, or Y = 0) at "
                          f"{int((~np.isfinite(z_ohm)).sum())} point(s): its impedance is infinite there, which no "
                          "real line's open end reads; leave those points out")
    return frequency_hz, z_ohm, name


def _sweeps(doc, ctx):
    """``sweeps: {open: FILE.s1p, short: FILE.s1p, velocity_factor: 0.66}``: the line's near end swept with its
    far end open, then shorted, on one frequency grid; ``velocity_factor`` (none by default) says the
    physical length is to be found from it rather than the line's ``length`` used."""
    mapping(doc, ctx, required=("open", "short"), optional=("velocity_factor",))
    f_open, z_open, open_name = _sweep_file(doc, ctx, "open")
    f_short, z_short, short_name = _sweep_file(doc, ctx, "short")
    if f_open.shape != f_short.shape or not np.allclose(f_open, f_short, rtol=SWEEP_GRID_RTOL, atol=0):
        raise ctx.child(doc, "short").error(
            f"the open sweep {open_name} ({f_open.size} points, {f_open[0] / 1e6:g} to {f_open[-1] / 1e6:g} MHz) and "
            f"the short sweep {short_name} ({f_short.size} points, {f_short[0] / 1e6:g} to {f_short[-1] / 1e6:g} MHz) "
            "are on different frequencies; sweep both on the same points")
    velocity_factor = number(doc, "velocity_factor", ctx, low=0, high=1) if "velocity_factor" in doc else None
    return OpenShortSweeps(f_open, z_open, z_short, open_name, short_name, velocity_factor, ctx.path, ctx.line)


def _loss(doc, ctx, default_db):
    """A non-negative loss in dB (``0.1 dB`` or a bare number in dB)."""
    if "loss" not in doc:
        return default_db
    loss = decibels(doc, "loss", ctx, "dB")
    if not 0 <= loss <= MAX_PART_LOSS_DB:
        raise ctx.child(doc, "loss").error(f"a part's loss is zero or more dB, at most {MAX_PART_LOSS_DB:g} dB, "
                                           f"got {doc['loss']!r}")
    return loss


def _connector(doc, ctx, index, z_ref_ohm):
    mapping(doc or {}, ctx, optional=("count", "loss", "label"))
    doc = doc or {}
    count = doc.get("count", 1)
    if isinstance(count, bool) or not isinstance(count, int) or not 1 <= count <= MAX_CONNECTORS:
        raise ctx.child(doc, "count").error(f"count is a whole number from 1 to {MAX_CONNECTORS}, got {count!r}")
    loss_db = _loss(doc, ctx, CONNECTOR_LOSS_DB)
    if loss_db * count > MAX_CONNECTORS_LOSS_DB:
        raise ctx.child(doc, "count").error(f"{count} connectors of {loss_db:g} dB lose {loss_db * count:g} dB "
                                            f"together; at most {MAX_CONNECTORS_LOSS_DB:g} dB")
    return Connector(_label(doc, ctx, "connector", index), loss_db, z_ref_ohm, count)


def _choke(doc, ctx, index, z_ref_ohm):
    doc = doc or {}
    mapping(doc, ctx, optional=("loss", "length", "velocity_factor", "common_mode", "min_common_mode", "label"))
    table = ()
    if "common_mode" in doc:
        def read(value, where):
            try:
                return abs(parse_impedance(value))
            except UnitError as exc:
                raise where.error(str(exc)) from None

        f, z = frequency_table(doc["common_mode"], ctx.child(doc, "common_mode"), read)
        table = tuple(zip(f.tolist(), z))
    threshold = (quantity(doc, "min_common_mode", ctx, "ohm", bare_unit="ohm") if "min_common_mode" in doc
                 else CHOKE_MIN_COMMON_MODE_OHM)
    length, velocity_factor = _winding(doc, ctx, CHOKE_LENGTH_M, CHOKE_VELOCITY_FACTOR)
    return Choke(_label(doc, ctx, "choke", index), _loss(doc, ctx, CHOKE_LOSS_DB), z_ref_ohm, length, velocity_factor,
                 common_mode_table=table, common_mode_threshold_ohm=threshold)


def _winding(doc, ctx, default_length_m, default_velocity_factor):
    """The length [m] and velocity factor of a choke's or balun's line section."""
    length = quantity(doc, "length", ctx, "m") if "length" in doc else default_length_m
    if not length <= MAX_WINDING_M:
        raise ctx.child(doc, "length").error(f"a choke or balun winding is at most {MAX_WINDING_M:g} m, "
                                             f"got {doc['length']!r}; a longer one is a line")
    velocity_factor = (number(doc, "velocity_factor", ctx, low=0, high=1) if "velocity_factor" in doc
                       else default_velocity_factor)
    return length, velocity_factor


def _ratio(doc, ctx):
    value = doc["ratio"]
    where = ctx.child(doc, "ratio")
    try:
        if isinstance(value, str) and ":" in value:
            high, low = (float(part) for part in value.split(":"))
            ratio = high / low
        elif isinstance(value, (int, float)) and not isinstance(value, bool):
            ratio = float(value)
        else:
            raise ValueError
    except (ValueError, ZeroDivisionError):
        raise where.error(f"a ratio is written 4:1 or 4, got {value!r}") from None
    if np.isfinite(ratio) and ratio > 0 and not RATIO_RANGE[0] <= ratio <= RATIO_RANGE[1]:
        raise where.error(f"an impedance ratio from {RATIO_RANGE[0]:g} to {RATIO_RANGE[1]:g}, got {value!r}")
    if not (np.isfinite(ratio) and ratio > 0):
        raise where.error(f"an impedance ratio is greater than zero, got {value!r}")
    return ratio


def _side(doc, ctx, key, default):
    value = doc.get(key, default)
    if value not in ("balanced", "unbalanced"):
        raise ctx.child(doc, key).error(f"{key} is balanced or unbalanced, got {value!r}")
    return value == "balanced"


def _voltage_balun(doc, ctx, index, z_ref_ohm):
    """``type: voltage``: its magnetising inductance and core Q in place of a winding line."""
    mapping(doc, ctx, required=("ratio", "type"), optional=("loss", "inductance", "core_q", "input", "output", "label"))
    inductance = VOLTAGE_BALUN_INDUCTANCE_H
    if "inductance" in doc:
        inductance = quantity(doc, "inductance", ctx, "H")
        low, high = BALUN_INDUCTANCE_RANGE_H
        if not low <= inductance <= high:
            raise ctx.child(doc, "inductance").error(f"a magnetising inductance from {low * 1e6:g} uH to "
                                                     f"{high:g} H, got {doc['inductance']!r}")
    return VoltageBalun(_label(doc, ctx, "balun", index), _ratio(doc, ctx), _loss(doc, ctx, BALUN_LOSS_DB), z_ref_ohm,
                        _side(doc, ctx, "input", "unbalanced"), _side(doc, ctx, "output", "balanced"),
                        inductance, _q(doc, ctx, "core_q", VOLTAGE_BALUN_CORE_Q))


def _balun(doc, ctx, index, z_ref_ohm):
    balun_type = doc.get("type", "current") if isinstance(doc, dict) else "current"
    if balun_type not in ("current", "voltage"):
        raise ctx.child(doc, "type").error(f"a balun's type is current or voltage, got {balun_type!r}")
    if balun_type == "voltage":
        return _voltage_balun(doc, ctx, index, z_ref_ohm)
    mapping(doc, ctx, required=("ratio",),
            optional=("type", "loss", "length", "velocity_factor", "input", "output", "label"))
    length, velocity_factor = _winding(doc, ctx, BALUN_LENGTH_M, BALUN_VELOCITY_FACTOR)
    return Transformer(_label(doc, ctx, "balun", index), _ratio(doc, ctx), _loss(doc, ctx, BALUN_LOSS_DB), z_ref_ohm,
                       _side(doc, ctx, "input", "unbalanced"), _side(doc, ctx, "output", "balanced"),
                       length, velocity_factor)


def _meter(doc, ctx, index, z_ref_ohm):
    doc = doc or {}
    mapping(doc, ctx, optional=("impedance", "label"))
    impedance = quantity(doc, "impedance", ctx, "ohm", bare_unit="ohm") if "impedance" in doc else z_ref_ohm
    return Meter(_label(doc, ctx, "meter", index), impedance)


def _q(doc, ctx, key, default):
    """An unloaded Q: above zero; at least `Q_RANGE`'s 1 and at most its 1e6 (a part of Q below 1
    is mostly resistor, one above 1e6 is ideal to every digit shown)."""
    if key not in doc:
        return default
    q = number(doc, key, ctx, low=0)
    if not Q_RANGE[0] <= q <= Q_RANGE[1]:
        raise ctx.child(doc, key).error(f"a Q from {Q_RANGE[0]:g} to {Q_RANGE[1]:g}, got {doc[key]!r}")
    return q


def _part(placement):
    def build(doc, ctx, index, z_ref_ohm):
        mapping(doc, ctx, optional=("r", "l", "c", "inductor_q", "capacitor_q", "label"))
        if not any(key in doc for key in ("r", "l", "c")):
            raise ctx.error("give at least one of r, l, c (in series with each other)")
        resistance = quantity(doc, "r", ctx, "ohm", positive=False, bare_unit="ohm") if "r" in doc else 0.0
        if not resistance >= 0:  # a negative resistance would make power: the parts are passive
            raise ctx.child(doc, "r").error(f"a resistance is zero or more ohm, got {doc['r']!r}")
        if placement == "shunt" and resistance == 0 and "l" not in doc and "c" not in doc:
            raise ctx.error("a shunt part of zero impedance (r: 0 alone) shorts the path; "
                            "give l or c, or a resistance above zero")
        return LumpedPart(
            _label(doc, ctx, placement, index), placement, z_ref_ohm, resistance_ohm=resistance,
            inductance_h=quantity(doc, "l", ctx, "H") if "l" in doc else 0.0,
            capacitance_f=quantity(doc, "c", ctx, "F") if "c" in doc else None,
            inductor_q=_q(doc, ctx, "inductor_q", INDUCTOR_Q), capacitor_q=_q(doc, ctx, "capacitor_q", CAPACITOR_Q))
    return build


def _stub(doc, ctx, index, z_ref_ohm):
    mapping(doc, ctx, required=("cable", "length", "end"), optional=("label",))
    label = _label(doc, ctx, "stub", index)
    end = doc["end"]
    if end not in ("open", "short"):
        raise ctx.child(doc, "end").error(f"end is open or short, got {end!r}")
    return Stub(label, read_cable(doc["cable"], ctx.child(doc, "cable"), label), quantity(doc, "length", ctx, "m"),
                end == "short", z_ref_ohm)


def _range(doc, ctx, key, unit, default):
    """A component range {min: ..., max: ...} in ``unit``; an empty or inverted range is refused."""
    if key not in doc:
        return default
    where = ctx.child(doc, key)
    limits = mapping(doc[key], where, required=("min", "max"))
    low = quantity(limits, "min", where, unit)
    high = quantity(limits, "max", where, unit)
    if not high > low:
        raise where.error(f"the range is empty or inverted: min {limits['min']} is not below max {limits['max']}")
    return low, high


def _tuner(doc, ctx, index, z_ref_ohm):
    doc = doc or {}
    mapping(doc, ctx, optional=("network", "capacitance", "inductance", "inductor_q", "capacitor_q", "max_swr",
                                "output", "capacitor_voltage_rating", "inductor_current_rating", "adjust",
                                "label"))
    network = doc.get("network", "T")
    if network not in ("L", "T", "builtin"):
        raise ctx.child(doc, "network").error(f"network is L, T or builtin, got {network!r}")
    if "max_swr" in doc and network != "builtin":
        raise ctx.child(doc, "max_swr").error("max_swr belongs to network: builtin")
    builtin = network == "builtin"
    c_min, c_max = _range(doc, ctx, "capacitance", "F", BUILTIN_CAPACITANCE_F if builtin else TUNER_CAPACITANCE_F)
    l_min, l_max = _range(doc, ctx, "inductance", "H", BUILTIN_INDUCTANCE_H if builtin else TUNER_INDUCTANCE_H)
    adjust = doc.get("adjust", TUNER_ADJUST[network])
    if adjust not in ("once", "automatic"):
        raise ctx.child(doc, "adjust").error(f"adjust is once or automatic, got {adjust!r}")
    parts = TunerParts(c_min, c_max, l_min, l_max, _q(doc, ctx, "inductor_q", INDUCTOR_Q),
                       _q(doc, ctx, "capacitor_q", CAPACITOR_Q))
    max_swr = number(doc, "max_swr", ctx, low=1, low_open=False) if "max_swr" in doc else TUNER_MAX_SWR
    voltage_rating = quantity(doc, "capacitor_voltage_rating", ctx, "V") if "capacitor_voltage_rating" in doc else None
    current_rating = quantity(doc, "inductor_current_rating", ctx, "A") if "inductor_current_rating" in doc else None
    return Tuner(_label(doc, ctx, "tuner", index), network, parts, z_ref_ohm, max_swr,
                 _side(doc, ctx, "output", "unbalanced"), voltage_rating, current_rating, adjust=adjust)


# Element builders by key in the feed list; each takes (settings, context, index, z_ref_ohm).
ELEMENT_BUILDERS = {"line": _line, "connector": _connector, "choke": _choke, "balun": _balun, "meter": _meter,
                    "series": _part("series"), "shunt": _part("shunt"), "stub": _stub, "tuner": _tuner}


def build_feed(doc, ctx, z_ref_ohm):
    """Build the feed list (radio to antenna) into a tuple of elements."""
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
        feed.append(ELEMENT_BUILDERS[kind](settings, where.child(item, kind), index, z_ref_ohm))
    return tuple(feed)


