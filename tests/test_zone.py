"""Checks of dropcalc.analysis.zone: Monte Carlo radius, its error, envelope, scatter, inverses.

Independent references:

- vacuum projectile kinematics: fall time t = sqrt(2 H / g) and horizontal travel v t; the
  greatest range from a height, R = (v / g) sqrt(v^2 + 2 g H) (D. Halliday, R. Resnick and
  J. Walker, "Fundamentals of Physics", 10th ed., Wiley, 2014, ch. 4; M. A. Lichtenberg and
  J. G. Wills, "Maximizing the range of the shot put", Am. J. Phys. 46 (1978) 546-549; both
  from memory);
- the p-quantile of a uniform distribution on [0, L], p L, and the asymptotic standard error of
  a sample quantile, sqrt(p (1 - p) / n) / f(q) (H. A. David and H. N. Nagaraja, "Order
  Statistics", 3rd ed., Wiley, 2003, sec. 10.2; R. J. Serfling, "Approximation Theorems of
  Mathematical Statistics", Wiley, 1980, sec. 2.3.3; from memory);
- the slide and hop formulas of derived for bounds on the scatter;
- shapely's own predicates and distances (is_valid, contains_xy, distance, hausdorff_distance).

A "dense" object (10 kg, drag area 1e-7 m^2) has k = rho Cd A / (2 m) ~ 6e-9 1/m, so over a
20-40 m flight drag changes speeds by ~1e-7 relative: vacuum kinematics hold far inside every
tolerance below. A "stopping" ground (restitutions 0, friction 1e9) ends every object where it
lands: the slide v^2 / (2 mu g) is below 1e-8 m for any speed here.
"""

from __future__ import annotations

import json
import math
from dataclasses import replace

import numpy as np
import pytest
import shapely

from dropcalc.analysis.plan import Site, WorkEdge, from_geojson_local, to_geojson
from dropcalc.analysis.zone import (
    ENVELOPE_SEARCH_ALLOWANCE,
    Uncertainty,
    ZoneObject,
    ZoneSettings,
    _land,
    _land_by_table,
    compute_zone,
    envelope_distance,
    greatest_height,
    highest_wind,
    quantile_with_error,
    sample_object,
    site_zone,
    zone_object,
)
from dropcalc.errors import InputError
from dropcalc.io.library import load_library
from dropcalc.model.conditions import Conditions
from dropcalc.physics.contact import FRAGMENT_ANGLE, FRAGMENT_SPEED_FRACTION
from dropcalc.physics.release import Release
from dropcalc.physics.scatter import Surface, surface
from dropcalc.physics.wind import wind_spec

G = 9.80665  # standard gravity [m/s^2], 3rd CGPM (1901); [CGPM-1901]

DENSE = ZoneObject("dense test mass", mass=10.0, drag_area_min=1e-7, drag_area_max=1e-7)

# Ground that stops an object where it lands (see the module docstring). Built here, not taken
# from the surface table: a restitution of exactly 0 and a friction of 1e9.
STOPPING = Surface(
    key="stopping",
    label="stops everything",
    restitution_factor=(0.0, 0.0),
    friction=(1e9, 1e9),
    rolling_resistance=(1e9, 1e9),
    source="test surface",
)

# Push speed uniform on [0, V] straight out from the edge: the rest distance is V_sample t_fall.
UNIFORM_PUSH = Uncertainty(release_speed_low=0.0, release_direction_spread=0.0)


def _library_object(object_id: str) -> ZoneObject:
    """The zone object for a library id, with the properties the CLI passes on."""
    return zone_object(load_library(None).get(object_id))


def _uniform_push_settings(top_speed: float, height: float, confidence: float) -> ZoneSettings:
    return ZoneSettings(
        height=height,
        conditions=Conditions(release=Release("push", speed=top_speed)),
        ground=STOPPING,
        confidence=confidence,
        margin=0.0,
        uncertainty=UNIFORM_PUSH,
    )


def _vacuum_fall_time(height: float) -> float:
    """t = sqrt(2 H / g), free fall from rest (Halliday, Resnick and Walker, ch. 2)."""
    return math.sqrt(2.0 * height / G)


# --- Analytic percentile ---------------------------------------------------------------------


