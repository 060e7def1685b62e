"""Tests of the energy reference levels (:mod:`dropcalc.model.reference_levels`).

Each level is recomputed here from the test parameters its standard or paper states
([EN397-2012], [Z89.1-2014], [EN14052-2012], [DESR-6055.09], [YOGANANDAN-1995], [BIR-2012],
[DIMAIO-1981]) and compared at the precision the level is printed with:

- EN 397:2012+A1, shock absorption: 5 kg striker dropped 1 m -> 5 x 9.80665 x 1 = 49.03 J
  (printed 49 J);
- ANSI/ISEA Z89.1, Type I top impact: 3.6 kg at 5.5 m/s -> 1/2 x 3.6 x 5.5^2 = 54.45 J (printed
  54.5 J); Type II lateral: 5 kg at 3.5 m/s -> 1/2 x 5 x 3.5^2 = 30.625 J (printed 30.6 J);
- EN 14052:2012+A1: crown 100 J, off-crown 50 J (stated as energies);
- helmet penetration, pointed striker: EN 397 3 kg from 1 m = 29.4 J and ANSI/ISEA Z89.1
  24.5 J; the level is the lower end;
- DoD explosives safety (DESR 6055.09; DDESB TP-12): hazardous fragment 58 ft·lbf;
  1 ft·lbf = 1.355818 J (NIST SP 811, 2008, App. B.9) -> 78.64 J (printed 79 J);
- Yoganandan et al., J. Neurotrauma 12 (1995): mean dynamic skull fracture energy 28 J;
- Bir, Resslar and Stewart, Forensic Sci. Int. 220 (2012): 23.99 J/cm^2, and 1 cm^2 = 1e-4 m^2.
"""

from __future__ import annotations

import pytest

from dropcalc.errors import DropcalcError, UnknownObjectError
from dropcalc.model.reference_levels import (
    CAUTION_LEVELS,
    DEFAULT_LEVEL_KEYS,
    REFERENCE_LEVELS,
    reference_level,
)

# Standard acceleration of gravity [m/s^2]. 3rd CGPM (1901).
G = 9.80665
# NIST SP 811 (2008), Appendix B.9: foot pound-force to joule, 1.355 818 E+00.
FOOT_POUND_FORCE = 1.355818


def test_en397_is_5_kg_dropped_1_m():
    # E = m g h = 5 x 9.80665 x 1 = 49.03 J, printed as 49 J (EN 397:2012+A1).
    level = reference_level("helmet-en397")
    assert level.quantity == "energy"
    assert level.value == pytest.approx(5 * G * 1.0, abs=0.05)
    assert "EN 397" in level.label


def test_z89_type_i_top_is_3_6_kg_at_5_5_m_s():
    # E = 1/2 m v^2 = 1/2 x 3.6 x 5.5^2 = 54.45 J, printed 54.5 J (ANSI/ISEA Z89.1).
    level = reference_level("helmet-z89-top")
    assert level.value == pytest.approx(0.5 * 3.6 * 5.5**2, abs=0.05 + 1e-9)
    assert "Z89.1" in level.label


def test_z89_type_ii_lateral_is_5_kg_at_3_5_m_s():
    # E = 1/2 x 5 x 3.5^2 = 30.625 J, printed 30.6 J (ANSI/ISEA Z89.1).
    level = reference_level("helmet-z89-lateral")
    assert level.value == pytest.approx(0.5 * 5 * 3.5**2, abs=0.05)


def test_en14052_crown_and_off_crown():
    assert reference_level("helmet-en14052-crown").value == pytest.approx(100.0, abs=0.5)
    assert reference_level("helmet-en14052-off-crown").value == pytest.approx(50.0, abs=0.5)


def test_penetration_level_is_the_lower_end_of_the_two_standards():
    # EN 397: 3 kg pointed striker from 1 m = 29.4 J; ANSI/ISEA Z89.1: 24.5 J. Lower end.
    en397 = 3 * G * 1.0
    assert en397 == pytest.approx(29.4, abs=0.05)
    assert reference_level("helmet-penetration").value == pytest.approx(min(en397, 24.5), abs=0.05)


def test_hazardous_fragment_is_58_foot_pound_force():
    # 58 ft·lbf x 1.355818 J/(ft·lbf) = 78.64 J, printed 79 J (DDESB TP-12; NIST SP 811).
    joules = 58 * FOOT_POUND_FORCE
    assert joules == pytest.approx(78.64, abs=0.005)
    level = reference_level("fragment-79j")
    assert level.value == pytest.approx(joules, abs=0.5)
    assert "58 ft·lbf" in level.label


def test_skull_fracture_mean_is_28_j():
    assert reference_level("cadaver-skull-28j").value == pytest.approx(28.0, abs=0.5)


def test_skin_penetration_is_23_99_j_per_cm2_in_si():
    # 23.99 J/cm^2 = 23.99 / 1e-4 J/m^2 = 2.399e5 J/m^2 (Bir et al. 2012).
    level = reference_level("skin-penetration-50")
    assert level.quantity == "energy_per_area"
    assert level.value == pytest.approx(23.99 / 1e-4, rel=1e-9)
    assert level.value == pytest.approx(2.399e5, rel=1e-9)


def test_every_level_has_a_label_a_source_and_a_known_quantity():
    assert len(REFERENCE_LEVELS) >= 9
    for key, level in REFERENCE_LEVELS.items():
        assert level.key == key
        assert level.label.strip(), key
        assert level.source.strip(), key
        assert level.quantity in ("energy", "energy_per_area"), key
        assert level.value > 0, key


def test_default_keys_are_known_and_distinct():
    assert len(set(DEFAULT_LEVEL_KEYS)) == len(DEFAULT_LEVEL_KEYS)
    for key in DEFAULT_LEVEL_KEYS:
        assert reference_level(key).key == key


def test_unknown_key_raises_unknown_object_error_listing_the_keys():
    with pytest.raises(UnknownObjectError) as caught:
        reference_level("helmet-en999")
    message = str(caught.value)
    assert "helmet-en999" in message
    for key in REFERENCE_LEVELS:
        assert key in message
    # One domain family: the CLI catches it once and exits 2.
    assert isinstance(caught.value, DropcalcError)
    assert isinstance(caught.value, LookupError)


def test_levels_are_read_only():
    with pytest.raises(TypeError):
        REFERENCE_LEVELS["new"] = REFERENCE_LEVELS["helmet-en397"]  # type: ignore[index]


def test_caution_says_levels_are_not_safe_limits():
    assert "not safe limits" in CAUTION_LEVELS
