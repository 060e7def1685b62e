"""From a scenario to a report: run the zones and the object checks, draw the figures, write.

The numbers come from the same functions as ``dropcalc zone`` and ``dropcalc batch``
(:func:`dropcalc.analysis.zone.site_zone`, :func:`dropcalc.analysis.batch.solve_items`), so the
PDF agrees with their JSON for the same inputs.
"""

from __future__ import annotations

import datetime as _dt
import math
from dataclasses import dataclass, replace
from pathlib import Path
from typing import Any

import numpy as np

from dropcalc import __version__
from dropcalc.io.scenario import Scenario
from dropcalc.report.data import JobInfo, ReportData, WorkAreaResult
from dropcalc.texts import keep_clear

#: How many objects the figures show at most (the highest-energy and the zone-driving ones).
FIGURE_OBJECTS = 5


@dataclass(frozen=True)
class ScenarioResults:
    """Everything computed for a scenario: the report data and the raw results behind it."""

    report: ReportData
    zones: list[Any]  # SiteZone per work area
    rows: list[dict[str, Any]]  # batch rows
    geojson: list[dict[str, Any] | None]  # per work area, when the site has an origin


def load_text(name: str, scenario_dir: Path | None = None) -> str:
    """A text block from ``templates/``: the scenario folder's own ``templates/`` first.

    A site overrides the cautions, method notes or sign-off wording by putting a file of the
    same name (``cautions.md``, ``method.md``, ``signoff.md``) in a ``templates`` folder beside
    its scenario.
    """
    from dropcalc.resources import data_path

    if scenario_dir is not None:
        own = scenario_dir / "templates" / name
        if own.is_file():
            return own.read_text(encoding="utf-8")
    return (data_path("templates") / name).read_text(encoding="utf-8")


def _zone_settings(scenario: Scenario, area: Any) -> Any:
    from dropcalc.analysis.zone import Uncertainty, ZoneSettings

    return ZoneSettings(
        height=max(edge.height for edge in area.site.edges),
        release=area.release,
        wind=scenario.wind,
        air=scenario.air,
        gravity=scenario.gravity,
        ground=scenario.ground,
        confidence=scenario.confidence,
        margin=scenario.margin,
        relative_error=scenario.precision,
        seed=scenario.seed,
        uncertainty=Uncertainty(contact_tilt=scenario.contact_tilt),
    )


def _code_rules(areas: list[WorkAreaResult]) -> list[tuple[str, str, str]]:
    rules = []
    for area in areas:
        h = max(area.heights_m)
        computed = (
            f"computed zone {keep_clear(area.radius_m)} m"
            if math.isfinite(area.radius_m)
            else "no finite computed zone: objects carried away"
        )
        rules.append(
            (
                f"{area.name}: pedestrian protection not needed beyond H/2; barrier H/4 to H/2; "
                "covered walkway inside H/4",
                f"H = {h:.3g} m: H/2 = {h / 2:.3g} m, H/4 = {h / 4:.3g} m ({computed})",
                "International Building Code, Table 3306.1",
            )
        )
    rules.append(
        (
            "Materials kept back from a roof edge without guardrails",
            "6 ft (1.83 m) from the edge, on the roof",
            "29 CFR 1926.502(j)(7)",
        )
    )
    rules.append(
        (
            "Danger areas / exclusion zones required, no distance given",
            "the assessment must size them",
            "UK Work at Height Regulations 2005 regs 10-11; model WHS Regulations r.54-55",
        )
    )
    return rules


