"""From a computed job to the report's data: the figures drawn, the numbers put in words.

The numbers come from :func:`dropcalc.analysis.job.run_job` (the zones of
:func:`dropcalc.analysis.zone.site_zone`, the rows of :func:`dropcalc.analysis.batch.solve_items`),
the same functions as ``dropcalc zone`` and ``dropcalc batch``, so the PDF agrees with their JSON
for the same inputs. Nothing is computed here that a JSON output or a page would need.
"""

from __future__ import annotations

import datetime as _dt
import math
from pathlib import Path
from typing import Any

import numpy as np

from dropcalc import __version__
from dropcalc.analysis.job import SIDE_VIEW_AZIMUTH, SIDE_VIEW_OBJECTS, JobResult
from dropcalc.report.data import JobInfo, ReportData, WorkAreaResult
from dropcalc.texts import keep_clear


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


def _after_landing_row(name: str, zone: Any) -> tuple[str, str]:
    """How much of a work area's radius rests on the after-landing inputs, in words."""
    d = zone.driver
    material = d.obj.material_class
    labels = {
        "restitution": "restitution",
        "friction": "friction",
        "rolling_resistance": "rolling resistance",
        "fragment_speed": "fragment speed",
    }
    parts = [
        f"{labels[row.parameter]} {row.low:.2g}/{row.high:.2g}: "
        f"{row.radius_low:.3g}/{row.radius_high:.3g} m"
        for row in d.sensitivity
        if row.parameter != "all"
    ]
    every = [row for row in d.sensitivity if row.parameter == "all"]
    text = f"{d.obj.name} ({material.label}): radius {zone.radius:.3g} m"
    if every:
        text += (
            f"; {every[0].radius_low:.3g} m with every after-landing input at its short end, "
            f"{every[0].radius_high:.3g} m at its long end"
        )
    if parts:
        text += " (" + "; ".join(parts) + ")"
    return (f"Bounce and slide, {name}", text)


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
                "covered walkway inside H/4. Leaves out: the rule uses the height only, not the "
                f"wind (drift {area.drift_m:.3g} m here), the bounce and slide after landing "
                f"(scatter {area.scatter_m:.3g} m) or the object.",
                f"H = {h:.3g} m: H/2 = {h / 2:.3g} m, H/4 = {h / 4:.3g} m ({computed})",
                "International Building Code, Table 3306.1",
            )
        )
    rules.append(
        (
            "Materials kept back from a roof edge without guardrails. Leaves out: the ground "
            "below; it is a distance on the roof, not an exclusion zone.",
            "6 ft (1.83 m) from the edge, on the roof",
            "29 CFR 1926.502(j)(7)",
        )
    )
    rules.append(
        (
            "Danger areas / exclusion zones required. Leaves out: any distance; the assessment "
            "(this report) sizes them.",
            "the assessment must size them",
            "UK Work at Height Regulations 2005 regs 10-11; model WHS Regulations r.54-55",
        )
    )
    return rules


