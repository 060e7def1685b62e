"""The engine benchmark still runs and still agrees with its reference (keeps it from rotting)."""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

SCRIPT = Path(__file__).parents[1] / "benchmarks" / "engine.py"


def test_engine_benchmark_runs_and_agrees_with_reference():
    completed = subprocess.run(
        [sys.executable, str(SCRIPT), "--cases", "200", "--reference-cases", "20", "--json"],
        capture_output=True,
        text=True,
        timeout=120,
        check=False,
    )
    assert completed.returncode == 0, completed.stderr
    result = json.loads(completed.stdout)  # exactly one JSON object, nothing else
    for key in ("trajectories_per_s", "reference_trajectories_per_s", "speedup"):
        assert result[key] > 0.0, key
    assert result["cases"] == 200
    assert result["reference_cases"] == 20
    # Agreement with scipy's DOP853 at rtol 1e-10 (benchmarks/cases.py).
    assert 0.0 <= result["max_rel_error"] < 1e-4


COMMANDS = Path(__file__).parents[1] / "benchmarks" / "commands.py"


def test_command_benchmark_runs():
    completed = subprocess.run(
        [sys.executable, str(COMMANDS), "--repeat", "1", "--only", "fall", "--batch-rows", "5",
         "--json"],
        capture_output=True,
        text=True,
        timeout=120,
        check=False,
    )  # fmt: skip
    assert completed.returncode == 0, completed.stderr
    result = json.loads(completed.stdout)
    assert result["fall"]["median_s"] > 0.0
    assert len(result["fall"]["times_s"]) == 1


TIMINGS = Path(__file__).parents[1] / "benchmarks" / "timings.py"


def test_timings_benchmark_runs():
    # Small sizes: this checks the script works, not how fast anything is.
    arguments = ["--repeat", "1", "--samples", "500", "--rows", "20", "--json"]
    completed = subprocess.run(
        [sys.executable, str(TIMINGS), *arguments], capture_output=True, text=True, timeout=120
    )
    assert completed.returncode == 0, completed.stderr
    result = json.loads(completed.stdout)
    assert set(result) == {"library", "zone_samples", "batch_rows"}
    assert (result["zone_samples"]["samples"], result["batch_rows"]["rows"]) == (500, 20)
    assert all(len(timing["times_s"]) == 1 for timing in result.values()), result
