"""Plan geometry of the ground exclusion area: footprints, swept areas, GeoJSON.

A site is drawn in local metres (x east, y north) around a chosen origin. Work edges are
polylines along which objects can be released; each has a release height. For each straight
segment of an edge, the Monte Carlo rest positions of the dropped objects (relative to the
release point) give a *footprint*: the convex hull of the share ``confidence`` of the samples
nearest to the release point. Sliding the release point along the segment sweeps the footprint
into an area; the exclusion area is the union of these swept areas, widened by a safety margin,
with the building outline cut out.

This module is geometry, not physics: it uses shapely and does no plotting (the drawing is in
:mod:`dropcalc.present.plan_plot`).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import numpy as np
import shapely
from shapely import affinity
from shapely.geometry import (
    GeometryCollection,
    LineString,
    MultiLineString,
    MultiPolygon,
    Polygon,
    shape,
)
from shapely.geometry.base import BaseGeometry
from shapely.geometry.polygon import orient

from dropcalc.errors import (
    InputError,
    parse_toml,
    read_file,
    require_finite_positive,
    require_range,
)
from dropcalc.model.limits import (
    EDGE_RESOLUTION,
    MAX_EDGES,
    MAX_TEXT_FILE_BYTES,
)
from dropcalc.model.site import Site as Site  # re-exported: the site is checked input
from dropcalc.model.site import WorkEdge as WorkEdge
from dropcalc.physics.constants import WGS84_INVERSE_FLATTENING, WGS84_SEMI_MAJOR_AXIS

#: Offset from a segment's midpoint used to decide which side faces away from the outline [m].
NORMAL_PROBE_OFFSET = 1e-3

#: Half-width given to a footprint whose samples do not span an area (all at one point or on
#: one line), so that a Polygon is still returned [m]. Common practice, no source.
DEGENERATE_FOOTPRINT_WIDTH = 1e-3

#: Segments per quarter circle of shapely's round buffers (the margin) [-]. The polygonal
#: quarter circle lies inside the true one; its area falls short by less than 2e-4 relative.
BUFFER_QUAD_SEGMENTS = 32

#: Longest step between the boundary points at which max_distance_m is evaluated [m]. The
#: distance to the edges is 1-Lipschitz along the boundary, so the sampled maximum is low by at
#: most half a step.
DISTANCE_SAMPLE_STEP = 0.02

#: Decimal places of the GeoJSON degrees: 1e-8 degree is about 1.1 mm of latitude.
GEOJSON_DECIMALS = 8

_RESERVED_PROPERTIES = ("kind", "area_m2", "max_distance_m", "origin_lat", "origin_lon")


# --- Geometry ----------------------------------------------------------------------------------


def _signed_distance(
    outline: Polygon, mid: tuple[float, float], normal: tuple[float, float], sign: float
) -> float:
    """Signed distance (< 0 inside) from the outline boundary to ``mid`` moved along ±normal."""
    probe = shapely.Point(
        mid[0] + sign * NORMAL_PROBE_OFFSET * normal[0],
        mid[1] + sign * NORMAL_PROBE_OFFSET * normal[1],
    )
    distance = float(outline.exterior.distance(probe))
    return -distance if outline.contains(probe) else distance


def segment_normals(site: Site, edge: WorkEdge) -> list[tuple[float, float]]:
    """Outward unit normal of each segment of a work edge.

    For the segment from A to B with unit direction d = (dx, dy), the two candidate normals are
    the right-hand normal n = (dy, -dx) and -n. Each is tested at the segment midpoint moved
    ``NORMAL_PROBE_OFFSET`` (1 mm) along it: the side whose probe point lies outside the outline
    is kept. When both or neither probe lies inside (an edge set back from the outline, or an
    edge standing off the building), the side with the larger signed distance to the outline
    boundary (positive outside, negative inside) is kept, i.e. the side facing away from the
    building. With no outline, or when the two sides tie, the right-hand normal is returned:
    walking along the edge from its first point to its last, objects fall to the right.

    Parameters
    ----------
    site : Site
        The site; its outline decides which side is outward.
    edge : WorkEdge
        The work edge (need not be one of ``site.edges``).

    Returns
    -------
    list of (float, float)
        One unit vector (east, north) per segment, in segment order. [-]
    """
    outline = site.outline_polygon
    normals: list[tuple[float, float]] = []
    for (ax, ay), (bx, by) in zip(edge.points[:-1], edge.points[1:], strict=True):
        length = math.hypot(bx - ax, by - ay)
        right = ((by - ay) / length, -(bx - ax) / length)
        if outline is None:
            normals.append(right)
            continue
        mid = ((ax + bx) / 2.0, (ay + by) / 2.0)
        right_side = _signed_distance(outline, mid, right, 1.0)
        left_side = _signed_distance(outline, mid, right, -1.0)
        flip = left_side > right_side
        normals.append((-right[0], -right[1]) if flip else right)
    return [(x + 0.0, y + 0.0) for x, y in normals]  # + 0.0 turns -0.0 into 0.0


def footprint(offsets: np.ndarray, confidence: float) -> Polygon:
    """Convex hull of the share ``confidence`` of rest positions nearest to the release point.

    k = ceil(confidence · N) samples with the smallest distance |offset| are kept (ties broken
    by sample order) and their convex hull is returned, so the polygon covers (contains or has
    on its boundary) at least k of the N samples. ``confidence · N`` is rounded to 9 decimals
    before the ceiling so that, e.g., 0.07 · 100 = 7.000000000000001 keeps 7 samples, not 8.

    Parameters
    ----------
    offsets : numpy.ndarray, shape (N, 2)
        Rest positions relative to the release point, east and north. [m]
    confidence : float
        Share of the samples to enclose, 0 < confidence <= 1. [-]

    Returns
    -------
    shapely.geometry.Polygon
        The footprint, relative to the release point. [m]
        If the kept samples do not span an area (one point, or all on one line), their hull is
        widened by ``DEGENERATE_FOOTPRINT_WIDTH`` (1 mm) so that a Polygon is still returned.

    Raises
    ------
    InputError
        If ``offsets`` is not an (N, 2) array of finite values with N >= 1, or ``confidence``
        is not in (0, 1].
    """
    array = np.asarray(offsets, dtype=float)
    if array.ndim != 2 or array.shape[1] != 2 or array.shape[0] < 1:
        raise InputError(f"offsets must be an array of shape (N, 2) with N >= 1; got {array.shape}")
    if not np.all(np.isfinite(array)):
        raise InputError("offsets must be finite (no NaN or infinity) in m")
    confidence = float(confidence)
    if not (0.0 < confidence <= 1.0):
        raise InputError(f"confidence must be > 0 and <= 1; got {confidence:g}", field="confidence")
    count = array.shape[0]
    keep = min(count, math.ceil(round(confidence * count, 9)))
    order = np.argsort(np.hypot(array[:, 0], array[:, 1]), kind="stable")
    hull = shapely.MultiPoint(array[order[:keep]]).convex_hull
    if not isinstance(hull, Polygon) or hull.area <= 0.0:
        hull = hull.buffer(DEGENERATE_FOOTPRINT_WIDTH, quad_segs=4)
    return hull


@dataclass(frozen=True)
class ExclusionArea:
    """The ground exclusion area of a site.

    Attributes
    ----------
    polygon : shapely.geometry.Polygon or shapely.geometry.MultiPolygon
        The area to keep clear, local metres, building interior removed. [m]
    area_m2 : float
        Its area. [m^2]
    max_distance_m : float
        Largest distance from the area's boundary to the nearest work edge: over all boundary
        points, the distance to the nearest edge polyline, maximised (the directed Hausdorff
        distance from the boundary to the edges). It is how far out the barrier line reaches.
        Evaluated on boundary points at most ``DISTANCE_SAMPLE_STEP`` apart: low by at most
        1 cm. [m]
    beyond_building : Polygon, MultiPolygon or None
        The part of ``polygon`` that no straight line from a work edge reaches without
        crossing the building outline: ground reached only over or around the building (an
        inner courtyard, the far side of a wing). It stays in the area to keep clear, but the
        model does not follow objects around or off the structure (deflection off the
        structure is not modelled), so it is drawn and reported apart. None without an
        outline; empty when every part is in direct line. [m]
    """

    polygon: Polygon | MultiPolygon
    area_m2: float
    max_distance_m: float
    beyond_building: Polygon | MultiPolygon | None = None

    @property
    def beyond_building_m2(self) -> float:
        """Area of :attr:`beyond_building`, 0 without a building outline [m^2]."""
        return 0.0 if self.beyond_building is None else float(self.beyond_building.area)


def _polygonal(geometry: BaseGeometry) -> Polygon | MultiPolygon:
    """Keep the polygonal parts of a geometry (overlay results can carry stray lines)."""
    if isinstance(geometry, Polygon | MultiPolygon):
        return geometry
    parts = [
        part
        for part in getattr(geometry, "geoms", [])
        if isinstance(part, Polygon | MultiPolygon) and not part.is_empty
    ]
    merged = shapely.unary_union(parts) if parts else Polygon()
    return merged if isinstance(merged, Polygon | MultiPolygon) else Polygon()


def _max_distance_to_edges(polygon: Polygon | MultiPolygon, site: Site) -> float:
    """Directed Hausdorff distance from the polygon's boundary to the work edges [m]."""
    edges = MultiLineString([edge.points for edge in site.edges])
    boundary = polygon.boundary
    step = max(DISTANCE_SAMPLE_STEP, boundary.length / 200_000.0)
    dense = shapely.segmentize(boundary, step)
    points = shapely.points(shapely.get_coordinates(dense))
    return float(np.max(shapely.distance(points, edges)))


