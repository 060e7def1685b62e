"""Sheets and plates in the zone and the fall: the attitudes sampled and searched.

The plate model (:mod:`dropcalc.physics.plate`) needs what the point mass does not: which side
lies in the plane of the wind, the pitch at release and the spin. They are uncertain on the day,
so the Monte Carlo samples them and the deterministic envelope searches them:

- which side is the chord: length or width, equally likely;
- the attitude at release: one third lying flat (a sheet blown or slid off the roof, pitch
  0 +- 15 deg), one third handled upright (carried on edge, 90 +- 15 deg), one third any pitch
  over the half circle (:data:`ATTITUDE_SHARES`, common practice, no source);
- the spin: uniform between -+ sqrt(3 g / c), the rate of a sheet that tips over an edge of the
  roof through a quarter turn about that edge (energy m g c / 2 = I_edge omega^2 / 2 with
  I_edge = m c^2 / 3; a rigid-body result, no source needed beyond that).

The wind, air and release inputs are sampled by :mod:`dropcalc.analysis.zone` as for every
object; the C_d spread scales the plate's air density (all its coefficients at once).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

import numpy as np

from dropcalc.analysis.fall import wind_field
from dropcalc.model.limits import CARRIED_AWAY_DISTANCE
from dropcalc.physics.plate import PlateGeometry, solve_plate_falls
from dropcalc.physics.trajectory import FallSolution

#: Shares of the release attitudes: lying flat, handled upright, any pitch [-] (common practice,
#: no source: a sheet is as likely blown off flat as dropped while carried on edge).
ATTITUDE_SHARES = (1 / 3, 1 / 3, 1 / 3)
#: Half-width of the pitch spread about flat and upright [deg] (common practice, no source).
ATTITUDE_SPREAD = 15.0
#: Integrator tolerance for zone samples: the attitude spread dwarfs it. Measured on the
#: plywood half sheet at 17.5 m in 8 m/s (20,000 samples): the zone radius at 1e-3 was
#: 45.55 m against 45.63 m at 1e-6, inside its Monte Carlo standard error of 0.2 m, at about
#: half the cost of 1e-4 (the 0.99 quantiles of drift and impact speed of 20,000 random
#: falls moved by less than 0.3 %).
PLATE_ZONE_TOLERANCE = 1e-3
#: Envelope search grid: pitch values over the half circle and spin values over their range.
ENVELOPE_PITCHES = 36
ENVELOPE_SPINS = 5


def largest_spin(chord: np.ndarray | float, gravity: float) -> np.ndarray:
    """Spin of a sheet tipping a quarter turn over an edge, sqrt(3 g / c) [rad/s]."""
    return np.sqrt(3.0 * gravity / np.asarray(chord, dtype=float))


def sample_attitudes(
    plate: tuple[float, float, float], n: int, rng: np.random.Generator, gravity: float
) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """Chord, span [m], pitch [deg] and spin [rad/s] of ``n`` sampled releases."""
    length, width, _ = plate
    along = rng.random(n) < 0.5
    chord = np.where(along, length, width)
    span = np.where(along, width, length)
    kind = rng.choice(3, size=n, p=ATTITUDE_SHARES)
    spread = rng.uniform(-ATTITUDE_SPREAD, ATTITUDE_SPREAD, n)
    pitch = np.select([kind == 0, kind == 1], [spread, 90.0 + spread], rng.uniform(0.0, 180.0, n))
    top = largest_spin(chord, gravity)
    spin = rng.uniform(-1.0, 1.0, n) * top
    return chord, span, pitch, spin


def land_plates(
    plate: tuple[float, float, float],
    mass: float,
    density: np.ndarray,
    wind_speed: np.ndarray,
    wind_toward: np.ndarray,
    velocity0: np.ndarray,
    settings: Any,
    chord: np.ndarray,
    span: np.ndarray,
    pitch: np.ndarray,
    spin: np.ndarray,
    *,
    record_path: bool = False,
) -> FallSolution:
    """Fly the sampled plates to their first ground contact (zone settings duck-typed).

    The plane of flight is the sampled wind's direction; in still air the edge's outward one.
    """
    from dataclasses import replace

    toward = np.radians(wind_toward)
    base = wind_field(settings.wind, wind_speed)
    field_ = replace(base, toward_east=np.sin(toward), toward_north=np.cos(toward))
    plane = np.where(np.asarray(wind_speed) > 0.0, wind_toward, settings.edge_azimuth)
    return solve_plate_falls(
        settings.height,
        velocity0,
        mass,
        PlateGeometry(chord, span, plate[2]),
        density,
        initial_pitch=pitch,
        initial_spin=spin,
        plane_azimuth=plane,
        gravity=settings.gravity,
        wind=field_,
        tolerance=PLATE_ZONE_TOLERANCE,
        max_distance=CARRIED_AWAY_DISTANCE,
        record_path=record_path,
    )


def envelope_grid(
    plate: tuple[float, float, float], gravity: float
) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """Chord, span, pitch and spin of the envelope's attitude search (both chords)."""
    length, width, _ = plate
    pitches = np.linspace(0.0, 180.0, ENVELOPE_PITCHES, endpoint=False)
    grids = []
    for chord, span in ((length, width), (width, length)):
        spins = np.linspace(-1.0, 1.0, ENVELOPE_SPINS) * float(largest_spin(chord, gravity))
        p, s = np.meshgrid(pitches, spins, indexing="ij")
        grids.append((np.full(p.size, chord), np.full(p.size, span), p.ravel(), s.ravel()))
    return tuple(np.concatenate([g[i] for g in grids]) for i in range(4))  # type: ignore[return-value]


