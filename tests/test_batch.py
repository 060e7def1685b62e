"""Tests of the batch check (``dropcalc batch`` and :mod:`dropcalc.analysis.batch`).

Check values come from outside the code under test:

- ``dropcalc fall`` for the same inputs (an independent entry point: one case, one call);
- energy conservation in vacuum, E = m g h (Galileo; Newton, *Principia* 1687);
- the still-air fall with quadratic drag, v(h)^2 = v_t^2 (1 - exp(-2 g h / v_t^2)), solved for h:
  h = -(v_t^2 / 2g) ln(1 - 2E / (m v_t^2)) (Timmerman and van der Weele, "On the rise and fall
  of a ball with linear or quadratic drag", Am. J. Phys. 67 (1999) 538-546);
- the terminal state in a uniform wind U: falling at v_t relative to the air and moving with it,
  so the impact energy tends to 1/2 m (v_t^2 + U^2) (wind-frame principle, [TVDW-1999],
  derived);
- exact unit definitions: 1 lb = 0.45359237 kg, 1 ft = 0.3048 m (NIST SP 811, 2008, App. B.9);
- drag coefficients of a sphere 0.47 and a sharp-edged block edge-on 0.80 / face-on 1.05
  (White, *Fluid Mechanics*, tables 7.2-7.3; Hoerner, *Fluid-Dynamic Drag* 1965, ch. 3; from
  memory, [WHITE-FM]) and the largest projection of a box, sqrt((ab)^2 + (bc)^2 + (ca)^2)
  (Cauchy's projection formula, derived).

The CSV and XLSX fixtures are written into ``tmp_path`` by the tests.
"""

from __future__ import annotations

import csv
import json
import math
from pathlib import Path
from typing import Any

import numpy as np
import pytest
from typer.testing import CliRunner

from dropcalc.analysis.batch import (
    BatchSettings,
    neutralise,
    parse_items,
    read_table,
    safe_heights,
    solve_items,
    sort_rows,
)
from dropcalc.cli import app
from dropcalc.io.library import load_library
from dropcalc.model.conditions import Conditions
from dropcalc.physics.atmosphere import air_state
from dropcalc.physics.release import Release
from dropcalc.physics.wind import wind_spec

# Standard acceleration of gravity [m/s^2]. 3rd CGPM (1901), Comptes rendus p. 70.
G = 9.80665
# Exact unit definitions, NIST SP 811 (2008), Appendix B.9.
POUND = 0.45359237  # kg
FOOT = 0.3048  # m

# Output columns every row carries (the batch contract).
CONTRACT_COLUMNS = (
    "row",
    "label",
    "id",
    "mass_kg",
    "impact_speed_max_m_s",
    "impact_energy_max_j",
    "drift_max_m",
    "error",
)

# Energy reference levels [J] (docs/references.md), by the key of their safe-height column.
LEVEL_ENERGY = {
    "helmet_penetration": 24.5,  # EN 397 / ANSI/ISEA Z89.1 penetration test, lower end
    "helmet_en397": 49.0,  # EN 397:2012+A1, 5 kg from 1 m
    "helmet_en14052_crown": 100.0,  # EN 14052:2012+A1 crown impact
    "fragment_79j": 79.0,  # DDESB TP-12: 58 ft·lbf
}
ENERGY_LEVEL_KEYS = "helmet-penetration,helmet-en397,helmet-en14052-crown,fragment-79j"

runner = CliRunner()


def _reject_constant(name: str) -> None:
    raise AssertionError(f"JSON output contains the non-standard constant {name}")


def invoke(*args: str) -> Any:
    """Run ``dropcalc ARGS`` in-process; stdout and stderr stay separate on the result."""
    env = {"COLUMNS": "120", "FORCE_COLOR": None, "TERM": "dumb"}
    return runner.invoke(app, list(args), env=env)


def batch_rows(path: Path, *args: str, exit_code: int = 0) -> list[dict[str, Any]]:
    """Run ``dropcalc batch PATH ARGS --json``; check the exit code and parse the rows."""
    result = invoke("batch", str(path), "--json", *args)
    assert result.exit_code == exit_code, result.output
    rows = json.loads(result.stdout, parse_constant=_reject_constant)
    assert isinstance(rows, list), result.stdout
    return rows


def fall_json(*args: str) -> dict[str, Any]:
    """Run ``dropcalc fall ARGS --json`` and parse its one JSON object."""
    result = invoke("fall", *args, "--json")
    assert result.exit_code == 0, result.output
    return json.loads(result.stdout, parse_constant=_reject_constant)


def write_text(folder: Path, name: str, text: str, encoding: str = "utf-8") -> Path:
    path = folder / name
    path.write_bytes(text.encode(encoding))
    return path


