"""Checks of one falling object and its release height against the model's ranges.

The ranges themselves are in :mod:`dropcalc.model.limits`, written once; these functions are
what the edges (CLI options, scenario objects, batch rows, zone objects) call before anything
is computed.
"""

from __future__ import annotations

from dropcalc.errors import require_finite_positive, require_range
from dropcalc.model.limits import (
    CONTACT_AREA_RANGE,
    DRAG_AREA_RANGE,
    MASS_RANGE,
    MAX_RELEASE_HEIGHT,
    MIN_RELEASE_HEIGHT,
)


def check_object(
    mass: float,
    drag_area: float,
    height: float,
    contact_area: float | None = None,
    drag_area_max: float | None = None,
) -> None:
    """Raise InputError unless the object and release height are within the model's ranges.

    Parameters
    ----------
    mass : float
        [kg]
    drag_area : float
        Smallest (or only) drag area. [m^2]
    height : float
        Release height. [m]
    contact_area : float or None
        [m^2]
    drag_area_max : float or None
        Largest drag area, >= ``drag_area``. [m^2]
    """
    require_range("mass", mass, *MASS_RANGE, "kg")
    require_range("drag_area", drag_area, *DRAG_AREA_RANGE, "m²")
    require_finite_positive("height", height, "m")
    require_range("height", height, MIN_RELEASE_HEIGHT, MAX_RELEASE_HEIGHT, "m")
    if drag_area_max is not None:
        require_range("drag_area_max", drag_area_max, drag_area, DRAG_AREA_RANGE[1], "m²")
    if contact_area is not None:
        require_range("contact_area", contact_area, *CONTACT_AREA_RANGE, "m²")
