"""The first ground contact as a planar rigid-body impact with friction, and what follows it.

An object that reaches the ground at a random orientation strikes on a corner, an edge, the end
of a tube or a face. This module resolves that strike with the mechanics of rigid-body impact
with Coulomb friction and restitution [BRACH-1991], [STRONGE-2000], vectorised over Monte
Carlo samples:

1. **Where it touches.** The orientation at the contact is uniformly random over all rotations
   (the tumbling body of the drag model: Cauchy's mean projected area S/4 [VOUK-1948]
   is the average over exactly these orientations). The contact point C is the lowest point of
   the shape class (box, plate and irregular as their bounding box, cylinder, tube, sphere);
   its offset from the centre of mass G gives the lever arm.
2. **The impact.** The impact is solved in the vertical plane through G and C (planar impact,
   [BRACH-1991] ch. 4, [STRONGE-2000] ch. 4) along the normal impulse p, the contact point's
   velocity changing linearly with p while it slips in one direction or sticks:

       d c / d p = W (f, 1),  W = [[1 + r_n^2 / k^2, -r_t r_n / k^2],
                                   [-r_t r_n / k^2, 1 + r_t^2 / k^2]]   (per unit mass)

   with f = -mu sign(c_t) while slipping and f = -W_tn / W_tt while sticking. The contact
   sticks once slip stops if mu W_tt >= |W_tn| (the sticking condition, [STRONGE-2000] §4.3,
   [KELLER-1986]), otherwise it slips back. Compression ends when the normal velocity of C is
   zero; the restitution phase ends when the normal force has returned e^2 of the work it took in
   compression (Stronge's energetic coefficient of restitution, [STRONGE-2000] §4.2), which, unlike
   Newton's kinematic coefficient, never creates energy when slip stops or reverses. A strike
   off the line through G makes the body jump and spin sideways; a centred strike (a sphere, a
   tube landing flat) does not.
3. **Afterwards.** The body flies ballistically (no drag) while its struck point is off the
   ground and lands again, now flat on its
   largest face or on its side (an assumption: the first contact carries the random
   orientation, later contacts are centred), with the spin it carries. Hops are counted while
   the rebound speed is at least :data:`STOP_SPEED`; then the body slides to rest against
   Coulomb friction, or a round body skids until it rolls at v / (1 + I / (m r^2)) and rolls
   out against the ground's rolling resistance ([HRW-2011]), on level ground or down a slope.
4. **Breaking.** An object of a brittle material whose impact speed exceeds its breaking speed
   does not bounce whole: it breaks, and its fragments fly from the impact point
   (:func:`fragment_travel`).

Restitution depends on the object's material class and the ground, and falls with the normal
impact speed as v^(-1/4) above a reference speed (the elastic-plastic trend of [JOHNSON-1985]
§11.4): :func:`normal_restitution` and the table :data:`MATERIALS`.

References
----------
[BRACH-1991], [STRONGE-2000], [KELLER-1986], [HRW-2011], [JOHNSON-1985] (docs/references.md).
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass
from types import MappingProxyType

import numpy as np
from numpy.typing import NDArray

from dropcalc.errors import UnknownObjectError

FloatArray = NDArray[np.float64]

#: Rebound vertical speed below which hops are no longer counted [m/s]. Common practice, no
#: source: a rebound at 0.3 m/s rises 0.3^2 / (2 g) = 4.6 mm.
STOP_SPEED = 0.3

#: Most contacts followed after the first (hops) [-]. With the restitutions here (at most 0.7,
#: falling with speed) the rebound speed after 8 contacts is below 0.7^8 = 6 % of the impact's,
#: and the hops left are shorter than the resolution of any zone.
MAX_LATER_CONTACTS = 8

#: Normal impact speed at which the tabulated restitutions apply [m/s]: a 1 m drop,
#: sqrt(2 g 1 m) (the drop height of the bench tests the values are remembered from).
REFERENCE_SPEED = 4.43

#: Exponent of the fall of the normal restitution with impact speed above
#: :data:`REFERENCE_SPEED` [-]: e proportional to v^(-1/4) in elastic-plastic impact ([JOHNSON-1985]
#: §11.4, from memory).
RESTITUTION_SPEED_EXPONENT = -0.25


@dataclass(frozen=True)
class Material:
    """A material class of dropped objects and its contact properties.

    Attributes
    ----------
    key : str
        Name used in the object library (``material = "metal"``).
    label : str
        Short human-readable name.
    restitution : tuple of float
        Range (low, high) of the normal restitution on concrete at :data:`REFERENCE_SPEED`. [-]
    restitution_source : str
        Where the range comes from.
    break_speed : float or None
        Impact speed above which an object of this class flagged fragile breaks instead of
        bouncing whole; None where the class does not break. [m/s]
    break_source : str
        Where the breaking speed comes from.
    """

    key: str
    label: str
    restitution: tuple[float, float]
    restitution_source: str
    break_speed: float | None
    break_source: str


#: The material classes, by key. Restitutions on concrete at a 1 m drop (REFERENCE_SPEED).
MATERIALS: Mapping[str, Material] = MappingProxyType(
    {
        item.key: item
        for item in (
            Material(
                "metal",
                "steel or aluminium tool, fitting or tube",
                (0.4, 0.7),
                "from memory: hardened steel balls dropped on a concrete floor rebound with "
                "e about 0.6-0.8; tools and tubes strike on edges and corners that dent, so the "
                "range is taken lower (no published value for tools)",
                None,
                "metal parts do not break on a fall from a work height (common practice)",
            ),
            Material(
                "timber",
                "timber, plywood, board",
                (0.3, 0.5),
                "from memory: wooden balls and blocks on concrete, e about 0.4-0.6 at low "
                "speed; boards land on edges that crush (no published value)",
                None,
                "timber splits rather than shatters (common practice)",
            ),
            Material(
                "masonry",
                "brick, block, concrete, stone, ceramic tile, slate, mortar",
                (0.1, 0.3),
                "from memory: a brick or tile that survives a drop on concrete barely bounces "
                "(chips and crushes at the contact); no published value",
                6.3,
                "common practice, no source: bricks, blocks and tiles dropped about 2 m "
                "(6.3 m/s) onto concrete usually break",
            ),
            Material(
                "glass",
                "glass, ice",
                (0.2, 0.5),
                "from memory: glass and ice bounce at low speed; no published value",
                3.1,
                "common practice, no source: glass panes and ice plates break when dropped "
                "about 0.5 m (3.1 m/s) onto a hard floor",
            ),
            Material(
                "plastic",
                "plastic-cased device, helmet",
                (0.3, 0.6),
                "from memory: hard plastic cases and helmets bounce on concrete, e about "
                "0.3-0.6 at low speed; no published value",
                None,
                "cases crack but the object stays in one piece (common practice)",
            ),
            Material(
                "soft",
                "bagged or soft load (cement bag, tool bag, bucket of mortar)",
                (0.0, 0.1),
                "common practice, no source: a bag of cement or a full tool bag lands with a "
                "thud and does not bounce",
                None,
                "bags split but the contents do not fly (common practice)",
            ),
        )
    }
)

#: Material assumed for a custom object with none given: metal has the highest restitution
#: of the classes that do not break, the conservative choice.
DEFAULT_MATERIAL = "metal"

#: Fraction of the impact speed with which fragments of a breaking object leave the impact
#: point, (low, high) of a uniform spread [-]. Common practice, no source: the earlier
#: fragment allowance used 0.3 as its one value; here it is the top of the spread, and the
#: sensitivity output shows how much of the distance rests on it.
FRAGMENT_SPEED_FRACTION = (0.1, 0.3)

#: Launch elevation of fragments above the ground, (low, high) of a uniform spread [deg].
#: An assumption (no source): pieces of a body breaking on a flat surface leave low, within
#: the upper quarter-space; 45 deg (the longest throw) lies inside the range.
FRAGMENT_ANGLE = (0.0, 60.0)


def material(name: str | Material) -> Material:
    """Look up a material class by key; a :class:`Material` is returned unchanged.

    Raises
    ------
    UnknownObjectError
        If the name is not known; the message lists the valid keys.
    """
    if isinstance(name, Material):
        return name
    key = str(name).strip().lower()
    try:
        return MATERIALS[key]
    except KeyError:
        raise UnknownObjectError(
            f"material must be one of {', '.join(MATERIALS)}; got {name!r}"
        ) from None


def normal_restitution(reference: FloatArray, speed: FloatArray) -> FloatArray:
    """Normal restitution at a normal impact speed, from its value at the reference speed.

    e(v) = e_ref min(1, (v / v_ref)^(-1/4)), the elastic-plastic trend of [JOHNSON-1985]
    (§11.4, from memory) above v_ref = :data:`REFERENCE_SPEED`, constant below it (the
    tabulated values already hold at low speed).

    Parameters
    ----------
    reference : float or array
        e at the reference speed (material range times the ground's factor). [-]
    speed : float or array
        Normal approach speed of the contact point. [m/s]

    Returns
    -------
    numpy.ndarray
        e at the speed, never above ``reference``. [-]
    """
    ratio = np.maximum(np.asarray(speed, dtype=float), REFERENCE_SPEED) / REFERENCE_SPEED
    return np.asarray(reference, dtype=float) * ratio**RESTITUTION_SPEED_EXPONENT


# --- body geometry ---------------------------------------------------------------------------


@dataclass(frozen=True)
class Body:
    """Contact geometry of a shape class (SI; built by :func:`body`).

    Attributes
    ----------
    shape : str
        ``box`` (box, plate and irregular as their bounding box), ``cylinder`` (cylinder and
        tube: a round bar along the body z axis) or ``sphere``.
    half_extents : tuple of float
        Box: the three half edges; cylinder: (radius, radius, half length); sphere: radius x 3.
        [m]
    gyration : tuple of float
        Squared radii of gyration about the body axes, I_i / m. [m^2]
    rest_radius : float
        Height of the centre of mass above the ground when the body lies flat on its largest
        face or on its side (later contacts). [m]
    rolling_inertia : float or None
        I / (m r^2) about the axis it rolls on for round bodies (sphere 2/5, solid cylinder 1/2,
        tube (1 + (r_i / r_o)^2) / 2); None for bodies that do not roll. [-]
    """

    shape: str
    half_extents: tuple[float, float, float]
    gyration: tuple[float, float, float]
    rest_radius: float
    rolling_inertia: float | None


def body(shape: str, dimensions: Mapping[str, float]) -> Body:
    """The contact geometry of a library shape class and its dimensions [m].

    Moments of inertia of uniform solids ([HRW-2011], from memory): box I_x = m (b^2 + c^2) / 12
    for edges a, b, c; solid cylinder about its axis m r^2 / 2, across it m (3 r^2 + L^2) / 12;
    thick tube about its axis m (r_o^2 + r_i^2) / 2, across it m (3 (r_o^2 + r_i^2) + L^2) / 12;
    solid sphere 2 m r^2 / 5. An irregular body is taken as its uniform bounding box (an
    assumption: its mass is spread over the box).
    """
    if shape in ("box", "plate", "irregular"):
        if shape == "plate":
            edges = (dimensions["length"], dimensions["width"], dimensions["thickness"])
        else:
            edges = (dimensions["length"], dimensions["width"], dimensions["height"])
        a, b, c = (float(x) for x in edges)
        gyration = ((b * b + c * c) / 12.0, (a * a + c * c) / 12.0, (a * a + b * b) / 12.0)
        return Body("box", (a / 2, b / 2, c / 2), gyration, min(a, b, c) / 2, None)
    if shape in ("cylinder", "tube"):
        length = float(dimensions["length"])
        if shape == "tube":
            outer = float(dimensions["outer_diameter"]) / 2
            inner = max(outer - float(dimensions["wall_thickness"]), 0.0)
        else:
            outer, inner = float(dimensions["diameter"]) / 2, 0.0
        square = outer * outer + inner * inner
        across = (3.0 * square + length * length) / 12.0
        return Body(
            "cylinder", (outer, outer, length / 2), (across, across, square / 2.0), outer,
            square / (2.0 * outer * outer),
        )  # fmt: skip
    if shape == "sphere":
        radius = float(dimensions["diameter"]) / 2
        square = 0.4 * radius * radius
        return Body("sphere", (radius,) * 3, (square,) * 3, radius, 0.4)
    raise UnknownObjectError(
        f"shape must be a shape class of the library; got {shape!r}", field="shape"
    )


def cube_body(drag_area: float) -> Body:
    """Contact geometry assumed for a custom object known only by its drag area.

    A cube whose face gives the largest drag area with C_d = 1.05 (cube face on, [WHITE-FM]
    table 7.2): edge sqrt(A / 1.05). An assumption; name a shape class for a better answer.
    """
    edge = float(np.sqrt(drag_area / 1.05))
    return body("box", {"length": edge, "width": edge, "height": edge})


# --- orientations ----------------------------------------------------------------------------


def orientations(down: FloatArray, spin: FloatArray) -> FloatArray:
    """Rotation matrices (n, 3, 3), body to world, from the body-frame down direction and a turn.

    Row 3 of R is minus the body-frame direction that points down; rows 1 and 2 are the
    body-frame directions of world east and north, turned by ``spin`` about the vertical. With
    ``down`` uniform on the sphere and ``spin`` uniform in [0, 2 pi) R is uniform over all
    rotations.

    Parameters
    ----------
    down : array (3, n)
        Unit vectors in the body frame pointing down (world -z). [-]
    spin : array (n,)
        Turn about the vertical. [rad]
    """
    d = np.asarray(down, dtype=float)
    up = -d
    # A unit vector normal to ``up``: cross it with the body axis it is least aligned with.
    helper = np.zeros_like(up)
    least = np.argmin(np.abs(up), axis=0)
    helper[least, np.arange(up.shape[1])] = 1.0
    p = np.cross(helper, up, axis=0)
    p /= np.linalg.norm(p, axis=0)
    q = np.cross(up, p, axis=0)
    east = np.cos(spin) * p + np.sin(spin) * q
    north = np.cross(up, east, axis=0)
    return np.stack([east.T, north.T, up.T], axis=1)


def random_orientations(n: int, rng: np.random.Generator) -> FloatArray:
    """Rotation matrices uniform over all rotations (the tumbling attitude at the contact).

    A unit quaternion with four independent standard normal components, normalised, is
    uniform on the rotation group ([SHOEMAKE-1992], from memory); R is its rotation matrix.
    """
    w, x, y, z = rng.standard_normal((4, n))
    norm = 2.0 / (w * w + x * x + y * y + z * z)
    xx, yy, zz = x * x * norm, y * y * norm, z * z * norm
    xy, xz, yz = x * y * norm, x * z * norm, y * z * norm
    wx, wy, wz = w * x * norm, w * y * norm, w * z * norm
    rotation = np.empty((n, 3, 3))
    rotation[:, 0, 0] = 1.0 - yy - zz
    rotation[:, 0, 1] = xy - wz
    rotation[:, 0, 2] = xz + wy
    rotation[:, 1, 0] = xy + wz
    rotation[:, 1, 1] = 1.0 - xx - zz
    rotation[:, 1, 2] = yz - wx
    rotation[:, 2, 0] = xz - wy
    rotation[:, 2, 1] = yz + wx
    rotation[:, 2, 2] = 1.0 - xx - yy
    return rotation


@dataclass(frozen=True)
class ContactPoint:
    """The lowest point of an oriented body and the inertia of the impact plane (arrays (n,)).

    Attributes
    ----------
    lever : ndarray
        Horizontal distance from the centre of mass to the contact point, r_t >= 0. [m]
    depth : ndarray
        Vertical offset of the contact point from the centre of mass, r_n < 0. [m]
    direction : ndarray (2, n)
        Unit horizontal vector (east, north) from the centre of mass towards the contact point;
        the impact plane contains it. [-]
    gyration : ndarray
        k^2 = I / m about the horizontal axis normal to the impact plane. [m^2]
    """

    lever: FloatArray
    depth: FloatArray
    direction: FloatArray
    gyration: FloatArray


def contact_point(shape: Body, rotation: FloatArray, heading: FloatArray) -> ContactPoint:
    """Lowest point of the body at each orientation and the impact plane through it.

    Parameters
    ----------
    shape : Body
        The body.
    rotation : array (n, 3, 3)
        Body-to-world rotations.
    heading : array (2, n)
        Unit horizontal vector used as the plane's direction when the contact point lies
        straight below the centre of mass (no lever arm).
    """
    down = -rotation[:, 2, :].T  # (3, n) body-frame down direction
    h = np.asarray(shape.half_extents)[:, None]
    if shape.shape == "box":
        support = h * np.where(down >= 0.0, 1.0, -1.0)
    elif shape.shape == "cylinder":
        radial = np.hypot(down[0], down[1])
        safe = np.where(radial > 1e-12, radial, 1.0)
        support = np.vstack(
            [
                h[0] * np.where(radial > 1e-12, down[0] / safe, 0.0),
                h[1] * np.where(radial > 1e-12, down[1] / safe, 0.0),
                h[2] * np.where(down[2] >= 0.0, 1.0, -1.0),
            ]
        )
    else:  # sphere
        support = h * down
    offset = np.einsum("nij,jn->in", rotation, support)  # world frame (3, n)
    lever = np.hypot(offset[0], offset[1])
    has_lever = lever > 1e-9 * max(shape.half_extents)
    safe = np.where(has_lever, lever, 1.0)
    direction = np.where(has_lever, offset[:2] / safe, heading)
    # Axis normal to the plane, horizontal: (e_y, -e_x, 0) in the world, into the body frame.
    axis_world = np.vstack([direction[1], -direction[0], np.zeros_like(lever)])
    axis_body = np.einsum("nji,jn->in", rotation, axis_world)
    gyration = np.einsum("i,in->n", np.asarray(shape.gyration), axis_body**2)
    return ContactPoint(np.where(has_lever, lever, 0.0), offset[2], direction, gyration)


# --- the impact ------------------------------------------------------------------------------


@dataclass(frozen=True)
class Impact:
    """Velocities after a planar impact (arrays (n,)), per unit mass impulses included.

    Attributes
    ----------
    tangential : ndarray
        Centre-of-mass velocity along the plane's direction after the contact. [m/s]
    vertical : ndarray
        Centre-of-mass vertical velocity after the contact, up positive. [m/s]
    spin : ndarray
        Angular velocity in the plane after the contact, positive turning the plane's
        direction towards up. [rad/s]
    normal_impulse, tangential_impulse : ndarray
        Impulses per unit mass P_n / m and P_t / m. [m/s]
    """

    tangential: FloatArray
    vertical: FloatArray
    spin: FloatArray
    normal_impulse: FloatArray
    tangential_impulse: FloatArray


def planar_impact(
    tangential: FloatArray,
    downward: FloatArray,
    spin: FloatArray,
    lever: FloatArray,
    depth: FloatArray,
    gyration: FloatArray,
    friction: FloatArray,
    restitution: FloatArray,
) -> Impact:
    """Planar rigid-body impact on a fixed flat ground with Coulomb friction (vectorised).

    The contact point C sits at (r_t, r_n) = (lever, depth) from the centre of mass G. The
    velocity of C changes along the normal impulse p (per unit mass) as dc/dp = W (f, 1) with
    the inverse-mass matrix W of the module docstring; f = -mu sign(c_t) while slipping,
    f = -W_tn / W_tt while sticking. Slip that stops turns into sticking when
    mu W_tt >= |W_tn| (the sticking condition), else into slip the other way. The impact ends
    when the normal force has done, in restitution, e^2 times minus its work in compression
    (energetic restitution; [STRONGE-2000] §4.2-4.3). At most two phases
    occur because W is constant.

    Parameters
    ----------
    tangential : array
        Velocity of G along the plane's direction before the contact. [m/s]
    downward : array
        Downward speed of G before the contact, > 0. [m/s]
    spin : array
        Angular velocity in the plane before the contact (positive turns the plane's direction
        towards up). [rad/s]
    lever : array
        r_t, horizontal offset of C from G along the plane's direction. [m]
    depth : array
        r_n, vertical offset of C from G, < 0. [m]
    gyration : array
        k^2 = I / m about the axis normal to the plane. [m^2]
    friction : array
        Coulomb friction coefficient mu >= 0. [-]
    restitution : array
        Energetic coefficient of restitution e in [0, 1]. [-]

    Returns
    -------
    Impact
        Velocities after the contact and the impulses.

    Notes
    -----
    The kernel trusts its inputs (the zone builds them); it does not validate. The ground is
    rigid and flat; the impact is instantaneous; gravity during the contact is neglected.
    """
    u = np.asarray(tangential, dtype=float)
    v = np.asarray(downward, dtype=float)
    w = np.asarray(spin, dtype=float)
    r_t = np.asarray(lever, dtype=float)
    r_n = np.asarray(depth, dtype=float)
    k2 = np.asarray(gyration, dtype=float)
    mu = np.asarray(friction, dtype=float)
    e = np.asarray(restitution, dtype=float)

    w_tt = 1.0 + r_n * r_n / k2
    w_tn = -r_t * r_n / k2
    w_nn = 1.0 + r_t * r_t / k2
    c_t = u - w * r_n  # tangential velocity of C
    c_n = -v + w * r_t  # normal velocity of C (< 0 approaching)

    # Phase 1: slip in the direction of c_t (or nothing to do if C does not slip).
    s0 = np.sign(c_t)
    rate1 = w_tn - mu * s0 * w_tt  # dc_t/dp
    a1 = w_nn - mu * s0 * w_tn  # dc_n/dp
    f1 = -mu * s0  # dp_t/dp
    with np.errstate(divide="ignore", invalid="ignore"):
        stops = (s0 != 0.0) & (c_t * rate1 < 0.0)
        p_s = np.where(s0 == 0.0, 0.0, np.where(stops, -c_t / np.where(stops, rate1, 1.0), np.inf))
    # Phase 2, once slip has stopped: stick, or slip the way W_tn drives it.
    sticks = mu * w_tt >= np.abs(w_tn)
    s1 = np.sign(w_tn)
    a2 = np.where(sticks, w_nn - w_tn * w_tn / w_tt, w_nn - mu * s1 * w_tn)
    f2 = np.where(sticks, -w_tn / w_tt, -mu * s1)

    finite_s = np.isfinite(p_s)
    p_s_f = np.where(finite_s, p_s, 0.0)
    c_ns = c_n + a1 * p_s_f  # normal velocity of C when slip stops
    in_two = finite_s & (c_ns < 0.0)  # compression ends in phase 2
    with np.errstate(divide="ignore", invalid="ignore"):
        p_c = np.where(in_two, p_s_f - c_ns / a2, -c_n / np.where(in_two, 1.0, a1))
        work_c = np.where(
            in_two,
            c_n * p_s_f
            + 0.5 * a1 * p_s_f**2
            + c_ns * (p_c - p_s_f)
            + 0.5 * a2 * (p_c - p_s_f) ** 2,
            c_n * p_c + 0.5 * a1 * p_c**2,
        )
        target = -e * e * work_c  # work of the normal force in restitution, >= 0
        # Restitution entirely in the phase where compression ended ...
        a_end = np.where(in_two, a2, a1)
        p_f = p_c + np.sqrt(2.0 * target / a_end)
        # ... unless it runs past the end of slip in phase 1.
        cross = ~in_two & finite_s & (p_f > p_s_f)
        area1 = 0.5 * a1 * (p_s_f - p_c) ** 2
        v1 = a1 * (p_s_f - p_c)
        q = (-v1 + np.sqrt(v1 * v1 + 2.0 * a2 * np.maximum(target - area1, 0.0))) / a2
        p_f = np.where(cross, p_s_f + q, p_f)
    p_f = np.where(c_n < 0.0, p_f, 0.0)  # C not approaching: no impact
    p_t = np.where(
        finite_s, f1 * np.minimum(p_f, p_s_f) + f2 * np.maximum(p_f - p_s_f, 0.0), f1 * p_f
    )
    return Impact(
        tangential=u + p_t,
        vertical=-v + p_f,
        spin=w + (r_t * p_f - r_n * p_t) / k2,
        normal_impulse=p_f,
        tangential_impulse=p_t,
    )


# --- after the first contact -----------------------------------------------------------------


@dataclass(frozen=True)
class Ground:
    """Per-sample ground and contact inputs of :func:`after_landing` (arrays (n,)).

    Attributes
    ----------
    restitution : ndarray
        Normal restitution at :data:`REFERENCE_SPEED` for this object on this ground. [-]
    friction : ndarray
        Coulomb friction coefficient. [-]
    rolling_resistance : ndarray
        Rolling deceleration over g of a body rolling without slipping on level ground. [-]
    slope : float
        Ground slope, taken to fall away in the direction of travel (conservative). [deg]
    """

    restitution: FloatArray
    friction: FloatArray
    rolling_resistance: FloatArray
    slope: float = 0.0


@dataclass(frozen=True)
class Landing:
    """Travel after the first ground contact (arrays of the samples).

    Attributes
    ----------
    offset : ndarray (2, n)
        Rest position (east, north) relative to the first contact; infinite where a body
        slides or rolls away down the slope without stopping. [m]
    hop_distance, slide_distance, roll_distance : ndarray
        Horizontal distances covered in hops, sliding or skidding, and rolling. [m]
    fragment_distance : ndarray
        Throw of a fragment of a body that broke; zero otherwise. [m]
    broke : ndarray of bool
        The body broke at the first contact.
    contacts : ndarray
        Contacts resolved, the first included. [-]
    """

    offset: FloatArray
    hop_distance: FloatArray
    slide_distance: FloatArray
    roll_distance: FloatArray
    fragment_distance: FloatArray
    broke: NDArray[np.bool_]
    contacts: FloatArray


def _stopping(speed: FloatArray, deceleration: FloatArray) -> FloatArray:
    """v^2 / (2 a), infinite where a <= 0 and v > 0."""
    with np.errstate(divide="ignore", invalid="ignore"):
        out = np.where(deceleration > 0.0, speed * speed / (2.0 * deceleration), np.inf)
    return np.where(speed > 0.0, out, 0.0)


def after_landing(
    velocity: FloatArray,
    shape: Body,
    ground: Ground,
    rotation: FloatArray,
    *,
    gravity: float,
    break_speed: float | None = None,
    fragment_speed: FloatArray | None = None,
    fragment_angle: FloatArray | None = None,
    fragment_azimuth: FloatArray | None = None,
    heading: FloatArray | None = None,
    rolls: bool = False,
) -> Landing:
    """Where a body comes to rest after its first ground contact (vectorised over samples).

    The first contact is a planar impact (:func:`planar_impact`) at the orientation
    ``rotation``, in the vertical plane through the centre of mass and the lowest point; the
    velocity across that plane is resisted by what Coulomb friction has left,
    sqrt((mu P_n)^2 - P_t^2) (the friction cone). Then ballistic hops on flat ground and
    centred later contacts (the body lying on its largest face or side, its spin carried), and
    a slide at mu g, or for a round body a skid until it rolls and a roll-out at c_rr g, less
    the slope's pull (s = v^2 / (2 a)). A body that breaks (``break_speed`` exceeded) throws a
    fragment instead (:func:`fragment_travel`).

    Parameters
    ----------
    velocity : array (3, n)
        Ground-frame velocity (east, north, up) at the first contact. [m/s]
    shape : Body
        Contact geometry.
    ground : Ground
        Restitution, friction, rolling resistance and slope per sample.
    rotation : array (n, 3, 3)
        Orientation at the first contact.
    gravity : float
        [m/s^2]
    break_speed : float, optional
        Impact speed above which the body breaks; None: it does not break. [m/s]
    fragment_speed, fragment_angle, fragment_azimuth : array (n,), optional
        Launch speed as a fraction of the impact speed [-], elevation [deg] and compass
        direction [rad] of the fragment; required with ``break_speed``.
    heading : array (2, n), optional
        Horizontal direction taken where the impact has no horizontal speed and the contact
        no lever arm (default east).
    rolls : bool
        The body rolls once the hops end (a ball, a bar or tube across its axis); it must be
        round (sphere, cylinder, tube).

    Returns
    -------
    Landing
    """
    v = np.asarray(velocity, dtype=float)
    n = v.shape[1]
    g = float(gravity)
    mu = np.asarray(ground.friction, dtype=float) * np.ones(n)
    e_ref = np.asarray(ground.restitution, dtype=float) * np.ones(n)
    c_rr = np.asarray(ground.rolling_resistance, dtype=float) * np.ones(n)
    slope = np.radians(ground.slope)
    sin_b, cos_b = np.sin(slope), np.cos(slope)

    horizontal = v[:2].copy()
    speed_h = np.hypot(horizontal[0], horizontal[1])
    fallback = np.array([[1.0], [0.0]]) if heading is None else np.asarray(heading, dtype=float)
    heading = np.where(
        speed_h > 1e-12, horizontal / np.where(speed_h > 1e-12, speed_h, 1.0), fallback
    )
    down = np.maximum(-v[2], 0.0)

    # First contact: random lever arm, velocity across the plane resisted by the friction left.
    point = contact_point(shape, rotation, heading)
    plane = point.direction
    across = np.vstack([-plane[1], plane[0]])
    u = np.einsum("in,in->n", horizontal, plane)
    w = np.einsum("in,in->n", horizontal, across)
    e = normal_restitution(e_ref, down)
    hit = planar_impact(u, down, np.zeros(n), point.lever, point.depth, point.gyration, mu, e)
    spare = np.sqrt(np.maximum((mu * hit.normal_impulse) ** 2 - hit.tangential_impulse**2, 0.0))
    w_after = np.sign(w) * np.maximum(np.abs(w) - spare, 0.0)
    horizontal = hit.tangential * plane + w_after * across
    # A hop lasts while the struck point is off the ground: to first order 2 c_n' / g, c_n' its
    # separation speed, at most the centre of mass's own 2 v_z / g. A body whose struck point
    # does not leave the ground pivots over it and falls onto a face, a slap taken to end its
    # vertical motion (a spinning body may touch with another corner sooner: not modelled).
    separation = hit.vertical + hit.spin * point.lever
    vertical = np.where(
        hit.vertical > 0.0,
        np.where(separation > STOP_SPEED, np.minimum(hit.vertical, separation), 0.0),
        hit.vertical,
    )
    spin_axis = np.vstack([plane[1], -plane[0]])  # horizontal spin vector per unit spin
    spin = hit.spin * spin_axis
    gyration = point.gyration.copy()
    heading = heading.copy()

    # Later contacts: centred, the body flat on its largest face or on its side. A bar or tube
    # lies along the horizontal direction its axis had at the first contact (it falls over in
    # the plane of that contact), so its inertia in the plane of travel depends on the angle
    # between the two.
    bar = shape.shape == "cylinder"
    axis = rotation[:, :2, 2].T.copy()  # body z axis, horizontal part (east, north)
    length = np.hypot(axis[0], axis[1])
    axis = np.where(length > 1e-12, axis / np.where(length > 1e-12, length, 1.0), heading)

    def later_gyration(east: FloatArray, north: FloatArray, lanes: NDArray[np.intp]) -> FloatArray:
        if bar:  # rotation axis normal to the travel: its cosine with the bar's axis
            cosine = north * axis[0, lanes] - east * axis[1, lanes]
            k2_axis, k2_across = shape.gyration[2], shape.gyration[0]
            return k2_axis * cosine**2 + k2_across * (1.0 - cosine**2)
        if shape.shape == "sphere":
            return np.full(lanes.size, shape.gyration[0])
        return point.gyration[lanes]

    radius = shape.rest_radius
    hops = np.zeros(n)
    contacts = np.ones(n)
    # Components as 1-D arrays: gathering lanes from them is much cheaper than from (2, n).
    h_e, h_n = horizontal[0].copy(), horizontal[1].copy()  # horizontal velocity
    s_e, s_n = spin[0].copy(), spin[1].copy()  # horizontal spin vector
    d_e, d_n = heading[0].copy(), heading[1].copy()  # direction of travel
    t_e, t_n = np.zeros(n), np.zeros(n)  # distance hopped
    # Bodies still moving vertically: rebounding, or still falling (pivoted on a corner).
    lanes = np.flatnonzero((vertical > STOP_SPEED) | (vertical < 0.0))
    for _ in range(MAX_LATER_CONTACTS):
        if lanes.size == 0:
            break
        # Only the lanes still hopping are computed (a centred contact in closed form).
        along_e, along_n, up = h_e[lanes], h_n[lanes], vertical[lanes]
        flight = np.where(up > 0.0, 2.0 * up / g, 0.0)
        t_e[lanes] += along_e * flight
        t_n[lanes] += along_n * flight
        speed = np.hypot(along_e, along_n)
        hops[lanes] += speed * flight
        moving = speed > 1e-12
        inverse = 1.0 / np.where(moving, speed, 1.0)
        east = np.where(moving, along_e * inverse, d_e[lanes])
        north = np.where(moving, along_n * inverse, d_n[lanes])
        k2 = later_gyration(east, north, lanes)
        # Spin about the horizontal axis (north, -east) normal to the travel; never more spin
        # energy than the body carried (k^2 may differ from the last contact).
        omega = (s_e[lanes] * north - s_n[lanes] * east) * np.sqrt(
            np.minimum(1.0, gyration[lanes] / k2)
        )
        approach = np.abs(up)
        e = normal_restitution(e_ref[lanes], approach)
        # Centred contact (lever 0, depth -R): W_tn = 0, so the normal impulse is (1 + e) v
        # for either restitution, and friction stops the slip of the contact point,
        # c_t = u + omega R, if mu (1 + e) v W_tt >= |c_t| (planar_impact with r_t = 0).
        slip = speed + omega * radius
        w_tt = 1.0 + radius * radius / k2
        normal = (1.0 + e) * approach
        friction = mu[lanes]
        sticks = friction * normal * w_tt >= np.abs(slip)
        tangential = np.where(sticks, -slip / w_tt, -friction * np.sign(slip) * normal)
        kept = speed + tangential
        h_e[lanes], h_n[lanes] = kept * east, kept * north
        vertical[lanes] = e * approach
        omega = omega + radius * tangential / k2
        s_e[lanes], s_n[lanes] = omega * north, -omega * east
        gyration[lanes] = k2
        d_e[lanes], d_n[lanes] = east, north
        contacts[lanes] += 1.0
        lanes = lanes[vertical[lanes] > STOP_SPEED]
    horizontal = np.vstack([h_e, h_n])
    heading = np.vstack([d_e, d_n])
    travel = np.vstack([t_e, t_n])
    vertical = np.minimum(vertical, STOP_SPEED)  # what is left is below the hop threshold

    # Slide, or for a round body skid until it rolls and roll out, each down the slope.
    slide_deceleration = g * (mu * cos_b - sin_b)
    if rolls and shape.rolling_inertia is not None:
        kappa = shape.rolling_inertia
        if bar:  # a bar slides along its axis and rolls across it
            along = np.einsum("in,in->n", horizontal, axis)
            sliding = along * axis
        else:
            sliding = np.zeros((2, n))
        rolling_part = horizontal - sliding
        speed_roll = np.hypot(rolling_part[0], rolling_part[1])
        # Skid from v to v / (1 + I / (m r^2)) (friction through the contact point keeps the
        # angular momentum about it), then roll out.
        rolled_speed = speed_roll / (1.0 + kappa)
        skid = _stopping(np.sqrt(speed_roll**2 - rolled_speed**2), slide_deceleration)
        rolled = _stopping(rolled_speed, g * (c_rr * cos_b - sin_b / (1.0 + kappa)))
        slid_along = _stopping(np.hypot(sliding[0], sliding[1]), slide_deceleration)
        roll_dir = rolling_part / np.where(speed_roll > 1e-12, speed_roll, 1.0)
        slide_len = np.hypot(sliding[0], sliding[1])
        slide_dir = sliding / np.where(slide_len > 1e-12, slide_len, 1.0)
        with np.errstate(invalid="ignore"):  # inf x 0 where a body never stops
            offset = travel + (skid + rolled) * roll_dir + slid_along * slide_dir
        slid = skid + slid_along
    else:
        speed_h = np.hypot(horizontal[0], horizontal[1])
        direction = horizontal / np.where(speed_h > 1e-12, speed_h, 1.0)
        slid = _stopping(speed_h, slide_deceleration)
        rolled = np.zeros(n)
        with np.errstate(invalid="ignore"):
            offset = travel + slid * direction
    # A body that slides or rolls away down the slope and never stops: infinitely far.
    offset = np.where(np.isnan(offset), np.inf, offset)
    fragments = np.zeros(n)
    broke = np.zeros(n, dtype=bool)
    if break_speed is not None:
        impact_speed = np.sqrt(np.sum(v * v, axis=0))
        broke = impact_speed > break_speed
        if np.any(broke):
            throw = fragment_travel(
                impact_speed,
                fragment_speed,  # type: ignore[arg-type]  # given whenever break_speed is
                fragment_angle,  # type: ignore[arg-type]
                mu,
                e_ref,
                slope,
                gravity=g,
            )
            direction = np.vstack([np.sin(fragment_azimuth), np.cos(fragment_azimuth)])  # type: ignore[arg-type]
            offset = np.where(broke, throw * direction, offset)
            fragments = np.where(broke, throw, 0.0)
            zero = np.zeros(n)
            hops, slid, rolled = (np.where(broke, zero, x) for x in (hops, slid, rolled))
            contacts = np.where(broke, 1.0, contacts)
    return Landing(offset, hops, slid, rolled, fragments, broke, contacts)


def fragment_travel(
    impact_speed: FloatArray,
    speed_fraction: FloatArray,
    angle: FloatArray,
    friction: FloatArray,
    restitution: FloatArray,
    slope: float = 0.0,
    *,
    gravity: float,
) -> FloatArray:
    """Distance a fragment travels from the impact point: its throw, then a slide [m].

    The fragment leaves at f v at elevation theta and flies (f v)^2 sin(2 theta) / g on flat
    ground (projectile range, [HRW-2011], from memory). It lands with
    the vertical speed it left with; the landing, a centred contact with Coulomb friction,
    takes up to mu (1 + e) of that from its horizontal speed, and it slides out the rest,
    v^2 / (2 g (mu cos beta - sin beta)).

    Parameters
    ----------
    impact_speed : array
        Speed of the whole body at its first contact. [m/s]
    speed_fraction : array
        f, the fragment's launch speed over the impact speed. [-]
    angle : array
        theta, launch elevation. [deg]
    friction, restitution : array
        mu and the normal restitution at the reference speed. [-]
    slope : float
        Ground slope falling away in the direction of travel. [rad]
    gravity : float
        [m/s^2]
    """
    launch = np.asarray(speed_fraction) * np.asarray(impact_speed)
    theta = np.radians(angle)
    up, along = launch * np.sin(theta), launch * np.cos(theta)
    flight = 2.0 * up * along / gravity
    e = normal_restitution(restitution, up)
    left = np.maximum(along - friction * (1.0 + e) * up, 0.0)
    slide = _stopping(left, gravity * (friction * np.cos(slope) - np.sin(slope)))
    return flight + slide
