"""The object library: things that fall, with mass, shape, size, hazards and sources.

A practitioner thinks in objects ("a 300 mm adjustable wrench", "a scaffold coupler"), not in
drag areas. The library turns such an object into the numbers the physics needs: mass, the
drag-area bounds of its shape (from :mod:`dropcalc.physics.shapes`), the area that strikes
first, and the hazards to mention in a report.

The built-in objects live in ``object_library/*.toml`` (one file per category; the file name
is the category id), located with :func:`dropcalc.resources.data_path`. A user may add a TOML
file in the same schema or a CSV file (see ``docs/object-library.md``); a user object with the
id of a built-in one replaces it, and :attr:`Library.overridden` says which.

Every validation error is an :class:`~dropcalc.errors.InputError` naming the file, the line
(TOML) or spreadsheet row (CSV, header = row 1) and the field, e.g.
``my_objects.csv: row 4: mass_kg must be a finite mass > 0 kg; got "-2"``.
"""

from __future__ import annotations

import csv
import difflib
import functools
import math
import re
from collections.abc import Callable, Iterable, Iterator, Mapping
from dataclasses import dataclass, field
from pathlib import Path
from types import MappingProxyType
from typing import Any

from dropcalc.errors import InputError, UnknownObjectError, parse_toml, require_file, shorten
from dropcalc.model.limits import (
    MAX_CELL_CHARACTERS,
    MAX_NAME_CHARACTERS,
    MAX_TEXT_FILE_BYTES,
)
from dropcalc.physics import contact, shapes
from dropcalc.resources import data_path
from dropcalc.units import parse_quantity

#: The hazard words an object may carry, with what each means. One vocabulary for data, CLI,
#: reports and docs.
HAZARDS: Mapping[str, str] = MappingProxyType(
    {
        "point": "a point, tip or cut end may strike first (small contact area)",
        "sharp-edge": "a sharp or thin edge may strike first and cut",
        "glides-in-wind": "a flat object that may glide or flutter beyond the tumbling bounds",
        "shatters": "breaks into fragments on impact that fly on",
        "heavy": "mass of 2.3 kg (5 lb) or more: tether to the structure, not to the wrist",
        "rolls": "round: may roll on after landing",
        "bounces": "may bounce off hard ground",
    }
)
#: Mass at and above which an object carries the "heavy" hazard [kg]: 5 lb, the usual limit
#: above which tools are tethered to the structure rather than the wrist
#: (common practice, no source).
HEAVY_MASS = 2.3

#: Mass bases an object may declare, besides ``density_kg_m3`` and ``mass_range_kg``.
STATED_MASS_BASES: tuple[str, ...] = ("common practice", "weighed")
#: Default allowed relative difference between ``mass_kg`` and density x volume (+ added mass).
DEFAULT_DERIVATION_TOLERANCE = 0.05
#: Allowed relative difference between ``mass_kg`` and count x unit mass + tare.
COUNT_TOLERANCE = 0.01

_ID_RE = re.compile(r"^[a-z0-9]+(?:-[a-z0-9]+)*$")
_OBJECT_TABLE = "object"

# TOML keys of one object and whether each is required in every file.
_REQUIRED_KEYS = ("id", "name", "category", "mass_kg", "shape", "dimensions_m")
_OPTIONAL_KEYS = (
    "contact_area_m2",
    "drag_area_m2",
    "drag_area_min_m2",
    "drag_area_max_m2",
    "hazards",
    "fragile",
    "notes",
    "mass_source",
    "size_source",
    "source",
    "density_kg_m3",
    "derivation_tolerance",
    "added_mass_kg",
    "mass_range_kg",
    "mass_basis",
    "count",
    "unit_mass_kg",
    "tare_mass_kg",
    "material",
    "outline_fill",
)
_ALL_KEYS = _REQUIRED_KEYS + _OPTIONAL_KEYS

#: Columns of a user CSV file, in the documented order.
CSV_COLUMNS: tuple[str, ...] = (
    "id",
    "name",
    "category",
    "mass_kg",
    "shape",
    "length_m",
    "width_m",
    "height_m",
    "diameter_m",
    "outer_diameter_m",
    "wall_thickness_m",
    "thickness_m",
    "contact_area_m2",
    "drag_area_m2",
    "drag_area_min_m2",
    "drag_area_max_m2",
    "outline_fill",
    "hazards",
    "fragile",
    "notes",
    "source",
)
#: Columns whose name starts with this hold what dropcalc computed (``objects --csv``); they are
#: shown for reading and ignored when the file is read back.
COMPUTED_PREFIX = "computed_"
#: Computed columns written by :func:`csv_rows` after the :data:`CSV_COLUMNS`.
COMPUTED_COLUMNS = (
    "computed_drag_area_min_m2",
    "computed_drag_area_typical_m2",
    "computed_drag_area_max_m2",
    "computed_glides",
)
_CSV_REQUIRED = ("id", "name", "category", "mass_kg", "shape")
_DIMENSION_NAMES = (
    "length",
    "width",
    "height",
    "diameter",
    "outer_diameter",
    "wall_thickness",
    "thickness",
)
_UNIT_OF_KIND = {"mass": "kg", "length": "m", "area": "m²"}


