"""One object, one release: the computation behind ``dropcalc fall``.

:class:`FallCase` holds validated inputs in SI units; :func:`solve_fall` runs the physics core
for the given wind and, when that wind is a mean speed, for its gust as well, and returns a
:class:`FallResult` whose :meth:`FallResult.to_json` is the stable JSON contract.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Any

import numpy as np

from dropcalc.errors import InputError, require_finite_positive, to_float
from dropcalc.model.limits import (  # re-exported for callers
    CARRIED_AWAY_DISTANCE,
    CONTACT_AREA_RANGE,
    DRAG_AREA_RANGE,
    GRAVITY_RANGE,
    MASS_RANGE,
    MAX_RELEASE_HEIGHT,
    MIN_RELEASE_HEIGHT,
)
from dropcalc.physics.atmosphere import AirState, air_state
from dropcalc.physics.drag import drag_parameter
from dropcalc.physics.impact import Impact, impact_from_solution
from dropcalc.physics.release import Release, describe, initial_velocity
from dropcalc.physics.trajectory import WindField, solve_falls
from dropcalc.physics.wind import WindSpec, wind_spec
from dropcalc.texts import CAUTION_SHORT


def _check_range(name: str, value: float, low: float, high: float, unit: str) -> float:
    v = to_float(name, value, unit)
    if not (math.isfinite(v) and low <= v <= high):
        raise InputError(
            f"{name} must be a finite value from {low:g} to {high:g} {unit}; got {v:g} {unit}"
        )
    return v


def check_object(
    mass: float,
    drag_area: float,
    height: float,
    contact_area: float | None = None,
    drag_area_max: float | None = None,
) -> None:
    """Raise InputError unless the object and release height are within the model's ranges.

    Parameters
    ----------
    mass : float
        [kg]
    drag_area : float
        Smallest (or only) drag area. [m^2]
    height : float
        Release height. [m]
    contact_area : float or None
        [m^2]
    drag_area_max : float or None
        Largest drag area, >= ``drag_area``. [m^2]
    """
    _check_range("mass", mass, *MASS_RANGE, "kg")
    _check_range("drag_area", drag_area, *DRAG_AREA_RANGE, "m²")
    require_finite_positive("height", height, "m")
    _check_range("height", height, MIN_RELEASE_HEIGHT, MAX_RELEASE_HEIGHT, "m")
    if drag_area_max is not None:
        _check_range("drag_area_max", drag_area_max, drag_area, DRAG_AREA_RANGE[1], "m²")
    if contact_area is not None:
        _check_range("contact_area", contact_area, *CONTACT_AREA_RANGE, "m²")


@dataclass(frozen=True)
class FallCase:
    """Validated inputs of one fall, SI units.

    Attributes
    ----------
    mass : float
        Mass of the object. [kg]
    drag_area : float
        Drag area C_d A of the object. [m^2]
    height : float
        Release height above the landing surface. [m]
    release : Release
        How the object leaves the edge.
    air : AirState
        Air density and its basis.
    wind : WindSpec
        Wind at 10 m, mean or gust, profile and direction.
    gravity : float
        Acceleration of gravity. [m/s^2]
    edge_azimuth : float
        Compass direction the edge faces (away from the structure). [deg]
    contact_area : float or None
        Area that strikes first, for energy per area. [m^2]
    drag_area_max : float or None
        Largest drag area of a tumbling object (longest drift); ``drag_area`` is then the
        smallest (highest impact energy). [m^2]
    object_id, object_name : str or None
        The library object, when the inputs came from it.
    glides : bool
        The object is a sheet or plate that can glide in wind.
    plate : tuple of float or None
        (length, width, thickness) [m] of a sheet flown by the plate model
        (:mod:`dropcalc.physics.plate`); None flies a point mass.
    """

    mass: float
    drag_area: float
    height: float
    release: Release = field(default_factory=Release)
    air: AirState = field(default_factory=air_state)
    wind: WindSpec = field(default_factory=lambda: wind_spec(0.0, from_direction=270.0))
    gravity: float = 9.80665
    edge_azimuth: float = 90.0
    contact_area: float | None = None
    drag_area_max: float | None = None
    object_id: str | None = None
    object_name: str | None = None
    glides: bool = False
    plate: tuple[float, float, float] | None = None

    def __post_init__(self) -> None:
        check_object(self.mass, self.drag_area, self.height, self.contact_area, self.drag_area_max)
        _check_range("gravity", self.gravity, *GRAVITY_RANGE, "m/s²")
        azimuth = to_float("edge_azimuth", self.edge_azimuth, "deg")
        if not math.isfinite(azimuth):
            raise InputError(f"edge_azimuth must be a finite angle in degrees; got {azimuth:g}")
        object.__setattr__(self, "edge_azimuth", azimuth)  # a float from here on, not an int


@dataclass(frozen=True)
class WindCase:
    """One wind speed the fall was solved for.

    ``label`` is "mean", "gust" (as given by the user) or "estimated gust" (from a mean).
    """

    label: str
    speed_10m: float
    impact: Impact
    impact_max_drag: Impact | None = None


@dataclass(frozen=True)
class FallResult:
    """Result of :func:`solve_fall`: the case, the impact at the given wind, and at its gust."""

    case: FallCase
    given: WindCase
    gust: WindCase | None
    warnings: tuple[str, ...]

    def to_json(self) -> dict[str, Any]:
        """Return the JSON contract (SI, snake case with unit suffixes; see DESIGN.md)."""
        imp = self.given.impact
        max_imp = self.given.impact_max_drag or imp
        case = self.case

        def value(array: np.ndarray | None) -> float | None:
            if array is None:
                return None
            v = float(array[0])
            return v if math.isfinite(v) else None

        outward = np.radians(case.edge_azimuth)
        drift = value(imp.drift)
        away = None
        if drift is not None:
            az = np.radians(float(imp.drift_azimuth[0]))
            away = drift * float(np.cos(az - outward))
        epa = value(imp.energy_per_area)
        out: dict[str, Any] = {
            "landed": bool(imp.landed[0]),
            "impact_speed_m_s": value(imp.impact_speed),
            "impact_energy_j": value(imp.kinetic_energy),
            "fall_time_s": value(imp.fall_time),
            "drift_m": drift,
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
            "wind_used": f"{self.given.label} {self.given.speed_10m:g} m/s at 10 m",
            "gust_speed_10m_m_s": None if self.gust is None else self.gust.speed_10m,
            "gust_drift_m": None if self.gust is None else value(self.gust.impact.drift),
            "gust_impact_energy_j": (
                None if self.gust is None else value(self.gust.impact.kinetic_energy)
            ),
            "object_id": case.object_id,
            "object_name": case.object_name,
            "drag_area_max_m2": case.drag_area_max
            if case.drag_area_max is not None
            else case.drag_area,
            "drift_max_m": value(max_imp.drift),
            "impact_energy_min_j": value(max_imp.kinetic_energy),
            "impact_speed_min_m_s": value(max_imp.impact_speed),
            "fall_time_max_s": value(max_imp.fall_time),
            "terminal_speed_min_m_s": value(max_imp.terminal_speed),
            "gust_drift_max_m": (
                None
                if self.gust is None
                else value((self.gust.impact_max_drag or self.gust.impact).drift)
            ),
            "flight_model": self.flight_model,
            "lift_off_speed_m_s": self.lift_off_speed,
            "warnings": list(self.warnings),
            "caution": CAUTION_SHORT,
        }
        return out

    @property
    def flight_model(self) -> str:
        """Which flight model the result comes from, in words."""
        from dropcalc.analysis.plate_flight import describe_model

        return describe_model(self.case.plate)

    @property
    def lift_off_speed(self) -> float | None:
        """Wind speed at roof level above which the sheet lying flat lifts off [m/s], or None."""
        if self.case.plate is None:
            return None
        from dropcalc.physics.plate import lift_off_speed

        length, width, _ = self.case.plate
        case = self.case
        return float(lift_off_speed(case.mass, length * width, case.air.density, case.gravity))


def wind_field(wind: WindSpec, speeds: np.ndarray) -> WindField:
    """The engine's WindField for a WindSpec at the given 10 m speeds (one per trajectory)."""
    east, north = wind.towards_unit_vector()
    return WindField(
        speed_10m=speeds,
        toward_east=east,
        toward_north=north,
        profile=wind.profile,
        exponent=wind.exponent or 0.0,
        roughness_length=wind.roughness_length or 0.05,
        minimum_height=wind.minimum_height,
    )


