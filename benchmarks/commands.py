"""Wall-clock time of whole ``dropcalc`` commands, as a user runs them (issue 12's workloads).

Each workload is run as a fresh process (``python -m dropcalc ...``) ``--repeat`` times and the
median wall time is printed, so start-up (imports, the unit registry) counts as it does for a
user. The inputs are written to a temporary folder: a 20-row item list, a site file whose one
work edge has 4 segments, and a batch list of ``--batch-rows`` library ids. The machine is
shared: compare numbers from the same run, or quote ratios, not absolute times from different
days.

    python benchmarks/commands.py [--repeat 5] [--only zone1,fall] [--batch-rows 100000] [--json]
        [--baseline DIR]

``--baseline DIR`` also runs every workload with the ``dropcalc`` of another source tree (e.g. an
export of main before a change: ``git archive main | tar -x -C DIR``), alternating the two run
by run, and prints both medians and their ratio: a comparison under the same machine load.
"""

from __future__ import annotations

import argparse
import json
import os
import statistics
import subprocess
import sys
import tempfile
import time
from collections.abc import Callable
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
DEMO = ROOT / "templates" / "demo"

#: Items of the 20-row list (library ids, quantities): tools, fittings, materials.
ITEM_IDS = (
    "claw-hammer-16oz", "brick-uk-standard", "combination-spanner-19mm", "cordless-drill-18v",
    "two-way-radio-handheld", "double-coupler-drop-forged", "scaffold-tube-steel-2m",
    "scaffold-board-2-4m", "toe-board-clip", "tool-bag-full", "bucket-of-mortar",
    "ice-plate-0-4kg", "plywood-12mm-half-sheet", "roof-tile-clay-plain",
    "slate-natural-500x250", "concrete-block-lightweight-100mm", "roof-tile-concrete-interlocking",
    "scaffold-tube-steel-6-4m", "concrete-block-dense-100mm", "roof-tile-clay-pantile",
)  # fmt: skip

SITE = """\
outline = [[0, 0], [30, 0], [30, 20], [0, 20]]
[[edge]]
name = "parapet"
points = [[0, 0], [30, 0], [30, 20], [0, 20], [0, 0]]
height = "18 m"
"""


def _library_ids() -> list[str]:
    from dropcalc.io.library import load_library

    return sorted(obj.id for obj in load_library())


def write_inputs(folder: Path, batch_rows: int) -> dict[str, Path]:
    """Write the workloads' input files into ``folder``."""
    items = folder / "items20.csv"
    items.write_text(
        "id,quantity\n" + "".join(f"{i},{n + 1}\n" for n, i in enumerate(ITEM_IDS)),
        encoding="utf-8",
    )
    site = folder / "site4.toml"
    site.write_text(SITE, encoding="utf-8")
    ids = _library_ids()
    rows = folder / "rows.csv"
    with rows.open("w", encoding="utf-8") as out:
        out.write("id,quantity\n")
        for n in range(batch_rows):
            out.write(f"{ids[(n * 7) % len(ids)]},1\n")
    return {"items": items, "site": site, "rows": rows, "out": folder}


def workloads(paths: dict[str, Path]) -> dict[str, list[str]]:
    """Command lines (arguments after ``dropcalc``) by workload name."""
    out = paths["out"]
    return {
        "zone1": ["zone", "--height", "18 m", "--object", "brick-uk-standard", "--wind", "8 m/s",
                  "--terrain", "en-iii", "--json"],
        "zone_items": ["zone", "--items", str(paths["items"]), "--height", "25 m", "--wind",
                       "8 m/s", "--json"],
        "zone_barricade": ["zone", "--height", "18 m", "--object", "scaffold-tube-steel-6-4m",
                           "--wind", "10 m/s", "--barricade", "15m", "--json"],
        "zone_site": ["zone", "--site", str(paths["site"]), "--object", "brick-uk-standard",
                      "--wind", "8 m/s", "--json"],
        "report": ["report", str(DEMO / "scenario.toml"), "-o", str(out / "report.pdf"),
                   "--json"],
        "batch_wind": ["batch", str(paths["rows"]), "--height", "20 m", "--wind", "8 m/s",
                       "--out", str(out / "rows_wind.csv"), "--json"],
        "batch_still": ["batch", str(paths["rows"]), "--height", "20 m",
                        "--out", str(out / "rows_still.csv"), "--json"],
        "fall": ["fall", "--height", "20 m", "--mass", "1 kg", "--drag-area", "0.01 m2",
                 "--json"],
    }  # fmt: skip


