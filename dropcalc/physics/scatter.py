"""How far an object travels after its first ground contact: hops, then a slide or a roll.

The trajectory engine gives the first ground contact (position, ground-frame velocity). An
exclusion zone must also cover what happens next. This module models it on flat ground, without
air drag, in three pieces, after an optional first step:

0. The first contact. A tool or fitting strikes on a corner, an edge or a protrusion, so the
   contact's effective normal is not vertical: :func:`first_rebound` reflects the impact about
   a tilted normal (the rockfall roughness-angle idea [4]_) and hands the rebound on as the
   flat-ground impact that would give it. Without it a straight drop would bounce straight up
   and never leave the spot below the edge.

1. Hops. Each rebound multiplies the normal (vertical) speed by the normal restitution e_n and
   the horizontal speed by the tangential restitution e_t (the velocity ratios of rockfall
   practice [1]_, [2]_). Hop k (k = 1, 2, ...) leaves the ground with e_n^k v_n upward and
   e_t^k v_h along, and so covers 2 (e_n^k v_n)(e_t^k v_h) / g (projectile range on flat
   ground [3]_). Hops are counted while the rebound normal speed is at least
   :data:`STOP_SPEED`; K is the number of such rebounds. The first j hops sum, as a geometric
   series with ratio r = e_n e_t, to

       B_j = (2 v_n v_h / g) r (1 - r^j) / (1 - r),

   which tends to (2 v_n v_h / g) r / (1 - r) for j -> infinity (derived).
2. Slide. Once the hopping ends, the object slides on with the horizontal speed of its last
   hop, v = e_t^j v_h, and stops after s = v^2 / (2 mu g) (constant Coulomb friction,
   [DORREN-2003] [3]_). A round object (ball, pipe, drum) instead rolls: a sphere landing
   without spin skids, with friction acting, until it rolls at (5/7) v (angular momentum about
   the contact point, derived [3]_), then rolls out against a small rolling
   resistance: s = (v^2 - (5 v / 7)^2) / (2 mu g) + (5 v / 7)^2 / (2 c_rr g).
3. Fragments. A fragile object (glass, tiles, blocks) that breaks throws fragments from the
   impact point: :func:`fragment_allowance` adds the ballistic range of a fragment leaving at a
   fraction f of the impact speed at 45 deg, (f v)^2 / g. This is an allowance, not a model.

Where the hopping ends is uncertain. The restitution ratios come from energetic impacts; at the
last, grazing contacts of a bounce sequence they overstate the tangential loss (Coulomb friction
caps it at mu (1 + e_n) times the small normal speed [3]_), so the object may turn from hopping to
sliding after any of its K counted hops. :func:`scatter_distance` therefore takes the longest
travel B_j + s(e_t^j v_h) over every turning point j = 0 ... K, and charges no tangential loss at
the contact where hopping ends (the brief's K = 0 case, a slide at v_h, is j = 0). This is
conservative, and it makes the result non-decreasing in e_n, e_t, the speeds and 1/mu, so that
the upper restitutions and the lower friction of a surface give the envelope
(:func:`scatter_upper`). Taking j = K alone would not be monotone in e_n: one more counted hop
costs a factor e_t^2 of sliding energy and can shorten the total.

Every array argument may be a float or a 1-D array (Monte Carlo samples) of one common length;
results have the broadcast shape.

References
----------
.. [1] L. K. A. Dorren, "A review of rockfall mechanics and modelling approaches", Progress in
   Physical Geography 27 (2003) 69-87, restitution coefficients by surface type (from memory,
   as quoted in [DORREN-2003]).
.. [2] K. T. Chau, R. H. C. Wong and J. J. Wu, "Coefficient of restitution and rotational
   motions of rockfall impacts", International Journal of Rock Mechanics and Mining Sciences
   39 (2002) 69-77 (from memory, as quoted in [DORREN-2003]).
.. [3] D. Halliday, R. Resnick and J. Walker, "Fundamentals of Physics", 10th ed., Wiley, 2014,
   ch. 4 (projectile range on flat ground), ch. 6 (kinetic friction), ch. 11 (rolling, angular
   momentum); chapter numbers from memory.
.. [4] T. J. Pfeiffer and T. D. Bowen, "Computer simulation of rockfalls", Bulletin of the
   Association of Engineering Geologists 26 (1989) 135-146 (from memory).
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass
from types import MappingProxyType

import numpy as np
from numpy.typing import ArrayLike, NDArray

from dropcalc.errors import InputError, UnknownObjectError, to_float
from dropcalc.physics.checks import as_samples as _as_samples
from dropcalc.physics.checks import check_gravity
from dropcalc.physics.checks import first_bad as _first_bad
from dropcalc.physics.constants import STANDARD_GRAVITY

#: Rebound normal speed below which hops are no longer counted [m/s]. Common practice, no
#: source: a rebound at 0.3 m/s rises 0.3^2 / (2 g) = 4.6 mm, and all the uncounted hops
#: together cover less than 2 (0.3 m/s) v_h / (g (1 - e_n e_t)), i.e. 0.06-0.13 m per m/s of
#: v_h for e_n e_t = 0-0.52 (the surfaces here).
STOP_SPEED = 0.3

#: Fraction of the impact speed with which fragments of a breaking object are assumed to leave
#: the impact point [-]. Common practice, no source; an allowance, not a fragmentation model.
FRAGMENT_SPEED_FRACTION = 0.3

#: Largest tilt of the effective contact normal at the first ground contact [deg]. An
#: assumption (common practice, no source): a tool, fitting or fragment strikes on a corner,
#: edge or protrusion, so it leaves the ground in a direction a flat-surface bounce would not
#: give; the tilt is the rockfall "roughness angle" idea (Pfeiffer and Bowen 1989, from memory)
#: applied to the object's own irregularity. 15 deg turns a vertical impact into a rebound
#: leaving about 20-30 deg from vertical on the surfaces here.
CONTACT_TILT_MAX = 15.0
#: Accepted values of the largest contact tilt [deg].
CONTACT_TILT_RANGE = (0.0, 45.0)

#: Share of :data:`CONTACT_TILT_MAX` that applies to round bodies that roll (tubes, pipes,
#: balls) [-]. An assumption (no source): a curved surface keeps the contact normal through the
#: body's axis or centre, so only strikes on an end or rim and the ground's own texture tilt
#: it. Without it a rolling body kicked sideways by the full tilt rolls out for tens of metres
#: on hard ground (rolling resistance 0.01-0.04).
ROUND_TILT_FRACTION = 1.0 / 3.0

#: Speed kept by a sphere landing without spin once it rolls without slipping, 1 / (1 + 2/5)
#: [-]. Derived from angular momentum about the contact point with I = (2/5) m r^2 (solid
#: sphere, Halliday, Resnick and Walker, Fundamentals of Physics, Table 10-2, from memory).
#: The solid sphere has the smallest I / (m r^2) of the common round bodies (solid cylinder
#: 1/2 -> 2/3, thin pipe 1 -> 1/2), so 5/7 is the largest, conservative, factor.
ROLLING_SPEED_FACTOR = 5.0 / 7.0


@dataclass(frozen=True)
class Surface:
    """One ground surface and the ranges of its contact coefficients.

    Attributes
    ----------
    key : str
        Name used to select the surface, e.g. ``"concrete"``.
    label : str
        Short human-readable name.
    normal_restitution : tuple of float
        Range (low, high) of the normal velocity restitution e_n. [-]
    tangential_restitution : tuple of float
        Range (low, high) of the tangential velocity restitution e_t. [-]
    friction : tuple of float
        Range (low, high) of the sliding friction coefficient mu; the low end gives the longer
        slide. [-]
    rolling_resistance : tuple of float
        Range (low, high) of the rolling-resistance coefficient c_rr, the deceleration of a body
        rolling without slipping divided by g; the low end gives the longer roll. [-]
    source : str
        Where each range comes from, marking values from memory and choices without a source.
    """

    key: str
    label: str
    normal_restitution: tuple[float, float]
    tangential_restitution: tuple[float, float]
    friction: tuple[float, float]
    rolling_resistance: tuple[float, float]
    source: str


_RESTITUTION_SOURCE = (
    "e_n, e_t: Dorren, Prog. Phys. Geogr. 27 (2003) 69-87; Chau et al., IJRMMS 39 (2002) "
    "69-77 (from memory, [DORREN-2003])"
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
                normal_restitution=(0.45, 0.55),
                tangential_restitution=(0.85, 0.95),
                friction=(0.4, 0.7),
                rolling_resistance=(0.01, 0.03),
                source=f"{_RESTITUTION_SOURCE} (concrete/rock); {_FRICTION_SOURCE}; "
                f"{_ROLLING_SOURCE}",
            ),
            Surface(
                key="asphalt",
                label="asphalt",
                normal_restitution=(0.35, 0.40),
                tangential_restitution=(0.85, 0.90),
                friction=(0.4, 0.7),
                rolling_resistance=(0.01, 0.04),
                source=f"{_RESTITUTION_SOURCE} (asphalt); {_FRICTION_SOURCE}; {_ROLLING_SOURCE}",
            ),
            Surface(
                key="compacted-soil",
                label="compacted soil",
                normal_restitution=(0.30, 0.40),
                tangential_restitution=(0.80, 0.85),
                friction=(0.4, 0.6),
                rolling_resistance=(0.03, 0.08),
                source=f"{_RESTITUTION_SOURCE} (compact soil); {_FRICTION_SOURCE}; "
                f"{_ROLLING_SOURCE}",
            ),
            Surface(
                key="gravel",
                label="loose gravel",
                normal_restitution=(0.25, 0.35),
                tangential_restitution=(0.70, 0.85),
                friction=(0.4, 0.7),
                rolling_resistance=(0.05, 0.2),
                source="e_n, e_t: chosen between compact soil (0.30-0.40, 0.80-0.85) and soft "
                "soil (0.20-0.30, 0.60-0.80) of Dorren (2003) and Chau et al. (2002) (from "
                "memory): loose stones take up energy by moving, yet a stone layer is harder "
                f"than soft soil; no source for the choice; {_FRICTION_SOURCE}; "
                f"{_ROLLING_SOURCE}",
            ),
            Surface(
                key="grass",
                label="grass",
                normal_restitution=(0.20, 0.30),
                tangential_restitution=(0.60, 0.80),
                friction=(0.3, 0.5),
                rolling_resistance=(0.05, 0.3),
                source=f"{_RESTITUTION_SOURCE} (soft soil/grass); {_FRICTION_SOURCE}; c_rr: "
                "0.05 for short mown turf (a golf ball leaving a Stimpmeter at about 1.8 m/s "
                "rolls about 3 m, from memory) to 0.3 for long grass (from memory)",
            ),
            Surface(
                key="soft-soil",
                label="soft soil",
                normal_restitution=(0.20, 0.30),
                tangential_restitution=(0.60, 0.80),
                friction=(0.4, 0.7),
                rolling_resistance=(0.1, 0.3),
                source=f"{_RESTITUTION_SOURCE} (soft soil/grass); mu and c_rr: objects sink "
                "in and plough (from memory; common practice, no source)",
            ),
        )
    }
)


@dataclass(frozen=True)
class Scatter:
    """Travel after the first ground contact (arrays of the broadcast shape of the inputs).

    Attributes
    ----------
    bounce_distance : ndarray
        Horizontal distance covered by the counted hops. [m]
    slide_distance : ndarray
        Distance slid (or skidded and rolled) after the hops. [m]
    fragment_distance : ndarray
        Fragment allowance added for a fragile object; zero otherwise. [m]
    total : ndarray
        bounce_distance + slide_distance + fragment_distance, measured from the first ground
        contact. [m]
    hops : ndarray
        Number of hops counted in bounce_distance (float; infinite only when stop_speed is 0
        and the unending hop sequence travels farthest). [-]
    """

    bounce_distance: NDArray[np.float64]
    slide_distance: NDArray[np.float64]
    fragment_distance: NDArray[np.float64]
    total: NDArray[np.float64]
    hops: NDArray[np.float64]


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
            f"surface must be one of {', '.join(surface_names())}; got {name!r}"
        ) from None


def hop_distance(
    vertical_speed: ArrayLike,
    horizontal_speed: ArrayLike,
    normal_restitution: ArrayLike,
    tangential_restitution: ArrayLike,
    hops: ArrayLike,
    *,
    gravity: ArrayLike = STANDARD_GRAVITY,
) -> NDArray[np.float64]:
    """Horizontal distance covered by the first ``hops`` rebounds on flat ground, without drag.

    B_j = (2 v_n v_h / g) r (1 - r^j) / (1 - r) with r = e_n e_t, the sum over k = 1 ... j of
    the hop lengths 2 (e_n^k v_n)(e_t^k v_h) / g; j may be infinite.

    Parameters
    ----------
    vertical_speed : float or array
        Downward speed at the first ground contact, v_n. [m/s]
    horizontal_speed : float or array
        Horizontal speed at the first ground contact, v_h. [m/s]
    normal_restitution : float or array
        Normal velocity restitution e_n, in [0, 1). [-]
    tangential_restitution : float or array
        Tangential velocity restitution e_t, in [0, 1). [-]
    hops : float or array
        Number of hops j, a whole number >= 0 or infinity. [-]
    gravity : float or array
        Acceleration of gravity. [m/s^2]

    Returns
    -------
    numpy.ndarray
        Distance covered by the hops. [m]

    Raises
    ------
    InputError
        For a negative or non-finite speed, a restitution outside [0, 1), a negative or
        fractional hop count, a gravity <= 0, or arrays of different lengths.

    References
    ----------
    derived; projectile range 2 v_x v_z / g from D. Halliday, R. Resnick and
    J. Walker, "Fundamentals of Physics", 10th ed., Wiley, 2014, ch. 4 (from memory).
    """
    v_n = _check_speed("vertical_speed", vertical_speed)
    v_h = _check_speed("horizontal_speed", horizontal_speed)
    e_n = _check_restitution("normal_restitution", normal_restitution)
    e_t = _check_restitution("tangential_restitution", tangential_restitution)
    count = _as_samples("hops", hops)
    good = (count >= 0) & ((count == np.floor(count)) | np.isposinf(count))
    if not np.all(good):
        raise InputError(
            f"hops must be a whole number >= 0 (or infinity); got {_first_bad(count, good):g}"
        )
    g = check_gravity(gravity)
    _common_length(
        vertical_speed=v_n,
        horizontal_speed=v_h,
        normal_restitution=e_n,
        tangential_restitution=e_t,
        hops=count,
        gravity=g,
    )
    return _hops_sum(2.0 * v_n * v_h / g, e_n * e_t, count)


@dataclass(frozen=True)
class Rebound:
    """The first ground contact on a tilted effective normal, as a flat-ground equivalent.

    Attributes
    ----------
    vertical_speed, horizontal_speed : numpy.ndarray
        Impact speeds (downward, horizontal) a flat contact would need to produce the same
        first rebound, e_n v_n' = u_z and e_t v_h' = u_h: feed them to
        :func:`scatter_distance`. [m/s]
    turn : numpy.ndarray
        Angle from the horizontal impact direction to the rebound's horizontal direction,
        counter-clockwise seen from above. [rad]
    """

    vertical_speed: NDArray[np.float64]
    horizontal_speed: NDArray[np.float64]
    turn: NDArray[np.float64]


def first_rebound(
    vertical_speed: ArrayLike,
    horizontal_speed: ArrayLike,
    tilt: ArrayLike,
    tilt_azimuth: ArrayLike,
    normal_restitution: ArrayLike,
    tangential_restitution: ArrayLike,
) -> Rebound:
    """Rebound from the first ground contact about a tilted effective normal.

    The impact velocity v = (v_h, 0, -v_n) (x along the horizontal impact direction) meets a
    contact whose normal n is tilted by ``tilt`` from the vertical towards ``tilt_azimuth``
    (measured from x, counter-clockwise). The normal part of v is reversed and scaled by e_n,
    the tangential part scaled by e_t (the velocity ratios of rockfall practice, [DORREN-2003]):

        v' = -e_n (v . n) n + e_t (v - (v . n) n).

    The rebound's vertical part u_z and horizontal speed u_h then go on as hops and a slide on
    flat ground (:func:`scatter_distance`), given as the flat-contact equivalent
    (u_z / e_n, u_h / e_t), each at most the impact speed. A rebound that does not rise
    (u_z <= 0) slides at once. With no tilt this is the flat contact itself; with
    e_n = e_t = 1 it is the law of reflection.

    Parameters
    ----------
    vertical_speed : float or array
        Downward speed at the first ground contact, v_n. [m/s]
    horizontal_speed : float or array
        Horizontal speed at the first ground contact, v_h. [m/s]
    tilt : float or array
        Angle of the effective contact normal from the vertical, 0..89 deg. [deg]
    tilt_azimuth : float or array
        Direction of the tilt from the horizontal impact direction. [deg]
    normal_restitution, tangential_restitution : float or array
        e_n and e_t of the surface, in [0, 1). [-]

    Returns
    -------
    Rebound
        Flat-ground equivalent speeds and the turn of the horizontal direction.

    Raises
    ------
    InputError
        For a negative or non-finite speed, a tilt outside 0..89 deg, a non-finite azimuth, a
        restitution outside [0, 1) or arrays of different lengths; the message names the field.

    References
    ----------
    T. J. Pfeiffer and T. D. Bowen, "Computer simulation of rockfalls", Bulletin of the
    Association of Engineering Geologists 26 (1989) 135-146 (a random slope angle at each
    impact for surface roughness; from memory). [DORREN-2003] (restitution).
    """
    v_n = _check_speed("vertical_speed", vertical_speed)
    v_h = _check_speed("horizontal_speed", horizontal_speed)
    theta = _as_samples("tilt", tilt)
    good = (theta >= 0.0) & (theta <= 89.0)
    if not np.all(good):
        raise InputError(f"tilt must be from 0 to 89 deg; got {_first_bad(theta, good):g} deg")
    psi = _as_samples("tilt_azimuth", tilt_azimuth)
    if not np.all(np.isfinite(psi)):
        raise InputError(
            f"tilt_azimuth must be a finite angle; got {_first_bad(psi, np.isfinite(psi)):g} deg"
        )
    e_n = _check_restitution("normal_restitution", normal_restitution)
    e_t = _check_restitution("tangential_restitution", tangential_restitution)
    _common_length(
        vertical_speed=v_n, horizontal_speed=v_h, tilt=theta, tilt_azimuth=psi,
        normal_restitution=e_n, tangential_restitution=e_t,
    )  # fmt: skip
    theta, psi = np.radians(theta), np.radians(psi)
    n_x = np.sin(theta) * np.cos(psi)
    n_y = np.sin(theta) * np.sin(psi)
    n_z = np.cos(theta)
    approach = v_h * n_x - v_n * n_z  # v . n, negative while approaching
    out_x = -e_n * approach * n_x + e_t * (v_h - approach * n_x)
    out_y = -e_n * approach * n_y + e_t * (-approach * n_y)
    out_z = -e_n * approach * n_z + e_t * (-v_n - approach * n_z)
    # The flat-ground equivalents never exceed the impact speed: nothing leaves the contact
    # faster than it arrived (and a vanishing e_n or e_t cannot blow them up).
    speed = np.hypot(v_n, v_h)
    rises = (out_z > 0.0) & (e_n > 0.0)
    horizontal_out = np.hypot(out_x, out_y)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        vertical = np.where(rises, np.minimum(out_z / np.where(rises, e_n, 1.0), speed), 0.0)
        horizontal = np.where(
            e_t > 0, np.minimum(horizontal_out / np.where(e_t > 0, e_t, 1.0), speed), v_h
        )
    turn = np.where(horizontal_out > 0.0, np.arctan2(out_y, out_x), 0.0)
    return Rebound(vertical, horizontal, turn)


def scatter_distance(
    vertical_speed: ArrayLike,
    horizontal_speed: ArrayLike,
    normal_restitution: ArrayLike,
    tangential_restitution: ArrayLike,
    friction: ArrayLike,
    *,
    gravity: ArrayLike = STANDARD_GRAVITY,
    rolls: bool = False,
    rolling_resistance: ArrayLike | None = None,
    stop_speed: ArrayLike = STOP_SPEED,
    fragile: bool = False,
) -> Scatter:
    """Distance travelled after the first ground contact: hops, then a slide or a roll.

    total = max over j = 0 ... K of [B_j + s(e_t^j v_h)] (+ fragment allowance), with
    B_j = (2 v_n v_h / g) r (1 - r^j) / (1 - r), r = e_n e_t, the first j hops;
    K = number of rebounds k >= 1 with e_n^k v_n >= stop_speed;
    s(v) = v^2 / (2 mu g) for a slide, or
    s(v) = (v^2 - (5 v / 7)^2) / (2 mu g) + (5 v / 7)^2 / (2 c_rr g) for a round body that
    skids until it rolls, then rolls out.

    Parameters
    ----------
    vertical_speed : float or array
        Downward speed at the first ground contact, v_n. [m/s]
    horizontal_speed : float or array
        Horizontal speed at the first ground contact (ground frame), v_h. [m/s]
    normal_restitution : float or array
        Normal velocity restitution e_n of the surface, in [0, 1). [-]
    tangential_restitution : float or array
        Tangential velocity restitution e_t of the surface, in [0, 1). [-]
    friction : float or array
        Sliding friction coefficient mu, > 0. [-]
    gravity : float or array
        Acceleration of gravity. [m/s^2]
    rolls : bool
        True for balls, pipes, drums and other round items that roll after the hops.
    rolling_resistance : float or array, optional
        Rolling-resistance coefficient c_rr (rolling deceleration / g), > 0; required when
        ``rolls`` is true, ignored otherwise. [-]
    stop_speed : float or array
        Rebound normal speed below which hops are no longer counted, >= 0; 0 counts the
        unending geometric sequence. [m/s]
    fragile : bool
        True for objects that break (glass, tiles, blocks): adds
        :func:`fragment_allowance` of the impact speed sqrt(v_n^2 + v_h^2).

    Returns
    -------
    Scatter
        Bounce, slide, fragment and total distances and the number of hops counted.

    Raises
    ------
    InputError
        For a negative or non-finite speed, a restitution outside [0, 1), a friction or
        rolling resistance <= 0, a missing rolling resistance with ``rolls``, a negative stop
        speed, a gravity <= 0, or arrays of different lengths. The message names the field.

    Notes
    -----
    Flat, level, uniform ground; no air drag after the first contact; no spin except the
    rolling of round bodies; the object keeps its direction. The contact at which the hopping
    ends is charged no tangential loss, and the turning point j is the one giving the longest
    travel; both are conservative (see the module docstring). The turning point that maximises
    B_j + C t^j (t = e_t^2, C = s(v_h)) is found in closed form: the continuous maximum lies at
    j_c = ln(B_inf ln r / (C ln t)) / ln(t / r); the integer maximum is at 0, K or next to
    j_c.

    References
    ----------
    [DORREN-2003]; L. K. A. Dorren, Progress in Physical Geography 27 (2003) 69-87 and
    K. T. Chau et al., IJRMMS 39 (2002) 69-77 (restitution, from memory); D. Halliday,
    R. Resnick and J. Walker, "Fundamentals of Physics", 10th ed., Wiley, 2014, ch. 4, 6, 11
    (projectile range, kinetic friction, rolling; from memory).
    """
    v_n = _check_speed("vertical_speed", vertical_speed)
    v_h = _check_speed("horizontal_speed", horizontal_speed)
    e_n = _check_restitution("normal_restitution", normal_restitution)
    e_t = _check_restitution("tangential_restitution", tangential_restitution)
    mu = _check_positive("friction", friction, "")
    g = check_gravity(gravity)
    stop = _as_samples("stop_speed", stop_speed)
    good = np.isfinite(stop) & (stop >= 0)
    if not np.all(good):
        raise InputError(
            f"stop_speed must be a finite speed >= 0 m/s; got {_first_bad(stop, good):g} m/s"
        )
    fields = {
        "vertical_speed": v_n,
        "horizontal_speed": v_h,
        "normal_restitution": e_n,
        "tangential_restitution": e_t,
        "friction": mu,
        "gravity": g,
        "stop_speed": stop,
    }
    if not isinstance(rolls, bool | np.bool_):
        raise InputError(f"rolls must be true or false; got {rolls!r}")
    if not isinstance(fragile, bool | np.bool_):
        raise InputError(f"fragile must be true or false; got {fragile!r}")
    if rolls:
        if rolling_resistance is None:
            raise InputError("rolling_resistance must be given (> 0) when rolls is true")
        c_rr = _check_positive("rolling_resistance", rolling_resistance, "")
        fields["rolling_resistance"] = c_rr
        # Skid at mu g from v to (5/7) v, then roll out at c_rr g.
        rolled = ROLLING_SPEED_FACTOR**2
        slide_per_speed_squared = (1.0 - rolled) / (2.0 * mu * g) + rolled / (2.0 * c_rr * g)
    else:
        slide_per_speed_squared = 1.0 / (2.0 * mu * g)
    _common_length(**fields)

    rebounds = _rebound_count(v_n, e_n, stop)
    hop_scale = 2.0 * v_n * v_h / g  # 2 v_n v_h / g
    ratio = e_n * e_t  # r
    shrink = e_t * e_t  # t: the slide length scales with (e_t^j v_h)^2
    slide_scale = slide_per_speed_squared * v_h * v_h  # C = s(v_h)

    candidates = _turning_point_candidates(hop_scale, ratio, shrink, slide_scale, rebounds)
    bounces = _hops_sum(hop_scale, ratio, candidates)
    with np.errstate(invalid="ignore"):
        # t^j with t = 0 and j = 0 is 1 (numpy agrees); t^inf = 0 since t < 1.
        slides = slide_scale * shrink**candidates
    best = np.argmax(bounces + slides, axis=0)
    pick = np.expand_dims(best, 0)
    bounce = np.take_along_axis(bounces, pick, 0)[0]
    slide = np.take_along_axis(slides, pick, 0)[0]
    hops = np.take_along_axis(candidates, pick, 0)[0]
    if fragile:
        fragments = _fragment_range(np.hypot(v_n, v_h), g, FRAGMENT_SPEED_FRACTION)
    else:
        fragments = np.zeros_like(bounce)
    shape = np.broadcast_shapes(*(np.shape(value) for value in fields.values()))
    bounce, slide, fragments, hops = (
        np.broadcast_to(value, shape).astype(float) for value in (bounce, slide, fragments, hops)
    )
    return Scatter(
        bounce_distance=bounce,
        slide_distance=slide,
        fragment_distance=fragments,
        total=np.asarray(bounce + slide + fragments),
        hops=hops,
    )


def scatter_upper(
    vertical_speed: ArrayLike,
    horizontal_speed: ArrayLike,
    ground: str | Surface,
    *,
    gravity: ArrayLike = STANDARD_GRAVITY,
    rolls: bool = False,
    stop_speed: ArrayLike = STOP_SPEED,
    fragile: bool = False,
) -> Scatter:
    """Conservative scatter on a surface: upper e_n and e_t, lower friction and rolling resistance.

    Because :func:`scatter_distance` is non-decreasing in e_n and e_t and non-increasing in mu
    and c_rr, these ends of the surface's ranges give the largest distance within them; this is
    the value for the deterministic (worst-case) envelope.

    Parameters
    ----------
    vertical_speed : float or array
        Downward speed at the first ground contact. [m/s]
    horizontal_speed : float or array
        Horizontal speed at the first ground contact (ground frame). [m/s]
    ground : str or Surface
        The surface, a key of :data:`SURFACES` or a :class:`Surface`.
    gravity : float or array
        Acceleration of gravity. [m/s^2]
    rolls : bool
        True for round items that roll after the hops.
    stop_speed : float or array
        Rebound normal speed below which hops are no longer counted. [m/s]
    fragile : bool
        True for objects that break: adds the fragment allowance.

    Returns
    -------
    Scatter
        As :func:`scatter_distance`.

    Raises
    ------
    UnknownObjectError
        For an unknown surface name.
    InputError
        As :func:`scatter_distance`.
    """
    chosen = surface(ground)
    return scatter_distance(
        vertical_speed,
        horizontal_speed,
        chosen.normal_restitution[1],
        chosen.tangential_restitution[1],
        chosen.friction[0],
        gravity=gravity,
        rolls=rolls,
        rolling_resistance=chosen.rolling_resistance[0],
        stop_speed=stop_speed,
        fragile=fragile,
    )


def sample_surface(
    ground: str | Surface, n: int, rng: np.random.Generator
) -> tuple[NDArray[np.float64], NDArray[np.float64], NDArray[np.float64]]:
    """Draw n (e_n, e_t, mu) triples uniformly and independently within a surface's ranges.

    Parameters
    ----------
    ground : str or Surface
        The surface, a key of :data:`SURFACES` or a :class:`Surface`.
    n : int
        Number of samples, >= 1. [-]
    rng : numpy.random.Generator
        Random generator (drawn in the order e_n, e_t, mu).

    Returns
    -------
    tuple of numpy.ndarray
        Normal restitution, tangential restitution and friction coefficient, each shape (n,).

    Raises
    ------
    UnknownObjectError
        For an unknown surface name.
    InputError
        If n is not a whole number >= 1.

    Notes
    -----
    The published material gives ranges, not distributions; uniform sampling within them is a
    choice (common practice, no source). Use :func:`sample_rolling_resistance` for round items.
    """
    chosen = surface(ground)
    count = _check_count(n)
    e_n = rng.uniform(*chosen.normal_restitution, size=count)
    e_t = rng.uniform(*chosen.tangential_restitution, size=count)
    mu = rng.uniform(*chosen.friction, size=count)
    return e_n, e_t, mu


def sample_rolling_resistance(
    ground: str | Surface, n: int, rng: np.random.Generator
) -> NDArray[np.float64]:
    """Draw n rolling-resistance coefficients uniformly within a surface's range.

    Parameters
    ----------
    ground : str or Surface
        The surface, a key of :data:`SURFACES` or a :class:`Surface`.
    n : int
        Number of samples, >= 1. [-]
    rng : numpy.random.Generator
        Random generator.

    Returns
    -------
    numpy.ndarray
        Rolling-resistance coefficients c_rr, shape (n,). [-]

    Raises
    ------
    UnknownObjectError
        For an unknown surface name.
    InputError
        If n is not a whole number >= 1.
    """
    chosen = surface(ground)
    return rng.uniform(*chosen.rolling_resistance, size=_check_count(n))


def fragment_allowance(
    impact_speed: ArrayLike,
    *,
    gravity: ArrayLike = STANDARD_GRAVITY,
    speed_fraction: float = FRAGMENT_SPEED_FRACTION,
) -> NDArray[np.float64]:
    """Allowance for fragments thrown from the impact point by a fragile object that breaks.

    d = (f v)^2 / g, the flat-ground range of a fragment leaving at f times the impact speed at
    45 deg (the angle of the longest range).

    Parameters
    ----------
    impact_speed : float or array
        Speed at the first ground contact. [m/s]
    gravity : float or array
        Acceleration of gravity. [m/s^2]
    speed_fraction : float
        Fraction f of the impact speed given to the fragments, in (0, 1]. [-]

    Returns
    -------
    numpy.ndarray
        Distance from the impact point to be added for fragments. [m]

    Raises
    ------
    InputError
        For a negative or non-finite speed, a gravity <= 0 or a fraction outside (0, 1].

    Notes
    -----
    An allowance, not a model: fragment speeds depend on the material, the shape and how it
    breaks, and no published value is used. f = 0.3 (:data:`FRAGMENT_SPEED_FRACTION`) is common
    practice, no source. Air drag, which shortens the flight of light fragments, is neglected.

    References
    ----------
    Range of a projectile on flat ground, v^2 sin(2 theta) / g: D. Halliday, R. Resnick and
    J. Walker, "Fundamentals of Physics", 10th ed., Wiley, 2014, ch. 4 (from memory).
    """
    speed = _check_speed("impact_speed", impact_speed)
    g = check_gravity(gravity)
    fraction = to_float("speed_fraction", speed_fraction)
    if not 0.0 < fraction <= 1.0:
        raise InputError(f"speed_fraction must be in (0, 1]; got {fraction:g}")
    _common_length(impact_speed=speed, gravity=g)
    return _fragment_range(speed, g, fraction)


# --- kernels ---------------------------------------------------------------------------------


def _hops_sum(hop_scale: NDArray, ratio: NDArray, hops: NDArray) -> NDArray[np.float64]:
    """B_j = A r (1 - r^j) / (1 - r); r < 1 always (both restitutions are < 1)."""
    with np.errstate(invalid="ignore"):
        # 0^0 = 1 and r^inf = 0 for 0 <= r < 1.
        return hop_scale * ratio * (1.0 - ratio**hops) / (1.0 - ratio)


def _rebound_count(v_n: NDArray, e_n: NDArray, stop: NDArray) -> NDArray[np.float64]:
    """K = number of k >= 1 with e_n^k v_n >= stop (infinite for stop = 0, e_n > 0, v_n > 0)."""
    bounces = (e_n > 0) & (v_n > 0)
    with np.errstate(divide="ignore", invalid="ignore"):
        # e_n^k v_n >= s  <=>  k <= ln(s / v_n) / ln(e_n)  (ln e_n < 0).
        # (logs taken apart: stop / v_n of a subnormal stop speed would underflow to 0)
        limit = (np.log(stop) - np.log(v_n)) / np.log(e_n)
        # A relative 1e-9 keeps the boundary case e_n^k v_n = s (in exact arithmetic) counted.
        count = np.floor(limit * (1.0 + 1e-9) + 1e-9)
    count = np.where(bounces & (stop == 0), np.inf, count)
    return np.where(bounces, np.maximum(count, 0.0), 0.0)


def _turning_point_candidates(
    hop_scale: NDArray, ratio: NDArray, shrink: NDArray, slide_scale: NDArray, rebounds: NDArray
) -> NDArray[np.float64]:
    """Hop counts j among which B_j + C t^j is largest, stacked on a new first axis.

    f(j) = B_inf - B_inf r^j + C t^j with B_inf = A r / (1 - r). Its derivative divided by r^j,
    C (t/r)^j ln t - B_inf ln r, is monotone in j, so f has at most one interior extremum, at
    j_c = ln(B_inf ln r / (C ln t)) / ln(t / r): the integer maximum is at 0, K, floor(j_c) or
    floor(j_c) + 1 (the last two clipped to [0, K]).
    """
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        b_inf = hop_scale * ratio / (1.0 - ratio)
        critical = np.log(b_inf * np.log(ratio) / (slide_scale * np.log(shrink))) / np.log(
            shrink / ratio
        )
    critical = np.where(np.isfinite(critical), critical, 0.0)
    below = np.clip(np.floor(critical), 0.0, rebounds)
    above = np.clip(np.floor(critical) + 1.0, 0.0, rebounds)
    # K first so that ties (e.g. v_h = 0) report every counted hop.
    return np.stack(np.broadcast_arrays(rebounds, below, above, np.zeros_like(rebounds))).astype(
        float
    )


def _fragment_range(speed: NDArray, g: NDArray, fraction: float) -> NDArray[np.float64]:
    return (fraction * speed) ** 2 / g


# --- checks ----------------------------------------------------------------------------------


#: Impact speeds accepted [m/s]: far above any fall on a site; beyond it is an input mistake.
MAX_IMPACT_SPEED = 1000.0
#: Friction and rolling-resistance coefficients accepted [-].
COEFFICIENT_RANGE = (1e-4, 1e12)


def _check_speed(name: str, value: ArrayLike) -> NDArray[np.float64]:
    array = _as_samples(name, value)
    good = (array >= 0) & (array <= MAX_IMPACT_SPEED)  # NaN compares False
    if not np.all(good):
        raise InputError(
            f"{name} must be a finite speed from 0 to {MAX_IMPACT_SPEED:g} m/s; "
            f"got {_first_bad(array, good):g} m/s"
        )
    # Speeds below a nanometre per second are zero for every purpose here (and would
    # underflow in the hop series).
    return np.where(array < 1e-9, 0.0, array)


def _check_restitution(name: str, value: ArrayLike) -> NDArray[np.float64]:
    array = _as_samples(name, value)
    good = (array >= 0) & (array < 1)  # NaN compares False
    if not np.all(good):
        raise InputError(f"{name} must be in [0, 1); got {_first_bad(array, good):g}")
    return array


def _check_positive(name: str, value: ArrayLike, unit: str) -> NDArray[np.float64]:
    array = _as_samples(name, value)
    good = (array >= COEFFICIENT_RANGE[0]) & (array <= COEFFICIENT_RANGE[1])
    if not np.all(good):
        unit = f" {unit}" if unit else ""
        raise InputError(
            f"{name} must be finite and > 0{unit} (from {COEFFICIENT_RANGE[0]:g} to "
            f"{COEFFICIENT_RANGE[1]:g}); got {_first_bad(array, good):g}{unit}"
        )
    return array


def _check_count(n: int) -> int:
    if isinstance(n, bool) or not isinstance(n, int | np.integer) or n < 1:
        raise InputError(f"n must be a whole number >= 1; got {n!r}")
    return int(n)


def _common_length(**fields: NDArray) -> None:
    """Raise InputError unless the 1-D arrays among ``fields`` share one length."""
    length: int | None = None
    first = ""
    for name, value in fields.items():
        if np.ndim(value) == 1:
            if length is None:
                length, first = len(value), name
            elif len(value) != length:
                raise InputError(
                    f"{name} has {len(value)} samples but {first} has {length}; arrays must "
                    "have the same length"
                )
