"""Tests of dropcalc.units: reading typed quantities and displaying SI results.

Reference values are the exact (or printed) conversion factors of NIST Special Publication 811
(2008 edition), "Guide for the Use of the International System of Units (SI)", Appendix B
(B.8 factors by alphabetical order, B.9 by kind of quantity; temperature in B.9), and the SI
prefixes (SI Brochure, 9th edition, 2019, Table 7). "exact" below means exact by definition.
The factors are as NIST prints them; the appendix and table numbers are cited from memory.
"""

from __future__ import annotations

import math
import re
import subprocess
import sys
from pathlib import Path

import pytest

from dropcalc.errors import InputError
from dropcalc.units import (
    _PLAIN_UNITS,
    KINDS,
    format_quantity,
    parse_quantity,
    to_display,
    unit_registry,
)

REPO = Path(__file__).resolve().parents[1]


# --- Conversions against published definitions ---------------------------------------------------
@pytest.mark.parametrize(
    ("text", "kind", "expected"),
    [
        # NIST SP 811 (2008) B.8: foot = 3.048 E-01 m, exact.
        ("100 ft", "length", 30.48),
        # NIST SP 811 (2008) B.8: inch = 2.54 E-02 m, exact.
        ("30 in", "length", 0.762),
        # NIST SP 811 (2008) B.8: pound (avoirdupois) = 4.535 923 7 E-01 kg, exact.
        ("12 lb", "mass", 5.44310844),
        # NIST SP 811 (2008) B.8: mile per hour = 4.4704 E-01 m/s, exact.
        ("25 mph", "speed", 11.176),
        # knot = 1 nautical mile (1852 m, exact) per hour; NIST SP 811 (2008) B.8.
        ("1 knot", "speed", 1852 / 3600),
        # SI prefix k = 1e3, h = 3600 s: 15 km/h = 15/3.6 m/s, exact.
        ("15 km/h", "speed", 15 / 3.6),
        # NIST SP 811 (2008) B.9: T/K = (t/°F + 459.67)/1.8, so 68 °F = 293.15 K exactly.
        ("68 degF", "temperature", 293.15),
        # SI Brochure 9th ed. (2019) 2.3.1: T/K = t/°C + 273.15.
        ("20 degC", "temperature", 293.15),
        ("293.15 K", "temperature", 293.15),
        # NIST SP 811 (2008) B.8: square foot = 9.290 304 E-02 m², exact; 3 ft² = 0.278 709 12 m².
        ("3 ft²", "area", 0.27870912),
        # SI prefix c = 1e-2: 80 cm² = 80e-4 m², exact.
        ("80 cm2", "area", 0.008),
        ("0.05 m^2", "area", 0.05),
        # SI prefix k = 1e3.
        ("101.3 kPa", "pressure", 101300.0),
        ("1500 m", "length", 1500.0),
        # NIST SP 811 (2008) B.8: pound-force = 4.448 221 615 260 5 E+00 N, exact.
        ("5 lbf", "force", 5 * 4.4482216152605),
        # NIST SP 811 (2008) B.8: foot per second squared = 3.048 E-01 m/s², exact.
        ("32 ft/s²", "acceleration", 32 * 0.3048),
        # 1 J/cm² = 1e4 J/m² (SI prefix c = 1e-2).
        ("3 J/cm²", "energy_per_area", 3.0e4),
        ("2 min", "time", 120.0),
        ("50 %", "fraction", 0.5),
        ("35°", "angle", 35.0),
        # 1 rad = 180/pi degrees (SI Brochure 9th ed., Table 8).
        ("0.6 rad", "angle", 0.6 * 180 / math.pi),
    ],
)
def test_conversion_matches_exact_definition(text: str, kind: str, expected: float) -> None:
    assert parse_quantity(text, kind, "--field") == pytest.approx(expected, rel=1e-12)


