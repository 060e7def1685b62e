"""Random fall cases and a high-precision reference, shared by the accuracy test and benchmark.

Not part of the package: test and benchmark scaffolding only. ``tests/test_trajectory_accuracy.py``
loads this file by path; ``benchmarks/engine.py`` imports it from its own directory.

The reference integrates the equations of motion of a point mass with quadratic drag in a
horizontal wind that varies with height,

    dr/dt = v,    dv/dt = -g e_z - k |v - w(z)| (v - w(z)),    w(z) = U_10 ratio(z) e_wind,

written out here from the formulas (not imported from ``dropcalc``), with scipy's DOP853
(Hairer, Norsett and Wanner, *Solving Ordinary Differential Equations I*, 2nd ed. 1993,
sec. II.10) at rtol 1e-10 and a terminal ground event.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from numpy.typing import NDArray
from scipy.integrate import solve_ivp

from dropcalc.physics.trajectory import DEFAULT_TOLERANCE, FallSolution, WindField, solve_falls

#: Standard gravity (3rd CGPM, 1901). [m/s^2]
GRAVITY = 9.80665
#: ISA sea-level air density (ICAO Doc 7488/3, 1993). [kg/m^3]
AIR_DENSITY = 1.225
#: Height at which the wind speed is given (WMO convention). [m]
REFERENCE_HEIGHT = 10.0
#: Release modes, in the order of their codes in ``Cases.mode``.
MODES = ("drop", "push", "throw", "roof_slide")
PROFILES = ("uniform", "power", "log")
#: Reference integrator settings.
REFERENCE_RTOL = 1e-10
#: Absolute tolerances relative to the case's length and speed scales.
REFERENCE_ATOL_FACTOR = 1e-12
#: Engine limits generous enough that every case in the sweep lands.
MAX_TIME = 1e5
MAX_DISTANCE = 1e7


@dataclass(frozen=True)
class Cases:
    """A batch of random falls (arrays over n cases)."""

    release_height: NDArray[np.float64]
    mass: NDArray[np.float64]
    drag_area: NDArray[np.float64]
    drag_parameter: NDArray[np.float64]
    initial_velocity: NDArray[np.float64]  # (3, n)
    mode: NDArray[np.int64]  # index into MODES
    carrier: NDArray[np.bool_]  # a carrier velocity was added
    wind_speed: NDArray[np.float64]  # at 10 m
    toward_east: NDArray[np.float64]
    toward_north: NDArray[np.float64]
    profile: NDArray[np.int64]  # index into PROFILES
    exponent: NDArray[np.float64]
    roughness_length: NDArray[np.float64]
    minimum_height: NDArray[np.float64]

    @property
    def count(self) -> int:
        return int(self.release_height.size)

    def subset(self, index: NDArray[np.int64] | slice) -> Cases:
        values = {}
        for name in self.__dataclass_fields__:
            array = getattr(self, name)
            values[name] = array[:, index] if array.ndim == 2 else array[index]
        return Cases(**values)


def _log_uniform(rng: np.random.Generator, low: float, high: float, n: int) -> NDArray:
    return np.exp(rng.uniform(math.log(low), math.log(high), n))


def _direction(speed: NDArray, elevation_deg: NDArray, azimuth: NDArray) -> NDArray:
    elevation = np.radians(elevation_deg)
    return np.stack(
        [
            speed * np.cos(elevation) * np.cos(azimuth),
            speed * np.cos(elevation) * np.sin(azimuth),
            speed * np.sin(elevation),
        ]
    )


def draw_cases(count: int, seed: int = 20240601, calm_fraction: float = 0.05) -> Cases:
    """Draw ``count`` random falls.

    Heights 1-300 m, masses 0.01-500 kg and drag areas 1e-5-2 m^2 log-uniform; k = rho C_d A /
    (2 m) with rho = 1.225 kg/m^3. Release modes equally likely: drop (at rest), push
    (horizontal, 0.5-5 m/s), throw (1-15 m/s at -60..75 deg elevation), roof slide (2-12 m/s,
    15-60 deg below horizontal); the horizontal direction is random. One case in five also
    carries the velocity of a moving platform (0-3 m/s horizontal, -1..1 m/s vertical). Wind
    0-35 m/s uniform in a random direction, with ``calm_fraction`` of the cases exactly calm
    (so a drop has exactly zero drift). Profiles equally likely: uniform; power law with exponent
    0.1-0.35 and minimum height 1-10 m; log law with roughness length 0.003-1 m (log-uniform)
    and minimum height max(1, 2 z0)-10 m.
    """
    rng = np.random.default_rng(seed)
    n = count
    height = _log_uniform(rng, 1.0, 300.0, n)
    mass = _log_uniform(rng, 0.01, 500.0, n)
    drag_area = _log_uniform(rng, 1e-5, 2.0, n)
    k = AIR_DENSITY * drag_area / (2.0 * mass)

    mode = rng.integers(0, len(MODES), n)
    azimuth = rng.uniform(0.0, 2.0 * math.pi, n)
    velocity = np.zeros((3, n))
    push = mode == 1
    velocity[:, push] = _direction(rng.uniform(0.5, 5.0, n), np.zeros(n), azimuth)[:, push]
    throw = mode == 2
    velocity[:, throw] = _direction(rng.uniform(1.0, 15.0, n), rng.uniform(-60, 75, n), azimuth)[
        :, throw
    ]
    slide = mode == 3
    velocity[:, slide] = _direction(rng.uniform(2.0, 12.0, n), -rng.uniform(15, 60, n), azimuth)[
        :, slide
    ]
    carrier = rng.uniform(size=n) < 0.2
    carrier_velocity = _direction(rng.uniform(0.0, 3.0, n), np.zeros(n), rng.uniform(0, 7, n))
    carrier_velocity[2] = rng.uniform(-1.0, 1.0, n)
    velocity[:, carrier] += carrier_velocity[:, carrier]

    wind_speed = rng.uniform(0.0, 35.0, n)
    wind_speed[rng.uniform(size=n) < calm_fraction] = 0.0
    wind_direction = rng.uniform(0.0, 2.0 * math.pi, n)

    profile = rng.integers(0, len(PROFILES), n)
    exponent = rng.uniform(0.1, 0.35, n)
    roughness = _log_uniform(rng, 0.003, 1.0, n)
    power_minimum = rng.uniform(1.0, 10.0, n)
    log_low = np.maximum(1.0, 2.0 * roughness)
    log_minimum = log_low + rng.uniform(size=n) * (10.0 - log_low)
    minimum_height = np.where(profile == 2, log_minimum, power_minimum)
    minimum_height = np.where(profile == 0, 0.0, minimum_height)

    return Cases(
        release_height=height,
        mass=mass,
        drag_area=drag_area,
        drag_parameter=k,
        initial_velocity=velocity,
        mode=mode,
        carrier=carrier,
        wind_speed=wind_speed,
        toward_east=np.cos(wind_direction),
        toward_north=np.sin(wind_direction),
        profile=profile,
        exponent=exponent,
        roughness_length=roughness,
        minimum_height=minimum_height,
    )


@dataclass(frozen=True)
class Outcome:
    """Quantities compared between engine and reference (arrays over cases)."""

    impact_speed: NDArray[np.float64]
    fall_time: NDArray[np.float64]
    drift: NDArray[np.float64]
    landed: NDArray[np.bool_]
    steps: NDArray[np.int64]


def _outcome(solution: FallSolution) -> Outcome:
    return Outcome(
        impact_speed=np.sqrt(np.sum(solution.velocity**2, axis=0)),
        fall_time=solution.time,
        drift=np.hypot(solution.position[0], solution.position[1]),
        landed=solution.landed,
        steps=solution.steps,
    )


def solve_with_engine(
    cases: Cases, tolerance: float = DEFAULT_TOLERANCE, closed_form: bool = False
) -> Outcome:
    """Run dropcalc's vectorised engine, one call per profile kind, and merge the results."""
    n = cases.count
    merged = {
        "impact_speed": np.full(n, np.nan),
        "fall_time": np.full(n, np.nan),
        "drift": np.full(n, np.nan),
        "landed": np.zeros(n, dtype=bool),
        "steps": np.zeros(n, dtype=np.int64),
    }
    for code, name in enumerate(PROFILES):
        index = np.flatnonzero(cases.profile == code)
        if not index.size:
            continue
        part = cases.subset(index)
        wind = WindField(
            speed_10m=part.wind_speed,
            toward_east=part.toward_east,
            toward_north=part.toward_north,
            profile=name,
            exponent=part.exponent,
            roughness_length=part.roughness_length,
            minimum_height=part.minimum_height,
        )
        solution = solve_falls(
            part.release_height,
            part.initial_velocity,
            part.drag_parameter,
            gravity=GRAVITY,
            wind=wind,
            max_time=MAX_TIME,
            max_distance=MAX_DISTANCE,
            tolerance=tolerance,
            closed_form=closed_form,
        )
        outcome = _outcome(solution)
        for key in merged:
            merged[key][index] = getattr(outcome, key)
    return Outcome(**merged)


