"""Touchstone one-port files: read a measured sweep, write a computed one.

Reading uses scikit-rf's Touchstone parser (imported inside `read_one_port` only, so that the
plain budget never pays for its import). Before it, a light scan of the text finds what a bad
file gets wrong and on which line, because the parser itself reports no line numbers. Writing
is done by hand (a Touchstone 1.x ``# Hz S RI R 50`` file is a few lines of text), atomically.
"""
from __future__ import annotations

import io
import re
from pathlib import Path
from typing import NamedTuple

import numpy as np
from linecalc.errors import InputError
from linecalc.io import atomic, input_file

UNITS_HZ = {"hz": 1.0, "khz": 1e3, "mhz": 1e6, "ghz": 1e9}
PARAMETERS = ("s", "y", "z")
FORMATS = ("ma", "db", "ri")
# The station file's limits, applied to a sweep too (README, Errors and exit status).
MAX_FREQUENCY_HZ = 1e12
MAX_REFERENCE_OHM = 1e9
# Touchstone 1.x names the port count in the extension (.s1p, and .y1p/.z1p by old custom).
_EXTENSION = re.compile(r"\.[syzgh](\d+)p$", re.IGNORECASE)


class TouchstoneError(InputError):
    """A Touchstone file that cannot be used: rendered ``FILE:LINE: message``.

    ``line`` is None only when the file cannot be opened at all (missing, a folder, no
    permission); the station loader then points at its own line that names the file.
    """

    def __init__(self, file, line, message):
        self.file, self.line, self.message = str(file), line, message
        super().__init__(f"{self.file}:{line}: {message}" if line is not None else f"{self.file}: {message}")


class TouchstoneWriteError(InputError):
    """An output that must not be written: it exists (without ``force``), it is an input, or the
    system refused. Bad usage, not a bug: the command line exits with status 2."""

    def __init__(self, file, message):
        self.file, self.message = str(file), message
        super().__init__(f"{self.file}: {message}")


def _read_text(path: Path) -> str:
    if not path.exists():
        raise TouchstoneError(path, None, "no such file")
    try:
        data = input_file.read_bytes(path, input_file.MAX_TOUCHSTONE_BYTES)
    except input_file.InputFileError as exc:
        raise TouchstoneError(path, None, exc.reason) from None
    except OSError as exc:
        raise TouchstoneError(path, None, f"cannot be read: {exc.strerror}") from None
    try:  # the same encodings scikit-rf tries
        text = data.decode("utf-8-sig")
    except UnicodeDecodeError:
        text = data.decode("latin-1")
    # CR-LF, LF and a lone CR (old editors) each end a line, as an editor counts them
    return text.replace("\r\n", "\n").replace("\r", "\n")