def build_results(scenario: Scenario, figure_dir: Path, progress: Any = None) -> ScenarioResults:
    """Run every work area's zone and the object checks, draw the figures into ``figure_dir``.

    Parameters
    ----------
    scenario : Scenario
        A loaded scenario (:func:`dropcalc.io.scenario.load_scenario`).
    figure_dir : Path
        Folder for the figure files (PNG).
    progress : callable, optional
        Progress callback passed to the Monte Carlo.
    """
    from dropcalc.analysis.batch import sort_rows
    from dropcalc.analysis.plan import to_geojson
    from dropcalc.analysis.zone import site_zone, zone_objects_from_items
    from dropcalc.physics.release import describe
    from dropcalc.present.plan_plot import plot_plan
    from dropcalc.present.text import zone_statement

    figure_dir.mkdir(parents=True, exist_ok=True)
    objects = zone_objects_from_items(scenario.items, scenario.library)
    outward = not scenario.wind_from_given
    wind = scenario.wind
    areas: list[WorkAreaResult] = []
    zones = []
    geojson = []
    warnings: list[str] = []
    for index, area in enumerate(scenario.work_areas, start=1):
        settings = _zone_settings(scenario, area)
        result = site_zone(objects, settings, area.site, progress, wind_outward=outward)
        zones.append(result)
        driver = result.driver[2]
        plan_png = figure_dir / f"plan-{index}.png"
        toward = None if outward else (wind.from_direction_deg + 180.0) % 360.0
        label = (
            "still air"
            if wind.speed_10m == 0
            else f"{wind.speed_10m:g} m/s {wind.kind}"
            + ("\nassumed out from\neach edge" if outward else "")
        )
        plot_plan(result.area, area.site, toward, plan_png, title=area.name, wind_label=label)
        radii: dict[str, float] = {}
        for _, _, zone in result.segments:
            for object_zone in zone.objects:
                name = object_zone.obj.name
                radii[name] = max(radii.get(name, 0.0), object_zone.radius)
        areas.append(
            WorkAreaResult(
                name=area.name,
                release=describe(area.release, scenario.gravity),
                heights_m=tuple(edge.height for edge in area.site.edges),
                radius_m=result.radius,
                worst_case_radius_m=result.worst_case,
                area_m2=result.area.area_m2,
                max_distance_m=result.area.max_distance_m,
                driving_object=driver.driver.obj.name,
                driving_edge=result.driver[0],
                drift_m=driver.driver.drift,
                scatter_m=driver.driver.scatter,
                margin_m=scenario.margin,
                standard_error_m=driver.driver.standard_error,
                segments=[
                    {
                        "edge": name,
                        "segment": segment,
                        "radius_m": zone.radius,
                        "worst_case_radius_m": zone.worst_case,
                        "height_m": zone.settings.height,
                        "edge_azimuth_deg": zone.settings.edge_azimuth,
                        "statement": zone_statement(zone),
                    }
                    for name, segment, zone in result.segments
                ],
                object_radii=radii,
                plan_png=plan_png,
            )
        )
        if scenario.origin is not None:
            geojson.append(
                to_geojson(
                    result.area,
                    area.site,
                    scenario.origin[0],
                    scenario.origin[1],
                    {
                        "work_area": area.name,
                        "radius_m": result.radius,
                        "worst_case_radius_m": result.worst_case,
                        "confidence": scenario.confidence,
                    },
                )  # fmt: skip
            )
        else:
            geojson.append(None)

    top_height = max(edge.height for a in scenario.work_areas for edge in a.site.edges)
    rows = sort_rows(_object_rows(scenario))
    for row in rows:
        label = row.get("label") or row.get("name")
        row["zone_radius_m"] = max((a.object_radii.get(label, 0.0) for a in areas), default=None)
    default_control = scenario.rules[-1].control if scenario.rules else ""
    controls = [
        (str(row.get("label") or row.get("id")), str(row["control"]))
        for row in rows
        if row.get("control") and row["control"] != default_control
    ]
    gliders = [str(row.get("label")) for row in rows if row.get("glides")]
    if gliders:
        warnings.append(
            f"Sheets and plates ({', '.join(gliders)}) can glide far downwind: the computed "
            "zone is not conservative for them. Secure them against wind before work starts."
        )
    windborne = [str(row.get("label")) for row in rows if "windborne" in str(row.get("warnings"))]
    if windborne:
        warnings.append(
            f"Windborne in this wind (terminal speed below the wind speed): {', '.join(windborne)}."
        )

    drivers = [a.driving_object for a in areas]
    figures = _figures(scenario, objects, rows, figure_dir, top_height, drivers)
    air = scenario.air
    job = scenario.job
    report = ReportData(
        job=JobInfo(
            title=job.get("title", ""),
            site=job.get("site", ""),
            client=job.get("client", ""),
            reference=job.get("reference", ""),
            prepared_by=job.get("prepared_by", ""),
            checked_by=job.get("checked_by", ""),
            revision=job.get("revision", ""),
            date=job.get("date", _dt.date.today().isoformat()),
        ),
        scenario_name=scenario.path.name,
        scenario_sha256=scenario.sha256,
        software_version=__version__,
        generated=_dt.datetime.now(_dt.UTC).strftime("%Y-%m-%d %H:%M UTC"),
        confidence=scenario.confidence,
        wind_text=_wind_text(scenario, outward),
        air_text=f"{air.density:.4g} kg/m³ ({air.basis}); g = {scenario.gravity:.5g} m/s²",
        ground_text=scenario.ground.label,
        inputs=[
            ("Wind profile", wind.describe().split("; ", 1)[-1]),
            ("Gust used for the worst case", f"{_gust(scenario):.3g} m/s at 10 m"),
            ("Gravity", f"{scenario.gravity:.5g} m/s²"),
            ("Margin added", f"{scenario.margin:g} m"),
            (
                "Bounce off the ground",
                f"the first contact's normal tilted up to {scenario.contact_tilt:g}° "
                "(sends a dropped object sideways)",
            ),
            (
                "Monte Carlo precision",
                f"standard error below {100 * scenario.precision:g} % "
                f"of the radius; seed {scenario.seed}",
            ),
            (
                "Objects",
                f"{len(scenario.items)} items ({sum(i.quantity for i in scenario.items)} pieces)",
            ),
        ],  # fmt: skip
        work_areas=areas,
        object_rows=rows,
        object_table_height_m=top_height,
        levels=[
            (
                level.key,
                level.label,
                level.value if level.quantity == "energy" else level.value / 1e4,
                "J" if level.quantity == "energy" else "J/cm²",
            )
            for level in scenario.levels
        ],
        controls=controls,
        code_rules=_code_rules(areas),
        figures=figures,
        texts={
            name: load_text(f"{name}.md", scenario.path.parent)
            for name in ("cautions", "method", "signoff")
        },
        warnings=warnings,
    )
    return ScenarioResults(report, zones, rows, geojson)


