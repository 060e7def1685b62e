"""Wind speed as a function of height above the landing surface.

Speeds are given at the 10 m reference height (meteorological convention) and scaled to the
height of a falling object by a profile: uniform, power law or log law. The kernel
:func:`speed_ratio` is vectorised and is what the trajectory integrator calls.

The module also holds the named terrain classes (EN 1991-1-4:2005 terrain categories and
ASCE 7-16 exposures) in one table, :data:`TERRAIN_CLASSES`, the EN 1991-1-4 profile functions
(terrain factor, roughness factor, turbulence intensity, peak velocity factor, peak (gust)
profile), and
:class:`WindSpec`, a validated wind description that says whether its speed is a mean or a gust.

References
----------
.. [1] CEN, EN 1991-1-4:2005 "Eurocode 1: Actions on structures - Part 1-4: General actions -
   Wind actions", Section 4.3-4.5, Table 4.1, equations (4.4), (4.5), (4.7), (4.8).
.. [2] ASCE, ASCE/SEI 7-16 "Minimum Design Loads and Associated Criteria for Buildings and
   Other Structures", 2017, Table 26.10-1 (K_z) and Table 26.11-1 (terrain exposure constants).
.. [3] WMO, WMO-No. 8 "Guide to Meteorological Instruments and Methods of Observation"
   (10 m reference height; from memory).
"""

from __future__ import annotations

import math
import warnings
from dataclasses import dataclass
from types import MappingProxyType
from typing import Literal

import numpy as np
from numpy.typing import ArrayLike, NDArray

from dropcalc.errors import (
    InputError,
    ModelValidityWarning,
    UnknownObjectError,
    require_range,
    to_float,
)
from dropcalc.physics.constants import (
    ASCE_MINIMUM_HEIGHT,
    DEFAULT_GUST_FACTOR,
    EN_MAXIMUM_HEIGHT,
    EN_PEAK_TURBULENCE_COEFFICIENT,
    EN_REFERENCE_ROUGHNESS_LENGTH,
    EN_REFERENCE_TERRAIN_FACTOR,
    EN_TERRAIN_FACTOR_EXPONENT,
    WIND_REFERENCE_HEIGHT,
)

ProfileKind = Literal["uniform", "power", "log"]
PROFILE_KINDS: tuple[str, ...] = ("uniform", "power", "log")

SpeedKind = Literal["mean", "gust"]
SPEED_KINDS: tuple[str, ...] = ("mean", "gust")

#: Largest 10 m wind speed a :class:`WindSpec` accepts [m/s].
MAXIMUM_WIND_SPEED = 70.0
#: Allowed range of the power-law exponent [-].
EXPONENT_RANGE = (0.0, 0.6)
#: Allowed range of the roughness length [m].
ROUGHNESS_LENGTH_RANGE = (1e-4, 3.0)
#: Default height below which a power law without a terrain class is held constant [m]:
#: the smallest z_min of EN 1991-1-4:2005 Table 4.1.
POWER_LAW_MINIMUM_HEIGHT = 1.0
#: Allowed range of the height below which the profile is held constant [m].
MINIMUM_HEIGHT_RANGE = (0.0, 50.0)


def speed_ratio(
    height: ArrayLike,
    profile: ProfileKind,
    exponent: ArrayLike = 0.0,
    roughness_length: ArrayLike = 0.05,
    minimum_height: ArrayLike = 0.0,
    reference_height: float = WIND_REFERENCE_HEIGHT,
) -> NDArray[np.float64]:
    """Ratio of the wind speed at ``height`` to the speed at the reference height.

    Power law: V(z)/V(z_ref) = (z/z_ref)^alpha. Log law: V(z)/V(z_ref) = ln(z/z0)/ln(z_ref/z0).
    Below ``minimum_height`` the ratio is held at its value there (EN 1991-1-4:2005, eq. 4.4,
    c_r(z) = c_r(z_min) for z < z_min).

    Parameters
    ----------
    height : float or array
        Height above the landing surface. [m]
    profile : {"uniform", "power", "log"}
        Profile law.
    exponent : float or array
        Power-law exponent alpha (power profile only). [-]
    roughness_length : float or array
        Aerodynamic roughness length z0 (log profile only); must be below ``minimum_height``. [m]
    minimum_height : float or array
        Height below which the ratio is held constant. [m]
    reference_height : float
        Height at which the given wind speed applies. [m]

    Returns
    -------
    numpy.ndarray
        V(z)/V(z_ref), broadcast over the inputs. [-]

    Raises
    ------
    InputError
        If ``profile`` is not one of the names above (an InputError is a ValueError).

    Notes
    -----
    This is the hot-loop kernel: it does not validate its numeric inputs. :func:`wind_spec`
    checks them once (in particular z0 < z_min for the log law, so no log of zero occurs).
    """
    z = np.maximum(np.asarray(height, dtype=float), minimum_height)
    if profile == "uniform":
        return np.ones_like(z)
    if profile == "power":
        return (z / reference_height) ** np.asarray(exponent, dtype=float)
    if profile == "log":
        z0 = np.asarray(roughness_length, dtype=float)
        return np.log(z / z0) / np.log(reference_height / z0)
    raise InputError(
        f"profile must be one of {', '.join(PROFILE_KINDS)}; got {profile!r}", field="profile"
    )


