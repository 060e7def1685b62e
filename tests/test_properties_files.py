"""Property tests of the input files: batch lists (CSV, XLSX) and scenario TOML files.

Requirement (issue, "Files"): batch CSV/XLSX and scenario TOML with wrong types, missing
columns, extra columns, empty files, huge cells, a byte-order mark, Latin-1 bytes, semicolon
separators with decimal commas, duplicate ids and formulas in cells. Each gives a precise
message (file, row or key, reason) and loses no good row.

Batch lists are built by hypothesis from a mix of good rows (library ids from
``dropcalc.io.library.load_library()``, duplicates included, and custom rows with a mass and a drag
area) and bad rows (garbage cells, a missing drag area, 100 000-character cells, formulas such
as ``=1+1`` and ``@SUM(A1)``, unit errors such as ``5 s``, unknown ids, an id with a mass, bad
quantities), extra columns, shuffled columns, blank lines, labels that start like a formula,
in UTF-8, UTF-8 with a byte-order mark or Latin-1, comma separated or semicolon separated with
decimal commas, or as XLSX. ``dropcalc batch FILE --height 10 --json --out rows.csv`` must exit
0 (all rows good) or 1 (some failed), keep every good row with an empty ``error``, give every
bad row an ``error`` that starts with its row number as a spreadsheet shows it (header = row
1, blank lines counted), print one ``dropcalc: FILE: row N: ...`` line per bad row, and write
text cells that start like a formula with a leading apostrophe in the CSV output.

Scenario files are random mutations of the demo scenario (``templates/demo/scenario.toml``,
made small: one library object, ``[policy] precision = 0.2``, no objects file): a line deleted,
a value replaced by one of another type or with a wrong unit, a table duplicated, the text
truncated, bytes inserted. ``dropcalc report`` must exit 0 with the PDF written, or exit 2 with
one line naming the file (and, for a changed value that is refused, its key and line) and no
PDF written; never a traceback.

Failure found, fixed, and kept as a regression test at the end of this file: a wrong
``points`` of an edge or a wrong site ``outline`` was reported at the enclosing table
(``work_area[1].edge[1]`` at its header line; ``work_area[1]`` for the site outline), not at the
key and its line.

Examples run per entry point on one run (hypothesis ``max_examples``; all are run when no
failure is found): ``batch`` CSV/XLSX lists 60, ``batch`` file-level errors 30, ``report``
scenario mutations 30; 120 in all. Run ``pytest -s`` to print the counts.
"""

from __future__ import annotations

import collections
import csv
import io
import json
import re
import warnings
from collections.abc import Iterator
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from typer.testing import CliRunner

from dropcalc.cli import app
from dropcalc.io.library import load_library

runner = CliRunner()
ENV = {"COLUMNS": "100", "FORCE_COLOR": None, "TERM": "dumb"}
EXAMPLES: collections.Counter[str] = collections.Counter()
COMMON = settings(
    deadline=None,
    database=None,  # nothing written into the repository
    suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large],
)
FORMULA_START = ("=", "+", "-", "@")
HUGE = 100_000


@pytest.fixture(scope="module", autouse=True)
def _print_counts() -> Iterator[None]:
    yield
    print("\nexamples run per entry point:", dict(EXAMPLES))


@pytest.fixture(scope="module")
def folder(tmp_path_factory: pytest.TempPathFactory) -> Path:
    return tmp_path_factory.mktemp("file-fuzz")


def _reject_constant(name: str) -> None:
    raise AssertionError(f"JSON output contains the non-standard constant {name}")


def invoke(args: list[str]) -> Any:
    """Run ``dropcalc ARGS`` in-process; warnings recorded (a terminal would print them)."""
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        result = runner.invoke(app, args, env=ENV)
    assert result.exception is None or isinstance(result.exception, SystemExit), (
        f"{args}: uncaught {type(result.exception).__name__}: {result.exception}"
    )
    assert "Traceback" not in result.stdout + result.stderr, args
    stray = [w for w in caught if issubclass(w.category, RuntimeWarning)]
    assert not stray, f"{args}: warning printed on stderr: {stray[0].message}"
    return result


