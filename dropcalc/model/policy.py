"""Suggested controls: a documented, user-configurable rule list (every matching rule applies).

The default rules tie the suggestion to the reference levels of
:mod:`dropcalc.model.reference_levels`; the hierarchy of controls behind them (prevent the fall,
then collective protection, then exclusion and personal protection) is common practice in
work-at-height guidance, no single source. A site replaces the rules with its own TOML file::

    [[rule]]
    control = "prevent the drop: tether to the structure or contain"
    energy_at_least = "helmet-en14052-crown"     # a reference level key, or a quantity "100 J"

    [[rule]]
    control = "collective protection below"
    energy_per_area_at_least = "20 J/cm2"

    [[rule]]
    control = "helmets and housekeeping"          # no condition: the default

A rule matches when every condition it gives holds: ``energy_at_least`` (impact energy at the
smallest drag area), ``energy_per_area_at_least``, ``mass_at_least`` and ``glides`` (true for
sheets and plates that can fly in wind). An item gets the control of EVERY rule it matches, in
the order of the file: a 16 kg glass pane needs securing against wind and preventing the drop,
not one of the two. A rule without conditions is the default: it applies only to items that no
rule with conditions matches.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from pathlib import Path

from dropcalc.errors import InputError, parse_toml, read_file
from dropcalc.model.limits import MAX_TEXT_FILE_BYTES
from dropcalc.model.reference_levels import REFERENCE_LEVELS


@dataclass(frozen=True)
class ControlRule:
    """One rule: conditions (None = not checked) and the control it suggests.

    Attributes
    ----------
    control : str
        The suggested control, in words.
    energy_at_least : float or None
        Matches impact energies at or above this. [J]
    energy_per_area_at_least : float or None
        Matches energies per contact area at or above this (rows without a contact area do
        not match). [J/m^2]
    mass_at_least : float or None
        Matches masses at or above this. [kg]
    glides : bool or None
        Matches objects flagged (True) or not flagged (False) as able to glide in wind.
    """

    control: str
    energy_at_least: float | None = None
    energy_per_area_at_least: float | None = None
    mass_at_least: float | None = None
    glides: bool | None = None

    def matches(
        self, energy: float, energy_per_area: float | None, mass: float, glides: bool
    ) -> bool:
        """Whether every condition of this rule holds for one item."""
        if self.energy_at_least is not None and not energy >= self.energy_at_least:
            return False
        if self.energy_per_area_at_least is not None and not (
            energy_per_area is not None and energy_per_area >= self.energy_per_area_at_least
        ):
            return False
        if self.mass_at_least is not None and not mass >= self.mass_at_least:
            return False
        return self.glides is None or self.glides == glides

    @property
    def unconditional(self) -> bool:
        """True for a default rule (no condition given)."""
        return (
            self.energy_at_least is None
            and self.energy_per_area_at_least is None
            and self.mass_at_least is None
            and self.glides is None
        )


_EN14052 = REFERENCE_LEVELS["helmet-en14052-crown"]
_PENETRATION = REFERENCE_LEVELS["helmet-penetration"]
_SKIN = REFERENCE_LEVELS["skin-penetration-50"]

#: The default rules (common practice, no source for the ordering; the thresholds are the
#: reference levels named in each control).
DEFAULT_RULES: tuple[ControlRule, ...] = (
    ControlRule(
        "secure against wind (strap, weight or store flat): a loose sheet lifts off a roof in "
        "a moderate wind and flies as windborne debris",
        glides=True,
    ),
    ControlRule(
        "prevent the drop: tether to the structure or contain, and exclude people below "
        f"(at or above {_EN14052.value:g} J, the EN 14052 crown test energy)",
        energy_at_least=_EN14052.value,
    ),
    ControlRule(
        "tether or contain, with collective protection below: toe boards, netting, brick "
        f"guards or a covered walkway (at or above {_PENETRATION.value:g} J, the helmet "
        "penetration test energy)",
        energy_at_least=_PENETRATION.value,
    ),
    ControlRule(
        "edged or pointed: tether or contain, and net or cover below (at or above "
        f"{_SKIN.value / 1e4:g} J/cm², skin penetration risk, Bir et al. 2012)",
        energy_per_area_at_least=_SKIN.value,
    ),
    ControlRule("collective protection (toe boards, netting) and helmets below; keep tidy"),
)

#: Tools heavier than this are tethered to the structure rather than the wrist [kg]
#: (about 5 lb; common practice, no source).
WRIST_TETHER_LIMIT = 2.3


#: Joins several controls in one table cell (CSV, XLSX, JSON ``control``).
CONTROL_SEPARATOR = " | "


def suggest_controls(
    rules: Sequence[ControlRule],
    energy: float,
    energy_per_area: float | None,
    mass: float,
    glides: bool,
) -> tuple[str, ...]:
    """Every control that applies to one item, in the order of the rules.

    The controls of all rules with conditions that match; when none matches, those of the
    unconditional (default) rules. Empty when nothing applies.

    Parameters
    ----------
    rules : sequence of ControlRule
    energy : float
        Impact energy at the smallest drag area. [J]
    energy_per_area : float or None
        Impact energy per contact area, None without a contact area. [J/m^2]
    mass : float
        [kg]
    glides : bool
        Whether the item is a sheet or plate that can fly in wind.
    """
    matched = [
        rule.control
        for rule in rules
        if not rule.unconditional and rule.matches(energy, energy_per_area, mass, glides)
    ]
    if not matched:
        matched = [rule.control for rule in rules if rule.unconditional]
    return tuple(dict.fromkeys(matched))


def suggest_control(
    rules: Sequence[ControlRule],
    energy: float,
    energy_per_area: float | None,
    mass: float,
    glides: bool,
) -> str:
    """:func:`suggest_controls` joined into one cell with :data:`CONTROL_SEPARATOR`."""
    return CONTROL_SEPARATOR.join(suggest_controls(rules, energy, energy_per_area, mass, glides))


def _threshold(value: object, kind: str, where: str) -> float | None:
    if value is None:
        return None
    from dropcalc.units import parse_quantity

    if isinstance(value, str) and value in REFERENCE_LEVELS:
        level = REFERENCE_LEVELS[value]
        wanted = "energy" if kind == "energy" else "energy_per_area"
        if level.quantity != wanted:
            raise InputError(
                f"{where}: reference level {value!r} is not an {kind.replace('_', ' ')}"
            )
        return level.value
    if not isinstance(value, (str, int, float)) or isinstance(value, bool):
        raise InputError(f"{where}: expected a quantity or a reference level key; got {value!r}")
    number = parse_quantity(value, kind, where)
    if not (math.isfinite(number) and number >= 0):
        raise InputError(f"{where}: must be >= 0; got {value!r}")
    return number


def load_policy(path: Path) -> tuple[ControlRule, ...]:
    """Read control rules from a TOML file (format in the module docstring).

    Raises
    ------
    InputError
        Naming the file, the rule number and the key for any mistake.
    """
    raw = read_file(path, "policy file", MAX_TEXT_FILE_BYTES)
    data, _ = parse_toml(raw, str(path), "policy file")
    raw_rules = data.get("rule")
    if not isinstance(raw_rules, list) or not raw_rules:
        raise InputError(f"{path}: expected one or more [[rule]] tables")
    allowed = {"control", "energy_at_least", "energy_per_area_at_least", "mass_at_least", "glides"}
    rules = []
    for number, raw in enumerate(raw_rules, start=1):
        where = f"{path}: rule[{number}]"
        if not isinstance(raw, dict):
            raise InputError(f"{where}: expected a [[rule]] table; got {raw!r}")
        unknown = set(raw) - allowed
        if unknown:
            names = ", ".join(sorted(allowed))
            raise InputError(f"{where}: unknown key {sorted(unknown)[0]!r}; allowed: {names}")
        control = raw.get("control")
        if not isinstance(control, str) or not control.strip():
            raise InputError(f"{where}.control: expected the control in words")
        glides = raw.get("glides")
        if glides is not None and not isinstance(glides, bool):
            raise InputError(f"{where}.glides: expected true or false; got {glides!r}")
        rules.append(
            ControlRule(
                control=control.strip(),
                energy_at_least=_threshold(
                    raw.get("energy_at_least"), "energy", f"{where}.energy_at_least"
                ),
                energy_per_area_at_least=_threshold(
                    raw.get("energy_per_area_at_least"),
                    "energy_per_area",
                    f"{where}.energy_per_area_at_least",
                ),
                mass_at_least=_threshold(
                    raw.get("mass_at_least"), "mass", f"{where}.mass_at_least"
                ),
                glides=glides,
            )
        )
    return tuple(rules)
