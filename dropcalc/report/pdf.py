"""Lay out a :class:`~dropcalc.report.data.ReportData` as an A4 PDF a competent person can sign.

The writer only arranges what :class:`ReportData` holds; it computes nothing but text formats.
Page 1 carries the answer (the distance to keep clear for each work area, the hardest-hitting
object, the items that need a control, the warnings); the pages after it carry the inputs, the
object table, the figures, the method, the code rules for comparison, the cautions and the
sign-off. Every page has a header (job title, reference) and a footer that ties it to the
scenario file (name and SHA-256), the software version, the report date and "page N of M".

User text goes through :func:`xml.sax.saxutils.escape` before it reaches reportlab's paragraph
markup, and the DejaVu fonts that ship with matplotlib are embedded so that ², ·, °, – and
accented letters print. The file is built under a temporary name in the target folder and
renamed over the target only when complete (:func:`dropcalc.io.atomic.write_atomic`).

Distances to keep clear are rounded *up* to 0.1 m (rounding a clearance down would shrink it);
other numbers are shown to three significant figures.
"""

from __future__ import annotations

import math
import re
from collections.abc import Callable, Sequence
from pathlib import Path
from typing import Any
from xml.sax.saxutils import escape

from reportlab.lib import colors
from reportlab.lib.enums import TA_RIGHT
from reportlab.lib.pagesizes import A4
from reportlab.lib.styles import ParagraphStyle
from reportlab.lib.units import mm
from reportlab.lib.utils import ImageReader
from reportlab.pdfbase import pdfmetrics
from reportlab.pdfbase.ttfonts import TTFont
from reportlab.pdfgen import canvas as pdfcanvas
from reportlab.platypus import (
    BaseDocTemplate,
    CondPageBreak,
    Flowable,
    Frame,
    FrameBreak,
    Image,
    KeepTogether,
    PageTemplate,
    Paragraph,
    Spacer,
    Table,
    TableStyle,
)

from dropcalc.io.atomic import write_atomic
from dropcalc.report.data import ReportData, WorkAreaResult
from dropcalc.texts import format_area, keep_clear

# --------------------------------------------------------------------------------------------
# Fonts, colours, styles

#: Font family names registered with reportlab (prefixed so they cannot clash with others).
SANS = "dropcalc-DejaVuSans"
SANS_BOLD = "dropcalc-DejaVuSans-Bold"
SANS_ITALIC = "dropcalc-DejaVuSans-Oblique"
MONO = "dropcalc-DejaVuSansMono"

_FONT_FILES = {
    SANS: "DejaVuSans.ttf",
    SANS_BOLD: "DejaVuSans-Bold.ttf",
    SANS_ITALIC: "DejaVuSans-Oblique.ttf",
    MONO: "DejaVuSansMono.ttf",
}

# Colours: the dark end of matplotlib's cividis map (Nuñez, Anderton and Renslow, PLoS ONE 13
# (2018) e0199239) for headings and frames, light tints of it for panels, neutral greys for
# rules and zebra stripes. No colour carries a meaning of its own.
INK = colors.HexColor("#1C1C1C")
CIVIDIS_DARK = colors.HexColor("#00224E")  # cividis(0.0)
CIVIDIS_BLUE = colors.HexColor("#3B496C")  # cividis(0.2)
CIVIDIS_TINT = colors.HexColor("#E8EBF1")  # cividis(0.0) at about 9 % on white
GREY_TEXT = colors.HexColor("#5E5E5E")
GREY_RULE = colors.HexColor("#A6A6A6")
GREY_LINE = colors.HexColor("#D0D0D0")
GREY_STRIPE = colors.HexColor("#F2F2F2")

PAGE_WIDTH, PAGE_HEIGHT = A4
MARGIN_SIDE = 18 * mm
MARGIN_TOP = 20 * mm
MARGIN_BOTTOM = 21 * mm
FRAME_WIDTH = PAGE_WIDTH - 2 * MARGIN_SIDE


def _register_fonts() -> None:
    """Register the DejaVu fonts shipped with matplotlib (once per process)."""
    registered = set(pdfmetrics.getRegisteredFontNames())
    if set(_FONT_FILES) <= registered:
        return
    import matplotlib

    folder = Path(matplotlib.get_data_path()) / "fonts" / "ttf"
    for name, file_name in _FONT_FILES.items():
        if name not in registered:
            pdfmetrics.registerFont(TTFont(name, str(folder / file_name)))
    pdfmetrics.registerFontFamily(
        SANS, normal=SANS, bold=SANS_BOLD, italic=SANS_ITALIC, boldItalic=SANS_BOLD
    )


