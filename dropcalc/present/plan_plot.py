"""Site-plan drawing of the ground exclusion area (PNG or SVG).

The map (left) shows the building outline, the work edges with their release heights and the
exclusion area in local metres with a scale bar; the panel on the right holds the key, a north
arrow and the wind arrow. The exclusion area is shaded from the cividis colour map (sequential,
colour-blind safe); the building is a light neutral grey.

matplotlib is imported inside :func:`plot_plan` only (Agg canvas, no pyplot state), so importing
this module costs nothing.
"""

from __future__ import annotations

import functools
import math
from collections.abc import Callable
from pathlib import Path
from typing import Any, TypeVar

from shapely.geometry import MultiPolygon, Polygon

from dropcalc.analysis.plan import ExclusionArea, Site, segment_normals
from dropcalc.errors import InputError, require_suffix
from dropcalc.io.atomic import write_atomic
from dropcalc.texts import format_area, keep_clear

PLOT_FORMATS = (".png", ".svg")

_Drawing = TypeVar("_Drawing", bound=Callable[..., Any])


def literal_text(draw: _Drawing) -> _Drawing:
    r"""Run a drawing function with every text drawn literally, as typed.

    Names and labels come from users: "north $\frac{1}$ eave" or "cost $x^$ tile" must be drawn
    as written, not read as math markup (which fails on them) or passed to a TeX installation.
    matplotlib takes ``text.parse_math`` and ``text.usetex`` when each text is created.
    """

    @functools.wraps(draw)
    def wrapper(*args: Any, **kwargs: Any) -> Any:
        import matplotlib

        with matplotlib.rc_context({"text.parse_math": False, "text.usetex": False}):
            return draw(*args, **kwargs)

    return wrapper  # type: ignore[return-value]


#: Positions on the cividis colour map (0 dark blue ... 1 yellow) of the area fill and outline.
AREA_FILL_LEVEL = 0.80
AREA_EDGE_LEVEL = 0.08

BUILDING_FILL = "#e4e2de"
BUILDING_EDGE = "#6f6c66"
WORK_EDGE_COLOUR = "#1b1b1b"
INK = "#2b2b2b"

#: Figure size [inch] and the map's rectangle in figure fractions (left, bottom, width, height).
FIGURE_SIZE = (10.5, 7.2)
MAP_RECT = (0.08, 0.09, 0.64, 0.80)
#: Figure size of the plan on the report's answer page [inch]: printed across the page
#: (174 mm), its 8.5 pt text reads at about 7 pt.
REPORT_FIGURE_SIZE = (8.2, 4.7)


def nice_length(span: float) -> float:
    """A round scale-bar length (1, 2 or 5 times a power of ten) near a fifth of ``span`` [m]."""
    target = max(span, 1e-9) / 5.0
    power = 10.0 ** math.floor(math.log10(target))
    for step in (5.0, 2.0, 1.0):
        if step * power <= target:
            return step * power
    return power  # pragma: no cover - the loop always returns for step 1


def _polygon_path(geometry: Polygon | MultiPolygon) -> Any:
    """A matplotlib Path of a (Multi)Polygon, holes included."""
    from matplotlib.path import Path as MplPath

    vertices: list[tuple[float, float]] = []
    codes: list[int] = []
    parts = geometry.geoms if isinstance(geometry, MultiPolygon) else [geometry]
    for part in parts:
        for ring in (part.exterior, *part.interiors):
            coordinates = list(ring.coords)
            vertices.extend(coordinates)
            codes.extend(
                [int(MplPath.MOVETO)]
                + [int(MplPath.LINETO)] * (len(coordinates) - 2)
                + [int(MplPath.CLOSEPOLY)]
            )
    return MplPath(vertices, codes)


def _draw_north_arrow(axes: Any) -> None:
    from matplotlib.patches import Polygon as MplPolygon

    axes.set_xlim(-1, 1)
    axes.set_ylim(-1.25, 1.25)
    axes.set_aspect("equal")
    axes.axis("off")
    axes.add_patch(MplPolygon([(0, 0.75), (-0.32, -0.65), (0, -0.38)], color=INK, lw=0))
    axes.add_patch(
        MplPolygon([(0, 0.75), (0.32, -0.65), (0, -0.38)], facecolor="white", edgecolor=INK, lw=1)
    )
    axes.text(0, 0.82, "N", ha="center", va="bottom", fontsize=13, weight="bold", color=INK)
    axes.text(0, -0.85, "north", ha="center", va="top", fontsize=8.5, color=INK)


