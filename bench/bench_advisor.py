"""Benchmark the feeder-length scan against scikit-rf networks and a bare numpy floor, in one process.

Prints figures and ratios, not verdicts.

    .venv/bin/python bench/bench_advisor.py

The scan: a 450-ohm window-line class feeder from 5 to 60 m in 1 cm steps (5,501 lengths), 11
bands from 160 m to 6 m at 21 points each (231 frequencies), a T tuner: 1.27 million
(length, frequency) evaluations.

- The whole scan: `linecalc.physics.length_scan.advise_length`, line solve, tuner test, voltages, windows.
- The line-solve part, like with like: the impedance the tuner sees for every length and
  frequency. linecalc's stage (`linecalc.physics.length_scan.feeder_waves`, chunked as the scan runs it);
  scikit-rf networks, one line network per length cascaded with the load, as a user of it would
  write (a subset of lengths, extrapolated per length); the numpy floor, the chain-matrix input
  impedance written inline over the whole (lengths, frequencies) array at once, and the same
  in its reflection form (one exponential, as linecalc's stage computes it).
- The tuner part: `linecalc.physics.matching_fast.t_network_least_loss` against the full design
  `linecalc.physics.matching.design_t_network` (a subset, extrapolated per evaluation).
"""
from __future__ import annotations

import time

import numpy as np

from linecalc.physics import length_scan as advisor
from linecalc.physics import bands
from linecalc.physics import matching as tuner
from linecalc.physics import matching_fast as tuner_scan
from linecalc.physics.cables import cable_from_points

LADDER_LIKE = cable_from_points("bench-ladder", "450-ohm window line, bench only", "balanced", 450.0, 0.91,
                                [1e6, 10e6, 100e6], [0.0006, 0.002, 0.008])
# A modest T tuner (bench values): narrow enough that only some lengths match on every band.
PARTS = tuner.TunerParts(15e-12, 250e-12, 0.1e-6, 20e-6)
BAND_NAMES = ("160m", "80m", "60m", "40m", "30m", "20m", "17m", "15m", "12m", "10m", "6m")
R0_OHM = 50.0
SKRF_LENGTHS = 200       # lengths solved with scikit-rf; the rest is extrapolated per length
FULL_DESIGN_LOADS = 5000  # loads designed with the full T design; extrapolated per evaluation


def bench_antenna_ohm(frequency_hz):
    """Invented load for the benchmark only: the usual shape of a 40 m long doublet,
    600 ohm x coth(gamma h), h = 20 m. Not a model of a real antenna."""
    beta = 2 * np.pi * frequency_hz / 299_792_458.0
    alpha = 0.117 / 20.0 * np.sqrt(frequency_hz / 3.75e6)
    return 600.0 / np.tanh((alpha + 1j * beta) * 20.0)


def best_of(function, repeats):
    """Least wall time of several runs [s] and the last result (the least is the least disturbed)."""
    times, result = [], None
    for _ in range(repeats):
        start = time.perf_counter()
        result = function()
        times.append(time.perf_counter() - start)
    return min(times), result


def linecalc_line_part(length_m, z0, gamma, rho_out, chunk):
    """The advisor's line stage over every chunk: the impedance the tuner sees."""
    out = np.empty((length_m.size, z0.size), dtype=complex)
    for start in range(0, length_m.size, chunk):
        _, v, i = advisor.feeder_waves(z0, gamma, length_m[start:start + chunk, None], rho_out)
        out[start:start + chunk] = v / i
    return out


def numpy_floor(length_m, z0, gamma, z_load):
    """The bare formula inline: Z_in = (cosh(gl) Z_L + Z0 sinh(gl)) / (sinh(gl) Z_L / Z0 + cosh(gl))."""
    gl = length_m[:, None] * gamma
    c, s = np.cosh(gl), np.sinh(gl)
    return (c * z_load + z0 * s) / (s * z_load / z0 + c)


def numpy_floor_reflection(length_m, z0, gamma, z_load):
    """The same in its reflection form inline, one exponential: Z0 (1 + rho e^(-2 gl)) / (1 - rho e^(-2 gl))."""
    rho = (z_load - z0) / (z_load + z0) * np.exp(-2 * length_m[:, None] * gamma)
    return z0 * (1 + rho) / (1 - rho)


def skrf_lengths(length_m, frequency_hz, z0, gamma, z_load):
    import skrf

    frequency = skrf.Frequency.from_f(frequency_hz, unit="Hz")
    media = skrf.media.DefinedGammaZ0(frequency, z0_port=R0_OHM, z0=z0, gamma=gamma)
    load = skrf.media.DefinedGammaZ0(frequency, z0_port=R0_OHM).load((z_load - R0_OHM) / (z_load + R0_OHM))
    return np.array([(media.line(length, unit="m") ** load).z[:, 0, 0] for length in length_m])


