"""Wall-clock timings that used to be asserted in the unit tests, measured here instead.

Three workloads, each timed ``--repeat`` times after a warm-up, best and median printed:

- ``library``: reading the built-in object library from its TOML files (cache cleared);
- ``zone_samples``: one Monte Carlo batch of ``--samples`` drops of a 19 mm spanner pushed at
  2 m/s from 15 m in an 8 m/s wind (:func:`dropcalc.analysis.zone.sample_object`);
- ``batch_rows``: reading, parsing and solving a ``--rows`` list, half library ids and half
  custom objects, in a 12 m/s suburban wind (:func:`dropcalc.analysis.batch.solve_items`).

The machine is shared: quote numbers from one run, or ratios, not absolute times from
different days. Targets the tests once asserted: library < 0.2 s, 100,000 samples < 1 s,
10,000 rows < 5 s.

    python benchmarks/timings.py [--repeat 3] [--samples 100000] [--rows 10000] [--json]
"""

from __future__ import annotations

import argparse
import json
import statistics
import tempfile
import time
from collections.abc import Callable
from pathlib import Path


def _timed(work: Callable[[], object], repeat: int) -> dict[str, float | list[float]]:
    work()  # warm-up: imports, caches
    times = []
    for _ in range(repeat):
        start = time.perf_counter()
        work()
        times.append(time.perf_counter() - start)
    return {"best_s": min(times), "median_s": statistics.median(times), "times_s": times}


def library_load() -> Callable[[], object]:
    """Read the built-in library from its files each time."""
    from dropcalc.io import library

    def work() -> object:
        library._builtin_library.cache_clear()
        return library.load_library()

    return work


def zone_samples(samples: int) -> Callable[[], object]:
    """One Monte Carlo batch of ``samples`` drops."""
    import numpy as np

    from dropcalc.analysis.zone import ZoneSettings, sample_object, zone_object
    from dropcalc.io.library import load_library
    from dropcalc.model.conditions import Conditions
    from dropcalc.physics.release import Release
    from dropcalc.physics.wind import wind_spec

    obj = zone_object(load_library().get("combination-spanner-19mm"))
    settings = ZoneSettings(
        height=15.0, conditions=Conditions(release=Release("push", speed=2.0), wind=wind_spec(8.0))
    )
    seeds = iter(range(1_000_000))
    return lambda: sample_object(obj, settings, samples, np.random.default_rng(next(seeds)))


def batch_rows(rows: int, folder: Path) -> Callable[[], object]:
    """Read, parse and solve a ``rows``-row list."""
    import numpy as np

    from dropcalc.analysis.batch import BatchSettings, parse_items, read_table, solve_items
    from dropcalc.io.library import load_library
    from dropcalc.model.conditions import Conditions
    from dropcalc.physics.wind import wind_spec

    library = load_library()
    ids = [obj.id for obj in library]
    rng = np.random.default_rng(7)
    heights = rng.uniform(2, 80, rows)
    masses = rng.uniform(0.05, 30, rows)
    areas = rng.uniform(5e-4, 0.2, rows)
    lines = [
        f"{ids[i % len(ids)]},,,,{heights[i]:.3f} m"
        if i % 2
        else f",custom {i},{masses[i]:.5f} kg,{areas[i]:.6f} m2,{heights[i]:.3f} m"
        for i in range(rows)
    ]
    path = folder / "rows.csv"
    path.write_text("id,label,mass,drag_area,height\n" + "\n".join(lines) + "\n", "utf-8")
    settings = BatchSettings(conditions=Conditions(wind=wind_spec(12.0, terrain="suburban")))

    def work() -> object:
        items, errors = parse_items(read_table(path), library, settings)
        assert not errors, errors[:3]
        return solve_items(items, settings)

    return work


def main() -> None:
    """Run the workloads and print their timings."""
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--repeat", type=int, default=3)
    parser.add_argument("--samples", type=int, default=100_000)
    parser.add_argument("--rows", type=int, default=10_000)
    parser.add_argument("--json", action="store_true", help="print one JSON object")
    args = parser.parse_args()
    with tempfile.TemporaryDirectory(prefix="dropcalc-timings-") as folder:
        results = {
            "library": _timed(library_load(), args.repeat),
            "zone_samples": {"samples": args.samples}
            | _timed(zone_samples(args.samples), args.repeat),
            "batch_rows": {"rows": args.rows}
            | _timed(batch_rows(args.rows, Path(folder)), args.repeat),
        }
    if args.json:
        print(json.dumps(results))
        return
    for name, result in results.items():
        size = {k: v for k, v in result.items() if k in ("samples", "rows")}
        print(
            f"{name:<13} best {result['best_s']:.3f} s, median {result['median_s']:.3f} s"
            + (f" ({', '.join(f'{k} {v:,}' for k, v in size.items())})" if size else "")
        )


if __name__ == "__main__":
    main()
