"""What the page's routes do, without the web framework: forms in, plain data and bytes out.

Every computation goes through the scenario loader and the job pipeline, as ``dropcalc
report`` does: :func:`load_form` writes the form as a scenario file (the same text the page
offers for download) and loads it; :func:`compute` runs the job and returns what the page
shows. Uploaded files are read from memory or from a private temporary folder under a fixed
name; the name the user's file had is only ever shown, never used as a path.
"""

from __future__ import annotations

import functools
import hashlib
import re
import tempfile
import threading
from collections import OrderedDict
from collections.abc import Callable, Mapping
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from dropcalc.errors import DropcalcError, InputError, one_line, shorten
from dropcalc.web.form import (
    MAX_OBJECTS,
    OBJECT_FIELDS,
    check_form,
    field_of_key,
    form_to_toml,
    toml_to_form,
)

#: File name of the scenario the page writes (in the PDF's footer and the TOML download).
SCENARIO_NAME = "scenario.toml"
#: Largest uploaded file. [bytes] A list of a few thousand objects is well under it.
MAX_UPLOAD_BYTES = 2 * 1024 * 1024
#: Object-list file types the page reads (the ``dropcalc batch`` formats).
LIST_SUFFIXES = (".csv", ".xlsx")
#: Release height used to check an uploaded list's rows before the plan gives one [m]; rows are
#: checked again, at the real heights, when the job runs.
LIST_CHECK_HEIGHT = 10.0


@dataclass
class FieldError:
    """An input error to show beside a field of the form ("" for the form as a whole)."""

    field: str
    message: str

    def to_json(self) -> dict[str, str]:
        """``{"field": ..., "message": ...}``."""
        return {"field": self.field, "message": self.message}


class FormError(Exception):
    """The form cannot be run; ``errors`` say which fields and why."""

    def __init__(self, errors: list[FieldError]) -> None:
        super().__init__("; ".join(e.message for e in errors))
        self.errors = errors


def field_error(exc: DropcalcError) -> FieldError:
    """The field and the message of an error raised by :func:`check_form` or the loader.

    The loader's message is the command line's; the scenario file's name and line are left
    out (the page wrote that file, the user typed into the field).
    """
    message = one_line(str(exc))
    key_path = getattr(exc, "key_path", None)
    if key_path is not None:
        shown = re.sub(rf"^{re.escape(SCENARIO_NAME)}: (line \d+: )?", "", message)
        return FieldError(field_of_key(key_path), shown)
    head, sep, _ = message.partition(": ")
    if sep and re.fullmatch(r"[a-z_]+(\.[a-z_0-9]+)*", head):
        return FieldError(head, message)
    return FieldError("", message)


def load_form(form_data: Any) -> tuple[Any, str]:
    """Check a form, write it as a scenario file and load that as ``dropcalc report`` would.

    Returns
    -------
    (Scenario, str)
        The loaded scenario and the scenario file's text.

    Raises
    ------
    FormError
        With the field and the command line's message.
    """
    from dropcalc.io.scenario import load_scenario

    try:
        form = check_form(form_data)
        text = form_to_toml(form)
        with tempfile.TemporaryDirectory(prefix="dropcalc-page-") as folder:
            path = Path(folder) / SCENARIO_NAME
            path.write_text(text, encoding="utf-8")
            scenario = load_scenario(path, allow_file_references=False)
    except DropcalcError as exc:
        raise FormError([field_error(exc)]) from None
    return scenario, text


# --------------------------------------------------------------------------------------------
# Uploads


def _decode_name(name: str | None) -> str:
    """An uploaded file's name for messages only: its last part, shortened, never a path."""
    shown = re.split(r"[\\/]", name or "")[-1] or "upload"
    return shorten(shown, 60)


def read_list_bytes(data: bytes, filename: str | None) -> Any:
    """Read an uploaded CSV/XLSX object list as text cells (a DataFrame).

    The bytes are written to a private temporary folder under a fixed name with the suffix of
    the (checked) file type, read by :func:`dropcalc.analysis.batch.read_table` and deleted.

    Raises
    ------
    InputError
        Naming the file as the user called it.
    """
    from dropcalc.errors import require_suffix
    from dropcalc.io.items import read_table

    shown = _decode_name(filename)
    if len(data) > MAX_UPLOAD_BYTES:
        raise InputError(f"{shown}: larger than the {MAX_UPLOAD_BYTES // 1024 // 1024} MB limit")
    suffix = require_suffix(shown, LIST_SUFFIXES, "the object list")
    with tempfile.TemporaryDirectory(prefix="dropcalc-page-") as folder:
        path = Path(folder) / f"list{suffix}"
        path.write_bytes(data)
        try:
            frame = read_table(path)
        except InputError as exc:
            raise InputError(str(exc).replace(str(path), shown)) from None
    if len(frame) > MAX_OBJECTS:
        raise InputError(f"{shown}: at most {MAX_OBJECTS} rows; got {len(frame)}")
    return frame


