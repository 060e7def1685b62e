"""Tests of ``dropcalc zone``: JSON contract, statement in words, options, site files, bad input.

Check values come from outside the code under test: the DESIGN.md JSON contract; vacuum
kinematics (a dense object dropped in still air lands below the release point with no
horizontal speed, so nothing carries it out: the radius is the margin alone); the definition of
the international foot (0.3048 m exactly, International Yard and Pound Agreement, 1959); the PNG
signature (PNG specification, ISO/IEC 15948:2004, sec. 5.2) and the GeoJSON FeatureCollection
(RFC 7946, sec. 3.3).
"""

from __future__ import annotations

import json
import math
import re
from pathlib import Path
from typing import Any

import pytest
from typer.testing import CliRunner

from dropcalc.cli import app

# JSON contract fields, DESIGN.md "JSON contract": never renamed.
CONTRACT_FIELDS = (
    "radius_m",
    "confidence",
    "drift_m",
    "scatter_m",
    "margin_m",
    "worst_case_radius_m",
)

runner = CliRunner()

BRICK = ("--object", "brick-uk-standard")
SPANNER = ("--object", "combination-spanner-19mm")
# 10 kg with a drag area of 1e-7 m^2: k = rho Cd A / (2 m) ~ 6e-9 1/m, vacuum kinematics.
DENSE = ("--mass", "10 kg", "--drag-area", "1e-7 m2")

SITE = """\
origin = { lat = 51.5, lon = -0.14 }
outline = [[0, 0], [20, 0], [20, 10], [0, 10]]

[[edge]]
name = "north parapet"
points = [[0, 10], [20, 10]]
height = "12 m"

[[edge]]
name = "east side"
points = [[20, 10], [20, 0]]
height = "9 m"
"""


def _reject_constant(name: str) -> None:
    raise AssertionError(f"JSON output contains the non-standard constant {name}")


def invoke(*args: str, columns: int = 100) -> Any:
    """Run ``dropcalc zone ARGS`` in-process; stdout and stderr stay separate on the result."""
    env = {"COLUMNS": str(columns), "FORCE_COLOR": None, "TERM": "dumb"}
    return runner.invoke(app, ["zone", *args], env=env)


def zone_json(*args: str) -> dict[str, Any]:
    """Run ``dropcalc zone ARGS --json``; check exit 0 and that stdout is one JSON object only."""
    result = invoke(*args, "--json")
    assert result.exit_code == 0, result.output
    # json.loads refuses trailing text, so stdout holds exactly one JSON value; NaN and
    # Infinity are refused by parse_constant.
    data = json.loads(result.stdout, parse_constant=_reject_constant)
    assert isinstance(data, dict), result.stdout
    return data


def _flat(text: str) -> str:
    """The text with every run of whitespace made one space (the output wraps at 90)."""
    return " ".join(text.split())


# --- JSON contract ---------------------------------------------------------------------------

CASES = {
    "brick-still-air": ("--height", "18 m", *BRICK),
    "spanner-push-in-wind": (
        "--height", "15 m", *SPANNER, "--wind", "8 m/s", "--release", "push",
        "--release-speed", "2 m/s",
    ),
    "custom-min-max-on-grass": (
        "--height", "10 m", "--mass", "0.5 kg", "--drag-area", "0.002,0.02", "--ground",
        "grass", "--wind", "12 m/s", "--wind-kind", "gust", "--margin", "1.5 m",
    ),
    "two-objects": ("--height", "18 m", *BRICK, *SPANNER, "--wind", "5 m/s"),
}  # fmt: skip


@pytest.mark.parametrize("args", CASES.values(), ids=CASES.keys())
def test_json_is_one_object_with_the_contract_fields(args: tuple[str, ...]) -> None:
    data = zone_json(*args)
    for name in CONTRACT_FIELDS:
        assert isinstance(data.get(name), int | float), (name, data.get(name))
    assert data["radius_m"] == pytest.approx(
        data["drift_m"] + data["scatter_m"] + data["margin_m"], abs=1e-9
    )
    assert data["radius_m"] <= data["worst_case_radius_m"]
    assert data["confidence"] == 0.99


