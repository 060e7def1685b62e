"""Units at the edge: read quantities typed by users, convert SI results for display.

Users type quantities such as ``"12 lb"``, ``"100 ft"``, ``"25 mph"``, ``"20 °C"``, ``"3 ft²"`` or
``"50 %"``. :func:`parse_quantity` reads them with pint and returns a plain SI float, which is all
the physics core ever sees. :func:`to_display` and :func:`format_quantity` go the other way for
output, with plain constants, so displaying results never needs pint.

Conventions of this module (shown to users in ``--help`` texts and the glossary):

- A bare number is in the kind's default unit, which is the SI unit except for:
  temperature, where a bare number is **degrees Celsius** (a bare number is ambiguous, and site
  people read thermometers and forecasts in °C; write ``"293.15 K"`` or ``"68 °F"`` otherwise);
  angle, which is returned and read in **degrees**; fraction, where a bare number must lie in
  0..1 (write ``"50 %"`` for a percentage).
- A decimal comma is accepted: ``"12,5 kg"`` is 12.5 kg. A comma that could be a thousands
  separator (``"1,500 m"``: 1.5 or 1500?) is refused with a message; write numbers without
  thousands separators.
- Unicode superscripts (``m²``, ``m³``, ``s⁻¹``), the middle dot (``ft·lbf``) and the degree sign
  (``35°``, ``20 °C``) are understood, as are ``sq ft``, ``m2``, ``kph``, ``kn``, ``lbs``.
- Only one number and one unit expression are read: ``"5 ft 3 in"`` is refused.

pint is imported on first use only (creating its registry takes about 0.3 s), so that importing
this module, and with it ``dropcalc --help``, stays fast.
"""

from __future__ import annotations

import functools
import math
import numbers
import re
from collections.abc import Callable
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any, Literal

from dropcalc.errors import InputError, shorten
from dropcalc.model.limits import MAX_QUANTITY_CHARACTERS
from dropcalc.physics.constants import STANDARD_GRAVITY

if TYPE_CHECKING:  # pragma: no cover - typing only, never imported at run time
    import pint

UnitSystem = Literal["si", "imperial"]
UNIT_SYSTEMS: tuple[str, ...] = ("si", "imperial")

# --- Display conversion factors [SI units per display unit] -------------------------------------
# Exact by definition, NIST SP 811 (2008), Guide for the Use of the International System of
# Units, Appendix B (international foot, avoirdupois pound, pound-force with standard gravity,
# mile per hour).
FOOT = 0.3048  # [m]
INCH = 0.0254  # [m]
POUND = 0.45359237  # [kg]
POUND_FORCE = 4.4482216152605  # [N] = POUND * 9.80665 m/s^2
MILE_PER_HOUR = 0.44704  # [m/s]
#: Conventional inch of mercury [Pa]: 13 595.1 kg/m³ x 9.806 65 m/s² x 0.0254 m, which
#: NIST SP 811 (2008), Appendix B.8 prints as 3.386 389 E+03 Pa.
INCH_OF_MERCURY = 13595.1 * STANDARD_GRAVITY * INCH
#: Offset of 0 °C on the kelvin scale [K]. SI Brochure, 9th edition (2019), 2.3.1 (section from
#: memory).
CELSIUS_ZERO = 273.15
#: Offset of 0 °F on the Rankine scale [°R]; t/°F = T/K x 9/5 - 459.67. NIST SP 811 (2008),
#: Appendix B.9, temperature (section from memory).
FAHRENHEIT_ZERO_RANKINE = 459.67


@dataclass(frozen=True)
class DisplayUnit:
    """A unit for showing results: ``shown = value_si / size - offset``.

    Attributes
    ----------
    label : str
        Unit symbol as printed, e.g. ``"ft·lbf"``.
    size : float
        Size of one display unit in SI units, e.g. 0.3048 for ft.
    offset : float
        Offset subtracted after scaling (temperature scales only), in display units.
    """

    label: str
    size: float
    offset: float = 0.0


