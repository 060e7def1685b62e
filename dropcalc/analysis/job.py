"""One job, end to end: a scenario in, every number a report, the CLI or a web page needs out.

:func:`run_job` is the one pipeline over a loaded scenario (:func:`dropcalc.io.scenario.
load_scenario`). For every work area it runs the site zone (a Monte Carlo per edge segment,
:func:`dropcalc.analysis.zone.site_zone`); for the object list it runs the batch checks
(:func:`dropcalc.analysis.batch.solve_items`) from every work area and keeps each item where it
strikes hardest; then it collects the controls, the warnings and the inputs the figures are
drawn from. It draws nothing and writes nothing: ``dropcalc report`` and ``dropcalc demo`` turn
the :class:`JobResult` into a PDF (:mod:`dropcalc.report.build`), and the same result can be
shown on a page or written as JSON.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Mapping
from dataclasses import dataclass, replace
from typing import TYPE_CHECKING, Any

import numpy as np

from dropcalc.model.conditions import Conditions, opposite_azimuth

if TYPE_CHECKING:
    from dropcalc.analysis.plan import Site
    from dropcalc.analysis.zone import SiteZone, ZoneObject
    from dropcalc.io.scenario import Scenario
    from dropcalc.physics.release import Release
    from dropcalc.physics.wind import WindSpec

#: How many objects the figures show at most besides the zone-driving ones (the highest-energy).
FIGURE_OBJECTS = 5
#: How many objects the side view draws at most (each with both drag bounds and each wind).
SIDE_VIEW_OBJECTS = 4
#: Direction the side view's edge faces: east (the wind blows straight out from it). [deg]
SIDE_VIEW_AZIMUTH = 90.0


@dataclass(frozen=True)
class WorkAreaJob:
    """One work area's exclusion zone and the figures of it that a report quotes.

    Attributes
    ----------
    name : str
        Work area name (user text).
    release : Release
        How objects leave this area's edges.
    site : Site
        The plan: the shared outline and this area's work edges.
    heights_m : tuple of float
        Release heights of its edges. [m]
    zone : SiteZone
        Per-segment zones and their union on the plan (:func:`dropcalc.analysis.zone.site_zone`).
    radius_m, worst_case_radius_m : float
        Exclusion distance at the confidence (margin included; ``inf`` when objects are carried
        away) and the envelope distance. [m]
    area_m2, max_distance_m : float
        Area of the exclusion zone on the plan and its reach from the nearest work edge.
        [m^2], [m]
    driving_object, driving_edge : str
        The object and the edge whose segment needs the widest zone.
    drift_m, scatter_m, standard_error_m : float
        Parts of ``radius_m`` for the driving object (air drift, scatter after landing) and its
        Monte Carlo standard error. [m]
    object_radii : Mapping of str to float
        Object name -> its own radius at the confidence (widest segment). [m]
    geojson : dict or None
        The zone as a GeoJSON feature collection (WGS84) when the scenario gives the site's
        origin; None otherwise.
    driver_warnings : tuple of str
        The warnings the driving object carries in the object table (a sheet that glides, an
        item carried away, anything outside the model): the distance may be too small for it.
    clear_distance_m : float or None
        The clear distance the scenario says is available from this area's edges (its
        ``clear_distance``), None when not given. [m]
    stop_work_wind_m_s : float or None
        With ``clear_distance_m``: the highest mean wind at 10 m in which the zone at the
        highest edge stays within it (:func:`dropcalc.analysis.zone.highest_wind`; 0 when
        even still air needs more). [m/s]
    """

    name: str
    release: Release
    site: Site
    heights_m: tuple[float, ...]
    zone: SiteZone
    radius_m: float
    worst_case_radius_m: float
    area_m2: float
    max_distance_m: float
    driving_object: str
    driving_edge: str
    drift_m: float
    scatter_m: float
    standard_error_m: float
    object_radii: Mapping[str, float]
    geojson: dict[str, Any] | None
    driver_warnings: tuple[str, ...] = ()
    clear_distance_m: float | None = None
    stop_work_wind_m_s: float | None = None


@dataclass(frozen=True)
class FigureInputs:
    """What the side-view and energy-against-height figures are computed from (no drawing).

    Attributes
    ----------
    objects : tuple of ZoneObject
        The objects to show: those driving a zone first, then the highest-energy ones.
        The side view takes the first :data:`SIDE_VIEW_OBJECTS`, the energy figure all.
    release_height_m : float
        Height of the highest work edge. [m]
    initial_velocity : numpy.ndarray
        Release velocity (east, north, up) of the first work area's release from an edge facing
        :data:`SIDE_VIEW_AZIMUTH`. [m/s]
    wind_speeds : tuple of (str, float)
        The winds drawn: (kind, speed at 10 m), the wind of the day and, for a mean wind, its
        gust. [m/s]
    side_wind : WindSpec
        The wind of the day turned to blow straight out from the side view's edge.
    """

    objects: tuple[ZoneObject, ...]
    release_height_m: float
    initial_velocity: np.ndarray
    wind_speeds: tuple[tuple[str, float], ...]
    side_wind: WindSpec


@dataclass(frozen=True)
class JobResult:
    """Everything computed for a scenario; the input of every output (PDF, JSON, page).

    Attributes
    ----------
    scenario : Scenario
        The scenario the job ran (its inputs, as loaded and checked).
    objects : tuple of ZoneObject
        The scenario's items as zone objects (quantity, glide and roll flags included).
    work_areas : tuple of WorkAreaJob
        One per work area, in scenario order.
    object_rows : list of dict
        The object table: batch rows (keys as ``dropcalc batch --json``), highest energy first,
        each item from the work area where it strikes hardest (named in ``work_area``) and with
        ``zone_radius_m`` (its own radius in the widest work area).
    object_table_height_m : float
        The highest work edge. [m]
    controls : tuple of (str, tuple of str)
        (item, controls) for every item of the object table, in its order: every control rule
        that applies to the item (:func:`dropcalc.model.policy.suggest_controls`).
    warnings : tuple of str
        Glide and windborne warnings, in words.
    wind_outward : bool
        True when the scenario gives no wind direction and every edge is checked with the wind
        blowing straight out from it.
    wind_toward_deg : float or None
        Direction the wind blows toward (clockwise from north), None with ``wind_outward``. [deg]
    gust_speed_10m : float
        The gust used for the worst case, at 10 m (0 in still air). [m/s]
    figures : FigureInputs
        Inputs of the side-view and energy figures.
    """

    scenario: Scenario
    objects: tuple[ZoneObject, ...]
    work_areas: tuple[WorkAreaJob, ...]
    object_rows: list[dict[str, Any]]
    object_table_height_m: float
    controls: tuple[tuple[str, tuple[str, ...]], ...]
    warnings: tuple[str, ...]
    wind_outward: bool
    wind_toward_deg: float | None
    gust_speed_10m: float
    figures: FigureInputs

    @property
    def highest_energy_row(self) -> dict[str, Any] | None:
        """The object table's first good row (highest impact energy), or None."""
        rows = self.object_rows
        return rows[0] if rows and not rows[0].get("error") else None