#: Most release points sampled along the work edges to find the ground hidden behind the
#: building (:func:`beyond_building`); with fewer metres of edge, one a metre. [-]
SHADOW_SAMPLES = 80

#: Release points are moved this far out from the outline before casting shadows, so that a
#: work edge lying on the outline does not graze it. [m]
SHADOW_PROBE_OFFSET = 0.05


def _shadow(point: tuple[float, float], outline: Polygon, reach: float) -> BaseGeometry:
    """Ground hidden from ``point`` behind the outline [m].

    The points P whose segment from ``point`` crosses the outline's boundary: the union, over
    the outline's sides, of the side and its projection away from ``point`` out to ``reach``.
    """
    qx, qy = point
    quads = []
    coords = list(outline.exterior.coords)
    for (ax, ay), (bx, by) in zip(coords[:-1], coords[1:], strict=True):
        far = []
        for x, y in ((bx, by), (ax, ay)):
            dx, dy = x - qx, y - qy
            norm = math.hypot(dx, dy)
            if norm < 1e-9:
                break
            far.append((x + dx / norm * reach, y + dy / norm * reach))
        if len(far) < 2:
            continue
        quad = Polygon([(ax, ay), (bx, by), far[0], far[1]])
        if not quad.is_valid:
            quad = quad.buffer(0)
        if quad.area > 0:
            quads.append(quad)
    return shapely.unary_union(quads) if quads else Polygon()


