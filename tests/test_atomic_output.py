"""Every file dropcalc writes is written whole or not at all, under any name, with the usual mode.

Each output (CSV, XLSX, JSON, GeoJSON, PNG, SVG, PDF) must be written to a temporary file in
the target folder and renamed over the target only when complete (``os.replace`` is atomic on
one file system, POSIX rename(2)). A failure injected in the middle of the write (the writer
puts some bytes in its file, then raises) must leave the old file byte-identical, or no file,
and no temporary file in the folder. An ``OSError`` (disk full, ENOSPC) reaches the user as one
line and exit code 2; any other error may propagate, but still leaves nothing behind.

Output names with spaces and non-ASCII letters must work for every writer, and a written file
gets the mode a new file normally gets, 0666 masked by the umask (POSIX open(2) with O_CREAT),
not the 0600 of a private temporary file.

File signatures checked: PDF "%PDF-" (ISO 32000-1:2008, 7.5.2), PNG's 8-byte signature
(ISO/IEC 15948:2004, 5.2), XLSX a ZIP package read back with openpyxl (ECMA-376 part 2),
SVG an XML document with an <svg> root (W3C SVG 1.1, 5.1), GeoJSON a FeatureCollection
(RFC 7946, 3.3).
"""

from __future__ import annotations

import builtins
import errno
import gc
import io
import json
import os
import shutil
import stat
import sys
from collections.abc import Callable, Iterator
from pathlib import Path
from typing import Any

import pandas as pd
import pytest
from typer.testing import CliRunner

from dropcalc.cli import app
from dropcalc.errors import InputError
from dropcalc.io.atomic import write_atomic
from dropcalc.present.tables import write_rows

runner = CliRunner()

PNG_SIGNATURE = b"\x89PNG\r\n\x1a\n"  # ISO/IEC 15948:2004, sec. 5.2
OLD = b"old contents \xc3\xa9 that must survive\n"
ROWS = [
    {"label": "Schraubenschlüssel", "mass_kg": 0.3, "impact_energy_max_j": 59.1, "error": ""},
    {"label": "brick", "mass_kg": 2.6, "impact_energy_max_j": 510.0, "error": ""},
]
# A dense object (k ~ 6e-9 1/m) dropped in still air: the zone is the margin alone, quickly.
DENSE = ("--mass", "10 kg", "--drag-area", "1e-7 m2")
ZONE_FAST = (*DENSE, "--precision", "0.05")
SITE = """origin = { lat = 53.0, lon = -2.0 }
outline = [[0, 0], [10, 0], [10, 8], [0, 8]]
[[edge]]
name = "north"
points = [[0, 8], [10, 8]]
height = "6 m"
"""
SCENARIO = """[job]
title = "Façade – test job"
site = "Rue de l'Église"

[site]
origin = { lat = 53.0, lon = -2.0 }
outline = [[0, 0], [10, 0], [10, 8], [0, 8]]

[policy]
seed = 3

[[work_area]]
name = "North edge"
release = "drop"
  [[work_area.edge]]
  name = "north"
  points = [[0, 8], [10, 8]]
  height = "6 m"

[[object]]
label = "Bolt"
mass = "0.3 kg"
drag_area = "0.001 m2"
"""
ITEMS = "name,mass,drag_area,height\nspanner,0.3 kg,0.003 m2,20 m\nbrick,2.6 kg,0.02 m2,12 m\n"


def invoke(*args: str) -> Any:
    """Run ``dropcalc ARGS`` in-process."""
    return runner.invoke(app, list(args), env={"COLUMNS": "100", "TERM": "dumb"})


def listing(folder: Path) -> list[str]:
    return sorted(p.name for p in folder.iterdir())


def mode(path: Path) -> int:
    return stat.S_IMODE(path.stat().st_mode)


@pytest.fixture
def umask_022() -> Iterator[int]:
    """Run the test under umask 022 (the usual one), restoring the caller's afterwards."""
    previous = os.umask(0o022)
    try:
        yield 0o022
    finally:
        os.umask(previous)