def run_job(scenario: Scenario, progress: Callable[[int, int], None] | None = None) -> JobResult:
    """Run a scenario: every work area's zone, the object table, controls and warnings.

    Parameters
    ----------
    scenario : Scenario
        A loaded, checked scenario (:func:`dropcalc.io.scenario.load_scenario`).
    progress : callable, optional
        ``progress(done, total)``, called by each segment's Monte Carlo as samples are solved
        (the CLI draws a bar with it). None for no progress reports.

    Returns
    -------
    JobResult
        All numbers and the figure inputs; nothing drawn or written. The same scenario and seed
        give the same result.

    Notes
    -----
    The zones come from :func:`dropcalc.analysis.zone.site_zone` and the object rows from
    :func:`dropcalc.analysis.batch.solve_items`, the functions behind ``dropcalc zone --site``
    and ``dropcalc batch``, so a report agrees with their JSON for the same inputs.
    """
    from dropcalc.analysis.batch import sort_rows
    from dropcalc.analysis.plan import to_geojson
    from dropcalc.analysis.zone import site_zone, zone_objects_from_items

    objects = tuple(zone_objects_from_items(scenario.items, scenario.library))
    outward = not scenario.wind_from_given
    areas: list[WorkAreaJob] = []
    for area in scenario.work_areas:
        settings = zone_settings(scenario, area)
        result = site_zone(objects, settings, area.site, progress, wind_outward=outward)
        stop_wind = None
        if area.clear_distance is not None:
            from dropcalc.analysis.zone import highest_wind

            driving = result.driver[2].settings
            stop_wind = highest_wind(objects, driving, area.clear_distance)
        driver = result.driver[2].driver
        radii: dict[str, float] = {}
        for _, _, zone in result.segments:
            for object_zone in zone.objects:
                name = object_zone.obj.name
                radii[name] = max(radii.get(name, 0.0), object_zone.radius)
        geojson = None
        if scenario.origin is not None:
            geojson = to_geojson(
                result.area, area.site, scenario.origin[0], scenario.origin[1],
                {"work_area": area.name, "radius_m": result.radius,
                 "worst_case_radius_m": result.worst_case, "confidence": scenario.confidence},
            )  # fmt: skip
        areas.append(
            WorkAreaJob(
                name=area.name,
                release=area.release,
                site=area.site,
                heights_m=tuple(edge.height for edge in area.site.edges),
                zone=result,
                radius_m=result.radius,
                worst_case_radius_m=result.worst_case,
                area_m2=result.area.area_m2,
                max_distance_m=result.area.max_distance_m,
                driving_object=driver.obj.name,
                driving_edge=result.driver[0],
                drift_m=driver.drift,
                scatter_m=driver.scatter,
                standard_error_m=driver.standard_error,
                object_radii=radii,
                geojson=geojson,
                clear_distance_m=area.clear_distance,
                stop_work_wind_m_s=stop_wind,
            )
        )

    top_height = max(edge.height for a in scenario.work_areas for edge in a.site.edges)
    rows = sort_rows(_object_rows(scenario))
    for row in rows:
        label = str(row.get("label") or row.get("name"))
        row["zone_radius_m"] = max((a.object_radii.get(label, 0.0) for a in areas), default=None)
    controls = tuple((row_name(row), _row_controls(row, scenario.rules)) for row in rows)
    areas = [replace(a, driver_warnings=_row_warnings(rows, a.driving_object)) for a in areas]
    return JobResult(
        scenario=scenario,
        objects=objects,
        work_areas=tuple(areas),
        object_rows=rows,
        object_table_height_m=top_height,
        controls=controls,
        warnings=_warnings(rows) + _wind_warnings(scenario),
        wind_outward=outward,
        wind_toward_deg=None
        if outward
        else float(opposite_azimuth(scenario.wind.from_direction_deg)),
        gust_speed_10m=gust_speed(scenario.wind),
        figures=_figure_inputs(
            scenario, objects, rows, top_height, [a.driving_object for a in areas]
        ),
    )


