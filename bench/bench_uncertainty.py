"""The uncertainty run: 10,000 drawn stations of a 10-band station against one plain budget of it.

    .venv/bin/python bench/bench_uncertainty.py

Two stations of 10 bands (160 m to 10 m, region 1): a dipole fed with 30 m of RG-213 class coax
through two connectors and a choke (impedance table), and the same with a T tuner at the radio.
The two solves run in alternation, 10 times each; the least wall time of each is compared.
The uncertainty run includes its plain budget (as `budget --uncertainty` does).
"""
from __future__ import annotations

import time

import linecalc
from linecalc.physics.tolerance import Tolerances

ROUNDS = 10

BANDS = "[160m, 80m, 40m, 30m, 20m, 17m, 15m, 12m, 10m, 60m]"
POINTS = ((1.8, 20, -400), (2.0, 25, -300), (3.5, 40, -150), (3.8, 55, -60), (5.3, 70, 80), (5.4, 72, 90),
          (7.0, 80, 150), (7.2, 85, 180), (10.1, 120, 300), (10.15, 121, 305), (14.0, 200, 500),
          (14.35, 210, 520), (18.068, 300, 600), (18.168, 302, 605), (21.0, 400, 500), (21.45, 410, 480),
          (24.89, 500, 300), (24.99, 505, 290), (28.0, 600, 0), (29.7, 640, -100))  # invented, for the bench only
TABLE = ", ".join(f"{f} MHz: {r}{x:+d}j" for f, r, x in POINTS)
STATION = f"""\
name: Bench station, ten bands
region: 1
radio: {{power: 100 W}}
bands: {BANDS}
antenna:
  impedance: {{{TABLE}}}
feed:
  - connector: {{count: 2}}
  - line: {{label: coax, cable: rg-213, length: 30 m}}
  - choke: {{}}
"""


def least_times(plain, drawn, rounds):
    """The least wall time of each of two functions, run in alternation ``rounds`` times (so that
    both meet the same moments of a busy machine)."""
    best = [float("inf"), float("inf")]
    for _ in range(rounds):
        for k, function in enumerate((plain, drawn)):
            start = time.perf_counter()
            function()
            best[k] = min(best[k], time.perf_counter() - start)
    return best


def main():
    for name, text in (("coax, connectors, choke", STATION),
                       ("the same with a T tuner at the radio", STATION.replace("feed:\n", "feed:\n  - tuner: {}\n"))):
        station = linecalc.load_station(text)
        tolerances = Tolerances(draws=10_000)
        plain, drawn = least_times(lambda: linecalc.solve_budget(station),
                                   lambda: linecalc.solve_budget(station, uncertainty=tolerances), ROUNDS)
        print(f"{name}: one budget {plain * 1e3:.1f} ms; 10,000 draws {drawn * 1e3:.0f} ms; "
              f"ratio {drawn / plain:.1f} (target within 20)")


if __name__ == "__main__":
    main()