def by_label(rows: list[dict[str, Any]]) -> dict[str, dict[str, Any]]:
    return {row["label"]: row for row in rows}


# A list mixing library objects, a custom drag area and custom shapes (units in the cells).
MIXED = """\
id,label,mass,drag_area,shape,length,width,depth,diameter,height
claw-hammer-16oz,hammer,,,,,,,,
brick-uk-standard,brick,,,,,,,,25 m
,bolt bag,2 lb,0.004 m2,,,,,,30 ft
,crate,6 kg,,box,0.4 m,30 cm,0.2,,
,ball,1 kg,,sphere,,,,10 cm,
"""


# --------------------------------------------------------------------------------------------
# Output contract


def test_rows_carry_the_contract_columns_and_json_equals_the_out_file(tmp_path):
    items = write_text(tmp_path, "items.csv", MIXED)
    out = tmp_path / "rows.json"
    rows = batch_rows(items, "--height", "20 m", "--out", str(out))
    assert len(rows) == 5
    for row in rows:
        for column in CONTRACT_COLUMNS:
            assert column in row, (column, row)
        assert row["error"] == ""
        assert row["impact_energy_max_j"] > 0
    # --json prints the same rows as the JSON file holds.
    assert json.loads(out.read_text(encoding="utf-8")) == rows


def test_cells_with_units_and_the_height_column(tmp_path):
    rows = by_label(batch_rows(write_text(tmp_path, "items.csv", MIXED), "--height", "20 m"))
    # 1 lb = 0.45359237 kg and 1 ft = 0.3048 m exactly (NIST SP 811, App. B.9).
    assert rows["bolt bag"]["mass_kg"] == pytest.approx(2 * POUND, rel=1e-12)
    assert rows["bolt bag"]["release_height_m"] == pytest.approx(30 * FOOT, rel=1e-12)
    # A row's own height wins over --height; the others take --height.
    assert rows["brick"]["release_height_m"] == pytest.approx(25.0, rel=1e-12)
    assert rows["hammer"]["release_height_m"] == pytest.approx(20.0, rel=1e-12)
    # "height" is the release height; a box's third edge is "depth" (0.2 m, bare = SI).
    assert rows["crate"]["release_height_m"] == pytest.approx(20.0, rel=1e-12)


def test_shape_rows_use_published_drag_coefficients(tmp_path):
    rows = by_label(batch_rows(write_text(tmp_path, "items.csv", MIXED), "--height", "20 m"))
    # Sphere: Cd 0.47 on pi D^2 / 4, both bounds (White tables 7.2-7.3, from memory).
    sphere = 0.47 * math.pi * 0.10**2 / 4
    assert rows["ball"]["drag_area_min_m2"] == pytest.approx(sphere, rel=1e-9)
    assert rows["ball"]["drag_area_max_m2"] == pytest.approx(sphere, rel=1e-9)
    # Box 0.4 x 0.3 x 0.2 m: smallest = Cd 0.80 (edge-on) x smallest face; largest = Cd 1.05
    # (face-on) x largest projection sqrt((ab)^2 + (bc)^2 + (ca)^2) (Hoerner ch. 3, from
    # memory; Cauchy's projection formula).
    a, b, c = 0.4, 0.3, 0.2
    assert rows["crate"]["drag_area_min_m2"] == pytest.approx(0.80 * b * c, rel=1e-9)
    largest = math.sqrt((a * b) ** 2 + (b * c) ** 2 + (c * a) ** 2)
    assert rows["crate"]["drag_area_max_m2"] == pytest.approx(1.05 * largest, rel=1e-9)


def test_every_shape_reads_its_dimension_columns(tmp_path):
    text = (
        "label,mass,shape,length,width,depth,diameter,outer_diameter,wall_thickness,thickness\n"
        "block,5 kg,box,0.4,0.2,0.1,,,,\n"
        "tool,1 kg,irregular,0.3,0.1,0.05,,,,\n"
        "bar,3 kg,cylinder,1 m,,,20 mm,,,\n"
        "rod,3 kg,rod,1 m,,,20 mm,,,\n"
        "pipe,4 kg,tube,1.5 m,,,,48.3 mm,4 mm,\n"
        "ball,1 kg,sphere,,,,0.1,,,\n"
        "sheet,10 kg,plate,1.2 m,0.6 m,,,,,10 mm\n"
    )
    rows = by_label(batch_rows(write_text(tmp_path, "shapes.csv", text), "--height", "10 m"))
    assert set(rows) == {"block", "tool", "bar", "rod", "pipe", "ball", "sheet"}
    for row in rows.values():
        assert row["error"] == "", row
        assert 0 < row["drag_area_min_m2"] <= row["drag_area_max_m2"]
    # "rod" is another name for "cylinder": the same item gives the same drag.
    assert rows["rod"]["drag_area_min_m2"] == rows["bar"]["drag_area_min_m2"]
    # A 10 mm sheet 0.6 m wide is flat: flagged as able to glide (thickness < 0.1 x width).
    assert rows["sheet"]["glides"] is True
    assert rows["block"]["glides"] is False


