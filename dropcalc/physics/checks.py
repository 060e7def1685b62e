"""Input checks shared by the physics modules that accept samples (floats or 1-D arrays)."""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike, NDArray

from dropcalc.errors import InputError, require_range_array


def as_samples(name: str, value: ArrayLike) -> NDArray[np.float64]:
    """Return ``value`` as a float array of dimension 0 or 1, else raise InputError."""
    try:
        array = np.asarray(value, dtype=float)
    except OverflowError:
        raise InputError(f"{name} must be a finite number; got {value!r:.40}", field=name) from None
    except (TypeError, ValueError):
        raise InputError(
            f"{name} must be a number or a 1-D array of numbers; got {value!r}", field=name
        ) from None
    if array.ndim > 1:
        raise InputError(
            f"{name} must be a number or a 1-D array; got shape {array.shape}", field=name
        )
    return array


def first_bad(array: NDArray[np.float64], good: NDArray[np.bool_]) -> float:
    """First element of ``array`` where ``good`` is False (NaN counts as bad)."""
    return float(np.broadcast_to(array, np.shape(good))[~good].flat[0])


#: Acceleration of gravity accepted by the physics entries that take it from a user [m/s^2]:
#: anywhere on or near the Earth's surface (WGS84 normal gravity 9.780-9.832, less at altitude).
GRAVITY_RANGE = (9.7, 9.9)


def check_gravity(gravity: ArrayLike) -> NDArray[np.float64]:
    """Return ``gravity`` as an array, or raise InputError if outside :data:`GRAVITY_RANGE`."""
    g = as_samples("gravity", gravity)
    return require_range_array("gravity", g, *GRAVITY_RANGE, "m/s²", " (the Earth's surface)")
