"""How an object leaves the work edge: its initial velocity (east, north, up).

Four release modes, each given in the vertical plane through the outward normal of the edge:

- ``drop``: from rest;
- ``push``: horizontally away from the edge at ``speed``;
- ``throw``: at ``speed`` and ``angle`` above the horizontal (negative: thrown downward),
  away from the edge;
- ``roof-slide``: slides (or rolls) down a pitched roof towards the edge and leaves the eave
  along the roof slope, ``roof_pitch`` below the horizontal, at v = sqrt(v0^2 + 2 a L) with
  a = g (sin theta - mu cos theta) ([HRW-2011]). Air drag and rolling resistance on the
  roof are neglected, so the exit speed is an upper bound.

The velocity of a moving carrier (hoist, hook, lift basket) is added in every mode.

The edge faces outward along the horizontal unit vector n = (sin a, cos a, 0), with a the
``edge_azimuth`` clockwise from north (90 deg: the edge faces east, "away from the edge" is +x).
Axes: x east, y north, z up. All numeric fields may be floats or 1-D arrays of one common length
(Monte Carlo samples); the velocity then has shape (3, n).

References
----------
.. [1] D. Halliday, R. Resnick and J. Walker, "Fundamentals of Physics", 10th ed., Wiley, 2014,
   ch. 6 (friction; block on an inclined plane), Table 10-2 (rotational inertias) and ch. 11
   (rolling down a ramp, eq. 11-10); table and equation numbers from memory.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass
from types import MappingProxyType

import numpy as np
from numpy.typing import ArrayLike, NDArray

from dropcalc.errors import InputError, UnknownObjectError, require_range_array
from dropcalc.physics.checks import as_samples as _as_samples
from dropcalc.physics.checks import check_gravity
from dropcalc.physics.checks import first_bad as _first_bad
from dropcalc.physics.constants import STANDARD_GRAVITY

RELEASE_MODES: tuple[str, ...] = ("drop", "push", "throw", "roof-slide")

#: Largest release speed accepted [m/s]. A tool thrown or kicked on site is far slower; only
#: elite overarm throws of a ball come near it (baseball pitches about 40-45 m/s, from memory).
#: Common practice, no source.
MAXIMUM_RELEASE_SPEED = 40.0
#: Allowed release angle, elevation above the horizontal (negative: thrown downward) [deg].
RELEASE_ANGLE_RANGE = (-90.0, 90.0)
#: Allowed roof pitch [deg]; steeper than 80 deg is a wall, use ``drop`` or ``push``.
ROOF_PITCH_RANGE = (0.0, 80.0)
#: Largest roof slope length [m].
MAXIMUM_ROOF_LENGTH = 100.0
#: Allowed Coulomb friction coefficient between object and roof [-].
FRICTION_RANGE = (0.0, 2.0)
#: Friction used for ``roof-slide`` when none is given [-]: the low end of tiles, slates and
#: tools on roof coverings (from memory, about 0.4-0.7), so that the exit speed errs high.
DEFAULT_ROOF_FRICTION = 0.4
#: Allowed ratio I/(m r^2) of a rolling body: 0 (all mass on the axis) to 1 (thin-walled tube).
INERTIA_RATIO_RANGE = (0.0, 1.0)
#: Default ratio I/(m r^2), a solid cylinder (a pipe plug, a roll of material).
DEFAULT_INERTIA_RATIO = 0.5
#: Largest magnitude of each carrier velocity component [m/s]; a hoist, hook or lift basket
#: moves far slower. Common practice, no source.
MAXIMUM_CARRIER_SPEED = 30.0

#: I/(m r^2) of common round bodies about their axis of symmetry. Halliday, Resnick & Walker,
#: Fundamentals of Physics, 10th ed. (2014), Table 10-2.
INERTIA_RATIOS: MappingProxyType[str, float] = MappingProxyType(
    {
        "solid sphere": 0.4,
        "solid cylinder": 0.5,
        "thin spherical shell": 2.0 / 3.0,
        "thin-walled tube": 1.0,
    }
)

#: A slope acceleration below this fraction of g counts as zero (pitch at the friction angle).
_ZERO_ACCELERATION = 1e-12

_CARRIER_AXES = ("east", "north", "up")


@dataclass(frozen=True)
class Release:
    """How an object leaves the edge; validated on construction.

    Parameters
    ----------
    mode : {"drop", "push", "throw", "roof-slide"}
        Release mode (the user's ``release_mode``).
    speed : float or array
        Release speed, 0..40 m/s (``release_speed``): push and throw speed, or the initial speed
        along the slope for ``roof-slide``. Must be 0 for ``drop``. [m/s]
    angle : float or array
        Elevation of a throw above the horizontal, -90..90 deg, negative downward
        (``release_angle``). Only for ``throw``. [deg]
    roof_pitch : float or array
        Roof pitch above the horizontal, 0..80 deg. Only for ``roof-slide``. [deg]
    roof_length : float or array
        Slope length the object travels down to the eave, > 0 and <= 100 m. Only for
        ``roof-slide``. [m]
    friction : float or array
        Coulomb friction coefficient between object and roof, 0..2. Only for ``roof-slide``. [-]
    rolling : bool
        The object is a round body (pipe, ball) that rolls. Only for ``roof-slide``.
    carrier_velocity : tuple of 3 floats or arrays
        Velocity of the hoist, hook or basket the object leaves (east, north, up); each
        component finite and at most 30 m/s in magnitude. Added in every mode. [m/s]
    inertia_ratio : float or array
        I/(m r^2) of a rolling body, 0..1: 0.4 solid sphere, 0.5 solid cylinder, 1.0
        thin-walled tube (see :data:`INERTIA_RATIOS`). Only with ``rolling``. [-]

    Raises
    ------
    InputError
        For a value out of range, an array that is not 1-D or not of the common length, a field
        given for a mode that does not use it, or a roof too shallow to slide on.
    UnknownObjectError
        For an unknown mode; the message lists the valid ones.
    """

    mode: str = "drop"
    speed: float | NDArray[np.float64] = 0.0
    angle: float | NDArray[np.float64] = 0.0
    roof_pitch: float | NDArray[np.float64] = 0.0
    roof_length: float | NDArray[np.float64] = 0.0
    friction: float | NDArray[np.float64] = 0.0
    rolling: bool = False
    carrier_velocity: tuple[float, float, float] = (0.0, 0.0, 0.0)
    inertia_ratio: float | NDArray[np.float64] = DEFAULT_INERTIA_RATIO

    def __post_init__(self) -> None:
        self.validate()

    def validate(self) -> None:
        """Check every field; raise InputError or UnknownObjectError naming the bad one.

        Raises
        ------
        InputError
            See the class docstring.
        UnknownObjectError
            For an unknown mode.
        """
        if self.mode not in RELEASE_MODES:
            raise UnknownObjectError(
                f"release_mode {self.mode!r} is not known; valid release modes: "
                f"{', '.join(RELEASE_MODES)}",
                field="release_mode",
            )
        speed = _as_samples("release_speed", self.speed)
        if not np.all(speed >= 0.0):  # NaN fails too
            raise InputError(
                "release_speed must be a finite speed >= 0 m/s; "
                f"got {_first_bad(speed, speed >= 0):g} m/s",
                field="release_speed",
            )
        if not np.all(speed <= MAXIMUM_RELEASE_SPEED):
            raise InputError(
                f"release_speed must be at most {MAXIMUM_RELEASE_SPEED:g} m/s (a thrown or kicked "
                "tool does not exceed this); "
                f"got {_first_bad(speed, speed <= MAXIMUM_RELEASE_SPEED):g} m/s",
                field="release_speed",
            )
        _check_range(
            "release_angle",
            self.angle,
            RELEASE_ANGLE_RANGE,
            "deg",
            " (elevation above horizontal; negative is thrown downward)",
        )
        _check_range("roof_pitch", self.roof_pitch, ROOF_PITCH_RANGE, "deg")
        _check_range("roof_length", self.roof_length, (0.0, MAXIMUM_ROOF_LENGTH), "m")
        _check_range("friction", self.friction, FRICTION_RANGE, "")
        _check_range(
            "inertia_ratio",
            self.inertia_ratio,
            INERTIA_RATIO_RANGE,
            "",
            " (0.4 solid sphere, 0.5 solid cylinder, 1.0 thin-walled tube)",
        )
        if not isinstance(self.rolling, bool | np.bool_):
            raise InputError(
                f"rolling must be true or false; got {self.rolling!r}", field="rolling"
            )
        if len(tuple(self.carrier_velocity)) != 3:
            raise InputError(
                "carrier_velocity must have 3 components (east, north, up) in m/s; "
                f"got {len(tuple(self.carrier_velocity))}",
                field="carrier_velocity",
            )
        for axis, component in zip(_CARRIER_AXES, self.carrier_velocity, strict=True):
            _check_range(
                f"carrier_velocity ({axis})",
                component,
                (-MAXIMUM_CARRIER_SPEED, MAXIMUM_CARRIER_SPEED),
                "m/s",
            )
        _broadcast_length(self._numeric_fields())
        self._check_fields_used()
        if self.mode == "roof-slide":
            _check_roof_slide(
                self.roof_pitch,
                self.roof_length,
                self.friction,
                self.speed,
                self.rolling,
                self.inertia_ratio,
            )

    def _numeric_fields(self) -> dict[str, ArrayLike]:
        fields: dict[str, ArrayLike] = {
            "release_speed": self.speed,
            "release_angle": self.angle,
            "roof_pitch": self.roof_pitch,
            "roof_length": self.roof_length,
            "friction": self.friction,
            "inertia_ratio": self.inertia_ratio,
        }
        for axis, component in zip(_CARRIER_AXES, self.carrier_velocity, strict=True):
            fields[f"carrier_velocity ({axis})"] = component
        return fields

    def _check_fields_used(self) -> None:
        """Refuse a field set for a mode that would silently ignore it."""
        unused: list[tuple[str, bool]] = []
        if self.mode == "drop":
            unused.append(("release_speed", bool(np.any(np.asarray(self.speed) != 0))))
        if self.mode != "throw":
            unused.append(("release_angle", bool(np.any(np.asarray(self.angle) != 0))))
        if self.mode != "roof-slide":
            unused += [
                ("roof_pitch", bool(np.any(np.asarray(self.roof_pitch) != 0))),
                ("roof_length", bool(np.any(np.asarray(self.roof_length) != 0))),
                ("friction", bool(np.any(np.asarray(self.friction) != 0))),
                ("rolling", bool(self.rolling)),
            ]
        if not self.rolling:
            changed = bool(np.any(np.asarray(self.inertia_ratio) != DEFAULT_INERTIA_RATIO))
            unused.append(("inertia_ratio", changed))
        for name, is_set in unused:
            if is_set:
                users = {
                    "release_speed": "with release mode push, throw or roof-slide",
                    "release_angle": "with release mode throw",
                    "inertia_ratio": "with rolling in release mode roof-slide",
                }.get(name, "with release mode roof-slide")
                remedy = "choose that release mode"
                context = ""
                if name == "inertia_ratio":
                    remedy, context = "set rolling", " without rolling"
                raise InputError(
                    f"{name} is used only {users}; got it with release mode {self.mode!r}"
                    f"{context}: remove it or {remedy}",
                    field=name,
                )


def slope_acceleration(
    roof_pitch: ArrayLike,
    friction: ArrayLike,
    gravity: ArrayLike = STANDARD_GRAVITY,
    *,
    rolling: bool = False,
    inertia_ratio: ArrayLike = DEFAULT_INERTIA_RATIO,
) -> NDArray[np.float64]:
    """Acceleration of an object along a roof slope, down-slope positive.

    Sliding block with Coulomb friction (Newton's second law along and normal to the slope):

        a = g (sin theta - mu cos theta)

    Round body rolling without slipping (k = I/(m r^2)):

        a = g sin theta / (1 + k)

    It rolls without slipping only while the friction can supply the torque,
    mu >= k tan theta / (1 + k); with less grip it slips and spins, and its centre then
    accelerates at g (sin theta - mu cos theta), which is then the larger of the two. So for a
    rolling body a = max(g sin theta / (1 + k), g (sin theta - mu cos theta)): on a frictionless
    roof (mu = 0) nothing can make it roll, and it slides at g sin theta.

    Parameters
    ----------
    roof_pitch : float or array
        Roof pitch above the horizontal. [deg]
    friction : float or array
        Coulomb friction coefficient (static and kinetic taken equal). [-]
    gravity : float or array
        Acceleration of gravity. [m/s^2]
    rolling : bool
        The object is a round body that rolls.
    inertia_ratio : float or array
        I/(m r^2) of the rolling body. [-]

    Returns
    -------
    numpy.ndarray
        Acceleration along the slope, negative if friction decelerates the object. [m/s^2]

    Notes
    -----
    Air drag on the roof and rolling resistance are neglected (both reduce the exit speed, so
    neglecting them errs towards a longer throw). Inputs are not range-checked here; use
    :func:`eave_exit_speed` or :class:`Release` for user input.

    References
    ----------
    .. [1] Halliday, Resnick & Walker, Fundamentals of Physics, 10th ed. (2014), ch. 6
       (block on an incline with friction) and ch. 11, eq. 11-10 (rolling down a ramp).
    """
    theta = np.radians(np.asarray(roof_pitch, dtype=float))
    g = np.asarray(gravity, dtype=float)
    sliding = g * (np.sin(theta) - np.asarray(friction, dtype=float) * np.cos(theta))
    if not rolling:
        return sliding
    rolled = g * np.sin(theta) / (1.0 + np.asarray(inertia_ratio, dtype=float))
    return np.maximum(rolled, sliding)


def eave_exit_speed(
    roof_pitch: ArrayLike,
    roof_length: ArrayLike,
    friction: ArrayLike,
    gravity: ArrayLike = STANDARD_GRAVITY,
    initial_speed: ArrayLike = 0.0,
    *,
    rolling: bool = False,
    inertia_ratio: ArrayLike = DEFAULT_INERTIA_RATIO,
) -> NDArray[np.float64]:
    """Speed at which an object sliding (or rolling) down a roof leaves the eave.

    v = sqrt(v0^2 + 2 a L), with a from :func:`slope_acceleration`
    (a = g (sin theta - mu cos theta) for a sliding object).

    Parameters
    ----------
    roof_pitch : float or array
        Roof pitch above the horizontal, 0..80 deg. [deg]
    roof_length : float or array
        Slope length down to the eave, > 0 and <= 100 m. [m]
    friction : float or array
        Coulomb friction coefficient between object and roof, 0..2. [-]
    gravity : float or array
        Acceleration of gravity, finite and > 0. [m/s^2]
    initial_speed : float or array
        Speed along the slope, down-slope, at the start of the slide, 0..40 m/s. [m/s]
    rolling : bool
        The object is a round body that rolls (see :func:`slope_acceleration`).
    inertia_ratio : float or array
        I/(m r^2) of the rolling body, 0..1. [-]

    Returns
    -------
    numpy.ndarray
        Exit speed along the slope at the eave. [m/s]

    Raises
    ------
    InputError
        If a value is out of range, if the object would not start to slide (roof pitch at or
        below the friction angle atan(mu) and no initial speed), or if friction stops it before
        the eave.

    Notes
    -----
    Air drag on the roof and rolling resistance are neglected: the exit speed is an upper bound.

    References
    ----------
    .. [1] Halliday, Resnick & Walker, Fundamentals of Physics, 10th ed. (2014), ch. 2
       (constant acceleration, v^2 = v0^2 + 2 a x), ch. 6 and ch. 11.
    """
    _check_range("roof_pitch", roof_pitch, ROOF_PITCH_RANGE, "deg")
    _check_range("friction", friction, FRICTION_RANGE, "")
    _check_range("inertia_ratio", inertia_ratio, INERTIA_RATIO_RANGE, "")
    _check_range("initial_speed", initial_speed, (0.0, MAXIMUM_RELEASE_SPEED), "m/s")
    g = _checked_gravity(gravity)
    names = ("roof_pitch", "roof_length", "friction", "gravity", "initial_speed", "inertia_ratio")
    values = (roof_pitch, roof_length, friction, g, initial_speed, inertia_ratio)
    _broadcast_length(dict(zip(names, values, strict=True)))
    return _check_roof_slide(
        roof_pitch, roof_length, friction, initial_speed, rolling, inertia_ratio, g
    )


def initial_velocity(
    release: Release, edge_azimuth: ArrayLike = 90.0, gravity: ArrayLike = STANDARD_GRAVITY
) -> NDArray[np.float64]:
    """Ground-frame velocity of the object as it leaves the edge.

    v = u n + w z + v_carrier, where n = (sin a, cos a, 0) is the outward edge normal and
    (u, w) the outward and upward speeds of the mode:
    drop (0, 0); push (V, 0); throw (V cos e, V sin e); roof-slide (v cos theta, -v sin theta)
    with v the eave exit speed of :func:`eave_exit_speed`.

    Parameters
    ----------
    release : Release
        The release mode and its parameters.
    edge_azimuth : float or array
        Direction the edge faces (away from the building), clockwise from north; any finite
        angle (90: east). [deg]
    gravity : float or array
        Acceleration of gravity, used for the roof slide. [m/s^2]

    Returns
    -------
    numpy.ndarray, shape (3,) or (3, n)
        Velocity east, north, up; shape (3, n) if any field or argument is an array. [m/s]

    Raises
    ------
    InputError
        For a non-finite azimuth or gravity, arrays of different lengths, or a roof slide that
        stops before the eave.
    """
    azimuth = _as_samples("edge_azimuth", edge_azimuth)
    if not np.all(np.isfinite(azimuth)):
        raise InputError(
            f"edge_azimuth must be a finite angle in deg (or a 1-D array of them); got "
            f"{_first_bad(azimuth, np.isfinite(azimuth)):g} deg",
            field="edge_azimuth",
        )
    g = _checked_gravity(gravity)
    fields = release._numeric_fields()
    fields.update({"edge_azimuth": azimuth, "gravity": g})
    _broadcast_length(fields)

    outward, upward = _MODE_SPEEDS[release.mode](release, g)
    theta = np.radians(azimuth)
    east = outward * np.sin(theta) + np.asarray(release.carrier_velocity[0], dtype=float)
    north = outward * np.cos(theta) + np.asarray(release.carrier_velocity[1], dtype=float)
    up = np.asarray(upward, dtype=float) + np.asarray(release.carrier_velocity[2], dtype=float)
    east, north, up = np.broadcast_arrays(east, north, up)
    return np.stack([east, north, up]).astype(float)


def describe(release: Release, gravity: float = STANDARD_GRAVITY) -> str:
    """One short sentence saying how the object leaves the edge, for the CLI and reports.

    Parameters
    ----------
    release : Release
        The release.
    gravity : float
        Acceleration of gravity, used for the roof-slide exit speed. [m/s^2]

    Returns
    -------
    str
        E.g. "thrown at 5.0 m/s, 30° above horizontal, away from the edge". Array fields show
        their range ("3.0-5.0 m/s").
    """
    mode = release.mode
    if mode == "drop":
        text = "dropped from rest"
    elif mode == "push":
        text = f"pushed off horizontally at {_span(release.speed, '.1f')} m/s, away from the edge"
    elif mode == "throw":
        angle = np.asarray(release.angle, dtype=float)
        if np.all(angle == 0):
            direction = "horizontally"
        elif np.all(angle > 0):
            direction = f"{_span(angle, '.0f')}° above horizontal"
        elif np.all(angle < 0):
            direction = f"{_span(-angle, '.0f')}° below horizontal"
        else:
            direction = f"at {_span(angle, '.0f')}° elevation"
        text = f"thrown at {_span(release.speed, '.1f')} m/s, {direction}, away from the edge"
    else:
        exit_speed = eave_exit_speed(
            release.roof_pitch,
            release.roof_length,
            release.friction,
            gravity,
            release.speed,
            rolling=release.rolling,
            inertia_ratio=release.inertia_ratio,
        )
        pitch = _span(release.roof_pitch, ".0f")
        if release.rolling:
            verb = "rolls"
            detail = f"I/(m r²) {_span(release.inertia_ratio, '.2f')}"
            rolled = (
                gravity
                * np.sin(np.radians(np.asarray(release.roof_pitch, dtype=float)))
                / (1.0 + np.asarray(release.inertia_ratio, dtype=float))
            )
            if np.any(slope_acceleration(release.roof_pitch, release.friction, gravity) > rolled):
                verb = "slides and spins"
                detail += f", friction {_span(release.friction, '.2f')} too low to roll"
        else:
            verb = "slides"
            detail = f"friction {_span(release.friction, '.2f')}"
        start = ""
        if np.any(np.asarray(release.speed) > 0):
            start = f" from {_span(release.speed, '.1f')} m/s"
        text = (
            f"{verb} {_span(release.roof_length, '.1f')} m down a {pitch}° roof ({detail}){start} "
            f"and leaves the eave at {_span(exit_speed, '.1f')} m/s, {pitch}° below horizontal"
        )
    carrier = [np.asarray(c, dtype=float) for c in release.carrier_velocity]
    if any(np.any(c != 0) for c in carrier):
        parts = ", ".join(
            f"{axis} {_span(c, '.1f')}" for axis, c in zip(_CARRIER_AXES, carrier, strict=True)
        )
        text += f", plus the carrier's velocity ({parts} m/s)"
    return text


# --- mode kernels: (outward speed, upward speed) in the plane of the edge normal -------------


def _drop_speeds(release: Release, gravity: NDArray[np.float64]) -> tuple[ArrayLike, ArrayLike]:
    return 0.0, 0.0


def _push_speeds(release: Release, gravity: NDArray[np.float64]) -> tuple[ArrayLike, ArrayLike]:
    return np.asarray(release.speed, dtype=float), 0.0


def _throw_speeds(release: Release, gravity: NDArray[np.float64]) -> tuple[ArrayLike, ArrayLike]:
    speed = np.asarray(release.speed, dtype=float)
    elevation = np.radians(np.asarray(release.angle, dtype=float))
    return speed * np.cos(elevation), speed * np.sin(elevation)


def _roof_slide_speeds(
    release: Release, gravity: NDArray[np.float64]
) -> tuple[ArrayLike, ArrayLike]:
    speed = _check_roof_slide(
        release.roof_pitch,
        release.roof_length,
        release.friction,
        release.speed,
        release.rolling,
        release.inertia_ratio,
        gravity,
    )
    pitch = np.radians(np.asarray(release.roof_pitch, dtype=float))
    return speed * np.cos(pitch), -speed * np.sin(pitch)


_MODE_SPEEDS: MappingProxyType[
    str, Callable[[Release, NDArray[np.float64]], tuple[ArrayLike, ArrayLike]]
] = MappingProxyType(
    {
        "drop": _drop_speeds,
        "push": _push_speeds,
        "throw": _throw_speeds,
        "roof-slide": _roof_slide_speeds,
    }
)


# --- checks ----------------------------------------------------------------------------------


def _check_range(
    name: str, value: ArrayLike, bounds: tuple[float, float], unit: str, note: str = ""
) -> NDArray[np.float64]:
    return require_range_array(name, _as_samples(name, value), *bounds, unit, note)


def _checked_gravity(gravity: ArrayLike) -> NDArray[np.float64]:
    return check_gravity(gravity)


def _broadcast_length(fields: dict[str, ArrayLike]) -> int | None:
    """Common length of the 1-D arrays among ``fields`` (None if all are scalars)."""
    length: int | None = None
    first = ""
    for name, value in fields.items():
        shape = np.shape(value)
        if len(shape) > 1:
            raise InputError(
                f"{name} must be a number or a 1-D array; got shape {shape}", field=name
            )
        if len(shape) == 1:
            if length is None:
                length, first = shape[0], name
            elif shape[0] != length:
                raise InputError(
                    f"{name} has {shape[0]} samples but {first} has {length}; arrays must have "
                    "the same length",
                    field=name,
                )
    return length


def _check_roof_slide(
    roof_pitch: ArrayLike,
    roof_length: ArrayLike,
    friction: ArrayLike,
    initial_speed: ArrayLike,
    rolling: bool,
    inertia_ratio: ArrayLike,
    gravity: ArrayLike = STANDARD_GRAVITY,
) -> NDArray[np.float64]:
    """Check that the object reaches the eave; return its exit speed [m/s]."""
    length = _as_samples("roof_length", roof_length)
    good = (length > 0) & (length <= MAXIMUM_ROOF_LENGTH)
    if not np.all(good):
        raise InputError(
            f"roof_length must be a finite length > 0 and <= {MAXIMUM_ROOF_LENGTH:g} m for "
            f"release mode 'roof-slide'; got {_first_bad(length, good):g} m",
            field="roof_length",
        )
    g = np.asarray(gravity, dtype=float)
    pitch, mu, v0, length, g, k = np.broadcast_arrays(
        np.asarray(roof_pitch, dtype=float),
        np.asarray(friction, dtype=float),
        np.asarray(initial_speed, dtype=float),
        length,
        g,
        np.asarray(inertia_ratio, dtype=float),
    )
    acceleration = slope_acceleration(pitch, mu, g, rolling=rolling, inertia_ratio=k)
    stuck = (acceleration <= _ZERO_ACCELERATION * g) & (v0 == 0)
    if np.any(stuck):
        i = np.flatnonzero(np.atleast_1d(stuck))[0]
        p, f = float(np.atleast_1d(pitch)[i]), float(np.atleast_1d(mu)[i])
        if rolling or f == 0:
            raise InputError(
                f"roof_pitch {p:g} deg is too shallow for an object to start moving (needs more "
                "than 0 deg, or a release_speed along the slope); choose another release mode",
                field="roof_pitch",
            )
        raise InputError(
            f"roof_pitch {p:g} deg is too shallow for an object to slide with friction {f:g} "
            f"(needs more than {math.degrees(math.atan(f)):.1f} deg, the friction angle "
            f"atan({f:g})); lower the friction or choose another release mode",
            field="roof_pitch",
        )
    squared = v0**2 + 2.0 * acceleration * length
    # Only a decelerating object can stop (v0^2 of a tiny v0 underflows to 0 without that).
    stops = (squared <= 0) & (acceleration < 0)
    if np.any(stops):
        i = np.flatnonzero(np.atleast_1d(stops))[0]
        a, v, s = (float(np.atleast_1d(x)[i]) for x in (acceleration, v0, length))
        raise InputError(
            f"roof_pitch {float(np.atleast_1d(pitch)[i]):g} deg with friction "
            f"{float(np.atleast_1d(mu)[i]):g}: an object starting at release_speed {v:g} m/s "
            f"stops {v * v / (-2.0 * a):.2f} m down the roof, before the eave {s:g} m away; "
            "raise release_speed, lower the friction or choose another release mode",
            field="roof_pitch",
        )
    exit_speed = np.sqrt(np.maximum(squared, 0.0))
    return np.where(acceleration >= 0, np.maximum(exit_speed, v0), exit_speed)


def _span(value: ArrayLike, spec: str) -> str:
    """Format a number, or the range of an array as "low-high"."""
    array = np.asarray(value, dtype=float)
    low, high = format(float(array.min()), spec), format(float(array.max()), spec)
    return low if low == high else f"{low}–{high}"
