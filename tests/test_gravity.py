"""Checks of dropcalc.physics.gravity against NIMA TR8350.2 values and independent formulas."""

from __future__ import annotations

import math

import numpy as np
import pytest

from dropcalc.errors import InputError
from dropcalc.physics.gravity import gravity, local_gravity, normal_gravity

# WGS84 defining / derived constants, NIMA TR8350.2, 3rd ed. (2000), chapter 3 tables
# (from memory): semi-major axis, flattening, m = omega^2 a^2 b / GM.
WGS84_A = 6378137.0
WGS84_F = 1.0 / 298.257223563
WGS84_M = 0.00344978650684


def test_normal_gravity_at_equator_and_pole() -> None:
    # NIMA TR8350.2 (2000), chapter 3: gamma_e = 9.7803253359, gamma_p = 9.8321849378 m/s2
    # (from memory). Printed to 1e-10; the formula's constants are rounded to 14 decimals, so
    # the pole value is reproduced to 6e-11: tolerance one unit in the last printed digit.
    assert float(normal_gravity(0.0)) == pytest.approx(9.7803253359, abs=1e-10)
    assert float(normal_gravity(90.0)) == pytest.approx(9.8321849378, abs=1e-10)
    assert float(normal_gravity(-90.0)) == pytest.approx(9.8321849378, abs=1e-10)


@pytest.mark.parametrize("latitude", [0.0, 15.0, 30.0, 45.0, 51.5, 60.0, 75.0, 90.0])
def test_normal_gravity_against_gravity_formula_1980_series(latitude: float) -> None:
    # International Gravity Formula 1980 (GRS80): g = 9.780327 (1 + 0.0053024 sin^2(phi)
    # - 0.0000058 sin^2(2 phi)); Moritz, "Geodetic Reference System 1980", Bull. Geod. 54
    # (1980) 395-405 (from memory). Its coefficients depend only on the ellipsoid's shape, which
    # GRS80 and WGS84 share to 1e-10, so we scale the series by the WGS84 gamma_e (GRS80's
    # 9.7803267715 is 1.4e-6 m/s2 higher). The series is truncated and printed to 7 decimals
    # (5e-8 relative), so it agrees to about 5e-7 m/s2: tolerance 1e-6 m/s2.
    phi = math.radians(latitude)
    series = 9.7803253359 * (
        1 + 0.0053024 * math.sin(phi) ** 2 - 0.0000058 * math.sin(2 * phi) ** 2
    )
    assert float(normal_gravity(latitude)) == pytest.approx(series, abs=1e-6)


def test_normal_gravity_against_unscaled_gravity_formula_1980() -> None:
    # The same series with its own 9.780327 (GRS80): differs by the gamma_e difference,
    # 1.4e-6 m/s2, plus the truncation above: within 3e-6 m/s2 at 45 deg.
    phi = math.radians(45.0)
    igf = 9.780327 * (1 + 0.0053024 * math.sin(phi) ** 2 - 0.0000058 * math.sin(2 * phi) ** 2)
    assert float(normal_gravity(45.0)) == pytest.approx(igf, abs=3e-6)


def _second_order_free_air(latitude: float, elevation: float) -> float:
    """NIMA TR8350.2 (2000) eq. 4-3, written out here from the document, not from the code."""
    sin_squared = math.sin(math.radians(latitude)) ** 2
    first = 2.0 / WGS84_A * (1.0 + WGS84_F + WGS84_M - 2.0 * WGS84_F * sin_squared) * elevation
    second = 3.0 * elevation**2 / WGS84_A**2
    return float(normal_gravity(latitude)) * (1.0 - first + second)


@pytest.mark.parametrize("latitude", [0.0, 45.0, 90.0])
@pytest.mark.parametrize("elevation", [-500.0, 1000.0, 5000.0])
def test_local_gravity_against_second_order_free_air_form(
    latitude: float, elevation: float
) -> None:
    # The linear -3.086e-6 s^-2 gradient departs from eq. 4-3 by at most 3.2e-5 m/s2 (3 ppm)
    # at 5000 m (pole): tolerance 3.5e-5 m/s2.
    expected = _second_order_free_air(latitude, elevation)
    assert float(local_gravity(latitude, elevation)) == pytest.approx(expected, abs=3.5e-5)


def test_free_air_gradient() -> None:
    # Conventional free-air gradient -0.3086 mGal/m = -3.086e-6 s^-2 ([WGS84-2000];
    # Heiskanen & Moritz, Physical Geodesy, 1967, from memory). The first-order term of
    # TR8350.2 eq. 4-3 at 45 deg is -2 gamma/a (1 + f + m - f) = -3.0855e-6 s^-2: they agree
    # within 0.1 %.
    gradient = float(local_gravity(45.0, 1000.0) - local_gravity(45.0, 0.0)) / 1000.0
    assert gradient == pytest.approx(-3.086e-6, rel=1e-9)
    first_order = -2.0 * float(normal_gravity(45.0)) / WGS84_A * (1.0 + WGS84_M)
    assert gradient == pytest.approx(first_order, rel=1e-3)


def test_gravity_defaults_to_standard_gravity() -> None:
    # 3rd CGPM (1901): g_n = 9.80665 m/s2 exactly.
    assert gravity() == 9.80665
    assert gravity(elevation=2000.0) == 9.80665


def test_gravity_with_a_latitude_is_local() -> None:
    # Closed values: gamma_e (TR8350.2) and the -3.086e-6 s^-2 gradient at 1000 m.
    assert gravity(0.0, 1000.0) == pytest.approx(9.7803253359 - 3.086e-3, abs=1e-10)


def test_normal_gravity_is_vectorised_and_symmetric() -> None:
    latitudes = np.array([-60.0, -30.0, 30.0, 60.0])
    values = normal_gravity(latitudes)
    assert values.shape == (4,)
    np.testing.assert_array_equal(values[:2], values[:1:-1])


@pytest.mark.parametrize("latitude", [math.nan, math.inf, -90.5, 91.0, 180.0])
def test_gravity_refuses_bad_latitude(latitude: float) -> None:
    with pytest.raises(InputError, match="latitude must be between -90 and 90 deg"):
        gravity(latitude)


@pytest.mark.parametrize("elevation", [math.nan, -math.inf, -600.0, 5001.0])
def test_gravity_refuses_bad_elevation(elevation: float) -> None:
    with pytest.raises(InputError, match="elevation must be between -500 and 5000 m"):
        gravity(45.0, elevation)
    with pytest.raises(InputError, match="elevation must be between -500 and 5000 m"):
        gravity(None, elevation)
