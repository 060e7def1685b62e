"""Vectorised 3-D trajectories of falling objects with quadratic drag in a sheared wind.

Axes: x east, y north, z up; the origin is on the landing surface directly below the release
point. The equations of motion of a point mass are

    dr/dt = v,    dv/dt = -g e_z - k |v - w(z)| (v - w(z)),    k = rho C_d A / (2 m),

with w(z) = U_10 * ratio(z) * e_wind horizontal (profiles in :mod:`dropcalc.physics.wind`).

The integrator is the embedded Runge-Kutta pair of Dormand and Prince, order 5(4), with a
separate step size for every trajectory, all trajectories advanced together in numpy arrays and
finished ones dropped from the working set. The first ground contact (z = 0) is located by a
cubic Hermite interpolant on the step that crosses the ground, a repeated step to that instant,
and a final second-order Taylor correction, so the contact time is not the last step's time.

Where the motion relative to the air is purely vertical (still air or a uniform wind, and the
object released moving with the air) the exact closed form of
:mod:`dropcalc.physics.closed_form` is used instead.

On request (``record_path``) every accepted step is kept, and :func:`sample_path` evaluates the
path between steps with the cubic Hermite interpolant, so a drawn path is the integrated one.

References
----------
Dormand, J. R. and Prince, P. J., "A family of embedded Runge-Kutta formulae", Journal of
Computational and Applied Mathematics 6 (1980) 19-26.
Hairer, E., Norsett, S. P. and Wanner, G., *Solving Ordinary Differential Equations I*, 2nd ed.
(1993), sec. II.4 (step size control) and II.6 (dense output, Hermite interpolation).
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike, NDArray

from dropcalc.physics.closed_form import vertical_fall
from dropcalc.physics.constants import STANDARD_GRAVITY
from dropcalc.physics.wind import PROFILE_KINDS, ProfileKind, speed_ratio, speed_ratio_slope

# Dormand-Prince 5(4) tableau (Dormand and Prince 1980, Table 2).
_A = (
    (),
    (1 / 5,),
    (3 / 40, 9 / 40),
    (44 / 45, -56 / 15, 32 / 9),
    (19372 / 6561, -25360 / 2187, 64448 / 6561, -212 / 729),
    (9017 / 3168, -355 / 33, 46732 / 5247, 49 / 176, -5103 / 18656),
)
_B = np.array([35 / 384, 0.0, 500 / 1113, 125 / 192, -2187 / 6784, 11 / 84])
# Fifth-order weights minus embedded fourth-order weights (7 stages, FSAL).
_E = np.array([71 / 57600, 0.0, -71 / 16695, 71 / 1920, -17253 / 339200, 22 / 525, -1 / 40])
_A_ROWS = [np.array(row) for row in _A]

#: Default relative tolerance of the integrator's local error control. With it, over 20,000
#: random cases against a DOP853 reference at rtol 1e-10, impact speed agreed to 1.4e-6 and fall
#: time to 2.8e-7 relative, drift to 4e-6 relative above 0.1 m and to within
#: 1e-4 x drift + 1e-8 x release height below (tests/test_trajectory_accuracy.py).
DEFAULT_TOLERANCE = 1e-8

# Parameter rows of the working array.
(_K, _G, _WX, _WY, _EXP, _Z0, _ZMIN, _T, _H, _POS_SCALE, _VEL_SCALE, _STEPS, _LANE, _FLOOR) = range(
    14
)
_N_PARAMS = 14


@dataclass(frozen=True)
class WindField:
    """Wind seen by a set of trajectories; every value broadcasts over the trajectories.

    Attributes
    ----------
    speed_10m : float or array
        Wind speed at the 10 m reference height. [m/s]
    toward_east, toward_north : float or array
        Components of the unit vector the wind blows towards. [-]
    profile : {"uniform", "power", "log"}
        Profile law with height.
    exponent : float or array
        Power-law exponent. [-]
    roughness_length : float or array
        Log-law roughness length. [m]
    minimum_height : float or array
        Height below which the profile is held constant. [m]
    """

    speed_10m: ArrayLike = 0.0
    toward_east: ArrayLike = 1.0
    toward_north: ArrayLike = 0.0
    profile: ProfileKind = "uniform"
    exponent: ArrayLike = 0.0
    roughness_length: ArrayLike = 0.05
    minimum_height: ArrayLike = 0.0

    def __post_init__(self) -> None:
        if self.profile not in PROFILE_KINDS:
            raise ValueError(f"profile must be one of {', '.join(PROFILE_KINDS)}")
        if self.profile == "log" and np.any(
            np.asarray(self.minimum_height) <= np.asarray(self.roughness_length)
        ):
            raise ValueError("log-law minimum_height must exceed the roughness length")


@dataclass(frozen=True)
class FallSolution:
    """State of each trajectory at its first ground contact (or where it was abandoned).

    Attributes
    ----------
    time : numpy.ndarray, shape (n,)
        Time from release to first ground contact. [s]
    position : numpy.ndarray, shape (3, n)
        Position at contact, relative to the point on the ground below the release point
        (z = 0 when landed). [m]
    velocity : numpy.ndarray, shape (3, n)
        Ground-frame velocity at contact. [m/s]
    landed : numpy.ndarray of bool, shape (n,)
        False where the object was still airborne at ``max_time`` or beyond ``max_distance``
        (carried by the wind); its other values are then where it was abandoned.
    steps : numpy.ndarray of int, shape (n,)
        Integrator steps taken (0 for the closed form).
    paths : tuple of numpy.ndarray or None
        Only with ``solve_falls(..., record_path=True)``, else None: one array per trajectory,
        shape (7, m), rows time [s], x, y, z [m], vx, vy, vz [m/s], one column per accepted
        step end in increasing time. The first column is the release (t = 0, position
        (0, 0, release height), the initial velocity); the last is ``time``, ``position`` and
        ``velocity`` of that trajectory. Evaluate between columns with :func:`sample_path`.
    """

    time: NDArray[np.float64]
    position: NDArray[np.float64]
    velocity: NDArray[np.float64]
    landed: NDArray[np.bool_]
    steps: NDArray[np.int64]
    paths: tuple[NDArray[np.float64], ...] | None = None


@dataclass(frozen=True)
class _Model:
    """What the right-hand side needs besides arrays: the wind profile law and the drag law."""

    profile: ProfileKind
    linear: bool = False


def _accelerations(
    z: NDArray[np.float64],
    vx: NDArray[np.float64],
    vy: NDArray[np.float64],
    vz: NDArray[np.float64],
    params: NDArray[np.float64],
    model: _Model,
) -> tuple[NDArray[np.float64], NDArray[np.float64], NDArray[np.float64]]:
    """Acceleration components [m/s^2]: -g e_z - k |v - w| (v - w)."""
    if model.profile == "uniform":
        rx = vx - params[_WX]
        ry = vy - params[_WY]
    else:
        ratio = speed_ratio(z, model.profile, params[_EXP], params[_Z0], params[_ZMIN])
        rx = vx - params[_WX] * ratio
        ry = vy - params[_WY] * ratio
    speed = 1.0 if model.linear else np.sqrt(rx * rx + ry * ry + vz * vz)
    ks = params[_K] * speed
    return -ks * rx, -ks * ry, -params[_G] - ks * vz


def _rhs(
    state: NDArray[np.float64], params: NDArray[np.float64], model: _Model, out: NDArray[np.float64]
) -> None:
    """Write d(state)/dt into ``out``; state rows are x, y, z, vx, vy, vz."""
    out[0:3] = state[3:6]
    ax, ay, az = _accelerations(state[2], state[3], state[4], state[5], params, model)
    out[3] = ax
    out[4] = ay
    out[5] = az


def _hermite_root(
    z0: NDArray[np.float64],
    dz0: NDArray[np.float64],
    z1: NDArray[np.float64],
    dz1: NDArray[np.float64],
) -> NDArray[np.float64]:
    """Fraction theta in (0, 1] of a step where the cubic Hermite interpolant of z is zero.

    ``dz0`` and ``dz1`` are the derivatives times the step size. Newton's method from the
    linear-interpolation estimate (Hairer, Norsett and Wanner 1993, sec. II.6).
    """
    theta = np.clip(z0 / (z0 - z1), 0.0, 1.0)
    for _ in range(6):
        t2 = theta * theta
        t3 = t2 * theta
        value = (
            (2 * t3 - 3 * t2 + 1) * z0
            + (t3 - 2 * t2 + theta) * dz0
            + (-2 * t3 + 3 * t2) * z1
            + (t3 - t2) * dz1
        )
        slope = (
            (6 * t2 - 6 * theta) * z0
            + (3 * t2 - 4 * theta + 1) * dz0
            + (-6 * t2 + 6 * theta) * z1
            + (3 * t2 - 2 * theta) * dz1
        )
        step = np.where(slope < 0.0, value / np.where(slope < 0.0, slope, -1.0), 0.0)
        theta = np.clip(theta - step, 1e-6, 1.0)
        if np.all(np.abs(step) <= 1e-12):  # converged (Newton: two or three iterations)
            break
    return theta


def _broadcast_lanes(*values: ArrayLike) -> tuple[NDArray[np.float64], ...]:
    arrays = [np.asarray(v, dtype=float) for v in values]
    shape = np.broadcast_shapes(*(a.shape for a in arrays))
    if len(shape) > 1:
        raise ValueError("trajectory parameters must be scalars or 1-D arrays")
    return tuple(np.broadcast_to(a, shape).astype(float).reshape(-1) for a in arrays)


def solve_falls(
    release_height: ArrayLike,
    initial_velocity: ArrayLike,
    drag_parameter: ArrayLike,
    *,
    gravity: ArrayLike = STANDARD_GRAVITY,
    wind: WindField | None = None,
    tolerance: float = DEFAULT_TOLERANCE,
    max_time: float = 3600.0,
    max_distance: float = 20000.0,
    closed_form: bool = True,
    drag_law: str = "quadratic",
    record_path: bool = False,
) -> FallSolution:
    """Integrate many falls at once to their first ground contact.

    Parameters
    ----------
    release_height : float or array, shape (n,)
        Height of the release point above the landing surface, > 0. [m]
    initial_velocity : array, shape (3,) or (3, n)
        Ground-frame velocity at release (east, north, up). [m/s]
    drag_parameter : float or array, shape (n,)
        k = rho C_d A / (2 m), >= 0 (see :func:`dropcalc.physics.drag.drag_parameter`). [1/m]
    gravity : float or array, shape (n,)
        Acceleration of gravity. [m/s^2]
    wind : WindField, optional
        The wind; still air when omitted.
    tolerance : float
        Relative tolerance of the local error control. [-]
    max_time : float
        Trajectories still airborne after this time are abandoned (``landed`` False). [s]
    max_distance : float
        Trajectories carried further than this horizontally are abandoned. [m]
    closed_form : bool
        Use the exact closed form where the motion relative to the air is vertical.
    drag_law : {"quadratic", "linear"}
        "quadratic" (the physics of falling objects, Re > 1e3) or "linear" (Stokes drag,
        acceleration -b (v - w) with ``drag_parameter`` = b in 1/s). The linear law separates
        into independent axes with closed-form solutions, which makes it a check of the
        vector integrator; it is not meant for site objects.
    record_path : bool
        Keep the path of every trajectory in ``FallSolution.paths``: the state (x, y, z, vx,
        vy, vz) at the release, at the end of every accepted step and at contact (or where the
        trajectory was abandoned). Every trajectory is then integrated (``closed_form`` is
        ignored), so every one has a path. Without it nothing is kept and nothing is spent.

    Returns
    -------
    FallSolution
        Arrays over the n trajectories (and their paths with ``record_path``).

    Raises
    ------
    ValueError
        On shapes that do not broadcast or non-positive heights (programming errors: the
        models validate user input before it reaches the core).
    """
    wind = wind or WindField()
    if drag_law not in ("quadratic", "linear"):
        raise ValueError(f"drag_law must be 'quadratic' or 'linear'; got {drag_law!r}")
    linear = drag_law == "linear"
    model = _Model(wind.profile, linear)
    v0 = np.asarray(initial_velocity, dtype=float)
    if v0.ndim == 1:
        v0 = v0[:, None]
    if v0.shape[0] != 3:
        raise ValueError("initial_velocity must have shape (3,) or (3, n)")
    (h0, k, g, u10, ex, ey, alpha, z0, zmin, vx0, vy0, vz0) = _broadcast_lanes(
        release_height,
        drag_parameter,
        gravity,
        wind.speed_10m,
        wind.toward_east,
        wind.toward_north,
        wind.exponent,
        wind.roughness_length,
        wind.minimum_height,
        v0[0],
        v0[1],
        v0[2],
    )
    n = h0.size
    if np.any(~(h0 > 0)) or np.any(~np.isfinite(h0)):
        raise ValueError("release_height must be finite and > 0")
    if np.any(~(k >= 0)) or np.any(~np.isfinite(k)):
        raise ValueError("drag_parameter must be finite and >= 0")

    time = np.zeros(n)
    position = np.zeros((3, n))
    velocity = np.zeros((3, n))
    landed = np.zeros(n, dtype=bool)
    steps = np.zeros(n, dtype=np.int64)

    wx, wy = u10 * ex, u10 * ey
    todo = np.ones(n, dtype=bool)
    if closed_form and not linear and not record_path:
        uniform_air = (wind.profile == "uniform") | (u10 == 0.0)
        vertical = uniform_air & (vx0 == wx) & (vy0 == wy)
        if np.any(vertical):
            t_fall, speed = vertical_fall(h0[vertical], -vz0[vertical], k[vertical], g[vertical])
            # Falls beyond the limits go to the integrator, which reports where they stopped.
            within = (t_fall <= max_time) & (np.hypot(wx, wy)[vertical] * t_fall <= max_distance)
            vertical[vertical] = within
            t_fall, speed = t_fall[within], speed[within]
            time[vertical] = t_fall
            position[0, vertical] = wx[vertical] * t_fall
            position[1, vertical] = wy[vertical] * t_fall
            velocity[0, vertical] = wx[vertical]
            velocity[1, vertical] = wy[vertical]
            velocity[2, vertical] = -speed
            landed[vertical] = True
            todo = ~vertical

    # Rise above the release point (vertical, still air) bounds the height to fall.
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        terminal_sq = (g / k) ** 2 if linear else g / k
        rise = np.where(vz0 > 0, terminal_sq / (2 * g) * np.log1p(vz0 * vz0 / terminal_sq), 0.0)
        fall_height = g * (h0 + rise) / terminal_sq
    stiff = fall_height > STIFF_FALL_HEIGHT
    params = np.empty((_N_PARAMS, n))
    params[_K], params[_G], params[_WX], params[_WY] = k, g, wx, wy
    params[_EXP], params[_Z0], params[_ZMIN] = alpha, z0, zmin
    params[_T] = 0.0
    params[_STEPS] = 0.0
    params[_LANE] = np.arange(n)
    state = np.zeros((6, n))
    state[2], state[3], state[4], state[5] = h0, vx0, vy0, vz0
    result = FallSolution(time, position, velocity, landed, steps)
    # Recorded steps, one array per step and lane set: rows lane, time, then the state.
    record: list[NDArray[np.float64]] | None = None
    if record_path:
        record = [np.vstack([params[_LANE], params[_T], state])]
    # Both methods advance in the same loop, so the loop runs as long as the slowest lane of
    # either, not the sum of the two. Large sets go in blocks small enough for the working
    # arrays to stay in the processor cache.
    working = []
    for implicit in (False, True):
        lanes = np.flatnonzero(todo & (stiff == implicit))
        working += [
            _start_lanes(state[:, block], params[:, block], model, tolerance, implicit, record)
            for block in (lanes[i : i + LANE_BLOCK] for i in range(0, lanes.size, LANE_BLOCK))
        ]
    while working:
        for lane_set in working:
            _advance(lane_set, model, tolerance, max_time, max_distance, result)
        working = [lane_set for lane_set in working if lane_set.state.shape[1]]
    paths = None if record is None else _assemble_paths(record, result)
    return FallSolution(time, position, velocity, landed, steps, paths)


def _assemble_paths(
    record: list[NDArray[np.float64]], result: FallSolution
) -> tuple[NDArray[np.float64], ...]:
    """Sort the recorded steps into one (7, m) array per lane and end each at its result.

    The steps of one lane were recorded in time order, so a stable sort by lane keeps them in
    it. The contact's Taylor step often ends a hair before the last accepted step (when that
    step ended just below the ground, within the contact tolerance), and an abandoned lane
    ends where its last step did: recorded steps at or after the final time are dropped, so
    times increase strictly and the last column is exactly the lane's result.
    """
    steps = np.hstack(record)
    steps = steps[:, np.argsort(steps[0], kind="stable")]
    n = result.time.size
    bounds = np.searchsorted(steps[0], np.arange(n + 1) - 0.5)
    paths = []
    for lane in range(n):
        own = steps[1:, bounds[lane] : bounds[lane + 1]]
        end = np.concatenate(
            [[result.time[lane]], result.position[:, lane], result.velocity[:, lane]]
        )
        own = own[:, own[0] < end[0]]
        paths.append(np.hstack([own, end[:, None]]))
    return tuple(paths)


def sample_path(path: ArrayLike, times: ArrayLike) -> NDArray[np.float64]:
    """Positions on a recorded path at the given times, by cubic Hermite interpolation.

    Written out rather than ``scipy.interpolate.CubicHermiteSpline``: the spline's power-basis
    form ends a step within rounding of, not exactly at, the recorded point, and a drawn path
    must end exactly where the engine says (tests check it to the bit).

    On the step from t_i to t_i+1 = t_i + h, with theta = (t - t_i) / h,

        r(t) = (2 theta^3 - 3 theta^2 + 1) r_i + (theta^3 - 2 theta^2 + theta) h v_i
               + (-2 theta^3 + 3 theta^2) r_i+1 + (theta^3 - theta^2) h v_i+1,

    the cubic through both end positions with both end velocities (the recorded derivative
    of the position). It is exact for motion of degree 3 or less in time (a fall in vacuum)
    and has a local error of order h^4 otherwise: as accurate as the drawing needs, and
    continuous with a continuous velocity across steps.

    Parameters
    ----------
    path : array, shape (7, m)
        One trajectory's path from ``solve_falls(..., record_path=True).paths``: rows time
        [s], x, y, z [m], vx, vy, vz [m/s], times increasing.
    times : float or array, shape (p,)
        Times at which to evaluate; clipped to the path's span [0, T]. [s]

    Returns
    -------
    numpy.ndarray, shape (3, p)
        Positions x, y, z at those times. [m]

    Raises
    ------
    ValueError
        If ``path`` does not have 7 rows and at least one column (a programming error).

    References
    ----------
    .. [1] Hairer, E., Norsett, S. P. and Wanner, G., *Solving Ordinary Differential Equations
       I*, 2nd ed. (1993), sec. II.6 (dense output; Hermite interpolation).
    """
    path = np.asarray(path, dtype=float)
    if path.ndim != 2 or path.shape[0] != 7 or path.shape[1] < 1:
        raise ValueError("path must have shape (7, m) with m >= 1")
    t = path[0]
    at = np.clip(np.atleast_1d(np.asarray(times, dtype=float)), t[0], t[-1])
    if t.size == 1:
        return np.repeat(path[1:4], at.size, axis=1)
    i = np.clip(np.searchsorted(t, at, side="right") - 1, 0, t.size - 2)
    h = t[i + 1] - t[i]
    theta = (at - t[i]) / h
    t2 = theta * theta
    t3 = t2 * theta
    return (
        (2 * t3 - 3 * t2 + 1) * path[1:4, i]
        + (t3 - 2 * t2 + theta) * h * path[4:7, i]
        + (-2 * t3 + 3 * t2) * path[1:4, i + 1]
        + (t3 - t2) * h * path[4:7, i + 1]
    )


def _error_ratio(
    error: NDArray[np.float64],
    state: NDArray[np.float64],
    new_state: NDArray[np.float64],
    params: NDArray[np.float64],
    tolerance: float,
) -> NDArray[np.float64]:
    """Largest component of |error| / (atol + rtol max(|y|, |y_new|)) for each trajectory."""
    scale = np.maximum(np.abs(state), np.abs(new_state))
    scale *= tolerance
    scale[0:3] += params[_POS_SCALE]
    scale[3:6] += params[_VEL_SCALE]
    return np.max(np.abs(error) / scale, axis=0)


def _explicit_step(
    state: NDArray[np.float64],
    slope0: NDArray[np.float64],
    params: NDArray[np.float64],
    model: _Model,
    h: NDArray[np.float64],
    tolerance: float,
) -> tuple[NDArray[np.float64], NDArray[np.float64], NDArray[np.float64]]:
    """One Dormand-Prince 5(4) step; returns the new state, its derivative and the error ratio."""
    m = state.shape[1]
    stages = np.empty((7, 6, m))
    stages[0] = slope0
    trial = np.empty((6, m))
    for s in range(1, 6):
        _combine(_A_ROWS[s], stages, trial)
        trial *= h
        trial += state
        _rhs(trial, params, model, stages[s])
    new_state = np.empty((6, m))
    _combine(_B, stages, new_state)
    new_state *= h
    new_state += state
    _rhs(new_state, params, model, stages[6])
    error = np.empty((6, m))
    _combine(_E, stages, error)
    error *= h
    return new_state, stages[6], _error_ratio(error, state, new_state, params, tolerance)


def _combine(
    weights: NDArray[np.float64], stages: NDArray[np.float64], out: NDArray[np.float64]
) -> None:
    """Write sum_i weights[i] * stages[i] into ``out``, skipping zero weights.

    Plain in-place multiply-adds: faster here than ``tensordot``, which copies its operands.
    """
    first = True
    tmp = np.empty_like(out)
    for w, stage in zip(weights, stages, strict=False):
        if w == 0.0:
            continue
        if first:
            np.multiply(stage, w, out=out)
            first = False
        else:
            np.multiply(stage, w, out=tmp)
            out += tmp


#: The implicit method's local tolerance is this much looser than the explicit one's: drag
#: damps its local errors, and at equal tolerance it was 100x more accurate than needed
#: (tests/test_trajectory_accuracy.py measures the result).
_IMPLICIT_TOLERANCE_FACTOR = 30.0

#: Step-number sequence of the linearly implicit Euler extrapolation (harmonic sequence).
_EXTRAPOLATION_SEQUENCE = (1, 2, 3, 4, 5, 6)


def _velocity_jacobian(
    state: NDArray[np.float64], params: NDArray[np.float64], model: _Model
) -> tuple[NDArray[np.float64], NDArray[np.float64], NDArray[np.float64], NDArray[np.float64]]:
    """Pieces of the Jacobian of the acceleration a(z, v).

    d a / d v = -k (|u| I + u u^T / |u|) with u = v - w(z); d a / d z = -(d a / d v) dw/dz.
    Returns k |u|, k / |u|, u (3, m) and d a / d z (3, m).
    """
    ratio = speed_ratio(state[2], model.profile, params[_EXP], params[_Z0], params[_ZMIN])
    u = np.empty((3, state.shape[1]))
    u[0] = state[3] - params[_WX] * ratio
    u[1] = state[4] - params[_WY] * ratio
    u[2] = state[5]
    speed = np.sqrt(np.sum(u * u, axis=0))
    k = params[_K]
    if model.linear:  # d a / d v = -b I
        k_speed = k.copy()
        k_over_speed = np.zeros_like(k)
    else:
        k_speed = k * speed
        k_over_speed = np.where(speed > 0.0, k / np.where(speed > 0.0, speed, 1.0), 0.0)
    dz = np.zeros((3, state.shape[1]))
    if model.profile != "uniform":
        slope = speed_ratio_slope(state[2], model.profile, params[_EXP], params[_Z0], params[_ZMIN])
        wpx, wpy = params[_WX] * slope, params[_WY] * slope
        u_dot_wp = u[0] * wpx + u[1] * wpy
        dz[0] = k_speed * wpx + k_over_speed * u[0] * u_dot_wp
        dz[1] = k_speed * wpy + k_over_speed * u[1] * u_dot_wp
        dz[2] = k_over_speed * u[2] * u_dot_wp
    return k_speed, k_over_speed, u, dz


def _rank_two_solver(
    alpha: NDArray[np.float64],
    beta: NDArray[np.float64],
    u: NDArray[np.float64],
    u_squared: NDArray[np.float64],
    c: NDArray[np.float64],
) -> Callable[[NDArray[np.float64]], NDArray[np.float64]]:
    """The solver x -> M^-1 x, M = alpha I + beta u u^T - c e_z^T per lane ((m,), (3, m)).

    A = alpha I + beta u u^T has A^-1 y = (y - gamma u (u . y)) / alpha with
    gamma = beta / (alpha + beta |u|^2); then M = A - c e_z^T gives
    M^-1 x = A^-1 x + A^-1 c (e_z . A^-1 x) / (1 - e_z . A^-1 c) (Sherman and Morrison, Ann.
    Math. Statist. 21 (1950) 124-127; Golub and Van Loan, Matrix Computations, sec. 2.1.4).
    """
    gamma = beta / (alpha + beta * u_squared)

    def a_inverse(y: NDArray[np.float64]) -> NDArray[np.float64]:
        return (y - gamma * u * np.sum(u * y, axis=0)) / alpha

    a_inverse_c = a_inverse(c)
    scale = a_inverse_c / (1.0 - a_inverse_c[2])

    def solve(x: NDArray[np.float64]) -> NDArray[np.float64]:
        y = a_inverse(x)
        return y + scale * y[2]

    return solve


def _implicit_step(
    state: NDArray[np.float64],
    slope0: NDArray[np.float64],
    params: NDArray[np.float64],
    model: _Model,
    h: NDArray[np.float64],
    tolerance: float,
) -> tuple[NDArray[np.float64], NDArray[np.float64], NDArray[np.float64]]:
    """One step of linearly implicit Euler extrapolation (stiff-stable).

    Each sub-step of size s solves (I - s J) dy = s f(y) with the Jacobian J taken at the start
    of the step; the results for 1..6 sub-steps are extrapolated to zero step size with the
    Aitken-Neville scheme for an error expansion in powers of s. The difference of the last two
    diagonal entries estimates the error (Deuflhard, "Order and stepsize control in extrapolation
    methods", Numer. Math. 41 (1983) 399-422; Hairer and Wanner, *Solving Ordinary Differential
    Equations II*, 2nd ed. (1996), sec. IV.9).

    With y = (r, v), J = [[0, I], [a_z e_z^T, a_v]]: dr = s (v + dv) and
    (I - s a_v - s^2 a_z e_z^T) dv = s a + s^2 a_z v_z, a 3x3 system per trajectory.
    """
    k_speed, k_over_speed, u, dz = _velocity_jacobian(state, params, model)
    u_squared = np.sum(u * u, axis=0)
    table: list[NDArray[np.float64]] = []
    for j, n in enumerate(_EXTRAPOLATION_SEQUENCE):
        s = h / n
        s2 = s * s
        # M = alpha I + beta u u^T - c e_z^T (one 3x3 matrix per lane), alpha = 1 + s k|u|,
        # beta = s k/|u|, c = s^2 dz: solved by two Sherman-Morrison updates, not inverted.
        solve = _rank_two_solver(1.0 + s * k_speed, s * k_over_speed, u, u_squared, s2 * dz)
        y = state.copy()
        f = slope0
        for i in range(n):
            if i:
                f = np.empty_like(y)
                _rhs(y, params, model, f)
            rhs = s * f[3:6] + (s2 * y[5]) * dz
            dv = solve(rhs)
            y[3:6] += dv
            y[0:3] += s * y[3:6]
        row = [y]
        for col in range(1, j + 1):
            ratio = n / _EXTRAPOLATION_SEQUENCE[j - col] - 1.0
            row.append(row[col - 1] + (row[col - 1] - table[col - 1]) / ratio)
        table = row
    new_state = table[-1]
    error = table[-1] - table[-2]
    slope_new = np.empty_like(new_state)
    _rhs(new_state, params, model, slope_new)
    return new_state, slope_new, _error_ratio(error, state, new_state, params, tolerance)


#: Steps after which a lane is abandoned (landed False): no fall needs a thousandth of this, so
#: reaching it means the step control has failed, and the caller must not wait for ever.
MAX_STEPS = 200_000

#: Trajectories advanced together in one block: large enough to amortise numpy's per-call
#: cost, small enough for the working arrays (~40 rows of 8 bytes each) to fit in cache.
LANE_BLOCK = 16384

#: Above this dimensionless fall height g H / v_t^2 the drag relaxation time is short compared
#: with the fall and the explicit method would be held back by stability, not accuracy.
STIFF_FALL_HEIGHT = 20.0


@dataclass
class _Lanes:
    """Working arrays of the trajectories one method advances; compacted as lanes finish."""

    implicit: bool
    state: NDArray[np.float64]
    slope: NDArray[np.float64]
    params: NDArray[np.float64]
    ground_tolerance: NDArray[np.float64]
    #: Where accepted steps are recorded (rows lane, time, state), or None: nothing recorded.
    record: list[NDArray[np.float64]] | None = None


def _start_lanes(
    state: NDArray[np.float64],
    params: NDArray[np.float64],
    model: _Model,
    tolerance: float,
    implicit: bool,
    record: list[NDArray[np.float64]] | None = None,
) -> _Lanes:
    """Set the error scales, first step and kink floor of a set of lanes (copies its inputs)."""
    state = state.copy()
    params = params.copy()
    # Scales for the absolute part of the error control: a length and a speed per lane.
    wind_speed = np.hypot(params[_WX], params[_WY])
    speed0 = np.sqrt(np.sum(state[3:6] ** 2, axis=0))
    free_fall_speed = np.sqrt(2.0 * params[_G] * state[2])
    with np.errstate(divide="ignore", over="ignore"):
        terminal = params[_G] / params[_K] if model.linear else np.sqrt(params[_G] / params[_K])
        relaxation = 1.0 / params[_K] if model.linear else terminal / params[_G]
    speed_scale = np.minimum(free_fall_speed, terminal) + speed0 + wind_speed
    params[_VEL_SCALE] = tolerance * speed_scale
    params[_POS_SCALE] = tolerance * np.maximum(state[2], 1.0)
    # First step: a small fraction of the shortest time scale (fall time, drag relaxation).
    fall_time = state[2] / np.maximum(speed_scale, 1e-3)
    params[_H] = 0.01 * np.minimum(fall_time, relaxation)
    # The profile's slope jumps at the minimum height: stop there once on the way down, so that
    # no step straddles the kink (both methods assume a smooth right-hand side within a step).
    kinked = (model.profile != "uniform") & (params[_ZMIN] > 0.0) & (state[2] > params[_ZMIN])
    params[_FLOOR] = np.where(kinked, params[_ZMIN], 0.0)
    slope = np.empty_like(state)
    _rhs(state, params, model, slope)
    return _Lanes(implicit, state, slope, params, 1e-3 * params[_POS_SCALE], record)


def _advance(
    lanes: _Lanes,
    model: _Model,
    tolerance: float,
    max_time: float,
    max_distance: float,
    result: FallSolution,
) -> None:
    """Take one step on every lane; write finished lanes into ``result`` and drop them.

    A step that ends below the floor (the ground, or first the profile's minimum height) is
    not accepted: it is retried to the floor crossing estimated by a cubic Hermite
    interpolant. A lane within ``ground_tolerance`` of the ground is finished with a
    second-order Taylor step to z = 0. With ``lanes.record`` the accepted steps' ends are
    appended to it.
    """
    state, slope, params = lanes.state, lanes.slope, lanes.params
    step = _implicit_step if lanes.implicit else _explicit_step
    order = len(_EXTRAPOLATION_SEQUENCE) if lanes.implicit else 5
    h = params[_H]
    local_tolerance = tolerance * _IMPLICIT_TOLERANCE_FACTOR if lanes.implicit else tolerance
    new_state, new_slope, error_ratio = step(state, slope, params, model, h, local_tolerance)
    accept = error_ratio <= 1.0

    floor = params[_FLOOR]
    z_new = new_state[2] - floor
    crossed = accept & (z_new < -lanes.ground_tolerance)
    contact = accept & ~crossed & (np.abs(z_new) <= lanes.ground_tolerance)
    moved = accept & ~crossed

    with np.errstate(divide="ignore", over="ignore"):
        factor = np.clip(0.9 * error_ratio ** (-1.0 / order), 0.2, 5.0)
    factor = np.where(accept, factor, np.minimum(factor, 0.9))
    new_h = h * factor
    if np.any(crossed):
        theta = _hermite_root(
            state[2, crossed] - floor[crossed],
            h[crossed] * slope[2, crossed],
            z_new[crossed],
            h[crossed] * new_slope[2, crossed],
        )
        new_h[crossed] = h[crossed] * theta

    np.copyto(state, new_state, where=moved)
    np.copyto(slope, new_slope, where=moved)
    params[_T] += np.where(moved, h, 0.0)
    params[_STEPS] += 1.0
    if lanes.record is not None:
        lanes.record.append(np.vstack([params[_LANE, moved], params[_T, moved], state[:, moved]]))
    # No step may carry a lane far past the time or distance limit (long implicit steps could
    # otherwise overshoot it by kilometres): cap it at the time left and at the time to cover
    # the distance left at the current horizontal speed, with a little slack to cross it.
    horizontal = np.hypot(state[0], state[1])
    horizontal_speed = np.hypot(state[3], state[4])
    with np.errstate(divide="ignore", over="ignore"):
        distance_time = (max_distance - horizontal) / horizontal_speed
    time_left = np.minimum(max_time - params[_T], distance_time)
    # 1 % and a microsecond past the limit, so the next step reaches it (a relative floor
    # would let steps shrink geometrically short of it forever).
    params[_H] = np.minimum(new_h, np.maximum(1.01 * time_left, 0.0) + 1e-6)

    at_kink = contact & (floor > 0.0)
    params[_FLOOR, at_kink] = 0.0
    contact &= ~at_kink
    beyond = (params[_T] > max_time) | (horizontal > max_distance) | (params[_STEPS] > MAX_STEPS)
    contact &= ~beyond  # a landing past a limit is not a landing within it
    abandoned = ~contact & beyond
    finished = contact | abandoned
    if not np.any(finished):
        return
    idx = params[_LANE, finished].astype(np.int64)
    st = state[:, finished]
    acc = slope[:, finished]
    hit = contact[finished]
    # Second-order Taylor step from z (|z| tiny) to z = 0.
    z, vz, az = st[2], st[5], acc[5]
    disc = np.maximum(vz * vz - 2.0 * az * z, 0.0)
    safe_az = np.where(az != 0.0, az, 1.0)
    dt = np.where(hit, (-vz - np.sqrt(disc)) / safe_az, 0.0)
    linear = hit & (np.abs(az * z) < 1e-12 * vz * vz)
    dt = np.where(linear, -z / np.where(vz != 0.0, vz, -1.0), dt)
    pos = st[0:3] + st[3:6] * dt + 0.5 * acc[3:6] * dt * dt
    pos[2] = np.where(hit, 0.0, pos[2])
    result.time[idx] = params[_T, finished] + dt
    result.position[:, idx] = pos
    result.velocity[:, idx] = st[3:6] + acc[3:6] * dt
    result.landed[idx] = hit
    result.steps[idx] = params[_STEPS, finished].astype(np.int64)
    keep = ~finished
    lanes.state = state[:, keep]
    lanes.slope = slope[:, keep]
    lanes.params = params[:, keep]
    lanes.ground_tolerance = lanes.ground_tolerance[keep]