def describe_model(plate: tuple[float, float, float] | None) -> str:
    """One line naming the flight model an object was computed with."""
    from dropcalc.physics.plate import TACHIKAWA_HOLMES_PLATE

    if plate is None:
        return "point mass with drag-area bounds"
    return f"plate flight ({TACHIKAWA_HOLMES_PLATE})"


#: The envelope passes this many of its farthest and of its fastest landings to the search over
#: the ground's ranges (the rest lie well inside them).
ENVELOPE_CANDIDATES = 16


def plate_envelope_distance(obj: Any, settings: Any, farthest_rest: Any) -> float:
    """Deterministic envelope rest distance [m] of a sheet (margin not included).

    As the point-mass envelope (:func:`dropcalc.analysis.zone.envelope_distance`): the gust
    blowing straight out, the top release speed straight out, the air density and C_d spread
    at both ends, the throw angle at its ends and middle; and the attitude searched on a grid
    (:func:`envelope_grid`: both chords, :data:`ENVELOPE_PITCHES` pitches over the half circle,
    :data:`ENVELOPE_SPINS` spins). The :data:`ENVELOPE_CANDIDATES` farthest and fastest
    landings then go through the search over the ground's ranges (``farthest_rest``). A
    tumbling sheet's landing is not a smooth function of its attitude, so
    :func:`dropcalc.analysis.zone.compute_zone` also takes the farthest Monte Carlo sample
    into the envelope.
    """
    from dataclasses import replace

    from dropcalc.analysis.zone import _mean_and_gust
    from dropcalc.physics.release import initial_velocity

    unc = settings.uncertainty
    _, gust = _mean_and_gust(settings)
    release = settings.release
    if release.mode == "roof-slide" and float(release.friction) > 0:
        release = replace(release, friction=float(release.friction) * (1 - unc.friction_spread))
    if release.mode == "throw":
        middle = float(release.angle)
        angles = [
            max(middle - unc.release_angle_spread, -90.0),
            middle,
            min(middle + unc.release_angle_spread, 90.0),
        ]
    else:
        angles = [None]
    rho = settings.air.density
    low = (1 - unc.density_spread) * (1 - unc.drag_coefficient_spread)
    high = (1 + unc.density_spread) * (1 + unc.drag_coefficient_spread)
    chord, span, pitch, spin = envelope_grid(obj.plate, settings.gravity)
    m = chord.size
    parts = []
    for angle in angles:
        rel = release if angle is None else replace(release, angle=angle)
        v0 = np.asarray(initial_velocity(rel, settings.edge_azimuth, settings.gravity), float)
        for factor in (low, high):
            parts.append((np.full(m, rho * factor), v0.reshape(3, 1) * np.ones((1, m))))
    density = np.concatenate([p[0] for p in parts])
    velocity0 = np.concatenate([p[1] for p in parts], axis=1)
    k = len(parts)
    solution = land_plates(
        obj.plate, obj.mass, density, np.full(m * k, gust), np.full(m * k, settings.edge_azimuth),
        velocity0, settings, np.tile(chord, k), np.tile(span, k), np.tile(pitch, k),
        np.tile(spin, k),
    )  # fmt: skip
    if not np.all(solution.landed):
        return math.inf
    drift = np.hypot(solution.position[0], solution.position[1])
    speed = np.sqrt(np.sum(solution.velocity**2, axis=0))
    pick = np.union1d(
        np.argsort(drift)[-ENVELOPE_CANDIDATES:], np.argsort(speed)[-ENVELOPE_CANDIDATES:]
    )
    sub = FallSolution(
        solution.time[pick], solution.position[:, pick], solution.velocity[:, pick],
        solution.landed[pick], solution.steps[pick],
    )  # fmt: skip
    return float(np.max(farthest_rest(sub, obj, settings)))


