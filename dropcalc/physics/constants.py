"""Physical constants used by the physics core, each with its source. SI units throughout."""

from __future__ import annotations

#: Standard acceleration of gravity [m/s^2]. 3rd CGPM (1901), Comptes rendus p. 70.
STANDARD_GRAVITY = 9.80665

#: Reference height of wind speeds [m].
#: WMO-No. 8, Guide to Meteorological Instruments and Methods of Observation (from memory).
WIND_REFERENCE_HEIGHT = 10.0

#: ISA sea-level temperature [K]. ICAO Doc 7488/3 (1993), Table A.
ISA_SEA_LEVEL_TEMPERATURE = 288.15

#: ISA sea-level pressure [Pa]. ICAO Doc 7488/3 (1993), Table A.
ISA_SEA_LEVEL_PRESSURE = 101325.0

#: ISA tropospheric temperature gradient [K/m] (0 to 11 km geopotential). ICAO Doc 7488/3 (1993).
ISA_LAPSE_RATE = -0.0065

#: Specific gas constant of dry air used by the ISA [J/(kg K)]. ICAO Doc 7488/3 (1993).
ISA_GAS_CONSTANT_DRY_AIR = 287.05287

#: Earth radius used for geopotential height [m]. ICAO Doc 7488/3 (1993) / US Std Atm 1976.
ISA_EARTH_RADIUS = 6356766.0

# --- Wind: EN 1991-1-4 and ASCE 7-16 terrain models (used by dropcalc.physics.wind) -------------

#: Roughness length of EN terrain category II, z_0,II [m]. EN 1991-1-4:2005, eq. (4.5).
EN_REFERENCE_ROUGHNESS_LENGTH = 0.05

#: Terrain factor of EN terrain category II, the 0.19 in k_r [-]. EN 1991-1-4:2005, eq. (4.5).
EN_REFERENCE_TERRAIN_FACTOR = 0.19

#: Exponent in the EN terrain factor k_r = 0.19 (z0/z0_II)^0.07 [-]. EN 1991-1-4:2005, eq. (4.5).
EN_TERRAIN_FACTOR_EXPONENT = 0.07

#: Coefficient of I_v in the EN peak velocity pressure q_p = (1 + 7 I_v) 1/2 rho v_m^2 [-].
#: EN 1991-1-4:2005, eq. (4.8).
EN_PEAK_TURBULENCE_COEFFICIENT = 7.0

#: Upper height limit of the EN 1991-1-4 profile formulas, z_max [m]. EN 1991-1-4:2005, 4.3.2.
EN_MAXIMUM_HEIGHT = 200.0

#: Height below which ASCE 7 holds K_z constant, 15 ft = 4.572 m exactly (1 ft = 0.3048 m) [m].
#: ASCE 7-16, Table 26.10-1, note.
ASCE_MINIMUM_HEIGHT = 15 * 0.3048

#: Ratio of a gust to the mean speed at 10 m when no terrain model gives one [-].
#: Common practice, no source (close to the 3-s-gust / hourly-mean ratio of about 1.5 of the
#: Durst curve for open terrain, from memory).
DEFAULT_GUST_FACTOR = 1.5

# --- Air and gravity (used by atmosphere.py and gravity.py) ---------------------------------

#: ISA pressure exponent g0/(R L) in p = p0 (T/T0)^n [-]. ICAO Doc 7488/3 (1993), as quoted in
#: [ISA-1993] (g0 / (287.05287 x 0.0065) = 5.2558770; the printed 5.255880 is used).
ISA_PRESSURE_EXPONENT = 5.255880

#: Molar gas constant adopted in CIPM-2007 [J/(mol K)]. Picard et al., Metrologia 45 (2008) 149.
CIPM2007_MOLAR_GAS_CONSTANT = 8.314472

#: Molar mass of dry air at a CO2 mole fraction of 0.0004 [kg/mol]. Picard et al. (2008).
CIPM2007_MOLAR_MASS_DRY_AIR = 28.96546e-3