@dataclass(frozen=True)
class Kind:
    """One kind of quantity: how it is read and how it is shown.

    Attributes
    ----------
    noun : str
        Name of the kind with its article, used in messages, e.g. ``"a length"``.
    dimensionality : str
        pint dimensionality in pint's own spelling, e.g. ``"[length] / [time]"``.
    si_unit : str
        pint expression of the unit :func:`parse_quantity` returns.
    si : DisplayUnit
        Display unit for ``system="si"``.
    imperial : DisplayUnit
        Display unit for ``system="imperial"``.
    examples : tuple of str
        Typed examples shown in error messages.
    allowed_units : frozenset of str or None
        For dimensionless kinds, the pint unit names accepted (angles, percentages and plain
        ratios share pint's ``dimensionless``); None accepts any unit of the right dimension.
    bare_offset : float
        Added to a bare number to get SI (273.15 for temperature, whose bare unit is °C).
    """

    noun: str
    dimensionality: str
    si_unit: str
    si: DisplayUnit
    imperial: DisplayUnit
    examples: tuple[str, ...]
    allowed_units: frozenset[str] | None = None
    bare_offset: float = 0.0


_ANGLE_UNITS = frozenset({"degree", "radian", "arcminute", "arcsecond", "turn"})
_DEGREE = DisplayUnit("°", 1.0)
_PERCENT = DisplayUnit("%", 0.01)
_PLAIN = DisplayUnit("", 1.0)
_SECOND = DisplayUnit("s", 1.0)

#: The one table of kinds: dimension, SI unit returned by :func:`parse_quantity`, display units.
KINDS: dict[str, Kind] = {
    "length": Kind(
        "a length", "[length]", "m", DisplayUnit("m", 1.0), DisplayUnit("ft", FOOT),
        ("12 m", "40 ft"),
    ),
    "mass": Kind(
        "a mass", "[mass]", "kg", DisplayUnit("kg", 1.0), DisplayUnit("lb", POUND),
        ("12 kg", "25 lb"),
    ),
    "speed": Kind(
        "a speed", "[length] / [time]", "m/s", DisplayUnit("m/s", 1.0),
        DisplayUnit("mph", MILE_PER_HOUR), ("12 m/s", "40 km/h", "25 mph", "20 kn"),
    ),
    "area": Kind(
        "an area", "[length] ** 2", "m**2", DisplayUnit("m²", 1.0), DisplayUnit("ft²", FOOT**2),
        ("0.05 m²", "80 cm²", "3 ft²"),
    ),
    "temperature": Kind(
        "a temperature", "[temperature]", "K", DisplayUnit("°C", 1.0, CELSIUS_ZERO),
        DisplayUnit("°F", 5.0 / 9.0, FAHRENHEIT_ZERO_RANKINE), ("20 °C", "68 °F", "293.15 K"),
        bare_offset=CELSIUS_ZERO,
    ),
    "pressure": Kind(
        "a pressure", "[mass] / [length] / [time] ** 2", "Pa", DisplayUnit("kPa", 1000.0),
        DisplayUnit("inHg", INCH_OF_MERCURY), ("101.3 kPa", "1013 hPa", "29.92 inHg"),
    ),
    "angle": Kind(
        "an angle", "dimensionless", "degree", _DEGREE, _DEGREE, ("35°", "35 deg", "0.6 rad"),
        allowed_units=_ANGLE_UNITS,
    ),
    "fraction": Kind(
        "a fraction", "dimensionless", "dimensionless", _PERCENT, _PERCENT, ("50 %", "0.5"),
        allowed_units=frozenset({"dimensionless", "percent"}),
    ),
    "density": Kind(
        "a density", "[mass] / [length] ** 3", "kg/m**3", DisplayUnit("kg/m³", 1.0),
        DisplayUnit("lb/ft³", POUND / FOOT**3), ("1.225 kg/m³", "0.0765 lb/ft³"),
    ),
    "time": Kind("a time", "[time]", "s", _SECOND, _SECOND, ("3 s", "2 min")),
    "dimensionless": Kind(
        "a plain number", "dimensionless", "dimensionless", _PLAIN, _PLAIN, ("0.8",),
        allowed_units=frozenset({"dimensionless"}),
    ),
    "energy": Kind(
        "an energy", "[mass] * [length] ** 2 / [time] ** 2", "J", DisplayUnit("J", 1.0),
        DisplayUnit("ft·lbf", FOOT * POUND_FORCE), ("55 J", "40 ft·lbf"),
    ),
    "momentum": Kind(
        "a momentum", "[mass] * [length] / [time]", "kg*m/s", DisplayUnit("kg·m/s", 1.0),
        DisplayUnit("lb·ft/s", POUND * FOOT), ("20 kg·m/s", "145 lb·ft/s"),
    ),
    # SI display in J/cm², the trade's unit for penetration; imperial display in ft·lbf/in².
    "energy_per_area": Kind(
        "an energy per area", "[mass] / [time] ** 2", "J/m**2", DisplayUnit("J/cm²", 1.0e4),
        DisplayUnit("ft·lbf/in²", FOOT * POUND_FORCE / INCH**2), ("3 J/cm²", "14 ft·lbf/in²"),
    ),
    "force": Kind(
        "a force", "[mass] * [length] / [time] ** 2", "N", DisplayUnit("N", 1.0),
        DisplayUnit("lbf", POUND_FORCE), ("100 N", "22 lbf"),
    ),
    "acceleration": Kind(
        "an acceleration", "[length] / [time] ** 2", "m/s**2", DisplayUnit("m/s²", 1.0),
        DisplayUnit("ft/s²", FOOT), ("9.81 m/s²", "32.2 ft/s²"),
    ),
}  # fmt: skip