def _lines(text: str) -> list[str]:
    """Lines as a terminal shows them (split at CR and LF only)."""
    return [line for line in re.split(r"\r\n|\r|\n", text) if line.strip()]


# --------------------------------------------------------------------------------------------
# Batch lists
# --------------------------------------------------------------------------------------------

LIBRARY_IDS = sorted(obj.id for obj in load_library())
COLUMNS = ("id", "label", "mass", "drag_area", "quantity")
#: Cells that are no mass: garbage, formulas, wrong units, huge, out of range.
BAD_MASSES = [
    "abc", "=1+1", "@SUM(A1)", "=2", "5 s", "12 m", "12 lb lb", "-1 kg", "0", "nan", "inf",
    "1,500 kg", "x" * HUGE, "9" * HUGE, "1e400", "½ kg", "kg",
]  # fmt: skip
#: Characters of random text cells: printable Latin-1 and some beyond (no CR or LF, which a
#: quoted CSV cell may hold but which would shift the row numbers this test expects).
CELL_TEXT = st.text(
    alphabet=st.characters(
        min_codepoint=0x20, max_codepoint=0x17F, exclude_categories=("Cc", "Cs")
    ),
    max_size=12,
)


@dataclass
class Row:
    """One generated input row and what the output must show for it."""

    cells: dict[str, str]
    good: bool
    mass: float | None = None  # custom good rows: the mass written [kg]
    number: int = 0  # spreadsheet row number, header = 1


@dataclass
class Table:
    rows: list[Row]
    columns: list[str]
    extra: list[str]
    blank_before: list[int] = field(default_factory=list)


def _decimal(value: float, digits: int, comma: bool) -> str:
    text = f"{value:.{digits}f}"
    return text.replace(".", ",") if comma else text


@st.composite
def rows(draw: st.DrawFn, comma: bool) -> Row:
    label = draw(st.sampled_from(["", *FORMULA_START])) + draw(CELL_TEXT)
    kind = draw(
        st.sampled_from(
            ["library", "custom", "bad-mass", "no-drag", "unknown-id", "id-and-mass", "quantity"]
        )
    )
    if kind == "library":
        return Row({"id": draw(st.sampled_from(LIBRARY_IDS)), "label": label}, True)
    mass = draw(st.floats(min_value=0.05, max_value=50.0))
    mass_text = _decimal(mass, 2, comma)
    unit = draw(st.sampled_from(["", " kg"]))
    area = _decimal(draw(st.floats(min_value=0.001, max_value=0.2)), 4, comma)
    area_unit = draw(st.sampled_from(["", " m2", " m²"]))
    if kind == "custom":
        cells = {"label": label, "mass": mass_text + unit, "drag_area": area + area_unit}
        return Row(cells, True, float(mass_text.replace(",", ".")))
    if kind == "bad-mass":
        bad = draw(st.one_of(st.sampled_from(BAD_MASSES), CELL_TEXT.map(lambda t: "?" + t)))
        return Row({"label": label, "mass": bad, "drag_area": area}, False)
    if kind == "no-drag":
        return Row({"label": label, "mass": mass_text + unit}, False)
    if kind == "unknown-id":
        return Row({"id": "zz-" + draw(st.text("abcdefgh", min_size=1)), "label": label}, False)
    if kind == "id-and-mass":
        return Row({"id": draw(st.sampled_from(LIBRARY_IDS)), "mass": mass_text}, False)
    count = draw(st.sampled_from(["2.5", "-1", "0", "x", "=1+1", "1e9x"]))
    return Row({"label": label, "mass": mass_text, "drag_area": area, "quantity": count}, False)


