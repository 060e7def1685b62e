"""The page's form and the scenario file: one to the other and back, without loss.

The browser sends the form as JSON: every value as the text the user typed ("17.5 m", "25 mph",
"" for "not given"), the plan's points as numbers. :func:`check_form` checks its shape (types,
sizes; never the physics), :func:`form_to_toml` writes the scenario file that ``dropcalc
report`` reads (docs/scenario.md), and :func:`toml_to_form` reads one back into a form. The
values themselves are checked by the scenario loader, once, as for the command line; its
messages name a key path (``work_area[1].edge[1].height``) that :func:`field_of_key` turns into
the form's field (``work_areas.0.edges.0.height``) so the page shows them beside that field.

A form never names another file: ``objects_file`` and ``rules_file`` have no place in it, so a
scenario written from the page opens no path on the server.
"""

from __future__ import annotations

import datetime as _dt
import math
import re
import tomllib
from collections.abc import Mapping, Sequence
from typing import Any

from dropcalc.errors import InputError, shorten

#: Fields of each part of the form, in the order the scenario file writes them. The names are
#: the scenario's keys (docs/scenario.md), except the origin, split into two fields.
JOB_FIELDS = (
    "title", "site", "client", "reference", "prepared_by", "checked_by", "revision", "date",
)  # fmt: skip
SITE_FIELDS = (
    "elevation", "air_temperature", "pressure", "humidity", "air_density", "latitude", "ground",
    "ground_slope", "origin_lat", "origin_lon",
)  # fmt: skip
WIND_FIELDS = (
    "speed", "kind", "measured", "from", "terrain", "profile", "exponent", "roughness",
)  # fmt: skip
POLICY_FIELDS = ("confidence", "margin", "levels", "precision", "seed")
AREA_FIELDS = (
    "name", "release", "release_speed", "release_angle", "roof_pitch", "roof_length", "friction",
    "rolling", "clear_distance",
)  # fmt: skip
EDGE_FIELDS = ("name", "height")
#: An object: a library id, or a custom object (mass with drag_area, or shape and dimensions),
#: as one row of a ``dropcalc batch`` list.
OBJECT_FIELDS = (
    "id", "label", "quantity", "mass", "drag_area", "contact_area", "shape", "length", "width",
    "depth", "thickness", "diameter", "outer_diameter", "wall_thickness", "height",
)  # fmt: skip

#: Keys whose value the scenario file holds as a number, not as text with a unit.
_NUMBER_KEYS = frozenset(
    {"latitude", "origin_lat", "origin_lon", "confidence", "precision", "seed", "exponent",
     "friction"}
)  # fmt: skip

#: Size limits of a form (a typing error or an attack, not a job, beyond them).
MAX_TEXT = 2000
MAX_WORK_AREAS = 20
MAX_EDGES = 20
MAX_POINTS = 500
MAX_OBJECTS = 2000
MAX_LEVELS = 50


def _text(value: Any, field: str) -> str:
    """A form value as text: "" for not given; numbers as they would be typed."""
    if value is None:
        return ""
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, int):
        return str(value)
    if isinstance(value, float):
        if not math.isfinite(value):
            raise InputError(
                f"{field}: expected a finite number or text; got {value!r}", field=field
            )
        return repr(value)
    if isinstance(value, _dt.date | _dt.datetime | _dt.time):
        return value.isoformat()
    if not isinstance(value, str):
        raise InputError(f"{field}: expected text; got {type(value).__name__}", field=field)
    if len(value) > MAX_TEXT:
        raise InputError(f"{field}: at most {MAX_TEXT} characters; got {len(value)}", field=field)
    if re.search(r"[\ud800-\udfff]", value):
        raise InputError(
            f"{field}: text holds an unpaired surrogate (not a character)", field=field
        )
    return value.strip()


def _table(value: Any, field: str, allowed: Sequence[str]) -> dict[str, Any]:
    if value is None:
        return {}
    if not isinstance(value, Mapping):
        raise InputError(
            f"{field}: expected a group of fields; got {type(value).__name__}", field=field
        )
    unknown = sorted(str(k) for k in value if k not in allowed)
    if unknown:
        raise InputError(
            f"{field}.{shorten(unknown[0], 40)}: unknown field; allowed: {', '.join(allowed)}"
        )
    return dict(value)


def _list(value: Any, field: str, limit: int) -> list[Any]:
    if value is None:
        return []
    if not isinstance(value, list):
        raise InputError(f"{field}: expected a list; got {type(value).__name__}", field=field)
    if len(value) > limit:
        raise InputError(f"{field}: at most {limit} entries; got {len(value)}", field=field)
    return value


