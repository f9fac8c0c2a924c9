"""Numbers as JSON takes them: finite floats, or null (None) where a value is infinite or
undefined (JSON has no infinity). Used by every result's ``to_dict``."""
from __future__ import annotations

import math

import numpy as np


def finite_or_none(value):
    """A float for JSON, or None where it is infinite or undefined."""
    value = float(value)
    return value if math.isfinite(value) else None


def json_value(value):
    """A reading as JSON: booleans and text as they are, numbers finite or None."""
    if isinstance(value, (bool, np.bool_)):
        return bool(value)
    if isinstance(value, (str, np.str_)):
        return str(value)
    return finite_or_none(value)


def pair(z):
    """A complex impedance as [R, X] [ohm], or None where there is none."""
    if z is None:
        return None
    return [finite_or_none(z.real), finite_or_none(z.imag)]


def json_list(values):
    """A flat list of finite floats or None."""
    return [finite_or_none(v) for v in np.ravel(values)]