@st.composite
def tables(draw: st.DrawFn, comma: bool) -> Table:
    body = draw(st.lists(rows(comma), min_size=1, max_size=8))
    extra = draw(st.lists(st.sampled_from(["notes", "price", "Supplier Ref"]), unique=True))
    columns = draw(st.permutations([*COLUMNS, *extra]))
    blank_before = draw(st.lists(st.integers(0, len(body)), max_size=2))
    for row in body:
        for name in extra:
            row.cells[name] = draw(st.one_of(CELL_TEXT, st.just("y" * HUGE), st.just("=A1")))
    return Table(body, list(columns), extra, blank_before)


def _number_rows(table: Table) -> None:
    number = 1  # header
    for index, row in enumerate(table.rows):
        number += 1 + table.blank_before.count(index)
        row.number = number


def write_csv(table: Table, path: Path, separator: str, encoding: str) -> None:
    buffer = io.StringIO()
    writer = csv.writer(buffer, delimiter=separator, lineterminator="\n")
    writer.writerow(table.columns)
    for index, row in enumerate(table.rows):
        for _ in range(table.blank_before.count(index)):
            buffer.write("\n")
        writer.writerow([row.cells.get(name, "") for name in table.columns])
    path.write_bytes(buffer.getvalue().encode(encoding, errors="replace"))


def write_xlsx(table: Table, path: Path) -> None:
    import openpyxl

    book = openpyxl.Workbook()
    sheet = book.active
    sheet.append(table.columns)
    for index, row in enumerate(table.rows):
        for _ in range(table.blank_before.count(index)):
            sheet.append([])
        values: list[Any] = []
        for name in table.columns:
            cell = row.cells.get(name, "")
            try:  # numbers as number cells, the way a spreadsheet holds them
                values.append(float(cell) if name in ("mass", "drag_area") else cell)
            except ValueError:
                values.append(cell)
        sheet.append([v if v != "" else None for v in values])
    book.save(path)


FORMATS = st.sampled_from(
    [("csv", ",", "utf-8"), ("csv", ",", "utf-8-sig"), ("csv", ",", "latin-1"),
     ("csv", ";", "utf-8"), ("csv", ";", "latin-1"), ("csv", ";", "utf-8-sig"), ("xlsx", "", "")]
)  # fmt: skip


@given(data=st.data())
@settings(COMMON, max_examples=60)
def test_batch_lists_keep_every_good_row_and_name_every_bad_one(
    folder: Path, data: st.DataObject
) -> None:
    suffix, separator, encoding = data.draw(FORMATS, label="format")
    table = data.draw(tables(separator == ";"), label="table")
    _number_rows(table)
    path = folder / f"items.{suffix}"
    if suffix == "xlsx":
        write_xlsx(table, path)
    else:
        write_csv(table, path, separator, encoding)
    out = folder / "rows.csv"
    out.unlink(missing_ok=True)
    EXAMPLES["batch list"] += 1
    result = invoke(["batch", str(path), "--height", "10", "--json", "--out", str(out)])
    bad = [row for row in table.rows if not row.good]
    assert result.exit_code == (1 if bad else 0), result.stderr[:2000]
    rows_out = json.loads(result.stdout, parse_constant=_reject_constant)
    by_number = {row["row"]: row for row in rows_out}
    assert len(rows_out) == len(table.rows), sorted(by_number)
    for row in table.rows:
        got = by_number[row.number]
        if row.good:
            assert got["error"] == "", (row.cells, got["error"][:300])
            if row.mass is not None:
                assert got["mass_kg"] == pytest.approx(row.mass, rel=1e-12)
            else:
                assert got["id"] == row.cells["id"]
        else:
            assert got["error"].startswith(f"row {row.number}: "), (row.cells, got["error"][:300])
    # One stderr line per bad row, naming the file and the row.
    lines = _lines(result.stderr)
    assert len(lines) == len(bad), result.stderr[:2000]
    for row in bad:
        assert (
            sum(line.startswith(f"dropcalc: {path.name}: row {row.number}: ") for line in lines)
            == 1
        ), (row.number, result.stderr[:2000])
    # The CSV output: every row, text cells that start like a formula neutralised.
    with out.open(encoding="utf-8", newline="") as handle:
        records = list(csv.DictReader(handle))
    assert len(records) == len(table.rows)
    for record in records:
        for name in ("label", "id", "name", "error", "warnings", "control", "levels_exceeded"):
            assert not (record.get(name) or "").startswith(FORMULA_START), (name, record[name])