def parse_points(value: Any, field: str) -> list[list[float]]:
    """Points typed as text ("0, 16; 42, 16") or sent as pairs, as [[x, y], ...] in metres.

    Raises
    ------
    InputError
        Naming ``field`` when the text is not pairs of finite numbers.
    """
    if value is None or value == "":
        return []
    if isinstance(value, str):
        if len(value) > MAX_TEXT * 10:
            raise InputError(f"{field}: too long ({len(value)} characters)", field=field)
        pairs = [p for p in re.split(r"[;\n]+", value) if p.strip()]
        out: list[list[float]] = []
        for pair in pairs:
            numbers = [n for n in re.split(r"[,\s]+", pair.strip().strip("()[]")) if n]
            try:
                x, y = (float(n) for n in numbers)
            except ValueError:
                raise InputError(
                    f"{field}: expected x, y pairs in metres separated by ';' "
                    f"(e.g. 0, 16; 42, 16); got {shorten(repr(pair.strip()), 40)}",
                    field=field,
                ) from None
            out.append([x, y])
        value = out
    points = _list(value, field, MAX_POINTS)
    checked = []
    for i, point in enumerate(points):
        ok = (
            isinstance(point, list | tuple)
            and len(point) == 2
            and all(isinstance(c, int | float) and not isinstance(c, bool) for c in point)
            and all(math.isfinite(c) for c in point)
        )
        if not ok:
            raise InputError(
                f"{field}[{i}]: expected a pair of finite numbers (x, y in metres); "
                f"got {shorten(repr(point), 40)}"
            )
        checked.append([float(point[0]), float(point[1])])
    return checked


def check_form(data: Any) -> dict[str, Any]:
    """Check the shape of a form sent by the page and return it normalised.

    Every scalar becomes text ("" when not given), points become [[x, y], ...] floats, lists
    are checked against the size limits. Nothing physical is checked here: the scenario loader
    does that, with the command line's messages.

    Raises
    ------
    InputError
        The message starts with the form field's path (``work_areas.0.edges.1.points``).
    """
    form = _table(
        data, "form", ("job", "site", "wind", "policy", "work_areas", "objects", "outline")
    )
    out: dict[str, Any] = {}
    for part, fields in (
        ("job", JOB_FIELDS),
        ("site", SITE_FIELDS),
        ("wind", WIND_FIELDS),
        ("policy", POLICY_FIELDS),
    ):
        table = _table(form.get(part), part, fields)
        values: dict[str, Any] = {}
        for name in fields:
            if part == "policy" and name == "levels":
                levels = table.get(name)
                if isinstance(levels, list):
                    values[name] = [
                        _text(v, f"policy.levels.{i}")
                        for i, v in enumerate(_list(levels, "policy.levels", MAX_LEVELS))
                    ]
                else:
                    text = _text(levels, "policy.levels")
                    values[name] = [k for k in re.split(r"[,\s]+", text) if k]
                continue
            values[name] = _text(table.get(name), f"{part}.{name}")
        out[part] = values
    out["outline"] = parse_points(form.get("outline"), "outline")
    areas = []
    for a, raw in enumerate(_list(form.get("work_areas"), "work_areas", MAX_WORK_AREAS)):
        key = f"work_areas.{a}"
        table = _table(raw, key, (*AREA_FIELDS, "edges"))
        area: dict[str, Any] = {n: _text(table.get(n), f"{key}.{n}") for n in AREA_FIELDS}
        edges = []
        for e, raw_edge in enumerate(_list(table.get("edges"), f"{key}.edges", MAX_EDGES)):
            edge_key = f"{key}.edges.{e}"
            edge_table = _table(raw_edge, edge_key, (*EDGE_FIELDS, "points"))
            edge: dict[str, Any] = {
                n: _text(edge_table.get(n), f"{edge_key}.{n}") for n in EDGE_FIELDS
            }
            edge["points"] = parse_points(edge_table.get("points"), f"{edge_key}.points")
            edges.append(edge)
        area["edges"] = edges
        areas.append(area)
    out["work_areas"] = areas
    objects = []
    for o, raw in enumerate(_list(form.get("objects"), "objects", MAX_OBJECTS)):
        key = f"objects.{o}"
        table = _table(raw, key, OBJECT_FIELDS)
        objects.append({n: _text(table.get(n), f"{key}.{n}") for n in OBJECT_FIELDS})
    out["objects"] = objects
    return out


# --------------------------------------------------------------------------------------------
# Form -> TOML


def toml_string(text: str) -> str:
    """``text`` as a TOML basic string: quotes, backslashes and control characters escaped.

    TOML 1.0 (toml.io, "String"): a basic string may hold any Unicode character except the
    quotation mark, the backslash and the control characters other than tab (U+0000 to U+001F,
    U+007F), which must be escaped.
    """
    out = ['"']
    for char in text:
        code = ord(char)
        if char == '"':
            out.append('\\"')
        elif char == "\\":
            out.append("\\\\")
        elif code < 0x20 or code == 0x7F:
            out.append(f"\\u{code:04X}")
        else:
            out.append(char)
    out.append('"')
    return "".join(out)