# --------------------------------------------------------------------------------------------
# Against an independent entry point: dropcalc fall


@pytest.mark.parametrize(
    "conditions",
    [
        ("--air-density", "1.2 kg/m3"),
        ("--wind", "12 m/s", "--terrain", "suburban", "--elevation", "350 m", "--air-temp", "5 °C"),
        ("--wind", "8 m/s", "--wind-from", "200", "--edge-azimuth", "45"),
    ],
    ids=["still-air", "suburban-12", "uniform-cross"],
)
def test_batch_equals_fall_for_the_same_inputs(tmp_path, conditions):
    rows = batch_rows(write_text(tmp_path, "items.csv", MIXED), "--height", "20 m", *conditions)
    assert len(rows) == 5
    for row in rows:
        height = repr(row["release_height_m"])
        if row["id"]:
            single = fall_json("--object", row["id"], "--height", height, *conditions)
            highest = single
            drift_max = single["drift_max_m"]
        else:
            mass = repr(row["mass_kg"])
            highest = fall_json(
                "--mass", mass, "--drag-area", repr(row["drag_area_min_m2"]), "--height", height,
                *conditions,
            )  # fmt: skip
            drift_max = fall_json(
                "--mass", mass, "--drag-area", repr(row["drag_area_max_m2"]), "--height", height,
                *conditions,
            )["drift_m"]  # fmt: skip
        label = row["label"]
        assert row["impact_speed_max_m_s"] == pytest.approx(highest["impact_speed_m_s"], rel=1e-9)
        assert row["impact_energy_max_j"] == pytest.approx(highest["impact_energy_j"], rel=1e-9)
        assert row["fall_time_s"] == pytest.approx(highest["fall_time_s"], rel=1e-9), label
        assert row["drift_min_m"] == pytest.approx(highest["drift_m"], rel=1e-9, abs=1e-12)
        assert row["drift_max_m"] == pytest.approx(drift_max, rel=1e-9, abs=1e-12), label


def test_batch_equals_fall_for_a_windborne_item(tmp_path):
    conditions = ("--height", "170 m", "--wind", "40 m/s", "--terrain", "en-0")
    items = write_text(tmp_path, "items.csv", "label,mass,drag_area\nleaf,5 g,0.05 m2\n")
    (row,) = batch_rows(items, *conditions)
    single = fall_json("--mass", "5 g", "--drag-area", "0.05 m2", *conditions)
    assert single["landed"] is False
    assert row["impact_energy_max_j"] == single["impact_energy_j"]
    assert row["drift_max_m"] == single["drift_m"]
    assert "carried away" in row["warnings"]


# --------------------------------------------------------------------------------------------
# Safe heights (the inverse solve)

INVERSE_ITEMS = """\
label,mass,drag_area
heavy,20 kg,0.05 m2
middle,2.5 kg,0.004 m2
light,0.3 kg,0.01 m2
"""


@pytest.mark.parametrize(
    "conditions",
    [
        ("--air-density", "1.2 kg/m3"),
        ("--wind", "12 m/s", "--terrain", "suburban"),
        ("--wind", "12 m/s"),
    ],
    ids=["still-air", "suburban-12", "uniform-12"],
)
def test_safe_height_fed_back_to_fall_gives_the_level(tmp_path, conditions):
    items = write_text(tmp_path, "items.csv", INVERSE_ITEMS)
    rows = batch_rows(items, "--height", "30 m", "--levels", ENERGY_LEVEL_KEYS, *conditions)
    checked = 0
    for row in rows:
        for key, level in LEVEL_ENERGY.items():
            height = row[f"safe_height_{key}_m"]
            if height == "never":
                continue
            single = fall_json(
                "--mass", repr(row["mass_kg"]), "--drag-area", repr(row["drag_area_min_m2"]),
                "--height", repr(height), *conditions,
            )  # fmt: skip
            assert single["impact_energy_j"] == pytest.approx(level, rel=1e-3), (row, key)
            checked += 1
    assert checked >= 10  # the light item never reaches the higher levels