def main():
    import skrf  # noqa: F401  (imported before timing so that its import cost is not counted)

    frequency_hz, _ = advisor.band_scan_frequencies([bands.band(name, 1) for name in BAND_NAMES], 21)
    z_antenna = bench_antenna_ohm(frequency_hz)
    length_m = advisor.scan_lengths_m(5.0, 60.0, 0.01)
    evaluations = length_m.size * frequency_hz.size
    print(f"scan: {length_m.size:,} lengths x {frequency_hz.size} frequencies = {evaluations:,} evaluations, "
          f"T tuner, one process")

    # --- the whole scan --------------------------------------------------------------------------
    def whole():
        return advisor.advise_length(LADDER_LIKE, frequency_hz, z_antenna, PARTS, network="T", r0_ohm=R0_OHM,
                                     radio_power_w=100.0, length_min_m=5.0, length_max_m=60.0, step_m=0.01)

    cpu = time.process_time()
    scan_s, advice = best_of(whole, 2)
    cpu = (time.process_time() - cpu) / 2
    print(f"whole scan: {scan_s:.2f} s wall (best of 2), {cpu:.2f} s processor per run; "
          f"{scan_s / evaluations * 1e9:.0f} ns per evaluation; chunks of {advice.chunk_lengths} lengths, "
          f"{advice.chunk_peak_bytes / 2**20:.0f} MB peak each; {len(advice.windows)} windows, "
          f"{advice.matchable.mean():.0%} of lengths match everywhere")

    # --- the line-solve part, like with like --------------------------------------------------------
    z0, gamma = LADDER_LIKE.constants(frequency_hz)
    rho_out = (z_antenna - z0) / (z_antenna + z0)
    ours_s, z_ours = best_of(lambda: linecalc_line_part(length_m, z0, gamma, rho_out, advice.chunk_lengths), 5)
    floor_s, z_floor = best_of(lambda: numpy_floor(length_m, z0, gamma, z_antenna), 5)
    floor2_s, _ = best_of(lambda: numpy_floor_reflection(length_m, z0, gamma, z_antenna), 5)
    subset = length_m[:: length_m.size // SKRF_LENGTHS][:SKRF_LENGTHS]
    skrf_subset_s, z_skrf = best_of(lambda: skrf_lengths(subset, frequency_hz, z0, gamma, z_antenna), 1)
    skrf_s = skrf_subset_s / subset.size * length_m.size
    print()
    print("line-solve part (impedance the tuner sees, all lengths x frequencies)")
    print("  linecalc [ms]  scikit-rf [ms]  numpy floor [ms]  vs scikit-rf  vs floor")
    print(f"  {ours_s * 1e3:13.1f}  {skrf_s * 1e3:14.0f}  {floor_s * 1e3:16.1f}  {skrf_s / ours_s:9.0f}x "
          f"{ours_s / floor_s:8.2f}x")
    print(f"  the floor in its reflection form (one exponential instead of cosh and sinh): {floor2_s * 1e3:.1f} ms, "
          f"linecalc {ours_s / floor2_s:.2f}x of it")
    print(f"  scikit-rf solved {subset.size} of the {length_m.size:,} lengths in {skrf_subset_s:.2f} s; "
          "its time is extrapolated per length")
    rows = np.searchsorted(length_m, subset)
    print(f"  largest relative difference of Z against scikit-rf: {np.max(np.abs(z_ours[rows] / z_skrf - 1)):.1e}, "
          f"against the floor: {np.max(np.abs(z_ours / z_floor - 1)):.1e}")

    # --- the tuner part ---------------------------------------------------------------------------
    loads = z_ours.ravel()
    frequencies = np.broadcast_to(frequency_hz, z_ours.shape).ravel()
    chunk = advice.chunk_lengths * frequency_hz.size

    def tuner_part():
        for start in range(0, loads.size, chunk):
            tuner_scan.t_network_least_loss(frequencies[start:start + chunk], loads[start:start + chunk], R0_OHM, PARTS)

    tuner_s, _ = best_of(tuner_part, 2)
    pick = np.linspace(0, loads.size - 1, FULL_DESIGN_LOADS).astype(int)
    full_subset_s, _ = best_of(lambda: tuner.design_t_network(frequencies[pick], loads[pick], R0_OHM, PARTS), 1)
    full_s = full_subset_s / pick.size * loads.size
    print()
    print("tuner part (can a T match, least loss)")
    print(f"  tuner_scan {tuner_s:.2f} s; full design {full_s:.1f} s (extrapolated from {pick.size:,} loads): "
          f"{full_s / tuner_s:.0f}x faster")
    print(f"  line part {ours_s / scan_s:.0%} of the whole scan, tuner part {tuner_s / scan_s:.0%}")


if __name__ == "__main__":
    main()