def _environment(source: Path | None) -> dict[str, str]:
    """The environment of a run: with ``source``, its ``dropcalc`` comes first on the path."""
    env = dict(os.environ)
    if source is not None:
        env["PYTHONPATH"] = os.pathsep.join(filter(None, [str(source), env.get("PYTHONPATH")]))
    return env


def run_once(args: list[str], cwd: Path, source: Path | None = None) -> float:
    """Wall time [s] of one fresh ``python -m dropcalc`` run."""
    start = time.perf_counter()
    done = subprocess.run(
        [sys.executable, "-m", "dropcalc", *args],
        cwd=cwd,
        env=_environment(source),
        capture_output=True,
        text=True,
        check=False,
    )
    elapsed = time.perf_counter() - start
    if done.returncode not in (0, 1):  # batch exits 1 when a row failed; else a failure
        raise SystemExit(f"{' '.join(args)} failed ({done.returncode}):\n{done.stderr[-2000:]}")
    return elapsed


def time_command(
    args: list[str], repeat: int, cwd: Path, baseline: Path | None = None
) -> dict[str, object]:
    """Median wall times [s] of ``repeat`` fresh runs (alternating with the baseline's)."""
    times, base_times = [], []
    for _ in range(repeat):
        if baseline is not None:
            base_times.append(run_once(args, cwd, baseline))
        times.append(run_once(args, cwd))
    result: dict[str, object] = {"median_s": statistics.median(times), "times_s": times}
    if baseline is not None:
        base = statistics.median(base_times)
        result.update(
            baseline_median_s=base,
            baseline_times_s=base_times,
            speedup=base / statistics.median(times),
        )
    return result


def engine_ratio(cases: int, reference_cases: int, source: Path | None = None) -> float:
    """Engine speed-up over the solve_ivp loop, both measured now (benchmarks/engine.py)."""
    script = (source or ROOT) / "benchmarks" / "engine.py"
    done = subprocess.run(
        [sys.executable, str(script), "--cases", str(cases), "--reference-cases",
         str(reference_cases), "--json"],
        env=_environment(source), capture_output=True, text=True, check=True,
    )  # fmt: skip
    return float(json.loads(done.stdout)["speedup"])


def main(argv: list[str] | None = None, report: Callable[[str], None] = print) -> dict:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--repeat", type=int, default=5, help="runs per workload (median)")
    parser.add_argument("--only", default="", help="comma-separated workload names")
    parser.add_argument("--batch-rows", type=int, default=100_000)
    parser.add_argument("--engine-cases", type=int, default=10_000)
    parser.add_argument("--engine-reference-cases", type=int, default=300)
    parser.add_argument("--json", action="store_true", help="print one JSON object")
    parser.add_argument("--baseline", type=Path, help="source tree to compare with")
    args = parser.parse_args(argv)
    baseline = args.baseline.resolve() if args.baseline else None
    results: dict[str, object] = {"repeat": args.repeat}
    with tempfile.TemporaryDirectory(prefix="dropcalc-bench-") as folder:
        paths = write_inputs(Path(folder), args.batch_rows)
        chosen = workloads(paths)
        names = [n for n in args.only.split(",") if n] or [*chosen, "engine"]
        for name in names:
            if name == "engine":
                ratio = engine_ratio(args.engine_cases, args.engine_reference_cases)
                results["engine_speedup"] = ratio
                line = f"{'engine':16s} {ratio:8.0f}x  (vs solve_ivp loop, same run)"
                if baseline is not None:
                    base = engine_ratio(args.engine_cases, args.engine_reference_cases, baseline)
                    results["baseline_engine_speedup"] = base
                    line += f"; baseline {base:.0f}x"
                if not args.json:
                    report(line)
                continue
            if name not in chosen:
                raise SystemExit(f"unknown workload {name!r}; choose from {', '.join(chosen)}")
            timing = time_command(chosen[name], args.repeat, Path(folder), baseline)
            results[name] = timing
            if not args.json:
                spread = ", ".join(f"{t:.2f}" for t in timing["times_s"])
                line = f"{name:16s} {timing['median_s']:8.2f} s  ({spread})"
                if baseline is not None:
                    line += (
                        f"  baseline {timing['baseline_median_s']:6.2f} s"
                        f"  speed-up {timing['speedup']:5.2f}x"
                    )
                report(line)
    if args.json:
        report(json.dumps(results))
    return results


if __name__ == "__main__":
    main()
