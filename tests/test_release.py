"""Checks of dropcalc.physics.release against closed forms, textbook results and scipy."""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest
from scipy.integrate import solve_ivp

from dropcalc.errors import InputError, UnknownObjectError
from dropcalc.physics.release import (
    INERTIA_RATIOS,
    RELEASE_MODES,
    Release,
    describe,
    eave_exit_speed,
    initial_velocity,
    slope_acceleration,
)

G = 9.80665  # standard gravity, 3rd CGPM (1901); [CGPM-1901]


def _incline_exit_speed_by_ode(
    pitch_deg: float, length: float, friction: float, initial_speed: float = 0.0
) -> float:
    """Integrate Newton's second law for a block on an incline until it has travelled ``length``.

    Along the slope: m dv/dt = m g sin(theta) - mu N, normal: N = m g cos(theta) (kinetic
    friction opposes the down-slope motion). Halliday, Resnick & Walker, Fundamentals of Physics,
    ch. 6 (block on an incline with friction). Solved with scipy.integrate.solve_ivp, an
    independent method from the closed form in the code.
    """
    theta = math.radians(pitch_deg)

    def rhs(_t: float, state: np.ndarray) -> list[float]:
        _s, v = state
        return [v, G * math.sin(theta) - friction * G * math.cos(theta)]

    def at_eave(_t: float, state: np.ndarray) -> float:
        return state[0] - length

    at_eave.terminal = True  # type: ignore[attr-defined]
    # max_step: the exact solution is a parabola, so the solver would otherwise take steps long
    # enough to pass the eave and come back (a decelerating block) without seeing the event.
    solution = solve_ivp(
        rhs,
        (0.0, 100.0),
        [0.0, initial_speed],
        events=at_eave,
        rtol=1e-10,
        atol=1e-12,
        max_step=0.05,
    )
    assert solution.t_events[0].size == 1, "the block never reached the eave"
    return float(solution.y_events[0][0][1])


# --- roof slide: incline kinematics ----------------------------------------------------------


def test_frictionless_30_degree_roof_2_m() -> None:
    # Block on a frictionless incline: a = g sin(theta) (Newton's second law along the slope;
    # Halliday, Resnick & Walker, Fundamentals of Physics, ch. 6). v^2 = 2 a L (constant
    # acceleration, ibid. ch. 2) = 2 g sin 30 * 2 m = 2 g: v = sqrt(2 g) = 4.4287 m/s.
    assert float(slope_acceleration(30.0, 0.0)) == pytest.approx(G / 2, rel=1e-12)
    speed = float(eave_exit_speed(30.0, 2.0, 0.0, G))
    assert speed == pytest.approx(math.sqrt(2.0 * G), rel=1e-12)
    assert speed == pytest.approx(4.4287, abs=5e-5)  # sqrt(19.6133) by hand


def test_sliding_with_friction_035_at_35_degrees() -> None:
    # Textbook formula for a block sliding down an incline with kinetic friction:
    # a = g (sin theta - mu_k cos theta) (Halliday, Resnick & Walker, ch. 6).
    # sin 35 = 0.573576, cos 35 = 0.819152 (four-figure tables): a = g * 0.327830 = 3.21494 m/s2.
    textbook_a = G * (0.573576 - 0.3 * 0.819152)
    assert float(slope_acceleration(35.0, 0.3)) == pytest.approx(textbook_a, rel=2e-6)
    # v = sqrt(2 a L) over 4 m: 5.0712 m/s.
    speed = float(eave_exit_speed(35.0, 4.0, 0.3, G))
    assert speed == pytest.approx(math.sqrt(2 * textbook_a * 4.0), rel=2e-6)


@pytest.mark.parametrize(
    ("pitch", "length", "friction", "initial_speed"),
    [(35.0, 4.0, 0.3, 0.0), (30.0, 2.0, 0.0, 0.0), (45.0, 7.5, 0.8, 1.5), (25.0, 3.0, 0.5, 2.0)],
)
def test_exit_speed_against_integrated_incline_ode(
    pitch: float, length: float, friction: float, initial_speed: float
) -> None:
    # Independent method: scipy.integrate.solve_ivp of Newton's law (see helper above); the
    # last case decelerates (25 deg < atan 0.5 = 26.6 deg) but reaches the eave from 2 m/s.
    expected = _incline_exit_speed_by_ode(pitch, length, friction, initial_speed)
    got = float(eave_exit_speed(pitch, length, friction, G, initial_speed))
    assert got == pytest.approx(expected, rel=1e-7)


