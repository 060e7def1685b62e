"""The domain exceptions and warnings of dropcalc.

Every error a user can cause is an :class:`InputError` (or a subclass) whose message names the
field, the value given and what is allowed, e.g.
``release_height must be a finite length > 0 m; got -3 m``. The CLI catches
:class:`DropcalcError` once, prints the message on one line and exits with code 2.
"""

from __future__ import annotations

import re
import stat
from pathlib import Path
from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:  # numpy is imported where an array is checked: the CLI starts without it
    import numpy as np
    from numpy.typing import NDArray


class DropcalcError(Exception):
    """Base class of every error dropcalc raises on purpose.

    The error carries what went wrong as data: ``field`` (the model's name for the input, e.g.
    ``"mass"``; None when the error is about no single field), ``value`` (what was given) and
    ``allowed`` (what would have been accepted, as words: ``"between 0.5 and 0.9999"``). The
    CLI names the option from ``field`` and a file reader names the key from it; neither reads
    the message back. Given those and no message, the message is built from them:
    ``{field} must be {allowed}; got {value} {unit}``.

    Parameters
    ----------
    message : str, optional
        The whole message; built from the fields below when omitted.
    field : str, optional
        Name of the input that failed.
    value : object, optional
        The value given (shown with ``:g`` for a number).
    allowed : str, optional
        What is allowed, completing "must be ...".
    unit : str
        Unit symbol shown after the value in a built message.
    """

    def __init__(
        self,
        message: str | None = None,
        *,
        field: str | None = None,
        value: object = None,
        allowed: str | None = None,
        unit: str = "",
    ) -> None:
        self.field = field
        self.value = value
        self.allowed = allowed
        #: The message without the field's name in front, for a reader that names the field
        #: its own way (a file's key path): "must be between 0.5 and 0.9999; got 1.5".
        if message is None:
            shown = f"{value:g}" if isinstance(value, float) else str(value)
            self.detail = f"must be {allowed}; got {shown}{' ' + unit if unit else ''}"
            message = f"{field} {self.detail}"
        else:
            self.detail = message
        super().__init__(message)


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
        raise InputError(
            f"{name} must be a number{' in ' + unit if unit else ''}; got {value!r}", field=name
        )
    try:
        return float(value)  # type: ignore[arg-type]
    except OverflowError:
        return float("inf") if value > 0 else float("-inf")  # type: ignore[operator]
    except (TypeError, ValueError):
        raise InputError(
            f"{name} must be a number{' in ' + unit if unit else ''}; got {value!r}", field=name
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
        raise InputError(field=name, value=v, allowed=f"a finite value {bound} {unit}", unit=unit)
    return v


def range_error(
    name: str, value: float, low: float, high: float, unit: str = "", note: str = ""
) -> InputError:
    """The one message of a value outside its range, as an :class:`InputError` with its data.

    ``{name} must be between {low} and {high} {unit}{note}; got {value} {unit}``; ``note`` says
    why, e.g. " (the Earth's surface)".
    """
    unit_shown = f" {unit}" if unit else ""
    return InputError(
        field=name,
        value=float(value),
        allowed=f"between {low:g} and {high:g}{unit_shown}{note}",
        unit=unit,
    )


def require_range(
    name: str, value: object, low: float, high: float, unit: str = "", note: str = ""
) -> float:
    """Return ``value`` as float if ``low <= value <= high`` (so finite), else raise InputError.

    The one range check of the model layer (the limits themselves are in
    :mod:`dropcalc.model.limits`); arrays are checked element-wise by :func:`require_range_array`.
    A number too large for a float counts as infinite; a non-number names the field.
    """
    v = to_float(name, value, unit)
    if not (low <= v <= high):  # NaN compares False
        raise range_error(name, v, low, high, unit, note)
    return v


def require_range_array(
    name: str, values: object, low: float, high: float, unit: str = "", note: str = ""
) -> NDArray[np.float64]:
    """:func:`require_range` for a number or an array: the first bad element is named."""
    import numpy as np

    try:
        array = np.asarray(values, dtype=float)
    except OverflowError:
        raise InputError(
            f"{name} must be a finite number; got {values!r:.40}", field=name
        ) from None
    except (TypeError, ValueError):
        raise InputError(f"{name} must be a number; got {values!r:.40}", field=name) from None
    bad = ~((array >= low) & (array <= high))  # NaN compares False, so it is caught here
    if bad.any():
        raise range_error(name, float(array[bad].flat[0]), low, high, unit, note)
    return array


def shorten(text: object, limit: int = 80) -> str:
    """``str(text)`` cut to ``limit`` characters with an ellipsis, for quoting user text."""
    shown = str(text)
    return shown if len(shown) <= limit else shown[: limit - 1] + "…"


def require_file(path: object, what: str, max_bytes: int | None = None) -> Path:
    """Return ``path`` as a :class:`~pathlib.Path` if it names a readable regular file.

    Parameters
    ----------
    path : str or os.PathLike
        The file the user named.
    what : str
        What the file is for, used in the message ("object list", "site file").
    max_bytes : int or None
        Largest size accepted [bytes] (``dropcalc.model.limits``); None for no limit.

    Raises
    ------
    InputError
        If the file does not exist, is a folder, is not a regular file (``/dev/zero``, a pipe:
        reading them never ends or blocks), is larger than ``max_bytes``, or its name cannot
        be looked up at all (a name too long for the file system, a NUL byte); the message
        names the file and the reason.
    """
    shown = shorten(path, 120)
    try:
        file = Path(path)  # type: ignore[arg-type]
        mode = file.stat().st_mode
        if stat.S_ISREG(mode):
            size = file.stat().st_size
            if max_bytes is None or size <= max_bytes:
                return file
            reason = f"{size:,} bytes; at most {max_bytes:,} bytes are read (docs/limits.md)"
        elif stat.S_ISDIR(mode):
            reason = "is a folder, not a file"
        else:
            reason = "not a regular file (a device, pipe or socket); name a saved file"
    except FileNotFoundError:
        reason = "no such file"
    except (OSError, ValueError) as exc:  # ENAMETOOLONG, ELOOP, EACCES on a parent; NUL byte
        reason = getattr(exc, "strerror", None) or str(exc)
    raise InputError(f"{what} {shown}: {reason}")


def read_file(path: object, what: str, max_bytes: int) -> bytes:
    """The bytes of a regular file of at most ``max_bytes``, read with that cap.

    Raises
    ------
    InputError
        As :func:`require_file`, or when the file cannot be read or grew past the cap.
    """
    file = require_file(path, what, max_bytes)
    try:
        with file.open("rb") as handle:
            data = handle.read(max_bytes + 1)
    except OSError as exc:
        raise InputError(f"{what} {shorten(path, 120)}: cannot read ({exc.strerror})") from None
    if len(data) > max_bytes:
        raise InputError(
            f"{what} {shorten(path, 120)}: more than {max_bytes:,} bytes (docs/limits.md)"
        )
    return data


def parse_toml(raw: bytes, label: str, what: str) -> tuple[dict[str, Any], str]:
    """Decode ``raw`` as UTF-8 (a byte-order mark allowed) and parse it as TOML.

    The one place where every TOML input (scenario, site, policy, object library) turns a
    decoding or syntax problem into a one-line :class:`InputError` starting with ``label``.

    Returns
    -------
    tuple of dict and str
        The parsed document and its text (for readers that locate keys by line).
    """
    import tomllib

    try:
        text = raw.decode("utf-8-sig")
        return tomllib.loads(text), text
    except UnicodeDecodeError:
        raise InputError(f"{label}: not UTF-8 text; save the {what} as UTF-8") from None
    except tomllib.TOMLDecodeError as exc:
        raise InputError(f"{label}: not valid TOML: {exc}") from None
    except RecursionError:  # tomllib recurses once per nested "[" or "{"
        raise InputError(f"{label}: not valid TOML: arrays or tables nested too deep") from None


def require_suffix(path: object, allowed: tuple[str, ...], field: str) -> str:
    """Return the lower-case suffix of ``path`` (".csv") if it is one of ``allowed``.

    Raises
    ------
    InputError
        Naming ``field``, the allowed suffixes and the file name given (shortened if long).
    """
    name = Path(str(path)).name
    suffix = Path(name).suffix.lower()
    if suffix not in allowed:
        listed = ", ".join(allowed[:-1]) + " or " + allowed[-1] if len(allowed) > 1 else allowed[0]
        raise InputError(f"{field} must end in {listed}; got {shorten(name, 80)}", field=field)
    return suffix


#: Longest error message printed [characters]: a message quoting a pasted-in value (a huge
#: spreadsheet cell) keeps its start and end and loses its middle.
MAX_MESSAGE = 400


_CONTROL_RE = re.compile(r"[\x00-\x08\x0b-\x1f\x7f-\x9f]")


def printable(text: str) -> str:
    r"""Text safe to print on a terminal: control and escape characters shown as ``\xNN``.

    An id such as ``brick\e]0;TITLE\a`` would otherwise set the terminal's title (or worse)
    when a row error quotes it. Line breaks and tabs are kept.
    """
    return _CONTROL_RE.sub(lambda match: f"\\x{ord(match.group()):02x}", text)


def one_line(message: str) -> str:
    """A message fit for one terminal line: control characters escaped, MAX_MESSAGE long."""
    message = printable(message.replace("\r", "\\r").replace("\n", "\\n"))
    if len(message) <= MAX_MESSAGE:
        return message
    keep = (MAX_MESSAGE - 5) // 2
    return f"{message[:keep]} ... {message[-keep:]}"
