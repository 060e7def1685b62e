"""The site plan as checked input: the building outline and the work edges, in local metres.

x points east and y north from the plan's origin. The geometry built on it (segment normals,
footprints, the exclusion area, GeoJSON) is in :mod:`dropcalc.analysis.plan`.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, field

import numpy as np
import shapely
from shapely.geometry import LineString, Polygon

from dropcalc.errors import InputError, require_finite_positive
from dropcalc.model.limits import (
    EDGE_RESOLUTION,
    MAX_COORDINATE,
    MAX_EDGE_POINTS,
    MAX_NAME_CHARACTERS,
)


def _points(
    field: str, points: Sequence[Sequence[float]], key: str
) -> tuple[tuple[float, float], ...]:
    """Return ``points`` as a tuple of finite (x, y) float pairs within the site, or raise."""
    count = len(points) if isinstance(points, Sequence) else 0
    if count > MAX_EDGE_POINTS:
        raise InputError(
            f"{field}: {count:,} points; at most {MAX_EDGE_POINTS:,} (docs/limits.md)", field=key
        )
    try:
        array = np.asarray(points, dtype=float)
    except (TypeError, ValueError):
        raise InputError(
            f"{field} must be a sequence of (x, y) pairs in metres", field=key
        ) from None
    if array.ndim != 2 or array.shape[1] != 2:
        raise InputError(
            f"{field} must be a sequence of (x, y) pairs in metres; got shape {array.shape}",
            field=key,
        )
    if not np.all(np.isfinite(array)):
        bad = int(np.flatnonzero(~np.all(np.isfinite(array), axis=1))[0])
        raise InputError(
            f"{field}[{bad}] must be finite coordinates in m; got {points[bad]}", field=key
        )
    if array.size and np.max(np.abs(array)) > MAX_COORDINATE:
        bad = int(np.flatnonzero(np.any(np.abs(array) > MAX_COORDINATE, axis=1))[0])
        raise InputError(
            f"{field}[{bad}]: coordinates within ±{MAX_COORDINATE:,.0f} m of the origin "
            f"(a site fits in a few km); got ({array[bad, 0]:.6g}, {array[bad, 1]:.6g})",
            field=key,
        )
    return tuple((float(x), float(y)) for x, y in array)


@dataclass(frozen=True)
class WorkEdge:
    """A polyline along which objects can be released, with its release height.

    Attributes
    ----------
    name : str
        Label shown on the plan and in the GeoJSON.
    points : tuple of (float, float)
        Vertices of the polyline, at least two, x east and y north, local metres. [m]
    height : float
        Release height above the ground along this edge. [m]
    """

    name: str
    points: tuple[tuple[float, float], ...]
    height: float
    #: Largest distance between the edge as given and its merged points [m]: a many-point edge
    #: (a circle exported from a drawing) is merged to ``EDGE_RESOLUTION``, and the exclusion
    #: area is widened by this distance so merging never shrinks it.
    merged_by: float = field(default=0.0, init=False, compare=False)

    def __post_init__(self) -> None:
        if len(str(self.name)) > MAX_NAME_CHARACTERS:
            raise InputError(
                f"work edge name: {len(str(self.name)):,} characters; at most "
                f"{MAX_NAME_CHARACTERS} (docs/limits.md)",
                field="name",
            )
        field = f"work edge {self.name!r}"
        points = _points(f"{field} points", self.points, "points")
        if len(points) < 2:
            raise InputError(
                f"{field} points must hold at least 2 points; got {len(points)}", field="points"
            )
        for index, (start, end) in enumerate(zip(points[:-1], points[1:], strict=True)):
            if start == end:
                raise InputError(
                    f"{field} segment {index} has zero length (point {start} repeated); "
                    "consecutive points must differ",
                    field="points",
                )
        height = require_finite_positive(f"{field} height", self.height, "m")
        if len(points) > 2:
            given = LineString(points)
            merged = given.simplify(EDGE_RESOLUTION, preserve_topology=False)
            if len(merged.coords) < len(points) and len(merged.coords) >= 2:
                object.__setattr__(self, "merged_by", float(given.hausdorff_distance(merged)))
                points = tuple((float(x), float(y)) for x, y in merged.coords)
        object.__setattr__(self, "points", points)
        object.__setattr__(self, "height", height)

    @property
    def line(self) -> LineString:
        """The edge as a shapely LineString in local metres."""
        return LineString(self.points)


@dataclass(frozen=True)
class Site:
    """A building outline (optional) and the work edges on it, in local metres.

    Attributes
    ----------
    outline : tuple of (float, float) or None
        Building or roof outline: a simple polygon of at least 3 distinct points (closing the
        ring by repeating the first point is optional). ``None`` when there is no building to
        cut out (a mast, a free-standing scaffold). [m]
    edges : tuple of WorkEdge
        The work edges, at least one.
    """

    outline: tuple[tuple[float, float], ...] | None
    edges: tuple[WorkEdge, ...]

    def __post_init__(self) -> None:
        if self.outline is not None:
            points = _points("outline", self.outline, "outline")
            distinct = set(points)
            if len(distinct) < 3:
                raise InputError(
                    f"outline must have at least 3 distinct points; got {len(distinct)}",
                    field="outline",
                )
            polygon = Polygon(points)
            if not polygon.is_valid or polygon.area <= 0.0:
                reason = shapely.is_valid_reason(polygon)
                raise InputError(
                    "outline must be a simple polygon (no self-intersection, non-zero area); "
                    f"got {reason}",
                    field="outline",
                )
            object.__setattr__(self, "outline", points)
        edges = tuple(self.edges)
        if not edges:
            raise InputError("edges must hold at least one work edge; got none")
        for index, edge in enumerate(edges):
            if not isinstance(edge, WorkEdge):
                raise InputError(f"edges[{index}] must be a WorkEdge; got {type(edge).__name__}")
        object.__setattr__(self, "edges", edges)

    @property
    def outline_polygon(self) -> Polygon | None:
        """The outline as a shapely Polygon, or None."""
        return None if self.outline is None else Polygon(self.outline)
