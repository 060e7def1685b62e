"""The ``dropcalc`` command line: parse, call the library, render. Nothing else lives here."""

from __future__ import annotations

import inspect
import math
import signal
import sys
from collections.abc import Callable
from dataclasses import replace
from enum import StrEnum
from functools import partial
from pathlib import Path
from typing import TYPE_CHECKING, Annotated, Any

import typer
from typer.core import TyperGroup, TyperOption

from dropcalc.errors import (
    DropcalcError,
    InputError,
    one_line,
    printable,
    require_suffix,
    shorten,
)


def _flag_type(self: TyperOption, ctx: Any) -> str | None:
    """Help shows a flag as a flag: no value type ("<bool>") beside --json, --help ..."""
    return None if self.is_flag else _OPTION_TYPE(self, ctx)


# typer 0.29 prints the value type of every option in --help, "<bool>" for on/off flags that
# take no value; flags are shown bare instead.
_OPTION_TYPE = TyperOption.display_type_rich
TyperOption.display_type_rich = _flag_type  # type: ignore[method-assign]

if TYPE_CHECKING:  # imported where used: `dropcalc --help` loads no numerics
    from dropcalc.model.conditions import Conditions


class _OneLineErrors(TyperGroup):
    """Command group whose usage errors (bad choice, unknown option) are one line, exit 2."""

    def main(self, *args: Any, standalone_mode: bool = True, **kwargs: Any) -> Any:
        """Run the command line; print click's usage errors as one line instead of a box."""
        try:
            result = super().main(*args, standalone_mode=False, **kwargs)  # type: ignore[misc]
            code = result if isinstance(result, int) else 0
        except typer.TyperException as exc:  # usage errors: bad choice, unknown option
            message = exc.format_message().strip()
            if message:  # empty when no arguments were given and the help was shown
                typer.echo(f"dropcalc: error: {one_line(message)}", err=True)
            code = exc.exit_code
        except typer.Exit as exc:
            code = exc.exit_code
        except typer.Abort:
            typer.echo("dropcalc: aborted", err=True)
            code = 1
        except OSError as exc:  # a file the commands did not foresee: still one line, exit 2
            name = shorten(exc.filename, 120) if exc.filename else "a file"
            typer.echo(
                one_line(f"dropcalc: error: cannot use {name}: {exc.strerror or exc}"), err=True
            )
            code = 2
        if standalone_mode:
            sys.exit(code)
        return code


app = typer.Typer(
    cls=_OneLineErrors,
    name="dropcalc",
    help=(
        "Dropped-object physics for work at height: how far to keep the ground clear, how hard "
        'a dropped item would hit. Quantities accept units ("12 lb", "100 ft", "25 mph"); '
        "a bare number means SI."
    ),
    no_args_is_help=True,
    add_completion=False,
    pretty_exceptions_enable=False,
)


def _version(value: bool) -> None:
    if value:
        from dropcalc import __version__

        typer.echo(f"dropcalc {__version__}")
        raise typer.Exit()


@app.callback()
def _root(
    version: Annotated[
        bool,
        typer.Option(
            "--version", callback=_version, is_eager=True, help="Print the version and exit."
        ),
    ] = False,
) -> None:
    """Dropped-object physics for work at height."""


class UnitSystem(StrEnum):
    """Display unit systems."""

    si = "si"
    imperial = "imperial"


class ReleaseMode(StrEnum):
    """How the object leaves the edge."""

    drop = "drop"
    push = "push"
    throw = "throw"
    roof_slide = "roof-slide"


class ProfileName(StrEnum):
    """Wind profile laws."""

    uniform = "uniform"
    power = "power"
    log = "log"


class SpeedKind(StrEnum):
    """Whether a wind speed is a mean or a gust."""

    mean = "mean"
    gust = "gust"


#: Model field names as the user knows them on the command line.
_OPTION_OF_FIELD = {
    "mass": "--mass",
    "drag_area": "--drag-area",
    "height": "--height",
    "contact_area": "--contact-area",
    "edge_azimuth": "--edge-azimuth",
    "speed_10m": "--wind",
    "kind": "--wind-kind",
    "from_direction": "--wind-from",
    "exponent": "--wind-exponent",
    "roughness_length": "--roughness",
    "minimum_height": "--roughness",
    "elevation": "--elevation",
    "temperature": "--air-temp",
    "pressure": "--pressure",
    "relative_humidity": "--humidity",
    "density": "--air-density",
    "latitude": "--latitude",
    "release_speed": "--release-speed",
    "release_angle": "--release-angle",
    "roof_pitch": "--roof-pitch",
    "roof_length": "--roof-length",
    "friction": "--friction",
    "carrier_velocity": "--carrier-velocity",
    "mode": "--release",
    "rolling": "--rolling",
    "terrain": "--terrain",
    "relative_error": "--precision",
    "confidence": "--confidence",
    "margin": "--margin",
}


def _fail(exc: DropcalcError) -> None:
    """Print one error line to stderr, naming the option where the model named a field."""
    # A value the user typed may hold a line break or be huge: keep one readable line.
    message = one_line(str(exc))
    option = _OPTION_OF_FIELD.get(exc.field or "")
    if option is not None:
        message = f"{option}: {message}"
    typer.echo(f"dropcalc: error: {message}", err=True)
    raise typer.Exit(2)


def _q(value: str | None, kind: str, option: str) -> float | None:
    """Parse an optional quantity typed at the command line into SI."""
    from dropcalc.units import parse_optional_quantity

    return parse_optional_quantity(value, kind, option)