def _number_or_text(text: str) -> str:
    """A number key's value: a TOML number when the text is one, else the text.

    The loader then names the key in its message.
    """
    try:
        value = float(text)
    except ValueError:
        return toml_string(text)
    if not math.isfinite(value):
        return toml_string(text)
    if re.fullmatch(r"[+-]?\d+", text.strip()):
        return str(int(text))
    return repr(value)


def _value(key: str, text: str) -> str:
    if key in _NUMBER_KEYS:
        return _number_or_text(text)
    if key == "rolling" and text.lower() in ("true", "false"):
        return text.lower()
    return toml_string(text)


def _points_toml(points: Sequence[Sequence[float]]) -> str:
    return "[" + ", ".join(f"[{_coordinate(x)}, {_coordinate(y)}]" for x, y in points) + "]"


def _coordinate(value: float) -> str:
    return str(int(value)) if float(value).is_integer() and abs(value) < 1e15 else repr(value)


def form_to_toml(form: Mapping[str, Any]) -> str:
    """Write a checked form (:func:`check_form`) as a scenario file (docs/scenario.md).

    Fields left empty are left out, so the loader applies the documented defaults. The file
    has the same layout as the demo's scenario and reads back to the same form
    (:func:`toml_to_form`).
    """
    lines = [
        "# dropcalc scenario, written by the dropcalc page (dropcalc serve).",
        "# Run it on the command line with: dropcalc report scenario.toml -o report.pdf",
        "# Reference of every key: docs/scenario.md.",
        "",
    ]

    def table(header: str, fields: Sequence[str], values: Mapping[str, Any]) -> None:
        lines.append(header)
        for name in fields:
            text = values.get(name, "")
            if text != "":
                lines.append(f"{name} = {_value(name, text)}")
        lines.append("")

    table("[job]", JOB_FIELDS, form["job"])
    site = form["site"]
    lines.append("[site]")
    for name in SITE_FIELDS:
        if name.startswith("origin_"):
            continue
        if site.get(name, "") != "":
            lines.append(f"{name} = {_value(name, site[name])}")
    if site.get("origin_lat", "") != "" or site.get("origin_lon", "") != "":
        lat = _number_or_text(site.get("origin_lat", ""))
        lon = _number_or_text(site.get("origin_lon", ""))
        lines.append(f"origin = {{ lat = {lat}, lon = {lon} }}")
    if form.get("outline"):
        lines.append(f"outline = {_points_toml(form['outline'])}")
    lines.append("")
    table("[wind]", WIND_FIELDS, form["wind"])
    policy = form["policy"]
    lines.append("[policy]")
    for name in POLICY_FIELDS:
        if name == "levels":
            if policy.get("levels"):
                listed = ", ".join(toml_string(k) for k in policy["levels"])
                lines.append(f"levels = [{listed}]")
        elif policy.get(name, "") != "":
            lines.append(f"{name} = {_value(name, policy[name])}")
    lines.append("")
    for area in form["work_areas"]:
        lines.append("[[work_area]]")
        for name in AREA_FIELDS:
            if area.get(name, "") != "":
                lines.append(f"{name} = {_value(name, area[name])}")
        for edge in area["edges"]:
            lines.append("  [[work_area.edge]]")
            for name in EDGE_FIELDS:
                if edge.get(name, "") != "":
                    lines.append(f"  {name} = {_value(name, edge[name])}")
            lines.append(f"  points = {_points_toml(edge['points'])}")
        lines.append("")
    for obj in form["objects"]:
        lines.append("[[object]]")
        for name in OBJECT_FIELDS:
            text = obj.get(name, "")
            if text == "":
                continue
            if name == "quantity" and re.fullmatch(r"\d{1,9}", text):
                lines.append(f"quantity = {int(text)}")
            else:
                lines.append(f"{name} = {toml_string(text)}")
        lines.append("")
    return "\n".join(lines)


# --------------------------------------------------------------------------------------------
# TOML -> form