def attitude_sweep(
    plate: tuple[float, float, float],
    mass: float,
    height: float,
    density: float,
    wind: Any,
    wind_speeds: np.ndarray,
    edge_azimuth: float,
    velocity0: np.ndarray,
    gravity: float,
    *,
    record_path: bool = False,
) -> tuple[FallSolution, np.ndarray]:
    """Fly the envelope's attitude grid at each wind speed (wind as given, ``WindSpec``).

    Returns the solution over ``len(wind_speeds) x grid`` lanes (speed-major) and the wind
    speed of each lane. ``fall`` and ``batch`` take from it the attitude of the highest impact
    energy and the one of the longest drift, as they take the smallest and largest drag area of
    a point mass.
    """
    from dataclasses import replace

    chord, span, pitch, spin = envelope_grid(plate, gravity)
    m = chord.size
    speeds = np.repeat(np.asarray(wind_speeds, dtype=float), m)
    k = speeds.size // m
    base = wind_field(wind, speeds)
    toward = np.degrees(np.arctan2(np.asarray(base.toward_east), np.asarray(base.toward_north)))
    plane = np.where(speeds > 0.0, toward, edge_azimuth)
    solution = solve_plate_falls(
        height,
        np.asarray(velocity0, dtype=float).reshape(3, 1) * np.ones((1, speeds.size)),
        mass,
        PlateGeometry(np.tile(chord, k), np.tile(span, k), plate[2]),
        density,
        initial_pitch=np.tile(pitch, k),
        initial_spin=np.tile(spin, k),
        plane_azimuth=plane,
        gravity=gravity,
        wind=replace(base),
        max_distance=CARRIED_AWAY_DISTANCE,
        record_path=record_path,
    )
    return solution, speeds


def face_on_drag_parameter(plate: tuple[float, float, float], mass: float, density: float) -> float:
    """K = rho C_N90 L W / (2 m) of the sheet falling face-on (its slowest terminal speed) [1/m]."""
    from dropcalc.physics.shapes import plate_normal_drag_coefficient

    length, width, _ = plate
    aspect = max(length, width) / min(length, width)
    cd = float(plate_normal_drag_coefficient(aspect))
    return density * cd * length * width / (2.0 * mass)