def _quantity(value: str, kind: str, option: str) -> float:
    """Parse a quantity typed at the command line into SI."""
    from dropcalc.units import parse_quantity

    return parse_quantity(value, kind, option)


def _carrier(value: str | None) -> tuple[float, float, float]:
    if value is None:
        return (0.0, 0.0, 0.0)
    parts = [p.strip() for p in value.replace(";", ",").split(",")]
    if len(parts) != 3:
        raise InputError(
            f'--carrier-velocity: expected three speeds east,north,up (e.g. "0,0,-1.5 m/s"); '
            f'got "{value}"'
        )
    unit = ""
    last = parts[2].split()
    if len(last) == 2:
        parts[2], unit = last
    speeds = []
    for p in parts:
        text = f"{p} {unit}".strip() if unit and len(p.split()) == 1 else p
        speeds.append(_quantity(text, "speed", "--carrier-velocity"))
    return (speeds[0], speeds[1], speeds[2])


# Options shared by several commands: declared once.
WindOpt = Annotated[
    str, typer.Option("--wind", help='Wind speed at 10 m, e.g. "12 m/s", "25 mph".')
]
WindKindOpt = Annotated[SpeedKind, typer.Option(help="Whether --wind is a mean speed or a gust.")]
WindFromOpt = Annotated[
    str | None,
    typer.Option(
        help='Direction the wind blows from: a compass point ("SW", "WSW") or degrees '
        'clockwise from north ("225"). Default: blowing the object straight out from the '
        "edge, away from the structure."
    ),
]
WindMeasuredOpt = Annotated[
    str,
    typer.Option(
        "--wind-measured",
        help="Where --wind was measured or forecast: 'site' (over the site's own terrain) or "
        "'open-country' (a forecast or airport value: EN 1991-1-4 category II, converted to the "
        "site's --terrain with the terrain factor k_r = 0.19 (z0/0.05 m)^0.07).",
    ),
]
WindProfileOpt = Annotated[ProfileName | None, typer.Option(help="Wind profile with height.")]
WindExponentOpt = Annotated[float | None, typer.Option(help="Power-law exponent of the profile.")]
RoughnessOpt = Annotated[str | None, typer.Option(help='Log-law roughness length, e.g. "0.3 m".')]
TerrainOpt = Annotated[
    str | None,
    typer.Option(help="Terrain class: en-0 … en-iv (EN 1991-1-4), asce-b/c/d (ASCE 7)."),
]
ElevationOpt = Annotated[
    str,
    typer.Option(
        help='Site elevation, e.g. "350 m", read as the geopotential height of the ISA '
        "atmosphere (it differs from the height above sea level by z²/r: 0.16 m at 1000 m)."
    ),
]
AirTempOpt = Annotated[str | None, typer.Option(help='Air temperature, e.g. "5 °C".')]
PressureOpt = Annotated[str | None, typer.Option(help='Air pressure, e.g. "98 kPa".')]
HumidityOpt = Annotated[str | None, typer.Option(help='Relative humidity, e.g. "60 %".')]
AirDensityOpt = Annotated[
    str | None, typer.Option(help='Air density; overrides the above, e.g. "1.2 kg/m3".')
]
LatitudeOpt = Annotated[
    float | None, typer.Option(help="Latitude (deg) for local gravity; default standard g.")
]
EdgeAzimuthOpt = Annotated[
    float, typer.Option(help="Compass direction the edge faces (deg); pushes go this way.")
]
UnitsOpt = Annotated[UnitSystem, typer.Option(help="Units for display.")]
JsonOpt = Annotated[bool, typer.Option("--json", help="Print JSON only.")]
LibraryOpt = Annotated[
    Path | None,
    typer.Option(help="Your own object file (TOML or CSV) extending or overriding the library."),
]


#: The options that set the conditions of a drop (air, wind, gravity), shared by ``fall``,
#: ``batch`` and ``zone``: declared once and added to each by :func:`_condition_options`, in
#: this order before the command's ``release`` option (``--edge-azimuth`` before ``library``).
_CONDITION_OPTIONS: tuple[tuple[str, Any, Any], ...] = (
    ("wind", WindOpt, "0"),
    ("wind_kind", WindKindOpt, SpeedKind.mean),
    ("wind_from", WindFromOpt, None),
    ("wind_profile", WindProfileOpt, None),
    ("wind_exponent", WindExponentOpt, None),
    ("roughness", RoughnessOpt, None),
    ("terrain", TerrainOpt, None),
    ("wind_measured", WindMeasuredOpt, "site"),
    ("elevation", ElevationOpt, "0"),
    ("air_temp", AirTempOpt, None),
    ("pressure", PressureOpt, None),
    ("humidity", HumidityOpt, None),
    ("air_density", AirDensityOpt, None),
    ("latitude", LatitudeOpt, None),
)
_EDGE_OPTION = ("edge_azimuth", EdgeAzimuthOpt, 90.0)


def _condition_options(command: Callable[..., None]) -> Callable[..., None]:
    """Add the shared condition options to a command; it receives them in ``**conditions``.

    typer reads a command's options from its signature: the signature shown to it gets the
    options of :data:`_CONDITION_OPTIONS` before ``release`` and ``--edge-azimuth`` before
    ``library``, so ``--help`` lists them where they always stood.
    """
    signature = inspect.signature(command, eval_str=True)
    params = [p for p in signature.parameters.values() if p.kind is not p.VAR_KEYWORD]

    def option(name: str, annotation: Any, default: Any) -> inspect.Parameter:
        return inspect.Parameter(
            name, inspect.Parameter.POSITIONAL_OR_KEYWORD, default=default, annotation=annotation
        )

    at = [p.name for p in params].index("release")
    params[at:at] = [option(*spec) for spec in _CONDITION_OPTIONS]
    at = [p.name for p in params].index("library")
    params.insert(at, option(*_EDGE_OPTION))
    command.__signature__ = signature.replace(parameters=params)  # type: ignore[attr-defined]
    return command


