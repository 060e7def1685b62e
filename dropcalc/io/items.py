"""Reading a job's object list (CSV or XLSX): one row per item, resolved to physical properties.

Rows name a library object (``id``) or describe a custom one (``mass`` with ``drag_area``, or
``shape`` with its dimensions). Every cell is read as text and parsed with units; a bad row
becomes a :class:`RowError` naming its row and column, and the other rows go on. Used by
``dropcalc batch``, ``zone --items`` and a scenario's ``[[object]]`` tables and ``objects_file``;
the sizes read are bounded by ``model/limits.py`` (``docs/limits.md``).
"""

from __future__ import annotations

import math
import re
from collections.abc import Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING, Any, Protocol

from dropcalc.errors import DropcalcError, InputError, require_file, shorten
from dropcalc.model.limits import (
    MAX_CELL_CHARACTERS,
    MAX_LIST_COLUMNS,
    MAX_LIST_FILE_BYTES,
    MAX_LIST_ROWS,
    MAX_NAME_CHARACTERS,
    MAX_XLSX_UNCOMPRESSED_BYTES,
)
from dropcalc.physics.plate import plate_dimensions

if TYPE_CHECKING:
    import pandas as pd

    from dropcalc.io.library import Library


class ListDefaults(Protocol):
    """What a list's rows take when they do not say: the release height [m] (or None)."""

    @property
    def height(self) -> float | None:
        """Release height for rows without their own [m], or None."""
        ...


@dataclass(frozen=True)
class Defaults:
    """A plain :class:`ListDefaults`: the release height for rows without one [m]."""

    height: float | None = None


#: Input columns (lower case; spaces and hyphens read as underscores).
ID_COLUMNS = ("id",)
TEXT_COLUMNS = ("id", "label", "shape")
QUANTITY_COLUMNS = {
    "mass": "mass",
    "drag_area": "area",
    "contact_area": "area",
    "height": "length",
    "length": "length",
    "width": "length",
    "depth": "length",
    "thickness": "length",
    "diameter": "length",
    "outer_diameter": "length",
    "wall_thickness": "length",
}
KNOWN_COLUMNS = frozenset({*TEXT_COLUMNS, "quantity", *QUANTITY_COLUMNS})
#: Largest item count on one row (more is a typing error, not a job list).
MAX_QUANTITY = 1_000_000


@dataclass(frozen=True)
class Item:
    """One good input row, resolved to physical properties (SI)."""

    row: int
    label: str
    object_id: str
    name: str
    quantity: int
    mass: float
    drag_area_min: float
    drag_area_max: float
    contact_area: float | None
    height: float
    glides: bool
    fragile: bool
    #: (length, width, thickness) [m] of a sheet flown by the plate model, else None.
    plate: tuple[float, float, float] | None = None
    #: True when the row gave its own height; False when it took the list's default (which a
    #: report may then set per work area).
    height_given: bool = False


@dataclass(frozen=True)
class RowError:
    """A row that could not be used, with its reason."""

    row: int
    label: str
    object_id: str
    message: str
    #: The column (model field) the message is about, when it names one.
    field: str | None = None


# --------------------------------------------------------------------------------------------
# Reading


def _column_name(name: object) -> str:
    return re.sub(r"[\s\-]+", "_", str(name).strip().lower()).lstrip("\ufeff")


def check_columns(path: Path, raw_names: Sequence[object]) -> list[str]:
    """The header's column names, normalised; refuse too many columns or a name given twice.

    A duplicate header ("mass,mass", or "Mass" and "mass") is refused: readers differ in which
    of the two they keep. pandas renames a repeated CSV or XLSX header "mass" to "mass.1",
    which is undone here so the repeat is seen.
    """
    if len(raw_names) > MAX_LIST_COLUMNS:
        raise InputError(
            f"{path.name}: row 1: {len(raw_names):,} columns; at most {MAX_LIST_COLUMNS} are read"
        )
    names = [_column_name(c) if c is not None else "" for c in raw_names]
    seen: set[str] = set()
    for name in names:
        base = re.sub(r"\.\d+$", "", name)
        key = base if base in names and base != name else name
        if key and key in seen:
            raise InputError(
                f"{path.name}: row 1: column {shorten(key, 40)!r} appears twice; keep one"
            )
        seen.add(key)
    return names