def _styles() -> dict[str, ParagraphStyle]:
    base = ParagraphStyle("body", fontName=SANS, fontSize=9, leading=12.5, textColor=INK)

    def style(name: str, **changes: Any) -> ParagraphStyle:
        return ParagraphStyle(name, parent=base, **changes)

    return {
        "body": base,
        "title": style(
            "title", fontName=SANS_BOLD, fontSize=17, leading=21, textColor=CIVIDIS_DARK
        ),
        "subtitle": style("subtitle", fontSize=10, leading=13, textColor=GREY_TEXT),
        "h2": style(
            "h2", fontName=SANS_BOLD, fontSize=12.5, leading=16, textColor=CIVIDIS_DARK,
            spaceBefore=10, spaceAfter=5, keepWithNext=1,
        ),
        "h3": style(
            "h3", fontName=SANS_BOLD, fontSize=9.5, leading=12.5, textColor=CIVIDIS_DARK,
            spaceBefore=6, spaceAfter=3, keepWithNext=1,
        ),
        "para": style("para", spaceAfter=5),
        "bullet": style("bullet", leftIndent=12, bulletIndent=2, spaceAfter=3),
        "equation": style(
            "equation", fontName=MONO, fontSize=8.5, leading=11.5, leftIndent=14,
            textColor=CIVIDIS_DARK, spaceBefore=1, spaceAfter=2,
        ),
        "note": style("note", fontSize=8, leading=10.5, textColor=GREY_TEXT, spaceAfter=4),
        "caption": style("caption", fontSize=8, leading=10.5, textColor=GREY_TEXT, spaceBefore=3),
        "label": style("label", fontSize=8, leading=10.5, textColor=GREY_TEXT),
        "value": style("value", fontSize=8.5, leading=11),
        "distance": style(
            "distance", fontName=SANS_BOLD, fontSize=22, leading=26, textColor=CIVIDIS_DARK
        ),
        "area_name": style(
            "area_name", fontName=SANS_BOLD, fontSize=10.5, leading=13, textColor=colors.white
        ),
        "cell": style("cell", fontSize=7, leading=8.6),
        "cell_right": style("cell_right", fontSize=7, leading=8.6, alignment=TA_RIGHT),
        "head": style(
            "head", fontName=SANS_BOLD, fontSize=6.6, leading=8, textColor=colors.white
        ),
        "head_right": style(
            "head_right", fontName=SANS_BOLD, fontSize=6.6, leading=8, textColor=colors.white,
            alignment=TA_RIGHT,
        ),
        "warning_title": style(
            "warning_title", fontName=SANS_BOLD, fontSize=10, leading=13, textColor=CIVIDIS_DARK
        ),
        "warning": style("warning", fontSize=8.5, leading=11.5, leftIndent=12, bulletIndent=2),
        "driver_warning": style(
            "driver_warning", fontSize=8.5, leading=11, leftIndent=12, bulletIndent=2,
            textColor=CIVIDIS_DARK, bulletFontName=SANS_BOLD,
        ),
    }  # fmt: skip


# --------------------------------------------------------------------------------------------
# Number and text formats


def _text(value: object) -> str:
    """User text escaped for reportlab paragraph markup (``<``, ``>``, ``&``)."""
    return escape("" if value is None else str(value))


def _finite(value: object) -> float | None:
    if value is None or isinstance(value, bool):
        return None
    try:
        number = float(value)  # type: ignore[arg-type]
    except (TypeError, ValueError):
        return None
    return number if math.isfinite(number) else None


def sig(value: object, digits: int = 3) -> str:
    """Format a number to ``digits`` significant figures; None, NaN or text -> "—".

    Examples: 16.87 -> "16.9", 1234 -> "1230", 0.0012345 -> "0.00123", 0 -> "0".
    """
    number = _finite(value)
    if number is None:
        return "—"
    if number == 0:
        return "0"
    exponent = math.floor(math.log10(abs(number)))
    decimals = digits - 1 - exponent
    rounded = round(number, decimals)
    if rounded != 0 and math.floor(math.log10(abs(rounded))) > exponent:  # 9.996 -> 10.0
        decimals -= 1
        rounded = round(number, decimals)
    return f"{rounded:.{max(decimals, 0)}f}"


def _percent(fraction: float) -> str:
    return f"{100 * fraction:.4g}\u00a0%"


def _fit(text: str, font: str, size: float, width: float) -> str:
    """Cut ``text`` with an ellipsis so it fits ``width`` points (header and footer lines)."""
    if pdfmetrics.stringWidth(text, font, size) <= width:
        return text
    while text and pdfmetrics.stringWidth(text + "…", font, size) > width:
        text = text[:-1]
    return text + "…"


# --------------------------------------------------------------------------------------------
# Text blocks from templates

_FENCE = "```"


def _is_equation(line: str) -> bool:
    """A formula line: indented by four spaces or more, or an '=' with at most two prose words.

    Prose words are runs of three or more letters (``sqrt`` and ``ln`` in a formula count,
    so a line such as ``v_t = sqrt(2 m g / (rho Cd A))`` is a formula; a sentence that
    mentions ``E = m g h`` has more words and stays prose).
    """
    if line.startswith(("    ", "\t")) and line.strip():
        return True
    if "=" not in line:
        return False
    words = re.findall(r"(?<![\w_])[^\W\d_]{3,}(?![\w_])", line)
    return len(words) <= 2 and not line.rstrip().endswith((".", ":", ","))


def text_blocks(text: str, styles: dict[str, ParagraphStyle]) -> list[Flowable]:
    """Turn a plain text block into paragraphs, bullets, headings and formula lines.

    The format (the one used by ``templates/*.md``): blank lines separate paragraphs; a line
    starting with ``- `` (or ``* ``) starts a bullet and indented lines continue it; a line
    starting with ``#`` is a sub-heading; formula lines (see :func:`_is_equation`) and lines
    between ``````` fences are set in a monospace font, one line each. Everything is escaped.
    """
    flowables: list[Flowable] = []
    paragraph: list[str] = []
    bullet: list[str] | None = None
    in_fence = False

    def flush() -> None:
        nonlocal paragraph, bullet
        if paragraph:
            flowables.append(Paragraph(_text(" ".join(paragraph)), styles["para"]))
        if bullet is not None:
            flowables.append(Paragraph(_text(" ".join(bullet)), styles["bullet"], bulletText="•"))
        paragraph, bullet = [], None

    for raw in text.replace("\r\n", "\n").split("\n"):
        line = raw.rstrip()
        stripped = line.strip()
        if stripped.startswith(_FENCE):
            flush()
            in_fence = not in_fence
            continue
        if in_fence:
            # Keep leading spaces (alignment of formula lines) as no-break spaces.
            indent = len(line) - len(line.lstrip(" "))
            flowables.append(Paragraph("\u00a0" * indent + _text(stripped), styles["equation"]))
            continue
        if not stripped:
            flush()
            continue
        if stripped.startswith(("- ", "* ")):
            flush()
            bullet = [stripped[2:].strip()]
        elif bullet is not None and line[:1].isspace() and not _is_equation(line.strip()):
            bullet.append(stripped)
        elif stripped.startswith("#"):
            flush()
            flowables.append(Paragraph(_text(stripped.lstrip("#").strip()), styles["h3"]))
        elif _is_equation(line):
            flush()
            flowables.append(Paragraph(_text(stripped), styles["equation"]))
        else:
            if bullet is not None:
                flush()
            paragraph.append(stripped)
    flush()
    return flowables