@dataclass(frozen=True)
class DropObject:
    """One object that can fall, with everything the physics and the report need.

    Attributes
    ----------
    id : str
        Unique id, lowercase words joined by hyphens, e.g. ``"claw-hammer-16oz"``.
    name : str
        Name for people, e.g. ``"Claw hammer, 16 oz head"``.
    category : str
        Category id (the built-in file's name without ``.toml``).
    mass : float
        Mass. [kg]
    shape : str
        Shape name, one of :data:`dropcalc.physics.shapes.SHAPES` (aliases resolved).
    dimensions : Mapping[str, float]
        The shape's dimensions by name (see ``shapes.SHAPE_DIMENSIONS``). [m]
    contact_area : float or None
        Area that strikes first for pointed or edged objects (tip, corner, edge). [m²]
    hazards : tuple of str
        Words from :data:`HAZARDS`.
    fragile : bool
        May break on impact (glass, tiles, blocks).
    material : str
        Material class for the contact after landing (``contact.MATERIALS``: its restitution
        and, with ``fragile``, its breaking speed); "" for the default class.
    notes : str
        Free text: counts of bundles, what the contact area is, assumptions.
    mass_source : str
        Where the mass comes from.
    size_source : str
        Where the size comes from.
    mass_basis : str
        How the mass is backed: "density", "catalogue range", "common practice", "weighed",
        or "not stated" (a user object that gave no basis).
    density : float or None
        Material density when the mass is derived from it. [kg/m³]
    mass_range : tuple of float or None
        Catalogue range (low, high) the mass lies in. [kg]
    drag_area_given : float or None
        Drag area C_d·A stated directly for the object; replaces the shape's estimate. [m²]
    drag_area_min_given, drag_area_max_given : float or None
        Bounds of a stated drag area. [m²]
    outline_fill : float or None
        Irregular shapes only: the share of the bounding rectangle that the largest projected
        outline covers, 0 < f <= 1; scales the largest drag area (None: the shape class's
        default, ``shapes.drag_bounds``). [-]
    source : str
        Mass and size sources in one string, for display (computed).
    drag_area_min, drag_area_max, drag_area_typical : float
        Smallest, largest and typical (tumbling) drag area C_d·A (computed). [m²]
    projected_area_mean : float
        Orientation-averaged projected area of the shape (computed). [m²]
    glides : bool
        The shape is thin and light enough to glide (computed by ``shapes.drag_bounds``).
    drag_basis : str
        How the drag areas were obtained (computed).
    """

    id: str
    name: str
    category: str
    mass: float
    shape: str
    dimensions: Mapping[str, float] = field(hash=False)
    contact_area: float | None = None
    hazards: tuple[str, ...] = ()
    fragile: bool = False
    material: str = ""
    notes: str = ""
    mass_source: str = ""
    size_source: str = ""
    mass_basis: str = "not stated"
    density: float | None = None
    mass_range: tuple[float, float] | None = None
    drag_area_given: float | None = None
    drag_area_min_given: float | None = None
    drag_area_max_given: float | None = None
    outline_fill: float | None = None
    source: str = field(init=False)
    drag_area_min: float = field(init=False)
    drag_area_max: float = field(init=False)
    drag_area_typical: float = field(init=False)
    projected_area_mean: float = field(init=False)
    glides: bool = field(init=False)
    drag_basis: str = field(init=False)

    def __post_init__(self) -> None:
        """Check the values and compute the source string and the drag areas."""
        shape = _shape_name(self.shape)
        mass = _positive(self.mass, "mass", "mass", f"{self.mass:g}")
        dimensions = _dimensions_for(shape, dict(self.dimensions))
        unknown = sorted(set(self.hazards) - set(HAZARDS))
        if unknown:
            raise InputError(f'hazards must be words from {", ".join(HAZARDS)}; got "{unknown[0]}"')
        if self.material:
            contact.material(self.material)  # an unknown class lists the known ones
        if self.contact_area is not None:
            _positive(self.contact_area, "contact_area_m2", "area", f"{self.contact_area:g}")
        bounds = shapes.drag_bounds(
            shape, drag_crisis=False, outline_fill=self.outline_fill, **dimensions
        )
        minimum, maximum, typical, basis = _drag_areas(
            bounds, self.drag_area_given, self.drag_area_min_given, self.drag_area_max_given
        )
        sources = [f"mass: {self.mass_source}" if self.mass_source else ""]
        sources.append(f"size: {self.size_source}" if self.size_source else "")
        values = {
            "shape": shape,
            "mass": mass,
            "dimensions": MappingProxyType(dimensions),
            "hazards": tuple(self.hazards),
            "source": "; ".join(text for text in sources if text) or "no source given",
            "drag_area_min": minimum,
            "drag_area_max": maximum,
            "drag_area_typical": typical,
            "projected_area_mean": float(bounds.projected_area_mean),
            "glides": bool(bounds.glides),
            "drag_basis": basis,
        }
        for name, value in values.items():
            object.__setattr__(self, name, value)


