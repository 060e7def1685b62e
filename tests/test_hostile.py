"""Hostile and careless input: a clear refusal or an answer, never a hang, a traceback or a leak.

Each case here hung, exhausted memory, raised a traceback or leaked before it was fixed; the
test pins the refusal (one line naming the key, exit code 2) or the answer.
"""

from __future__ import annotations

import json
import os
from pathlib import Path
from typing import Any

import numpy as np
import pytest
from typer.testing import CliRunner

from dropcalc.cli import app
from dropcalc.errors import InputError
from dropcalc.io.scenario import load_scenario
from dropcalc.model.limits import (
    EDGE_RESOLUTION,
    MAX_LIST_ROWS,
    MAX_OBJECTS,
    MAX_TEXT_FILE_BYTES,
)
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


# --------------------------------------------------------------------------------------------
# Declared limits, checked before any work


def _fifo(folder: Path) -> Path:
    fifo = folder / "pipe.toml"
    os.mkfifo(fifo)
    return fifo


@pytest.mark.parametrize(
    ("args", "words"),
    [
        (("report", "/dev/zero"), ("scenario /dev/zero", "not a regular file")),
        (
            ("zone", "--site", "/dev/zero", "--object", "claw-hammer-16oz"),
            ("site file /dev/zero", "not a regular file"),
        ),
        (
            ("zone", "--items", "/dev/zero", "--height", "5"),
            ("object list /dev/zero", "not a regular file"),
        ),
        (("objects", "--library", "/dev/zero"), ("object file /dev/zero", "not a regular file")),
    ],
)
def test_special_files_are_refused_as_not_regular(args: tuple[str, ...], words: Any) -> None:
    one_error_line(invoke(*args), *words)


def test_a_fifo_is_not_a_regular_file_rather_than_missing(tmp_path: Path) -> None:
    one_error_line(invoke("report", str(_fifo(tmp_path))), "not a regular file")


def test_batch_policy_from_dev_zero_is_refused(tmp_path: Path) -> None:
    items = tmp_path / "items.csv"
    items.write_text("id\nclaw-hammer-16oz\n", encoding="utf-8")
    result = invoke("batch", str(items), "--height", "5", "--policy", "/dev/zero")
    one_error_line(result, "policy file /dev/zero", "not a regular file")


def test_a_rules_file_on_dev_zero_names_the_key(tmp_path: Path) -> None:
    text = SCENARIO.replace("precision = 0.2", 'precision = 0.2\nrules_file = "/dev/zero"')
    with pytest.raises(InputError, match=r"line 6: policy.rules_file: .*not a regular file"):
        load_scenario(write_scenario(tmp_path, text))


def test_a_file_over_the_size_limit_is_refused_before_reading(tmp_path: Path) -> None:
    big = tmp_path / "big.toml"
    with big.open("wb") as handle:  # sparse: no disk used
        handle.truncate(MAX_TEXT_FILE_BYTES + 1)
    one_error_line(invoke("report", str(big)), "big.toml", f"at most {MAX_TEXT_FILE_BYTES:,}")


def _workbook(path: Path, rows: list[list[Any]]) -> Path:
    from openpyxl import Workbook

    book = Workbook()
    sheet = book.active
    for row in rows:
        sheet.append(row)
    book.save(path)
    return path


def _declare_dimension(path: Path, ref: str) -> None:
    """Rewrite the first sheet's <dimension ref=...> as a hostile file would."""
    import re
    import zipfile

    with zipfile.ZipFile(path) as archive:
        members = {info.filename: archive.read(info) for info in archive.infolist()}
    name = "xl/worksheets/sheet1.xml"
    members[name] = re.sub(rb'<dimension ref="[^"]*"', f'<dimension ref="{ref}"'.encode(),
                           members[name])  # fmt: skip
    with zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as archive:
        for member, data in members.items():
            archive.writestr(member, data)


def test_a_sheet_declaring_the_whole_grid_is_refused(tmp_path: Path) -> None:
    book = _workbook(tmp_path / "items.xlsx", [["id"], ["claw-hammer-16oz"]])
    _declare_dimension(book, "A1:XFD1048576")
    one_error_line(invoke("zone", "--items", str(book), "--height", "5"), "A1:XFD1048576")
    one_error_line(invoke("batch", str(book), "--height", "5"), "A1:XFD1048576")


