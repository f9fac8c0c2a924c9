"""Make the barn-dipole demo sweeps: the old coax swept open and shorted, and the dipole swept
through it, as an analyser in the shack would read them.

    .venv/bin/python stations/make_demo_line_sweeps.py

The files are demo data computed from a model, not a measurement. The model, invented for the
demo (round numbers of the size an aged foam-dielectric coax shows; common practice that old or
wet coax loses 10 to 30 % more than new and that water in foam lowers its velocity factor):

- the real line: 32 m of RG-8X class coax that has aged: nominal impedance 52 ohm, velocity
  factor 0.76 (the library's new cable: 50 ohm and 0.80), and both attenuation terms 1.35 times
  the library's ``rg-8x``;
- the antenna: an 80 m half-wave dipole near its resonance, as a series R-L-C whose resistance
  rises with frequency, Z(f) = R0 + k (f - f0) + j (2 pi f L - 1 / (2 pi f C)), resonant at
  f0 = 3.65 MHz with R0 = 60 ohm, k = 30 ohm/MHz and a reactance slope of 300 ohm/MHz at
  resonance (the form of stations/make_demo_sweep.py);
- the instrument: an analyser of reflection error 0.002 on each part of rho against 50 ohm (a
  good calibrated one; common practice: 0.01 to 0.03 in |rho|), random and seeded (seed 15) so
  the files come out the same every run.

Three files: demo-old-coax-open.s1p and demo-old-coax-short.s1p (the coax's near end, its far
end open, then shorted; 301 points from 1.8 to 30 MHz), and demo-barn-dipole-sweep.s1p (the
dipole through the coax, 101 points from 3.4 to 3.9 MHz).

References
----------
Pozar, Microwave Engineering, 4th ed., section 2.3 (open and shorted lines; the input impedance
of a loaded line); Balanis, Antenna Theory, 3rd ed., section 4.6, from memory (the half-wave
dipole); the series-RLC form near one resonance is common practice.
"""
from __future__ import annotations

import dataclasses
from pathlib import Path

import numpy as np

from linecalc.elements import Line
from linecalc.io.cable_library import load_library
from linecalc.io.touchstone import write_one_port
from linecalc.physics.deembed import embed_impedance

FOLDER = Path(__file__).resolve().parent
LENGTH_M = 32.0
Z0_NOMINAL_OHM = 52.0
VELOCITY_FACTOR = 0.76
LOSS_FACTOR = 1.35
RESONANCE_HZ = 3.65e6
RESISTANCE_OHM = 60.0
RESISTANCE_SLOPE_OHM_PER_HZ = 30.0 / 1e6
REACTANCE_SLOPE_OHM_PER_HZ = 300.0 / 1e6
INDUCTANCE_H = REACTANCE_SLOPE_OHM_PER_HZ / (4 * np.pi)
CAPACITANCE_F = 1 / ((2 * np.pi * RESONANCE_HZ) ** 2 * INDUCTANCE_H)
RHO_ERROR = 0.002
SEED = 15
LINE_SWEEP_HZ = np.linspace(1.8e6, 30e6, 301)
ANTENNA_SWEEP_HZ = np.linspace(3.4e6, 3.9e6, 101)


def real_line() -> Line:
    """The aged coax of the model (see the module docstring)."""
    new = load_library()["rg-8x"]
    aged = dataclasses.replace(new, id="demo-aged-rg-8x", z0_nominal_ohm=Z0_NOMINAL_OHM,
                               velocity_factor=VELOCITY_FACTOR, k_conductor=new.k_conductor * LOSS_FACTOR,
                               k_dielectric=new.k_dielectric * LOSS_FACTOR)
    return Line(aged, LENGTH_M, label="old coax")


def dipole_impedance_ohm(frequency_hz):
    """Feedpoint impedance of the model dipole [ohm]."""
    omega = 2 * np.pi * frequency_hz
    resistance = RESISTANCE_OHM + RESISTANCE_SLOPE_OHM_PER_HZ * (frequency_hz - RESONANCE_HZ)
    return resistance + 1j * (omega * INDUCTANCE_H - 1 / (omega * CAPACITANCE_F))


def _read_by_analyser(z_ohm, rng):
    """``z_ohm`` as the model analyser reads it: its rho against 50 ohm plus the instrument's error."""
    rho = np.where(np.isinf(z_ohm), 1.0, (z_ohm - 50) / (z_ohm + 50))
    rho = rho + RHO_ERROR * (rng.standard_normal(rho.shape) + 1j * rng.standard_normal(rho.shape))
    return 50 * (1 + rho) / (1 - rho)


def sweeps():
    """(name, frequencies [Hz], impedance read [ohm], what it is) of the three files."""
    rng = np.random.default_rng(SEED)
    line = real_line()
    f = LINE_SWEEP_HZ
    z0, gamma = line.cable.constants(f)
    t = np.tanh(gamma * LENGTH_M)
    z_open, z_short = z0 / t, z0 * t  # Pozar, section 2.3
    z_radio = embed_impedance([line.abcd(ANTENNA_SWEEP_HZ)], dipole_impedance_ohm(ANTENNA_SWEEP_HZ))
    return [("demo-old-coax-open.s1p", f, _read_by_analyser(z_open, rng), "the old coax, far end OPEN"),
            ("demo-old-coax-short.s1p", f, _read_by_analyser(z_short, rng), "the old coax, far end SHORTED"),
            ("demo-barn-dipole-sweep.s1p", ANTENNA_SWEEP_HZ, _read_by_analyser(z_radio, rng),
             "the 80 m dipole through the old coax")]


def main(folder=FOLDER):
    for name, f, z, what in sweeps():
        comment = (
            "SYNTHESISED DEMO DATA from a model, not a real measurement.\n"
            f"Made by stations/make_demo_line_sweeps.py: {what}, read at the coax's shack end.\n"
            f"Model line: {LENGTH_M:g} m of aged RG-8X class coax ({Z0_NOMINAL_OHM:g} ohm, VF {VELOCITY_FACTOR:g}, "
            f"loss {LOSS_FACTOR:g} x the library's rg-8x);\n"
            f"instrument error {RHO_ERROR:g} on each part of rho, seed {SEED}."
        )
        write_one_port(Path(folder) / name, f, z, 50.0, comment, force=True)
        print(f"wrote {Path(folder) / name}")


if __name__ == "__main__":
    main()