def _drag_areas(
    bounds: Any, given: float | None, given_min: float | None, given_max: float | None
) -> tuple[float, float, float, str]:
    """Return (min, max, typical, basis) of the drag area from the shape or a stated value."""
    if given is None:
        if given_min is not None or given_max is not None:
            raise InputError("drag_area_min_m2 and drag_area_max_m2 need drag_area_m2 as well")
        return (
            float(bounds.drag_area_min),
            float(bounds.drag_area_max),
            float(bounds.drag_area_typical),
            str(bounds.basis),
        )
    typical = _positive(given, "drag_area_m2", "area", f"{given:g}")
    minimum = (
        typical
        if given_min is None
        else _positive(given_min, "drag_area_min_m2", "area", f"{given_min:g}")
    )
    maximum = (
        typical
        if given_max is None
        else _positive(given_max, "drag_area_max_m2", "area", f"{given_max:g}")
    )
    if not minimum <= typical <= maximum:
        raise InputError(
            "drag areas must satisfy drag_area_min_m2 <= drag_area_m2 <= drag_area_max_m2; "
            f"got {minimum:g} m², {typical:g} m², {maximum:g} m²"
        )
    return minimum, maximum, typical, "drag area stated for the object (C_d·A given directly)"


def _shape_name(shape: str) -> str:
    """Return the canonical shape name, or raise InputError listing the allowed names."""
    try:
        return shapes.normalise_shape(shape)
    except UnknownObjectError:
        allowed = ", ".join((*shapes.SHAPES, *shapes.SHAPE_ALIASES))
        raise InputError(f'shape must be one of {allowed}; got "{shape}"', field="shape") from None


def _positive(value: float, name: str, kind: str, raw: str) -> float:
    """Return ``value`` if finite and > 0, else raise InputError in the library's wording."""
    number = float(value)
    if not (math.isfinite(number) and number > 0):
        raise InputError(
            f'{name} must be a finite {kind} > 0 {_UNIT_OF_KIND[kind]}; got "{raw}"', field=name
        )
    return number


def _dimensions_for(shape: str, dimensions: dict[str, float]) -> dict[str, float]:
    """Check that ``dimensions`` are exactly the shape's, finite and > 0; return them as floats."""
    wanted = shapes.SHAPE_DIMENSIONS[shape]
    missing = [name for name in wanted if name not in dimensions]
    extra = [name for name in dimensions if name not in wanted]
    if missing or extra:
        problem = f"missing {', '.join(missing)}" if missing else f"unexpected {', '.join(extra)}"
        raise InputError(f"dimensions_m of a {shape} must be {', '.join(wanted)} (in m); {problem}")
    checked = {
        name: _positive(dimensions[name], f"dimensions_m.{name}", "length", f"{dimensions[name]:g}")
        for name in wanted
    }
    if shape == "tube" and not checked["wall_thickness"] < checked["outer_diameter"] / 2:
        raise InputError(
            "dimensions_m.wall_thickness of a tube must be less than half the outer_diameter "
            f"({checked['outer_diameter'] / 2:g} m); got {checked['wall_thickness']:g} m"
        )
    return checked