@pytest.mark.parametrize(
    ("text", "kind", "expected", "rel"),
    [
        # NIST SP 811 (2008) B.8 printed values (7 significant digits).
        ("1 ft·lbf", "energy", 1.355818, 1e-6),
        ("1 lb/ft³", "density", 1.601846e1, 1e-6),
        ("1 inHg", "pressure", 3.386389e3, 1e-6),
        ("1 psi", "pressure", 6.894757e3, 1e-6),
    ],
)
def test_conversion_matches_printed_factor(
    text: str, kind: str, expected: float, rel: float
) -> None:
    assert parse_quantity(text, kind, "--field") == pytest.approx(expected, rel=rel)


@pytest.mark.parametrize(
    ("spellings", "kind"),
    [
        (["12 lb", "12 lbs", "12lb", "12 pound", "12 pounds"], "mass"),
        (["100 ft", "100 feet", "100 foot", "100ft"], "length"),
        (["30 in", "30 inch", "30 inches"], "length"),
        (["15 km/h", "15 kph", "15 km·h⁻¹", "15 km h^-1"], "speed"),
        (["2 knots", "2 knot", "2 kn", "2 kt"], "speed"),
        (["3 ft²", "3 ft2", "3 ft^2", "3 ft**2", "3 sq ft", "3 sq. ft", "3 square feet"], "area"),
        (
            ["0.05 m²", "0.05 sq m", "0.05 m2", "0.05 m^2", "500 cm2", "500 cm²", "50000 mm2"],
            "area",
        ),
        (["1.225 kg/m³", "1.225 kg/m3", "1.225 kg·m⁻³", "1.225 kg m^-3"], "density"),
        (["35°", "35 °", "35 deg", "35 degree", "35 degrees", "35º"], "angle"),
        (["50 %", "50%", "50 percent", "0.5"], "fraction"),
        (["40 ft·lbf", "40 ft*lbf", "40 ft lbf", "40 ft⋅lbf"], "energy"),
        (["1 µs", "1 μs", "1 us", "0.001 ms"], "time"),
    ],
)
def test_common_spellings_agree(spellings: list[str], kind: str) -> None:
    values = [parse_quantity(text, kind, "--field") for text in spellings]
    assert values == pytest.approx([values[0]] * len(values), rel=1e-12), spellings


@pytest.mark.parametrize(
    "text",
    ["20 degC", "20 °C", "20°C", "20 C", "20 c", "20 deg C", "20 degrees C", "20 celsius",
     "20 degrees Celsius", "20 °Celsius", "20 ºC", "68 degF", "68 °F", "68°F", "68 F", "68 deg F",
     "68 fahrenheit", "293.15 K", "293.15 kelvin", "20"],
)  # fmt: skip
def test_temperature_spellings(text: str) -> None:
    # 20 °C = 68 °F = 293.15 K: NIST SP 811 (2008) B.9; a bare number is °C (module docstring).
    assert parse_quantity(text, "temperature", "--temperature") == pytest.approx(293.15, rel=1e-12)


@pytest.mark.parametrize("text", ["-40 °F", "-40 °C", "−40 °F", "-40"])
def test_minus_forty_is_the_same_in_both_scales(text: str) -> None:
    # Closed form: (-40 + 459.67) / 1.8 = 233.15 K = -40 + 273.15 (NIST SP 811 B.9); includes the
    # Unicode minus sign U+2212.
    assert parse_quantity(text, "temperature", "--temperature") == pytest.approx(233.15, rel=1e-12)


# --- Bare numbers ---------------------------------------------------------------------------------
@pytest.mark.parametrize(
    ("value", "kind", "expected"),
    [
        ("12", "length", 12.0),
        (12, "length", 12.0),
        (12.5, "mass", 12.5),
        ("  7.5  ", "speed", 7.5),
        ("1e3", "length", 1000.0),
        (".5", "length", 0.5),
        ("+3", "time", 3.0),
        ("20", "temperature", 293.15),  # bare temperature is °C
        (20, "temperature", 293.15),
        ("35", "angle", 35.0),  # bare angle is degrees
        ("0.5", "fraction", 0.5),
        (1, "fraction", 1.0),
        ("0.8", "dimensionless", 0.8),
    ],
)
def test_bare_number_is_in_the_default_unit(value: str | float, kind: str, expected: float) -> None:
    assert parse_quantity(value, kind, "--field") == pytest.approx(expected, rel=1e-12)


