"""Plan geometry (dropcalc.analysis.plan) and the site-plan drawing (dropcalc.present.plan_plot).

Check values come from closed forms (stadium area, Minkowski sum of a square and a segment,
Steiner's formula), from the WGS84 ellipsoid (NIMA TR8350.2) through series written down from
memory, or from shapely's own predicates (covers, is_ccw, hausdorff_distance), which this
project did not write.
"""

from __future__ import annotations

import json
import math
import subprocess
import sys
from pathlib import Path

import numpy as np
import pytest
import shapely
from shapely.geometry import LinearRing, Point, Polygon, box

from dropcalc.analysis.plan import (
    ExclusionArea,
    Site,
    WorkEdge,
    exclusion_area,
    footprint,
    from_geojson_local,
    segment_normals,
    to_geojson,
)
from dropcalc.errors import InputError
from dropcalc.present.plan_plot import nice_length, plot_plan

SQUARE = ((0.0, 0.0), (10.0, 0.0), (10.0, 10.0), (0.0, 10.0))


def disc(radius: float, quad_segs: int = 64) -> Polygon:
    """A disc footprint centred on the release point (shapely buffer, 4·quad_segs sides)."""
    return Point(0.0, 0.0).buffer(radius, quad_segs=quad_segs)


def ring_site() -> tuple[Site, ExclusionArea]:
    """All four sides of a 10 m square worked; disc footprints: the area is a ring with a hole."""
    edge = WorkEdge("roof edge", (*SQUARE, SQUARE[0]), 12.0)
    site = Site(outline=SQUARE, edges=(edge,))
    return site, exclusion_area(site, [(0, s, disc(3.0)) for s in range(4)], margin=1.0)


# --- Normals -----------------------------------------------------------------------------------

# Outward normals of the sides of an axis-aligned square, by inspection: south side faces
# (0, -1), east (1, 0), north (0, 1), west (-1, 0). Common practice, no source.
OUTWARD = [(0.0, -1.0), (1.0, 0.0), (0.0, 1.0), (-1.0, 0.0)]


@pytest.mark.parametrize("reverse", [False, True], ids=["counter-clockwise", "clockwise"])
def test_normals_of_a_square_building_point_outward(reverse: bool) -> None:
    ring = [*SQUARE, SQUARE[0]]
    expected = OUTWARD
    if reverse:  # walk the same sides the other way round: same outward normals, reversed
        ring = ring[::-1]
        expected = OUTWARD[::-1]
    site = Site(outline=SQUARE, edges=(WorkEdge("all round", tuple(ring), 10.0),))
    normals = segment_normals(site, site.edges[0])
    np.testing.assert_allclose(normals, expected, atol=1e-12)


@pytest.mark.parametrize(
    ("points", "expected"),
    [
        (((0.0, 9.5), (10.0, 9.5)), (0.0, 1.0)),  # parapet line set back 0.5 m inside the roof
        (((12.0, 10.0), (12.0, 0.0)), (1.0, 0.0)),  # scaffold lift 2 m off the east wall
        (((12.0, 0.0), (12.0, 10.0)), (1.0, 0.0)),  # the same, drawn the other way
    ],
)
def test_normals_face_away_from_the_building_off_the_outline(points, expected) -> None:
    site = Site(outline=SQUARE, edges=(WorkEdge("edge", points, 10.0),))
    np.testing.assert_allclose(segment_normals(site, site.edges[0]), [expected], atol=1e-12)


def test_normals_without_outline_are_to_the_right_of_travel() -> None:
    # Walking north, "right" is east; walking east, right is south (documented convention).
    edge = WorkEdge("mast platform", ((0.0, 0.0), (0.0, 5.0), (5.0, 5.0)), 30.0)
    site = Site(outline=None, edges=(edge,))
    np.testing.assert_allclose(segment_normals(site, edge), [(1, 0), (0, -1)], atol=1e-12)


# --- Footprint ---------------------------------------------------------------------------------


@pytest.mark.parametrize("confidence", [0.5, 0.9, 0.95, 0.99, 1.0])
def test_footprint_covers_at_least_the_requested_share(confidence: float) -> None:
    rng = np.random.default_rng(7)
    offsets = rng.normal([1.0, 4.0], [1.5, 2.5], size=(1000, 2))
    polygon = footprint(offsets, confidence)
    covered = int(np.count_nonzero(shapely.covers(polygon, shapely.points(offsets))))
    assert covered >= math.ceil(confidence * len(offsets))


