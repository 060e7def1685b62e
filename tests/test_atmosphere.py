"""Checks of dropcalc.physics.atmosphere against published values and reference libraries."""

from __future__ import annotations

import math

import numpy as np
import pytest
from ambiance import Atmosphere
from fluids import ATMOSPHERE_1976

from dropcalc.errors import InputError
from dropcalc.physics.atmosphere import (
    AirState,
    air_state,
    dynamic_viscosity,
    enhancement_factor,
    geopotential_height,
    humid_air_density,
    isa_density,
    isa_pressure,
    isa_temperature,
    saturation_vapour_pressure,
)

# --- ISA ----------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("elevation", "density"),
    # ICAO Doc 7488/3 (1993) table, as quoted in [ISA-1993] (geopotential height H).
    [(0.0, 1.225000), (1000.0, 1.111643), (2000.0, 1.006490)],
)
def test_isa_density_matches_icao_table(elevation: float, density: float) -> None:
    # Printed to 6 decimals. Tolerance is one unit in the last digit, not half: at 1000 m both
    # this code and ambiance give 1.1116425 (half a unit below the printed 1.111643).
    assert float(isa_density(elevation)) == pytest.approx(density, abs=1e-6)


def test_isa_temperature_and_pressure_at_5000_m() -> None:
    # ICAO / US Standard Atmosphere 1976 table at H = 5000 m: 255.65 K, 54019.9 Pa (from memory).
    assert float(isa_temperature(5000.0)) == pytest.approx(255.65, abs=0.005)
    assert float(isa_pressure(5000.0)) == pytest.approx(54019.9, abs=0.05)
    # Cross-check with ambiance (geometric input: convert H = 5000 m to geometric height).
    reference = Atmosphere(6356766.0 * 5000.0 / (6356766.0 - 5000.0))
    assert float(reference.temperature[0]) == pytest.approx(255.65, abs=1e-6)
    assert float(reference.pressure[0]) == pytest.approx(float(isa_pressure(5000.0)), rel=1e-6)


def test_isa_matches_ambiance_using_geopotential_conversion() -> None:
    # ambiance.Atmosphere takes GEOMETRIC height; we convert it with geopotential_height.
    # Tolerance 1e-6 relative covers the printed exponent 5.255880 vs g0/(R L) = 5.2558770.
    geometric = np.array([0.0, 500.0, 1000.0, 2000.0, 3000.0, 4000.0, 5000.0])
    reference = Atmosphere(geometric)
    elevation = geopotential_height(geometric)
    np.testing.assert_allclose(elevation, reference.H, rtol=0, atol=1e-6)
    np.testing.assert_allclose(isa_density(elevation), reference.density, rtol=1e-6)
    np.testing.assert_allclose(isa_pressure(elevation), reference.pressure, rtol=1e-6)
    np.testing.assert_allclose(isa_temperature(elevation), reference.temperature, rtol=1e-9)


def test_geometric_height_is_not_geopotential_height() -> None:
    # Quantifies the difference the conversion removes: at 5000 m geometric, H is 3.93 m lower
    # (ambiance.Atmosphere(5000).H = 4996.07). With d(rho)/dH = -(rho/T)(g0/R + L)
    # = -(0.7361/255.65)(0.034163 - 0.0065) = -7.96e-5 kg/m3 per m (derived from the ISA
    # formulas), using geometric height as if geopotential would understate rho by 3.13e-4.
    assert 5000.0 - float(geopotential_height(5000.0)) == pytest.approx(3.93, abs=0.01)
    difference = float(isa_density(5000.0)) - float(Atmosphere(5000.0).density[0])
    assert difference == pytest.approx(-3.13e-4, abs=0.02e-4)


def test_isa_functions_are_vectorised() -> None:
    elevation = np.array([[0.0, 1000.0], [2000.0, 5000.0]])
    assert isa_density(elevation).shape == (2, 2)


@pytest.mark.parametrize("elevation", [math.nan, math.inf, -math.inf, -501.0, 11001.0])
def test_isa_refuses_bad_elevation(elevation: float) -> None:
    with pytest.raises(InputError, match="elevation must be between -500 and 11000 m"):
        isa_density(elevation)


def test_isa_refuses_one_bad_element_in_an_array() -> None:
    with pytest.raises(InputError, match="got nan m"):
        isa_temperature(np.array([0.0, math.nan, 100.0]))


# --- CIPM-2007 humid air -------------------------------------------------------------------