def _object_rows(scenario: Scenario) -> list[dict[str, Any]]:
    """The object table: each item where it strikes hardest.

    Every item is solved from every work area (from the area's highest edge, unless the item
    list gives the item its own height, with the area's release, pushed or thrown along the
    wind); the row of the area that gives the highest impact energy (smallest drag area) is
    kept, with that area's name in ``work_area``. With one work area this is simply that area.
    """
    from dropcalc.analysis.batch import BatchSettings, solve_items

    toward = (scenario.wind.from_direction_deg + 180.0) % 360.0
    best: list[dict[str, Any] | None] = [None] * len(scenario.items)
    for area in scenario.work_areas:
        height = max(edge.height for edge in area.site.edges)
        settings = BatchSettings(
            height=height,
            wind=scenario.wind,
            air=scenario.air,
            gravity=scenario.gravity,
            release=area.release,
            edge_azimuth=toward,
            levels=scenario.levels,
            rules=scenario.rules,
        )
        items = [
            item if item.height_given else replace(item, height=height) for item in scenario.items
        ]
        for index, row in enumerate(solve_items(items, settings)):
            row["work_area"] = area.name
            if best[index] is None or _energy(row) > _energy(best[index]):
                best[index] = row
    return [row for row in best if row is not None]


def _energy(row: dict[str, Any] | None) -> float:
    value = None if row is None else row.get("impact_energy_max_j")
    return float(value) if isinstance(value, (int, float)) and math.isfinite(value) else -math.inf


def _wind_text(scenario: Scenario, outward: bool) -> str:
    """The wind in a few words: speed, kind, gust, profile and direction."""
    wind = scenario.wind
    if wind.speed_10m == 0:
        return "still air"
    from dropcalc.physics.wind import terrain

    profiles = {"uniform": "uniform with height", "power": "power law", "log": "log law"}
    profile = terrain(wind.terrain_key).label if wind.terrain_key else profiles[wind.profile]
    direction = (
        "direction not given: each edge checked with the wind blowing straight out from it"
        if outward
        else f"from {wind.from_direction_deg:.0f}°"
    )
    return (
        f"{wind.speed_10m:g} m/s {wind.kind} at 10 m (gust {_gust(scenario):.3g} m/s), "
        f"{profile}; {direction}"
    )


