"""Recompute the matched attenuation of every library cable from its stated geometry.

Usage (from the repository root, with the project's Python):

    python cable_data/derive_attenuation.py            # print the tables, with the stored values
    python cable_data/derive_attenuation.py --write    # also rewrite the `points:` blocks
    python cable_data/derive_attenuation.py --strands  # the field-diameter ratios of stranded wire

The attenuation is 20 log10(e) Re(gamma) from `linecalc.physics.cables.coax_rlgc` or `two_wire_rlgc`
through `line_constants`, at the frequencies listed in `FREQUENCIES_MHZ`; a stranded conductor
enters with its field diameter (overall diameter times `field_diameter_ratio`) and every
conductor with its `resistance_factor`. README.md explains the format and the sources.
"""
from __future__ import annotations

import argparse
import re
import sys
from pathlib import Path

import numpy as np

from linecalc.physics import cables
from linecalc.io import cable_library as library
from linecalc.io.units import parse_loss_db_per_m, parse_quantity

FOLDER = Path(__file__).resolve().parent
# Frequencies of the tables [MHz]: coax across 1 to 1000 MHz; balanced lines to 450 MHz, and
# open-wire line only while its spacing stays a small fraction of a wavelength.
FREQUENCIES_MHZ = {
    "coax": (1, 3.5, 7, 14, 30, 50, 100, 150, 450, 1000),
    "balanced": (1, 3.5, 7, 14, 30, 50, 100, 150, 450),
    "open-wire-600": (1, 3.5, 7, 14, 30, 50, 100, 150),
}


def number(node) -> float:
    """The number of a `{value: ..., source: ...}` node (a bare YAML number)."""
    return float(node["value"])


def length_m(node) -> float:
    """The length of a `{value: 2.25 mm, source: ...}` node [m]."""
    return parse_quantity(node["value"], "m")


def frequencies_hz(entry) -> np.ndarray:
    """The table frequencies of an entry [Hz]."""
    return 1e6 * np.array(FREQUENCIES_MHZ.get(entry["id"], FREQUENCIES_MHZ[entry["kind"]]), dtype=float)


def conductor(node) -> tuple[float, float, float]:
    """Field diameter [m], conductivity [S/m] and resistance factor [1] of a conductor node."""
    diameter = length_m(node["diameter"]) * number(node["field_diameter_ratio"])
    return diameter, cables.CONDUCTIVITY_S_PER_M[node["material"]], number(node["resistance_factor"])


def cladding_m(node) -> float | None:
    """Cladding thickness [m] of a copper-clad steel conductor from its composite conductivity in
    percent of IACS (``conductivity_iacs``); None for a solid conductor."""
    if "conductivity_iacs" not in node:
        return None
    return cables.cladding_thickness_m(length_m(node["diameter"]),
                                       number(node["conductivity_iacs"]) / 100 * cables.IACS_S_PER_M)


def geometry_rlgc(entry, frequency_hz) -> cables.Rlgc:
    """Per-metre constants of an entry from its stated geometry."""
    geometry = entry["geometry"]
    dielectric = geometry["dielectric"]
    eps_r, tan_delta = number(dielectric["permittivity"]), number(dielectric["loss_tangent"])
    if entry["kind"] == "coax":
        d, sigma_i, k_i = conductor(geometry["inner"])
        outer = geometry["outer"]
        return cables.coax_rlgc(frequency_hz, d, length_m(dielectric["diameter"]), eps_r, tan_delta, sigma_i,
                                cables.CONDUCTIVITY_S_PER_M[outer["material"]], k_i, number(outer["resistance_factor"]),
                                inner_cladding_m=cladding_m(geometry["inner"]))
    d, sigma, k = conductor(geometry["wires"])
    return cables.two_wire_rlgc(frequency_hz, d, length_m(geometry["spacing"]), eps_r, tan_delta, sigma, k)


def attenuation_db_per_m(entry, frequency_hz) -> np.ndarray:
    """Matched attenuation of an entry from its geometry [dB/m]."""
    _, gamma = cables.line_constants(frequency_hz, geometry_rlgc(entry, frequency_hz))
    return 20 * np.log10(np.e) * gamma.real


