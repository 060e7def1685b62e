"""Every JSON document dropcalc writes, built in one place and passed through one guard.

The contracts (SI, snake case, unit suffix on every quantity; the stable keys are listed in
the README's glossary) are built here from the analysis results: ``fall``, ``zone`` (with its
site part), ``objects``, the ``report``/``demo`` summary, and the rows of ``batch`` and the
GeoJSON files on their way out. :func:`json_safe` is the only inf/NaN guard: a value that is not
a finite number becomes ``null`` and its key is listed, with what it was, in a ``not_finite``
object beside it, so a reader can tell "carried away, no finite distance" (``inf``) from "not
given" (a plain ``null``). :func:`dumps` applies it to whatever it writes, so no output can end
in ``ValueError: Out of range float values are not JSON compliant``.
"""

from __future__ import annotations

import json
import math
from collections.abc import Iterable, Mapping
from pathlib import Path
from typing import IO, TYPE_CHECKING, Any

import numpy as np

from dropcalc.texts import CAUTION_SHORT

if TYPE_CHECKING:
    from dropcalc.analysis.fall import FallResult
    from dropcalc.analysis.job import JobResult
    from dropcalc.analysis.zone import SiteZone, ZoneResult
    from dropcalc.io.library import DropObject

#: Key added to an object whose values were not finite: {key: "inf" | "-inf" | "nan"}.
NOT_FINITE = "not_finite"


def json_safe(value: Any) -> Any:
    """Return ``value`` as plain JSON data: no inf or NaN anywhere, numpy and paths converted.

    Parameters
    ----------
    value : Any
        Dicts, lists, tuples, numbers (Python or numpy), strings, bools, None, paths, numpy
        arrays, nested to any depth.

    Returns
    -------
    Any
        The same structure with dicts and lists only. A float that is inf or NaN becomes None;
        in a dict its key is also recorded in ``not_finite`` (``{"radius_m": "inf"}``). A
        non-finite value inside a list becomes None without a record (lists have no keys).
    """
    if isinstance(value, Mapping):
        out: dict[str, Any] = {}
        lost: dict[str, str] = dict(value.get(NOT_FINITE) or {})
        for key, item in value.items():
            if key == NOT_FINITE:
                continue
            number = _number(item)
            if number is not None and not math.isfinite(number):
                lost[str(key)] = _spelling(number)
                out[str(key)] = None
            else:
                out[str(key)] = json_safe(item)
        if lost:
            out[NOT_FINITE] = lost
        return out
    if isinstance(value, np.ndarray):
        return json_safe(value.tolist())
    if isinstance(value, (list, tuple)):
        return [json_safe(item) for item in value]
    if isinstance(value, (bool, np.bool_)):
        return bool(value)
    number = _number(value)
    if number is not None:
        if not math.isfinite(number):
            return None
        return int(number) if isinstance(value, (int, np.integer)) else number
    if isinstance(value, Path):
        return str(value)
    return value


def _safe_dict(value: dict[str, Any]) -> dict[str, Any]:
    """:func:`json_safe` of a JSON object, typed as one."""
    safe: dict[str, Any] = json_safe(value)
    return safe


def _number(value: Any) -> float | None:
    """The value as a float if it is a (non-bool) number, else None."""
    if isinstance(value, (bool, np.bool_)):
        return None
    if isinstance(value, (int, float, np.integer, np.floating)):
        return float(value)
    return None


def _spelling(number: float) -> str:
    if math.isnan(number):
        return "nan"
    return "inf" if number > 0 else "-inf"


def dumps(document: Any, indent: int | None = 2) -> str:
    """The JSON text of ``document`` after :func:`json_safe` (strict: no NaN or Infinity)."""
    return json.dumps(json_safe(document), indent=indent, allow_nan=False)


def write_rows_json(handle: IO[str], rows: Iterable[Mapping[str, Any]]) -> None:
    """Write result rows as one JSON array, a row at a time (streams any number of rows)."""
    handle.write("[")
    for number, row in enumerate(rows):
        handle.write(",\n  " if number else "\n  ")
        handle.write(dumps(row, indent=None))
    handle.write("\n]\n")


# --------------------------------------------------------------------------------------------
# fall


