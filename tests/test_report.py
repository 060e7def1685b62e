"""``dropcalc report`` and ``dropcalc demo``: the PDF agrees with ``zone`` and ``batch``.

The report is read back with pypdf, a PDF parser this project did not write. Its numbers are
checked against the ``dropcalc zone --json`` and ``dropcalc batch --json`` output for the same
inputs (same objects, edges, wind, air, ground, confidence, margin, precision and seed), which
the report is documented to reuse (``dropcalc/report/build.py``). Distances to keep clear are
rounded up to 0.1 m on page 1 (``docs/scenario.md``, ``dropcalc/report/pdf.py``); other table
numbers are printed to three significant figures, so they are compared to half a unit in the
third figure. GeoJSON files are checked against RFC 7946 (sec. 3.1.6 linear rings closed,
sec. 3.3 FeatureCollection, sec. 4 longitude before latitude).
"""

from __future__ import annotations

import csv
import json
import math
import re
import tomllib
from collections.abc import Callable
from pathlib import Path
from typing import Any

import pytest
from pypdf import PdfReader
from typer.testing import CliRunner

from dropcalc.cli import app
from dropcalc.errors import InputError

runner = CliRunner()
ENV = {"COLUMNS": "100", "FORCE_COLOR": None, "TERM": "dumb"}
REPO = Path(__file__).resolve().parents[1]

TITLE = "Façade <B> & Dachrand – Zürich"
AREA_NAME = "Roof <north> & east"
SPANNER = "Schlüssel <19> & Co"
BRICK = "Ziegel – Ø"

#: One work area, two edges (12 m and 9 m), two library objects; cheap Monte Carlo.
SCENARIO = f"""\
[job]
title = "{TITLE}"
reference = "R&D <7>"

[site]
elevation = "300 m"
ground = "grass"

[wind]
speed = "6 m/s"
terrain = "suburban"

[policy]
confidence = 0.95
margin = "1.5 m"
precision = 0.2
seed = 3

[[work_area]]
name = "{AREA_NAME}"
release = "push"
release_speed = "1 m/s"
  [[work_area.edge]]
  name = "north"
  points = [[0, 10], [20, 10]]
  height = "12 m"
  [[work_area.edge]]
  name = "east"
  points = [[20, 10], [20, 0]]
  height = "9 m"

[[object]]
id = "combination-spanner-19mm"
label = "{SPANNER}"

[[object]]
id = "brick-uk-standard"
label = "{BRICK}"
"""

#: The same work area as a ``dropcalc zone --site`` file.
SITE = """\
[[edge]]
name = "north"
points = [[0, 10], [20, 10]]
height = "12 m"

[[edge]]
name = "east"
points = [[20, 10], [20, 0]]
height = "9 m"
"""

#: The same scenario's settings as ``dropcalc zone`` options.
ZONE_OPTIONS = (
    "--object", "combination-spanner-19mm", "--object", "brick-uk-standard",
    "--wind", "6 m/s", "--terrain", "suburban", "--ground", "grass", "--elevation", "300 m",
    "--confidence", "0.95", "--margin", "1.5 m", "--precision", "0.2", "--seed", "3",
    "--release", "push", "--release-speed", "1 m/s",
)  # fmt: skip

#: Still air, one object: the cheapest scenario that reports.
CHEAP = """\
[job]
title = "Cheap"

[policy]
precision = 0.2

[[work_area]]
  [[work_area.edge]]
  points = [[0, 0], [10, 0]]
  height = "6 m"

[[object]]
id = "combination-spanner-19mm"
"""


def invoke(*args: str) -> Any:
    """Run ``dropcalc ARGS`` in-process; stdout and stderr stay separate on the result."""
    return runner.invoke(app, list(args), env=ENV)


def json_of(*args: str) -> Any:
    result = invoke(*args, "--json")
    assert result.exit_code == 0, result.output
    return json.loads(result.stdout)


def flat(text: str) -> str:
    return re.sub(r"\s+", " ", text).strip()


def page_texts(path: Path) -> list[str]:
    return [flat(page.extract_text()) for page in PdfReader(path).pages]


def keep_clear(radius: float) -> str:
    """Written out from the rule "rounded up to 0.1 m" (not the code's own formatter)."""
    return f"{math.ceil(round(radius * 10, 6)) / 10:.1f}"


def three_figures(shown: float, value: float) -> bool:
    """``shown`` is ``value`` printed to three significant figures."""
    if value == 0:
        return shown == 0
    half_unit = 0.5 * 10 ** (math.floor(math.log10(abs(value))) - 2)
    return abs(shown - value) <= half_unit * (1 + 1e-9)


