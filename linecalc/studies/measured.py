"""Measured antennas: a sweep or an SWR reading taken at the radio (or at a meter) moved along
the path to the antenna's feedpoint, and the feedpoint study of `linecalc feedpoint`.

An orchestrator: the de-embedding itself is `linecalc.physics.deembed`.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from linecalc.physics import deembed
from linecalc.physics.loads import ImpedanceTable, MeasuredAntenna, rho_from_impedance
from linecalc.studies.json_values import finite_or_none
from linecalc.studies.station import BudgetError, Station
from linecalc.elements.base import named

# Phases sampled for an SWR-only antenna: the trapezoid rule on a smooth periodic function
# converges geometrically, so 180 points (2 degree steps) average to rounding and bound the
# least/most loss to a few thousandths of a dB.
PHASE_SAMPLES = 180


# Above this multiplier a reflection error at the measuring point grows too much on its way to
# the antenna: the recovered antenna SWR is flagged as uncertain.
SENSITIVITY_WARNING = 3.0
# The reflection error of a good amateur instrument, for the uncertainty figure in that warning
# (common practice: |dG| of about 0.01 to 0.03 for analysers after calibration).
INSTRUMENT_RHO_ERROR = 0.02


def _measurement_path(station, frequency_hz):
    """Chain matrices from the measuring point to the antenna; a tuner there is refused."""
    path = station.feed[station.antenna.node:]
    for element in path:
        if element.adapts_to_load:
            raise BudgetError(f"{named('tuner', element.label)} sits between the measuring point and the antenna: its "
                              "setting depends on the antenna, so the measurement cannot be moved through it",
                              "antenna")
    return [element.abcd(frequency_hz) for element in path]


def _feeding_z0(station, frequency_hz):
    """The characteristic impedance that the antenna's SWR is taken against: that of the element
    feeding the antenna, or the reference impedance with no feed."""
    if station.feed:
        return station.feed[-1].port_z0_ohm(frequency_hz)[1]
    return np.full(np.shape(frequency_hz), complex(station.reference_impedance_ohm))


def recover_feedpoint(station: Station) -> deembed.DeembeddedSweep:
    """A measured impedance sweep moved from its measuring point to the antenna, at its own frequencies."""
    measured = station.antenna.table
    f = measured.frequency_hz
    return deembed.deembed_sweep(_measurement_path(station, f), measured.impedance_ohm, station.reference_impedance_ohm,
                                 _feeding_z0(station, f))


def measured_antenna_load(station, frequency_hz):
    """Turn a measured antenna into a feedpoint load: an ImpedanceTable, or for an SWR reading the
    antenna reflections of every phase of the reading (phases, nf) against the reference.

    Returns (load, per-row facts for the report, warnings).
    """
    measured, z_ref, labels = station.antenna, station.reference_impedance_ohm, station.labels
    warnings = []
    if isinstance(measured.table, ImpedanceTable):
        sweep = recover_feedpoint(station)
        if np.any(sweep.active):
            where = measured.table.frequency_hz[sweep.active] / 1e6
            warnings.append(f"the feedpoint recovered from {measured.source} comes out active (|rho| > 1) at "
                            f"{', '.join(f'{x:g}' for x in where[:8])}{' ...' if where.size > 8 else ''} MHz: the "
                            "described path does not match the measurement there")
        load = ImpedanceTable(measured.table.frequency_hz, sweep.z_antenna_ohm)
        rho_measured = rho_from_impedance(measured.table.impedance_at(frequency_hz), z_ref)
        sensitivity = deembed.sensitivity_multiplier(_measurement_path(station, frequency_hz), rho_measured, z_ref,
                                                     _feeding_z0(station, frequency_hz))
        facts = {"sensitivity": sensitivity}
    else:
        path = _measurement_path(station, frequency_hz)
        reading = measured.table.rho_magnitude_at(frequency_hz)
        against_line = deembed.antenna_range_from_reading(path, reading, z_ref, _feeding_z0(station, frequency_hz))
        if np.any(against_line.undetermined):
            rows = ", ".join(label for label, u in zip(labels, against_line.undetermined) if u)
            raise BudgetError(f"{measured.source} cannot pin the antenna down on {rows}: the path "
                              "between them loses so much that even an open or a short at the antenna would read "
                              "as well; measure closer to the antenna", "antenna")
        load = deembed.antenna_range_from_reading(path, reading, z_ref, phase_samples=PHASE_SAMPLES).rho
        sensitivity = against_line.sensitivity_max
        facts = {"swr_antenna_least": against_line.swr_min, "swr_antenna_most": against_line.swr_max,
                 "sensitivity": sensitivity}
    uncertain = sensitivity > SENSITIVITY_WARNING
    if np.any(uncertain):
        rows = ", ".join(f"{label} (x{m:.1f}: a reflection error of {INSTRUMENT_RHO_ERROR} becomes "
                         f"{INSTRUMENT_RHO_ERROR * m:.2f})" for label, m, u in zip(labels, sensitivity, uncertain) if u)
        warnings.append(f"the antenna SWR recovered from {measured.source} is uncertain on {rows}: the path's loss "
                        "multiplies any error of the measurement")
    return load, facts, warnings


@dataclass(frozen=True)
class FeedpointResult:
    """A measured sweep moved to the antenna feedpoint, at the sweep's own frequencies [Hz]."""

    station: str
    source: str
    frequency_hz: np.ndarray
    sweep: deembed.DeembeddedSweep
    uncertainty: object | None = None  # feedpoint --uncertainty: a `studies.uncertainty.FeedpointSpread`

    def to_dict(self) -> dict:
        """The JSON document of ``linecalc feedpoint --format json``."""
        sweep = self.sweep
        document = {"station": self.station, "source": self.source, "points": [
            {"frequency_hz": float(f), "z_antenna_ohm": [finite_or_none(z.real), finite_or_none(z.imag)],
             "swr_antenna": finite_or_none(swr), "sensitivity": finite_or_none(m), "active": bool(a)}
            for f, z, swr, m, a in zip(self.frequency_hz, sweep.z_antenna_ohm, sweep.swr_antenna, sweep.sensitivity,
                                       sweep.active)]}
        if self.uncertainty is not None:
            document["uncertainty"] = self.uncertainty.to_dict()
        return document


def solve_feedpoint(station: Station) -> FeedpointResult:
    """The station's measured sweep moved from where it was taken to the antenna feedpoint.

    Raises `BudgetError` (at ``antenna``) unless the antenna is an impedance sweep measured away
    from the feedpoint (``measured_at:`` the radio or a meter).
    """
    antenna = station.antenna
    if not (isinstance(antenna, MeasuredAntenna) and isinstance(antenna.table, ImpedanceTable)):
        raise BudgetError("feedpoint needs an antenna measured away from the feedpoint: touchstone: FILE (or "
                          "impedance: {...}) with measured_at: radio or a meter label", "antenna")
    return FeedpointResult(station.name, antenna.source, antenna.table.frequency_hz, recover_feedpoint(station))