def fall_json(result: FallResult) -> dict[str, Any]:
    """The ``fall --json`` contract (SI, snake case with unit suffixes; see the README glossary).

    ``drift_m`` (the DESIGN contract key) and ``drift_min_m`` (the name ``batch`` uses) are the
    same number: the drift at the smallest drag area; ``drift_max_m`` is at the largest.
    """
    from dropcalc.physics.release import describe
    from dropcalc.present.text import fall_levels

    imp = result.given.impact
    max_imp = result.given.impact_max_drag or imp
    case = result.case
    gust = result.gust

    def value(array: np.ndarray | None) -> float | None:
        return None if array is None else float(array[0])

    drift = value(imp.drift)
    away = None
    if drift is not None and math.isfinite(drift):
        az = np.radians(float(imp.drift_azimuth[0]))
        away = drift * float(np.cos(az - np.radians(case.edge_azimuth)))
    epa = None if case.contact_area is None else value(imp.energy_per_area)
    out: dict[str, Any] = {
        "landed": bool(imp.landed[0]),
        "impact_speed_m_s": value(imp.impact_speed),
        "impact_energy_j": value(imp.kinetic_energy),
        "fall_time_s": value(imp.fall_time),
        "drift_m": drift,
        "drift_min_m": drift,
        "terminal_speed_m_s": value(imp.terminal_speed),
        "impact_angle_deg": value(imp.impact_angle),
        "air_density_kg_m3": case.air.density,
        "vertical_impact_speed_m_s": value(imp.vertical_speed),
        "horizontal_impact_speed_m_s": value(imp.horizontal_speed),
        "momentum_kg_m_s": value(imp.momentum),
        "drift_azimuth_deg": value(imp.drift_azimuth),
        "drift_away_from_edge_m": away,
        "terminal_speed_fraction": value(imp.terminal_fraction),
        "height_to_95_percent_terminal_m": value(imp.height_to_95_percent),
        "energy_per_contact_area_j_m2": epa,
        "energy_per_contact_area_j_cm2": None if epa is None else epa / 1e4,
        "mass_kg": case.mass,
        "drag_area_m2": case.drag_area,
        "contact_area_m2": case.contact_area,
        "release_height_m": case.height,
        "release_mode": case.release.mode,
        "release": describe(case.release, case.gravity),
        "edge_azimuth_deg": case.edge_azimuth,
        "gravity_m_s2": case.gravity,
        "air_basis": case.air.basis,
        "wind_speed_10m_m_s": case.wind.speed_10m,
        "wind_speed_kind": case.wind.kind,
        "wind_from_deg": case.wind.from_direction_deg,
        "wind_profile": case.wind.profile,
        "wind": case.wind.describe(),
        "wind_used": f"{result.given.label} {result.given.speed_10m:g} m/s at 10 m",
        "gust_speed_10m_m_s": None if gust is None else gust.speed_10m,
        "gust_drift_m": None if gust is None else value(gust.impact.drift),
        "gust_impact_energy_j": None if gust is None else value(gust.impact.kinetic_energy),
        "object_id": case.object_id,
        "object_name": case.object_name,
        "drag_area_max_m2": (
            case.drag_area_max if case.drag_area_max is not None else case.drag_area
        ),
        "drift_max_m": value(max_imp.drift),
        "impact_energy_min_j": value(max_imp.kinetic_energy),
        "impact_speed_min_m_s": value(max_imp.impact_speed),
        "fall_time_max_s": value(max_imp.fall_time),
        "terminal_speed_min_m_s": value(max_imp.terminal_speed),
        "gust_drift_max_m": (
            None if gust is None else value((gust.impact_max_drag or gust.impact).drift)
        ),
        "flight_model": result.flight_model,
        "lift_off_speed_m_s": result.lift_off_speed,
        "warnings": list(result.warnings),
        "caution": CAUTION_SHORT,
    }
    reached, _ = fall_levels(result)
    out["levels_reached"] = [level.key for level in reached]
    return _safe_dict(out)


# --------------------------------------------------------------------------------------------
# zone