def test_footprint_keeps_the_samples_nearest_to_the_release_point() -> None:
    # 9 points at distance 1 and one far outlier: 90 % must leave the outlier out.
    angles = np.linspace(0.0, 2.0 * math.pi, 9, endpoint=False)
    offsets = np.vstack([np.column_stack([np.cos(angles), np.sin(angles)]), [[50.0, 0.0]]])
    polygon = footprint(offsets, 0.9)
    assert not polygon.covers(Point(50.0, 0.0))
    assert polygon.bounds[2] == pytest.approx(1.0)


def test_footprint_of_coincident_samples_is_a_small_polygon() -> None:
    polygon = footprint(np.zeros((20, 2)) + [2.0, 3.0], 0.95)
    assert isinstance(polygon, Polygon)
    assert polygon.covers(Point(2.0, 3.0))
    assert polygon.area < 1e-5  # widened by 1 mm only


# --- Swept area --------------------------------------------------------------------------------


def test_swept_disc_is_a_stadium() -> None:
    # Closed form: a disc of radius r swept along a segment of length L covers 2 r L + π r².
    # The disc is shapely's buffer with quad_segs=64 (a 256-gon inscribed in the circle, area
    # short by (2π/256)²/6 ≈ 1e-4 relative), hence the relative tolerance 1e-3.
    radius, length = 4.0, 25.0
    start = (3.0, -2.0)
    end = (start[0] + length * math.cos(0.6), start[1] + length * math.sin(0.6))
    site = Site(outline=None, edges=(WorkEdge("oblique edge", (start, end), 20.0),))
    area = exclusion_area(site, [(0, 0, disc(radius))], margin=0.0)
    assert area.area_m2 == pytest.approx(2 * radius * length + math.pi * radius**2, rel=1e-3)
    # The stadium's boundary is at distance r from the segment everywhere.
    assert area.max_distance_m == pytest.approx(radius, abs=1e-2)


def test_swept_square_is_the_minkowski_sum() -> None:
    # Closed form: an axis-aligned square of side s swept along (dx, dy) covers
    # s² + s (|dx| + |dy|) (area of a parallelogram plus the square's width across the segment
    # times the segment length). Exact for polygons.
    side, dx, dy = 2.0, 7.0, -3.0
    site = Site(outline=None, edges=(WorkEdge("edge", ((1.0, 1.0), (1.0 + dx, 1.0 + dy)), 9.0),))
    area = exclusion_area(site, [(0, 0, box(-1.0, -1.0, 1.0, 1.0))], margin=0.0)
    assert area.area_m2 == pytest.approx(side**2 + side * (abs(dx) + abs(dy)), rel=1e-12)


def test_margin_adds_perimeter_times_margin_plus_pi_margin_squared() -> None:
    # Steiner formula for a convex plane set K: area(K ⊕ mB) = area(K) + perimeter(K)·m + π m²
    # (Steiner 1840; e.g. Schneider, Convex Bodies: The Brunn-Minkowski Theory, 2014, eq. 4.2.27
    # from memory). The rounded corners are 32-segment quarter circles in dropcalc.analysis.plan
    # (BUFFER_QUAD_SEGMENTS), π m² short by ≈ 4e-4 relative: tolerance 1e-3 · π m².
    margin = 2.5
    site = Site(outline=None, edges=(WorkEdge("edge", ((0.0, 0.0), (12.0, 5.0)), 9.0),))
    footprints = [(0, 0, box(-1.0, 0.5, 3.0, 4.0))]
    bare = exclusion_area(site, footprints, margin=0.0)
    widened = exclusion_area(site, footprints, margin=margin)
    steiner = bare.area_m2 + bare.polygon.length * margin + math.pi * margin**2
    assert widened.area_m2 == pytest.approx(steiner, abs=1e-3 * math.pi * margin**2)
    assert widened.max_distance_m == pytest.approx(bare.max_distance_m + margin, abs=2e-2)


def test_area_never_overlaps_the_building_interior() -> None:
    # Disc footprints centred on the release points reach 3 m into the building: cut out.
    site, area = ring_site()
    outline = site.outline_polygon
    assert area.polygon.intersection(outline).area == pytest.approx(0.0, abs=1e-9)
    # What is left is the ring of width r + m = 4 m around the 10 m square, with rounded
    # corners: (10 + 8)² − 10² − (4 − π)·4² (closed form), to the buffer resolution.
    expected = 18.0**2 - 10.0**2 - (4.0 - math.pi) * 4.0**2
    assert area.area_m2 == pytest.approx(expected, rel=1e-3)
    assert area.polygon.covers(Point(5.0, -3.9))