def test_a_list_over_the_row_limit_is_refused(tmp_path: Path) -> None:
    items = tmp_path / "items.csv"
    items.write_text("id\n" + "claw-hammer-16oz\n" * (MAX_LIST_ROWS + 1), encoding="utf-8")
    one_error_line(invoke("batch", str(items), "--height", "5"), f"{MAX_LIST_ROWS:,}")


@pytest.mark.parametrize("header", ["mass,mass", "Mass,mass"])
def test_duplicate_headers_are_refused_in_csv(tmp_path: Path, header: str) -> None:
    items = tmp_path / "items.csv"
    items.write_text(f"label,{header},drag_area\nx,1 kg,50 kg,0.01\n", encoding="utf-8")
    one_error_line(invoke("batch", str(items), "--height", "5"), "'mass' appears twice")
    one_error_line(invoke("zone", "--items", str(items), "--height", "5"), "appears twice")


def test_duplicate_headers_are_refused_in_xlsx(tmp_path: Path) -> None:
    book = _workbook(
        tmp_path / "items.xlsx", [["label", "mass", "mass", "drag_area"], ["x", "1", "50", "0.01"]]
    )
    one_error_line(invoke("batch", str(book), "--height", "5"), "'mass' appears twice")
    one_error_line(invoke("zone", "--items", str(book), "--height", "5"), "appears twice")


def test_duplicate_headers_are_refused_in_a_library_csv(tmp_path: Path) -> None:
    from dropcalc.io.library import load_library

    library = tmp_path / "own.csv"
    library.write_text("id,name,name\nx,a,b\n", encoding="utf-8")
    with pytest.raises(InputError, match=r'row 1: column "name" appears twice'):
        load_library(library)


def test_too_many_object_tables_are_refused_by_count(tmp_path: Path) -> None:
    objects = '[[object]]\nid = "combination-spanner-19mm"\n' * MAX_OBJECTS
    # Named at the first table over the limit: BASE's object is line 13, each added one 2 lines.
    line = 13 + 2 * MAX_OBJECTS
    with pytest.raises(
        InputError, match=rf"line {line}: object\[{MAX_OBJECTS + 1}\]: {MAX_OBJECTS + 1:,} objects"
    ):
        load_scenario(write_scenario(tmp_path, SCENARIO + objects))


def test_a_long_title_and_a_long_name_are_refused_with_their_key(tmp_path: Path) -> None:
    title = SCENARIO.replace("Test job", "word " * 20_000)
    with pytest.raises(InputError, match=r"line 2: job.title: 100,000 characters; at most 200"):
        load_scenario(write_scenario(tmp_path, title))
    name = SCENARIO.replace('name = "Roof"', f'name = "{"x" * 5000}"')
    with pytest.raises(InputError, match=r"line 8: work_area\[1\].name: 5,000 characters"):
        load_scenario(write_scenario(tmp_path, name))


def test_coordinates_beyond_the_site_are_refused(tmp_path: Path) -> None:
    text = SCENARIO.replace("[[0, 0], [10, 0]]", "[[0, 0], [1e300, 0]]")
    with pytest.raises(InputError, match=r"line 10: work_area\[1\].edge\[1\].points.*10,000 m"):
        load_scenario(write_scenario(tmp_path, text))


@pytest.mark.parametrize(
    ("old", "new", "words"),
    [
        ("  [[work_area.edge]]\n  points = [[0, 0], [10, 0]]\n  height = \"10 m\"\n",
         "edge = [5]\n", r"work_area\[1\].edge: expected \[\[work_area.edge\]\] tables"),
        ('title = "Test job"', "title = " + "[" * 5000, "nested too deep"),
    ],
)  # fmt: skip
def test_malformed_structure_is_a_message_not_a_traceback(
    tmp_path: Path, old: str, new: str, words: str
) -> None:
    assert old in SCENARIO
    with pytest.raises(InputError, match=words):
        load_scenario(write_scenario(tmp_path, SCENARIO.replace(old, new)))