def solve_fall(case: FallCase) -> FallResult:
    """Solve one fall at the given wind and, for a mean wind, at its gust.

    Parameters
    ----------
    case : FallCase
        Validated inputs.

    Returns
    -------
    FallResult
        Impact quantities and warnings (carried away, windborne, gust estimate).
    """
    k = float(drag_parameter(case.air.density, case.drag_area, case.mass))
    speeds = [case.wind.speed_10m]
    gust_speed = None
    if case.wind.kind == "mean" and case.wind.speed_10m > 0:
        gust_speed = case.wind.gust_speed_10m()
        speeds.append(gust_speed)
    n = len(speeds)
    speeds_arr = np.array(speeds)
    ks = np.full(n, k)
    if case.drag_area_max is not None:
        # The same winds again at the largest drag area: the longest drift.
        k_max = float(drag_parameter(case.air.density, case.drag_area_max, case.mass))
        speeds_arr = np.concatenate([speeds_arr, speeds_arr])
        ks = np.concatenate([ks, np.full(n, k_max)])
    v0 = np.asarray(initial_velocity(case.release, case.edge_azimuth, case.gravity), dtype=float)
    field_of_wind = wind_field(case.wind, speeds_arr)
    solution = solve_falls(
        case.height,
        v0.reshape(3, 1),
        ks,
        gravity=case.gravity,
        wind=field_of_wind,
        max_distance=CARRIED_AWAY_DISTANCE,
    )
    impact = impact_from_solution(
        solution, case.mass, ks, case.gravity, field_of_wind, case.contact_area
    )
    impacts = [_pick(impact, i) for i in range(len(speeds))]
    max_drag = [_pick(impact, n + i) if case.drag_area_max is not None else None for i in range(n)]
    if case.plate is not None:  # a sheet: the plate model over its attitudes replaces both
        impacts, max_drag = _plate_impacts(case, np.array(speeds), v0)
    warnings: list[str] = []
    labels = [case.wind.kind] + (["estimated gust"] if gust_speed is not None else [])
    for label, impact_i, impact_max in zip(labels, impacts, max_drag, strict=True):
        gone = [not impact_i.landed[0]] + ([] if impact_max is None else [not impact_max.landed[0]])
        if any(gone):
            where = "at its smallest drag area" if gone[0] else "at its largest drag area"
            warnings.append(
                f"carried away in the {label} wind {where}: followed "
                f"{CARRIED_AWAY_DISTANCE / 1000:g} km downwind and still airborne; no landing "
                "point or impact can be given (windborne debris: no drop zone can bound it)"
            )
    slowest = impacts[0] if max_drag[0] is None else max_drag[0]
    vt = float(slowest.terminal_speed[0])
    if case.wind.speed_10m > 0 and vt < case.wind.speed_10m:
        warnings.append(
            f"windborne: terminal speed {vt:.2g} m/s is below the wind speed; "
            + (
                "the plate model flies it, but a gust can carry it further than any zone"
                if case.plate is not None
                else "light, flat or sheet-like objects can glide and fly further than this "
                "point-mass model predicts"
            )
        )
    if case.glides and case.plate is None:  # a disc or a custom sheet the plate model lacks
        from dropcalc.physics.shapes import GLIDE_WARNING

        warnings.append(GLIDE_WARNING)
    given = WindCase(case.wind.kind, case.wind.speed_10m, impacts[0], max_drag[0])
    gust = None
    if gust_speed is not None:
        gust = WindCase("estimated gust", gust_speed, impacts[1], max_drag[1])
    return FallResult(case, given, gust, tuple(warnings))


