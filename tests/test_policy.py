"""Tests of the control policy (:mod:`dropcalc.model.policy`) and ``dropcalc batch --policy``.

Quantities in a policy file are converted with exact unit definitions: 1 cm^2 = 1e-4 m^2,
1 ft·lbf = 1.355818 J (NIST SP 811, 2008, App. B.9: 1.355 818 E+00, rounded there),
1 lb = 0.45359237 kg (exact, NIST SP 811). The reference levels a rule may name are checked
against their standards in ``test_reference_levels.py``.
"""

from __future__ import annotations

import json
from pathlib import Path
from typing import Any

import pytest
from typer.testing import CliRunner

from dropcalc.cli import app
from dropcalc.errors import InputError
from dropcalc.model.policy import (
    DEFAULT_RULES,
    ControlRule,
    load_policy,
    suggest_control,
    suggest_controls,
)

runner = CliRunner()


def write_policy(folder: Path, text: str, name: str = "policy.toml") -> Path:
    path = folder / name
    path.write_text(text, encoding="utf-8")
    return path


GOOD = """\
# A site's own rules; every rule that matches applies.
[[rule]]
control = "secure sheets"
glides = true

[[rule]]
control = "exclusion zone"
energy_at_least = "100 J"

[[rule]]
control = "heavy tool: tether to the structure"
mass_at_least = "5 lb"

[[rule]]
control = "edged item: netting"
energy_per_area_at_least = "20 J/cm2"

[[rule]]
control = "helmet test energy: toe boards"
energy_at_least = "helmet-en397"

[[rule]]
control = "fragment energy in ft·lbf"
energy_at_least = "58 ft*lbf"

[[rule]]
control = "housekeeping"
"""


def test_load_policy_reads_quantities_and_level_keys(tmp_path):
    rules = load_policy(write_policy(tmp_path, GOOD))
    assert [r.control for r in rules] == [
        "secure sheets",
        "exclusion zone",
        "heavy tool: tether to the structure",
        "edged item: netting",
        "helmet test energy: toe boards",
        "fragment energy in ft·lbf",
        "housekeeping",
    ]
    assert rules[0].glides is True
    assert rules[1].energy_at_least == pytest.approx(100.0, rel=1e-12)
    assert rules[2].mass_at_least == pytest.approx(5 * 0.45359237, rel=1e-12)  # NIST SP 811
    # 20 J/cm^2 = 20 / 1e-4 J/m^2.
    assert rules[3].energy_per_area_at_least == pytest.approx(2.0e5, rel=1e-12)
    # A level key stands for the level's value: EN 397, 5 kg x g x 1 m = 49.0 J.
    assert rules[4].energy_at_least == pytest.approx(49.0, abs=0.05)
    # 58 ft·lbf x 1.355818 J/(ft·lbf) = 78.64 J (NIST SP 811 factor, 7 digits).
    assert rules[5].energy_at_least == pytest.approx(58 * 1.355818, rel=1e-6)
    unconditional = rules[6]
    assert unconditional.energy_at_least is None
    assert unconditional.energy_per_area_at_least is None
    assert unconditional.mass_at_least is None
    assert unconditional.glides is None


def test_load_policy_accepts_a_mass_in_kg_and_a_bare_number(tmp_path):
    text = '[[rule]]\ncontrol = "a"\nmass_at_least = "2.3 kg"\nenergy_at_least = 30\n'
    (rule,) = load_policy(write_policy(tmp_path, text))
    assert rule.mass_at_least == pytest.approx(2.3, rel=1e-12)
    assert rule.energy_at_least == pytest.approx(30.0, rel=1e-12)


def test_every_matching_rule_applies(tmp_path):
    rules = load_policy(write_policy(tmp_path, GOOD))
    c = [r.control for r in rules]
    # A gliding 30 kg sheet with 500 J matches the glide, 100 J, mass, 49 J and 79 J rules:
    # it gets every one of them, in the order of the file (not just the first).
    assert suggest_controls(rules, 500.0, None, 30.0, True) == (c[0], c[1], c[2], c[4], c[5])
    # 150 J, 1 kg, not gliding: the 100 J, 49 J and 79 J rules.
    assert suggest_controls(rules, 150.0, None, 1.0, False) == (c[1], c[4], c[5])
    # 60 J, 3 kg (> 5 lb = 2.27 kg): the mass rule and the 49 J level.
    assert suggest_controls(rules, 60.0, None, 3.0, False) == (c[2], c[4])
    # 60 J, 1 kg, 30 J/cm^2 = 3e5 J/m^2: the per-area rule and the 49 J level.
    assert suggest_controls(rules, 60.0, 3.0e5, 1.0, False) == (c[3], c[4])
    # 60 J, 1 kg, no contact area: the per-area rule does not match; the 49 J rule does.
    assert suggest_controls(rules, 60.0, None, 1.0, False) == (c[4],)
    # Thresholds are "at least": exactly 100 J matches the 100 J rule.
    assert c[1] in suggest_controls(rules, 100.0, None, 1.0, False)
    # Nothing with conditions matches: the unconditional rule, and only then.
    assert suggest_controls(rules, 1.0, None, 0.1, False) == ("housekeeping",)
    assert "housekeeping" not in suggest_controls(rules, 60.0, None, 1.0, False)
    # One cell for tables: the controls joined in order.
    assert suggest_control(rules, 60.0, None, 3.0, False) == f"{c[2]} | {c[4]}"