# --- GeoJSON -----------------------------------------------------------------------------------

ORIGIN = (51.5, -0.1)


def test_geojson_is_structurally_valid() -> None:
    # RFC 7946 §3.1.6 (rings closed, exterior counter-clockwise, holes clockwise), §3.3.
    site, area = ring_site()
    collection = json.loads(json.dumps(to_geojson(area, site, *ORIGIN, {"confidence": 0.95})))
    assert collection["type"] == "FeatureCollection"
    kinds = [feature["properties"]["kind"] for feature in collection["features"]]
    assert kinds == ["exclusion_area", "building_outline", "work_edge"]
    assert all(feature["type"] == "Feature" for feature in collection["features"])
    zone, outline, edge = collection["features"]
    assert zone["properties"]["confidence"] == 0.95
    assert zone["geometry"]["type"] == "Polygon"
    assert outline["geometry"]["type"] == "Polygon"
    assert edge["geometry"]["type"] == "LineString"
    assert edge["properties"]["height_m"] == 12.0
    rings = zone["geometry"]["coordinates"]
    assert len(rings) == 2  # the ring around the building has the building as its hole
    for polygon in (rings, outline["geometry"]["coordinates"]):
        for number, ring in enumerate(polygon):
            assert ring[0] == ring[-1]
            assert len(ring) >= 4
            assert LinearRing(ring).is_ccw is (number == 0)
    for lon, lat in (point for ring in rings for point in ring):
        assert -180.0 <= lon <= 180.0
        assert -90.0 <= lat <= 90.0
        assert round(lon, 8) == lon
        assert round(lat, 8) == lat


def test_geojson_multipolygon_rings_are_oriented() -> None:
    site = Site(
        outline=None,
        edges=(
            WorkEdge("a", ((0.0, 0.0), (10.0, 0.0)), 5.0),
            WorkEdge("b", ((40.0, 0.0), (40.0, -10.0)), 5.0),
        ),
    )
    # Clockwise footprint on purpose: the export must still write counter-clockwise rings.
    clockwise = Polygon([(0, 0), (0, 2), (2, 2), (2, 0)])
    area = exclusion_area(site, [(0, 0, clockwise), (1, 0, clockwise)], margin=0.0)
    geometry = to_geojson(area, site, *ORIGIN, {})["features"][0]["geometry"]
    assert geometry["type"] == "MultiPolygon"
    assert all(LinearRing(part[0]).is_ccw for part in geometry["coordinates"])


def test_geojson_round_trips_within_a_millimetre() -> None:
    site, area = ring_site()
    collection = to_geojson(area, site, *ORIGIN, {})
    back = from_geojson_local(collection, *ORIGIN)
    assert back.hausdorff_distance(area.polygon) < 1e-3
    edge = from_geojson_local(collection, *ORIGIN, kind="work_edge")
    assert edge.hausdorff_distance(site.edges[0].line) < 1e-3


def test_one_degree_of_latitude_at_51_5_north() -> None:
    # 1° of latitude at 51.5° N is 111,257 m ± 5 m (from memory: meridian arc formula). A point
    # 10 km north of the origin gives the metres per degree the export uses.
    north = 10_000.0
    site = Site(outline=None, edges=(WorkEdge("e", ((0.0, 0.0), (0.0, north)), 5.0),))
    area = exclusion_area(site, [(0, 0, box(0.0, 0.0, 1.0, 1.0))], margin=0.0)
    line = to_geojson(area, site, *ORIGIN, {})["features"][1]["geometry"]["coordinates"]
    metres_per_degree = north / (line[1][1] - ORIGIN[0])
    assert metres_per_degree == pytest.approx(111_257.0, abs=5.0)
    # Finer: the WGS84 series 111132.954 − 559.822 cos 2φ + 1.175 cos 4φ m per degree of
    # latitude (from memory, as printed in geodesy tables), to 0.05 m (the series' last digit
    # and the 1e-8° rounding of the export, 0.006 m per degree here).
    phi = math.radians(ORIGIN[0])
    series = 111_132.954 - 559.822 * math.cos(2 * phi) + 1.175 * math.cos(4 * phi)
    assert metres_per_degree == pytest.approx(series, abs=0.05)


