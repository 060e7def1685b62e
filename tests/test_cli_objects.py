"""Tests of ``dropcalc objects``, ``dropcalc objects show`` and ``dropcalc fall --object``.

The listing is checked against the library it lists (``load_library``), the CSV export by
reading it back, and ``fall --object`` against ``fall --mass --drag-area`` runs with the
object's own numbers (an independent entry point: the object's drag-area bounds entered by
hand, as a user without the library would).
"""

from __future__ import annotations

import csv
import json
from pathlib import Path
from typing import Any

import pytest
from typer.testing import CliRunner

from dropcalc.cli import app
from dropcalc.io.library import load_library
from dropcalc.present.json import object_json

# Keys every element of `objects --json` carries (the contract).
OBJECT_FIELDS = (
    "id",
    "name",
    "category",
    "mass_kg",
    "shape",
    "drag_area_min_m2",
    "drag_area_max_m2",
    "source",
)
# JSON contract fields of `fall --json`, DESIGN.md "JSON contract".
FALL_FIELDS = (
    "impact_speed_m_s",
    "impact_energy_j",
    "fall_time_s",
    "drift_m",
    "terminal_speed_m_s",
    "impact_angle_deg",
    "air_density_kg_m3",
)
HAMMER = "claw-hammer-16oz"

runner = CliRunner()


def _reject_constant(name: str) -> None:
    raise AssertionError(f"JSON output contains the non-standard constant {name}")


def invoke(*args: str) -> Any:
    """Run ``dropcalc ARGS`` in-process; stdout and stderr stay separate on the result."""
    env = {"COLUMNS": "120", "FORCE_COLOR": None, "TERM": "dumb"}
    return runner.invoke(app, list(args), env=env)


def run_json(*args: str) -> Any:
    result = invoke(*args, "--json")
    assert result.exit_code == 0, result.output
    return json.loads(result.stdout, parse_constant=_reject_constant)


def one_error_line(result: Any) -> str:
    """Check exit 2 with exactly one stderr line and no traceback; return the line."""
    assert result.exit_code == 2, result.output
    lines = [line for line in result.stderr.splitlines() if line.strip()]
    assert len(lines) == 1, result.stderr
    assert "Traceback" not in result.output
    return lines[0]


# --------------------------------------------------------------------------------------------
# objects


def test_objects_json_is_an_array_of_the_whole_library():
    records = run_json("objects")
    assert isinstance(records, list)
    library = load_library()
    assert len(records) == len(library)
    assert [r["id"] for r in records] == [o.id for o in library]
    for record in records:
        for field in OBJECT_FIELDS:
            assert field in record, (field, record["id"])
        obj = library.get(record["id"])
        assert record["mass_kg"] == obj.mass
        assert record["drag_area_min_m2"] == obj.drag_area_min
        assert record["drag_area_max_m2"] == obj.drag_area_max
        assert 0 < record["drag_area_min_m2"] <= record["drag_area_max_m2"]
        assert record["source"]


def test_objects_category_filters():
    categories = load_library().categories()
    assert "hand-tools" in categories
    records = run_json("objects", "--category", "hand-tools")
    assert records
    assert {r["category"] for r in records} == {"hand-tools"}
    expected = [o.id for o in load_library() if o.category == "hand-tools"]
    assert [r["id"] for r in records] == expected


def test_objects_search_filters_on_every_word():
    records = run_json("objects", "--search", "hammer")
    ids = [r["id"] for r in records]
    assert HAMMER in ids
    for record in records:
        text = " ".join((record["id"], record["name"], record["notes"], record["category"]))
        assert "hammer" in text.lower(), record["id"]
    narrowed = run_json("objects", "--search", "hammer claw")
    assert HAMMER in [r["id"] for r in narrowed]
    assert len(narrowed) < len(records)


def test_objects_category_and_search_combine():
    records = run_json("objects", "--category", "hand-tools", "--search", "hammer")
    assert records
    assert {r["category"] for r in records} == {"hand-tools"}
    assert all(r in run_json("objects", "--search", "hammer") for r in records)


def test_objects_text_table_lists_every_object():
    result = invoke("objects")
    assert result.exit_code == 0, result.output
    for obj in load_library():
        assert obj.id in result.stdout