# --------------------------------------------------------------------------------------------
# Many-point edges


def test_a_many_point_circle_is_merged_within_the_resolution() -> None:
    from dropcalc.analysis.plan import WorkEdge

    n, radius = 10_000, 20.0
    angles = np.linspace(0.0, 2.0 * np.pi, n, endpoint=False)
    points = [(radius * np.cos(a), radius * np.sin(a)) for a in angles]
    edge = WorkEdge("tank rim", points, 15.0)
    # A chord of a circle departs from it by its sagitta R (1 - cos(theta/2)); with at most
    # EDGE_RESOLUTION of departure a 20 m circle needs at least pi / acos(1 - 0.25/20) = 28.
    assert 28 <= len(edge.points) - 1 <= 64
    assert 0.0 < edge.merged_by <= EDGE_RESOLUTION
    # Every given point stays within the resolution of the merged edge (shapely's own measure).
    from shapely.geometry import LineString, MultiPoint

    assert LineString(edge.points).distance(MultiPoint(points)) < 1e-9
    assert LineString(edge.points).hausdorff_distance(LineString(points)) <= EDGE_RESOLUTION


def test_a_few_point_edge_is_kept_as_given() -> None:
    from dropcalc.analysis.plan import WorkEdge

    points = ((0.0, 0.0), (10.0, 0.0), (10.0, 10.0), (20.0, 10.0))
    edge = WorkEdge("parapet", points, 8.0)
    assert edge.points == points
    assert edge.merged_by == 0.0


# --------------------------------------------------------------------------------------------
# Text is text


MARKUP = ["north $\\frac{1}$ eave", "cost $x^$ tile", "$$", "a $\\undefined$ b"]


@pytest.mark.parametrize("name", MARKUP)
def test_dollar_names_are_drawn_literally_in_every_figure(tmp_path: Path, name: str) -> None:
    from shapely.geometry import Point

    from dropcalc.analysis.plan import Site, WorkEdge, exclusion_area
    from dropcalc.present.plan_plot import plot_plan
    from dropcalc.report.figures import EnergyCurve, SideViewCase, energy_height, side_view

    site = Site(outline=None, edges=(WorkEdge(name, ((0.0, 0.0), (3.0, 0.0)), 10.0),))
    area = exclusion_area(site, [(0, 0, Point(0, 0).buffer(5.0))], margin=1.0)
    plot_plan(area, site, None, tmp_path / "plan.png", title=name, wind_label=name)
    case = SideViewCase(name, 10.0, (0.0, 0.0, 0.0), 0.01)
    side_view(tmp_path / "side.svg", [case], 10.0, title=name)
    energy_height(tmp_path / "energy.png", [EnergyCurve(name, 1.0, 0.01, 9.81, None)],
                  [(name, 49.0)], 10.0, title=name)  # fmt: skip
    # The text went to the SVG as typed (matplotlib writes it as glyph paths and keeps it in
    # no element, so look for the absence of failure and a written file of each kind).
    assert sorted(p.name for p in tmp_path.iterdir()) == ["energy.png", "plan.png", "side.svg"]


# --------------------------------------------------------------------------------------------
# Security: formulas, escape sequences, file references


def test_a_formula_after_a_separator_is_neutralised_and_the_cell_quoted(tmp_path: Path) -> None:
    import csv

    hostile = "Tile;=cmd|' /C calc'!A0;"
    items = tmp_path / "items.csv"
    items.write_text(f'label,mass,drag_area\n"{hostile}",1 kg,0.01\n', encoding="utf-8")
    out = tmp_path / "rows.csv"
    result = invoke("batch", str(items), "--height", "5 m", "--out", str(out))
    assert result.exit_code == 0, result.output
    text = out.read_text(encoding="utf-8")
    assert "\"Tile;'=cmd|' /C calc'!A0;\"" in text  # quoted whole, formula start defused
    # A spreadsheet splitting on ";" gets no cell that starts with a formula character.
    for line in text.splitlines():
        for cell in line.split(";"):
            assert not cell.lstrip('"').startswith(("=", "+", "-", "@")), cell
    with out.open(encoding="utf-8", newline="") as handle:
        (record,) = list(csv.DictReader(handle))
    assert record["label"] == "Tile;'=cmd|' /C calc'!A0;"


