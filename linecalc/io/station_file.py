"""Station files: YAML with units in, a validated `Station` in SI floats out.

The document is checked against an explicit schema before anything is built: unknown keys are
errors, and every error names its file, line and key path (`StationError`).
"""
from __future__ import annotations

import math
from pathlib import Path

import numpy as np

from linecalc.physics import bands as band_table
from linecalc.studies.station import CompareSpec, Station
from linecalc.physics.exposure import MODE_DUTY_FACTORS, duty_factor
from linecalc.io import input_file
from linecalc.io.feed_file import build_feed, read_cable
from linecalc.physics.loads import ImpedanceTable, MeasuredAntenna, SwrTable, outside_table
from linecalc.errors import StationError
from linecalc.io.yaml_schema import (MAGNITUDE_LIMITS, Context, decibels, frequency_table, load_yaml_text, mapping, number, quantity,
                     string)
from linecalc.io.units import UnitError, parse_impedance
from linecalc.io.wire_file import read_wire
from linecalc.physics.wire_antenna import WireAntenna


# Defaults of the radio and antenna keys (documented in the README where the keys are):
# a continuous carrier, always transmitting (the cautious exposure figure), a half-wave dipole.
MODE = "carrier"
TRANSMIT_FRACTION = 1.0
# The radio's power control holds its forward power (a solid-state radio); no reflected-power
# limit and no largest forward power unless the station gives them.
RADIO_HOLDS = "forward"
ANTENNA_GAIN_DBI = 2.15
# Beyond these no antenna exists: refused, not warned about.
GAIN_LIMITS_DBI = (-100.0, 100.0)
# An SWR above this (|rho| within 2e-6 of 1) is a total reflection for every purpose here.
MAX_SWR = 1e6


def _read_impedance(value, ctx):
    try:
        z = parse_impedance(value)
    except UnitError as exc:
        raise ctx.error(str(exc)) from None
    if z.real < 0:
        raise ctx.error(f"a passive antenna has a resistance of zero or more, got {value!r}")
    if abs(z) > MAGNITUDE_LIMITS["ohm"]:
        raise ctx.error(f"an impedance is at most {MAGNITUDE_LIMITS['ohm']:g} ohm in size, got {value!r}")
    return z


def _read_swr(value, ctx):
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value):
        raise ctx.error(f"an SWR is a plain number such as 1.8, got {value!r}")
    if value < 1:
        raise ctx.error(f"an SWR is 1 or more, got {value!r}")
    if value > MAX_SWR:
        raise ctx.error(f"an SWR above {MAX_SWR:g} is a total reflection; give the impedance instead, got {value!r}")
    return float(value)


def _gain_dbi(doc, ctx):
    """Antenna gain over isotropic: ``2.15 dBi`` or a bare number of dBi; default `ANTENNA_GAIN_DBI`.
    Outside `GAIN_LIMITS_DBI` it is refused (the budget warns outside the plausible -10 to 30)."""
    if "gain" not in doc:
        return ANTENNA_GAIN_DBI
    gain = decibels(doc, "gain", ctx, "dBi")
    if not GAIN_LIMITS_DBI[0] <= gain <= GAIN_LIMITS_DBI[1]:
        raise ctx.child(doc, "gain").error(f"a gain from {GAIN_LIMITS_DBI[0]:g} to {GAIN_LIMITS_DBI[1]:g} dBi, "
                                           f"got {doc['gain']!r}")
    return gain


def _touchstone(doc, ctx, file):
    """A Touchstone one-port sweep, its path relative to the station file."""
    from linecalc.io.touchstone import TouchstoneError, read_sweep

    name = string(doc, "touchstone", ctx)
    path = Path(file).parent / name
    try:
        frequency_hz, z_ohm, notes = read_sweep(path)
    except TouchstoneError as exc:
        if exc.line is None:
            raise ctx.child(doc, "touchstone").error(str(exc)) from None
        raise StationError(exc.file, exc.line, exc.message) from None
    infinite = ~np.isfinite(z_ohm)
    if infinite.any():  # an exact open (S = 1, or Y = 0): no impedance to interpolate between
        where = ", ".join(f"{f / 1e6:.9g}" for f in frequency_hz[infinite][:8])
        raise ctx.child(doc, "touchstone").error(
            f"the sweep {name} is an exact open (S = 1, or Y = 0) at {where} MHz: its impedance is infinite "
            "there, and a sweep is interpolated in impedance; leave those points out")
    return ImpedanceTable(frequency_hz, z_ohm), ctx.child(doc, "touchstone"), f"the sweep {name}", notes