def numbers(text: str) -> list[float]:
    return [float(n) for n in re.findall(r"(?<![\w.])\d+(?:\.\d+)?", text)]


@pytest.fixture(scope="module")
def job(tmp_path_factory: pytest.TempPathFactory) -> dict[str, Any]:
    """The report, the zone and the batch for the same inputs, run once for this module."""
    folder = tmp_path_factory.mktemp("job")
    scenario = folder / "scenario.toml"
    scenario.write_text(SCENARIO, encoding="utf-8")
    (folder / "site.toml").write_text(SITE, encoding="utf-8")
    (folder / "items.csv").write_text(
        f"id,label\ncombination-spanner-19mm,{SPANNER}\nbrick-uk-standard,{BRICK}\n",
        encoding="utf-8",
    )
    pdf = folder / "report.pdf"
    summary = json_of("report", str(scenario), "-o", str(pdf))
    zone = json_of("zone", "--site", str(folder / "site.toml"), *ZONE_OPTIONS)
    batch = json_of(
        "batch", str(folder / "items.csv"), "--height", "12 m", "--wind", "6 m/s",
        "--terrain", "suburban", "--elevation", "300 m", "--release", "push",
        "--release-speed", "1 m/s",
    )  # fmt: skip
    return {"summary": summary, "zone": zone, "batch": batch, "pdf": pdf, "folder": folder}


def test_report_numbers_equal_zone_json(job: dict[str, Any]) -> None:
    (area,) = job["summary"]["work_areas"]
    zone = job["zone"]
    assert area["radius_m"] == pytest.approx(zone["site_radius_m"], rel=0, abs=1e-9)
    assert area["worst_case_radius_m"] == pytest.approx(
        zone["site_worst_case_radius_m"], rel=0, abs=1e-9
    )
    assert area["area_m2"] == pytest.approx(zone["area_m2"], rel=0, abs=1e-9)
    assert area["max_distance_m"] == pytest.approx(
        zone["area_max_distance_from_edge_m"], rel=0, abs=1e-9
    )
    assert area["drift_m"] == pytest.approx(zone["drift_m"], rel=0, abs=1e-9)
    assert area["scatter_m"] == pytest.approx(zone["scatter_m"], rel=0, abs=1e-9)
    assert area["margin_m"] == zone["margin_m"] == 1.5
    assert job["summary"]["confidence"] == zone["confidence"] == 0.95


def test_every_report_json_key_is_in_the_glossary(
    job: dict[str, Any], unlisted_keys: Callable[[Any], list[str]]
) -> None:
    assert unlisted_keys(job["summary"]) == []


def test_page_one_distance_is_the_radius_rounded_up(job: dict[str, Any]) -> None:
    (area,) = job["summary"]["work_areas"]
    first = page_texts(job["pdf"])[0]
    assert f"Keep {keep_clear(job['zone']['site_radius_m'])} m clear" in first
    assert f"Worst case {keep_clear(area['worst_case_radius_m'])} m" in first
    assert "95 % of simulated drops" in first.replace("\u00a0", " ")


def _object_table(texts: list[str]) -> str:
    whole = " ".join(texts)
    start = whole.index("numbered as in the legend below the table.")
    end = whole.index("Reference levels used", start)
    # When the legend starts a new page, the page's footer and the next header come between.
    footer = re.search(r"page \d+ of \d+", whole[start:end])
    return whole[start : start + footer.start()] if footer else whole[start:end]


def _legend(texts: list[str]) -> dict[str, int]:
    whole = " ".join(texts)
    legend = whole[whole.index("Reference levels used") :]
    return {key: int(n) for n, key in re.findall(r"\b(\d) ([a-z][a-z0-9]*(?:-[a-z0-9]+)+)", legend)}


