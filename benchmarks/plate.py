"""Cost of a plate trajectory against a point-mass trajectory, and of a zone with a sheet.

Two measurements under the same machine load (ratios, not absolute rates, are what a shared
machine lets one trust):

1. ``plate_over_point_mass``: N falls of a 1220 x 1220 x 12 mm plywood sheet (9.8 kg) from
   17.5 m in a log-law wind of 0-13 m/s, attitudes and spins as the zone samples them, flown by
   :func:`dropcalc.physics.plate.solve_plate_falls` at the zone's tolerance; and the same
   falls as point masses (drag areas between the sheet's bounds) by
   :func:`dropcalc.physics.trajectory.solve_falls` at the zone's tolerance with the closed form
   off. The target of issue 11 is a ratio of 20 or less.
2. ``zone_seconds``: :func:`dropcalc.analysis.zone.compute_zone` for the sheet alone at one
   work edge (17.5 m, 8 m/s mean wind, suburban terrain), Monte Carlo and envelope, and the
   same object as a point mass.

    python benchmarks/plate.py [--cases N] [--seed S] [--json]
"""

from __future__ import annotations

import argparse
import json
import time
from dataclasses import replace

import numpy as np

from dropcalc.analysis.plate_flight import PLATE_ZONE_TOLERANCE, sample_attitudes
from dropcalc.analysis.zone import ZONE_TOLERANCE, ZoneSettings, compute_zone, zone_object
from dropcalc.io.library import load_library
from dropcalc.model.conditions import Conditions
from dropcalc.physics.plate import PlateGeometry, solve_plate_falls
from dropcalc.physics.trajectory import WindField, solve_falls
from dropcalc.physics.wind import wind_spec

SHEET = "plywood-12mm-half-sheet"


def _best_of(repeat: int, run: object) -> float:
    times = []
    for _ in range(repeat):
        start = time.perf_counter()
        run()  # type: ignore[operator]
        times.append(time.perf_counter() - start)
    return min(times)


def run(cases: int, seed: int, repeat: int) -> dict:
    rng = np.random.default_rng(seed)
    obj = load_library().get(SHEET)
    plate = (1.22, 1.22, 0.012)
    wind = WindField(
        speed_10m=rng.uniform(0.0, 13.0, cases),
        profile="log",
        roughness_length=0.3,
        minimum_height=5.0,
    )
    chord, span, pitch, spin = sample_attitudes(plate, cases, rng, 9.80665)
    k = 1.225 * rng.uniform(obj.drag_area_min, obj.drag_area_max, cases) / (2 * obj.mass)
    velocity = np.zeros((3, cases))

    def plates() -> None:
        solve_plate_falls(
            17.5, velocity, obj.mass, PlateGeometry(chord, span, plate[2]), 1.225,
            initial_pitch=pitch, initial_spin=spin, wind=wind, tolerance=PLATE_ZONE_TOLERANCE,
        )  # fmt: skip

    def points() -> None:
        solve_falls(17.5, velocity, k, wind=wind, tolerance=ZONE_TOLERANCE, closed_form=False)

    plate_seconds = _best_of(repeat, plates)
    point_seconds = _best_of(repeat, points)

    settings = ZoneSettings(
        height=17.5, conditions=Conditions(wind=wind_spec(8.0, terrain="suburban"))
    )
    sheet = zone_object(obj)
    as_point = replace(sheet, plate=None)
    zone_plate = _best_of(1, lambda: compute_zone([sheet], settings))
    zone_point = _best_of(1, lambda: compute_zone([as_point], settings))
    return {
        "cases": cases,
        "plate_seconds": plate_seconds,
        "point_mass_seconds": point_seconds,
        "plate_over_point_mass": plate_seconds / point_seconds,
        "zone_seconds": zone_plate,
        "zone_point_mass_seconds": zone_point,
        "zone_over_point_mass": zone_plate / zone_point,
    }


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--cases", type=int, default=20000)
    parser.add_argument("--seed", type=int, default=1)
    parser.add_argument("--repeat", type=int, default=3)
    parser.add_argument("--json", action="store_true")
    args = parser.parse_args()
    result = run(args.cases, args.seed, args.repeat)
    if args.json:
        print(json.dumps(result))
        return
    print(
        f"{result['cases']} falls: plate {result['plate_seconds']:.2f} s, point mass "
        f"{result['point_mass_seconds']:.2f} s, ratio {result['plate_over_point_mass']:.2f} "
        "(target <= 20)"
    )
    print(
        f"zone, one edge, sheet alone: {result['zone_seconds']:.2f} s (as a point mass "
        f"{result['zone_point_mass_seconds']:.2f} s; target < 3 s)"
    )


if __name__ == "__main__":
    main()
