"""The PDF report writer (dropcalc.report.pdf): layout facts read back from the file.

The report is built from a hand-made ReportData (invented numbers; nothing here is physics)
and read back with pypdf, a PDF parser this project did not write. Expected strings are
written out by hand from the inputs (e.g. 16.87 m rounded up to 0.1 m is "16.9").
"""

from __future__ import annotations

import re
from pathlib import Path

import pytest
from pypdf import PdfReader

from dropcalc.errors import InputError
from dropcalc.report.data import JobInfo, ReportData, WorkAreaResult
from dropcalc.report.pdf import keep_clear, sig, write_report

SHA = "3f9a1c0de2b4a6f8" + "0" * 48
LONG_NAME = (
    "Cordless impact driver with 18 V battery pack, belt clip and side handle <kit> & its hard case"
)
ODD_NAME = "Schraubenschlüssel 19 mm – Stahl, 0.5 m² plate · 90°"
CAUTIONS = """The figures are estimates from a simplified model.

- A helmet test energy is not a protection rating: injury can happen well below every
  reference level shown.
- Sheets and boards can glide and fly much further than computed.
"""
METHOD = """Each object is a point mass with quadratic drag.

    F = ½ ρ Cd·A |v_rel| v_rel
v_t = sqrt(2 m g / (ρ Cd A))

- The wind grows with height by a power law.
- Scatter after landing is added to the drift.
"""
LEVELS = [
    ("helmet-penetration", "helmet penetration test energy, EN 397 / ANSI/ISEA Z89.1", 24.5, "J"),
    ("helmet-en397", "industrial helmet crown test energy, EN 397 (5 kg from 1 m)", 49.0, "J"),
    ("helmet-en14052-crown", "high-performance helmet crown test energy, EN 14052", 100.0, "J"),
    ("skin-penetration-50", "energy per area for 50 % skin penetration risk", 23.99, "J/cm²"),
]


BAD_ROW = {"row": 999, "label": "bad <row>", "id": "", "error": "row 999: mass must be > 0 kg"}


def label(i: int) -> str:
    if i == 5:
        return LONG_NAME
    if i == 7:
        return ODD_NAME
    return f"item-{i:03d} spanner"


def png(path: Path, width: float, height: float) -> Path:
    """A small PNG drawn with matplotlib (no pyplot, so no GUI backend)."""
    from matplotlib.figure import Figure

    figure = Figure(figsize=(width, height), dpi=50)
    axes = figure.add_subplot()
    axes.plot([0, 1, 2], [0, 1, 0])
    figure.savefig(path)
    return path


def object_row(i: int) -> dict:
    energy = 900.0 / (i + 1)
    return {
        "row": i + 1,
        "label": label(i),
        "id": f"obj-{i}",
        "name": label(i),
        "quantity": 1 + i % 3,
        "mass_kg": 0.25 + 0.01 * i,
        "release_height_m": 32.0,
        "drag_area_min_m2": 0.0012,
        "drag_area_max_m2": 0.0045,
        "contact_area_m2": 1e-4 if i % 2 else None,
        "terminal_speed_max_m_s": 41.234,
        "terminal_speed_min_m_s": 20.0,
        "impact_speed_max_m_s": 23.456,
        "impact_speed_min_m_s": 19.0,
        "impact_energy_max_j": energy,
        "impact_energy_min_j": energy / 2,
        "energy_per_contact_area_j_cm2": energy / 1.0 if i % 2 else None,
        "fall_time_s": 2.7,
        "fall_time_max_s": 3.1,
        "drift_min_m": 1.0,
        "drift_max_m": 4.567,
        "levels_exceeded": "helmet-penetration; helmet-en397" if energy >= 49 else "",
        "zone_radius_m": 12.34,
        "control": "tether",
        "warnings": "",
        "error": "",
    }