def zone_json(
    result: ZoneResult,
    limits: Mapping[str, Any] | None = None,
    site: SiteZone | None = None,
) -> dict[str, Any]:
    """The ``zone --json`` contract plus per-object figures and the statement in words.

    ``result`` is the zone of the driving segment; with ``site`` (``zone --site``) the plan's
    figures and every segment's zone are added (:func:`site_json`). ``limits`` is the barricade
    check (``zone --barricade``): ``distance`` [m], the highest mean ``wind`` [m/s] and greatest
    work ``height`` [m] it holds for, the radius ``needed`` in the day's wind [m], and the
    radius in ``still_air`` [m] when even still air needs more than the barricade (else None).

    ``release_height_m`` is the work height (the name ``fall`` and ``batch`` use); ``height_m``
    is kept beside it with the same value for readers of earlier output. ``precision`` is the
    target relative standard error of the radius (``--precision``, ``ZoneSettings.relative_error``).
    """
    from dropcalc.present.text import NO_TERRAIN_WARNING, zone_statement

    s = result.settings
    d = result.driver
    out: dict[str, Any] = {
        "radius_m": result.radius,
        "confidence": s.confidence,
        "drift_m": d.drift,
        "scatter_m": d.scatter,
        "margin_m": s.margin,
        "worst_case_radius_m": result.worst_case,
        "standard_error_m": d.standard_error,
        "precision": s.relative_error,
        "samples": d.samples,
        "driving_object": d.obj.name,
        "driving_object_id": d.obj.object_id or None,
        "worst_case_object": result.worst_case_driver.obj.name,
        "height_m": s.height,
        "release_height_m": s.height,
        "release_mode": s.release.mode,
        "wind_speed_10m_m_s": s.wind.speed_10m,
        "wind_speed_kind": s.wind.kind,
        "gust_speed_10m_m_s": result.gust_speed,
        "turbulence_intensity": result.turbulence_intensity,
        "ground": s.ground.key,
        "ground_slope_deg": s.ground_slope,
        "air_density_kg_m3": s.air.density,
        "seed": s.seed,
        "objects": [
            {
                "name": z.obj.name,
                "id": z.obj.object_id or None,
                "radius_m": z.radius,
                "drift_m": z.drift,
                "scatter_m": z.scatter,
                "standard_error_m": z.standard_error,
                "worst_case_radius_m": z.worst_case,
                "max_sampled_m": z.max_sampled,
                "carried_away_fraction": z.carried_away,
                "rolled_away_fraction": z.rolled_away,
                "samples": z.samples,
                "glides": z.obj.glides,
                "flight_model": "plate" if z.obj.plate is not None else "point mass",
            }
            for z in result.objects
        ],
        "after_landing": after_landing_json(result),
        "statement": zone_statement(result),
        "not_modelled": "deflection off the structure (scaffold, facade, balconies)",
        "wind_warning": (
            NO_TERRAIN_WARNING if s.wind.speed_10m > 0 and s.wind.profile == "uniform" else None
        ),
        "caution": CAUTION_SHORT,
    }
    if limits is not None:
        out["barricade_m"] = limits["distance"]
        out["barricade_highest_wind_m_s"] = limits["wind"]
        out["barricade_greatest_height_m"] = limits["height"]
        out["barricade_holds"] = bool(limits["needed"] <= limits["distance"])
        out["barricade_too_close_in_still_air"] = limits["still_air"] is not None
        out["barricade_needed_m"] = limits["needed"]
        out["barricade_needed_in_still_air_m"] = limits["still_air"]
    if site is not None:
        out.update(site_json(site))
    return _safe_dict(out)


def after_landing_json(result: ZoneResult) -> dict[str, Any]:
    """The after-landing model of the driving object: its inputs, sources and sensitivity.

    Part of :func:`zone_json` (key ``after_landing``); non-finite sensitivity radii are left to
    :func:`json_safe` there.
    """
    from dropcalc.physics import contact

    s, d = result.settings, result.driver
    obj, ground = d.obj, s.ground
    material = obj.material_class
    return {
        "model": "first contact as a planar rigid-body impact with Coulomb friction and "
        "energetic restitution at a random orientation; then hops, and a slide or a skid and "
        "roll; an object that breaks throws fragments instead",
        "object": obj.name,
        "material": material.key,
        "restitution_on_concrete": list(material.restitution),
        "restitution_source": material.restitution_source,
        "restitution_reference_speed_m_s": contact.REFERENCE_SPEED,
        "restitution_speed_exponent": contact.RESTITUTION_SPEED_EXPONENT,
        "ground_restitution_factor": list(ground.restitution_factor),
        "friction": list(ground.friction),
        "rolling_resistance": list(ground.rolling_resistance) if obj.rolls else None,
        "ground_source": ground.source,
        "ground_slope_deg": s.ground_slope,
        "break_speed_m_s": obj.break_speed,
        "break_source": material.break_source if obj.fragile else None,
        "fragment_speed_fraction": (
            list(contact.FRAGMENT_SPEED_FRACTION) if obj.break_speed is not None else None
        ),
        "fragment_angle_deg": (
            list(contact.FRAGMENT_ANGLE) if obj.break_speed is not None else None
        ),
        "sensitivity": [
            {
                "parameter": row.parameter,
                "low": row.low,
                "high": row.high,
                "radius_at_low_m": row.radius_low,
                "radius_at_high_m": row.radius_high,
            }
            for row in d.sensitivity
        ],
    }


