"""Energy reference levels to compare impacts with.

Sources: [EN397-2012], [Z89.1-2014], [EN14052-2012], [DESR-6055.09], [YOGANANDAN-1995],
[BIR-2012], [DIMAIO-1981] (docs/references.md).

They are references, not safe limits: a helmet test energy is not a protection rating, and
injury can happen well below every level here. Each level is labelled by what it is (the test
or the measurement it comes from), never by an injury word of our own.
"""

from __future__ import annotations

from dataclasses import dataclass
from types import MappingProxyType

from dropcalc.errors import UnknownObjectError


@dataclass(frozen=True)
class ReferenceLevel:
    """One energy (or energy per area) reference level.

    Attributes
    ----------
    key : str
        Short id used in policies and output columns.
    label : str
        What the level is, for tables and reports.
    value : float
        The level: J for ``quantity == "energy"``, J/m^2 for ``"energy_per_area"``.
    quantity : {"energy", "energy_per_area"}
        Which impact quantity it is compared with.
    source : str
        Where the number comes from.
    """

    key: str
    label: str
    value: float
    quantity: str
    source: str


_LEVELS = (
    ReferenceLevel(
        "helmet-en397",
        "industrial helmet crown test energy, EN 397 (5 kg from 1 m)",
        49.0,
        "energy",
        "EN 397:2012+A1, shock absorption test: 5 kg striker dropped 1 m",
    ),
    ReferenceLevel(
        "helmet-z89-top",
        "industrial helmet top test energy, ANSI/ISEA Z89.1 Type I (3.6 kg at 5.5 m/s)",
        54.5,
        "energy",
        "ANSI/ISEA Z89.1, Type I top impact: 3.6 kg striker at 5.5 m/s",
    ),
    ReferenceLevel(
        "helmet-z89-lateral",
        "helmet lateral test energy, ANSI/ISEA Z89.1 Type II (5 kg at 3.5 m/s)",
        30.6,
        "energy",
        "ANSI/ISEA Z89.1, Type II lateral impact: 5 kg striker at 3.5 m/s",
    ),
    ReferenceLevel(
        "helmet-en14052-crown",
        "high-performance helmet crown test energy, EN 14052",
        100.0,
        "energy",
        "EN 14052:2012+A1, crown impact 100 J",
    ),
    ReferenceLevel(
        "helmet-en14052-off-crown",
        "high-performance helmet off-crown test energy, EN 14052",
        50.0,
        "energy",
        "EN 14052:2012+A1, off-crown impact 50 J",
    ),
    ReferenceLevel(
        "helmet-penetration",
        "helmet penetration test energy, pointed striker (lower end), EN 397 / ANSI/ISEA Z89.1",
        24.5,
        "energy",
        "EN 397 (3 kg pointed striker from 1 m, 29.4 J); ANSI/ISEA Z89.1 (24.5 J): lower end",
    ),
    ReferenceLevel(
        "fragment-79j",
        "hazardous fragment energy, US DoD explosives safety (58 ft·lbf, printed as 79 J)",
        79.0,
        "energy",
        "DoD Explosives Safety Standards DESR 6055.09; DDESB Technical Paper 12: 58 ft·lbf, "
        "whose metric value the standard prints as 79 J (used here); 58 ft·lbf converts to "
        "78.6 J",
    ),
    ReferenceLevel(
        "cadaver-skull-28j",
        "mean dynamic skull fracture energy in cadaver head drop tests",
        28.0,
        "energy",
        "Yoganandan et al., J. Neurotrauma 12 (1995): range 14-68.5 J, mean 28 J",
    ),
    ReferenceLevel(
        "skin-penetration-50",
        "energy per area for 50 % skin penetration risk (Bir et al. 2012)",
        23.99e4,
        "energy_per_area",
        "Bir, Resslar and Stewart, Forensic Sci. Int. 220 (2012): 23.99 J/cm^2",
    ),
)

#: All reference levels by key, in the order above.
REFERENCE_LEVELS: MappingProxyType[str, ReferenceLevel] = MappingProxyType(
    {level.key: level for level in _LEVELS}
)

#: Levels reported by default (batch columns, report tables).
DEFAULT_LEVEL_KEYS: tuple[str, ...] = (
    "helmet-penetration",
    "helmet-en397",
    "helmet-en14052-crown",
    "fragment-79j",
    "skin-penetration-50",
)

CAUTION_LEVELS = (
    "Reference levels are test energies and published measurements, not safe limits: a helmet "
    "test energy is not a protection rating, and injury can happen well below every level."
)


def reference_level(key: str) -> ReferenceLevel:
    """Return the level with this key; UnknownObjectError lists the valid keys."""
    try:
        return REFERENCE_LEVELS[key]
    except KeyError:
        raise UnknownObjectError(
            f"unknown reference level {key!r}; known: {', '.join(REFERENCE_LEVELS)}"
        ) from None