#: Names for dimensions outside :data:`KINDS`, used only to say what the user typed instead.
_OTHER_DIMENSIONS: dict[str, str] = {
    "[length] ** 3": "a volume",
    "1 / [time]": "a frequency",
    "[current] * [time]": "an electric charge",
    "[mass] * [length] ** 2 / [time] ** 3": "a power",
}


# --- Registry ------------------------------------------------------------------------------------
@functools.cache
def unit_registry() -> pint.UnitRegistry[Any]:
    """Return the one pint registry of dropcalc, created (and pint imported) on first call."""
    import pint

    return pint.UnitRegistry()


# --- Parsing -------------------------------------------------------------------------------------
_NUMBER_RE = re.compile(
    r"""^\s*(?P<number>[+-]?(?:\d+(?:[.,]\d*)?|[.,]\d+)(?:[eE][+-]?\d+)?
        |[+-]?(?:nan|inf(?:inity)?))\s*(?P<unit>.*?)\s*$""",
    re.IGNORECASE | re.VERBOSE,
)
#: A comma with exactly three digits after a 1-3 digit integer part reads as a thousands separator.
_THOUSANDS_RE = re.compile(r"^[+-]?[1-9]\d{0,2},\d{3}$")

_SUPERSCRIPTS = str.maketrans("⁰¹²³⁴⁵⁶⁷⁸⁹⁻", "0123456789-")
_SUPERSCRIPT_RE = re.compile(r"[⁰¹²³⁴⁵⁶⁷⁸⁹⁻]+")
# Character substitutions applied to every unit string before pint reads it.
_CHARACTERS = {
    "·": "*", "⋅": "*", "∙": "*", "×": "*",
    "µ": "u", "μ": "u",
    "º": "°", "˚": "°",
    "−": "-",
}  # fmt: skip


def _lower(match: re.Match[str]) -> str:
    return match.group(1).lower()


def _degrees_letter(match: re.Match[str]) -> str:
    return "deg" + match.group(1).upper()


# Word-level rewrites (regex -> replacement), applied in order.
_REWRITES: tuple[tuple[re.Pattern[str], str | Callable[[re.Match[str]], str]], ...] = (
    (re.compile(r"(?:°\s*|\bdeg(?:rees?)?\s+)?\b(celsius|fahrenheit)\b", re.IGNORECASE), _lower),
    (re.compile(r"(?:°\s*|\bdeg(?:rees?)?\s+)([CF])\b", re.IGNORECASE), _degrees_letter),
    (re.compile(r"°"), "deg"),
    (re.compile(r"\b(?:square\s+|sq(?:\.\s*|\s+))([A-Za-z]+)\b"), r"\1**2"),
    (re.compile(r"\bcubic\s+([A-Za-z]+)\b"), r"\1**3"),
    # "m2", "cm2", "ft3": a digit right after a unit's letters is an exponent ("inH2O" is kept).
    (re.compile(r"([A-Za-z])(\d+)(?=$|[\s*/)])"), r"\1**\2"),
)
# Bare "C" and "F" are coulomb and farad to pint; in a temperature field they mean °C and °F.
_TEMPERATURE_LETTERS = {"C": "degC", "c": "degC", "F": "degF", "f": "degF"}


