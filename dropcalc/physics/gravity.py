"""Acceleration of gravity: standard, or WGS84 normal gravity at a latitude and elevation.

References
----------
.. [1] National Imagery and Mapping Agency, "Department of Defense World Geodetic System 1984:
   Its Definition and Relationships with Local Geodetic Systems", NIMA TR8350.2, 3rd ed., 2000.
"""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike, NDArray

from dropcalc.physics.atmosphere import SITE_ELEVATION_RANGE, _checked
from dropcalc.physics.constants import (
    FREE_AIR_GRADIENT,
    STANDARD_GRAVITY,
    WGS84_EQUATORIAL_GRAVITY,
    WGS84_FIRST_ECCENTRICITY_SQUARED,
    WGS84_SOMIGLIANA_CONSTANT,
)

#: Latitudes accepted [deg].
LATITUDE_RANGE = (-90.0, 90.0)


def normal_gravity(latitude: ArrayLike) -> NDArray[np.float64]:
    """WGS84 normal gravity on the ellipsoid (Somigliana's closed formula).

    gamma = gamma_e (1 + k sin^2 phi) / sqrt(1 - e^2 sin^2 phi), gamma_e = 9.7803253359 m/s^2,
    k = 0.00193185265241, e^2 = 0.00669437999013.

    Parameters
    ----------
    latitude : float or array
        Geodetic latitude, -90..90 deg. [deg]

    Returns
    -------
    numpy.ndarray
        Normal gravity on the ellipsoid surface. [m/s^2]

    Raises
    ------
    InputError
        If a latitude is NaN, infinite or outside -90..90 deg.

    References
    ----------
    .. [1] NIMA TR8350.2, 3rd ed. (2000), eq. 4-1.
    """
    sin_squared = np.sin(np.radians(_checked("latitude", latitude, LATITUDE_RANGE, "deg"))) ** 2
    return (
        WGS84_EQUATORIAL_GRAVITY
        * (1.0 + WGS84_SOMIGLIANA_CONSTANT * sin_squared)
        / np.sqrt(1.0 - WGS84_FIRST_ECCENTRICITY_SQUARED * sin_squared)
    )


def local_gravity(latitude: ArrayLike, elevation: ArrayLike) -> NDArray[np.float64]:
    """Compute normal gravity at a latitude and an elevation above the ellipsoid.

    g = gamma(phi) - 3.086e-6 s^-2 * h (linear free-air approximation).

    Parameters
    ----------
    latitude : float or array
        Geodetic latitude, -90..90 deg. [deg]
    elevation : float or array
        Height above the ellipsoid (mean sea level is close enough here), -500..5000 m. [m]

    Returns
    -------
    numpy.ndarray
        Normal gravity at the elevation. [m/s^2]

    Raises
    ------
    InputError
        If a value is NaN, infinite or outside its range.

    Notes
    -----
    The linear free-air gradient -0.3086 mGal/m is the first-order term of NIMA TR8350.2,
    eq. 4-3, averaged over latitude; up to 5000 m it differs from the second-order form by less
    than 4e-5 m/s^2 (4 ppm). Local anomalies (terrain, density) of up to a few 1e-4 m/s^2 are
    ignored; both are far below what matters for a falling object.

    References
    ----------
    .. [1] NIMA TR8350.2, 3rd ed. (2000), eqs. 4-1 and 4-3.
    """
    height = _checked("elevation", elevation, SITE_ELEVATION_RANGE, "m")
    return normal_gravity(latitude) + FREE_AIR_GRADIENT * height


def gravity(latitude: float | None = None, elevation: float = 0.0) -> float:
    """Acceleration of gravity for a site: standard gravity, or local normal gravity.

    Parameters
    ----------
    latitude : float, optional
        Geodetic latitude, -90..90 deg; None gives standard gravity 9.80665 m/s^2. [deg]
    elevation : float
        Site elevation, -500..5000 m (used only with a latitude). [m]

    Returns
    -------
    float
        Acceleration of gravity. [m/s^2]

    Raises
    ------
    InputError
        If a value is NaN, infinite or outside its range.

    References
    ----------
    .. [1] 3rd CGPM (1901), Comptes rendus p. 70 (standard gravity).
    .. [2] NIMA TR8350.2, 3rd ed. (2000), eqs. 4-1 and 4-3.
    """
    if latitude is None:
        _checked("elevation", elevation, SITE_ELEVATION_RANGE, "m")
        return STANDARD_GRAVITY
    return float(local_gravity(latitude, elevation))
