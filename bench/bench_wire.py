"""A wire antenna on 11 bands of 3 points each (33 frequencies): `budget --sweep 3` and a
budget of 33 rows with the model, against the bare engine run it makes (the same wires and
cards, no linecalc around them); each with its engine runs shared between this process and a
forked worker (the default on Linux, at most 2 processes) and serially (one process, as with
LINECALC_ENGINE_PROCESSES=1).

    .venv/bin/python bench/bench_wire.py

Each case runs 3 times with the cache cleared; the least wall time counts. The ratios say what
linecalc adds to the engine (little) and what the far-field pattern and real ground cost.
"""
from __future__ import annotations

import dataclasses
import os
import time

import numpy as np

import linecalc
from linecalc.physics import wire_antenna
from linecalc.studies.station import row_frequencies

STATION = """\
name: Bench doublet
region: 1
radio: {power: 100 W}
bands: [160m, 80m, 60m, 40m, 30m, 20m, 17m, 15m, 12m, 10m, 6m]
antenna:
  wire: {shape: dipole, length: 2 x 20 m, height: 12 m, ground: GROUND}
feed:
  - tuner: {label: tuner, output: balanced}
  - line: {label: ladder, cable: window-line-450, length: 20 m}
"""
RUNS = 3


def least(work):
    times = []
    for _ in range(RUNS):
        wire_antenna.clear_cache()
        start = time.perf_counter()
        work()
        times.append(time.perf_counter() - start)
    return min(times)


def main():
    print(f"{os.cpu_count()} processors, load average {os.getloadavg()[0]:.2f} at the start")
    for ground in ("perfect", "average"):
        station = linecalc.load_station(STATION.replace("GROUND", ground))
        f = np.concatenate(row_frequencies(station, 3))
        swept = dataclasses.replace(station, frequency_hz=f, labels=tuple(f"{x:g}" for x in f),
                                    band_edges_hz=(None,) * f.size)
        segments = sum(count for *_, count in wire_antenna.wires(station.antenna)[0])
        sweep = {}
        for processes in (1, 2):
            os.environ[wire_antenna.PROCESSES_VARIABLE] = str(processes)
            full = least(lambda: linecalc.solve_budget(swept))
            sweep[processes] = least(lambda: linecalc.solve_budget(station, sweep_points=3))
            engine = least(lambda: wire_antenna._engine_runs(station.antenna, sorted(f), True, processes))
            bare = least(lambda: wire_antenna._engine_runs(station.antenna, sorted(f), False, processes))
            print(f"{ground:>8} ground, {f.size} frequencies, {segments} segments, {processes} process(es): "
                  f"budget --sweep 3 {sweep[processes]:.2f} s (far field at the 11 band centres only), budget of "
                  f"33 rows {full:.2f} s, engine with pattern {engine:.2f} s ({full / engine:.2f}x), impedance "
                  f"only {bare:.2f} s (pattern costs {engine / bare:.2f}x), {1000 * engine / f.size:.0f} ms of wall time per "
                  f"frequency")
        print(f"{ground:>8} ground: budget --sweep 3 split over 2 processes takes {sweep[2] / sweep[1]:.2f}x "
              "the serial time")
    del os.environ[wire_antenna.PROCESSES_VARIABLE]


if __name__ == "__main__":
    main()