# --------------------------------------------------------------------------------------------
# Building blocks


def _image(path: Path | None, max_width: float, max_height: float) -> Image | None:
    """The PNG scaled to fit the box with its aspect kept; None if missing or unreadable."""
    if path is None or not Path(path).is_file():
        return None
    try:
        width, height = ImageReader(str(path)).getSize()
    except Exception:  # reportlab/PIL raise several kinds for a damaged image
        return None
    if width <= 0 or height <= 0:
        return None
    scale = min(max_width / width, max_height / height)
    return Image(str(path), width=width * scale, height=height * scale)


def _pairs_table(
    rows: Sequence[tuple[str, str]],
    styles: dict[str, ParagraphStyle],
    widths: tuple[float, float],
    *,
    zebra: bool = True,
) -> Table:
    """A two-column label/value table; both columns wrap."""
    cells = [
        [Paragraph(_text(label), styles["label"]), Paragraph(_text(value), styles["value"])]
        for label, value in rows
    ]
    table = Table(cells, colWidths=list(widths), hAlign="LEFT")
    commands: list[tuple[Any, ...]] = [
        ("VALIGN", (0, 0), (-1, -1), "TOP"),
        ("TOPPADDING", (0, 0), (-1, -1), 2.5),
        ("BOTTOMPADDING", (0, 0), (-1, -1), 2.5),
        ("LEFTPADDING", (0, 0), (-1, -1), 4),
        ("LINEBELOW", (0, 0), (-1, -1), 0.25, GREY_LINE),
    ]
    if zebra:
        commands.append(("ROWBACKGROUNDS", (0, 0), (-1, -1), [colors.white, GREY_STRIPE]))
    table.setStyle(TableStyle(commands))
    return table


def _grid_style(header_rows: int = 1) -> list[tuple[Any, ...]]:
    """Common look of the data tables: dark header band, zebra body, hairlines."""
    return [
        ("BACKGROUND", (0, 0), (-1, header_rows - 1), CIVIDIS_DARK),
        ("ROWBACKGROUNDS", (0, header_rows), (-1, -1), [colors.white, GREY_STRIPE]),
        ("VALIGN", (0, 0), (-1, -1), "TOP"),
        ("VALIGN", (0, 0), (-1, header_rows - 1), "BOTTOM"),
        ("FONTNAME", (0, 0), (-1, -1), SANS),
        ("FONTSIZE", (0, 0), (-1, -1), 7),
        ("LEADING", (0, 0), (-1, -1), 8.6),
        ("TOPPADDING", (0, 0), (-1, -1), 2),
        ("BOTTOMPADDING", (0, 0), (-1, -1), 2.5),
        ("LEFTPADDING", (0, 0), (-1, -1), 3),
        ("RIGHTPADDING", (0, 0), (-1, -1), 3),
        ("LINEBELOW", (0, header_rows), (-1, -1), 0.25, GREY_LINE),
        ("LINEBELOW", (0, -1), (-1, -1), 0.8, CIVIDIS_DARK),
    ]


def _heading(text: str, styles: dict[str, ParagraphStyle]) -> Paragraph:
    return Paragraph(_text(text), styles["h2"])


def _where(row: dict[str, Any], data: ReportData) -> str:
    """Where an object-table row falls from: "12 m (East scaffold, pushed off ...)"."""
    height = f"{sig(row.get('release_height_m', data.object_table_height_m))}\u00a0m"
    area = row.get("work_area")
    if not area:
        return height
    releases = {a.name: a.release for a in data.work_areas}
    release = releases.get(str(area))
    return f"{height} ({area}, {release})" if release else f"{height} ({area})"


def _table_basis(data: ReportData) -> str:
    """How the object table's rows were computed, in one sentence."""
    if len(data.work_areas) <= 1:
        release = data.work_areas[0].release if data.work_areas else "dropped from rest"
        return (
            f"Each item falling from {sig(data.object_table_height_m)}\u00a0m, the highest work "
            f"edge, {release}"
        )
    return (
        "Each item from the work area where it strikes hardest (named under the item: that "
        "area's highest edge and release)"
    )


def _item_label(row: dict[str, Any]) -> str:
    return str(row.get("label") or row.get("name") or row.get("id") or f"row {row.get('row', '?')}")


# --------------------------------------------------------------------------------------------
# Page 1: the answer


def _title_block(data: ReportData, styles: dict[str, ParagraphStyle]) -> list[Flowable]:
    job = data.job
    report_date = job.date or data.generated
    rows = [
        ("Site", job.site),
        ("Client", job.client or "—"),
        ("Reference", job.reference or "—"),
        ("Revision", job.revision or "—"),
        ("Date", report_date),
    ]
    cells = [
        [Paragraph(_text(label), styles["label"]), Paragraph(_text(value), styles["value"])]
        for label, value in rows
    ]
    table = Table(cells, colWidths=[24 * mm, FRAME_WIDTH - 24 * mm], hAlign="LEFT")
    table.setStyle(
        TableStyle(
            [
                ("VALIGN", (0, 0), (-1, -1), "TOP"),
                ("TOPPADDING", (0, 0), (-1, -1), 1),
                ("BOTTOMPADDING", (0, 0), (-1, -1), 1),
                ("LEFTPADDING", (0, 0), (-1, -1), 0),
            ]
        )
    )
    return [
        Paragraph("Dropped objects: exclusion zones and impact energies", styles["subtitle"]),
        Spacer(1, 2),
        Paragraph(_text(job.title), styles["title"]),
        Spacer(1, 5),
        table,
        Spacer(1, 4),
        Paragraph(
            f"Computed {_text(data.generated)} by dropcalc {_text(data.software_version)} from "
            f"scenario {_text(data.scenario_name)}.",
            styles["note"],
        ),
    ]


