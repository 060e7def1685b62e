"""A report a safety advisor can sign (issue 13): every control, honest page 1, clean numbers.

The PDF is read back with pypdf (a parser this project did not write); the check values are
the scenario's own inputs and the rules written out in each test.
"""

from __future__ import annotations

import json
import re
from pathlib import Path
from typing import Any

import pytest
from pypdf import PdfReader
from typer.testing import CliRunner

from dropcalc.cli import app
from dropcalc.model.policy import DEFAULT_RULES

runner = CliRunner()
ENV = {"COLUMNS": "100", "FORCE_COLOR": None, "TERM": "dumb"}

#: Nine items from a 17.5 m edge in still air: more than the six page 1 used to list, with a
#: glass pane and a plywood sheet (both glide and strike with well over 100 J).
MANY = """\
[job]
title = "Many items"

[policy]
precision = 0.2

[[work_area]]
name = "Roof"
  [[work_area.edge]]
  points = [[0, 0], [10, 0]]
  height = "17.5 m"

[[object]]
id = "float-glass-6mm-1200x900"
label = "Glass pane"
[[object]]
id = "plywood-12mm-full-sheet"
label = "Plywood sheet"
[[object]]
id = "combination-spanner-19mm"
[[object]]
id = "brick-uk-standard"
[[object]]
id = "two-way-radio-handheld"
[[object]]
id = "toe-board-clip"
[[object]]
id = "scaffold-tube-steel-2m"
[[object]]
id = "double-coupler-drop-forged"
[[object]]
id = "claw-hammer-16oz"
"""


def flat(text: str) -> str:
    return re.sub(r"\s+", " ", text).strip()


def pdf_text(path: Path) -> str:
    return flat(" ".join(page.extract_text() for page in PdfReader(path).pages))


def run_report(folder: Path, scenario_text: str, *extra: str) -> tuple[dict[str, Any], Path]:
    scenario = folder / "scenario.toml"
    scenario.write_text(scenario_text, encoding="utf-8")
    pdf = folder / "report.pdf"
    result = runner.invoke(
        app, ["report", str(scenario), "-o", str(pdf), "--json", *extra], env=ENV
    )
    assert result.exit_code == 0, result.output
    return json.loads(result.stdout), pdf


@pytest.fixture(scope="module")
def many(tmp_path_factory: pytest.TempPathFactory) -> dict[str, Any]:
    summary, pdf = run_report(tmp_path_factory.mktemp("many"), MANY)
    return {"summary": summary, "pdf": pdf, "text": pdf_text(pdf)}


def test_every_item_has_every_control_in_the_pdf(many: dict[str, Any]) -> None:
    controls = many["summary"]["controls"]
    assert len(controls) == 9  # every item, not a short list
    text = many["text"]
    for entry in controls:
        assert entry["controls"], entry
        assert flat(entry["item"]) in text, entry["item"]
        for control in entry["controls"]:
            assert flat(control) in text, control
    # No pointer to a column that the object table does not have.
    assert "more" not in text.split("Controls for every item")[1].split("Inputs")[0]
    assert "control column" not in text


def test_glass_and_heavy_sheet_get_prevent_the_drop(many: dict[str, Any]) -> None:
    by_item = {e["item"]: e["controls"] for e in many["summary"]["controls"]}
    for item in ("Glass pane", "Plywood sheet"):
        assert any(c.startswith("secure against wind") for c in by_item[item]), by_item[item]
        assert any(c.startswith("prevent the drop") for c in by_item[item]), by_item[item]
        # The default ("everything else") rule is not added to items that matched a rule.
        assert DEFAULT_RULES[-1].control not in by_item[item]


#: A breezy day, a plywood sheet and a spanner: the sheet drives the zone. The building is a
#: 3 m deep strip south of the work edge, so the zone wraps round behind it.
SHEET = """\
[job]
title = "Sheet"

[site]
outline = [[0, -3], [10, -3], [10, 0], [0, 0]]

[policy]
precision = 0.2

[wind]
speed = "8 m/s"
terrain = "suburban"

[[work_area]]
name = "Roof"
  [[work_area.edge]]
  points = [[0, 0], [10, 0]]
  height = "12 m"

[[object]]
id = "plywood-12mm-half-sheet"
label = "Plywood half sheet"
[[object]]
id = "combination-spanner-19mm"
"""


@pytest.fixture(scope="module")
def sheet(tmp_path_factory: pytest.TempPathFactory) -> dict[str, Any]:
    summary, pdf = run_report(tmp_path_factory.mktemp("sheet"), SHEET)
    first = flat(PdfReader(pdf).pages[0].extract_text())
    return {"summary": summary, "pdf": pdf, "first": first}


def test_page_one_says_when_the_driving_object_carries_a_warning(sheet: dict[str, Any]) -> None:
    (area,) = sheet["summary"]["work_areas"]
    assert area["driving_object"] == "Plywood half sheet"
    assert any("glide" in w for w in area["driver_warnings"]), area
    first = sheet["first"]
    # Beside the distance: between "Keep ... clear" and the facts below it.
    keep = first.index("Keep ")
    beside = first[keep : first.index("Worst case", keep)]
    assert "Warning: the distance is set by Plywood half sheet" in beside, beside
    assert "glide" in beside


def test_page_one_says_what_is_reached_only_over_or_around_the_building(
    sheet: dict[str, Any],
) -> None:
    (area,) = sheet["summary"]["work_areas"]
    assert area["beyond_building_m2"] > 0
    first = sheet["first"]
    assert "reached only over or around the building" in first
    assert "deflection off the structure is not modelled" in first
