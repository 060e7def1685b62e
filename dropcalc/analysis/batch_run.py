"""Running a batch list of any length in bounded memory.

The list is read in chunks (:data:`CHUNK_ROWS` rows), each chunk solved and its rows sorted and
written to a temporary file; the outputs then stream the chunks merged in energy order
(:func:`heapq.merge`), so memory holds one chunk and a block of rows per chunk, not the whole
list.
"""

from __future__ import annotations

import codecs
import heapq
import json
import pickle
import tempfile
from collections.abc import Callable, Iterator
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from dropcalc.analysis.batch import BatchSettings, error_rows, solve_items
from dropcalc.errors import InputError, require_file
from dropcalc.io.items import (
    KNOWN_COLUMNS,
    _column_name,
    check_columns,
    check_xlsx,
    parse_items,
)
from dropcalc.model.limits import MAX_LIST_FILE_BYTES, MAX_LIST_ROWS

#: Rows read, solved and sorted at a time.
CHUNK_ROWS = 10_000


def _encoding(path: Path) -> str:
    """UTF-8 (with or without byte-order mark) if the whole file decodes as such, else Latin-1.

    Checked block by block with an incremental decoder, so the file is never held whole.
    """
    decoder = codecs.getincrementaldecoder("utf-8")()
    with path.open("rb") as handle:
        try:
            while block := handle.read(1 << 20):
                decoder.decode(block)
            decoder.decode(b"", final=True)
        except UnicodeDecodeError:
            return "latin-1"
    return "utf-8-sig"


def _count_lines(path: Path) -> int:
    with path.open("rb") as handle:
        return sum(block.count(b"\n") for block in iter(lambda: handle.read(1 << 20), b""))


def _too_many_rows(path: Path, rows: int) -> InputError:
    return InputError(
        f"{path.name}: {rows:,} rows or more; at most {MAX_LIST_ROWS:,} are read (docs/limits.md)"
    )


def _check_columns(path: Path, raw_columns: list[Any]) -> list[str]:
    """Return the ignored columns, or raise when the list cannot be used at all."""
    columns = check_columns(path, raw_columns)
    if not columns:
        raise InputError(f"{path}: the table has no rows")
    if "id" not in columns and "mass" not in columns:
        raise InputError(f"{path}: needs an 'id' column (library objects) or a 'mass' column")
    return [c for c in columns if c not in KNOWN_COLUMNS]


def iter_chunks(path: Path) -> Iterator[tuple[int, Any]]:
    """Yield (spreadsheet row number of the chunk's first row, DataFrame of text cells).

    Raises
    ------
    InputError
        For a missing or unreadable file, an unknown format, no rows, or no id/mass column.
    """
    import pandas as pd

    path = require_file(path, "object list", MAX_LIST_FILE_BYTES)
    suffix = path.suffix.lower()
    if suffix in (".xlsx", ".xlsm"):
        yield from _xlsx_chunks(path)
        return
    if suffix not in (".csv", ".txt", ".tsv", ""):
        raise InputError(f"{path}: expected a .csv or .xlsx file; got {suffix or 'no suffix'}")
    lines = _count_lines(path)
    if lines - 1 > MAX_LIST_ROWS:  # the header's line break, then one per row
        raise _too_many_rows(path, lines - 1)
    encoding = _encoding(path)
    with path.open(encoding=encoding, newline="") as handle:
        header = handle.readline()
    separator = max((";", ",", "\t"), key=header.count)
    if header.count(separator) == 0:
        separator = ","
    try:
        with pd.read_csv(
            path, sep=separator, dtype=str, keep_default_na=False, skipinitialspace=True,
            skip_blank_lines=False, encoding=encoding, chunksize=CHUNK_ROWS,
        ) as reader:  # fmt: skip
            first = 2
            seen_rows = False
            for chunk in reader:
                if first == 2:
                    ignored = _check_columns(path, list(chunk.columns))
                chunk.columns = [_column_name(c) for c in chunk.columns]
                if first == 2:
                    chunk.attrs["ignored_columns"] = ignored
                seen_rows = seen_rows or not chunk.empty
                if first + len(chunk) - 2 > MAX_LIST_ROWS:  # rows with line breaks in cells
                    raise _too_many_rows(path, first + len(chunk) - 2)
                yield first, chunk
                first += len(chunk)
        if not seen_rows:
            raise InputError(f"{path}: the table has no rows")
    except InputError:
        raise
    except pd.errors.EmptyDataError:
        raise InputError(f"{path}: the table has no rows") from None
    except Exception as exc:  # pandas raises many kinds for malformed tables
        raise InputError(f"{path}: cannot read the table ({exc})") from None


def _xlsx_chunks(path: Path) -> Iterator[tuple[int, Any]]:
    import pandas as pd
    from openpyxl import load_workbook

    check_xlsx(path)
    try:
        # Formulas are read as their text ("=1+1"): dropcalc does not evaluate them, so a
        # formula in a number cell is refused with its row rather than read as empty.
        book = load_workbook(path, read_only=True, data_only=False)
    except Exception as exc:  # openpyxl raises several kinds for files it cannot read
        raise InputError(f"{path}: cannot read the workbook ({exc})") from None
    try:
        rows = book.worksheets[0].iter_rows(values_only=True)
        header = next(rows, None)
        if header is None:
            raise InputError(f"{path}: the table has no rows")
        ignored = _check_columns(path, list(header))
        columns = [_column_name(c) if c is not None else "" for c in header]
        first = 2
        buffer: list[list[str]] = []

        def frame() -> Any:
            chunk = pd.DataFrame(buffer, columns=columns)
            if first == 2:
                chunk.attrs["ignored_columns"] = ignored
            return chunk

        for values in rows:
            if first + len(buffer) - 1 > MAX_LIST_ROWS:
                raise _too_many_rows(path, MAX_LIST_ROWS + 1)
            cells = ["" if v is None else str(v) for v in values][: len(columns)]
            buffer.append(cells + [""] * (len(columns) - len(cells)))
            if len(buffer) == CHUNK_ROWS:
                yield first, frame()
                first += len(buffer)
                buffer = []
        if buffer or first == 2:
            if not buffer:
                raise InputError(f"{path}: the table has no rows")
            yield first, frame()
    finally:
        book.close()