def _stop_work(area: WorkAreaResult) -> list[tuple[str, str]]:
    """The stop-work line of a work area that has a clear distance available, else nothing."""
    if area.clear_distance_m is None or area.stop_work_wind_m_s is None:
        return []
    available = keep_clear(area.clear_distance_m)
    if area.stop_work_wind_m_s <= 0:
        return [
            (
                "Stop work",
                f"the {available}\u00a0m clear distance available is too small even in still "
                f"air: keep {keep_clear(area.radius_m)}\u00a0m clear or work lower",
            )
        ]
    holds = area.radius_m <= area.clear_distance_m
    return [
        (
            "Stop work",
            f"above a mean wind of {sig(area.stop_work_wind_m_s)}\u00a0m/s at 10\u00a0m: "
            f"beyond it the zone needs more than the {available}\u00a0m clear distance "
            "available" + ("" if holds else " (already more in the wind of this report)"),
        )
    ]


def _work_area_box(
    area: WorkAreaResult, data: ReportData, styles: dict[str, ParagraphStyle]
) -> Flowable:
    """One work area: the distance to keep clear, what it rests on, and its plan."""
    plan_width = FRAME_WIDTH - 12
    text_width = FRAME_WIDTH
    heights = ", ".join(dict.fromkeys(f"{sig(h)}\u00a0m" for h in area.heights_m)) or "—"
    made_of = (
        f"drift {sig(area.drift_m)}\u00a0m + scatter {sig(area.scatter_m)}\u00a0m + "
        f"margin {sig(area.margin_m)}\u00a0m"
    )
    facts = [
        ("Worst case", f"{keep_clear(area.worst_case_radius_m)}\u00a0m (deterministic envelope)"),
        (
            "Area",
            f"{format_area(area.area_m2)}\u00a0m², reaching {keep_clear(area.max_distance_m)}"
            "\u00a0m from the nearest work edge"
            + (
                f"; {format_area(area.beyond_building_m2)}\u00a0m² of it (hatched) is reached "
                "only over or around the building: deflection off the structure is not "
                "modelled"
                if area.beyond_building_m2 > 0
                else ""
            ),
        ),
        ("Wind", data.wind_text),
        *_stop_work(area),
        ("Driven by", f"{area.driving_object}, at {area.driving_edge}"),
        (
            "Release",
            f"{area.release}; edge height{'s' if ',' in heights else ''} {heights}",
        ),
        ("Made of", made_of),
    ]
    fact_cells = [
        [Paragraph(_text(label), styles["label"]), Paragraph(_text(value), styles["value"])]
        for label, value in facts
    ]
    fact_table = Table(fact_cells, colWidths=[20 * mm, text_width - 20 * mm - 12])
    fact_table.setStyle(
        TableStyle(
            [
                ("VALIGN", (0, 0), (-1, -1), "TOP"),
                ("LEFTPADDING", (0, 0), (-1, -1), 0),
                ("TOPPADDING", (0, 0), (-1, -1), 1.5),
                ("BOTTOMPADDING", (0, 0), (-1, -1), 1.5),
                ("LINEABOVE", (0, 0), (-1, 0), 0.5, GREY_RULE),
            ]
        )
    )
    headline: list[Flowable] = [
        Paragraph(
            f"Keep {keep_clear(area.radius_m)} m clear"
            if math.isfinite(area.radius_m)
            else "No finite distance",
            styles["distance"],
        ),
        Paragraph(
            f"from the work edge. Contains {_percent(data.confidence)} of simulated drops, "
            f"including a margin of {sig(area.margin_m)}\u00a0m; Monte Carlo standard error "
            f"{sig(area.standard_error_m, 2)}\u00a0m; rounded up to 0.1 m."
            if math.isfinite(area.radius_m)
            else f"More than {_percent(1 - data.confidence)} of simulated drops of "
            f"{_text(area.driving_object)} were still in the air 1 km downwind: no zone can "
            "bound them. Secure such objects against the wind or stop the work.",
            styles["note"],
        ),
    ]
    if area.driver_warnings:
        # A sheet's lift-off wind is advice on storing it, not a doubt on the distance (the
        # plate model covers its flight); only the other warnings say the distance may be short.
        doubts = [w for w in area.driver_warnings if not w.startswith("lying flat on a roof")]
        tail = (
            "The computed distance may be too small for it; see the warnings below."
            if doubts
            else "Weigh it down or store it flat."
        )
        headline.append(
            Paragraph(
                f"<b>Warning:</b> the distance is set by {_text(area.driving_object)}, which "
                f"carries a warning: {_text('; '.join(area.driver_warnings))}. {tail}",
                styles["driver_warning"],
                bulletText="!",
            )
        )
    plan = _image(area.plan_png, plan_width, 104 * mm)
    drawing: Flowable = (
        plan if plan is not None else Paragraph("Plan drawing not available.", styles["note"])
    )
    table = Table(
        [
            [Paragraph(f"Work area: {_text(area.name)}", styles["area_name"]), ""],
            [headline, ""],
            [fact_table, ""],
            [drawing, ""],
        ],
        colWidths=[text_width / 2, text_width / 2],
    )
    table.setStyle(
        TableStyle(
            [
                ("SPAN", (0, 0), (1, 0)),
                ("SPAN", (0, 1), (1, 1)),
                ("SPAN", (0, 2), (1, 2)),
                ("SPAN", (0, 3), (1, 3)),
                ("BACKGROUND", (0, 0), (1, 0), CIVIDIS_DARK),
                ("BOX", (0, 0), (-1, -1), 0.9, CIVIDIS_DARK),
                ("BACKGROUND", (0, 1), (1, 1), CIVIDIS_TINT),
                ("BACKGROUND", (0, 2), (1, 2), CIVIDIS_TINT),
                ("VALIGN", (0, 1), (-1, -1), "TOP"),
                ("ALIGN", (0, 3), (1, 3), "CENTER"),
                ("LEFTPADDING", (0, 0), (-1, -1), 6),
                ("RIGHTPADDING", (0, 0), (-1, -1), 6),
                ("TOPPADDING", (0, 0), (-1, 0), 4),
                ("BOTTOMPADDING", (0, 0), (-1, 0), 4),
                ("TOPPADDING", (0, 1), (-1, -1), 5),
                ("BOTTOMPADDING", (0, 1), (-1, -1), 5),
            ]
        )
    )
    return KeepTogether([table])