def test_one_degree_of_longitude_at_51_5_north() -> None:
    # WGS84 series 111412.84 cos φ − 93.5 cos 3φ + 0.118 cos 5φ m per degree of longitude (from
    # memory, as printed in geodesy tables), to 0.1 m (the series is good to about 0.03 m).
    east = 10_000.0
    site = Site(outline=None, edges=(WorkEdge("e", ((0.0, 0.0), (east, 0.0)), 5.0),))
    area = exclusion_area(site, [(0, 0, box(0.0, 0.0, 1.0, 1.0))], margin=0.0)
    line = to_geojson(area, site, *ORIGIN, {})["features"][1]["geometry"]["coordinates"]
    metres_per_degree = east / (line[1][0] - ORIGIN[1])
    phi = math.radians(ORIGIN[0])
    series = 111_412.84 * math.cos(phi) - 93.5 * math.cos(3 * phi) + 0.118 * math.cos(5 * phi)
    assert metres_per_degree == pytest.approx(series, abs=0.1)


def test_converted_point_against_pyproj_geodesic() -> None:
    # Independent geodesic: pyproj.Geod(ellps="WGS84").inv (Karney's algorithm). Skipped when
    # pyproj is not installed. Over 1 km the tangent plane is off by (d/R)² ≈ 2.5e-8 relative.
    pyproj = pytest.importorskip("pyproj")
    x, y = 600.0, 800.0
    site = Site(outline=None, edges=(WorkEdge("e", ((0.0, 0.0), (x, y)), 5.0),))
    area = exclusion_area(site, [(0, 0, box(0.0, 0.0, 1.0, 1.0))], margin=0.0)
    lon, lat = to_geojson(area, site, *ORIGIN, {})["features"][1]["geometry"]["coordinates"][1]
    azimuth, _, distance = pyproj.Geod(ellps="WGS84").inv(ORIGIN[1], ORIGIN[0], lon, lat)
    assert distance == pytest.approx(1000.0, abs=2e-3)
    assert azimuth == pytest.approx(math.degrees(math.atan2(x, y)), abs=1e-4)


@pytest.mark.parametrize(
    ("origin", "field"),
    [((85.5, 0.0), "origin_lat"), ((0.0, 180.5), "origin_lon"), ((math.nan, 0.0), "origin_lat")],
)
def test_geojson_rejects_a_bad_origin(origin, field) -> None:
    site, area = ring_site()
    with pytest.raises(InputError, match=field):
        to_geojson(area, site, *origin, {})
    with pytest.raises(InputError, match=field):
        from_geojson_local({"type": "Point", "coordinates": [0, 0]}, *origin)


def test_geojson_rejects_reserved_property_keys() -> None:
    site, area = ring_site()
    with pytest.raises(InputError, match="kind"):
        to_geojson(area, site, *ORIGIN, {"kind": "mine"})


# --- Bad inputs --------------------------------------------------------------------------------

GOOD_EDGE = WorkEdge("edge", ((0.0, 10.0), (10.0, 10.0)), 10.0)


@pytest.mark.parametrize(
    ("outline", "message"),
    [
        (((0.0, 0.0), (1.0, 1.0), (0.0, 0.0)), "outline must have at least 3 distinct"),
        (((0, 0), (10, 10), (10, 0), (0, 10)), "outline must be a simple polygon"),  # bow tie
        (((0, 0), (5, 0), (10, 0)), "outline must be a simple polygon"),  # no area
        (((0, 0), (5, math.inf), (10, 0)), "outline"),
        (((0, 0, 1), (5, 0, 1), (10, 0, 1)), "outline"),
    ],
)
def test_bad_outline_raises(outline, message) -> None:
    with pytest.raises(InputError, match=message):
        Site(outline=outline, edges=(GOOD_EDGE,))


@pytest.mark.parametrize(
    ("points", "height", "message"),
    [
        (((0.0, 0.0),), 10.0, "at least 2 points"),
        (((0.0, 0.0), (math.nan, 1.0)), 10.0, "points"),
        (((0.0, 0.0), (0.0, 0.0)), 10.0, "zero length"),
        (((0.0, 0.0), (1.0, 0.0)), 0.0, "height"),
        (((0.0, 0.0), (1.0, 0.0)), -2.0, "height"),
        (((0.0, 0.0), (1.0, 0.0)), math.nan, "height"),
    ],
)
def test_bad_work_edge_raises(points, height, message) -> None:
    with pytest.raises(InputError, match=message):
        WorkEdge("north parapet", points, height)


def test_site_needs_an_edge() -> None:
    with pytest.raises(InputError, match="edges"):
        Site(outline=SQUARE, edges=())