def _conditions(options: dict[str, Any]) -> Conditions:
    """The conditions from a command's shared options (raises InputError); release: a drop."""
    from dropcalc.model.conditions import conditions_from_options

    return conditions_from_options(options)


def _release(
    mode: str,
    release_speed: str | None,
    release_angle: str | None = None,
    roof_pitch: str | None = None,
    roof_length: str | None = None,
    friction: float | None = None,
    rolling: bool = False,
    carrier_velocity: str | None = None,
) -> Any:
    """The release model from the options (raises InputError)."""
    from dropcalc.physics.release import DEFAULT_ROOF_FRICTION, Release

    speed = _q(release_speed, "speed", "--release-speed")
    if mode in ("push", "throw") and speed is None:
        raise InputError(f"--release {mode} needs --release-speed (e.g. 2 m/s)")
    if mode == "roof-slide" and (roof_pitch is None or roof_length is None):
        raise InputError("--release roof-slide needs --roof-pitch and --roof-length")
    return Release(
        mode=mode,
        speed=speed or 0.0,
        angle=_q(release_angle, "angle", "--release-angle") or 0.0,
        roof_pitch=_q(roof_pitch, "angle", "--roof-pitch") or 0.0,
        roof_length=_q(roof_length, "length", "--roof-length") or 0.0,
        friction=(
            friction
            if friction is not None
            else (DEFAULT_ROOF_FRICTION if mode == "roof-slide" else 0.0)
        ),
        rolling=rolling,
        carrier_velocity=_carrier(carrier_velocity),
    )


def _drag_area(drag_area: str | None, cd: float | None, area: str | None) -> float | None:
    """Cd·A from --drag-area, or from --cd and --area; None when none was given."""
    if drag_area is not None and (cd is not None or area is not None):
        raise InputError(
            "give either --drag-area or --cd with --area, not both "
            f"(got --drag-area {drag_area} and --cd {cd} --area {area})"
        )
    if drag_area is not None:
        return _quantity(drag_area, "area", "--drag-area")
    if cd is None and area is None:
        return None
    if cd is None or area is None:
        raise InputError("--cd and --area go together (or give --drag-area, Cd·A)")
    if not (math.isfinite(cd) and 0 < cd <= 5):
        raise InputError(f"--cd must be between 0 and 5 (exclusive of 0); got {cd:g}")
    area_m2 = _quantity(area, "area", "--area")
    if not area_m2 > 0:
        raise InputError(f"--area must be an area > 0 m²; got {area}")
    return cd * area_m2


@app.command()
@_condition_options
def fall(
    height: Annotated[
        str, typer.Option(help='Release height above the landing surface, e.g. "25 m", "80 ft".')
    ],
    mass: Annotated[
        str | None, typer.Option(help='Mass of the object, e.g. "1.2 kg", "3 lb".')
    ] = None,
    object_id: Annotated[
        str | None,
        typer.Option("--object", help="A library object id (see `dropcalc objects`)."),
    ] = None,
    drag_area: Annotated[
        str | None, typer.Option(help='Drag area Cd·A, e.g. "0.004 m2", "6 in2".')
    ] = None,
    cd: Annotated[
        float | None, typer.Option("--cd", help="Drag coefficient (with --area).")
    ] = None,
    area: Annotated[
        str | None, typer.Option(help='Projected area for --cd, e.g. "0.01 m2".')
    ] = None,
    contact_area: Annotated[
        str | None, typer.Option(help='Area that strikes first, e.g. "2 cm2" (energy per area).')
    ] = None,
    release: Annotated[
        ReleaseMode, typer.Option(help="How the object leaves the edge.")
    ] = ReleaseMode.drop,
    release_speed: Annotated[
        str | None, typer.Option(help='Speed for push, throw or roof-slide, e.g. "3 m/s".')
    ] = None,
    release_angle: Annotated[
        str | None, typer.Option(help="Throw angle above horizontal (deg).")
    ] = None,
    roof_pitch: Annotated[str | None, typer.Option(help="Roof pitch for roof-slide (deg).")] = None,
    roof_length: Annotated[
        str | None, typer.Option(help='Slope length slid to the eave, e.g. "4 m".')
    ] = None,
    friction: Annotated[
        float | None,
        typer.Option(help="Friction coefficient on the roof (roof-slide; default 0.4)."),
    ] = None,
    rolling: Annotated[
        bool,
        typer.Option("--rolling", help="Roof-slide: the object rolls (pipe, ball), not slides."),
    ] = False,
    carrier_velocity: Annotated[
        str | None,
        typer.Option(help='Velocity of what it falls from, east,north,up, e.g. "0,0,-1 m/s".'),
    ] = None,
    library: LibraryOpt = None,
    plot: Annotated[
        Path | None, typer.Option(help="Write a side view of the fall (PNG or SVG).")
    ] = None,
    units: UnitsOpt = UnitSystem.si,
    as_json: JsonOpt = False,
    **conditions: Any,
) -> None:
    """Solve one object falling from one release: impact speed, energy, time and drift."""
    try:
        from dropcalc.analysis.fall import FallCase, solve_fall
        from dropcalc.physics.plate import plate_dimensions
        from dropcalc.present.text import render_fall

        env = _conditions(conditions)
        cda = _drag_area(drag_area, cd, area)
        contact = _q(contact_area, "area", "--contact-area")
        drag_area_max = None
        obj = None
        if object_id is not None:
            if mass is not None or cda is not None:
                raise InputError(
                    "--object gives the mass and drag; do not combine it with --mass, "
                    "--drag-area or --cd/--area"
                )
            from dropcalc.io.library import load_library

            obj = load_library(library).get(object_id)
            mass_kg, cda, drag_area_max = obj.mass, obj.drag_area_min, obj.drag_area_max
            contact = contact if contact is not None else obj.contact_area
        else:
            if mass is None:
                raise InputError(
                    "give --mass with --drag-area (or --cd and --area), or --object ID"
                )
            if cda is None:
                raise InputError(
                    "the drag needs --drag-area (Cd·A, e.g. 0.004 m2) or both --cd and --area"
                )
            mass_kg = _quantity(mass, "mass", "--mass")
        case = FallCase(
            mass=mass_kg,
            drag_area=cda,
            height=_quantity(height, "length", "--height"),
            conditions=replace(
                env,
                release=_release(
                    release.value,
                    release_speed,
                    release_angle,
                    roof_pitch,
                    roof_length,
                    friction,
                    rolling,
                    carrier_velocity,
                ),
            ),  # fmt: skip
            contact_area=contact,
            drag_area_max=drag_area_max,
            object_id=obj.id if obj is not None else None,
            object_name=obj.name if obj is not None else None,
            glides=bool(obj.glides) if obj is not None else False,
            plate=plate_dimensions(obj.shape, obj.dimensions) if obj is not None else None,
        )
        if plot is not None:
            require_suffix(plot, (".png", ".svg"), "--plot")
        result = solve_fall(case)
        if plot is not None:
            from dropcalc.report.figures import fall_figure

            fall_figure(plot, result)
    except DropcalcError as exc:
        _fail(exc)
        return
    if as_json:
        from dropcalc.present.json import dumps, fall_json

        typer.echo(dumps(fall_json(result)))
    else:
        typer.echo(printable(render_fall(result, units.value)))


