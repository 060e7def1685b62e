"""Result rows written as CSV, XLSX or JSON (chosen by the file suffix), atomically.

The rows are the object table of ``batch``, ``demo`` and ``objects --csv``: dicts with
unit-suffixed keys. Text cells that a spreadsheet would run as a formula are neutralised
(:func:`dropcalc.analysis.batch.neutralise`); JSON goes through the one guard of
:mod:`dropcalc.present.json`.
"""

from __future__ import annotations

import csv
import io
from collections.abc import Sequence
from pathlib import Path
from typing import Any

from dropcalc.analysis.batch import neutralise, rows_frame
from dropcalc.analysis.batch_run import BatchRun
from dropcalc.errors import require_suffix
from dropcalc.io.atomic import OUTPUT_FORMATS, write_atomic
from dropcalc.present.json import dumps, write_rows_json


def write_rows(path: Path, rows: Sequence[dict[str, Any]]) -> None:
    """Write result rows as CSV, XLSX or JSON, chosen by the file suffix."""
    suffix = require_suffix(path, OUTPUT_FORMATS, "--out")
    if suffix == ".json":
        text = dumps(list(rows))
        write_atomic(path, lambda p: p.write_text(text + "\n", encoding="utf-8"))
        return
    frame = rows_frame(rows)
    if suffix == ".csv":

        def write_csv(target: Path) -> None:
            frame.head(0).to_csv(target, index=False, encoding="utf-8")  # the header, plain
            frame.to_csv(target, mode="a", index=False, header=False, encoding="utf-8",
                         quoting=csv.QUOTE_NONNUMERIC)  # every text cell quoted  # fmt: skip

        write_atomic(path, write_csv)
    else:
        write_atomic(path, lambda p: frame.to_excel(p, index=False, engine="openpyxl"))


def write_run(path: Path, run: BatchRun) -> None:
    """Write the merged rows as CSV, XLSX or JSON (by suffix), streaming, atomically."""
    suffix = require_suffix(path, OUTPUT_FORMATS, "--out")
    columns = run.columns

    def cells(row: dict[str, Any]) -> list[Any]:
        return [neutralise(row.get(c)) for c in columns]

    def write_csv(target: Path) -> None:
        with target.open("w", encoding="utf-8", newline="") as handle:
            csv.writer(handle).writerow(columns)
            writer = csv.writer(handle, quoting=csv.QUOTE_NONNUMERIC)  # every text cell quoted
            for row in run.rows():
                writer.writerow(["" if v is None else v for v in cells(row)])

    def write_xlsx(target: Path) -> None:
        from openpyxl import Workbook
        from openpyxl.cell import WriteOnlyCell
        from openpyxl.styles import Alignment, Font
        from openpyxl.utils import get_column_letter

        # The workbook is zipped in memory (compressed, ~100 bytes a row) and then written as
        # plain bytes: a full disk then fails one ordinary write, instead of leaving openpyxl's
        # half-written zip archive to raise again from the garbage collector.
        book = Workbook(write_only=True)
        sheet = book.create_sheet("dropcalc batch")
        sheet.freeze_panes = "A2"  # the header stays in view
        formats = [xlsx_number_format(c) for c in columns]
        for index, column in enumerate(columns, start=1):
            sheet.column_dimensions[get_column_letter(index)].width = xlsx_column_width(column)
        bold = Font(bold=True)
        header = []
        for column in columns:
            cell = WriteOnlyCell(sheet, value=column)
            cell.font = bold
            cell.alignment = Alignment(wrap_text=True, vertical="top")
            header.append(cell)
        sheet.append(header)
        for row in run.rows():
            out = []
            for value, number_format in zip(cells(row), formats, strict=True):
                cell = WriteOnlyCell(sheet, value=value)
                if number_format and isinstance(value, int | float) and not isinstance(value, bool):
                    cell.number_format = number_format
                out.append(cell)
            sheet.append(out)
        buffer = io.BytesIO()
        book.save(buffer)
        target.write_bytes(buffer.getvalue())

    def write_json(target: Path) -> None:
        with target.open("w", encoding="utf-8") as handle:
            write_rows_json(handle, run.rows())

    writer = {".csv": write_csv, ".xlsx": write_xlsx, ".json": write_json}[suffix]
    write_atomic(path, writer)


#: Number formats of the XLSX columns by the unit suffix of their name (the value keeps its
#: full precision; the format only sets what the sheet shows).
_XLSX_FORMATS = (
    ("_j_cm2", "0.00"),
    ("_m2", "0.00000"),
    ("_m_s", "0.00"),
    ("_kg", "0.000"),
    ("_j", "0.0"),
    ("_m", "0.00"),
    ("_s", "0.00"),
)


def xlsx_number_format(column: str) -> str | None:
    """The XLSX number format of a batch column ("0.00" for metres), None for text columns."""
    if column in ("row", "quantity"):
        return "0"
    for suffix, number_format in _XLSX_FORMATS:
        if column.endswith(suffix):
            return number_format
    return None


def xlsx_column_width(column: str) -> float:
    """Column width in characters: text columns wide, number columns to fit their header."""
    if column in ("label", "name", "warnings", "control", "levels_exceeded", "error"):
        return 40.0
    if column == "id":
        return 28.0
    return float(min(max(len(column) * 0.75, 9.0), 22.0))