def list_rows(frame: Any) -> tuple[list[dict[str, str]], list[dict[str, Any]]]:
    """Check a list's rows as ``dropcalc batch`` does; keep the good ones as form objects.

    Returns
    -------
    (objects, errors)
        The good rows as form objects (the cells as typed), and for each bad row
        ``{"row", "label", "id", "message"}`` with the spreadsheet's row number.
    """
    from dropcalc.analysis.batch import BatchSettings
    from dropcalc.io.items import parse_items

    items, errors = parse_items(
        frame, library(), BatchSettings(height=LIST_CHECK_HEIGHT), first_row=2
    )
    good = {item.row for item in items}
    objects = []
    for index, record in enumerate(frame.to_dict("records")):
        if index + 2 in good:
            cells = {k: str(v).strip() for k, v in record.items() if k in OBJECT_FIELDS}
            objects.append({k: cells.get(k, "") for k in OBJECT_FIELDS})
    return objects, [
        {"row": e.row, "label": e.label, "id": e.object_id, "message": one_line(e.message)}
        for e in errors
    ]


def read_scenario_upload(
    data: bytes, filename: str | None, list_data: bytes | None = None, list_name: str | None = None
) -> dict[str, Any]:
    """Read an uploaded scenario file (and the object list it names) into a form.

    Returns
    -------
    dict
        ``{"form": ..., "row_errors": [...], "errors": [...]}``: the form to fill the page
        with, the list's bad rows (left out), and the loader's errors of the filled form (the
        page shows them beside their fields).

    Raises
    ------
    InputError
        When the file is not a scenario the page can read at all (not UTF-8, not TOML, a
        ``rules_file``, an ``objects_file`` whose list was not uploaded with it).
    """
    import tomllib

    shown = _decode_name(filename)
    if len(data) > MAX_UPLOAD_BYTES:
        raise InputError(f"{shown}: larger than the {MAX_UPLOAD_BYTES // 1024 // 1024} MB limit")
    try:
        text = data.decode("utf-8-sig")
    except UnicodeDecodeError:
        raise InputError(f"{shown}: not UTF-8 text; save the scenario as UTF-8") from None
    try:
        raw = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise InputError(f"{shown}: not valid TOML: {exc}") from None
    rows: list[dict[str, str]] = []
    row_errors: list[dict[str, Any]] = []
    if "objects_file" in raw:
        listed = _decode_name(str(raw["objects_file"]))
        if list_data is None:
            raise InputError(
                f"{shown}: objects_file: the scenario lists its objects in {listed!r}; choose "
                "that file together with the scenario"
            )
        rows, row_errors = list_rows(read_list_bytes(list_data, list_name))
    elif list_data is not None:
        rows, row_errors = list_rows(read_list_bytes(list_data, list_name))
    form = toml_to_form(text, rows, shown)
    errors: list[dict[str, str]] = []
    try:
        load_form(form)
    except FormError as exc:
        errors = [e.to_json() for e in exc.errors]
    return {"form": form, "row_errors": row_errors, "errors": errors}


def demo_form() -> dict[str, Any]:
    """The demo job (``templates/demo``) as a form."""
    from dropcalc.resources import data_path

    folder = data_path("templates") / "demo"
    text = (folder / "scenario.toml").read_text(encoding="utf-8")
    rows, _errors = list_rows(read_list_bytes((folder / "items.csv").read_bytes(), "items.csv"))
    return toml_to_form(text, rows)


# --------------------------------------------------------------------------------------------
# The object library


_LIBRARY_LOCK = threading.Lock()
_LIBRARY: list[Any] = []


def library() -> Any:
    """The built-in object library, loaded once per process (the first call takes ~1 s)."""
    with _LIBRARY_LOCK:
        if not _LIBRARY:
            from dropcalc.io.library import load_library

            _LIBRARY.append(load_library())
        return _LIBRARY[0]


def warm_up() -> None:
    """Load the library and import the job pipeline ahead of the first request.

    Run in a background thread while the server starts and the browser opens, so that the
    page's first library list and first answer do not wait for them.
    """
    library()
    choices()
    import dropcalc.analysis.job  # noqa: F401
    import dropcalc.report.build  # noqa: F401