def test_vacuum_limit_height_is_energy_over_weight(tmp_path):
    # A dense object with a tiny drag area falls as in vacuum: k = rho Cd A / (2 m) ~ 6e-9 1/m,
    # so h = E / (m g) (energy conservation, Galileo/Newton) holds to ~1e-6.
    items = write_text(tmp_path, "dense.csv", "label,mass,drag_area\ndense,10 kg,1e-7 m2\n")
    (row,) = batch_rows(items, "--height", "10 m", "--levels", "helmet-en397")
    assert row["safe_height_helmet_en397_m"] == pytest.approx(49.0 / (10 * G), rel=1e-6)
    # The same through the library function, several masses and levels at once.
    masses = np.array([10.0, 10.0, 50.0, 200.0])
    levels = np.array([49.0, 100.0, 24.5, 1000.0])
    k = 1.225 * 1e-7 / (2 * masses)
    heights = safe_heights(masses, k, levels, BatchSettings())
    np.testing.assert_allclose(heights, levels / (masses * G), rtol=1e-6)


def _closed_form_height(mass, drag_area, energy, density):
    """Still-air drop height whose impact energy is ``energy`` (Timmerman & van der Weele 1999).

    v(h)^2 = v_t^2 (1 - exp(-2 g h / v_t^2)) with v_t^2 = 2 m g / (rho Cd A), and v^2 = 2E/m.
    """
    vt2 = 2 * mass * G / (density * drag_area)
    return -(vt2 / (2 * G)) * np.log(1 - 2 * energy / (mass * vt2))


def test_still_air_safe_height_matches_the_closed_form():
    density = 1.2
    masses = np.array([0.2, 1.0, 2.5, 10.0, 40.0, 0.68])
    areas = np.array([0.002, 0.01, 0.004, 0.05, 0.3, 0.0025])
    levels = np.array([5.0, 24.5, 49.0, 100.0, 300.0, 30.6])
    k = density * areas / (2 * masses)
    heights = safe_heights(
        masses, k, levels, BatchSettings(conditions=Conditions(air=air_state(density=density)))
    )
    expected = _closed_form_height(masses, areas, levels, density)
    # The inverse solve's documented accuracy is 1e-4 relative in height.
    np.testing.assert_allclose(heights, expected, rtol=1e-4)


def test_still_air_safe_height_through_the_cli_matches_the_closed_form(tmp_path):
    items = write_text(tmp_path, "items.csv", "label,mass,drag_area\nm,2.5 kg,0.004 m2\n")
    (row,) = batch_rows(
        items, "--height", "30 m", "--air-density", "1.2 kg/m3", "--levels", ENERGY_LEVEL_KEYS
    )
    for key, level in LEVEL_ENERGY.items():
        expected = _closed_form_height(2.5, 0.004, level, 1.2)
        assert row[f"safe_height_{key}_m"] == pytest.approx(expected, rel=1e-4), key


@pytest.mark.parametrize("wind", [0.0, 8.0])
def test_levels_above_the_terminal_energy_are_never_reached(wind):
    density = 1.2
    masses = np.array([0.05, 0.3, 1.0, 10.0])
    areas = np.array([0.01, 0.01, 0.02, 0.05])
    k = density * areas / (2 * masses)
    vt2 = G / k
    # Terminal state in a uniform wind: v_t relative to the air, moving with the wind
    # ([TVDW-1999], wind-frame principle): energy -> 1/2 m (v_t^2 + U^2), from below.
    ceiling = 0.5 * masses * (vt2 + wind**2)
    settings = BatchSettings(
        conditions=Conditions(air=air_state(density=density), wind=wind_spec(wind))
    )
    assert np.all(np.isposinf(safe_heights(masses, k, 1.001 * ceiling, settings)))
    below = safe_heights(masses, k, 0.99 * ceiling, settings)
    assert np.all(np.isfinite(below))
    assert np.all(below > 0)


def test_never_in_the_cli_rows(tmp_path):
    # 50 g, Cd A = 0.01 m^2: 1/2 m v_t^2 = m^2 g / (rho Cd A) = 0.20 J at rho = 1.2, so even
    # with a 10 m/s wind (1/2 m U^2 = 2.5 J) every default energy level is out of reach.
    items = write_text(tmp_path, "items.csv", "label,mass,drag_area\nleaf,50 g,0.01 m2\n")
    (row,) = batch_rows(
        items, "--height", "30 m", "--wind", "10 m/s", "--air-density", "1.2 kg/m3",
        "--levels", ENERGY_LEVEL_KEYS,
    )  # fmt: skip
    for key in LEVEL_ENERGY:
        assert row[f"safe_height_{key}_m"] == "never", key


