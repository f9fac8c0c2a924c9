"""The ``antenna: wire:`` key of a station file: a wire antenna described by its shape, read
into a `linecalc.physics.wire_antenna.WireAntenna` in SI floats.

Defaults (documented in the README where the keys are): ``feed_at`` 0.5 (centre fed),
``apex_angle`` 120 degrees (inverted-V), ``diameter`` 2 mm, ``material`` copper, no radials,
``ground`` average (0.005 S/m, relative permittivity 13, common practice).
"""
from __future__ import annotations

import math
import re

from linecalc.io.yaml_schema import mapping, number, quantity, string
from linecalc.io.units import UnitError, parse_quantity
from linecalc.physics.cables import CONDUCTIVITY_S_PER_M
from linecalc.physics.wire_antenna import (INSTALL_HINT, SHAPES, GeometryError, Ground, WireAntenna, check_geometry,
                                           engine_available)

FEED_AT = 0.5
APEX_ANGLE_DEG = 120.0
DIAMETER_M = 0.002
MATERIAL = "copper"
GROUND = "average"

# Soils: conductivity [S/m] and relative permittivity at HF. The names and values follow ITU-R
# Recommendation P.527-3 (1992), Electrical characteristics of the surface of the Earth, its
# curves read near 1 to 10 MHz (from memory: check them against the edition in force). The
# 'average' ground is not one of its names but the value amateur modelling commonly uses
# (common practice).
SOILS = {
    "sea-water": (5.0, 70.0),
    "fresh-water": (3e-3, 80.0),
    "wet-ground": (1e-2, 30.0),
    "medium-dry-ground": (1e-3, 15.0),
    "very-dry-ground": (1e-4, 3.0),
    "average": (5e-3, 13.0),
}
GROUND_NAMES = ("free-space", "perfect") + tuple(SOILS)

_TIMES = re.compile(r"^\s*([0-9.eE+-]+)\s*[xX*]\s*(.+)$")


def _length(doc, ctx):
    """``length``: a quantity, or ``COUNT x QUANTITY`` (``2 x 20 m``, a doublet's legs)."""
    value = doc["length"]
    where = ctx.child(doc, "length")
    match = _TIMES.match(value) if isinstance(value, str) else None
    if match is None:
        return quantity(doc, "length", ctx, "m")
    try:
        count, leg = float(match.group(1)), parse_quantity(match.group(2), "m")
    except (ValueError, UnitError) as exc:
        raise where.error(f"length is a quantity such as 40 m, or legs times count such as 2 x 20 m: {exc}") from None
    if not (math.isfinite(count) and count > 0 and leg > 0):
        raise where.error(f"length must be greater than zero, got {value!r}")
    return quantity({"length": f"{count * leg!r} m"}, "length", where, "m")


def _number_with_unit(doc, key, where, unit_pattern, example):
    """The number of ``doc[key]``, written bare or followed by a unit matching ``unit_pattern``
    (units pint does not read here: degrees, S/m); its range is the caller's to check."""
    value = doc[key]
    text = value.strip() if isinstance(value, str) else value
    if isinstance(text, str):
        text = re.sub(rf"\s*({unit_pattern})$", "", text)
    try:
        return float(text)
    except (TypeError, ValueError):
        raise where.error(f"expected {example}, got {value!r}") from None


def _angle_rad(doc, key, ctx):
    """An angle such as ``120 deg`` or a bare number of degrees, in (0, 180]."""
    value = doc[key]
    degrees = _number_with_unit(doc, key, ctx.child(doc, key), r"deg|degrees|°", "an angle such as 120 deg")
    if isinstance(value, bool) or not 0 < degrees <= 180:
        raise ctx.child(doc, key).error(f"an apex angle from above 0 to 180 deg, got {value!r}")
    return math.radians(degrees)