def test_control_characters_are_removed_from_xlsx_output(tmp_path: Path) -> None:
    from openpyxl import load_workbook

    items = tmp_path / "items.csv"
    items.write_text("label,mass,drag_area\nA\x01B,1 kg,0.01\n", encoding="utf-8")
    out = tmp_path / "rows.xlsx"
    result = invoke("batch", str(items), "--height", "5 m", "--out", str(out))
    assert result.exit_code == 0, result.output
    sheet = load_workbook(out).active
    header = [cell.value for cell in sheet[1]]
    assert sheet.cell(2, header.index("label") + 1).value == "AB"


def test_escape_sequences_are_not_sent_to_the_terminal(tmp_path: Path) -> None:
    items = tmp_path / "items.csv"
    items.write_text(
        "id,label\nbrick\x1b]0;PWNED-TITLE\x07,x\ncombination-spanner-19mm,ok \x1b[31mred\n",
        encoding="utf-8",
    )
    result = invoke("batch", str(items), "--height", "5 m")
    assert result.exit_code == 1, result.output
    assert "\x1b" not in result.stdout
    assert "\x1b" not in result.stderr
    assert "\x07" not in result.stderr
    assert "brick\\x1b]0;PWNED-TITLE\\x07" in result.stderr  # shown, escaped


@pytest.mark.parametrize(
    ("reference", "key"),
    [('objects_file = "/etc/passwd"\n', "line 1: objects_file"),
     ('[policy]\nrules_file = "/etc/passwd"\n', "line 2: policy.rules_file")],
)  # fmt: skip
def test_a_scenario_without_file_references_opens_no_file(
    tmp_path: Path, reference: str, key: str, monkeypatch: pytest.MonkeyPatch
) -> None:
    text = reference + SCENARIO.replace("[policy]\nprecision = 0.2\n", "")
    path = write_scenario(tmp_path, text)
    opened: list[str] = []
    real_open = Path.open

    def spy(self: Path, *args: Any, **kwargs: Any) -> Any:
        opened.append(str(self))
        return real_open(self, *args, **kwargs)

    monkeypatch.setattr(Path, "open", spy)
    with pytest.raises(InputError, match=rf"{key}: this scenario may not name files"):
        load_scenario(path, allow_file_references=False)
    assert "/etc/passwd" not in opened


# --------------------------------------------------------------------------------------------
# Signals: temporary files and folders are removed

_SLOW_WRITE = """
import signal, sys, time
from pathlib import Path
from dropcalc.cli import stop_on_signal
from dropcalc.io.atomic import write_atomic

signal.signal(signal.SIGTERM, stop_on_signal)

def slow(temporary: Path) -> None:
    with temporary.open("w") as handle:
        handle.write("half a file")
        handle.flush()
        time.sleep(60)

write_atomic(Path(sys.argv[1]), slow)
"""


def _wait_for(condition: Any, seconds: float = 60.0) -> None:
    import time

    end = time.monotonic() + seconds
    while not condition():
        assert time.monotonic() < end, "the child never got there"
        time.sleep(0.02)


@pytest.mark.parametrize("signal_name", ["SIGTERM", "SIGINT"])
def test_a_signal_mid_write_leaves_the_old_file_and_no_temporary(
    tmp_path: Path, signal_name: str
) -> None:
    import signal
    import subprocess
    import sys

    target = tmp_path / "rows.csv"
    target.write_text("the old file\n", encoding="utf-8")
    with subprocess.Popen([sys.executable, "-c", _SLOW_WRITE, str(target)],
                          stderr=subprocess.PIPE) as child:  # fmt: skip
        try:
            _wait_for(lambda: len(list(tmp_path.iterdir())) == 2)  # the temporary is written
            child.send_signal(getattr(signal, signal_name))
            _, stderr = child.communicate(timeout=60)
        finally:
            child.kill()
    # SIGTERM: the shell's 143; SIGINT: KeyboardInterrupt, which Python ends with the signal.
    assert child.returncode in (128 + signal.SIGTERM, -signal.SIGINT), stderr.decode()
    assert [p.name for p in tmp_path.iterdir()] == ["rows.csv"]
    assert target.read_text(encoding="utf-8") == "the old file\n"