def make_data(tmp_path: Path, rows: int = 12, *, figures: bool = True) -> ReportData:
    areas = [
        WorkAreaResult(
            name="Roof edge <north> & parapet",
            release="dropped or knocked off",
            heights_m=(24.0, 32.0),
            radius_m=16.87,
            worst_case_radius_m=21.02,
            area_m2=812.4,
            max_distance_m=16.87,
            driving_object="item-000 spanner",
            driving_edge="N1",
            drift_m=9.8,
            scatter_m=5.6,
            margin_m=1.0,
            standard_error_m=0.041,
            segments=[],
            object_radii={"item-000 spanner": 16.87},
            plan_png=png(tmp_path / "plan_a.png", 4, 4),
        ),
        WorkAreaResult(
            name="Scaffold lift 3",
            release="pushed off",
            heights_m=(12.0,),
            radius_m=7.31,
            worst_case_radius_m=9.0,
            area_m2=120.0,
            max_distance_m=7.31,
            driving_object="item-001 spanner",
            driving_edge="S2",
            drift_m=3.0,
            scatter_m=3.3,
            margin_m=1.0,
            standard_error_m=0.02,
            segments=[],
            object_radii={},
            plan_png=png(tmp_path / "plan_b.png", 6, 3),
        ),
    ]
    figure_paths = {}
    if figures:
        figure_paths = {
            "side_view": png(tmp_path / "side.png", 8, 4),
            "energy_height": png(tmp_path / "energy.png", 8, 4),
        }
    return ReportData(
        job=JobInfo(
            title="Façade repair – Block B <east> & roof",
            site="Rue de l'Église 12, Zürich",
            client="Müller & Söhne AG",
            reference="DC-2024/017",
            prepared_by="Zoë Ångström",
            checked_by="José Nuñez",
            revision="B",
            date="2024-05-14",
        ),
        scenario_name="block_b.toml",
        scenario_sha256=SHA,
        software_version="0.1.0",
        generated="2024-05-14T09:30:00Z",
        confidence=0.95,
        wind_text="8 m/s mean at 10 m from 270°, power law exponent 0.14",
        air_text="1.20 kg/m³ (15 °C, 101.3 kPa)",
        ground_text="concrete, level",
        inputs=[("Release heights", "24 m, 32 m"), ("Scatter model", "bounce & slide < 3 m")],
        work_areas=areas,
        object_rows=[object_row(i) for i in range(rows)] + [BAD_ROW],
        object_table_height_m=32.0,
        levels=LEVELS,
        controls=[("item-000 spanner", ("tether to the structure",)), (ODD_NAME, ("net below",))],
        code_rules=[("Rule of thumb: one third of the height", "10.7 m", "common practice")],
        figures=figure_paths,
        texts={"cautions": CAUTIONS, "method": METHOD, "signoff": "Checked against the plan."},
        warnings=["Plywood sheet: can glide far in wind; drift not conservative."],
    )


def page_texts(path: Path) -> list[str]:
    """Text of each page with runs of white space folded to one space."""
    return [re.sub(r"\s+", " ", page.extract_text()) for page in PdfReader(path).pages]


@pytest.fixture(scope="module")
def report(tmp_path_factory: pytest.TempPathFactory) -> tuple[Path, int, list[str]]:
    folder = tmp_path_factory.mktemp("report")
    path = folder / "report.pdf"
    pages = write_report(make_data(folder, rows=200), path)
    return path, pages, page_texts(path)


def test_formats() -> None:
    # Worked by hand: three significant figures; clearances rounded up to 0.1 m.
    assert [sig(v) for v in (16.87, 1234.0, 0.0012345, 9.996, 0.0, None, float("nan"))] == [
        "16.9", "1230", "0.00123", "10.0", "0", "—", "—",
    ]  # fmt: skip
    assert [keep_clear(v) for v in (16.87, 16.81, 7.3, 0.7, 7.31)] == [
        "16.9", "16.9", "7.3", "0.7", "7.4",
    ]  # fmt: skip


def test_parses_and_page_count(report: tuple[Path, int, list[str]]) -> None:
    path, pages, texts = report
    assert pages == len(PdfReader(path).pages) == len(texts)
    for number, text in enumerate(texts, start=1):
        assert f"page {number} of {pages}" in text
        assert "sha256 3f9a1c0de2b4a6f8…" in text
        assert "dropcalc 0.1.0" in text
        assert "report date 2024-05-14" in text
        assert "DC-2024/017" in text  # header


def test_page_one_answer(report: tuple[Path, int, list[str]]) -> None:
    _path, _pages, texts = report
    first = texts[0]
    assert "Façade repair – Block B <east> & roof" in first
    assert "Keep 16.9 m clear" in first
    assert "Keep 7.4 m clear" in texts[0] + texts[1]  # the second box may flow to page 2
    assert "Roof edge <north> & parapet" in first
    assert "Müller & Söhne AG" in first
    # With two work areas and their plans printed across the page, the highest-energy line
    # follows the answer boxes on page 2.
    assert "900 J" in texts[0] + texts[1]  # object_rows[0]
    assert "can glide far in wind" in " ".join(texts[:2])


