"""Figures for the PDF report and ``dropcalc fall --plot``: fall paths and energy by height.

:func:`side_view` draws the paths of falling objects seen from the side, height above the
ground against the distance out from the work edge. :func:`energy_height` draws the impact
energy of each object against its release height with reference energy levels as labelled
lines. :func:`fall_figure` is the side view of one ``dropcalc fall`` result.

Line colours come from a colour-blind-safe qualitative set (:data:`OBJECT_COLOURS`), one per
object; everything else is a neutral grey. matplotlib is imported inside the drawing functions only
(an Agg canvas on a :class:`matplotlib.figure.Figure`, no pyplot state), so importing this
module costs nothing. Files are written through :func:`dropcalc.io.atomic.write_atomic`: an error
while drawing or writing leaves no partial file.

How the paths are computed
--------------------------
:func:`trajectory_paths` asks the trajectory engine
(:func:`dropcalc.physics.trajectory.solve_falls`) to record the path it integrates
(``record_path=True``) and samples it with :func:`dropcalc.physics.trajectory.sample_path`
(cubic Hermite between the engine's steps). The drawing follows the engine's own solution, and
every path ends at the engine's contact point; every number reported comes from the engine.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, field
from pathlib import Path
from typing import TYPE_CHECKING, Any

import numpy as np
from numpy.typing import ArrayLike, NDArray

from dropcalc.errors import InputError, require_suffix
from dropcalc.io.atomic import write_atomic
from dropcalc.physics.constants import STANDARD_GRAVITY
from dropcalc.physics.trajectory import WindField, sample_path, solve_falls
from dropcalc.present.plan_plot import literal_text
from dropcalc.texts import keep_clear

if TYPE_CHECKING:
    from dropcalc.analysis.fall import FallResult

FIGURE_FORMATS = (".png", ".svg")
#: Resolution of PNG files [dots per inch].
PNG_DPI = 200

#: Number of release heights of an energy curve.
ENERGY_CURVE_POINTS = 60
#: Lowest release height of an energy curve. [m]
ENERGY_CURVE_LOWEST = 0.5

# Palette: cividis positions for the objects (its pale yellow end is avoided: low contrast on
# white), and neutral greys for everything else.
GUST_LIGHTEN = 0.45
INK = "#2b2b2b"
STRUCTURE_FILL = "#dedcd8"
STRUCTURE_EDGE = "#6f6c66"
GROUND = "#4a4843"
GRID = "#dcdad6"
LEVEL_GREY = "#77746d"
LARGEST_DRAG_DASHES = (0, (5.0, 2.4))


# --------------------------------------------------------------------------------------------
# Paths
# --------------------------------------------------------------------------------------------


def trajectory_paths(
    release_height: ArrayLike,
    initial_velocity: ArrayLike,
    drag_parameter: ArrayLike,
    *,
    gravity: ArrayLike = STANDARD_GRAVITY,
    wind: WindField | None = None,
    samples: int = 200,
    max_distance: float = 20000.0,
) -> list[NDArray[np.float64]]:
    """Paths of falls from release to ground contact, for drawing.

    One :func:`~dropcalc.physics.trajectory.solve_falls` call with ``record_path=True``
    integrates every fall (the closed form is not used, so every fall has a path) and keeps
    the state at each of its accepted steps; each path is then sampled at ``samples`` even
    times from 0 to the fall's end time T by the cubic Hermite interpolant of the positions
    and velocities at the ends of the step holding each time
    (:func:`~dropcalc.physics.trajectory.sample_path`). The first sample is the release, the
    last the engine's contact point.

    Parameters
    ----------
    release_height : float or array, shape (n,)
        Height of the release point above the landing surface, > 0. [m]
    initial_velocity : array, shape (3,) or (3, n)
        Ground-frame velocity at release (east, north, up). [m/s]
    drag_parameter : float or array, shape (n,)
        k = rho C_d A / (2 m), >= 0. [1/m]
    gravity : float or array, shape (n,)
        Acceleration of gravity. [m/s^2]
    wind : WindField, optional
        The wind; still air when omitted.
    samples : int
        Points per path, >= 2.
    max_distance : float
        Falls carried further than this horizontally are stopped there, as in ``solve_falls``
        (their path ends in the air). [m]

    Returns
    -------
    list of numpy.ndarray, each shape (4, samples)
        One array per fall; rows time [s], east [m], north [m] and height [m], relative to
        the point on the ground below the release point. The last column is the engine's
        ground contact (height 0) or, for a fall that did not land, where it was stopped.

    Raises
    ------
    ValueError
        For fewer than 2 samples or shapes that do not broadcast (programming errors).

    References
    ----------
    .. [1] Hairer, E., Norsett, S. P. and Wanner, G., *Solving Ordinary Differential Equations
       I*, 2nd ed. (1993), sec. II.6 (dense output; Hermite interpolation).
    """
    if samples < 2:
        raise ValueError("samples must be at least 2")
    solution = solve_falls(
        release_height,
        initial_velocity,
        drag_parameter,
        gravity=gravity,
        wind=wind,
        max_distance=max_distance,
        record_path=True,
    )
    tracks = []
    for path in solution.paths or ():  # record_path=True: one path per fall
        times = np.linspace(0.0, path[0, -1], samples)
        tracks.append(np.vstack([times, sample_path(path, times)]))
    return tracks


# --------------------------------------------------------------------------------------------
# Energy against release height
# --------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class EnergyCurve:
    """One object of the energy-height figure.

    Attributes
    ----------
    label : str
        Name in the legend.
    mass : float
        Mass of the object. [kg]
    drag_parameter : float
        k = rho C_d A / (2 m) (use the smallest drag area: the highest energy). [1/m]
    gravity : float
        Acceleration of gravity. [m/s^2]
    wind : WindField or None
        Wind with scalar values; None for still air.
    initial_velocity : tuple of 3 floats
        Ground-frame velocity at release (east, north, up). [m/s]
    """

    label: str
    mass: float
    drag_parameter: float
    gravity: float = STANDARD_GRAVITY
    wind: WindField | None = None
    initial_velocity: tuple[float, float, float] = (0.0, 0.0, 0.0)


def energy_curve_heights(max_height: float) -> NDArray[np.float64]:
    """About :data:`ENERGY_CURVE_POINTS` release heights [m] from 0.5 m to ``max_height``.

    Half evenly spaced, half geometrically spaced (denser low down, where the energy changes
    fastest on the figure's logarithmic axis).
    """
    half = ENERGY_CURVE_POINTS // 2
    return np.unique(
        np.concatenate(
            [
                np.linspace(ENERGY_CURVE_LOWEST, max_height, half),
                np.geomspace(ENERGY_CURVE_LOWEST, max_height, ENERGY_CURVE_POINTS - half),
            ]
        )
    )


def energy_curve(curve: EnergyCurve, heights: ArrayLike) -> np.ma.MaskedArray:
    """Impact energy ½ m |v|² of one object released from each height (one engine call).

    Parameters
    ----------
    curve : EnergyCurve
        The object, its drag, the wind and the release velocity.
    heights : array, shape (n,)
        Release heights, > 0. [m]

    Returns
    -------
    numpy.ma.MaskedArray, shape (n,)
        Kinetic energy at ground contact [J]; masked where the object did not land (carried
        away by the wind), so those heights are left out of the drawing.
    """
    h = np.asarray(heights, dtype=float)
    solution = solve_falls(
        h,
        np.asarray(curve.initial_velocity, dtype=float),
        curve.drag_parameter,
        gravity=curve.gravity,
        wind=curve.wind,
    )
    speed_squared = np.sum(solution.velocity**2, axis=0)
    energy = 0.5 * curve.mass * speed_squared
    return np.ma.masked_array(energy, mask=~solution.landed)


# --------------------------------------------------------------------------------------------
# Side view
# --------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class PlateFlight:
    """A sheet flown by the plate model in a side view (:mod:`dropcalc.physics.plate`).

    Attributes
    ----------
    mass : float
        [kg]
    chord, span, thickness : float
        Side in the plane of the wind, side across it, thickness. [m]
    air_density : float
        [kg/m^3]
    pitch : float
        Pitch at release. [deg]
    spin : float
        Pitch rate at release. [rad/s]
    """

    mass: float
    chord: float
    span: float
    thickness: float
    air_density: float
    pitch: float
    spin: float


#: Drag bound names accepted in ``SideViewCase.style_key`` (smallest, largest drag area).
DRAG_BOUND_NAMES = {"min": False, "smallest": False, "max": True, "largest": True}


@dataclass(frozen=True)
class SideViewCase:
    """One path of the side view.

    How the path is drawn is given either by ``largest_drag`` and ``gust`` (and ``label``
    naming the object), or by ``style_key``, which then sets all three.

    Attributes
    ----------
    label : str
        Object name: paths of the same object share a colour and one legend entry (unless
        ``style_key`` names the object).
    release_height : float
        Height of the release point above the ground. [m]
    initial_velocity : tuple of 3 floats or array, shape (3,)
        Ground-frame velocity at release (east, north, up). [m/s]
    drag_parameter : float
        k = rho C_d A / (2 m). [1/m]
    gravity : float
        Acceleration of gravity. [m/s^2]
    wind : WindField
        Wind with scalar values (or arrays of length 1).
    style_key : tuple of (str, str, str) or None
        (object name, drag bound, wind kind): the drag bound is "min"/"smallest" or
        "max"/"largest", the wind kind "mean" (or any name of the given wind) or one that
        contains "gust". Overrides ``largest_drag`` and ``gust``; the object name groups the
        colours instead of ``label``.
    edge_azimuth : float
        Direction the edge faces (away from the structure), clockwise from north; the
        horizontal axis is the distance along it. [deg]
    largest_drag : bool
        The path is for the object's largest drag area (dashed line); False for its smallest
        or only drag area (solid line).
    gust : bool
        The path is in the gust (lighter tone, open landing marker); False for the mean or
        given wind.
    plate : PlateFlight or None
        A sheet flown by the plate model (``drag_parameter`` is then not used); the smallest
        and largest drag bounds stand for its attitudes of highest energy and longest drift.

    Raises
    ------
    ValueError
        For a ``style_key`` that is not three strings or names an unknown drag bound.
    """

    label: str
    release_height: float
    initial_velocity: Any
    drag_parameter: float
    gravity: float = STANDARD_GRAVITY
    wind: WindField = field(default_factory=WindField)
    style_key: tuple[str, str, str] | None = None
    edge_azimuth: float = 90.0
    largest_drag: bool = False
    gust: bool = False
    plate: PlateFlight | None = None

    def __post_init__(self) -> None:
        if self.style_key is None:
            return
        if len(self.style_key) != 3:
            raise ValueError(
                f"style_key must be (object, drag bound, wind kind); got {self.style_key!r}"
            )
        _, bound, kind = self.style_key
        if bound not in DRAG_BOUND_NAMES:
            raise ValueError(
                f"style_key drag bound must be one of {', '.join(DRAG_BOUND_NAMES)}; got {bound!r}"
            )
        object.__setattr__(self, "largest_drag", DRAG_BOUND_NAMES[bound])
        object.__setattr__(self, "gust", "gust" in str(kind).lower())

    @property
    def object_name(self) -> str:
        """Name that groups the paths of one object (one colour, one legend entry)."""
        return self.label if self.style_key is None else str(self.style_key[0])


def _scalar(value: ArrayLike) -> float:
    return float(np.ravel(np.asarray(value, dtype=float))[0])


def _case_paths(cases: Sequence[SideViewCase], max_distance: float) -> list[NDArray[np.float64]]:
    """Paths of the cases, one :func:`trajectory_paths` call per wind profile law."""
    tracks: list[NDArray[np.float64] | None] = [None] * len(cases)
    for i, case in enumerate(cases):
        if case.plate is not None:
            tracks[i] = _plate_track(case, max_distance)
    for profile in dict.fromkeys(c.wind.profile for c in cases if c.plate is None):
        chosen = [i for i, c in enumerate(cases) if c.wind.profile == profile and c.plate is None]
        group = [cases[i] for i in chosen]

        def column(name: str, group: list[SideViewCase] = group) -> NDArray[np.float64]:
            return np.array([_scalar(getattr(c.wind, name)) for c in group])

        wind = WindField(
            speed_10m=column("speed_10m"),
            toward_east=column("toward_east"),
            toward_north=column("toward_north"),
            profile=profile,
            exponent=column("exponent"),
            roughness_length=column("roughness_length"),
            minimum_height=column("minimum_height"),
        )
        paths = trajectory_paths(
            np.array([c.release_height for c in group], dtype=float),
            np.stack([np.asarray(c.initial_velocity, dtype=float).reshape(3) for c in group], 1),
            np.array([c.drag_parameter for c in group], dtype=float),
            gravity=np.array([c.gravity for c in group], dtype=float),
            wind=wind,
            max_distance=max_distance,
        )
        for i, track in zip(chosen, paths, strict=True):
            tracks[i] = track
    return [track for track in tracks if track is not None]


def _plate_track(
    case: SideViewCase, max_distance: float, samples: int = 200
) -> NDArray[np.float64]:
    """Path (rows time, east, north, height) of a sheet flown by the plate model."""
    from dropcalc.physics.plate import PlateGeometry, solve_plate_falls

    p = case.plate
    assert p is not None
    solution = solve_plate_falls(
        case.release_height, np.asarray(case.initial_velocity, dtype=float).reshape(3), p.mass,
        PlateGeometry(p.chord, p.span, p.thickness), p.air_density, initial_pitch=p.pitch,
        initial_spin=p.spin, gravity=case.gravity, wind=case.wind, max_distance=max_distance,
        record_path=True,
    )  # fmt: skip
    path = solution.paths[0] if solution.paths else np.zeros((7, 1))
    times = np.linspace(0.0, path[0, -1], samples)
    return np.vstack([times, sample_path(path, times)])


def _figure_format(path: Path, what: str) -> str:
    return require_suffix(path, FIGURE_FORMATS, f"{what} file").lstrip(".")


def _save(figure: Any, path: Path, image_format: str) -> None:
    """Write the figure atomically (PNG at :data:`PNG_DPI`, SVG without a date stamp)."""
    metadata = {"Date": None} if image_format == "svg" else None

    def write(temporary: Path) -> None:
        figure.savefig(temporary, format=image_format, dpi=PNG_DPI, metadata=metadata)

    write_atomic(path, write)


#: Line colours, one per object: the colour-blind-safe qualitative set of [OKABE-ITO-2008]
#: (blue, vermillion, bluish green, reddish purple, orange, sky blue, black), chosen to be told
#: apart by hue and lightness under the common colour-vision deficiencies. Yellow is left out:
#: it is too light on white.
OBJECT_COLOURS = ("#0072B2", "#D55E00", "#009E73", "#CC79A7", "#E69F00", "#56B4E9", "#000000")


def _object_colours(labels: Sequence[str]) -> dict[str, Any]:
    """One colour of :data:`OBJECT_COLOURS` per distinct label (repeating past seven)."""
    from matplotlib.colors import to_rgba

    distinct = list(dict.fromkeys(labels))
    return {
        label: to_rgba(OBJECT_COLOURS[index % len(OBJECT_COLOURS)])
        for index, label in enumerate(distinct)
    }


def _lighter(colour: Any, amount: float) -> tuple[float, float, float]:
    red, green, blue = colour[:3]
    return (
        red + (1 - red) * amount,
        green + (1 - green) * amount,
        blue + (1 - blue) * amount,
    )


def _speed_text(wind: WindField) -> str:
    speed = _scalar(wind.speed_10m)
    return f"{speed:.3g} m/s at 10 m"


def _wind_kind_label(cases: Sequence[SideViewCase], gust: bool) -> str:
    chosen = [c for c in cases if c.gust == gust]
    speeds = {_speed_text(c.wind) for c in chosen}
    name = "gust" if gust else "mean wind"
    if not gust and all(_scalar(c.wind.speed_10m) == 0.0 for c in chosen):
        return "still air"
    return f"{name}, {speeds.pop()}" if len(speeds) == 1 else name


@literal_text
def side_view(
    path: Path,
    cases: list[SideViewCase],
    height: float,
    title: str = "",
    max_distance: float = 20000.0,
) -> None:
    """Draw fall paths seen from the side and write them as PNG or SVG.

    Height above the ground against the horizontal distance out from the edge (the component
    of the path along the edge's outward direction). The structure is a grey band at x <= 0 up
    to ``height``; landing points are marked. Colour: the object (cividis); line style: drag
    bound (solid smallest Cd·A, dashed largest); tone and marker: mean wind (full tone,
    filled marker) or gust (lighter tone, open marker).

    Parameters
    ----------
    path : pathlib.Path
        Output file; the suffix (.png or .svg) chooses the format.
    cases : list of SideViewCase
        The paths to draw.
    height : float
        Height of the work edge, to draw the structure. [m]
    title : str
        Title above the plot; a plain default when empty.
    max_distance : float
        Falls carried further than this are drawn up to there, marked as not landed. [m]

    Raises
    ------
    InputError
        If the suffix is not .png or .svg, there is no case, ``height`` is not a finite
        positive length, or the folder cannot be written.
    """
    path = Path(path)
    image_format = _figure_format(path, "side view")
    if not cases:
        raise InputError("side view needs at least one fall to draw; got none")
    if not (math.isfinite(height) and height > 0):
        raise InputError(f"height must be a finite length > 0 m; got {height:g} m", field="height")

    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.figure import Figure
    from matplotlib.lines import Line2D

    tracks = _case_paths(cases, max_distance)
    drawn = []
    for case, track in zip(cases, tracks, strict=True):
        azimuth = math.radians(case.edge_azimuth)
        out = track[1] * math.sin(azimuth) + track[2] * math.cos(azimuth)
        drawn.append((case, out, track[3]))

    colours = _object_colours([c.object_name for c in cases])
    figure = Figure(figsize=(8.6, 5.2), dpi=100)
    FigureCanvasAgg(figure)
    axes = figure.add_axes((0.085, 0.11, 0.57, 0.74))

    x_low = min(0.0, *(float(out.min()) for _, out, _ in drawn))
    x_high = max(0.0, *(float(out.max()) for _, out, _ in drawn))
    top = max(height, *(float(z.max()) for _, _, z in drawn))
    # At least a third of the height across, so a near-vertical fall is not a sliver.
    span = max(x_high - x_low, 0.35 * top)
    left = x_low - 0.14 * span
    right = max(x_high + 0.06 * (x_high - x_low), x_low + 1.06 * span)
    axes.set_xlim(left, right)
    axes.set_ylim(-0.035 * top, 1.08 * top)

    axes.fill_between(
        [left, 0.0], 0.0, height, facecolor=STRUCTURE_FILL, edgecolor="none", zorder=1
    )
    axes.plot([0.0, 0.0], [0.0, height], color=STRUCTURE_EDGE, lw=1.4, zorder=2)
    axes.plot([left, 0.0], [height, height], color=STRUCTURE_EDGE, lw=1.4, zorder=2)
    axes.text(
        0.5 * left,
        0.5 * height,
        "structure",
        rotation=90,
        ha="center",
        va="center",
        fontsize=8.5,
        color=STRUCTURE_EDGE,
        zorder=2,
    )
    axes.axhline(0.0, color=GROUND, lw=1.6, zorder=2)
    axes.axhspan(-0.035 * top, 0.0, facecolor="#efeeeb", edgecolor="none", zorder=0)

    farthest = None
    not_landed = False
    for case, out, z in drawn:
        colour = colours[case.object_name]
        tone = _lighter(colour, GUST_LIGHTEN) if case.gust else colour
        axes.plot(
            out,
            z,
            color=tone,
            lw=1.9,
            linestyle=LARGEST_DRAG_DASHES if case.largest_drag else "solid",
            zorder=4 if not case.gust else 3,
            solid_capstyle="round",
        )
        landed = abs(float(z[-1])) <= 1e-6 * max(case.release_height, 1.0)
        if landed:
            axes.plot(
                out[-1],
                0.0,
                marker="D" if case.gust else "o",
                markersize=6.5 if case.gust else 6.0,
                markerfacecolor="white" if case.gust else colour,
                markeredgecolor=colour,
                markeredgewidth=1.5,
                linestyle="none",
                zorder=6,
                clip_on=False,
            )
            if farthest is None or out[-1] > farthest:
                farthest = float(out[-1])
        else:
            not_landed = True
            axes.plot(out[-1], z[-1], marker="x", color=colour, markersize=7, zorder=6)

    axes.grid(True, color=GRID, lw=0.6)
    axes.set_axisbelow(True)
    axes.set_xlabel("horizontal distance out from the edge (m)", fontsize=9.5, color=INK)
    axes.set_ylabel("height above ground (m)", fontsize=9.5, color=INK)
    axes.tick_params(labelsize=8.5, colors=INK)
    for spine in axes.spines.values():
        spine.set_color("#9a978f")

    figure.text(
        0.085,
        0.93,
        title or "Fall paths seen from the side",
        fontsize=12.5,
        weight="bold",
        color=INK,
        ha="left",
    )
    if farthest is not None or not_landed:
        subtitle = (
            f"farthest landing point: {_metres(farthest)} out from the edge"
            if farthest is not None
            else "no landing point: still airborne where the model stops following the fall"
        )
        figure.text(
            0.085,
            0.885,
            subtitle,
            fontsize=9.5,
            color=INK,
            ha="left",
        )

    # Key in sections: colour = object; line style = drag bound; tone and marker = wind.
    grey = "#4f4d48"
    sections: list[tuple[str, list[Any]]] = [
        (
            "Object",
            [Line2D([], [], color=c, lw=2.6, label=_short(label)) for label, c in colours.items()],
        )
    ]
    if len({c.largest_drag for c in cases}) > 1:
        sheets = any(c.plate is not None for c in cases)  # drawn at attitudes, not areas
        sections.append(
            (
                "Drag area Cd·A",
                [
                    Line2D(
                        [], [], color=grey, lw=1.9,
                        label="smallest (sheet: highest energy)" if sheets else "smallest",
                    ),
                    Line2D(
                        [], [], color=grey, lw=1.9, linestyle=LARGEST_DRAG_DASHES,
                        label="largest (sheet: longest drift)" if sheets else "largest",
                    ),
                ],
            )
        )  # fmt: skip
    wind_handles = [
        Line2D(
            [],
            [],
            color=_lighter(_to_rgb(grey), GUST_LIGHTEN) if gust else grey,
            lw=1.9,
            marker="D" if gust else "o",
            markersize=6.5 if gust else 6.0,
            markerfacecolor="white" if gust else grey,
            markeredgecolor=grey,
            markeredgewidth=1.4,
            label=_wind_kind_label(cases, gust),
        )
        for gust in sorted({c.gust for c in cases})
    ]
    if not_landed:
        wind_handles.append(
            Line2D([], [], color=grey, marker="x", linestyle="none", label="still airborne")
        )
    sections.append(("Wind (marker: landing point)", wind_handles))
    handles: list[Any] = []
    headers: list[int] = []
    for header, entries in sections:
        headers.append(len(handles))
        handles.append(Line2D([], [], linestyle="none", label=header))
        handles += entries
    legend = figure.legend(
        handles=handles,
        loc="upper left",
        bbox_to_anchor=(0.685, 0.86),
        frameon=False,
        fontsize=8.5,
        labelspacing=0.75,
        handlelength=2.8,
        alignment="left",
    )
    for i in headers:
        legend.get_texts()[i].set_fontweight("bold")
        legend.get_texts()[i].set_fontsize(9)
    _save(figure, path, image_format)


def _metres(distance: float) -> str:
    """A distance from the edge as a reader keeps clear of it: rounded up to 0.1 m."""
    return f"{keep_clear(distance)} m"


def _to_rgb(colour: str) -> tuple[float, float, float]:
    from matplotlib.colors import to_rgb

    return to_rgb(colour)


# --------------------------------------------------------------------------------------------
# Energy-height figure
# --------------------------------------------------------------------------------------------


def _level_text(label: str, value: float) -> str:
    value_text = f"{value:g} J"
    return label if value_text in label else f"{label}: {value_text}"


def _spread(positions: Sequence[float], gap: float, low: float, high: float) -> list[float]:
    """Move sorted positions at least ``gap`` apart, each group centred where it wants to be.

    Overlapping labels are merged into groups laid out evenly about the mean of their wanted
    positions (so a cluster spreads both ways, not only upwards); the whole set is then
    shifted to stay within [low, high].
    """
    groups: list[list[float]] = []  # each: [sum of wanted positions, count]
    for position in positions:
        groups.append([position, 1.0])
        while len(groups) > 1:
            (sum_a, n_a), (sum_b, n_b) = groups[-2], groups[-1]
            top_a = sum_a / n_a + (n_a - 1) * gap / 2
            bottom_b = sum_b / n_b - (n_b - 1) * gap / 2
            if bottom_b - top_a >= gap:
                break
            groups[-2:] = [[sum_a + sum_b, n_a + n_b]]
    placed: list[float] = []
    for total, count in groups:
        centre = total / count
        placed += [centre + (j - (count - 1) / 2) * gap for j in range(int(count))]
    if placed and placed[-1] > high:
        placed = [min(p, high - (len(placed) - 1 - i) * gap) for i, p in enumerate(placed)]
    if placed and placed[0] < low:
        placed = [max(p, low + i * gap) for i, p in enumerate(placed)]
    return placed


@literal_text
def energy_height(
    path: Path,
    objects: list[EnergyCurve],
    levels: list[tuple[str, float]],
    max_height: float,
    title: str = "",
) -> None:
    """Draw impact energy against release height per object and write it as PNG or SVG.

    Each object's curve is one engine call over :data:`ENERGY_CURVE_POINTS` release heights
    from 0.5 m to ``max_height``; heights from which it is carried away are left out. Energy
    is on a logarithmic axis. Each reference level is a grey dashed line labelled at its right
    end with what it is and its value; labels of close levels are moved apart and tied to
    their line by a short leader.

    Parameters
    ----------
    path : pathlib.Path
        Output file; the suffix (.png or .svg) chooses the format.
    objects : list of EnergyCurve
        The objects.
    levels : list of (str, float)
        Reference levels: what each is, and its energy [J].
    max_height : float
        Highest release height drawn, > 0.5 m. [m]
    title : str
        Title above the plot; a plain default when empty.

    Raises
    ------
    InputError
        If the suffix is not .png or .svg, there is no object, ``max_height`` is not above
        0.5 m, a level is not finite and positive, or the folder cannot be written.
    """
    path = Path(path)
    image_format = _figure_format(path, "energy figure")
    if not objects:
        raise InputError("energy figure needs at least one object; got none")
    if not (math.isfinite(max_height) and max_height > ENERGY_CURVE_LOWEST):
        raise InputError(
            f"max_height must be a finite length above {ENERGY_CURVE_LOWEST:g} m; "
            f"got {max_height:g} m"
        )
    for label, value in levels:
        if not (math.isfinite(value) and value > 0):
            raise InputError(
                f"reference level {label!r} must be a finite energy > 0 J; got {value}"
            )

    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.figure import Figure
    from matplotlib.ticker import FuncFormatter, LogLocator, NullFormatter

    heights = energy_curve_heights(max_height)
    curves = [(curve, energy_curve(curve, heights)) for curve in objects]
    colours = _object_colours([c.label for c in objects])

    labels = []
    for curve, energy in curves:
        label = curve.label
        if energy.count() < energy.size:
            first = heights[np.argmax(np.ma.getmaskarray(energy))]
            label += f" (carried away from {first:.3g} m)"
        labels.append(label)
    columns, labels = legend_layout(labels)
    lines_per_row = [
        max(label.count("\n") + 1 for label in labels[start : start + columns])
        for start in range(0, len(labels), columns)
    ]
    rows = sum(lines_per_row)
    figure = Figure(figsize=(8.6, 5.6 + 0.22 * rows), dpi=100)
    FigureCanvasAgg(figure)
    legend_height = (0.05 + 0.26 * (rows + 1)) / (5.6 + 0.22 * rows)
    axes = figure.add_axes((0.10, 0.10, 0.86, 0.80 - legend_height))
    axes.set_yscale("log")

    values = [float(e.min()) for _, e in curves if e.count()]
    values += [float(e.max()) for _, e in curves if e.count()]
    values += [value for _, value in levels]
    bottom = min(values) / 1.8
    top = max(values) * 2.2
    axes.set_xlim(0.0, max_height * 1.01)
    axes.set_ylim(bottom, top)

    for (curve, energy), label in zip(curves, labels, strict=True):
        axes.plot(heights, energy, color=colours[curve.label], lw=2.2, label=label, zorder=4)

    # Reference levels: a line each, the label at the right end, spread apart if close.
    if levels:
        axes_height_pt = axes.get_position().height * figure.get_figheight() * 72.0
        font = 7.5
        gap = 1.75 * font / axes_height_pt
        span = math.log(top / bottom)
        ordered = sorted(levels, key=lambda level: level[1])
        fractions = [math.log(value / bottom) / span for _, value in ordered]
        placed = _spread(fractions, gap, 0.5 * gap, 1.0 - 0.5 * gap)
        for (label, value), line_at, text_at in zip(ordered, fractions, placed, strict=True):
            axes.plot(
                [0.0, 0.955],
                [line_at, line_at],
                transform=axes.transAxes,
                color=LEVEL_GREY,
                lw=1.0,
                linestyle=(0, (4.0, 3.0)),
                zorder=2,
            )
            # Leader from the label to the end of its line.
            axes.plot(
                [0.937, 0.962, 1.0],
                [text_at, line_at, line_at],
                transform=axes.transAxes,
                color=LEVEL_GREY,
                lw=0.9,
                zorder=5,
            )
            axes.text(
                0.933,
                text_at,
                _level_text(label, value),
                transform=axes.transAxes,
                ha="right",
                va="center",
                fontsize=font,
                color=INK,
                zorder=5,
                bbox={
                    "boxstyle": "square,pad=0.15",
                    "facecolor": "white",
                    "edgecolor": "none",
                    "alpha": 0.82,
                },
            )

    axes.yaxis.set_major_locator(LogLocator(base=10.0, subs=(1.0, 2.0, 5.0)))
    axes.yaxis.set_major_formatter(FuncFormatter(lambda value, _: f"{value:g}"))
    axes.yaxis.set_minor_formatter(NullFormatter())
    axes.grid(True, which="major", color=GRID, lw=0.6)
    axes.set_axisbelow(True)
    axes.set_xlabel("release height above the ground (m)", fontsize=9.5, color=INK)
    axes.set_ylabel("impact energy (J, logarithmic scale)", fontsize=9.5, color=INK)
    axes.tick_params(labelsize=8.5, colors=INK)
    for spine in axes.spines.values():
        spine.set_color("#9a978f")
    figure.legend(
        handles=axes.get_lines()[: len(objects)],
        loc="upper left",
        bbox_to_anchor=(0.10, 0.905),
        ncols=columns,
        fontsize=8.5,
        frameon=False,
        handlelength=2.4,
        columnspacing=2.0,
        title="Object (at its smallest drag area, the highest energy)",
        title_fontproperties={"weight": "bold", "size": 9},
        alignment="left",
    )
    figure.text(
        0.10,
        0.935,
        title or "Impact energy against release height",
        fontsize=12.5,
        weight="bold",
        color=INK,
        ha="left",
    )
    _save(figure, path, image_format)


# --------------------------------------------------------------------------------------------
# dropcalc fall --plot
# --------------------------------------------------------------------------------------------


def fall_cases(result: FallResult) -> list[SideViewCase]:
    """Side-view cases of one ``dropcalc fall`` result.

    Both drag bounds when the case has a largest drag area, the given wind and its gust when
    one was estimated, with the release velocity of the case's release mode.

    Parameters
    ----------
    result : dropcalc.analysis.fall.FallResult
        The solved fall.

    Returns
    -------
    list of SideViewCase
        Smallest drag area first, the given wind before the gust.
    """
    from dropcalc.analysis.fall import wind_field
    from dropcalc.physics.drag import drag_parameter
    from dropcalc.physics.release import initial_velocity

    case = result.case
    label = case.object_name or case.object_id or f"object, {case.mass:g} kg"
    velocity = np.asarray(
        initial_velocity(case.release, case.edge_azimuth, case.gravity), dtype=float
    ).reshape(3)
    winds = [(result.given.speed_10m, False)]
    if result.gust is not None:
        winds.append((result.gust.speed_10m, True))
    areas = [(case.drag_area, False)]
    if case.drag_area_max is not None and case.drag_area_max > case.drag_area:
        areas.append((case.drag_area_max, True))
    cases = []
    if case.plate is not None:  # a sheet: its attitudes of highest energy and longest drift
        from dropcalc.analysis.plate_flight import bounding_attitudes

        for speed, gust in winds:
            attitudes = bounding_attitudes(
                case.plate, case.mass, case.height, case.air.density, case.wind, speed,
                case.edge_azimuth, velocity, case.gravity,
            )  # fmt: skip
            for (chord, span, pitch, spin), largest in zip(attitudes, (False, True), strict=True):
                cases.append(
                    SideViewCase(
                        label=label, release_height=case.height, initial_velocity=tuple(velocity),
                        drag_parameter=0.0, gravity=case.gravity,
                        wind=wind_field(case.wind, np.array([speed])), largest_drag=largest,
                        gust=gust, edge_azimuth=case.edge_azimuth,
                        plate=PlateFlight(case.mass, chord, span, case.plate[2],
                                          case.air.density, pitch, spin),
                    )
                )  # fmt: skip
        return cases
    for area, largest in areas:
        k = float(drag_parameter(case.air.density, area, case.mass))
        for speed, gust in winds:
            cases.append(
                SideViewCase(
                    label=label,
                    release_height=case.height,
                    initial_velocity=tuple(velocity),
                    drag_parameter=k,
                    gravity=case.gravity,
                    wind=wind_field(case.wind, np.array([speed])),
                    largest_drag=largest,
                    gust=gust,
                    edge_azimuth=case.edge_azimuth,
                )
            )
    return cases


def fall_figure(path: Path, result: FallResult) -> None:
    """Write the side view of one ``dropcalc fall`` result (PNG or SVG by the suffix).

    Parameters
    ----------
    path : pathlib.Path
        Output file.
    result : dropcalc.analysis.fall.FallResult
        The solved fall.

    Raises
    ------
    InputError
        If the suffix is not .png or .svg or the folder cannot be written.
    """
    from dropcalc.model.limits import CARRIED_AWAY_DISTANCE

    case = result.case
    label = case.object_name or case.object_id or f"object, {case.mass:g} kg"
    side_view(
        path,
        fall_cases(result),
        case.height,
        title=f"Fall paths from {case.height:g} m: {label}",
        max_distance=CARRIED_AWAY_DISTANCE,
    )


__all__: list[str] = [
    "EnergyCurve",
    "SideViewCase",
    "energy_curve",
    "energy_height",
    "fall_cases",
    "fall_figure",
    "side_view",
    "trajectory_paths",
]


#: Characters of 8.5 pt legend text that fit one column of the 8.6 in energy figure, by the
#: number of columns (measured on DejaVu Sans: about 4.7 pt a character).
LEGEND_COLUMN_CHARACTERS = {3: 31, 2: 50, 1: 100}


def legend_layout(labels: Sequence[str]) -> tuple[int, list[str]]:
    """Columns for the energy figure's legend and the labels wrapped to fit them.

    As many columns (3, 2 or 1) as the longest label allows; a label longer than one column
    wraps onto more lines, so no name runs off the figure.
    """
    import textwrap

    longest = max((len(label) for label in labels), default=0)
    columns = next((n for n in (3, 2) if longest <= LEGEND_COLUMN_CHARACTERS[n]), 1)
    columns = max(1, min(len(labels), columns))
    width = LEGEND_COLUMN_CHARACTERS[columns]
    return columns, ["\n".join(textwrap.wrap(label, width)) or label for label in labels]


def _short(label: str, width: int = 30) -> str:
    """A legend label cut to ``width`` characters (the key sits beside the plot)."""
    return label if len(label) <= width else label[: width - 1].rstrip() + "…"