def _highest_energy(data: ReportData, styles: dict[str, ParagraphStyle]) -> list[Flowable]:
    rows = [r for r in data.object_rows if not r.get("error")]
    if not rows:
        return []
    top = rows[0]
    labels = {key: label for key, label, _value, _unit in data.levels}
    exceeded = [k.strip() for k in str(top.get("levels_exceeded") or "").split(";") if k.strip()]
    levels_text = (
        "At or above: " + "; ".join(_text(labels.get(k, k)) for k in exceeded) + "."
        if exceeded
        else "Below every reference level listed in this report."
    )
    energy = sig(top.get("impact_energy_max_j"))
    text = (
        f"<b>{_text(_item_label(top))}</b> ({sig(top.get('mass_kg'))}\u00a0kg) strikes with "
        f"<b>{energy}\u00a0J</b> at {sig(top.get('impact_speed_max_m_s'))}\u00a0m/s when it "
        f"falls from {_text(_where(top, data))} at its smallest drag area. {levels_text}"
    )
    return [
        Paragraph("Highest impact energy on the object list", styles["h3"]),
        Paragraph(text, styles["para"]),
    ]


def control_groups(
    controls: list[tuple[str, tuple[str, ...]]],
) -> list[tuple[list[str], tuple[str, ...]]]:
    """Items grouped by the set of controls they need, in order of their first item.

    ``controls`` is highest energy first, so the groups are too. Every item is in one group,
    and each group carries every control of its items: nothing is left to another table.
    """
    groups: dict[tuple[str, ...], list[str]] = {}
    for item, item_controls in controls:
        groups.setdefault(tuple(item_controls), []).append(item)
    return [(items, group) for group, items in groups.items()]


def _controls(data: ReportData, styles: dict[str, ParagraphStyle]) -> list[Flowable]:
    out: list[Flowable] = [Paragraph("Controls for every item", styles["h3"])]
    if not any(c for _, c in data.controls):
        out.append(
            Paragraph("No item on the list met a rule of the control policy.", styles["para"])
        )
        return out
    out.append(
        Paragraph(
            "Each item gets every rule of the control policy that applies to it, in order of "
            "impact energy, hardest-hitting first; items that need the same controls share a row.",
            styles["para"],
        )
    )
    cells = [[Paragraph("items", styles["head"]), Paragraph("controls", styles["head"])]]
    for items, group in control_groups(data.controls):
        names = "<br/>".join(_text(item) for item in items)
        text = (
            "<br/>".join(f"• {_text(c)}" for c in group)
            if group
            else "no rule of the policy applies"
        )
        cells.append([Paragraph(names, styles["cell"]), Paragraph(text, styles["cell"])])
    table = Table(cells, colWidths=[62 * mm, FRAME_WIDTH - 62 * mm], repeatRows=1, hAlign="LEFT")
    table.setStyle(TableStyle(_grid_style()))
    out.append(table)
    return out


def _warnings(data: ReportData, styles: dict[str, ParagraphStyle]) -> list[Flowable]:
    if not data.warnings:
        return []
    inner: list[Flowable] = [
        Paragraph("Warnings: read these before relying on the distances", styles["warning_title"])
    ]
    inner += [
        Paragraph(_text(warning), styles["warning"], bulletText="!") for warning in data.warnings
    ]
    box = Table([[inner]], colWidths=[FRAME_WIDTH])
    box.setStyle(
        TableStyle(
            [
                ("BOX", (0, 0), (-1, -1), 1.6, CIVIDIS_DARK),
                ("LINEBEFORE", (0, 0), (0, -1), 5, CIVIDIS_DARK),
                ("BACKGROUND", (0, 0), (-1, -1), GREY_STRIPE),
                ("LEFTPADDING", (0, 0), (-1, -1), 10),
                ("TOPPADDING", (0, 0), (-1, -1), 5),
                ("BOTTOMPADDING", (0, 0), (-1, -1), 6),
            ]
        )
    )
    return [box, Spacer(1, 4)]


# --------------------------------------------------------------------------------------------
# The pages after the answer


def _inputs(data: ReportData, styles: dict[str, ParagraphStyle]) -> list[Flowable]:
    widths = (58 * mm, FRAME_WIDTH - 58 * mm)
    conditions = [
        ("Wind", data.wind_text),
        ("Air", data.air_text),
        ("Ground", data.ground_text),
        ("Share of simulated drops inside the distance", _percent(data.confidence)),
        ("Object table", _table_basis(data)),
    ]
    out: list[Flowable] = [_heading("Inputs and assumptions", styles)]
    if data.inputs:
        out += [_pairs_table(data.inputs, styles, widths), Spacer(1, 6)]
    out += [Paragraph("Conditions", styles["h3"]), _pairs_table(conditions, styles, widths)]
    return out