def speed_ratio_slope(
    height: ArrayLike,
    profile: ProfileKind,
    exponent: ArrayLike = 0.0,
    roughness_length: ArrayLike = 0.05,
    minimum_height: ArrayLike = 0.0,
    reference_height: float = WIND_REFERENCE_HEIGHT,
) -> NDArray[np.float64]:
    """Derivative [1/m] with height of :func:`speed_ratio`, zero below ``minimum_height``.

    Power law: alpha (z/z_ref)^alpha / z. Log law: 1 / (z ln(z_ref/z0)). Used for the Jacobian
    of the stiff integrator. Parameters as in :func:`speed_ratio`.
    """
    z = np.asarray(height, dtype=float)
    above = z > minimum_height
    if profile == "uniform":
        return np.zeros_like(z)
    zc = np.maximum(z, minimum_height)
    if profile == "power":
        alpha = np.asarray(exponent, dtype=float)
        slope = alpha * (zc / reference_height) ** alpha / zc
    elif profile == "log":
        slope = 1.0 / (zc * np.log(reference_height / np.asarray(roughness_length, dtype=float)))
    else:
        raise InputError(
            f"profile must be one of {', '.join(PROFILE_KINDS)}; got {profile!r}", field="profile"
        )
    return np.where(above, slope, 0.0)


# --------------------------------------------------------------------------------------------
# Terrain classes
# --------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class TerrainClass:
    """One named terrain class of a wind-loading standard.

    Attributes
    ----------
    key : str
        Name used to select the class, e.g. ``"en-ii"`` or ``"asce-c"``.
    standard : str
        The standard the class comes from.
    label : str
        Short human-readable name, e.g. ``"EN terrain category II"``.
    description : str
        The terrain it stands for (paraphrased, not quoted).
    roughness_length : float or None
        Aerodynamic roughness length z0 for the log law; None where the standard gives none. [m]
    minimum_height : float
        Height below which the profile is held constant. [m]
    mean_exponent : float or None
        Power-law exponent of the mean speed; None where no citable value exists. [-]
    gust_exponent : float or None
        Power-law exponent of the gust speed; None where no citable value exists. [-]
    source : str
        Where each number comes from, with [mem] marking values from memory.
    gradient_height : float or None
        Gradient height z_g of the ASCE 7 K_z formula; None for other standards. [m]
    """

    key: str
    standard: str
    label: str
    description: str
    roughness_length: float | None
    minimum_height: float
    mean_exponent: float | None
    gust_exponent: float | None
    source: str
    gradient_height: float | None = None


_EN = "EN 1991-1-4:2005"
_EN_SOURCE = "EN 1991-1-4:2005, Table 4.1 (z0, z_min); no power-law exponent is given there"
_ASCE = "ASCE 7-16"
_ASCE_SOURCE = (
    "ASCE 7-16, Table 26.11-1: alpha and z_g published; mean-hourly exponent alpha-bar "
    "from memory [mem]; minimum height 15 ft = 4.572 m from the note to Table 26.10-1"
)

#: The terrain classes, by key. EN classes use the log law; ASCE exposures the power law.
TERRAIN_CLASSES: MappingProxyType[str, TerrainClass] = MappingProxyType(
    {
        terrain_class.key: terrain_class
        for terrain_class in (
            TerrainClass(
                key="en-0",
                standard=_EN,
                label="EN terrain category 0",
                description="sea, or coastal area open to the sea",
                roughness_length=0.003,
                minimum_height=1.0,
                mean_exponent=None,
                gust_exponent=None,
                source=_EN_SOURCE,
            ),
            TerrainClass(
                key="en-i",
                standard=_EN,
                label="EN terrain category I",
                description="lakes, or flat level land with negligible vegetation and no obstacles",
                roughness_length=0.01,
                minimum_height=1.0,
                mean_exponent=None,
                gust_exponent=None,
                source=_EN_SOURCE,
            ),
            TerrainClass(
                key="en-ii",
                standard=_EN,
                label="EN terrain category II",
                description=(
                    "low vegetation such as grass, with isolated obstacles (trees, buildings) "
                    "at least 20 obstacle heights apart"
                ),
                roughness_length=0.05,
                minimum_height=2.0,
                mean_exponent=None,
                gust_exponent=None,
                source=_EN_SOURCE,
            ),
            TerrainClass(
                key="en-iii",
                standard=_EN,
                label="EN terrain category III",
                description=(
                    "regular cover of vegetation or buildings, or obstacles at most 20 obstacle "
                    "heights apart: villages, suburbs, forest"
                ),
                roughness_length=0.3,
                minimum_height=5.0,
                mean_exponent=None,
                gust_exponent=None,
                source=_EN_SOURCE,
            ),
            TerrainClass(
                key="en-iv",
                standard=_EN,
                label="EN terrain category IV",
                description=(
                    "at least 15 % of the surface covered by buildings with an average height "
                    "above 15 m"
                ),
                roughness_length=1.0,
                minimum_height=10.0,
                mean_exponent=None,
                gust_exponent=None,
                source=_EN_SOURCE,
            ),
            TerrainClass(
                key="asce-b",
                standard=_ASCE,
                label="ASCE exposure B",
                description=(
                    "urban and suburban areas, wooded areas, many closely spaced obstructions "
                    "the size of single-family houses or larger"
                ),
                roughness_length=None,
                minimum_height=ASCE_MINIMUM_HEIGHT,
                mean_exponent=1.0 / 4.0,
                gust_exponent=1.0 / 7.0,
                source=_ASCE_SOURCE,
                gradient_height=365.76,
            ),
            TerrainClass(
                key="asce-c",
                standard=_ASCE,
                label="ASCE exposure C",
                description=(
                    "open terrain with scattered obstructions mostly under about 9 m high, "
                    "flat open country and grassland"
                ),
                roughness_length=None,
                minimum_height=ASCE_MINIMUM_HEIGHT,
                mean_exponent=1.0 / 6.5,
                gust_exponent=1.0 / 9.5,
                source=_ASCE_SOURCE,
                gradient_height=274.32,
            ),
            TerrainClass(
                key="asce-d",
                standard=_ASCE,
                label="ASCE exposure D",
                description=(
                    "flat unobstructed land and water surfaces: mud flats, salt flats, unbroken ice"
                ),
                roughness_length=None,
                minimum_height=ASCE_MINIMUM_HEIGHT,
                mean_exponent=1.0 / 9.0,
                gust_exponent=1.0 / 11.5,
                source=_ASCE_SOURCE,
                gradient_height=213.36,
            ),
        )
    }
)