def site_json(site_result: SiteZone) -> dict[str, Any]:
    """The plan part of ``zone --site --json``: the area and every segment's zone.

    Not yet passed through :func:`json_safe`: :func:`zone_json` does that for the whole document.
    """
    area: Any = site_result.area
    return {
        "site_radius_m": site_result.radius,
        "site_worst_case_radius_m": site_result.worst_case,
        "area_m2": area.area_m2,
        "area_max_distance_from_edge_m": area.max_distance_m,
        "driving_edge": site_result.driver[0],
        "segments": [
            {
                "edge": name,
                "segment": index,
                "radius_m": z.radius,
                "worst_case_radius_m": z.worst_case,
                "height_m": z.settings.height,
                "release_height_m": z.settings.height,
                "edge_azimuth_deg": z.settings.edge_azimuth,
            }
            for name, index, z in site_result.segments
        ],
    }


# --------------------------------------------------------------------------------------------
# objects


def object_json(obj: DropObject) -> dict[str, Any]:
    """All properties of a library object with unit-suffixed keys (``objects --json``)."""
    from dropcalc.physics import contact

    return _safe_dict(
        {
            "id": obj.id,
            "name": obj.name,
            "category": obj.category,
            "mass_kg": obj.mass,
            "shape": obj.shape,
            "dimensions_m": dict(obj.dimensions),
            "drag_area_min_m2": obj.drag_area_min,
            "drag_area_typical_m2": obj.drag_area_typical,
            "drag_area_max_m2": obj.drag_area_max,
            "projected_area_mean_m2": obj.projected_area_mean,
            "contact_area_m2": obj.contact_area,
            "hazards": list(obj.hazards),
            "fragile": obj.fragile,
            "material": obj.material or contact.DEFAULT_MATERIAL,
            "glides": obj.glides,
            "mass_basis": obj.mass_basis,
            "mass_source": obj.mass_source,
            "size_source": obj.size_source,
            "source": obj.source,
            "drag_basis": obj.drag_basis,
            "notes": obj.notes,
        }
    )


# --------------------------------------------------------------------------------------------
# report and demo


def report_json(job: JobResult, pdf: Path) -> dict[str, Any]:
    """The ``report --json`` / ``demo --json`` summary of a job whose PDF is ``pdf``."""
    scenario = job.scenario
    top = job.highest_energy_row
    return _safe_dict(
        {
            "pdf": str(pdf),
            "scenario": scenario.path.name,
            "scenario_sha256": scenario.sha256,
            "confidence": scenario.confidence,
            "work_areas": [
                {
                    "name": a.name,
                    "radius_m": a.radius_m,
                    "worst_case_radius_m": a.worst_case_radius_m,
                    "area_m2": a.area_m2,
                    "max_distance_m": a.max_distance_m,
                    "driving_object": a.driving_object,
                    "drift_m": a.drift_m,
                    "scatter_m": a.scatter_m,
                    "margin_m": scenario.margin,
                    "driver_warnings": list(a.driver_warnings),
                    "beyond_building_m2": a.zone.area.beyond_building_m2,
                    "clear_distance_m": a.clear_distance_m,
                    "stop_work_wind_m_s": a.stop_work_wind_m_s,
                }
                for a in job.work_areas
            ],
            "highest_energy_object": top.get("label") if top is not None else None,
            "highest_impact_energy_j": (
                job.object_rows[0].get("impact_energy_max_j") if job.object_rows else None
            ),
            "objects": len(job.object_rows),
            "controls": [
                {"item": item, "controls": list(controls)} for item, controls in job.controls
            ],
        }
    )