_NUMBER_COLUMNS: tuple[tuple[str, float, bool], ...] = (
    # header markup, width, right-aligned
    ("qty", 7 * mm, True),
    ("mass<br/>[kg]", 11 * mm, True),
    ("Cd·A min–max<br/>[m²]", 24 * mm, True),
    ("terminal speed at min Cd·A [m/s]", 14 * mm, True),
    ("impact speed<br/>[m/s]", 12 * mm, True),
    ("impact energy<br/>[J]", 13 * mm, True),
    ("energy per area [J/cm²]", 13 * mm, True),
    ("levels reached (legend)", 15 * mm, False),
    ("drift max<br/>[m]", 11 * mm, True),
    ("zone radius<br/>[m]", 12 * mm, True),
)
#: Object table columns; the item name takes the width left over.
_OBJECT_COLUMNS = (
    ("item", FRAME_WIDTH - sum(width for _t, width, _r in _NUMBER_COLUMNS), False),
    *_NUMBER_COLUMNS,
)


def _zone_radius(value: object) -> str:
    """An item's own zone radius as page 1 prints a distance: rounded up to 0.1 m."""
    number = _finite(value)
    return "—" if number is None else keep_clear(number)


def _drag_range(row: dict[str, Any]) -> str:
    low, high = row.get("drag_area_min_m2"), row.get("drag_area_max_m2")
    if _finite(low) is None and _finite(high) is None:
        return "—"
    if _finite(high) is None or sig(low) == sig(high):
        return sig(low)
    return f"{sig(low)}–{sig(high)}"


def _objects(data: ReportData, styles: dict[str, ParagraphStyle]) -> list[Flowable]:
    out: list[Flowable] = [
        CondPageBreak(60 * mm),
        _heading("Objects", styles),
        Paragraph(
            f"{_text(_table_basis(data))}; highest impact energy first. Speeds and energy at "
            "the smallest drag area (the "
            "hardest hit); drift at the largest (the furthest carry); zone radius is the item's "
            "own distance in the widest work area. Levels reached are numbered as in the "
            "legend below the table.",
            styles["note"],
        ),
    ]
    if not data.object_rows:
        out.append(Paragraph("The scenario lists no objects.", styles["para"]))
        return out
    number_of = {key: str(i + 1) for i, (key, *_rest) in enumerate(data.levels)}
    header = [
        Paragraph(title, styles["head_right" if right else "head"])
        for title, _width, right in _OBJECT_COLUMNS
    ]
    cells: list[list[Any]] = [header]
    spans: list[tuple[Any, ...]] = []
    for index, row in enumerate(data.object_rows, start=1):
        label = _text(_item_label(row))
        if len(data.work_areas) > 1 and row.get("work_area"):
            label += f"<br/><i>{_text(row['work_area'])}, {sig(row.get('release_height_m'))} m</i>"
        item = Paragraph(label, styles["cell"])
        if row.get("error"):
            reason = Paragraph("not computed: " + _text(row["error"]), styles["cell"])
            cells.append([item, reason] + [""] * (len(_OBJECT_COLUMNS) - 2))
            spans.append(("SPAN", (1, index), (-1, index)))
            continue
        keys = [k.strip() for k in str(row.get("levels_exceeded") or "").split(";") if k.strip()]
        levels = ", ".join(number_of.get(k, k) for k in keys) or "none"
        cells.append(
            [
                item,
                str(row.get("quantity", "—") or "—"),
                sig(row.get("mass_kg")),
                _drag_range(row),
                sig(row.get("terminal_speed_max_m_s")),
                sig(row.get("impact_speed_max_m_s")),
                sig(row.get("impact_energy_max_j")),
                sig(row.get("energy_per_contact_area_j_cm2")),
                Paragraph(_text(levels), styles["cell"]),
                sig(row.get("drift_max_m")),
                _zone_radius(row.get("zone_radius_m")),
            ]
        )
    table = Table(
        cells,
        colWidths=[width for _title, width, _right in _OBJECT_COLUMNS],
        repeatRows=1,
        hAlign="LEFT",
    )
    style = _grid_style()
    for column, (_title, _width, right) in enumerate(_OBJECT_COLUMNS):
        if right:
            style.append(("ALIGN", (column, 1), (column, -1), "RIGHT"))
    table.setStyle(TableStyle(style + spans))
    out.append(table)
    out += _levels_legend(data, styles)
    return out


def _levels_legend(data: ReportData, styles: dict[str, ParagraphStyle]) -> list[Flowable]:
    if not data.levels:
        return []
    from dropcalc.model.reference_levels import CAUTION_LEVELS, REFERENCE_LEVELS

    cells: list[list[Any]] = [
        [
            Paragraph("no.", styles["head"]),
            Paragraph("key", styles["head"]),
            Paragraph("what the level is", styles["head"]),
            Paragraph("value", styles["head_right"]),
            Paragraph("source", styles["head"]),
        ]
    ]
    for number, (key, label, value, unit) in enumerate(data.levels, start=1):
        known = REFERENCE_LEVELS.get(key)
        source = known.source if known is not None else "given in the scenario"
        cells.append(
            [
                str(number),
                Paragraph(_text(key), styles["cell"]),
                Paragraph(_text(label), styles["cell"]),
                Paragraph(f"{value:.4g}\u00a0{_text(unit)}", styles["cell_right"]),
                Paragraph(_text(source), styles["cell"]),
            ]
        )
    table = Table(
        cells,
        colWidths=[8 * mm, 35 * mm, 60 * mm, 17 * mm, FRAME_WIDTH - 120 * mm],
        repeatRows=1,
        hAlign="LEFT",
    )
    table.setStyle(TableStyle(_grid_style()))
    return [
        Spacer(1, 8),
        KeepTogether(
            [
                Paragraph("Reference levels used", styles["h3"]),
                table,
                Spacer(1, 3),
                Paragraph(_text(CAUTION_LEVELS), styles["note"]),
            ]
        ),
    ]