def test_unknown_category_exits_2_with_one_line_naming_the_known_ones():
    line = one_error_line(invoke("objects", "--category", "no-such-category"))
    assert "no-such-category" in line
    assert "hand-tools" in line


def test_objects_csv_reads_back(tmp_path):
    path = tmp_path / "objects.csv"
    result = invoke("objects", "--category", "hand-tools", "--csv", str(path))
    assert result.exit_code == 0, result.output
    with path.open(encoding="utf-8", newline="") as handle:
        records = list(csv.DictReader(handle))
    expected = run_json("objects", "--category", "hand-tools")
    assert [r["id"] for r in records] == [e["id"] for e in expected]
    for record, want in zip(records, expected, strict=True):
        assert float(record["mass_kg"]) == pytest.approx(want["mass_kg"], rel=1e-12)
        for field in ("drag_area_min_m2", "drag_area_max_m2"):
            shown = float(record[f"computed_{field}"])
            assert shown == pytest.approx(want[field], rel=1e-12), field
        assert record["name"] == want["name"]
        assert record["source"] == want["source"]


def test_the_whole_library_written_as_csv_loads_back_unchanged(tmp_path):
    """`objects --csv` writes the --library format: read back, every object has the same
    mass, shape, sizes, drag areas, contact area, hazards and fragility."""
    path = tmp_path / "library.csv"
    assert invoke("objects", "--csv", str(path)).exit_code == 0
    again = load_library(path)
    assert len(again.overridden) == len(load_library())  # every id came back
    for original in load_library():
        copy = again.get(original.id)
        for field in ("name", "category", "shape", "hazards", "fragile", "glides", "notes"):
            assert getattr(copy, field) == getattr(original, field), (original.id, field)
        for field in ("mass", "drag_area_min", "drag_area_typical", "drag_area_max"):
            want = getattr(original, field)
            assert getattr(copy, field) == pytest.approx(want, rel=1e-12), (original.id, field)
        assert dict(copy.dimensions) == pytest.approx(dict(original.dimensions), rel=1e-12)
        assert (copy.contact_area is None) == (original.contact_area is None)


def test_editing_a_size_in_the_exported_csv_changes_the_drag_but_a_computed_cell_does_not(
    tmp_path,
):
    path = tmp_path / "spanner.csv"
    assert invoke("objects", "--search", "combination spanner", "--csv", str(path)).exit_code == 0
    with path.open(encoding="utf-8", newline="") as handle:
        (row,) = list(csv.DictReader(handle))
    original = load_library().get("combination-spanner-19mm")
    row["computed_drag_area_min_m2"] = "99"  # ignored on reading
    row["length_m"] = str(2 * float(row["length_m"]))
    with path.open("w", encoding="utf-8", newline="") as handle:
        writer = csv.DictWriter(handle, fieldnames=list(row))
        writer.writeheader()
        writer.writerow(row)
    edited = load_library(path).get("combination-spanner-19mm")
    assert edited.drag_area_max > 1.5 * original.drag_area_max  # longer side, larger area
    assert edited.drag_area_min < 1.0


def test_objects_csv_into_a_missing_folder_exits_2(tmp_path):
    one_error_line(invoke("objects", "--csv", str(tmp_path / "missing" / "objects.csv")))


def test_objects_csv_needs_a_csv_suffix(tmp_path):
    target = tmp_path / "objects.txt"
    line = one_error_line(invoke("objects", "--csv", str(target)))
    assert "objects.txt" in line
    assert not target.exists()


# --------------------------------------------------------------------------------------------
# objects show


def test_objects_show_gives_every_property_with_its_source():
    obj = load_library().get(HAMMER)
    result = invoke("objects", "show", HAMMER)
    assert result.exit_code == 0, result.output
    text = " ".join(result.stdout.split())  # undo the wrapping
    for value in (obj.id, obj.name, obj.category, obj.shape, obj.mass_basis, obj.notes):
        assert " ".join(value.split()) in text, value
    for source in (obj.mass_source, obj.size_source, obj.drag_basis):
        assert " ".join(source.split()) in text, source
    for dimension in obj.dimensions:
        assert dimension in text
    for hazard in obj.hazards:
        assert hazard in text