# The unit part a user may type, checked before any unit parser sees it: unit words, products and
# quotients, parentheses and one single-digit exponent per word or bracket ("m**3", "s⁻²",
# "m2"). No number factors and no exponent towers ("kg*9**9**9" would make pint compute for
# hours). Possessive quantifiers keep the check linear in the length.
_LETTER = r"(?:[^\W\d_⁰¹²³⁴⁵⁶⁷⁸⁹]|[°˚%])"
_EXPONENT = (
    r"(?:\s*+(?:\*\*|\^)\s*+(?:[+\-−]?\d|\(\s*+[+\-−]?\d\s*+\))(?![\d.,eE])|⁻?[⁰¹²³⁴⁵⁶⁷⁸⁹])?+"
)
_WORD = rf"{_LETTER}(?:{_LETTER}|\.|\d(?={_LETTER}))*+\d?+"
_UNIT_TEXT_RE = re.compile(rf"(?:\s*+(?:{_WORD}{_EXPONENT}|[*/·⋅∙×]|\(|\){_EXPONENT}))*+\s*+")


def _kind(kind: str) -> Kind:
    try:
        return KINDS[kind]
    except KeyError:
        raise ValueError(f"kind must be one of {', '.join(KINDS)}; got {kind!r}") from None


def _examples(spec: Kind) -> str:
    return ", ".join(f'"{example}"' for example in spec.examples)


def _normalise_unit(unit: str, kind: str) -> str:
    """Rewrite a typed unit into an expression pint reads."""
    for old, new in _CHARACTERS.items():
        unit = unit.replace(old, new)
    unit = _SUPERSCRIPT_RE.sub(
        lambda match: "**(" + match.group().translate(_SUPERSCRIPTS) + ")", unit
    )
    for pattern, replacement in _REWRITES:
        unit = pattern.sub(replacement, unit)
    if kind == "temperature":
        unit = _TEMPERATURE_LETTERS.get(unit, unit)
    return unit


def _show(raw: str) -> str:
    """A typed value as quoted in a message: control characters escaped, long text cut."""
    escaped = raw.encode("unicode_escape").decode("ascii") if not raw.isprintable() else raw
    return shorten(escaped, 60)


def _read_number(text: str, raw: str, field: str, spec: Kind) -> float:
    """Read the number part, accepting a decimal comma; refuse a thousands separator."""
    if "," in text:
        if _THOUSANDS_RE.match(text):
            alternatives = raw.replace(",", ".", 1), raw.replace(",", "", 1)
            raise InputError(
                f'{field}: "{_show(raw)}" is ambiguous (is the comma a decimal point?); '
                f'write "{alternatives[0]}" or "{alternatives[1]}" without thousands separators',
                field=field,
            )
        text = text.replace(",", ".")
    number = float(text)
    if not math.isfinite(number):
        raise InputError(
            f'{field}: "{_show(raw)}" is not a finite number; '
            f"expected {spec.noun} (e.g. {_examples(spec)})",
            field=field,
        )
    return number


@functools.cache
def _dimensionality(text: str) -> Any:
    """Return pint's dimensionality object for a string such as ``"[length] / [time]"``."""
    registry = unit_registry()
    if text == "dimensionless":
        return registry.parse_units("").dimensionality
    return registry.get_dimensionality(text)


def _describe(units: Any) -> str:
    """Say in words what kind of quantity a pint unit measures."""
    name = str(units)
    if name == "percent":
        return "a percentage"
    if name in _ANGLE_UNITS:
        return "an angle"
    if not units.dimensionality:
        return "a plain number"
    for text, noun in [(spec.dimensionality, spec.noun) for spec in KINDS.values()] + list(
        _OTHER_DIMENSIONS.items()
    ):
        if units.dimensionality == _dimensionality(text):
            return noun
    return f"units of {units.dimensionality}"


def _bare(number: float, raw: str, kind: str, field: str, spec: Kind) -> float:
    """Convert a number given without a unit (the kind's default unit) to SI."""
    if kind == "fraction" and number > 1.0:
        raise InputError(
            f'{field}: a number without a unit must be a fraction from 0 to 1; got "{_show(raw)}" '
            f'(for a percentage write "{_show(raw)} %")',
            field=field,
        )
    return number + spec.bare_offset


