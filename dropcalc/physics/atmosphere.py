"""Air at the site: ISA standard atmosphere, humid-air density (CIPM-2007) and viscosity.

The kernels are vectorised over numpy arrays and check their inputs (an out-of-range or NaN
value raises :class:`~dropcalc.errors.InputError` naming the field). :func:`air_state` resolves
what the user gave (elevation, temperature, pressure, humidity or a density) into one
:class:`AirState` that says in words where its density came from.

References
----------
.. [1] ICAO, "Manual of the ICAO Standard Atmosphere (extended to 80 kilometres)", Doc 7488/3,
   3rd ed., 1993.
.. [2] NOAA, NASA, USAF, "U.S. Standard Atmosphere, 1976", NOAA-S/T 76-1562, 1976.
.. [3] A. Picard, R. S. Davis, M. Glaser and K. Fujii, "Revised formula for the density of moist
   air (CIPM-2007)", Metrologia 45 (2008) 149-155, doi:10.1088/0026-1394/45/2/004.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike, NDArray

from dropcalc.errors import require_range_array
from dropcalc.physics.constants import (
    CIPM2007_CO2_MOLAR_MASS_COEFFICIENT,
    CIPM2007_MOLAR_GAS_CONSTANT,
    CIPM2007_MOLAR_MASS_DRY_AIR,
    CIPM2007_MOLAR_MASS_WATER,
    CIPM2007_REFERENCE_CO2_MOLE_FRACTION,
    ISA_EARTH_RADIUS,
    ISA_GAS_CONSTANT_DRY_AIR,
    ISA_LAPSE_RATE,
    ISA_PRESSURE_EXPONENT,
    ISA_SEA_LEVEL_PRESSURE,
    ISA_SEA_LEVEL_TEMPERATURE,
    SUTHERLAND_COEFFICIENT,
    SUTHERLAND_CONSTANT,
)

#: Geopotential heights where the ISA troposphere formulas are used [m].
ISA_ELEVATION_RANGE = (-500.0, 11000.0)
#: Site elevations accepted by :func:`air_state` [m].
SITE_ELEVATION_RANGE = (-500.0, 5000.0)
#: Air temperatures accepted (-50 to +60 degC) [K].
TEMPERATURE_RANGE = (223.15, 333.15)
#: Air pressures accepted [Pa].
PRESSURE_RANGE = (30e3, 110e3)
#: Relative humidity accepted, as a fraction [-].
RELATIVE_HUMIDITY_RANGE = (0.0, 1.0)
#: Air densities accepted when the user gives one [kg/m^3].
DENSITY_RANGE = (0.3, 1.6)
#: CO2 mole fractions accepted [mol/mol].
CO2_MOLE_FRACTION_RANGE = (0.0, 0.01)

_CELSIUS_OFFSET = 273.15
_FRACTION_NOTE = " (a fraction: 0.5 means 50 %)"
_TEMPERATURE_NOTE = " (-50 to +60 °C)"

# Coefficients of Picard et al. (2008), appendix A1: saturation vapour pressure (eq. A1.1),
# enhancement factor (eq. A1.2) and compressibility factor (eq. A1.3). t is in degC below.
_PSV_A = 1.2378847e-5  # [K^-2]
_PSV_B = -1.9121316e-2  # [K^-1]
_PSV_C = 33.93711047  # [-]
_PSV_D = -6.3431645e3  # [K]
_ENHANCEMENT_ALPHA = 1.00062  # [-]
_ENHANCEMENT_BETA = 3.14e-8  # [Pa^-1]
_ENHANCEMENT_GAMMA = 5.6e-7  # [K^-2]
_Z_A0 = 1.58123e-6  # [K Pa^-1]
_Z_A1 = -2.9331e-8  # [Pa^-1]
_Z_A2 = 1.1043e-10  # [K^-1 Pa^-1]
_Z_B0 = 5.707e-6  # [K Pa^-1]
_Z_B1 = -2.051e-8  # [Pa^-1]
_Z_C0 = 1.9898e-4  # [K Pa^-1]
_Z_C1 = -2.376e-6  # [Pa^-1]
_Z_D = 1.83e-11  # [K^2 Pa^-2]
_Z_E = -0.765e-8  # [K^2 Pa^-2]


def _checked(
    name: str, values: ArrayLike, bounds: tuple[float, float], unit: str, note: str = ""
) -> NDArray[np.float64]:
    """Return ``values`` as a float array, or raise InputError naming the first bad element."""
    return require_range_array(name, values, *bounds, unit, note)


def geopotential_height(geometric_height: ArrayLike) -> NDArray[np.float64]:
    """Geopotential height of a geometric height above mean sea level.

    H = r0 h / (r0 + h), with the ISA earth radius r0 = 6356766 m.

    Parameters
    ----------
    geometric_height : float or array
        Geometric height above mean sea level, between -500 and 20000 m. [m]

    Returns
    -------
    numpy.ndarray
        Geopotential height H. [m]

    Raises
    ------
    InputError
        If a height is NaN, infinite or outside -500..20000 m.

    References
    ----------
    .. [1] ICAO Doc 7488/3 (1993), section 2 (geopotential and geometric heights).
    """
    height = _checked("geometric_height", geometric_height, (-500.0, 20000.0), "m")
    return ISA_EARTH_RADIUS * height / (ISA_EARTH_RADIUS + height)


def isa_temperature(elevation: ArrayLike) -> NDArray[np.float64]:
    """ISA air temperature in the troposphere.

    T = 288.15 K - 0.0065 K/m * H.

    Parameters
    ----------
    elevation : float or array
        Geopotential height H above mean sea level, -500..11000 m. [m]

    Returns
    -------
    numpy.ndarray
        Air temperature. [K]

    Raises
    ------
    InputError
        If an elevation is NaN, infinite or outside -500..11000 m.

    References
    ----------
    .. [1] ICAO Doc 7488/3 (1993), Table A; U.S. Standard Atmosphere 1976 (identical below 32 km).
    """
    height = _checked("elevation", elevation, ISA_ELEVATION_RANGE, "m")
    return ISA_SEA_LEVEL_TEMPERATURE + ISA_LAPSE_RATE * height


def isa_pressure(elevation: ArrayLike) -> NDArray[np.float64]:
    """ISA air pressure in the troposphere.

    p = 101325 Pa * (T / 288.15 K)^5.255880, T from :func:`isa_temperature`.

    Parameters
    ----------
    elevation : float or array
        Geopotential height H above mean sea level, -500..11000 m. [m]

    Returns
    -------
    numpy.ndarray
        Air pressure. [Pa]

    Raises
    ------
    InputError
        If an elevation is NaN, infinite or outside -500..11000 m.

    References
    ----------
    .. [1] ICAO Doc 7488/3 (1993); U.S. Standard Atmosphere 1976.
    """
    temperature = isa_temperature(elevation)
    return ISA_SEA_LEVEL_PRESSURE * (temperature / ISA_SEA_LEVEL_TEMPERATURE) ** (
        ISA_PRESSURE_EXPONENT
    )


def isa_density(elevation: ArrayLike) -> NDArray[np.float64]:
    """ISA air density in the troposphere (dry ideal gas).

    rho = p / (R T), R = 287.05287 J/(kg K).

    Parameters
    ----------
    elevation : float or array
        Geopotential height H above mean sea level, -500..11000 m. [m]

    Returns
    -------
    numpy.ndarray
        Air density. [kg/m^3]

    Raises
    ------
    InputError
        If an elevation is NaN, infinite or outside -500..11000 m.

    References
    ----------
    .. [1] ICAO Doc 7488/3 (1993), Table A.
    """
    return isa_pressure(elevation) / (ISA_GAS_CONSTANT_DRY_AIR * isa_temperature(elevation))


def saturation_vapour_pressure(temperature: ArrayLike) -> NDArray[np.float64]:
    """Saturation vapour pressure of water over a plane liquid surface (CIPM-2007).

    p_sv = 1 Pa * exp(A T^2 + B T + C + D / T), A = 1.2378847e-5 K^-2, B = -1.9121316e-2 K^-1,
    C = 33.93711047, D = -6.3431645e3 K.

    Parameters
    ----------
    temperature : float or array
        Air temperature, 223.15..333.15 K. [K]

    Returns
    -------
    numpy.ndarray
        Saturation vapour pressure. [Pa]

    Raises
    ------
    InputError
        If a temperature is NaN, infinite or outside 223.15..333.15 K.

    Notes
    -----
    Picard et al. state the formula for 15..27 degC; it stays within about 1e-4 of the IAPWS
    values from 0.01 to 60 degC (see the tests). Below 0 degC it is the (supercooled) liquid
    value, as meteorological relative humidity is defined.

    References
    ----------
    .. [1] A. Picard et al., Metrologia 45 (2008) 149-155, appendix A1, eq. A1.1.
    """
    t = _checked("temperature", temperature, TEMPERATURE_RANGE, "K", _TEMPERATURE_NOTE)
    return np.exp(_PSV_A * t**2 + _PSV_B * t + _PSV_C + _PSV_D / t)


def enhancement_factor(pressure: ArrayLike, temperature: ArrayLike) -> NDArray[np.float64]:
    """Enhancement factor of water vapour in air (CIPM-2007).

    f = alpha + beta p + gamma t^2, alpha = 1.00062, beta = 3.14e-8 Pa^-1, gamma = 5.6e-7 K^-2,
    t the temperature in degC.

    Parameters
    ----------
    pressure : float or array
        Air pressure, 30..110 kPa. [Pa]
    temperature : float or array
        Air temperature, 223.15..333.15 K. [K]

    Returns
    -------
    numpy.ndarray
        Enhancement factor f. [-]

    Raises
    ------
    InputError
        If a value is NaN, infinite or outside its range.

    References
    ----------
    .. [1] A. Picard et al., Metrologia 45 (2008) 149-155, appendix A1, eq. A1.2.
    """
    p = _checked("pressure", pressure, PRESSURE_RANGE, "Pa")
    t_kelvin = _checked("temperature", temperature, TEMPERATURE_RANGE, "K", _TEMPERATURE_NOTE)
    t = t_kelvin - _CELSIUS_OFFSET
    return _ENHANCEMENT_ALPHA + _ENHANCEMENT_BETA * p + _ENHANCEMENT_GAMMA * t**2


def humid_air_density(
    temperature: ArrayLike,
    pressure: ArrayLike,
    relative_humidity: ArrayLike,
    co2_mole_fraction: ArrayLike = CIPM2007_REFERENCE_CO2_MOLE_FRACTION,
) -> NDArray[np.float64]:
    """Density of moist air by the CIPM-2007 equation.

    rho = p M_a / (Z R T) * [1 - x_v (1 - M_v / M_a)], with x_v = h f p_sv / p,
    M_a = [28.96546 + 12.011 (x_CO2 - 0.0004)] 1e-3 kg/mol, M_v = 18.01528e-3 kg/mol,
    R = 8.314472 J/(mol K), and the compressibility factor
    Z = 1 - (p/T)[a0 + a1 t + a2 t^2 + (b0 + b1 t) x_v + (c0 + c1 t) x_v^2] + (p/T)^2 (d + e x_v^2).

    Parameters
    ----------
    temperature : float or array
        Air temperature, 223.15..333.15 K. [K]
    pressure : float or array
        Air pressure, 30..110 kPa. [Pa]
    relative_humidity : float or array
        Relative humidity h as a fraction, 0..1 (0.5 means 50 %). [-]
    co2_mole_fraction : float or array
        Mole fraction of CO2 in dry air, 0..0.01. [mol/mol]

    Returns
    -------
    numpy.ndarray
        Density of the moist air. [kg/m^3]

    Raises
    ------
    InputError
        If a value is NaN, infinite or outside its range (a humidity given in per cent, e.g. 50,
        is refused).

    Notes
    -----
    The stated validity of CIPM-2007 is 600..1100 hPa and 15..27 degC, where its relative
    uncertainty is 2.2e-5. Outside that range the real-gas terms (Z differs from 1 by < 1e-3)
    and the vapour-pressure fit lose accuracy slowly; for dropped-object work, where the drag
    coefficient is uncertain by several per cent, the formula remains far more accurate than
    needed.

    References
    ----------
    .. [1] A. Picard et al., Metrologia 45 (2008) 149-155, section 2 and appendix A1
       (eqs. A1.1 to A1.3).
    """
    t_kelvin = _checked("temperature", temperature, TEMPERATURE_RANGE, "K", _TEMPERATURE_NOTE)
    p = _checked("pressure", pressure, PRESSURE_RANGE, "Pa")
    h = _checked(
        "relative_humidity", relative_humidity, RELATIVE_HUMIDITY_RANGE, "", _FRACTION_NOTE
    )
    x_co2 = _checked("co2_mole_fraction", co2_mole_fraction, CO2_MOLE_FRACTION_RANGE, "mol/mol")

    t = t_kelvin - _CELSIUS_OFFSET
    x_v = h * enhancement_factor(p, t_kelvin) * saturation_vapour_pressure(t_kelvin) / p
    p_over_t = p / t_kelvin
    z = (
        1.0
        - p_over_t
        * (
            _Z_A0
            + _Z_A1 * t
            + _Z_A2 * t**2
            + (_Z_B0 + _Z_B1 * t) * x_v
            + (_Z_C0 + _Z_C1 * t) * x_v**2
        )
        + p_over_t**2 * (_Z_D + _Z_E * x_v**2)
    )
    molar_mass_dry = CIPM2007_MOLAR_MASS_DRY_AIR + CIPM2007_CO2_MOLAR_MASS_COEFFICIENT * (
        x_co2 - CIPM2007_REFERENCE_CO2_MOLE_FRACTION
    )
    return (
        p
        * molar_mass_dry
        / (z * CIPM2007_MOLAR_GAS_CONSTANT * t_kelvin)
        * (1.0 - x_v * (1.0 - CIPM2007_MOLAR_MASS_WATER / molar_mass_dry))
    )


def dynamic_viscosity(temperature: ArrayLike) -> NDArray[np.float64]:
    """Dynamic viscosity of air by Sutherland's law.

    mu = beta_s T^1.5 / (T + S), beta_s = 1.458e-6 kg/(m s K^0.5), S = 110.4 K.

    Parameters
    ----------
    temperature : float or array
        Air temperature, 223.15..333.15 K. [K]

    Returns
    -------
    numpy.ndarray
        Dynamic viscosity. [Pa s]

    Raises
    ------
    InputError
        If a temperature is NaN, infinite or outside 223.15..333.15 K.

    References
    ----------
    .. [1] ICAO Doc 7488/3 (1993); U.S. Standard Atmosphere 1976, eq. 51 (from memory).
    """
    t = _checked("temperature", temperature, TEMPERATURE_RANGE, "K", _TEMPERATURE_NOTE)
    return SUTHERLAND_COEFFICIENT * t**1.5 / (t + SUTHERLAND_CONSTANT)


@dataclass(frozen=True)
class AirState:
    """The air a falling object moves through, and where its density came from.

    Attributes
    ----------
    density : float
        Air density. [kg/m^3]
    temperature : float
        Air temperature. [K]
    pressure : float
        Air pressure. [Pa]
    relative_humidity : float
        Relative humidity as a fraction 0..1. [-]
    viscosity : float
        Dynamic viscosity (Sutherland). [Pa s]
    basis : str
        What the density came from, in words, e.g. "ISA at 350 m elevation".
    """

    density: float
    temperature: float
    pressure: float
    relative_humidity: float
    viscosity: float
    basis: str


def air_state(
    elevation: float = 0.0,
    temperature: float | None = None,
    pressure: float | None = None,
    relative_humidity: float | None = None,
    density: float | None = None,
) -> AirState:
    """Resolve the air at the site from what the user gave.

    Precedence: a given ``density`` is used as is (the other fields then describe the ISA at the
    elevation, or the given values). Otherwise a missing temperature or pressure is taken from
    the ISA at the elevation and a missing humidity is 0 (dry, as in the ISA); with none of the
    three given the ISA density is used, else the CIPM-2007 humid-air density.

    Parameters
    ----------
    elevation : float
        Site elevation above mean sea level (geopotential height), -500..5000 m. [m]
    temperature : float, optional
        Air temperature, 223.15..333.15 K (-50..+60 degC). [K]
    pressure : float, optional
        Air pressure at the site (station pressure, not reduced to sea level), 30..110 kPa. [Pa]
    relative_humidity : float, optional
        Relative humidity as a fraction, 0..1. [-]
    density : float, optional
        Air density given by the user, 0.3..1.6 kg/m^3. [kg/m^3]

    Returns
    -------
    AirState
        Density, temperature, pressure, humidity, viscosity and the basis in words.

    Raises
    ------
    InputError
        If a value is NaN, infinite or outside its range; the message names the field.
    """
    elevation = float(_checked("elevation", elevation, SITE_ELEVATION_RANGE, "m"))
    if temperature is not None:
        temperature = float(
            _checked("temperature", temperature, TEMPERATURE_RANGE, "K", _TEMPERATURE_NOTE)
        )
    if pressure is not None:
        pressure = float(_checked("pressure", pressure, PRESSURE_RANGE, "Pa"))
    if relative_humidity is not None:
        relative_humidity = float(
            _checked(
                "relative_humidity", relative_humidity, RELATIVE_HUMIDITY_RANGE, "", _FRACTION_NOTE
            )
        )
    if density is not None:
        density = float(_checked("density", density, DENSITY_RANGE, "kg/m^3"))

    defaulted = [
        name
        for name, value in (("temperature", temperature), ("pressure", pressure))
        if value is None
    ]
    weather_given = len(defaulted) < 2 or relative_humidity is not None
    temperature = float(isa_temperature(elevation)) if temperature is None else temperature
    pressure = float(isa_pressure(elevation)) if pressure is None else pressure
    relative_humidity = 0.0 if relative_humidity is None else relative_humidity

    if density is not None:
        basis = "given by the user"
    elif weather_given:
        density = float(humid_air_density(temperature, pressure, relative_humidity))
        isa_note = f"; {' and '.join(defaulted)} from ISA at {elevation:g} m" if defaulted else ""
        basis = (
            f"{temperature - _CELSIUS_OFFSET:.1f} °C, {pressure / 1000:.1f} kPa, "
            f"{relative_humidity * 100:.0f} % RH (CIPM-2007{isa_note})"
        )
    else:
        density = float(isa_density(elevation))
        basis = f"ISA at {elevation:g} m elevation"
    return AirState(
        density=density,
        temperature=temperature,
        pressure=pressure,
        relative_humidity=relative_humidity,
        viscosity=float(dynamic_viscosity(temperature)),
        basis=basis,
    )