@pytest.mark.parametrize("confidence", [0.5, 0.9, 0.99])
def test_zone_drift_quantile_is_the_uniform_quantile_of_push_speed_times_fall_time(
    confidence: float,
) -> None:
    # Speed uniform on [0, V] => travel uniform on [0, V t]; its p-quantile is p V t (uniform
    # distribution), t = sqrt(2 H / g) (vacuum kinematics).
    top, height = 5.0, 20.0
    result = compute_zone([DENSE], _uniform_push_settings(top, height, confidence))
    zone = result.driver
    expected = confidence * top * _vacuum_fall_time(height)
    assert zone.standard_error > 0
    assert abs(zone.drift - expected) <= 3.0 * zone.standard_error, (zone.drift, expected)
    # Nothing moves after landing on the stopping ground, and there is no margin.
    assert zone.scatter == pytest.approx(0.0, abs=1e-6)
    assert result.radius == pytest.approx(zone.drift, abs=1e-6)


def test_reported_standard_error_matches_the_asymptotic_standard_error_of_a_quantile() -> None:
    # For a uniform distribution on [0, L] the density is 1/L, so the sample p-quantile has the
    # asymptotic standard error L sqrt(p (1 - p) / n) (David and Nagaraja 2003, sec. 10.2).
    # The reported SE is the width of a distribution-free interval spanning ~2 x 1.96 x
    # sqrt(n p (1 - p)) = 55 order statistics at p = 0.99, n = 20 000: its relative scatter is
    # about 1/sqrt(55) = 0.13, so +-40 % is a 3-sigma window.
    top, height, p = 5.0, 20.0, 0.99
    n = 20_000
    length = top * _vacuum_fall_time(height)
    rest, _, _ = sample_object(
        DENSE, _uniform_push_settings(top, height, p), n, np.random.default_rng(11)
    )
    _, error = quantile_with_error(np.hypot(rest[0], rest[1]), p)
    expected = length * math.sqrt(p * (1.0 - p) / n)
    assert error == pytest.approx(expected, rel=0.4)


def test_radius_converges_to_the_analytic_quantile_as_samples_grow() -> None:
    top, height, p = 5.0, 20.0, 0.99
    exact = p * top * _vacuum_fall_time(height)  # uniform quantile x vacuum fall time
    settings = _uniform_push_settings(top, height, p)
    errors = []
    for n in (5_000, 20_000, 80_000):
        rest, _, _ = sample_object(DENSE, settings, n, np.random.default_rng(n))
        quantile, error = quantile_with_error(np.hypot(rest[0], rest[1]), p)
        assert abs(quantile - exact) <= 3.0 * error, (n, quantile, exact, error)
        errors.append(error)
    # SE ~ 1 / sqrt(n): four times the samples halve it. Each SE is good to ~13-25 % (see the
    # test above; fewer order statistics at n = 5000), so the ratio of two lies within 1.3-3.
    for coarse, fine in zip(errors[:-1], errors[1:], strict=True):
        assert 1.3 < coarse / fine < 3.0, errors


def test_realistic_radius_agrees_across_sample_sizes_within_the_errors() -> None:
    # No closed form here: the quantiles at 5k, 20k and 80k samples must agree within three
    # combined standard errors, and the standard error must shrink.
    obj = _library_object("combination-spanner-19mm")
    settings = ZoneSettings(
        height=15.0, conditions=Conditions(release=Release("push", speed=2.0), wind=wind_spec(8.0))
    )
    found = []
    for n in (5_000, 20_000, 80_000):
        rest, _, _ = sample_object(obj, settings, n, np.random.default_rng(100 + n))
        found.append(quantile_with_error(np.hypot(rest[0], rest[1]), 0.99))
    (_, se_5k), _, (q_80k, se_80k) = found
    for quantile, error in found[:-1]:
        assert abs(quantile - q_80k) <= 3.0 * math.hypot(error, se_80k), found
    assert se_80k < se_5k


def _spanner_in_wind() -> tuple[ZoneObject, ZoneSettings]:
    obj = _library_object("combination-spanner-19mm")
    return obj, ZoneSettings(
        height=15.0, conditions=Conditions(release=Release("push", speed=2.0), wind=wind_spec(8.0))
    )