def test_objects_show_json_is_the_full_record():
    record = run_json("objects", "show", HAMMER)
    assert record == object_json(load_library().get(HAMMER))
    for field in (*OBJECT_FIELDS, "mass_source", "size_source", "drag_basis", "dimensions_m"):
        assert record[field] not in (None, ""), field


def test_objects_show_accepts_a_loosely_typed_id():
    record = run_json("objects", "show", "Claw hammer 16oz")
    assert record["id"] == HAMMER


def test_objects_show_unknown_id_exits_2_with_a_suggestion():
    line = one_error_line(invoke("objects", "show", "claw-hamer"))
    assert "claw-hamer" in line
    assert "did you mean" in line
    assert HAMMER in line


# --------------------------------------------------------------------------------------------
# fall --object

CONDITIONS = ("--height", "20 m", "--wind", "10 m/s", "--air-density", "1.2 kg/m3")


def test_fall_object_reports_the_highest_energy_and_the_longest_drift():
    obj = load_library().get(HAMMER)
    assert obj.drag_area_min < obj.drag_area_max
    single = run_json("fall", "--object", HAMMER, *CONDITIONS)
    for field in FALL_FIELDS:
        assert field in single, field
    assert single["object_id"] == HAMMER
    # The contract fields are those of the smallest drag area (highest impact energy) ...
    smallest = run_json(
        "fall", "--mass", repr(obj.mass), "--drag-area", repr(obj.drag_area_min), *CONDITIONS
    )
    for field in FALL_FIELDS:
        assert single[field] == pytest.approx(smallest[field], rel=1e-12), field
    # ... and drift_max_m is the drift at the largest drag area (longest drift).
    largest = run_json(
        "fall", "--mass", repr(obj.mass), "--drag-area", repr(obj.drag_area_max), *CONDITIONS
    )
    assert single["drift_max_m"] == pytest.approx(largest["drift_m"], rel=1e-12)
    assert single["drift_max_m"] > single["drift_m"]
    assert single["impact_energy_min_j"] == pytest.approx(largest["impact_energy_j"], rel=1e-12)


def test_fall_object_uses_its_contact_area():
    obj = load_library().get(HAMMER)
    assert obj.contact_area is not None
    single = run_json("fall", "--object", HAMMER, *CONDITIONS)
    assert single["contact_area_m2"] == obj.contact_area
    expected = single["impact_energy_j"] / obj.contact_area
    assert single["energy_per_contact_area_j_m2"] == pytest.approx(expected, rel=1e-12)


@pytest.mark.parametrize(
    "extra",
    [("--mass", "1 kg"), ("--drag-area", "0.01 m2"), ("--cd", "1.0", "--area", "0.01 m2")],
    ids=["mass", "drag-area", "cd-area"],
)
def test_fall_object_with_mass_or_drag_exits_2(extra):
    line = one_error_line(invoke("fall", "--object", HAMMER, "--height", "10 m", *extra))
    assert "--object" in line


def test_fall_unknown_object_exits_2_with_a_suggestion():
    line = one_error_line(invoke("fall", "--object", "claw-hamer", "--height", "10 m"))
    assert HAMMER in line


def test_fall_object_from_a_user_library(tmp_path: Path):
    path = tmp_path / "mine.csv"
    path.write_text(
        "id,name,category,mass_kg,shape,diameter_m,source\n"
        "test-ball,Test ball,site-kit,2 kg,sphere,0.1 m,weighed on site\n",
        encoding="utf-8",
    )
    single = run_json("fall", "--object", "test-ball", "--library", str(path), *CONDITIONS)
    # Sphere: Cd 0.47 on pi D^2 / 4 (White, Fluid Mechanics, tables 7.2-7.3, from memory).
    drag_area = 0.47 * 3.141592653589793 * 0.1**2 / 4
    by_hand = run_json("fall", "--mass", "2 kg", "--drag-area", repr(drag_area), *CONDITIONS)
    assert single["impact_energy_j"] == pytest.approx(by_hand["impact_energy_j"], rel=1e-9)