def zone_settings(scenario: Scenario, area: Any) -> Any:
    """The zone settings of one work area: its highest edge and release, the scenario's rest."""
    from dropcalc.analysis.zone import ZoneSettings

    return ZoneSettings(
        height=max(edge.height for edge in area.site.edges),
        conditions=Conditions(scenario.air, scenario.wind, scenario.gravity, area.release),
        ground=scenario.ground,
        ground_slope=scenario.ground_slope,
        confidence=scenario.confidence,
        margin=scenario.margin,
        relative_error=scenario.precision,
        seed=scenario.seed,
    )


def gust_speed(wind: WindSpec) -> float:
    """The gust used for the worst case at 10 m [m/s]: the given speed if it is a gust."""
    if wind.speed_10m == 0:
        return 0.0
    return float(wind.speed_10m if wind.kind == "gust" else wind.gust_speed_10m())


def _object_rows(scenario: Scenario) -> list[dict[str, Any]]:
    """The object table: each item where it strikes hardest.

    Every item is solved from every work area (from the area's highest edge, unless the item
    list gives the item its own height, with the area's release, pushed or thrown along the
    wind); the row of the area that gives the highest impact energy (smallest drag area) is
    kept, with that area's name in ``work_area``. With one work area this is simply that area.
    """
    from dropcalc.analysis.batch import BatchSettings, solve_items

    toward = float(opposite_azimuth(scenario.wind.from_direction_deg))
    best: list[dict[str, Any] | None] = [None] * len(scenario.items)
    for area in scenario.work_areas:
        height = max(edge.height for edge in area.site.edges)
        settings = BatchSettings(
            height=height,
            conditions=Conditions(
                scenario.air, scenario.wind, scenario.gravity, area.release, toward
            ),
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


def _row_warnings(rows: list[dict[str, Any]], name: str) -> tuple[str, ...]:
    """The warnings of the object-table row of one object (by label or name).

    The row's own warnings, and for a sheet or plate flown by the plate model the wind at
    which it lifts off when lying flat on a roof (a sheet left loose leaves the roof itself).
    """
    for row in rows:
        if name in (row.get("label"), row.get("name")):
            text = str(row.get("warnings") or "")
            out = [w.strip() for w in text.split(";") if w.strip()]
            if row.get("glides") and row.get("flight_model") == "plate":
                lift_off = row.get("lift_off_speed_m_s")
                if lift_off:
                    out.append(
                        f"lying flat on a roof it lifts off above about {lift_off:.0f} m/s at "
                        "roof level (gust)"
                    )
            return tuple(out)
    return ()


def row_name(row: dict[str, Any]) -> str:
    """The name of an item in tables: its label, else its library id, else its row number."""
    return str(row.get("label") or row.get("id") or f"row {row.get('row')}")


def _row_controls(row: dict[str, Any], rules: Any) -> tuple[str, ...]:
    """Every control rule that applies to one object row (see :mod:`dropcalc.model.policy`)."""
    from dropcalc.model.policy import DEFAULT_RULES, suggest_controls

    epa = row.get("energy_per_contact_area_j_cm2")
    return suggest_controls(
        rules or DEFAULT_RULES,
        max(_energy(row), 0.0),
        None if epa is None else float(epa) * 1e4,
        float(row.get("mass_kg") or 0.0),
        bool(row.get("glides")),
    )


def _energy(row: dict[str, Any] | None) -> float:
    value = None if row is None else row.get("impact_energy_max_j")
    return float(value) if isinstance(value, (int, float)) and math.isfinite(value) else -math.inf


def _wind_warnings(scenario: Scenario) -> tuple[str, ...]:
    """A warning when the wind has no terrain (the same speed at every height)."""
    if scenario.wind.speed_10m > 0 and scenario.wind.profile == "uniform":
        return (
            "No terrain given for the wind: the same speed is taken at every height, while over "
            "real ground it grows with height. Give wind.terrain (an EN 1991-1-4 category) and "
            'say where the speed was measured (wind.measured = "open-country" for a forecast).',
        )
    return ()


def _warnings(rows: list[dict[str, Any]]) -> tuple[str, ...]:
    """Glide and windborne warnings for the object table's rows."""
    warnings = []
    gliders = [
        str(row.get("label"))
        for row in rows
        if row.get("glides") and row.get("flight_model") != "plate"
    ]
    if gliders:  # flat objects the plate model does not cover (discs, given drag areas)
        warnings.append(
            f"Sheets and plates ({', '.join(gliders)}) can glide far downwind: the computed "
            "zone is not conservative for them. Secure them against wind before work starts."
        )
    for row in rows:  # thin sheets only: a loose thick slab is not what blows off a roof
        lift_off = row.get("lift_off_speed_m_s")
        if lift_off and row.get("glides"):
            warnings.append(
                f"{row.get('label')}: lying flat on a roof it lifts off above about "
                f"{lift_off:.0f} m/s at roof level (gust): weigh it down or store it flat."
            )
    windborne = [str(row.get("label")) for row in rows if "windborne" in str(row.get("warnings"))]
    if windborne:
        warnings.append(
            f"Windborne in this wind (terminal speed below the wind speed): {', '.join(windborne)}."
        )
    return tuple(warnings)


def _figure_inputs(
    scenario: Scenario,
    objects: tuple[ZoneObject, ...],
    rows: list[dict[str, Any]],
    height: float,
    drivers: list[str],
) -> FigureInputs:
    """The objects that matter most and the release and winds the figures show them in."""
    from dropcalc.physics.release import initial_velocity

    by_name = {o.name: o for o in objects}
    chosen: list[ZoneObject] = []
    # The objects that drive a zone first (the side view must show the drift it is about),
    # then the highest-energy ones.
    for name in drivers:
        if name in by_name and by_name[name] not in chosen:
            chosen.append(by_name[name])
    for row in rows[:FIGURE_OBJECTS]:
        obj = by_name.get(str(row.get("label") or row.get("name")))
        if obj is not None and obj not in chosen:
            chosen.append(obj)
    release = scenario.work_areas[0].release
    v0 = np.asarray(initial_velocity(release, SIDE_VIEW_AZIMUTH, scenario.gravity), dtype=float)
    wind = scenario.wind
    speeds = [(wind.kind, wind.speed_10m)]
    if wind.kind == "mean" and wind.speed_10m:
        speeds.append(("gust", gust_speed(wind)))
    return FigureInputs(
        objects=tuple(chosen),
        release_height_m=height,
        initial_velocity=v0,
        wind_speeds=tuple(speeds),
        side_wind=replace(wind, from_direction_deg=float(opposite_azimuth(SIDE_VIEW_AZIMUTH))),
    )
