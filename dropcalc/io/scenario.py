"""The scenario file: one TOML file that describes a job for the report.

Reference: ``docs/scenario.md``; a commented example: ``templates/example-scenario.toml`` (the
demo's scenario). Every quantity accepts units ("18 m", "25 mph", "8 degC"); every field has a
documented default. A mistake is reported with the file, the key path and the line::

    scenario.toml: line 31: work_area[1].edge[1].height: expected a length (e.g. "12 m",
    "40 ft"); got "twelve"
"""

from __future__ import annotations

import hashlib
import math
import re
from collections.abc import Iterator
from dataclasses import dataclass, field
from pathlib import Path
from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:  # loaded with the scenario, in load_scenario
    from dropcalc.io.library import Library
    from dropcalc.model.policy import ControlRule
    from dropcalc.model.reference_levels import ReferenceLevel
    from dropcalc.physics.atmosphere import AirState
    from dropcalc.physics.release import Release
    from dropcalc.physics.scatter import Surface
    from dropcalc.physics.wind import WindSpec

from dropcalc.errors import (
    DropcalcError,
    InputError,
    parse_toml,
    read_file,
    require_range,
    shorten,
)
from dropcalc.model.limits import (
    MAX_EDGES,
    MAX_NAME_CHARACTERS,
    MAX_OBJECTS,
    MAX_REFERENCE_LEVELS,
    MAX_TEXT_FILE_BYTES,
    MAX_TITLE_CHARACTERS,
    MAX_WORK_AREAS,
)

#: Tables and keys a scenario may have (anything else is a mistake, reported as such).
_KEYS: dict[str, set[str]] = {
    "": {"job", "site", "wind", "policy", "work_area", "object", "objects_file"},
    "job": {
        "title", "site", "client", "reference", "prepared_by", "checked_by", "revision", "date",
    },
    "site": {
        "elevation", "air_temperature", "pressure", "humidity", "air_density", "latitude",
        "ground", "ground_slope", "origin", "outline",
    },
    "wind": {"speed", "kind", "from", "terrain", "profile", "exponent", "roughness", "measured"},
    "policy": {
        "confidence", "margin", "levels", "rules_file", "precision", "seed",
    },  # fmt: skip
    "work_area": {
        "name", "release", "release_speed", "release_angle", "roof_pitch", "roof_length",
        "friction", "rolling", "edge", "clear_distance",
    },  # fmt: skip
    "edge": {"name", "points", "height"},
    # An object is one row of a ``dropcalc batch`` list: a library id, or mass with drag_area,
    # or mass with a shape and its dimensions; height for an item used higher than the edges.
    "object": {
        "id", "label", "quantity", "mass", "drag_area", "contact_area", "shape", "length",
        "width", "depth", "thickness", "diameter", "outer_diameter", "wall_thickness", "height",
    },
}  # fmt: skip


#: Said when a scenario loaded without file references names a file.
_NO_FILE_REFERENCES = (
    "this scenario may not name files (it was not read from the command line); "
    "give its objects as [[object]] tables and leave rules_file out (default rules)"
)


@dataclass(frozen=True)
class WorkArea:
    """One work area: edges with heights, and how objects leave them."""

    name: str
    release: Release
    site: Any  # dropcalc.analysis.plan.Site (outline shared, this area's edges)
    #: Clear distance available from the work edge (barricade line) [m], or None.
    clear_distance: float | None = None


@dataclass(frozen=True)
class Scenario:
    """A validated scenario, SI units, ready for the report."""

    path: Path
    sha256: str
    job: dict[str, str]
    air: AirState
    gravity: float
    wind: WindSpec
    wind_from_given: bool
    ground: Surface
    ground_slope: float
    origin: tuple[float, float] | None
    work_areas: tuple[WorkArea, ...]
    items: Any  # list of dropcalc.io.items.Item
    confidence: float
    margin: float
    precision: float
    seed: int
    levels: tuple[ReferenceLevel, ...]
    rules: tuple[ControlRule, ...]
    library: Library
    notes: list[str] = field(default_factory=list)
    #: Where the wind speed was measured: "site" or "open-country" (converted to the site).
    wind_measured: str = "site"
    #: The wind's basis in words (measured where, converted how; or no terrain given).
    wind_basis: str = ""


