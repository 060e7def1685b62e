"""Accuracy of dropcalc.physics.trajectory against an independent high-precision reference.

Reference: scipy.integrate.solve_ivp, method "DOP853" (Hairer, Norsett and Wanner, *Solving
Ordinary Differential Equations I*, 2nd ed. 1993, sec. II.10) at rtol 1e-10 with a terminal
ground event, integrating the equations of motion written out in ``benchmarks/cases.py`` (the
wind profile there is coded from EN 1991-1-4:2005 eq. 4.4 and the power law, not imported from
dropcalc). Closed forms: vacuum ballistics, and the vertical fall with quadratic drag of
Timmerman and van der Weele, "On the rise and fall of a ball with linear or quadratic drag",
Am. J. Phys. 67 (1999) 538-546.

The sweep tolerance is 1e-4 relative, far looser than both solvers (observed: impact speed
1.4e-6, fall time 2.8e-7 over 20,000 cases) so the test checks the engine, not the reference.
"""

from __future__ import annotations

import importlib.util
import math
import sys
from pathlib import Path

import numpy as np
import pytest

from dropcalc.physics.trajectory import (
    DEFAULT_TOLERANCE,
    STIFF_FALL_HEIGHT,
    WindField,
    solve_falls,
)


def _load_cases_module():
    path = Path(__file__).parents[1] / "benchmarks" / "cases.py"
    spec = importlib.util.spec_from_file_location("dropcalc_benchmark_cases", path)
    assert spec is not None
    assert spec.loader is not None
    module = importlib.util.module_from_spec(spec)
    sys.modules[spec.name] = module  # dataclasses look the module up by name
    spec.loader.exec_module(module)
    return module


cases_module = _load_cases_module()
G = cases_module.GRAVITY  # standard gravity, 3rd CGPM (1901)
RELATIVE = 1e-4
TINY_DRIFT = 1e-6  # [m]
TINY_DRIFT_ABSOLUTE = 1e-8  # [m]
SWEEP_CASES = 1500
SWEEP_SEED = 20240601
SLOW_SWEEP_CASES = 6000
SLOW_SWEEP_SEED = 7


def _sweep(count: int, seed: int):
    cases = cases_module.draw_cases(count, seed=seed)
    engine = cases_module.solve_with_engine(cases, tolerance=DEFAULT_TOLERANCE)
    reference = cases_module.solve_with_reference(cases)
    return cases, engine, reference


@pytest.fixture(scope="module")
def sweep():
    return _sweep(SWEEP_CASES, SWEEP_SEED)


def _check_sweep(cases, engine, reference) -> None:
    assert engine.landed.all()
    np.testing.assert_allclose(engine.impact_speed, reference.impact_speed, rtol=RELATIVE, atol=0)
    np.testing.assert_allclose(engine.fall_time, reference.fall_time, rtol=RELATIVE, atol=0)
    # Drift: relative 1e-4 plus the engine's absolute position tolerance, tolerance *
    # max(h, 1 m) (3e-6 m at 300 m). The error control holds each position component to that
    # absolute size, so a drift of a few millimetres or less cannot be relatively accurate to
    # 1e-4: over 20,000 cases 62 drifts between 2e-6 and 5e-3 m (near-vacuum drops, k <
    # 3e-5 1/m, in light wind) were off by up to 5e-4 relative, 5e-7 m absolute, 0.32 of the
    # allowance. Every drift above 1 cm agreed to 2.2e-5 relative.
    error = np.abs(engine.drift - reference.drift)
    allowance = cases_module.drift_allowance(cases.release_height, DEFAULT_TOLERANCE)
    bad = error > RELATIVE * reference.drift + allowance
    assert not bad.any(), (
        f"drift off in {bad.sum()} cases: reference {reference.drift[bad]}, error {error[bad]}"
    )
    # Below a micrometre (calm drops, exactly 0 in both) compare absolutely: a relative error
    # of a number made only of rounding and absolute tolerances means nothing.
    tiny = reference.drift < TINY_DRIFT
    assert np.all(error[tiny] <= TINY_DRIFT_ABSOLUTE), error[tiny].max()