def build_report(job: JobResult, figure_dir: Path) -> ReportData:
    """Turn a job's results into the report's data, drawing its figures into ``figure_dir``.

    Parameters
    ----------
    job : JobResult
        The computed job (:func:`dropcalc.analysis.job.run_job`).
    figure_dir : Path
        Folder for the figure files (PNG), created if missing.

    Returns
    -------
    ReportData
        Everything the PDF shows (:func:`dropcalc.report.pdf.write_report` lays it out).
    """
    from dropcalc.physics.release import describe
    from dropcalc.present.plan_plot import REPORT_FIGURE_SIZE, plot_plan
    from dropcalc.present.text import zone_statement

    figure_dir.mkdir(parents=True, exist_ok=True)
    scenario = job.scenario
    wind = scenario.wind
    label = (
        "still air"
        if wind.speed_10m == 0
        else f"{wind.speed_10m:.3g} m/s {wind.kind}"
        + ("\nassumed out from\neach edge" if job.wind_outward else "")
    )
    areas: list[WorkAreaResult] = []
    for index, area in enumerate(job.work_areas, start=1):
        plan_png = figure_dir / f"plan-{index}.png"
        plot_plan(
            area.zone.area, area.site, job.wind_toward_deg, plan_png,
            title=area.name, wind_label=label, size=REPORT_FIGURE_SIZE,
        )  # fmt: skip
        areas.append(
            WorkAreaResult(
                name=area.name,
                release=describe(area.release, scenario.gravity),
                heights_m=area.heights_m,
                radius_m=area.radius_m,
                worst_case_radius_m=area.worst_case_radius_m,
                area_m2=area.area_m2,
                max_distance_m=area.max_distance_m,
                driving_object=area.driving_object,
                driving_edge=area.driving_edge,
                drift_m=area.drift_m,
                scatter_m=area.scatter_m,
                margin_m=scenario.margin,
                standard_error_m=area.standard_error_m,
                driver_warnings=area.driver_warnings,
                beyond_building_m2=area.zone.area.beyond_building_m2,
                clear_distance_m=area.clear_distance_m,
                stop_work_wind_m_s=area.stop_work_wind_m_s,
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
                    for name, segment, zone in area.zone.segments
                ],
                object_radii=dict(area.object_radii),
                plan_png=plan_png,
            )
        )

    figures = draw_figures(job, figure_dir)
    air = scenario.air
    info = scenario.job
    return ReportData(
        job=JobInfo(
            title=info.get("title", ""),
            site=info.get("site", ""),
            client=info.get("client", ""),
            reference=info.get("reference", ""),
            prepared_by=info.get("prepared_by", ""),
            checked_by=info.get("checked_by", ""),
            revision=info.get("revision", ""),
            date=info.get("date", _dt.date.today().isoformat()),
        ),
        scenario_name=scenario.path.name,
        scenario_sha256=scenario.sha256,
        software_version=__version__,
        generated=_dt.datetime.now(_dt.UTC).strftime("%Y-%m-%d %H:%M UTC"),
        confidence=scenario.confidence,
        wind_text=_wind_text(job),
        air_text=f"{air.density:.4g} kg/m³ ({air.basis}); g = {scenario.gravity:.4g} m/s²",
        ground_text=scenario.ground.label,
        inputs=[
            ("Wind profile", wind.describe().split("; ", 1)[-1]),
            ("Wind measured", scenario.wind_basis or "still air"),
            ("Gust used for the worst case", f"{job.gust_speed_10m:.3g} m/s at 10 m"),
            ("Gravity", f"{scenario.gravity:.4g} m/s²"),
            ("Margin added", f"{scenario.margin:.3g} m"),
            (
                "After landing",
                "first contact as a rigid-body impact with friction at a random orientation; "
                f"ground slope {scenario.ground_slope:g}° (taken to fall away from the edge)",
            ),
            *(_after_landing_row(area.name, area.zone.driver[2]) for area in job.work_areas),
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
        object_rows=job.object_rows,
        object_table_height_m=job.object_table_height_m,
        levels=[
            (
                level.key,
                level.label,
                level.value if level.quantity == "energy" else level.value / 1e4,
                "J" if level.quantity == "energy" else "J/cm²",
            )
            for level in scenario.levels
        ],
        controls=list(job.controls),
        code_rules=_code_rules(areas),
        figures=figures,
        texts={
            name: load_text(f"{name}.md", scenario.path.parent)
            for name in ("cautions", "method", "signoff")
        },
        warnings=list(job.warnings),
    )


def _wind_text(job: JobResult) -> str:
    """The wind in a few words: speed, kind, gust, profile and direction."""
    wind = job.scenario.wind
    if wind.speed_10m == 0:
        return "still air"
    from dropcalc.physics.wind import compass_point, terrain

    profiles = {"uniform": "uniform with height", "power": "power law", "log": "log law"}
    profile = terrain(wind.terrain_key).label if wind.terrain_key else profiles[wind.profile]
    direction = (
        "direction not given: each edge checked with the wind blowing straight out from it"
        if job.wind_outward
        else f"from {wind.from_direction_deg:.0f}° ({compass_point(wind.from_direction_deg)})"
    )
    return (
        f"{wind.speed_10m:.3g} m/s {wind.kind} at 10 m (gust {job.gust_speed_10m:.3g} m/s), "
        f"{profile}; {direction}"
    )


def _plate_cases(obj: Any, inputs: Any, height: float, density: float, gravity: float) -> list[Any]:
    """Side-view paths of a sheet at its highest-energy and longest-drift attitudes."""
    from dropcalc.analysis.fall import wind_field
    from dropcalc.analysis.plate_flight import bounding_attitudes
    from dropcalc.report.figures import PlateFlight, SideViewCase

    cases = []
    velocity = np.asarray(inputs.initial_velocity, dtype=float).reshape(3)
    for kind, speed in inputs.wind_speeds:
        attitudes = bounding_attitudes(
            obj.plate, obj.mass, height, density, inputs.side_wind, speed, SIDE_VIEW_AZIMUTH,
            velocity, gravity,
        )  # fmt: skip
        for (chord, span, pitch, spin), bound in zip(attitudes, ("min", "max"), strict=True):
            cases.append(
                SideViewCase(
                    label=f"{obj.name}, attitude {bound}, {kind} {speed:.3g} m/s",
                    release_height=height,
                    initial_velocity=tuple(velocity),
                    drag_parameter=0.0,
                    gravity=gravity,
                    wind=wind_field(inputs.side_wind, np.array([speed])),
                    style_key=(obj.name, bound, kind),
                    edge_azimuth=SIDE_VIEW_AZIMUTH,
                    plate=PlateFlight(obj.mass, chord, span, obj.plate[2], density, pitch, spin),
                )
            )
    return cases


def draw_figures(job: JobResult, folder: Path, image_format: str = "png") -> dict[str, Path]:
    """Side view and energy-against-height figures for the objects that matter most.

    Parameters
    ----------
    job : JobResult
        The computed job; its :attr:`~dropcalc.analysis.job.JobResult.figures` say what to draw.
    folder : Path
        Folder the files are written to (it must exist).
    image_format : {"png", "svg"}
        PNG for the PDF report, SVG for the page (the same drawing either way).

    Returns
    -------
    dict of str -> Path
        ``"side_view"`` and ``"energy_height"``.
    """
    from dropcalc.analysis.fall import wind_field
    from dropcalc.physics.drag import drag_parameter
    from dropcalc.report.figures import EnergyCurve, SideViewCase, energy_height, side_view

    scenario = job.scenario
    inputs = job.figures
    height = inputs.release_height_m
    density = scenario.air.density
    cases = []
    for obj in inputs.objects[:SIDE_VIEW_OBJECTS]:
        if obj.plate is not None:  # a sheet: drawn at its two bounding attitudes
            cases.extend(_plate_cases(obj, inputs, height, density, scenario.gravity))
            continue
        for bound, area_m2 in (("min", obj.drag_area_min), ("max", obj.drag_area_max)):
            k = float(drag_parameter(density, area_m2, obj.mass))
            for kind, speed in inputs.wind_speeds:
                cases.append(
                    SideViewCase(
                        label=f"{obj.name}, Cd·A {bound}, {kind} {speed:.3g} m/s",
                        release_height=height,
                        initial_velocity=inputs.initial_velocity,
                        drag_parameter=k,
                        gravity=scenario.gravity,
                        wind=wind_field(inputs.side_wind, np.array([speed])),
                        style_key=(obj.name, bound, kind),
                        edge_azimuth=SIDE_VIEW_AZIMUTH,
                    )
                )
    figures: dict[str, Path] = {}
    side = folder / f"side-view.{image_format}"
    wind = scenario.wind
    if wind.speed_10m == 0:
        side_title = "Falls from the highest edge, still air"
    elif job.wind_outward:
        side_title = "Falls from the highest edge, wind straight out (no direction given)"
    else:  # the day's direction is in the conditions; the side view turns it outward
        side_title = "Falls from the highest edge, wind turned straight out (worst case)"
    side_view(side, cases, height, title=side_title)
    figures["side_view"] = side
    curves = [
        EnergyCurve(
            label=obj.name,
            mass=obj.mass,
            drag_parameter=float(drag_parameter(density, obj.drag_area_min, obj.mass)),
            gravity=scenario.gravity,
            wind=None,
            initial_velocity=(0.0, 0.0, 0.0),
        )
        for obj in inputs.objects
    ]
    levels = [(lv.label, lv.value) for lv in scenario.levels if lv.quantity == "energy"]
    energy = folder / f"energy-height.{image_format}"
    energy_height(
        energy, curves, levels, max(2.0 * height, 10.0),
        title="Impact energy against release height (still air, smallest Cd·A)",
    )  # fmt: skip
    figures["energy_height"] = energy
    return figures