#: Friendly names for the EN terrain categories, mapped to keys of :data:`TERRAIN_CLASSES`.
TERRAIN_ALIASES: MappingProxyType[str, str] = MappingProxyType(
    {
        "sea": "en-0",
        "open": "en-i",
        "country": "en-ii",
        "suburban": "en-iii",
        "urban": "en-iv",
    }
)


def terrain_names() -> tuple[str, ...]:
    """Return every name :func:`terrain` accepts: the keys, then the aliases."""
    return (*TERRAIN_CLASSES, *TERRAIN_ALIASES)


def terrain(name: str) -> TerrainClass:
    """Look up a terrain class by key or alias (case, spaces and underscores do not matter).

    Parameters
    ----------
    name : str
        A key of :data:`TERRAIN_CLASSES` (``"en-ii"``, ``"asce-c"``) or an alias of
        :data:`TERRAIN_ALIASES` (``"suburban"``).

    Returns
    -------
    TerrainClass
        The terrain class.

    Raises
    ------
    UnknownObjectError
        If the name is not known; the message lists the valid names.
    """
    normalised = str(name).strip().lower().replace("_", "-").replace(" ", "-")
    key = TERRAIN_ALIASES.get(normalised, normalised)
    try:
        return TERRAIN_CLASSES[key]
    except KeyError:
        raise UnknownObjectError(
            f"terrain must be one of {', '.join(terrain_names())}; got {name!r}", field="terrain"
        ) from None


# ``wind_spec`` has a parameter named ``terrain``; it calls the lookup through this name.
_terrain_by_name = terrain


# --------------------------------------------------------------------------------------------
# EN 1991-1-4 profile functions
# --------------------------------------------------------------------------------------------


def _positive_array(name: str, value: ArrayLike, unit: str) -> NDArray[np.float64]:
    """Return ``value`` as a float array after checking it is finite and > 0."""
    array = np.asarray(value, dtype=float)
    if not np.all(np.isfinite(array) & (array > 0)):
        bad = array[~(np.isfinite(array) & (array > 0))].ravel()[0]
        raise InputError(
            f"{name} must be a finite value > 0 {unit}; got {bad:g} {unit}", field=name
        )
    return array


def _en_heights(
    height: ArrayLike, roughness_length: ArrayLike, minimum_height: ArrayLike
) -> tuple[NDArray[np.float64], NDArray[np.float64]]:
    """Validate EN inputs; return (max(z, z_min), z0) as arrays."""
    z = np.asarray(height, dtype=float)
    if not np.all(np.isfinite(z)):
        raise InputError("height must be finite m; got a NaN or infinite value", field="height")
    z0 = _positive_array("roughness_length", roughness_length, "m")
    z_min = _positive_array("minimum_height", minimum_height, "m")
    if np.any(z_min <= z0):
        raise InputError(
            "minimum_height must be greater than roughness_length; "
            f"got minimum_height {np.min(z_min):g} m, roughness_length {np.max(z0):g} m",
            field="minimum_height",
        )
    if np.any(z > EN_MAXIMUM_HEIGHT):
        warnings.warn(
            f"EN 1991-1-4 profile formulas hold up to {EN_MAXIMUM_HEIGHT:g} m; "
            f"got height {np.max(z):g} m",
            ModelValidityWarning,
            stacklevel=3,
        )
    return np.maximum(z, z_min), z0