@pytest.fixture
def folder(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Path:
    """A work folder whose name has a space and a non-ASCII letter; also the cwd."""
    work = tmp_path / "x y é"
    work.mkdir()
    monkeypatch.chdir(work)
    return work


def disk_full() -> OSError:
    return OSError(errno.ENOSPC, "No space left on device")


def fail_after(partial: bytes, error: BaseException) -> Callable[[Any, Any], None]:
    """A stand-in for ``writer(self, target, ...)`` that writes ``partial`` then raises."""

    def writer(self: Any, target: Any, *args: Any, **kwargs: Any) -> None:
        Path(target).write_bytes(partial)
        raise error

    return writer


def failing_write_text(monkeypatch: pytest.MonkeyPatch, folder: Path, error: BaseException) -> None:
    """Path.write_text into ``folder`` writes half its text, then raises ``error``."""
    original = Path.write_text
    where = folder.resolve()

    def write_text(self: Path, data: str, *args: Any, **kwargs: Any) -> int:
        if self.resolve().parent != where:
            return original(self, data, *args, **kwargs)
        self.write_bytes(data[: len(data) // 2].encode("utf-8"))
        raise error

    monkeypatch.setattr(Path, "write_text", write_text)


def one_line_error(result: Any, *words: str) -> None:
    """Exit 2 with one line on stderr containing ``words``."""
    assert result.exit_code == 2, (result.output, result.exception)
    message = result.stderr.strip()
    assert "\n" not in message, message
    assert "Traceback" not in message, message
    for word in words:
        assert word in message, message


# ---------------------------------------------------------------------------------------------
# write_atomic itself
# ---------------------------------------------------------------------------------------------


@pytest.mark.parametrize("error", [RuntimeError("boom"), KeyboardInterrupt()])
def test_write_atomic_any_failure_keeps_the_old_file(tmp_path: Path, error: BaseException) -> None:
    """Expected: an exception of any kind (even KeyboardInterrupt) raised after some bytes are
    written propagates unchanged, the old file is byte-identical and no temporary is left."""
    target = tmp_path / "out.csv"
    target.write_bytes(OLD)

    def write(temporary: Path) -> None:
        temporary.write_bytes(b"half,a,row")
        raise error

    with pytest.raises(type(error)):
        write_atomic(target, write)
    assert target.read_bytes() == OLD
    assert listing(tmp_path) == ["out.csv"]


def test_write_atomic_disk_error_is_an_input_error(tmp_path: Path) -> None:
    """Expected: an OSError mid-write becomes InputError naming the file and the reason; no
    file is created where there was none."""
    target = tmp_path / "new file ü.json"

    def write(temporary: Path) -> None:
        temporary.write_bytes(b"[{")
        raise disk_full()

    with pytest.raises(InputError, match="cannot write") as caught:
        write_atomic(target, write)
    assert "new file ü.json" in str(caught.value)
    assert listing(tmp_path) == []


def test_write_atomic_missing_folder(tmp_path: Path) -> None:
    """Expected: a missing folder is an InputError naming it; nothing is created."""
    with pytest.raises(InputError, match="does not exist"):
        write_atomic(tmp_path / "nowhere" / "a.csv", lambda p: p.write_text("x"))
    assert listing(tmp_path) == []


@pytest.mark.parametrize("umask", [0o022, 0o027, 0o002])
def test_written_file_mode_follows_the_umask(tmp_path: Path, umask: int) -> None:
    """Expected: 0666 & ~umask (0644, 0640, 0664), as open(2) gives a new file; not 0600."""
    previous = os.umask(umask)
    try:
        write_rows(tmp_path / "rows.csv", ROWS)
    finally:
        os.umask(previous)
    assert mode(tmp_path / "rows.csv") == 0o666 & ~umask


# ---------------------------------------------------------------------------------------------
# CSV, XLSX, JSON rows (write_rows: batch --out, objects --csv, demo)
# ---------------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    "error", [RuntimeError("writer crashed"), disk_full()], ids=["crash", "enospc"]
)
@pytest.mark.parametrize(
    ("suffix", "method", "partial"),
    [
        pytest.param(".csv", "to_csv", b"label,mass_kg\nSchrau", id="csv"),
        pytest.param(".xlsx", "to_excel", b"PK\x03\x04\x14\x00half", id="xlsx"),
    ],
)
def test_rows_failure_mid_write_keeps_the_old_file(
    tmp_path: Path,
    monkeypatch: pytest.MonkeyPatch,
    suffix: str,
    method: str,
    partial: bytes,
    error: BaseException,
) -> None:
    """pandas writes part of the file, then fails. Expected: the old file byte-identical, no
    temporary; a disk error as InputError ("cannot write"), any other error unchanged."""
    target = tmp_path / f"results{suffix}"
    target.write_bytes(OLD)
    monkeypatch.setattr(pd.DataFrame, method, fail_after(partial, error))
    expected = InputError if isinstance(error, OSError) else type(error)
    with pytest.raises(expected):
        write_rows(target, ROWS)
    assert target.read_bytes() == OLD
    assert listing(tmp_path) == [target.name]
    with pytest.raises(expected):
        write_rows(tmp_path / f"fresh{suffix}", ROWS)
    assert listing(tmp_path) == [target.name]


def test_json_rows_dumps_failure_keeps_the_old_file(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    """json.dumps raises (e.g. a value it cannot encode). Expected: old file kept, no temp."""
    target = tmp_path / "results.json"
    target.write_bytes(OLD)

    def dumps(*args: Any, **kwargs: Any) -> str:
        raise ValueError("Out of range float values are not JSON compliant")

    monkeypatch.setattr(json, "dumps", dumps)
    with pytest.raises(ValueError, match="JSON"):
        write_rows(target, ROWS)
    assert target.read_bytes() == OLD
    assert listing(tmp_path) == ["results.json"]


@pytest.mark.parametrize("error", [RuntimeError("crash"), disk_full()], ids=["crash", "enospc"])
def test_json_rows_failure_mid_write_keeps_the_old_file(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch, error: BaseException
) -> None:
    """Half the JSON text reaches the disk, then the write fails. Expected: old file kept."""
    target = tmp_path / "results.json"
    target.write_bytes(OLD)
    failing_write_text(monkeypatch, tmp_path, error)
    with pytest.raises(InputError if isinstance(error, OSError) else type(error)):
        write_rows(target, ROWS)
    assert target.read_bytes() == OLD
    assert listing(tmp_path) == ["results.json"]


def test_batch_out_xlsx_save_failure_keeps_the_old_file(
    folder: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    """`batch ... --out "Résultats ü.xlsx"`: the workbook is zipped in memory and then written;
    the write puts the start of the ZIP package on disk, then the disk fills. Expected: exit 2,
    one line naming the file and "cannot write"; the old file byte-identical; no temporary
    file."""
    (folder / "items.csv").write_text(ITEMS, encoding="utf-8")
    target = folder / "Résultats ü.xlsx"
    target.write_bytes(OLD)
    before = listing(folder)
    original = Path.write_bytes
    where = folder.resolve()

    def write_bytes(self: Path, data: bytes) -> int:
        if self.resolve().parent != where or not data.startswith(b"PK"):
            return original(self, data)
        original(self, data[:6])
        raise disk_full()

    monkeypatch.setattr(Path, "write_bytes", write_bytes)
    result = invoke("batch", "items.csv", "--out", str(target))
    one_line_error(result, "Résultats ü.xlsx", "cannot write")
    assert target.read_bytes() == OLD
    assert listing(folder) == before


def test_batch_out_json_dumps_failure_mid_list_keeps_the_old_file(
    folder: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    """`batch ... --out "Résultats ü.json"`: json.dumps raises on its last call of the run,
    the last row of the output, after the first row is written. (A first run counts the calls;
    the rows are encoded last for the output.) Expected: the old file byte-identical, no
    temporary file."""
    (folder / "items.csv").write_text(ITEMS, encoding="utf-8")
    real_dumps = json.dumps
    calls: list[int] = []

    def counting_dumps(data: Any, *args: Any, **kwargs: Any) -> str:
        calls.append(1)
        if len(calls) == fail_at:
            raise ValueError("Out of range float values are not JSON compliant")
        return real_dumps(data, *args, **kwargs)

    fail_at = 0
    monkeypatch.setattr(json, "dumps", counting_dumps)
    dry = invoke("batch", "items.csv", "--out", "dry run.json")
    assert dry.exit_code == 0, dry.output
    total = len(calls)
    assert total >= 2
    (folder / "dry run.json").unlink()
    target = folder / "Résultats ü.json"
    target.write_bytes(OLD)
    before = listing(folder)
    calls.clear()
    fail_at = total
    result = invoke("batch", "items.csv", "--out", str(target))
    assert isinstance(result.exception, ValueError), result.output
    assert target.read_bytes() == OLD
    assert listing(folder) == before


def test_objects_csv_disk_full_keeps_the_old_file(
    folder: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    """`objects --csv "objets ü.csv"` when the disk fills mid-write. Expected as above."""
    target = folder / "objets ü.csv"
    target.write_bytes(OLD)
    monkeypatch.setattr(pd.DataFrame, "to_csv", fail_after(b"id,name\nclaw-", disk_full()))
    result = invoke("objects", "--csv", "objets ü.csv")
    one_line_error(result, "objets ü.csv", "cannot write")
    assert target.read_bytes() == OLD
    assert listing(folder) == ["objets ü.csv"]


# ---------------------------------------------------------------------------------------------
# PNG and SVG: fall --plot (report figures) and zone --plot (site plan)
# ---------------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("name", "partial", "error"),
    [
        pytest.param("chute é.png", PNG_SIGNATURE + b"half", RuntimeError("Agg"), id="png-crash"),
        pytest.param("chute é.svg", b"<?xml version", disk_full(), id="svg-enospc"),
    ],
)
def test_fall_plot_failure_mid_write_keeps_the_old_file(
    folder: Path, monkeypatch: pytest.MonkeyPatch, name: str, partial: bytes, error: Exception
) -> None:
    """matplotlib's savefig writes some bytes, then raises. Expected: old figure kept, no
    temporary; a disk error is one line, exit 2."""
    from matplotlib.figure import Figure

    target = folder / name
    target.write_bytes(OLD)
    monkeypatch.setattr(Figure, "savefig", fail_after(partial, error))
    result = invoke("fall", *DENSE, "--height", "10 m", "--plot", name)
    if isinstance(error, OSError):
        one_line_error(result, name, "cannot write")
    else:
        assert isinstance(result.exception, type(error)), result.output
    assert target.read_bytes() == OLD
    assert listing(folder) == [name]


@pytest.mark.parametrize(
    ("name", "partial", "error"),
    [
        pytest.param("plan ö.svg", b"<?xml version", RuntimeError("svg backend"), id="svg"),
        pytest.param("plan ö.png", PNG_SIGNATURE, disk_full(), id="png-enospc"),
    ],
)
def test_zone_plot_failure_mid_write_keeps_the_old_file(
    folder: Path, monkeypatch: pytest.MonkeyPatch, name: str, partial: bytes, error: Exception
) -> None:
    """Site plan drawing (plan_plot.plot_plan) failing inside savefig. Expected as above."""
    from matplotlib.figure import Figure

    target = folder / name
    target.write_bytes(OLD)
    monkeypatch.setattr(Figure, "savefig", fail_after(partial, error))
    result = invoke("zone", *ZONE_FAST, "--height", "6 m", "--plot", name)
    if isinstance(error, OSError):
        one_line_error(result, name, "cannot write")
    else:
        assert isinstance(result.exception, type(error)), result.output
    assert target.read_bytes() == OLD
    assert listing(folder) == [name]


# ---------------------------------------------------------------------------------------------
# GeoJSON: zone --site ... --geojson
# ---------------------------------------------------------------------------------------------


def test_geojson_dumps_failure_keeps_the_old_file(
    folder: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    """json.dumps raising while the GeoJSON is encoded. Expected: old file kept, no temp."""
    (folder / "site.toml").write_text(SITE, encoding="utf-8")
    target = folder / "zone ü.geojson"
    target.write_bytes(OLD)
    real_dumps = json.dumps

    def dumps(data: Any, *args: Any, **kwargs: Any) -> str:
        if isinstance(data, dict) and data.get("type") == "FeatureCollection":
            raise TypeError("Object of type float32 is not JSON serializable")
        return real_dumps(data, *args, **kwargs)

    monkeypatch.setattr(json, "dumps", dumps)
    result = invoke("zone", *ZONE_FAST, "--site", "site.toml", "--geojson", target.name)
    assert isinstance(result.exception, TypeError), result.output
    assert target.read_bytes() == OLD
    assert listing(folder) == ["site.toml", "zone ü.geojson"]


def test_geojson_disk_full_mid_write_keeps_the_old_file(
    folder: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    """Half the GeoJSON text written, then ENOSPC. Expected: exit 2 one line, old file kept."""
    (folder / "site.toml").write_text(SITE, encoding="utf-8")
    target = folder / "zone ü.geojson"
    target.write_bytes(OLD)
    failing_write_text(monkeypatch, folder, disk_full())
    result = invoke("zone", *ZONE_FAST, "--site", "site.toml", "--geojson", target.name)
    one_line_error(result, "zone ü.geojson", "cannot write")
    assert target.read_bytes() == OLD
    assert listing(folder) == ["site.toml", "zone ü.geojson"]


# ---------------------------------------------------------------------------------------------
# PDF: report -o
# ---------------------------------------------------------------------------------------------


def test_report_build_failure_keeps_the_old_pdf(
    folder: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    """reportlab's build writes the start of a PDF, then the disk fills. Expected: exit 2, one
    line naming the file; the old PDF byte-identical; no temporary in the folder."""
    from reportlab.platypus import doctemplate

    (folder / "s.toml").write_text(SCENARIO, encoding="utf-8")
    target = folder / "rapport é.pdf"
    target.write_bytes(b"%PDF-1.4 " + OLD)

    def build(self: Any, flowables: Any, *args: Any, **kwargs: Any) -> None:
        Path(self.filename).write_bytes(b"%PDF-1.4\n%\xe2\xe3\xcf\xd3\n1 0 obj")
        raise disk_full()

    monkeypatch.setattr(doctemplate.BaseDocTemplate, "build", build)
    result = invoke("report", "s.toml", "-o", target.name)
    one_line_error(result, "rapport é.pdf", "cannot write")
    assert target.read_bytes() == b"%PDF-1.4 " + OLD
    assert listing(folder) == ["rapport é.pdf", "s.toml"]


# ---------------------------------------------------------------------------------------------
# Every CLI writer: the disk fills after the first 64 bytes written in the target folder
# ---------------------------------------------------------------------------------------------


class _FillingFile:
    """A file whose writes fail with ENOSPC once ``budget`` bytes (or characters) are written.

    ``fileno`` is refused so that no writer (PIL, for one) bypasses ``write`` with os.write.
    """

    def __init__(self, handle: Any, budget: int) -> None:
        self._handle = handle
        self._left = budget

    def write(self, data: Any) -> int:
        size = len(data)
        if size > self._left:
            self._handle.write(data[: self._left])
            self._left = 0
            raise disk_full()
        self._left -= size
        return self._handle.write(data)

    def writelines(self, lines: Any) -> None:
        for line in lines:
            self.write(line)

    def fileno(self) -> int:
        raise io.UnsupportedOperation("fileno")

    def __getattr__(self, name: str) -> Any:
        return getattr(self._handle, name)

    def __iter__(self) -> Iterator[Any]:
        return iter(self._handle)

    def __enter__(self) -> _FillingFile:
        return self

    def __exit__(self, *exc: object) -> None:
        self._handle.close()


def watch_writes(
    monkeypatch: pytest.MonkeyPatch, folder: Path, budget: int | None = None
) -> list[str]:
    """Record the names of files opened for writing in ``folder`` (returned list); with a
    ``budget``, each of them takes that many bytes, then fails with ENOSPC."""
    real_open = builtins.open
    where = folder.resolve()
    opened: list[str] = []

    def watching_open(file: Any, mode: str = "r", *args: Any, **kwargs: Any) -> Any:
        handle = real_open(file, mode, *args, **kwargs)
        writing = any(flag in mode for flag in "wax+")
        path_like = isinstance(file, str | os.PathLike)
        if writing and path_like and Path(os.fsdecode(file)).resolve().parent == where:
            opened.append(Path(os.fsdecode(file)).name)
            if budget is not None:
                return _FillingFile(handle, budget)
        return handle

    monkeypatch.setattr(builtins, "open", watching_open)
    monkeypatch.setattr(io, "open", watching_open)
    return opened


# (CLI arguments with {target}, the target's name, files the command needs)
CLI_WRITERS = {
    "batch-csv": (("batch", "items.csv", "--out", "{target}"), "Résultats ü.csv"),
    "batch-xlsx": (("batch", "items.csv", "--out", "{target}"), "Résultats ü.xlsx"),
    "batch-json": (("batch", "items.csv", "--out", "{target}"), "Résultats ü.json"),
    "objects-csv": (("objects", "--csv", "{target}"), "objets ü.csv"),
    "fall-png": (("fall", *DENSE, "--height", "10 m", "--plot", "{target}"), "chute é.png"),
    "fall-svg": (("fall", *DENSE, "--height", "10 m", "--plot", "{target}"), "chute é.svg"),
    "zone-png": (("zone", *ZONE_FAST, "--height", "6 m", "--plot", "{target}"), "plan ö.png"),
    "zone-svg": (("zone", *ZONE_FAST, "--site", "site.toml", "--plot", "{target}"), "plan ö.svg"),
    "zone-geojson": (
        ("zone", *ZONE_FAST, "--site", "site.toml", "--geojson", "{target}"),
        "zone ü.geojson",
    ),
    "report-pdf": (("report", "s.toml", "-o", "{target}"), "rapport é.pdf"),
}


def prepare(folder: Path) -> None:
    """The input files the CLI_WRITERS commands read."""
    (folder / "items.csv").write_text(ITEMS, encoding="utf-8")
    (folder / "site.toml").write_text(SITE, encoding="utf-8")
    (folder / "s.toml").write_text(SCENARIO, encoding="utf-8")


@pytest.mark.parametrize("case", list(CLI_WRITERS))
def test_every_writer_writes_a_temporary_in_the_folder_and_renames_it(
    case: str, folder: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    """Expected: the target itself is never opened for writing (an old file is replaced by a
    rename, os.replace, never truncated); a differently named file in the target folder is
    written instead and is gone afterwards; the old file is replaced by the new one."""
    args, name = CLI_WRITERS[case]
    prepare(folder)
    (folder / name).write_bytes(OLD)
    before = listing(folder)
    opened = watch_writes(monkeypatch, folder)
    result = invoke(*(a.replace("{target}", name) for a in args))
    assert result.exit_code == 0, result.output
    assert opened, "nothing was written in the target folder"
    assert name not in opened, opened
    assert listing(folder) == before  # the temporaries are gone
    assert (folder / name).read_bytes() != OLD


@pytest.mark.parametrize(
    "case",
    [case for case in CLI_WRITERS],
)
def test_disk_full_mid_write_keeps_the_old_file_for_every_writer(
    case: str, folder: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    """Each CLI output with the disk filling after 64 bytes. Expected: exit 2 with one line
    naming the file and "cannot write"; the old file byte-identical; no other file left in the
    folder (no temporary); and nothing left half-open that fails later, when garbage-collected
    (Python prints such errors as an "Exception ignored in" traceback after the message)."""
    args, name = CLI_WRITERS[case]
    prepare(folder)
    target = folder / name
    target.write_bytes(OLD)
    before = listing(folder)
    ignored: list[str] = []

    def unraisable(report: Any) -> None:
        # A ResourceWarning (a file left to the collector) is silent by default; an exception
        # in a finaliser is printed ("Exception ignored in ...").
        if not issubclass(report.exc_type, ResourceWarning):
            ignored.append(f"{report.exc_type.__name__}: {report.exc_value}")

    monkeypatch.setattr(sys, "unraisablehook", unraisable)
    watch_writes(monkeypatch, folder, budget=64)
    result = invoke(*(a.replace("{target}", name) for a in args))
    one_line_error(result, name, "cannot write")
    del result  # its traceback keeps the failed writer's objects alive
    gc.collect()
    assert target.read_bytes() == OLD
    assert listing(folder) == before
    assert ignored == []


# ---------------------------------------------------------------------------------------------
# demo: the scenario and item list it copies into the folder
# ---------------------------------------------------------------------------------------------


def test_demo_copy_failure_keeps_the_old_scenario(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    """Expected: like every other output, the demo's copies are whole or absent: an error
    mid-copy leaves the old scenario.toml byte-identical and no temporary file. (The old file
    is the demo's own copy from an earlier run: an edited one is never overwritten, below.)"""
    from dropcalc.resources import data_path

    shipped = (data_path("templates") / "demo" / "scenario.toml").read_bytes()
    out = tmp_path / "démo x"
    out.mkdir()
    (out / "scenario.toml").write_bytes(shipped)

    def copyfile(source: Any, destination: Any, **kwargs: Any) -> Any:
        data = Path(source).read_bytes()
        Path(destination).write_bytes(data[: len(data) // 2])
        raise disk_full()

    monkeypatch.setattr(shutil, "copyfile", copyfile)
    result = invoke("demo", "--out", str(out))
    assert result.exit_code != 0
    assert (out / "scenario.toml").read_bytes() == shipped
    assert listing(out) == ["scenario.toml"]


@pytest.mark.parametrize("name", ["scenario.toml", "items.csv"])
def test_demo_never_overwrites_an_edited_input(tmp_path: Path, name: str) -> None:
    """Expected: a user who edited the demo's scenario or item list in its folder keeps the
    edits: the demo refuses (exit 2, one line naming the file and what to do) and writes
    nothing."""
    out = tmp_path / "demo"
    out.mkdir()
    (out / name).write_bytes(OLD)
    result = invoke("demo", "--out", str(out))
    assert result.exit_code == 2, result.output
    assert name in result.stderr
    assert "dropcalc report" in result.stderr
    assert len(result.stderr.strip().splitlines()) == 1
    assert (out / name).read_bytes() == OLD
    assert listing(out) == [name]


# ---------------------------------------------------------------------------------------------
# Names with spaces and non-ASCII letters, and the mode of the written files
# ---------------------------------------------------------------------------------------------


def check_written(path: Path, umask: int) -> None:
    """The file exists, is not empty, has mode 0666 & ~umask, and no temporary is beside it."""
    assert path.is_file(), sorted(p.name for p in path.parent.iterdir())
    assert path.stat().st_size > 0
    assert mode(path) == 0o666 & ~umask, oct(mode(path))
    assert not [p.name for p in path.parent.iterdir() if p.name.endswith(".tmp")]


def test_batch_out_to_unusual_names(folder: Path, umask_022: int) -> None:
    """`batch items.csv --out "x y é/Résultats ü.xlsx"` (also .csv and .json). Expected: each
    file written, readable (openpyxl, pandas, json), mode 0644 under umask 022."""
    (folder / "items.csv").write_text(ITEMS, encoding="utf-8")
    for name in ("Résultats ü.xlsx", "Résultats ü.csv", "Résultats ü.json"):
        target = folder / name
        result = invoke("batch", "items.csv", "--out", str(target))
        assert result.exit_code == 0, result.output
        check_written(target, umask_022)
    assert len(pd.read_excel(folder / "Résultats ü.xlsx", engine="openpyxl")) == 2
    assert len(pd.read_csv(folder / "Résultats ü.csv")) == 2
    assert len(json.loads((folder / "Résultats ü.json").read_text(encoding="utf-8"))) == 2


def test_objects_csv_to_an_unusual_name(folder: Path, umask_022: int) -> None:
    """`objects --csv "objets ü.csv"`. Expected: a CSV with an id column, mode 0644."""
    result = invoke("objects", "--csv", "objets ü.csv")
    assert result.exit_code == 0, result.output
    check_written(folder / "objets ü.csv", umask_022)
    assert "id" in pd.read_csv(folder / "objets ü.csv").columns


@pytest.mark.parametrize("name", ["chute é.png", "chute é.svg"])
def test_fall_plot_to_an_unusual_name(folder: Path, umask_022: int, name: str) -> None:
    """`fall ... --plot "chute é.png"` (and .svg). Expected: PNG signature or an SVG root."""
    result = invoke("fall", *DENSE, "--height", "10 m", "--plot", name)
    assert result.exit_code == 0, result.output
    check_written(folder / name, umask_022)
    head = (folder / name).read_bytes()[:400]
    assert head.startswith(PNG_SIGNATURE) if name.endswith(".png") else b"<svg" in head


def test_zone_plot_and_geojson_to_unusual_names(folder: Path, umask_022: int) -> None:
    """`zone --site site.toml --plot "plan ö.svg" --geojson "zone ü.geojson"`. Expected: an SVG
    and a GeoJSON FeatureCollection, both mode 0644."""
    (folder / "site.toml").write_text(SITE, encoding="utf-8")
    result = invoke(
        "zone", *ZONE_FAST, "--site", "site.toml", "--plot", "plan ö.svg",
        "--geojson", "zone ü.geojson",
    )  # fmt: skip
    assert result.exit_code == 0, result.output
    check_written(folder / "plan ö.svg", umask_022)
    check_written(folder / "zone ü.geojson", umask_022)
    assert b"<svg" in (folder / "plan ö.svg").read_bytes()[:400]
    geojson = json.loads((folder / "zone ü.geojson").read_text(encoding="utf-8"))
    assert geojson["type"] == "FeatureCollection"


def test_zone_plot_png_without_a_site_to_an_unusual_name(folder: Path, umask_022: int) -> None:
    """`zone --height 6 m --plot "plan ö.png"` (no site: a stretch of edge). Expected: a PNG,
    mode 0644."""
    result = invoke("zone", *ZONE_FAST, "--height", "6 m", "--plot", "plan ö.png")
    assert result.exit_code == 0, result.output
    check_written(folder / "plan ö.png", umask_022)
    assert (folder / "plan ö.png").read_bytes().startswith(PNG_SIGNATURE)


def test_report_to_an_unusual_name(folder: Path, umask_022: int) -> None:
    """`report s.toml -o "rapport é.pdf"`. Expected: a PDF readable by pypdf, mode 0644, and
    the summary naming the file."""
    from pypdf import PdfReader

    (folder / "s.toml").write_text(SCENARIO, encoding="utf-8")
    result = invoke("report", "s.toml", "-o", "rapport é.pdf")
    assert result.exit_code == 0, result.output
    assert "rapport é.pdf" in result.stdout
    target = folder / "rapport é.pdf"
    check_written(target, umask_022)
    assert target.read_bytes().startswith(b"%PDF-")
    assert len(PdfReader(target).pages) >= 1
    assert listing(folder) == ["rapport é.pdf", "s.toml"]