# --------------------------------------------------------------------------------------------
# Reference: one trajectory at a time with scipy's DOP853
# --------------------------------------------------------------------------------------------


def wind_ratio(height: float, profile: str, exponent: float, z0: float, z_min: float) -> float:
    """V(z)/V(10 m), held constant below z_min (EN 1991-1-4:2005 eq. 4.4, c_r(z_min) below).

    Power law (z/10)^alpha; log law ln(z/z0)/ln(10/z0); uniform 1.
    """
    if profile == "uniform":
        return 1.0
    z = max(height, z_min)
    if profile == "power":
        return (z / REFERENCE_HEIGHT) ** exponent
    return math.log(z / z0) / math.log(REFERENCE_HEIGHT / z0)


def reference_fall(
    release_height: float,
    initial_velocity: tuple[float, float, float],
    drag_parameter: float,
    wind_east: float = 0.0,
    wind_north: float = 0.0,
    profile: str = "uniform",
    exponent: float = 0.0,
    roughness_length: float = 0.05,
    minimum_height: float = 0.0,
    gravity: float = GRAVITY,
) -> tuple[float, NDArray[np.float64], NDArray[np.float64]]:
    """Integrate one fall with DOP853 to its first ground contact.

    Parameters are SI: height [m], velocity (east, north, up) [m/s], k [1/m], the wind
    components at 10 m [m/s], the profile and its parameters as in :func:`wind_ratio`, g
    [m/s^2].

    Returns the contact time [s], the contact position (3,) [m] and the contact velocity (3,)
    [m/s]. The integration stops wherever it crosses the profile's
    minimum height (the wind's slope jumps there) and restarts, so no step straddles the kink.
    """
    k, g = drag_parameter, gravity

    def rhs(_t: float, state: NDArray[np.float64]) -> list[float]:
        _, _, z, vx, vy, vz = state.tolist()
        ratio = wind_ratio(z, profile, exponent, roughness_length, minimum_height)
        ux = vx - wind_east * ratio
        uy = vy - wind_north * ratio
        drag = k * math.sqrt(ux * ux + uy * uy + vz * vz)
        return [vx, vy, vz, -drag * ux, -drag * uy, -g - drag * vz]

    speed0 = math.sqrt(sum(v * v for v in initial_velocity))
    wind_speed = math.hypot(wind_east, wind_north)
    speed_scale = speed0 + wind_speed + math.sqrt(2.0 * g * release_height)
    length_scale = max(release_height, 1.0)
    atol = REFERENCE_ATOL_FACTOR * np.array([length_scale] * 3 + [speed_scale] * 3)

    def ground(_t: float, y: NDArray[np.float64]) -> float:
        return y[2]

    ground.terminal = True  # type: ignore[attr-defined]
    ground.direction = -1  # type: ignore[attr-defined]

    def kink(_t: float, y: NDArray[np.float64]) -> float:
        return y[2] - minimum_height

    kink.terminal = True  # type: ignore[attr-defined]
    # After crossing the kink one way, only a crossing the other way can come next; this also
    # keeps the restart (which begins exactly on the kink) from triggering at once.
    kink.direction = 1 if release_height < minimum_height else -1  # type: ignore[attr-defined]
    events = [ground, kink] if profile != "uniform" and minimum_height > 0.0 else [ground]

    state = np.array([0.0, 0.0, release_height, *initial_velocity])
    t = 0.0
    while True:
        result = solve_ivp(
            rhs,
            (t, t + MAX_TIME),
            state,
            method="DOP853",
            rtol=REFERENCE_RTOL,
            atol=atol,
            events=events,
        )
        if result.status != 1:
            raise RuntimeError(f"reference did not reach the ground: {result.message}")
        if result.t_events[0].size:
            t = float(result.t_events[0][0])
            state = result.y_events[0][0].copy()
            state[2] = 0.0  # the event's root is exact to a few ulp
            break
        t = float(result.t_events[1][0])
        state = result.y_events[1][0].copy()
        state[2] = minimum_height
        kink.direction = -kink.direction  # type: ignore[attr-defined]
    return t, state[0:3], state[3:6]


