"""Quadratic air drag on a falling object.

The drag force is F = -1/2 rho C_d A |v_rel| v_rel with v_rel = v - w(z), the velocity of the
object relative to the local wind (Newton's quadratic drag law, valid for Reynolds numbers
above about 1e3 where C_d is nearly constant; White, *Fluid Mechanics*, 7th ed. (2011), sec. 7.6).
The trajectory integrator uses the drag parameter k = rho C_d A / (2 m), so that the
acceleration due to drag is -k |v_rel| v_rel.

Buoyancy and added mass are of order rho_air / rho_object ~ 1e-3 for solid objects and are
neglected.
"""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike, NDArray

from dropcalc.physics.constants import STANDARD_GRAVITY


def drag_area(drag_coefficient: ArrayLike, projected_area: ArrayLike) -> NDArray[np.float64]:
    """Drag area C_d * A.

    Parameters
    ----------
    drag_coefficient : float or array
        Drag coefficient referred to ``projected_area``. [-]
    projected_area : float or array
        Area projected on a plane normal to the relative flow. [m^2]

    Returns
    -------
    numpy.ndarray
        Drag area. [m^2]
    """
    return np.asarray(drag_coefficient, dtype=float) * np.asarray(projected_area, dtype=float)


def drag_parameter(
    density: ArrayLike, drag_area_m2: ArrayLike, mass: ArrayLike
) -> NDArray[np.float64]:
    """Drag parameter k = rho C_d A / (2 m), so that the drag acceleration is -k |v| v.

    Parameters
    ----------
    density : float or array
        Air density. [kg/m^3]
    drag_area_m2 : float or array
        Drag area C_d A. [m^2]
    mass : float or array
        Mass of the object. [kg]

    Returns
    -------
    numpy.ndarray
        k. [1/m]
    """
    rho = np.asarray(density, dtype=float)
    return rho * np.asarray(drag_area_m2, dtype=float) / (2.0 * np.asarray(mass, dtype=float))


def drag_force(
    velocity: ArrayLike, wind_velocity: ArrayLike, density: ArrayLike, drag_area_m2: ArrayLike
) -> NDArray[np.float64]:
    """Quadratic drag force F = -1/2 rho C_d A |v - w| (v - w).

    Parameters
    ----------
    velocity : array, shape (3, ...)
        Object velocity in the ground frame. [m/s]
    wind_velocity : array, shape (3, ...)
        Wind velocity at the object's position. [m/s]
    density : float or array
        Air density. [kg/m^3]
    drag_area_m2 : float or array
        Drag area C_d A. [m^2]

    Returns
    -------
    numpy.ndarray, shape (3, ...)
        Drag force. [N]
    """
    rel = np.asarray(velocity, dtype=float) - np.asarray(wind_velocity, dtype=float)
    speed = np.sqrt(np.sum(rel * rel, axis=0))
    return -0.5 * np.asarray(density) * np.asarray(drag_area_m2) * speed * rel


def terminal_speed(
    mass: ArrayLike,
    drag_area_m2: ArrayLike,
    density: ArrayLike,
    gravity: ArrayLike = STANDARD_GRAVITY,
) -> NDArray[np.float64]:
    """Terminal speed relative to the air, v_t = sqrt(2 m g / (rho C_d A)).

    Infinite when the drag area is zero (a fall in vacuum).

    Parameters
    ----------
    mass : float or array
        Mass. [kg]
    drag_area_m2 : float or array
        Drag area C_d A. [m^2]
    density : float or array
        Air density. [kg/m^3]
    gravity : float or array
        Acceleration of gravity. [m/s^2]

    Returns
    -------
    numpy.ndarray
        Terminal speed. [m/s]

    References
    ----------
    Timmerman, P. and van der Weele, J. P., "On the rise and fall of a ball with linear or
    quadratic drag", Am. J. Phys. 67 (1999) 538-546.
    """
    k = drag_parameter(density, drag_area_m2, mass)
    with np.errstate(divide="ignore", over="ignore"):
        return np.sqrt(np.asarray(gravity, dtype=float) / k)


def reynolds_number(
    speed: ArrayLike, length: ArrayLike, density: ArrayLike, viscosity: ArrayLike
) -> NDArray[np.float64]:
    """Reynolds number Re = rho V L / mu.

    Parameters
    ----------
    speed : float or array
        Speed relative to the air. [m/s]
    length : float or array
        Characteristic length (diameter of a sphere or cylinder). [m]
    density : float or array
        Air density. [kg/m^3]
    viscosity : float or array
        Dynamic viscosity of air. [Pa s]

    Returns
    -------
    numpy.ndarray
        Reynolds number. [-]
    """
    return (
        np.asarray(density, dtype=float)
        * np.asarray(speed, dtype=float)
        * np.asarray(length, dtype=float)
        / np.asarray(viscosity, dtype=float)
    )