@given(
    content=st.one_of(
        st.just(b""),
        st.just(b"\xef\xbb\xbf"),
        st.just(b"\n\n\n"),
        st.sampled_from([b"label,notes\n", b"label;notes\nx;y\n", b"id\n", b"mass;drag_area\n"]),
        st.binary(max_size=200),
        st.just(b"notes\n" + b"z" * HUGE + b"\n"),
    ),
    suffix=st.sampled_from(["csv", "xlsx", "txt", "ods"]),
)
@settings(COMMON, max_examples=30)
def test_batch_files_that_are_no_list_give_one_line_naming_the_file(
    folder: Path, content: bytes, suffix: str
) -> None:
    path = folder / f"broken.{suffix}"
    path.write_bytes(content)
    EXAMPLES["batch file-level"] += 1
    result = invoke(["batch", str(path), "--height", "10", "--json"])
    assert result.exit_code in (0, 1, 2), result.stderr
    if result.exit_code == 2:
        lines = _lines(result.stderr)
        assert len(lines) == 1, result.stderr
        assert lines[0].startswith("dropcalc: error: "), lines[0]
        assert path.name in lines[0], lines[0]
        assert result.stdout == ""
    else:
        json.loads(result.stdout, parse_constant=_reject_constant)


# --------------------------------------------------------------------------------------------
# Scenario files
# --------------------------------------------------------------------------------------------


def _small_scenario() -> str:
    """The demo scenario with one library object, precision 0.2 and no objects file."""
    text = (Path(__file__).parents[1] / "templates" / "demo" / "scenario.toml").read_text(
        encoding="utf-8"
    )
    text = text.replace('objects_file = "items.csv"\n', "")
    text = text[: text.index("\n[[object]]") + 1]
    text = text.replace("seed = 7", "seed = 7\nprecision = 0.2")
    return text + '[[object]]\nid = "claw-hammer-16oz"\nquantity = 2\n'


BASE = _small_scenario()
BASE_LINES = BASE.splitlines()
KEY_LINES = [
    i for i, line in enumerate(BASE_LINES) if re.match(r"^\s*\w+\s*=", line)
]  # lines holding a key = value
HEADER_LINES = [i for i, line in enumerate(BASE_LINES) if re.match(r"^\s*\[", line)]
WRONG_VALUES = [
    "true", "123", "-1", "0", "nan", "inf", "-inf", '"abc"', '""', "[1, 2]", "{ a = 1 }",
    '"5 s"', '"12 lb"', '"17.5 furlongs"', '"1e400 m"', '"=1+1"', "2026-12-01",
    '"' + "x" * HUGE + '"', "[[0, 0]]", '"m"',
]  # fmt: skip


@dataclass(frozen=True)
class Mutation:
    text: str
    key: str | None = None  # the key whose value was changed
    line: int | None = None  # its line (1-based)