def _scan(path: Path, text: str):
    """Check the structure of a one-port Touchstone file line by line.

    Returns the option line's number (or None) and the line numbers of the data rows. Raises
    `TouchstoneError` at the first line that is wrong: an empty file, a bad option line, a
    port count other than one, a row that is not three numbers, frequencies that do not
    increase, a 2.x file whose declared frequency count or [End] is missing.

    A message names the line and the field, and never quotes the file's text: the name may lead
    (by a symlink, or a path in a shared station file) to a file that is not a sweep at all, whose
    first word may be a secret. Numbers it read are shown as numbers.
    """
    lines = text.split("\n")  # numbered as an editor numbers them (CR of CR-LF is stripped below)
    if lines[-1] == "":
        lines.pop()
    if not any(line.partition("!")[0].strip() for line in lines):
        raise TouchstoneError(path, 1, "the file is empty (no option line and no data)")
    version2 = any(line.strip().lower().startswith("[version]") for line in lines)
    extension = _EXTENSION.search(path.name)
    if not version2:
        if extension is None:
            raise TouchstoneError(path, 1, "not a Touchstone one-port file: a 1.x file is named *.s1p, "
                                           "a 2.x file begins with [Version] 2.0")
        if int(extension.group(1)) != 1:
            raise TouchstoneError(path, 1, f"a {extension.group(1)}-port file (by its name); a one-port "
                                           "(.s1p) file is needed")
    option_line, in_data, ended = None, not version2, False
    declared, rows, previous = None, [], None
    unit_hz, data_format = UNITS_HZ["ghz"], "ma"  # the defaults of a file without an option line
    for number, raw in enumerate(lines, start=1):
        line = raw.partition("!")[0].strip()
        if not line:
            continue
        lower = line.lower()
        if lower.startswith("#"):
            if rows:
                raise TouchstoneError(path, number, f"an option line after the data (line {rows[0]}): it must "
                                                    "come before the first data row")
            if option_line is None:
                option_line = number
                unit_hz, data_format = _check_option_line(path, number, lower)
            continue
        if lower.startswith("["):
            keyword, _, value = lower.partition("]")
            if keyword == "[version" and value.split() not in (["2.0"], ["2.1"]):
                raise TouchstoneError(path, number, "[Version] is not 2.0 or 2.1: linecalc reads Touchstone 1.x files "
                                                    "and 2.0 or 2.1 files")
            if keyword == "[reference" and value.strip():
                _check_reference(path, number, value.split())
            if keyword == "[number of ports" and value.split() != ["1"]:
                raise TouchstoneError(path, number, f"[Number of Ports] is {'not 1' if value.strip() else 'missing'}; "
                                                    "a one-port file is needed")
            if keyword == "[number of frequencies":
                try:
                    declared = int(value)
                except ValueError:
                    raise TouchstoneError(path, number, "[Number of Frequencies] is not a whole number") from None
            in_data = keyword == "[network data" or (in_data and keyword not in ("[noise data", "[end"))
            ended = ended or keyword == "[end"
            continue
        if not in_data:
            continue  # 2.x: values of a keyword, such as [Reference], before [Network Data]
        values = []
        for field, token in enumerate(line.split(), start=1):
            try:
                value = float(token)
            except ValueError:
                raise TouchstoneError(path, number, f"field {field} is not a number") from None
            if not np.isfinite(value):
                raise TouchstoneError(path, number, f"field {field} is not a finite number")
            values.append(value)
        if len(values) > 3:
            raise TouchstoneError(path, number, f"{len(values) - 1} values after the frequency where a one-port "
                                                "row has 2: is this a file of more than one port?")
        if len(values) < 3:
            raise TouchstoneError(path, number, f"truncated row: {len(values)} number(s) where a one-port row has "
                                                "3 (frequency and two values)")
        if values[0] <= 0:
            raise TouchstoneError(path, number, f"frequency must be above zero, got {values[0]:g}")
        if values[0] * unit_hz > MAX_FREQUENCY_HZ:
            raise TouchstoneError(path, number, f"frequency {values[0]:g} is beyond what linecalc handles "
                                                f"(at most {MAX_FREQUENCY_HZ:g} Hz, as in a station file)")
        if data_format == "ma" and values[1] < 0:
            raise TouchstoneError(path, number, f"a magnitude (MA format) is 0 or more, got {values[1]:g}")
        if previous is not None and values[0] <= previous[1]:
            raise TouchstoneError(path, number, f"frequencies must increase: {values[0]:g} follows {previous[1]:g} "
                                                f"(line {previous[0]})")
        previous = (number, values[0])
        rows.append(number)
    last = len(lines)
    if not rows:
        raise TouchstoneError(path, last, "no data rows")
    if version2 and declared is not None and declared != len(rows):
        raise TouchstoneError(path, rows[-1], f"[Number of Frequencies] is {declared} but the file has "
                                              f"{len(rows)} data rows (truncated?)")
    if version2 and not ended:
        raise TouchstoneError(path, last, "no [End] keyword: the file looks truncated")
    return option_line, rows


def _check_option_line(path, number, lower):
    """The option line ``# <unit> <parameter> <format> R <n>``, fields in this order, each optional."""
    tokens = lower[1:].split()
    expected = (("frequency unit", UNITS_HZ), ("parameter", PARAMETERS), ("format", FORMATS))
    for field, (token, (what, allowed)) in enumerate(zip(tokens, expected), start=1):
        if token not in allowed:
            raise TouchstoneError(path, number, f"option line: field {field} is not a {what} "
                                                f"({', '.join(a.upper() for a in allowed)}) for a one-port file")
    rest = tokens[3:]
    if rest:
        try:
            resistance = float(rest[1]) if rest[0] == "r" and len(rest) == 2 else None
        except ValueError:
            resistance = None
        if resistance is None or not resistance > 0 or not np.isfinite(resistance):
            raise TouchstoneError(path, number, "option line: after the format, the reference must be 'R' and one "
                                                "positive resistance")
        if resistance > MAX_REFERENCE_OHM:
            raise TouchstoneError(path, number, f"option line: a reference of {resistance:g} ohm is beyond what "
                                                f"linecalc handles (at most {MAX_REFERENCE_OHM:g} ohm)")
    unit = tokens[0] if tokens else "ghz"
    data_format = tokens[2] if len(tokens) > 2 else "ma"
    return UNITS_HZ[unit], data_format


def _check_reference(path, number, tokens):
    """A 2.x ``[Reference]`` line: one positive resistance [ohm] within `MAX_REFERENCE_OHM`."""
    for field, token in enumerate(tokens, start=1):
        try:
            value = float(token)
        except ValueError:
            raise TouchstoneError(path, number, f"[Reference]: field {field} is not a number") from None
        if not 0 < value <= MAX_REFERENCE_OHM:
            raise TouchstoneError(path, number, f"[Reference]: a resistance above 0 and at most "
                                                f"{MAX_REFERENCE_OHM:g} ohm, got {value:g}")


