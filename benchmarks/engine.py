"""Throughput and accuracy of the vectorised trajectory engine against a per-trajectory loop.

Draws random falls (``cases.py``: heights 1-300 m, masses 0.01-500 kg, drag areas
1e-5-2 m^2, every release mode, winds 0-35 m/s in the three profiles), solves N of them with
``dropcalc.physics.trajectory.solve_falls`` (``closed_form=False``, one call per profile kind,
times added) and the first M with scipy's DOP853 at rtol 1e-10, one ``solve_ivp`` call per
trajectory. Both run in the same process, so the speed-up is a ratio measured under the same
machine load; absolute rates on a shared machine are noisy.

    python benchmarks/engine.py [--cases N] [--reference-cases M] [--seed S] [--json]
"""

from __future__ import annotations

import argparse
import json
import time

from cases import draw_cases, relative_errors, solve_with_engine, solve_with_reference

from dropcalc.physics.trajectory import DEFAULT_TOLERANCE


def run(cases_count: int, reference_count: int, seed: int) -> dict:
    if reference_count > cases_count:
        raise SystemExit("--reference-cases must not exceed --cases")
    cases = draw_cases(cases_count, seed=seed)

    start = time.perf_counter()
    engine = solve_with_engine(cases, tolerance=DEFAULT_TOLERANCE, closed_form=False)
    engine_seconds = time.perf_counter() - start

    subset = cases.subset(slice(0, reference_count))
    start = time.perf_counter()
    reference = solve_with_reference(subset)
    reference_seconds = time.perf_counter() - start

    engine_subset = type(engine)(
        **{name: getattr(engine, name)[:reference_count] for name in engine.__dataclass_fields__}
    )
    errors = relative_errors(subset, engine_subset, reference, DEFAULT_TOLERANCE)
    rate = cases_count / engine_seconds
    reference_rate = reference_count / reference_seconds
    return {
        "trajectories_per_s": rate,
        "reference_trajectories_per_s": reference_rate,
        "speedup": rate / reference_rate,
        "max_rel_error": max(errors["impact_speed"], errors["fall_time"], errors["drift"]),
        "rel_error": errors,
        "cases": cases_count,
        "reference_cases": reference_count,
        "seed": seed,
        "engine_seconds": engine_seconds,
        "reference_seconds": reference_seconds,
        "tolerance": DEFAULT_TOLERANCE,
        "all_landed": bool(engine.landed.all()),
        "steps_mean": float(engine.steps.mean()),
        "steps_max": int(engine.steps.max()),
    }


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--cases", type=int, default=10000, help="trajectories for the engine")
    parser.add_argument(
        "--reference-cases",
        type=int,
        default=300,
        help="first M trajectories also solved one by one with DOP853",
    )
    parser.add_argument("--seed", type=int, default=20240601)
    parser.add_argument("--json", action="store_true", help="print one JSON object")
    args = parser.parse_args()
    if args.cases < 1 or args.reference_cases < 1:
        parser.error("--cases and --reference-cases must be >= 1")
    result = run(args.cases, args.reference_cases, args.seed)
    if args.json:
        print(json.dumps(result))
        return
    errors = result["rel_error"]
    print(
        f"engine     {result['cases']:7d} trajectories in {result['engine_seconds']:.3f} s: "
        f"{result['trajectories_per_s']:10.0f} /s (mean {result['steps_mean']:.1f} steps)"
    )
    print(
        f"reference  {result['reference_cases']:7d} trajectories in "
        f"{result['reference_seconds']:.3f} s: {result['reference_trajectories_per_s']:10.0f} /s"
        " (scipy DOP853, rtol 1e-10, one call each)"
    )
    print(f"speed-up   {result['speedup']:.0f}x")
    print(
        f"worst relative error on the {result['reference_cases']} shared cases: "
        f"impact speed {errors['impact_speed']:.2e}, fall time {errors['fall_time']:.2e}, "
        f"drift {errors['drift']:.2e} (plain {errors['drift_raw']:.2e}; "
        f"below 1 um: {errors['drift_abs_below_1um']:.1e} m absolute)"
    )
    if not result["all_landed"]:
        print("warning: some trajectories did not land within the limits")


if __name__ == "__main__":
    main()