def geometry_z0_ohm(entry) -> float:
    """Lossless characteristic impedance from the geometry [ohm] (Pozar, 4th ed., Table 2.1)."""
    geometry = entry["geometry"]
    eps_r = number(geometry["dielectric"]["permittivity"])
    if entry["kind"] == "coax":
        d, _, _ = conductor(geometry["inner"])
        return cables.coax_from_geometry(entry["id"], "", d, length_m(geometry["dielectric"]["diameter"]),
                                         eps_r, 0.0).z0_nominal_ohm
    d, _, _ = conductor(geometry["wires"])
    return cables.two_wire_from_geometry(entry["id"], "", d, length_m(geometry["spacing"]), eps_r).z0_nominal_ohm


def points_block(frequency_hz, loss_db_per_m) -> str:
    """The `points:` lines of an entry, three significant figures in dB/100m."""
    return "".join(f"    {f / 1e6:g} MHz: {100 * a:#.3g} dB/100m\n".replace(". dB", " dB")
                   for f, a in zip(frequency_hz, loss_db_per_m))


def stranded_field_diameter_ratio(layers: int, points_per_strand: int = 90) -> float:
    """Field diameter of an ideal concentric lay over its overall diameter (2D electrostatics).

    The lay is one centre strand and ``layers`` rings of 6, 12, ... strands, all touching. A
    charge-simulation solution (line charges inside each strand, potential 1 on the exposed
    strand surfaces) gives the total charge Q per unit length for unit potential with the 2D
    free-space Green's function -ln(r)/(2 pi eps); the round wire with the same far field has
    radius exp(-2 pi eps / Q) (Harrington, Field Computation by Moment Methods, chapter 1).
    """
    centres = [(0.0, 0.0)] + [(2 * k * np.cos(a), 2 * k * np.sin(a)) for k in range(1, layers + 1)
                              for a in 2 * np.pi * np.arange(6 * k) / (6 * k)]
    centres = np.array(centres)  # strand radius 1, so touching neighbours sit 2 apart
    angle = 2 * np.pi * np.arange(points_per_strand) / points_per_strand
    ring = np.column_stack([np.cos(angle), np.sin(angle)])
    surface = (centres[:, None, :] + ring[None]).reshape(-1, 2)
    sources = (centres[:, None, :] + 0.7 * ring[None]).reshape(-1, 2)
    # keep surface points that are not inside a neighbour (contact points sit on both)
    distance = np.linalg.norm(surface[:, None, :] - centres[None], axis=2)
    exposed = np.sum(distance < 1 - 1e-9, axis=1) == 0
    surface = surface[exposed]
    green = -np.log(np.linalg.norm(surface[:, None, :] - sources[None], axis=2))
    charges, *_ = np.linalg.lstsq(green, np.ones(len(surface)), rcond=None)
    return float(np.exp(-1 / charges.sum()) / (2 * layers + 1))


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--write", action="store_true", help="rewrite the points: block of every file")
    parser.add_argument("--strands", action="store_true", help="print the field-diameter ratios of stranded wire")
    args = parser.parse_args(argv)
    if args.strands:
        for layers in (1, 2):
            print(f"{1 + 3 * layers * (layers + 1)} strands: field diameter = "
                  f"{stranded_field_diameter_ratio(layers):.3f} x overall diameter")
        return 0
    for entry in library.library_entries():
        f = frequencies_hz(entry)
        loss = attenuation_db_per_m(entry, f)
        stored = (entry.get("attenuation") or {}).get("points") or {}
        stored_by_f = {parse_quantity(k, "Hz"): parse_loss_db_per_m(v) for k, v in stored.items()}
        z0 = geometry_z0_ohm(entry)
        nominal = entry["nominal_impedance"]["value"]
        print(f"{entry['id']}  ({entry['_file']}): geometry Z0 = {z0:.1f} ohm, nominal {nominal}")
        print("  frequency    derived dB/100m   stored dB/100m")
        for fi, ai in zip(f, loss):
            old = stored_by_f.get(fi)
            print(f"  {fi / 1e6:7g} MHz   {100 * ai:12.3f}   " + ("   (none)" if old is None else f"{100 * old:12.3f}"))
        if args.write:
            path = FOLDER / entry["_file"]
            text = path.read_text(encoding="utf-8")
            # the points: block is the last thing in the file (one entry per file)
            new, count = re.subn(r"(?ms)^  points:\n.*\Z", "  points:\n" + points_block(f, loss), text)
            if count != 1:
                print(f"  cannot find the points: block at the end of {path.name}", file=sys.stderr)
                return 1
            path.write_text(new, encoding="utf-8")
    return 0


if __name__ == "__main__":
    sys.exit(main())