def test_push_release_with_energy_above_a_level_gives_zero(tmp_path):
    # 10 kg pushed off at 4 m/s already carries 1/2 m v0^2 = 80 J: above 24.5, 49 and 79 J.
    items = write_text(tmp_path, "items.csv", "label,mass,drag_area\nplate,10 kg,0.01 m2\n")
    (row,) = batch_rows(
        items, "--height", "10 m", "--release", "push", "--release-speed", "4 m/s",
        "--levels", ENERGY_LEVEL_KEYS,
    )  # fmt: skip
    for key in ("helmet_penetration", "helmet_en397", "fragment_79j"):
        assert row[f"safe_height_{key}_m"] == 0.0, key
    assert 0.0 < row["safe_height_helmet_en14052_crown_m"] < 10.0
    # Library level: a level just above the release energy needs a small drop.
    settings = BatchSettings(conditions=Conditions(release=Release(mode="push", speed=4.0)))
    k = np.full(2, 1.225 * 0.01 / 20)
    heights = safe_heights(np.full(2, 10.0), k, np.array([79.0, 81.0]), settings)
    assert heights[0] == 0.0
    assert 0.0 < heights[1] < 0.1


def test_safe_height_agrees_with_the_forward_solve_in_a_profile_wind(tmp_path):
    items = write_text(tmp_path, "items.csv", "label,mass,drag_area\nlight,0.3 kg,0.01 m2\n")
    (row,) = batch_rows(
        items, "--height", "100 m", "--wind", "15 m/s", "--terrain", "en-ii",
        "--levels", "helmet-en14052-crown",
    )  # fmt: skip
    assert row["impact_energy_max_j"] > 100.0
    assert "helmet-en14052-crown" in row["levels_exceeded"]
    # A level exceeded from 100 m must be reached from some height at or below 100 m.
    height = row["safe_height_helmet_en14052_crown_m"]
    assert isinstance(height, float), height
    assert 0.0 < height <= 100.0


# --------------------------------------------------------------------------------------------
# Order, summary, failed rows

BAD_ROWS = """\
id,label,mass,drag_area,quantity
,good custom,1.5 kg,0.004 m2,
claw-hamer,typo,,,
,negative,-1 kg,0.004 m2,
,no drag,1 kg,,
,seconds,2 s,0.004 m2,
claw-hammer-16oz,both,1 kg,,
,half,1 kg,0.004 m2,2.5
,minus,1 kg,0.004 m2,-1
,letter,1 kg,0.004 m2,x
brick-uk-standard,good id,,,3
,infinite,1 kg,0.004 m2,inf
,absurd,1 kg,0.004 m2,2e6
,nan,1 kg,0.004 m2,nan
"""

# Row number (header = row 1) -> words its error must contain.
BAD_ROW_REASONS = {
    3: ("unknown object", "claw-hamer", "did you mean", "claw-hammer-16oz"),
    4: ("mass", "-1 kg"),
    5: ("drag",),
    6: ("mass", "2 s"),
    7: ("id", "mass", "not both"),
    8: ("quantity", "2.5"),
    9: ("quantity", "-1"),
    10: ("quantity", "'x'"),
    12: ("quantity", "'inf'", "1,000,000"),  # raised OverflowError before (found by hypothesis)
    13: ("quantity", "'2e6'", "1,000,000"),
    14: ("quantity", "'nan'"),
}


@pytest.fixture(scope="module")
def bad_run(tmp_path_factory):
    path = tmp_path_factory.mktemp("bad") / "items.csv"
    path.write_text(BAD_ROWS, encoding="utf-8")
    text = invoke("batch", str(path), "--height", "12 m")
    as_json = invoke("batch", str(path), "--height", "12 m", "--json")
    return text, as_json


def test_some_rows_failed_exits_1_and_the_good_rows_are_computed(bad_run):
    text, as_json = bad_run
    assert text.exit_code == 1, text.output
    assert as_json.exit_code == 1, as_json.output
    rows = json.loads(as_json.stdout)
    good = [r for r in rows if not r["error"]]
    assert sorted(r["row"] for r in good) == [2, 11]
    assert all(r["impact_energy_max_j"] > 0 for r in good)


@pytest.mark.parametrize(("number", "words"), list(BAD_ROW_REASONS.items()))
def test_each_malformed_row_names_its_number_and_reason(bad_run, number, words):
    _, as_json = bad_run
    rows = {r["row"]: r for r in json.loads(as_json.stdout)}
    error = rows[number]["error"]
    assert error.startswith(f"row {number}: "), error
    for word in words:
        assert word in error, (word, error)
    # One stderr line per failed row, with the same reason.
    lines = [line for line in as_json.stderr.splitlines() if f"row {number}:" in line]
    assert len(lines) == 1, as_json.stderr
    assert error in lines[0]