def _antenna(doc, ctx, file, highest_frequency_hz):
    """The antenna table, where its key sits, its gain, where it was measured (None: at the
    feedpoint), a description of its source, and the warnings of reading it (a sweep's).

    A wire antenna is the model itself, its gain None (it has one per row)."""
    mapping(doc, ctx, optional=("impedance", "swr", "touchstone", "wire", "measured_at", "gain"))
    given = [key for key in ("impedance", "swr", "touchstone", "wire") if key in doc]
    if len(given) != 1:
        raise ctx.error("give the antenna as exactly one of impedance: {...}, swr: {...}, touchstone: FILE "
                        "or wire: {...}")
    if "wire" in doc:
        for key in ("gain", "measured_at"):
            if key in doc:
                raise ctx.child(doc, key).error(f"a wire antenna takes no {key}: the model gives its gain and its "
                                                "feedpoint")
        antenna = read_wire(doc["wire"], ctx.child(doc, "wire"), highest_frequency_hz)
        return antenna, ctx.child(doc, "wire"), None, None, "the wire model", ()
    gain_dbi = _gain_dbi(doc, ctx)
    measured_at = string(doc, "measured_at", ctx) if "measured_at" in doc else None
    if "touchstone" in doc:
        table, where, source, notes = _touchstone(doc, ctx, file)
        return table, where, gain_dbi, measured_at, source, notes
    if "impedance" in doc:
        f, z = frequency_table(doc["impedance"], ctx.child(doc, "impedance"), _read_impedance)
        return (ImpedanceTable(f, np.array(z, dtype=complex)), ctx.child(doc, "impedance"), gain_dbi, measured_at,
                f"the impedance measured at {measured_at}", ())
    f, swr = frequency_table(doc["swr"], ctx.child(doc, "swr"), _read_swr)
    return SwrTable(f, np.array(swr)), ctx.child(doc, "swr"), gain_dbi, measured_at, f"the reading at {measured_at}", ()


def _measuring_node(measured_at, feed, ctx):
    """Node of the feed where a measurement was taken: 0 for the radio, else the named meter's input."""
    if measured_at == "radio":
        return 0
    meters = [k for k, element in enumerate(feed) if element.kind == "meter" and element.label == measured_at]
    if not meters:
        known = ", ".join(["radio"] + [e.label for e in feed if e.kind == "meter"])
        raise ctx.error(f"measured_at names the radio or a meter of the feed, got {measured_at!r}; known: {known}")
    return meters[0]


def _radio_drive(radio, ctx, power_w):
    """``holds`` (default `RADIO_HOLDS`), ``foldback_swr`` and ``max_power`` (None by default).

    A radio that holds its forward power cannot hold more than it can make: a ``power`` above
    ``max_power`` is refused.
    """
    holds = RADIO_HOLDS
    if "holds" in radio:
        holds = radio["holds"]
        if holds not in ("forward", "net"):
            raise ctx.child(radio, "holds").error(f"holds is forward or net, got {holds!r}")
    foldback_swr = None
    if "foldback_swr" in radio:
        foldback_swr = number(radio, "foldback_swr", ctx, low=1, high=MAX_SWR)
    max_power_w = quantity(radio, "max_power", ctx, "W") if "max_power" in radio else None
    if holds == "forward" and max_power_w is not None and power_w > max_power_w:
        raise ctx.child(radio, "power").error(f"power {power_w:g} W is above max_power {max_power_w:g} W: a radio "
                                              "that holds its forward power cannot hold more than it makes")
    return holds, foldback_swr, max_power_w


def _mode(radio, ctx):
    """The radio's mode name and duty factor (FCC OET Bulletin 65 Supplement B); default `MODE`."""
    if "mode" not in radio:
        return MODE, duty_factor(MODE)
    value = radio["mode"]
    where = ctx.child(radio, "mode")
    if isinstance(value, bool) or not isinstance(value, (str, int, float)):
        raise where.error(f"mode is a name ({', '.join(MODE_DUTY_FACTORS)}) or a duty factor in (0, 1]")
    try:
        duty = duty_factor(value)
    except ValueError as exc:
        raise where.error(str(exc)) from None
    return (value.strip().lower() if isinstance(value, str) else f"duty factor {value:g}"), duty