# --- The library ---------------------------------------------------------------------------------
@dataclass(frozen=True)
class Library:
    """A set of objects by id, built in and from a user file.

    Attributes
    ----------
    objects : Mapping[str, DropObject]
        The objects by id, in file order (built-in first, then new user objects).
    overridden : tuple of str
        Ids of built-in objects replaced by an object of the user file.
    files : tuple of pathlib.Path
        The files read, built-in first.
    """

    objects: Mapping[str, DropObject] = field(hash=False)
    overridden: tuple[str, ...] = ()
    files: tuple[Path, ...] = ()

    def __iter__(self) -> Iterator[DropObject]:
        """Iterate over the objects in library order."""
        return iter(self.objects.values())

    def __len__(self) -> int:
        """Number of objects."""
        return len(self.objects)

    def __contains__(self, object_id: object) -> bool:
        """Whether an object with this id (after normalising) is in the library."""
        return isinstance(object_id, str) and _normalise_id(object_id) in self.objects

    def get(self, object_id: str) -> DropObject:
        """Return the object with this id.

        The id is matched after trimming, lowering and turning spaces and underscores into
        hyphens, so ``"Claw hammer 16oz"`` finds ``claw-hammer-16oz``.

        Raises
        ------
        UnknownObjectError
            If there is no such object; the message names up to 3 close matches.
        """
        key = _normalise_id(object_id)
        try:
            return self.objects[key]
        except KeyError:
            raise UnknownObjectError(
                f'unknown object "{shorten(object_id, 60)}"; {_suggest(key, list(self.objects))}',
                field="id",
                value=object_id,
            ) from None

    def categories(self) -> tuple[str, ...]:
        """Category ids in library order."""
        return tuple(dict.fromkeys(item.category for item in self))

    def search(self, text: str) -> tuple[DropObject, ...]:
        """Objects whose id, name, notes or category contain every word of ``text``.

        Case-insensitive; an empty text matches every object.
        """
        words = text.lower().split()
        found = []
        for item in self:
            haystack = " ".join((item.id, item.name, item.notes, item.category)).lower()
            if all(word in haystack for word in words):
                found.append(item)
        return tuple(found)

    def filter(
        self,
        category: str | None = None,
        hazard: str | None = None,
        shape: str | None = None,
    ) -> tuple[DropObject, ...]:
        """Objects of a category, carrying a hazard and/or of a shape (None: any).

        Raises
        ------
        UnknownObjectError
            If the category, hazard or shape is not known.
        """
        found = list(self)
        if category is not None:
            key = _normalise_id(category)
            if key not in self.categories():
                raise UnknownObjectError(
                    f'unknown category "{category}"; {_suggest(key, list(self.categories()))}'
                )
            found = [item for item in found if item.category == key]
        if hazard is not None:
            if hazard not in HAZARDS:
                raise UnknownObjectError(
                    f'unknown hazard "{hazard}"; {_suggest(hazard, list(HAZARDS))}'
                )
            found = [item for item in found if hazard in item.hazards]
        if shape is not None:
            canonical = shapes.normalise_shape(shape)
            found = [item for item in found if item.shape == canonical]
        return tuple(found)


def _normalise_id(text: str) -> str:
    return re.sub(r"[\s_]+", "-", text.strip().lower())


def _suggest(key: str, names: list[str]) -> str:
    close = difflib.get_close_matches(key, names, n=3, cutoff=0.5)
    if close:
        return "did you mean " + ", ".join(close) + "?"
    return "no close match (search the library by a word of the name)"


def load_library(extra: Path | str | None = None) -> Library:
    """Return the built-in object library, plus the objects of a user file.

    Parameters
    ----------
    extra : pathlib.Path or str or None
        A user file, ``.toml`` (same schema as the built-in files) or ``.csv`` (columns
        :data:`CSV_COLUMNS`). Its objects are added; one with the id of a built-in object
        replaces it (listed in :attr:`Library.overridden`).

    Returns
    -------
    Library
        The objects. The built-in part is read once per process.

    Raises
    ------
    InputError
        If a file is missing, unreadable or holds an invalid object; the message names the
        file, the line or row and the field.
    """
    builtin = _builtin_library()
    if extra is None:
        return builtin
    path = require_file(extra, "object file", MAX_TEXT_FILE_BYTES)
    suffix = path.suffix.lower()
    if suffix == ".toml":
        user = _read_toml(path, builtin=False)
    elif suffix == ".csv":
        user = _read_csv(path)
    else:
        raise InputError(f'{path.name}: object files must end in .toml or .csv; got "{suffix}"')
    objects = dict(builtin.objects)
    overridden = tuple(item.id for item in user if item.id in objects)
    objects.update((item.id, item) for item in user)
    return Library(MappingProxyType(objects), overridden, (*builtin.files, path))


@functools.cache
def _builtin_library() -> Library:
    """Read every ``*.toml`` file of the built-in object library (once per process)."""
    folder = data_path("object_library")
    files = tuple(sorted(folder.glob("*.toml")))
    objects: dict[str, DropObject] = {}
    where: dict[str, str] = {}
    for path in files:
        for item in _read_toml(path, builtin=True):
            if item.id in objects:
                raise InputError(
                    f'{path.name}: id "{item.id}" is also used in {where[item.id]}; '
                    "ids must be unique across the library"
                )
            objects[item.id] = item
            where[item.id] = path.name
    return Library(MappingProxyType(objects), (), files)


# --- Reading TOML --------------------------------------------------------------------------------
_TABLE_RE = re.compile(r"^\s*\[\[\s*object\s*\]\]")