@pytest.mark.parametrize("case", ["uniform-push", "spanner-in-wind", "brick-drop-in-wind"])
def test_reported_standard_error_matches_the_spread_over_seeds(case: str) -> None:
    # 30 independent runs of 5000 samples. The standard deviation of 30 values has a relative
    # standard error of 1 / sqrt(2 (30 - 1)) = 0.13 (normal theory), and the mean of 30
    # reported SEs adds little; the reported SE itself is an asymptotic (normal-approximation)
    # figure. The window 0.6-1.6 is -3 sigma to +4.6 sigma: it catches an SE off by a factor
    # of ~2 (e.g. a missing 1.96 or sqrt(n)), not the sampling noise.
    if case == "uniform-push":
        obj, settings = DENSE, _uniform_push_settings(5.0, 20.0, 0.99)
    elif case == "brick-drop-in-wind":  # landings read from the fall table
        obj = _library_object("brick-uk-standard")
        settings = ZoneSettings(height=18.0, conditions=Conditions(wind=wind_spec(8.0)))
    else:
        obj, settings = _spanner_in_wind()
    quantiles, errors = [], []
    for seed in range(30):
        rest, _, _ = sample_object(obj, settings, 5_000, np.random.default_rng(1000 + seed))
        quantile, error = quantile_with_error(np.hypot(rest[0], rest[1]), 0.99)
        quantiles.append(quantile)
        errors.append(error)
    ratio = float(np.std(quantiles, ddof=1) / np.mean(errors))
    assert 0.6 <= ratio <= 1.6, ratio


# --- Fall table of straight drops ----------------------------------------------------------------

#: Bounds of the fall table against direct solves: 1 mm in landing position, 1e-5 relative in
#: fall time, 1 mm/s in landing velocity (the engine's own error at the zone tolerance is of the
#: same order; both are far inside a zone's standard error of centimetres).
TABLE_POSITION_BOUND = 1e-3
TABLE_TIME_BOUND = 1e-5
TABLE_VELOCITY_BOUND = 1e-3


@pytest.mark.parametrize(
    ("object_id", "height", "wind"),
    [
        ("brick-uk-standard", 18.0, wind_spec(8.0)),
        ("slate-natural-500x250", 25.0, wind_spec(12.0, terrain="en-iii")),
        ("claw-hammer-16oz", 60.0, wind_spec(20.0, profile="power", exponent=0.2)),
        ("roof-tile-clay-plain", 10.0, wind_spec(0.0)),
    ],
)
def test_fall_table_of_drops_matches_direct_solves(object_id: str, height: float, wind) -> None:
    # The table interpolates drops from rest over (log k, U) and turns them to each sample's wind
    # direction; the direct engine solves every sample (the engine is checked against scipy's
    # DOP853 in tests/test_trajectory_accuracy.py).
    obj = _library_object(object_id)
    settings = ZoneSettings(height=height, conditions=Conditions(wind=wind))
    rng = np.random.default_rng(5)
    n = 4000
    speed = wind.speed_10m * rng.uniform(0.0, 1.5, n)
    toward = rng.uniform(0.0, 360.0, n)
    area = rng.uniform(obj.drag_area_min * 0.9, obj.drag_area_max * 1.1, n)
    density = 1.225 * rng.uniform(0.95, 1.05, n)
    mass = np.full(n, obj.mass)
    direct = _land(mass, area, density, speed, toward, np.zeros((3, n)), settings)
    table = _land_by_table(density * area / (2.0 * mass), speed, toward, settings)
    assert table is not None
    assert direct.landed.all()
    tabled, checked = table
    assert np.abs(tabled.position - direct.position).max() < TABLE_POSITION_BOUND
    assert np.abs(tabled.time / direct.time - 1.0).max() < TABLE_TIME_BOUND
    assert np.abs(tabled.velocity - direct.velocity).max() < TABLE_VELOCITY_BOUND
    # The checked samples are direct solves too (in the wind's frame, turned): equal to the
    # engine's own error at the zone tolerance.
    count = checked.time.size
    np.testing.assert_allclose(checked.position, direct.position[:, :count], rtol=1e-5, atol=1e-5)