def terrain_factor(roughness_length: ArrayLike) -> NDArray[np.float64]:
    """EN 1991-1-4 terrain factor k_r.

    k_r = 0.19 * (z0 / z0_II)^0.07, with z0_II = 0.05 m.

    Parameters
    ----------
    roughness_length : float or array
        Roughness length z0 of the terrain. [m]

    Returns
    -------
    numpy.ndarray
        Terrain factor k_r. [-]

    Raises
    ------
    InputError
        If a roughness length is not finite and > 0.

    References
    ----------
    .. [1] CEN, EN 1991-1-4:2005 "Eurocode 1: Actions on structures - Part 1-4: General
       actions - Wind actions", 4.3.2, equation (4.5).
    """
    z0 = _positive_array("roughness_length", roughness_length, "m")
    return EN_REFERENCE_TERRAIN_FACTOR * (z0 / EN_REFERENCE_ROUGHNESS_LENGTH) ** (
        EN_TERRAIN_FACTOR_EXPONENT
    )


def roughness_factor(
    height: ArrayLike, roughness_length: ArrayLike, minimum_height: ArrayLike
) -> NDArray[np.float64]:
    """EN 1991-1-4 roughness factor c_r(z), the mean speed over the basic wind speed.

    c_r(z) = k_r * ln(z / z0) for z_min <= z <= z_max; c_r(z) = c_r(z_min) for z < z_min.

    Parameters
    ----------
    height : float or array
        Height above ground. [m]
    roughness_length : float or array
        Roughness length z0. [m]
    minimum_height : float or array
        Minimum height z_min; must be greater than z0. [m]

    Returns
    -------
    numpy.ndarray
        Roughness factor c_r. [-]

    Raises
    ------
    InputError
        If a height is not finite, z0 or z_min is not finite and > 0, or z_min <= z0.

    Warns
    -----
    ModelValidityWarning
        If a height is above z_max = 200 m.

    References
    ----------
    .. [1] CEN, EN 1991-1-4:2005 "Eurocode 1: Actions on structures - Part 1-4: General
       actions - Wind actions", 4.3.2, equations (4.4) and (4.5), Table 4.1.
    """
    z, z0 = _en_heights(height, roughness_length, minimum_height)
    return terrain_factor(z0) * np.log(z / z0)


def turbulence_intensity(
    height: ArrayLike, roughness_length: ArrayLike, minimum_height: ArrayLike
) -> NDArray[np.float64]:
    """EN 1991-1-4 turbulence intensity I_v(z) with the recommended k_I = 1 and c_0 = 1.

    I_v(z) = k_I / (c_0 * ln(z / z0)) = 1 / ln(z / z0) for z_min <= z <= z_max;
    I_v(z) = I_v(z_min) for z < z_min.

    Parameters
    ----------
    height : float or array
        Height above ground. [m]
    roughness_length : float or array
        Roughness length z0. [m]
    minimum_height : float or array
        Minimum height z_min; must be greater than z0. [m]

    Returns
    -------
    numpy.ndarray
        Turbulence intensity I_v, the standard deviation of the along-wind speed over the mean
        speed. [-]

    Raises
    ------
    InputError
        If a height is not finite, z0 or z_min is not finite and > 0, or z_min <= z0.

    Warns
    -----
    ModelValidityWarning
        If a height is above z_max = 200 m.

    Notes
    -----
    Flat terrain (orography factor c_0 = 1) and the recommended turbulence factor k_I = 1.

    References
    ----------
    .. [1] CEN, EN 1991-1-4:2005 "Eurocode 1: Actions on structures - Part 1-4: General
       actions - Wind actions", 4.4, equation (4.7).
    """
    z, z0 = _en_heights(height, roughness_length, minimum_height)
    return 1.0 / np.log(z / z0)


def peak_velocity_factor(
    height: ArrayLike, roughness_length: ArrayLike, minimum_height: ArrayLike
) -> NDArray[np.float64]:
    """Ratio of the EN 1991-1-4 peak (gust) speed to the mean speed at the same height.

    From q_p(z) = (1 + 7 I_v(z)) * 1/2 * rho * v_m(z)^2: v_p(z) / v_m(z) = sqrt(1 + 7 I_v(z)).

    Parameters
    ----------
    height : float or array
        Height above ground. [m]
    roughness_length : float or array
        Roughness length z0. [m]
    minimum_height : float or array
        Minimum height z_min; must be greater than z0. [m]

    Returns
    -------
    numpy.ndarray
        Peak velocity factor v_p / v_m. [-]

    Raises
    ------
    InputError
        If a height is not finite, z0 or z_min is not finite and > 0, or z_min <= z0.

    Warns
    -----
    ModelValidityWarning
        If a height is above z_max = 200 m.

    Notes
    -----
    The 7 is twice the peak factor 3.5 the standard uses; k_I = c_0 = 1 as in
    :func:`turbulence_intensity`. The mean speed is the 10-min mean.

    References
    ----------
    .. [1] CEN, EN 1991-1-4:2005 "Eurocode 1: Actions on structures - Part 1-4: General
       actions - Wind actions", 4.5, equation (4.8).
    """
    intensity = turbulence_intensity(height, roughness_length, minimum_height)
    return np.sqrt(1.0 + EN_PEAK_TURBULENCE_COEFFICIENT * intensity)


