"""Physics tests of the trajectory engine dropcalc.physics.trajectory.solve_falls.

Where the integrator itself is under test the closed-form fast path is switched off
(``closed_form=False``). Oracles: the closed forms of Timmerman and van der Weele, Am. J. Phys.
67 (1999) 538 ([TVDW-1999]), the wind-frame principle and small-wind drift limit
(derived, Galileo's vacuum fall, a published skydiving terminal speed, and the
sphere terminal-speed correlations of the ``fluids`` library (fluids.drag.v_terminal).
The random sweep against solve_ivp lives in tests/test_trajectory_accuracy.py.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from fluids.drag import v_terminal

from dropcalc.physics.closed_form import vertical_fall
from dropcalc.physics.drag import drag_area, drag_parameter, terminal_speed
from dropcalc.physics.trajectory import STIFF_FALL_HEIGHT, WindField, sample_path, solve_falls

G = 9.80665  # standard gravity [m/s^2], 3rd CGPM (1901); [CGPM-1901]

# Air at 20 degC and 101325 Pa, dry: rho = p / (R T) with R = 287.05287 J/(kg K) (ICAO Doc
# 7488/3, [ISA-1993]) -> 1.2041 kg/m^3; Sutherland mu = 1.458e-6 T^1.5/(T + 110.4)
# ([ISA-1993]) -> 1.8134e-5 Pa s.
AIR_DENSITY_20C = 101325.0 / (287.05287 * 293.15)
AIR_VISCOSITY_20C = 1.458e-6 * 293.15**1.5 / (293.15 + 110.4)
# Subcritical sphere drag coefficient: White, Fluid Mechanics, table 7.3 (from memory);
# [WHITE-FM], [HOERNER-1965] gives 0.47 (0.4-0.5) for 1e3 < Re < ~2e5.
SPHERE_DRAG_COEFFICIENT = 0.47


def sphere_drag_parameter(diameter: float, density: float, air_density: float) -> float:
    """K = rho_air Cd A / (2 m) [1/m] of a solid sphere with Cd = 0.47."""
    mass = density * math.pi * diameter**3 / 6.0
    area = math.pi * diameter**2 / 4.0
    return float(drag_parameter(air_density, drag_area(SPHERE_DRAG_COEFFICIENT, area), mass))


# --- Vacuum limit and the vertical closed form ------------------------------------------------


def test_dense_compact_object_falls_as_in_vacuum() -> None:
    # Steel ball, 10 cm diameter (7850 kg/m^3, [MASSES-DERIVED]; 4.11 kg), 2 m fall in air at
    # 20 degC: g h / v_t^2 ~ 1e-3, so within 0.1 % of Galileo's sqrt(2 g h) and sqrt(2 h / g).
    k = sphere_drag_parameter(0.10, 7850.0, AIR_DENSITY_20C)
    h = 2.0
    solution = solve_falls(h, [0.0, 0.0, 0.0], k, closed_form=False)
    speed = -solution.velocity[2, 0]
    assert speed == pytest.approx(math.sqrt(2.0 * G * h), rel=1e-3)
    assert solution.time[0] == pytest.approx(math.sqrt(2.0 * h / G), rel=1e-3)
    # Drag only ever slows it down.
    assert speed < math.sqrt(2.0 * G * h)
    assert solution.time[0] > math.sqrt(2.0 * h / G)


def test_vacuum_k_zero_integrator_is_galileo() -> None:
    # k = 0, thrown sideways and up: x = u t, z = h + w t - g t^2/2 (Galileo), exactly.
    h, u, w = 12.0, 3.0, 4.0
    solution = solve_falls(h, [u, 0.0, w], 0.0, closed_form=False)
    t_expected = (w + math.sqrt(w * w + 2.0 * G * h)) / G
    assert solution.time[0] == pytest.approx(t_expected, rel=1e-9)
    assert solution.position[0, 0] == pytest.approx(u * t_expected, rel=1e-9)
    assert solution.velocity[2, 0] == pytest.approx(w - G * t_expected, rel=1e-9)


# (release height [m], k [1/m], initial downward speed [m/s]); heights 0.5 m and 1000 m span the
# explicit (Dormand-Prince) and the stiff (implicit extrapolation) paths of the integrator.
VERTICAL_CASES = [
    (h, k, w0)
    for h in (0.5, 1000.0)
    for k in (1e-4, 1e-2, 1.0, 3.0)
    for w0 in (0.0, 5.0, -8.0)  # from rest, thrown down, thrown up
]


@pytest.mark.parametrize(("release_height", "k", "downward_speed"), VERTICAL_CASES)
def test_integrator_agrees_with_vertical_closed_form(
    release_height: float, k: float, downward_speed: float
) -> None:
    # Timmerman and van der Weele (1999): exact t(h) and v(h), incl. rise and apex
    # ([TVDW-1999]; the module is itself checked against solve_ivp in test_closed_form).
    # Default tolerance 1e-8; the module promises better than 1e-5 relative: 1e-6 here.
    solution = solve_falls(release_height, [0.0, 0.0, -downward_speed], k, closed_form=False)
    time, speed = vertical_fall(release_height, downward_speed, k, G)
    assert solution.landed[0]
    assert solution.time[0] == pytest.approx(float(time), rel=1e-6)
    assert -solution.velocity[2, 0] == pytest.approx(float(speed), rel=1e-6)
    assert solution.position[:, 0] == pytest.approx([0.0, 0.0, 0.0], abs=1e-12)


def test_integrator_above_terminal_speed() -> None:
    # Thrown down at 3 v_t: decelerates towards v_t (coth branch of the closed form).
    k = 0.1
    vt = math.sqrt(G / k)
    solution = solve_falls(20.0, [0.0, 0.0, -3.0 * vt], k, closed_form=False)
    time, speed = vertical_fall(20.0, 3.0 * vt, k, G)
    assert solution.time[0] == pytest.approx(float(time), rel=1e-6)
    assert -solution.velocity[2, 0] == pytest.approx(float(speed), rel=1e-6)
    assert vt < -solution.velocity[2, 0] < 3.0 * vt


@pytest.mark.parametrize("k", [1e-3, 1e-2, 0.1, 1.0])
def test_ground_contact_is_located_inside_the_last_step(k: float) -> None:
    # With a loose tolerance the steps are long (fall time / steps ~ 0.2-0.7 s), yet contact is
    # at z = 0 exactly and the time matches the closed form (Timmerman and van der Weele 1999)
    # to the integration tolerance: the contact is interpolated, not the last step's end.
    h = 200.0
    solution = solve_falls(h, [0.0, 0.0, 0.0], k, closed_form=False, tolerance=1e-5)
    time, _ = vertical_fall(h, 0.0, k, G)
    assert solution.position[2, 0] == 0.0
    error = abs(solution.time[0] / float(time) - 1.0)
    assert error < 1e-5
    mean_step = solution.time[0] / solution.steps[0]
    assert error * float(time) < 1e-3 * mean_step


# --- Wind --------------------------------------------------------------------------------------


@pytest.mark.parametrize(("k", "wind_speed"), [(0.01, 5.0), (0.2, 12.0), (2.0, 3.0)])
def test_released_moving_with_the_wind_drifts_exactly_wind_times_fall_time(
    k: float, wind_speed: float
) -> None:
    # Wind-frame principle (derived: in a steady uniform wind U an object
    # released with velocity U moves vertically relative to the air, so its drift is U t_fall
    # and t_fall is the still-air closed form.
    h = 40.0
    wind = WindField(speed_10m=wind_speed, toward_east=0.6, toward_north=0.8)
    solution = solve_falls(
        h, [0.6 * wind_speed, 0.8 * wind_speed, 0.0], k, wind=wind, closed_form=False
    )
    t_fall = solution.time[0]
    assert solution.position[0, 0] == pytest.approx(0.6 * wind_speed * t_fall, rel=1e-9)
    assert solution.position[1, 0] == pytest.approx(0.8 * wind_speed * t_fall, rel=1e-9)
    time, _ = vertical_fall(h, 0.0, k, G)
    assert t_fall == pytest.approx(float(time), rel=1e-6)


@pytest.mark.parametrize("k", [0.01, 0.2])
def test_released_at_rest_drifts_less_than_wind_times_fall_time(k: float) -> None:
    # Wind-frame principle ([TVDW-1999]): released at rest it starts with a headwind
    # relative to the air and is never faster than the wind horizontally: 0 < x < U t_fall.
    wind_speed = 10.0
    solution = solve_falls(
        40.0, [0.0, 0.0, 0.0], k, wind=WindField(speed_10m=wind_speed), closed_form=False
    )
    assert 0.0 < solution.position[0, 0] < wind_speed * solution.time[0]
    assert solution.position[1, 0] == pytest.approx(0.0, abs=1e-12)


def test_small_wind_drift_limit() -> None:
    # Small-wind limit (derived: for U << v_t, released at rest,
    # x(t) = U [t - (v_t/g) atan(sinh(g t / v_t))], a lower bound for finite U; agrees with a
    # numerical solution to 2e-4 relative for U/v_t = 0.003 (we find ~3e-5).
    k = 0.01
    vt = math.sqrt(G / k)
    wind_speed = 0.003 * vt
    solution = solve_falls(
        200.0,
        [0.0, 0.0, 0.0],
        k,
        wind=WindField(speed_10m=wind_speed),
        closed_form=False,
        tolerance=1e-10,
    )
    t = solution.time[0]
    limit = wind_speed * (t - vt / G * math.atan(math.sinh(G * t / vt)))
    relative = solution.position[0, 0] / limit - 1.0
    assert 0.0 < relative < 2e-4


@pytest.mark.parametrize("angle_deg", [30.0, 90.0, 217.0])
def test_rotating_wind_and_release_rotates_the_landing_point(angle_deg: float) -> None:
    # Rotation invariance of the equations of motion about the vertical (isotropic drag,
    # gravity along z) [derived]: rotate wind direction and release velocity by an angle and the
    # landing point rotates by the same angle; drift, time and impact speed do not change.
    profile = {"profile": "power", "exponent": 0.2, "minimum_height": 1.0}
    k, h = 0.02, 30.0
    u, v, w = 1.0, 0.5, 0.3
    base = solve_falls(h, [u, v, w], k, wind=WindField(speed_10m=8.0, **profile))
    a = math.radians(angle_deg)
    c, s = math.cos(a), math.sin(a)
    turned = solve_falls(
        h,
        [c * u - s * v, s * u + c * v, w],
        k,
        wind=WindField(speed_10m=8.0, toward_east=c, toward_north=s, **profile),
    )
    x, y = base.position[0, 0], base.position[1, 0]
    drift = math.hypot(x, y)
    assert drift > 1.0  # the wind really moved it
    np.testing.assert_allclose(
        turned.position[:2, 0], [c * x - s * y, s * x + c * y], rtol=0, atol=1e-7 * drift
    )
    assert math.hypot(*turned.position[:2, 0]) == pytest.approx(drift, rel=1e-7)
    assert turned.time[0] == pytest.approx(base.time[0], rel=1e-7)
    assert np.linalg.norm(turned.velocity[:, 0]) == pytest.approx(
        np.linalg.norm(base.velocity[:, 0]), rel=1e-7
    )


def test_thrown_upward_goes_higher_and_drifts_further_than_a_drop() -> None:
    # Thrown up, the object rises above the release point (apex (v_t^2/2g) ln(1 + v0^2/v_t^2),
    # Timmerman and van der Weele 1999) and so falls longer and drifts further in a wind
    # [derived]. Its fall time exceeds the drop's by at least the still-air rise time
    # (v_t/g) atan(v0/v_t) plus the extra fall from the apex.
    k, h, v0 = 0.05, 20.0, 8.0
    wind = WindField(speed_10m=6.0)
    drop = solve_falls(h, [0.0, 0.0, 0.0], k, wind=wind, closed_form=False)
    throw = solve_falls(h, [0.0, 0.0, v0], k, wind=wind, closed_form=False)
    assert throw.time[0] > drop.time[0]
    assert throw.position[0, 0] > drop.position[0, 0]
    # Still air: the total time is the closed form with the rise included.
    still = solve_falls(h, [0.0, 0.0, v0], k, closed_form=False)
    time, _ = vertical_fall(h, -v0, k, G)
    assert still.time[0] == pytest.approx(float(time), rel=1e-6)
    vt = math.sqrt(G / k)
    assert still.time[0] > float(vertical_fall(h, 0.0, k, G)[0]) + vt / G * math.atan(v0 / vt)


# --- Published terminal speeds -----------------------------------------------------------------


def test_skydiver_belly_to_earth_terminal_speed() -> None:
    # A skydiver in a stable belly-to-earth position falls at about 54-56 m/s (about 120 mph):
    # common knowledge in the sport, e.g. US Parachute Association, Skydiver's Information
    # Manual (from memory). 80 kg and Cd A = 0.46 m^2 (a plausible value, assumed here) at ISA
    # 1000 m, rho = 1.111643 kg/m^3 (ICAO Doc 7488/3, [ISA-1993]): after a 3000 m fall the
    # speed must be in that range.
    mass, cd_area, rho = 80.0, 0.46, 1.111643
    k = float(drag_parameter(rho, cd_area, mass))
    solution = solve_falls(3000.0, [0.0, 0.0, 0.0], k, closed_form=False)
    speed = -solution.velocity[2, 0]
    assert 54.0 <= speed <= 56.0
    assert speed == pytest.approx(float(terminal_speed(mass, cd_area, rho)), rel=1e-6)


# Solid spheres 2-5 cm in air at 20 degC, all subcritical (Re < 2e5, checked below).
# Densities: steel 7850 and aluminium 2700 kg/m^3 ([MASSES-DERIVED]); rubber 1150 and
# wood 600 kg/m^3 (from memory; timber 500-650 in [MASSES-DERIVED]).
SPHERES = [
    pytest.param(0.02, 7850.0, id="steel 2 cm"),
    pytest.param(0.02, 2700.0, id="aluminium 2 cm"),
    pytest.param(0.05, 2700.0, id="aluminium 5 cm"),
    pytest.param(0.02, 1150.0, id="rubber 2 cm"),
    pytest.param(0.05, 1150.0, id="rubber 5 cm"),
    pytest.param(0.02, 600.0, id="wood 2 cm"),
    pytest.param(0.05, 600.0, id="wood 5 cm"),
]
# fluids 1.3.1 correlations valid below the drag crisis (pass a Method).
SPHERE_CORRELATIONS = ("Barati", "Clift", "Morrison")


@pytest.mark.parametrize(("diameter", "density"), SPHERES)
def test_sphere_terminal_speed_against_fluids_correlations(diameter: float, density: float) -> None:
    # Oracle: fluids.drag.v_terminal (fluids 1.3.1) with the Barati, Clift and Morrison Cd(Re)
    # correlations. The engine uses a constant Cd = 0.47 (White, table 7.3, from memory). The
    # 0.4-0.5 band of [WHITE-FM] moves v_t by -3 % / +8 %; we require the engine within
    # the correlations' spread widened by 5 % on each side. fluids includes buoyancy, the engine
    # neglects it (rho_air/rho_sphere <= 2e-3, [TVDW-1999]).
    k = sphere_drag_parameter(diameter, density, AIR_DENSITY_20C)
    vt = math.sqrt(G / k)
    # A fall of 8 v_t^2/g reaches v_t sqrt(1 - e^-16): v_t to 1e-7 (Timmerman and van der Weele).
    solution = solve_falls(8.0 * vt**2 / G, [0.0, 0.0, 0.0], k, closed_form=False)
    engine_speed = -solution.velocity[2, 0]
    reynolds = AIR_DENSITY_20C * engine_speed * diameter / AIR_VISCOSITY_20C
    assert 1e3 < reynolds < 2e5, "case must be subcritical for Cd = 0.47 to apply"

    references = [
        v_terminal(diameter, density, AIR_DENSITY_20C, AIR_VISCOSITY_20C, Method=method)
        for method in SPHERE_CORRELATIONS
    ]
    assert max(references) / min(references) < 1.15  # the oracle itself is coherent
    assert 0.95 * min(references) <= engine_speed <= 1.05 * max(references)


# --- Solver limits and vectorisation -----------------------------------------------------------


def test_beyond_max_distance_is_not_landed() -> None:
    # A light object (v_t = 1.4 m/s) in a 20 m/s wind from 50 m is carried about 700 m; with
    # max_distance = 5 m it must come back airborne, not as a landing.
    solution = solve_falls(
        50.0,
        [0.0, 0.0, 0.0],
        5.0,
        wind=WindField(speed_10m=20.0),
        max_distance=5.0,
        closed_form=False,
    )
    assert not solution.landed[0]
    assert solution.position[2, 0] > 0.0
    assert math.hypot(solution.position[0, 0], solution.position[1, 0]) > 5.0


def test_beyond_max_time_is_not_landed() -> None:
    # Still-air fall of 100 m takes 5.3 s (closed form); max_time 1 s abandons it in the air.
    solution = solve_falls(100.0, [0.0, 0.0, 0.0], 0.01, max_time=1.0, closed_form=False)
    assert not solution.landed[0]
    assert solution.position[2, 0] > 0.0


def test_closed_form_path_honours_max_time() -> None:
    # The fast path must give the same verdict as the integrator (test above).
    solution = solve_falls(100.0, [0.0, 0.0, 0.0], 0.01, max_time=1.0)
    assert not solution.landed[0]


def test_closed_form_path_honours_max_distance() -> None:
    # Released moving with a uniform 10 m/s wind it drifts U t_fall = 53 m (wind-frame
    # principle, [TVDW-1999]; t_fall = 5.3 s); with max_distance 20 m it is not a landing.
    wind = WindField(speed_10m=10.0)
    solution = solve_falls(100.0, [10.0, 0.0, 0.0], 0.01, wind=wind, max_distance=20.0)
    assert not solution.landed[0]
    assert solution.position[2, 0] > 0.0


def test_many_at_once_equals_one_at_a_time() -> None:
    # Vectorisation: mixed heights, drag parameters (4 orders of magnitude, both integrator
    # paths), release velocities and winds in one call equal the single calls to 1e-12.
    heights = np.array([0.5, 3.0, 30.0, 300.0, 1000.0, 12.0])
    ks = np.array([0.001, 0.01, 0.1, 1.0, 5.0, 0.05])
    velocities = np.array(
        [[0.0, 1.0, -2.0, 0.5, 0.0, 4.0], [0.0, 0.0, 1.0, 0.0, -1.0, 0.0], [0, 2, -5, 10, 0, 0]],
        dtype=float,
    )
    speeds = np.array([0.0, 5.0, 10.0, 15.0, 3.0, 4.0])
    east = np.array([1.0, 0.0, 0.6, 1.0, 0.0, 1.0])
    north = np.array([0.0, 1.0, 0.8, 0.0, 1.0, 0.0])
    log_law = {"profile": "log", "roughness_length": 0.05, "minimum_height": 2.0}
    together = solve_falls(
        heights,
        velocities,
        ks,
        wind=WindField(speed_10m=speeds, toward_east=east, toward_north=north, **log_law),
    )
    assert together.landed.all()
    for i in range(heights.size):
        wind = WindField(speed_10m=speeds[i], toward_east=east[i], toward_north=north[i], **log_law)
        alone = solve_falls(heights[i], velocities[:, i], ks[i], wind=wind)
        assert together.time[i] == pytest.approx(alone.time[0], rel=1e-12)
        np.testing.assert_allclose(together.position[:, i], alone.position[:, 0], rtol=1e-12,
                                   atol=1e-12 * np.abs(alone.position[:, 0]).max())  # fmt: skip
        np.testing.assert_allclose(together.velocity[:, i], alone.velocity[:, 0], rtol=1e-12)


def test_mixed_drag_parameters_each_match_their_closed_form() -> None:
    # One call, k from vacuum to a feather-like 5 1/m: each lane against Timmerman and
    # van der Weele (1999) / Galileo.
    ks = np.array([0.0, 1e-4, 1e-2, 0.3, 5.0])
    h = 25.0
    solution = solve_falls(h, [0.0, 0.0, 0.0], ks, closed_form=False)
    time, speed = vertical_fall(h, 0.0, ks, G)
    np.testing.assert_allclose(solution.time, time, rtol=1e-6)
    np.testing.assert_allclose(-solution.velocity[2], speed, rtol=1e-6)


# ============================================================================================
# Recorded paths: solve_falls(..., record_path=True) and sample_path
# ============================================================================================
# Oracles: Galileo's vacuum fall (x = v0 t, z = H - g t^2 / 2), the vertical fall with
# quadratic drag of Timmerman, P. and van der Weele, J. P., "On the rise and fall of a ball
# with linear or quadratic drag", Am. J. Phys. 67 (1999) 538-546 (eq. 8), written out here,
# and scipy.integrate.solve_ivp with method "DOP853" at rtol 1e-10 on the equations of motion
# written out here. The paths are sampled with the cubic Hermite interpolant (Hairer, Norsett
# and Wanner, *Solving Ordinary Differential Equations I*, 2nd ed. 1993, sec. II.6).

# A power-law wind, V(z) = V10 (z / 10 m)^alpha ([EN1991-1-4]), held at its value at
# z_min below z_min (EN 1991-1-4:2005, eq. 4.4).
PATH_WIND_SPEED = 12.0  # [m/s]
PATH_WIND_EAST, PATH_WIND_NORTH = 0.6, 0.8  # [-]
PATH_WIND_EXPONENT = 0.22  # [-]
PATH_WIND_MINIMUM_HEIGHT = 2.0  # [m]
PATH_WIND = WindField(
    speed_10m=PATH_WIND_SPEED,
    toward_east=PATH_WIND_EAST,
    toward_north=PATH_WIND_NORTH,
    profile="power",
    exponent=PATH_WIND_EXPONENT,
    minimum_height=PATH_WIND_MINIMUM_HEIGHT,
)

# (release height [m], initial velocity [m/s], k [1/m]): a pushed tool (explicit method), a
# throw upwards, and a light object, k = 2 /m from 100 m: g H / v_t^2 = 200 > 20, which the
# engine hands to its implicit (stiff) method.
PATH_LANES = [
    (60.0, (1.5, 0.0, 0.0), 0.02),
    (30.0, (0.0, 0.0, 3.0), 0.3),
    (100.0, (0.0, 0.0, 0.0), 2.0),
]


def _path_lane_arrays() -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    heights = np.array([lane[0] for lane in PATH_LANES])
    velocities = np.array([lane[1] for lane in PATH_LANES]).T
    ks = np.array([lane[2] for lane in PATH_LANES])
    return heights, velocities, ks


def test_without_record_path_there_are_no_paths_and_the_numbers_do_not_change() -> None:
    # Mixed lanes in one call: in still air (wind 0 at that lane) and released at rest or
    # straight up the engine takes the closed form; in the wind it integrates, with both
    # methods (k = 2 /m from 100 m is stiff). With record_path every lane is integrated.
    heights = np.array([30.0, 100.0, 10.0, 60.0, 20.0, 100.0])
    ks = np.array([0.01, 2.0, 0.05, 0.02, 0.3, 2.0])
    velocities = np.array(
        [[0.0, 0.0, 0.0, 0.0, 1.5, 0.0], [0.0] * 6, [0.0, 0.0, 5.0, 0.0, 0.0, 0.0]]
    )
    speeds = np.array([0.0, 0.0, 0.0, 8.0, 8.0, 8.0])
    wind = WindField(speed_10m=speeds, profile="power", exponent=0.2, minimum_height=2.0)
    plain = solve_falls(heights, velocities, ks, wind=wind)
    recorded = solve_falls(heights, velocities, ks, wind=wind, record_path=True)
    assert plain.paths is None
    assert recorded.paths is not None
    assert len(recorded.paths) == heights.size
    closed = plain.steps == 0
    assert list(closed) == [True, True, True, False, False, False]
    assert np.all(recorded.steps > 0)
    assert plain.landed.all()
    assert recorded.landed.all()
    # Integrated lanes: recording changes nothing (same arithmetic; 1e-12 allows rounding).
    # Closed-form lanes: the integrator against the exact solution, the engine's accuracy
    # (fall time 2.8e-7, impact speed 1.4e-6 relative over 20,000 cases against DOP853,
    # tests/test_trajectory_accuracy.py), hence 1e-6.
    for lanes, rel in ((~closed, 1e-12), (closed, 1e-6)):
        np.testing.assert_allclose(recorded.time[lanes], plain.time[lanes], rtol=rel, atol=0)
        for name in ("position", "velocity"):
            got, want = getattr(recorded, name)[:, lanes], getattr(plain, name)[:, lanes]
            scale = np.max(np.abs(want), axis=0)
            assert np.all(np.abs(got - want) <= rel * scale), name


def test_recorded_vacuum_path_is_galileo_at_any_time() -> None:
    # k = 0, pushed sideways: x = u t, y = v t, z = H - g t^2 / 2 (Galileo). The motion is a
    # polynomial of degree 2, which the integrator's steps and the cubic Hermite interpolant
    # both reproduce exactly: only rounding is left (1e-9 m).
    h, u, v = 12.0, 1.5, -0.7
    solution = solve_falls(h, [u, v, 0.0], 0.0, gravity=G, record_path=True)
    assert solution.paths is not None
    (path,) = solution.paths
    fall_time = math.sqrt(2.0 * h / G)
    assert path[0, -1] == pytest.approx(fall_time, rel=1e-9)
    times = np.random.default_rng(11).uniform(0.0, path[0, -1], 40)
    positions = sample_path(path, times)
    assert positions.shape == (3, 40)
    np.testing.assert_allclose(positions[0], u * times, rtol=0, atol=1e-9)
    np.testing.assert_allclose(positions[1], v * times, rtol=0, atol=1e-9)
    np.testing.assert_allclose(positions[2], h - 0.5 * G * times**2, rtol=0, atol=1e-9)
    # Times outside [0, T] are clipped to the release and the contact.
    outside = sample_path(path, [-1.0, path[0, -1] + 5.0])
    assert list(outside[:, 0]) == [0.0, 0.0, h]
    assert list(outside[:, 1]) == list(path[1:4, -1])


@pytest.mark.parametrize(
    ("release_height", "k"),
    [
        (40.0, 0.01),  # g H / v_t^2 = 0.4: few, long explicit steps (the worst case seen)
        (25.0, 0.3),  # 7.5: explicit
        (100.0, 2.0),  # 200: implicit (stiff) method
    ],
)
def test_recorded_still_air_path_follows_timmerman_van_der_weele(
    release_height: float, k: float
) -> None:
    # Distance fallen from rest d(t) = (v_t^2 / g) ln cosh(g t / v_t), v_t = sqrt(g / k)
    # (Timmerman & van der Weele 1999, eq. 8), at 50 times. The cubic Hermite interpolant has
    # a local error of order h^4 on the engine's steps: observed at most 2e-6 H (first case,
    # 13 points over the fall), so 1e-5 H.
    v_t = math.sqrt(G / k)
    solution = solve_falls(release_height, [0.0, 0.0, 0.0], k, gravity=G, record_path=True)
    assert solution.paths is not None
    (path,) = solution.paths
    times = np.linspace(0.0, path[0, -1], 50)
    positions = sample_path(path, times)
    fallen = v_t**2 / G * np.log(np.cosh(G * times / v_t))
    np.testing.assert_allclose(
        positions[2], release_height - fallen, rtol=0, atol=1e-5 * release_height
    )
    assert np.all(positions[0:2] == 0.0)  # nothing pushes it sideways in still air


def _power_wind_rhs(_: float, y: np.ndarray, k: float) -> np.ndarray:
    """dr/dt = v, dv/dt = -g e_z - k |v - w(z)| (v - w(z)) in PATH_WIND, written out here."""
    ratio = (max(y[2], PATH_WIND_MINIMUM_HEIGHT) / 10.0) ** PATH_WIND_EXPONENT
    relative = y[3:6] - PATH_WIND_SPEED * ratio * np.array([PATH_WIND_EAST, PATH_WIND_NORTH, 0.0])
    drag = k * math.sqrt(float(relative @ relative))
    return np.concatenate([y[3:6], -drag * relative - np.array([0.0, 0.0, G])])


def test_recorded_windy_paths_follow_dop853() -> None:
    # Sheared power-law wind, both integrator methods, against scipy's DOP853 at rtol 1e-10
    # (its dense output) at 50 times: within 1e-4 H (brief; observed at most 1e-6 H).
    from scipy.integrate import solve_ivp

    heights, velocities, ks = _path_lane_arrays()
    solution = solve_falls(heights, velocities, ks, gravity=G, wind=PATH_WIND, record_path=True)
    assert solution.paths is not None
    for i, path in enumerate(solution.paths):
        start = np.concatenate([[0.0, 0.0, heights[i]], velocities[:, i]])
        reference = solve_ivp(
            _power_wind_rhs,
            (0.0, path[0, -1]),
            start,
            method="DOP853",
            rtol=1e-10,
            atol=1e-12 * heights[i],
            dense_output=True,
            args=(ks[i],),
        )
        assert reference.success
        times = np.linspace(0.0, path[0, -1], 50)
        np.testing.assert_allclose(
            sample_path(path, times), reference.sol(times)[0:3], rtol=0, atol=1e-4 * heights[i]
        )


def test_recorded_paths_run_from_the_release_to_the_engines_result() -> None:
    # Each path starts at (0, 0, H) with the release velocity, ends at exactly the time,
    # position and velocity the engine reports, and its times increase strictly; lanes of
    # both methods (the last is stiff: g H / v_t^2 = 9.81 * 100 / 4.9 = 200).
    heights, velocities, ks = _path_lane_arrays()
    assert ks[-1] * heights[-1] > STIFF_FALL_HEIGHT  # g H / v_t^2 = g H / (g / k) = k H
    solution = solve_falls(heights, velocities, ks, gravity=G, wind=PATH_WIND, record_path=True)
    assert solution.paths is not None
    assert solution.landed.all()
    for i, path in enumerate(solution.paths):
        assert path.shape[0] == 7
        assert path.shape[1] >= 3
        assert list(path[:, 0]) == [0.0, 0.0, 0.0, heights[i], *velocities[:, i]]
        end = [solution.time[i], *solution.position[:, i], *solution.velocity[:, i]]
        assert list(path[:, -1]) == end
        assert path[3, -1] == 0.0
        assert np.all(np.diff(path[0]) > 0.0)


def test_recorded_path_of_an_abandoned_fall_ends_where_it_was_abandoned() -> None:
    # Still-air fall of 100 m takes 5.3 s (closed form); max_time 1 s abandons it in the air:
    # the path ends there, at the engine's time and height, with times increasing.
    solution = solve_falls(100.0, [0.0, 0.0, 0.0], 0.01, max_time=1.0, record_path=True)
    assert not solution.landed[0]
    assert solution.paths is not None
    (path,) = solution.paths
    assert path[0, -1] == solution.time[0]
    assert path[3, -1] == solution.position[2, 0]
    assert path[3, -1] > 0.0
    assert np.all(np.diff(path[0]) > 0.0)
