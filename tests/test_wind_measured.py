"""Where the wind was measured, and compass points (issue 13).

Check values are computed here from the published formulas of EN 1991-1-4:2005 [EN1991-1-4]:
roughness factor c_r(z) = k_r ln(max(z, z_min) / z0), terrain factor
k_r = 0.19 (z0 / 0.05 m)^0.07 (eq. 4.4, 4.5), turbulence intensity I_v = 1 / ln(z / z0)
(eq. 4.7 with k_I = c_0 = 1) and Table 4.1 (category II z0 = 0.05 m, z_min = 2 m; category IV
z0 = 1 m, z_min = 10 m). The 16 compass points are 22.5 degrees apart, N = 0, clockwise.
"""

from __future__ import annotations

import json
import math
from typing import Any

import pytest
from typer.testing import CliRunner

from dropcalc.cli import app
from dropcalc.errors import InputError
from dropcalc.physics.wind import compass_point, open_country_factor
from dropcalc.units import parse_direction

runner = CliRunner()
ENV = {"COLUMNS": "100", "FORCE_COLOR": None, "TERM": "dumb"}


def c_r(z0: float, z_min: float, z: float = 10.0) -> float:
    return 0.19 * (z0 / 0.05) ** 0.07 * math.log(max(z, z_min) / z0)


def test_open_country_to_category_iv_mean() -> None:
    expected = c_r(1.0, 10.0) / c_r(0.05, 2.0)  # 0.5360
    assert open_country_factor(1.0, 10.0) == pytest.approx(expected, rel=1e-12)
    assert expected == pytest.approx(0.536, abs=5e-4)
    assert open_country_factor(0.05, 2.0) == pytest.approx(1.0, rel=1e-12)


def test_open_country_to_category_iv_gust() -> None:
    peak_iv = c_r(1.0, 10.0) * math.sqrt(1 + 7 / math.log(10 / 1.0))
    peak_ii = c_r(0.05, 2.0) * math.sqrt(1 + 7 / math.log(10 / 0.05))
    assert open_country_factor(1.0, 10.0, "gust") == pytest.approx(peak_iv / peak_ii, rel=1e-12)


def zone_json(*args: str) -> dict[str, Any]:
    result = runner.invoke(
        app,
        ["zone", "--height", "12 m", "--object", "combination-spanner-19mm",
         "--precision", "0.2", *args, "--json"],
        env=ENV,
    )  # fmt: skip
    assert result.exit_code == 0, result.output
    return json.loads(result.stdout)


def test_zone_converts_an_open_country_wind_to_the_site() -> None:
    data = zone_json("--wind", "10 m/s", "--terrain", "en-iv", "--wind-measured", "open-country")
    expected = 10.0 * c_r(1.0, 10.0) / c_r(0.05, 2.0)
    assert data["wind_speed_10m_m_s"] == pytest.approx(expected, rel=1e-9)
    site = zone_json("--wind", "10 m/s", "--terrain", "en-iv")
    assert site["wind_speed_10m_m_s"] == pytest.approx(10.0, rel=1e-12)
    # The same forecast gives a smaller zone over rough terrain than taken at the site.
    assert data["radius_m"] < site["radius_m"]


def test_open_country_needs_a_terrain_to_convert_to() -> None:
    result = runner.invoke(
        app,
        ["zone", "--height", "12 m", "--object", "combination-spanner-19mm",
         "--wind", "10 m/s", "--wind-measured", "open-country"],
        env=ENV,
    )  # fmt: skip
    assert result.exit_code == 2
    assert "terrain" in result.output


def test_zone_warns_when_no_terrain_is_given() -> None:
    data = zone_json("--wind", "8 m/s")
    assert "no --terrain given" in data["wind_warning"]
    assert zone_json("--wind", "8 m/s", "--terrain", "en-iii")["wind_warning"] is None
    result = runner.invoke(
        app,
        ["zone", "--height", "12 m", "--object", "combination-spanner-19mm",
         "--precision", "0.2", "--wind", "8 m/s"],
        env=ENV,
    )  # fmt: skip
    assert "no --terrain given" in " ".join(result.stdout.split())


@pytest.mark.parametrize(
    ("typed", "degrees"),
    [("N", 0.0), ("NNE", 22.5), ("SW", 225.0), ("wsw", 247.5), ("W", 270.0), ("NNW", 337.5),
     ("225", 225.0), ("225 deg", 225.0), ("S-W", 225.0)],
)  # fmt: skip
def test_compass_points_and_degrees(typed: str, degrees: float) -> None:
    assert parse_direction(typed, "--wind-from") == pytest.approx(degrees, abs=1e-12)


def test_unknown_direction_names_the_field() -> None:
    with pytest.raises(InputError, match="--wind-from.*compass point"):
        parse_direction("SWW", "--wind-from")


def test_compass_point_of_a_direction() -> None:
    assert [compass_point(d) for d in (0, 11, 12, 225, 250, 359)] == [
        "N", "N", "NNE", "SW", "WSW", "N",
    ]  # fmt: skip


def test_zone_takes_a_compass_point_for_the_wind_direction() -> None:
    by_name = zone_json("--wind", "6 m/s", "--terrain", "en-iii", "--wind-from", "SW")
    by_degrees = zone_json("--wind", "6 m/s", "--terrain", "en-iii", "--wind-from", "225")
    assert by_name["radius_m"] == by_degrees["radius_m"]


def test_scenario_reads_compass_points_and_where_the_wind_was_measured(tmp_path) -> None:
    from dropcalc.io.scenario import load_scenario

    path = tmp_path / "scenario.toml"
    path.write_text(
        '[job]\ntitle = "t"\n[wind]\nspeed = "10 m/s"\nfrom = "WSW"\nterrain = "urban"\n'
        'measured = "open-country"\n'
        '[[work_area]]\n  [[work_area.edge]]\n  points = [[0, 0], [10, 0]]\n  height = "12 m"\n'
        '[[object]]\nid = "combination-spanner-19mm"\n',
        encoding="utf-8",
    )
    scenario = load_scenario(path)
    assert scenario.wind.from_direction_deg == pytest.approx(247.5)
    assert scenario.wind.speed_10m == pytest.approx(10.0 * c_r(1.0, 10.0) / c_r(0.05, 2.0))
    assert "open country" in scenario.wind_basis