def peak_speed_ratio(
    height: ArrayLike,
    roughness_length: ArrayLike,
    minimum_height: ArrayLike,
    reference_height: float = WIND_REFERENCE_HEIGHT,
) -> NDArray[np.float64]:
    """Ratio of the EN 1991-1-4 peak (gust) speed at ``height`` to the peak at the reference.

    v_p(z) = v_m(z) sqrt(1 + 7 I_v(z)) with v_m(z) proportional to ln(z / z0) and
    I_v(z) = k_I / (c_0 ln(z / z0)), z held at z_min below it, so

        v_p(z) / v_p(z_ref) = [ln(z/z0) sqrt(1 + 7 / ln(z/z0))]
                              / [ln(z_ref/z0) sqrt(1 + 7 / ln(z_ref/z0))].

    The gust profile is flatter than the mean law ln(z/z0) / ln(z_ref/z0): for terrain
    category III (z0 = 0.3 m, z_min = 5 m) it gives 1.08 times the mean-law ratio at 5 m and
    below and 0.90 times at 40 m.

    Parameters
    ----------
    height : float or array
        Height above ground. [m]
    roughness_length : float or array
        Roughness length z0. [m]
    minimum_height : float or array
        Minimum height z_min; must be greater than z0. [m]
    reference_height : float
        Height at which the given gust applies. [m]

    Returns
    -------
    numpy.ndarray
        v_p(z) / v_p(z_ref). [-]

    Raises
    ------
    InputError
        As :func:`turbulence_intensity`.

    Warns
    -----
    ModelValidityWarning
        If a height is above z_max = 200 m.

    Notes
    -----
    Flat terrain (c_0 = 1) and k_I = 1, as in :func:`peak_velocity_factor`. The mean profile
    comes from eq. (4.3)-(4.4), the turbulence intensity from eq. (4.7) and the peak from eq.
    (4.8) [EN1991-1-4].

    References
    ----------
    .. [1] CEN, EN 1991-1-4:2005 "Eurocode 1: Actions on structures - Part 1-4: General
       actions - Wind actions", 4.4, equation (4.7), and 4.5, equation (4.8).
    """
    mean_ratio = speed_ratio(
        height,
        "log",
        roughness_length=roughness_length,
        minimum_height=minimum_height,
        reference_height=reference_height,
    )
    peak = peak_velocity_factor(height, roughness_length, minimum_height)
    peak_reference = peak_velocity_factor(reference_height, roughness_length, minimum_height)
    return mean_ratio * peak / peak_reference