class Sweep(NamedTuple):
    """A one-port sweep as read: frequencies [Hz], impedances [ohm], and warnings about how the
    file was read (text for people: a 1.x file without an option line)."""

    frequency_hz: np.ndarray
    z_ohm: np.ndarray
    warnings: tuple[str, ...]


def read_sweep(path) -> Sweep:
    """`read_one_port`, with the warnings of the reading.

    A 1.x file without an option line is read with the defaults the Touchstone specification
    gives such a file, GHz, S, MA and R 50, and a warning names the file and says so: a sweep
    written in MHz without its option line would otherwise be read a thousand times too high in
    frequency without a word.

    References
    ----------
    Touchstone File Format Specification, version 2.0 (IBIS Open Forum, 2009), the option line
    and its defaults (from memory).
    """
    path = Path(path)
    frequency_hz, z_ohm, option_line = _read(path)
    warnings = ()
    if option_line is None:
        warnings = (f"{path}: no option line, so its data are read as the Touchstone specification's defaults: "
                    "frequencies in GHz, S parameters as magnitude and angle, 50 ohm reference; if that is not "
                    "what the file holds, add its option line (for example '# MHz S RI R 50')",)
    return Sweep(frequency_hz, z_ohm, warnings)


def read_one_port(path):
    """Read a one-port Touchstone file (1.x or 2.x) as impedance against frequency.

    Parameters
    ----------
    path : str or Path
        A Touchstone 1.x file named ``*.s1p`` (or ``*.z1p``, ``*.y1p``) or a 2.x file beginning
        with ``[Version] 2.0``: S, Z or Y data; Hz, kHz, MHz or GHz; MA, DB or RI; any
        reference resistance (option line ``R n``, or 2.x ``[Reference]``); comments after ``!``.

    Returns
    -------
    frequency_hz : ndarray, shape (nf,)
        Strictly increasing frequencies [Hz].
    z_ohm : ndarray of complex, shape (nf,)
        Impedance [ohm]: from S data Z = R (1 + S)/(1 - S), ``inf`` where S = 1 exactly (an
        open); Z data as given; from Y data Z = 1/Y, ``inf`` where Y = 0.

    Raises
    ------
    TouchstoneError
        A missing, unreadable, empty, truncated or non-numeric file, a multi-port file, G or H
        data, frequencies that do not increase, or scikit-rf not installed; it names the file
        and the line (the line is None only for a file that cannot be opened).

    Notes
    -----
    In a 1.x file Z and Y data are normalised to the reference resistance R: z = Z/R and
    y = Y R (the normalised admittance Y/Y0, Y0 = 1/R); 2.x data are not normalised. The
    reading of 1.x Y data as Y = y/R follows the definition of a normalised admittance; it is
    done here, from the parser's raw values, because scikit-rf 2.2 multiplies 1.x Y data by R.

    References
    ----------
    Touchstone File Format Specification, version 2.0 (IBIS Open Forum, 2009): option line,
    keywords, version 1.0 compatibility rules (normalised Z and Y, from memory). Pozar,
    Microwave Engineering, 4th ed., section 2.3 (Z from rho) and section 2.4 (normalised
    admittance y = Y Z0).
    """
    frequency_hz, z_ohm, _ = _read(Path(path))
    return frequency_hz, z_ohm


def _read(path: Path):
    """The body of `read_one_port`: frequencies, impedances and the option line's number (None
    for a file without one)."""
    text = _read_text(path)
    option_line, rows = _scan(path, text)
    where = option_line or rows[0]
    try:
        from skrf.io.touchstone import Touchstone
    except ImportError:
        raise TouchstoneError(path, where, "reading Touchstone files needs scikit-rf "
                                           "(pip install scikit-rf)") from None
    try:
        text_file = io.StringIO(text)  # the text checked above, not the file read a second time
        text_file.name = str(path)
        parsed = Touchstone(text_file)
    except Exception as exc:  # noqa: BLE001 - whatever the parser raises is a bad file, named here
        # the parser's own words may quote the file, which is not shown (see `_scan`)
        raise TouchstoneError(path, where, f"scikit-rf cannot read it ({type(exc).__name__})") from None
    if parsed.rank != 1 or len(parsed.f) != len(rows):
        raise TouchstoneError(path, rows[0], f"read as {parsed.rank} port(s) and {len(parsed.f)} frequencies "
                                             f"where the text has one port and {len(rows)} rows")
    frequency_hz = np.asarray(parsed.f, dtype=float)
    raw = np.asarray(parsed.s_flat, dtype=complex)[:, 0]  # the file's values, format decoded, not converted
    resistance = np.asarray(parsed.z0, dtype=complex)[:, 0]
    if np.any(resistance.imag != 0) or np.any(resistance.real <= 0):
        raise TouchstoneError(path, where, "the reference resistance must be real and positive")
    resistance = resistance.real
    version1 = parsed.version == "1.0"
    parameter = parsed.parameter.lower()
    if parameter == "s":
        z_ohm = _divide(resistance * (1 + raw), 1 - raw)
    elif parameter == "z":
        z_ohm = raw * resistance if version1 else raw
    else:
        admittance = raw / resistance if version1 else raw
        z_ohm = _divide(np.ones_like(admittance), admittance)
    return frequency_hz, z_ohm, option_line