def test_humid_air_density_cipm2007_example() -> None:
    # Picard et al., Metrologia 45 (2008) 149-155 ([ISA-1993]): 1.19931 kg/m3 at 20 degC,
    # 101325 Pa, 50 % RH, x_CO2 = 0.0004. We get 1.1993139: within half a unit of the printed
    # last digit (3e-6 relative), so the tolerance is the printed precision.
    density = float(humid_air_density(293.15, 101325.0, 0.5))
    assert density == pytest.approx(1.19931, abs=0.5e-5)


def test_dry_air_at_isa_sea_level_is_isa_density_plus_real_gas_correction() -> None:
    # The ISA treats air as an ideal gas with R = 287.05287 J/(kg K). CIPM-2007 differs by
    # (a) its R/M_a = 8.314472 / 0.02896546 = 287.0493 J/(kg K): +1.2e-5 relative, and
    # (b) the compressibility factor Z of dry air at 15 degC, 1 atm, which is 1 + B p / (R T)
    #     with the second virial coefficient of air B ~ -10 cm3/mol (from memory): about
    #     -4.1e-4, so rho is higher by about 4.1e-4.
    # Expected: +4.2e-4 relative (1.22551 kg/m3), tolerance 0.3e-4 for the remembered B.
    density = float(humid_air_density(288.15, 101325.0, 0.0))
    assert density / 1.225 - 1.0 == pytest.approx(4.2e-4, abs=0.3e-4)


def test_co2_correction_of_the_dry_air_molar_mass() -> None:
    # Picard et al. (2008): M_a = [28.96546 + 12.011 (x_CO2 - 0.0004)] 1e-3 kg/mol; for dry air
    # the density scales with M_a (Z does not depend on x_CO2).
    ratio = float(humid_air_density(293.15, 101325.0, 0.0, co2_mole_fraction=0.0014)) / float(
        humid_air_density(293.15, 101325.0, 0.0)
    )
    assert ratio == pytest.approx((28.96546 + 12.011 * 0.001) / 28.96546, rel=1e-12)


@pytest.mark.parametrize(
    ("temperature", "pressure", "tolerance"),
    [
        # Triple point of water, 611.657 Pa (IAPWS, Wagner & Pruss, J. Phys. Chem. Ref. Data 31
        # (2002) 387; from memory). Within the CIPM fit's accuracy.
        (273.16, 611.657, 1e-5),
        # Saturation pressure at 20 degC, 2.3392 kPa (Cengel & Boles, Thermodynamics, Table A-4,
        # from IAPWS-95; from memory). Printed precision 1 Pa.
        (293.15, 2339.2, 0.5 / 2339.2),
        # 60 degC, 19.947 kPa (same table, from memory); outside the fit's stated 15..27 degC
        # range, where it drifts by ~4e-5, hence 1e-4.
        (333.15, 19947.0, 1e-4),
    ],
)
def test_saturation_vapour_pressure_against_iapws(
    temperature: float, pressure: float, tolerance: float
) -> None:
    assert float(saturation_vapour_pressure(temperature)) == pytest.approx(pressure, rel=tolerance)


def test_enhancement_factor_against_buck_1981() -> None:
    # Buck, J. Appl. Meteorol. 20 (1981) 1527-1532: f_w = 1.0007 + 3.46e-6 P[hPa] (from memory),
    # an independent fit; the two agree to a few 1e-4 at 20 degC, 1 atm (1.00421 vs 1.00403).
    buck = 1.0007 + 3.46e-6 * 1013.25
    assert float(enhancement_factor(101325.0, 293.15)) == pytest.approx(buck, abs=3e-4)


@pytest.mark.parametrize(
    ("field", "arguments"),
    [
        ("relative_humidity", (293.15, 101325.0, 50.0)),  # per cent instead of fraction
        ("relative_humidity", (293.15, 101325.0, -0.1)),
        ("temperature", (math.nan, 101325.0, 0.5)),
        ("temperature", (400.0, 101325.0, 0.5)),
        ("pressure", (293.15, math.inf, 0.5)),
        ("pressure", (293.15, 1013.25, 0.5)),  # hPa instead of Pa
    ],
)
def test_humid_air_density_refuses_bad_input(field: str, arguments: tuple[float, ...]) -> None:
    with pytest.raises(InputError, match=f"^{field} must be between"):
        humid_air_density(*arguments)


# --- Viscosity -----------------------------------------------------------------------------


