"""The ``dropcalc`` command line: parse, call the library, render. Nothing else lives here."""

from __future__ import annotations

import json
import math
import sys
from enum import StrEnum
from typing import Annotated, Any

import typer
from typer.core import TyperGroup

from dropcalc.errors import DropcalcError, InputError


class _OneLineErrors(TyperGroup):
    """Command group whose usage errors (bad choice, unknown option) are one line, exit 2."""

    def main(self, *args: Any, standalone_mode: bool = True, **kwargs: Any) -> Any:
        """Run the command line; print click's usage errors as one line instead of a box."""
        try:
            result = super().main(*args, standalone_mode=False, **kwargs)
            code = result if isinstance(result, int) else 0
        except typer.TyperException as exc:  # usage errors: bad choice, unknown option
            message = exc.format_message().strip()
            if message:  # empty when no arguments were given and the help was shown
                typer.echo(f"dropcalc: error: {message}", err=True)
            code = exc.exit_code
        except typer.Exit as exc:
            code = exc.exit_code
        except typer.Abort:
            typer.echo("dropcalc: aborted", err=True)
            code = 1
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


@app.callback()
def _root() -> None:
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
}


def _fail(message: str) -> None:
    """Print one error line to stderr, naming the option where the model named a field."""
    first = message.split(" ", 1)[0].rstrip(":")
    option = _OPTION_OF_FIELD.get(first)
    if option is not None:
        message = f"{option}: {message}"
    typer.echo(f"dropcalc: error: {message}", err=True)
    raise typer.Exit(2)


def _q(value: str | None, kind: str, option: str) -> float | None:
    """Parse an optional quantity typed at the command line into SI."""
    if value is None:
        return None
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
        speeds.append(_q(text, "speed", "--carrier-velocity"))
    return (speeds[0], speeds[1], speeds[2])  # type: ignore[return-value]


