"""The ground-surface table the after-landing model reads (dropcalc.physics.scatter).

The mechanics of the contact are tested in test_contact.py.
"""

from __future__ import annotations

import pytest

from dropcalc.errors import UnknownObjectError
from dropcalc.physics.scatter import SURFACES, surface

# Rockfall normal restitution by ground, from memory: Dorren, Prog. Phys. Geogr. 27 (2003)
# 69-87; Chau et al., IJRMMS 39 (2002) 69-77. key: e_n range. Concrete/rock 0.45-0.55.
ROCKFALL_NORMAL_RESTITUTION = {
    "asphalt": (0.35, 0.40),
    "compacted-soil": (0.30, 0.40),
    "grass": (0.20, 0.30),
    "soft-soil": (0.20, 0.30),
}
ROCK = (0.45, 0.55)


@pytest.mark.parametrize("key", sorted(ROCKFALL_NORMAL_RESTITUTION))
def test_ground_factor_is_the_rockfall_ratio_to_rock_at_both_ends(key: str) -> None:
    low, high = ROCKFALL_NORMAL_RESTITUTION[key]
    factor = surface(key).restitution_factor
    assert sorted((low / ROCK[0], high / ROCK[1])) == pytest.approx(list(factor), abs=0.005)


def test_surface_table_is_consistent() -> None:
    assert {"concrete", "asphalt", "compacted-soil", "gravel", "grass"} <= set(SURFACES)
    assert SURFACES["concrete"].restitution_factor == (1.0, 1.0)
    for key, item in SURFACES.items():
        assert item.key == key
        assert item.source
        low, high = item.restitution_factor
        assert 0 < low <= high <= 1
        for low, high in (item.friction, item.rolling_resistance):
            assert 0 < low <= high
        # Rolling is the easier motion at the conservative (low) ends the envelope uses.
        assert item.rolling_resistance[0] < item.friction[0]
    # Gravel is chosen between compact soil and soft soil (no source for the choice).
    gravel, compact, soft = surface("gravel"), surface("compacted-soil"), surface("soft-soil")
    for end in (0, 1):
        assert (
            soft.restitution_factor[end]
            <= gravel.restitution_factor[end]
            <= compact.restitution_factor[end]
        )


def test_surface_lookup_is_forgiving_and_unknown_names_list_the_keys() -> None:
    assert surface("Compacted soil") is SURFACES["compacted-soil"]
    assert surface("compacted_soil") is SURFACES["compacted-soil"]
    assert surface(SURFACES["grass"]) is SURFACES["grass"]
    with pytest.raises(UnknownObjectError, match="surface must be one of concrete, asphalt"):
        surface("ice")