def test_roof_slide_leaves_along_the_slope() -> None:
    # derived: exit velocity along the roof slope, pitch below horizontal,
    # pointing away from the edge (edge facing east here, so +x).
    release = Release("roof-slide", roof_pitch=35.0, roof_length=4.0, friction=0.3)
    velocity = initial_velocity(release, edge_azimuth=90.0)
    speed = _incline_exit_speed_by_ode(35.0, 4.0, 0.3)
    assert np.linalg.norm(velocity) == pytest.approx(speed, rel=1e-7)
    assert math.degrees(math.atan2(-velocity[2], velocity[0])) == pytest.approx(35.0, abs=1e-9)
    assert velocity[1] == pytest.approx(0.0, abs=1e-12)
    assert velocity[0] > 0


def test_roof_slide_initial_speed_is_added_in_quadrature() -> None:
    # v^2 = v0^2 + 2 a L (constant acceleration; Halliday, Resnick & Walker, ch. 2, eq. 2-16).
    # Frictionless 30 deg, 2 m: 2 a L = 2 g; from 3 m/s: v = sqrt(9 + 2 g).
    speed = float(eave_exit_speed(30.0, 2.0, 0.0, G, initial_speed=3.0))
    assert speed == pytest.approx(math.sqrt(9.0 + 2.0 * G), rel=1e-12)


# --- rolling ----------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("body", "height_factor"),
    [
        # Energy conservation for rolling without slipping, m g h = (1/2) m v^2 (1 + k):
        # solid cylinder v = sqrt(4 g h / 3), solid sphere v = sqrt(10 g h / 7), thin-walled
        # tube (hoop) v = sqrt(g h). Halliday, Resnick & Walker, Fundamentals of Physics,
        # ch. 11 (rolling down a ramp), from memory.
        ("solid cylinder", 4.0 / 3.0),
        ("solid sphere", 10.0 / 7.0),
        ("thin-walled tube", 1.0),
    ],
)
def test_rolling_body_energy_conservation(body: str, height_factor: float) -> None:
    pitch, length = 30.0, 5.0
    height = length * math.sin(math.radians(pitch))  # 2.5 m drop over the slope
    # Friction 0.6 is above the no-slip minimum k tan(theta)/(1 + k) <= 0.29 for every body.
    release = Release(
        "roof-slide",
        roof_pitch=pitch,
        roof_length=length,
        friction=0.6,
        rolling=True,
        inertia_ratio=INERTIA_RATIOS[body],
    )
    velocity = initial_velocity(release)
    assert np.linalg.norm(velocity) == pytest.approx(math.sqrt(height_factor * G * height), 1e-12)


def test_rolling_cylinder_needs_grip_else_it_slips() -> None:
    # Rolling without slipping needs mu >= k tan(theta)/(1 + k) (Halliday, Resnick & Walker,
    # ch. 11, from memory): 35 deg, solid cylinder: 0.7002075 / 3 = 0.2334. With less grip the
    # centre accelerates at g (sin theta - mu cos theta) (sliding with kinetic friction, ch. 6),
    # faster than rolling.
    threshold = math.tan(math.radians(35.0)) / 3.0
    rolling_a = G * math.sin(math.radians(35.0)) / 1.5
    above = slope_acceleration(35.0, threshold * 1.01, rolling=True, inertia_ratio=0.5)
    assert float(above) == pytest.approx(rolling_a, rel=1e-12)
    slipping = slope_acceleration(35.0, 0.1, rolling=True, inertia_ratio=0.5)
    assert float(slipping) == pytest.approx(G * (0.573576 - 0.1 * 0.819152), rel=2e-6)
    assert float(slipping) > rolling_a
    # At the threshold both laws give the same acceleration (continuity).
    at = float(slope_acceleration(35.0, threshold, rolling=True, inertia_ratio=0.5))
    theta = math.radians(35.0)
    assert at == pytest.approx(G * (math.sin(theta) - threshold * math.cos(theta)), rel=1e-12)
    assert at == pytest.approx(rolling_a, rel=1e-12)


# --- push, throw, drop, carrier ---------------------------------------------------------------