def test_one_stderr_line_per_failed_row_and_failed_rows_last(bad_run):
    text, as_json = bad_run
    lines = [line for line in text.stderr.splitlines() if line.strip()]
    assert len(lines) == len(BAD_ROW_REASONS), text.stderr
    rows = json.loads(as_json.stdout)
    failed = [r["row"] for r in rows if r["error"]]
    assert failed == sorted(BAD_ROW_REASONS)
    assert rows[-len(failed) :] == [r for r in rows if r["error"]]


def test_sorted_by_energy_and_the_worst_item_named(tmp_path):
    items = write_text(tmp_path, "items.csv", MIXED)
    rows = batch_rows(items, "--height", "20 m")
    energies = [r["impact_energy_max_j"] for r in rows]
    assert energies == sorted(energies, reverse=True)
    worst = max(rows, key=lambda r: r["impact_energy_max_j"])
    result = invoke("batch", str(items), "--height", "20 m")
    assert result.exit_code == 0, result.output
    assert f"highest energy: {worst['label']} (row {worst['row']})" in result.stdout
    assert result.stderr.strip() == ""


def test_sort_rows_puts_failed_rows_last_in_input_order():
    rows = [
        {"row": 5, "error": "row 5: x"},
        {"row": 2, "impact_energy_max_j": 3.0, "error": ""},
        {"row": 3, "error": "row 3: y"},
        {"row": 4, "impact_energy_max_j": 9.0, "error": ""},
    ]
    assert [r["row"] for r in sort_rows(rows)] == [4, 2, 3, 5]


# --------------------------------------------------------------------------------------------
# Input that cannot be used at all: exit 2, one line


def _one_error_line(result: Any, *words: str) -> None:
    assert result.exit_code == 2, result.output
    lines = [line for line in result.stderr.splitlines() if line.strip()]
    assert len(lines) == 1, result.stderr
    for word in words:
        assert word in lines[0], (word, lines[0])
    assert "Traceback" not in result.output


def test_missing_file_exits_2(tmp_path):
    _one_error_line(invoke("batch", str(tmp_path / "nothing.csv"), "--height", "5"), "nothing")


def test_empty_file_exits_2(tmp_path):
    path = write_text(tmp_path, "empty.csv", "")
    _one_error_line(invoke("batch", str(path), "--height", "5"), "empty.csv")


def test_header_only_exits_2(tmp_path):
    path = write_text(tmp_path, "header.csv", "id,label\n")
    _one_error_line(invoke("batch", str(path), "--height", "5"), "header.csv")


def test_no_id_or_mass_column_exits_2(tmp_path):
    path = write_text(tmp_path, "cols.csv", "label,drag_area\nx,0.01\n")
    _one_error_line(invoke("batch", str(path), "--height", "5"), "'id'", "'mass'")


def test_unknown_level_key_exits_2(tmp_path):
    path = write_text(tmp_path, "items.csv", MIXED)
    result = invoke("batch", str(path), "--height", "5", "--levels", "helmet-en397,nope")
    _one_error_line(result, "nope", "helmet-en397")


# --------------------------------------------------------------------------------------------
# Files as they come


def test_byte_order_mark_is_not_part_of_the_first_column(tmp_path):
    path = write_text(tmp_path, "bom.csv", "\ufeffid,height\nclaw-hammer-16oz,10 m\n")
    assert path.read_bytes().startswith(b"\xef\xbb\xbf")
    (row,) = batch_rows(path)
    assert row["id"] == "claw-hammer-16oz"


def test_latin_1_bytes_are_read(tmp_path):
    path = write_text(
        tmp_path, "latin.csv", "label,mass,drag_area\nSchäkel groß,0.9 kg,0.002\n", "latin-1"
    )
    (row,) = batch_rows(path, "--height", "10 m")
    assert row["label"] == "Schäkel groß"


def test_semicolons_with_decimal_commas(tmp_path):
    text = "label;mass;drag_area;height\nshackle;0,9 kg;0,002 m2;12,5 m\n"
    (row,) = batch_rows(write_text(tmp_path, "semi.csv", text))
    assert row["mass_kg"] == pytest.approx(0.9, rel=1e-12)
    assert row["drag_area_min_m2"] == pytest.approx(0.002, rel=1e-12)
    assert row["release_height_m"] == pytest.approx(12.5, rel=1e-12)


