"""What a falling object does when it reaches the ground: speed, energy, momentum, drift.

Everything here is computed from a :class:`~dropcalc.physics.trajectory.FallSolution` and the
object's mass; the impact is taken at the first ground contact, in the ground frame.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike, NDArray

from dropcalc.physics.closed_form import HEIGHT_FOR_95_PERCENT
from dropcalc.physics.trajectory import FallSolution, WindField
from dropcalc.physics.wind import speed_ratio


@dataclass(frozen=True)
class Impact:
    """Impact quantities for each trajectory (arrays of shape (n,)).

    Attributes
    ----------
    impact_speed : ndarray
        Speed at first ground contact, ground frame. [m/s]
    vertical_speed : ndarray
        Downward part of the impact velocity. [m/s]
    horizontal_speed : ndarray
        Horizontal part of the impact velocity. [m/s]
    impact_angle : ndarray
        Angle of the impact velocity from the vertical. [deg]
    kinetic_energy : ndarray
        1/2 m v^2 at impact. [J]
    momentum : ndarray
        m v at impact. [kg m/s]
    fall_time : ndarray
        Time from release to first ground contact. [s]
    drift : ndarray
        Horizontal distance from the release point to the first ground contact. [m]
    drift_azimuth : ndarray
        Compass direction of the drift, degrees clockwise from north. [deg]
    terminal_speed : ndarray
        Terminal speed relative to the air, sqrt(g / k) (infinite without drag). [m/s]
    terminal_fraction : ndarray
        Speed relative to the air at impact divided by the terminal speed. [-]
    height_to_95_percent : ndarray
        Fall from rest in still air needed to reach 95 % of terminal speed, 1.1640 v_t^2 / g. [m]
    energy_per_area : ndarray or None
        Kinetic energy divided by the contact area, where a contact area was given. [J/m^2]
    landed : ndarray of bool
        False where the object was carried beyond the solver's limits; the other values are
        then NaN and must not be reported as a landing.
    """

    impact_speed: NDArray[np.float64]
    vertical_speed: NDArray[np.float64]
    horizontal_speed: NDArray[np.float64]
    impact_angle: NDArray[np.float64]
    kinetic_energy: NDArray[np.float64]
    momentum: NDArray[np.float64]
    fall_time: NDArray[np.float64]
    drift: NDArray[np.float64]
    drift_azimuth: NDArray[np.float64]
    terminal_speed: NDArray[np.float64]
    terminal_fraction: NDArray[np.float64]
    height_to_95_percent: NDArray[np.float64]
    energy_per_area: NDArray[np.float64] | None
    landed: NDArray[np.bool_]


def impact_from_solution(
    solution: FallSolution,
    mass: ArrayLike,
    drag_parameter: ArrayLike,
    gravity: ArrayLike,
    wind: WindField | None = None,
    contact_area: ArrayLike | None = None,
) -> Impact:
    """Derive the impact quantities from solved trajectories.

    Parameters
    ----------
    solution : FallSolution
        Output of :func:`dropcalc.physics.trajectory.solve_falls`.
    mass : float or array
        Mass of the object. [kg]
    drag_parameter : float or array
        k = rho C_d A / (2 m) used for the solution. [1/m]
    gravity : float or array
        Acceleration of gravity used for the solution. [m/s^2]
    wind : WindField, optional
        Wind used for the solution (needed for the speed relative to the air at the ground).
    contact_area : float or array, optional
        Area of the object that strikes first (a corner, an edge, a point). [m^2]

    Returns
    -------
    Impact
        Arrays over the trajectories; NaN where ``solution.landed`` is False.

    Notes
    -----
    E = 1/2 m |v|^2 and p = m |v| with v the ground-frame velocity at first contact. The height
    to 95 % of terminal speed follows from v(h) = v_t sqrt(1 - exp(-2 g h / v_t^2))
    (Timmerman and van der Weele, Am. J. Phys. 67 (1999) 538).
    """
    m = np.asarray(mass, dtype=float)
    k = np.asarray(drag_parameter, dtype=float)
    g = np.asarray(gravity, dtype=float)
    vel = solution.velocity
    landed = solution.landed
    nan_unless_landed = np.where(landed, 1.0, np.nan)

    speed = np.sqrt(np.sum(vel * vel, axis=0)) * nan_unless_landed
    vertical = -vel[2] * nan_unless_landed
    horizontal = np.hypot(vel[0], vel[1]) * nan_unless_landed
    angle = np.degrees(np.arctan2(horizontal, vertical))
    energy = 0.5 * m * speed**2
    drift = np.hypot(solution.position[0], solution.position[1]) * nan_unless_landed
    azimuth = np.degrees(np.arctan2(solution.position[0], solution.position[1])) % 360.0

    with np.errstate(divide="ignore", over="ignore"):
        terminal = np.sqrt(g / k) * np.ones_like(speed)
    wind = wind or WindField()
    ratio = speed_ratio(
        0.0, wind.profile, wind.exponent, wind.roughness_length, wind.minimum_height
    )
    u10 = np.asarray(wind.speed_10m, dtype=float)
    wx = u10 * np.asarray(wind.toward_east, dtype=float) * ratio
    wy = u10 * np.asarray(wind.toward_north, dtype=float) * ratio
    relative = np.sqrt((vel[0] - wx) ** 2 + (vel[1] - wy) ** 2 + vel[2] ** 2) * nan_unless_landed
    with np.errstate(divide="ignore", invalid="ignore"):
        fraction = np.where(np.isfinite(terminal), relative / terminal, 0.0)
    per_area = None if contact_area is None else energy / np.asarray(contact_area, dtype=float)
    return Impact(
        impact_speed=speed,
        vertical_speed=vertical,
        horizontal_speed=horizontal,
        impact_angle=angle,
        kinetic_energy=energy,
        momentum=m * speed,
        fall_time=solution.time * nan_unless_landed,
        drift=drift,
        drift_azimuth=np.where(drift > 0, azimuth, 0.0) * nan_unless_landed,
        terminal_speed=terminal,
        terminal_fraction=fraction,
        height_to_95_percent=HEIGHT_FOR_95_PERCENT * terminal**2 / g,
        energy_per_area=per_area,
        landed=landed.copy(),
    )