# --------------------------------------------------------------------------------------------
# Wind specification
# --------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class WindSpec:
    """A validated wind: speed at 10 m, mean or gust, direction and profile with height.

    Build it with :func:`wind_spec`, which resolves the defaults and checks the values.

    Attributes
    ----------
    speed_10m : float
        Wind speed at the 10 m reference height. [m/s]
    kind : {"mean", "gust"}
        Whether ``speed_10m`` is a mean speed or a gust speed.
    from_direction_deg : float
        Direction the wind blows from, clockwise from north, in [0, 360). [deg]
    profile : {"uniform", "power", "log"}
        Profile law used by :func:`speed_ratio`.
    exponent : float or None
        Power-law exponent (power profile only). [-]
    roughness_length : float or None
        Roughness length z0 (log profile only). [m]
    minimum_height : float
        Height below which the speed is held constant. [m]
    terrain_key : str or None
        Key of the terrain class the profile came from, if any.
    """

    speed_10m: float
    kind: SpeedKind
    from_direction_deg: float
    profile: ProfileKind
    exponent: float | None
    roughness_length: float | None
    minimum_height: float
    terrain_key: str | None

    def speed_at(self, height: ArrayLike) -> NDArray[np.float64]:
        """Wind speed at ``height`` (same kind as ``speed_10m``: mean or gust).

        A mean follows :func:`speed_ratio`; a gust on the log law follows the EN 1991-1-4 peak
        profile :func:`peak_speed_ratio` (eq. 4.7 and 4.8 [EN1991-1-4]); a gust on the power law
        uses the gust exponent the profile was built with.

        Parameters
        ----------
        height : float or array
            Height above the landing surface. [m]

        Returns
        -------
        numpy.ndarray
            Wind speed. [m/s]
        """
        if self.kind == "gust" and self.profile == "log":
            # A gust follows the EN 1991-1-4 peak profile v_p(z), flatter than the mean law.
            assert self.roughness_length is not None
            return self.speed_10m * peak_speed_ratio(
                height, self.roughness_length, self.minimum_height
            )
        # The kernel ignores the parameter of the other law; pass its harmless defaults.
        exponent = 0.0 if self.exponent is None else self.exponent
        roughness = self.roughness_length
        if roughness is None:
            roughness = EN_REFERENCE_ROUGHNESS_LENGTH
        return self.speed_10m * speed_ratio(
            height, self.profile, exponent, roughness, self.minimum_height
        )

    def towards_unit_vector(self) -> tuple[float, float]:
        """Return the unit vector (east, north) of the direction the wind blows towards.

        The from-direction is meteorological (clockwise from north), so the wind blows towards
        from_direction + 180 deg: east = -sin(from), north = -cos(from). A wind from 270 deg
        (westerly) blows towards the east, (1, 0).

        Returns
        -------
        tuple of float
            (east, north) components. [-]
        """
        angle = math.radians(self.from_direction_deg)
        east, north = -math.sin(angle), -math.cos(angle)
        # Remove rounding residue (cos 90 deg = 6e-17) so cardinal directions come out exact.
        return (
            0.0 if abs(east) < 1e-12 else east,
            0.0 if abs(north) < 1e-12 else north,
        )

    def _terrain_class(self) -> TerrainClass | None:
        return None if self.terrain_key is None else TERRAIN_CLASSES[self.terrain_key]

    def _en_gust_parameters(self) -> tuple[float, float] | None:
        """(z0, z_min) for the EN gust factor, or None when it does not apply."""
        terrain_class = self._terrain_class()
        if terrain_class is not None and terrain_class.standard == _EN:
            assert terrain_class.roughness_length is not None
            return terrain_class.roughness_length, terrain_class.minimum_height
        if terrain_class is None and self.profile == "log" and self.roughness_length is not None:
            return self.roughness_length, self.minimum_height
        return None

    def gust_speed_10m(self) -> float:
        """Gust speed at 10 m.

        If ``kind`` is "gust", the given speed. If "mean": for an EN terrain class (or a log
        profile with a given roughness length and no terrain class), the mean times the EN
        1991-1-4 peak velocity factor sqrt(1 + 7 I_v(10 m)) (eq. 4.8, k_I = c_0 = 1);
        otherwise the mean times 1.5 (common practice, no source).

        Returns
        -------
        float
            Gust speed at 10 m. [m/s]

        References
        ----------
        .. [1] CEN, EN 1991-1-4:2005 "Eurocode 1: Actions on structures - Part 1-4: General
           actions - Wind actions", equations (4.7) and (4.8).
        """
        if self.kind == "gust":
            return self.speed_10m
        return self.speed_10m * self.gust_factor()

    def gust_factor(self) -> float:
        """Ratio of the gust to the mean speed at 10 m used by :meth:`gust_speed_10m` [-]."""
        parameters = self._en_gust_parameters()
        if parameters is None:
            return DEFAULT_GUST_FACTOR
        roughness_length, minimum_height = parameters
        return float(peak_velocity_factor(WIND_REFERENCE_HEIGHT, roughness_length, minimum_height))

    def describe(self) -> str:
        """One sentence: the speed, whether it is a mean or a gust, and the profile used."""
        terrain_class = self._terrain_class()
        if self.kind == "gust":
            if terrain_class is not None and terrain_class.standard == _ASCE:
                what = "a 3-s gust speed"
            else:
                what = "a gust (peak) speed"
        elif terrain_class is not None and terrain_class.standard == _ASCE:
            what = "an hourly mean speed"
        elif terrain_class is not None and terrain_class.standard == _EN:
            what = "a 10-min mean speed"
        else:
            what = "a mean speed"
        if self.profile == "uniform":
            law = "the same speed at every height"
        elif self.profile == "power":
            law = f"power-law profile, exponent {self.exponent:.3g}"
        else:
            law = f"log-law profile, roughness length {self.roughness_length:.3g} m"
        if self.profile != "uniform" and self.minimum_height > 0:
            law += f", constant below {self.minimum_height:.3g} m"
        origin = "" if terrain_class is None else f" ({terrain_class.label})"
        return (
            f"Wind {self.speed_10m:.3g} m/s at 10 m from {self.from_direction_deg:.0f} deg, "
            f"given as {what}; {law}{origin}."
        )


def _nearest_en_minimum_height(roughness_length: float) -> float:
    """z_min of the EN terrain category whose z0 is nearest in ln z0 to ``roughness_length``."""
    en_classes = [c for c in TERRAIN_CLASSES.values() if c.standard == _EN]
    nearest = min(
        en_classes,
        key=lambda c: abs(math.log(roughness_length / (c.roughness_length or 1.0))),
    )
    return nearest.minimum_height


def _validate_speed(speed_10m: float) -> float:
    speed = to_float("speed_10m", speed_10m, "m/s")
    if math.isfinite(speed) and speed > MAXIMUM_WIND_SPEED:
        raise InputError(
            f"speed_10m must be between 0 and {MAXIMUM_WIND_SPEED:g} m/s; got {speed:g} m/s: "
            "dropcalc's wind model is not meant for storm conditions",
            field="speed_10m",
        )
    return require_range("speed_10m", speed, 0.0, MAXIMUM_WIND_SPEED, "m/s")