def test_sweep_covers_every_mode_profile_and_regime(sweep):
    cases, engine, _ = sweep
    assert cases.count >= 1000
    for code in range(len(cases_module.MODES)):
        assert np.count_nonzero(cases.mode == code) > 100
    for code in range(len(cases_module.PROFILES)):
        assert np.count_nonzero(cases.profile == code) > 100
    assert np.count_nonzero(cases.carrier) > 100
    assert np.count_nonzero(cases.wind_speed == 0.0) > 10
    assert np.count_nonzero(cases.initial_velocity[2] > 0.0) > 100  # rises first
    # Both of the engine's integrators: explicit, and implicit for long falls (g h k > 40).
    fall_height = G * cases.release_height * cases.drag_parameter
    assert np.count_nonzero(fall_height > STIFF_FALL_HEIGHT) > 10
    assert np.count_nonzero(fall_height < 1.0) > 100
    assert np.all(engine.steps > 0)  # closed_form=False: the integrator ran everywhere


def test_sweep_matches_dop853_reference(sweep):
    _check_sweep(*sweep)


@pytest.mark.slow
def test_larger_sweep_matches_dop853_reference():
    _check_sweep(*_sweep(SLOW_SWEEP_CASES, SLOW_SWEEP_SEED))


def _reference(height, velocity, k, wind=(0.0, 0.0), **profile):
    t, position, v = cases_module.reference_fall(
        height, velocity, k, wind_east=wind[0], wind_north=wind[1], **profile
    )
    return t, float(np.linalg.norm(v)), math.hypot(position[0], position[1])


def _engine(height, velocity, k, wind=None, **options):
    solution = solve_falls(height, velocity, k, gravity=G, wind=wind, **options)
    assert solution.landed.all()
    speed = np.linalg.norm(solution.velocity, axis=0)
    drift = np.hypot(solution.position[0], solution.position[1])
    return float(solution.time[0]), float(speed[0]), float(drift[0]), solution


def test_contact_time_is_located_not_the_last_step_in_vacuum():
    # Without drag the path is a parabola, which Dormand-Prince 5(4) integrates exactly: the
    # error estimate vanishes, steps grow five-fold each time, and the whole time error is how
    # the contact is located. Exact: t = (w + sqrt(w^2 + 2 g h)) / g, w upward speed.
    height, velocity = 40.0, (6.0, -2.0, 9.0)
    t, speed, drift, solution = _engine(height, velocity, 0.0, tolerance=1e-6, closed_form=False)
    t_exact = (velocity[2] + math.sqrt(velocity[2] ** 2 + 2 * G * height)) / G
    assert solution.steps[0] < 40
    assert t == pytest.approx(t_exact, rel=1e-10)
    assert speed == pytest.approx(math.sqrt(6.0**2 + 2.0**2 + 9.0**2 + 2 * G * height), rel=1e-10)
    assert drift == pytest.approx(math.hypot(6.0, 2.0) * t_exact, rel=1e-10)


@pytest.mark.parametrize(
    ("height", "velocity", "k", "wind"),
    [
        (25.0, (3.0, 0.0, 0.0), 0.02, WindField(12.0, 0.0, 1.0, "power", 0.2, 0.05, 3.0)),
        (8.0, (0.0, 0.0, 0.0), 0.5, WindField(20.0, 0.6, 0.8, "log", 0.0, 0.3, 5.0)),
        (120.0, (-4.0, 2.0, -6.0), 0.003, WindField(30.0, -1.0, 0.0)),
    ],
)
def test_contact_time_with_loose_tolerance(height, velocity, k, wind):
    # At tolerance 1e-6 the steps near the ground are a sizeable fraction of the fall; the
    # contact time must still agree with the reference to 1e-6 relative.
    t, speed, drift, _ = _engine(height, velocity, k, wind, tolerance=1e-6, closed_form=False)
    u10 = float(wind.speed_10m)
    t_ref, speed_ref, drift_ref = _reference(
        height,
        velocity,
        k,
        (u10 * wind.toward_east, u10 * wind.toward_north),
        profile=wind.profile,
        exponent=wind.exponent,
        roughness_length=wind.roughness_length,
        minimum_height=wind.minimum_height,
    )
    assert t == pytest.approx(t_ref, rel=1e-6)
    assert speed == pytest.approx(speed_ref, rel=1e-5)
    assert drift == pytest.approx(drift_ref, rel=1e-5)