def _rows(doc, ctx):
    """Row labels, frequencies [Hz] and band edges [Hz] (None for an explicit frequency): the bands
    first, then the explicit frequencies."""
    labels, frequencies, edges = [], [], []
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
            edges.append((band.low_hz, band.high_hz))
    if "frequencies" in doc:
        where = ctx.child(doc, "frequencies")
        values = doc["frequencies"]
        if not isinstance(values, list) or not values:
            raise where.error("frequencies is a list such as [7.15 MHz, 14.2 MHz]")
        for i in range(len(values)):
            frequency = quantity(values, i, where, "Hz")
            labels.append(f"{frequency / 1e6:.9g} MHz")  # 9 digits: 7.2000001 MHz is not shown as 7.2
            frequencies.append(frequency)
            edges.append(None)
    if not labels:
        raise ctx.error("give bands: [...] (with region:) or frequencies: [...], or both")
    return tuple(labels), np.array(frequencies), tuple(edges)


def _compare_spec(doc, ctx) -> CompareSpec:
    """The ``compare:`` key: alternatives for the main line, tuner positions, line lengths."""
    mapping(doc, ctx, optional=("main_line", "cables", "tuner_positions", "line", "lengths"))
    cables = ()
    if "cables" in doc:
        where = ctx.child(doc, "cables")
        items = doc["cables"]
        if not isinstance(items, list) or not items:
            raise where.error("cables is a list of library ids or inline cables")
        cables = tuple((item if isinstance(item, str) else f"inline cable {i + 1}",
                        read_cable(item, where.child(items, i), f"alternative {i + 1}")) for i, item in enumerate(items))
    tuner_positions = doc.get("tuner_positions", False)
    if not isinstance(tuner_positions, bool):
        raise ctx.child(doc, "tuner_positions").error(f"tuner_positions is true or false, got {tuner_positions!r}")
    lengths = ()
    if "lengths" in doc:
        where = ctx.child(doc, "lengths")
        items = doc["lengths"]
        if not isinstance(items, list) or not items:
            raise where.error("lengths is a list such as [1 m, 2 m, 3 m]")
        lengths = tuple(quantity(items, i, where, "m") for i in range(len(items)))
    labels = {key: string(doc, key, ctx) for key in ("main_line", "line") if key in doc}
    spec = CompareSpec(labels.get("main_line"), cables, tuner_positions, labels.get("line"), lengths)
    if not (spec.cables or spec.tuner_positions or spec.lengths_m):
        raise ctx.error("nothing to compare: give cables, tuner_positions: true or lengths")
    return spec


