"""The domain exceptions and warnings of dropcalc.

Every error a user can cause is an :class:`InputError` (or a subclass) whose message names the
field, the value given and what is allowed, e.g.
``release_height must be a finite length > 0 m; got -3 m``. The CLI catches
:class:`DropcalcError` once, prints the message on one line and exits with code 2.
"""

from __future__ import annotations


class DropcalcError(Exception):
    """Base class of every error dropcalc raises on purpose."""


class InputError(DropcalcError, ValueError):
    """A value given by the user is missing, malformed or outside the allowed range."""


class UnknownObjectError(DropcalcError, LookupError):
    """A name (object id, terrain class, release mode) that dropcalc does not know."""


class ModelValidityWarning(UserWarning):
    """A result was computed outside the range where the model or a correlation is valid."""


def to_float(name: str, value: object, unit: str = "") -> float:
    """``float(value)``, with a number too large for a float read as infinite.

    Raises
    ------
    InputError
        When ``value`` is not a number (a text, None, a list), naming the field.
    """
    if isinstance(value, bool):
        raise InputError(f"{name} must be a number{' in ' + unit if unit else ''}; got {value!r}")
    try:
        return float(value)  # type: ignore[arg-type]
    except OverflowError:
        return float("inf") if value > 0 else float("-inf")  # type: ignore[operator]
    except (TypeError, ValueError):
        raise InputError(
            f"{name} must be a number{' in ' + unit if unit else ''}; got {value!r}"
        ) from None


def require_finite_positive(
    name: str, value: float, unit: str, *, allow_zero: bool = False
) -> float:
    """Return ``value`` as float if it is finite and > 0 (or >= 0), else raise InputError.

    Parameters
    ----------
    name : str
        Field name used in the message.
    value : float
        The value to check, in SI units.
    unit : str
        SI unit symbol shown in the message.
    allow_zero : bool
        Accept zero as well.

    Raises
    ------
    InputError
        If the value is NaN, infinite, negative, or zero when zero is not allowed.
    """
    v = to_float(name, value, unit)
    bound = ">= 0" if allow_zero else "> 0"
    ok = v == v and v not in (float("inf"), float("-inf")) and (v >= 0 if allow_zero else v > 0)
    if not ok:
        raise InputError(f"{name} must be a finite value {bound} {unit}; got {value:g} {unit}")
    return v


def require_range(name: str, value: float, low: float, high: float, unit: str) -> float:
    """Return ``value`` as float if ``low <= value <= high`` and finite, else raise InputError."""
    v = to_float(name, value, unit)
    if not (v == v and low <= v <= high):
        raise InputError(
            f"{name} must be between {low:g} and {high:g} {unit}; got {value:g} {unit}".rstrip()
        )
    return v