def _sort_key(row: dict[str, Any]) -> tuple[float, int]:
    return (-(row.get("impact_energy_max_j") or 0.0), row["row"])


@dataclass
class BatchRun:
    """A solved list held in sorted chunk files; iterate :meth:`rows` for the merged result."""

    folder: tempfile.TemporaryDirectory[str]
    chunk_files: list[Path] = field(default_factory=list)
    error_file: Path | None = None
    good: int = 0
    bad: int = 0
    columns: list[str] = field(default_factory=list)
    ignored_columns: list[str] = field(default_factory=list)
    errors: list[Any] = field(default_factory=list)  # the first few, for the terminal

    def rows(self) -> Iterator[dict[str, Any]]:
        """Good rows by energy (highest first), then failed rows in input order."""
        streams = [_read_chunk(p) for p in self.chunk_files]
        yield from heapq.merge(*streams, key=_sort_key)
        if self.error_file is not None:
            yield from _read_lines(self.error_file)

    def close(self) -> None:
        """Remove the temporary chunk files."""
        self.folder.cleanup()


def _read_lines(path: Path) -> Iterator[dict[str, Any]]:
    with path.open(encoding="utf-8") as handle:
        for line in handle:
            yield json.loads(line)


#: Rows pickled together in a chunk file (what one chunk's stream holds in memory while merging).
PICKLE_BLOCK_ROWS = 500


def _write_chunk(path: Path, rows: list[dict[str, Any]]) -> None:
    """Write solved rows (all with the same keys) as pickled blocks of value tuples.

    The chunk files are this process's own, in its private temporary folder, read back only
    by :func:`_read_chunk`: pickle is about ten times faster than JSON here, which counted for a
    quarter of a 100,000-row batch.
    """
    columns = list(rows[0]) if rows else []
    with path.open("wb") as handle:
        pickle.dump(columns, handle, protocol=pickle.HIGHEST_PROTOCOL)
        for start in range(0, len(rows), PICKLE_BLOCK_ROWS):
            block = [tuple(row.values()) for row in rows[start : start + PICKLE_BLOCK_ROWS]]
            pickle.dump(block, handle, protocol=pickle.HIGHEST_PROTOCOL)


def _read_chunk(path: Path) -> Iterator[dict[str, Any]]:
    with path.open("rb") as handle:
        columns = pickle.load(handle)
        while True:
            try:
                block = pickle.load(handle)
            except EOFError:
                return
            for values in block:
                yield dict(zip(columns, values, strict=True))


#: Failed rows kept in memory for the terminal's error lines (all are in the outputs).
ERRORS_SHOWN = 50


def run_batch(
    path: Path,
    settings: BatchSettings,
    library_loader: Callable[[], Any],
    progress: Callable[[int, int], None] | None = None,
) -> BatchRun:
    """Read, solve and sort a list chunk by chunk (see the module docstring)."""
    folder = tempfile.TemporaryDirectory(prefix="dropcalc-batch-")
    run = BatchRun(folder)
    total = _count_lines(path) if progress is not None and path.suffix.lower() != ".xlsx" else 0
    library = None
    done = 0
    memo: dict[tuple[float, float, float], float] = {}  # safe heights, shared by the chunks
    try:
        for index, (first_row, frame) in enumerate(iter_chunks(path)):
            if index == 0:
                run.ignored_columns = frame.attrs.get("ignored_columns", [])
                if settings.height is None and "height" not in frame.columns:
                    raise InputError(
                        f"{path.name}: no release height: give --height or a 'height' column"
                    )
            if library is None and "id" in frame.columns:
                library = library_loader()
            items, errors = parse_items(frame, library, settings, first_row=first_row)
            rows = sorted(solve_items(items, settings, memo=memo), key=_sort_key)
            if rows:
                if not run.columns:
                    run.columns = list(rows[0])
                chunk_file = Path(folder.name) / f"chunk-{index}.pickle"
                _write_chunk(chunk_file, rows)
                run.chunk_files.append(chunk_file)
            if errors:
                run.error_file = run.error_file or Path(folder.name) / "errors.jsonl"
                with run.error_file.open("a", encoding="utf-8") as handle:
                    for row in error_rows(errors):
                        handle.write(json.dumps(row, allow_nan=False) + "\n")
                room = ERRORS_SHOWN - len(run.errors)
                run.errors.extend(errors[: max(room, 0)])
            run.good += len(rows)
            run.bad += len(errors)
            done += len(frame)
            if progress is not None:
                progress(done, max(total - 1, done))
    except BaseException:
        folder.cleanup()
        raise
    if not run.columns:
        run.columns = ["row", "label", "id", "error"]
    elif "error" not in run.columns:
        run.columns.append("error")
    return run