@pytest.mark.parametrize(
    ("azimuth", "direction"),
    [
        # Azimuth clockwise from north (surveying convention): 0 north, 90 east, 180 south,
        # 270 west, 45 north-east = (1/sqrt2, 1/sqrt2).
        (0.0, (0.0, 1.0)),
        (90.0, (1.0, 0.0)),
        (180.0, (0.0, -1.0)),
        (270.0, (-1.0, 0.0)),
        (45.0, (math.sqrt(0.5), math.sqrt(0.5))),
        (-90.0, (-1.0, 0.0)),
    ],
)
def test_push_goes_away_from_the_edge(azimuth: float, direction: tuple[float, float]) -> None:
    velocity = initial_velocity(Release("push", speed=2.0), edge_azimuth=azimuth)
    assert velocity.shape == (3,)
    np.testing.assert_allclose(velocity, [2 * direction[0], 2 * direction[1], 0.0], atol=1e-12)


def test_throw_components() -> None:
    # 5 m/s at 30 deg: horizontal 5 cos 30 = 4.330127, vertical 5 sin 30 = 2.5 (trigonometry).
    velocity = initial_velocity(Release("throw", speed=5.0, angle=30.0), edge_azimuth=90.0)
    np.testing.assert_allclose(velocity, [4.330127, 0.0, 2.5], atol=5e-7)
    north = initial_velocity(Release("throw", speed=5.0, angle=30.0), edge_azimuth=0.0)
    np.testing.assert_allclose(north, [0.0, 4.330127, 2.5], atol=5e-7)
    down = initial_velocity(Release("throw", speed=10.0, angle=-60.0), edge_azimuth=180.0)
    np.testing.assert_allclose(down, [0.0, -5.0, -8.660254], atol=5e-7)
    straight_up = initial_velocity(Release("throw", speed=3.0, angle=90.0))
    np.testing.assert_allclose(straight_up, [0.0, 0.0, 3.0], atol=1e-12)


def test_drop_is_from_rest() -> None:
    np.testing.assert_array_equal(initial_velocity(Release()), [0.0, 0.0, 0.0])


@pytest.mark.parametrize(
    "release",
    [
        Release("drop"),
        Release("push", speed=2.0),
        Release("throw", speed=5.0, angle=20.0),
        Release("roof-slide", roof_pitch=40.0, roof_length=3.0, friction=0.2),
    ],
)
def test_carrier_velocity_is_added(release: Release) -> None:
    # Galilean velocity addition: ground velocity = velocity relative to the carrier + carrier.
    carrier = (1.5, -0.5, 2.0)
    moving = dataclasses.replace(release, carrier_velocity=carrier)
    np.testing.assert_allclose(
        initial_velocity(moving, 30.0), initial_velocity(release, 30.0) + carrier, atol=1e-12
    )


# --- vectorisation ----------------------------------------------------------------------------


def test_array_fields_give_one_column_per_sample() -> None:
    speeds = np.array([1.0, 5.0, 12.0])
    angles = np.array([-20.0, 0.0, 45.0])
    azimuths = np.array([0.0, 90.0, 200.0])
    batch = initial_velocity(Release("throw", speed=speeds, angle=angles), edge_azimuth=azimuths)
    assert batch.shape == (3, 3)
    for i in range(3):
        # Closed-form components of each sample, written out independently of the code.
        a, e = math.radians(azimuths[i]), math.radians(angles[i])
        expected = speeds[i] * np.array(
            [math.cos(e) * math.sin(a), math.cos(e) * math.cos(a), math.sin(e)]
        )
        np.testing.assert_allclose(batch[:, i], expected, atol=1e-12)


def test_array_roof_slide_and_carrier() -> None:
    pitches = np.array([30.0, 35.0, 45.0])
    frictions = np.array([0.0, 0.3, 0.8])
    carrier_east = np.array([0.0, 1.0, -1.0])
    release = Release(
        "roof-slide",
        roof_pitch=pitches,
        roof_length=2.0,
        friction=frictions,
        carrier_velocity=(carrier_east, 0.0, 0.0),
    )
    batch = initial_velocity(release, 90.0)
    assert batch.shape == (3, 3)
    for i in range(3):
        speed = _incline_exit_speed_by_ode(pitches[i], 2.0, frictions[i])
        theta = math.radians(pitches[i])
        expected = [speed * math.cos(theta) + carrier_east[i], 0.0, -speed * math.sin(theta)]
        np.testing.assert_allclose(batch[:, i], expected, rtol=1e-7, atol=1e-12)


def test_scalar_release_with_array_azimuth() -> None:
    batch = initial_velocity(Release("push", speed=1.0), edge_azimuth=np.array([0.0, 90.0]))
    np.testing.assert_allclose(batch, [[0.0, 1.0], [1.0, 0.0], [0.0, 0.0]], atol=1e-12)


