"""Reading YAML with line numbers and checking it against a schema, for station files.

Every error is a `StationError` that names its file, line and key path.
"""
from __future__ import annotations

import math
import re
import sys
import unicodedata

import numpy as np
import yaml

from linecalc.errors import StationError, printable
from linecalc.io.units import UnitError, parse_quantity

class _Mapping(dict):
    """A YAML mapping that remembers the line of each key and of itself."""

    line = 0
    key_lines: dict


class _Sequence(list):
    """A YAML sequence that remembers the line of each item and of itself."""

    line = 0
    item_lines: list


# A station file nests about eight levels deep and holds a few thousand values. Anchors and
# aliases may repeat parts of it, but a few lines of aliases can expand to billions of values
# (and so can an error message that shows one); deeper or larger documents are refused.
MAX_DEPTH = 64
MAX_EXPANDED_VALUES = 1_000_000


class _LineLoader(yaml.SafeLoader):
    """Safe YAML loader that records lines, refuses duplicate keys and nesting past `MAX_DEPTH`."""

    def __init__(self, stream):
        super().__init__(stream)
        self.depth = 0

    def construct_object(self, node, deep=False):
        try:
            return super().construct_object(node, deep=deep)
        except StationError:
            raise
        except (ValueError, TypeError, KeyError) as exc:  # an explicit tag on a value it cannot read: !!float x
            raise StationError(self.name, node.start_mark.line + 1,
                               f"cannot read {node.value if isinstance(node, yaml.ScalarNode) else 'this value'!r} "
                               f"as {node.tag.rsplit(':', 1)[-1]}: {exc}") from None

    def compose_node(self, parent, index):
        # the composer recurses once per level: refuse before Python's recursion limit is reached
        if self.depth >= MAX_DEPTH:
            line = self.peek_event().start_mark.line + 1
            raise StationError(self.name, line, f"the document nests deeper than {MAX_DEPTH} levels")
        self.depth += 1
        try:
            return super().compose_node(parent, index)
        finally:
            self.depth -= 1


def _check_expansion(root, file):
    """Refuse a document whose aliases expand it past `MAX_EXPANDED_VALUES` values or `MAX_DEPTH` levels.

    One walk over the node graph, each node once (aliases share their node); a node that contains
    itself is left to the constructor, which refuses it.
    """
    size, depth, open_nodes, stack = {}, {}, set(), [(root, False)]
    while stack:
        node, children_done = stack.pop()
        if isinstance(node, yaml.MappingNode):
            children = [child for pair in node.value for child in pair]
        else:
            children = node.value if isinstance(node, yaml.SequenceNode) else []
        if children_done:
            open_nodes.discard(id(node))
            size[id(node)] = 1 + sum(size.get(id(child), 0) for child in children)
            depth[id(node)] = 1 + max((depth.get(id(child), 0) for child in children), default=0)
            if size[id(node)] > MAX_EXPANDED_VALUES or depth[id(node)] > MAX_DEPTH:
                raise StationError(file, node.start_mark.line + 1,
                                   f"with its aliases expanded this value holds more than {MAX_EXPANDED_VALUES:,} "
                                   f"values or nests deeper than {MAX_DEPTH} levels")
        elif id(node) not in size and id(node) not in open_nodes:
            open_nodes.add(id(node))
            stack.append((node, True))
            stack.extend((child, False) for child in children)


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


def _construct_int(loader, node):
    """An integer, refused where it does not fit a float (every number ends up as one)."""
    value = loader.construct_yaml_int(node)
    if abs(value) > sys.float_info.max:
        raise StationError(loader.name, node.start_mark.line + 1,
                           f"a number of {len(str(abs(value)))} digits is too large")
    return value


# YAML 1.1 reads 4:1 as the base-60 number 241 and 1_000 as 1000: a balun ratio must stay text.
# Numbers are resolved as in YAML 1.2 (plain decimal and exponent forms) instead.
_LineLoader.yaml_implicit_resolvers = {
    first: [(tag, regexp) for tag, regexp in resolvers if tag not in ("tag:yaml.org,2002:int", "tag:yaml.org,2002:float")]
    for first, resolvers in yaml.SafeLoader.yaml_implicit_resolvers.items()}
_LineLoader.add_implicit_resolver("tag:yaml.org,2002:int", re.compile(r"^[-+]?[0-9]+$"), list("-+0123456789"))
_LineLoader.add_implicit_resolver(
    "tag:yaml.org,2002:float",
    re.compile(r"^(?:[-+]?(?:[0-9]+\.?[0-9]*|\.[0-9]+)(?:[eE][-+]?[0-9]+)?|[-+]?\.(?:inf|Inf|INF)|\.(?:nan|NaN|NAN))$"),
    list("-+0123456789."))
_LineLoader.add_constructor("tag:yaml.org,2002:int", _construct_int)
_LineLoader.add_constructor(yaml.resolver.BaseResolver.DEFAULT_MAPPING_TAG, _construct_mapping)
_LineLoader.add_constructor(yaml.resolver.BaseResolver.DEFAULT_SEQUENCE_TAG, _construct_sequence)