def test_zone_of_drops_counts_the_fall_table_error_in_its_standard_error() -> None:
    obj = _library_object("brick-uk-standard")
    result = compute_zone(
        [obj], ZoneSettings(height=18.0, conditions=Conditions(wind=wind_spec(8.0)))
    )
    zone = result.driver
    _, sampled = quantile_with_error(np.hypot(*zone.offsets), result.settings.confidence)
    assert zone.standard_error >= sampled
    assert zone.standard_error - sampled < TABLE_POSITION_BOUND + 1e-3


def test_zone_of_a_sheet_beside_drops_mixes_the_plate_model_and_the_fall_table() -> None:
    # A sheet flies by the plate model (solved directly), a brick reads the fall table: both
    # sampling paths feed one zone.
    from dropcalc.analysis.zone import zone_object

    library = load_library(None)
    sheet = zone_object(library.get("plywood-12mm-half-sheet"))
    assert sheet.plate is not None
    brick = zone_object(library.get("brick-uk-standard"))
    result = compute_zone(
        [sheet, brick], ZoneSettings(height=12.0, conditions=Conditions(wind=wind_spec(6.0)))
    )
    for zone in result.objects:
        assert zone.samples >= 1000
        assert math.isfinite(zone.radius)
        assert zone.standard_error > 0


def test_quantile_with_error_counts_carried_away_samples_as_infinitely_far() -> None:
    # 0..98 then one NaN: the 0.99-quantile with the NaN counted as infinity is the 99th
    # smallest value, 98 (rank n p = 99, by counting).
    distances = np.append(np.arange(99.0), np.nan)
    quantile, _ = quantile_with_error(distances, 0.99)
    assert quantile == 98.0


# --- Envelope ---------------------------------------------------------------------------------

ENVELOPE_OBJECTS = (
    "brick-uk-standard",
    "combination-spanner-19mm",
    "scaffold-tube-steel-2m",
    "plywood-18mm-full-sheet",
    "washer-m12",  # a light item: 6.3 g
)
RELEASES = {
    "drop": Release(),
    "push": Release("push", speed=2.0),
    "throw": Release("throw", speed=6.0, angle=30.0),
}
WINDS = {
    "still": wind_spec(0.0),
    "8-mean": wind_spec(8.0),
    "15-gust": wind_spec(15.0, kind="gust"),
}
GROUNDS = ("concrete", "grass")


def _envelope_cases() -> list:
    cases = []
    number = 0
    for object_id in ENVELOPE_OBJECTS:
        for release in RELEASES:
            for wind in WINDS:
                for ground in GROUNDS:
                    # One case in nine runs by default (every object, release, wind and ground
                    # appears); the full grid is marked slow.
                    marks = () if number % 9 == 0 else (pytest.mark.slow,)
                    cases.append(
                        pytest.param(
                            object_id,
                            release,
                            wind,
                            ground,
                            id=f"{object_id}-{release}-{wind}-{ground}",
                            marks=marks,
                        )
                    )
                    number += 1
    return cases


@pytest.mark.parametrize(("object_id", "release", "wind", "ground"), _envelope_cases())
def test_no_monte_carlo_sample_lies_beyond_the_worst_case(
    object_id: str, release: str, wind: str, ground: str
) -> None:
    margin = 2.0
    settings = ZoneSettings(
        height=18.0,
        conditions=Conditions(release=RELEASES[release], wind=WINDS[wind]),
        ground=surface(ground),
        margin=margin,
    )
    zone = compute_zone([_library_object(object_id)], settings).driver
    distance = np.hypot(zone.offsets[0], zone.offsets[1])
    assert zone.carried_away == 0.0
    envelope = zone.worst_case - margin
    violations = int(np.count_nonzero(distance > envelope))
    assert violations == 0, (violations, float(distance.max()), envelope)
    assert zone.max_sampled <= envelope
    assert zone.radius <= zone.worst_case