@app.command()
@_condition_options
def batch(
    file: Annotated[Path, typer.Argument(help="CSV or XLSX list of items (see README).")],
    height: Annotated[
        str | None, typer.Option(help="Release height for rows without a height column.")
    ] = None,
    release: Annotated[
        ReleaseMode, typer.Option(help="How the items leave the edge.")
    ] = ReleaseMode.drop,
    release_speed: Annotated[
        str | None, typer.Option(help='Speed for push, throw or roof-slide, e.g. "1.5 m/s".')
    ] = None,
    release_angle: Annotated[
        str | None, typer.Option(help="Throw angle above horizontal (deg).")
    ] = None,
    roof_pitch: Annotated[str | None, typer.Option(help="Roof pitch for roof-slide (deg).")] = None,
    roof_length: Annotated[
        str | None, typer.Option(help='Slope length slid to the eave, e.g. "4 m".')
    ] = None,
    friction: Annotated[
        float | None,
        typer.Option(help="Friction coefficient on the roof (roof-slide; default 0.4)."),
    ] = None,
    rolling: Annotated[
        bool,
        typer.Option("--rolling", help="Roof-slide: the items roll (pipe, ball), not slide."),
    ] = False,
    library: LibraryOpt = None,
    policy: Annotated[
        Path | None, typer.Option(help="Control rules (TOML) replacing the default policy.")
    ] = None,
    levels: Annotated[
        str | None,
        typer.Option(help="Reference level keys to check, comma-separated (default: a set of 5)."),
    ] = None,
    out: Annotated[
        Path | None, typer.Option(help="Write all rows to OUT.csv, OUT.xlsx or OUT.json.")
    ] = None,
    units: UnitsOpt = UnitSystem.si,
    as_json: JsonOpt = False,
    **conditions: Any,
) -> None:
    """Check a list of objects: impact at both drag bounds, levels exceeded, safe heights."""
    try:
        from dropcalc.analysis.batch import BatchSettings
        from dropcalc.model.reference_levels import DEFAULT_LEVEL_KEYS, reference_level

        env = _conditions(conditions)
        keys = (
            DEFAULT_LEVEL_KEYS
            if levels is None
            else tuple(k.strip() for k in levels.split(",") if k.strip())
        )
        from dropcalc.model.policy import DEFAULT_RULES, load_policy

        settings = BatchSettings(
            height=_q(height, "length", "--height"),
            conditions=replace(
                env,
                release=_release(
                    release.value,
                    release_speed,
                    release_angle,
                    roof_pitch,
                    roof_length,
                    friction,
                    rolling,
                ),
            ),  # fmt: skip
            levels=tuple(reference_level(k) for k in keys),
            rules=DEFAULT_RULES if policy is None else load_policy(policy),
        )
        if out is not None:
            require_suffix(out, (".csv", ".xlsx", ".json"), "--out")
        from dropcalc.analysis.batch_run import run_batch
        from dropcalc.io.library import load_library
        from dropcalc.present.json import write_rows_json
        from dropcalc.present.tables import write_run

        run = run_batch(file, settings, lambda: load_library(library), _progress(as_json))
        try:
            if out is not None:
                write_run(out, run)
            if as_json:
                write_rows_json(sys.stdout, run.rows())
            else:
                from dropcalc.present.text import render_batch

                top: list[dict[str, Any]] = []
                for row in run.rows():
                    if len(top) >= 40 or row.get("error"):
                        break
                    top.append(row)
                typer.echo(
                    printable(render_batch(
                        top, settings, units.value, run.ignored_columns, out,
                        total_good=run.good, total_bad=run.bad,
                    ))
                )  # fmt: skip
        finally:
            run.close()
    except DropcalcError as exc:
        _fail(exc)
        return
    for error in run.errors:
        typer.echo(one_line(f"dropcalc: {file.name}: row {error.row}: {error.message}"), err=True)
    if run.bad > len(run.errors):
        typer.echo(
            f"dropcalc: {file.name}: {run.bad - len(run.errors)} more failed rows "
            "(see the error column)",
            err=True,
        )
    if run.bad:
        raise typer.Exit(1)