_FIGURES = (
    (
        "side_view",
        "Side view: paths from the work edge to the ground at the smallest and the largest "
        "drag area, in the mean wind and in the gust.",
    ),
    (
        "energy_height",
        "Impact energy against release height for each object; the horizontal lines are the "
        "reference levels of the legend, labelled by what they are.",
    ),
)


def _figures(data: ReportData, styles: dict[str, ParagraphStyle]) -> list[Flowable]:
    shown: list[Flowable] = []
    for key, caption in _FIGURES:
        picture = _image(data.figures.get(key), FRAME_WIDTH, 105 * mm)
        if picture is None:
            continue
        number = len(shown) + 1
        shown.append(
            KeepTogether(
                [
                    picture,
                    Paragraph(f"<b>Figure {number}.</b> {_text(caption)}", styles["caption"]),
                    Spacer(1, 10),
                ]
            )
        )
    if not shown:
        return []
    return [CondPageBreak(90 * mm), _heading("Figures", styles), *shown]


def _code_rules(data: ReportData, styles: dict[str, ParagraphStyle]) -> list[Flowable]:
    if not data.code_rules:
        return []
    cells: list[list[Any]] = [
        [
            Paragraph("rule", styles["head"]),
            Paragraph("distance", styles["head"]),
            Paragraph("source", styles["head"]),
        ]
    ]
    cells += [
        [
            Paragraph(_text(rule), styles["cell"]),
            Paragraph(_text(distance), styles["cell"]),
            Paragraph(_text(source), styles["cell"]),
        ]
        for rule, distance, source in data.code_rules
    ]
    table = Table(
        cells, colWidths=[78 * mm, 38 * mm, FRAME_WIDTH - 116 * mm], repeatRows=1, hAlign="LEFT"
    )
    table.setStyle(TableStyle(_grid_style()))
    return [
        KeepTogether(
            [
                _heading("Distances from code rules, for comparison", styles),
                Paragraph(
                    "These are rules of thumb from codes and guidance. They are shown beside the "
                    "computed zone for comparison, not instead of it: where a rule gives more "
                    "than the computed distance, the competent person decides which applies.",
                    styles["note"],
                ),
                table,
            ]
        )
    ]


def _signoff(data: ReportData, styles: dict[str, ParagraphStyle]) -> list[Flowable]:
    job = data.job
    header = [Paragraph(title, styles["head"]) for title in ("role", "name", "signature", "date")]
    rows = [
        ("Prepared by", job.prepared_by),
        ("Checked by", job.checked_by),
        ("Approved by", ""),
    ]
    cells: list[list[Any]] = [header]
    cells += [
        [Paragraph(role, styles["value"]), Paragraph(_text(name), styles["value"]), "", ""]
        for role, name in rows
    ]
    table = Table(
        cells,
        colWidths=[30 * mm, 52 * mm, 58 * mm, FRAME_WIDTH - 140 * mm],
        rowHeights=[None] + [15 * mm] * len(rows),
        hAlign="LEFT",
    )
    table.setStyle(
        TableStyle(
            [
                ("BACKGROUND", (0, 0), (-1, 0), CIVIDIS_DARK),
                ("VALIGN", (0, 1), (-1, -1), "BOTTOM"),
                ("LEFTPADDING", (0, 0), (-1, -1), 4),
                ("BOTTOMPADDING", (0, 1), (-1, -1), 3),
                ("LINEBELOW", (1, 1), (-1, -1), 0.6, GREY_RULE),
                ("BOX", (0, 0), (-1, -1), 0.8, CIVIDIS_DARK),
            ]
        )
    )
    revision = _pairs_table(
        [
            ("Revision", job.revision or "—"),
            ("Report date", job.date or data.generated),
            ("Scenario", f"{data.scenario_name}, SHA-256 {data.scenario_sha256}"),
        ],
        styles,
        (30 * mm, FRAME_WIDTH - 30 * mm),
        zebra=False,
    )
    text = data.texts.get("signoff", "")
    return [
        KeepTogether(
            [
                _heading("Sign-off", styles),
                *text_blocks(text, styles),
                Spacer(1, 4),
                table,
                Spacer(1, 6),
                revision,
            ]
        )
    ]


class _EndOfAnswer(CondPageBreak):  # type: ignore[misc]  # reportlab is untyped
    """Start the detail on a new page if the answer fits page 1; else carry straight on.

    With several work areas page 1 overflows; the detail then follows the end of the answer
    on the same page instead of leaving most of a page blank.
    """

    def __init__(self) -> None:
        super().__init__(0)

    def wrap(self, availWidth: float, availHeight: float) -> tuple[float, float]:  # noqa: N803
        frame = self._doctemplateAttr("frame")
        if frame and self._doctemplateAttr("page") == 1:
            frame.add_generated_content(FrameBreak)
        return 0, 0