def test_object_table_equals_batch_json(job: dict[str, Any]) -> None:
    texts = page_texts(job["pdf"])
    table = _object_table(texts)
    legend = _legend(texts)
    assert len(legend) == 5, legend  # five default levels (docs/scenario.md)
    rows = {row["label"]: row for row in job["batch"]}
    assert set(rows) == {SPANNER, BRICK}
    positions = sorted((table.index(label), label) for label in rows)
    for i, (start, label) in enumerate(positions):
        end = positions[i + 1][0] if i + 1 < len(positions) else len(table)
        cells = numbers(table[start + len(label) : end])
        row = rows[label]
        assert row["release_height_m"] == 12.0  # the highest edge
        expected = [
            row["quantity"], row["mass_kg"], row["drag_area_min_m2"], row["drag_area_max_m2"],
            row["terminal_speed_max_m_s"], row["impact_speed_max_m_s"],
            row["impact_energy_max_j"],
        ]  # fmt: skip
        if row["energy_per_contact_area_j_cm2"] is not None:
            expected.append(row["energy_per_contact_area_j_cm2"])
        head = cells[: len(expected)]
        assert all(map(three_figures, head, expected)), (label, head, expected)
        keys = [k.strip() for k in row["levels_exceeded"].split(";") if k.strip()]
        middle = cells[len(expected) : -2]
        assert middle == [legend[k] for k in keys], (label, middle, keys)
        assert three_figures(cells[-2], row["drift_max_m"]), (label, cells, row["drift_max_m"])
        zone_radius = cells[-1]
        # Printed rounded up to 0.1 m (keep_clear), so it may exceed the site radius by < 0.1 m.
        assert zone_radius <= job["zone"]["site_radius_m"] + 0.1
    # The widest zone's object shows the site radius in its own zone radius column.
    driver = job["summary"]["work_areas"][0]["driving_object"]
    assert driver in rows
    start = table.index(driver)
    tail = [p for p, _ in positions if p > start]
    driver_cells = numbers(table[start + len(driver) : tail[0] if tail else len(table)])
    # Printed as page 1 prints a distance: rounded up to 0.1 m (keep_clear).
    assert driver_cells[-1] == float(keep_clear(job["zone"]["site_radius_m"]))


def test_summary_highest_energy_equals_batch(job: dict[str, Any]) -> None:
    top = max(job["batch"], key=lambda row: row["impact_energy_max_j"])
    assert job["summary"]["highest_energy_object"] == top["label"]
    assert job["summary"]["highest_impact_energy_j"] == pytest.approx(
        top["impact_energy_max_j"], rel=1e-12
    )
    assert job["summary"]["objects"] == len(job["batch"]) == 2


def test_object_table_height_is_the_highest_edge(job: dict[str, Any]) -> None:
    whole = " ".join(page_texts(job["pdf"]))
    assert "Each item falling from 12.0 m, the highest work edge" in whole.replace("\u00a0", " ")


#: Three work areas whose hardest strike differs: a 10 m drop, a 6 m/s push from 9 m (vacuum
#: energy per kg g*9 + 6^2/2 = 106 J/kg beats g*10 = 98 J/kg) and a 3 m drop (never the worst).
AREAS = """\
[job]
title = "Three areas"

[policy]
precision = 0.2
levels = ["helmet-en397"]

[[work_area]]
name = "A drop"
  [[work_area.edge]]
  points = [[0, 0], [10, 0]]
  height = "10 m"

[[work_area]]
name = "B push"
release = "push"
release_speed = "6 m/s"
  [[work_area.edge]]
  points = [[0, 20], [10, 20]]
  height = "9 m"

[[work_area]]
name = "C low"
  [[work_area.edge]]
  points = [[0, 40], [10, 40]]
  height = "3 m"

[[object]]
id = "brick-uk-standard"

[[object]]
id = "claw-hammer-16oz"
"""


def test_object_table_takes_each_item_where_it_strikes_hardest(tmp_path: Path) -> None:
    """Each row is the batch row of the work area (its highest edge, its release) giving the
    highest energy, named in ``work_area``; checked against `dropcalc batch` for that area and
    against the vacuum bound E <= m (g H + v0^2 / 2) (energy conservation without drag)."""
    from dropcalc.analysis.job import run_job
    from dropcalc.io.scenario import load_scenario

    scenario = tmp_path / "scenario.toml"
    scenario.write_text(AREAS, encoding="utf-8")
    rows = run_job(load_scenario(scenario)).object_rows
    (tmp_path / "items.csv").write_text(
        "id\nbrick-uk-standard\nclaw-hammer-16oz\n", encoding="utf-8"
    )
    batch = json_of(
        "batch", str(tmp_path / "items.csv"), "--height", "9 m", "--release", "push",
        "--release-speed", "6 m/s", "--levels", "helmet-en397",
    )  # fmt: skip
    by_id = {row["id"]: row for row in batch}
    assert len(rows) == 2
    for row in rows:
        assert row["work_area"] == "B push", row
        assert row["release_height_m"] == 9.0
        expected = by_id[row["id"]]
        for key in ("impact_energy_max_j", "impact_speed_max_m_s", "drift_max_m"):
            assert row[key] == pytest.approx(expected[key], rel=1e-9), key
        vacuum = row["mass_kg"] * (9.80665 * 9.0 + 6.0**2 / 2)
        assert 0.9 * vacuum < row["impact_energy_max_j"] < vacuum