def test_xlsx_input_with_numbers_and_text_cells(tmp_path):
    openpyxl = pytest.importorskip("openpyxl")
    book = openpyxl.Workbook()
    sheet = book.active
    sheet.append(["ID", "Label", "Mass", "Drag Area", "Height"])
    sheet.append([None, "numbers", 1.5, 0.004, 20])
    sheet.append([None, "with units", "3 lb", "0.004 m2", "40 ft"])
    sheet.append(["claw-hammer-16oz", "library", None, None, "15 m"])
    path = tmp_path / "items.xlsx"
    book.save(path)
    rows = by_label(batch_rows(path))
    assert rows["numbers"]["mass_kg"] == pytest.approx(1.5, rel=1e-12)
    assert rows["numbers"]["release_height_m"] == pytest.approx(20.0, rel=1e-12)
    assert rows["with units"]["mass_kg"] == pytest.approx(3 * POUND, rel=1e-12)
    assert rows["with units"]["release_height_m"] == pytest.approx(40 * FOOT, rel=1e-12)
    assert rows["library"]["id"] == "claw-hammer-16oz"
    assert {r["row"] for r in rows.values()} == {2, 3, 4}


def test_extra_columns_are_ignored_and_reported(tmp_path):
    text = "label,mass,drag_area,notes,price\nx,1 kg,0.01,top shelf,12.50\n"
    path = write_text(tmp_path, "extra.csv", text)
    result = invoke("batch", str(path), "--height", "5 m")
    assert result.exit_code == 0, result.output
    assert "Ignored column(s): notes, price" in result.stdout
    (row,) = batch_rows(path, "--height", "5 m")
    assert "notes" not in row
    assert "price" not in row


def test_blank_lines_are_skipped(tmp_path):
    text = "label,mass,drag_area\na,1 kg,0.01\n\nb,2 kg,0.01\n\n\nc,3 kg,0.01\n\n"
    rows = batch_rows(write_text(tmp_path, "blank.csv", text), "--height", "5 m")
    assert sorted(r["label"] for r in rows) == ["a", "b", "c"]
    assert all(r["error"] == "" for r in rows)


def test_row_numbers_count_blank_lines_in_a_csv(tmp_path):
    # Line 1 header, 2 good, 3 blank, 4 bad, 5-6 blank, 7 bad: as a spreadsheet shows it.
    text = "label,mass,drag_area\na,1 kg,0.01\n\nb,2 s,0.01\n\n\nc,-1 kg,0.01\n"
    rows = batch_rows(write_text(tmp_path, "blank.csv", text), "--height", "5 m", exit_code=1)
    numbers = {r["label"]: r["row"] for r in rows}
    assert numbers == {"a": 2, "b": 4, "c": 7}


# --------------------------------------------------------------------------------------------
# Output files

FORMULA_LABELS = ("=cmd|calc", "+1+1", "-2+3", "@SUM(A1)")


def _formula_list(tmp_path: Path) -> Path:
    lines = ["label,mass,drag_area"] + [f'"{label}",1 kg,0.01' for label in FORMULA_LABELS]
    return write_text(tmp_path, "formulas.csv", "\n".join(lines) + "\n")


def test_neutralise_prefixes_formula_starts_only():
    for text in FORMULA_LABELS:
        assert neutralise(text) == "'" + text
    assert neutralise("hammer") == "hammer"
    assert neutralise(-2.5) == -2.5
    assert neutralise(None) is None


def test_csv_output_neutralises_formulas_and_keeps_numbers(tmp_path):
    out = tmp_path / "rows.csv"
    result = invoke("batch", str(_formula_list(tmp_path)), "--height", "5 m", "--out", str(out))
    assert result.exit_code == 0, result.output
    with out.open(encoding="utf-8", newline="") as handle:
        records = list(csv.DictReader(handle))
    assert {r["label"] for r in records} == {"'" + label for label in FORMULA_LABELS}
    for record in records:
        assert float(record["mass_kg"]) == pytest.approx(1.0)
        assert float(record["impact_energy_max_j"]) > 0
        assert int(record["row"]) >= 2


def test_xlsx_output_neutralises_formulas_and_keeps_numbers(tmp_path):
    openpyxl = pytest.importorskip("openpyxl")
    out = tmp_path / "rows.xlsx"
    result = invoke("batch", str(_formula_list(tmp_path)), "--height", "5 m", "--out", str(out))
    assert result.exit_code == 0, result.output
    sheet = openpyxl.load_workbook(out).active
    header = [cell.value for cell in sheet[1]]
    label_at, mass_at = header.index("label"), header.index("mass_kg")
    energy_at = header.index("impact_energy_max_j")
    labels = set()
    for line in sheet.iter_rows(min_row=2):
        labels.add(line[label_at].value)
        assert line[label_at].data_type == "s"  # text, not a formula ("f")
        assert line[mass_at].data_type == "n"
        assert line[energy_at].data_type == "n"
        assert line[mass_at].value == pytest.approx(1.0)
    assert labels == {"'" + label for label in FORMULA_LABELS}