def _read_toml(path: Path, *, builtin: bool) -> list[DropObject]:
    """Read and validate the objects of one TOML file."""
    document, text = parse_toml(path.read_bytes(), path.name, "file")
    lines = text.splitlines()
    starts = [number for number, line in enumerate(lines, start=1) if _TABLE_RE.match(line)]
    unknown = [key for key in document if key != _OBJECT_TABLE]
    if unknown:
        raise InputError(
            f'{path.name}: unknown top-level key "{unknown[0]}"; objects go in [[object]] tables'
        )
    tables = document.get(_OBJECT_TABLE, [])
    if not isinstance(tables, list) or not all(isinstance(item, dict) for item in tables):
        raise InputError(f"{path.name}: objects must be written as [[object]] tables")
    objects = []
    first_line: dict[str, int] = {}
    for index, table in enumerate(tables):
        start = starts[index] if index < len(starts) else 0
        end = starts[index + 1] if index + 1 < len(starts) else len(lines) + 1
        locate = _TomlLocator(path.name, lines, start, end)
        if builtin and table.get("category") != path.stem:
            raise InputError(
                f"{locate('category')}category must be the file's name, "
                f'"{path.stem}"; got "{table.get("category")}"'
            )
        item = _object_from_record(table, locate, builtin=builtin, default_source=path.name)
        if item.id in first_line:
            raise InputError(
                f'{locate("id")}id "{item.id}" appears twice in this file '
                f"(first at line {first_line[item.id]})"
            )
        first_line[item.id] = locate.line_of("id")
        objects.append(item)
    return objects


class _TomlLocator:
    """Give the ``"file: line N: "`` prefix of a field of one [[object]] table."""

    def __init__(self, file_name: str, lines: list[str], start: int, end: int) -> None:
        self.file_name, self.lines, self.start, self.end = file_name, lines, start, end

    def line_of(self, key: str) -> int:
        """Line of ``key = ...`` in the table, else of its ``id``, else of its header."""
        if self.start == 0:
            return 0
        for wanted in (key.split(".")[0], "id"):
            pattern = re.compile(rf"^\s*{re.escape(wanted)}\s*=")
            for number in range(self.start, self.end):
                if pattern.match(self.lines[number - 1]):
                    return number
        return self.start

    def __call__(self, key: str) -> str:
        line = self.line_of(key)
        return f"{self.file_name}: line {line}: " if line else f"{self.file_name}: "


# --- Reading CSV ---------------------------------------------------------------------------------
def _read_csv(path: Path) -> list[DropObject]:
    """Read and validate the objects of one CSV file (header = row 1)."""
    try:
        with path.open(newline="", encoding="utf-8-sig") as handle:
            rows = list(csv.reader(handle))
    except UnicodeDecodeError:
        raise InputError(f"{path.name}: not UTF-8 text; save the file as UTF-8") from None
    if not rows:
        raise InputError(f"{path.name}: the file is empty; row 1 must name the columns")
    header = [name.strip() for name in rows[0]]
    repeated = [name for number, name in enumerate(header) if name in header[:number]]
    if repeated:
        raise InputError(
            f'{path.name}: row 1: column "{shorten(repeated[0], 40)}" appears twice; keep one'
        )
    for name in header:
        if name not in CSV_COLUMNS and not name.startswith(COMPUTED_PREFIX):
            raise InputError(
                f'{path.name}: row 1: unknown column "{name}"; {_suggest(name, list(CSV_COLUMNS))} '
                f"(allowed columns: {', '.join(CSV_COLUMNS)})"
            )
    missing = [name for name in _CSV_REQUIRED if name not in header]
    if missing:
        raise InputError(f"{path.name}: row 1: missing column {', '.join(missing)}")
    objects = []
    first_row: dict[str, int] = {}
    for number, row in enumerate(rows[1:], start=2):
        if not any(cell.strip() for cell in row):
            continue
        prefix = f"{path.name}: row {number}: "
        if len(row) > len(header):
            raise InputError(f"{prefix}{len(row)} cells but only {len(header)} columns in row 1")
        cells = {name: cell.strip() for name, cell in zip(header, row, strict=False)}
        record = _record_from_cells(cells, prefix)

        def locate(_key: str, p: str = prefix) -> str:
            return p

        item = _object_from_record(
            record,
            locate,
            builtin=False,
            default_source=path.name,
            csv_names=True,
        )
        if item.id in first_row:
            raise InputError(
                f'{prefix}id "{item.id}" appears twice in this file '
                f"(first at row {first_row[item.id]})"
            )
        first_row[item.id] = number
        objects.append(item)
    return objects