#: Molar mass of water [kg/mol]. Picard et al., Metrologia 45 (2008) 149, appendix A1.
CIPM2007_MOLAR_MASS_WATER = 18.01528e-3

#: Reference CO2 mole fraction of the dry-air molar mass [mol/mol]. Picard et al. (2008).
CIPM2007_REFERENCE_CO2_MOLE_FRACTION = 0.0004

#: Change of the dry-air molar mass per unit CO2 mole fraction (O2 replaced by CO2, i.e. the
#: molar mass of carbon) [kg/mol]. Picard et al., Metrologia 45 (2008) 149.
CIPM2007_CO2_MOLAR_MASS_COEFFICIENT = 12.011e-3

#: Sutherland coefficient beta_s of air [kg/(m s K^0.5)]. ICAO Doc 7488/3 (1993); US Standard
#: Atmosphere 1976, eq. 51 (equation number from memory).
SUTHERLAND_COEFFICIENT = 1.458e-6

#: Sutherland constant S of air [K]. ICAO Doc 7488/3 (1993); US Standard Atmosphere 1976.
SUTHERLAND_CONSTANT = 110.4

#: WGS84 normal gravity at the equator gamma_e [m/s^2]. NIMA TR8350.2, 3rd ed. (2000), ch. 3.
WGS84_EQUATORIAL_GRAVITY = 9.7803253359

#: WGS84 Somigliana constant k = (b gamma_p)/(a gamma_e) - 1 [-]. NIMA TR8350.2 (2000), eq. 4-1.
WGS84_SOMIGLIANA_CONSTANT = 0.00193185265241

#: WGS84 first eccentricity squared e^2 [-]. NIMA TR8350.2, 3rd ed. (2000), ch. 3.
WGS84_FIRST_ECCENTRICITY_SQUARED = 0.00669437999013

#: Conventional free-air gradient of normal gravity [1/s^2] (-0.3086 mGal/m), linear
#: approximation of NIMA TR8350.2 (2000), eq. 4-3. [WGS84-2000].
FREE_AIR_GRADIENT = -3.086e-6

# --- Shape-based drag (used by dropcalc.physics.shapes) --------------------------------------

#: Tumbling drag area divided by the mean projected area S/4 of a convex body [-].
#: (1.0-1.1) S/4, derived from [GANSER-1993] (Ganser, Powder Technol. 77 (1993) 143-152);
#: the middle of that range is taken.
TUMBLING_DRAG_FACTOR = 1.05

#: Fraction of its bounding box's projected area that a compact irregular body (a hammer, a
#: drill, a radio) presents [-]. Common practice, no source.
IRREGULAR_COMPACTNESS_FACTOR = 0.8

#: Default outline fill of an ``irregular`` body: the share of its bounding rectangle that its
#: largest projected outline covers [-]. 1.0 takes the whole rectangle, an upper bound on any
#: outline (geometry, no further source), used where an object's outline is not known; objects
#: whose outline is known state ``outline_fill`` in the library (e.g. a hammer, about 0.3).
IRREGULAR_OUTLINE_FILL = 1.0

#: Thickness over the next-larger dimension below which a flat body (sheet, board, disc) is
#: flagged as able to glide and autorotate [-]. Common practice, no source; the flying behaviour
#: of sheets is from Holmes, Letchford & Lin, J. Wind Eng. Ind. Aerodyn. 94 (2006) 21-39.
GLIDE_THICKNESS_RATIO = 0.1

# --- WGS84 ellipsoid (used by dropcalc.analysis.plan for local metres <-> lon/lat) ---------

#: WGS84 semi-major axis a [m]. NIMA TR8350.2, 3rd ed. (2000), Table 3.1 (defining parameter).
WGS84_SEMI_MAJOR_AXIS = 6378137.0

#: WGS84 inverse flattening 1/f [-]. NIMA TR8350.2, 3rd ed. (2000), Table 3.1 (defining
#: parameter). e^2 = f (2 - f) reproduces WGS84_FIRST_ECCENTRICITY_SQUARED above to 2e-15.
WGS84_INVERSE_FLATTENING = 298.257223563
