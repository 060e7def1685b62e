"""Closed-form solutions of a vertical fall with quadratic drag.

They are exact when the object moves only vertically relative to the air: a drop in still air,
or an object released moving with a uniform wind (the wind-frame principle). The trajectory
solver uses them as a fast path in those cases, and the tests use them as oracles.

With k = rho C_d A / (2 m) and the terminal speed v_t = sqrt(g / k), for a fall from rest:

    v(t) = v_t tanh(g t / v_t)                       y(t) = (v_t^2 / g) ln cosh(g t / v_t)
    v(h) = v_t sqrt(1 - exp(-2 g h / v_t^2))         t(h) = (v_t / g) arccosh(exp(g h / v_t^2))

References
----------
Timmerman, P. and van der Weele, J. P., "On the rise and fall of a ball with linear or
quadratic drag", American Journal of Physics 67 (1999) 538-546.
"""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike, NDArray

#: Fall from rest that reaches 95 % of terminal speed, in units of v_t^2 / g:
#: -ln(1 - 0.95^2) / 2, from v(h) above [derived].
HEIGHT_FOR_95_PERCENT = float(-np.log(1.0 - 0.95**2) / 2.0)


def _log_arccosh_of_exp(log_y: NDArray[np.float64]) -> NDArray[np.float64]:
    """arccosh(exp(log_y)) for log_y >= 0 without overflow."""
    return log_y + np.log1p(np.sqrt(-np.expm1(-2.0 * log_y)))


def _log_arcsinh_of_exp(log_y: NDArray[np.float64]) -> NDArray[np.float64]:
    """arcsinh(exp(log_y)) without overflow."""
    return log_y + np.log1p(np.sqrt(1.0 + np.exp(-2.0 * log_y)))


def _log_cosh(x: NDArray[np.float64]) -> NDArray[np.float64]:
    """Return ln cosh(x) without overflow."""
    ax = np.abs(x)
    return ax + np.log1p(np.exp(-2.0 * ax)) - np.log(2.0)


def _log_sinh(x: NDArray[np.float64]) -> NDArray[np.float64]:
    """Return ln sinh(x) for x > 0 without overflow."""
    return x + np.log(-np.expm1(-2.0 * x)) - np.log(2.0)


#: Below this relative drag effect k (h + w0^2 / g) [-] a fall is solved as in vacuum.
VACUUM_DRAG_EFFECT = 1e-30


def vertical_fall(
    drop_height: ArrayLike,
    downward_speed: ArrayLike,
    drag_parameter: ArrayLike,
    gravity: ArrayLike,
) -> tuple[NDArray[np.float64], NDArray[np.float64]]:
    """Time and speed at the end of a vertical fall relative to still air.

    Handles an initial downward speed below, at or above terminal speed, an initial upward
    speed (rise, apex, then fall), and the vacuum limit k = 0.

    Parameters
    ----------
    drop_height : float or array
        Height fallen, > 0. [m]
    downward_speed : float or array
        Initial vertical speed, positive downwards (negative means thrown upwards). [m/s]
    drag_parameter : float or array
        k = rho C_d A / (2 m), >= 0. [1/m]
    gravity : float or array
        Acceleration of gravity. [m/s^2]

    Returns
    -------
    time : numpy.ndarray
        Time to fall ``drop_height`` (including any rise). [s]
    speed : numpy.ndarray
        Downward speed at the end of the fall. [m/s]

    Notes
    -----
    Downward start, w0 < v_t: v = v_t tanh(g t/v_t + phi), phi = artanh(w0/v_t), so
    y = (v_t^2/g) ln(cosh(g t/v_t + phi)/cosh(phi)). Downward start, w0 > v_t: v = v_t coth(...),
    y = (v_t^2/g) ln(sinh(g t/v_t + psi)/sinh(psi)), psi = arcoth(w0/v_t). In both cases
    v(h)^2 = v_t^2 - (v_t^2 - w0^2) exp(-2 g h / v_t^2). Upward start u0: apex after
    (v_t/g) atan(u0/v_t) at (v_t^2/2g) ln(1 + u0^2/v_t^2) above the start (Timmerman and
    van der Weele 1999, eqs. for the rising ball).
    """
    h = np.asarray(drop_height, dtype=float)
    w0 = np.asarray(downward_speed, dtype=float)
    k = np.asarray(drag_parameter, dtype=float)
    g = np.asarray(gravity, dtype=float)
    h, w0, k, g = np.broadcast_arrays(h, w0, k, g)
    time = np.empty(h.shape)
    speed = np.empty(h.shape)

    # No drag, or so little that its relative effect, about k (h + w0^2 / g), is far below
    # rounding (a subnormal k would otherwise underflow the dimensionless drop to zero).
    with np.errstate(over="ignore", invalid="ignore"):
        vacuum = (k == 0.0) | (k * (h + w0 * w0 / g) < VACUUM_DRAG_EFFECT)
    if np.any(vacuum):
        hv, wv, gv = h[vacuum], w0[vacuum], g[vacuum]
        v_end = np.sqrt(wv * wv + 2.0 * gv * hv)
        time[vacuum] = (v_end - wv) / gv
        speed[vacuum] = v_end

    drag = ~vacuum
    if np.any(drag):
        hd, wd, kd, gd = h[drag], w0[drag].copy(), k[drag], g[drag]
        vt = np.sqrt(gd / kd)
        t_extra = np.zeros_like(hd)
        up = wd < 0.0
        # Rise to the apex, then fall from rest from there.
        u0 = -wd[up]
        t_extra[up] = vt[up] / gd[up] * np.arctan(u0 / vt[up])
        hd[up] = hd[up] + vt[up] ** 2 / (2.0 * gd[up]) * np.log1p((u0 / vt[up]) ** 2)
        wd[up] = 0.0

        x = gd * hd / vt**2  # dimensionless drop
        ratio = wd / vt
        # v_t^2 - (v_t^2 - w0^2) e^(-2x), written with expm1 so that x -> 0 keeps its digits.
        speed[drag] = vt * np.sqrt(ratio**2 * np.exp(-2.0 * x) - np.expm1(-2.0 * x))
        tau = vt / gd
        t_fall = np.empty_like(hd)
        # Short drops (x <= 1): the difference form below cancels when the drop is tiny beside
        # the start speed's own scale (k -> 0 with a downward start); solve directly for
        # D = g t / v_t instead (see _drag_time_short).
        short = x <= 1.0
        t_fall[short] = tau[short] * _drag_time_short(x[short], ratio[short])
        slow = ~short & (ratio < 1.0)
        phi = np.arctanh(ratio[slow])
        t_fall[slow] = tau[slow] * (_log_arccosh_of_exp(_log_cosh(phi) + x[slow]) - phi)
        fast = ~short & (ratio > 1.0)
        psi = np.arctanh(1.0 / ratio[fast])
        t_fall[fast] = tau[fast] * (_log_arcsinh_of_exp(_log_sinh(psi) + x[fast]) - psi)
        at_terminal = ~short & (ratio == 1.0)
        t_fall[at_terminal] = hd[at_terminal] / vt[at_terminal]
        time[drag] = t_fall + t_extra
    return time, speed