@app.command()
@_condition_options
def zone(
    height: Annotated[
        str | None,
        typer.Option(help='Work height above the ground, e.g. "18 m" (with --site: per edge).'),
    ] = None,
    site: Annotated[
        Path | None,
        typer.Option(help="Site plan (TOML): building outline and work edges with heights."),
    ] = None,
    plot: Annotated[
        Path | None, typer.Option(help="With --site: write the plan drawing (PNG or SVG).")
    ] = None,
    geojson: Annotated[
        Path | None,
        typer.Option(help="With --site and its origin: write the area as GeoJSON (WGS84)."),
    ] = None,
    object_ids: Annotated[
        list[str] | None,
        typer.Option("--object", help="Library object id; repeat for several objects."),
    ] = None,
    items: Annotated[
        Path | None, typer.Option(help="A batch list (CSV/XLSX) of the objects in use.")
    ] = None,
    mass: Annotated[str | None, typer.Option(help="Custom object: mass.")] = None,
    drag_area: Annotated[
        str | None, typer.Option(help="Custom object: drag area Cd·A (or a min,max pair).")
    ] = None,
    ground: Annotated[
        str,
        typer.Option(
            help="Landing surface: concrete, asphalt, compacted-soil, gravel, grass, soft-soil."
        ),
    ] = "concrete",
    confidence: Annotated[
        float, typer.Option(help="Share of simulated drops the radius must contain (0.99, 0.999).")
    ] = 0.99,
    margin: Annotated[str, typer.Option(help='Margin added to the radius, e.g. "2 m".')] = "2 m",
    precision: Annotated[
        float, typer.Option(help="Target standard error of the radius, relative (0.01 = 1 %).")
    ] = 0.01,
    seed: Annotated[int, typer.Option(help="Random seed (same seed, same answer).")] = 1,
    ground_slope: Annotated[
        str,
        typer.Option(
            help='Slope of the landing ground, e.g. "5 deg"; taken to fall away from the '
            "edge in the direction an object travels (default level)."
        ),
    ] = "0 deg",
    barricade: Annotated[
        str | None,
        typer.Option(
            help="A barricade distance: also report the highest wind and the greatest work "
            "height for which it still holds."
        ),
    ] = None,
    release: Annotated[
        ReleaseMode, typer.Option(help="How objects leave the edge.")
    ] = ReleaseMode.drop,
    release_speed: Annotated[
        str | None, typer.Option(help="Highest push or throw speed, or roof-slide start speed.")
    ] = None,
    release_angle: Annotated[str | None, typer.Option(help="Throw angle (deg).")] = None,
    roof_pitch: Annotated[str | None, typer.Option(help="Roof pitch for roof-slide (deg).")] = None,
    roof_length: Annotated[str | None, typer.Option(help="Slope length to the eave.")] = None,
    friction: Annotated[
        float | None, typer.Option(help="Roof friction (roof-slide; default 0.4).")
    ] = None,
    library: LibraryOpt = None,
    units: UnitsOpt = UnitSystem.si,
    as_json: JsonOpt = False,
    **conditions: Any,
) -> None:
    """Exclusion distance from the work edge: Monte Carlo at a confidence, and the worst case."""
    try:
        from dropcalc.analysis.zone import (
            ZoneSettings,
            compute_zone,
            greatest_height,
            highest_wind,
            still_air_radius,
        )
        from dropcalc.physics.scatter import surface

        env = _conditions(conditions)
        if site is None and height is None:
            raise InputError("give --height (or --site with the edge heights)")
        if site is None and geojson is not None:
            raise InputError("--geojson places the site on the map: give --site with its origin")
        plan = None
        if site is not None:
            from dropcalc.analysis.plan import load_site

            plan = load_site(site)
            if geojson is not None and plan.origin_lat is None:
                raise InputError(f"--geojson needs the site's origin (lat, lon) in {site.name}")
        elif plot is not None:
            # No site: draw the zone around a 1 m stretch of edge facing --edge-azimuth.
            from dropcalc.analysis.plan import Site, SitePlan, WorkEdge

            assert height is not None  # without a site, --height was required above
            facing = math.radians(env.edge_azimuth)
            nx, ny = math.sin(facing), math.cos(facing)
            edge = WorkEdge(
                "work edge", ((ny / 2, -nx / 2), (-ny / 2, nx / 2)),
                _quantity(height, "length", "--height"),
            )  # fmt: skip
            plan = SitePlan(Site(None, (edge,)))
        if height is not None:
            height_m = _quantity(height, "length", "--height")
        else:
            assert plan is not None  # without --height, --site was required above
            height_m = max(edge.height for edge in plan.site.edges)
        objects = _zone_objects(object_ids, items, mass, drag_area, library, height_m)
        settings = ZoneSettings(
            height=height_m,
            conditions=replace(
                env,
                release=_release(
                    release.value, release_speed, release_angle, roof_pitch, roof_length, friction
                ),
            ),
            ground=surface(ground),
            confidence=confidence,
            margin=_quantity(margin, "length", "--margin"),
            relative_error=precision,
            seed=seed,
            ground_slope=_ground_slope(ground_slope, "--ground-slope"),
        )
        site_result = None
        wind_outward = conditions["wind_from"] is None
        if plan is not None:
            from dropcalc.analysis.zone import site_zone

            site_result = site_zone(
                objects, settings, plan.site, _progress(as_json), wind_outward=wind_outward
            )
            result = site_result.driver[2]
            _write_plan(site_result, plan, plot, geojson, env.wind, wind_outward)
        else:
            result = compute_zone(objects, settings, _progress(as_json))
        limits = None
        if barricade is not None:
            distance = _quantity(barricade, "length", "--barricade")
            if not distance > 0:
                raise InputError(f"--barricade must be a distance > 0 m; got {barricade}")
            wind_limit = highest_wind(objects, settings, distance)
            limits = {
                "distance": distance,
                "wind": wind_limit,
                "height": greatest_height(objects, settings, distance),
                "needed": result.radius,
                "still_air": still_air_radius(objects, settings) if wind_limit == 0 else None,
            }
    except DropcalcError as exc:
        _fail(exc)
        return
    if as_json:
        from dropcalc.present.json import dumps, zone_json

        typer.echo(dumps(zone_json(result, limits, site_result)))
    else:
        from dropcalc.present.text import render_zone

        typer.echo(printable(render_zone(result, units.value, limits, site_result)))