def _ground(doc, ctx):
    """``ground``: free-space, perfect, a soil name, or {conductivity: S/m, permittivity}."""
    value = doc.get("ground", GROUND)
    where = ctx.child(doc, "ground")
    if isinstance(value, dict):
        mapping(value, where, required=("conductivity", "permittivity"))
        conductivity = value["conductivity"]
        sigma = _number_with_unit(value, "conductivity", where.child(value, "conductivity"), r"S/m",
                                  "a conductivity such as 0.005 S/m")
        if isinstance(conductivity, bool) or not (math.isfinite(sigma) and 0 < sigma <= 1e3):
            raise where.child(value, "conductivity").error(f"a conductivity above 0 up to 1000 S/m, got {conductivity!r}")
        permittivity = number(value, "permittivity", where, low=1, high=100, low_open=False)
        return Ground("real", sigma, permittivity)
    name = value.strip().lower() if isinstance(value, str) else value
    if name in ("free-space", "perfect"):
        return Ground(name)
    if name in SOILS:
        return Ground("real", *SOILS[name])
    raise where.error(f"ground is one of {', '.join(GROUND_NAMES)}, or {{conductivity: 0.005 S/m, permittivity: 13}}, "
                      f"got {value!r}")


def read_wire(doc, ctx, highest_frequency_hz) -> WireAntenna:
    """Read ``antenna: wire:`` (its context ``ctx``); segments are chosen for ``highest_frequency_hz``."""
    mapping(doc, ctx, required=("shape", "length", "height"),
            optional=("apex_angle", "feed_at", "diameter", "material", "radials", "ground"))
    shape = string(doc, "shape", ctx).lower()
    if shape not in SHAPES:
        raise ctx.child(doc, "shape").error(f"shape is one of {', '.join(SHAPES)}, got {doc['shape']!r}")
    for key, allowed in (("apex_angle", "inverted-v"), ("radials", "vertical")):
        if key in doc and shape != allowed:
            raise ctx.child(doc, key).error(f"{key} belongs to the {allowed} only")
    if "feed_at" in doc and shape == "vertical":
        raise ctx.child(doc, "feed_at").error("a vertical is fed at its base: leave out feed_at")
    length_m = _length(doc, ctx)
    height_m = quantity(doc, "height", ctx, "m", positive=False)
    if height_m < 0:
        raise ctx.child(doc, "height").error(f"the height is above ground, zero or more, got {doc['height']!r}")
    feed_at = number(doc, "feed_at", ctx) if "feed_at" in doc else FEED_AT
    apex_rad = _angle_rad(doc, "apex_angle", ctx) if "apex_angle" in doc else math.radians(APEX_ANGLE_DEG)
    diameter_m = quantity(doc, "diameter", ctx, "m") if "diameter" in doc else DIAMETER_M
    material = string(doc, "material", ctx).lower() if "material" in doc else MATERIAL
    if material not in CONDUCTIVITY_S_PER_M:
        raise ctx.child(doc, "material").error(f"material is one of {', '.join(CONDUCTIVITY_S_PER_M)}, "
                                               f"got {doc['material']!r}")
    count, radial_m = 0, 0.0
    if "radials" in doc:
        where = ctx.child(doc, "radials")
        radials = mapping(doc["radials"], where, required=("count", "length"))
        count_value = radials["count"]
        if isinstance(count_value, bool) or not isinstance(count_value, int) or not 1 <= count_value <= 64:
            raise where.child(radials, "count").error(f"count is a whole number from 1 to 64, got {count_value!r}")
        count, radial_m = count_value, quantity(radials, "length", where, "m")
    ground = _ground(doc, ctx)
    antenna = WireAntenna(shape=shape, length_m=length_m, height_m=height_m, radius_m=diameter_m / 2,
                          conductivity_s_per_m=CONDUCTIVITY_S_PER_M[material], ground=ground,
                          highest_frequency_hz=highest_frequency_hz, feed_at=feed_at, apex_angle_rad=apex_rad,
                          radial_count=count, radial_length_m=radial_m)
    try:
        check_geometry(antenna)
    except GeometryError as exc:
        key = exc.key if exc.key in doc else ("length" if exc.key == "wire" else exc.key)
        raise (ctx.child(doc, key) if key in doc else ctx).error(str(exc)) from None
    if not engine_available():
        raise ctx.error(f"a wire antenna is solved by the optional method-of-moments engine, which is not "
                        f"installed: {INSTALL_HINT}")
    return antenna