def _drag_time_short(drop: NDArray[np.float64], ratio: NDArray[np.float64]) -> NDArray[np.float64]:
    """Dimensionless fall time D = g t / v_t for a dimensionless drop x = g h / v_t^2 <= 1.

    Both downward branches of :func:`vertical_fall` (tanh below terminal speed, coth above)
    reduce to one equation in D with r = w0 / v_t >= 0 (the start speed over terminal):
    cosh(D) + r sinh(D) = e^x. Its root s = e^D of (1 + r) s^2 - 2 e^x s + (1 - r) = 0 is
    written so that nothing cancels as x -> 0 or r -> 0:

        s - 1 = (expm1(x) + q / (sqrt(q + r^2) + r)) / (1 + r),   q = expm1(2 x),
        D = log1p(s - 1).

    From rest (r = 0) this is D = arccosh(e^x); at terminal speed (r = 1), D = x.
    """
    q = np.expm1(2.0 * drop)
    growth = np.expm1(drop) + q / (np.sqrt(q + ratio * ratio) + ratio)
    with np.errstate(invalid="ignore", divide="ignore"):
        return np.log1p(np.where(q > 0.0, growth, 0.0) / (1.0 + ratio))


def speed_after_time(
    time: ArrayLike, drag_parameter: ArrayLike, gravity: ArrayLike
) -> NDArray[np.float64]:
    """Speed [m/s] after falling from rest for ``time``: v = v_t tanh(g t / v_t).

    Parameters
    ----------
    time : float or array
        Time since release from rest. [s]
    drag_parameter : float or array
        k = rho C_d A / (2 m), > 0. [1/m]
    gravity : float or array
        Acceleration of gravity. [m/s^2]
    """
    g = np.asarray(gravity, dtype=float)
    vt = np.sqrt(g / np.asarray(drag_parameter, dtype=float))
    return vt * np.tanh(g * np.asarray(time, dtype=float) / vt)


def distance_after_time(
    time: ArrayLike, drag_parameter: ArrayLike, gravity: ArrayLike
) -> NDArray[np.float64]:
    """Distance [m] fallen from rest after ``time``: y = (v_t^2 / g) ln cosh(g t / v_t).

    Parameters
    ----------
    time : float or array
        Time since release from rest. [s]
    drag_parameter : float or array
        k = rho C_d A / (2 m), > 0. [1/m]
    gravity : float or array
        Acceleration of gravity. [m/s^2]
    """
    g = np.asarray(gravity, dtype=float)
    vt = np.sqrt(g / np.asarray(drag_parameter, dtype=float))
    return vt**2 / g * _log_cosh(g * np.asarray(time, dtype=float) / vt)


def height_to_reach_fraction(
    fraction: ArrayLike, drag_parameter: ArrayLike, gravity: ArrayLike
) -> NDArray[np.float64]:
    """Fall from rest [m] needed to reach ``fraction`` of terminal speed.

    From v(h) = v_t sqrt(1 - exp(-2 g h / v_t^2)): h = -(v_t^2 / 2g) ln(1 - fraction^2).
    For fraction 0.95 this is 1.1640 v_t^2 / g.

    Parameters
    ----------
    fraction : float or array
        Fraction of terminal speed, 0 <= fraction < 1. [-]
    drag_parameter : float or array
        k = rho C_d A / (2 m), > 0 (infinite height when k = 0). [1/m]
    gravity : float or array
        Acceleration of gravity. [m/s^2]
    """
    f = np.asarray(fraction, dtype=float)
    with np.errstate(divide="ignore", over="ignore"):
        vt2 = np.asarray(gravity, dtype=float) / np.asarray(drag_parameter, dtype=float)
    return -vt2 / (2.0 * np.asarray(gravity, dtype=float)) * np.log1p(-(f**2))
