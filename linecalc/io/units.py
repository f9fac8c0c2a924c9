"""The one pint registry, and the parsers that turn text with units into SI floats.

Everything below the station loader and the CLI works in SI floats (Hz, m, ohm, W, Np/m);
these functions are the only place where a unit is read.
"""
from __future__ import annotations

import functools
import math
import re
import sys
from linecalc.errors import InputError


@functools.lru_cache(maxsize=1)
def registry():
    """The one pint registry, made on first use, with pint's parsed-definitions cache when the
    user cache folder is writable (without it pint parses its definitions afresh, same result).
    """
    import pint  # a tenth of a second: only for units outside `COMMON_UNITS`

    try:
        ureg = pint.UnitRegistry(cache_folder=":auto:")
    except OSError:
        ureg = pint.UnitRegistry()
    # Trade spellings that pint does not know by itself.
    ureg.define("ohms = ohm")
    ureg.define("Ohm = ohm")
    return ureg


# The units station files use most, as (SI unit, exact factor to it). A quantity written in one
# of them is read without pint; any other unit pint knows is read by pint. The tests check every
# factor here against pint.
COMMON_UNITS = {
    "m": ("m", 1.0), "mm": ("m", 1e-3), "cm": ("m", 1e-2), "km": ("m", 1e3), "ft": ("m", 0.3048),
    "in": ("m", 0.0254),
    "Hz": ("Hz", 1.0), "kHz": ("Hz", 1e3), "MHz": ("Hz", 1e6), "GHz": ("Hz", 1e9),
    "W": ("W", 1.0), "kW": ("W", 1e3), "mW": ("W", 1e-3),
    "ohm": ("ohm", 1.0), "ohms": ("ohm", 1.0), "Ohm": ("ohm", 1.0), "kohm": ("ohm", 1e3),
    "V": ("V", 1.0), "kV": ("V", 1e3), "A": ("A", 1.0), "mA": ("A", 1e-3),
    "pF": ("F", 1e-12), "nF": ("F", 1e-9), "uF": ("F", 1e-6),
    "nH": ("H", 1e-9), "uH": ("H", 1e-6), "mH": ("H", 1e-3),
    "K*m/W": ("K*m/W", 1.0),  # thermal resistivity, in the cable library
}

DB_PER_NEPER = 20.0 / math.log(10.0)  # 8.686 dB per neper (amplitude)

_NUMBER = r"[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?"
_LOSS = re.compile(rf"^\s*({_NUMBER})\s*dB\s*/\s*(.+?)\s*$")
_SIMPLE = re.compile(rf"^({_NUMBER})\s*({'|'.join(map(re.escape, COMMON_UNITS))})$")


class UnitError(InputError):
    """A value that cannot be read as the quantity its key asks for."""


def _common(value, text, unit):
    """The value of ``text`` in ``unit`` if it is a number and a `COMMON_UNITS` symbol, else None."""
    match = _SIMPLE.match(text)
    if match is None or unit not in {si for si, _ in COMMON_UNITS.values()}:
        return None
    si, factor = COMMON_UNITS[match.group(2)]
    if si != unit:
        raise UnitError(f"{value!r} is not a quantity in {unit} ({match.group(2)} given)")
    result = float(match.group(1)) * factor
    if not math.isfinite(result):
        raise UnitError(f"{value!r} is not a finite number")
    return result


def parse_quantity(value, unit: str, *, bare_unit: str | None = None) -> float:
    """Read ``value`` as a quantity of the dimension of ``unit`` and return it in ``unit``.

    Parameters
    ----------
    value : str, int or float
        Text such as ``"30 m"``, ``"98 ft"`` or ``"7.15 MHz"``, or a bare number.
    unit : str
        The unit the result is expressed in (for example ``"m"``, ``"Hz"``, ``"ohm"``).
    bare_unit : str or None
        The documented unit of a bare number for this key; ``None`` refuses bare numbers.

    Returns
    -------
    float
        The value in ``unit``.
    """
    if isinstance(value, bool):
        raise UnitError(f"expected a quantity in {unit}, got {value!r}")
    if isinstance(value, (int, float)):
        if bare_unit is None:
            raise UnitError(f"a bare number needs a unit here, for example '{value} {unit}'")
        if isinstance(value, int) and abs(value) > sys.float_info.max:
            raise UnitError(f"a number of {len(str(abs(value)))} digits is too large")
        return parse_quantity(f"{float(value)!r} {bare_unit}", unit)
    if not isinstance(value, str):
        raise UnitError(f"expected a quantity in {unit}, got {value!r}")
    text = value.strip()
    common = _common(value, text, unit)
    if common is not None:
        return common
    if "**" in text or "^" in text:  # pint raises to powers in Python integers: '9**9**9 m' runs for hours
        raise UnitError(f"cannot read {value!r} as a quantity in {unit}; write a number and a unit, such as '30 {unit}'")
    import pint

    ureg = registry()
    try:
        quantity = ureg.Quantity(text)
    except Exception as exc:  # pint raises several unrelated exception types on bad text
        raise UnitError(f"cannot read {value!r} as a quantity in {unit}") from exc
    try:
        if not isinstance(quantity, pint.Quantity) or quantity.dimensionless:
            if bare_unit is None:
                raise UnitError(f"{value!r} has no unit; write it as for example '{text} {unit}'")
            quantity = ureg.Quantity(float(quantity), bare_unit)
        magnitude = quantity.to(unit).magnitude
        if not isinstance(magnitude, (int, float)) or isinstance(magnitude, complex):
            raise UnitError(f"cannot read {value!r} as a quantity in {unit}")
        result = float(magnitude)
    except pint.DimensionalityError as exc:
        raise UnitError(f"{value!r} is not a quantity in {unit} ({quantity.units:~} given)") from exc
    except OverflowError:  # an integer of hundreds of digits
        raise UnitError(f"{value!r} is too large") from None
    if not math.isfinite(result):
        raise UnitError(f"{value!r} is not a finite number")
    return result