class ScenarioError(InputError):
    """A mistake in a scenario file; ``key_path`` names the key (``work_area[1].edge[1].height``).

    The message is the command line's (file, line, key path, what is wrong); the key path is
    kept apart so that a page can show the message beside the field the key came from.
    """

    def __init__(self, message: str, key_path: str) -> None:
        super().__init__(message)
        self.key_path = key_path


class _Where:
    """Key paths and their lines in the scenario text, for messages."""

    def __init__(self, path: Path, text: str) -> None:
        self.path = path
        self.lines = text.splitlines()

    def line_of(self, key_path: str) -> int | None:
        """Best-effort line number of a key path like ``work_area[2].edge[1].height``.

        The line of the key itself when it is there, else the line of its table's header.
        """
        start: int | None = None  # index of the current table's header line
        parts = key_path.split(".")
        table = ""
        header = re.compile(r"^\s*\[")
        for i, part in enumerate(parts):
            match = re.fullmatch(r"(\w+)\[(\d+)\]", part)
            begin = 0 if start is None else start
            if match:
                name, index = match[1], int(match[2])
                table = f"{table}.{name}" if table else name
                pattern = re.compile(rf"^\s*\[\[\s*{re.escape(table)}\s*\]\]")
                hits = [n for n in range(begin, len(self.lines)) if pattern.match(self.lines[n])]
                if len(hits) < index:
                    return None if start is None else start + 1
                start = hits[index - 1]
            elif i == len(parts) - 1:
                key = re.compile(rf"^\s*{re.escape(part)}\s*=")
                first = begin + 1 if start is not None else 0
                for n in range(first, len(self.lines)):
                    if start is not None and header.match(self.lines[n]):
                        break  # the next table: the key is not in this one
                    if start is None and header.match(self.lines[n]):
                        break  # top-level keys come before the first table
                    if key.match(self.lines[n]):
                        return n + 1
                return None if start is None else start + 1
            else:
                table = f"{table}.{part}" if table else part
                pattern = re.compile(rf"^\s*\[\s*{re.escape(table)}\s*\]")
                hits = [n for n in range(begin, len(self.lines)) if pattern.match(self.lines[n])]
                if not hits:
                    # Not a table of its own: an inline table, ``part = { ... }``, in this one.
                    inline = re.compile(rf"^\s*{re.escape(part)}\s*=")
                    for n in range(begin, len(self.lines)):
                        if n > begin and header.match(self.lines[n]):
                            break
                        if inline.match(self.lines[n]):
                            return n + 1
                    return None if start is None else start + 1
                start = hits[0]
        return None if start is None else start + 1

    def error(self, key_path: str, message: str) -> ScenarioError:
        """An error naming the file, the line (when found) and the key path."""
        line = self.line_of(key_path)
        at = f"line {line}: " if line else ""
        return ScenarioError(f"{self.path.name}: {at}{key_path}: {message}", key_path)


