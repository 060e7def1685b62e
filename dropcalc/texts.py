"""Fixed wording shown with every result: the cautions.

The long text blocks live in ``templates/`` (see :mod:`dropcalc.resources`); the one-line
caution below is printed by the CLI under every result and put in every JSON output.
"""

CAUTION_SHORT = (
    "Estimates from a simplified model. They do not replace a competent person's assessment, "
    "the site's rescue and lifting plans, or local work-at-height law, codes and licensed "
    "practice, which prevail."
)