def bounding_attitudes(
    plate: tuple[float, float, float],
    mass: float,
    height: float,
    density: float,
    wind: Any,
    wind_speed: float,
    edge_azimuth: float,
    velocity0: np.ndarray,
    gravity: float,
) -> tuple[tuple[float, float, float, float], tuple[float, float, float, float]]:
    """(chord, span, pitch, spin) of the highest-energy and of the longest-drift attitude.

    From :func:`attitude_sweep` at one wind speed; a figure draws the sheet's path at these two
    attitudes as it draws a point mass at its smallest and largest drag area.
    """
    solution, _ = attitude_sweep(
        plate, mass, height, density, wind, np.array([wind_speed]), edge_azimuth, velocity0,
        gravity,
    )  # fmt: skip
    grid = envelope_grid(plate, gravity)
    landed = solution.landed
    energy = np.where(landed, np.sum(solution.velocity**2, axis=0), -np.inf)
    drift = np.where(landed, np.hypot(solution.position[0], solution.position[1]), np.inf)
    i, j = int(np.argmax(energy)), int(np.argmax(drift))
    return (
        tuple(float(g[i]) for g in grid),  # type: ignore[return-value]
        tuple(float(g[j]) for g in grid),
    )


#: Pitches over the half circle a batch row is flown at, both chords, no spin: a list of
#: thousands of rows cannot afford the envelope's grid; the zone still samples and searches all.
BATCH_PITCHES = 8


@dataclass(frozen=True)
class SheetRange:
    """Per batch row: the plate model's extremes over its attitudes (arrays over the rows)."""

    speed_max: np.ndarray
    speed_min: np.ndarray
    drift_max: np.ndarray
    drift_min: np.ndarray
    time_min: np.ndarray
    time_max: np.ndarray
    landed: np.ndarray


def sweep_rows(
    plates: list[tuple[float, float, float]],
    masses: np.ndarray,
    heights: np.ndarray,
    density: float,
    wind: Any,
    wind_speed: float,
    edge_azimuth: float,
    velocity0: np.ndarray,
    gravity: float,
) -> SheetRange:
    """Fly every sheet row at :data:`BATCH_PITCHES` pitches and both chords in one engine call."""
    from dataclasses import replace

    pitches = np.linspace(0.0, 180.0, BATCH_PITCHES, endpoint=False)
    per_row = 2 * pitches.size
    dims = np.asarray(plates, dtype=float).reshape(-1, 3)
    rows = dims.shape[0]
    chord = np.concatenate(
        [np.repeat(dims[:, 0], pitches.size), np.repeat(dims[:, 1], pitches.size)]
    )
    span = np.concatenate(
        [np.repeat(dims[:, 1], pitches.size), np.repeat(dims[:, 0], pitches.size)]
    )
    order = np.concatenate(
        [np.arange(rows).repeat(pitches.size), np.arange(rows).repeat(pitches.size)]
    )
    pitch = np.tile(pitches, 2 * rows)
    speeds = np.full(order.size, float(wind_speed))
    base = wind_field(wind, speeds)
    toward = np.degrees(np.arctan2(np.asarray(base.toward_east), np.asarray(base.toward_north)))
    solution = solve_plate_falls(
        np.asarray(heights, dtype=float)[order],
        np.asarray(velocity0, dtype=float).reshape(3, 1) * np.ones((1, order.size)),
        np.asarray(masses, dtype=float)[order],
        PlateGeometry(chord, span, dims[order, 2]),
        density,
        initial_pitch=pitch,
        plane_azimuth=np.where(speeds > 0.0, toward, edge_azimuth),
        gravity=gravity,
        wind=replace(base),
        tolerance=PLATE_ZONE_TOLERANCE,
        max_distance=CARRIED_AWAY_DISTANCE,
    )
    sort = np.argsort(order, kind="stable")

    def per(values: np.ndarray) -> np.ndarray:
        return values[sort].reshape(rows, per_row)

    speed = per(np.sqrt(np.sum(solution.velocity**2, axis=0)))
    drift = per(np.hypot(solution.position[0], solution.position[1]))
    time = per(solution.time)
    return SheetRange(
        speed.max(axis=1), speed.min(axis=1), drift.max(axis=1), drift.min(axis=1),
        time.min(axis=1), time.max(axis=1), np.asarray(per(solution.landed).all(axis=1)),
    )  # fmt: skip