def load_scenario(path: Path, *, allow_file_references: bool = True) -> Scenario:
    """Read and validate a scenario file.

    Parameters
    ----------
    path : pathlib.Path
        The scenario (TOML).
    allow_file_references : bool
        Whether ``objects_file`` and ``policy.rules_file`` may name files to open (relative
        to the scenario's folder, or any path). True on the command line, where users read
        their own files; a scenario that came from elsewhere (uploaded to the local page) is
        loaded with False, and then a file reference is refused without opening anything.

    Raises
    ------
    InputError
        For a file that cannot be read, is not TOML, or has a wrong key, value or unit; the
        message names the file, the line and the key path. A mistake inside a referenced
        objects file is named by its row and column, without quoting the file's content.
    """
    from dropcalc.io.items import KNOWN_COLUMNS, Defaults, parse_items, read_table
    from dropcalc.io.library import load_library
    from dropcalc.model.limits import (
        CONFIDENCE_RANGE,
        MARGIN_RANGE,
        MAX_CLEAR_DISTANCE,
        RELATIVE_ERROR_RANGE,
        RELEASE_HEIGHT_RANGE,
    )
    from dropcalc.model.policy import DEFAULT_RULES, load_policy
    from dropcalc.model.reference_levels import DEFAULT_LEVEL_KEYS, reference_level
    from dropcalc.model.site import Site, WorkEdge
    from dropcalc.physics.atmosphere import air_state
    from dropcalc.physics.gravity import gravity as local_gravity
    from dropcalc.physics.release import DEFAULT_ROOF_FRICTION, Release
    from dropcalc.physics.scatter import SLOPE_RANGE, surface
    from dropcalc.physics.wind import wind_at_site, wind_spec
    from dropcalc.units import parse_direction, parse_quantity

    path = Path(path)
    raw_bytes = read_file(path, "scenario", MAX_TEXT_FILE_BYTES)
    data, text = parse_toml(raw_bytes, path.name, "scenario")
    where = _Where(path, text)

    def check_keys(table: dict[str, Any], kind: str, key_path: str) -> None:
        for key in table:
            if key not in _KEYS[kind]:
                allowed = ", ".join(sorted(_KEYS[kind]))
                raise where.error(
                    f"{key_path}.{key}" if key_path else key, f"unknown key; allowed: {allowed}"
                )

    def table(name: str) -> dict[str, Any]:
        value = data.get(name, {})
        if not isinstance(value, dict):
            raise where.error(name, "expected a table, e.g. [" + name + "]")
        check_keys(value, name, name)
        return value

    def quantity(value: Any, kind: str, key_path: str) -> float:
        try:
            return parse_quantity(value, kind, key_path)
        except InputError as exc:
            message = str(exc)
            if message.startswith(f"{key_path}: "):
                message = message[len(key_path) + 2 :]
            raise where.error(key_path, message) from None

    def number(value: Any, key_path: str, convert: Any = float) -> Any:
        if isinstance(value, bool):
            raise where.error(key_path, f"expected a number; got {value!r}")
        try:
            return convert(value)
        except (TypeError, ValueError, OverflowError):  # int(inf) overflows
            raise where.error(key_path, f"expected a number; got {value!r}") from None

    def model(key_path: str, build: Any, fields: dict[str, str] | None = None) -> Any:
        try:
            return build()
        except DropcalcError as exc:
            if fields and exc.field in fields:  # the model named its own field: the file's key
                raise where.error(fields[exc.field], str(exc)) from None
            raise where.error(key_path, str(exc)) from None

    def in_range(value: Any, key_path: str, limits: tuple[float, float], unit: str = "") -> Any:
        try:
            return require_range(key_path, value, *limits, unit)
        except InputError as exc:
            raise where.error(key_path, exc.detail) from None

    def tables(raw_list: list[Any], name: str) -> Iterator[tuple[str, dict[str, Any]]]:
        """Each table of an array of tables ([[name]]) with its key path, keys checked."""
        for number, raw in enumerate(raw_list, start=1):
            key = f"{name}[{number}]"
            if not isinstance(raw, dict):
                raise where.error(key, "expected a table")
            check_keys(raw, name, key)
            yield key, raw

    def text_of(value: Any, key_path: str, limit: int = MAX_NAME_CHARACTERS) -> str:
        if not isinstance(value, str | int | float) or isinstance(value, bool):
            raise where.error(key_path, f"expected text; got {shorten(repr(value), 60)}")
        if len(str(value)) > limit:
            raise where.error(
                key_path, f"{len(str(value)):,} characters; at most {limit} (docs/limits.md)"
            )
        return str(value)

    def at_most(items: list[Any], limit: int, key_path: str, what: str) -> None:
        if len(items) > limit:
            raise where.error(
                key_path, f"{len(items):,} {what}; at most {limit:,} (docs/limits.md)"
            )

    check_keys(data, "", "")
    job_table = table("job")
    if "title" not in job_table:
        raise where.error("job.title", "missing: every report needs a title")
    job = {k: text_of(v, f"job.{k}", MAX_TITLE_CHARACTERS) for k, v in job_table.items()}

    site_table = table("site")
    elevation = quantity(site_table.get("elevation", 0), "length", "site.elevation")
    optional = {
        "temperature": ("air_temperature", "temperature"),
        "pressure": ("pressure", "pressure"),
        "relative_humidity": ("humidity", "fraction"),
        "density": ("air_density", "density"),
    }
    air_args = {
        arg: quantity(site_table[key], kind, f"site.{key}")
        for arg, (key, kind) in optional.items()
        if key in site_table
    }
    air = model(
        "site",
        lambda: air_state(elevation=elevation, **air_args),
        {arg: f"site.{key}" for arg, (key, _kind) in optional.items()},
    )
    latitude = site_table.get("latitude")
    g = model("site.latitude", lambda: local_gravity(latitude, elevation))
    ground = model("site.ground", lambda: surface(site_table.get("ground", "concrete")))
    ground_slope = quantity(site_table.get("ground_slope", "0 deg"), "angle", "site.ground_slope")
    in_range(ground_slope, "site.ground_slope", SLOPE_RANGE, "deg")
    origin = None
    if "origin" in site_table:
        o = site_table["origin"]
        if not isinstance(o, dict) or set(o) != {"lat", "lon"}:
            raise where.error("site.origin", "expected { lat = ..., lon = ... } in degrees")
        origin = (number(o["lat"], "site.origin.lat"), number(o["lon"], "site.origin.lon"))
    outline = site_table.get("outline")

    wind_table = table("wind")
    speed = quantity(wind_table.get("speed", 0), "speed", "wind.speed")
    wind_from_given = "from" in wind_table
    from_direction = (
        model("wind.from", lambda: parse_direction(wind_table["from"], "wind.from"))
        if wind_from_given
        else 270.0
    )
    wind = model(
        "wind",
        lambda: wind_spec(
            speed,
            kind=text_of(wind_table.get("kind", "mean"), "wind.kind"),  # type: ignore[arg-type]
            from_direction=from_direction,
            profile=wind_table.get("profile"),
            exponent=wind_table.get("exponent"),
            roughness_length=(
                quantity(wind_table["roughness"], "length", "wind.roughness")
                if "roughness" in wind_table
                else None
            ),
            terrain=wind_table.get("terrain"),
        ),
        {
            "speed_10m": "wind.speed", "kind": "wind.kind", "from_direction": "wind.from",
            "profile": "wind.profile", "exponent": "wind.exponent",
            "roughness_length": "wind.roughness", "terrain": "wind.terrain",
            "unknown": "wind.terrain", "minimum_height": "wind.roughness",
        },
    )  # fmt: skip

    measured = text_of(wind_table.get("measured", "site"), "wind.measured").strip().lower()
    given_speed = wind.speed_10m
    wind = model("wind.measured", lambda: wind_at_site(wind, measured))
    if wind.speed_10m > 0 and wind.profile == "uniform":
        wind_basis = (
            "no terrain given: the same wind speed is taken at every height (over real ground "
            "it grows with height); give wind.terrain"
        )
    elif measured == "open-country" and given_speed > 0:
        wind_basis = (
            f"given as {given_speed:.3g} m/s at 10 m in open country (EN 1991-1-4 category II), "
            f"converted to {wind.speed_10m:.3g} m/s at 10 m over the site's terrain "
            "(roughness factor c_r = k_r ln(z/z0), k_r = 0.19 (z0/0.05 m)^0.07)"
        )
    else:
        wind_basis = "given at 10 m over the site's own terrain" if given_speed > 0 else ""

    policy = table("policy")
    confidence = number(policy.get("confidence", 0.99), "policy.confidence")
    in_range(confidence, "policy.confidence", CONFIDENCE_RANGE)
    margin = quantity(policy.get("margin", "2 m"), "length", "policy.margin")
    in_range(margin, "policy.margin", MARGIN_RANGE, "m")
    precision = number(policy.get("precision", 0.01), "policy.precision")
    in_range(precision, "policy.precision", RELATIVE_ERROR_RANGE)
    raw_seed = policy.get("seed", 1)
    seed = number(raw_seed, "policy.seed", int)
    fractional = isinstance(raw_seed, float) and not raw_seed.is_integer()
    if seed < 0 or fractional:
        raise where.error("policy.seed", f"must be a whole number >= 0; got {raw_seed!r}")
    level_keys = policy.get("levels", list(DEFAULT_LEVEL_KEYS))
    if not isinstance(level_keys, list):
        raise where.error("policy.levels", "expected a list of reference level keys")
    at_most(level_keys, MAX_REFERENCE_LEVELS, "policy.levels", "reference levels")
    levels = tuple(model("policy.levels", lambda k=k: reference_level(str(k))) for k in level_keys)
    rules = DEFAULT_RULES
    if "rules_file" in policy:
        if not allow_file_references:
            raise where.error("policy.rules_file", _NO_FILE_REFERENCES)
        rules_path = path.parent / str(policy["rules_file"])
        rules = model("policy.rules_file", lambda: load_policy(rules_path))

    raw_areas = data.get("work_area")
    if not isinstance(raw_areas, list) or not raw_areas:
        raise where.error("work_area", "expected one or more [[work_area]] tables")
    # An array of tables is named at its first table over the limit (key path and line).
    at_most(raw_areas, MAX_WORK_AREAS, f"work_area[{MAX_WORK_AREAS + 1}]", "work areas")
    every_edge = [
        f"work_area[{a}].edge[{e}]"
        for a, area in enumerate(raw_areas, start=1)
        if isinstance(area, dict) and isinstance(area.get("edge"), list)
        for e in range(1, len(area["edge"]) + 1)
    ]
    if len(every_edge) > MAX_EDGES:
        at_most(every_edge, MAX_EDGES, every_edge[MAX_EDGES], "edges in all work areas together")
    areas = []
    for a, (key, raw) in enumerate(tables(raw_areas, "work_area"), start=1):
        mode = text_of(raw.get("release", "drop"), f"{key}.release")
        release_speed = (
            quantity(raw["release_speed"], "speed", f"{key}.release_speed")
            if "release_speed" in raw
            else 0.0
        )
        angle = (
            quantity(raw["release_angle"], "angle", f"{key}.release_angle")
            if "release_angle" in raw
            else 0.0
        )
        slide: dict[str, Any] = {}
        for name, kind in (("roof_pitch", "angle"), ("roof_length", "length")):
            if name in raw:
                slide[name] = quantity(raw[name], kind, f"{key}.{name}")
            elif mode == "roof-slide":
                raise where.error(f"{key}.{name}", 'missing: release = "roof-slide" needs it')
        if "friction" in raw:
            slide["friction"] = number(raw["friction"], f"{key}.friction")
        elif mode == "roof-slide":
            slide["friction"] = DEFAULT_ROOF_FRICTION
        if "rolling" in raw:
            if not isinstance(raw["rolling"], bool):
                raise where.error(
                    f"{key}.rolling", f"expected true or false; got {raw['rolling']!r}"
                )
            slide["rolling"] = raw["rolling"]
        fields = {name: f"{key}.{name}" for name in (*slide, "release_speed", "release_angle")}
        release = model(
            f"{key}.release",
            lambda m=mode, v=release_speed, t=angle, extra=slide: Release(m, v, t, **extra),
            fields,
        )
        clear_distance = None
        if "clear_distance" in raw:
            clear_distance = quantity(raw["clear_distance"], "length", f"{key}.clear_distance")
            if not (0.0 < clear_distance <= MAX_CLEAR_DISTANCE):
                raise where.error(
                    f"{key}.clear_distance",
                    f"must be a distance above 0 and at most {MAX_CLEAR_DISTANCE:g} m; "
                    f"got {clear_distance:g} m",
                )
        raw_edges = raw.get("edge")
        if not isinstance(raw_edges, list) or not raw_edges:
            raise where.error(f"{key}.edge", "expected one or more [[work_area.edge]] tables")
        edges = []
        for e, raw_edge in enumerate(raw_edges, start=1):
            edge_key = f"{key}.edge[{e}]"
            if not isinstance(raw_edge, dict):
                raise where.error(
                    f"{key}.edge", "expected [[work_area.edge]] tables with points and height"
                )
            check_keys(raw_edge, "edge", edge_key)
            for needed in ("points", "height"):
                if needed not in raw_edge:
                    raise where.error(f"{edge_key}.{needed}", "missing")
            height = quantity(raw_edge["height"], "length", f"{edge_key}.height")
            in_range(height, f"{edge_key}.height", RELEASE_HEIGHT_RANGE, "m")
            name = text_of(raw_edge.get("name", f"edge {e}"), f"{edge_key}.name")
            edges.append(
                model(
                    edge_key,
                    lambda n=name, p=raw_edge["points"], h=height: WorkEdge(n, p, h),
                    {"work": f"{edge_key}.points", "points": f"{edge_key}.points"},
                )
            )
        site = model(f"{key}", lambda e=edges: Site(outline, tuple(e)), {"outline": "site.outline"})
        name = text_of(raw.get("name", f"work area {a}"), f"{key}.name")
        areas.append(WorkArea(name, release, site, clear_distance))

    library = load_library()
    from dropcalc.model.checks import check_object

    raw_objects = data.get("object", [])
    if not isinstance(raw_objects, list):
        raise where.error("object", "expected [[object]] tables")
    at_most(raw_objects, MAX_OBJECTS, f"object[{MAX_OBJECTS + 1}]", "objects")
    items = []
    highest = max(e.height for w in areas for e in w.site.edges)
    settings = Defaults(height=highest)
    import pandas as pd

    records = []
    for key, raw in tables(raw_objects, "object"):
        for k, v in raw.items():
            if k in ("id", "label"):
                text_of(v, f"{key}.{k}")
        records.append({k: str(v) for k, v in raw.items()})
    if records:
        frame = pd.DataFrame(records).fillna("")
        parsed, errors = parse_items(frame, library, settings)
        if errors:
            first = errors[0]
            key = f"object[{first.row - 1}]"
            if first.field in _KEYS["object"]:
                key += f".{first.field}"
            message = first.message
            word = first.field or ""
            if word and message.startswith(f"{word}: ") and key.endswith(f".{word}"):
                message = message[len(word) + 2 :]  # the key path names it already
            raise where.error(key, message)
        items.extend(parsed)
    if "objects_file" in data:
        if not allow_file_references:
            raise where.error("objects_file", _NO_FILE_REFERENCES)
        list_path = path.parent / str(data["objects_file"])
        frame = model("objects_file", lambda: read_table(list_path))
        parsed, errors = parse_items(frame, library, settings)
        if errors:
            first = errors[0]
            column = first.field or ""
            cell = f"the {column} cell" if column in KNOWN_COLUMNS else "a cell"
            raise where.error(
                "objects_file",
                f"{list_path.name}: row {first.row}: {cell} cannot be used "
                f"(dropcalc batch {list_path.name} --height 10 says why)",
            )
        items.extend(parsed)
        at_most(items, MAX_OBJECTS, "objects_file", "objects ([[object]] tables and the file)")
    if not items:
        raise where.error("object", "no objects: add [[object]] tables or an objects_file")
    for item in items:
        check_object(item.mass, item.drag_area_min, highest, item.contact_area)
    if origin is not None and not (
        math.isfinite(origin[0]) and -85 <= origin[0] <= 85 and -180 <= origin[1] <= 180
    ):
        raise where.error("site.origin", f"latitude -85..85 and longitude -180..180; got {origin}")
    return Scenario(
        path=path,
        sha256=hashlib.sha256(raw_bytes).hexdigest(),
        job=job,
        air=air,
        gravity=g,
        wind=wind,
        wind_from_given=wind_from_given,
        ground=ground,
        ground_slope=ground_slope,
        origin=origin,
        work_areas=tuple(areas),
        items=items,
        confidence=confidence,
        margin=margin,
        precision=precision,
        seed=seed,
        levels=levels,
        rules=rules,
        library=library,
        wind_measured=measured,
        wind_basis=wind_basis,
    )
