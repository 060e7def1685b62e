"""Wall time of one exclusion zone: one object, a fixed number of Monte Carlo samples.

Times ``compute_zone`` (samples, after-landing travel, envelope and sensitivity) and, apart,
``sample_object`` alone, for a few library objects, each repeated; the median and the fastest
run are printed. On a shared machine compare two versions by running them alternately in the
same minutes, not against numbers from another day.

    python benchmarks/zone_time.py [--samples N] [--repeat R] [--json]
"""

from __future__ import annotations

import argparse
import json
import statistics
import time

import numpy as np

from dropcalc.analysis.zone import ZoneSettings, compute_zone, sample_object, zone_object
from dropcalc.io.library import load_library
from dropcalc.model.conditions import Conditions
from dropcalc.physics.wind import wind_spec

#: (object id, work height [m], mean wind at 10 m [m/s]): the issue-10 table's cases.
CASES = (
    ("claw-hammer-16oz", 20.0, 0.0),
    ("brick-uk-standard", 20.0, 0.0),
    ("scaffold-tube-steel-6-4m", 40.0, 10.0),
)


def run(samples: int, repeat: int) -> dict:
    library = load_library()
    out = {}
    for object_id, height, wind in CASES:
        obj = zone_object(library.get(object_id))
        settings = ZoneSettings(
            height=height,
            conditions=Conditions(
                wind=wind_spec(wind, profile="log", roughness_length=0.3)
                if wind
                else wind_spec(0.0)
            ),
            max_samples=samples,
            relative_error=0.2,  # one round of ``samples``: the time of a fixed sample count
        )
        zone_times, sample_times = [], []
        for _ in range(repeat):
            start = time.perf_counter()
            sample_object(obj, settings, samples, np.random.default_rng(1))
            sample_times.append(time.perf_counter() - start)
            start = time.perf_counter()
            result = compute_zone([obj], settings)
            zone_times.append(time.perf_counter() - start)
        out[object_id] = {
            "zone_median_s": statistics.median(zone_times),
            "zone_min_s": min(zone_times),
            "sample_median_s": statistics.median(sample_times),
            "sample_min_s": min(sample_times),
            "radius_m": result.radius,
            "worst_case_radius_m": result.worst_case,
        }
    return {"samples": samples, "repeat": repeat, "cases": out}


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--samples", type=int, default=20_000)
    parser.add_argument("--repeat", type=int, default=5)
    parser.add_argument("--json", action="store_true")
    args = parser.parse_args()
    result = run(args.samples, args.repeat)
    if args.json:
        print(json.dumps(result))
        return
    for object_id, row in result["cases"].items():
        print(
            f"{object_id:28s} zone median {row['zone_median_s']:.3f} s (min "
            f"{row['zone_min_s']:.3f}); samples alone {row['sample_median_s']:.3f} s; radius "
            f"{row['radius_m']:.2f} m, worst case {row['worst_case_radius_m']:.2f} m"
        )


if __name__ == "__main__":
    main()