def _write_plan(
    site_result: Any,
    plan: Any,
    plot: Path | None,
    geojson: Path | None,
    wind: Any,
    outward: bool,
) -> None:
    """Write the plan drawing and the GeoJSON of a site zone, where asked."""
    if geojson is not None:
        from dropcalc.analysis.plan import to_geojson
        from dropcalc.io.atomic import write_atomic
        from dropcalc.present.json import dumps

        data = to_geojson(
            site_result.area, plan.site, plan.origin_lat, plan.origin_lon,
            {"radius_m": site_result.radius,
             "confidence": site_result.driver[2].settings.confidence,
             "worst_case_radius_m": site_result.worst_case},
        )  # fmt: skip
        text = dumps(data, indent=1)
        write_atomic(geojson, lambda p: p.write_text(text, encoding="utf-8"))
    if plot is not None:
        from dropcalc.model.conditions import opposite_azimuth
        from dropcalc.present.plan_plot import plot_plan

        toward = None if outward else float(opposite_azimuth(wind.from_direction_deg))
        label = (
            "still air" if wind.speed_10m == 0
            else f"{wind.speed_10m:g} m/s {wind.kind}"
            + ("\nassumed out from\neach edge" if outward else "")
        )  # fmt: skip
        plot_plan(
            site_result.area, plan.site, toward, plot, title="Exclusion area", wind_label=label
        )


def _zone_objects(
    object_ids: list[str] | None,
    items: Path | None,
    mass: str | None,
    drag_area: str | None,
    library: Path | None,
    height: float,
) -> list[Any]:
    """The zone's objects from --object, --items or --mass/--drag-area (raises InputError)."""
    from dropcalc.analysis.zone import ZoneObject, zone_object, zone_objects_from_items

    objects: list[ZoneObject] = []
    if object_ids or items is not None:
        from dropcalc.io.library import load_library

        lib = load_library(library)
        for object_id in object_ids or []:
            objects.append(zone_object(lib.get(object_id)))
        if items is not None:
            from dropcalc.analysis.batch import BatchSettings
            from dropcalc.io.items import parse_items, read_table

            frame = read_table(items)
            parsed, errors = parse_items(frame, lib, BatchSettings(height=height))
            if errors and not parsed:
                first = errors[0]
                raise InputError(f"{items.name}: row {first.row}: {first.message}")
            for error in errors:  # like batch: a bad row is named and left out, not fatal
                typer.echo(
                    f"dropcalc: warning: {items.name}: row {error.row}: {error.message} "
                    "(row left out of the zone)",
                    err=True,
                )
            objects.extend(zone_objects_from_items(parsed, lib))
    if mass is not None or drag_area is not None:
        if mass is None or drag_area is None:
            raise InputError("a custom object needs both --mass and --drag-area")
        parts = [p for p in drag_area.split(",") if p.strip()]
        areas = [_quantity(p.strip(), "area", "--drag-area") for p in parts]
        if len(areas) not in (1, 2) or min(areas) <= 0:
            raise InputError(f"--drag-area: expected one area or a min,max pair; got {drag_area}")
        from dropcalc.analysis.fall import check_object

        m = _quantity(mass, "mass", "--mass")
        check_object(m, min(areas), 1.0, None, max(areas))
        objects.append(ZoneObject("custom object", m, min(areas), max(areas)))
    if not objects:
        raise InputError(
            "give the objects: --object ID (repeatable), --items FILE, or --mass with --drag-area"
        )
    return objects