def test_the_contact_tilt_option_is_gone_and_the_ground_slope_is_reported() -> None:
    # The free contact tilt was replaced by the rigid-body impact (issue 10): the option is
    # refused as unknown; the ground slope is the named input that remains.
    result = runner.invoke(app, ["zone", "--height", "20 m", *DENSE, "--contact-tilt", "0"])
    assert result.exit_code == 2
    data = zone_json("--height", "20 m", *DENSE, "--ground-slope", "2 deg")
    assert data["ground_slope_deg"] == 2.0
    assert "contact_tilt_deg" not in data
    bad = runner.invoke(app, ["zone", "--height", "20 m", *DENSE, "--ground-slope", "40 deg"])
    assert bad.exit_code == 2
    assert "--ground-slope" in bad.output


def test_json_lists_the_after_landing_inputs_and_the_radius_at_their_ends() -> None:
    # Still air, straight drop: all the distance is after landing. Every input at the end that
    # gives the longer travel cannot give a shorter radius than the other end, and the
    # envelope (all of them at their worst with the orientation searched) bounds both.
    data = zone_json("--height", "20 m", *SPANNER, "--margin", "0 m")
    after = data["after_landing"]
    assert after["material"] == "metal"
    assert after["friction"] == [0.4, 0.7]
    assert after["restitution_on_concrete"][0] < after["restitution_on_concrete"][1]
    rows = {row["parameter"]: row for row in after["sensitivity"]}
    assert set(rows) == {"restitution", "friction", "all"}
    low, high = rows["all"]["radius_at_low_m"], rows["all"]["radius_at_high_m"]
    assert low < high <= data["worst_case_radius_m"]
    assert rows["restitution"]["radius_at_low_m"] < rows["restitution"]["radius_at_high_m"]


def test_margin_accepts_units() -> None:
    # 1 ft = 0.3048 m exactly (International Yard and Pound Agreement, 1959); the same seed
    # gives the same rest points, so only the margin differs.
    data = zone_json("--height", "20 m", *DENSE, "--margin", "10 ft")
    none = zone_json("--height", "20 m", *DENSE, "--margin", "0 m")
    assert data["margin_m"] == pytest.approx(3.048, abs=1e-9)
    assert data["radius_m"] - none["radius_m"] == pytest.approx(3.048, abs=1e-9)


def test_higher_confidence_gives_a_radius_at_least_as_wide() -> None:
    args = ("--height", "15 m", *SPANNER, "--wind", "8 m/s")
    at_99 = zone_json(*args, "--confidence", "0.99")
    at_999 = zone_json(*args, "--confidence", "0.999")
    assert at_999["confidence"] == 0.999
    assert at_999["radius_m"] >= at_99["radius_m"]


def test_same_seed_same_answer_and_the_seed_is_reported() -> None:
    args = ("--height", "15 m", *SPANNER, "--wind", "8 m/s", "--seed", "42")
    first, second = zone_json(*args), zone_json(*args)
    assert first["seed"] == 42
    assert first["radius_m"] == second["radius_m"]


def test_barricade_adds_its_fields_and_they_hold_when_rerun() -> None:
    base = ("--height", "12 m", *SPANNER)
    data = zone_json(*base, "--barricade", "25 m")
    assert data["barricade_m"] == pytest.approx(25.0)
    wind = data["barricade_highest_wind_m_s"]
    height = data["barricade_greatest_height_m"]
    assert wind > 0
    assert height > 0
    # The zone in the reported wind stays within the barricade (the mean wind is the one
    # reported), and so does the zone at the reported height in the day's wind.
    # The search judges the radius on the first 20,000 samples; the full zone may sample more
    # and its quantile moves within its standard error.
    at_wind = zone_json(*base, "--wind", f"{wind!r} m/s")
    assert at_wind["radius_m"] <= 25.0 + 2.0 * at_wind["standard_error_m"]
    at_height = zone_json("--height", f"{height!r} m", *SPANNER)
    assert at_height["radius_m"] <= 25.0 + 2.0 * at_height["standard_error_m"]