def toml_to_form(
    text: str, objects: Sequence[Mapping[str, Any]] = (), name: str = "scenario.toml"
) -> dict[str, Any]:
    """Read a scenario file's text into a form (the reverse of :func:`form_to_toml`).

    Parameters
    ----------
    text : str
        The scenario file's text.
    objects : sequence of mapping
        Rows of the scenario's ``objects_file``, read by the caller from an uploaded file
        (columns as for ``dropcalc batch``); added after the ``[[object]]`` tables.
    name : str
        File name for messages.

    Raises
    ------
    InputError
        Not TOML; a key of the wrong type or place; a key that names another file
        (``rules_file``: the page opens no file the scenario names).
    """
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise InputError(f"{name}: not valid TOML: {exc}", field=name) from None
    raw: dict[str, Any] = {}
    for part in ("job", "site", "wind", "policy"):
        value = data.get(part, {})
        if not isinstance(value, dict):
            raise InputError(f"{name}: {part}: expected a table, e.g. [{part}]", field=name)
        raw[part] = dict(value)
    if "rules_file" in raw["policy"]:
        raise InputError(
            f"{name}: policy.rules_file: the page reads no other file; run this scenario with "
            "`dropcalc report`, or remove rules_file to use the built-in control rules",
            field=name,
        )
    unknown = sorted(set(data) - {"job", "site", "wind", "policy", "work_area", "object",
                                  "objects_file"})  # fmt: skip
    if unknown:
        raise InputError(f"{name}: {shorten(unknown[0], 40)}: unknown key", field=name)
    site = raw["site"]
    origin = site.pop("origin", None)
    if origin is not None:
        if not isinstance(origin, dict):
            raise InputError(
                f"{name}: site.origin: expected {{ lat = ..., lon = ... }}", field=name
            )
        site["origin_lat"] = origin.get("lat")
        site["origin_lon"] = origin.get("lon")
    outline = site.pop("outline", None)
    form: dict[str, Any] = {
        "job": raw["job"],
        "site": site,
        "wind": raw["wind"],
        "policy": raw["policy"],
        "outline": outline,
    }
    areas = data.get("work_area", [])
    if not isinstance(areas, list):
        raise InputError(f"{name}: work_area: expected [[work_area]] tables", field=name)
    form["work_areas"] = []
    for a, area in enumerate(areas, start=1):
        if not isinstance(area, dict):
            raise InputError(f"{name}: work_area[{a}]: expected a table", field=name)
        area = dict(area)
        edges = area.pop("edge", [])
        if not isinstance(edges, list) or not all(isinstance(e, dict) for e in edges):
            raise InputError(
                f"{name}: work_area[{a}].edge: expected [[work_area.edge]] tables", field=name
            )
        area["edges"] = [dict(e) for e in edges]
        form["work_areas"].append(area)
    listed = data.get("object", [])
    if not isinstance(listed, list) or not all(isinstance(o, dict) for o in listed):
        raise InputError(f"{name}: object: expected [[object]] tables", field=name)
    form["objects"] = [dict(o) for o in listed] + [
        {k: v for k, v in row.items() if k in OBJECT_FIELDS and v not in ("", None)}
        for row in objects
    ]
    try:
        return check_form(form)
    except InputError as exc:
        raise InputError(f"{name}: {_key_of_field(str(exc))}", field=name) from None


def _key_of_field(message: str) -> str:
    """A :func:`check_form` message with the form path turned back into the scenario's key."""
    path, sep, rest = message.partition(": ")
    if not sep:
        return message
    parts = path.split(".")
    out = []
    i = 0
    while i < len(parts):
        part = parts[i]
        if part in ("work_areas", "edges", "objects") and i + 1 < len(parts):
            index = parts[i + 1]
            name = {"work_areas": "work_area", "edges": "edge", "objects": "object"}[part]
            out.append(f"{name}[{int(index) + 1}]" if index.isdigit() else f"{name}.{index}")
            i += 2
            continue
        out.append(part)
        i += 1
    return ".".join(out) + sep + rest


def field_of_key(key_path: str) -> str:
    """The form field of a scenario key path.

    ``work_area[1].edge[2].height`` -> ``work_areas.0.edges.1.height``; ``site.origin`` ->
    ``site.origin_lat``; a table as a whole -> its first field.
    """
    names = {"work_area": "work_areas", "edge": "edges", "object": "objects"}
    out = []
    for part in key_path.split("."):
        match = re.fullmatch(r"(\w+)\[(\d+)\]", part)
        if match:
            out.extend([names.get(match[1], match[1]), str(int(match[2]) - 1)])
        else:
            out.append(part)
    field = ".".join(out)
    if field == "site.outline":
        return "outline"
    if field.startswith("site.origin"):
        return "site.origin_lon" if field.endswith(".lon") else "site.origin_lat"
    if field == "site":
        return "site.elevation"
    if field in ("wind", "policy", "job"):
        return f"{field}.{ {'wind': 'speed', 'policy': 'confidence', 'job': 'title'}[field] }"
    if field in ("object", "objects"):
        return "objects"
    return field


def empty_form() -> dict[str, Any]:
    """A form with nothing filled in (the page's "new job")."""
    return check_form({})
