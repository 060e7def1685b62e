"""Property test: scenario and list files built from their schema with random and extreme values.

Issue 15 ("hostile files"): whatever the file holds, dropcalc gives an answer or a clear
refusal, never a traceback, a hang, a half-written or leftover file, or JSON with NaN/inf.

Scenarios are built key by key from the scenario schema (``dropcalc.io.scenario._KEYS``), each
value drawn from extreme kinds: huge and tiny numbers, NaN and infinities, exponent towers and
long unit texts, math markup and control characters, deep lists, wrong types, file references.
They are loaded in-process (``load_scenario``): the only exception allowed is DropcalcError.
Lists are CSV files with the documented columns filled the same way and run through
``dropcalc batch FILE --json --out rows.json`` with a private temporary folder: exit 0, 1 or 2;
stdout valid JSON without NaN; the folder holds the list and the output only, the temporary
folder nothing. The repeatable profile of ``tests/conftest.py`` draws the same files each run.
"""

from __future__ import annotations

import json
import math
import tempfile
from pathlib import Path
from typing import Any

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from typer.testing import CliRunner

from dropcalc.analysis.batch import KNOWN_COLUMNS
from dropcalc.cli import app
from dropcalc.errors import DropcalcError
from dropcalc.io.scenario import _KEYS, load_scenario

COMMON = settings(
    deadline=None,
    database=None,
    max_examples=40,
    suppress_health_check=[HealthCheck.too_slow, HealthCheck.function_scoped_fixture],
)

#: Texts a careless or hostile user may type where a quantity, a name or a key is expected.
HOSTILE_TEXT = [
    "1 kg*9**9**9", "1 kg*2**2**40", "10 m" + " " * 200, "1e308 km", "-0 m", "nan m",
    "north $\\frac{1}$ eave", "cost $x^$ tile", "A\x01B", "brick\x1b]0;PWNED\x07",
    "Tile;=cmd|' /C calc'!A0;", "=1+1", "W" * 3000, "word " * 300, "12,500 m", "5 ft 3 in",
    "/dev/zero", "../secret.csv", "", " ", "35°", "25 mph", "0.01 m", "12 kg", "0.02 m²",
]  # fmt: skip
NUMBERS = st.one_of(
    st.floats(allow_nan=True, allow_infinity=True),
    st.sampled_from([0, -1, 1e-320, 1e300, 2**70, 5, 0.5, 10]),
    st.integers(min_value=-(10**30), max_value=10**30),
)
SCALARS = st.one_of(NUMBERS, st.sampled_from(HOSTILE_TEXT), st.booleans(), st.text(max_size=30))
POINTS = st.one_of(
    st.lists(st.tuples(NUMBERS, NUMBERS).map(list), max_size=6),
    st.just([[0, 0], [10, 0]]),
    st.just([5]),
    st.just([[0, 0], [1e300, 0]]),
)


def _toml(value: Any) -> str:
    """A TOML value (tomllib reads it back as ``value``)."""
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, int):
        return str(value)
    if isinstance(value, float):
        if math.isnan(value):
            return "nan"
        if math.isinf(value):
            return "inf" if value > 0 else "-inf"
        return repr(value)
    if isinstance(value, list):
        return "[" + ", ".join(_toml(v) for v in value) + "]"
    return json.dumps(value)  # a TOML basic string is a JSON string


def _table(draw: Any, kind: str, required: dict[str, Any]) -> dict[str, Any]:
    keys = draw(st.lists(st.sampled_from(sorted(_KEYS[kind])), max_size=4, unique=True))
    table = {key: draw(POINTS if key in ("points", "outline") else SCALARS) for key in keys}
    return {**required, **table}