def library_entries(search: str = "", category: str = "") -> list[dict[str, Any]]:
    """Library objects matching a search text and a category ("" for any), for the picker.

    Raises
    ------
    InputError
        For an unknown category or an over-long search text.
    """
    if len(search) > 200:
        raise InputError(f"search: at most 200 characters; got {len(search)}")
    objects = library()
    found = objects.search(search) if search.strip() else tuple(objects)
    if category:
        if category not in objects.categories():
            raise InputError(
                f"category: unknown category {shorten(repr(category), 40)}; known: "
                f"{', '.join(objects.categories())}"
            )
        found = tuple(o for o in found if o.category == category)
    return [
        {
            "id": o.id,
            "name": o.name,
            "category": o.category,
            "mass_kg": o.mass,
            "drag_area_min_m2": o.drag_area_min,
            "drag_area_max_m2": o.drag_area_max,
            "source": o.source,
            "glides": o.glides,
        }
        for o in found
    ]


def library_categories() -> list[str]:
    """Category ids of the library, in library order."""
    return list(library().categories())


# --------------------------------------------------------------------------------------------
# A small cache of finished jobs (the only state the server keeps)


@dataclass
class JobCache:
    """The last few finished jobs by the SHA-256 of their scenario text (least recent out).

    Each entry is a dict: ``"job"`` (the :class:`~dropcalc.analysis.job.JobResult`) and, once
    made, ``"answer"`` (what the page shows for it), so a repeated input or a download after a
    compute costs no second run.
    """

    size: int = 8
    _items: OrderedDict[str, dict[str, Any]] = field(default_factory=OrderedDict)
    _lock: threading.Lock = field(default_factory=threading.Lock)

    def entry(self, text: str, run: Callable[[], Any]) -> tuple[dict[str, Any], bool]:
        """The entry for this scenario text, running ``run()`` for its job when there is none.

        Returns the entry and whether it was already cached.
        """
        key = hashlib.sha256(text.encode("utf-8")).hexdigest()
        with self._lock:
            if key in self._items:
                self._items.move_to_end(key)
                return self._items[key], True
        item = {"job": run()}
        with self._lock:
            self._items[key] = item
            while len(self._items) > self.size:
                self._items.popitem(last=False)
        return item, False


def form_errors_json(errors: list[FieldError]) -> list[Mapping[str, str]]:
    """Errors as the page reads them."""
    return [e.to_json() for e in errors]


# --------------------------------------------------------------------------------------------
# Choices the page offers in its lists


@functools.cache
def choices() -> dict[str, Any]:
    """Grounds, terrains, releases, wind kinds and reference levels, with labels."""
    from dropcalc.model.reference_levels import DEFAULT_LEVEL_KEYS, REFERENCE_LEVELS
    from dropcalc.physics.release import RELEASE_MODES
    from dropcalc.physics.scatter import SURFACES
    from dropcalc.physics.wind import TERRAIN_ALIASES, TERRAIN_CLASSES

    aliases: dict[str, list[str]] = {}
    for alias, key in TERRAIN_ALIASES.items():
        aliases.setdefault(key, []).append(alias)
    return {
        "grounds": [[key, s.label] for key, s in SURFACES.items()],
        "terrains": [
            [key, t.label + (f" ({', '.join(aliases[key])})" if key in aliases else "")]
            for key, t in TERRAIN_CLASSES.items()
        ],
        "terrain_aliases": dict(TERRAIN_ALIASES),
        "releases": list(RELEASE_MODES),
        "wind_kinds": [["mean", "10-minute mean"], ["gust", "gust"]],
        "wind_measured": [
            ["site", "at the site"],
            ["open-country", "in open country (forecast, airport)"],
        ],
        "levels": [[key, lv.label] for key, lv in REFERENCE_LEVELS.items()],
        "default_levels": list(DEFAULT_LEVEL_KEYS),
    }


def empty_form() -> dict[str, Any]:
    """A new job: nothing filled in but one work area with one empty edge and the defaults."""
    from dropcalc.web.form import empty_form as blank

    form = blank()
    form["site"]["ground"] = "concrete"
    form["wind"]["kind"] = "mean"
    form["work_areas"] = check_form(
        {"work_areas": [{"name": "work area 1", "release": "drop", "edges": [{"name": "edge 1"}]}]}
    )["work_areas"]
    return form


# --------------------------------------------------------------------------------------------
# The job and its answer


class Superseded(Exception):
    """The page gave up on this request (newer inputs): the job was stopped part-way."""