def test_throw_envelope_reaches_the_greatest_range_when_the_angle_spread_holds_it() -> None:
    # Dense object thrown at exactly 10 m/s (release_speed_low = 1) from 18 m, angle 27.5 +- 15
    # deg, straight out, still air, stopping ground. The greatest range from height H,
    # R = (v / g) sqrt(v^2 + 2 g H) = 21.704 m, is reached at tan(theta) = v / sqrt(v^2 + 2 g H),
    # theta = 25.2 deg, inside 12.5-42.5 deg (Lichtenberg and Wills 1978, from memory).
    speed, height = 10.0, 18.0
    settings = ZoneSettings(
        height=height,
        conditions=Conditions(release=Release("throw", speed=speed, angle=27.5)),
        ground=STOPPING,
        margin=0.0,
        uncertainty=Uncertainty(
            release_speed_low=1.0,
            release_direction_spread=0.0,
            direction_spread=0.0,
            drag_coefficient_spread=0.0,
            density_spread=0.0,
        ),
    )
    greatest = speed / G * math.sqrt(speed**2 + 2.0 * G * height)
    assert envelope_distance(DENSE, settings) >= greatest - 1e-3
    rest, _, _ = sample_object(DENSE, settings, 50_000, np.random.default_rng(1))
    assert np.max(np.hypot(rest[0], rest[1])) <= envelope_distance(DENSE, settings)


def test_envelope_of_a_uniform_push_is_the_top_speed_travel() -> None:
    # Vacuum: the farthest sample is pushed at the top speed V and travels V sqrt(2 H / g).
    top, height = 5.0, 20.0
    envelope = envelope_distance(DENSE, _uniform_push_settings(top, height, 0.99))
    assert envelope == pytest.approx(top * _vacuum_fall_time(height), rel=1e-4)


# --- Scatter after landing ---------------------------------------------------------------------


def test_scatter_is_zero_on_a_ground_that_stops_everything() -> None:
    obj, settings = _spanner_in_wind()
    zone = compute_zone([obj], replace(settings, ground=STOPPING)).driver
    assert zone.drift > 1.0  # the wind and the push carry it well out
    # e_n = 0, mu = 1e9: a corner strike can only pivot the spanner about its corner, so it
    # rests within its own length (0.23 m, the library's size) of where it landed.
    assert zone.scatter == pytest.approx(0.0, abs=0.23)


def test_a_straight_drop_of_a_sphere_on_frictionless_level_ground_stays_below_the_edge() -> None:
    # A ball meets level ground along the line through its centre: the impulse is vertical, no
    # friction acts, so it bounces straight up and down forever (planar impact with no lever
    # arm, Stronge, Impact Mechanics, 2000, ch. 4: the limit case of the checks).
    ball = replace(DENSE, shape="sphere", dimensions=(("diameter", 0.1),))
    frictionless = Surface("ice", "frictionless", (1.0, 1.0), (1e-4, 1e-4), (1e-4, 1e-4), "test")
    zone = compute_zone([ball], ZoneSettings(height=20.0, ground=frictionless, margin=0.0))
    assert zone.radius == pytest.approx(0.0, abs=1e-9)
    assert zone.worst_case == pytest.approx(0.0, abs=ENVELOPE_SEARCH_ALLOWANCE + 1e-9)


def test_no_bounce_and_unlimited_friction_leave_no_slide_for_a_block() -> None:
    # e_n = 0 and mu -> infinity (the STOPPING ground): a block that strikes on a corner pivots
    # about it and falls flat; nothing is left to slide, and it comes to rest within its own
    # size (0.4 m long) of the landing point, below the edge after a straight drop.
    block = replace(
        DENSE, shape="box", dimensions=(("height", 0.2), ("length", 0.4), ("width", 0.1))
    )
    zone = compute_zone([block], ZoneSettings(height=20.0, ground=STOPPING, margin=0.0)).driver
    assert zone.max_sampled <= 0.4
    assert zone.worst_case <= 0.4 + ENVELOPE_SEARCH_ALLOWANCE


def test_a_corner_strike_sends_a_straight_drop_sideways_on_concrete() -> None:
    # The off-centre impulse of a corner strike turns part of the fall into sideways motion
    # and spin (rigid-body impact with friction); a straight drop in still air therefore comes
    # to rest away from the point below the edge, in every direction.
    block = _library_object("claw-hammer-16oz")
    zone = compute_zone([block], ZoneSettings(height=20.0, margin=0.0)).driver
    assert zone.drift == pytest.approx(0.0, abs=1e-6)
    assert 0.5 < zone.radius <= zone.worst_case
    angles = np.arctan2(zone.offsets[0], zone.offsets[1])
    counts, _ = np.histogram(angles, bins=4, range=(-np.pi, np.pi))
    assert counts.min() > 0.15 * counts.sum()


