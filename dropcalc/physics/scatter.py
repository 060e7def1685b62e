"""Ground surfaces and their contact coefficients for the travel after the first ground contact.

The mechanics of the contact, the hops, the slide and the roll live in
:mod:`dropcalc.physics.contact`; this module holds the table of ground surfaces they read: a
factor on the object's normal restitution (its material class on concrete), the sliding
friction and the rolling resistance, each as a range with its source.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass
from types import MappingProxyType

from dropcalc.errors import UnknownObjectError

#: Accepted ground slope [deg]: level to 30 deg (steeper ground is not a landing area).
SLOPE_RANGE = (0.0, 30.0)


@dataclass(frozen=True)
class Surface:
    """One ground surface and the ranges of its contact coefficients.

    Attributes
    ----------
    key : str
        Name used to select the surface, e.g. ``"concrete"``.
    label : str
        Short human-readable name.
    restitution_factor : tuple of float
        Range (low, high) of the factor on an object's normal restitution on concrete
        (:data:`dropcalc.physics.contact.MATERIALS`) for this ground: 1 for concrete. [-]
    friction : tuple of float
        Range (low, high) of the sliding friction coefficient mu. [-]
    rolling_resistance : tuple of float
        Range (low, high) of the rolling-resistance coefficient c_rr, the deceleration of a body
        rolling without slipping on level ground divided by g; the low end gives the longer
        roll. [-]
    source : str
        Where each range comes from, marking values from memory and choices without a source.
    """

    key: str
    label: str
    restitution_factor: tuple[float, float]
    friction: tuple[float, float]
    rolling_resistance: tuple[float, float]
    source: str


_FACTOR_SOURCE = (
    "restitution factor: ratio of the rockfall normal restitution on this ground to that on "
    "rock or concrete (0.45-0.55), low end to low end and high to high: [DORREN-2003], "
    "[CHAU-2002] (from memory)"
)
_FRICTION_SOURCE = (
    "mu: steel, concrete or timber sliding on the surface (from memory; common practice, no source)"
)
_ROLLING_SOURCE = (
    "c_rr: order of magnitude of rolling-resistance coefficients of balls and wheels (from "
    "memory; common practice, no source)"
)

#: The ground surfaces, by key.
SURFACES: Mapping[str, Surface] = MappingProxyType(
    {
        item.key: item
        for item in (
            Surface(
                key="concrete",
                label="concrete or rock",
                restitution_factor=(1.0, 1.0),
                friction=(0.4, 0.7),
                rolling_resistance=(0.01, 0.03),
                source="restitution factor 1: the material restitutions are for concrete; "
                f"{_FRICTION_SOURCE}; {_ROLLING_SOURCE}",
            ),
            Surface(
                key="asphalt",
                label="asphalt",
                restitution_factor=(0.73, 0.78),
                friction=(0.4, 0.7),
                rolling_resistance=(0.01, 0.04),
                source=f"{_FACTOR_SOURCE} (asphalt 0.35-0.40); {_FRICTION_SOURCE}; "
                f"{_ROLLING_SOURCE}",
            ),
            Surface(
                key="compacted-soil",
                label="compacted soil",
                restitution_factor=(0.67, 0.73),
                friction=(0.4, 0.6),
                rolling_resistance=(0.03, 0.08),
                source=f"{_FACTOR_SOURCE} (compact soil 0.30-0.40); {_FRICTION_SOURCE}; "
                f"{_ROLLING_SOURCE}",
            ),
            Surface(
                key="gravel",
                label="loose gravel",
                restitution_factor=(0.56, 0.64),
                friction=(0.4, 0.7),
                rolling_resistance=(0.05, 0.2),
                source="restitution factor: from e_n 0.25-0.35, chosen between compact soil "
                "(0.30-0.40) and soft soil (0.20-0.30) of [DORREN-2003] and [CHAU-2002] "
                "(from memory), over rock 0.45-0.55: loose stones take up energy by moving, "
                f"yet a stone layer is harder than soft soil; no source for the choice; "
                f"{_FRICTION_SOURCE}; {_ROLLING_SOURCE}",
            ),
            Surface(
                key="grass",
                label="grass",
                restitution_factor=(0.44, 0.55),
                friction=(0.3, 0.5),
                rolling_resistance=(0.05, 0.3),
                source=f"{_FACTOR_SOURCE} (soft soil/grass 0.20-0.30); {_FRICTION_SOURCE}; "
                "c_rr: 0.05 for short mown turf (a golf ball leaving a Stimpmeter at about "
                "1.8 m/s rolls about 3 m, from memory) to 0.3 for long grass (from memory)",
            ),
            Surface(
                key="soft-soil",
                label="soft soil",
                restitution_factor=(0.44, 0.55),
                friction=(0.4, 0.7),
                rolling_resistance=(0.1, 0.3),
                source=f"{_FACTOR_SOURCE} (soft soil/grass 0.20-0.30); mu and c_rr: objects "
                "sink in and plough (from memory; common practice, no source)",
            ),
        )
    }
)


def surface_names() -> tuple[str, ...]:
    """Return every key :func:`surface` accepts."""
    return tuple(SURFACES)


def surface(name: str | Surface) -> Surface:
    """Look up a ground surface by key (case, spaces and underscores do not matter).

    Parameters
    ----------
    name : str or Surface
        A key of :data:`SURFACES`, e.g. ``"concrete"`` or ``"compacted soil"``; a
        :class:`Surface` is returned unchanged.

    Returns
    -------
    Surface
        The surface.

    Raises
    ------
    UnknownObjectError
        If the name is not known; the message lists the valid keys.
    """
    if isinstance(name, Surface):
        return name
    key = str(name).strip().lower().replace("_", "-").replace(" ", "-")
    try:
        return SURFACES[key]
    except KeyError:
        raise UnknownObjectError(
            f"surface must be one of {', '.join(surface_names())}; got {name!r}", field="surface"
        ) from None