def run_form(
    form_data: Any, cache: JobCache | None = None, cancelled: threading.Event | None = None
) -> tuple[dict[str, Any], bool]:
    """Load a form and run its job (or take it from the cache).

    Returns
    -------
    (dict, bool)
        The cache entry (``"job"``: the JobResult; ``"answer"`` once made) and whether it came
        from the cache.

    Raises
    ------
    FormError
        For input the loader or the job refuses, with the field.
    Superseded
        When ``cancelled`` is set while the job runs (checked at each Monte Carlo round).
    """
    from dropcalc.analysis.job import run_job

    scenario, text = load_form(form_data)

    def check(done: int, total: int) -> None:
        if cancelled is not None and cancelled.is_set():
            raise Superseded

    def run() -> Any:
        try:
            return run_job(scenario, check if cancelled is not None else None)
        except DropcalcError as exc:
            raise FormError([field_error(exc)]) from None

    if cache is None:
        return {"job": run()}, False
    return cache.entry(text, run)


def _rings(geometry: Any) -> list[list[list[list[float]]]]:
    """A (multi)polygon as [[exterior, hole, ...], ...] rings of [x, y] in metres."""
    polygons = getattr(geometry, "geoms", [geometry])
    out = []
    for polygon in polygons:
        if polygon.is_empty:
            continue
        rings = [polygon.exterior, *polygon.interiors]
        out.append([[[round(x, 3), round(y, 3)] for x, y in ring.coords] for ring in rings])
    return out


def _svg_data(path: Path) -> str:
    """An SVG file as a data: URI (shown in an <img>, so nothing in it can run)."""
    import base64

    return "data:image/svg+xml;base64," + base64.b64encode(path.read_bytes()).decode("ascii")


def answer_json(job: Any) -> dict[str, Any]:
    """What the page shows for a job.

    Per work area the distance to keep clear, what sets it and the zone on the plan; the object
    table, the controls, the warnings and the caution. The figures come apart
    (:func:`figures_json`): drawing them takes longer than the numbers, which the page shows
    first.
    """
    import math

    from dropcalc.physics.release import describe
    from dropcalc.texts import CAUTION_SHORT, NO_FINITE_DISTANCE, keep_clear

    scenario = job.scenario
    areas = []
    for area in job.work_areas:
        finite = math.isfinite(area.radius_m)
        areas.append(
            {
                "name": area.name,
                "finite": finite,
                "radius_m": area.radius_m if finite else None,
                "keep_clear": keep_clear(area.radius_m),
                "keep_clear_text": (
                    f"keep {keep_clear(area.radius_m)} m clear" if finite else NO_FINITE_DISTANCE
                ),
                "worst_case_radius_m": (
                    area.worst_case_radius_m if math.isfinite(area.worst_case_radius_m) else None
                ),
                "worst_case_text": (
                    f"{keep_clear(area.worst_case_radius_m)} m (every simulated drop, the envelope)"
                    if math.isfinite(area.worst_case_radius_m)
                    else NO_FINITE_DISTANCE
                ),
                "confidence_text": f"{100 * scenario.confidence:g} %",
                "margin_text": f"{scenario.margin:g} m",
                "margin_m": scenario.margin,
                "driving_object": area.driving_object,
                "driving_edge": area.driving_edge,
                "drift_m": _finite(area.drift_m),
                "scatter_m": _finite(area.scatter_m),
                "area_m2": _finite(area.area_m2),
                "heights_text": ", ".join(f"{e.name} at {e.height:g} m" for e in area.site.edges),
                "release": describe(area.release, scenario.gravity),
                "zone": _rings(area.zone.area.polygon) if finite else [],
                "driver_warnings": list(getattr(area, "driver_warnings", ())),
                "clear_distance_m": _finite(getattr(area, "clear_distance_m", None)),
                "stop_work_wind_m_s": _finite(getattr(area, "stop_work_wind_m_s", None)),
            }
        )
    objects = []
    for row in job.object_rows:
        radius = row.get("zone_radius_m")
        objects.append(
            {
                "label": str(row.get("label") or row.get("name") or row.get("id") or ""),
                "quantity": row.get("quantity"),
                "mass_kg": _finite(row.get("mass_kg")),
                "impact_speed_m_s": _finite(row.get("impact_speed_max_m_s")),
                "impact_energy_j": _finite(row.get("impact_energy_max_j")),
                "levels": str(row.get("levels_exceeded") or "").replace("; ", ", "),
                "control": str(row.get("control") or ""),
                "zone_text": (
                    f"{keep_clear(radius)} m"
                    if isinstance(radius, float) and math.isfinite(radius)
                    else "—"
                ),
                "error": str(row.get("error") or ""),
            }
        )
    return {
        "areas": areas,
        "objects": objects,
        "controls": [
            {"item": item, "controls": [controls] if isinstance(controls, str) else list(controls)}
            for item, controls in job.controls
        ],
        "warnings": list(job.warnings),
        "caution": CAUTION_SHORT,
        "wind_basis": str(getattr(scenario, "wind_basis", "") or ""),
    }


