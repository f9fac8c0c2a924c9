"""`linecalc line`: a line of the station characterised from its open and short sweeps.

An orchestrator: the extraction and the fit are `linecalc.physics.line_fit`; this module picks
the line, turns the fitted parameters into the figures a user reads (with their intervals), and
states the fitted line as an inline cable of the station format.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from linecalc.physics.cables import SPEED_OF_LIGHT
from linecalc.physics.line_fit import CONFIDENCE, LineFit, SweepFitError, fit_open_short
from linecalc.studies.station import BudgetError, Station

# Loss against frequency is reported at this many frequencies, evenly spaced from the lowest to
# the highest of the sweep (both included); the inline cable carries this many loss points.
LOSS_POINTS = 11
CABLE_LOSS_POINTS = 5
# A residual above this (RMS |rho| over both sweeps) is more than a calibrated amateur analyser's
# error of about 0.01 to 0.03 (common practice, as for `measured.INSTRUMENT_RHO_ERROR`): warned about.
RESIDUAL_WARNING_RHO = 0.02

CAUTIONS = (
    "Sweep a line only when it is disconnected from the radio and from the antenna, and never while "
    "anyone transmits on it.",
    "An antenna and its line collect static charge and lightning surges: ground and discharge the line (and "
    "the antenna) as local practice requires before touching its far end, and do not sweep with a storm about.",
    "Measure the physical length (or take the velocity factor) yourself: the fit gives only their product, "
    "the electrical length.",
)


def _line_with_sweeps(station: Station, label):
    """The feed index and line labelled ``label`` (None: the only line with sweeps)."""
    lines = [(k, e) for k, e in enumerate(station.feed) if e.kind == "line"]
    if label is None:
        swept = [(k, e) for k, e in lines if e.sweeps is not None]
        if not swept:
            raise BudgetError("no line has sweeps: give the line to characterise sweeps: {open: FILE.s1p, "
                              "short: FILE.s1p}", "feed")
        if len(swept) > 1:
            named = ", ".join(repr(e.label) for _, e in swept)
            raise BudgetError(f"give the line to characterise with --line LABEL (lines with sweeps: {named})", "feed")
        return swept[0]
    for k, element in lines:
        if element.label == label:
            if element.sweeps is None:
                raise BudgetError(f"line {label!r} has no sweeps: give it sweeps: {{open: FILE.s1p, short: FILE.s1p}}",
                                  "feed")
            return k, element
    known = ", ".join(repr(e.label) for _, e in lines) or "none"
    raise BudgetError(f"no line labelled {label!r}; lines: {known}", "feed")


def _interval(value, half):
    return [float(value - half), float(value + half)]


@dataclass(frozen=True)
class LineCharacterisation:
    """A line fitted from its sweeps: the fit, the figures derived from it, and the station's own cable."""

    station: str
    label: str
    index: int
    open_source: str
    short_source: str
    given: str  # "length" or "velocity_factor"
    length_m: float
    velocity_factor: float
    length_half_m: float | None
    velocity_factor_half: float | None
    fit: LineFit
    z_ref_ohm: float
    kind: str
    station_cable: object
    warnings: tuple

    def z0_centre(self):
        """The model's Z0 at the sweep's centre [ohm], and the half-widths of its R and X."""
        centre = np.array([self.fit.centre_hz])

        def parts(p):
            z = self.fit.z0_ohm(centre, p)[0]
            return np.array([z.real, z.imag])

        return self.fit.propagate(parts)

    def loss_frequencies_hz(self, points=LOSS_POINTS):
        f = self.fit.frequency_hz
        return np.linspace(f[0], f[-1], points)

    def _length(self, p):
        """The physical length [m] for parameters ``p``: given, or from the velocity factor."""
        if self.given == "length":
            return self.length_m
        return self.velocity_factor * SPEED_OF_LIGHT * p[1] / self.fit.centre_hz

    def loss_db_per_100m(self, frequency_hz):
        """Matched loss per 100 m at ``frequency_hz`` and its half-widths [dB/100 m]."""
        return self.fit.propagate(lambda p: self.fit.loss_db(frequency_hz, p) / self._length(p) * 100)

    def loss_terms(self):
        """k1 [dB/100 m at 1 MHz, times sqrt(f/MHz)] and k2 [dB/100 m at 1 MHz, times f/MHz], with half-widths."""
        scale = np.array([np.sqrt(1e6 / self.fit.centre_hz), 1e6 / self.fit.centre_hz])
        return self.fit.propagate(lambda p: 20 * np.log10(np.e) * p[2:] * scale / self._length(p) * 100)

    def inline_cable(self) -> dict:
        """The fitted line as the station format's inline cable (numbers in SI: ohm, Hz, dB/100 m)."""
        f = self.loss_frequencies_hz(CABLE_LOSS_POINTS)
        loss, _ = self.loss_db_per_100m(f)
        return {"impedance_ohm": float(self.fit.params[0]), "velocity_factor": self.velocity_factor,
                "kind": self.kind, "loss_db_per_100m": [[float(a), float(b)] for a, b in zip(f, loss)],
                "length_m": self.length_m, "label": self.label,
                "description": f"{self.label}, fitted by linecalc from {self.open_source} and {self.short_source}"}

    def to_dict(self) -> dict:
        """The JSON document of ``linecalc line --format json``."""
        fit = self.fit
        z, z_half = self.z0_centre()
        nominal, nominal_half = fit.propagate(lambda p: np.array([p[0]]))
        delay, delay_half = fit.propagate(lambda p: np.array([p[1] / fit.centre_hz]))
        turns, turns_half = fit.propagate(lambda p: np.array([p[1]]))
        f = self.loss_frequencies_hz()
        loss, loss_half = self.loss_db_per_100m(f)
        whole, whole_half = fit.propagate(lambda p: fit.loss_db(f, p))
        terms, terms_half = self.loss_terms()
        cable = self.station_cable
        return {
            "station": self.station, "line": self.label,
            "sweeps": {"open": self.open_source, "short": self.short_source},
            "frequency_hz": [float(fit.frequency_hz[0]), float(fit.frequency_hz[-1])],
            "points": int(fit.frequency_hz.size), "reference_impedance_ohm": self.z_ref_ohm,
            "centre_frequency_hz": fit.centre_hz, "confidence": CONFIDENCE,
            "z0_ohm": [float(z[0]), float(z[1])],
            "z0_ohm_interval": [_interval(z[0], z_half[0]), _interval(z[1], z_half[1])],
            "z0_nominal_ohm": float(nominal[0]), "z0_nominal_ohm_interval": _interval(nominal[0], nominal_half[0]),
            "electrical_length_s": float(delay[0]), "electrical_length_s_interval": _interval(delay[0], delay_half[0]),
            "electrical_length_wavelengths": float(turns[0]),
            "electrical_length_wavelengths_interval": _interval(turns[0], turns_half[0]),
            "given": self.given,
            "velocity_factor": self.velocity_factor,
            "velocity_factor_interval": (None if self.velocity_factor_half is None
                                         else _interval(self.velocity_factor, self.velocity_factor_half)),
            "length_m": self.length_m,
            "length_m_interval": None if self.length_half_m is None else _interval(self.length_m, self.length_half_m),
            "loss_k1_db_per_100m": float(terms[0]), "loss_k1_db_per_100m_interval": _interval(terms[0], terms_half[0]),
            "loss_k2_db_per_100m": float(terms[1]), "loss_k2_db_per_100m_interval": _interval(terms[1], terms_half[1]),
            "loss_db_per_100m": [[float(a), float(b)] for a, b in zip(f, loss)],
            "loss_db_per_100m_interval": [_interval(b, h) for b, h in zip(loss, loss_half)],
            "matched_loss_db": [[float(a), float(b)] for a, b in zip(f, whole)],
            "matched_loss_db_interval": [_interval(b, h) for b, h in zip(whole, whole_half)],
            "residual_rms_rho": fit.residual_rms, "residual_max_rho": fit.residual_max,
            "station_cable": {"id": cable.id, "z0_nominal_ohm": cable.z0_nominal_ohm,
                              "velocity_factor": cable.velocity_factor,
                              "loss_db_per_100m": [[float(a), float(b)]
                                                   for a, b in zip(f, cable.matched_loss_db_per_m(f) * 100)]},
            "inline_cable": self.inline_cable(),
            "cautions": list(CAUTIONS),
            "warnings": list(self.warnings),
        }


