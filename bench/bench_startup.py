"""Start-up: `linecalc budget` on a demo station against `python -c "import numpy, scipy, pint, yaml"`.

    .venv/bin/python bench/bench_startup.py

Each command runs 15 times in a fresh process; the least wall time of each is compared (the
least is the run least disturbed by the rest of the machine).
"""
from __future__ import annotations

import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
BIN = Path(sys.executable).parent
RUNS = 15


def least_time(command):
    times = []
    for _ in range(RUNS):
        start = time.perf_counter()
        subprocess.run(command, stdout=subprocess.DEVNULL, check=True)
        times.append(time.perf_counter() - start)
    return min(times)


def main():
    floor = least_time([str(BIN / "python"), "-c", "import numpy, scipy, pint, yaml"])
    budget = least_time([str(BIN / "linecalc"), "budget", str(ROOT / "stations" / "hilltop-dipole.yaml")])
    print(f"import numpy, scipy, pint, yaml: {floor * 1e3:.0f} ms; linecalc budget on a demo station: "
          f"{budget * 1e3:.0f} ms; ratio {budget / floor:.2f} (target under 1.5)")


if __name__ == "__main__":
    main()