def parse_loss_db_per_m(value, *, bare_unit: str | None = None) -> float:
    """Read a matched-line attenuation such as ``"0.55 dB/100ft"`` and return dB per metre.

    Accepted forms: ``X dB/100ft``, ``X dB/100 ft``, ``X dB/100m``, ``X dB/m``, ``X dB/km``;
    any length unit pint knows may follow the slash, with an optional number in front.

    Parameters
    ----------
    value : str or float
        The attenuation text.
    bare_unit : str or None
        For a bare number, the documented denominator (``"m"`` for dB/m); ``None`` refuses it.

    Returns
    -------
    float
        Attenuation [dB/m].
    """
    if isinstance(value, (int, float)) and not isinstance(value, bool):
        if bare_unit is None:
            raise UnitError(f"a bare number needs a unit here, for example '{value} dB/100ft'")
        return float(value) / parse_quantity(f"1 {bare_unit}", "m")
    if not isinstance(value, str):
        raise UnitError(f"expected a loss such as '0.55 dB/100ft', got {value!r}")
    match = _LOSS.match(value)
    if not match:
        raise UnitError(f"cannot read {value!r} as a loss; write it as '0.55 dB/100ft' or '1.8 dB/100m'")
    db = float(match.group(1))
    length_text = match.group(2)
    if re.match(r"^\d", length_text) is None:
        length_text = "1 " + length_text
    length_m = parse_quantity(length_text, "m")
    if length_m <= 0:
        raise UnitError(f"the length in {value!r} must be positive")
    if not math.isfinite(db / length_m):  # '1e400 dB/100m' would read as infinite and fit as lossless
        raise UnitError(f"{value!r} is not a finite loss")
    return db / length_m


_COMPLEX_J_FIRST = re.compile(rf"^({_NUMBER})?\s*(?:([-+])\s*[jJ]\s*({_NUMBER}))?$")
_COMPLEX_J_LAST = re.compile(rf"^({_NUMBER})?\s*(?:([-+])\s*({_NUMBER})\s*[jJ])?$")


def parse_impedance(value) -> complex:
    """Read a complex impedance in ohm: ``58+j12``, ``58-j12``, ``58+12j``, ``[58, 12]``, ``50``, ``"50 ohm"``.

    Parameters
    ----------
    value : str, number or two-element list
        The impedance; a bare number or a list is in ohm.

    Returns
    -------
    complex
        Impedance [ohm].
    """
    if isinstance(value, bool):
        raise UnitError(f"cannot read {value!r} as an impedance")
    if isinstance(value, (int, float)):
        result = complex(float(value), 0.0)
    elif isinstance(value, (list, tuple)):
        if len(value) != 2 or not all(isinstance(v, (int, float)) and not isinstance(v, bool) for v in value):
            raise UnitError(f"an impedance list is [R, X] in ohm, got {value!r}")
        result = complex(float(value[0]), float(value[1]))
    elif isinstance(value, str):
        text = value.strip()
        text = re.sub(r"\s*(ohms?|Ohms?|Ω)\s*$", "", text)
        result = None
        for pattern in (_COMPLEX_J_FIRST, _COMPLEX_J_LAST):
            match = pattern.match(text)
            if match and (match.group(1) is not None or match.group(3) is not None):
                real = float(match.group(1)) if match.group(1) else 0.0
                imag = float(match.group(3)) if match.group(3) else 0.0
                if match.group(2) == "-":
                    imag = -imag
                result = complex(real, imag)
                break
        if result is None:
            raise UnitError(f"cannot read {value!r} as an impedance; write it as '58+j12' or '[58, 12]'")
    else:
        raise UnitError(f"cannot read {value!r} as an impedance")
    if not (math.isfinite(result.real) and math.isfinite(result.imag)):
        raise UnitError(f"{value!r} is not a finite impedance")
    return result