#: A sheet's declared range, ``<dimension ref="A1:D20"/>``: its last column and row.
_DIMENSION_RE = re.compile(r"<(?:\w+:)?dimension\s+ref=\"[A-Za-z]+\d+:([A-Za-z]+)(\d+)\"")


def _count_rows(archive: Any, member: Any) -> int:
    """Rows in a sheet's XML, counted block by block (the sheet is never held whole)."""
    rows = 0
    tail = b""
    with archive.open(member) as handle:
        while block := handle.read(1 << 20):
            data = tail + block
            rows += len(re.findall(rb"<(?:\w+:)?row[\s>]", data))
            tail = data[-16:]
            rows -= len(re.findall(rb"<(?:\w+:)?row[\s>]", tail))  # counted again next block
            if rows > MAX_LIST_ROWS + 1:
                break
    return rows + len(re.findall(rb"<(?:\w+:)?row[\s>]", tail))


def check_xlsx(path: Path) -> None:
    """Refuse a workbook too large to load, from what its archive declares, before loading it.

    Reads the members' uncompressed sizes and each sheet's ``<dimension ref="A1:D20"/>`` (the
    range the sheet says it uses): a 351 KB file may expand to a million rows, and a sheet
    declaring ``A1:XFD1048576`` makes a reader pad every row to 16,384 cells.
    """
    import zipfile

    try:
        with zipfile.ZipFile(path) as archive:
            members = archive.infolist()
            total = sum(member.file_size for member in members)
            if total > MAX_XLSX_UNCOMPRESSED_BYTES:
                raise InputError(
                    f"{path.name}: the workbook unpacks to {total:,} bytes; at most "
                    f"{MAX_XLSX_UNCOMPRESSED_BYTES:,} are read (docs/limits.md)"
                )
            for member in members:
                if not re.fullmatch(r"xl/worksheets/[^/]+\.xml", member.filename):
                    continue
                with archive.open(member) as handle:
                    start = handle.read(4096).decode("utf-8", "replace")
                ref = _DIMENSION_RE.search(start)
                if ref is None:  # no declared range (a streamed writer): count the rows
                    rows = _count_rows(archive, member)
                    if rows > MAX_LIST_ROWS + 1:
                        raise InputError(
                            f"{path.name}: a sheet holds {rows - 1:,} rows or more; at most "
                            f"{MAX_LIST_ROWS:,} are read (docs/limits.md)"
                        )
                    continue
                columns = 0
                for letter in ref[1].upper():
                    columns = columns * 26 + ord(letter) - ord("A") + 1
                rows = int(ref[2])
                if rows > MAX_LIST_ROWS + 1 or columns > MAX_LIST_COLUMNS:
                    raise InputError(
                        f"{path.name}: a sheet declares {rows:,} rows and {columns:,} columns "
                        f"(A1:{ref[1]}{ref[2]}); at most {MAX_LIST_ROWS:,} rows and "
                        f"{MAX_LIST_COLUMNS} columns are read (docs/limits.md)"
                    )
    except zipfile.BadZipFile:
        return  # not an archive: the workbook reader says so in its own words


