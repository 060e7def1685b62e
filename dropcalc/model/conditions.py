"""The conditions of a drop: air, wind, gravity, how objects leave the edge and where it faces.

One :class:`Conditions` is shared by every computation that drops something: a single fall
(``FallCase``), a list (``BatchSettings``) and a zone (``ZoneSettings``) each hold one, and
read its parts through :class:`WithConditions`. The CLI builds it from its options in one call
(:func:`conditions_from_options`); the scenario reader from the file's tables.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass, field, replace
from typing import Any, Self

import numpy as np
from numpy.typing import ArrayLike, NDArray

from dropcalc.errors import InputError, require_range, to_float
from dropcalc.model.limits import GRAVITY_RANGE
from dropcalc.physics.atmosphere import AirState, air_state
from dropcalc.physics.constants import STANDARD_GRAVITY
from dropcalc.physics.release import Release
from dropcalc.physics.wind import WindSpec, wind_spec

#: Acceleration of gravity when none is given [m/s^2]: standard gravity (CGPM 1901).
DEFAULT_GRAVITY = STANDARD_GRAVITY
#: Compass direction a work edge faces when none is given [deg]: east (any direction would do
#: for a lone edge; the wind's default, from the west, then blows straight out from it).
DEFAULT_EDGE_AZIMUTH = 90.0


def opposite_azimuth(azimuth: ArrayLike) -> NDArray[np.float64]:
    """The compass direction opposite ``azimuth``, in [0, 360) [deg].

    A wind blowing *from* ``azimuth`` blows *toward* ``(azimuth + 180) mod 360``; the wind that
    blows straight out from an edge facing ``azimuth`` comes from the opposite direction.
    """
    return np.mod(np.asarray(azimuth, dtype=float) + 180.0, 360.0)


def _still_air() -> WindSpec:
    return wind_spec(0.0)


@dataclass(frozen=True)
class Conditions:
    """Air, wind, gravity, release and the edge's direction (SI units).

    Everything a drop needs but the object and its height.

    Attributes
    ----------
    air : AirState
        Air density and its basis.
    wind : WindSpec
        Wind at 10 m, mean or gust, profile and direction.
    gravity : float
        Acceleration of gravity. [m/s^2]
    release : Release
        How objects leave the edge.
    edge_azimuth : float
        Compass direction the edge faces, away from the structure. [deg]

    Raises
    ------
    InputError
        When gravity is outside :data:`~dropcalc.model.limits.GRAVITY_RANGE` or the azimuth
        is not a finite angle (the air, wind and release check themselves when built).
    """

    air: AirState = field(default_factory=air_state)
    wind: WindSpec = field(default_factory=_still_air)
    gravity: float = DEFAULT_GRAVITY
    release: Release = field(default_factory=Release)
    edge_azimuth: float = DEFAULT_EDGE_AZIMUTH

    def __post_init__(self) -> None:
        require_range("gravity", self.gravity, *GRAVITY_RANGE, "m/s²")
        azimuth = to_float("edge_azimuth", self.edge_azimuth, "deg")
        if not math.isfinite(azimuth):
            raise InputError(
                field="edge_azimuth", value=azimuth, allowed="a finite angle in degrees"
            )
        object.__setattr__(self, "edge_azimuth", azimuth)  # a float from here on, not an int

    @property
    def outward_wind_from(self) -> float:
        """The direction a wind blowing straight out from the edge comes from [deg]."""
        return float(opposite_azimuth(self.edge_azimuth))


class WithConditions:
    """Read access to the :class:`Conditions` of a case or settings, and a changed copy.

    A mixin for frozen dataclasses with a ``conditions`` field: ``settings.wind`` reads
    ``settings.conditions.wind``.
    """

    conditions: Conditions

    @property
    def air(self) -> AirState:
        """Air density and its basis."""
        return self.conditions.air

    @property
    def wind(self) -> WindSpec:
        """The wind of the day."""
        return self.conditions.wind

    @property
    def gravity(self) -> float:
        """Acceleration of gravity [m/s^2]."""
        return self.conditions.gravity

    @property
    def release(self) -> Release:
        """How objects leave the edge."""
        return self.conditions.release

    @property
    def edge_azimuth(self) -> float:
        """Compass direction the edge faces [deg]."""
        return self.conditions.edge_azimuth

    def with_conditions(self, **changes: Any) -> Self:
        """A copy with some parts of the conditions replaced (``wind=``, ``edge_azimuth=``)."""
        return replace(self, conditions=replace(self.conditions, **changes))  # type: ignore[type-var]


def conditions_from_options(
    options: Mapping[str, Any], release: Release | None = None
) -> Conditions:
    """The conditions from the command line's shared options (raises InputError).

    Parameters
    ----------
    options : mapping
        The command's parameters by name (``typer.Context.params``): ``wind``, ``wind_kind``,
        ``wind_from``, ``wind_profile``, ``wind_exponent``, ``roughness``, ``terrain``,
        ``wind_measured``, ``elevation``, ``air_temp``, ``pressure``, ``humidity``, ``air_density``,
        ``latitude`` and ``edge_azimuth``, as typed (quantities as text with units).
    release : Release, optional
        How objects leave the edge (built from the command's own release options); a drop
        when not given.
    """
    from dropcalc.physics.gravity import gravity as local_gravity
    from dropcalc.physics.wind import wind_at_site
    from dropcalc.units import parse_direction, parse_quantity
    from dropcalc.units import parse_optional_quantity as q

    edge_azimuth = options.get("edge_azimuth", DEFAULT_EDGE_AZIMUTH)
    if not math.isfinite(edge_azimuth):
        raise InputError(
            f"--edge-azimuth must be a finite compass angle in degrees; got {edge_azimuth}"
        )
    elevation = parse_quantity(options.get("elevation", "0"), "length", "--elevation")
    air = air_state(
        elevation=elevation,
        temperature=q(options.get("air_temp"), "temperature", "--air-temp"),
        pressure=q(options.get("pressure"), "pressure", "--pressure"),
        relative_humidity=q(options.get("humidity"), "fraction", "--humidity"),
        density=q(options.get("air_density"), "density", "--air-density"),
    )
    wind_from = options.get("wind_from")
    kind, profile = options.get("wind_kind"), options.get("wind_profile")
    wind = wind_spec(
        parse_quantity(options.get("wind", "0"), "speed", "--wind"),
        kind=str(kind.value) if kind is not None else "mean",  # type: ignore[arg-type]
        from_direction=(
            parse_direction(wind_from, "--wind-from")
            if wind_from
            else float(opposite_azimuth(edge_azimuth))
        ),
        profile=profile.value if profile is not None else None,
        exponent=options.get("wind_exponent"),
        roughness_length=q(options.get("roughness"), "length", "--roughness"),
        terrain=options.get("terrain"),
    )
    wind = wind_at_site(wind, str(options.get("wind_measured", "site")).strip().lower())
    return Conditions(
        air=air,
        wind=wind,
        gravity=local_gravity(options.get("latitude"), elevation),
        release=release if release is not None else Release(),
        edge_azimuth=edge_azimuth,
    )