def _record_from_cells(cells: dict[str, str], prefix: str) -> dict[str, Any]:
    """Turn the cells of a CSV row into a record in the TOML schema."""
    record: dict[str, Any] = {
        key: cells[key] for key in ("id", "name", "category", "mass_kg", "shape") if key in cells
    }
    for key in (
        "contact_area_m2",
        "drag_area_m2",
        "drag_area_min_m2",
        "drag_area_max_m2",
        "outline_fill",
    ):
        if cells.get(key):
            record[key] = cells[key]
    for key in ("notes", "source"):
        if cells.get(key):
            record[key] = cells[key]
    if cells.get("fragile"):
        word = cells["fragile"].lower()
        if word not in ("true", "false", "yes", "no"):
            raise InputError(
                f'{prefix}fragile must be true, false, yes or no; got "{cells["fragile"]}"'
            )
        record["fragile"] = word in ("true", "yes")
    if cells.get("hazards"):
        record["hazards"] = [word.strip() for word in cells["hazards"].split(";") if word.strip()]
    shape_text = cells.get("shape", "")
    try:
        wanted = shapes.SHAPE_DIMENSIONS[shapes.normalise_shape(shape_text)] if shape_text else ()
    except UnknownObjectError:
        wanted = ()  # reported with the shape field below
    dimensions: dict[str, str] = {}
    for name in _DIMENSION_NAMES:
        cell = cells.get(f"{name}_m", "")
        if name in wanted and not cell:
            raise InputError(
                f"{prefix}{name}_m: no value given; a {shape_text} needs "
                f"{', '.join(f'{dim}_m' for dim in wanted)}"
            )
        if cell and wanted and name not in wanted:
            raise InputError(
                f"{prefix}{name}_m is not a dimension of a {shape_text} (it needs "
                f'{", ".join(f"{dim}_m" for dim in wanted)}); got "{cell}"'
            )
        if cell:
            dimensions[name] = cell
    record["dimensions_m"] = dimensions
    return record


def csv_rows(objects: Iterable[DropObject]) -> list[dict[str, Any]]:
    """Objects as rows of the user CSV format, so that a file written from them reads back.

    The :data:`CSV_COLUMNS` hold what defines each object (sizes in metres, mass in kg, a drag
    area only where one was stated rather than computed from the shape); the
    :data:`COMPUTED_COLUMNS` after them show the drag areas dropcalc worked out and are ignored
    on reading, so editing a size changes the drag areas and editing a computed cell does not.
    """

    def blank(value: float | None) -> float | str:
        return "" if value is None else value

    rows = []
    for item in objects:
        row: dict[str, Any] = dict.fromkeys(CSV_COLUMNS, "")
        row.update(
            id=item.id,
            name=item.name,
            category=item.category,
            mass_kg=item.mass,
            shape=item.shape,
            contact_area_m2=item.contact_area if item.contact_area is not None else "",
            drag_area_m2=item.drag_area_given if item.drag_area_given is not None else "",
            drag_area_min_m2=item.drag_area_min_given
            if item.drag_area_min_given is not None
            else "",
            drag_area_max_m2=item.drag_area_max_given
            if item.drag_area_max_given is not None
            else "",
            outline_fill=item.outline_fill if item.outline_fill is not None else "",
            hazards="; ".join(item.hazards),
            fragile="true" if item.fragile else "false",
            notes=item.notes,
            source=item.source,
        )
        for name, value in item.dimensions.items():
            row[f"{name}_m"] = value
        row["computed_drag_area_min_m2"] = item.drag_area_min
        row["computed_drag_area_typical_m2"] = item.drag_area_typical
        row["computed_drag_area_max_m2"] = item.drag_area_max
        row["computed_glides"] = "true" if item.glides else "false"
        rows.append(row)
    return rows