def test_arrays_of_different_lengths_are_refused() -> None:
    with pytest.raises(InputError, match="release_angle has 3 samples but release_speed has 2"):
        Release("throw", speed=np.array([1.0, 2.0]), angle=np.array([0.0, 1.0, 2.0]))
    with pytest.raises(InputError, match="edge_azimuth has 3 samples"):
        initial_velocity(Release("push", speed=np.array([1.0, 2.0])), np.array([0.0, 1.0, 2.0]))


# --- bad input --------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("fields", "message"),
    [
        ({"mode": "push", "speed": -2.0}, r"release_speed must be a finite speed >= 0 m/s; got -2"),
        ({"mode": "push", "speed": math.nan}, r"release_speed .* got nan"),
        ({"mode": "throw", "speed": 45.0}, r"release_speed must be at most 40 m/s .*got 45"),
        ({"mode": "throw", "speed": 5.0, "angle": 95.0}, r"release_angle .* -90 and 90 deg"),
        ({"mode": "throw", "speed": 5.0, "angle": math.inf}, r"release_angle .* got inf"),
        (
            {"mode": "roof-slide", "roof_pitch": 85.0, "roof_length": 2.0},
            r"roof_pitch must be between 0 and 80 deg; got 85 deg",
        ),
        (
            {"mode": "roof-slide", "roof_pitch": 30.0, "roof_length": 0.0},
            r"roof_length must be a finite length > 0 and <= 100 m .*got 0 m",
        ),
        ({"mode": "roof-slide", "roof_pitch": 30.0, "roof_length": 120.0}, r"roof_length .*120"),
        (
            {"mode": "roof-slide", "roof_pitch": 30.0, "roof_length": 2.0, "friction": -0.1},
            r"friction must be between 0 and 2; got -0.1",
        ),
        (
            {"mode": "roof-slide", "roof_pitch": 60, "roof_length": 2, "friction": 2.5},
            r"friction .* got 2.5",
        ),
        (
            {
                "mode": "roof-slide",
                "roof_pitch": 30.0,
                "roof_length": 2.0,
                "rolling": True,
                "inertia_ratio": 1.5,
            },
            r"inertia_ratio must be between 0 and 1 .*got 1.5",
        ),
        ({"carrier_velocity": (0.0, 31.0, 0.0)}, r"carrier_velocity \(north\) .* -30 and 30 m/s"),
        ({"carrier_velocity": (math.nan, 0.0, 0.0)}, r"carrier_velocity \(east\) .* got nan"),
        ({"carrier_velocity": (0.0, 0.0)}, r"carrier_velocity must have 3 components"),
        ({"mode": "push", "speed": np.ones((2, 2))}, r"release_speed must be .* 1-D array"),
        ({"mode": "push", "speed": "fast"}, r"release_speed must be a number"),
        ({"mode": "drop", "speed": 3.0}, r"release_speed is used only with release mode push"),
        ({"mode": "push", "speed": 3.0, "angle": 10.0}, r"release_angle is used only .* throw"),
        ({"mode": "throw", "speed": 3.0, "roof_pitch": 30.0}, r"roof_pitch is used only"),
        ({"mode": "drop", "rolling": True}, r"rolling is used only .* roof-slide"),
        (
            {"mode": "roof-slide", "roof_pitch": 30.0, "roof_length": 2.0, "inertia_ratio": 1.0},
            r"inertia_ratio is used only with rolling .* without rolling: remove it or set rolling",
        ),
        (
            {"mode": "roof-slide", "roof_pitch": 8.0, "roof_length": 4.0, "friction": 0.4},
            r"roof_pitch 8 deg is too shallow for an object to slide with friction 0.4 \(needs "
            r"more than 21.8 deg, the friction angle atan\(0.4\)\)",
        ),
        (
            {"mode": "roof-slide", "roof_pitch": 0.0, "roof_length": 4.0, "rolling": True},
            r"roof_pitch 0 deg is too shallow for an object to start moving",
        ),
        (
            {
                "mode": "roof-slide",
                "roof_pitch": 10.0,
                "roof_length": 4.0,
                "friction": 0.5,
                "speed": 1.0,
            },
            r"release_speed 1 m/s stops .* before the eave 4 m away",
        ),
    ],
)
def test_bad_input_names_the_field(fields: dict, message: str) -> None:
    with pytest.raises(InputError, match=message):
        Release(**fields)


def test_unknown_mode_lists_the_valid_ones() -> None:
    with pytest.raises(UnknownObjectError, match="release_mode 'toss'") as info:
        Release("toss")
    for mode in RELEASE_MODES:
        assert mode in str(info.value)