@app.command()
def report(
    scenario: Annotated[Path, typer.Argument(help="The scenario file (TOML).")],
    output: Annotated[Path, typer.Option("-o", "--output", help="The PDF to write.")] = Path(
        "report.pdf"
    ),
    out_dir: Annotated[
        Path | None,
        typer.Option(
            "--out-dir",
            help="Write the whole job into this folder (created if missing): the PDF (named as "
            "-o), results.json, objects.csv, one GeoJSON per work area (when the scenario gives "
            "site.origin) and the figures.",
        ),
    ] = None,
    as_json: JsonOpt = False,
) -> None:
    """Write the exclusion-zone report (PDF) for a scenario file; with --out-dir, every file."""
    import tempfile

    try:
        from dropcalc.analysis.job import run_job
        from dropcalc.io.scenario import load_scenario
        from dropcalc.present.json import report_json

        if output.suffix.lower() != ".pdf":
            raise InputError(f"-o must name a .pdf file; got {output.name}")
        job = run_job(load_scenario(scenario), _progress(as_json))
        if out_dir is not None:
            out_dir.mkdir(parents=True, exist_ok=True)
            summary = _write_job_files(job, out_dir, out_dir / output.name)
        else:
            with tempfile.TemporaryDirectory(prefix="dropcalc-figures-") as folder:
                pages = _write_pdf(job, Path(folder), output)
            summary = report_json(job, output)
            summary["pages"] = pages
    except DropcalcError as exc:
        _fail(exc)
        return
    except OSError as exc:
        _fail(InputError(f"cannot write the job's files ({exc.strerror or exc})"))
        return
    if as_json:
        from dropcalc.present.json import dumps

        typer.echo(dumps(summary))
    else:
        typer.echo(printable(_report_lines(summary)))
        if out_dir is not None:
            typer.echo(_files_line(out_dir, summary["files"]))


def _write_job_files(job: Any, out: Path, pdf: Path) -> dict[str, Any]:
    """Write a job's PDF, figures, objects.csv, GeoJSON and results.json into ``out``.

    Returns the report summary with ``pages`` and ``files`` (every file written, by role).
    """
    from dropcalc.io.atomic import write_atomic
    from dropcalc.present.json import dumps, report_json
    from dropcalc.present.tables import write_rows

    figures = out / "figures"
    pages = _write_pdf(job, figures, pdf)
    write_rows(out / "objects.csv", job.object_rows)
    summary = report_json(job, pdf)
    summary["pages"] = pages
    files = {"pdf": str(pdf), "objects_csv": str(out / "objects.csv")}
    for index, area in enumerate(job.work_areas, start=1):
        data = area.geojson
        if data is not None:
            target = out / f"exclusion-area-{index}.geojson"
            text = dumps(data, indent=1)
            write_atomic(target, partial(Path.write_text, data=text, encoding="utf-8"))
            files[f"geojson_{index}"] = str(target)
    for figure in sorted(figures.glob("*.png")):
        files[f"figure_{figure.stem}"] = str(figure)
    summary["files"] = files
    full = {"summary": summary, "objects": job.object_rows}
    text = dumps(full)
    write_atomic(out / "results.json", lambda p: p.write_text(text, encoding="utf-8"))
    files["results_json"] = str(out / "results.json")
    return summary


def _files_line(out: Path, files: dict[str, str]) -> str:
    """The closing line naming every file written, relative to ``out``."""
    names = []
    for path in files.values():
        try:
            names.append(str(Path(path).relative_to(out)))
        except ValueError:
            names.append(str(path))
    return f"Files in {out}/: " + ", ".join(names)


def _write_pdf(job: Any, figure_dir: Path, output: Path) -> int:
    """Draw the job's figures into ``figure_dir`` and write its PDF report; the page count."""
    from dropcalc.report.build import build_report
    from dropcalc.report.pdf import write_report

    return write_report(build_report(job, figure_dir), output)


def _report_lines(summary: dict[str, Any]) -> str:
    from dropcalc.texts import CAUTION_SHORT, NO_FINITE_DISTANCE, format_area, keep_clear

    lines = [f"Report written: {summary['pdf']} ({summary['pages']} pages)"]
    for area in summary["work_areas"]:
        if area["radius_m"] is None:  # not finite: carried away (see "not_finite")
            lines.append(f"  {area['name']}: {NO_FINITE_DISTANCE}")
            continue
        lines.append(
            f"  {area['name']}: keep {keep_clear(area['radius_m'])} m clear "
            f"({100 * summary['confidence']:g} % of simulated drops, margin included); "
            f"worst case {keep_clear(area['worst_case_radius_m'])} m; "
            f"area {format_area(area['area_m2'])} m²"
        )

    lines.append("Caution: " + CAUTION_SHORT)
    return "\n".join(lines)


@app.command()
def demo(
    out: Annotated[
        Path, typer.Option(help="Folder for the demo's files (created if missing).")
    ] = Path("dropcalc-demo"),
    as_json: JsonOpt = False,
) -> None:
    """Run the built-in demo job end to end: PDF report, JSON, CSV and GeoJSON in a folder."""
    import shutil

    try:
        from dropcalc.analysis.job import run_job
        from dropcalc.io.atomic import write_atomic
        from dropcalc.io.scenario import load_scenario
        from dropcalc.present.json import dumps
        from dropcalc.resources import data_path

        source = data_path("templates") / "demo"
        _refuse_to_overwrite_edits(out, source, ("scenario.toml", "items.csv"))
        out.mkdir(parents=True, exist_ok=True)
        for name in ("scenario.toml", "items.csv"):
            write_atomic(out / name, partial(shutil.copyfile, source / name))
        job = run_job(load_scenario(out / "scenario.toml"), _progress(as_json))
        summary = _write_job_files(job, out, out / "report.pdf")
        files = {
            "scenario": str(out / "scenario.toml"),
            "items_csv": str(out / "items.csv"),
            **summary["files"],
        }
        summary["files"] = files
    except DropcalcError as exc:
        _fail(exc)
        return
    if as_json:
        typer.echo(dumps(summary))
        return
    typer.echo(printable(_report_lines(summary)))
    typer.echo(_files_line(out, files).replace("Files in", "Demo files in", 1))