# --- One object ----------------------------------------------------------------------------------
def _object_from_record(
    record: Mapping[str, Any],
    locate: Callable[[str], str],
    *,
    builtin: bool,
    default_source: str,
    csv_names: bool = False,
) -> DropObject:
    """Validate one record (a TOML table or a converted CSV row) and build the object."""
    for key in record:
        if key not in _ALL_KEYS:
            raise InputError(
                f'{locate(key)}unknown field "{key}"; {_suggest(key, list(_ALL_KEYS))}'
            )
    required = _REQUIRED_KEYS + (("mass_source", "size_source") if builtin else ())
    for key in required:
        if key not in record or record[key] in ("", None):
            raise InputError(f"{locate(key)}missing field {key}")

    def text(key: str) -> str:
        value = record.get(key, "")
        if not isinstance(value, str):
            raise InputError(f"{locate(key)}{key} must be text; got {value!r}")
        limit = MAX_NAME_CHARACTERS if key in ("id", "name") else MAX_CELL_CHARACTERS
        if len(value.strip()) > limit:
            raise InputError(f"{locate(key)}{key}: {len(value):,} characters; at most {limit:,}")
        return value.strip()

    def quantity(key: str, kind: str) -> float:
        return _quantity(record[key], key, kind, locate(key))

    def optional(key: str, kind: str) -> float | None:
        return quantity(key, kind) if record.get(key) not in (None, "") else None

    object_id = text("id")
    if not _ID_RE.match(object_id):
        raise InputError(
            f"{locate('id')}id must be lowercase letters and digits in words joined by "
            f'hyphens (e.g. "claw-hammer-16oz"); got "{object_id}"'
        )
    category = text("category")
    if not _ID_RE.match(category):
        raise InputError(
            f"{locate('category')}category must be lowercase words joined by hyphens "
            f'(e.g. "hand-tools"); got "{category}"'
        )
    try:
        shape = _shape_name(text("shape"))
    except InputError as error:
        raise InputError(f"{locate('shape')}{error}") from None
    mass = quantity("mass_kg", "mass")
    dimensions = _read_dimensions(
        record["dimensions_m"], shape, locate("dimensions_m"), csv_names=csv_names
    )
    hazards = record.get("hazards", [])
    if not isinstance(hazards, list) or not all(isinstance(word, str) for word in hazards):
        raise InputError(f"{locate('hazards')}hazards must be a list of words; got {hazards!r}")
    for word in hazards:
        if word not in HAZARDS:
            raise InputError(
                f'{locate("hazards")}hazards must be words from {", ".join(HAZARDS)}; got "{word}"'
            )
    fragile = record.get("fragile", False)
    if not isinstance(fragile, bool):
        raise InputError(f"{locate('fragile')}fragile must be true or false; got {fragile!r}")
    basis, density, mass_range = _mass_basis(record, mass, shape, dimensions, locate, builtin)
    material = record.get("material", "")
    if not isinstance(material, str) or (material and material not in contact.MATERIALS):
        raise InputError(
            f"{locate('material')}material must be one of {', '.join(contact.MATERIALS)}; "
            f"got {material!r}"
        )
    source = text("source")
    outline_fill = _outline_fill(record.get("outline_fill"), locate("outline_fill"))
    try:
        return DropObject(
            id=object_id,
            name=text("name"),
            category=category,
            mass=mass,
            shape=shape,
            dimensions=dimensions,
            contact_area=optional("contact_area_m2", "area"),
            hazards=tuple(hazards),
            fragile=fragile,
            material=material,
            notes=text("notes"),
            mass_source=text("mass_source") or source or f"user file {default_source}",
            size_source=text("size_source") or source or f"user file {default_source}",
            mass_basis=basis,
            density=density,
            mass_range=mass_range,
            drag_area_given=optional("drag_area_m2", "area"),
            drag_area_min_given=optional("drag_area_min_m2", "area"),
            drag_area_max_given=optional("drag_area_max_m2", "area"),
            outline_fill=outline_fill,
        )
    except InputError as error:
        key = "drag_area_m2" if str(error).startswith("drag_area") else "dimensions_m"
        key = "outline_fill" if str(error).startswith("outline_fill") else key
        raise InputError(f"{locate(key)}{error}") from None


def _outline_fill(value: Any, prefix: str) -> float | None:
    """Read ``outline_fill``: absent, or a number > 0 and <= 1."""
    if value is None:
        return None
    message = f"{prefix}outline_fill must be a number > 0 and <= 1; got {value!r}"
    if isinstance(value, bool) or not isinstance(value, int | float | str):
        raise InputError(message, field="outline_fill")
    try:
        number = float(value)
    except ValueError:
        raise InputError(message, field="outline_fill") from None
    if not 0.0 < number <= 1.0:  # NaN compares False
        raise InputError(message, field="outline_fill")
    return number


def _quantity(value: Any, key: str, kind: str, prefix: str) -> float:
    """Read a number (SI) or a text with a unit; it must be finite and > 0."""
    raw = value.strip() if isinstance(value, str) else str(value)
    try:
        return _positive(parse_quantity(value, kind, key), key, kind, raw)
    except InputError as error:
        raise InputError(f"{prefix}{error}") from None


def _read_dimensions(table: Any, shape: str, prefix: str, *, csv_names: bool) -> dict[str, float]:
    """Read the ``dimensions_m`` table of a shape: exactly its dimension names, lengths > 0.

    Messages name a dimension as the CSV column (``length_m``) or the TOML key
    (``dimensions_m.length``).
    """
    if not isinstance(table, Mapping):
        raise InputError(
            f"{prefix}dimensions_m must be a table of lengths, e.g. "
            "{ length = 0.3, diameter = 0.02 }"
        )
    lengths = {
        name: _quantity(
            value, f"{name}_m" if csv_names else f"dimensions_m.{name}", "length", prefix
        )
        for name, value in table.items()
    }
    try:
        return _dimensions_for(shape, lengths)
    except InputError as error:
        raise InputError(f"{prefix}{error}") from None


