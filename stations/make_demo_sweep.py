"""Make stations/demo-shack-sweep.s1p: a synthesised analyser sweep for the de-embedding demo.

    .venv/bin/python stations/make_demo_sweep.py

The file is demo data computed from a model, not a measurement. The model: a 40 m half-wave
dipole near its resonance, as a series R-L-C whose resistance rises with frequency,

    Z(f) = R0 + k (f - f0) + j (2 pi f L - 1 / (2 pi f C)),

resonant at f0 = 7.1 MHz with R0 = 68 ohm, k = 40 ohm/MHz and a reactance slope of 380 ohm/MHz
at resonance (L = slope / (4 pi), C = 1 / ((2 pi f0)^2 L)); these are invented round numbers
of the size a dipole at a modest height shows (common practice), the same model as the
impedance table of stations/hilltop-dipole.yaml. The antenna is seen through 25 m of the
library's RG-213 class coax (cable id ``rg-213``), and the impedance at the radio end of that
line is what the file holds, as an analyser connected in the shack would read it: 101 points
from 6.9 to 7.4 MHz, S data against 50 ohm. A station that describes the same 25 m of coax and
de-embeds the file recovers the model to rounding.

References
----------
Balanis, Antenna Theory, 3rd ed., section 4.6, from memory (the half-wave dipole: about 73 ohm radiation
resistance in free space, reactance rising through resonance); the series-RLC form near one
resonance is common practice.
"""
from __future__ import annotations

from pathlib import Path

import numpy as np

from linecalc.physics.deembed import embed_impedance
from linecalc.elements import Line
from linecalc.io.cable_library import load_library
from linecalc.io.touchstone import write_one_port

OUTPUT = Path(__file__).resolve().parent / "demo-shack-sweep.s1p"
RESONANCE_HZ = 7.1e6
RESISTANCE_OHM = 68.0
RESISTANCE_SLOPE_OHM_PER_HZ = 40.0 / 1e6
REACTANCE_SLOPE_OHM_PER_HZ = 380.0 / 1e6
INDUCTANCE_H = REACTANCE_SLOPE_OHM_PER_HZ / (4 * np.pi)
CAPACITANCE_F = 1 / ((2 * np.pi * RESONANCE_HZ) ** 2 * INDUCTANCE_H)
COAX_LENGTH_M = 25.0
SWEEP_HZ = np.linspace(6.9e6, 7.4e6, 101)


def dipole_impedance_ohm(frequency_hz):
    """Feedpoint impedance of the model dipole [ohm] (see the module docstring)."""
    omega = 2 * np.pi * frequency_hz
    resistance = RESISTANCE_OHM + RESISTANCE_SLOPE_OHM_PER_HZ * (frequency_hz - RESONANCE_HZ)
    return resistance + 1j * (omega * INDUCTANCE_H - 1 / (omega * CAPACITANCE_F))


def main():
    coax = Line(load_library()["rg-213"], COAX_LENGTH_M, label="main coax")
    z_radio = embed_impedance([coax.abcd(SWEEP_HZ)], dipole_impedance_ohm(SWEEP_HZ))
    comment = (
        "SYNTHESISED DEMO DATA from a model, not a real measurement.\n"
        "Made by stations/make_demo_sweep.py: a 40 m half-wave dipole modelled as a series RLC\n"
        f"(resonant at {RESONANCE_HZ / 1e6:g} MHz, R = {RESISTANCE_OHM:g} ohm there, rising "
        f"{RESISTANCE_SLOPE_OHM_PER_HZ * 1e6:g} ohm/MHz;\n"
        f"reactance slope {REACTANCE_SLOPE_OHM_PER_HZ * 1e6:g} ohm/MHz), seen through "
        f"{COAX_LENGTH_M:g} m of RG-213 class coax (linecalc cable rg-213),\n"
        "as an analyser at the radio end of that coax would read it."
    )
    write_one_port(OUTPUT, SWEEP_HZ, z_radio, 50.0, comment, force=True)
    print(f"wrote {OUTPUT}")


if __name__ == "__main__":
    main()
