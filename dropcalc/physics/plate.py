"""Flight of flat plates (sheets, boards, panels, slates) in the vertical plane of the wind.

A point mass with a fixed drag area cannot glide, rise or tumble; a sheet does all three. This
module integrates a quasi-steady flat-plate model with three degrees of freedom in the vertical
plane that holds the wind (position x along the plane, height z, pitch angle theta of the chord
above the horizontal) plus a drag-only cross-plane coordinate, for many plates at once.

Equations of motion (per unit mass m and moment of inertia I = m c^2 / 12 of a thin plate about
the span axis through the centre)::

    dv/dt = -g e_z + (F_n n + F_c c_hat + F_r) / m,     dtheta/dt = omega,
    domega/dt = (e(alpha) sign(u_c) F_n + M_d) / I,

with v_r = v - w(z) the velocity relative to the air, u_c and u_n its components along the
chord c_hat = (cos theta, sin theta) and the normal n = (-sin theta, cos theta), V = |v_r| in
the plane, S = c b the plan area and q = rho S / 2. The coefficient set
:data:`TACHIKAWA_HOLMES_PLATE` (named in the report's method text) is:

- normal force (cross-flow theory, Hoerner and Borst 1985, ch. 19, from memory; the form used
  for windborne plates by Tachikawa 1983 and Holmes, Letchford and Lin 2006):
  C_N = sin(alpha) (a |cos alpha| + C_N90 |sin alpha|), i.e. F_n = -q u_n (a |u_c| + C_N90 |u_n|),
  with C_N90 the face-on C_d of a plate of the same aspect ratio
  (:func:`dropcalc.physics.shapes.plate_normal_drag_coefficient`) and a the finite-wing lift
  slope of Helmbold, a = 2 pi AR / (2 + sqrt(AR^2 + 4)), AR = span / chord;
- chordwise (friction and edge) force F_c = -q C_T V u_c, C_T = 0.01 + t / c
  (:data:`SKIN_FRICTION_COEFFICIENT`, :data:`EDGE_DRAG_COEFFICIENT`);
- centre of pressure ahead of the centre by e(alpha) = (c / 4)(1 - 2 alpha_a / pi), alpha_a the
  acute angle between chord and relative wind: at the quarter chord in gliding flight, at the
  centre face-on (the classical travel of flat-plate data, Hoerner 1965; measured on windborne
  plates by Tachikawa 1983), so a plate turns broadside to the relative wind;
- rotational (Magnus) lift, found important for windborne plates by Holmes, Letchford and Lin
  (2006): the quasi-steady thin-aerofoil lift of a plate pitching about its mid chord,
  Delta C_L = 2 pi (3/4 - 1/2) omega c / V (Theodorsen's quasi-steady term, Katz and Plotkin
  2001, sec. 13.8, from memory), scaled by a / (2 pi) for the finite span, acting normal to v_r;
- damping moment by strip theory across the chord with the face-on C_N90:
  M_d = -rho b C_N90 omega (|u_n| c^3 / 12 + |omega| c^4 / 64) (the linear term of a strip at
  r seeing u_n + omega r, and a plate spinning in still air);
- the cross-plane velocity relaxes with the tumbling drag 1.05 S_mean (Cauchy's mean
  projection, :data:`~dropcalc.physics.constants.TUMBLING_DRAG_FACTOR`).

Added mass of the air is neglected (valid while the plate's mass is large against rho c^2 b;
plywood, OSB, slate and glass qualify, insulation foam does not: that is in the report's limits),
and the moment coefficients hold no measured autorotation driver beyond what the coupling of the
rotational lift and the moving centre of pressure produces. The Monte Carlo of
:mod:`dropcalc.analysis.zone` samples the initial attitude and spin widely for that reason.

The checks in ``tests/test_plate.py`` compare the horizontal speed and travel in uniform wind
with the empirical fits of Lin, Letchford and Holmes (2006) against the Tachikawa number
K = rho U^2 S / (2 m g), and the limits of a heavy plate (point mass) and of a plate held at a
fixed attitude (a point mass with that attitude's drag area).

The integrator is the Dormand-Prince 5(4) pair of :mod:`dropcalc.physics.trajectory`, with a
step size per trajectory, all trajectories advanced together in numpy arrays and finished ones
dropped; the ground (z = 0) is found by a cubic Hermite interpolant and a repeated step.

References
----------
[TACHIKAWA-1983] Tachikawa, M., "Trajectories of flat plates in uniform flow with application to
wind-generated missiles", J. Wind Eng. Ind. Aerodyn. 14 (1983) 443-453.
[HLL-2006] Holmes, J. D., Letchford, C. W. and Lin, N., "Investigations of plate-type windborne
debris - Part II: Computed trajectories", J. Wind Eng. Ind. Aerodyn. 94 (2006) 21-39.
[LLH-2006] Lin, N., Letchford, C. W. and Holmes, J. D., "Investigation of plate-type windborne
debris. Part I. Experiments in wind tunnel and full scale", J. Wind Eng. Ind. Aerodyn. 94 (2006)
51-76; fitted in [LHL-2007] Lin, Holmes and Letchford, J. Struct. Eng. 133 (2007) 274-282.
[HOERNER-BORST-1985] Hoerner, S. F. and Borst, H. V., *Fluid-Dynamic Lift*, 2nd ed. (1985),
ch. 19 (from memory).
[ANDERSON-FA] Anderson, J. D., *Fundamentals of Aerodynamics*, 5th ed. (2011), Helmbold's
formula (from memory).
[KATZ-PLOTKIN-2001] Katz, J. and Plotkin, A., *Low-Speed Aerodynamics*, 2nd ed. (2001),
sec. 13.8 (from memory).
[EN1991-1-4] EN 1991-1-4:2005, Table 7.2 (roof-edge suction, lift-off of loose sheets);
[WILLS-2002] Wills, Lee and Wyatt, J. Wind Eng. Ind. Aerodyn. 90 (2002) 555-565.
[RICHARDS-2008] and [KORDI-2009] give the 3-D coefficients and the corrections to quasi-steady
theory (autorotation) this set does not yet hold; see the closing note of issue 11.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike, NDArray

from dropcalc.physics.constants import (
    GLIDE_THICKNESS_RATIO,
    STANDARD_GRAVITY,
    TUMBLING_DRAG_FACTOR,
)
from dropcalc.physics.shapes import plate_normal_drag_coefficient
from dropcalc.physics.trajectory import (
    _A_ROWS,
    _B,
    _E,
    FallSolution,
    WindField,
    _combine,
    _hermite_root,
)
from dropcalc.physics.wind import ProfileKind, speed_ratio

#: Name of the coefficient set, shown in the report's method text and in ``fall``'s output.
TACHIKAWA_HOLMES_PLATE = (
    "quasi-steady flat plate after Tachikawa (1983) and Holmes, Letchford & Lin (2006): "
    "cross-flow normal force, moving centre of pressure, rotational lift, strip-theory damping"
)

#: Skin-friction coefficient of a plate at Re ~ 1e5-1e6, both faces, on the plan area [-]
#: (turbulent flat plate 0.074 Re^-0.2 is 0.0047 per face at Re 1e6; White, *Fluid Mechanics*,
#: eq. 7.45, from memory).
SKIN_FRICTION_COEFFICIENT = 0.01
#: Drag coefficient of the plate's edge on the edge area t x b (a blunt edge) [-] (Hoerner
#: 1965, ch. 3, rectangular blunt base ~1, from memory).
EDGE_DRAG_COEFFICIENT = 1.0

#: Default relative tolerance of the local error control: a tumbling plate's path is sensitive
#: to its initial attitude far beyond this, and the zone samples that attitude.
PLATE_TOLERANCE = 1e-5

#: Steps after which a trajectory is abandoned (``landed`` False): the step control has failed.
MAX_STEPS = 100_000

# Parameter rows.
(
    _Q,  # rho S / (2 m) [1/m]
    _A,  # lift slope a [-/rad]
    _CN90,
    _CT,
    _CY,  # cross-plane drag coefficient on S
    _CHORD,
    _DAMP,  # rho b C_N90 / I [1/m^... per unit]
    _G,
    _WP,  # wind at 10 m along the plane [m/s]
    _WC,  # wind at 10 m across the plane [m/s]
    _EXP,
    _Z0,
    _ZMIN,
    _T,
    _H,
    _STEPS,
    _LANE,
    _FREE,  # 0: attitude held fixed, 1: free to rotate
) = range(18)
_N_PARAMS = 18


def helmbold_lift_slope(aspect_ratio: ArrayLike) -> NDArray[np.float64]:
    """Lift-curve slope of a flat wing of the given aspect ratio [1/rad].

    a = 2 pi AR / (2 + sqrt(AR^2 + 4)) (Helmbold 1942; Anderson, *Fundamentals of
    Aerodynamics*, 5th ed., eq. 5.81, from memory): 2 pi for an infinite span, 1.49 for a
    square plate.
    """
    ar = np.asarray(aspect_ratio, dtype=float)
    return 2.0 * math.pi * ar / (2.0 + np.sqrt(ar * ar + 4.0))


@dataclass(frozen=True)
class PlateGeometry:
    """A rectangular plate flying with ``chord`` in the plane of motion (SI, arrays broadcast).

    Attributes
    ----------
    chord : float or array
        Side lying in the plane of the wind. [m]
    span : float or array
        Side across the plane. [m]
    thickness : float or array
        [m]
    """

    chord: ArrayLike
    span: ArrayLike
    thickness: ArrayLike


def tachikawa_number(
    density: ArrayLike,
    wind_speed: ArrayLike,
    area: ArrayLike,
    mass: ArrayLike,
    gravity: ArrayLike = STANDARD_GRAVITY,
) -> NDArray[np.float64]:
    """Tachikawa number K = rho U^2 S / (2 m g) [-] (Tachikawa 1983).

    The ratio of the aerodynamic force scale to the weight: K -> 0 is a heavy plate that falls
    like a point mass, K of order 1 or more a plate the wind carries.
    """  # fmt: skip
    return (
        np.asarray(density, float) * np.asarray(wind_speed, float) ** 2 * np.asarray(area, float)
        / (2.0 * np.asarray(mass, float) * np.asarray(gravity, float))
    )  # fmt: skip


def _rhs(
    state: NDArray[np.float64],
    p: NDArray[np.float64],
    profile: ProfileKind,
    out: NDArray[np.float64],
) -> None:
    """d(state)/dt; state rows x, z, y, u, w, v, theta, omega (plane, up, cross)."""
    z, u, w, v, theta, omega = state[1], state[3], state[4], state[5], state[6], state[7]
    uniform = profile == "uniform"
    ratio = 1.0 if uniform else speed_ratio(z, profile, p[_EXP], p[_Z0], p[_ZMIN])
    rx = u - p[_WP] * ratio
    rz = w
    ry = v - p[_WC] * ratio
    vp = np.sqrt(rx * rx + rz * rz)
    cos_t, sin_t = np.cos(theta), np.sin(theta)
    uc = rx * cos_t + rz * sin_t
    un = -rx * sin_t + rz * cos_t
    q = p[_Q]
    a = p[_A]
    abs_un = np.abs(un)
    abs_uc = np.abs(uc)
    with np.errstate(invalid="ignore", divide="ignore"):
        acute = np.arctan2(abs_un, abs_uc)
    chord = p[_CHORD]
    offset = 0.25 * chord * (1.0 - acute * (2.0 / math.pi))
    sign = np.where(uc >= 0.0, 1.0, -1.0)
    # The normal force acts at the centre of pressure and is taken from the normal velocity
    # of that point (u_n + omega e): its power is then never positive.
    un_cp = un + omega * offset * sign
    fn = -q * un_cp * (a * abs_uc + p[_CN90] * np.abs(un_cp))  # along n, per unit mass
    fc = -q * p[_CT] * vp * uc  # along the chord
    rot = q * 0.25 * a * p[_CHORD] * omega  # rotational lift per unit mass / |v_r|
    ax = -fn * sin_t + fc * cos_t - rot * rz
    az = fn * cos_t + fc * sin_t + rot * rx - p[_G]
    v3 = np.sqrt(vp * vp + ry * ry)
    ay = -q * p[_CY] * v3 * ry
    # Moment per inertia: normal force at the centre of pressure, plus strip-theory damping.
    # I = m c^2 / 12 (thin plate): torque / I = 12 / c^2 x (torque / m).
    inv_i = 12.0 / (chord * chord)
    alpha_dot = inv_i * offset * sign * fn - p[_DAMP] * omega * (
        abs_un * chord**3 / 12.0 + np.abs(omega) * chord**4 / 64.0
    )
    out[0] = u
    out[1] = w
    out[2] = v
    out[3] = ax
    out[4] = az
    out[5] = ay
    out[6] = omega * p[_FREE]
    out[7] = alpha_dot * p[_FREE]


def _step(
    state: NDArray[np.float64],
    slope0: NDArray[np.float64],
    p: NDArray[np.float64],
    profile: ProfileKind,
    h: NDArray[np.float64],
    rtol: float,
    scale: NDArray[np.float64],
) -> tuple[NDArray[np.float64], NDArray[np.float64], NDArray[np.float64]]:
    """One Dormand-Prince 5(4) step: new state, its derivative, error ratio."""  # fmt: skip
    m = state.shape[1]
    stages = np.empty((7, 8, m))
    stages[0] = slope0
    trial = np.empty((8, m))
    for s in range(1, 6):
        _combine(_A_ROWS[s], stages, trial)
        trial *= h
        trial += state
        _rhs(trial, p, profile, stages[s])
    new = np.empty((8, m))
    _combine(_B, stages, new)
    new *= h
    new += state
    _rhs(new, p, profile, stages[6])
    err = np.empty((8, m))
    _combine(_E, stages, err)
    err *= h
    tol = rtol * np.maximum(np.abs(state), np.abs(new)) + scale
    return new, stages[6], np.max(np.abs(err) / tol, axis=0)


def solve_plate_falls(
    release_height: ArrayLike,
    initial_velocity: ArrayLike,
    mass: ArrayLike,
    geometry: PlateGeometry,
    air_density: ArrayLike,
    *,
    initial_pitch: ArrayLike = 0.0,
    initial_spin: ArrayLike = 0.0,
    plane_azimuth: ArrayLike | None = None,
    gravity: ArrayLike = STANDARD_GRAVITY,
    wind: WindField | None = None,
    tolerance: float = PLATE_TOLERANCE,
    max_time: float = 3600.0,
    max_distance: float = 20000.0,
    fixed_attitude: bool = False,
    record_path: bool = False,
) -> FallSolution:
    """Fly many plates at once to their first ground contact.

    Parameters
    ----------
    release_height : float or array, shape (n,)
        Height of the plate's centre at release above the landing surface, > 0. [m]
    initial_velocity : array, shape (3,) or (3, n)
        Ground-frame velocity at release (east, north, up). [m/s]
    mass : float or array
        [kg]
    geometry : PlateGeometry
        Chord (in the plane), span and thickness. [m]
    air_density : float or array
        [kg/m^3]
    initial_pitch : float or array
        Angle of the chord above the horizontal at release: 0 flat, 90 upright. [deg]
    initial_spin : float or array
        Pitch rate at release, counter-clockwise seen with the plane's direction to the
        right. [rad/s]
    plane_azimuth : float or array, optional
        Compass direction of the plane's x axis [deg]; by default the direction the wind blows
        towards (east in still air).
    gravity : float or array
        [m/s^2]
    wind : WindField, optional
        The wind; still air when omitted.
    tolerance : float
        Relative tolerance of the local error control. [-]
    max_time, max_distance : float
        Trajectories still airborne after this time or further than this distance are
        abandoned (``landed`` False). [s], [m]
    fixed_attitude : bool
        Hold the pitch at ``initial_pitch`` (no rotation): a check of the force model.
    record_path : bool
        Keep each path as in :func:`dropcalc.physics.trajectory.solve_falls` (rows time, x, y,
        z, vx, vy, vz in the ground frame).

    Returns
    -------
    FallSolution
        The same fields as the point-mass engine (time, position, velocity, landed, steps,
        paths), so impact, scatter and zone code take either.
    """
    wind = wind or WindField()
    v0 = np.asarray(initial_velocity, dtype=float)
    if v0.ndim == 1:
        v0 = v0[:, None]
    arrays = [
        np.asarray(x, dtype=float)
        for x in (
            release_height, mass, geometry.chord, geometry.span, geometry.thickness,
            air_density, initial_pitch, initial_spin, gravity, wind.speed_10m,
            wind.toward_east, wind.toward_north, wind.exponent, wind.roughness_length,
            wind.minimum_height, v0[0], v0[1], v0[2],
            0.0 if plane_azimuth is None else plane_azimuth,
        )
    ]  # fmt: skip
    shape = np.broadcast_shapes(*(a.shape for a in arrays))
    flat = (np.broadcast_to(a, shape).astype(float).reshape(-1) for a in arrays)
    (h0, m, chord, span, thick, rho, pitch, spin, g, u10, te, tn, alpha, z0, zmin, vx0, vy0,
     vz0, plane_az) = flat  # fmt: skip
    n = h0.size
    if np.any(~(h0 > 0)) or np.any(~np.isfinite(h0)):
        raise ValueError("release_height must be finite and > 0")
    # Plane direction: the wind's, or the given azimuth (east in still air).
    if plane_azimuth is None:
        still = u10 == 0.0
        px = np.where(still, 1.0, te)
        py = np.where(still, 0.0, tn)
        norm = np.hypot(px, py)
        px, py = px / norm, py / norm
    else:
        az = np.radians(plane_az)
        px, py = np.sin(az), np.cos(az)
    # Cross axis: plane direction turned 90 deg to the left (y_cross = e_z x e_plane).
    cx, cy = -py, px
    area = chord * span
    params = np.empty((_N_PARAMS, n))
    params[_Q] = rho * area / (2.0 * m)
    params[_A] = helmbold_lift_slope(span / chord)
    aspect = np.maximum(span, chord) / np.minimum(span, chord)
    params[_CN90] = plate_normal_drag_coefficient(aspect)
    params[_CT] = SKIN_FRICTION_COEFFICIENT + EDGE_DRAG_COEFFICIENT * thick / chord
    # Tumbling drag area 1.05 x mean projection (2 c b + edges) / 4, on the plan area.
    params[_CY] = TUMBLING_DRAG_FACTOR * (2 * area + 2 * thick * (chord + span)) / 4.0 / area
    params[_CHORD] = chord
    inertia = m * chord**2 / 12.0  # thin plate
    params[_DAMP] = rho * span * params[_CN90] / inertia
    params[_G] = g
    params[_WP] = u10 * (te * px + tn * py)
    params[_WC] = u10 * (te * cx + tn * cy)
    params[_EXP], params[_Z0], params[_ZMIN] = alpha, z0, zmin
    params[_T] = 0.0
    params[_STEPS] = 0.0
    params[_LANE] = np.arange(n)
    params[_FREE] = 0.0 if fixed_attitude else 1.0
    state = np.zeros((8, n))
    state[1] = h0
    state[3] = vx0 * px + vy0 * py
    state[5] = vx0 * cx + vy0 * cy
    state[4] = vz0
    state[6] = np.radians(pitch)
    state[7] = 0.0 if fixed_attitude else spin
    profile = wind.profile

    time = np.zeros(n)
    position = np.zeros((3, n))
    velocity = np.zeros((3, n))
    landed = np.zeros(n, dtype=bool)
    steps = np.zeros(n, dtype=np.int64)
    records: list[NDArray[np.float64]] | None = [] if record_path else None

    def to_ground(
        st: NDArray[np.float64], lanes: NDArray[np.float64]
    ) -> tuple[NDArray[np.float64], NDArray[np.float64]]:
        """Ground-frame position (3, k) and velocity (3, k) of plane-frame states."""
        l_px, l_py, l_cx, l_cy = px[lanes], py[lanes], cx[lanes], cy[lanes]
        pos = np.vstack([st[0] * l_px + st[2] * l_cx, st[0] * l_py + st[2] * l_cy, st[1]])
        vel = np.vstack([st[3] * l_px + st[5] * l_cx, st[3] * l_py + st[5] * l_cy, st[4]])
        return pos, vel

    def record(st: NDArray[np.float64], p: NDArray[np.float64]) -> None:
        if records is not None:
            lanes = p[_LANE].astype(np.int64)
            pos, vel = to_ground(st, lanes)
            records.append(np.vstack([p[_LANE], p[_T], pos, vel]))

    slope = np.empty_like(state)
    _rhs(state, params, profile, slope)
    record(state, params)
    # Error scales: a length and a speed per lane.
    speed_scale = np.sqrt(2.0 * g * h0) + np.abs(u10) + np.sqrt(np.sum(v0 * v0, axis=0))
    scale = np.empty((8, n))
    scale[0:3] = tolerance * np.maximum(h0, 1.0)
    scale[3:6] = tolerance * speed_scale
    scale[6] = tolerance * 2 * math.pi
    scale[7] = tolerance * speed_scale / chord
    ground_tolerance = 1e-7 * np.maximum(h0, 1.0)
    params[_H] = 0.01 * np.minimum(np.sqrt(2.0 * h0 / g), chord / np.maximum(speed_scale, 0.1))

    while state.shape[1]:
        h = params[_H]
        new, new_slope, ratio = _step(state, slope, params, profile, h, tolerance, scale)
        accept = ratio <= 1.0
        crossed = accept & (new[1] < -ground_tolerance)
        contact = accept & ~crossed & (np.abs(new[1]) <= ground_tolerance)
        moved = accept & ~crossed
        with np.errstate(divide="ignore", over="ignore"):
            factor = np.clip(0.9 * ratio ** (-0.2), 0.2, 5.0)
        new_h = h * np.where(accept, factor, np.minimum(factor, 0.9))
        if np.any(crossed):
            theta = _hermite_root(
                state[1, crossed], h[crossed] * slope[1, crossed], new[1, crossed],
                h[crossed] * new_slope[1, crossed],
            )  # fmt: skip
            new_h[crossed] = h[crossed] * theta
        np.copyto(state, new, where=moved)
        np.copyto(slope, new_slope, where=moved)
        params[_T] += np.where(moved, h, 0.0)
        params[_STEPS] += 1.0
        if records is not None and np.any(moved):
            record(state[:, moved], params[:, moved])
        time_left = max_time - params[_T]
        params[_H] = np.minimum(new_h, np.maximum(1.01 * time_left, 0.0) + 1e-6)
        travelled = np.hypot(state[0], state[2])
        beyond = (params[_T] > max_time) | (travelled > max_distance)
        beyond |= params[_STEPS] > MAX_STEPS
        contact &= ~beyond
        finished = contact | beyond
        if not np.any(finished):
            continue
        idx = params[_LANE, finished].astype(np.int64)
        st = state[:, finished].copy()
        hit = contact[finished]
        # Linear step from z (|z| tiny) to z = 0.
        vz = st[4]
        dt = np.where(hit & (vz < 0.0), -st[1] / np.where(vz < 0.0, vz, -1.0), 0.0)
        st[0:3] += st[3:6] * dt
        st[1] = np.where(hit, 0.0, st[1])
        pos, vel = to_ground(st, idx)
        time[idx] = params[_T, finished] + dt
        position[:, idx] = pos
        velocity[:, idx] = vel
        landed[idx] = hit
        steps[idx] = params[_STEPS, finished].astype(np.int64)
        if records is not None:
            records.append(np.vstack([idx.astype(float), time[idx], pos, vel]))
        keep = ~finished
        state, slope, params, scale = (
            state[:, keep],
            slope[:, keep],
            params[:, keep],
            scale[:, keep],
        )
        ground_tolerance = ground_tolerance[keep]

    paths = None
    if records is not None:
        allrec = np.concatenate(records, axis=1)
        order = np.lexsort((allrec[1], allrec[0]))
        allrec = allrec[:, order]
        lanes = allrec[0].astype(np.int64)
        bounds = np.searchsorted(lanes, np.arange(n + 1))
        kept = []
        for i in range(n):
            path = allrec[1:, bounds[i] : bounds[i + 1]]
            step = np.diff(path[0], prepend=-np.inf) > 0.0  # the contact may repeat the last
            kept.append(path[:, step])
        paths = tuple(kept)
    return FallSolution(time, position, velocity, landed, steps, paths)


#: Largest external suction on a flat roof near its edge, c_pe,10 = -1.8 (CEN, EN 1991-1-4:2005,
#: Table 7.2, flat roof with sharp eaves, zone F). A sheet lying loose on a roof feels at most this
#: suction on its top face; counting no pressure under it makes the lift-off speed a low
#: (cautious) estimate.
ROOF_EDGE_SUCTION_COEFFICIENT = 1.8


def lift_off_speed(
    mass: ArrayLike,
    area: ArrayLike,
    air_density: ArrayLike,
    gravity: ArrayLike = STANDARD_GRAVITY,
    suction_coefficient: float = ROOF_EDGE_SUCTION_COEFFICIENT,
) -> NDArray[np.float64]:
    """Wind speed at roof level above which a loose sheet lying flat on the roof lifts off [m/s].

    The uplift 1/2 rho U^2 |c_p| S equals the weight m g:

        U = sqrt(2 m g / (rho |c_p| S)),

    with c_p the roof-edge suction of :data:`ROOF_EDGE_SUCTION_COEFFICIENT` (EN 1991-1-4:2005,
    Table 7.2, zone F). This is the flight-initiation balance of Wills, Lee and Wyatt (J. Wind
    Eng. Ind. Aerodyn. 90 (2002) 555-565) for an unrestrained sheet (fixing strength zero). U
    is a gust (peak) speed at roof level, the speed the EN pressure coefficients go with.

    Parameters
    ----------
    mass : float or array
        [kg]
    area : float or array
        Face area of the sheet. [m^2]
    air_density : float or array
        [kg/m^3]
    gravity : float or array
        [m/s^2]
    suction_coefficient : float
        |c_p| of the suction on the top face. [-]
    """
    m = np.asarray(mass, dtype=float)
    s = np.asarray(area, dtype=float)
    rho = np.asarray(air_density, dtype=float)
    return np.sqrt(2.0 * m * np.asarray(gravity, dtype=float) / (rho * suction_coefficient * s))


def plate_dimensions(
    shape: str, dimensions: Mapping[str, float]
) -> tuple[float, float, float] | None:
    """(length, width, thickness) [m] of an object the plate model flies, else None.

    Selected: every object of the plate shape class (sheets, boards, panes, slates, tiles), and
    boxes and irregular bodies whose smallest edge is under
    :data:`~dropcalc.physics.constants.GLIDE_THICKNESS_RATIO` of the middle one (a custom
    board given as a box). Discs (thin cylinders) are not covered: they keep the glide warning.

    Parameters
    ----------
    shape : str
        Canonical shape class (:data:`dropcalc.physics.shapes.SHAPES`).
    dimensions : mapping of str to float
        The shape's dimensions by name. [m]
    """
    if shape == "plate":
        return (
            float(dimensions["length"]),
            float(dimensions["width"]),
            float(dimensions["thickness"]),
        )
    if shape in ("box", "irregular"):
        small, middle, large = sorted(float(v) for v in dimensions.values())
        if small < GLIDE_THICKNESS_RATIO * middle:
            return large, middle, small
    return None