def test_out_with_failed_rows_writes_every_row(tmp_path):
    path = write_text(tmp_path, "items.csv", BAD_ROWS)
    out = tmp_path / "rows.csv"
    result = invoke("batch", str(path), "--height", "12 m", "--out", str(out))
    assert result.exit_code == 1, result.output
    with out.open(encoding="utf-8", newline="") as handle:
        records = list(csv.DictReader(handle))
    assert len(records) == len(BAD_ROWS.splitlines()) - 1  # every row but the header
    assert sum(1 for r in records if r["error"]) == len(BAD_ROW_REASONS)


def test_unsupported_out_suffix_exits_2_and_writes_nothing(tmp_path):
    path = write_text(tmp_path, "items.csv", MIXED)
    before = set(tmp_path.iterdir())
    result = invoke("batch", str(path), "--height", "5 m", "--out", str(tmp_path / "rows.txt"))
    _one_error_line(result, "rows.txt")
    assert set(tmp_path.iterdir()) == before


def test_out_into_a_missing_folder_exits_2(tmp_path):
    path = write_text(tmp_path, "items.csv", MIXED)
    target = tmp_path / "no-such-folder" / "rows.csv"
    _one_error_line(invoke("batch", str(path), "--height", "5 m", "--out", str(target)))
    assert not target.parent.exists()


# --------------------------------------------------------------------------------------------
# Speed


def _big_list(path: Path, rows: int) -> None:
    ids = [obj.id for obj in load_library()]
    rng = np.random.default_rng(7)
    with path.open("w", encoding="utf-8", newline="") as handle:
        writer = csv.writer(handle)
        writer.writerow(["id", "label", "mass", "drag_area", "height"])
        for i in range(rows):
            height = f"{rng.uniform(3, 120):.3f} m"
            if i % 2:
                writer.writerow([ids[i % len(ids)], "", "", "", height])
            else:
                mass = f"{rng.uniform(0.05, 30):.5f} kg"
                area = f"{rng.uniform(5e-4, 0.2):.6f} m2"
                writer.writerow(["", f"custom {i}", mass, area, height])


@pytest.mark.slow
def test_ten_thousand_rows_are_all_solved(tmp_path):
    # Speed is measured by benchmarks/commands.py (batch workloads), not asserted here.
    path = tmp_path / "big.csv"
    _big_list(path, 10_000)
    settings = BatchSettings(conditions=Conditions(wind=wind_spec(12.0, terrain="suburban")))
    frame = read_table(path)
    items, errors = parse_items(frame, load_library(), settings)
    rows = solve_items(items, settings)
    assert errors == []
    assert [r["row"] for r in rows] == [item.row for item in items]
    assert len(rows) == 10_000
    assert all(r["impact_energy_max_j"] is not None for r in rows)


def test_a_huge_cell_is_named_but_not_quoted_whole(tmp_path):
    # A 5,000-character cell pasted by mistake: each error still fits on one readable line.
    path = tmp_path / "items.csv"
    huge = "x" * 5000
    path.write_text(
        f"id,label,mass,drag_area,shape\n{huge},a,,,\n,b,1 kg,,{huge}\n,c,{'9' * 5000} kg,0.01,\n",
        encoding="utf-8",
    )
    result = invoke("batch", str(path), "--height", "10 m", "--json")
    assert result.exit_code == 1, result.output
    lines = [line for line in result.stderr.splitlines() if line.strip()]
    assert len(lines) == 3, result.stderr
    for number, line in zip((2, 3, 4), lines, strict=True):
        assert f"row {number}:" in line
        assert len(line) <= 450, len(line)


def test_repeated_rows_are_solved_once_with_the_same_figures_as_alone(tmp_path):
    # Rows naming the same object (a sheet flown by the plate model, a brick) are solved once
    # per distinct object; each row's figures equal those of the object solved on its own.
    settings = BatchSettings(height=15.0, conditions=Conditions(wind=wind_spec(6.0)))
    library = load_library()
    ids = ["plywood-12mm-half-sheet", "brick-uk-standard", "plywood-12mm-half-sheet"]
    listed = write_text(tmp_path, "list.csv", "id\n" + "\n".join(ids) + "\n")
    items, errors = parse_items(read_table(listed), library, settings)
    assert errors == []
    rows = solve_items(items, settings)
    for object_id in set(ids):
        alone = write_text(tmp_path, "alone.csv", f"id\n{object_id}\n")
        single, _ = parse_items(read_table(alone), library, settings)
        (expected,) = solve_items(single, settings)
        for row in rows:
            if row["id"] == object_id:
                for key in ("impact_energy_max_j", "drift_max_m", "fall_time_s"):
                    assert row[key] == expected[key], (object_id, key)
                safe = [k for k in row if k.startswith("safe_height_")]
                assert safe
                assert all(row[k] == expected[k] for k in safe)