def test_heavy_sheet_and_glass_pane_get_prevent_the_drop_too():
    # Issue 13: the first-match rule gave a 12 kg plywood sheet striking with 1660 J and a
    # 16 kg glass pane with 2220 J only "secure against wind". Both glide AND exceed the
    # 100 J of EN 14052 [EN14052-2012]: they must get both controls.
    for energy, mass in ((1660.0, 12.0), (2220.0, 16.0)):
        controls = suggest_controls(DEFAULT_RULES, energy, None, mass, True)
        assert any(c.startswith("secure against wind") for c in controls), controls
        assert any(c.startswith("prevent the drop") for c in controls), controls
        assert DEFAULT_RULES[-1].control not in controls


def test_glides_condition_true_and_false():
    rules = (
        ControlRule("flat", glides=True),
        ControlRule("not flat", glides=False),
    )
    assert suggest_control(rules, 1.0, None, 1.0, True) == "flat"
    assert suggest_control(rules, 1.0, None, 1.0, False) == "not flat"


def test_every_condition_of_a_rule_must_hold():
    rules = (ControlRule("heavy and hard", energy_at_least=50.0, mass_at_least=5.0),)
    assert suggest_control(rules, 60.0, None, 6.0, False) == "heavy and hard"
    assert suggest_control(rules, 60.0, None, 4.0, False) == ""
    assert suggest_control(rules, 40.0, None, 6.0, False) == ""


def test_default_rules_follow_the_reference_levels():
    # The default thresholds are the levels named in their text:
    # [EN14052-2012] crown 100 J, [Z89.1-2014] helmet penetration 24.5 J, [BIR-2012] skin
    # penetration 23.99 J/cm^2.
    energies = [r.energy_at_least for r in DEFAULT_RULES if r.energy_at_least is not None]
    assert energies == [pytest.approx(100.0), pytest.approx(24.5)]
    per_area = [r.energy_per_area_at_least for r in DEFAULT_RULES if r.energy_per_area_at_least]
    assert per_area == [pytest.approx(23.99e4)]
    assert suggest_control(DEFAULT_RULES, 150.0, None, 5.0, False).startswith("prevent")
    assert DEFAULT_RULES[-1].control  # a default for everything else
    assert suggest_control(DEFAULT_RULES, 0.1, None, 0.01, False) == DEFAULT_RULES[-1].control


# --------------------------------------------------------------------------------------------
# Bad policy files: InputError naming the file, the rule number and the key

BAD_FILES = {
    "not-toml": ("this is = not [toml", ()),
    "no-rules": ('title = "site rules"\n', ()),
    "empty-rules": ("rule = []\n", ()),
    "unknown-key": (
        '[[rule]]\ncontrol = "a"\n[[rule]]\ncontrol = "b"\nenergy_atleast = "100 J"\n',
        ("rule[2]", "energy_atleast"),
    ),
    "bad-quantity": (
        '[[rule]]\ncontrol = "a"\nenergy_at_least = "lots"\n',
        ("rule[1]", "energy_at_least", "lots"),
    ),
    "wrong-dimension": (
        '[[rule]]\ncontrol = "a"\nenergy_at_least = "100 kg"\n',
        ("rule[1]", "energy_at_least", "100 kg"),
    ),
    "negative": (
        '[[rule]]\ncontrol = "a"\nmass_at_least = "-3 kg"\n',
        ("rule[1]", "mass_at_least", "-3 kg"),
    ),
    "per-area-level-for-energy": (
        '[[rule]]\ncontrol = "a"\n[[rule]]\ncontrol = "b"\n'
        'energy_at_least = "skin-penetration-50"\n',
        ("rule[2]", "energy_at_least", "skin-penetration-50"),
    ),
    "energy-level-for-per-area": (
        '[[rule]]\ncontrol = "a"\nenergy_per_area_at_least = "helmet-en397"\n',
        ("rule[1]", "energy_per_area_at_least", "helmet-en397"),
    ),
    "per-area-quantity-for-energy": (
        '[[rule]]\ncontrol = "a"\nenergy_at_least = "20 J/cm2"\n',
        ("rule[1]", "energy_at_least", "20 J/cm2"),
    ),
    "no-control": ('[[rule]]\nenergy_at_least = "1 J"\n', ("rule[1]", "control")),
    "glides-not-bool": ('[[rule]]\ncontrol = "a"\nglides = "yes"\n', ("rule[1]", "glides")),
    "boolean-threshold": (
        '[[rule]]\ncontrol = "a"\nenergy_at_least = true\n',
        ("rule[1]", "energy_at_least"),
    ),
}


