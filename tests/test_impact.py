"""Tests of dropcalc.physics.impact.impact_from_solution.

Mostly built on synthetic FallSolution values, so that every expected number is a hand value:
E = 1/2 m v^2 and p = m v (Newtonian mechanics), angles from the velocity components, compass
azimuth clockwise from north (x east, y north). The terminal fraction is checked against the
closed form of Timmerman and van der Weele, Am. J. Phys. 67 (1999) 538 ([TVDW-1999]).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from dropcalc.physics.impact import impact_from_solution
from dropcalc.physics.trajectory import FallSolution, WindField, solve_falls

G = 9.80665  # standard gravity [m/s^2], 3rd CGPM (1901)


def synthetic(
    positions: list[list[float]], velocities: list[list[float]], landed: list[bool]
) -> FallSolution:
    """A FallSolution with the given (n, 3) positions and velocities, time 2 s each."""
    n = len(landed)
    return FallSolution(
        time=np.full(n, 2.0),
        position=np.array(positions, dtype=float).T,
        velocity=np.array(velocities, dtype=float).T,
        landed=np.array(landed),
        steps=np.zeros(n, dtype=np.int64),
    )


def test_energy_momentum_angle_and_azimuth_hand_values() -> None:
    solution = synthetic(
        positions=[[10.0, 0.0, 0.0], [0.0, 5.0, 0.0], [-4.0, 0.0, 0.0], [0.0, -2.0, 0.0]],
        velocities=[[3.0, 0.0, -3.0], [0.0, 0.0, -10.0], [0.0, 4.0, -3.0], [-1.0, 0.0, -1.0]],
        landed=[True, True, True, True],
    )
    impact = impact_from_solution(solution, mass=2.0, drag_parameter=0.01, gravity=G)
    # Speeds: |(3, 0, -3)| = sqrt(18); 10; |(0, 4, -3)| = 5; sqrt(2).
    np.testing.assert_allclose(impact.impact_speed, [math.sqrt(18.0), 10.0, 5.0, math.sqrt(2.0)])
    np.testing.assert_allclose(impact.vertical_speed, [3.0, 10.0, 3.0, 1.0])
    np.testing.assert_allclose(impact.horizontal_speed, [3.0, 0.0, 4.0, 1.0])
    # E = 1/2 m v^2 = 18, 100, 25, 2 J; p = m v.
    np.testing.assert_allclose(impact.kinetic_energy, [18.0, 100.0, 25.0, 2.0])
    np.testing.assert_allclose(impact.momentum, 2.0 * impact.impact_speed)
    # From the vertical: 45 deg where horizontal = vertical speed; 0 straight down;
    # atan(4/3) = 53.130 deg.
    np.testing.assert_allclose(impact.impact_angle, [45.0, 0.0, 53.130102, 45.0], rtol=1e-7)
    # Drift to the east -> 90 deg, north -> 0, west -> 270, south -> 180 (compass bearing).
    np.testing.assert_allclose(impact.drift, [10.0, 5.0, 4.0, 2.0])
    np.testing.assert_allclose(impact.drift_azimuth, [90.0, 0.0, 270.0, 180.0], atol=1e-12)
    np.testing.assert_allclose(impact.fall_time, [2.0, 2.0, 2.0, 2.0])
    assert impact.landed.all()


def test_energy_per_contact_area() -> None:
    # E / A: 18 J on 1 cm^2 = 1.8e5 J/m^2 = 18 J/cm^2 (the unit of Bir et al. 2012 thresholds).
    solution = synthetic([[0.0, 0.0, 0.0]], [[3.0, 0.0, -3.0]], [True])
    impact = impact_from_solution(solution, 2.0, 0.01, G, contact_area=1e-4)
    assert impact.energy_per_area is not None
    np.testing.assert_allclose(impact.energy_per_area, [1.8e5])
    assert impact_from_solution(solution, 2.0, 0.01, G).energy_per_area is None


def test_not_landed_gives_nan_not_numbers() -> None:
    # An object carried beyond the solver's limits has no impact: every impact quantity NaN.
    solution = synthetic(
        [[10.0, 0.0, 0.0], [300.0, 0.0, 40.0]], [[3.0, 0.0, -3.0], [20.0, 0.0, -1.0]],
        [True, False],
    )  # fmt: skip
    impact = impact_from_solution(solution, 2.0, 0.01, G, contact_area=1e-4)
    for name in (
        "impact_speed", "vertical_speed", "horizontal_speed", "impact_angle", "kinetic_energy",
        "momentum", "fall_time", "drift", "terminal_fraction", "energy_per_area",
    ):  # fmt: skip
        values = getattr(impact, name)
        assert np.isfinite(values[0]), name
        assert np.isnan(values[1]), name
    np.testing.assert_array_equal(impact.landed, [True, False])


def test_not_landed_drift_azimuth_is_nan() -> None:
    solution = synthetic([[300.0, 0.0, 40.0]], [[20.0, 0.0, -1.0]], [False])
    impact = impact_from_solution(solution, 2.0, 0.01, G)
    assert np.isnan(impact.drift_azimuth[0])


@pytest.mark.parametrize(("release_height", "k"), [(2.0, 0.005), (10.0, 0.05), (60.0, 0.2)])
def test_terminal_fraction_in_still_air_is_closed_form(release_height: float, k: float) -> None:
    # Still air, from rest: v(h)/v_t = sqrt(1 - exp(-2 g h / v_t^2)) (Timmerman and
    # van der Weele 1999, [TVDW-1999]), with v_t^2 / g = 1/k.
    solution = solve_falls(release_height, [0.0, 0.0, 0.0], k, closed_form=False)
    impact = impact_from_solution(solution, 1.0, k, G)
    expected = math.sqrt(1.0 - math.exp(-2.0 * k * release_height))
    assert impact.terminal_fraction[0] == pytest.approx(expected, rel=1e-6)
    assert impact.terminal_speed[0] == pytest.approx(math.sqrt(G / k), rel=1e-12)
    # Height to 95 % of v_t: 1.1640 v_t^2/g ([TVDW-1999] [derived], 4 decimals).
    assert impact.height_to_95_percent[0] * k == pytest.approx(1.1640, abs=5e-5)


def test_terminal_fraction_moving_with_uniform_wind_is_still_air_value() -> None:
    # Wind-frame principle ([TVDW-1999]): released with a uniform 8 m/s wind, the speed
    # relative to the air at the ground is the still-air v(h), so the fraction is unchanged;
    # the ground-frame speed is sqrt(v(h)^2 + U^2).
    k, h, wind_speed = 0.05, 10.0, 8.0
    wind = WindField(speed_10m=wind_speed)
    solution = solve_falls(h, [wind_speed, 0.0, 0.0], k, wind=wind, closed_form=False)
    impact = impact_from_solution(solution, 1.0, k, G, wind=wind)
    fraction = math.sqrt(1.0 - math.exp(-2.0 * k * h))
    assert impact.terminal_fraction[0] == pytest.approx(fraction, rel=1e-6)
    vertical = fraction * math.sqrt(G / k)
    assert impact.impact_speed[0] == pytest.approx(math.hypot(vertical, wind_speed), rel=1e-6)
    assert impact.drift_azimuth[0] == pytest.approx(90.0)  # wind towards east


def test_vacuum_has_infinite_terminal_speed_and_galileo_energy() -> None:
    # k = 0: E = m g h (energy conservation), no terminal speed.
    solution = solve_falls(5.0, [0.0, 0.0, 0.0], 0.0)
    impact = impact_from_solution(solution, 3.0, 0.0, G)
    assert impact.kinetic_energy[0] == pytest.approx(3.0 * G * 5.0, rel=1e-12)
    assert impact.terminal_speed[0] == math.inf