def beyond_building(site: Site, polygon: Polygon | MultiPolygon) -> Polygon | MultiPolygon | None:
    """The part of ``polygon`` reached from the work edges only over or around the building.

    A ground point is in direct line when a straight segment from some release point on a work
    edge reaches it without crossing the building outline. The release points are sampled
    along the edges (at most :data:`SHADOW_SAMPLES`, about one a metre, ends included), each
    moved :data:`SHADOW_PROBE_OFFSET` outward; the hidden ground is the intersection of their
    shadows (:func:`_shadow`), and the result is its overlap with ``polygon``. Geometry only
    (line of sight in plan), derived.

    Returns
    -------
    Polygon, MultiPolygon or None
        None when the site has no outline. [m]
    """
    outline = site.outline_polygon
    if outline is None or polygon.is_empty:
        return None
    # Shadows are cast by the outline merged to the edge resolution: a circle drawn with 10,000
    # points otherwise makes 10,000 quadrilaterals per release point (36 s for one ring).
    # The hatched ground moves by at most EDGE_RESOLUTION at the outline.
    merged = outline.simplify(EDGE_RESOLUTION, preserve_topology=True)
    if isinstance(merged, Polygon) and not merged.is_empty:
        outline = merged
    x0, y0, x1, y1 = shapely.unary_union([polygon, outline]).bounds
    reach = 4.0 * math.hypot(x1 - x0, y1 - y0) + 1.0
    total = sum(edge.line.length for edge in site.edges)
    count = int(min(SHADOW_SAMPLES, max(2 * len(site.edges), math.ceil(total))))
    hidden: BaseGeometry | None = None
    for edge in site.edges:
        normals = segment_normals(site, edge)
        share = max(2, round(count * edge.line.length / max(total, 1e-9)))
        for index, normal in enumerate(normals):
            a = np.asarray(edge.points[index], dtype=float)
            b = np.asarray(edge.points[index + 1], dtype=float)
            for s in np.linspace(0.0, 1.0, max(2, share // len(normals) + 1)):
                q = a + s * (b - a) + SHADOW_PROBE_OFFSET * np.asarray(normal)
                if outline.contains(shapely.points(q)):
                    continue
                shadow = _shadow((float(q[0]), float(q[1])), outline, reach)
                hidden = shadow if hidden is None else hidden.intersection(shadow)
                if hidden.is_empty:
                    return Polygon()
    if hidden is None:
        return Polygon()
    return _polygonal(polygon.intersection(hidden))


def exclusion_area(
    site: Site,
    footprints: Sequence[tuple[int, int, Polygon]],
    margin: float,
) -> ExclusionArea:
    """Union of the footprints swept along their segments, widened by a margin.

    For a segment from A to B and a footprint F (relative to the release point), the swept area
    is the Minkowski sum F ⊕ [A, B]; for a convex F it equals

        conv((F + A) ∪ (F + B)),

    which is what is computed (for a non-convex F it is the sum of F's convex hull with the
    segment, a superset). The union over all given footprints is buffered by ``margin`` (round
    joins, ``BUFFER_QUAD_SEGMENTS`` segments per quarter circle) and the interior of the
    building outline is removed. The margin is widened by the largest ``WorkEdge.merged_by``
    (a many-point edge merged to ``EDGE_RESOLUTION``), so merging never shrinks the area.

    Parameters
    ----------
    site : Site
        Outline and work edges.
    footprints : sequence of (int, int, shapely.geometry.Polygon)
        (edge index into ``site.edges``, segment index along that edge, footprint relative to a
        release point on that segment). A segment may carry several footprints (several
        objects); every footprint given is used. [m]
    margin : float
        Safety margin added all round, >= 0. [m]

    Returns
    -------
    ExclusionArea
        The area, its size and its largest distance from the work edges.

    Raises
    ------
    InputError
        If an index is out of range, a footprint is not a non-empty valid Polygon, the margin is
        negative or not finite, no footprint is given, or nothing is left outside the outline.
    """
    margin = require_finite_positive("margin", margin, "m", allow_zero=True)
    if len(footprints) == 0:
        raise InputError("footprints must hold at least one (edge, segment, polygon); got none")
    swept: list[BaseGeometry] = []
    for number, item in enumerate(footprints):
        try:
            edge_index, segment_index, polygon = item
        except (TypeError, ValueError):
            raise InputError(
                f"footprints[{number}] must be (edge index, segment index, polygon)"
            ) from None
        if not (isinstance(edge_index, int | np.integer) and 0 <= edge_index < len(site.edges)):
            raise InputError(
                f"footprints[{number}] edge index must be 0 to {len(site.edges) - 1}; "
                f"got {edge_index}"
            )
        edge = site.edges[int(edge_index)]
        segments = len(edge.points) - 1
        if not (isinstance(segment_index, int | np.integer) and 0 <= segment_index < segments):
            raise InputError(
                f"footprints[{number}] segment index must be 0 to {segments - 1} on work edge "
                f"{edge.name!r}; got {segment_index}"
            )
        if not isinstance(polygon, Polygon) or polygon.is_empty or not polygon.is_valid:
            raise InputError(f"footprints[{number}] footprint must be a non-empty valid Polygon")
        start = edge.points[int(segment_index)]
        end = edge.points[int(segment_index) + 1]
        at_start = affinity.translate(polygon, start[0], start[1])
        at_end = affinity.translate(polygon, end[0], end[1])
        swept.append(shapely.union(at_start, at_end).convex_hull)
    union = shapely.unary_union(swept)
    margin += max(edge.merged_by for edge in site.edges)
    if margin > 0.0:
        union = union.buffer(margin, quad_segs=BUFFER_QUAD_SEGMENTS)
    outline = site.outline_polygon
    if outline is not None:
        union = union.difference(outline)
    area = _polygonal(union)
    if area.is_empty or area.area <= 0.0:
        raise InputError(
            "the exclusion area is empty: every footprint lies inside the building outline"
        )
    return ExclusionArea(
        polygon=area,
        area_m2=float(area.area),
        max_distance_m=_max_distance_to_edges(area, site),
        beyond_building=beyond_building(site, area),
    )


# --- GeoJSON -----------------------------------------------------------------------------------


def _radii_of_curvature(origin_lat: float) -> tuple[float, float]:
    """Meridian and prime-vertical radii of curvature M, N of WGS84 at a latitude [m].

    M = a (1 - e²) / (1 - e² sin²φ)^1.5, N = a / sqrt(1 - e² sin²φ), e² = f (2 - f).
    NIMA TR8350.2, 3rd ed. (2000), ch. 3 and 4.
    """
    flattening = 1.0 / WGS84_INVERSE_FLATTENING
    eccentricity_squared = flattening * (2.0 - flattening)
    sin_squared = math.sin(math.radians(origin_lat)) ** 2
    denominator = 1.0 - eccentricity_squared * sin_squared
    meridian = WGS84_SEMI_MAJOR_AXIS * (1.0 - eccentricity_squared) / denominator**1.5
    prime_vertical = WGS84_SEMI_MAJOR_AXIS / math.sqrt(denominator)
    return meridian, prime_vertical


def _check_origin(origin_lat: float, origin_lon: float) -> tuple[float, float]:
    latitude = require_range("origin_lat", origin_lat, -85.0, 85.0, "degrees")
    longitude = require_range("origin_lon", origin_lon, -180.0, 180.0, "degrees")
    return latitude, longitude


def _local_to_lonlat(xy: np.ndarray, origin_lat: float, origin_lon: float) -> np.ndarray:
    """Local tangent-plane metres (east, north) to WGS84 (lon, lat) degrees, rounded."""
    meridian, prime_vertical = _radii_of_curvature(origin_lat)
    xy = np.asarray(xy, dtype=float)
    latitude = origin_lat + np.degrees(xy[:, 1] / meridian)
    longitude = origin_lon + np.degrees(
        xy[:, 0] / (prime_vertical * math.cos(math.radians(origin_lat)))
    )
    if np.any(np.abs(longitude) > 180.0):
        raise InputError(
            "the plan crosses the 180th meridian, which this GeoJSON export does not split; "
            f"got origin_lon {origin_lon:g} degrees"
        )
    return np.round(np.column_stack([longitude, latitude]), GEOJSON_DECIMALS)


def _lonlat_to_local(lonlat: np.ndarray, origin_lat: float, origin_lon: float) -> np.ndarray:
    """WGS84 (lon, lat) degrees to local tangent-plane metres (east, north)."""
    meridian, prime_vertical = _radii_of_curvature(origin_lat)
    lonlat = np.asarray(lonlat, dtype=float)
    east = (
        np.radians(lonlat[:, 0] - origin_lon) * prime_vertical * math.cos(math.radians(origin_lat))
    )
    north = np.radians(lonlat[:, 1] - origin_lat) * meridian
    return np.column_stack([east, north])


def _ring(coordinates: Sequence[Sequence[float]], origin: tuple[float, float]) -> list[list[float]]:
    """A closed GeoJSON ring (first == last, no repeated neighbours after rounding)."""
    converted = _local_to_lonlat(np.asarray(coordinates, dtype=float), *origin).tolist()
    ring = [converted[0]]
    for point in converted[1:]:
        if point != ring[-1]:
            ring.append(point)
    if ring[0] != ring[-1]:
        ring.append(ring[0])
    return ring


def _polygon_rings(polygon: Polygon, origin: tuple[float, float]) -> list[list[list[float]]]:
    oriented = orient(polygon, sign=1.0)  # exterior counter-clockwise, holes clockwise
    rings = [_ring(oriented.exterior.coords, origin)]
    rings.extend(_ring(hole.coords, origin) for hole in oriented.interiors)
    return rings


def _geometry(geometry: BaseGeometry, origin: tuple[float, float]) -> dict[str, Any]:
    if isinstance(geometry, Polygon):
        return {"type": "Polygon", "coordinates": _polygon_rings(geometry, origin)}
    if isinstance(geometry, MultiPolygon):
        return {
            "type": "MultiPolygon",
            "coordinates": [_polygon_rings(part, origin) for part in geometry.geoms],
        }
    if isinstance(geometry, LineString):
        return {
            "type": "LineString",
            "coordinates": _local_to_lonlat(np.asarray(geometry.coords), *origin).tolist(),
        }
    raise TypeError(f"no GeoJSON export for {geometry.geom_type}")  # pragma: no cover


def to_geojson(
    area: ExclusionArea,
    site: Site,
    origin_lat: float,
    origin_lon: float,
    properties: dict[str, Any],
) -> dict[str, Any]:
    """The exclusion area, outline and work edges as an RFC 7946 FeatureCollection.

    Local metres are turned into WGS84 longitude and latitude with the local tangent-plane
    approximation at the origin latitude φ0:

        Δlat = y / M,   Δlon = x / (N cos φ0)   [rad]
        M = a (1 - e²) / (1 - e² sin²φ0)^1.5,   N = a / sqrt(1 - e² sin²φ0)

    with a = 6378137 m, 1/f = 298.257223563, e² = f (2 - f). Coordinates are rounded to 1e-8
    degree (about 1 mm). The horizontal error of the flat-plane approximation grows as
    (distance / Earth radius)²: well under 1 mm within 1 km of the origin.

    Features, each with a ``kind`` property:

    - ``"exclusion_area"``: Polygon or MultiPolygon (exterior rings counter-clockwise, holes
      clockwise, RFC 7946 §3.1.6), with ``area_m2``, ``max_distance_m``, ``origin_lat``,
      ``origin_lon`` and the caller's ``properties``;
    - ``"building_outline"``: Polygon, when the site has an outline;
    - ``"beyond_building"``: Polygon or MultiPolygon, the part of the exclusion area reached
      only over or around the building (:func:`beyond_building`), when there is one;
    - ``"work_edge"``: LineString per work edge, with ``name`` and ``height_m``.

    Parameters
    ----------
    area : ExclusionArea
        The exclusion area in local metres.
    site : Site
        Outline and work edges in local metres.
    origin_lat : float
        Latitude of the local origin, -85 to 85. [degrees]
    origin_lon : float
        Longitude of the local origin, -180 to 180. [degrees]
    properties : dict
        JSON-serialisable values added to the exclusion-area feature's properties (e.g. the
        confidence, the wind); must not use the keys this function sets.

    Returns
    -------
    dict
        The FeatureCollection, ready for ``json.dumps``.

    Raises
    ------
    InputError
        If the origin is out of range, a property key is reserved, or the plan crosses the
        180th meridian.

    References
    ----------
    National Imagery and Mapping Agency, "Department of Defense World Geodetic System 1984:
    Its Definition and Relationships with Local Geodetic Systems", NIMA TR8350.2, 3rd ed.,
    2000, Table 3.1 (a, 1/f) and ch. 4 (radii of curvature).

    H. Butler et al., "The GeoJSON Format", RFC 7946, IETF, 2016.
    """
    origin = _check_origin(origin_lat, origin_lon)
    clashes = sorted(set(properties) & set(_RESERVED_PROPERTIES))
    if clashes:
        raise InputError(
            f"properties must not use the reserved keys {', '.join(_RESERVED_PROPERTIES)}; "
            f"got {', '.join(clashes)}"
        )
    features: list[dict[str, Any]] = [
        {
            "type": "Feature",
            "geometry": _geometry(area.polygon, origin),
            "properties": {
                "kind": "exclusion_area",
                "area_m2": round(area.area_m2, 2),
                "max_distance_m": round(area.max_distance_m, 3),
                "origin_lat": origin[0],
                "origin_lon": origin[1],
                **properties,
            },
        }
    ]
    outline = site.outline_polygon
    if outline is not None:
        features.append(
            {
                "type": "Feature",
                "geometry": _geometry(outline, origin),
                "properties": {"kind": "building_outline"},
            }
        )
    beyond = area.beyond_building
    if beyond is not None and not beyond.is_empty and beyond.area > 0:
        features.append(
            {
                "type": "Feature",
                "geometry": _geometry(beyond, origin),
                "properties": {
                    "kind": "beyond_building",
                    "area_m2": round(float(beyond.area), 2),
                    "note": "part of the exclusion area reached from the work edges only over "
                    "or around the building; deflection off the structure is not modelled",
                },
            }
        )
    features.extend(
        {
            "type": "Feature",
            "geometry": _geometry(edge.line, origin),
            "properties": {"kind": "work_edge", "name": edge.name, "height_m": edge.height},
        }
        for edge in site.edges
    )
    return {"type": "FeatureCollection", "features": features}


def from_geojson_local(
    geojson: dict[str, Any],
    origin_lat: float,
    origin_lon: float,
    kind: str | None = "exclusion_area",
) -> BaseGeometry:
    """Read GeoJSON lon/lat back into local metres (the inverse of :func:`to_geojson`).

    Parameters
    ----------
    geojson : dict
        A FeatureCollection, a Feature or a bare geometry.
    origin_lat : float
        Latitude of the local origin, -85 to 85. [degrees]
    origin_lon : float
        Longitude of the local origin, -180 to 180. [degrees]
    kind : str or None
        For a FeatureCollection: the ``kind`` of the features to read (default the exclusion
        area); ``None`` reads all of them.

    Returns
    -------
    shapely geometry
        The one matching geometry, or a GeometryCollection when several match, in local
        metres (east, north). [m]

    Raises
    ------
    InputError
        If the origin is out of range, the object is not GeoJSON, or no feature matches.
    """
    origin = _check_origin(origin_lat, origin_lon)
    kind_of = geojson.get("type") if isinstance(geojson, dict) else None
    if kind_of == "FeatureCollection":
        geometries = [
            feature["geometry"]
            for feature in geojson.get("features", [])
            if kind is None or feature.get("properties", {}).get("kind") == kind
        ]
    elif kind_of == "Feature":
        geometries = [geojson["geometry"]]
    elif kind_of in ("Point", "LineString", "Polygon", "MultiPolygon", "MultiLineString"):
        geometries = [geojson]
    else:
        raise InputError(f"geojson must be a FeatureCollection, Feature or geometry; got {kind_of}")
    if not geometries:
        raise InputError(f"geojson has no feature of kind {kind!r}")
    local = [
        shapely.transform(shape(geometry), lambda lonlat: _lonlat_to_local(lonlat, *origin))
        for geometry in geometries
    ]
    return local[0] if len(local) == 1 else GeometryCollection(local)


@dataclass(frozen=True)
class SitePlan:
    """A site read from a file: the geometry and, if given, its WGS84 origin."""

    site: Site
    origin_lat: float | None = None
    origin_lon: float | None = None


def load_site(path: Path) -> SitePlan:
    """Read a site file (TOML) with the building outline, work edges and optional origin.

    Format (local metres, x east, y north; heights accept units)::

        origin = { lat = 51.5012, lon = -0.1419 }      # optional, for GeoJSON
        outline = [[0, 0], [30, 0], [30, 20], [0, 20]]  # optional building or roof outline
        [[edge]]
        name = "north parapet"
        points = [[0, 20], [30, 20]]
        height = "18 m"

    Raises
    ------
    InputError
        Naming the file and the key for any mistake.
    """
    from dropcalc.units import parse_quantity

    path = Path(path)
    raw = read_file(path, "site file", MAX_TEXT_FILE_BYTES)
    data, _ = parse_toml(raw, str(path), "site file")
    unknown = set(data) - {"origin", "outline", "edge"}
    if unknown:
        raise InputError(
            f"{path}: unknown key {sorted(unknown)[0]!r}; allowed: origin, outline, edge"
        )
    raw_edges = data.get("edge")
    if not isinstance(raw_edges, list) or not raw_edges:
        raise InputError(f"{path}: expected one or more [[edge]] tables (the work edges)")
    if len(raw_edges) > MAX_EDGES:
        raise InputError(f"{path}: {len(raw_edges):,} edges; at most {MAX_EDGES} (docs/limits.md)")
    edges = []
    for number, raw in enumerate(raw_edges, start=1):
        where = f"{path}: edge[{number}]"
        if not isinstance(raw, dict):
            raise InputError(f"{where}: expected a table with name, points and height")
        extra = set(raw) - {"name", "points", "height"}
        if extra:
            raise InputError(f"{where}: unknown key {sorted(extra)[0]!r}")
        if "height" not in raw or "points" not in raw:
            raise InputError(f"{where}: needs points and height")
        height = parse_quantity(raw["height"], "length", f"{where}.height")
        try:
            edges.append(
                WorkEdge(str(raw.get("name", f"edge {number}")), tuple(raw["points"]), height)
            )
        except (TypeError, ValueError) as exc:
            raise InputError(f"{where}: {exc}") from None
    outline = data.get("outline")
    site = Site(tuple(map(tuple, outline)) if outline is not None else None, tuple(edges))
    origin = data.get("origin")
    if origin is None:
        return SitePlan(site)
    if not isinstance(origin, dict) or set(origin) != {"lat", "lon"}:
        raise InputError(f"{path}: origin must be {{ lat = ..., lon = ... }} in degrees")
    lat, lon = _check_origin(float(origin["lat"]), float(origin["lon"]))
    return SitePlan(site, lat, lon)