def _gust(scenario: Scenario) -> float:
    wind = scenario.wind
    if wind.speed_10m == 0:
        return 0.0
    return wind.speed_10m if wind.kind == "gust" else wind.gust_speed_10m()


def _figures(
    scenario: Scenario,
    objects: list[Any],
    rows: list[dict[str, Any]],
    folder: Path,
    height: float,
    drivers: list[str],
) -> dict[str, Path]:
    """Side view and energy-against-height figures for the objects that matter most."""
    from dropcalc.analysis.fall import wind_field
    from dropcalc.physics.drag import drag_parameter
    from dropcalc.physics.release import initial_velocity
    from dropcalc.report.figures import EnergyCurve, SideViewCase, energy_height, side_view

    by_name = {o.name: o for o in objects}
    chosen: list[Any] = []
    # The objects that drive a zone first (the side view must show the drift it is about),
    # then the highest-energy ones.
    for name in drivers:
        if name in by_name and by_name[name] not in chosen:
            chosen.append(by_name[name])
    for row in rows[:FIGURE_OBJECTS]:
        obj = by_name.get(str(row.get("label") or row.get("name")))
        if obj is not None and obj not in chosen:
            chosen.append(obj)
    area = scenario.work_areas[0]
    azimuth = 90.0
    v0 = np.asarray(initial_velocity(area.release, azimuth, scenario.gravity), dtype=float)
    wind = scenario.wind
    speeds = [wind.speed_10m] + (
        [_gust(scenario)] if wind.kind == "mean" and wind.speed_10m else []
    )
    outward = replace(wind, from_direction_deg=(azimuth + 180.0) % 360.0)
    cases = []
    for obj in chosen[:4]:
        for bound, area_m2 in (("min", obj.drag_area_min), ("max", obj.drag_area_max)):
            k = float(drag_parameter(scenario.air.density, area_m2, obj.mass))
            for speed in speeds:
                kind = wind.kind if speed == wind.speed_10m else "gust"
                cases.append(
                    SideViewCase(
                        label=f"{obj.name}, Cd·A {bound}, {kind} {speed:.3g} m/s",
                        release_height=height,
                        initial_velocity=v0,
                        drag_parameter=k,
                        gravity=scenario.gravity,
                        wind=wind_field(outward, np.array([speed])),
                        style_key=(obj.name, bound, kind),
                        edge_azimuth=azimuth,
                    )
                )
    figures: dict[str, Path] = {}
    side = folder / "side-view.png"
    side_view(side, cases, height, title="Falls from the highest edge, wind straight out")
    figures["side_view"] = side
    curves = [
        EnergyCurve(
            label=obj.name,
            mass=obj.mass,
            drag_parameter=float(drag_parameter(scenario.air.density, obj.drag_area_min, obj.mass)),
            gravity=scenario.gravity,
            wind=None,
            initial_velocity=np.zeros(3),
        )
        for obj in chosen
    ]
    levels = [(lv.label, lv.value) for lv in scenario.levels if lv.quantity == "energy"]
    energy = folder / "energy-height.png"
    energy_height(
        energy, curves, levels, max(2.0 * height, 10.0),
        title="Impact energy against release height (still air, smallest Cd·A)",
    )  # fmt: skip
    figures["energy_height"] = energy
    return figures


def summary_json(results: ScenarioResults, pdf: Path) -> dict[str, Any]:
    """The ``--json`` summary of a report run."""
    return {
        "pdf": str(pdf),
        "scenario": results.report.scenario_name,
        "scenario_sha256": results.report.scenario_sha256,
        "confidence": results.report.confidence,
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
                "margin_m": a.margin_m,
            }
            for a in results.report.work_areas
        ],
        "highest_energy_object": (
            results.rows[0].get("label")
            if results.rows and not results.rows[0].get("error")
            else None
        ),
        "highest_impact_energy_j": results.rows[0].get("impact_energy_max_j")
        if results.rows
        else None,
        "objects": len(results.rows),
        "controls": [
            {"item": item, "control": control} for item, control in results.report.controls
        ],
    }


def _finite(value: float) -> float | None:
    return value if value is not None and math.isfinite(value) else None