@st.composite
def scenarios(draw: Any) -> str:
    lines = ["[job]"]
    job = _table(draw, "job", {"title": draw(st.sampled_from(["t", *HOSTILE_TEXT]))})
    lines += [f"{key} = {_toml(value)}" for key, value in job.items()]
    for name in ("site", "wind", "policy"):
        table = _table(draw, name, {"precision": 0.2} if name == "policy" else {})
        table.pop("rules_file", None) if draw(st.booleans()) else None
        lines += [f"[{name}]", *(f"{key} = {_toml(value)}" for key, value in table.items())]
    for _ in range(draw(st.integers(1, 2))):
        area = _table(draw, "work_area", {})
        area.pop("edge", None)
        lines += ["[[work_area]]", *(f"{key} = {_toml(value)}" for key, value in area.items())]
        for _ in range(draw(st.integers(0, 2))):
            edge = _table(draw, "edge", {"points": [[0, 0], [10, 0]], "height": "10 m"})
            lines += ["[[work_area.edge]]", *(f"{k} = {_toml(v)}" for k, v in edge.items())]
    for _ in range(draw(st.integers(0, 2))):
        obj = _table(draw, "object", {"id": "combination-spanner-19mm"})
        lines += ["[[object]]", *(f"{key} = {_toml(value)}" for key, value in obj.items())]
    return "\n".join(lines) + "\n"


@given(text=scenarios())
@COMMON
def test_a_scenario_from_the_schema_loads_or_is_refused(tmp_path: Path, text: str) -> None:
    path = tmp_path / "scenario.toml"
    path.write_text(text, encoding="utf-8")
    try:
        load_scenario(path, allow_file_references=False)
    except DropcalcError as exc:
        message = str(exc)
        assert message.startswith("scenario.toml: "), message
        assert "\n" not in message, message


@st.composite
def lists(draw: Any) -> str:
    columns = draw(st.lists(st.sampled_from(sorted(KNOWN_COLUMNS)), min_size=1, max_size=6,
                            unique=True))  # fmt: skip
    if "id" not in columns and "mass" not in columns:
        columns.append(draw(st.sampled_from(["id", "mass"])))
    rows = []
    for _ in range(draw(st.integers(1, 5))):
        cells = [draw(st.one_of(st.sampled_from(HOSTILE_TEXT), NUMBERS.map(str))) for _ in columns]
        rows.append(cells)
    import csv
    import io

    buffer = io.StringIO()
    writer = csv.writer(buffer)
    writer.writerow(columns)
    writer.writerows(rows)
    return buffer.getvalue()


def _reject(name: str) -> None:
    raise AssertionError(f"JSON output holds {name}")


@given(text=lists())
@COMMON
def test_a_list_from_the_schema_gives_rows_or_a_refusal_and_leaves_nothing(
    tmp_path: Path, text: str, monkeypatch: pytest.MonkeyPatch
) -> None:
    folder = Path(tempfile.mkdtemp(dir=tmp_path))
    private = folder / "tmp"
    private.mkdir()
    monkeypatch.setattr(tempfile, "tempdir", str(private))
    items = folder / "items.csv"
    items.write_text(text, encoding="utf-8")
    out = folder / "rows.json"
    result = CliRunner().invoke(
        app, ["batch", str(items), "--height", "10 m", "--json", "--out", str(out)],
        env={"COLUMNS": "100", "TERM": "dumb"},
    )  # fmt: skip
    assert result.exit_code in (0, 1, 2), (result.exit_code, result.output[-2000:])
    assert result.exception is None or isinstance(result.exception, SystemExit), result.exception
    assert "Traceback" not in result.output
    assert "\x1b" not in result.output
    if result.exit_code in (0, 1):
        rows = json.loads(result.stdout, parse_constant=_reject)
        assert json.loads(out.read_text(encoding="utf-8"), parse_constant=_reject) == rows
        assert sorted(p.name for p in folder.iterdir()) == ["items.csv", "rows.json", "tmp"]
    else:
        assert sorted(p.name for p in folder.iterdir()) == ["items.csv", "tmp"]
    assert list(private.iterdir()) == []
