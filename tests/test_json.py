"""Tests of the one JSON guard (``dropcalc.present.json``) and of the JSON keys' glossary.

Check values: RFC 8259 (The JavaScript Object Notation (JSON) Data Interchange Format, 2017),
sec. 6: "Numeric values that cannot be represented ... (such as Infinity and NaN) are not
permitted", so a strict parser (``parse_constant`` refusing them) must read every output.
"""

from __future__ import annotations

import json
import math
from collections.abc import Callable
from pathlib import Path
from typing import Any

import numpy as np
import pytest
from typer.testing import CliRunner

from dropcalc.cli import app
from dropcalc.present.json import NOT_FINITE, dumps, json_safe

runner = CliRunner()
ENV = {"COLUMNS": "100", "FORCE_COLOR": None, "TERM": "dumb"}

# A 5 g object with a 0.05 m^2 drag area (terminal speed ~1.3 m/s) in a 30 m/s wind from a
# 60 m edge: more than 1 % of drops are still airborne far downwind, so there is no finite
# radius at 99 %.
SITE_60M = """\
origin = { lat = 53.0, lon = -2.0 }
outline = [[0, 0], [10, 0], [10, 8], [0, 8]]
[[edge]]
name = "north"
points = [[0, 8], [10, 8]]
height = "60 m"
"""


def _refuse(name: str) -> None:
    raise AssertionError(f"JSON output contains the non-standard constant {name}")


def strict(text: str) -> Any:
    """Parse as RFC 8259 JSON: NaN and Infinity refused."""
    return json.loads(text, parse_constant=_refuse)


def run_json(*args: str, exit_code: int = 0) -> Any:
    result = runner.invoke(app, [*args, "--json"], env=ENV)
    assert result.exit_code == exit_code, result.output
    return strict(result.stdout)


# --- json_safe ---------------------------------------------------------------------------------


def test_json_safe_replaces_every_non_finite_number_and_says_which() -> None:
    document = {
        "radius_m": math.inf,
        "low": -math.inf,
        "ratio": np.float64("nan"),
        "count": np.int64(3),
        "flag": np.bool_(True),
        "values": (1.0, math.inf, np.float32(2.5)),
        "array": np.array([0.5, np.nan]),
        "nested": [{"drift_m": math.inf, "name": "brick"}],
        "path": Path("a") / "b.pdf",
        "nothing": None,
    }
    safe = json_safe(document)
    assert safe["radius_m"] is None
    assert safe["low"] is None
    assert safe["ratio"] is None
    assert safe[NOT_FINITE] == {"radius_m": "inf", "low": "-inf", "ratio": "nan"}
    assert safe["count"] == 3
    assert type(safe["count"]) is int
    assert safe["flag"] is True
    assert safe["values"] == [1.0, None, 2.5]
    assert safe["array"] == [0.5, None]
    assert safe["nested"] == [{"drift_m": None, "name": "brick", NOT_FINITE: {"drift_m": "inf"}}]
    assert safe["path"] == str(Path("a") / "b.pdf")
    assert safe["nothing"] is None
    assert NOT_FINITE not in json_safe({"a": 1.0, "b": None})  # a plain null is "not given"
    assert json_safe(safe) == safe  # idempotent: a document may pass the guard twice
    strict(dumps(document))


def test_dumps_never_raises_on_inf() -> None:
    # json.dumps(..., allow_nan=False) raises ValueError on these; dumps goes through the guard.
    with pytest.raises(ValueError, match="not JSON compliant"):
        json.dumps({"x": math.inf}, allow_nan=False)
    assert strict(dumps({"x": math.inf})) == {"x": None, NOT_FINITE: {"x": "inf"}}


# --- the traceback of issue 9 ------------------------------------------------------------------


def test_regression_zone_site_json_with_an_unbounded_radius(
    tmp_path: Path, unlisted_keys: Callable[[Any], list[str]]
) -> None:
    """`zone --site ... --json` ended in `ValueError: Out of range float values are not JSON
    compliant: inf` when the objects are carried away. Expected: exit 0, strict JSON, the
    radii null and named in `not_finite`."""
    (tmp_path / "site.toml").write_text(SITE_60M, encoding="utf-8")
    data = run_json(
        "zone", "--site", str(tmp_path / "site.toml"), "--mass", "0.005 kg",
        "--drag-area", "0.05 m2", "--wind", "30",
    )  # fmt: skip
    assert data["radius_m"] is None
    assert data["site_radius_m"] is None
    assert data[NOT_FINITE]["radius_m"] == "inf"
    assert data[NOT_FINITE]["site_radius_m"] == "inf"
    (segment,) = data["segments"]
    assert segment["radius_m"] is None
    assert segment[NOT_FINITE]["radius_m"] == "inf"
    assert data["objects"][0]["carried_away_fraction"] > 0.01
    assert data["release_height_m"] == data["height_m"] == 60.0
    assert unlisted_keys(data) == []


# --- every key in the glossary -----------------------------------------------------------------


def test_every_json_key_of_fall_zone_batch_and_objects_is_in_the_glossary(
    tmp_path: Path, unlisted_keys: Callable[[Any], list[str]]
) -> None:
    items = tmp_path / "items.csv"
    items.write_text(
        "id,label,mass,drag_area,contact_area\nclaw-hammer-16oz,hammer,,,\n"
        ",bolt bag,2 kg,0.02 m2,0.01 m2\nnot-an-object,typo,,,\n",
        encoding="utf-8",
    )
    outputs = {
        "fall": run_json(
            "fall",
            "--object",
            "claw-hammer-16oz",
            "--height",
            "20 m",
            "--wind",
            "10 m/s",
        ),  # fmt: skip
        "zone": run_json(
            "zone",
            "--height",
            "10 m",
            "--mass",
            "10 kg",
            "--drag-area",
            "1e-7 m2",
            "--precision",
            "0.2",
            "--barricade",
            "5 m",
        ),  # fmt: skip
        # exit 1: a row failed (its `error` is in the output), the others were solved
        "batch": run_json("batch", str(items), "--height", "10 m", exit_code=1),
        "objects": run_json("objects", "--search", "hammer"),
        "objects show": run_json("objects", "show", "claw-hammer-16oz"),
    }
    for command, data in outputs.items():
        assert unlisted_keys(data) == [], command
    fall = outputs["fall"]
    assert fall["drift_min_m"] == fall["drift_m"]  # the unified name beside the contract key
    zone = outputs["zone"]
    assert zone["release_height_m"] == zone["height_m"] == 10.0
    assert zone["precision"] == 0.2