def parse_optional_quantity(value: str | float | int | None, kind: str, field: str) -> float | None:
    """:func:`parse_quantity`, with None (an option not given) passed through as None."""
    return None if value is None else parse_quantity(value, kind, field)


def parse_quantity(value: str | float | int, kind: str, field: str) -> float:
    """Read a quantity typed by a user and return it as an SI float.

    Parameters
    ----------
    value : str or float or int
        What the user gave, e.g. ``"12 lb"``, ``"25 mph"``, ``"20 °C"``, ``"50 %"`` or a number.
        A number without a unit is in the kind's default unit: SI, except degrees Celsius for
        temperature, degrees for angles and a 0..1 fraction for fractions.
    kind : str
        One of :data:`KINDS`: "length", "mass", "speed", "area", "temperature", "pressure",
        "angle", "fraction", "density", "time", "dimensionless", "energy", "momentum",
        "energy_per_area", "force", "acceleration".
    field : str
        Name of the field or option the value came from (e.g. ``"--height"``), used in messages.

    Returns
    -------
    float
        The value in the kind's SI unit (K for temperature, degrees for angles, 0..1 for
        fractions); always finite.

    Raises
    ------
    InputError
        If the value is empty, not a finite number, in an unknown unit, of another dimension than
        ``kind``, or a bare fraction above 1. The message is one line naming the field, the value
        and what is allowed. Range checks are left to the models.
    ValueError
        If ``kind`` is not in :data:`KINDS` (a programming error, not a user error).

    Examples
    --------
    >>> parse_quantity("25 mph", "speed", "--wind")  # 25 x 0.44704 m/s, exact
    11.176
    >>> parse_quantity("20", "temperature", "--temperature")  # a bare temperature is in °C
    293.15
    >>> parse_quantity("50 %", "fraction", "--humidity")
    0.5
    """
    spec = _kind(kind)
    if isinstance(value, numbers.Real) and not isinstance(value, bool):
        try:
            number = float(value)
        except OverflowError:
            number = math.inf
        if not math.isfinite(number):
            raise InputError(
                f"{field}: {number} is not a finite number; expected {spec.noun} "
                f"(e.g. {_examples(spec)})",
                field=field,
            )
        return _bare(number, f"{number:g}", kind, field, spec)
    if not isinstance(value, str):
        raise InputError(
            f"{field}: expected {spec.noun} as text or a number (e.g. {_examples(spec)}); "
            f"got {type(value).__name__} {value!r}",
            field=field,
        )
    raw = value.strip()
    if not raw:
        raise InputError(
            f"{field}: no value given; expected {spec.noun} (e.g. {_examples(spec)})", field=field
        )
    if len(raw) > MAX_QUANTITY_CHARACTERS:
        raise InputError(
            f'{field}: "{_show(raw)}" is longer than {MAX_QUANTITY_CHARACTERS} characters; '
            f"expected {spec.noun} (e.g. {_examples(spec)})",
            field=field,
        )
    match = _NUMBER_RE.match(raw.replace("−", "-"))
    if match is None:
        raise InputError(
            f'{field}: could not read "{_show(raw)}" as {spec.noun} (e.g. {_examples(spec)})',
            field=field,
        )
    if not _UNIT_TEXT_RE.fullmatch(match["unit"]):
        raise InputError(
            f'{field}: could not read "{_show(raw)}" as {spec.noun} (e.g. {_examples(spec)}); '
            "after the number only unit names, * and / and one-digit powers are read",
            field=field,
        )
    number = _read_number(match["number"], raw, field, spec)
    unit_text = match["unit"]
    if not unit_text:
        return _bare(number, raw, kind, field, spec)
    return _convert(number, _normalise_unit(unit_text, kind), raw, field, spec)


#: Affine conversions (scale, offset) to SI already worked out, by (unit text, kind): a batch
#: list repeats a handful of units thousands of times, and pint takes ~0.1 ms per parse.
_CONVERSIONS: dict[tuple[str, int], tuple[float, float]] = {}