def test_sigterm_during_a_batch_removes_its_chunk_folder(tmp_path: Path) -> None:
    import signal
    import subprocess
    import sys

    temporary = tmp_path / "tmp"
    temporary.mkdir()
    items = tmp_path / "items.csv"
    items.write_text("id\n" + "claw-hammer-16oz\n" * 30_000, encoding="utf-8")
    out = tmp_path / "rows.json"
    env = {**os.environ, "TMPDIR": str(temporary)}
    command = [sys.executable, "-m", "dropcalc", "batch", str(items), "--height", "5",
               "--out", str(out)]  # fmt: skip
    with subprocess.Popen(
        command, env=env, stderr=subprocess.PIPE, stdout=subprocess.PIPE
    ) as child:
        try:
            _wait_for(lambda: any(temporary.iterdir()))  # the chunk folder exists: mid-run
            child.send_signal(signal.SIGTERM)
            _, stderr = child.communicate(timeout=60)
        finally:
            child.kill()
    assert child.returncode == 128 + signal.SIGTERM, stderr.decode()
    assert list(temporary.iterdir()) == []
    assert sorted(p.name for p in tmp_path.iterdir()) == ["items.csv", "tmp"]


# --------------------------------------------------------------------------------------------
# Numbers


def test_zone_refuses_a_height_below_a_hands_drop_like_fall() -> None:
    one_error_line(
        invoke("zone", "--height", "1e-320", "--object", "claw-hammer-16oz"),
        "--height",
        "between 0.01 and 5000 m",
    )


def test_every_distance_in_the_zone_text_is_rounded_up() -> None:
    from dropcalc.texts import keep_clear_text

    args = ("zone", "--height", "30 m", "--object", "claw-hammer-16oz", "--object",
            "brick-uk-standard", "--wind", "8 m/s", "--precision", "0.1")  # fmt: skip
    as_json = invoke(*args, "--json")
    assert as_json.exit_code == 0, as_json.output
    data = json.loads(as_json.stdout)
    lines = [" ".join(line.split()) for line in invoke(*args).stdout.splitlines()]
    assert f"Radius at confidence {keep_clear_text(data['radius_m'])}" in lines
    worst = keep_clear_text(data["worst_case_radius_m"])
    assert any(line.startswith(f"Worst case (envelope) {worst} (") for line in lines), lines
    for obj in data["objects"]:
        shown = (
            f"{keep_clear_text(obj['radius_m'])} / {keep_clear_text(obj['worst_case_radius_m'])}"
        )
        assert any(line.endswith(shown) for line in lines), (shown, lines)


def test_a_streamed_workbook_without_a_declared_range_is_counted_before_loading(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    from openpyxl import Workbook

    import dropcalc.io.items as batch  # the list reader

    monkeypatch.setattr(batch, "MAX_LIST_ROWS", 50)  # the real limit takes a minute to write
    book = Workbook(write_only=True)  # writes no <dimension> element
    sheet = book.create_sheet()
    sheet.append(["id"])
    for _ in range(60):
        sheet.append(["claw-hammer-16oz"])
    book.save(tmp_path / "items.xlsx")
    with pytest.raises(InputError, match=r"items.xlsx: a sheet holds 60 rows or more; at most 50"):
        batch.check_xlsx(tmp_path / "items.xlsx")


def test_a_site_file_edge_name_over_the_limit_is_refused(tmp_path: Path) -> None:
    site = tmp_path / "site.toml"
    site.write_text(
        f'[[edge]]\nname = "{"n" * 500}"\npoints = [[0, 0], [10, 0]]\nheight = "15 m"\n',
        encoding="utf-8",
    )
    result = invoke("zone", "--site", str(site), "--object", "claw-hammer-16oz")
    one_error_line(result, "edge[1]: work edge name: 500 characters; at most 120")