def wind_spec(
    speed_10m: float,
    kind: SpeedKind = "mean",
    from_direction: float = 270.0,
    profile: ProfileKind | None = None,
    exponent: float | None = None,
    roughness_length: float | None = None,
    terrain: str | None = None,
    minimum_height: float | None = None,
) -> WindSpec:
    """Build a validated :class:`WindSpec`, resolving the profile from a terrain class.

    Resolution order: a terrain class gives the profile and its parameters (EN category: log
    law with its z0 and z_min; ASCE exposure: power law with the mean or gust exponent matching
    ``kind`` and z_min = 15 ft = 4.572 m). An explicit ``exponent`` or ``roughness_length``
    overrides the terrain's (and implies the power or log law if ``profile`` is not given).
    With neither a terrain nor a profile nor a parameter, the profile is uniform.

    Parameters
    ----------
    speed_10m : float
        Wind speed at 10 m, between 0 and 70 m/s. [m/s]
    kind : {"mean", "gust"}
        Whether the speed is a mean speed (10-min for EN, hourly for ASCE) or a gust speed.
    from_direction : float
        Direction the wind blows from, clockwise from north; any finite value, normalised to
        [0, 360). The default 270 (westerly) blows towards +east. [deg]
    profile : {"uniform", "power", "log"} or None
        Profile law; None to take it from the terrain or the parameters given.
    exponent : float or None
        Power-law exponent, between 0 and 0.6. [-]
    roughness_length : float or None
        Log-law roughness length z0, between 1e-4 and 3 m. [m]
    terrain : str or None
        Terrain class key or alias (see :func:`terrain_names`).
    minimum_height : float or None
        Height below which the speed is held constant, between 0 and 50 m and above z0 for the
        log law; None for the terrain's value, else the z_min of the EN category nearest in
        z0 (log law) or 1 m (power law; uniform: 0). [m]

    Returns
    -------
    WindSpec
        The resolved wind.

    Raises
    ------
    InputError
        For a value out of range, an unknown ``kind`` or ``profile``, a missing parameter
        (power law without exponent, log law without roughness length) or a parameter given
        for the wrong profile.
    UnknownObjectError
        For an unknown terrain name.
    """
    speed = _validate_speed(speed_10m)
    if kind not in SPEED_KINDS:
        raise InputError(
            f"kind must be one of {', '.join(SPEED_KINDS)}; got {kind!r}", field="kind"
        )
    direction = to_float("from_direction", from_direction, "deg")
    if not math.isfinite(direction):
        raise InputError(
            f"from_direction must be a finite angle in deg; got {direction:g} deg",
            field="from_direction",
        )
    direction = direction % 360.0
    if direction >= 360.0:  # a tiny negative angle rounds up to 360.0
        direction = 0.0
    if profile is not None and profile not in PROFILE_KINDS:
        raise InputError(
            f"profile must be one of {', '.join(PROFILE_KINDS)}; got {profile!r}", field="profile"
        )
    if exponent is not None:
        exponent = require_range("exponent", exponent, *EXPONENT_RANGE, "")
    if roughness_length is not None:
        roughness_length = require_range(
            "roughness_length", roughness_length, *ROUGHNESS_LENGTH_RANGE, "m"
        )
    if minimum_height is not None:
        minimum_height = require_range("minimum_height", minimum_height, *MINIMUM_HEIGHT_RANGE, "m")
    terrain_class = None if terrain is None else _terrain_by_name(terrain)

    # Profile: explicit, else implied by an explicit parameter, else the terrain's, else uniform.
    if profile is None:
        if exponent is not None and roughness_length is not None:
            raise InputError(
                "give either exponent (power law) or roughness_length (log law), not both, "
                "or name the profile"
            )
        if exponent is not None:
            profile = "power"
        elif roughness_length is not None:
            profile = "log"
        elif terrain_class is not None:
            profile = "log" if terrain_class.roughness_length is not None else "power"
        else:
            profile = "uniform"
    if exponent is not None and profile != "power":
        raise InputError(
            f"exponent applies to the power profile only; got profile {profile!r}", field="exponent"
        )
    if roughness_length is not None and profile != "log":
        raise InputError(
            f"roughness_length applies to the log profile only; got profile {profile!r}",
            field="roughness_length",
        )

    terrain_name = "" if terrain_class is None else f" (terrain {terrain_class.key} gives none)"
    if profile == "power" and exponent is None:
        if terrain_class is not None:
            exponent = (
                terrain_class.gust_exponent if kind == "gust" else terrain_class.mean_exponent
            )
        if exponent is None:
            raise InputError(
                f"exponent is required for the power profile{terrain_name}", field="exponent"
            )
    if profile == "log" and roughness_length is None:
        if terrain_class is not None:
            roughness_length = terrain_class.roughness_length
        if roughness_length is None:
            raise InputError(
                f"roughness_length is required for the log profile{terrain_name}",
                field="roughness_length",
            )

    if minimum_height is None:
        if terrain_class is not None:
            minimum_height = terrain_class.minimum_height
        elif profile == "log":
            assert roughness_length is not None
            minimum_height = _nearest_en_minimum_height(roughness_length)
        elif profile == "power":
            # The power law has an infinite slope at the ground; hold it below 1 m, the
            # smallest z_min of EN 1991-1-4 Table 4.1 (categories 0 and I).
            minimum_height = POWER_LAW_MINIMUM_HEIGHT
        else:
            minimum_height = 0.0
    if profile == "log" and roughness_length is not None and minimum_height <= roughness_length:
        raise InputError(
            f"minimum_height must be greater than roughness_length {roughness_length:g} m "
            f"for the log profile; got {minimum_height:g} m",
            field="minimum_height",
        )

    return WindSpec(
        speed_10m=speed,
        kind=kind,
        from_direction_deg=direction,
        profile=profile,
        exponent=exponent if profile == "power" else None,
        roughness_length=roughness_length if profile == "log" else None,
        minimum_height=minimum_height,
        terrain_key=None if terrain_class is None else terrain_class.key,
    )