def test_fragile_object_throws_fragments_within_the_longest_throw() -> None:
    # A masonry object dropped 20 m in still air onto the stopping ground breaks (impact speed
    # sqrt(2 g H) = 19.8 m/s > 6.3 m/s); its fragment flies (f v)^2 sin(2 theta) / g and does
    # not slide. The longest throw, f at its top and theta = 45 deg (inside the angle range),
    # is (f_max v)^2 / g = 2 f_max^2 H (projectile range on flat ground, Halliday, Resnick and
    # Walker, ch. 4): the envelope, and no sample beyond it.
    height = 20.0
    settings = ZoneSettings(height=height, ground=STOPPING, margin=0.0)
    brick = replace(DENSE, fragile=True, material="masonry")
    broken = compute_zone([brick], settings).driver
    longest = 2.0 * FRAGMENT_SPEED_FRACTION[1] ** 2 * height
    assert FRAGMENT_ANGLE[0] <= 45.0 <= FRAGMENT_ANGLE[1]
    assert broken.worst_case == pytest.approx(longest, rel=1e-3)
    assert 0.7 * longest < broken.radius <= broken.worst_case
    assert broken.drift == pytest.approx(0.0, abs=1e-6)


def test_a_brick_breaks_rather_than_bouncing_whole() -> None:
    # A brick dropped 20 m breaks (19.8 m/s > 6.3 m/s) and its pieces fly at most a fraction
    # of the impact speed: it comes to rest within half the height on concrete (a third to a
    # half of the height is what sites use, common practice, no source).
    brick = _library_object("brick-uk-standard")
    assert brick.fragile
    assert brick.material == "masonry"
    settings = ZoneSettings(height=20.0, margin=0.0)
    broken = compute_zone([brick], settings).driver
    assert broken.radius < 0.5 * 20.0
    assert broken.radius <= broken.worst_case


# --- Plan ------------------------------------------------------------------------------------

OUTLINE = ((0.0, 0.0), (20.0, 0.0), (20.0, 10.0), (0.0, 10.0))
ORIGIN = (51.5, -0.14)


@pytest.fixture(scope="module")
def plan_zone() -> tuple[Site, ZoneSettings, object]:
    site = Site(
        outline=OUTLINE,
        edges=(
            WorkEdge("north parapet", ((0.0, 10.0), (20.0, 10.0)), 12.0),
            WorkEdge("east and south", ((20.0, 10.0), (20.0, 0.0), (0.0, 0.0)), 9.0),
        ),
    )
    settings = ZoneSettings(height=12.0, conditions=Conditions(wind=wind_spec(8.0)), margin=0.0)
    objects = [_library_object("combination-spanner-19mm"), _library_object("brick-uk-standard")]
    return site, settings, site_zone(objects, settings, site, wind_outward=True)


def test_site_exclusion_polygon_is_valid(plan_zone) -> None:
    _, _, result = plan_zone
    assert result.area.polygon.is_valid
    assert result.area.area_m2 > 0


def test_site_polygon_holds_the_promised_share_of_drops_all_along_each_segment(plan_zone) -> None:
    # For each segment and object, the sampled rest offsets are placed at release points at the
    # segment's ends and middle; the share inside the area (margin 0 here, so no slack) must be
    # at least the confidence. Points on the boundary count (distance <= 1 um, shapely), and so
    # do points inside the building: a rebound that heads back stops against its wall.
    site, settings, result = plan_zone
    polygon = result.area.polygon.union(shapely.Polygon(OUTLINE))
    shapely.prepare(polygon)
    edges = {edge.name: edge for edge in site.edges}
    checked = 0
    for name, index, zone in result.segments:
        start = np.array(edges[name].points[index])
        end = np.array(edges[name].points[index + 1])
        for object_zone in zone.objects:
            offsets = object_zone.offsets
            for fraction in (0.0, 0.5, 1.0):
                release = start + fraction * (end - start)
                x, y = offsets[0] + release[0], offsets[1] + release[1]
                inside = shapely.contains_xy(polygon, x, y)
                outside = ~inside
                near = shapely.distance(polygon, shapely.points(x[outside], y[outside])) <= 1e-6
                share = (np.count_nonzero(inside) + np.count_nonzero(near)) / x.size
                assert share >= settings.confidence, (name, index, object_zone.obj.name, share)
                checked += 1
    assert checked == 3 * 3 * 2  # 3 segments, 3 release points, 2 objects


