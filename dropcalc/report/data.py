"""Everything the PDF report shows, computed before a single page is drawn.

The report writer only lays out what is here; the numbers come from the same functions as the
``zone`` and ``batch`` commands, so the PDF and their JSON agree.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path
from typing import Any


@dataclass(frozen=True)
class JobInfo:
    """Who and what the report is for (user text: escape before putting it in markup)."""

    title: str
    site: str
    client: str = ""
    reference: str = ""
    prepared_by: str = ""
    checked_by: str = ""
    revision: str = ""
    date: str = ""


@dataclass(frozen=True)
class WorkAreaResult:
    """One work area: its zone on the plan and the figures that go with it.

    Attributes
    ----------
    name : str
        Work area name (user text).
    release : str
        How objects leave the edge, in words.
    heights_m : tuple of float
        Release heights of its edges. [m]
    radius_m, worst_case_radius_m, area_m2, max_distance_m : float
        Exclusion distance at the confidence, envelope distance, area on the plan and its
        reach from the nearest work edge. [m], [m], [m^2], [m]
    driving_object : str
        The object that needs the widest zone.
    driving_edge : str
        The edge segment with the widest zone.
    drift_m, scatter_m, margin_m, standard_error_m : float
        Parts of the radius and its Monte Carlo standard error. [m]
    segments : list of dict
        Per segment: edge, segment, radius_m, worst_case_radius_m, height_m, edge_azimuth_deg.
    object_radii : dict
        Object name -> its own radius at the confidence (widest segment). [m]
    plan_png : Path
        The plan drawing (outline, work edges, area, wind, north arrow, scale bar).
    driver_warnings : tuple of str
        The warnings the driving object carries in the object table (sheets that glide, items
        carried away, anything outside the model); page 1 shows them beside the distance.
    beyond_building_m2 : float
        Part of ``area_m2`` reached from the work edges only over or around the building
        (:func:`dropcalc.analysis.plan.beyond_building`). [m^2]
    clear_distance_m, stop_work_wind_m_s : float or None
        The clear distance the scenario gives for the area and the highest mean wind at 10 m
        in which the zone stays within it (0: too small even in still air). [m], [m/s]
    """

    name: str
    release: str
    heights_m: tuple[float, ...]
    radius_m: float
    worst_case_radius_m: float
    area_m2: float
    max_distance_m: float
    driving_object: str
    driving_edge: str
    drift_m: float
    scatter_m: float
    margin_m: float
    standard_error_m: float
    segments: list[dict[str, Any]]
    object_radii: dict[str, float]
    plan_png: Path
    driver_warnings: tuple[str, ...] = ()
    beyond_building_m2: float = 0.0
    clear_distance_m: float | None = None
    stop_work_wind_m_s: float | None = None


@dataclass(frozen=True)
class ReportData:
    """The whole report.

    Attributes
    ----------
    job : JobInfo
    scenario_name : str
        File name of the scenario.
    scenario_sha256 : str
        SHA-256 of the scenario file's bytes (hex), printed on every page.
    software_version : str
    generated : str
        Date and time the report was made (ISO 8601, UTC).
    confidence : float
        Share of simulated drops the radius contains.
    wind_text, air_text, ground_text : str
        The conditions, in words, with units.
    inputs : list of (label, value)
        Inputs and assumptions table.
    work_areas : list of WorkAreaResult
    object_rows : list of dict
        Batch rows (keys as ``dropcalc batch --json``), highest energy first, computed at
        ``object_table_height_m``; each has ``zone_radius_m`` added (its own radius in the widest
        work area).
    object_table_height_m : float
        Release height used for the object table (the highest work edge). [m]
    levels : list of (key, label, value, unit)
        Reference levels shown (unit "J" or "J/cm²").
    controls : list of (item, controls)
        Every item (highest energy first) with every control rule that applies to it.
    code_rules : list of (rule, distance_text, source)
        Distances from code rules, shown beside the computed zone for comparison.
    figures : dict of str -> Path
        "side_view" (trajectories from the edge to the ground: both drag bounds, mean and gust
        wind) and "energy_height" (impact energy against release height per object with the
        reference levels as labelled lines); PNG files.
    texts : dict of str -> str
        Text blocks from ``templates/`` (user-overridable): "cautions", "method", "signoff".
    warnings : list of str
        Glide, windborne and other warnings to show on page 1.
    """

    job: JobInfo
    scenario_name: str
    scenario_sha256: str
    software_version: str
    generated: str
    confidence: float
    wind_text: str
    air_text: str
    ground_text: str
    inputs: list[tuple[str, str]]
    work_areas: list[WorkAreaResult]
    object_rows: list[dict[str, Any]]
    object_table_height_m: float
    levels: list[tuple[str, str, float, str]]
    controls: list[tuple[str, tuple[str, ...]]]
    code_rules: list[tuple[str, str, str]]
    figures: dict[str, Path] = field(default_factory=dict)
    texts: dict[str, str] = field(default_factory=dict)
    warnings: list[str] = field(default_factory=list)
