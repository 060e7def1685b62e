"""Checks of dropcalc.physics.scatter: hops, slide, roll and fragments after the first contact.

Independent references: explicit hop-by-hop loops written here; the infinite geometric series of
derived; scipy.integrate.solve_ivp for a projectile (hop length, fragment
range), a block decelerating at mu g (slide) and a skidding sphere with spin (the 5/7 rolling
factor); the restitution ranges quoted in [DORREN-2003] (Dorren, Prog. Phys. Geogr. 27 (2003)
69-87; Chau et al., IJRMMS 39 (2002) 69-77; from memory).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.integrate import solve_ivp

from dropcalc.errors import InputError, UnknownObjectError
from dropcalc.physics.scatter import (
    FRAGMENT_SPEED_FRACTION,
    STOP_SPEED,
    SURFACES,
    first_rebound,
    fragment_allowance,
    hop_distance,
    sample_rolling_resistance,
    sample_surface,
    scatter_distance,
    scatter_upper,
    surface,
)

G = 9.80665  # standard gravity [m/s^2], 3rd CGPM (1901); [CGPM-1901]


# --- independent references ------------------------------------------------------------------


def hops_by_loop(
    v_n: float, v_h: float, e_n: float, e_t: float, stop: float
) -> tuple[float, int, list[tuple[float, float]]]:
    """Rebound by rebound: (distance of the counted hops, hop count, per-hop (v_n, v_h)).

    Each rebound multiplies the normal speed by e_n and the tangential speed by e_t
    ([DORREN-2003]); a hop is counted while its rebound normal speed is >= stop; a hop
    leaving with (v_z, v_x) lands after 2 v_z / g and covers 2 v_z v_x / g (flat ground, no
    drag; Halliday, Resnick & Walker, Fundamentals of Physics, ch. 4, from memory).
    """
    distance, count, speeds = 0.0, 0, []
    normal, along = v_n, v_h
    while True:
        normal, along = normal * e_n, along * e_t
        if normal <= 0.0 or normal < stop:
            return distance, count, speeds
        count += 1
        distance += 2.0 * normal * along / G
        speeds.append((normal, along))


def slide_by_formula(speed: float, mu: float, c_rr: float | None) -> float:
    """v^2 / (2 mu g); a rolling sphere skids to (5/7) v, then rolls out at c_rr g.

    Both formulas are checked against solve_ivp in the tests below.
    """
    if c_rr is None:
        return speed**2 / (2.0 * mu * G)
    rolling = 5.0 / 7.0 * speed
    return (speed**2 - rolling**2) / (2.0 * mu * G) + rolling**2 / (2.0 * c_rr * G)


def envelope_by_loop(
    v_n: float,
    v_h: float,
    e_n: float,
    e_t: float,
    mu: float,
    stop: float,
    c_rr: float | None = None,
) -> tuple[float, float, int]:
    """Longest (bounce + slide) over every turning point j = 0 ... K, hop by hop.

    The object may stop hopping after any counted hop and slide on at that hop's horizontal
    speed (module docstring of dropcalc.physics.scatter). Returns (total, bounce, hops).
    """
    best = (slide_by_formula(v_h, mu, c_rr), 0.0, 0)
    _, _, speeds = hops_by_loop(v_n, v_h, e_n, e_t, stop)
    distance = 0.0
    for j, (normal, along) in enumerate(speeds, start=1):
        distance += 2.0 * normal * along / G
        total = distance + slide_by_formula(along, mu, c_rr)
        if total > best[0]:
            best = (total, distance, j)
    return best


def projectile_range(speed_up: float, speed_along: float) -> float:
    """Horizontal distance to the return to z = 0, by scipy.integrate.solve_ivp (no drag)."""

    def rhs(_t: float, state: np.ndarray) -> list[float]:
        return [state[2], state[3], 0.0, -G]

    def ground(t: float, state: np.ndarray) -> float:
        return state[1] if t > 0 else 1.0

    ground.terminal = True  # type: ignore[attr-defined]
    ground.direction = -1  # type: ignore[attr-defined]
    result = solve_ivp(
        rhs, (0.0, 100.0), [0.0, 0.0, speed_along, speed_up], events=ground, rtol=1e-10, atol=1e-12
    )
    return float(result.y_events[0][0][0])


# --- hops ------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("v_n", "v_h", "e_n", "e_t", "stop"),
    [
        (15.0, 3.0, 0.5, 0.9, 0.3),
        (22.0, 7.5, 0.37, 0.87, 0.3),
        (8.0, 1.0, 0.25, 0.7, 0.1),
        (0.5, 4.0, 0.5, 0.9, 0.3),  # first rebound at 0.25 m/s: no hop
    ],
)
def test_truncated_hop_sum_equals_the_hop_by_hop_loop(
    v_n: float, v_h: float, e_n: float, e_t: float, stop: float
) -> None:
    expected, count, _ = hops_by_loop(v_n, v_h, e_n, e_t, stop)
    got = hop_distance(v_n, v_h, e_n, e_t, count, gravity=G)
    assert got == pytest.approx(expected, rel=1e-12, abs=1e-15)
    # With friction so high that sliding is negligible the envelope is the brief's literal
    # model: every counted hop, K of them.
    literal = scatter_distance(v_n, v_h, e_n, e_t, 1e12, gravity=G, stop_speed=stop)
    assert int(literal.hops) == count
    assert float(literal.bounce_distance) == pytest.approx(expected, rel=1e-12, abs=1e-15)


def test_infinite_hop_sum_equals_the_geometric_series() -> None:
    # derived: total (2 v_n v_h / g) e_n e_t / (1 - e_n e_t).
    v_n, v_h, e_n, e_t = 12.0, 4.0, 0.45, 0.9
    series = 2 * v_n * v_h / G * e_n * e_t / (1 - e_n * e_t)
    assert float(hop_distance(v_n, v_h, e_n, e_t, math.inf)) == pytest.approx(series, rel=1e-12)
    # stop_speed = 0 counts the whole sequence; with negligible sliding the envelope is it.
    result = scatter_distance(v_n, v_h, e_n, e_t, 1e12, stop_speed=0.0)
    assert float(result.total) == pytest.approx(series, rel=1e-9)


@pytest.mark.parametrize(("speed_up", "speed_along"), [(5.0, 3.0), (0.8, 12.0), (9.0, 0.4)])
def test_hop_length_matches_a_projectile_integration(speed_up: float, speed_along: float) -> None:
    # One hop from an impact at (v_n, v_h) with e_n = 0.5, e_t = 0.8 leaves with
    # (speed_up, speed_along); scipy solve_ivp integrates z'' = -g until z = 0.
    by_ode = projectile_range(speed_up, speed_along)
    got = hop_distance(speed_up / 0.5, speed_along / 0.8, 0.5, 0.8, 1)
    assert float(got) == pytest.approx(by_ode, rel=1e-8)


def test_scatter_equals_the_hop_by_hop_envelope_over_random_cases() -> None:
    rng = np.random.default_rng(20240611)
    n = 300
    v_n = rng.uniform(0.0, 40.0, n)
    v_h = rng.uniform(0.0, 20.0, n)
    e_n = rng.uniform(0.0, 0.7, n)
    e_t = rng.uniform(0.3, 0.99, n)
    mu = rng.uniform(0.2, 0.9, n)
    c_rr = rng.uniform(0.01, 0.3, n)
    for rolls in (False, True):
        result = scatter_distance(
            v_n, v_h, e_n, e_t, mu, rolls=rolls, rolling_resistance=c_rr, stop_speed=STOP_SPEED
        )
        for i in range(n):
            total, bounce, hops = envelope_by_loop(
                v_n[i], v_h[i], e_n[i], e_t[i], mu[i], STOP_SPEED, c_rr[i] if rolls else None
            )
            assert result.total[i] == pytest.approx(total, rel=1e-10, abs=1e-12)
            assert result.bounce_distance[i] == pytest.approx(bounce, rel=1e-10, abs=1e-12)
            assert result.hops[i] == hops


def test_the_envelope_can_prefer_fewer_hops_than_counted() -> None:
    # Concrete-like e_n 0.55, e_t 0.95, mu 0.4, v_n 15 m/s, v_h 10 m/s: K = 6 rebounds at or
    # above 0.3 m/s (0.55^6 x 15 = 0.415, 0.55^7 x 15 = 0.228), but sliding on from hop 5 at
    # 0.95^5 v_h goes farther than the small sixth hop plus a slide at 0.95^6 v_h.
    _, count, _ = hops_by_loop(15.0, 10.0, 0.55, 0.95, STOP_SPEED)
    assert count == 6
    result = scatter_distance(15.0, 10.0, 0.55, 0.95, 0.4)
    assert int(result.hops) == 5
    assert float(result.total) > hop_distance(15.0, 10.0, 0.55, 0.95, 6) + slide_by_formula(
        10.0 * 0.95**6, 0.4, None
    )


# --- slide and roll --------------------------------------------------------------------------


@pytest.mark.parametrize(("speed", "mu"), [(6.0, 0.4), (2.5, 0.7), (15.0, 0.3)])
def test_slide_distance_matches_a_decelerating_block(speed: float, mu: float) -> None:
    # Kinetic friction: x'' = -mu g until v = 0 (Halliday, Resnick & Walker, ch. 6), by
    # scipy solve_ivp; no hop since v_n = 0.
    def rhs(_t: float, state: np.ndarray) -> list[float]:
        return [state[1], -mu * G]

    def stopped(_t: float, state: np.ndarray) -> float:
        return state[1]

    stopped.terminal = True  # type: ignore[attr-defined]
    ode = solve_ivp(rhs, (0.0, 100.0), [0.0, speed], events=stopped, rtol=1e-10, atol=1e-12)
    result = scatter_distance(0.0, speed, 0.5, 0.9, mu)
    assert float(result.slide_distance) == pytest.approx(ode.y_events[0][0][0], rel=1e-8)
    assert float(result.bounce_distance) == 0.0
    assert float(result.total) == float(result.slide_distance)


@pytest.mark.parametrize(("speed", "mu", "c_rr"), [(5.0, 0.4, 0.03), (10.0, 0.6, 0.2)])
def test_rolling_sphere_matches_an_integration_with_spin(
    speed: float, mu: float, c_rr: float
) -> None:
    # A solid sphere (I = 2/5 m r^2; Halliday, Resnick & Walker, Table 10-2, from memory) lands
    # without spin at v0. While it skids, friction mu m g slows the centre (v' = -mu g) and spins
    # it up (I w' = mu m g r). Angular momentum about the contact point is conserved (friction
    # and the normal force act at that point, gravity along the line through it):
    # m v0 r = m v r + I w, and rolling starts at w = v / r, so v0 = v (1 + 2/5): v = 5/7 v0.
    # It then rolls out decelerating at c_rr g (c_rr as defined in the module: rolling
    # deceleration / g). scipy solve_ivp integrates both phases.
    radius = 0.05

    def skid(_t: float, state: np.ndarray) -> list[float]:
        return [state[1], -mu * G, 2.5 * mu * G / radius]

    def rolling_starts(_t: float, state: np.ndarray) -> float:
        return state[1] - state[2] * radius

    rolling_starts.terminal = True  # type: ignore[attr-defined]
    first = solve_ivp(
        skid, (0, 100), [0.0, speed, 0.0], events=rolling_starts, rtol=1e-11, atol=1e-12
    )
    x_roll, v_roll, _ = first.y_events[0][0]
    assert v_roll == pytest.approx(5.0 / 7.0 * speed, rel=1e-8)
    distance = x_roll + v_roll**2 / (2 * c_rr * G)  # uniform deceleration c_rr g (ch. 2)
    result = scatter_distance(0.0, speed, 0.5, 0.9, mu, rolls=True, rolling_resistance=c_rr)
    assert float(result.slide_distance) == pytest.approx(distance, rel=1e-8)


def test_rolling_goes_farther_than_sliding_on_every_surface() -> None:
    # c_rr << mu on every surface (from memory, table in the module), so rolling is longer.
    for name in SURFACES:
        assert (
            scatter_upper(10.0, 5.0, name, rolls=True).total > scatter_upper(10.0, 5.0, name).total
        )


# --- fragments -------------------------------------------------------------------------------


@pytest.mark.parametrize("impact_speed", [5.0, 17.0, 30.0])
def test_fragment_allowance_is_the_45_degree_range_at_a_fraction_of_the_speed(
    impact_speed: float,
) -> None:
    # (f v)^2 / g with f = 0.3 (common practice, no source); the range at 45 deg by solve_ivp.
    assert FRAGMENT_SPEED_FRACTION == 0.3
    speed = 0.3 * impact_speed
    by_ode = projectile_range(speed / math.sqrt(2), speed / math.sqrt(2))
    assert float(fragment_allowance(impact_speed)) == pytest.approx(by_ode, rel=1e-8)
    # 45 deg is the longest flat-ground range: 30 and 60 deg give sin(60 deg) = 0.866 of it.
    assert projectile_range(speed * 0.5, speed * math.sqrt(3) / 2) == pytest.approx(
        by_ode * math.sqrt(3) / 2, rel=1e-8
    )


def test_fragile_objects_add_the_allowance_of_the_impact_speed() -> None:
    plain = scatter_distance(12.0, 5.0, 0.4, 0.85, 0.5)
    fragile = scatter_distance(12.0, 5.0, 0.4, 0.85, 0.5, fragile=True)
    allowance = (0.3 * 13.0) ** 2 / G  # |(12, 5)| = 13 m/s
    assert float(fragile.fragment_distance) == pytest.approx(allowance, rel=1e-12)
    assert float(fragile.total) == pytest.approx(float(plain.total) + allowance, rel=1e-12)
    assert float(plain.fragment_distance) == 0.0


# --- monotonicity and limits -----------------------------------------------------------------


def test_total_grows_with_restitution_and_falls_with_friction() -> None:
    # Across K steps too: e_n from 0.05 to 0.95 crosses many hop counts at v_n = 20 m/s.
    e_n = np.linspace(0.0, 0.95, 400)
    for v_h in (0.5, 3.0, 10.0):
        by_e_n = scatter_distance(20.0, v_h, e_n, 0.9, 0.4).total
        assert np.all(np.diff(by_e_n) >= -1e-12 * by_e_n[1:])
    e_t = np.linspace(0.0, 0.99, 200)
    assert np.all(np.diff(scatter_distance(20.0, 4.0, 0.5, e_t, 0.4).total) >= 0)
    mu = np.linspace(0.1, 1.0, 200)
    assert np.all(np.diff(scatter_distance(20.0, 4.0, 0.5, 0.9, mu).total) <= 0)
    c_rr = np.linspace(0.01, 0.5, 200)
    rolled = scatter_distance(20.0, 4.0, 0.5, 0.9, 0.4, rolls=True, rolling_resistance=c_rr)
    assert np.all(np.diff(rolled.total) <= 0)
    # Strictly: the ends of these ranges differ.
    assert by_e_n[-1] > by_e_n[0]


def test_scatter_upper_bounds_every_sample_within_the_ranges() -> None:
    rng = np.random.default_rng(7)
    v_n = rng.uniform(1.0, 35.0, 2000)
    v_h = rng.uniform(0.0, 15.0, 2000)
    for name in SURFACES:
        e_n, e_t, mu = sample_surface(name, 2000, rng)
        c_rr = sample_rolling_resistance(name, 2000, rng)
        upper = scatter_upper(v_n, v_h, name, rolls=True).total
        sampled = scatter_distance(v_n, v_h, e_n, e_t, mu, rolls=True, rolling_resistance=c_rr)
        assert np.all(sampled.total <= upper * (1 + 1e-12))


def test_no_horizontal_speed_means_no_scatter() -> None:
    result = scatter_distance(
        np.array([0.0, 5.0, 30.0]), 0.0, 0.5, 0.9, 0.4, rolls=True, rolling_resistance=0.02
    )
    np.testing.assert_array_equal(result.total, 0.0)
    np.testing.assert_array_equal(result.bounce_distance, 0.0)
    np.testing.assert_array_equal(result.slide_distance, 0.0)
    # The object still bounces in place: 0.5 x 5 = 2.5 ... 0.5^4 x 5 = 0.31 >= 0.3 m/s: 4 hops.
    assert result.hops[1] == 4


def test_vectorised_equals_scalar() -> None:
    v_n = np.array([3.0, 12.0, 25.0, 0.0])
    v_h = np.array([1.0, 6.0, 2.0, 4.0])
    e_n = np.array([0.2, 0.45, 0.55, 0.3])
    e_t = np.array([0.6, 0.85, 0.95, 0.8])
    mu = np.array([0.3, 0.5, 0.7, 0.4])
    many = scatter_distance(v_n, v_h, e_n, e_t, mu, fragile=True)
    assert many.total.shape == (4,)
    for i in range(4):
        one = scatter_distance(v_n[i], v_h[i], e_n[i], e_t[i], mu[i], fragile=True)
        assert one.total.shape == ()
        assert float(one.total) == many.total[i]
        assert float(one.hops) == many.hops[i]
    # Scalars broadcast against arrays.
    mixed = scatter_distance(v_n, 6.0, 0.45, 0.85, 0.5)
    assert mixed.total[1] == float(scatter_distance(12.0, 6.0, 0.45, 0.85, 0.5).total)


# --- surfaces and sampling -------------------------------------------------------------------


# [DORREN-2003], from memory: Dorren, Prog. Phys. Geogr. 27 (2003) 69-87; Chau et al.,
# IJRMMS 39 (2002) 69-77. key: (e_n range, e_t range).
PUBLISHED_RESTITUTION = {
    "concrete": ((0.45, 0.55), (0.85, 0.95)),
    "asphalt": ((0.35, 0.40), (0.85, 0.90)),
    "compacted-soil": ((0.30, 0.40), (0.80, 0.85)),
    "grass": ((0.20, 0.30), (0.60, 0.80)),
    "soft-soil": ((0.20, 0.30), (0.60, 0.80)),
}


@pytest.mark.parametrize("key", sorted(PUBLISHED_RESTITUTION))
def test_surface_restitution_is_the_quoted_range(key: str) -> None:
    e_n, e_t = PUBLISHED_RESTITUTION[key]
    assert surface(key).normal_restitution == e_n
    assert surface(key).tangential_restitution == e_t


def test_surface_table_is_consistent() -> None:
    assert {"concrete", "asphalt", "compacted-soil", "gravel", "grass"} <= set(SURFACES)
    for key, item in SURFACES.items():
        assert item.key == key
        assert item.source
        for low, high in (item.normal_restitution, item.tangential_restitution):
            assert 0 <= low <= high < 1
        for low, high in (item.friction, item.rolling_resistance):
            assert 0 < low <= high
        # Rolling is the easier motion at the conservative (low) ends the envelope uses.
        assert item.rolling_resistance[0] < item.friction[0]
    # Gravel is chosen between compact soil and soft soil (no source for the choice).
    gravel, compact, soft = surface("gravel"), surface("compacted-soil"), surface("soft-soil")
    for field in ("normal_restitution", "tangential_restitution"):
        assert getattr(soft, field)[0] <= getattr(gravel, field)[0] <= getattr(compact, field)[0]
        assert getattr(soft, field)[1] <= getattr(gravel, field)[1] <= getattr(compact, field)[1]


def test_surface_lookup_is_forgiving_and_unknown_names_list_the_keys() -> None:
    assert surface("Compacted soil") is SURFACES["compacted-soil"]
    assert surface("compacted_soil") is SURFACES["compacted-soil"]
    assert surface(SURFACES["grass"]) is SURFACES["grass"]
    with pytest.raises(UnknownObjectError, match="surface must be one of concrete, asphalt"):
        surface("ice")
    with pytest.raises(UnknownObjectError, match="gravel"):
        scatter_upper(10.0, 2.0, "sand")


def test_samples_are_uniform_within_the_ranges() -> None:
    rng = np.random.default_rng(1)
    n = 20000
    e_n, e_t, mu = sample_surface("asphalt", n, rng)
    for values, (low, high) in (
        (e_n, (0.35, 0.40)),
        (e_t, (0.85, 0.90)),
        (mu, SURFACES["asphalt"].friction),
    ):
        assert values.shape == (n,)
        assert values.min() >= low
        assert values.max() <= high
        # Uniform(a, b): mean (a + b) / 2, standard deviation (b - a) / sqrt(12); 5 sigma / sqrt(n).
        sigma = (high - low) / math.sqrt(12)
        assert abs(values.mean() - (low + high) / 2) < 5 * sigma / math.sqrt(n)
        assert values.std() == pytest.approx(sigma, rel=0.03)
    again = sample_surface("asphalt", 5, np.random.default_rng(3))
    np.testing.assert_array_equal(
        again[0], sample_surface("asphalt", 5, np.random.default_rng(3))[0]
    )
    with pytest.raises(InputError, match="n must be a whole number >= 1"):
        sample_surface("asphalt", 0, rng)


# --- bad input -------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("kwargs", "field"),
    [
        ({"vertical_speed": -1.0}, "vertical_speed"),
        ({"horizontal_speed": np.array([1.0, -2.0])}, "horizontal_speed"),
        ({"horizontal_speed": math.nan}, "horizontal_speed"),
        ({"normal_restitution": 1.0}, "normal_restitution"),
        ({"normal_restitution": -0.1}, "normal_restitution"),
        ({"tangential_restitution": 1.2}, "tangential_restitution"),
        ({"friction": 0.0}, "friction"),
        ({"friction": -0.3}, "friction"),
        ({"gravity": 0.0}, "gravity"),
        ({"stop_speed": -0.1}, "stop_speed"),
        ({"rolls": True}, "rolling_resistance"),
        ({"rolls": True, "rolling_resistance": 0.0}, "rolling_resistance"),
        ({"vertical_speed": np.ones((2, 2))}, "vertical_speed"),
        ({"vertical_speed": np.ones(3), "horizontal_speed": np.ones(2)}, "horizontal_speed"),
    ],
)
def test_bad_input_names_the_field(kwargs: dict, field: str) -> None:
    arguments = {
        "vertical_speed": 10.0,
        "horizontal_speed": 2.0,
        "normal_restitution": 0.4,
        "tangential_restitution": 0.8,
        "friction": 0.5,
    }
    arguments.update(kwargs)
    with pytest.raises(InputError, match=field):
        scatter_distance(**arguments)


def test_bad_fragment_and_hop_inputs_name_the_field() -> None:
    with pytest.raises(
        InputError, match="impact_speed must be a finite speed from 0 to 1000 m/s; got -3"
    ):
        fragment_allowance(-3.0)
    with pytest.raises(InputError, match="speed_fraction"):
        fragment_allowance(3.0, speed_fraction=1.5)
    with pytest.raises(InputError, match="hops"):
        hop_distance(10.0, 2.0, 0.4, 0.8, 1.5)


def test_fragment_fraction_too_large_for_a_float_is_refused_by_name() -> None:
    # Found by the property tests: an integer of 10^400 raised OverflowError when formatted.
    with pytest.raises(InputError, match="speed_fraction"):
        fragment_allowance(0.0, speed_fraction=10**400)


# --- First contact on a tilted effective normal -----------------------------------------------


def test_untilted_first_rebound_is_the_flat_contact() -> None:
    # No tilt: the flat-ground equivalent is the impact itself, going straight on.
    rebound = first_rebound([12.0, 3.0], [0.0, 4.0], 0.0, [0.0, 123.0], 0.5, 0.9)
    np.testing.assert_allclose(rebound.vertical_speed, [12.0, 3.0], rtol=1e-15)
    np.testing.assert_allclose(rebound.horizontal_speed, [0.0, 4.0], rtol=1e-15)
    np.testing.assert_allclose(rebound.turn, 0.0, atol=1e-15)


@pytest.mark.parametrize("tilt", [5.0, 15.0, 30.0])
def test_elastic_rebound_off_a_tilted_plane_obeys_the_law_of_reflection(tilt: float) -> None:
    # e_n = e_t -> 1: a vertical impact on a plane tilted by theta leaves 2 theta from the
    # vertical with its speed (angle of incidence = angle of reflection; Halliday, Resnick and
    # Walker, Fundamentals of Physics, ch. 33, from memory).
    e = 1.0 - 1e-12
    v = 10.0
    rebound = first_rebound(v, 0.0, tilt, 0.0, e, e)
    two_theta = math.radians(2.0 * tilt)
    assert float(rebound.vertical_speed) == pytest.approx(v * math.cos(two_theta), rel=1e-9)
    assert float(rebound.horizontal_speed) == pytest.approx(v * math.sin(two_theta), rel=1e-9)


def test_vertical_impact_on_a_tilted_contact_matches_the_hand_derivation() -> None:
    # v = (0, 0, -V), n = (sin t, 0, cos t): v.n = -V cos t; the normal part V cos t n is
    # reversed and scaled by e_n, the tangential part V sin t (cos t, 0, -sin t)... scaled by
    # e_t. Horizontal: V sin t cos t (e_n + e_t); vertical: V (e_n cos^2 t - e_t sin^2 t).
    v, t, e_n, e_t = 18.0, math.radians(12.0), 0.5, 0.9
    rebound = first_rebound(v, 0.0, 12.0, 0.0, e_n, e_t)
    u_h = v * math.sin(t) * math.cos(t) * (e_n + e_t)
    u_z = v * (e_n * math.cos(t) ** 2 - e_t * math.sin(t) ** 2)
    assert float(rebound.horizontal_speed) * e_t == pytest.approx(u_h, rel=1e-12)
    assert float(rebound.vertical_speed) * e_n == pytest.approx(u_z, rel=1e-12)


def test_the_rebound_turns_towards_the_tilt_and_never_gains_energy() -> None:
    rng = np.random.default_rng(3)
    n = 2000
    v_n, v_h = rng.uniform(0, 30, n), rng.uniform(0, 15, n)
    tilt, azimuth = rng.uniform(0, 45, n), rng.uniform(-180, 180, n)
    e_n, e_t = rng.uniform(0.2, 0.55, n), rng.uniform(0.6, 0.95, n)
    rebound = first_rebound(v_n, v_h, tilt, azimuth, e_n, e_t)
    # Energy: each velocity component about the normal shrinks (e < 1), so the rebound speed
    # is at most the impact speed.
    u_z = rebound.vertical_speed * e_n
    u_h = rebound.horizontal_speed * e_t
    assert np.all(u_z**2 + u_h**2 <= (v_n**2 + v_h**2) * (1 + 1e-12))
    # A vertical impact leaves towards the tilt's azimuth (counter-clockwise from the x axis).
    straight = first_rebound(10.0, 0.0, 20.0, 90.0, 0.5, 0.9)
    assert float(straight.turn) == pytest.approx(math.pi / 2, abs=1e-12)


@pytest.mark.parametrize(
    ("field", "kwargs"),
    [
        ("tilt", {"tilt": 95.0}),
        ("tilt", {"tilt": -1.0}),
        ("tilt_azimuth", {"tilt_azimuth": math.nan}),
        ("vertical_speed", {"vertical_speed": -1.0}),
        ("normal_restitution", {"normal_restitution": 1.0}),
    ],
)
def test_first_rebound_names_a_bad_field(field: str, kwargs: dict) -> None:
    args = {
        "vertical_speed": 10.0, "horizontal_speed": 1.0, "tilt": 10.0, "tilt_azimuth": 0.0,
        "normal_restitution": 0.5, "tangential_restitution": 0.9,
    } | kwargs  # fmt: skip
    with pytest.raises(InputError, match=field):
        first_rebound(**args)