def figures_json(job: Any) -> dict[str, str]:
    """The side view and the energy plot as SVG ``data:`` URIs, from the PDF's figure code."""
    from dropcalc.report.build import draw_figures

    with tempfile.TemporaryDirectory(prefix="dropcalc-page-") as folder:
        paths = draw_figures(job, Path(folder), "svg")
        return {name: _svg_data(path) for name, path in paths.items()}


def figures(form_data: Any, cache: JobCache | None = None) -> dict[str, str]:
    """The figures of a form's job (run it, or take it from the cache, first)."""
    entry, _cached = run_form(form_data, cache)
    if "figures" not in entry:
        entry["figures"] = figures_json(entry["job"])
    drawn: dict[str, str] = entry["figures"]
    return drawn


def _finite(value: Any) -> float | None:
    import math

    return float(value) if isinstance(value, int | float) and math.isfinite(value) else None


def compute(
    form_data: Any, cache: JobCache | None = None, cancelled: threading.Event | None = None
) -> dict[str, Any]:
    """Run a form's job and return the page's answer (:func:`answer_json`).

    ``cancelled``, set from another thread, stops the job part-way (:class:`Superseded`): the
    page has newer inputs and no longer waits for this answer.

    Raises
    ------
    FormError
        For input the loader refuses, with the field and the command line's message.
    """
    import time

    started = time.perf_counter()
    entry, cached = run_form(form_data, cache, cancelled)
    if "answer" not in entry:
        entry["answer"] = answer_json(entry["job"])
    return {**entry["answer"], "cached": cached, "seconds": time.perf_counter() - started}


# --------------------------------------------------------------------------------------------
# Documents

#: Documents the page offers: kind -> (media type, file name).
DOCUMENTS = {
    "pdf": ("application/pdf", "report.pdf"),
    "toml": ("application/toml", SCENARIO_NAME),
    "json": ("application/json", "results.json"),
    "csv": ("text/csv", "objects.csv"),
    "geojson": ("application/geo+json", "exclusion-zone.geojson"),
}


def document(kind: str, form_data: Any, cache: JobCache | None = None) -> tuple[bytes, str, str]:
    """A document for a form: the scenario file, or the job's PDF, JSON, CSV or GeoJSON.

    The same files ``dropcalc demo`` writes for its scenario.

    Returns
    -------
    (bytes, str, str)
        The content, its media type and the file name to offer.

    Raises
    ------
    FormError
        For input the loader refuses.
    InputError
        For an unknown kind, or GeoJSON without the site's origin.
    """
    from dropcalc.present.json import dumps, report_json

    if kind not in DOCUMENTS:
        raise InputError(f"no such document {kind!r}; known: {', '.join(DOCUMENTS)}")
    media_type, name = DOCUMENTS[kind]
    if kind == "toml":
        _scenario, text = load_form(form_data)
        return text.encode("utf-8"), media_type, name
    job = run_form(form_data, cache)[0]["job"]
    if kind == "geojson":
        features = [
            feature
            for area in job.work_areas
            if area.geojson
            for feature in area.geojson["features"]
        ]
        if not features:
            raise FormError(
                [
                    FieldError(
                        "site.origin_lat",
                        "site.origin: GeoJSON places the zone on the map: give the site's "
                        "origin (latitude and longitude of the plan's 0, 0) in the method "
                        "settings",
                    )
                ]
            )
        data = {"type": "FeatureCollection", "features": features}
        return dumps(data, indent=1).encode("utf-8"), media_type, name
    if kind == "json":
        full = {"summary": report_json(job, Path(DOCUMENTS["pdf"][1])), "objects": job.object_rows}
        return dumps(full).encode("utf-8"), media_type, name
    with tempfile.TemporaryDirectory(prefix="dropcalc-page-") as folder:
        target = Path(folder) / name
        if kind == "csv":
            from dropcalc.present.tables import write_rows

            write_rows(target, job.object_rows)
        else:
            from dropcalc.report.build import build_report
            from dropcalc.report.pdf import write_report

            write_report(build_report(job, Path(folder) / "figures"), target)
        return target.read_bytes(), media_type, name