def characterise_line(station: Station, label=None) -> LineCharacterisation:
    """Fit the line ``label`` (default: the only line with sweeps) to its open and short sweeps.

    Raises `BudgetError` at ``feed`` for a line that is not there or has no sweeps, and at the
    line's ``sweeps`` key (``error.key``) for sweeps that cannot characterise it.
    """
    index, line = _line_with_sweeps(station, label)
    sweeps = line.sweeps
    try:
        fit = fit_open_short(sweeps.frequency_hz, sweeps.z_open_ohm, sweeps.z_short_ohm,
                             station.reference_impedance_ohm)
    except SweepFitError as exc:
        raise BudgetError(f"the sweeps of line {line.label!r} ({sweeps.open_source}, {sweeps.short_source}): {exc}",
                          sweeps.key) from None
    delay_s = fit.delay_s
    relative = fit.sigma[1] / fit.params[1] * fit.t_quantile  # the delay's relative half-width
    if sweeps.velocity_factor is None:
        given, length = "length", float(line.length_m)
        velocity_factor = length / (delay_s * SPEED_OF_LIGHT)
        length_half, vf_half = None, velocity_factor * relative
    else:
        given, velocity_factor = "velocity_factor", sweeps.velocity_factor
        length = velocity_factor * SPEED_OF_LIGHT * delay_s
        length_half, vf_half = length * relative, None
    warnings = []
    if fit.residual_rms > RESIDUAL_WARNING_RHO:
        warnings.append(f"the fitted line leaves a residual of {fit.residual_rms:.3f} in rho (RMS), more than a "
                        f"calibrated analyser's error (about {RESIDUAL_WARNING_RHO}): check the calibration and the "
                        "connections, and that the line is one cable without a joint or water in it")
    for name in fit.at_bound:
        warnings.append(f"the fitted {name} term came out at zero, its bound: the sweep does not show it, and its "
                        "interval is only indicative")
    if velocity_factor > 1:
        warnings.append(f"the velocity factor comes out at {velocity_factor:.3f}, above 1: the line's length "
                        f"({length:g} m) is too long for its electrical length")
    return LineCharacterisation(station.name, line.label, index, sweeps.open_source, sweeps.short_source, given,
                                length, float(velocity_factor), length_half, vf_half, fit,
                                station.reference_impedance_ohm, line.cable.kind, line.cable, tuple(warnings))