def _mass_basis(
    record: Mapping[str, Any],
    mass: float,
    shape: str,
    dimensions: Mapping[str, float],
    locate: Callable[[str], str],
    builtin: bool,
) -> tuple[str, float | None, tuple[float, float] | None]:
    """Check ``mass_kg`` against the basis the record declares; return (basis, density, range).

    A record may declare ``density_kg_m3`` (mass = density x shape volume + ``added_mass_kg``,
    within ``derivation_tolerance``), ``mass_range_kg`` (mass inside the range) or
    ``mass_basis`` ("common practice" or "weighed"); ``count`` with ``unit_mass_kg`` (and
    ``tare_mass_kg``) is checked whenever given. Built-in objects must declare exactly one
    basis.
    """
    declared = [key for key in ("density_kg_m3", "mass_range_kg", "mass_basis") if key in record]
    if len(declared) > 1:
        raise InputError(
            f"{locate(declared[1])}give one mass basis (density_kg_m3, mass_range_kg or "
            f"mass_basis); got {', '.join(declared)}"
        )
    if builtin and not declared:
        raise InputError(
            f"{locate('mass_kg')}missing mass basis: give density_kg_m3, mass_range_kg "
            'or mass_basis = "common practice"'
        )
    _check_count(record, mass, locate)
    if "density_kg_m3" not in record:
        for key in ("derivation_tolerance", "added_mass_kg"):
            if key in record:
                raise InputError(f"{locate(key)}{key} is only used with density_kg_m3")
    if "density_kg_m3" in record:
        density = _positive_number(record["density_kg_m3"], "density_kg_m3", locate)
        tolerance = DEFAULT_DERIVATION_TOLERANCE
        if "derivation_tolerance" in record:
            tolerance = _positive_number(
                record["derivation_tolerance"], "derivation_tolerance", locate
            )
        added = 0.0
        if "added_mass_kg" in record:
            added = _quantity(
                record["added_mass_kg"], "added_mass_kg", "mass", locate("added_mass_kg")
            )
        expected = density * float(shapes.volume(shape, **dimensions)) + added
        difference = mass / expected - 1.0
        if abs(difference) > tolerance + 1e-12:
            raise InputError(
                f"{locate('mass_kg')}mass_kg {mass:g} kg differs from density_kg_m3 x volume"
                f"{' + added_mass_kg' if added else ''} = {expected:.4g} kg by {difference:+.1%}; "
                f"allowed is ±{tolerance:.0%} (derivation_tolerance)"
            )
        return "density", density, None
    if "mass_range_kg" in record:
        value = record["mass_range_kg"]
        if not (isinstance(value, list) and len(value) == 2):
            raise InputError(
                f"{locate('mass_range_kg')}mass_range_kg must be [low, high] in kg; got {value!r}"
            )
        low, high = (_positive_number(number, "mass_range_kg", locate) for number in value)
        if not low < high:
            raise InputError(
                f"{locate('mass_range_kg')}mass_range_kg must have low < high; got {value!r}"
            )
        if not low <= mass <= high:
            raise InputError(
                f"{locate('mass_kg')}mass_kg must lie in mass_range_kg [{low:g}, {high:g}] kg; "
                f"got {mass:g} kg"
            )
        return "catalogue range", None, (low, high)
    if "mass_basis" in record:
        basis = record["mass_basis"]
        if basis not in STATED_MASS_BASES:
            raise InputError(
                f"{locate('mass_basis')}mass_basis must be one of {', '.join(STATED_MASS_BASES)} "
                f"(or give density_kg_m3 or mass_range_kg); got {basis!r}"
            )
        return str(basis), None, None
    return "not stated", None, None


def _check_count(record: Mapping[str, Any], mass: float, locate: Callable[[str], str]) -> None:
    """Check mass = count x unit_mass_kg + tare_mass_kg (bundles, pallets, boxes)."""
    if not any(key in record for key in ("count", "unit_mass_kg", "tare_mass_kg")):
        return
    if "count" not in record or "unit_mass_kg" not in record:
        raise InputError(f"{locate('count')}count and unit_mass_kg go together")
    count = record["count"]
    if isinstance(count, bool) or not isinstance(count, int) or count < 1:
        raise InputError(f"{locate('count')}count must be a whole number >= 1; got {count!r}")
    unit = _quantity(record["unit_mass_kg"], "unit_mass_kg", "mass", locate("unit_mass_kg"))
    tare = 0.0
    if "tare_mass_kg" in record:
        tare = _quantity(record["tare_mass_kg"], "tare_mass_kg", "mass", locate("tare_mass_kg"))
    expected = count * unit + tare
    if abs(mass / expected - 1.0) > COUNT_TOLERANCE:
        raise InputError(
            f"{locate('mass_kg')}mass_kg {mass:g} kg differs from count x unit_mass_kg + "
            f"tare_mass_kg = {expected:.4g} kg by more than {COUNT_TOLERANCE:.0%}"
        )


def _positive_number(value: Any, key: str, locate: Callable[[str], str]) -> float:
    """Read a plain number > 0 (density, tolerance, range bound)."""
    if isinstance(value, bool) or not isinstance(value, int | float):
        raise InputError(f"{locate(key)}{key} must be a number; got {value!r}")
    if not (math.isfinite(value) and value > 0):
        raise InputError(f"{locate(key)}{key} must be a finite number > 0; got {value!r}")
    return float(value)