@pytest.mark.parametrize(
    ("offsets", "confidence", "field"),
    [
        (np.zeros((0, 2)), 0.9, "offsets"),
        (np.zeros((5, 3)), 0.9, "offsets"),
        (np.array([[0.0, math.nan]]), 0.9, "offsets"),
        (np.zeros((5, 2)), 0.0, "confidence"),
        (np.zeros((5, 2)), 1.5, "confidence"),
    ],
)
def test_bad_footprint_inputs_raise(offsets, confidence, field) -> None:
    with pytest.raises(InputError, match=field):
        footprint(offsets, confidence)


@pytest.mark.parametrize(
    ("footprints", "margin", "message"),
    [
        ([(0, 0, disc(1.0))], -1.0, "margin"),
        ([(0, 0, disc(1.0))], math.inf, "margin"),
        ([], 1.0, "footprints"),
        ([(1, 0, disc(1.0))], 1.0, "edge index"),
        ([(0, 1, disc(1.0))], 1.0, "segment index"),
        ([(0, 0, Point(0, 0))], 1.0, "Polygon"),
        ([(0, 0, Polygon([(0, 0), (1, 1), (1, 0), (0, 1)]))], 1.0, "valid Polygon"),
    ],
)
def test_bad_exclusion_area_inputs_raise(footprints, margin, message) -> None:
    site = Site(outline=SQUARE, edges=(GOOD_EDGE,))
    with pytest.raises(InputError, match=message):
        exclusion_area(site, footprints, margin)


def test_footprint_inside_the_building_gives_an_error_not_an_empty_area() -> None:
    site = Site(outline=SQUARE, edges=(WorkEdge("short", ((2.0, 10.0), (8.0, 10.0)), 10.0),))
    inside = box(-1.0, -5.0, 1.0, -4.0)  # swept: x 1 to 9 m, y 5 to 6 m, all on the roof
    with pytest.raises(InputError, match="empty"):
        exclusion_area(site, [(0, 0, inside)], margin=0.0)


# --- Drawing -----------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("span", "expected"), [(47.0, 5.0), (12.0, 2.0), (480.0, 50.0), (3.2, 0.5)]
)
def test_scale_bar_length_is_round(span: float, expected: float) -> None:
    # 1-2-5 series at or below a fifth of the span. Common practice, no source.
    assert nice_length(span) == pytest.approx(expected)


@pytest.mark.parametrize("suffix", [".png", ".svg"])
def test_plot_plan_writes_the_file(tmp_path: Path, suffix: str) -> None:
    site, area = ring_site()
    target = tmp_path / f"plan{suffix}"
    plot_plan(area, site, 45.0, target, title="Test site", wind_label="8 m/s at 10 m")
    assert target.stat().st_size > 1000
    head = target.read_bytes()[:200]
    assert head.startswith(b"\x89PNG") if suffix == ".png" else b"<svg" in target.read_bytes()
    assert sorted(p.name for p in tmp_path.iterdir()) == [target.name]  # no temporary left


def test_plot_plan_without_wind_or_outline(tmp_path: Path) -> None:
    site = Site(outline=None, edges=(WorkEdge("mast", ((0.0, 0.0), (3.0, 0.0)), 40.0),))
    area = exclusion_area(site, [(0, 0, disc(8.0, quad_segs=16))], margin=1.0)
    plot_plan(area, site, None, tmp_path / "mast.png")
    assert (tmp_path / "mast.png").stat().st_size > 1000


def test_plot_plan_failure_mid_write_leaves_no_file(tmp_path, monkeypatch) -> None:
    from matplotlib.figure import Figure

    def broken_savefig(self, fname, **kwargs):
        Path(fname).write_bytes(b"\x89PNG half an image")
        raise RuntimeError("disk full (simulated)")

    site, area = ring_site()
    monkeypatch.setattr(Figure, "savefig", broken_savefig)
    new = tmp_path / "new.png"
    with pytest.raises(RuntimeError, match="simulated"):
        plot_plan(area, site, 90.0, new)
    assert list(tmp_path.iterdir()) == []
    old = tmp_path / "old.png"
    old.write_bytes(b"previous plan")
    with pytest.raises(RuntimeError, match="simulated"):
        plot_plan(area, site, 90.0, old)
    assert old.read_bytes() == b"previous plan"
    assert [p.name for p in tmp_path.iterdir()] == ["old.png"]