def test_site_geojson_round_trips_within_a_millimetre(plan_zone) -> None:
    site, _, result = plan_zone
    data = to_geojson(result.area, site, *ORIGIN, {"confidence": 0.99})
    text = json.dumps(data)
    back = from_geojson_local(json.loads(text), *ORIGIN)
    assert back.is_valid
    # Coordinates are rounded to 1e-8 degree: at most 0.56 mm of latitude and 0.35 mm of
    # longitude at 51.5 deg, 0.66 mm together.
    assert shapely.hausdorff_distance(back, result.area.polygon) <= 1e-3
    assert back.area == pytest.approx(result.area.area_m2, rel=1e-4)


def test_site_zone_wind_outward_turns_the_wind_with_each_segment(plan_zone) -> None:
    # Outward normals of an axis-aligned rectangle, by inspection: north side 0 deg, east side
    # 90 deg, south side 180 deg (compass azimuths).
    _, _, result = plan_zone
    azimuths = [round(zone.settings.edge_azimuth, 6) for _, _, zone in result.segments]
    assert azimuths == [0.0, 90.0, 180.0]
    for _, _, zone in result.segments:
        blows_toward = (zone.settings.wind.from_direction_deg + 180.0) % 360.0
        assert blows_toward == pytest.approx(zone.settings.edge_azimuth)


def test_site_segments_alike_but_for_their_azimuth_share_one_zone_turned() -> None:
    # Four sides of a square at one height, the wind straight out from each: every segment's
    # rest positions are the first segment's turned by the difference of the edge azimuths
    # (compass bearings turn clockwise), and the radii are equal.
    square = ((0.0, 0.0), (10.0, 0.0), (10.0, 10.0), (0.0, 10.0), (0.0, 0.0))
    site = Site(outline=square[:-1], edges=(WorkEdge("all round", square, 10.0),))
    settings = ZoneSettings(height=10.0, conditions=Conditions(wind=wind_spec(6.0)), margin=0.0)
    result = site_zone([_library_object("brick-uk-standard")], settings, site, wind_outward=True)
    first = result.segments[0][2]
    for _, _, zone in result.segments[1:]:
        assert zone.radius == first.radius
        turn = math.radians(zone.settings.edge_azimuth - first.settings.edge_azimuth)
        east, north = first.driver.offsets
        np.testing.assert_allclose(
            zone.driver.offsets[0], east * math.cos(turn) + north * math.sin(turn), atol=1e-9
        )
        np.testing.assert_allclose(
            zone.driver.offsets[1], north * math.cos(turn) - east * math.sin(turn), atol=1e-9
        )
    # The first segment faces south (azimuth 180): its rest positions lie to the south.
    assert first.settings.edge_azimuth == pytest.approx(180.0)
    assert np.median(first.driver.offsets[1]) < 0


# --- Inverse questions ------------------------------------------------------------------------


def test_highest_wind_keeps_the_radius_within_the_distance() -> None:
    objects = [_library_object("combination-spanner-19mm")]
    settings = ZoneSettings(height=12.0)
    distance = 25.0  # still air needs about 9 m (a corner strike on concrete sends it sideways)
    wind = highest_wind(objects, settings, distance)
    assert 0.0 < wind < 60.0
    at = compute_zone(objects, settings.with_conditions(wind=wind_spec(wind)))
    above = compute_zone(objects, settings.with_conditions(wind=wind_spec(wind + 1.0)))
    # The bisection judges the radius on the first 20,000 samples; the full zone may sample
    # more and its quantile moves within its standard error.
    slack = 2.0 * at.driver.standard_error
    assert at.radius <= distance + slack, (wind, at.radius, slack)
    assert distance < above.radius, (wind, above.radius)