def read_table(path: Path) -> pd.DataFrame:
    """Read a CSV or XLSX item list as text cells (no type guessing).

    CSV: UTF-8 (with or without byte-order mark), else Latin-1; comma, semicolon or tab
    separated (sniffed from the header line). Decimal commas in cells are read by the
    quantity parser.

    Raises
    ------
    InputError
        When the file cannot be read as a table at all.
    """
    import pandas as pd

    path = require_file(path, "object list", MAX_LIST_FILE_BYTES)
    suffix = path.suffix.lower()
    try:
        if suffix in (".xlsx", ".xlsm"):
            check_xlsx(path)
            frame = pd.read_excel(path, dtype=str, keep_default_na=False, engine="openpyxl")
        elif suffix in (".csv", ".txt", ".tsv", ""):
            raw = path.read_bytes()
            try:
                text = raw.decode("utf-8-sig")
            except UnicodeDecodeError:
                text = raw.decode("latin-1")
            header = text.split("\n", 1)[0]
            separator = max((";", ",", "\t"), key=header.count)
            if header.count(separator) == 0:
                separator = ","
            import io

            # Blank lines are kept (and skipped later) so rows keep the numbers a spreadsheet shows.
            frame = pd.read_csv(
                io.StringIO(text), sep=separator, dtype=str, keep_default_na=False,
                skipinitialspace=True, skip_blank_lines=False,
            )  # fmt: skip
        else:
            raise InputError(f"{path}: expected a .csv or .xlsx file; got {suffix or 'no suffix'}")
    except InputError:
        raise
    except Exception as exc:  # pandas raises many kinds for malformed tables
        raise InputError(f"{path}: cannot read the table ({exc})") from None
    frame.columns = check_columns(path, list(frame.columns))
    if frame.empty or not len(frame.columns):
        raise InputError(f"{path}: the table has no rows")
    if len(frame) > MAX_LIST_ROWS:
        raise InputError(
            f"{path.name}: {len(frame):,} rows; at most {MAX_LIST_ROWS:,} are read (docs/limits.md)"
        )
    # Extra columns (notes, prices) are carried by many real lists: ignore them, but say so.
    frame.attrs["ignored_columns"] = [c for c in frame.columns if c not in KNOWN_COLUMNS]
    if "id" not in frame.columns and "mass" not in frame.columns:
        raise InputError(f"{path}: needs an 'id' column (library objects) or a 'mass' column")
    return frame


def _cell(record: dict[str, Any], name: str) -> str:
    value = record.get(name, "")
    return "" if value is None else str(value).strip()