def _plate_impacts(
    case: FallCase, speeds: np.ndarray, v0: np.ndarray
) -> tuple[list[Impact], list[Impact]]:
    """Per wind speed: the plate model's impacts at the two bounding attitudes.

    The attitude of the highest impact energy and the one of the longest drift, from
    :func:`dropcalc.analysis.plate_flight.attitude_sweep`.
    """
    from dropcalc.analysis.plate_flight import attitude_sweep, face_on_drag_parameter

    assert case.plate is not None
    solution, lane_speeds = attitude_sweep(
        case.plate, case.mass, case.height, case.air.density, case.wind, speeds,
        case.edge_azimuth, v0, case.gravity,
    )  # fmt: skip
    k = face_on_drag_parameter(case.plate, case.mass, case.air.density)
    impact = impact_from_solution(
        solution, case.mass, np.full(lane_speeds.size, k), case.gravity,
        wind_field(case.wind, lane_speeds), case.contact_area,
    )  # fmt: skip
    per_speed = lane_speeds.size // speeds.size
    energy = np.where(impact.landed, impact.kinetic_energy, np.inf).reshape(speeds.size, -1)
    drift = np.where(impact.landed, impact.drift, np.inf).reshape(speeds.size, -1)
    highest, longest = [], []
    for i in range(speeds.size):
        highest.append(_pick(impact, i * per_speed + int(np.argmax(energy[i]))))
        longest.append(_pick(impact, i * per_speed + int(np.argmax(drift[i]))))
    return highest, longest


def _pick(impact: Impact, i: int) -> Impact:
    """Impact of trajectory ``i`` only (arrays of length 1)."""
    values = {}
    for name, array in vars(impact).items():
        values[name] = None if array is None else np.asarray(array)[i : i + 1]
    return Impact(**values)
