"""Benchmark the antenna-length and feeder-length scan (linecalc advise --antenna-from/--antenna-to).

Prints figures and ratios, not verdicts.

    .venv/bin/python bench/bench_pairs.py [--step 1] [--jobs N]

The scan: a copper doublet 10 m high over average ground from 2 x 10 to 2 x 25 m tip to tip
(--step, default 1 m: 31 antenna lengths), a 450-ohm window-line class feeder from 5 to 60 m in
1 cm steps (5,501 lengths), 80 m to 10 m (9 bands, edges and centre: 27 frequencies), a T tuner.
Per antenna length: one engine run over every frequency (impedance only) and one whole feeder
scan. It prints the time per antenna length, the share the engine takes, and the whole scan
with one process (wall and processor time, and the load average, since the development machine
is shared) and with --jobs processes running the engine (default: one per processor).
"""
from __future__ import annotations

import argparse
import dataclasses
import os
import time

import numpy as np

import linecalc
from linecalc.physics import wire_antenna
from linecalc.studies import pair_advice
from linecalc.studies.length_advice import prepare_scan, scan_feeder

STATION = """\
name: Bench doublet pair scan
region: 1
radio: {power: 100 W}
bands: [80m, 60m, 40m, 30m, 20m, 17m, 15m, 12m, 10m]
antenna:
  wire: {shape: dipole, length: 2 x 17.5 m, height: 10 m, diameter: 2 mm, material: copper, ground: average}
feed:
  - tuner: {label: tuner, network: T, output: balanced}
  - line: {label: ladder, cable: window-line-450, length: 20 m}
"""


def whole(station, step_m, jobs, per_length):
    """Wall time [s], this process's processor time [s] and the result of the whole scan."""
    wire_antenna.clear_cache()
    start, cpu = time.perf_counter(), time.process_time()
    result = pair_advice.advise_pairs(station, None, 20.0, 50.0, step_m, 5.0, 60.0, 0.01, jobs=jobs,
                                      antenna_progress=lambda done, total, length, s: per_length.append(s))
    return time.perf_counter() - start, time.process_time() - cpu, result


def main():
    parser = argparse.ArgumentParser()
    parser.add_argument("--step", type=float, default=1.0, help="antenna length step [m] (default 1)")
    parser.add_argument("--jobs", type=int, default=os.cpu_count() or 1)
    args = parser.parse_args()
    station = linecalc.load_station(STATION)
    setup = prepare_scan(station, None)
    lengths = pair_advice.antenna_lengths_m(station.antenna, 20.0, 50.0, args.step)
    print(f"scan: {lengths.size} antenna lengths (20 to 50 m tip to tip) x 5,501 feeder lengths x "
          f"{setup.frequency_hz.size} frequencies, T tuner, average ground; {os.cpu_count()} processors")

    # one antenna length, its parts: the engine run and the feeder scan
    engine_s, scan_s = [], []
    for length in (lengths[0], lengths[lengths.size // 2], lengths[-1]):
        wire_antenna.clear_cache()
        antenna = dataclasses.replace(station.antenna, length_m=float(length))
        z, seconds = pair_advice.antenna_impedance(antenna, setup.frequency_hz)
        start = time.perf_counter()
        scan_feeder(dataclasses.replace(setup, station=dataclasses.replace(station, antenna=antenna)), z, 5.0, 60.0, 0.01)
        engine_s.append(seconds)
        scan_s.append(time.perf_counter() - start)
        print(f"  {length:g} m: engine {seconds:.2f} s ({1000 * seconds / setup.frequency_hz.size:.0f} ms per "
              f"frequency), feeder scan {scan_s[-1]:.2f} s")
    print(f"engine share of one antenna length: {np.sum(engine_s) / (np.sum(engine_s) + np.sum(scan_s)):.0%}")

    print(f"load average before the whole scan: {os.getloadavg()[0]:.1f} (other work shares the processors)")
    one_s, one_cpu, result = whole(station, args.step, 1, per_one := [])
    print(f"whole scan, 1 process: {one_s:.1f} s wall, {one_cpu:.1f} s processor; {one_s / lengths.size:.2f} s per "
          f"antenna length (least {min(per_one):.2f} s, most {max(per_one):.2f} s)")
    if args.jobs > 1:
        many_s, _, other = whole(station, args.step, args.jobs, [])
        same = other.to_dict(50) == result.to_dict(50)
        print(f"whole scan, {args.jobs} processes for the engine: {many_s:.1f} s ({one_s / many_s:.2f}x faster; "
              f"the same document: {same})")
    best = result.pairs()[0]
    print(f"best pair: antenna {best[0]:g} m, feeder {best[1].best_length_m:.2f} m, "
          f"{best[1].power_sum_w:.1f} W summed over {len(result.scans[0].labels)} bands")


if __name__ == "__main__":
    main()
