"""Fixed wording shown with every result: the cautions.

The long text blocks live in ``templates/`` (see :mod:`dropcalc.resources`); the one-line
caution below is printed by the CLI under every result and put in every JSON output.
"""

CAUTION_SHORT = (
    "Estimates from a simplified model. They do not replace a competent person's assessment, "
    "the site's rescue and lifting plans, or local work-at-height law, codes and licensed "
    "practice, which prevail."
)


def keep_clear(value: float) -> str:
    """A clearance distance rounded up to 0.1 m, as text without the unit (16.81 -> "16.9").

    Rounding up keeps the printed distance on the safe side of the computed one; the small
    allowance absorbs binary representation (7.3 stays 7.3). Every "keep X m clear" that
    dropcalc prints goes through here, so the terminal, the JSON summary's wording and the PDF
    agree.
    """
    import math

    if value is None or not math.isfinite(value):
        return "—"
    return f"{math.ceil(value * 10 - 1e-9) / 10:.1f}"


def format_area(value: float) -> str:
    """An area on the plan as text without the unit (3368.4 -> "3,368").

    Whole square metres with thousands separators; one decimal below 100 m² (42.37 -> "42.4").

    Every area dropcalc prints (terminal, PDF, plan drawing) goes through here, so they agree.
    """
    import math

    if value is None or not math.isfinite(value):
        return "—"
    return f"{value:,.1f}" if value < 100 else f"{value:,.0f}"


#: One foot [m] (international foot, 1959).
_FOOT = 0.3048


def keep_clear_text(value: float, system: str = "si") -> str:
    """A clearance distance with its unit, rounded up: to 0.1 m, or to a whole foot.

    ``keep_clear_text(16.81) == "16.9 m"``; ``keep_clear_text(16.81, "imperial") == "56 ft"``
    (16.81 m = 55.15 ft, rounded up).
    """
    import math

    if value is None or not math.isfinite(value):
        return "—"
    if str(system).lower() == "imperial":
        return f"{math.ceil(value / _FOOT - 1e-9):,d} ft"
    return f"{keep_clear(value)} m"


def area_text(value_m2: float, system: str = "si") -> str:
    """An area on the plan with its unit: m², or ft² for imperial (see :func:`format_area`)."""
    if str(system).lower() == "imperial":
        return f"{format_area(value_m2 / _FOOT**2)} ft²"
    return f"{format_area(value_m2)} m²"


#: Said instead of a distance when samples were carried away by the wind.
NO_FINITE_DISTANCE = "no finite distance: objects are carried away by the wind"