def _resolve_row(
    number: int, record: dict[str, Any], library: Library | None, settings: ListDefaults
) -> Item:
    """Turn one row into an Item or raise InputError (message without the row prefix)."""
    from dropcalc.units import parse_quantity

    def quantity(name: str) -> float | None:
        text = _cell(record, name)
        if not text:
            return None
        value = parse_quantity(text, QUANTITY_COLUMNS[name], name)
        if not value > 0:
            raise InputError(f"{name} must be > 0; got {text!r}", field=name)
        return value

    for column, value in record.items():  # extra columns (notes) are not read: any length
        if column in KNOWN_COLUMNS and isinstance(value, str) and len(value) > MAX_CELL_CHARACTERS:
            raise InputError(
                f"{shorten(column, 40)}: the cell has {len(value):,} characters; "
                f"at most {MAX_CELL_CHARACTERS:,} are read"
            )
    object_id = _cell(record, "id")
    label = _cell(record, "label")
    if len(label) > MAX_NAME_CHARACTERS:
        raise InputError(
            f"label: {len(label):,} characters; at most {MAX_NAME_CHARACTERS} are shown",
            field="label",
        )
    count_text = _cell(record, "quantity") or "1"
    try:
        count_value = float(count_text.replace(",", "."))
    except ValueError:
        count_value = math.nan
    if not (count_value.is_integer() and 1 <= count_value <= MAX_QUANTITY):
        raise InputError(
            f"quantity must be a whole number from 1 to {MAX_QUANTITY:,}; "
            f"got {shorten(repr(count_text), 40)}",
            field="quantity",
        )
    count = int(count_value)
    own_height = quantity("height")
    height = own_height or settings.height
    if height is None:
        raise InputError(
            "height is missing: give a 'height' column or --height for the list", field="height"
        )
    contact = quantity("contact_area")
    mass = quantity("mass")
    drag_area = quantity("drag_area")
    glides = fragile = False
    plate = None
    name = label
    if object_id:
        if mass is not None or drag_area is not None or _cell(record, "shape"):
            raise InputError("give either an id or mass/drag_area/shape, not both")
        if library is None:
            raise InputError("an id needs the object library")
        obj = library.get(object_id)
        mass, area_min, area_max = obj.mass, obj.drag_area_min, obj.drag_area_max
        contact = contact if contact is not None else obj.contact_area
        glides, fragile, name = obj.glides, obj.fragile, obj.name
        plate = plate_dimensions(obj.shape, obj.dimensions)
    else:
        if mass is None:
            raise InputError("mass is missing (or give a library id)", field="mass")
        shape = _cell(record, "shape")
        if drag_area is not None and shape:
            raise InputError("give either drag_area or shape with its dimensions, not both")
        if drag_area is not None:
            area_min = area_max = drag_area
        elif shape:
            from dropcalc.physics.shapes import SHAPE_DIMENSIONS, drag_bounds, normalise_shape

            shape = normalise_shape(shape)
            dims: dict[str, Any] = {}
            for dim in SHAPE_DIMENSIONS[shape]:
                column = "depth" if dim == "height" else dim
                value = quantity(column)
                if value is None:
                    raise InputError(f"shape {shape} needs {column}", field="shape")
                dims[dim] = value
            bounds = drag_bounds(shape, drag_crisis=False, **dims)
            area_min, area_max = float(bounds.drag_area_min), float(bounds.drag_area_max)
            glides = bool(bounds.glides)
            plate = plate_dimensions(shape, {k: float(v) for k, v in dims.items()})
        else:
            raise InputError("drag is missing: give drag_area, or shape with its dimensions")
    return Item(
        row=number,
        label=label or name or object_id,
        object_id=object_id,
        name=name or label or object_id,
        quantity=count,
        mass=float(mass),
        drag_area_min=float(area_min),
        drag_area_max=float(area_max),
        contact_area=contact,
        height=float(height),
        glides=glides,
        fragile=fragile,
        plate=plate,
        height_given=own_height is not None,
    )


def parse_items(
    frame: pd.DataFrame, library: Library | None, settings: ListDefaults, first_row: int = 2
) -> tuple[list[Item], list[RowError]]:
    """Resolve every row; rows numbered as a spreadsheet shows them (header = row 1).

    ``first_row`` is the spreadsheet number of the frame's first row (2 for a whole table; more
    for a later chunk of a long list).
    """
    from dataclasses import replace

    from dropcalc.model.checks import check_object

    items: list[Item] = []
    errors: list[RowError] = []
    # A row equal to an earlier one resolves the same but for its number: a long list repeats
    # a few hundred objects, so each distinct row is read (units, library, checks) once.
    resolved: dict[tuple[tuple[str, Any], ...], Item | RowError] = {}
    for index, record in enumerate(frame.to_dict("records")):
        number = index + first_row
        if not any(str(v).strip() for v in record.values()):
            continue  # blank line
        try:
            key: tuple[tuple[str, Any], ...] | None = tuple(record.items())
            hash(key)
        except TypeError:
            key = None
        known = resolved.get(key) if key is not None else None
        if known is None:
            try:
                known = _resolve_row(number, record, library, settings)
                # The same range checks as a single fall.
                check_object(
                    known.mass, known.drag_area_min, known.height, known.contact_area,
                    known.drag_area_max,
                )  # fmt: skip
            except DropcalcError as exc:
                known = RowError(
                    number, _cell(record, "label"), _cell(record, "id"), str(exc), exc.field
                )
            if key is not None:
                resolved[key] = known
        if isinstance(known, RowError):
            errors.append(known if known.row == number else replace(known, row=number))
        else:
            items.append(known if known.row == number else replace(known, row=number))
    return items, errors
