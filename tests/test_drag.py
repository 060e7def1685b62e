"""Tests of dropcalc.physics.drag against Newton's quadratic drag law and hand values.

Sources: F = 1/2 rho C_d A V^2 opposing the relative velocity (White, Fluid Mechanics, 7th ed.
(2011), sec. 7.6, from memory); v_t = sqrt(2 m g / (rho C_d A)) and k = rho C_d A / (2 m)
([TVDW-1999]); Re = rho V L / mu, also against fluids.core.Reynolds; units checked with pint.
"""

from __future__ import annotations

import math

import numpy as np
import pint
import pytest
from fluids.core import Reynolds

from dropcalc.physics.drag import (
    drag_area,
    drag_force,
    drag_parameter,
    reynolds_number,
    terminal_speed,
)

G = 9.80665  # standard gravity [m/s^2], 3rd CGPM (1901)


def test_drag_area_is_coefficient_times_area() -> None:
    # C_d A for a 10 cm sphere, Cd 0.47 (White, table 7.3, from memory): 0.47 * pi * 0.05^2
    # = 3.6914e-3 m^2 (hand value).
    assert float(drag_area(0.47, math.pi * 0.05**2)) == pytest.approx(3.6914e-3, rel=1e-4)


def test_drag_force_hand_value() -> None:
    # Falling at 10 m/s in a 5 m/s east wind: v - w = (-5, 0, -10) m/s, |v - w| = sqrt(125).
    # F = -1/2 rho CdA |v - w| (v - w) with rho = 1.2, CdA = 0.5:
    # 0.3 * 11.1803 * (5, 0, 10) = (16.7705, 0, 33.5410) N (hand value).
    force = drag_force([0.0, 0.0, -10.0], [5.0, 0.0, 0.0], 1.2, 0.5)
    np.testing.assert_allclose(force, [16.7705, 0.0, 33.5410], rtol=1e-5, atol=1e-12)


def test_drag_force_opposes_relative_velocity_and_has_newton_magnitude() -> None:
    # Newton's quadratic law: |F| = 1/2 rho CdA |v_rel|^2, F antiparallel to v_rel, for a
    # batch of arbitrary (3, n) velocities and winds.
    rng = np.random.default_rng(7)
    velocity = rng.normal(scale=10.0, size=(3, 20))
    wind = rng.normal(scale=5.0, size=(3, 20))
    wind[2] = 0.0
    rho, cd_area = 1.15, 0.02
    force = drag_force(velocity, wind, rho, cd_area)
    relative = velocity - wind
    rel_speed = np.linalg.norm(relative, axis=0)
    np.testing.assert_allclose(np.linalg.norm(force, axis=0), 0.5 * rho * cd_area * rel_speed**2)
    cosine = np.sum(force * relative, axis=0) / (np.linalg.norm(force, axis=0) * rel_speed)
    np.testing.assert_allclose(cosine, -1.0, rtol=1e-12)


def test_no_drag_when_moving_with_the_air() -> None:
    # v = w: no relative motion, no drag (the wind-frame principle, [TVDW-1999]).
    force = drag_force([3.0, -2.0, 0.0], [3.0, -2.0, 0.0], 1.2, 0.5)
    np.testing.assert_array_equal(force, [0.0, 0.0, 0.0])


def test_terminal_speed_formula_and_force_balance() -> None:
    # v_t = sqrt(2 m g / (rho Cd A)) ([TVDW-1999]). 1 kg, CdA 0.01 m^2, rho 1.225:
    # sqrt(2 * 9.80665 / 0.01225) = 40.0136 m/s (hand value).
    assert float(terminal_speed(1.0, 0.01, 1.225)) == pytest.approx(40.0136, rel=1e-5)
    # At v_t the drag on a body falling in still air balances its weight m g.
    masses = np.array([0.2, 1.0, 25.0])
    areas = np.array([0.01, 0.05, 0.3])
    vt = terminal_speed(masses, areas, 1.1)
    up_force = drag_force(np.stack([0 * vt, 0 * vt, -vt]), np.zeros((3, 3)), 1.1, areas)[2]
    np.testing.assert_allclose(up_force, masses * G, rtol=1e-12)


def test_terminal_speed_infinite_without_drag_area() -> None:
    # CdA = 0 is a fall in vacuum: no terminal speed.
    assert float(terminal_speed(1.0, 0.0, 1.225)) == math.inf


def test_terminal_speed_uses_given_gravity() -> None:
    # v_t scales with sqrt(g): on the Moon-like g = 1.62 m/s^2 (from memory) with the same air.
    ratio = terminal_speed(1.0, 0.01, 1.225, gravity=1.62) / terminal_speed(1.0, 0.01, 1.225)
    assert float(ratio) == pytest.approx(math.sqrt(1.62 / G), rel=1e-12)


def test_reynolds_number_hand_value_and_fluids() -> None:
    # 5 cm sphere at 10 m/s in air at 20 degC, rho 1.204 kg/m^3, mu 1.81e-5 Pa s:
    # Re = 1.204 * 10 * 0.05 / 1.81e-5 = 33260 (hand value); fluids.core.Reynolds agrees.
    re = float(reynolds_number(10.0, 0.05, 1.204, 1.81e-5))
    assert re == pytest.approx(33260.0, rel=1e-4)
    assert re == pytest.approx(Reynolds(V=10.0, D=0.05, rho=1.204, mu=1.81e-5), rel=1e-12)


def test_drag_parameter_hand_value_and_units() -> None:
    # k = rho CdA / (2 m) [1/m] ([TVDW-1999]): 1.225 * 0.01 / (2 * 1) = 6.125e-3 1/m.
    assert float(drag_parameter(1.225, 0.01, 1.0)) == pytest.approx(6.125e-3, rel=1e-12)
    # Units: the same expression in pint reduces to 1/m, and k v^2 is an acceleration.
    ureg = pint.UnitRegistry()
    k = (1.1 * ureg("kg/m^3") * 0.3 * ureg("m^2") / (2 * 80.0 * ureg.kg)).to("1/m")
    assert float(drag_parameter(1.1, 0.3, 80.0)) == pytest.approx(k.magnitude, rel=1e-12)
    assert (k * (50 * ureg("m/s")) ** 2).check("[acceleration]")
    # k = g / v_t^2 closes the loop with terminal_speed.
    assert float(drag_parameter(1.1, 0.3, 80.0)) == pytest.approx(
        G / float(terminal_speed(80.0, 0.3, 1.1)) ** 2, rel=1e-12
    )
