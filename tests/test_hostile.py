"""Hostile and careless input: a clear refusal or an answer, never a hang, a traceback or a leak.

Each case here hung, exhausted memory, raised a traceback or leaked before it was fixed; the
test pins the refusal (one line naming the key, exit code 2) or the answer.
"""

from __future__ import annotations

import json
from pathlib import Path
from typing import Any

import pytest
from typer.testing import CliRunner

from dropcalc.cli import app
from dropcalc.errors import InputError
from dropcalc.io.scenario import load_scenario
from dropcalc.units import parse_quantity

runner = CliRunner()


def invoke(*args: str) -> Any:
    """Run ``dropcalc ARGS`` in-process; stdout and stderr stay separate on the result."""
    env = {"COLUMNS": "120", "FORCE_COLOR": None, "TERM": "dumb"}
    return runner.invoke(app, list(args), env=env)


def one_error_line(result: Any, *words: str) -> str:
    """The command exited 2 with one stderr line holding ``words`` and no traceback."""
    assert result.exit_code == 2, (result.exit_code, result.output)
    assert "Traceback" not in result.output
    lines = [line for line in result.stderr.splitlines() if line.strip()]
    assert len(lines) == 1, result.stderr
    for word in words:
        assert word in lines[0], (word, lines[0])
    return lines[0]


SCENARIO = """\
[job]
title = "Test job"

[policy]
precision = 0.2

[[work_area]]
name = "Roof"
  [[work_area.edge]]
  points = [[0, 0], [10, 0]]
  height = "10 m"

[[object]]
id = "combination-spanner-19mm"
"""


def write_scenario(folder: Path, text: str, name: str = "scenario.toml") -> Path:
    path = folder / name
    path.write_text(text, encoding="utf-8")
    return path


# --------------------------------------------------------------------------------------------
# Unit expressions that cannot run away

#: Expressions pint would evaluate for hours or until memory runs out (an exponent tower, a
#: huge power), or that smuggle a number factor into the unit.
RUNAWAY = ["1 kg*9**9**9", "1 kg*2**2**40", "1 kg**9**9", "1 kg^9^9^9", "1 kg*9", "1 kg**1e9"]


@pytest.mark.parametrize("text", RUNAWAY)
def test_runaway_unit_expressions_are_refused_before_pint(text: str) -> None:
    with pytest.raises(InputError, match=r"--mass: could not read .* one-digit powers"):
        parse_quantity(text, "mass", "--mass")


def test_a_quantity_longer_than_the_limit_is_refused() -> None:
    with pytest.raises(InputError, match=r"longer than 80 characters; expected a length"):
        parse_quantity("1 " + "m*" * 40 + "m", "length", "--height")


@pytest.mark.parametrize(
    ("text", "kind", "expected"),
    [
        ("3 sq. ft", "area", 3 * 0.3048**2),
        ("1 m s⁻¹", "speed", 1.0),
        ("10 inH2O", "pressure", 2490.8891),  # pint's inch of water, 39.2 degF
        ("5 kg/(m*s**2)", "pressure", 5.0),
        ("1 kilogram / meter ** 3", "density", 1.0),
        ("2 m^2", "area", 2.0),
    ],
)
def test_ordinary_unit_spellings_still_read(text: str, kind: str, expected: float) -> None:
    assert parse_quantity(text, kind, "--x") == pytest.approx(expected, rel=1e-6)


def test_fall_refuses_the_tower_in_one_line() -> None:
    result = invoke("fall", "--mass", "1 kg*9**9**9", "--drag-area", "0.01", "--height", "10")
    one_error_line(result, "--mass", "9**9**9")


def test_a_tower_cell_in_a_batch_list_is_a_row_error_and_the_rest_is_computed(
    tmp_path: Path,
) -> None:
    items = tmp_path / "items.csv"
    items.write_text(
        "label,mass,drag_area\nok,1 kg,0.01 m2\ntower,1 kg*9**9**9,0.01 m2\nhuge,1 kg*2**2**40,"
        "0.01\nalso ok,2 kg,0.02\n",
        encoding="utf-8",
    )
    result = invoke("batch", str(items), "--height", "10 m", "--json")
    assert result.exit_code == 1, result.output
    rows = {row["label"]: row for row in json.loads(result.stdout)}
    assert rows["ok"]["impact_energy_max_j"] > 0
    assert rows["also ok"]["impact_energy_max_j"] > 0
    assert rows["tower"]["error"].startswith("row 3: mass")
    assert rows["huge"]["error"].startswith("row 4: mass")


def test_a_tower_in_a_scenario_names_the_key_and_line(tmp_path: Path) -> None:
    text = SCENARIO.replace(
        'id = "combination-spanner-19mm"', 'mass = "1 kg*2**2**40"\ndrag_area = "0.01 m2"'
    )
    with pytest.raises(InputError, match=r"scenario.toml: line 14: object\[1\]\.mass: "):
        load_scenario(write_scenario(tmp_path, text))