@pytest.mark.parametrize("value", ["50", 50, 1.5])
def test_bare_fraction_above_one_asks_for_percent(value: str | float) -> None:
    with pytest.raises(InputError, match=re.escape("--humidity: ")) as caught:
        parse_quantity(value, "fraction", "--humidity")
    assert "%" in str(caught.value)


# --- Decimal comma --------------------------------------------------------------------------------
@pytest.mark.parametrize(
    ("text", "expected"),
    [("12,5 kg", 12.5), ("12,5", 12.5), ("0,125 kg", 0.125), ("1,25 kg", 1.25), ("12,50 kg", 12.5)],
)
def test_decimal_comma_is_a_decimal_point(text: str, expected: float) -> None:
    assert parse_quantity(text, "mass", "--mass") == pytest.approx(expected, rel=1e-12)


@pytest.mark.parametrize("text", ["1,500 m", "12,000", "-2,500 ft"])
def test_comma_that_may_separate_thousands_is_refused(text: str) -> None:
    with pytest.raises(InputError, match=r"^--height: .*ambiguous") as caught:
        parse_quantity(text, "length", "--height")
    assert f'"{text}"' in str(caught.value)


# --- Errors ---------------------------------------------------------------------------------------
def test_wrong_dimension_message_is_exact() -> None:
    with pytest.raises(InputError) as caught:
        parse_quantity("5 s", "length", "--height")
    assert (
        str(caught.value)
        == '--height: expected a length (e.g. "12 m", "40 ft"); got "5 s" (a time)'
    )


def test_unreadable_value_message_is_exact() -> None:
    with pytest.raises(InputError) as caught:
        parse_quantity("twelve", "mass", "--mass")
    assert str(caught.value) == '--mass: could not read "twelve" as a mass (e.g. "12 kg", "25 lb")'


@pytest.mark.parametrize(
    ("text", "kind", "wanted", "given"),
    [
        ("12 kg", "length", "a length", "a mass"),
        ("25 mph", "mass", "a mass", "a speed"),
        ("3 m³", "area", "an area", "a volume"),
        ("20 m", "temperature", "a temperature", "a length"),
        ("20 degrees", "temperature", "a temperature", "an angle"),
        ("5 C", "length", "a length", "an electric charge"),  # "C" is °C only for temperatures
        ("35 %", "angle", "an angle", "a percentage"),
        ("35°", "fraction", "a fraction", "an angle"),
        ("3 s", "dimensionless", "a plain number", "a time"),
        ("5 Hz", "time", "a time", "a frequency"),
        ("55 J", "force", "a force", "an energy"),
    ],
)
def test_wrong_dimension_names_field_value_and_both_dimensions(
    text: str, kind: str, wanted: str, given: str
) -> None:
    with pytest.raises(InputError) as caught:
        parse_quantity(text, kind, "--some-field")
    message = str(caught.value)
    assert message.startswith(f"--some-field: expected {wanted} (e.g. ")
    assert message.endswith(f'got "{text}" ({given})')


@pytest.mark.parametrize(
    "value",
    ["", "   ", "nan", "NaN m", "inf", "-inf m", "infinity", float("nan"), float("inf"),
     -float("inf"), "1e400 m", "1e308 km", "twelve", "m", "12 kgs", "5 ft 3 in", "12 m m ((",
     "1,2,3 m", "12 $", None, True, [12],
     "0\n0", "1\r2 m", "x" * 500],  # a line break inside (found by the property tests), huge
)  # fmt: skip
def test_bad_values_raise_one_line_input_error_naming_the_field(value: object) -> None:
    with pytest.raises(InputError) as caught:
        parse_quantity(value, "length", "--height")  # type: ignore[arg-type]
    message = str(caught.value)
    assert message.startswith("--height: ")
    assert "\n" not in message
    assert "\r" not in message
    assert len(message) < 200
    assert "length" in message