def _draw_wind_arrow(axes: Any, wind_toward_deg: float | None, wind_label: str) -> None:
    from matplotlib.patches import Circle, FancyArrow

    axes.set_xlim(-1, 1)
    axes.set_ylim(-1.25, 1.25)
    axes.set_aspect("equal")
    axes.axis("off")
    axes.add_patch(Circle((0, 0), 0.72, facecolor="none", edgecolor="#b9b6b0", lw=1, ls=":"))
    if wind_toward_deg is None:
        axes.text(0, 0, "wind\nnot given", ha="center", va="center", fontsize=8.5, color=INK)
        if wind_label:
            axes.text(0, -0.85, wind_label, ha="center", va="top", fontsize=8.5, color=INK)
        return
    bearing = math.radians(wind_toward_deg)
    east, north = math.sin(bearing), math.cos(bearing)
    length = 1.25
    axes.add_patch(
        FancyArrow(
            -0.5 * length * east,
            -0.5 * length * north,
            length * east,
            length * north,
            width=0.12,
            head_width=0.36,
            head_length=0.3,
            length_includes_head=True,
            color=INK,
        )
    )
    text = f"wind toward {wind_toward_deg % 360:03.0f}°"
    if wind_label:
        text += f"\n{wind_label}"
    axes.text(0, -0.85, text, ha="center", va="top", fontsize=8.5, color=INK)


def _label_edges(axes: Any, site: Site, offset: float) -> None:
    for edge in site.edges:
        lengths = [
            math.hypot(bx - ax, by - ay)
            for (ax, ay), (bx, by) in zip(edge.points[:-1], edge.points[1:], strict=True)
        ]
        longest = max(range(len(lengths)), key=lengths.__getitem__)
        (ax, ay), (bx, by) = edge.points[longest], edge.points[longest + 1]
        normal = segment_normals(site, edge)[longest]
        # Inside the building (against the outward normal): the label never covers the area.
        x = (ax + bx) / 2 - offset * normal[0]
        y = (ay + by) / 2 - offset * normal[1]
        angle = math.degrees(math.atan2(by - ay, bx - ax))
        if angle > 90:
            angle -= 180
        elif angle <= -90:
            angle += 180
        axes.text(
            x,
            y,
            f"{edge.name}, {edge.height:.3g} m",
            rotation=angle,
            rotation_mode="anchor",
            ha="center",
            va="center",
            fontsize=8,
            color=INK,
            linespacing=1.25,
            bbox={
                "boxstyle": "round,pad=0.25",
                "facecolor": "white",
                "edgecolor": "none",
                "alpha": 0.85,
            },
            zorder=6,
        )


