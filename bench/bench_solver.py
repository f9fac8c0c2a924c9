"""Benchmark the path solve against scikit-rf cascades and a bare numpy floor, in one process.

Prints ratios, not verdicts: linecalc time / reference time for the same work.

    .venv/bin/python bench/bench_solver.py

Work 1: a four-element path (coax, window line, coax, coax) at 10,001 frequencies.
Work 2: one line at 1,000 lengths times 11 band centres (a length axis, broadcast).
"""
from __future__ import annotations

import time

import numpy as np

from linecalc.physics.cables import cable_from_points
from linecalc.elements import Line
from linecalc.physics.twoports import line_abcd
from linecalc.physics.cascade import solve_path

RG213_LIKE = cable_from_points("bench-coax", "50-ohm solid-PE coax, bench only", "coax", 50.0, 0.66,
                               [1e6, 10e6, 100e6, 1000e6], [0.007, 0.022, 0.072, 0.27])
LADDER_LIKE = cable_from_points("bench-ladder", "450-ohm window line, bench only", "balanced", 450.0, 0.91,
                                [1e6, 10e6, 100e6], [0.0006, 0.002, 0.008])
BAND_CENTRES_HZ = np.array([1.9, 3.65, 7.1, 10.125, 14.175, 18.118, 21.225, 24.94, 28.85, 51, 145]) * 1e6


def best_of(function, repeats=5):
    """Least wall time of several runs [s] (the least is the one least disturbed)."""
    times = []
    for _ in range(repeats):
        start = time.perf_counter()
        function()
        times.append(time.perf_counter() - start)
    return min(times)


def linecalc_path(frequency_hz, path, rho_load):
    return solve_path([element.abcd(frequency_hz) for element in path], rho_load, 50.0, 100.0)


def inline_constants(frequency_hz, cable):
    """Z0 and gamma from a fitted cable's four numbers, the bare formula inline (as linecalc does:
    G' = 2 k_d f / Z0, C' = 1/(Z0 v), L' = Z0/v + R'/omega, and R' in closed form so that
    Re(gamma) = k_c sqrt(f) + k_d f exactly; see physics.cables.rlgc_for_attenuation)."""
    omega = 2 * np.pi * frequency_hz
    v = cable.velocity_factor * 299_792_458.0
    alpha = cable.k_conductor * np.sqrt(frequency_hz) + cable.k_dielectric * frequency_hz
    g = 2 * cable.k_dielectric * frequency_hz / cable.z0_nominal_ohm
    b, x = omega / (cable.z0_nominal_ohm * v), omega * cable.z0_nominal_ohm / v
    y2 = g * g + b * b
    beta = (alpha * (b - g) + np.sqrt(alpha ** 2 * (b - g) ** 2 + (b + g) * ((b + g) * alpha ** 2 + x * y2))) / (b + g)
    r = ((alpha ** 2 - beta ** 2) * g + 2 * alpha * beta * b) / y2
    z = r + 1j * (x + r)
    y = g + 1j * b
    return np.sqrt(z / y), np.sqrt(z * y)


def numpy_floor(frequency_hz, cables, lengths, rho_load):
    """The bare formula inline: line constants, cosh/sinh chain matrices, product, input
    impedance and power; no objects."""
    constants = [inline_constants(frequency_hz, cable) for cable in cables]
    v = 1 + rho_load
    i = (1 - rho_load) / 50.0
    for (z0, gamma), length in zip(reversed(constants), reversed(lengths)):
        gl = np.asarray(length)[..., None] * gamma
        c, s = np.cosh(gl), np.sinh(gl)
        v, i = c * v + z0 * s * i, s / z0 * v + c * i
    return v / i, (v * i.conj()).real


def skrf_path(frequency_hz, constants, lengths, rho_load):
    import skrf

    frequency = skrf.Frequency.from_f(frequency_hz, unit="Hz")
    network = None
    for (z0, gamma), length in zip(constants, lengths):
        media = skrf.media.DefinedGammaZ0(frequency, z0_port=50.0, z0=z0, gamma=gamma)
        line = media.line(length, unit="m")
        network = line if network is None else network ** line
    load = skrf.media.DefinedGammaZ0(frequency, z0_port=50.0).load(rho_load)
    return (network ** load).z[:, 0, 0]


def main():
    import skrf  # noqa: F401  (imported before timing so that its import cost is not counted)

    print("work                                   linecalc [ms]  scikit-rf [ms]  numpy floor [ms]  vs skrf  vs floor")

    frequency_hz = np.linspace(1.8e6, 30e6, 10_001)
    path = [Line(RG213_LIKE, 3.0), Line(LADDER_LIKE, 20.0), Line(RG213_LIKE, 1.0), Line(RG213_LIKE, 2.0)]
    constants = [e.cable.constants(frequency_hz) for e in path]
    lengths = [e.length_m for e in path]
    rho_load = np.full(frequency_hz.shape, 0.3 + 0.4j)
    ours = best_of(lambda: linecalc_path(frequency_hz, path, rho_load))
    ref = best_of(lambda: skrf_path(frequency_hz, constants, lengths, rho_load), repeats=3)
    floor = best_of(lambda: numpy_floor(frequency_hz, [e.cable for e in path], lengths, rho_load))
    print(f"4-element path, 10,001 frequencies   {ours * 1e3:12.2f}  {ref * 1e3:14.2f}  {floor * 1e3:16.2f}  "
          f"{ref / ours:6.1f}x  {ours / floor:6.2f}x")

    length_m = np.linspace(5.0, 15.0, 1000)
    swept = Line(RG213_LIKE, length_m)
    band_constants = RG213_LIKE.constants(BAND_CENTRES_HZ)
    rho_bands = np.full(BAND_CENTRES_HZ.shape, 0.5 - 0.2j)
    ours = best_of(lambda: linecalc_path(BAND_CENTRES_HZ, [swept], rho_bands))
    floor = best_of(lambda: numpy_floor(BAND_CENTRES_HZ, [RG213_LIKE], [length_m], rho_bands))

    def skrf_lengths():
        # scikit-rf has no length axis: one network per length, as a user of it would write
        for length in length_m:
            skrf_path(BAND_CENTRES_HZ, [band_constants], [length], rho_bands)

    ref = best_of(skrf_lengths, repeats=1)
    print(f"1,000 lengths x 11 bands             {ours * 1e3:12.2f}  {ref * 1e3:14.2f}  {floor * 1e3:16.2f}  "
          f"{ref / ours:6.1f}x  {ours / floor:6.2f}x")
    # a check that the three computed the same thing
    z_ours = linecalc_path(frequency_hz, path, rho_load)
    z_in = z_ours.voltage_v[0] / z_ours.current_a[0]
    z_ref = skrf_path(frequency_hz, constants, lengths, rho_load)
    print(f"largest relative difference of Z_in against scikit-rf: {np.max(np.abs(z_in / z_ref - 1)):.1e}")


if __name__ == "__main__":
    main()
