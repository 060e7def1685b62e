"""Tests of dropcalc.physics.closed_form: the vertical fall with quadratic drag.

Oracles: the closed forms of Timmerman and van der Weele, "On the rise and fall of a ball with
linear or quadratic drag", Am. J. Phys. 67 (1999) 538-546 (typed here from [TVDW-1999], not
read from the module), Galileo's vacuum kinematics, their series expansions, and an independent
numerical solution with scipy.integrate.solve_ivp (DOP853, rtol 1e-12).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.integrate import solve_ivp

from dropcalc.physics.closed_form import (
    HEIGHT_FOR_95_PERCENT,
    distance_after_time,
    height_to_reach_fraction,
    speed_after_time,
    vertical_fall,
)

G = 9.80665  # standard gravity [m/s^2], 3rd CGPM (1901); [CGPM-1901]


def terminal(drag_parameter: float, gravity: float = G) -> float:
    """v_t = sqrt(g / k) [m/s] (Timmerman and van der Weele 1999; [TVDW-1999])."""
    return math.sqrt(gravity / drag_parameter)


def reference_fall(
    drop_height: float, downward_speed: float, drag_parameter: float, gravity: float = G
) -> tuple[float, float]:
    """Time [s] and speed [m/s] to fall ``drop_height`` by scipy solve_ivp (DOP853).

    State: distance fallen s (positive down) and downward velocity w;
    ds/dt = w, dw/dt = g - k w |w|. Stops at s = drop_height on the way down.
    """

    def rhs(_t: float, y: np.ndarray) -> list[float]:
        return [y[1], gravity - drag_parameter * y[1] * abs(y[1])]

    def ground(_t: float, y: np.ndarray) -> float:
        return y[0] - drop_height

    ground.terminal = True  # type: ignore[attr-defined]
    ground.direction = 1.0  # type: ignore[attr-defined]
    solution = solve_ivp(
        rhs,
        (0.0, 1e5),
        [0.0, downward_speed],
        method="DOP853",
        rtol=1e-12,
        atol=1e-12,
        events=ground,
    )
    assert solution.status == 1, "reference integration did not reach the ground"
    return float(solution.t_events[0][0]), float(solution.y_events[0][0][1])


# (drop height [m], initial downward speed [m/s], k [1/m]); v_t = sqrt(g/k) noted beside.
FALL_CASES = [
    pytest.param(10.0, 0.0, 0.01, id="rest, v_t=31"),
    pytest.param(100.0, 0.0, 0.1, id="rest, v_t=9.9"),
    pytest.param(2.0, 0.0, 1.0, id="rest, v_t=3.1"),
    pytest.param(500.0, 0.0, 0.003, id="rest, v_t=57"),
    pytest.param(20.0, 5.0, 0.05, id="down below v_t=14"),
    pytest.param(20.0, 30.0, 0.05, id="down above v_t=14"),
    pytest.param(5.0, 50.0, 0.5, id="down far above v_t=4.4"),
    pytest.param(10.0, -15.0, 0.02, id="thrown up, v_t=22"),
    pytest.param(3.0, -5.0, 0.3, id="thrown up, v_t=5.7"),
]


@pytest.mark.parametrize(("drop_height", "downward_speed", "drag_parameter"), FALL_CASES)
def test_vertical_fall_matches_solve_ivp(
    drop_height: float, downward_speed: float, drag_parameter: float
) -> None:
    # Independent method: scipy.integrate.solve_ivp, DOP853 at rtol 1e-12.
    time_ref, speed_ref = reference_fall(drop_height, downward_speed, drag_parameter)
    time, speed = vertical_fall(drop_height, downward_speed, drag_parameter, G)
    assert time == pytest.approx(time_ref, rel=1e-9)
    assert speed == pytest.approx(speed_ref, rel=1e-9)


def test_fall_from_rest_closed_forms_agree_with_each_other() -> None:
    # Timmerman and van der Weele (1999): v(h), t(h), v(t), y(t) for a fall from rest
    # ([TVDW-1999]). t(h) fed into y(t) gives h back; fed into v(t) gives v(h).
    heights = np.array([0.5, 3.0, 30.0, 300.0, 3000.0])
    k = 0.02
    vt = terminal(k)
    time, speed = vertical_fall(heights, 0.0, k, G)
    # The printed forms, evaluated here independently of the module:
    speed_of_height = vt * np.sqrt(1.0 - np.exp(-2.0 * G * heights / vt**2))
    time_of_height = vt / G * np.arccosh(np.exp(G * heights / vt**2))
    np.testing.assert_allclose(speed, speed_of_height, rtol=1e-12)
    np.testing.assert_allclose(time, time_of_height, rtol=1e-12)
    np.testing.assert_allclose(distance_after_time(time, k, G), heights, rtol=1e-12)
    np.testing.assert_allclose(speed_after_time(time, k, G), speed, rtol=1e-12)
    # v(t) = v_t tanh(g t / v_t) and y(t) = (v_t^2/g) ln cosh(g t / v_t), printed forms:
    times = np.array([0.1, 1.0, 5.0, 20.0])
    np.testing.assert_allclose(speed_after_time(times, k, G), vt * np.tanh(G * times / vt))
    np.testing.assert_allclose(
        distance_after_time(times, k, G), vt**2 / G * np.log(np.cosh(G * times / vt)), rtol=1e-12
    )


def test_speed_and_distance_after_time_match_solve_ivp() -> None:
    # Independent method: solve_ivp DOP853 dense output, fall from rest, k = 0.05 1/m.
    k = 0.05
    times = np.array([0.2, 1.0, 2.5, 6.0, 15.0])

    def rhs(_t: float, y: np.ndarray) -> list[float]:
        return [y[1], G - k * y[1] * abs(y[1])]

    solution = solve_ivp(
        rhs, (0.0, 15.0), [0.0, 0.0], method="DOP853", rtol=1e-12, atol=1e-12, t_eval=times
    )
    np.testing.assert_allclose(distance_after_time(times, k, G), solution.y[0], rtol=1e-9)
    np.testing.assert_allclose(speed_after_time(times, k, G), solution.y[1], rtol=1e-9)


@pytest.mark.parametrize("ratio", [0.0, 0.3, 0.9, 1.0, 1.5, 4.0])
def test_initial_downward_speed_below_and_above_terminal(ratio: float) -> None:
    # Timmerman and van der Weele (1999), [TVDW-1999]:
    # v(h)^2 = v_t^2 - (v_t^2 - v0^2) exp(-2 g h / v_t^2), for v0 below, at and above v_t.
    k, h = 0.04, 25.0
    vt = terminal(k)
    v0 = ratio * vt
    expected = math.sqrt(vt**2 - (vt**2 - v0**2) * math.exp(-2.0 * G * h / vt**2))
    time, speed = vertical_fall(h, v0, k, G)
    assert speed == pytest.approx(expected, rel=1e-12)
    if ratio == 1.0:
        # Released at terminal speed it stays there: t = h / v_t (no source needed: v constant).
        assert time == pytest.approx(h / vt, rel=1e-12)
    else:
        time_ref, speed_ref = reference_fall(h, v0, k)  # solve_ivp DOP853
        assert time == pytest.approx(time_ref, rel=1e-9)
        assert speed == pytest.approx(speed_ref, rel=1e-9)


@pytest.mark.parametrize(("upward_speed", "drag_parameter"), [(15.0, 0.02), (5.0, 0.3), (40, 0.1)])
def test_thrown_upward_apex_height_and_time(upward_speed: float, drag_parameter: float) -> None:
    # Timmerman and van der Weele (1999), rising ball ([TVDW-1999]):
    # apex H = (v_t^2 / 2g) ln(1 + v0^2/v_t^2), reached after t = (v_t/g) atan(v0/v_t).
    vt = terminal(drag_parameter)
    apex_height = vt**2 / (2.0 * G) * math.log(1.0 + upward_speed**2 / vt**2)
    apex_time = vt / G * math.atan(upward_speed / vt)

    # Check the printed forms against solve_ivp (rise: dw/dt = -g - k w |w|, w upward).
    def rhs(_t: float, y: np.ndarray) -> list[float]:
        return [y[1], -G - drag_parameter * y[1] * abs(y[1])]

    def apex(_t: float, y: np.ndarray) -> float:
        return y[1]

    apex.terminal = True  # type: ignore[attr-defined]
    solution = solve_ivp(
        rhs, (0.0, 100.0), [0.0, upward_speed], method="DOP853", rtol=1e-12, atol=1e-12,
        events=apex,
    )  # fmt: skip
    assert solution.t_events[0][0] == pytest.approx(apex_time, rel=1e-9)
    assert solution.y_events[0][0][0] == pytest.approx(apex_height, rel=1e-9)

    # The module: rise, then a fall from rest through H + h. Back at the release level
    # (h -> 0) the speed is v_t sqrt(1 - exp(-2gH/v_t^2)) = v0 / sqrt(1 + v0^2/v_t^2)
    # [derived from the two printed forms].
    h = 1e-9
    time, speed = vertical_fall(h, -upward_speed, drag_parameter, G)
    fall_time = vt / G * math.acosh(math.exp(G * apex_height / vt**2))
    assert time == pytest.approx(apex_time + fall_time, rel=1e-7)
    assert speed == pytest.approx(upward_speed / math.sqrt(1 + upward_speed**2 / vt**2), rel=1e-7)


@pytest.mark.parametrize("downward_speed", [0.0, 3.0, -4.0])
def test_vacuum_k_zero_is_galileo(downward_speed: float) -> None:
    # k = 0: v = sqrt(w0^2 + 2 g h), t = (v - w0)/g (uniform acceleration, Galileo).
    h = 7.5
    time, speed = vertical_fall(h, downward_speed, 0.0, G)
    expected_speed = math.sqrt(downward_speed**2 + 2.0 * G * h)
    assert speed == pytest.approx(expected_speed, rel=1e-14)
    assert time == pytest.approx((expected_speed - downward_speed) / G, rel=1e-14)


@pytest.mark.parametrize("drag_parameter", [1e-4, 1e-5, 1e-6])
def test_small_drag_limit_follows_series(drag_parameter: float) -> None:
    # As k -> 0 with x = g h / v_t^2 = k h: v = sqrt(2gh) (1 - x/2 + O(x^2)) and
    # t = sqrt(2h/g) (1 + x/6 + O(x^2)) [derived: series of v(h) and y(t) of Timmerman and
    # van der Weele 1999]. The leading correction must be there with the right size.
    h = 10.0
    x = drag_parameter * h
    time, speed = vertical_fall(h, 0.0, drag_parameter, G)
    speed_deficit = 1.0 - float(speed) / math.sqrt(2.0 * G * h)
    time_excess = float(time) / math.sqrt(2.0 * h / G) - 1.0
    assert speed_deficit / (x / 2.0) == pytest.approx(1.0, abs=1e-3)
    assert time_excess / (x / 6.0) == pytest.approx(1.0, abs=1e-3)


def test_tiny_drag_speed_is_continuous_with_vacuum() -> None:
    # k -> 0 limit: the true deviation from sqrt(2gh) is x/2 = 2.5e-13 here (series above).
    _, speed = vertical_fall(0.5, 0.0, 1e-12, G)
    assert float(speed) == pytest.approx(math.sqrt(2.0 * G * 0.5), rel=1e-9)


@pytest.mark.parametrize("drag_parameter", [1.17549435e-38, 1e-30, 1e-20, 1e-14, 1e-10])
@pytest.mark.parametrize(
    ("drop_height", "downward_speed"), [(0.001, 1.0), (2.0, 30.0), (50.0, 5.0)]
)
def test_tiny_drag_with_a_downward_start_is_galileo(
    drag_parameter: float, drop_height: float, downward_speed: float
) -> None:
    # Found by the property tests: with k -> 0 and a downward start the difference form of
    # t(h) cancelled and gave a negative time (-0.088 s for 1 mm at 1 m/s, k = 1.2e-38).
    # Galileo with a start speed: t = (sqrt(w0^2 + 2 g h) - w0) / g; the drag correction is
    # of relative size k (h + w0^2/g) <= 1e-7 here.
    time, speed = vertical_fall(drop_height, downward_speed, drag_parameter, G)
    end_speed = math.sqrt(downward_speed**2 + 2.0 * G * drop_height)
    tolerance = 1e-12 + 10 * drag_parameter * (drop_height + downward_speed**2 / G)
    assert float(time) == pytest.approx((end_speed - downward_speed) / G, rel=tolerance)
    assert float(speed) == pytest.approx(end_speed, rel=tolerance)


@pytest.mark.parametrize("ratio", [0.0, 0.3, 1.0, 2.5])
@pytest.mark.parametrize("drop", [1e-9, 0.5, 1.0 - 1e-9, 1.0 + 1e-9, 3.0])
def test_fall_time_solves_the_printed_position_law_on_both_sides_of_the_short_form(
    ratio: float, drop: float
) -> None:
    # Timmerman and van der Weele (1999): from w0 = r v_t downward, the distance fallen is
    # (v_t^2/g) ln(cosh(g t/v_t + phi)/cosh(phi)), phi = artanh(r) (r < 1), or with sinh and
    # psi = arcoth(r) (r > 1), or v_t t (r = 1). The module switches formula at
    # x = g h / v_t^2 = 1; the time it gives must put the object at h on both sides.
    k = 0.05
    vt = terminal(k)
    h = drop * vt**2 / G
    (time,) = np.atleast_1d(vertical_fall(h, ratio * vt, k, G)[0])
    a = G * float(time) / vt
    if ratio < 1.0:
        phi = math.atanh(ratio)
        fallen = vt**2 / G * (math.log(math.cosh(a + phi)) - math.log(math.cosh(phi)))
    elif ratio > 1.0:
        psi = math.atanh(1.0 / ratio)
        fallen = vt**2 / G * (math.log(math.sinh(a + psi)) - math.log(math.sinh(psi)))
    else:
        fallen = vt * float(time)
    assert fallen == pytest.approx(h, rel=1e-9)


def test_95_and_99_percent_of_terminal_speed() -> None:
    # [TVDW-1999] [derived]: 95 % of v_t after 1.1640 v_t^2/g of fall, 99 % after
    # 1.9585 v_t^2/g. Recomputed here from v(h) = v_t sqrt(1 - exp(-2gh/v_t^2)):
    # h/(v_t^2/g) = -ln(1 - f^2)/2. Printed to 4 decimals, so abs 5e-5.
    def scaled(f: float) -> float:
        return -math.log(1.0 - f * f) / 2.0

    assert scaled(0.95) == pytest.approx(1.1640, abs=5e-5)
    assert scaled(0.99) == pytest.approx(1.9585, abs=5e-5)
    assert pytest.approx(1.1640, abs=5e-5) == HEIGHT_FOR_95_PERCENT

    k = 0.08
    vt2_over_g = 1.0 / k  # v_t^2 / g = 1/k
    for fraction, printed in ((0.95, 1.1640), (0.99, 1.9585)):
        height = float(height_to_reach_fraction(fraction, k, G))
        assert height / vt2_over_g == pytest.approx(printed, abs=5e-5)
        assert height / vt2_over_g == pytest.approx(scaled(fraction), rel=1e-12)
        # And the fall of that height from rest really reaches the fraction (solve_ivp):
        _, speed_ref = reference_fall(height, 0.0, k)
        assert speed_ref / terminal(k) == pytest.approx(fraction, rel=1e-9)


@pytest.mark.parametrize("ratio", [0.0, 0.5, 1.0, 3.0])
def test_no_overflow_for_huge_dimensionless_height(ratio: float) -> None:
    # g h / v_t^2 = 1e6: cosh and exp would overflow. Asymptotics of t(h) [derived from the
    # closed forms of Timmerman and van der Weele 1999]: with u = g t / v_t and x = g h/v_t^2,
    # from rest or w0 < v_t: u = x + ln(2 cosh phi) - phi, phi = artanh(w0/v_t);
    # w0 > v_t: u = x + ln(2 sinh psi) - psi, psi = artanh(v_t/w0); w0 = v_t: u = x.
    k = 1.0
    h = 1e6  # x = k h = 1e6
    vt = terminal(k)
    with np.errstate(over="raise", invalid="raise", divide="raise"):
        time, speed = vertical_fall(h, ratio * vt, k, G)
        t_large = 1e5 * vt / G
        far = distance_after_time(t_large, k, G)
        fast = speed_after_time(t_large, k, G)
    x = G * h / vt**2
    if ratio < 1.0:
        phi = math.atanh(ratio)
        u = x + math.log(2.0 * math.cosh(phi)) - phi
    elif ratio > 1.0:
        psi = math.atanh(1.0 / ratio)
        u = x + math.log(2.0 * math.sinh(psi)) - psi
    else:
        u = x
    assert time == pytest.approx(u * vt / G, rel=1e-12)
    assert speed == pytest.approx(vt, rel=1e-12)
    # y(t) -> v_t t - (v_t^2/g) ln 2 for g t/v_t >> 1 [derived from ln cosh].
    assert far == pytest.approx(vt * t_large - vt**2 / G * math.log(2.0), rel=1e-12)
    assert fast == pytest.approx(vt, rel=1e-15)


def test_thrown_upward_with_huge_fall_is_finite() -> None:
    # Upward start and g h / v_t^2 = 1e6: rise (v_t/g) atan(v0/v_t), then the asymptotic fall
    # from rest from H + h, u = x' + ln 2 (as above).
    k, h, v0 = 1.0, 1e6, 10.0
    vt = terminal(k)
    with np.errstate(over="raise", invalid="raise", divide="raise"):
        time, speed = vertical_fall(h, -v0, k, G)
    rise = vt**2 / (2.0 * G) * math.log(1.0 + v0**2 / vt**2)
    expected = vt / G * math.atan(v0 / vt) + vt / G * (G * (h + rise) / vt**2 + math.log(2.0))
    assert time == pytest.approx(expected, rel=1e-12)
    assert speed == pytest.approx(vt, rel=1e-12)


def test_vectorised_over_mixed_cases() -> None:
    # One call over vacuum, from rest, below/above terminal and thrown up equals the scalar
    # calls (each of which is checked against its oracle above).
    heights = np.array([5.0, 5.0, 20.0, 20.0, 10.0])
    speeds = np.array([0.0, 0.0, 5.0, 30.0, -15.0])
    ks = np.array([0.0, 0.01, 0.05, 0.05, 0.02])
    time, speed = vertical_fall(heights, speeds, ks, G)
    for i in range(heights.size):
        t_i, v_i = vertical_fall(heights[i], speeds[i], ks[i], G)
        assert time[i] == pytest.approx(float(t_i), rel=1e-15)
        assert speed[i] == pytest.approx(float(v_i), rel=1e-15)