def _divide(numerator, denominator):
    """numerator / denominator; complex infinity where the denominator is zero."""
    zero = denominator == 0
    return np.where(zero, complex(np.inf, 0.0), numerator / np.where(zero, 1.0, denominator))


def write_one_port(path, frequency_hz, z_ohm, z_ref_ohm=50.0, comment="", *, force=False, protected=()):
    """Write an impedance sweep as a Touchstone 1.x one-port file of S data in RI form.

    Parameters
    ----------
    path : str or Path
        The output file (conventionally ``*.s1p``).
    frequency_hz : array_like, shape (nf,)
        Strictly increasing, positive frequencies [Hz].
    z_ohm : array_like of complex, shape (nf,)
        Impedance [ohm]; ``inf`` for an open (written as S = 1).
    z_ref_ohm : float
        Reference resistance R of the file [ohm].
    comment : str
        Text for the header, one ``!`` line per line of text (non-ASCII characters become '?',
        since Touchstone files are ASCII).
    force : bool
        Replace an existing file; without it an existing output is refused.
    protected : iterable of str or Path
        Files that must never be replaced, even with ``force`` (the inputs of the run).

    Returns
    -------
    Path
        The file written.

    Raises
    ------
    TouchstoneWriteError
        The output exists (without ``force``), is one of ``protected``, or cannot be written.
    ValueError
        Arrays of the wrong shape, frequencies not increasing, a NaN impedance, an impedance of
        exactly -R (infinite S), or a reference that is not a positive number.

    Notes
    -----
    Written by `linecalc.io.atomic.write_atomically`: whole or not at all. Values are written
    with 17 significant digits, so they read back exactly.

    References
    ----------
    Touchstone File Format Specification, version 2.0 (IBIS Open Forum, 2009), option line and
    version 1.0 data lines. Pozar, Microwave Engineering, 4th ed., section 2.3 (S = rho).
    """
    path = Path(path)
    f = np.asarray(frequency_hz, dtype=float)
    z = np.asarray(z_ohm, dtype=complex)
    if f.ndim != 1 or z.shape != f.shape or f.size == 0:
        raise ValueError("frequency_hz and z_ohm must be one-dimensional arrays of the same, non-zero length")
    if not np.all(np.isfinite(f)) or np.any(f <= 0) or np.any(np.diff(f) <= 0):
        raise ValueError("frequencies must be finite, positive and strictly increasing")
    if not (np.isfinite(z_ref_ohm) and z_ref_ohm > 0):
        raise ValueError(f"the reference resistance must be a positive number, got {z_ref_ohm!r}")
    if np.any(np.isnan(z)):
        raise ValueError("an impedance is NaN")
    open_circuit = np.isinf(z)
    finite = np.where(open_circuit, 0.0, z)
    if np.any(finite + z_ref_ohm == 0):
        raise ValueError(f"an impedance equals -{z_ref_ohm:g} ohm: its reflection coefficient is infinite")
    s = np.where(open_circuit, 1.0 + 0j, (finite - z_ref_ohm) / (finite + z_ref_ohm))

    header = [f"! {line}".rstrip() for line in comment.encode("ascii", "replace").decode("ascii").splitlines()]
    header.append(f"# Hz S RI R {z_ref_ohm:.17g}")
    rows = [f"{fi:.17g} {si.real:.17g} {si.imag:.17g}" for fi, si in zip(f, s)]
    text = "\n".join(header + rows) + "\n"

    try:
        return atomic.write_atomically(path, lambda out: out.write(text), force=force, protected=protected)
    except atomic.OutputIsInputError as exc:
        raise TouchstoneWriteError(path, f"is an input of this run ({exc.other}); it is never overwritten") from None
    except atomic.OutputExistsError:
        raise TouchstoneWriteError(path, "exists; use --force to replace it") from None
    except atomic.OutputWriteError as exc:
        raise TouchstoneWriteError(path, f"cannot be written: {exc.reason}") from None
    except atomic.OutputNotFileError as exc:
        raise TouchstoneWriteError(path, f"is {exc.what}, not a regular file; it is never replaced") from None
    except OSError as exc:
        raise TouchstoneWriteError(path, f"cannot be written: {exc.strerror}") from None