def test_pitch_equal_to_the_friction_angle_is_refused() -> None:
    # At theta = atan(mu), g sin(theta) = mu g cos(theta): the forces balance and a block at
    # rest stays at rest (Halliday, Resnick & Walker, ch. 6, angle of repose).
    friction_angle = math.degrees(math.atan(0.4))
    with pytest.raises(InputError, match=r"roof_pitch 21.8\d* deg is too shallow"):
        Release("roof-slide", roof_pitch=friction_angle, roof_length=4.0, friction=0.4)
    with pytest.raises(InputError, match="too shallow"):
        eave_exit_speed(friction_angle, 4.0, 0.4, G)
    # Just steeper, it slides (slowly).
    Release("roof-slide", roof_pitch=friction_angle + 0.1, roof_length=4.0, friction=0.4)


def test_one_bad_sample_in_an_array_is_reported() -> None:
    with pytest.raises(InputError, match="roof_pitch 10 deg is too shallow"):
        Release("roof-slide", roof_pitch=np.array([40.0, 10.0]), roof_length=3.0, friction=0.4)
    with pytest.raises(InputError, match="release_speed .* got -1"):
        Release("push", speed=np.array([1.0, -1.0]))


@pytest.mark.parametrize("gravity", [0.0, -9.8, math.nan])
def test_bad_gravity(gravity: float) -> None:
    with pytest.raises(InputError, match="gravity must be between 9.7 and 9.9"):
        initial_velocity(Release("push", speed=1.0), gravity=gravity)
    with pytest.raises(InputError, match="gravity must be"):
        eave_exit_speed(30.0, 2.0, 0.0, gravity)


def test_bad_azimuth() -> None:
    with pytest.raises(InputError, match="edge_azimuth must be a finite angle"):
        initial_velocity(Release("push", speed=1.0), edge_azimuth=math.nan)


def test_eave_exit_speed_checks_its_arguments() -> None:
    with pytest.raises(InputError, match="roof_pitch must be between 0 and 80"):
        eave_exit_speed(90.0, 2.0, 0.0, G)
    with pytest.raises(InputError, match="roof_length must be a finite length > 0"):
        eave_exit_speed(30.0, -1.0, 0.0, G)
    with pytest.raises(InputError, match="initial_speed must be between"):
        eave_exit_speed(30.0, 2.0, 0.0, G, initial_speed=-1.0)


def test_release_is_frozen() -> None:
    release = Release("push", speed=1.0)
    with pytest.raises(dataclasses.FrozenInstanceError):
        release.speed = 2.0  # type: ignore[misc]


# --- description ------------------------------------------------------------------------------


def test_describe_throw_and_push_and_drop() -> None:
    throw = Release("throw", speed=5.0, angle=30.0)
    assert describe(throw) == "thrown at 5.0 m/s, 30° above horizontal, away from the edge"
    assert "20° below horizontal" in describe(Release("throw", speed=5.0, angle=-20.0))
    assert describe(Release("push", speed=2.0)) == (
        "pushed off horizontally at 2.0 m/s, away from the edge"
    )
    assert describe(Release()) == "dropped from rest"


def test_describe_roof_slide_states_the_exit_speed() -> None:
    # 35 deg, mu 0.4, 4 m: a = g (0.573576 - 0.4 * 0.819152) = 2.41162 m/s2 (Halliday, Resnick &
    # Walker, ch. 6), v = sqrt(2 a 4) = 4.392 m/s -> "4.4 m/s".
    release = Release("roof-slide", roof_pitch=35.0, roof_length=4.0, friction=0.4)
    assert describe(release) == (
        "slides 4.0 m down a 35° roof (friction 0.40) and leaves the eave at 4.4 m/s, "
        "35° below horizontal"
    )


def test_describe_mentions_carrier_and_ranges() -> None:
    text = describe(Release("push", speed=np.array([1.0, 3.0]), carrier_velocity=(0, 0, 1.5)))
    assert "1.0–3.0 m/s" in text
    assert "up 1.5" in text


def test_a_tiny_start_speed_on_a_level_frictionless_roof_keeps_its_speed() -> None:
    # Found by the property tests: v0 = 1e-300 squared underflows to 0, which read as "stops
    # on the roof" and then divided by a zero deceleration. With no deceleration the object
    # keeps v0 to the eave (Newton's first law).
    from dropcalc.physics.release import eave_exit_speed

    speed = eave_exit_speed(0.0, 1.0, 0.0, 9.80665, initial_speed=1e-300)
    assert float(speed) == 1e-300