def test_unknown_unit_is_named() -> None:
    with pytest.raises(InputError, match=r'unknown unit "kgs"'):
        parse_quantity("12 kgs", "mass", "--mass")


def test_empty_and_nonfinite_messages_say_why() -> None:
    with pytest.raises(InputError, match="no value given"):
        parse_quantity(" ", "mass", "--mass")
    with pytest.raises(InputError, match="not a finite number"):
        parse_quantity("nan kg", "mass", "--mass")
    with pytest.raises(InputError, match="not a finite number"):
        parse_quantity(float("inf"), "mass", "--mass")


def test_unknown_kind_is_a_programming_error() -> None:
    with pytest.raises(ValueError, match="kind must be one of length, mass") as caught:
        parse_quantity("1 m", "lenght", "--height")
    assert not isinstance(caught.value, InputError)


# --- Display --------------------------------------------------------------------------------------
@pytest.mark.parametrize(
    ("value_si", "kind", "system", "expected"),
    [
        (12.34, "length", "si", "12.3 m"),
        (30.48, "length", "imperial", "100 ft"),  # 100 ft exactly, NIST SP 811 B.8
        (55.2, "energy", "si", "55.2 J"),
        # 55.2 J / 1.355818 J per ft·lbf (NIST SP 811 B.8) = 40.71 ft·lbf.
        (55.2, "energy", "imperial", "40.7 ft·lbf"),
        (11.176, "speed", "imperial", "25.0 mph"),  # 25 mph exactly, NIST SP 811 B.8
        (1.2345, "density", "si", "1.23 kg/m³"),
        (5.44310844, "mass", "imperial", "12.0 lb"),  # NIST SP 811 B.8
        (293.15, "temperature", "si", "20.0 °C"),  # SI Brochure 2.3.1
        (293.15, "temperature", "imperial", "68.0 °F"),  # NIST SP 811 B.9
        (35.0, "angle", "si", "35.0°"),  # no space before °, SI Brochure 9th ed. 5.4.3
        (0.5, "fraction", "imperial", "50.0 %"),
        (3.0e4, "energy_per_area", "si", "3.00 J/cm²"),
        (0.27870912, "area", "imperial", "3.00 ft²"),
        (4.4482216152605, "force", "imperial", "1.00 lbf"),
        (101300.0, "pressure", "si", "101 kPa"),
        (9.996, "length", "si", "10.0 m"),  # rounding carries into a new digit
        (1234.5, "length", "si", "1230 m"),
        (0.0, "length", "si", "0.00 m"),
        (0.00123, "length", "si", "0.00123 m"),
        (5.0e8, "energy", "si", "5.00e+08 J"),
        (0.8, "dimensionless", "si", "0.800"),
        (float("nan"), "length", "si", "n/a"),
        (float("inf"), "length", "si", "∞ m"),
    ],
)
def test_format_quantity(value_si: float, kind: str, system: str, expected: str) -> None:
    assert format_quantity(value_si, kind, system) == expected


@pytest.mark.parametrize(
    ("kind", "one_imperial_unit_in_si"),
    [
        ("length", 0.3048),  # NIST SP 811 B.8, exact
        ("mass", 0.45359237),  # NIST SP 811 B.8, exact
        ("speed", 0.44704),  # NIST SP 811 B.8, exact
        ("force", 4.4482216152605),  # NIST SP 811 B.8, exact
        ("area", 9.290304e-2),  # NIST SP 811 B.8, exact
        ("acceleration", 0.3048),  # NIST SP 811 B.8, exact
        ("momentum", 0.45359237 * 0.3048),  # exact products of the above
        ("energy", 1.355818),  # NIST SP 811 B.8, printed to 7 digits
        ("density", 1.601846e1),  # NIST SP 811 B.8, printed to 7 digits
        ("pressure", 3.386389e3),  # NIST SP 811 B.8, inch of mercury (conventional), 7 digits
    ],
)
def test_to_display_imperial_units(kind: str, one_imperial_unit_in_si: float) -> None:
    shown, _label = to_display(one_imperial_unit_in_si, kind, "imperial")
    assert shown == pytest.approx(1.0, rel=1e-6)