@st.composite
def mutations(draw: st.DrawFn) -> Mutation:
    kind = draw(st.sampled_from(["delete", "retype", "unit", "duplicate", "truncate", "bytes"]))
    lines = list(BASE_LINES)
    if kind in ("delete", "retype", "unit"):
        index = draw(st.sampled_from(KEY_LINES))
        key = lines[index].split("=", 1)[0].strip()
        if kind == "delete":
            del lines[index]
            return Mutation("\n".join(lines) + "\n")
        if kind == "retype":
            value = draw(st.sampled_from(WRONG_VALUES))
        else:
            number = draw(st.sampled_from(["1", "17.5", "-3", "0"]))
            unit = draw(st.sampled_from(["s", "kg", "furlongs", "m/s/s", "lb", "%%", "ft ft"]))
            value = f'"{number} {unit}"'
        lines[index] = f"{lines[index].split('=', 1)[0]}= {value}"
        return Mutation("\n".join(lines) + "\n", key, index + 1)
    if kind == "duplicate":
        start = draw(st.sampled_from(HEADER_LINES))
        end = next((h for h in HEADER_LINES if h > start), len(lines))
        lines[end:end] = lines[start:end]
        return Mutation("\n".join(lines) + "\n")
    if kind == "truncate":
        return Mutation(BASE[: draw(st.integers(0, len(BASE) - 1))])
    position = draw(st.integers(0, len(BASE)))
    junk = draw(st.sampled_from(["\x00", "\ufeff", "]]", "[", '"', "= =", "\u00e9"]))
    return Mutation(BASE[:position] + junk + BASE[position:])


@pytest.mark.slow  # 30 report runs (Monte Carlo, figures, PDF): CI runs it, the default run not
@given(mutation=mutations(), latin_1=st.booleans())
@settings(COMMON, max_examples=30)
def test_scenario_mutations_exit_0_with_a_pdf_or_2_naming_file_key_and_line(
    folder: Path, mutation: Mutation, latin_1: bool
) -> None:
    scenario = folder / "scenario.toml"
    scenario.write_bytes(mutation.text.encode("latin-1" if latin_1 else "utf-8", errors="replace"))
    pdf = folder / "report.pdf"
    pdf.unlink(missing_ok=True)
    EXAMPLES["report scenario"] += 1
    result = invoke(["report", str(scenario), "-o", str(pdf), "--json"])
    assert result.exit_code in (0, 2), result.stderr
    if result.exit_code == 0:
        assert pdf.is_file()
        json.loads(result.stdout, parse_constant=_reject_constant)
        return
    assert not pdf.exists(), "a PDF was written although the scenario was refused"
    lines = _lines(result.stderr)
    assert len(lines) == 1, result.stderr
    message = lines[0]
    assert message.startswith("dropcalc: error: "), message
    assert scenario.name in message, message
    if mutation.key is not None:
        # A changed value refused: the message names its key path and the key's line.
        where = message.split(": ", 2)[-1]
        assert re.search(rf"(^|[\s.]){mutation.key}(\[\d+\])?:", where), (mutation.key, message)
        assert f"line {mutation.line}:" in message, (mutation.key, mutation.line, message)


def test_the_small_base_scenario_is_valid(folder: Path) -> None:
    # A guard for the mutations above: unmutated, the base runs and writes its PDF.
    scenario = folder / "base.toml"
    scenario.write_text(BASE, encoding="utf-8")
    pdf = folder / "base.pdf"
    result = invoke(["report", str(scenario), "-o", str(pdf), "--json"])
    assert result.exit_code == 0, result.stderr
    assert pdf.is_file()


# --------------------------------------------------------------------------------------------
# Regressions found by the properties above (minimised reproducers)
# --------------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("key", "key_path"),
    [("points", "work_area[1].edge[1].points"), ("outline", "site.outline")],
)
def test_a_wrong_points_or_outline_value_names_its_key_and_line(
    tmp_path: Path, key: str, key_path: str
) -> None:
    lines = list(BASE_LINES)
    index = next(i for i, line in enumerate(lines) if line.strip().startswith(f"{key} ="))
    lines[index] = f"{key} = 123"
    scenario = tmp_path / "scenario.toml"
    scenario.write_text("\n".join(lines) + "\n", encoding="utf-8")
    result = invoke(["report", str(scenario), "-o", str(tmp_path / "r.pdf")])
    assert result.exit_code == 2, result.output
    (message,) = _lines(result.stderr)
    assert f"line {index + 1}: {key_path}:" in message, message