def solve_with_reference(cases: Cases) -> Outcome:
    """Run :func:`reference_fall` on every case (a Python loop)."""
    n = cases.count
    speed = np.empty(n)
    time = np.empty(n)
    drift = np.empty(n)
    for i in range(n):
        profile = PROFILES[cases.profile[i]]
        u10 = cases.wind_speed[i]
        t, position, velocity = reference_fall(
            float(cases.release_height[i]),
            tuple(float(v) for v in cases.initial_velocity[:, i]),
            float(cases.drag_parameter[i]),
            wind_east=float(u10 * cases.toward_east[i]),
            wind_north=float(u10 * cases.toward_north[i]),
            profile=profile,
            exponent=float(cases.exponent[i]),
            roughness_length=float(cases.roughness_length[i]),
            minimum_height=float(cases.minimum_height[i]),
        )
        time[i] = t
        speed[i] = math.sqrt(float(np.sum(velocity**2)))
        drift[i] = math.hypot(position[0], position[1])
    return Outcome(speed, time, drift, np.ones(n, dtype=bool), np.zeros(n, dtype=np.int64))


def drift_allowance(release_height: NDArray[np.float64], tolerance: float) -> NDArray[np.float64]:
    """Absolute drift error [m] the engine's error control admits: tolerance * max(h, 1 m).

    The engine controls each position component to ``tolerance`` times its size plus an
    absolute ``tolerance * max(release_height, 1 m)`` (``_POS_SCALE`` in trajectory.py), so a
    drift much smaller than that absolute part cannot be expected to be relatively accurate.
    """
    return tolerance * np.maximum(release_height, 1.0)