@pytest.mark.parametrize("k", [0.001, 0.05, 2.0])
def test_thrown_straight_up_in_still_air_matches_closed_form(k):
    # Timmerman and van der Weele (1999): apex (v_t^2 / 2g) ln(1 + u0^2 / v_t^2) above the
    # release after (v_t / g) atan(u0 / v_t), then a fall from rest; v(H) = v_t sqrt(1 - e^(-2gH
    # / v_t^2)) and t(H) = (v_t / g) arccosh(e^(g H / v_t^2)).
    height, u0 = 3.0, 12.0
    vt = math.sqrt(G / k)
    rise = vt**2 / (2 * G) * math.log1p(u0**2 / vt**2)
    assert rise > 0.05  # the apex is above the release point
    fall = height + rise
    t_exact = vt / G * math.atan(u0 / vt) + vt / G * math.acosh(math.exp(G * fall / vt**2))
    speed_exact = vt * math.sqrt(-math.expm1(-2 * G * fall / vt**2))
    t, speed, drift, _ = _engine(height, (0.0, 0.0, u0), k, closed_form=False)
    assert t == pytest.approx(t_exact, rel=1e-6)
    assert speed == pytest.approx(speed_exact, rel=1e-6)
    assert drift == 0.0


@pytest.mark.parametrize(
    ("height", "velocity", "k", "profile"),
    [
        # Thrown up from 0.5 m through the 5 m kink of the power profile and back.
        (0.5, (2.0, 0.0, 14.0), 0.01, dict(profile="power", exponent=0.25, minimum_height=5.0)),
        # Thrown up from 30 m in a log profile; light object, drag matters on the way up.
        (30.0, (0.0, 3.0, 10.0), 0.2, dict(profile="log", roughness_length=0.3, minimum_height=5)),
        # Short releases.
        (0.5, (0.0, 0.0, 0.0), 0.05, dict(profile="log", roughness_length=0.05, minimum_height=2)),
        (0.5, (4.0, 0.0, 0.0), 1.0, dict(profile="uniform")),
        # 1000 m: a dense object (explicit integrator) and a light one (implicit: g h k = 490).
        (1000.0, (0.0, 0.0, 0.0), 2e-4, dict(profile="power", exponent=0.3, minimum_height=4.6)),
        (
            1000.0,
            (1.0, 0.0, 0.0),
            0.05,
            dict(profile="log", roughness_length=1.0, minimum_height=10),
        ),
        (1000.0, (0.0, 0.0, 5.0), 0.05, dict(profile="uniform")),
    ],
)
def test_targeted_releases_match_reference(height, velocity, k, profile):
    u10, east, north = 18.0, 0.6, -0.8
    wind = WindField(u10, east, north, **profile)
    t, speed, drift, _ = _engine(height, velocity, k, wind, closed_form=False)
    t_ref, speed_ref, drift_ref = _reference(
        height, velocity, k, (u10 * east, u10 * north), **profile
    )
    assert t == pytest.approx(t_ref, rel=RELATIVE)
    assert speed == pytest.approx(speed_ref, rel=RELATIVE)
    assert drift == pytest.approx(drift_ref, rel=RELATIVE)


def test_closed_form_path_agrees_with_integrator():
    # Relative motion purely vertical: still air (drops and vertical throws) and objects
    # released moving with a uniform wind; vacuum included.
    n = 8
    height = np.array([0.5, 3.0, 20.0, 80.0, 300.0, 1000.0, 15.0, 60.0])
    k = np.array([0.3, 0.0, 0.01, 2e-4, 0.004, 0.05, 1.5, 0.02])
    wind_east = np.array([0.0, 0.0, 0.0, 10.0, 25.0, 5.0, 0.0, 12.0])
    vertical = np.array([0.0, 6.0, -3.0, 0.0, 10.0, -20.0, 2.0, 0.0])
    velocity = np.stack([wind_east, np.zeros(n), vertical])
    wind = WindField(wind_east, 1.0, 0.0)
    exact = solve_falls(height, velocity, k, gravity=G, wind=wind, closed_form=True)
    numeric = solve_falls(height, velocity, k, gravity=G, wind=wind, closed_form=False)
    assert np.all(exact.steps == 0)
    assert np.all(numeric.steps > 0)
    assert exact.landed.all()
    assert numeric.landed.all()
    np.testing.assert_allclose(numeric.time, exact.time, rtol=1e-6)
    np.testing.assert_allclose(numeric.velocity, exact.velocity, rtol=1e-6, atol=1e-9)
    np.testing.assert_allclose(numeric.position, exact.position, rtol=1e-6, atol=1e-9)