def test_to_display_returns_value_and_label_and_ignores_case() -> None:
    assert to_display(30.48, "length", "Imperial") == (pytest.approx(100.0, rel=1e-12), "ft")
    assert to_display(1.0e4, "energy_per_area", "SI") == (pytest.approx(1.0, rel=1e-12), "J/cm²")


def test_display_rejects_unknown_system_and_bad_digits() -> None:
    with pytest.raises(InputError, match=r'units must be one of si, imperial; got "metric"'):
        format_quantity(1.0, "length", "metric")
    with pytest.raises(ValueError, match="digits"):
        format_quantity(1.0, "length", digits=0)


@pytest.mark.parametrize("system", ["si", "imperial"])
@pytest.mark.parametrize("kind", list(KINDS))
def test_displayed_text_reads_back_through_pint(kind: str, system: str) -> None:
    # Display uses this module's own constants; parsing uses pint's definitions (reference
    # library). Reading the displayed text back must give the value again.
    value_si = {"temperature": 255.0, "fraction": 0.37, "angle": 12.5}.get(kind, 2.345)
    text = format_quantity(value_si, kind, system, digits=12)
    assert parse_quantity(text, kind, "--field") == pytest.approx(value_si, rel=1e-9), text


# --- The table and the lazy registry --------------------------------------------------------------
@pytest.mark.parametrize("kind", list(KINDS))
def test_table_dimensionality_matches_its_si_unit(kind: str) -> None:
    spec = KINDS[kind]
    registry = unit_registry()
    si_dimensionality = registry.parse_units(spec.si_unit).dimensionality
    if spec.dimensionality == "dimensionless":
        assert not si_dimensionality
    else:
        assert registry.get_dimensionality(spec.dimensionality) == si_dimensionality
    for example in spec.examples:  # every example shown in messages must itself be accepted
        assert math.isfinite(parse_quantity(example, kind, "--field"))


def test_registry_is_created_once() -> None:
    assert unit_registry() is unit_registry()


@pytest.mark.parametrize(
    ("kind", "unit"), [(kind, unit) for kind, table in _PLAIN_UNITS.items() for unit in table]
)
def test_plain_spelling_fast_path_gives_pints_value_to_the_bit(kind: str, unit: str) -> None:
    # The fast path (no pint) must return exactly what pint returns for the same text.
    registry = unit_registry()
    units = registry.parse_units(unit)
    spec = KINDS[kind]
    assert spec.allowed_units is None or str(units) in spec.allowed_units
    for number in (1.0, 0.3, 2.0, 12.5, 17.5, 25.0, 1e-3, 123456.789, 7.0, 1e300):
        expected = float(registry.Quantity(number, units).to(spec.si_unit).magnitude)
        assert _PLAIN_UNITS[kind][unit] * number == expected, (unit, number)


def test_import_and_display_do_not_import_pint() -> None:
    code = (
        "import sys\n"
        "import dropcalc.units as u\n"
        "assert 'pint' not in sys.modules, 'import'\n"
        "u.format_quantity(12.3, 'length', 'imperial')\n"
        "u.parse_quantity('12', 'length', '--height')\n"
        "assert 'pint' not in sys.modules, 'display or bare number'\n"
        "for text, kind in [('2 m', 'length'), ('15 deg', 'angle'), ('25 mph', 'speed'),\n"
        "                   ('12 lb', 'mass'), ('35°', 'angle'), ('3 m²', 'area')]:\n"
        "    u.parse_quantity(text, kind, '--field')\n"
        "assert 'pint' not in sys.modules, 'plain spelling'\n"
        "u.parse_quantity('12 furlong', 'length', '--height')\n"
        "assert 'pint' in sys.modules, 'pint used on first unit the fast path cannot read'\n"
    )
    result = subprocess.run(
        [sys.executable, "-c", code], cwd=REPO, capture_output=True, text=True, timeout=60
    )
    assert result.returncode == 0, result.stderr