def test_viscosity_at_sea_level_matches_us_standard_atmosphere_table() -> None:
    # U.S. Standard Atmosphere 1976, table at 0 m: 1.7894e-5 Pa s (printed to 5 digits).
    assert float(dynamic_viscosity(288.15)) == pytest.approx(1.7894e-5, abs=0.5e-9)


@pytest.mark.parametrize("temperature", [223.15, 255.65, 273.15, 288.15, 310.0, 333.15])
def test_viscosity_matches_fluids_atmosphere_1976(temperature: float) -> None:
    # fluids.ATMOSPHERE_1976 computes mu from the 1976 standard's Sutherland law; pick the height
    # whose 1976 temperature is ours (lapse 6.5 K/km below 11 km, negative heights above 15 degC).
    geopotential = (288.15 - temperature) / 0.0065
    geometric = 6356766.0 * geopotential / (6356766.0 - geopotential)
    reference = ATMOSPHERE_1976(geometric)
    reference_temperature = reference.T
    assert reference_temperature == pytest.approx(temperature, abs=1e-9)
    assert float(dynamic_viscosity(temperature)) == pytest.approx(reference.mu, rel=1e-9)


def test_viscosity_matches_ambiance() -> None:
    reference = Atmosphere(np.array([0.0, 2500.0, 5000.0]))
    np.testing.assert_allclose(
        dynamic_viscosity(reference.temperature), reference.dynamic_viscosity, rtol=1e-9
    )


# --- air_state resolver --------------------------------------------------------------------


def test_air_state_defaults_to_isa_at_the_elevation() -> None:
    state = air_state(elevation=1000.0)
    assert isinstance(state, AirState)
    assert state.density == pytest.approx(1.111643, abs=1e-6)  # ICAO table, as above
    assert state.relative_humidity == 0.0
    assert state.basis == "ISA at 1000 m elevation"


def test_air_state_uses_cipm_when_weather_is_given() -> None:
    state = air_state(temperature=293.15, pressure=101325.0, relative_humidity=0.5)
    assert state.density == pytest.approx(1.19931, abs=0.5e-5)  # Picard et al. (2008)
    assert state.basis == "20.0 °C, 101.3 kPa, 50 % RH (CIPM-2007)"


def test_air_state_fills_missing_weather_from_isa_and_says_so() -> None:
    state = air_state(elevation=2000.0, relative_humidity=0.0)
    # Dry air at ISA T and p: the ISA table density plus the ~4e-4 real-gas correction above.
    assert state.density / 1.006490 - 1.0 == pytest.approx(4.3e-4, abs=0.4e-4)
    assert state.temperature == pytest.approx(275.15)  # ICAO: 288.15 - 0.0065 * 2000
    assert "temperature and pressure from ISA at 2000 m" in state.basis


def test_air_state_takes_a_given_density_as_is() -> None:
    state = air_state(elevation=350.0, density=1.2)
    assert state.density == 1.2
    assert state.basis == "given by the user"
    assert state.temperature == pytest.approx(288.15 - 0.0065 * 350.0)  # ICAO lapse rate
    assert state.viscosity == pytest.approx(ATMOSPHERE_1976(350.0).mu, rel=1e-4)


def test_air_state_is_frozen() -> None:
    state = air_state()
    with pytest.raises(AttributeError):
        state.density = 1.0  # type: ignore[misc]


@pytest.mark.parametrize(
    ("arguments", "message"),
    [
        ({"elevation": 6000.0}, "elevation must be between -500 and 5000 m; got 6000 m"),
        ({"elevation": math.nan}, "elevation must be between -500 and 5000 m; got nan m"),
        ({"temperature": 20.0}, "temperature must be between 223.15 and 333.15 K"),
        ({"temperature": math.inf}, "temperature must be between"),
        ({"pressure": 1013.0}, "pressure must be between 30000 and 110000 Pa; got 1013 Pa"),
        ({"relative_humidity": 60.0}, "relative_humidity must be between 0 and 1"),
        ({"relative_humidity": math.nan}, "relative_humidity must be between 0 and 1"),
        ({"density": 0.0}, "density must be between 0.3 and 1.6 kg/m^3; got 0 kg/m^3"),
        ({"density": math.nan}, "density must be between 0.3 and 1.6 kg/m^3; got nan"),
        ({"density": -math.inf}, "density must be between 0.3 and 1.6 kg/m^3"),
    ],
)
def test_air_state_refuses_bad_input(arguments: dict[str, float], message: str) -> None:
    with pytest.raises(InputError, match=message.replace("^", r"\^")):
        air_state(**arguments)
