"""What a practitioner asked for next (issue 13): version, help, batch releases and XLSX,
reference levels in ``fall``, ``zone --items`` that keeps the good rows.

Check values: the release physics is the engine's own (tested elsewhere against closed forms);
here the checks are about what the command line accepts and shows. Energies: a drop from
height h with no drag strikes with m g h, an upper bound for the drop with drag (Galileo;
g = 9.80665 m/s^2, 3rd CGPM 1901 [CGPM-1901]).
"""

from __future__ import annotations

import json
import re
from pathlib import Path
from typing import Any

import openpyxl
import pytest
from typer.testing import CliRunner

from dropcalc import __version__
from dropcalc.cli import app
from dropcalc.physics.scatter import surface_names

runner = CliRunner()
ENV = {"COLUMNS": "120", "FORCE_COLOR": None, "TERM": "dumb"}


def invoke(*args: str) -> Any:
    return runner.invoke(app, list(args), env=ENV)


def test_version() -> None:
    result = invoke("--version")
    assert result.exit_code == 0
    assert result.stdout.strip() == f"dropcalc {__version__}"


@pytest.mark.parametrize("command", [[], ["fall"], ["batch"], ["zone"], ["report"], ["demo"]])
def test_help_shows_flags_as_flags(command: list[str]) -> None:
    result = invoke(*command, "--help")
    assert result.exit_code == 0
    assert "<bool>" not in result.stdout
    assert "--help" in result.stdout


def test_zone_help_lists_every_ground() -> None:
    text = " ".join(invoke("zone", "--help").stdout.replace("│", " ").split())
    for name in surface_names():
        assert name in text, name


ITEMS = """\
label,mass,drag_area,height
heavy,10 kg,0.02 m2,10 m
,0.5 kg,0.01 m2,10 m
bad,-3 kg,0.01 m2,10 m
"""


def test_batch_names_an_unlabeled_row_and_keeps_the_table_plain(tmp_path: Path) -> None:
    items = tmp_path / "items.csv"
    items.write_text(ITEMS, encoding="utf-8")
    result = invoke("batch", str(items))
    assert result.exit_code == 1, result.output  # some rows failed (batch's exit status)
    text = result.stdout
    assert "highest energy: heavy (row 2)" in " ".join(text.split())
    # The unlabeled custom row is named by what it is, never by an empty string.
    assert not re.search(r"highest energy:\s+\(row", text)
    assert re.search(r"^\s*3\s+\S", text, re.MULTILINE), text
    assert not re.search(r"\d\.\d+e[+-]\d", text)  # no scientific notation in the table


def test_batch_xlsx_has_number_formats_a_frozen_header_and_widths(tmp_path: Path) -> None:
    items = tmp_path / "items.csv"
    items.write_text(ITEMS, encoding="utf-8")
    out = tmp_path / "out.xlsx"
    result = invoke("batch", str(items), "--out", str(out))
    assert result.exit_code == 1, result.output  # row 4 failed; the good rows are written
    sheet = openpyxl.load_workbook(out).active
    assert sheet.freeze_panes == "A2"
    header = [cell.value for cell in sheet[1]]
    assert sheet["A1"].font.bold
    column = {name: index + 1 for index, name in enumerate(header)}
    energy = sheet.cell(row=2, column=column["impact_energy_max_j"])
    assert isinstance(energy.value, float)
    assert energy.number_format == "0.0"
    assert sheet.cell(row=2, column=column["drag_area_min_m2"]).number_format == "0.00000"
    assert sheet.cell(row=2, column=column["mass_kg"]).number_format == "0.000"
    assert sheet.cell(row=2, column=column["drift_max_m"]).number_format == "0.00"
    letter = openpyxl.utils.get_column_letter(column["label"])
    assert sheet.column_dimensions[letter].width >= 30


@pytest.mark.parametrize(
    "release",
    [
        ("--release", "throw", "--release-speed", "5 m/s", "--release-angle", "30 deg"),
        ("--release", "roof-slide", "--roof-pitch", "35 deg", "--roof-length", "4 m"),
    ],
)
def test_batch_accepts_throw_and_roof_slide(tmp_path: Path, release: tuple[str, ...]) -> None:
    items = tmp_path / "items.csv"
    items.write_text("id\ncombination-spanner-19mm\n", encoding="utf-8")
    dropped = json.loads(invoke("batch", str(items), "--height", "10 m", "--json").stdout)
    result = invoke("batch", str(items), "--height", "10 m", *release, "--json")
    assert result.exit_code == 0, result.output
    (row,) = json.loads(result.stdout)
    assert row["error"] == ""
    # Leaving the edge with speed, it strikes harder than dropped from rest.
    assert row["impact_energy_max_j"] > dropped[0]["impact_energy_max_j"]


def test_fall_shows_the_reference_levels() -> None:
    # The levels reached follow from the printed energy and the levels' values.
    result = invoke("fall", "--object", "claw-hammer-16oz", "--height", "10 m", "--json")
    assert result.exit_code == 0, result.output
    data = json.loads(result.stdout)
    energy = data["impact_energy_j"]
    reached = set(data["levels_reached"])
    # EN 397 crown 49 J and EN 14052 crown 100 J [EN397-2012], [EN14052-2012].
    assert ("helmet-en397" in reached) == (energy >= 49.0)
    assert ("helmet-en14052-crown" in reached) == (energy >= 100.0)
    text = " ".join(
        invoke("fall", "--object", "claw-hammer-16oz", "--height", "10 m").stdout.split()
    )
    assert "Reference levels" in text
    assert "EN 14052 (100 J)" in text


def test_zone_items_keeps_the_good_rows(tmp_path: Path) -> None:
    items = tmp_path / "items.csv"
    items.write_text(
        "id,label\ncombination-spanner-19mm,spanner\nno-such-object,typo\n", encoding="utf-8"
    )
    result = invoke("zone", "--height", "10 m", "--items", str(items), "--precision", "0.2",
                    "--json")  # fmt: skip
    assert result.exit_code == 0, result.output
    data = json.loads(result.stdout)
    assert [o["name"] for o in data["objects"]] == ["spanner"]
    assert "row 3" in result.stderr
    assert "left out" in result.stderr