def test_barricade_too_close_even_in_still_air_says_so_and_gives_the_distance() -> None:
    # A spanner dropped from 24 m cannot land within 1 m of the edge: it bounces and slides
    # further than that on concrete (issue 13: the answer was "holds up to a mean wind of
    # 0.00 m/s").
    base = ("--height", "24 m", *SPANNER, "--wind", "5 m/s", "--barricade", "1 m")
    data = zone_json(*base)
    assert data["barricade_highest_wind_m_s"] == 0
    assert data["barricade_too_close_in_still_air"] is True
    assert data["barricade_holds"] is False
    still = data["barricade_needed_in_still_air_m"]
    assert 1.0 < still <= data["barricade_needed_m"]
    assert data["barricade_needed_m"] == data["radius_m"]
    text = _flat(invoke(*base).stdout)
    assert "too close even in still air" in text
    assert "0.00 m/s" not in text
    # The distance that would hold, rounded up to 0.1 m like every keep-clear distance.
    needed = math.ceil(round(data["radius_m"] * 10, 6)) / 10
    assert f"Move the barricade to at least {needed:.1f} m" in text


# --- Human output ----------------------------------------------------------------------------


def test_human_output_states_the_share_the_driver_the_margin_and_the_cautions() -> None:
    result = invoke("--height", "18 m", *BRICK, *SPANNER, "--wind", "8 m/s")
    assert result.exit_code == 0, result.output
    text = _flat(result.stdout)
    data = zone_json("--height", "18 m", *BRICK, *SPANNER, "--wind", "8 m/s")
    assert "99 % of simulated drops" in text
    assert f"of the {data['driving_object']} came to rest" in text
    assert re.search(r"plus a [\d.]+ m margin", text), text
    assert "competent person" in text
    assert "Not modelled: deflection off the structure" in text


def test_human_output_names_the_barricade() -> None:
    result = invoke("--height", "12 m", *SPANNER, "--barricade", "15 m")
    assert result.exit_code == 0, result.output
    assert "Barricade at 15" in _flat(result.stdout)


# --- Site plan -------------------------------------------------------------------------------


def test_site_writes_the_plan_drawing_and_the_geojson(tmp_path: Path) -> None:
    site = tmp_path / "site.toml"
    site.write_text(SITE, encoding="utf-8")
    plot, geojson = tmp_path / "plan.png", tmp_path / "area.geojson"
    result = invoke(
        "--site", str(site), *SPANNER, "--wind", "8 m/s", "--plot", str(plot),
        "--geojson", str(geojson), "--json",
    )  # fmt: skip
    assert result.exit_code == 0, result.output
    data = json.loads(result.stdout)
    for name in CONTRACT_FIELDS:
        assert name in data
    # PNG signature: ISO/IEC 15948:2004, sec. 5.2.
    assert plot.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    collection = json.loads(geojson.read_text(encoding="utf-8"))
    assert collection["type"] == "FeatureCollection"  # RFC 7946, sec. 3.3
    kinds = [feature["properties"]["kind"] for feature in collection["features"]]
    assert kinds.count("exclusion_area") == 1
    assert kinds.count("work_edge") == 2
    area = collection["features"][kinds.index("exclusion_area")]
    assert area["geometry"]["type"] in ("Polygon", "MultiPolygon")


# --- Bad input -------------------------------------------------------------------------------

NO_ORIGIN = """\
outline = [[0, 0], [20, 0], [20, 10], [0, 10]]
[[edge]]
name = "north"
points = [[0, 10], [20, 10]]
height = "12 m"
"""
NO_HEIGHT = """\
[[edge]]
name = "north"
points = [[0, 10], [20, 10]]
"""
BAD_TOML = "outline = [[0, 0],\n[[edge]\n"