@pytest.mark.parametrize(
    ("name", "wind", "field"), [("plan.pdf", 0.0, "plan file"), ("plan.png", math.nan, "wind")]
)
def test_plot_plan_bad_inputs_raise(tmp_path: Path, name: str, wind: float, field: str) -> None:
    site, area = ring_site()
    with pytest.raises(InputError, match=field):
        plot_plan(area, site, wind, tmp_path / name)
    assert list(tmp_path.iterdir()) == []


def test_matplotlib_is_imported_only_when_drawing() -> None:
    code = (
        "import sys, dropcalc.analysis.plan, dropcalc.present.plan_plot; "
        "print('matplotlib' in sys.modules)"
    )
    result = subprocess.run(
        [sys.executable, "-c", code], capture_output=True, text=True, check=True
    )
    assert result.stdout.strip() == "False"


# --- L-shaped building: ground outside the structure, and what lies behind it ------------------

#: An L: a 40 x 12 m south wing and a 12 x 18 m west wing on top of its west end. The inner
#: courtyard is x > 12, y > 12; the ground west of the west wing (x < 0, y > 12) is behind the
#: building as seen from the south wing's east end and north face.
L_OUTLINE = ((0.0, 0.0), (40.0, 0.0), (40.0, 12.0), (12.0, 12.0), (12.0, 30.0), (0.0, 30.0))


def l_site() -> tuple[Site, ExclusionArea]:
    edges = (
        WorkEdge("wing east", ((40.0, 0.0), (40.0, 12.0)), 24.0),
        WorkEdge("wing north", ((12.0, 12.0), (40.0, 12.0)), 24.0),
    )
    site = Site(outline=L_OUTLINE, edges=edges)
    # A 35 m disc: wide enough to wrap round the whole building.
    return site, exclusion_area(site, [(0, 0, disc(35.0)), (1, 0, disc(35.0))], margin=2.0)


def test_l_shaped_building_geojson_area_is_ground_outside_the_structure() -> None:
    site, area = l_site()
    data = json.loads(json.dumps(to_geojson(area, site, *ORIGIN, {})))
    zone = from_geojson_local(data, *ORIGIN)
    # Points inside each wing of the footprint are not in the area to keep clear ...
    for inside in ((5.0, 20.0), (30.0, 5.0), (6.0, 6.0)):
        assert not zone.contains(Point(inside)), inside
    # ... nor is any of the footprint's area (to the millimetre rounding of the degrees).
    assert zone.intersection(Polygon(L_OUTLINE)).area < 0.05
    # The courtyard, in direct line of the north face, is in it.
    assert zone.contains(Point(20.0, 20.0))


def test_l_shaped_building_ground_behind_it_is_drawn_apart() -> None:
    site, area = l_site()
    beyond = area.beyond_building
    assert beyond is not None
    assert beyond.area > 0
    # West of the west wing: a straight line from any point of either work edge crosses the
    # building (line of sight in plan, by inspection of the outline).
    assert beyond.contains(Point(-10.0, 20.0))
    # The courtyard and the ground east of the wing are in direct line of a work edge.
    assert not beyond.contains(Point(20.0, 20.0))
    assert not beyond.contains(Point(50.0, 5.0))
    # South of the south wing, west of x = 0: hidden from the east edge's foot at (40, 0)?
    # No: the segment from (40, 0) to (-10, -10) stays below y = 0, so it is in direct line.
    assert not beyond.contains(Point(-10.0, -10.0))
    assert beyond.difference(area.polygon).area < 1e-6  # part of the area, never outside it
    data = to_geojson(area, site, *ORIGIN, {})
    kinds = [f["properties"]["kind"] for f in data["features"]]
    assert "beyond_building" in kinds
    back = from_geojson_local(data, *ORIGIN, kind="beyond_building")
    assert back.contains(Point(-10.0, 20.0))


def test_without_an_outline_nothing_is_beyond_the_building() -> None:
    edge = WorkEdge("edge", ((0.0, 0.0), (10.0, 0.0)), 10.0)
    area = exclusion_area(Site(outline=None, edges=(edge,)), [(0, 0, disc(5.0))], margin=1.0)
    assert area.beyond_building is None
    assert area.beyond_building_m2 == 0.0


def test_plan_drawing_of_an_l_shaped_building(tmp_path: Path) -> None:
    site, area = l_site()
    out = tmp_path / "plan.svg"
    plot_plan(area, site, 90.0, out, title="L", wind_label="10 m/s")
    svg = out.read_text(encoding="utf-8")
    assert "only over or" in svg
    assert "the building (deflection" in svg
    assert "not modelled)" in svg