@app.command()
def serve(
    host: Annotated[
        str,
        typer.Option(help="Address to listen on (default: this computer only)."),
    ] = "127.0.0.1",
    port: Annotated[int, typer.Option(min=0, max=65535, help="Port (0: a free one).")] = 0,
    no_browser: Annotated[
        bool, typer.Option("--no-browser", help="Do not open the page in the browser.")
    ] = False,
) -> None:
    """Open the job page in the browser: the whole job without a terminal (Ctrl+C stops it)."""
    try:
        from dropcalc.web.serve import serve as run_server

        run_server(host, port, open_browser=not no_browser)
    except DropcalcError as exc:
        _fail(exc)
    except KeyboardInterrupt:
        pass


def _ground_slope(text: str, field: str) -> float:
    """The ground slope in degrees, in its allowed range (raises InputError naming ``field``)."""
    from dropcalc.errors import require_range
    from dropcalc.physics.scatter import SLOPE_RANGE

    return require_range(field, _quantity(text, "angle", field), *SLOPE_RANGE, "deg")


def _refuse_to_overwrite_edits(out: Path, source: Path, names: tuple[str, ...]) -> None:
    """Raise InputError if a demo input in ``out`` differs from the shipped one (user edits)."""
    for name in names:
        target = out / name
        try:
            edited = target.is_file() and target.read_bytes() != (source / name).read_bytes()
        except OSError as exc:
            raise InputError(f"{shorten(target, 120)}: cannot read ({exc.strerror})") from None
        if edited:
            raise InputError(
                f"{shorten(target, 120)} differs from the demo's copy (edited?); the demo will not "
                f"overwrite it. Run `dropcalc report {shorten(out / 'scenario.toml', 120)}` for "
                "your own version, or give the demo another --out folder"
            )


objects_app = typer.Typer(
    help="Browse the object library: list, filter, search, show one object.",
    no_args_is_help=False,
)
app.add_typer(objects_app, name="objects")

#: Columns of the object list (terminal) and of its CSV export.
_OBJECT_COLUMNS = (
    "id", "name", "category", "mass_kg", "shape", "drag_area_min_m2", "drag_area_max_m2",
    "contact_area_m2", "hazards", "source",
)  # fmt: skip


@objects_app.callback(invoke_without_command=True)
def objects(
    ctx: typer.Context,
    category: Annotated[str | None, typer.Option(help="Only this category.")] = None,
    search: Annotated[
        str | None, typer.Option(help="Only objects whose id, name or notes contain every word.")
    ] = None,
    library: LibraryOpt = None,
    csv: Annotated[
        Path | None,
        typer.Option(
            "--csv",
            help="Write the listed objects to a CSV file in the --library format (edit, then "
            "load it back with --library).",
        ),
    ] = None,
    units: UnitsOpt = UnitSystem.si,
    as_json: JsonOpt = False,
) -> None:
    """List the library's objects (or `objects show ID` for one)."""
    if ctx.invoked_subcommand is not None:
        return
    try:
        from dropcalc.io.library import load_library

        lib = load_library(library)
        chosen = list(lib.search(search) if search else lib)
        if category is not None:
            if category not in lib.categories():
                raise InputError(
                    f"--category: unknown category {category!r}; known: "
                    f"{', '.join(lib.categories())}"
                )
            chosen = [o for o in chosen if o.category == category]
        if csv is not None:
            from dropcalc.io.library import csv_rows
            from dropcalc.present.tables import write_rows

            require_suffix(csv, (".csv",), "--csv")
            write_rows(csv, csv_rows(chosen))
    except DropcalcError as exc:
        _fail(exc)
        return
    if as_json:
        from dropcalc.present.json import dumps, object_json

        typer.echo(dumps([object_json(o) for o in chosen]))
        return
    from dropcalc.present.text import render_objects

    typer.echo(printable(render_objects(chosen, units.value)))


@objects_app.command("show")
def objects_show(
    object_id: Annotated[str, typer.Argument(metavar="ID", help="Object id.")],
    library: LibraryOpt = None,
    units: UnitsOpt = UnitSystem.si,
    as_json: JsonOpt = False,
) -> None:
    """Show every property of one object with its source."""
    try:
        from dropcalc.io.library import load_library

        obj = load_library(library).get(object_id)
    except DropcalcError as exc:
        _fail(exc)
        return
    if as_json:
        from dropcalc.present.json import dumps, object_json

        typer.echo(dumps(object_json(obj)))
        return
    from dropcalc.present.text import render_object

    typer.echo(printable(render_object(obj, units.value)))


def _progress(quiet: bool) -> Any:
    """A progress callback drawing a bar on a terminal; None when quiet or not a terminal."""
    if quiet or not sys.stderr.isatty():
        return None
    from rich.progress import Progress

    state: dict[str, Any] = {}

    def update(done: int, total: int) -> None:
        if total < 2000:  # a short list finishes before a bar is worth drawing
            return
        if "bar" not in state:
            state["bar"] = Progress(transient=True)
            state["bar"].start()
            state["task"] = state["bar"].add_task("solving", total=total)
        state["bar"].update(state["task"], completed=done)
        if done >= total:
            state["bar"].stop()

    return update


def stop_on_signal(signum: int, frame: Any) -> None:
    """SIGTERM handler: leave through SystemExit, so that every cleanup runs.

    Python's default SIGTERM ends the process at once: the temporary file of an atomic write,
    a batch run's chunk folder and openpyxl's temporary files stayed behind. Raised as
    SystemExit, ``finally`` blocks, context managers and ``atexit`` handlers remove them; the
    exit code is the shell's 128 + signal number. (SIGINT already raises KeyboardInterrupt.)
    """
    raise SystemExit(128 + signum)


def main() -> None:
    """Entry point of the ``dropcalc`` console script."""
    signal.signal(signal.SIGTERM, stop_on_signal)
    app()