#: pint's factors for ft, ft² and lb, one unit in the last place off the exact definitions
#: (it builds them from the inch and the grain); the fast path uses them so that it returns the
#: very float pint would.
_PINT_FOOT, _PINT_SQUARE_FOOT, _PINT_POUND = (
    0.30479999999999996,
    0.09290303999999999,
    0.4535923700000001,
)
#: Plain spellings read without pint (pint's registry takes ~0.3 s to build): SI units per unit,
#: by kind, keyed by the text :func:`_normalise_unit` gives. The factors are the definitions
#: (NIST SP 811 (2008), Appendix B; SI prefixes) as pint computes them, and a test checks every
#: entry against pint to the bit. Any other spelling goes to pint.
_PLAIN_UNITS: dict[str, dict[str, float]] = {
    "length": {"m": 1.0, "cm": 0.01, "mm": 0.001, "km": 1000.0, "ft": _PINT_FOOT, "in": INCH},
    "mass": {"kg": 1.0, "g": 0.001, "lb": _PINT_POUND, "lbs": _PINT_POUND, "t": 1000.0},
    "speed": {"m/s": 1.0, "km/h": 1 / 3.6, "kph": 1 / 3.6, "mph": MILE_PER_HOUR,
              "kn": 1852 / 3600, "knot": 1852 / 3600, "knots": 1852 / 3600},
    "area": {"m**2": 1.0, "m**(2)": 1.0, "cm**2": 1e-4, "cm**(2)": 1e-4, "mm**2": 1e-6,
             "mm**(2)": 1e-6, "ft**2": _PINT_SQUARE_FOOT,
             "ft**(2)": _PINT_SQUARE_FOOT},
    "angle": {"deg": 1.0, "degree": 1.0, "degrees": 1.0},
    "fraction": {"%": 0.01, "percent": 0.01},
    "pressure": {"Pa": 1.0, "hPa": 100.0, "kPa": 1000.0},
    "density": {"kg/m**3": 1.0, "kg/m**(3)": 1.0},
    "time": {"s": 1.0, "min": 60.0, "h": 3600.0},
    "energy": {"J": 1.0},
}  # fmt: skip


def _convert(number: float, unit_text: str, raw: str, field: str, spec: Kind) -> float:
    """Convert ``number`` in the pint expression ``unit_text`` to the kind's SI unit."""
    scale = _PLAIN_UNITS_BY_SPEC.get(id(spec), {}).get(unit_text)
    if scale is not None and math.isfinite(number * scale):
        return number * scale
    cached = _CONVERSIONS.get((unit_text, id(spec)))
    if cached is not None:
        result = cached[1] + cached[0] * number
        if math.isfinite(result):
            return result
    registry = unit_registry()
    cannot_read = f'{field}: could not read "{_show(raw)}" as {spec.noun} (e.g. {_examples(spec)})'
    try:
        units = registry.parse_units(unit_text)
    except Exception as error:  # pint raises several unrelated types for unreadable units
        names = getattr(error, "unit_names", None)
        if names:
            unknown = names if isinstance(names, str) else ", ".join(names)
            raise InputError(f'{cannot_read}: unknown unit "{unknown}"') from error
        raise InputError(cannot_read) from error
    unit_allowed = spec.allowed_units is None or str(units) in spec.allowed_units
    if units.dimensionality != _dimensionality(spec.dimensionality) or not unit_allowed:
        raise InputError(
            f'{field}: expected {spec.noun} (e.g. {_examples(spec)}); got "{_show(raw)}" '
            f"({_describe(units)})",
            field=field,
        )
    try:
        result = float(registry.Quantity(number, units).to(spec.si_unit).magnitude)
    except Exception as error:  # e.g. offset units in a compound expression ("degC/s")
        raise InputError(cannot_read) from error
    if not math.isfinite(result):
        raise InputError(
            f'{field}: "{_show(raw)}" is too large to represent; expected {spec.noun} '
            f"(e.g. {_examples(spec)})",
            field=field,
        )
    if (unit_text, id(spec)) not in _CONVERSIONS:
        zero = float(registry.Quantity(0.0, units).to(spec.si_unit).magnitude)
        one = float(registry.Quantity(1.0, units).to(spec.si_unit).magnitude)
        _CONVERSIONS[(unit_text, id(spec))] = (one - zero, zero)
    return result


_PLAIN_UNITS_BY_SPEC = {id(KINDS[kind]): units for kind, units in _PLAIN_UNITS.items()}


# --- Display -------------------------------------------------------------------------------------
def _system(system: str) -> str:
    normalised = system.strip().lower()
    if normalised not in UNIT_SYSTEMS:
        raise InputError(f'units must be one of {", ".join(UNIT_SYSTEMS)}; got "{system}"')
    return normalised


