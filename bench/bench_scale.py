"""Scale: a station with 200 elements at 10,001 frequencies, and a batch of 1,000 station files.

    .venv/bin/python bench/bench_scale.py

Prints the time per station and the peak resident memory of each run (each run in a fresh
process, so that one does not inherit the other's peak). The batch runs the command's own entry
point, `linecalc budget FOLDER --format json`, in that process on 1,000 generated stations.
"""
from __future__ import annotations

import subprocess
import sys
import tempfile
import textwrap
import time
from pathlib import Path

BIN = Path(sys.executable).parent

LONG_PATH = """
import time, resource
import numpy as np
from linecalc.studies.budget import solve_budget
from linecalc.studies.station import Station
from linecalc.elements import Connector, Line
from linecalc.io.cable_library import load_library
from linecalc.physics.loads import ImpedanceTable

cables = load_library()
feed = []
for k in range(100):
    feed.append(Line(cables["rg-213" if k % 2 else "foam-10mm"], 0.5 + 0.01 * k, f"jumper {k}"))
    feed.append(Connector(f"connector {k}", 0.05, 50.0))
f = np.linspace(1.8e6, 30e6, 10_001)
antenna = ImpedanceTable(np.array([1.8e6, 30e6]), np.array([30 - 40j, 300 + 200j]))
station = Station("200 elements", 100.0, 50.0, tuple(f"{x:g}" for x in f), f, antenna, tuple(feed))
start = time.perf_counter()
result = solve_budget(station)
elapsed = time.perf_counter() - start
peak_mb = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
print(f"{elapsed:.2f} {peak_mb:.0f}")
"""

BATCH = """
import contextlib, io, resource, sys, time
from linecalc.cli import main
start = time.perf_counter()
with contextlib.redirect_stdout(io.StringIO()):
    status = main(["budget", sys.argv[1], "--format", "json"])
elapsed = time.perf_counter() - start
assert status == 0
print(f"{elapsed:.3f} {resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024:.0f}")
"""

STATION = textwrap.dedent("""\
    name: Batch station {k}
    region: 1
    radio: {{power: 100 W}}
    bands: [80m, 40m, 20m, 15m, 10m]
    antenna:
      impedance: {{3.5 MHz: 60+j20, 3.8 MHz: 95+j150, 7.0 MHz: 2600-j1500, 7.2 MHz: 2100-j1900,
                  14.0 MHz: 1900+j1100, 14.35 MHz: 1700+j1400, 21.0 MHz: 290+j470, 21.45 MHz: 320+j560,
                  28.0 MHz: 980-j640, 29.7 MHz: 760-j820}}
    feed:
      - meter: {{label: shack}}
      - tuner: {{network: T}}
      - line: {{cable: rg-213, length: {length} m}}
      - choke: {{}}
    """)


def main():
    print("work                                      time            per station    peak RSS")
    out = subprocess.run([str(BIN / "python"), "-c", LONG_PATH], capture_output=True, text=True, check=True)
    elapsed, peak = out.stdout.split()
    print(f"1 station, 200 elements x 10,001 freqs   {float(elapsed):6.2f} s        {float(elapsed):6.2f} s      {peak} MB")
    with tempfile.TemporaryDirectory() as folder:
        for k in range(1000):
            Path(folder, f"station-{k:04d}.yaml").write_text(STATION.format(k=k, length=10 + 0.05 * k))
        out = subprocess.run([str(BIN / "python"), "-c", BATCH, folder], capture_output=True, text=True, check=True)
        elapsed, peak = (float(x) for x in out.stdout.split())
    print(f"1,000 station files (5 bands, T tuner)    {elapsed:6.2f} s        {elapsed / 1000 * 1e3:6.1f} ms     "
          f"{peak:.0f} MB")


if __name__ == "__main__":
    main()
