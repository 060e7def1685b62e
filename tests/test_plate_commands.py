"""Sheets in the commands: the plate model is chosen for them and its results reach the output."""

from __future__ import annotations

import json
import math

import numpy as np
import pytest
from typer.testing import CliRunner

from dropcalc.analysis.plate_flight import largest_spin, sample_attitudes
from dropcalc.analysis.zone import ZoneSettings, sample_object, zone_object
from dropcalc.cli import app
from dropcalc.io.library import load_library
from dropcalc.model.conditions import Conditions
from dropcalc.physics.plate import plate_dimensions
from dropcalc.physics.wind import wind_spec

SHEET = "plywood-12mm-half-sheet"


def test_selection_covers_plates_and_thin_boxes_only() -> None:
    assert plate_dimensions("plate", {"length": 1.2, "width": 0.6, "thickness": 0.01}) == (
        1.2, 0.6, 0.01,
    )  # fmt: skip
    # A custom board given as a box: 18 mm against 300 mm is thin (< 0.1 of the middle edge).
    assert plate_dimensions("box", {"length": 2.4, "width": 0.3, "height": 0.018}) == (
        2.4, 0.3, 0.018,
    )  # fmt: skip
    assert plate_dimensions("box", {"length": 0.2, "width": 0.1, "height": 0.065}) is None
    assert plate_dimensions("cylinder", {"length": 0.01, "diameter": 0.3}) is None
    assert zone_object(load_library().get(SHEET)).plate == (1.22, 1.22, 0.012)
    assert zone_object(load_library().get("claw-hammer-16oz")).plate is None


def test_attitudes_cover_flat_upright_and_any_with_edge_tipping_spin() -> None:
    rng = np.random.default_rng(0)
    chord, span, pitch, spin = sample_attitudes((2.44, 1.22, 0.018), 30000, rng, 9.80665)
    assert set(np.unique(chord)) == {2.44, 1.22}
    assert np.all((pitch >= -15.0) & (pitch <= 180.0))
    flat = np.mean(np.abs(pitch) <= 15.0)
    upright = np.mean(np.abs(pitch - 90.0) <= 15.0)
    assert flat > 0.33
    assert upright > 0.33
    # A rigid body tipping a quarter turn about an edge: m g c / 2 = (m c^2 / 3) omega^2 / 2.
    top = math.sqrt(3 * 9.80665 / 1.22)
    assert float(largest_spin(1.22, 9.80665)) == top
    assert np.max(np.abs(spin[chord == 1.22])) <= top


def test_still_air_sheet_drifts_in_the_zone() -> None:
    obj = zone_object(load_library().get(SHEET))
    settings = ZoneSettings(height=17.5)
    _, drift, landed = sample_object(obj, settings, 2000, np.random.default_rng(1))
    assert np.all(landed)
    # A point mass dropped in still air lands below the edge (drift 0); a sheet does not.
    assert np.quantile(drift, 0.5) > 0.3


def test_fall_names_the_plate_model_and_the_lift_off_wind() -> None:
    runner = CliRunner()
    result = runner.invoke(
        app, ["fall", "--object", SHEET, "--height", "17.5", "--wind", "8", "--json"]
    )
    assert result.exit_code == 0, result.output
    data = json.loads(result.output)
    assert data["flight_model"].startswith("plate flight")
    assert not any("not conservative" in w for w in data["warnings"])
    # 1/2 rho U^2 x 1.8 x S = m g (EN 1991-1-4:2005 Table 7.2, zone F).
    rho = data["air_density_kg_m3"]
    expected = math.sqrt(2 * 9.8 * 9.80665 / (rho * 1.8 * 1.22 * 1.22))
    assert data["lift_off_speed_m_s"] == pytest.approx(expected, rel=1e-9)
    assert data["drift_m"] > 0
    assert data["drift_max_m"] >= data["drift_m"]
    text = runner.invoke(app, ["fall", "--object", SHEET, "--height", "17.5", "--wind", "8"])
    assert "lifts off above about" in text.output
    hammer = runner.invoke(
        app, ["fall", "--object", "claw-hammer-16oz", "--height", "10", "--json"]
    )
    assert json.loads(hammer.output)["flight_model"].startswith("point mass")


def test_zone_text_keeps_no_glide_warning_for_a_covered_sheet() -> None:
    from dropcalc.analysis.zone import compute_zone
    from dropcalc.present.text import render_zone

    obj = zone_object(load_library().get(SHEET))
    settings = ZoneSettings(
        height=10.0, conditions=Conditions(wind=wind_spec(6.0)), max_samples=20000
    )
    result = compute_zone([obj], settings)
    text = render_zone(result)
    assert "not conservative" not in text
    zone = result.objects[0]
    # The envelope holds every Monte Carlo sample of a sheet (its landing is chaotic).
    assert zone.worst_case >= zone.max_sampled + settings.margin - 1e-9