@literal_text
def plot_plan(
    area: ExclusionArea,
    site: Site,
    wind_toward_deg: float | None,
    path: Path,
    title: str = "",
    wind_label: str = "",
    size: tuple[float, float] = FIGURE_SIZE,
) -> None:
    """Draw the site plan with the exclusion area and write it as PNG or SVG.

    The file is rendered to a temporary file in the target folder and renamed over ``path``
    only when complete, so an error leaves the old file (or no file) in place.

    Parameters
    ----------
    area : ExclusionArea
        The exclusion area (local metres).
    site : Site
        Building outline and work edges (local metres).
    wind_toward_deg : float or None
        Bearing the wind blows toward, clockwise from north; None if no wind was given.
        [degrees]
    path : pathlib.Path
        Output file; the suffix (.png or .svg) chooses the format.
    title : str
        Title printed above the map; a plain default when empty.
    wind_label : str
        Text under the wind arrow, e.g. ``"8 m/s at 10 m"``.
    size : (float, float)
        Figure size (width, height) [inch]. The text keeps its point size, so a smaller figure
        printed at a given width reads larger (the report uses :data:`REPORT_FIGURE_SIZE`).

    Raises
    ------
    InputError
        If the suffix is not .png or .svg, the wind bearing is not finite, or the folder
        cannot be written.
    """
    path = Path(path)
    suffix = require_suffix(path, PLOT_FORMATS, "plan file")
    if wind_toward_deg is not None and not math.isfinite(float(wind_toward_deg)):
        raise InputError(
            f"wind_toward_deg must be a finite bearing in degrees; got {wind_toward_deg}"
        )

    import matplotlib
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.figure import Figure
    from matplotlib.lines import Line2D
    from matplotlib.patches import Patch, PathPatch
    from mpl_toolkits.axes_grid1.anchored_artists import AnchoredSizeBar

    cividis = matplotlib.colormaps["cividis"]
    area_fill = cividis(AREA_FILL_LEVEL)
    area_edge = cividis(AREA_EDGE_LEVEL)

    figure = Figure(figsize=size, dpi=150)
    FigureCanvasAgg(figure)
    axes = figure.add_axes(MAP_RECT)

    # Extent: everything drawn, padded, with a square-ish frame.
    bounds = [area.polygon.bounds]
    outline = site.outline_polygon
    if outline is not None:
        bounds.append(outline.bounds)
    bounds.extend(edge.line.bounds for edge in site.edges)
    x0 = min(b[0] for b in bounds)
    y0 = min(b[1] for b in bounds)
    x1 = max(b[2] for b in bounds)
    y1 = max(b[3] for b in bounds)
    span = max(x1 - x0, y1 - y0, 1.0)
    pad = 0.08 * span
    # Widen the shorter side so that one metre is as long east as north (equal aspect) in a
    # frame of the axes' own proportions.
    frame_ratio = (MAP_RECT[2] * size[0]) / (MAP_RECT[3] * size[1])
    width, height = x1 - x0 + 2 * pad, y1 - y0 + 2 * pad
    if width / height < frame_ratio:
        width = height * frame_ratio
    else:
        height = width / frame_ratio
    centre_x, centre_y = (x0 + x1) / 2, (y0 + y1) / 2
    axes.set_xlim(centre_x - width / 2, centre_x + width / 2)
    axes.set_ylim(centre_y - height / 2, centre_y + height / 2)
    axes.set_aspect("equal", adjustable="box")

    axes.add_patch(
        PathPatch(
            _polygon_path(area.polygon),
            facecolor=area_fill,
            edgecolor=area_edge,
            lw=1.8,
            alpha=0.9,
            zorder=2,
        )
    )
    beyond = area.beyond_building
    has_beyond = beyond is not None and not beyond.is_empty and beyond.area > 0
    if has_beyond:
        axes.add_patch(
            PathPatch(
                _polygon_path(beyond),
                facecolor="none",
                edgecolor=area_edge,
                hatch="///",
                lw=0.0,
                zorder=2.5,
            )
        )
    if outline is not None:
        axes.add_patch(
            PathPatch(
                _polygon_path(outline),
                facecolor=BUILDING_FILL,
                edgecolor=BUILDING_EDGE,
                lw=1.0,
                zorder=3,
            )
        )
    for edge in site.edges:
        xs, ys = zip(*edge.points, strict=True)
        axes.plot(xs, ys, color=WORK_EDGE_COLOUR, lw=3.2, solid_capstyle="round", zorder=5)
    _label_edges(axes, site, offset=0.035 * span)

    axes.grid(True, color="#d9d7d2", lw=0.6, ls=":")
    axes.set_axisbelow(True)
    axes.set_xlabel("east (m)")
    axes.set_ylabel("north (m)")
    axes.tick_params(labelsize=8.5, colors=INK)
    for spine in axes.spines.values():
        spine.set_color("#9a978f")

    scale = nice_length(span)
    axes.add_artist(
        AnchoredSizeBar(
            axes.transData,
            scale,
            f"{scale:g} m",
            loc="lower left",
            pad=0.5,
            borderpad=0.6,
            sep=4,
            size_vertical=span / 180,
            color=INK,
            frameon=True,
            fontproperties={"size": 8.5},
        )
    )
    axes.artists[-1].patch.set(  # type: ignore[attr-defined]  # an AnchoredSizeBar
        facecolor="white", alpha=0.85, edgecolor="none"
    )

    figure.text(
        0.08,
        0.94,
        title or "Ground exclusion area, site plan",
        fontsize=13,
        weight="bold",
        color=INK,
        ha="left",
    )

    # Key panel on the right.
    compact = size[1] < 6.0  # the report's plan: the key takes more of the height
    key = figure.add_axes((0.745, 0.36, 0.25, 0.56) if compact else (0.745, 0.52, 0.24, 0.37))
    key.axis("off")
    handles = [
        Patch(
            facecolor=area_fill,
            edgecolor=area_edge,
            lw=1.8,
            label=f"exclusion area\n{format_area(area.area_m2)} m², reaches\n"
            f"{keep_clear(area.max_distance_m)} m from the\nnearest work edge",
        ),
        Line2D([], [], color=WORK_EDGE_COLOUR, lw=3.2, label="work edge, with its\nrelease height"),
    ]
    if has_beyond:
        handles.insert(
            1,
            Patch(
                facecolor=area_fill,
                edgecolor=area_edge,
                hatch="///",
                lw=0.0,
                label=f"of it {format_area(area.beyond_building_m2)} m² reached\nonly over or "
                "around\nthe building (deflection\noff the structure is\nnot modelled)",
            ),
        )
    if outline is not None:
        handles.append(
            Patch(facecolor=BUILDING_FILL, edgecolor=BUILDING_EDGE, label="building outline")
        )
    key.legend(
        handles=handles,
        loc="upper left",
        frameon=False,
        fontsize=8 if compact else 9,
        labelspacing=0.8 if compact else 1.1,
        handlelength=2.2,
        title="Key",
        title_fontproperties={"weight": "bold", "size": 10},
        alignment="left",
    )
    arrows_y, arrows_h = (0.06, 0.24) if compact else (0.30, 0.20)
    _draw_north_arrow(figure.add_axes((0.75, arrows_y, 0.10, arrows_h)))
    _draw_wind_arrow(
        figure.add_axes((0.875, arrows_y, 0.10, arrows_h)), wind_toward_deg, wind_label
    )

    image_format = suffix.lstrip(".")
    write_atomic(path, lambda temporary: figure.savefig(temporary, format=image_format))