def _story(data: ReportData, styles: dict[str, ParagraphStyle]) -> list[Flowable]:
    story: list[Flowable] = _title_block(data, styles)
    story.append(Spacer(1, 8))
    for area in data.work_areas:
        story += [_work_area_box(area, data, styles), Spacer(1, 8)]
    if not data.work_areas:
        story.append(Paragraph("The scenario defines no work area.", styles["para"]))
    story += _warnings(data, styles)
    story += _highest_energy(data, styles)
    story += _controls(data, styles)
    story.append(_EndOfAnswer())
    story += _inputs(data, styles)
    story += _objects(data, styles)
    story += _figures(data, styles)
    method = data.texts.get("method", "")
    if method.strip():
        story += [CondPageBreak(50 * mm), _heading("Method", styles), *text_blocks(method, styles)]
    story += _code_rules(data, styles)
    cautions = data.texts.get("cautions", "")
    if cautions.strip():
        story += [
            CondPageBreak(40 * mm),
            _heading("Cautions", styles),
            *text_blocks(cautions, styles),
        ]
    story += _signoff(data, styles)
    return story


# --------------------------------------------------------------------------------------------
# Header, footer, page numbers


def _page_decorations(data: ReportData) -> Callable[[pdfcanvas.Canvas, BaseDocTemplate], None]:
    """The onPage callback: header and footer, except "page N of M" (drawn at save)."""
    job = data.job
    reference = " · ".join(
        part
        for part in (
            f"ref. {job.reference}" if job.reference else "",
            f"rev. {job.revision}" if job.revision else "",
        )
        if part
    )
    report_date = job.date or data.generated[:10]
    trace = f"scenario {data.scenario_name} sha256 {data.scenario_sha256[:16]}…"
    origin = f"dropcalc {data.software_version} · report date {report_date}"

    def draw(canvas: pdfcanvas.Canvas, _doc: BaseDocTemplate) -> None:
        canvas.saveState()
        left, right = MARGIN_SIDE, PAGE_WIDTH - MARGIN_SIDE
        top = PAGE_HEIGHT - 11 * mm
        reference_width = pdfmetrics.stringWidth(reference, SANS, 7.5)
        canvas.setFillColor(GREY_TEXT)
        canvas.setFont(SANS_BOLD, 7.5)
        canvas.drawString(
            left, top, _fit(job.title, SANS_BOLD, 7.5, FRAME_WIDTH - reference_width - 12)
        )
        canvas.setFont(SANS, 7.5)
        canvas.drawRightString(right, top, reference)
        canvas.setStrokeColor(GREY_RULE)
        canvas.setLineWidth(0.4)
        canvas.line(left, top - 3, right, top - 3)

        bottom = 10 * mm
        canvas.line(left, bottom + 9.5, right, bottom + 9.5)
        canvas.setFont(SANS, 6.8)
        canvas.drawString(left, bottom + 2.5, _fit(trace, SANS, 6.8, FRAME_WIDTH - 70))
        canvas.drawString(left, bottom - 6, _fit(origin, SANS, 6.8, FRAME_WIDTH - 70))
        canvas.restoreState()

    return draw


def _numbered_canvas(pages: list[int]) -> type[pdfcanvas.Canvas]:
    """A canvas that holds its pages until save, then writes "page N of M" on each.

    The page total goes into ``pages`` so :func:`write_report` can return it.
    """

    class NumberedCanvas(pdfcanvas.Canvas):  # type: ignore[misc]  # reportlab is untyped
        def __init__(self, *args: Any, **kwargs: Any) -> None:
            super().__init__(*args, **kwargs)
            self._held_pages: list[dict[str, Any]] = []

        def showPage(self) -> None:  # noqa: N802 (reportlab's name)
            self._held_pages.append(dict(self.__dict__))
            self._startPage()

        def save(self) -> None:
            total = len(self._held_pages)
            for number, state in enumerate(self._held_pages, start=1):
                self.__dict__.update(state)
                self.saveState()
                self.setFillColor(INK)
                self.setFont(SANS_BOLD, 7.5)
                self.drawRightString(
                    PAGE_WIDTH - MARGIN_SIDE, 10 * mm + 2.5, f"page {number} of {total}"
                )
                self.restoreState()
                super().showPage()
            pages.append(total)
            super().save()

    return NumberedCanvas


# --------------------------------------------------------------------------------------------
# Public entry point


def write_report(data: ReportData, path: Path) -> int:
    """Write the PDF report for ``data`` to ``path`` and return its number of pages.

    The file is built under a temporary name in the same folder and renamed over ``path``
    only when complete: an error during the build leaves no new file and any old file at
    ``path`` untouched.

    Parameters
    ----------
    data : ReportData
        Everything the report shows, computed beforehand.
    path : pathlib.Path
        Target file (its folder must exist).

    Returns
    -------
    int
        Number of pages written.

    Raises
    ------
    InputError
        If the folder does not exist or the file cannot be written.
    """
    _register_fonts()
    styles = _styles()
    pages: list[int] = []

    def build(temporary: Path) -> None:
        doc = BaseDocTemplate(
            str(temporary),
            pagesize=A4,
            leftMargin=MARGIN_SIDE,
            rightMargin=MARGIN_SIDE,
            topMargin=MARGIN_TOP,
            bottomMargin=MARGIN_BOTTOM,
            title=f"{data.job.title}: dropped objects report",
            author=data.job.prepared_by or "dropcalc",
            subject=f"scenario {data.scenario_name} sha256 {data.scenario_sha256}",
            creator=f"dropcalc {data.software_version}",
        )
        frame = Frame(
            doc.leftMargin, doc.bottomMargin, doc.width, doc.height, id="body",
            leftPadding=0, rightPadding=0, topPadding=0, bottomPadding=0,
        )  # fmt: skip
        doc.addPageTemplates(
            [PageTemplate(id="page", frames=[frame], onPage=_page_decorations(data))]
        )
        doc.build(_story(data, styles), canvasmaker=_numbered_canvas(pages))

    write_atomic(Path(path), build)
    return pages[-1]


__all__ = ["keep_clear", "sig", "text_blocks", "write_report"]