def test_greatest_height_keeps_the_radius_within_the_distance() -> None:
    objects = [_library_object("combination-spanner-19mm")]
    settings = ZoneSettings(height=12.0, conditions=Conditions(wind=wind_spec(6.0)))
    distance = 15.0
    height = greatest_height(objects, settings, distance)
    assert 0.5 < height < 500.0
    at = compute_zone(objects, replace(settings, height=height))
    above = compute_zone(objects, replace(settings, height=1.05 * height))
    assert at.radius <= distance < above.radius, (height, at.radius, above.radius)


def test_highest_wind_is_zero_when_still_air_already_needs_more() -> None:
    # A push of 5 m/s from 20 m travels up to 5 sqrt(2 x 20 / g) = 10.1 m in vacuum; no wind
    # keeps that within 5 m.
    objects = [DENSE]
    settings = ZoneSettings(
        height=20.0, conditions=Conditions(release=Release("push", speed=5.0)), ground=STOPPING
    )
    assert highest_wind(objects, settings, 5.0) == 0.0


# --- Speed and reproducibility ---------------------------------------------------------------


@pytest.mark.slow
def test_hundred_thousand_samples_all_come_to_rest() -> None:
    # Speed is measured by benchmarks/commands.py (zone workloads), not asserted here.
    obj, settings = _spanner_in_wind()
    rest, drift, landed = sample_object(obj, settings, 100_000, np.random.default_rng(0))
    assert rest.shape == (2, 100_000)
    assert landed.all()
    assert np.all(np.isfinite(drift))
    # No sample lies beyond the deterministic envelope.
    assert np.hypot(*rest).max() <= envelope_distance(obj, settings)


def test_same_seed_gives_the_same_radius() -> None:
    obj, settings = _spanner_in_wind()
    first = compute_zone([obj], replace(settings, seed=7))
    second = compute_zone([obj], replace(settings, seed=7))
    assert first.radius == second.radius
    assert first.worst_case == second.worst_case
    np.testing.assert_array_equal(first.driver.offsets, second.driver.offsets)


def test_different_seeds_give_different_radii_within_the_errors() -> None:
    # Two independent estimates differ by less than 3 sqrt(SE1^2 + SE2^2) (normal theory,
    # 3 sigma of the difference).
    obj, settings = _spanner_in_wind()
    first = compute_zone([obj], replace(settings, seed=7)).driver
    second = compute_zone([obj], replace(settings, seed=8)).driver
    assert first.radius != second.radius
    combined = math.hypot(first.standard_error, second.standard_error)
    assert abs(first.radius - second.radius) <= 3.0 * combined


# --- Result structure ------------------------------------------------------------------------


def test_radius_is_drift_plus_scatter_plus_margin_and_the_widest_object_drives() -> None:
    objects = [_library_object("brick-uk-standard"), _library_object("combination-spanner-19mm")]
    settings = ZoneSettings(height=18.0, conditions=Conditions(wind=wind_spec(8.0)), margin=3.0)
    result = compute_zone(objects, settings)
    for zone in result.objects:
        assert zone.radius == pytest.approx(zone.drift + zone.scatter + 3.0, abs=1e-9)
    assert result.radius == max(zone.radius for zone in result.objects)
    assert result.worst_case == max(zone.worst_case for zone in result.objects)


def test_zone_without_objects_is_refused() -> None:
    with pytest.raises(InputError, match="at least one object"):
        compute_zone([], ZoneSettings(height=10.0))


@pytest.mark.parametrize(
    ("field", "value"), [("height", -5.0), ("confidence", 1.5), ("margin", -1.0)]
)
def test_bad_settings_are_refused_naming_the_field(field: str, value: float) -> None:
    arguments = {"height": 10.0, field: value}
    with pytest.raises(InputError, match=field):
        ZoneSettings(**arguments)


def test_the_radius_does_not_depend_on_computing_the_envelope() -> None:
    # The inverse questions skip the envelope; the Monte Carlo radius must be the same.
    objects = [_library_object("combination-spanner-19mm"), DENSE]
    settings = ZoneSettings(height=10.0, conditions=Conditions(wind=wind_spec(5.0)))
    with_envelope = compute_zone(objects, settings)
    without = compute_zone(objects, settings, envelope=False)
    assert without.radius == with_envelope.radius
    assert math.isnan(without.worst_case)
    assert math.isfinite(with_envelope.worst_case)