def test_every_object_label_is_in_the_table_once(job: dict[str, Any]) -> None:
    table = _object_table(page_texts(job["pdf"]))
    for label in (SPANNER, BRICK):
        assert table.count(label) == 1, (label, table)


def test_cautions_are_present(job: dict[str, Any]) -> None:
    whole = " ".join(page_texts(job["pdf"]))
    cautions = (REPO / "templates" / "cautions.md").read_text(encoding="utf-8")
    bullets = [line[2:] for line in cautions.splitlines() if line.startswith("- ")]
    assert len(bullets) >= 4
    for bullet in bullets:
        opening = " ".join(bullet.split()[:7])
        assert opening in whole, opening
    assert "Prevention comes first" in whole
    assert "competent person's assessment" in whole


def test_page_count_equals_pypdf(job: dict[str, Any]) -> None:
    reader = PdfReader(job["pdf"])
    pages = job["summary"]["pages"]
    assert pages == len(reader.pages) >= 2
    for number, page in enumerate(reader.pages, start=1):
        assert f"page {number} of {pages}" in flat(page.extract_text())


def test_user_text_appears_literally(job: dict[str, Any]) -> None:
    texts = page_texts(job["pdf"])
    whole = " ".join(texts)
    assert TITLE in texts[0]
    assert f"Work area: {AREA_NAME}" in texts[0]
    assert "R&D <7>" in texts[0]
    table = _object_table(texts)
    assert SPANNER in table
    assert BRICK in table
    for escaped in ("&amp;", "&lt;", "&gt;", "&#"):
        assert escaped not in whole


# --------------------------------------------------------------------------------------------
# Text overrides


def test_cautions_beside_the_scenario_replace_the_built_in_ones(tmp_path: Path) -> None:
    (tmp_path / "templates").mkdir()
    (tmp_path / "templates" / "cautions.md").write_text(
        "Site rule Q7: keep the yellow gate at the car park shut while anyone works above.\n",
        encoding="utf-8",
    )
    scenario = tmp_path / "scenario.toml"
    scenario.write_text(CHEAP, encoding="utf-8")
    result = invoke("report", str(scenario), "-o", str(tmp_path / "out.pdf"))
    assert result.exit_code == 0, result.output
    whole = " ".join(page_texts(tmp_path / "out.pdf"))
    assert "Site rule Q7: keep the yellow gate at the car park shut" in whole
    assert "Prevention comes first" not in whole  # the built-in cautions are gone
    # The other text blocks keep the built-in wording (templates/method.md).
    assert "Each object is a point mass" in whole


# --------------------------------------------------------------------------------------------
# Atomic output


def _run_cheap(folder: Path) -> Any:
    scenario = folder / "scenario.toml"
    scenario.write_text(CHEAP, encoding="utf-8")
    return invoke("report", str(scenario), "-o", str(folder / "out.pdf"))


def _leftovers(folder: Path) -> list[str]:
    return sorted(p.name for p in folder.iterdir() if p.name not in ("scenario.toml", "out.pdf"))