@pytest.mark.parametrize(("name", "words"), [(k, v[1]) for k, v in BAD_FILES.items()])
def test_bad_policy_files_raise_input_error_naming_file_rule_and_key(tmp_path, name, words):
    path = write_policy(tmp_path, BAD_FILES[name][0], f"{name}.toml")
    with pytest.raises(InputError) as caught:
        load_policy(path)
    message = str(caught.value)
    assert f"{name}.toml" in message
    for word in words:
        assert word in message, (word, message)


def test_missing_policy_file_raises_input_error(tmp_path):
    with pytest.raises(InputError, match="nothing.toml"):
        load_policy(tmp_path / "nothing.toml")


@pytest.mark.parametrize("text", ["rule = [1]\n", 'rule = ["a"]\n'], ids=["number", "string"])
def test_rule_entries_that_are_not_tables(tmp_path, text):
    path = write_policy(tmp_path, text, "odd.toml")
    with pytest.raises(InputError) as caught:
        load_policy(path)
    message = str(caught.value)
    assert "odd.toml" in message
    assert "rule[1]" in message
    assert "table" in message


# --------------------------------------------------------------------------------------------
# Through the CLI


def _items(folder: Path) -> Path:
    path = folder / "items.csv"
    path.write_text("label,mass,drag_area\nheavy,10 kg,0.01\nlight,0.1 kg,0.01\n", encoding="utf-8")
    return path


def _batch(*args: str) -> Any:
    env = {"COLUMNS": "120", "FORCE_COLOR": None, "TERM": "dumb"}
    return runner.invoke(app, ["batch", *args], env=env)


def test_policy_option_changes_the_control_column(tmp_path):
    items = _items(tmp_path)
    policy = write_policy(
        tmp_path,
        '[[rule]]\ncontrol = "site rule A"\nenergy_at_least = "helmet-en397"\n'
        '[[rule]]\ncontrol = "site rule B"\n',
    )
    default = _batch(str(items), "--height", "10 m", "--json")
    assert default.exit_code == 0, default.output
    mine = _batch(str(items), "--height", "10 m", "--json", "--policy", str(policy))
    assert mine.exit_code == 0, mine.output
    controls = {r["label"]: r["control"] for r in json.loads(mine.stdout)}
    # 10 kg from 10 m carries about m g h = 98 J (> 49 J); 0.1 kg with Cd A 0.01 m^2 has
    # v_t^2 = 2 m g / (rho Cd A) = 160 m^2/s^2, so at most 1/2 m v_t^2 = 8 J (< 49 J).
    assert controls == {"heavy": "site rule A", "light": "site rule B"}
    defaults = {r["label"]: r["control"] for r in json.loads(default.stdout)}
    assert set(defaults.values()).isdisjoint({"site rule A", "site rule B"})


@pytest.mark.parametrize("name", ["not-toml", "unknown-key", "per-area-level-for-energy"])
def test_bad_policy_file_through_the_cli_exits_2_with_one_line(tmp_path, name):
    policy = write_policy(tmp_path, BAD_FILES[name][0], f"{name}.toml")
    result = _batch(str(_items(tmp_path)), "--height", "10 m", "--policy", str(policy))
    assert result.exit_code == 2, result.output
    lines = [line for line in result.stderr.splitlines() if line.strip()]
    assert len(lines) == 1, result.stderr
    assert f"{name}.toml" in lines[0]
    assert "Traceback" not in result.output


def test_missing_policy_file_through_the_cli_exits_2(tmp_path):
    result = _batch(str(_items(tmp_path)), "--height", "10 m", "--policy", "nothing.toml")
    assert result.exit_code == 2, result.output
    assert "nothing.toml" in result.stderr
