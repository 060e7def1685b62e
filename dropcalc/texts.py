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


#: Said instead of a distance when samples were carried away by the wind.
NO_FINITE_DISTANCE = "no finite distance: objects are carried away by the wind"