def test_sections_and_signoff(report: tuple[Path, int, list[str]]) -> None:
    _path, _pages, texts = report
    text = " ".join(texts)
    for heading in (
        "Inputs and assumptions",
        "Objects",
        "Reference levels used",
        "Figures",
        "Method",
        "Distances from code rules, for comparison",
        "Cautions",
        "Sign-off",
    ):
        assert heading in text
    assert "not a protection rating" in text
    assert "glide and fly much further" in text
    assert "v_t = sqrt(2 m g / (ρ Cd A))" in text
    assert "Zoë Ångström" in text
    assert "José Nuñez" in text
    assert "bounce & slide < 3 m" in text
    assert "1.20 kg/m³ (15 °C, 101.3 kPa)" in text
    assert "23.99 J/cm²" in text  # legend values as given, not rounded


def test_object_table_spans_pages(report: tuple[Path, int, list[str]]) -> None:
    _path, _pages, texts = report
    # Every page that shows a table row also shows the header row (repeated on each page).
    row_pages = [n for n, t in enumerate(texts) if re.search(r"item-(0[2-9]\d|1\d\d) ", t)]
    assert len(row_pages) >= 3
    assert row_pages == list(range(row_pages[0], row_pages[-1] + 1))
    for n in row_pages:
        assert "impact energy [J]" in texts[n]
        assert "zone radius [m]" in texts[n]
    # Each item label appears exactly once in the table (long names wrap inside their cell).
    text = " ".join(texts)
    table = text[text.index("highest impact energy first") : text.index("Reference levels used")]
    for i in range(200):
        assert table.count(label(i)) == 1, label(i)
    assert "41.2" in table  # terminal speed, 3 significant figures
    assert "0.00120–0.00450" in table  # drag areas to 3 significant figures
    assert (
        "bad <row> not computed: row 999: mass must be > 0 kg" in table
    )  # a failed row keeps its reason


def test_missing_figures_do_not_crash(tmp_path: Path) -> None:
    data = make_data(tmp_path, rows=3, figures=False)
    broken = WorkAreaResult(**{**data.work_areas[0].__dict__, "plan_png": tmp_path / "none.png"})
    data = ReportData(
        **{**data.__dict__, "work_areas": [broken], "figures": {"side_view": tmp_path / "x.png"}}
    )
    path = tmp_path / "bare.pdf"
    pages = write_report(data, path)
    text = " ".join(page_texts(path))
    assert pages == len(PdfReader(path).pages)
    assert "Plan drawing not available" in text
    assert "Figure 1" not in text


def test_failure_leaves_no_file_and_keeps_old(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    from reportlab.platypus import doctemplate

    data = make_data(tmp_path, rows=3)
    old = tmp_path / "old.pdf"
    old.write_bytes(b"%PDF old report")
    before = sorted(p.name for p in tmp_path.iterdir())

    real_build = doctemplate.BaseDocTemplate.build

    def failing_build(self, flowables, *args, **kwargs):  # type: ignore[no-untyped-def]
        # Let a page or two be laid out, then fail in the middle of the build.
        flowables.insert(len(flowables) // 2, _Boom())
        return real_build(self, flowables, *args, **kwargs)

    monkeypatch.setattr(doctemplate.BaseDocTemplate, "build", failing_build)
    with pytest.raises(RuntimeError, match="boom"):
        write_report(data, tmp_path / "new.pdf")
    with pytest.raises(RuntimeError, match="boom"):
        write_report(data, old)
    assert old.read_bytes() == b"%PDF old report"
    assert sorted(p.name for p in tmp_path.iterdir()) == before  # no new or temporary file


def test_missing_folder_is_an_input_error(tmp_path: Path) -> None:
    with pytest.raises(InputError, match="does not exist"):
        write_report(make_data(tmp_path, rows=1), tmp_path / "no" / "r.pdf")


class _Boom:
    """A flowable that raises when laid out (stands for any failure mid-build)."""

    def __getattr__(self, name: str):  # type: ignore[no-untyped-def]
        raise RuntimeError("boom")