def to_display(value_si: float, kind: str, system: str = "si") -> tuple[float, str]:
    """Convert an SI value to the display unit of a unit system.

    Works on numpy arrays as well as floats. Uses plain constants, not pint.

    Parameters
    ----------
    value_si : float
        Value in the kind's SI unit (K for temperature, degrees for angles, 0..1 for fractions).
    kind : str
        One of :data:`KINDS`.
    system : {"si", "imperial"}
        Unit system (case-insensitive).

    Returns
    -------
    tuple of (float, str)
        The value in the display unit, and the unit label (e.g. ``(40.7, "ft·lbf")``). SI display
        uses °C for temperature, kPa for pressure and J/cm² for energy per area; fractions are
        shown in % and angles in ° in both systems.

    Raises
    ------
    InputError
        If ``system`` is not "si" or "imperial".
    ValueError
        If ``kind`` is not in :data:`KINDS`.
    """
    spec = _kind(kind)
    unit = spec.si if _system(system) == "si" else spec.imperial
    return value_si / unit.size - unit.offset, unit.label


def _significant(number: float, digits: int) -> str:
    """Format ``number`` with ``digits`` significant digits, fixed point where readable."""
    if number == 0.0:
        return f"{0.0:.{digits - 1}f}"
    rounded = float(f"{number:.{digits - 1}e}")
    exponent = math.floor(math.log10(abs(rounded)))
    if exponent < -3 or exponent >= 7:
        return f"{number:.{digits - 1}e}"
    decimals = digits - 1 - exponent
    return f"{rounded:.{max(decimals, 0)}f}"


def format_quantity(value_si: float, kind: str, system: str = "si", digits: int = 3) -> str:
    """Format an SI value for people, in the display unit of a unit system.

    Parameters
    ----------
    value_si : float
        Value in the kind's SI unit.
    kind : str
        One of :data:`KINDS`.
    system : {"si", "imperial"}
        Unit system (case-insensitive).
    digits : int
        Significant digits shown (trailing zeros kept, e.g. "25.0 mph"); very small or large
        values switch to scientific notation.

    Returns
    -------
    str
        E.g. ``"12.3 m"``, ``"40.7 ft·lbf"``, ``"1.23 kg/m³"``, ``"35.0°"`` (no space before the
        degree sign, SI Brochure 9th ed., 5.4.3, section from memory). NaN is shown as
        ``"n/a"``, infinities as ``"∞ m"`` / ``"-∞ m"``.

    Raises
    ------
    InputError
        If ``system`` is not "si" or "imperial".
    ValueError
        If ``kind`` is not in :data:`KINDS` or ``digits`` < 1.
    """
    if digits < 1:
        raise ValueError(f"digits must be >= 1; got {digits}")
    shown, label = to_display(float(value_si), kind, system)
    if math.isnan(shown):
        return "n/a"
    text = ("-∞" if shown < 0 else "∞") if math.isinf(shown) else _significant(shown, digits)
    if not label:
        return text
    return f"{text}{label}" if label == "°" else f"{text} {label}"


def parse_direction(value: str | float | int, field: str) -> float:
    """A compass direction in degrees clockwise from north, from "SW", "WSW", "225" or "225 deg".

    The 16 points of the compass (N, NNE, NE, ... NNW; any case) name 0, 22.5, 45, ... 337.5°;
    anything else is read as an angle (a bare number is degrees here, as compass bearings are).

    Raises
    ------
    InputError
        Naming ``field`` when the value is neither a compass point nor an angle.
    """
    from dropcalc.physics.wind import COMPASS_POINTS

    if isinstance(value, str):
        text = value.strip().upper().replace("-", "").replace(" ", "")
        if text in COMPASS_POINTS:
            return COMPASS_POINTS[text]
        try:
            return float(value.strip())
        except ValueError:
            pass
        try:
            return parse_quantity(value, "angle", field)
        except InputError:
            raise InputError(
                f"{field}: could not read {_show(value)} as a direction: give a compass point "
                "(N, NE, ENE, SW, WSW ...) or an angle clockwise from north "
                '(e.g. "225", "225 deg")',
                field=field,
            ) from None
    return parse_quantity(value, "angle", field)
