"""Input checks shared by the physics modules that accept samples (floats or 1-D arrays)."""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike, NDArray

from dropcalc.errors import InputError


def as_samples(name: str, value: ArrayLike) -> NDArray[np.float64]:
    """Return ``value`` as a float array of dimension 0 or 1, else raise InputError."""
    try:
        array = np.asarray(value, dtype=float)
    except (TypeError, ValueError):
        raise InputError(
            f"{name} must be a number or a 1-D array of numbers; got {value!r}"
        ) from None
    if array.ndim > 1:
        raise InputError(f"{name} must be a number or a 1-D array; got shape {array.shape}")
    return array


def first_bad(array: NDArray, good: NDArray) -> float:
    """First element of ``array`` where ``good`` is False (NaN counts as bad)."""
    return float(np.broadcast_to(array, np.shape(good))[~good].flat[0])