@app.command()
def fall(
    mass: Annotated[str, typer.Option(help='Mass of the object, e.g. "1.2 kg", "3 lb".')],
    height: Annotated[
        str, typer.Option(help='Release height above the landing surface, e.g. "25 m", "80 ft".')
    ],
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
    wind: Annotated[str, typer.Option(help='Wind speed at 10 m, e.g. "12 m/s", "25 mph".')] = "0",
    wind_kind: Annotated[
        SpeedKind, typer.Option(help="Whether --wind is a mean speed or a gust.")
    ] = SpeedKind.mean,
    wind_from: Annotated[
        str | None,
        typer.Option(
            help="Compass direction the wind blows from (deg). Default: straight at the edge "
            "from behind, i.e. blowing the object away from the structure."
        ),
    ] = None,
    wind_profile: Annotated[
        ProfileName | None, typer.Option(help="Wind profile with height.")
    ] = None,
    wind_exponent: Annotated[
        float | None, typer.Option(help="Power-law exponent of the wind profile.")
    ] = None,
    roughness: Annotated[
        str | None, typer.Option(help='Log-law roughness length, e.g. "0.3 m".')
    ] = None,
    terrain: Annotated[
        str | None,
        typer.Option(help="Terrain class: en-0 … en-iv (EN 1991-1-4), asce-b/c/d (ASCE 7)."),
    ] = None,
    elevation: Annotated[str, typer.Option(help='Site elevation, e.g. "350 m".')] = "0",
    air_temp: Annotated[str | None, typer.Option(help='Air temperature, e.g. "5 °C".')] = None,
    pressure: Annotated[str | None, typer.Option(help='Air pressure, e.g. "98 kPa".')] = None,
    humidity: Annotated[str | None, typer.Option(help='Relative humidity, e.g. "60 %".')] = None,
    air_density: Annotated[
        str | None, typer.Option(help='Air density; overrides the above, e.g. "1.2 kg/m3".')
    ] = None,
    latitude: Annotated[
        float | None, typer.Option(help="Latitude (deg) for local gravity; default standard g.")
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
        float | None, typer.Option(help="Friction coefficient on the roof (roof-slide).")
    ] = None,
    rolling: Annotated[
        bool,
        typer.Option("--rolling", help="Roof-slide: the object rolls (pipe, ball), not slides."),
    ] = False,
    carrier_velocity: Annotated[
        str | None,
        typer.Option(help='Velocity of what it falls from, east,north,up, e.g. "0,0,-1 m/s".'),
    ] = None,
    edge_azimuth: Annotated[
        float, typer.Option(help="Compass direction the edge faces (deg); pushes go this way.")
    ] = 90.0,
    units: Annotated[UnitSystem, typer.Option(help="Units for display.")] = UnitSystem.si,
    as_json: Annotated[
        bool, typer.Option("--json", help="Print the result as one JSON object only.")
    ] = False,
) -> None:
    """Solve one object falling from one release: impact speed, energy, time and drift."""
    try:
        if not math.isfinite(edge_azimuth):
            raise InputError(
                f"--edge-azimuth must be a finite compass angle in degrees; got {edge_azimuth}"
            )
        from dropcalc.fall import FallCase, solve_fall
        from dropcalc.physics.atmosphere import air_state
        from dropcalc.physics.gravity import gravity as local_g
        from dropcalc.physics.release import Release
        from dropcalc.physics.wind import wind_spec
        from dropcalc.render import render_fall

        if drag_area is not None and (cd is not None or area is not None):
            raise InputError(
                "give either --drag-area or --cd with --area, not both "
                f"(got --drag-area {drag_area} and --cd {cd} --area {area})"
            )
        if drag_area is None:
            if cd is None or area is None:
                raise InputError(
                    "the drag needs --drag-area (Cd·A, e.g. 0.004 m2) or both --cd and --area"
                )
            if not (0 < cd <= 5):
                raise InputError(f"--cd must be between 0 and 5 (exclusive of 0); got {cd:g}")
            area_m2 = float(_q(area, "area", "--area"))
            if not area_m2 > 0:
                raise InputError(f"--area must be an area > 0 m²; got {area}")
            cda = cd * area_m2
        else:
            cda = float(_q(drag_area, "area", "--drag-area"))
        elevation_m = float(_q(elevation, "length", "--elevation"))
        air = air_state(
            elevation=elevation_m,
            temperature=_q(air_temp, "temperature", "--air-temp"),
            pressure=_q(pressure, "pressure", "--pressure"),
            relative_humidity=_q(humidity, "fraction", "--humidity"),
            density=_q(air_density, "density", "--air-density"),
        )
        default_from = (edge_azimuth + 180.0) % 360.0
        wind_model = wind_spec(
            float(_q(wind, "speed", "--wind")),
            kind=wind_kind.value,
            from_direction=_q(wind_from, "angle", "--wind-from") if wind_from else default_from,
            profile=wind_profile.value if wind_profile else None,
            exponent=wind_exponent,
            roughness_length=_q(roughness, "length", "--roughness"),
            terrain=terrain,
        )
        mode = release.value
        speed = _q(release_speed, "speed", "--release-speed")
        if mode in ("push", "throw") and speed is None:
            raise InputError(f"--release {mode} needs --release-speed (e.g. 2 m/s)")
        if mode == "roof-slide" and (roof_pitch is None or roof_length is None):
            raise InputError("--release roof-slide needs --roof-pitch and --roof-length")
        release_model = Release(
            mode=mode,
            speed=speed or 0.0,
            angle=_q(release_angle, "angle", "--release-angle") or 0.0,
            roof_pitch=_q(roof_pitch, "angle", "--roof-pitch") or 0.0,
            roof_length=_q(roof_length, "length", "--roof-length") or 0.0,
            friction=friction if friction is not None else (0.4 if mode == "roof-slide" else 0.0),
            rolling=rolling,
            carrier_velocity=_carrier(carrier_velocity),
        )
        case = FallCase(
            mass=float(_q(mass, "mass", "--mass")),
            drag_area=cda,
            height=float(_q(height, "length", "--height")),
            release=release_model,
            air=air,
            wind=wind_model,
            gravity=local_g(latitude, elevation_m),
            edge_azimuth=edge_azimuth,
            contact_area=_q(contact_area, "area", "--contact-area"),
        )
        result = solve_fall(case)
    except DropcalcError as exc:
        _fail(str(exc))
        return
    if as_json:
        typer.echo(json.dumps(result.to_json(), indent=2, allow_nan=False))
    else:
        typer.echo(render_fall(result, units.value))


def main() -> None:
    """Entry point of the ``dropcalc`` console script."""
    try:
        app()
    except DropcalcError as exc:  # pragma: no cover - commands catch their own
        typer.echo(f"dropcalc: error: {exc}", err=True)
        sys.exit(2)