# (arguments, site file text or None, words the message must contain)
BAD_INPUTS = {
    "no-objects": (("--height", "18 m"), None, ("--object",)),
    "unknown-object": (("--height", "18 m", "--object", "nosuch-thing"), None, ("nosuch-thing",)),
    "negative-height": (("--height", "-5 m", *BRICK), None, ("height", "-5")),
    "confidence-1.5": (("--height", "18 m", *BRICK, "--confidence", "1.5"), None, ("1.5",)),
    "unknown-ground": (("--height", "18 m", *BRICK, "--ground", "moon"), None, ("moon",)),
    "geojson-without-site": (
        ("--height", "18 m", *BRICK, "--geojson", "a.geojson"), None, ("--site",),
    ),
    "geojson-without-origin": (
        ("--object", "brick-uk-standard", "--geojson", "area.geojson"), NO_ORIGIN, ("origin",),
    ),
    "site-edge-without-height": ((*BRICK,), NO_HEIGHT, ("height",)),
    "site-bad-toml": ((*BRICK,), BAD_TOML, ("TOML",)),
    "no-height-no-site": ((*BRICK,), None, ("--height",)),
    "mass-without-drag-area": (("--height", "18 m", "--mass", "1 kg"), None, ("--drag-area",)),
    "negative-margin": (("--height", "18 m", *BRICK, "--margin", "-1 m"), None, ("margin",)),
    "negative-barricade": (("--height", "18 m", *BRICK, "--barricade", "-3 m"), None, ("-3",)),
}  # fmt: skip


def _run_bad(args: tuple[str, ...], site_text: str | None, tmp_path: Path) -> Any:
    if site_text is not None:
        site = tmp_path / "site.toml"
        site.write_text(site_text, encoding="utf-8")
        args = ("--site", str(site), *args)
    return invoke(*args, "--json", columns=80)


@pytest.mark.parametrize(("args", "site_text", "words"), BAD_INPUTS.values(), ids=BAD_INPUTS.keys())
def test_bad_input_is_one_line_exit_2_no_traceback(
    args: tuple[str, ...], site_text: str | None, words: tuple[str, ...], tmp_path: Path
) -> None:
    result = _run_bad(args, site_text, tmp_path)
    assert result.exit_code == 2, result.output
    assert "Traceback" not in result.output
    assert result.stdout == "", result.stdout
    lines = [line for line in result.stderr.splitlines() if line.strip()]
    assert len(lines) == 1, result.stderr
    assert lines[0].startswith("dropcalc: error: "), lines[0]
    for word in words:
        assert word.lower() in lines[0].lower(), (word, lines[0])


def test_bad_input_writes_no_files(tmp_path: Path) -> None:
    site = tmp_path / "site.toml"
    site.write_text(SITE, encoding="utf-8")
    plot, geojson = tmp_path / "plan.png", tmp_path / "area.geojson"
    result = invoke(
        "--site", str(site), *BRICK, "--ground", "moon", "--plot", str(plot),
        "--geojson", str(geojson),
    )  # fmt: skip
    assert result.exit_code == 2, result.output
    assert not plot.exists()
    assert not geojson.exists()


def test_bad_precision_names_the_option() -> None:
    result = invoke("--height", "18 m", *BRICK, "--precision", "5", columns=80)
    assert result.exit_code == 2, result.output
    (line,) = [line for line in result.stderr.splitlines() if line.strip()]
    assert "--precision" in line, line
    assert "5" in line, line


def test_plot_without_a_site_draws_the_zone_around_a_stretch_of_edge(tmp_path: Path) -> None:
    # zone --plot on its own (no site file): the plan around a 1 m stretch of edge.
    target = tmp_path / "zone.png"
    result = invoke("--height", "18 m", *BRICK, "--plot", str(target))
    assert result.exit_code == 0, result.output
    assert target.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"  # PNG signature (ISO/IEC 15948)


def test_a_tube_that_rolls_away_down_a_slope_gets_no_distance_and_is_named() -> None:
    # On a 10 deg slope a rolling tube accelerates while sin(10 deg) / (1 + I/(m r^2)) =
    # 0.174 / 1.85 = 0.094 exceeds its rolling resistance (0.01-0.03 on concrete): it never
    # stops (Halliday, Resnick and Walker, ch. 11), so no distance can be promised.
    data = zone_json("--height", "10 m", "--object", "scaffold-tube-steel-1m", "--ground-slope",
                     "10 deg")  # fmt: skip
    assert data["radius_m"] is None
    assert data["objects"][0]["rolled_away_fraction"] > 0.01
    assert "rolled away down the 10° slope" in data["statement"]