class Context:
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
        return Context(self.file, path, line)

    def error(self, message):
        return StationError(self.file, self.line, message, self.path)


def mapping(value, ctx, required=(), optional=()):
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


# The largest magnitude a station file may give in each unit: far beyond any station (1 THz,
# 1,000 km, 10 MW, ...), near enough that no product of them overflows a float downstream.
MAGNITUDE_LIMITS = {"Hz": 1e12, "m": 1e6, "W": 1e7, "ohm": 1e9, "V": 1e9, "A": 1e6, "F": 1.0, "H": 1e3}
# The smallest positive magnitude, likewise: below it a value is rounding, not a component.
SMALLEST = {"Hz": 1.0, "m": 1e-6, "W": 1e-6, "ohm": 1e-9, "V": 1e-6, "A": 1e-9, "F": 1e-18, "H": 1e-15}


def _within_limits(result, original, unit, where):
    limit, smallest = MAGNITUDE_LIMITS.get(unit), SMALLEST.get(unit)
    if limit is not None and abs(result) > limit:
        raise where.error(f"{original!r} is beyond what linecalc handles (at most {limit:g} {unit})")
    if smallest is not None and 0 < abs(result) < smallest:
        raise where.error(f"{original!r} is too small to be real (at least {smallest:g} {unit}, or zero where "
                          "zero is allowed)")
    return result


def quantity(parent, key, ctx, unit, *, positive=True, bare_unit=None):
    """Read ``parent[key]`` as a quantity in ``unit``, within `MAGNITUDE_LIMITS`."""
    where = ctx.child(parent, key)
    try:
        result = parse_quantity(parent[key], unit, bare_unit=bare_unit)
    except UnitError as exc:
        raise where.error(str(exc)) from None
    if positive and not result > 0:
        raise where.error(f"must be greater than zero, got {parent[key]!r}")
    return _within_limits(result, parent[key], unit, where)


def number(parent, key, ctx, *, low=None, high=None, low_open=True):
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


def decibels(parent, key, ctx, suffix):
    """A logarithmic figure such as ``0.1 dB`` or ``2.15 dBi``: the number, with ``suffix`` or bare
    (decibels are no pint quantity, so they are read here)."""
    value = parent[key]
    where = ctx.child(parent, key)
    text = value.strip() if isinstance(value, str) else value
    if isinstance(text, str) and text.lower().endswith(suffix.lower()):
        text = text[:-len(suffix)].strip()
    try:
        result = float(text)
    except (TypeError, ValueError):
        raise where.error(f"expected a number of {suffix} such as 0.2 {suffix}, got {value!r}") from None
    if isinstance(value, bool) or not math.isfinite(result):
        raise where.error(f"expected a finite number of {suffix}, got {value!r}")
    return result


def string(parent, key, ctx):
    """Text, such as a name or a label; a plain whole number (``label: 2``) is taken as its text."""
    value = parent[key]
    if isinstance(value, int) and not isinstance(value, bool):
        value = str(value)
    if not isinstance(value, str) or not value.strip():
        raise ctx.child(parent, key).error(f"expected text, got {value!r}")
    control = [c for c in value if unicodedata.category(c) in ("Cc", "Cf")]
    if control:  # a terminal escape code in a name would reach every table and warning line
        raise ctx.child(parent, key).error(f"a name or label holds no control or format characters, got "
                                           f"{printable(repr(value))} ({printable(control[0])})")
    return value.strip()


def frequency_table(table, ctx, read_value):
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
        _within_limits(frequency, key, "Hz", where)
        rows.append((frequency, read_value(value, where), where))
    rows.sort(key=lambda row: row[0])
    for (f1, _, _), (f2, _, where) in zip(rows, rows[1:]):
        if f2 == f1:
            raise where.error(f"frequency {f2 / 1e6:g} MHz appears twice")
    return np.array([r[0] for r in rows]), [r[1] for r in rows]




def _one_line(message):
    """A parser's message on one line (some span several, with the position we report already)."""
    return " ".join(str(message).split())


def load_yaml_text(text, file):
    """Parse YAML text into mappings and sequences that remember their lines.

    An empty document, a syntax error or a duplicate key is a `StationError` naming ``file``.
    """
    try:
        loader = _LineLoader(text)  # the reader refuses control characters here, before any parsing
    except yaml.reader.ReaderError as exc:
        line = text.count("\n", 0, exc.position) + 1
        raise StationError(file, line, f"character #x{exc.character:04x} is not allowed in a YAML file") from None
    loader.name = str(file)
    try:
        node = loader.get_single_node()
        if node is not None:
            _check_expansion(node, file)
        doc = None if node is None else loader.construct_document(node)
    except yaml.MarkedYAMLError as exc:
        mark = exc.problem_mark or exc.context_mark
        line = mark.line + 1 if mark else 1
        raise StationError(file, line, f"YAML syntax error: {_one_line(exc.problem or exc)}") from None
    except yaml.YAMLError as exc:
        raise StationError(file, 1, f"YAML error: {_one_line(exc)}") from None
    finally:
        loader.dispose()
    if doc is None:
        raise StationError(file, 1, "the file is empty")
    return doc