#: Where a wind speed was measured or forecast: over the site's own terrain, or in open
#: country (EN 1991-1-4 terrain category II, z0 = 0.05 m, the basis of forecasts and of the
#: basic wind speed).
WIND_MEASURED = ("site", "open-country")

#: Roughness length and minimum height of EN 1991-1-4 terrain category II (Table 4.1). [m]
OPEN_COUNTRY_ROUGHNESS = 0.05
OPEN_COUNTRY_MINIMUM_HEIGHT = 2.0


def open_country_factor(
    roughness_length: float, minimum_height: float, kind: SpeedKind = "mean"
) -> float:
    """Speed at 10 m over a site's terrain per unit speed at 10 m in open country [-].

    For a mean speed, the ratio of the EN 1991-1-4 roughness factors at 10 m,

        c_r,site(10) / c_r,II(10),   c_r(z) = k_r ln(max(z, z_min) / z0),
        k_r = 0.19 (z0 / z0,II)^0.07,  z0,II = 0.05 m

    ([EN1991-1-4] eq. 4.4 and 4.5); for a gust (peak) speed, the ratio of the peak velocities
    c_r(10) sqrt(1 + 7 I_v(10)) with I_v = 1 / ln(max(z, z_min) / z0) (eq. 4.7 and 4.8, k_I = 1,
    c_0 = 1). Both terrains see the same basic wind speed.

    Parameters
    ----------
    roughness_length, minimum_height : float
        The site's z0 and z_min. [m]
    kind : {"mean", "gust"}

    Returns
    -------
    float
        The factor (0.54 for category IV, mean; 1 for category II). [-]
    """
    ten = np.array([10.0])
    site = float(roughness_factor(ten, roughness_length, minimum_height)[0])
    open_country = float(
        roughness_factor(ten, OPEN_COUNTRY_ROUGHNESS, OPEN_COUNTRY_MINIMUM_HEIGHT)[0]
    )
    if kind == "gust":
        site_iv = 1.0 / math.log(max(10.0, minimum_height) / roughness_length)
        open_iv = 1.0 / math.log(max(10.0, OPEN_COUNTRY_MINIMUM_HEIGHT) / OPEN_COUNTRY_ROUGHNESS)
        site *= math.sqrt(1.0 + 7.0 * site_iv)
        open_country *= math.sqrt(1.0 + 7.0 * open_iv)
    return site / open_country


def wind_at_site(wind: WindSpec, measured: str) -> WindSpec:
    """The wind over the site's terrain from a speed measured ``"site"`` or ``"open-country"``.

    Raises
    ------
    InputError
        For an unknown ``measured``, or ``"open-country"`` without a log-law profile (an EN
        terrain category or a roughness length) to convert to.
    """
    from dataclasses import replace

    if measured not in WIND_MEASURED:
        raise InputError(
            f"wind measured must be one of {', '.join(WIND_MEASURED)}; got {measured!r}"
        )
    if measured == "site" or wind.speed_10m == 0:
        return wind
    if wind.profile != "log" or wind.roughness_length is None:
        raise InputError(
            "a wind measured in open country is converted to the site with the EN 1991-1-4 "
            "terrain factor: give the site's terrain (an EN category en-0 ... en-iv, or a "
            "roughness length)"
        )
    factor = open_country_factor(wind.roughness_length, wind.minimum_height, wind.kind)
    return replace(wind, speed_10m=wind.speed_10m * factor)


#: The 16 points of the compass and the direction each names, clockwise from north. [deg]
COMPASS_POINTS = {
    name: 22.5 * index
    for index, name in enumerate(
        [
            "N",
            "NNE",
            "NE",
            "ENE",
            "E",
            "ESE",
            "SE",
            "SSE",
            "S",
            "SSW",
            "SW",
            "WSW",
            "W",
            "WNW",
            "NW",
            "NNW",
        ]
    )
}


def compass_point(direction_deg: float) -> str:
    """The nearest of the 16 compass points to a direction (225 -> "SW")."""
    index = round((float(direction_deg) % 360.0) / 22.5) % 16
    return list(COMPASS_POINTS)[index]