def station_from_document(doc, file="<station>") -> Station:
    """Validate a parsed station document and build the `Station` (with its ``compare:`` key)."""
    ctx = Context(file, "", getattr(doc, "line", 1))
    mapping(doc, ctx, required=("name", "radio", "antenna", "feed"),
            optional=("region", "bands", "frequencies", "compare"))
    name = string(doc, "name", ctx)
    radio_ctx = ctx.child(doc, "radio")
    radio = mapping(doc["radio"], radio_ctx, required=("power",),
                    optional=("impedance", "mode", "transmit_fraction", "holds", "foldback_swr", "max_power"))
    power_w = quantity(radio, "power", radio_ctx, "W")
    holds, foldback_swr, max_power_w = _radio_drive(radio, radio_ctx, power_w)
    z_ref = quantity(radio, "impedance", radio_ctx, "ohm", bare_unit="ohm") if "impedance" in radio else 50.0
    mode, duty = _mode(radio, radio_ctx)
    transmit_fraction = (number(radio, "transmit_fraction", radio_ctx, low=0, high=1) if "transmit_fraction" in radio
                         else TRANSMIT_FRACTION)
    labels, frequency_hz, band_edges = _rows(doc, ctx)
    highest_hz = max([f for f in frequency_hz] + [edge[1] for edge in band_edges if edge is not None])
    antenna, table_ctx, gain_dbi, measured_at, source, notes = _antenna(doc["antenna"], ctx.child(doc, "antenna"), file,
                                                                 highest_hz)
    outside = (np.zeros(frequency_hz.shape, bool) if isinstance(antenna, WireAntenna)
               else outside_table(antenna.frequency_hz, frequency_hz))
    if outside.any():
        span = f"{antenna.frequency_hz[0] / 1e6:g} to {antenna.frequency_hz[-1] / 1e6:g} MHz"
        asked = ", ".join(label if label == f"{f / 1e6:.9g} MHz" else f"{label} ({f / 1e6:.9g} MHz)"
                          for label, f, out in zip(labels, frequency_hz, outside) if out)
        raise table_ctx.error(f"{asked} outside the antenna table, which spans {span}; it is never extrapolated")
    feed = build_feed(doc["feed"], ctx.child(doc, "feed"), z_ref)
    if measured_at is not None:
        where = ctx.child(doc, "antenna").child(doc["antenna"], "measured_at")
        antenna = MeasuredAntenna(_measuring_node(measured_at, feed, where), antenna, source)
    region = doc.get("region", 2)
    spec = _compare_spec(doc["compare"], ctx.child(doc, "compare")) if "compare" in doc else None
    station = Station(name=name, radio_power_w=power_w, reference_impedance_ohm=z_ref, labels=labels,
                      frequency_hz=frequency_hz, antenna=antenna, feed=feed, region=region, mode=mode,
                      duty_factor=duty, transmit_fraction=transmit_fraction, antenna_gain_dbi=gain_dbi,
                      radio_holds=holds, radio_foldback_swr=foldback_swr, radio_max_power_w=max_power_w,
                      band_edges_hz=band_edges, compare=spec, input_warnings=notes,
                      source_file=str(file),
                      key_lines={"antenna": ctx.child(doc, "antenna").line, "feed": ctx.child(doc, "feed").line,
                                 **({"compare": ctx.child(doc, "compare").line} if "compare" in doc else {})})
    return station


def parse_station_text(text, file="<station>") -> Station:
    """Parse station YAML text; errors are `StationError` naming ``file``."""
    return station_from_document(load_yaml_text(text, file), file)


def input_files(path) -> list[Path]:
    """The files a station file reads: itself, the Touchstone sweep its antenna names and the
    open and short sweeps of its lines.

    For outputs, which must never replace an input. A file that cannot be read or parsed names
    only itself (loading it reports what is wrong).
    """
    path = Path(path)
    try:
        doc = load_yaml_text(read_station_text(path), path)
    except StationError:
        return [path]
    antenna = doc.get("antenna") if isinstance(doc, dict) else None
    names = [antenna.get("touchstone") if isinstance(antenna, dict) else None] + _sweep_names(doc)
    files = [path]
    for name in names:
        if isinstance(name, int) and not isinstance(name, bool):
            name = str(name)  # touchstone: 123 names the file 123, as the loader reads it
        if isinstance(name, str) and name.strip():
            files.append(path.parent / name.strip())
    return files


def _sweep_names(doc):
    """The open and short sweeps that the feed's lines name (``line: {sweeps: {open, short}}``)."""
    feed = doc.get("feed") if isinstance(doc, dict) else None
    names = []
    for item in feed if isinstance(feed, list) else ():
        line = item.get("line") if isinstance(item, dict) else None
        sweeps = line.get("sweeps") if isinstance(line, dict) else None
        if isinstance(sweeps, dict):
            names += [sweeps.get("open"), sweeps.get("short")]
    return names


def load_station(path) -> Station:
    """Read and validate a station file."""
    path = Path(path)
    return station_from_document(load_yaml_text(read_station_text(path), path), path)


def read_station_text(path) -> str:
    """The text of a station file: a regular file of at most `MAX_STATION_BYTES`, in UTF-8.

    Raises `StationError`: at line 0 for a file that cannot be read (naming what it is), at the
    line of the first byte that is not UTF-8 (with its column).
    """
    path = Path(path)
    try:
        data = input_file.read_bytes(path, input_file.MAX_STATION_BYTES)
    except OSError as exc:
        raise StationError(path, 0, f"cannot read the station file: {exc.strerror or exc}") from None
    try:
        return data.decode("utf-8")
    except UnicodeDecodeError as exc:
        line = data.count(b"\n", 0, exc.start) + 1
        column = exc.start - (data.rfind(b"\n", 0, exc.start) + 1) + 1
        raise StationError(path, line, f"byte 0x{data[exc.start]:02x} at column {column} is not UTF-8; "
                                       "a station file is UTF-8 text") from None
