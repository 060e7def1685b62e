"""One object, one release: the computation behind ``dropcalc fall``.

:class:`FallCase` holds validated inputs in SI units; :func:`solve_fall` runs the physics core
for the given wind and, when that wind is a mean speed, for its gust as well, and returns a
:class:`FallResult`; its JSON contract is built by :func:`dropcalc.present.json.fall_json`.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

import numpy as np

from dropcalc.model.checks import check_object as check_object  # re-exported
from dropcalc.model.conditions import Conditions, WithConditions
from dropcalc.model.limits import (  # re-exported for callers
    CARRIED_AWAY_DISTANCE,
)
from dropcalc.physics.drag import drag_parameter
from dropcalc.physics.impact import Impact, impact_from_solution
from dropcalc.physics.release import initial_velocity
from dropcalc.physics.trajectory import WindField, solve_falls
from dropcalc.physics.wind import WindSpec


@dataclass(frozen=True)
class FallCase(WithConditions):
    """Validated inputs of one fall, SI units.

    Attributes
    ----------
    mass : float
        Mass of the object. [kg]
    drag_area : float
        Drag area C_d A of the object. [m^2]
    height : float
        Release height above the landing surface. [m]
    conditions : Conditions
        Air, wind, gravity, release and the edge's direction (read as ``case.wind`` etc.).
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
    conditions: Conditions = field(default_factory=Conditions)
    contact_area: float | None = None
    drag_area_max: float | None = None
    object_id: str | None = None
    object_name: str | None = None
    glides: bool = False
    plate: tuple[float, float, float] | None = None

    def __post_init__(self) -> None:
        check_object(self.mass, self.drag_area, self.height, self.contact_area, self.drag_area_max)


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
    max_drag: list[Impact | None] = [
        _pick(impact, n + i) if case.drag_area_max is not None else None for i in range(n)
    ]
    if case.plate is not None:  # a sheet: the plate model over its attitudes replaces both
        impacts, plate_max = _plate_impacts(case, np.array(speeds), v0)
        max_drag = list(plate_max)
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
    values: dict[str, Any] = {}
    for name, array in vars(impact).items():
        values[name] = None if array is None else np.asarray(array)[i : i + 1]
    return Impact(**values)