@pytest.mark.parametrize("old", [None, b"%PDF-1.4 an older report\n"], ids=["no-old", "old"])
def test_failure_while_laying_out_writes_nothing(
    old: bytes | None, tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    import dropcalc.report.pdf as pdf_module

    def broken(*_args: Any, **_kwargs: Any) -> Any:
        raise RuntimeError("layout failed")

    monkeypatch.setattr(pdf_module, "_story", broken)
    if old is not None:
        (tmp_path / "out.pdf").write_bytes(old)
    result = _run_cheap(tmp_path)
    assert result.exit_code != 0, result.output
    assert isinstance(result.exception, RuntimeError)
    if old is None:
        assert not (tmp_path / "out.pdf").exists()
    else:
        assert (tmp_path / "out.pdf").read_bytes() == old
    assert _leftovers(tmp_path) == []


def test_failure_in_the_figure_step_keeps_the_old_pdf(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    import dropcalc.report.figures as figures_module

    def broken(*_args: Any, **_kwargs: Any) -> Any:
        raise InputError("side view: cannot draw")

    monkeypatch.setattr(figures_module, "side_view", broken)
    old = b"%PDF-1.4 an older report\n"
    (tmp_path / "out.pdf").write_bytes(old)
    result = _run_cheap(tmp_path)
    assert result.exit_code == 2, result.output
    assert "side view: cannot draw" in result.stderr
    assert (tmp_path / "out.pdf").read_bytes() == old
    assert _leftovers(tmp_path) == []


# --------------------------------------------------------------------------------------------
# The demo


def _check_feature_collection(data: dict[str, Any], origin: dict[str, float]) -> None:
    assert data["type"] == "FeatureCollection"  # RFC 7946 sec. 3.3
    assert isinstance(data["features"], list)
    assert data["features"]
    polygons = 0
    for feature in data["features"]:
        assert feature["type"] == "Feature"
        assert isinstance(feature["properties"], dict)
        geometry = feature["geometry"]
        if geometry["type"] == "Polygon":
            polygons += 1
            for ring in geometry["coordinates"]:
                assert len(ring) >= 4
                assert ring[0] == ring[-1]
                points = ring
        else:
            points = geometry["coordinates"]
        for lon, lat in points:  # RFC 7946 sec. 4: longitude first
            assert abs(lon - origin["lon"]) < 0.01
            assert abs(lat - origin["lat"]) < 0.01
    assert polygons >= 1


def test_demo_writes_every_file(tmp_path: Path, unlisted_keys: Callable[[Any], list[str]]) -> None:
    out = tmp_path / "demo"
    summary = json_of("demo", "--out", str(out))
    for name in ("report.pdf", "scenario.toml", "items.csv", "objects.csv", "results.json"):
        assert (out / name).is_file(), name
    scenario = tomllib.loads((out / "scenario.toml").read_text(encoding="utf-8"))
    names = [area["name"] for area in scenario["work_area"]]
    assert [area["name"] for area in summary["work_areas"]] == names
    for number, area in enumerate(summary["work_areas"], start=1):
        for key in ("name", "radius_m", "worst_case_radius_m", "area_m2"):
            assert key in area, key
        assert 0 < area["radius_m"] <= area["worst_case_radius_m"]
        geojson = json.loads((out / f"exclusion-area-{number}.geojson").read_text("utf-8"))
        _check_feature_collection(geojson, scenario["site"]["origin"])
    assert not (out / f"exclusion-area-{len(names) + 1}.geojson").exists()
    assert Path(summary["pdf"]) == out / "report.pdf"
    texts = page_texts(out / "report.pdf")
    assert summary["pages"] == len(texts)
    for area in summary["work_areas"]:
        assert f"Keep {keep_clear(area['radius_m'])} m clear" in " ".join(texts)
    results = json.loads((out / "results.json").read_text(encoding="utf-8"))
    assert results["summary"]["work_areas"] == summary["work_areas"]
    with (out / "objects.csv").open(encoding="utf-8", newline="") as handle:
        rows = list(csv.DictReader(handle))
    assert len(rows) == summary["objects"] == len(results["objects"])
    # The closing message names every file written (it prints summary["files"]).
    written = {str(p) for p in out.rglob("*") if p.is_file()}
    assert written == set(summary["files"].values())
    assert unlisted_keys(summary) == []
    assert unlisted_keys(results) == []


WINDBORNE = """\
[job]
title = "Windborne"

[wind]
speed = "30 m/s"

[policy]
precision = 0.2

[[work_area]]
  [[work_area.edge]]
  points = [[0, 0], [10, 0]]
  height = "30 m"

[[object]]
label = "foil offcut"
mass = "1 g"
drag_area = "0.1 m2"
"""


def test_a_zone_no_distance_can_bound_is_reported_as_such(tmp_path: Path) -> None:
    # Found by exploring (an edge 17.5 furlongs high): an infinite radius crashed the code-rule
    # table (math.ceil of inf). A 1 g, 0.1 m2 offcut in 30 m/s has a terminal speed of
    # sqrt(2 m g / (rho Cd A)) = 0.4 m/s: it is carried away, so no distance can be given.
    scenario = tmp_path / "scenario.toml"
    scenario.write_text(WINDBORNE, encoding="utf-8")
    pdf = tmp_path / "out.pdf"
    result = invoke("report", str(scenario), "-o", str(pdf))
    assert result.exit_code == 0, result.output
    assert "no finite distance" in result.stdout
    text = " ".join(page_texts(pdf))
    assert "No finite distance" in text
    assert "no finite computed zone" in text
    assert "Keep — m clear" not in text
