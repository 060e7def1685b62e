"""Drag of simple shape classes: projected areas, drag coefficients and drag-area bounds.

A practitioner describes a dropped object by a shape class and its dimensions ("a 300 mm
wrench" is an ``irregular`` body in a 300 x 40 x 12 mm bounding box) rather than by C_d A.
This module turns that description into the drag areas the trajectory solver needs:

- the smallest C_d A over orientations, which gives the highest impact energy;
- the largest C_d A, which gives the longest drift in wind;
- a tumbling value, (1.0-1.1) S/4 ([GANSER-1993]), here 1.05 S/4.

Drag coefficients come from one table, :data:`CD_TABLE` ([WHITE-FM], [HOERNER-1965], from memory of
White, *Fluid Mechanics*, tables 7.2-7.3, and Hoerner, *Fluid-Dynamic Drag* (1965), ch. 3),
valid for Reynolds numbers above about 1e4. Sharp-edged bodies (boxes, plates, most tools) have
a C_d nearly independent of Re there; the orientation is the big uncertainty (a factor 1.5-2 on
C_d A), which is why bounds are returned, not one number.

Every function is vectorised: each dimension may be a float or a 1-D array (one value per
batch row); the arrays broadcast together. All dimensions are in metres.

References
----------
.. [1] White, F. M., *Fluid Mechanics*, tables 7.2 and 7.3 (values from memory).
.. [2] Hoerner, S. F., *Fluid-Dynamic Drag*, published by the author, 1965, ch. 3 (from memory).
.. [3] Vouk, V., "Projected area of convex bodies", Nature 162 (1948) 330-331.
.. [4] Ganser, G. H., "A rational approach to drag prediction of spherical and nonspherical
   particles", Powder Technology 77 (1993) 143-152.
.. [5] Holmes, J. D., Letchford, C. W. and Lin, N., "Investigations of plate-type windborne
   debris - Part II: Computed trajectories", J. Wind Eng. Ind. Aerodyn. 94 (2006) 21-39.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass
from types import MappingProxyType

import numpy as np
from numpy.typing import ArrayLike, NDArray

from dropcalc.errors import InputError, UnknownObjectError, shorten
from dropcalc.physics.constants import (
    GLIDE_THICKNESS_RATIO,
    IRREGULAR_COMPACTNESS_FACTOR,
    IRREGULAR_OUTLINE_FILL,
    TUMBLING_DRAG_FACTOR,
)

FloatArray = NDArray[np.float64]

#: The shape classes, in the order documentation lists them.
SHAPES: tuple[str, ...] = ("box", "cylinder", "tube", "sphere", "plate", "irregular")

#: Dimension names each shape requires, all in metres.
SHAPE_DIMENSIONS: Mapping[str, tuple[str, ...]] = MappingProxyType(
    {
        # solid rectangular block; the three edges in any order
        "box": ("length", "width", "height"),
        # solid rod, bar or round ("rod" is an alias)
        "cylinder": ("length", "diameter"),
        # hollow tube or pipe; drag uses the outer diameter
        "tube": ("length", "outer_diameter", "wall_thickness"),
        "sphere": ("diameter",),
        # sheets, boards, panes, panels: thickness << width
        "plate": ("length", "width", "thickness"),
        # compact irregular body described by its bounding box
        "irregular": ("length", "width", "height"),
    }
)

#: Other names accepted for the shape classes.
SHAPE_ALIASES: Mapping[str, str] = MappingProxyType(
    {"rod": "cylinder", "sheet": "plate", "pipe": "tube", "compact": "irregular"}
)

#: One-sentence caution shown wherever a result is flagged ``glides``.
GLIDE_WARNING = (
    "Sheets and plates can glide and autorotate far downwind (Holmes, Letchford & Lin, "
    "J. Wind Eng. Ind. Aerodyn. 94 (2006) 21-39); the point-mass model is not conservative "
    "for them, so treat the computed drift as a lower bound."
)

_SOURCE_TABLE = (
    "White, Fluid Mechanics, tables 7.2-7.3; Hoerner, Fluid-Dynamic Drag (1965) ch. 3 "
    "(from memory; [WHITE-FM], [HOERNER-1965])"
)


@dataclass(frozen=True)
class CdEntry:
    """One row of the drag-coefficient table.

    Attributes
    ----------
    key : str
        Identifier used by code, docs and reports.
    body : str
        The body, in words.
    orientation : str
        Which way the flow meets it.
    cd : float
        Drag coefficient referred to the frontal (projected) area. [-]
    source : str
        Where the value comes from.
    ratio : float or None
        The aspect ratio (plate: long side / short side) or length over diameter (cylinder)
        that the row belongs to; ``math.inf`` for the infinite cylinder, None where the row
        does not depend on one. [-]
    """

    key: str
    body: str
    orientation: str
    cd: float
    source: str
    ratio: float | None = None


def _entries(*rows: CdEntry) -> Mapping[str, CdEntry]:
    return MappingProxyType({row.key: row for row in rows})


#: THE drag-coefficient table that code, docs and reports read (Re above about 1e4, C_d on the
#: frontal area). Every row of [WHITE-FM], [HOERNER-1965], from memory of White, *Fluid Mechanics*,
#: tables 7.2-7.3, and Hoerner, *Fluid-Dynamic Drag* (1965) ch. 3, plus one row for a smooth
#: sphere past the drag crisis ([WHITE-FM], [HOERNER-1965] text).
CD_TABLE: Mapping[str, CdEntry] = _entries(
    CdEntry("sphere", "sphere", "any; subcritical, 1e3 < Re < 2e5", 0.47, _SOURCE_TABLE),
    CdEntry(
        "sphere_supercritical",
        "smooth sphere",
        "any; past the drag crisis, Re > 2e5 to 4e5",
        0.10,
        "[HOERNER-1965]: 0.1-0.2 past the drag crisis (from memory); the low end is taken "
        "because the smallest drag gives the highest impact energy",
    ),
    CdEntry("cube_face", "cube", "face on", 1.05, _SOURCE_TABLE),
    CdEntry("cube_edge", "cube", "edge on", 0.80, _SOURCE_TABLE),
    CdEntry("disk_normal", "thin circular disk", "normal to the flow", 1.17, _SOURCE_TABLE, 0.0),
    CdEntry("plate_normal_1", "square flat plate", "normal to the flow", 1.18, _SOURCE_TABLE, 1.0),
    CdEntry("plate_normal_5", "rectangular plate, aspect 5", "normal", 1.20, _SOURCE_TABLE, 5.0),
    CdEntry("plate_normal_10", "rectangular plate, aspect 10", "normal", 1.30, _SOURCE_TABLE, 10.0),
    CdEntry("plate_normal_20", "rectangular plate, aspect 20", "normal", 1.50, _SOURCE_TABLE, 20.0),
    CdEntry("cylinder_side_1", "circular cylinder, L/D 1", "side on", 0.64, _SOURCE_TABLE, 1.0),
    CdEntry("cylinder_side_2", "circular cylinder, L/D 2", "side on", 0.68, _SOURCE_TABLE, 2.0),
    CdEntry("cylinder_side_5", "circular cylinder, L/D 5", "side on", 0.74, _SOURCE_TABLE, 5.0),
    CdEntry("cylinder_side_10", "circular cylinder, L/D 10", "side on", 0.82, _SOURCE_TABLE, 10.0),
    CdEntry("cylinder_side_20", "circular cylinder, L/D 20", "side on", 0.91, _SOURCE_TABLE, 20.0),
    CdEntry("cylinder_side_40", "circular cylinder, L/D 40", "side on", 0.98, _SOURCE_TABLE, 40.0),
    CdEntry(
        "cylinder_side_inf",
        "circular cylinder, infinitely long",
        "side on",
        1.20,
        _SOURCE_TABLE,
        math.inf,
    ),
    CdEntry("cylinder_end_0.5", "circular cylinder, L/D 0.5", "end on", 1.15, _SOURCE_TABLE, 0.5),
    CdEntry("cylinder_end_1", "circular cylinder, L/D 1", "end on", 0.90, _SOURCE_TABLE, 1.0),
    CdEntry("cylinder_end_2", "circular cylinder, L/D 2", "end on", 0.85, _SOURCE_TABLE, 2.0),
    CdEntry("cylinder_end_4", "circular cylinder, L/D 4", "end on", 0.87, _SOURCE_TABLE, 4.0),
    CdEntry("cylinder_end_8", "circular cylinder, L/D 8", "end on", 0.99, _SOURCE_TABLE, 8.0),
    CdEntry(
        "hemisphere_cup_open", "hemispherical cup", "open side facing the flow", 1.42, _SOURCE_TABLE
    ),
    CdEntry(
        "hemisphere_cup_round",
        "hemispherical cup",
        "round side facing the flow",
        0.38,
        _SOURCE_TABLE,
    ),
)


@dataclass(frozen=True)
class DragBounds:
    """Drag areas of a shape over its possible orientations (arrays broadcast over the inputs).

    Attributes
    ----------
    projected_area_min : ndarray
        Smallest projected area over all orientations. [m^2]
    projected_area_max : ndarray
        Largest projected area over all orientations. [m^2]
    projected_area_mean : ndarray
        Mean projected area over random orientations (Cauchy's S/4 for convex bodies). [m^2]
    drag_area_min : ndarray
        Smallest C_d A over orientations: use it for the highest impact energy. [m^2]
    drag_area_max : ndarray
        Largest C_d A over orientations: use it for the longest drift. [m^2]
    drag_area_typical : ndarray
        C_d A of a tumbling body, 1.05 S/4, clamped between the two bounds. [m^2]
    glides : ndarray of bool
        True for flat bodies (sheets, boards, discs) that can glide and autorotate far in wind;
        the point-mass model is not conservative for them (see :data:`GLIDE_WARNING`).
    basis : str
        One sentence: which C_d rows and areas were used.
    """

    projected_area_min: FloatArray
    projected_area_max: FloatArray
    projected_area_mean: FloatArray
    drag_area_min: FloatArray
    drag_area_max: FloatArray
    drag_area_typical: FloatArray
    glides: NDArray[np.bool_]
    basis: str


# --- names and input checks -----------------------------------------------------------------


def normalise_shape(name: str) -> str:
    """Return the canonical shape class for ``name`` (case and surrounding spaces ignored).

    Parameters
    ----------
    name : str
        A shape class of :data:`SHAPES` or an alias of :data:`SHAPE_ALIASES`.

    Returns
    -------
    str
        The canonical name, one of :data:`SHAPES`.

    Raises
    ------
    UnknownObjectError
        If the name is neither a shape nor an alias; the message lists the valid names.
    """
    key = str(name).strip().lower()
    if key in SHAPES:
        return key
    if key in SHAPE_ALIASES:
        return SHAPE_ALIASES[key]
    aliases = ", ".join(f"{alias} ({target})" for alias, target in SHAPE_ALIASES.items())
    raise UnknownObjectError(
        f"shape must be one of {', '.join(SHAPES)} or an alias {aliases}; "
        f"got {shorten(repr(name), 60)}",
        field="shape",
    )


#: Dimensions accepted [m]: a 10 micrometre flake to a 1 km structure; anything outside is a
#: typing or unit mistake, and would overflow or underflow the area products.
DIMENSION_RANGE = (1e-5, 1000.0)


def _length(name: str, value: object) -> FloatArray:
    """One dimension as a float array, checked finite and > 0."""
    try:
        array = np.asarray(value, dtype=float)
    except (TypeError, ValueError, OverflowError):
        raise InputError(
            f"{name} must be a finite length > 0 m; got {value!r:.40}", field=name
        ) from None
    if array.ndim > 1:
        raise InputError(
            f"{name} must be a float or a 1-D array; got an array of {array.ndim} D", field=name
        )
    low, high = DIMENSION_RANGE
    bad = ~((array >= low) & (array <= high))  # NaN compares False
    if np.any(bad):
        flat = np.atleast_1d(array)
        index = int(np.flatnonzero(np.atleast_1d(bad))[0])
        where = f" (row {index})" if array.ndim == 1 else ""
        raise InputError(
            f"{name} must be a finite length > 0 m; got {flat[index]:g} m{where} "
            f"(allowed: {low:g} to {high:g} m)",
            field=name,
        )
    return array


def _first_bad(mask: NDArray[np.bool_], *arrays: FloatArray) -> tuple[str, list[float]]:
    """Row label and the values of ``arrays`` at the first True of ``mask``."""
    index = int(np.flatnonzero(np.atleast_1d(mask))[0])
    where = f" (row {index})" if np.ndim(mask) == 1 else ""
    values = [float(np.broadcast_to(a, np.shape(mask)).ravel()[index]) for a in arrays]
    return where, values


def _dimensions(shape: str, dimensions: Mapping[str, object]) -> tuple[str, list[FloatArray]]:
    """Canonical shape and its dimensions (SHAPE_DIMENSIONS order), checked and broadcast."""
    canonical = normalise_shape(shape)
    required = SHAPE_DIMENSIONS[canonical]
    unknown = [name for name in dimensions if name not in required]
    if unknown:
        raise InputError(
            f"{', '.join(unknown)} is not a dimension of shape {canonical}; "
            f"it takes {', '.join(required)} (m)"
        )
    missing = [name for name in required if name not in dimensions]
    if missing:
        raise InputError(
            f"shape {canonical} needs {', '.join(required)} (m); missing {', '.join(missing)}",
            field="shape",
        )
    values = [_length(name, dimensions[name]) for name in required]
    try:
        values = list(np.broadcast_arrays(*values))
    except ValueError:
        sizes = ", ".join(f"{n}: {np.size(v)}" for n, v in zip(required, values, strict=True))
        raise InputError(
            f"the dimensions of a {canonical} must be floats or 1-D arrays of one length; "
            f"got {sizes}"
        ) from None
    if canonical == "tube":
        outer, wall = values[1], values[2]
        bad = wall >= 0.5 * outer
        if np.any(bad):
            where, (od, wt) = _first_bad(bad, outer, wall)
            raise InputError(
                f"wall_thickness must be less than half the outer_diameter ({0.5 * od:g} m); "
                f"got {wt:g} m{where}"
            )
    if canonical == "plate":
        length, width, thickness = values
        bad = thickness > np.minimum(length, width)
        if np.any(bad):
            where, (le, wi, th) = _first_bad(bad, length, width, thickness)
            raise InputError(
                f"thickness must not exceed the smaller of length and width ({min(le, wi):g} m); "
                f"got {th:g} m{where}"
            )
    return canonical, values


def _sorted_edges(a: FloatArray, b: FloatArray, c: FloatArray) -> FloatArray:
    """Edges of a block sorted along the first axis: smallest, middle, largest."""
    return np.sort(np.stack([a, b, c]), axis=0)


# --- geometry ---------------------------------------------------------------------------------


def surface_area(shape: str, **dimensions: ArrayLike) -> FloatArray:
    """Surface area S of the body that enters Cauchy's formula.

    box, plate: 2 (ab + bc + ca); cylinder: pi D L + pi D^2 / 2; sphere: pi D^2. A tube returns
    the surface of its convex hull (a solid cylinder of the outer diameter) and an irregular
    body that of its bounding box: these are the convex surfaces whose S/4 is the mean
    projected area.

    Parameters
    ----------
    shape : str
        Shape class or alias (see :data:`SHAPES`, :data:`SHAPE_ALIASES`).
    **dimensions : float or 1-D array
        The dimensions :data:`SHAPE_DIMENSIONS` lists for the shape. [m]

    Returns
    -------
    numpy.ndarray
        Surface area. [m^2]

    Raises
    ------
    UnknownObjectError
        For an unknown shape.
    InputError
        For a missing, unknown, non-finite or non-positive dimension, a tube wall of half the
        outer diameter or more, or a plate thicker than it is wide.
    """
    canonical, values = _dimensions(shape, dimensions)
    if canonical in ("box", "plate", "irregular"):
        a, b, c = values
        return np.asarray(2.0 * (a * b + b * c + c * a))
    if canonical == "sphere":
        (diameter,) = values
        return np.asarray(math.pi * diameter**2)
    length, diameter = values[0], values[1]
    return np.asarray(math.pi * diameter * length + 0.5 * math.pi * diameter**2)


def volume(shape: str, **dimensions: ArrayLike) -> FloatArray:
    """Volume of material.

    box, plate: abc; cylinder: pi D^2 L / 4; tube: the wall only, pi (D_o^2 - D_i^2) L / 4
    with D_i = D_o - 2 t; sphere: pi D^3 / 6. An irregular body returns its bounding box's
    volume, an upper bound on its material volume: give the mass of irregular objects, do not
    derive it from this volume.

    Parameters
    ----------
    shape : str
        Shape class or alias.
    **dimensions : float or 1-D array
        The dimensions :data:`SHAPE_DIMENSIONS` lists for the shape. [m]

    Returns
    -------
    numpy.ndarray
        Volume. [m^3]

    Raises
    ------
    UnknownObjectError
        For an unknown shape.
    InputError
        For a bad dimension (see :func:`surface_area`).
    """
    canonical, values = _dimensions(shape, dimensions)
    if canonical in ("box", "plate", "irregular"):
        a, b, c = values
        return np.asarray(a * b * c)
    if canonical == "sphere":
        (diameter,) = values
        return np.asarray(math.pi * diameter**3 / 6.0)
    if canonical == "tube":
        length, outer, wall = values
        inner = outer - 2.0 * wall
        return np.asarray(0.25 * math.pi * (outer**2 - inner**2) * length)
    length, diameter = values
    return np.asarray(0.25 * math.pi * diameter**2 * length)


def _block_projected_areas(
    a: FloatArray, b: FloatArray, c: FloatArray
) -> tuple[FloatArray, FloatArray, FloatArray]:
    """(min, max, mean) projected area of an a x b x c block."""
    faces = np.stack([b * c, c * a, a * b])
    return (
        np.asarray(np.min(faces, axis=0)),
        np.asarray(np.sqrt(np.sum(faces**2, axis=0))),
        np.asarray(0.5 * np.sum(faces, axis=0)),
    )


def _cylinder_projected_areas(
    length: FloatArray, diameter: FloatArray
) -> tuple[FloatArray, FloatArray, FloatArray]:
    """(min, max, mean) projected area of a solid circular cylinder."""
    side = length * diameter
    end = 0.25 * math.pi * diameter**2
    return (
        np.asarray(np.minimum(side, end)),
        np.asarray(np.hypot(side, end)),
        np.asarray(0.25 * math.pi * diameter * length + 0.125 * math.pi * diameter**2),
    )


def projected_areas(
    shape: str, **dimensions: ArrayLike
) -> tuple[FloatArray, FloatArray, FloatArray]:
    """Smallest, largest and mean projected area over all orientations.

    Block a x b x c (box, plate), seen along the unit vector n in body axes:

        A(n) = |n_1| bc + |n_2| ca + |n_3| ab

    (each face pair projects with the cosine of its normal). Its minimum over the unit sphere is
    the smallest face (A >= min(face) (|n_1| + |n_2| + |n_3|) >= min(face)), its maximum, seen
    along the body diagonal direction n ~ (bc, ca, ab), is sqrt((ab)^2 + (bc)^2 + (ca)^2)
    (Cauchy-Schwarz).

    Cylinder of length L and diameter D, axis at angle theta to the view:

        A(theta) = L D sin(theta) + (pi D^2 / 4) |cos(theta)|

    a sinusoid of amplitude sqrt((L D)^2 + (pi D^2 / 4)^2) on [0, pi/2]: that is its maximum,
    reached at tan(theta) = 4 L / (pi D); the minimum is the smaller of side-on L D and
    end-on pi D^2 / 4. Sphere: pi D^2 / 4 in every direction.

    Mean over uniformly random orientations: S/4 for any convex body (Cauchy's formula, [3]);
    (ab + bc + ca)/2 for a block, pi D L / 4 + pi D^2 / 8 for a cylinder.

    A tube is taken as its convex hull, a solid cylinder of the outer diameter (its silhouette
    from any side but end-on is that of the hull; end-on the bore is ignored, as for drag).
    An irregular body is its bounding box with the smallest and the mean area multiplied by
    the compactness factor 0.8 (``IRREGULAR_COMPACTNESS_FACTOR``, common practice, no source):
    a body inside a box presents less than the box in every direction. The largest area is
    the box's, an upper bound.

    Parameters
    ----------
    shape : str
        Shape class or alias.
    **dimensions : float or 1-D array
        The dimensions :data:`SHAPE_DIMENSIONS` lists for the shape. [m]

    Returns
    -------
    tuple of numpy.ndarray
        (smallest, largest, mean) projected area. [m^2]

    Raises
    ------
    UnknownObjectError
        For an unknown shape.
    InputError
        For a bad dimension (see :func:`surface_area`).

    References
    ----------
    Vouk, V., "Projected area of convex bodies", Nature 162 (1948) 330-331.
    """
    canonical, values = _dimensions(shape, dimensions)
    return _projected_areas(canonical, values)


def _projected_areas(
    canonical: str, values: list[FloatArray]
) -> tuple[FloatArray, FloatArray, FloatArray]:
    if canonical in ("box", "plate"):
        return _block_projected_areas(*values)
    if canonical == "irregular":
        smallest, largest, mean = _block_projected_areas(*values)
        factor = IRREGULAR_COMPACTNESS_FACTOR
        return np.asarray(factor * smallest), largest, np.asarray(factor * mean)
    if canonical == "sphere":
        area = np.asarray(0.25 * math.pi * values[0] ** 2)
        return area, area.copy(), area.copy()
    return _cylinder_projected_areas(values[0], values[1])


# --- drag coefficients ------------------------------------------------------------------------


def _table(prefix: str) -> tuple[NDArray[np.float64], NDArray[np.float64]]:
    """(ratio, cd) of the CD_TABLE rows whose key starts with ``prefix``, sorted by ratio."""
    rows = sorted(
        (row for key, row in CD_TABLE.items() if key.startswith(prefix)),
        key=lambda row: float(row.ratio if row.ratio is not None else 0.0),
    )
    ratios = np.array([row.ratio for row in rows], dtype=float)
    return ratios, np.array([row.cd for row in rows], dtype=float)


def plate_normal_drag_coefficient(aspect_ratio: ArrayLike) -> FloatArray:
    """C_d of a flat rectangular plate normal to the flow, by its aspect ratio.

    Interpolated linearly in log(aspect ratio) between the ``plate_normal_*`` rows of
    :data:`CD_TABLE` (1.18 at 1, 1.20 at 5, 1.30 at 10, 1.50 at 20) and held at 1.50 beyond 20.
    The two-dimensional plate (infinite aspect) has C_d near 2 (White, table 7.2, from memory),
    so very long strips get a low value here: they are flagged ``glides`` anyway.

    Parameters
    ----------
    aspect_ratio : float or array
        Long side over short side; values below 1 are inverted. [-]

    Returns
    -------
    numpy.ndarray
        Drag coefficient on the plate area. [-]

    References
    ----------
    White, *Fluid Mechanics*, table 7.3; Hoerner, *Fluid-Dynamic Drag* (1965) ch. 3
    (from memory, [WHITE-FM], [HOERNER-1965]).
    """
    aspect = np.asarray(aspect_ratio, dtype=float)
    aspect = np.maximum(aspect, 1.0 / aspect)
    ratios, cds = _table("plate_normal_")
    return np.asarray(np.interp(np.log(aspect), np.log(ratios), cds))


def cylinder_side_on_drag_coefficient(length_to_diameter: ArrayLike) -> FloatArray:
    """C_d of a circular cylinder with its axis normal to the flow, by L/D.

    Interpolated linearly in D/L between the ``cylinder_side_*`` rows of :data:`CD_TABLE`
    (0.64 at L/D = 1 up to 1.20 at L/D = infinity, i.e. D/L = 0), so that the infinite
    cylinder is a table point; held at 0.64 for L/D < 1. Subcritical Re (below about 2e5 on
    the diameter); the drag crisis of a smooth cylinder is not modelled.

    Parameters
    ----------
    length_to_diameter : float or array
        L/D. [-]

    Returns
    -------
    numpy.ndarray
        Drag coefficient on L D. [-]

    References
    ----------
    White, *Fluid Mechanics*, table 7.3; Hoerner, *Fluid-Dynamic Drag* (1965) ch. 3
    (from memory, [WHITE-FM], [HOERNER-1965]).
    """
    ratios, cds = _table("cylinder_side_")
    inverse = 1.0 / ratios  # 1/inf = 0: the infinite cylinder
    order = np.argsort(inverse)
    return np.asarray(
        np.interp(1.0 / np.asarray(length_to_diameter, dtype=float), inverse[order], cds[order])
    )


def cylinder_end_on_drag_coefficient(length_to_diameter: ArrayLike) -> FloatArray:
    """C_d of a circular cylinder with its axis along the flow, by L/D.

    Interpolated linearly in L/D between the thin disk (``disk_normal``, 1.17 at L/D = 0) and
    the ``cylinder_end_*`` rows of :data:`CD_TABLE` (1.15 at 0.5, 0.90 at 1, 0.85 at 2, 0.87 at
    4, 0.99 at 8), held at 0.99 beyond L/D = 8. Skin friction raises the C_d of long rods
    end-on above that, so the held value is low: this errs towards a higher impact energy,
    the safe side for the smallest drag area.

    Parameters
    ----------
    length_to_diameter : float or array
        L/D. [-]

    Returns
    -------
    numpy.ndarray
        Drag coefficient on pi D^2 / 4. [-]

    References
    ----------
    White, *Fluid Mechanics*, table 7.3; Hoerner, *Fluid-Dynamic Drag* (1965) ch. 3
    (from memory, [WHITE-FM], [HOERNER-1965]).
    """
    ratios, cds = _table("cylinder_end_")
    disk = CD_TABLE["disk_normal"]
    ratios = np.concatenate([[0.0 if disk.ratio is None else disk.ratio], ratios])
    cds = np.concatenate([[disk.cd], cds])
    return np.asarray(np.interp(np.asarray(length_to_diameter, dtype=float), ratios, cds))


# --- drag bounds ------------------------------------------------------------------------------


def drag_bounds(
    shape: str,
    *,
    drag_crisis: bool = False,
    outline_fill: ArrayLike | None = None,
    **dimensions: ArrayLike,
) -> DragBounds:
    """Smallest, largest and tumbling drag area C_d A of a shape over its orientations.

    Rules, per shape (C_d rows named by their :data:`CD_TABLE` key):

    - cylinder, tube (outer diameter D): side-on C_d(L/D) L D
      (:func:`cylinder_side_on_drag_coefficient`) and end-on C_d(L/D) pi D^2 / 4
      (:func:`cylinder_end_on_drag_coefficient`); the smaller is ``drag_area_min`` (a bar
      falling end-on), the larger ``drag_area_max``. A tube's bore is ignored, as the brief
      for the object library fixes (drag uses the outer diameter).
    - sphere: ``sphere`` 0.47 x pi D^2 / 4 for both bounds. With ``drag_crisis=True`` the
      minimum uses ``sphere_supercritical`` 0.10, the low end of the 0.1-0.2 a smooth sphere
      reaches past Re of about 2e5-4e5 ([HOERNER-1965]). It is off by default: the crisis
      needs both a smooth ball and a large Re (a 50 mm ball reaches Re = 2e5 only above about
      60 m/s), which dropped objects on site rarely have.
    - box: the table has two C_d for a sharp-edged block, ``cube_face`` 1.05 and ``cube_edge``
      0.80, and the area the edge-on value refers to (the face a^2 or the projection
      sqrt(2) a^2) could not be checked. The bounds are therefore taken as an envelope:
      ``drag_area_min`` = 0.80 x the smallest face, ``drag_area_max`` = 1.05 x the largest
      projection. For a cube they are 0.80 a^2 and 1.82 a^2, around the tumbling 1.575 a^2.
    - plate: as a box, except that the largest is at least the face-on value
      C_d(aspect) L W from :func:`plate_normal_drag_coefficient` (1.18-1.50).
    - irregular: as a box on the bounding box, with the minimum multiplied by the compactness
      factor 0.8 (``IRREGULAR_COMPACTNESS_FACTOR``, common practice, no source), and the
      maximum multiplied by the outline fill f, the share of the bounding rectangle that the
      body's largest projected outline covers (a hammer's handle and head, about 0.3 of its
      box). f defaults to 1.0 (``IRREGULAR_OUTLINE_FILL``, the whole rectangle, an upper bound);
      the minimum is held at or below the maximum.

    Tumbling (``drag_area_typical``): 1.05 x the mean projected area (S/4, Cauchy [3]; for an
    irregular body 0.8 x the bounding box's S/4), the middle of the (1.0-1.1) S/4 of
    [WHITE-FM], [HOERNER-1965], derived from Ganser [4]; clamped between the two bounds, which for a
    sphere makes it 0.47 pi D^2 / 4.

    ``glides`` is True for flat bodies: box, plate and irregular when the smallest edge is
    less than 0.1 of the middle one (``GLIDE_THICKNESS_RATIO``, common practice, no source),
    cylinder and tube (discs, rings) when L < 0.1 D. Such bodies glide and autorotate [5];
    show :data:`GLIDE_WARNING` with their result.

    Parameters
    ----------
    shape : str
        Shape class or alias.
    drag_crisis : bool
        Spheres only: let the minimum drag area use the post-crisis C_d of a smooth sphere.
    outline_fill : float or 1-D array or None
        Irregular bodies only: the outline fill f, 0 < f <= 1, that multiplies the largest
        drag area; None uses ``IRREGULAR_OUTLINE_FILL``. [-]
    **dimensions : float or 1-D array
        The dimensions :data:`SHAPE_DIMENSIONS` lists for the shape. [m]

    Returns
    -------
    DragBounds
        Projected areas, drag areas [m^2], the glide flag and a one-sentence basis.

    Raises
    ------
    UnknownObjectError
        For an unknown shape.
    InputError
        For a bad dimension (see :func:`surface_area`), ``drag_crisis`` on a shape other
        than a sphere, or ``outline_fill`` outside (0, 1] or on a shape other than irregular.

    Notes
    -----
    The C_d values hold for Re above about 1e4, where sharp-edged bodies have a C_d nearly
    independent of Re; the orientation is the big uncertainty (a factor 1.5-2 on C_d A,
    [WHITE-FM]). Size exclusion zones on the envelope: ``drag_area_min`` for the impact
    energy, ``drag_area_max`` for the drift.

    References
    ----------
    White, F. M., *Fluid Mechanics*, tables 7.2-7.3 (from memory). Hoerner, S. F.,
    *Fluid-Dynamic Drag* (1965) ch. 3 (from memory). Vouk, V., Nature 162 (1948) 330-331.
    Ganser, G. H., Powder Technology 77 (1993) 143-152. Holmes, J. D., Letchford, C. W. and
    Lin, N., J. Wind Eng. Ind. Aerodyn. 94 (2006) 21-39.
    """
    canonical, values = _dimensions(shape, dimensions)
    if drag_crisis and canonical != "sphere":
        raise InputError(f"drag_crisis applies to a sphere only; got shape {canonical}")
    if outline_fill is not None and canonical != "irregular":
        raise InputError(f"outline_fill applies to an irregular shape only; got shape {canonical}")
    fill = np.asarray(IRREGULAR_OUTLINE_FILL if outline_fill is None else outline_fill, dtype=float)
    if not np.all((fill > 0.0) & (fill <= 1.0)):  # NaN compares False
        raise InputError(
            f"outline_fill must be a number > 0 and <= 1; got {np.atleast_1d(fill)[0]:g}",
            field="outline_fill",
        )
    area_min, area_max, area_mean = _projected_areas(canonical, values)
    glides = np.zeros(np.shape(area_min), dtype=bool)

    if canonical == "sphere":
        cd_max = CD_TABLE["sphere"].cd
        row_min = "sphere_supercritical" if drag_crisis else "sphere"
        cd_min = CD_TABLE[row_min].cd
        drag_min, drag_max = cd_min * area_min, cd_max * area_max
        basis = (
            f"sphere: Cd {cd_min:.2f} ({row_min}) for the minimum and {cd_max:.2f} (sphere) "
            "for the maximum on pi D^2/4; tumbling 1.05 S/4 clamped to them."
        )
    elif canonical in ("cylinder", "tube"):
        length, diameter = values[0], values[1]
        ratio = length / diameter
        side = cylinder_side_on_drag_coefficient(ratio) * length * diameter
        end = cylinder_end_on_drag_coefficient(ratio) * 0.25 * math.pi * diameter**2
        drag_min, drag_max = np.minimum(side, end), np.maximum(side, end)
        glides = ratio < GLIDE_THICKNESS_RATIO
        which = "outer diameter" if canonical == "tube" else "diameter"
        basis = (
            f"{canonical}: side-on Cd(L/D) from the cylinder_side rows on L D and end-on "
            f"Cd(L/D) from disk_normal and the cylinder_end rows on pi D^2/4, D the {which}; "
            "smaller and larger of the two; tumbling 1.05 S/4 (Cauchy)."
        )
    else:
        edges = _sorted_edges(*values)
        smallest_face = edges[0] * edges[1]
        cd_edge, cd_face = CD_TABLE["cube_edge"].cd, CD_TABLE["cube_face"].cd
        drag_min = cd_edge * smallest_face
        _, box_max, _ = _block_projected_areas(*values)
        drag_max = cd_face * box_max
        glides = edges[0] < GLIDE_THICKNESS_RATIO * edges[1]
        basis = (
            f"{canonical}: minimum Cd {cd_edge:.2f} (cube_edge) on the smallest face, maximum "
            f"Cd {cd_face:.2f} (cube_face) on the largest projection sqrt((ab)^2+(bc)^2+(ca)^2)"
        )
        if canonical == "plate":
            length, width, _ = values
            face_on = plate_normal_drag_coefficient(length / width) * length * width
            drag_max = np.maximum(drag_max, face_on)
            basis += " or Cd(aspect) from the plate_normal rows on L W face-on, if larger"
        if canonical == "irregular":
            drag_max = fill * drag_max
            drag_min = np.minimum(IRREGULAR_COMPACTNESS_FACTOR * drag_min, drag_max)
            fills = np.unique(np.atleast_1d(fill))
            fill_text = f"{fills[0]:g}" if fills.size == 1 else "given per row"
            basis += (
                f", of the bounding box, the minimum and tumbling areas x "
                f"{IRREGULAR_COMPACTNESS_FACTOR:g} compactness (common practice, no source), "
                f"the maximum x outline fill {fill_text}"
            )
        basis += "; tumbling 1.05 S/4 (Cauchy)."

    typical = np.clip(TUMBLING_DRAG_FACTOR * area_mean, drag_min, drag_max)
    return DragBounds(
        projected_area_min=np.asarray(area_min, dtype=float),
        projected_area_max=np.asarray(area_max, dtype=float),
        projected_area_mean=np.asarray(area_mean, dtype=float),
        drag_area_min=np.asarray(drag_min, dtype=float),
        drag_area_max=np.asarray(drag_max, dtype=float),
        drag_area_typical=np.asarray(typical, dtype=float),
        glides=np.asarray(glides, dtype=bool),
        basis=basis,
    )