def relative_errors(
    cases: Cases, engine: Outcome, reference: Outcome, tolerance: float
) -> dict[str, float]:
    """Worst errors of the engine against the reference.

    ``impact_speed`` and ``fall_time``: relative. ``drift``: |error| / (drift + allowance /
    1e-4) with the allowance of :func:`drift_allowance`, i.e. the relative error where the drift
    is large, and below 1e-4 exactly when |error| <= 1e-4 drift + allowance. ``drift_raw``:
    the plain relative error where the reference drift is >= 1e-6 m; ``drift_abs_below_1um``:
    the absolute error [m] where it is below 1e-6 m.
    """
    speed = np.abs(engine.impact_speed - reference.impact_speed) / reference.impact_speed
    time = np.abs(engine.fall_time - reference.fall_time) / reference.fall_time
    drift_error = np.abs(engine.drift - reference.drift)
    allowance = drift_allowance(cases.release_height, tolerance)
    drift = drift_error / (reference.drift + allowance / 1e-4)
    large = reference.drift >= 1e-6
    return {
        "impact_speed": float(np.max(speed, initial=0.0)),
        "fall_time": float(np.max(time, initial=0.0)),
        "drift": float(np.max(drift, initial=0.0)),
        "drift_raw": float(np.max(drift_error[large] / reference.drift[large], initial=0.0)),
        "drift_abs_below_1um": float(np.max(drift_error[~large], initial=0.0)),
    }
