"""The first ground contact as a rigid-body impact with friction, and the travel after it.

Each check value comes from outside this project: a closed form of rigid-body impact mechanics
(source beside it), a textbook moment of inertia, or a conservation law.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from dropcalc.physics import contact
from dropcalc.physics.contact import (
    MATERIALS,
    REFERENCE_SPEED,
    Ground,
    after_landing,
    body,
    contact_point,
    normal_restitution,
    planar_impact,
    random_orientations,
)
from dropcalc.physics.scatter import SURFACES

G = 9.80665  # standard gravity [m/s^2], 3rd CGPM (1901)


def _one(value: float) -> np.ndarray:
    return np.array([float(value)])


def _sphere_bounce(u: float, v: float, mu: float, e: float, spin: float = 0.0):
    radius = 0.11
    return planar_impact(
        _one(u), _one(v), _one(spin), _one(0.0), _one(-radius), _one(0.4 * radius**2),
        _one(mu), _one(e),
    ), radius  # fmt: skip


# --- A ball bouncing with friction -----------------------------------------------------------


@pytest.mark.parametrize(("u", "v", "mu", "e"), [(6.0, 8.0, 0.1, 0.8), (3.0, 10.0, 0.05, 0.5)])
def test_a_ball_that_slips_throughout_loses_mu_one_plus_e_times_its_normal_speed(
    u: float, v: float, mu: float, e: float
) -> None:
    # Slipping throughout the bounce (mu (1 + e) v_n < (2/7) v_t): v_x' = v_x - mu (1 + e) v_n,
    # omega' R = (5/2) mu (1 + e) v_n, v_y' = e v_n. R. Cross, "Grip-slip behavior of a
    # bouncing ball", Am. J. Phys. 70 (2002) 1093-1102, the sliding case of its rigid-body
    # model (from memory); also Brach, Mechanical Impact Dynamics (1991), ch. 4.
    assert mu * (1 + e) * v < 2.0 / 7.0 * u
    hit, radius = _sphere_bounce(u, v, mu, e)
    assert hit.tangential[0] == pytest.approx(u - mu * (1 + e) * v, rel=1e-12)
    assert hit.vertical[0] == pytest.approx(e * v, rel=1e-12)
    assert -hit.spin[0] * radius == pytest.approx(2.5 * mu * (1 + e) * v, rel=1e-12)


@pytest.mark.parametrize(("u", "v", "e"), [(5.0, 10.0, 0.5), (2.0, 3.0, 0.9), (8.0, 20.0, 0.0)])
def test_a_ball_that_grips_leaves_rolling_at_five_sevenths_of_its_speed(
    u: float, v: float, e: float
) -> None:
    # Gripping (mu (1 + e) v_n >= (2/7) v_t): the ball leaves rolling without slipping,
    # v_x' = (5/7) v_x and omega' R = -v_x' (angular momentum about the contact point, solid
    # sphere I = (2/5) m R^2). Cross, Am. J. Phys. 70 (2002) 1093, and the rolling-without-
    # slipping rebound e_t <= 5/7 of the issue; Halliday, Resnick and Walker, ch. 11.
    hit, radius = _sphere_bounce(u, v, 0.6, e)
    assert hit.tangential[0] == pytest.approx(5.0 / 7.0 * u, rel=1e-12)
    assert hit.tangential[0] + hit.spin[0] * radius == pytest.approx(0.0, abs=1e-12)
    assert hit.vertical[0] == pytest.approx(e * v, rel=1e-12)


def test_a_ball_on_frictionless_ground_keeps_its_horizontal_speed_and_spin() -> None:
    # No friction, no lever arm: only the normal impulse (1 + e) m v_n acts (Newton's and
    # Stronge's restitution agree here, Stronge, Impact Mechanics, 2000, §4.2).
    hit, _ = _sphere_bounce(4.0, 9.0, 0.0, 0.6, spin=12.0)
    assert hit.tangential[0] == 4.0
    assert hit.spin[0] == 12.0
    assert hit.vertical[0] == pytest.approx(0.6 * 9.0, rel=1e-12)


# --- A rod striking at an angle --------------------------------------------------------------


@pytest.mark.parametrize("angle", [10.0, 30.0, 45.0, 60.0, 80.0])
@pytest.mark.parametrize("e", [0.0, 0.5, 0.9])
def test_a_slender_rod_striking_on_its_end_without_friction_matches_rigid_body_theory(
    angle: float, e: float
) -> None:
    # Uniform thin rod of length L at angle theta to the ground, falling at v, striking with its
    # lower end on frictionless ground: P = (1 + e) m v / (1 + 3 cos^2 theta),
    # v_G' = -v + P / m, omega' = 6 P cos(theta) / (m L) (k^2 = L^2 / 12). The rigid-body
    # prediction D. Stoianovici and Y. Hurmuzlu, J. Appl. Mech. 63 (1996) 307-316, test against
    # their drop tests of slender bars (derived by hand here; their measured rebounds are not
    # reproduced, we have only their set-up from memory).
    length, v = 0.6, 7.0
    theta = math.radians(angle)
    lever, depth = 0.5 * length * math.cos(theta), -0.5 * length * math.sin(theta)
    hit = planar_impact(
        _one(0.0), _one(v), _one(0.0), _one(lever), _one(depth), _one(length**2 / 12.0),
        _one(0.0), _one(e),
    )  # fmt: skip
    impulse = (1.0 + e) * v / (1.0 + 3.0 * math.cos(theta) ** 2)
    assert hit.vertical[0] == pytest.approx(-v + impulse, rel=1e-12, abs=1e-12)
    assert hit.spin[0] == pytest.approx(6.0 * impulse * math.cos(theta) / length, rel=1e-12)
    assert hit.tangential[0] == 0.0


@pytest.mark.parametrize("angle", [20.0, 45.0, 70.0])
def test_a_rod_sticks_when_friction_allows_it_and_slips_when_it_does_not(angle: float) -> None:
    # The sticking condition: once slip stops, the contact sticks iff mu >= |W_tn| / W_tt
    # (Stronge, Impact Mechanics, 2000, §4.3; Keller, J. Appl. Mech. 53 (1986) 1-4). For the
    # rod striking on its end, W_tn / W_tt = 3 sin(theta) cos(theta) / (1 + 3 sin^2 theta)
    # (per unit mass, k^2 = L^2 / 12). Sticking leaves the contact point with no tangential
    # velocity; slipping leaves the friction impulse at mu times the normal impulse.
    length, v, e = 0.6, 7.0, 0.3
    theta = math.radians(angle)
    lever, depth = 0.5 * length * math.cos(theta), -0.5 * length * math.sin(theta)
    ratio = 3 * math.sin(theta) * math.cos(theta) / (1 + 3 * math.sin(theta) ** 2)
    k2 = length**2 / 12.0
    for mu, sticks in ((1.2 * ratio, True), (0.8 * ratio, False)):
        hit = planar_impact(
            _one(0.0), _one(v), _one(0.0), _one(lever), _one(depth), _one(k2), _one(mu), _one(e)
        )
        slip_after = hit.tangential[0] - hit.spin[0] * depth  # c_t = u - omega r_n
        if sticks:
            assert slip_after == pytest.approx(0.0, abs=1e-12)
        else:
            assert abs(hit.tangential_impulse[0]) == pytest.approx(
                mu * hit.normal_impulse[0], rel=1e-12
            )
            assert abs(slip_after) > 1e-6


# --- Energy --------------------------------------------------------------------------------


@pytest.mark.parametrize("shape", ["irregular", "tube", "plate", "sphere"])
def test_no_contact_returns_more_kinetic_energy_than_it_received(shape: str) -> None:
    # Energetic restitution with Coulomb friction is dissipative for every slip history
    # (Stronge, Impact Mechanics, 2000, §4.3): a property over random attitudes, speeds, spins,
    # friction and restitution.
    dims = {
        "irregular": {"length": 0.33, "width": 0.13, "height": 0.03},
        "tube": {"length": 6.4, "outer_diameter": 0.0483, "wall_thickness": 0.004},
        "plate": {"length": 1.2, "width": 0.6, "thickness": 0.018},
        "sphere": {"diameter": 0.2},
    }[shape]
    geometry = body(shape, dims)
    rng = np.random.default_rng(7)
    n = 50_000
    rotation = random_orientations(n, rng)
    point = contact_point(geometry, rotation, np.tile([[1.0], [0.0]], (1, n)))
    u = rng.uniform(-15.0, 15.0, n)
    v = rng.uniform(0.01, 40.0, n)
    spin = rng.uniform(-30.0, 30.0, n)
    mu = rng.choice([0.0, 0.2, 0.5, 1.0, 5.0, 1e6], n)
    e = rng.uniform(0.0, 1.0, n)
    hit = planar_impact(u, v, spin, point.lever, point.depth, point.gyration, mu, e)
    before = u**2 + v**2 + point.gyration * spin**2
    after = hit.tangential**2 + hit.vertical**2 + point.gyration * hit.spin**2
    approaching = v - spin * point.lever > 0.0  # contact point moving into the ground
    assert np.all(after[approaching] <= before[approaching] * (1 + 1e-12))
    # The contact point never keeps moving into the ground.
    separating = hit.vertical + hit.spin * point.lever
    assert np.all(separating[approaching] >= -1e-9 * v[approaching])


def test_after_landing_never_outruns_its_impact_energy_on_level_ground() -> None:
    # With e = 0 the contact point never rebounds, but a body that pivots on its corner can
    # still lift its centre of mass once: one hop at most, (v_z^2 + v_h^2) / g <= v^2 / g for
    # a speed v it cannot exceed (no energy gain), and later centred contacts with e = 0 end
    # the hopping. Then it slides at most v^2 / (2 mu g) (Coulomb friction on level ground).
    geometry = body("box", {"length": 0.4, "width": 0.2, "height": 0.1})
    rng = np.random.default_rng(3)
    n = 20_000
    velocity = np.vstack([rng.uniform(-5, 5, n), rng.uniform(-5, 5, n), -rng.uniform(1, 30, n)])
    ground = Ground(np.zeros(n), np.full(n, 0.4), np.full(n, 0.01))
    landing = after_landing(velocity, geometry, ground, random_orientations(n, rng), gravity=G)
    speed2 = np.sum(velocity**2, axis=0)
    assert np.all(landing.contacts <= 3)
    assert np.all(landing.hop_distance <= speed2 / G)
    assert np.all(np.hypot(*landing.offset) <= speed2 / G + speed2 / (2 * 0.4 * G))


def test_random_orientations_are_rotations_uniform_over_directions() -> None:
    # Rotation matrices are orthonormal with determinant 1; for a uniform rotation the body
    # axis that ends up vertical is uniform on the sphere, so each component of it has mean 0
    # and variance 1/3 (Archimedes' hat-box theorem: its z component is uniform on [-1, 1]).
    rotation = random_orientations(200_000, np.random.default_rng(5))
    eye = np.einsum("nij,nkj->nik", rotation, rotation)
    assert np.allclose(eye, np.eye(3), atol=1e-12)
    assert np.allclose(np.linalg.det(rotation), 1.0, atol=1e-12)
    up = rotation[:, 2, :]
    assert np.allclose(up.mean(axis=0), 0.0, atol=0.01)
    assert np.allclose((up**2).mean(axis=0), 1.0 / 3.0, atol=0.01)
    counts, _ = np.histogram(up[:, 2], bins=10, range=(-1.0, 1.0))
    assert counts.min() > 0.95 * counts.mean()


# --- Restitution, rolling, materials ---------------------------------------------------------


def test_restitution_falls_as_the_inverse_fourth_root_of_speed_above_the_reference() -> None:
    # e proportional to V^(-1/4) in elastic-plastic impact above the yield velocity (Johnson,
    # Contact Mechanics, 1985, §11.4, from memory): 16 times the speed halves e.
    e_ref = np.array([0.6])
    assert normal_restitution(e_ref, 16.0 * REFERENCE_SPEED)[0] == pytest.approx(0.3, rel=1e-12)
    assert normal_restitution(e_ref, 0.5 * REFERENCE_SPEED)[0] == 0.6


@pytest.mark.parametrize(
    ("shape", "dims", "factor"),
    [
        ("sphere", {"diameter": 0.1}, 5.0 / 7.0),
        ("cylinder", {"length": 1.0, "diameter": 0.05}, 2.0 / 3.0),
        ("tube", {"length": 1.0, "outer_diameter": 0.05, "wall_thickness": 1e-6}, 0.5),
    ],
)
def test_a_skidding_round_body_rolls_on_at_v_over_one_plus_its_inertia_factor(
    shape: str, dims: dict, factor: float
) -> None:
    # Skid to roll: v_after = v / (1 + I / (m r^2)): sphere 5/7, solid cylinder 2/3,
    # thin-walled tube 1/2 (Halliday, Resnick and Walker, ch. 11 and Table 10-2). A body
    # sliding at v with no hop skids over (v^2 - v_r^2) / (2 mu g) and rolls out over
    # v_r^2 / (2 c_rr g).
    geometry = body(shape, dims)
    v, mu, c_rr = 3.0, 0.5, 0.02
    # Lying on its side, axis (body z) north-south, sliding east: a grazing first contact.
    # Rows: the body-frame directions of world east, north and up.
    rotation = np.array([[[0.0, -1.0, 0.0], [0.0, 0.0, 1.0], [-1.0, 0.0, 0.0]]])
    velocity = np.array([[v], [0.0], [-1e-9]])
    landing = after_landing(
        velocity, geometry, Ground(_one(0.0), _one(mu), _one(c_rr)), rotation, gravity=G,
        rolls=True,
    )  # fmt: skip
    rolled = factor * v
    # (the "thin" tube has a 1 um wall: its factor is 1/2 to 4e-5)
    assert landing.roll_distance[0] == pytest.approx(rolled**2 / (2 * c_rr * G), rel=1e-4)
    assert landing.slide_distance[0] == pytest.approx((v**2 - rolled**2) / (2 * mu * G), rel=1e-4)


def test_a_roll_down_a_slope_steeper_than_the_resistance_never_stops() -> None:
    # A rolling body on a slope beta accelerates while sin(beta) / (1 + kappa) > c_rr cos(beta)
    # (Halliday, Resnick and Walker, ch. 11): it rolls away, reported as infinitely far.
    geometry = body("sphere", {"diameter": 0.1})
    rotation = contact.orientations(np.array([[0.0], [0.0], [1.0]]), np.array([0.0]))
    velocity = np.array([[2.0], [0.0], [-1e-9]])
    landing = after_landing(
        velocity, geometry, Ground(_one(0.0), _one(0.5), _one(0.01), slope=5.0), rotation,
        gravity=G, rolls=True,
    )  # fmt: skip
    assert math.isinf(landing.roll_distance[0])


def test_material_and_ground_tables_are_complete_and_sourced() -> None:
    assert set(MATERIALS) == {"metal", "timber", "masonry", "glass", "plastic", "soft"}
    for item in MATERIALS.values():
        low, high = item.restitution
        assert 0.0 <= low <= high < 1.0
        assert item.restitution_source
        assert item.break_source
    assert MATERIALS["masonry"].break_speed is not None
    assert MATERIALS["metal"].break_speed is None
    assert SURFACES["concrete"].restitution_factor == (1.0, 1.0)
    for item in SURFACES.values():
        low, high = item.restitution_factor
        assert 0.0 < low <= high <= 1.0
        assert item.source


def test_fragment_travel_is_the_projectile_range_then_the_slide_left() -> None:
    # Launch at f v, elevation theta: range (f v)^2 sin(2 theta) / g (Halliday, Resnick and
    # Walker, ch. 4); landing takes up to mu (1 + e) of its vertical speed from the horizontal.
    v, f, theta, mu = 20.0, 0.3, 30.0, 0.5
    launch = f * v
    up, along = launch * math.sin(math.radians(theta)), launch * math.cos(math.radians(theta))
    e = 0.2  # e_ref below the reference speed: unchanged
    assert up < REFERENCE_SPEED
    left = along - mu * (1 + e) * up
    expected = launch**2 * math.sin(math.radians(2 * theta)) / G + left**2 / (2 * mu * G)
    got = contact.fragment_travel(
        _one(v), _one(f), _one(theta), _one(mu), _one(e), gravity=G
    )[0]  # fmt: skip
    assert got == pytest.approx(expected, rel=1e-12)
