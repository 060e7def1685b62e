"""Tests of ``dropcalc fall``: JSON contract, units, options, bad input, windborne objects, help.

Check values come from outside the code under test: closed forms for a fall with quadratic drag
(Timmerman & van der Weele 1999), vacuum projectile kinematics, incline kinematics, the
wind-frame principle, WGS84 normal gravity (NIMA TR8350.2), the ICAO standard atmosphere,
CIPM-2007 humid air and the EN 1991-1-4 peak velocity factor. Every expected value is computed
in this file from the formula named beside it, never read back from dropcalc.
"""

from __future__ import annotations

import functools
import json
import math
import re
import subprocess
import sys
from typing import Any

import pytest
from typer.testing import CliRunner

from dropcalc.cli import app

# Standard acceleration of gravity [m/s^2]. 3rd CGPM (1901), Comptes rendus p. 70.
G = 9.80665

# JSON contract fields, DESIGN.md "JSON contract": never renamed.
CONTRACT_FIELDS = (
    "impact_speed_m_s",
    "impact_energy_j",
    "fall_time_s",
    "drift_m",
    "terminal_speed_m_s",
    "impact_angle_deg",
    "air_density_kg_m3",
)

# Fields that describe the impact; all null when the object never lands.
IMPACT_FIELDS = (
    "impact_speed_m_s",
    "impact_energy_j",
    "fall_time_s",
    "drift_m",
    "impact_angle_deg",
)

# A dense object: 10 kg with a drag area of 1e-6 m^2 has k = rho Cd A / (2 m) ~ 6e-8 1/m, so over
# 20 m drag changes speeds by ~1e-6 relative: vacuum kinematics hold to far better than 1e-4.
DENSE = ("--mass", "10 kg", "--drag-area", "1e-6 m2")

# A body where drag matters: v_t = sqrt(2 m g / (rho Cd A)) = 28.6 m/s at rho = 1.2 kg/m^3, so a
# 30 m fall reaches 72 % of v_t.
DRAGGY = ("--mass", "1 kg", "--drag-area", "0.02 m2", "--air-density", "1.2 kg/m3")

runner = CliRunner()


def _reject_constant(name: str) -> None:
    raise AssertionError(f"JSON output contains the non-standard constant {name}")


def invoke(*args: str, columns: int = 100) -> Any:
    """Run ``dropcalc fall ARGS`` in-process; stdout and stderr stay separate on the result."""
    env = {"COLUMNS": str(columns), "FORCE_COLOR": None, "TERM": "dumb"}
    return runner.invoke(app, ["fall", *args], env=env)


def fall_json(*args: str) -> dict[str, Any]:
    """Run ``dropcalc fall ARGS --json``; check exit 0 and that stdout is one JSON object only."""
    result = invoke(*args, "--json")
    assert result.exit_code == 0, result.output
    # json.loads refuses trailing text ("Extra data"), so stdout holds exactly one JSON value;
    # parse_constant refuses NaN and Infinity, which are not JSON.
    data = json.loads(result.stdout, parse_constant=_reject_constant)
    assert isinstance(data, dict), result.stdout
    return data


def terminal_speed(mass: float, drag_area: float, density: float, gravity: float = G) -> float:
    """v_t = sqrt(2 m g / (rho Cd A)). Timmerman & van der Weele, Am. J. Phys. 67 (1999) 538."""
    return math.sqrt(2.0 * mass * gravity / (density * drag_area))


def still_air_speed(height: float, v_t: float, gravity: float = G) -> float:
    """v(h) = v_t sqrt(1 - exp(-2 g h / v_t^2)), from rest in still air.

    Timmerman & van der Weele, "On the rise and fall of a ball with linear or quadratic drag",
    Am. J. Phys. 67 (1999) 538-546.
    """
    return v_t * math.sqrt(1.0 - math.exp(-2.0 * gravity * height / v_t**2))


def still_air_time(height: float, v_t: float, gravity: float = G) -> float:
    """t(h) = (v_t / g) arccosh(exp(g h / v_t^2)). Timmerman & van der Weele (1999)."""
    return v_t / gravity * math.acosh(math.exp(gravity * height / v_t**2))


def vacuum_fall_time(height: float, downward_speed: float, gravity: float = G) -> float:
    """Time to fall ``height`` with initial downward speed, no drag: h = v0 t + g t^2 / 2."""
    return (-downward_speed + math.sqrt(downward_speed**2 + 2.0 * gravity * height)) / gravity


# --------------------------------------------------------------------------------------------
# JSON contract
# --------------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    "args",
    [
        pytest.param((*DRAGGY, "--height", "30 m"), id="still-air"),
        pytest.param((*DRAGGY, "--height", "30 m", "--wind", "12 m/s"), id="mean-wind"),
        pytest.param(
            ("--mass", "5 g", "--drag-area", "0.05 m2", "--height", "30 m", "--wind", "30 m/s"),
            id="windborne",
        ),
    ],
)
def test_json_is_one_object_with_the_contract_fields(args: tuple[str, ...]) -> None:
    data = fall_json(*args)
    for name in CONTRACT_FIELDS:
        assert name in data, f"JSON contract field {name} missing"
        value = data[name]
        assert value is None or (isinstance(value, float) and math.isfinite(value)), (name, value)
    assert isinstance(data["air_density_kg_m3"], float)


def test_json_still_air_drop_matches_the_quadratic_drag_closed_form() -> None:
    # 1 kg, Cd A = 0.02 m^2, rho = 1.2 kg/m^3, 30 m, still air, from rest.
    data = fall_json(*DRAGGY, "--height", "30 m")
    v_t = terminal_speed(1.0, 0.02, 1.2)
    v = still_air_speed(30.0, v_t)
    assert data["terminal_speed_m_s"] == pytest.approx(v_t, rel=1e-9)
    assert data["impact_speed_m_s"] == pytest.approx(v, rel=1e-6)
    assert data["fall_time_s"] == pytest.approx(still_air_time(30.0, v_t), rel=1e-6)
    # Kinetic energy E = m v^2 / 2 and momentum p = m v (definitions).
    assert data["impact_energy_j"] == pytest.approx(0.5 * 1.0 * v**2, rel=1e-6)
    assert data["momentum_kg_m_s"] == pytest.approx(1.0 * v, rel=1e-6)
    assert data["drift_m"] == pytest.approx(0.0, abs=1e-9)
    assert data["impact_angle_deg"] == pytest.approx(0.0, abs=1e-6)
    assert data["air_density_kg_m3"] == pytest.approx(1.2, rel=1e-12)
    # 95 % of v_t after h = -(v_t^2 / 2g) ln(1 - 0.95^2) = 1.1640 v_t^2 / g: inverted closed form
    # above (derived.
    h95 = -(v_t**2) / (2.0 * G) * math.log(1.0 - 0.95**2)
    assert h95 == pytest.approx(1.1640 * v_t**2 / G, rel=1e-4)
    assert data["height_to_95_percent_terminal_m"] == pytest.approx(h95, rel=1e-6)
    assert data["landed"] is True


def test_json_dense_object_falls_as_in_vacuum() -> None:
    # Free fall without drag: v = sqrt(2 g h), t = sqrt(2 h / g), E = m g h (m = 10 kg, h = 20 m).
    data = fall_json(*DENSE, "--height", "20 m")
    assert data["impact_speed_m_s"] == pytest.approx(math.sqrt(2 * G * 20.0), rel=1e-5)
    assert data["fall_time_s"] == pytest.approx(math.sqrt(2 * 20.0 / G), rel=1e-5)
    assert data["impact_energy_j"] == pytest.approx(10.0 * G * 20.0, rel=1e-5)


def test_json_wind_frame_principle_gives_exact_drift_and_impact_angle() -> None:
    # Wind-frame principle (derived: in a uniform wind U an object
    # released moving with the air (carrier velocity = U) falls relative to the air exactly as in
    # still air, so it drifts U t_fall with t_fall = (v_t/g) arccosh(exp(g h / v_t^2)), lands
    # with vertical speed v(h) and horizontal speed U, at atan(U / v(h)) from vertical.
    # The default wind blows away from the edge (edge faces 90 deg: towards east).
    data = fall_json(
        *DRAGGY, "--height", "30 m", "--wind", "8 m/s", "--carrier-velocity", "8,0,0 m/s"
    )
    v_t = terminal_speed(1.0, 0.02, 1.2)
    t = still_air_time(30.0, v_t)
    v = still_air_speed(30.0, v_t)
    assert data["fall_time_s"] == pytest.approx(t, rel=1e-6)
    assert data["drift_m"] == pytest.approx(8.0 * t, rel=1e-6)
    assert data["horizontal_impact_speed_m_s"] == pytest.approx(8.0, rel=1e-6)
    assert data["vertical_impact_speed_m_s"] == pytest.approx(v, rel=1e-6)
    assert data["impact_speed_m_s"] == pytest.approx(math.hypot(8.0, v), rel=1e-6)
    assert data["impact_angle_deg"] == pytest.approx(math.degrees(math.atan2(8.0, v)), abs=1e-4)


def test_json_object_released_at_rest_in_wind_drifts_less_than_wind_times_fall_time() -> None:
    # Wind-frame principle (derived: released at rest, the object
    # drifts less than U t_fall.
    data = fall_json(*DRAGGY, "--height", "30 m", "--wind", "8 m/s")
    assert 0.0 < data["drift_m"] < 8.0 * data["fall_time_s"]


# --------------------------------------------------------------------------------------------
# Units
# --------------------------------------------------------------------------------------------


def assert_same_result(left: dict[str, Any], right: dict[str, Any]) -> None:
    """Every numeric field equal to 1e-9 relative; the contract fields must be present."""
    assert left.keys() == right.keys()
    for name in CONTRACT_FIELDS:
        assert left[name] is not None, name
    for name, value in left.items():
        if isinstance(value, float) and not isinstance(value, bool):
            assert right[name] == pytest.approx(value, rel=1e-9, abs=1e-12), name


def test_units_give_the_same_result_as_si_inputs() -> None:
    # Exact conversion factors, NIST SP 811 (2008), Appendix B: 1 lb = 0.45359237 kg,
    # 1 ft = 0.3048 m, 1 mph = 0.44704 m/s. 20 degC is the bare-number temperature unit of
    # dropcalc; 60 % = 0.6; 98 kPa = 98000 Pa.
    with_units = fall_json(
        "--mass", "12 lb", "--height", "100 ft", "--drag-area", "0.004 m2",
        "--wind", "25 mph", "--elevation", "1500 m", "--air-temp", "20 degC",
        "--humidity", "60 %", "--pressure", "98 kPa", "--latitude", "52",
    )  # fmt: skip
    si = fall_json(
        "--mass", str(12 * 0.45359237), "--height", str(100 * 0.3048), "--drag-area", "0.004",
        "--wind", str(25 * 0.44704), "--elevation", "1500", "--air-temp", "20",
        "--humidity", "0.6", "--pressure", "98000", "--latitude", "52",
    )  # fmt: skip
    assert_same_result(with_units, si)
    assert with_units["mass_kg"] == pytest.approx(5.44310844, rel=1e-12)
    assert with_units["release_height_m"] == pytest.approx(30.48, rel=1e-12)
    assert with_units["wind_speed_10m_m_s"] == pytest.approx(11.176, rel=1e-12)


@pytest.mark.parametrize(
    ("option", "typed", "si"),
    [
        ("--elevation", "1.5 km", "1500"),
        ("--elevation", "4921.259842519685 ft", "1500"),  # 1500 m / 0.3048 m/ft (NIST SP 811)
        ("--air-temp", "293.15 K", "20"),
        ("--air-temp", "68 degF", "20"),  # t/degC = (t/degF - 32) * 5/9 (NIST SP 811, B.9)
        ("--pressure", "980 hPa", "98000"),
        ("--humidity", "60 %", "0.6"),
    ],
)
def test_each_air_quantity_accepts_units(option: str, typed: str, si: str) -> None:
    base = (*DRAGGY[:4], "--height", "30 m", "--latitude", "45")
    assert_same_result(fall_json(*base, option, typed), fall_json(*base, option, si))


def test_cd_with_area_equals_drag_area() -> None:
    # Cd A = 0.8 x 250 cm^2 = 0.02 m^2.
    product = fall_json("--mass", "1 kg", "--cd", "0.8", "--area", "250 cm2", "--height", "30")
    direct = fall_json("--mass", "1 kg", "--drag-area", "0.02 m2", "--height", "30")
    assert_same_result(product, direct)


def test_imperial_display_uses_ft_lb_mph_and_ft_lbf() -> None:
    result = invoke(
        "--mass", "12 lb", "--height", "100 ft", "--drag-area", "0.004 m2", "--wind", "25 mph",
        "--units", "imperial",
    )  # fmt: skip
    assert result.exit_code == 0, result.output
    text = result.stdout
    for unit in (" ft", " lb", " mph", " ft·lbf"):
        assert unit in text, f"{unit!r} missing from the imperial table:\n{text}"
    # 100 ft release height and 12 lb mass shown in the units typed.
    assert "100 ft" in text
    assert "12.0 lb" in text
    assert "25.0 mph" in text
    assert " J\n" not in text
    assert " kg," not in text


def test_imperial_display_shows_no_speed_in_m_per_s() -> None:
    result = invoke(
        "--mass", "12 lb", "--height", "100 ft", "--drag-area", "0.004 m2", "--wind", "25 mph",
        "--units", "imperial",
    )  # fmt: skip
    assert result.exit_code == 0, result.output
    assert not re.search(r"\d m/s(?!²)", result.stdout), result.stdout


def test_si_display_is_the_default() -> None:
    result = invoke("--mass", "12 lb", "--height", "100 ft", "--drag-area", "0.004 m2")
    assert result.exit_code == 0, result.output
    assert "5.44 kg" in result.stdout
    assert "30.5 m" in result.stdout
    assert " J" in result.stdout


# --------------------------------------------------------------------------------------------
# Options and their physical effect
# --------------------------------------------------------------------------------------------


def test_more_wind_gives_more_drift() -> None:
    drifts = [
        fall_json(*DRAGGY, "--height", "30 m", "--wind", f"{u} m/s")["drift_m"]
        for u in (0, 3, 8, 15)
    ]
    assert drifts[0] == pytest.approx(0.0, abs=1e-9)
    assert drifts == sorted(drifts), drifts
    assert len(set(drifts)) == 4, drifts


@pytest.mark.parametrize("edge_azimuth", [0.0, 90.0, 200.0, 315.0])
def test_default_wind_blows_away_from_the_edge(edge_azimuth: float) -> None:
    data = fall_json(
        *DRAGGY, "--height", "30 m", "--wind", "10 m/s", "--edge-azimuth", str(edge_azimuth)
    )
    assert data["drift_m"] > 0
    assert data["drift_azimuth_deg"] % 360.0 == pytest.approx(edge_azimuth, abs=1e-6)
    assert data["drift_away_from_edge_m"] == pytest.approx(data["drift_m"], rel=1e-9)


@pytest.mark.parametrize(("wind_from", "toward"), [("0", 180.0), ("270", 90.0), ("45 deg", 225.0)])
def test_wind_from_is_the_direction_the_wind_comes_from(wind_from: str, toward: float) -> None:
    # Meteorological convention: a wind "from" north blows towards south (WMO-No. 8, from memory).
    data = fall_json(*DRAGGY, "--height", "30 m", "--wind", "10 m/s", "--wind-from", wind_from)
    assert data["drift_azimuth_deg"] % 360.0 == pytest.approx(toward, abs=1e-6)


def test_dense_push_matches_vacuum_projectile() -> None:
    # Pushed horizontally at 3 m/s from 20 m, no drag: x = u0 sqrt(2 h / g).
    data = fall_json(*DENSE, "--height", "20 m", "--release", "push", "--release-speed", "3 m/s")
    assert data["drift_m"] == pytest.approx(3.0 * math.sqrt(2 * 20.0 / G), rel=1e-4)
    assert data["drift_azimuth_deg"] == pytest.approx(90.0, abs=1e-6)


def test_push_with_drag_and_with_wind() -> None:
    push = ("--height", "30 m", "--release", "push", "--release-speed", "3 m/s")
    still = fall_json(*DRAGGY, *push)
    # Drag only slows the horizontal motion: 0 < x < u0 t_fall.
    assert 0.0 < still["drift_m"] < 3.0 * still["fall_time_s"]
    # A wind blowing away from the edge only adds to the push.
    windy = fall_json(*DRAGGY, *push, "--wind", "6 m/s")
    assert windy["drift_m"] >= still["drift_m"]


@pytest.mark.parametrize("edge_azimuth", [0.0, 200.0])
def test_push_goes_the_way_the_edge_faces(edge_azimuth: float) -> None:
    data = fall_json(
        *DENSE, "--height", "20 m", "--release", "push", "--release-speed", "2 m/s",
        "--edge-azimuth", str(edge_azimuth),
    )  # fmt: skip
    assert data["drift_azimuth_deg"] % 360.0 == pytest.approx(edge_azimuth, abs=1e-6)


def test_dense_throw_matches_vacuum_projectile() -> None:
    # Thrown at 5 m/s, 30 deg above horizontal, from 20 m, no drag:
    # t = (v0 sin a + sqrt((v0 sin a)^2 + 2 g h)) / g, x = v0 cos a t.
    data = fall_json(
        *DENSE, "--height", "20 m", "--release", "throw", "--release-speed", "5 m/s",
        "--release-angle", "30 deg",
    )  # fmt: skip
    angle = math.radians(30.0)
    t = vacuum_fall_time(20.0, -5.0 * math.sin(angle))
    assert data["fall_time_s"] == pytest.approx(t, rel=1e-4)
    assert data["drift_m"] == pytest.approx(5.0 * math.cos(angle) * t, rel=1e-4)


@pytest.mark.parametrize(
    ("extra", "acceleration_factor"),
    [
        # Sliding: a = g (sin t - mu cos t), derived ([HRW-2011]; Halliday, Resnick &
        # Walker, Fundamentals of Physics, ch. 6, block on an incline).
        (("--friction", "0.3"), lambda t: math.sin(t) - 0.3 * math.cos(t)),
        # Rolling solid cylinder: a = g sin t / (1 + I/(m r^2)), I/(m r^2) = 1/2 (Halliday,
        # Resnick & Walker, Table 10-2 and eq. 11-10, numbers from memory).
        (("--rolling",), lambda t: math.sin(t) / 1.5),
    ],
    ids=["slide", "roll"],
)
def test_dense_roof_slide_matches_incline_kinematics(extra, acceleration_factor) -> None:
    # Exit speed v = sqrt(2 a L) along the slope, pitch below horizontal; then a vacuum
    # projectile from the eave height: x = v cos t * t_fall.
    data = fall_json(
        *DENSE, "--height", "20 m", "--release", "roof-slide", "--roof-pitch", "35 deg",
        "--roof-length", "4 m", *extra,
    )  # fmt: skip
    pitch = math.radians(35.0)
    v = math.sqrt(2.0 * G * acceleration_factor(pitch) * 4.0)
    t = vacuum_fall_time(20.0, v * math.sin(pitch))
    assert data["fall_time_s"] == pytest.approx(t, rel=1e-4)
    assert data["drift_m"] == pytest.approx(v * math.cos(pitch) * t, rel=1e-4)
    # Energy: speed^2 at impact = v^2 + 2 g h (vacuum).
    assert data["impact_speed_m_s"] == pytest.approx(math.sqrt(v**2 + 2 * G * 20.0), rel=1e-4)


def test_carrier_velocity_is_east_north_up() -> None:
    # Carrier moving north at 2 m/s and down at 1 m/s, no drag: the object falls 20 m in
    # t = (-1 + sqrt(1 + 2 g h)) / g and drifts 2 t towards north (0 deg).
    data = fall_json(*DENSE, "--height", "20 m", "--carrier-velocity", "0, 2, -1 m/s")
    t = vacuum_fall_time(20.0, 1.0)
    assert data["fall_time_s"] == pytest.approx(t, rel=1e-4)
    assert data["drift_m"] == pytest.approx(2.0 * t, rel=1e-4)
    assert data["drift_azimuth_deg"] % 360.0 == pytest.approx(0.0, abs=1e-6)


def test_air_density_scales_terminal_speed() -> None:
    # v_t proportional to rho^(-1/2) (v_t = sqrt(2 m g / (rho Cd A))).
    thin = fall_json(*DRAGGY[:4], "--height", "30 m", "--air-density", "1.0 kg/m3")
    thick = fall_json(*DRAGGY[:4], "--height", "30 m", "--air-density", "1.3 kg/m3")
    ratio = thin["terminal_speed_m_s"] / thick["terminal_speed_m_s"]
    assert ratio == pytest.approx(math.sqrt(1.3 / 1.0), rel=1e-9)
    assert thin["air_density_kg_m3"] == pytest.approx(1.0, rel=1e-12)
    assert thick["air_density_kg_m3"] == pytest.approx(1.3, rel=1e-12)
    assert thin["impact_speed_m_s"] > thick["impact_speed_m_s"]


def test_air_density_overrides_elevation_and_weather() -> None:
    plain = fall_json(*DRAGGY, "--height", "30 m")
    overridden = fall_json(
        *DRAGGY, "--height", "30 m", "--elevation", "2000 m", "--air-temp", "35 degC",
        "--pressure", "80 kPa", "--humidity", "90 %",
    )  # fmt: skip
    assert overridden["air_density_kg_m3"] == pytest.approx(1.2, rel=1e-12)
    assert overridden["impact_speed_m_s"] == pytest.approx(plain["impact_speed_m_s"], rel=1e-12)


@pytest.mark.parametrize(
    ("elevation", "density"),
    # ICAO Standard Atmosphere (Doc 7488/3, 1993) density at geopotential altitude 0 / 1000 /
    # 2000 m, as printed in [ISA-1993]. Tolerance: one unit of the last digit.
    [("0 m", 1.225000), ("1000 m", 1.111643), ("2000 m", 1.006490)],
)
def test_elevation_gives_isa_density(elevation: str, density: float) -> None:
    data = fall_json(*DRAGGY[:4], "--height", "30 m", "--elevation", elevation)
    assert data["air_density_kg_m3"] == pytest.approx(density, abs=1e-6)


def test_temperature_pressure_humidity_give_cipm_density() -> None:
    # CIPM-2007 humid air at 20 degC, 101325 Pa, 50 % RH: 1.19931 kg/m^3 (Picard, Davis, Glaser
    # & Fujii, Metrologia 45 (2008) 149-155, as quoted in [ISA-1993]).
    data = fall_json(
        *DRAGGY[:4], "--height", "30 m", "--air-temp", "20 degC", "--pressure", "101325 Pa",
        "--humidity", "50 %",
    )  # fmt: skip
    assert data["air_density_kg_m3"] == pytest.approx(1.19931, abs=1e-5)


def test_latitude_gives_wgs84_normal_gravity() -> None:
    # WGS84 normal gravity at the equator 9.7803253359 m/s^2 and at the poles 9.8321849378 m/s^2
    # (NIMA TR8350.2, 3rd ed. 2000, Table 3.4, gamma_e and gamma_p; table number from memory).
    equator = fall_json(*DENSE, "--height", "20 m", "--latitude", "0")
    pole = fall_json(*DENSE, "--height", "20 m", "--latitude", "90")
    assert equator["gravity_m_s2"] == pytest.approx(9.7803253359, abs=1e-9)
    assert pole["gravity_m_s2"] == pytest.approx(9.8321849378, abs=1e-9)
    # Free fall with the local g: v = sqrt(2 g h).
    assert equator["impact_speed_m_s"] == pytest.approx(math.sqrt(2 * 9.7803253359 * 20), rel=1e-5)
    assert pole["impact_speed_m_s"] == pytest.approx(math.sqrt(2 * 9.8321849378 * 20), rel=1e-5)
    # Without --latitude: standard gravity (3rd CGPM 1901).
    assert fall_json(*DENSE, "--height", "20 m")["gravity_m_s2"] == pytest.approx(G, abs=1e-12)


def test_latitude_with_elevation_applies_free_air_gradient() -> None:
    # Free-air gradient -0.3086 mGal/m = -3.086e-6 s^-2 (NIMA TR8350.2, eq. 4-3, first order).
    low = fall_json(*DENSE, "--height", "20 m", "--latitude", "45", "--elevation", "0 m")
    high = fall_json(*DENSE, "--height", "20 m", "--latitude", "45", "--elevation", "1000 m")
    assert low["gravity_m_s2"] - high["gravity_m_s2"] == pytest.approx(3.086e-3, rel=1e-3)


def test_contact_area_gives_energy_per_area() -> None:
    data = fall_json(*DRAGGY, "--height", "30 m", "--contact-area", "2 cm2")
    assert data["contact_area_m2"] == pytest.approx(2e-4, rel=1e-12)
    assert data["energy_per_contact_area_j_m2"] == pytest.approx(
        data["impact_energy_j"] / 2e-4, rel=1e-9
    )
    assert data["energy_per_contact_area_j_cm2"] == pytest.approx(
        data["impact_energy_j"] / 2.0, rel=1e-9
    )


def test_mean_wind_reports_a_gust_and_a_gust_wind_reports_none() -> None:
    mean = fall_json(*DRAGGY, "--height", "30 m", "--wind", "10 m/s")
    assert mean["wind_speed_kind"] == "mean"
    assert mean["gust_speed_10m_m_s"] > 10.0
    assert mean["gust_drift_m"] > mean["drift_m"]
    gust = fall_json(*DRAGGY, "--height", "30 m", "--wind", "10 m/s", "--wind-kind", "gust")
    assert gust["wind_speed_kind"] == "gust"
    assert gust["gust_speed_10m_m_s"] is None
    assert gust["gust_drift_m"] is None
    assert gust["gust_impact_energy_j"] is None
    # A uniform gust of 10 m/s is the same wind as a uniform mean of 10 m/s for one fall.
    assert gust["drift_m"] == pytest.approx(mean["drift_m"], rel=1e-9)


@pytest.mark.parametrize(("terrain", "z0"), [("en-ii", 0.05), ("en-iii", 0.3), ("en-iv", 1.0)])
def test_en_terrain_gust_uses_the_en_peak_velocity_factor(terrain: str, z0: float) -> None:
    # EN 1991-1-4:2005 eqs. (4.7)-(4.8) (numbers from memory) with k_I = c_o = 1:
    # v_peak / v_mean = sqrt(1 + 7 I_v), I_v = 1 / ln(z / z0) at z = 10 m; z0 from Table 4.1.
    data = fall_json(*DRAGGY, "--height", "30 m", "--wind", "10 m/s", "--terrain", terrain)
    expected = 10.0 * math.sqrt(1.0 + 7.0 / math.log(10.0 / z0))
    assert data["gust_speed_10m_m_s"] == pytest.approx(expected, rel=1e-6)


# The windborne limit: when the object's terminal speed v_t is small, it moves horizontally with
# the air and falls at v_t, so the drift is the integral of U(z) / v_t over the fall height
# (derived). 5 g with Cd A = 0.05 m^2 at rho = 1.2 has v_t = 1.28 m/s; 1.5 % covers the short
# time the object takes to pick up the wind speed.
LIGHT = ("--mass", "5 g", "--drag-area", "0.05 m2", "--air-density", "1.2", "--height", "30 m")
LIGHT_VT = terminal_speed(0.005, 0.05, 1.2)


def test_windborne_limit_uniform_profile() -> None:
    data = fall_json(*LIGHT, "--wind", "10 m/s", "--wind-profile", "uniform")
    assert data["wind_profile"] == "uniform"
    assert data["drift_m"] == pytest.approx(10.0 * 30.0 / LIGHT_VT, rel=0.015)


def test_windborne_limit_power_profile() -> None:
    # U(z) = U10 (z/10)^a, held constant below z_min = 1 m (dropcalc's documented power-law
    # floor, the smallest z_min of EN 1991-1-4 Table 4.1).
    data = fall_json(
        *LIGHT, "--wind", "10 m/s", "--wind-profile", "power", "--wind-exponent", "0.2"
    )
    assert data["wind_profile"] == "power"
    a, z_min, h = 0.2, 1.0, 30.0
    integral = z_min * (z_min / 10) ** a + 10 / (a + 1) * (
        (h / 10) ** (a + 1) - (z_min / 10) ** (a + 1)
    )
    assert data["drift_m"] == pytest.approx(10.0 * integral / LIGHT_VT, rel=0.015)


@pytest.mark.parametrize(
    "args",
    [
        ("--terrain", "en-iii"),
        ("--wind-profile", "log", "--roughness", "0.3 m"),
        ("--roughness", "30 cm"),
    ],
    ids=["terrain", "profile-log", "roughness-implies-log"],
)
def test_windborne_limit_log_profile(args: tuple[str, ...]) -> None:
    # U(z) = U10 ln(z/z0) / ln(10/z0), z0 = 0.3 m, constant below z_min = 5 m
    # (EN 1991-1-4:2005 Table 4.1, category III).
    data = fall_json(*LIGHT, "--wind", "10 m/s", *args)
    assert data["wind_profile"] == "log"
    z0, z_min, h = 0.3, 5.0, 30.0

    def antiderivative(z: float) -> float:
        return z * math.log(z / z0) - z

    integral = (
        z_min * math.log(z_min / z0) + antiderivative(h) - antiderivative(z_min)
    ) / math.log(10.0 / z0)
    assert data["drift_m"] == pytest.approx(10.0 * integral / LIGHT_VT, rel=0.015)


@pytest.mark.parametrize(
    ("terrain", "profile"),
    [
        ("en-0", "log"), ("en-i", "log"), ("en-ii", "log"), ("en-iii", "log"), ("en-iv", "log"),
        ("asce-b", "power"), ("asce-c", "power"), ("asce-d", "power"),
        ("EN-II", "log"), ("Asce_C", "power"),
    ],
)  # fmt: skip
def test_every_terrain_class_is_accepted(terrain: str, profile: str) -> None:
    # EN 1991-1-4 defines its categories by roughness length (log law); ASCE 7 exposures by a
    # power-law exponent ([EN1991-1-4]).
    data = fall_json(*DRAGGY, "--height", "30 m", "--wind", "10 m/s", "--terrain", terrain)
    assert data["wind_profile"] == profile
    assert data["drift_m"] > 0


@pytest.mark.parametrize(
    ("alias", "key"),
    [("sea", "en-0"), ("open", "en-i"), ("country", "en-ii"), ("suburban", "en-iii"),
     ("urban", "en-iv")],
)  # fmt: skip
def test_terrain_aliases_equal_their_class(alias: str, key: str) -> None:
    base = (*DRAGGY, "--height", "30 m", "--wind", "10 m/s", "--terrain")
    assert_same_result(fall_json(*base, alias), fall_json(*base, key))


def test_human_output_carries_the_caution() -> None:
    result = invoke(*DRAGGY, "--height", "30 m", "--wind", "10 m/s")
    assert result.exit_code == 0, result.output
    assert "competent person" in result.stdout
    json_result = fall_json(*DRAGGY, "--height", "30 m")
    assert "competent person" in json_result["caution"]


# --------------------------------------------------------------------------------------------
# Light objects in strong wind: never a silent number
# --------------------------------------------------------------------------------------------

WINDBORNE_WORDS = re.compile(r"windborne|carried away", re.IGNORECASE)


@pytest.mark.parametrize(
    "args",
    [
        pytest.param(
            ("--mass", "5 g", "--drag-area", "0.05 m2", "--height", "30 m", "--wind", "30 m/s"),
            id="5g-30m",
        ),
        pytest.param(
            ("--mass", "0.1 g", "--drag-area", "0.05 m2", "--height", "1000 m", "--wind", "30"),
            id="0.1g-1000m",
        ),
    ],
)
def test_light_object_in_strong_wind_is_flagged(args: tuple[str, ...]) -> None:
    data = fall_json(*args)
    if data["landed"] is False:
        for name in IMPACT_FIELDS:
            assert data[name] is None, (name, data[name])
        assert any("carried away" in w for w in data["warnings"]), data["warnings"]
    else:
        assert any(WINDBORNE_WORDS.search(w) for w in data["warnings"]), data["warnings"]
    human = invoke(*args)
    assert human.exit_code == 0, human.output
    assert WINDBORNE_WORDS.search(human.output), human.output
    assert "nan" not in human.stdout.lower()


def test_object_carried_away_has_no_impact_values() -> None:
    # v_t = sqrt(2 m g / (rho Cd A)) = 0.18 m/s: the fall from 1000 m takes ~5600 s, in which a
    # 30 m/s wind carries it far beyond 5 km.
    data = fall_json(
        "--mass", "0.1 g", "--drag-area", "0.05 m2", "--height", "1 km", "--wind", "30"
    )
    assert data["landed"] is False
    for name in IMPACT_FIELDS:
        assert data[name] is None, name


# --------------------------------------------------------------------------------------------
# Bad input: exit code 2, one line naming the option or field and the value, no traceback
# --------------------------------------------------------------------------------------------

OK = {"--mass": "1 kg", "--height": "20 m", "--drag-area": "0.004 m2"}


def _args(**override: str | None) -> tuple[str, ...]:
    """Valid base arguments with some replaced (value None removes the option)."""
    options = dict(OK)
    for key, value in override.items():
        option = "--" + key.replace("_", "-")
        if value is None:
            options.pop(option, None)
        else:
            options[option] = value
    return tuple(item for pair in options.items() for item in pair)


# (arguments, words the message must contain: the option or field, and the value)
BAD_INPUTS = {
    "mass-negative": (_args(mass="-1 kg"), ("mass", "-1")),
    "mass-zero": (_args(mass="0"), ("mass", "0")),
    "mass-nan": (_args(mass="nan"), ("mass", "nan")),
    "mass-inf": (_args(mass="inf kg"), ("mass", "inf")),
    "height-negative": (_args(height="-5 m"), ("height", "-5")),
    "height-zero": (_args(height="0 m"), ("height", "0")),
    "height-nan": (_args(height="NaN"), ("height", "nan")),
    "height-inf": (_args(height="inf"), ("height", "inf")),
    "height-a-time": (_args(height="5 s"), ("--height", "5 s")),
    "drag-area-negative": (_args(drag_area="-0.1"), ("--drag-area", "-0.1")),
    "drag-area-zero": (_args(drag_area="0 m2"), ("--drag-area", "0")),
    "drag-area-nan": (_args(drag_area="nan"), ("--drag-area", "nan")),
    "drag-area-inf": (_args(drag_area="inf m2"), ("--drag-area", "inf")),
    "terrain-unknown": (_args() + ("--wind", "5", "--terrain", "moon"), ("terrain", "moon")),
    "release-unknown": (_args() + ("--release", "fly"), ("--release", "fly")),
    "roof-too-shallow": (
        _args() + ("--release", "roof-slide", "--roof-pitch", "10", "--roof-length", "3 m"),
        ("--roof-pitch", "10"),
    ),
    "drag-area-and-cd": (_args() + ("--cd", "1.0", "--area", "0.01 m2"), ("--drag-area", "--cd")),
    "cd-without-area": (_args(drag_area=None) + ("--cd", "1.0"), ("--cd", "--area")),
    "cd-zero": (_args(drag_area=None) + ("--cd", "0", "--area", "0.01"), ("--cd", "0")),
    "push-without-speed": (_args() + ("--release", "push"), ("--release-speed", "push")),
    "humidity-150-percent": (_args() + ("--humidity", "150 %"), ("humidity", "1.5")),
    "elevation-6000": (_args() + ("--elevation", "6000 m"), ("elevation", "6000")),
    "wind-90": (_args() + ("--wind", "90 m/s"), ("--wind", "90")),
    "latitude-91": (_args() + ("--latitude", "91"), ("latitude", "91")),
    "air-density-5": (_args() + ("--air-density", "5 kg/m3"), ("density", "5")),
    "release-speed-50": (
        _args() + ("--release", "push", "--release-speed", "50 m/s"),
        ("release", "50"),
    ),
    "carrier-two-values": (_args() + ("--carrier-velocity", "1,2"), ("--carrier-velocity", "1,2")),
}
ENUM_ERRORS = {"release-unknown"}  # parsed by typer, not by dropcalc's models


def _names(line: str, word: str) -> bool:
    """``word`` occurs in ``line`` as a whole token: "0" is not found in "0.0001" or "100000"."""
    return re.search(rf"(?<![\w.]){re.escape(word)}(?![\w.])", line, re.IGNORECASE) is not None


def _message_lines(result: Any) -> list[str]:
    return [line for line in result.stderr.splitlines() if line.strip()]


@pytest.mark.parametrize(("args", "words"), BAD_INPUTS.values(), ids=BAD_INPUTS.keys())
def test_bad_input_is_refused_with_a_message(args: tuple[str, ...], words: tuple[str, ...]) -> None:
    result = invoke(*args, columns=80)
    assert result.exit_code == 2, result.output
    assert "Traceback" not in result.output
    assert result.stdout == "", result.stdout
    lines = _message_lines(result)
    assert any(all(_names(line, word) for word in words) for line in lines), (
        f"no line names {words}:\n{result.stderr}"
    )


@pytest.mark.parametrize(
    ("args", "words"),
    [pytest.param(*value, id=key) for key, value in BAD_INPUTS.items()],
)
def test_bad_input_message_is_one_line(args: tuple[str, ...], words: tuple[str, ...]) -> None:
    result = invoke(*args, columns=80)
    assert result.exit_code == 2, result.output
    lines = _message_lines(result)
    assert len(lines) == 1, result.stderr
    assert lines[0].startswith("dropcalc: error: "), lines[0]


def test_bad_input_in_json_mode_prints_no_json() -> None:
    result = invoke(*_args(mass="-1 kg"), "--json")
    assert result.exit_code == 2, result.output
    assert result.stdout == ""
    assert len(_message_lines(result)) == 1


@pytest.mark.parametrize("value", ["nan", "inf"])
def test_bad_edge_azimuth_names_edge_azimuth(value: str) -> None:
    result = invoke(*_args(), "--edge-azimuth", value)
    assert result.exit_code == 2, result.output
    (line,) = _message_lines(result)
    assert "--edge-azimuth" in line, line
    assert value in line.lower(), line


def test_bad_area_with_cd_names_area() -> None:
    result = invoke(*_args(drag_area=None), "--cd", "2", "--area", "-0.01 m2")
    assert result.exit_code == 2, result.output
    (line,) = _message_lines(result)
    assert "--area" in line, line
    assert "-0.01" in line, line


# --------------------------------------------------------------------------------------------
# Help and module entry point
# --------------------------------------------------------------------------------------------

FALL_OPTIONS = (
    "--mass", "--height", "--drag-area", "--cd", "--area", "--contact-area", "--wind",
    "--wind-kind", "--wind-from", "--wind-profile", "--wind-exponent", "--roughness",
    "--terrain", "--elevation", "--air-temp", "--pressure", "--humidity", "--air-density",
    "--latitude", "--release", "--release-speed", "--release-angle", "--roof-pitch",
    "--roof-length", "--friction", "--rolling", "--carrier-velocity", "--edge-azimuth",
    "--units", "--json",
)  # fmt: skip


@functools.cache
def _help_text(columns: int) -> str:
    """``dropcalc fall --help`` at a terminal width; rendered once per width (about 0.1 s)."""
    result = runner.invoke(
        app, ["fall", "--help"], env={"COLUMNS": str(columns), "FORCE_COLOR": None}
    )
    assert result.exit_code == 0, result.output
    return result.output


def test_fall_help_lists_every_option() -> None:
    text = _help_text(200)
    for option in FALL_OPTIONS:
        assert re.search(rf"(?<![\w-]){re.escape(option)}(?![\w-])", text), option


@pytest.mark.parametrize(
    "option",
    [option for option in FALL_OPTIONS],
)
def test_fall_help_in_80_columns_shows_each_option_in_full(option: str) -> None:
    text = _help_text(80)
    assert re.search(rf"(?<![\w-]){re.escape(option)}(?![\w-])", text), text


def test_python_dash_m_dropcalc_help() -> None:
    done = subprocess.run(
        [sys.executable, "-m", "dropcalc", "--help"],
        capture_output=True,
        text=True,
        timeout=60,
        check=False,
    )
    assert done.returncode == 0, done.stdout + done.stderr
    assert "fall" in done.stdout
    assert "Traceback" not in done.stderr


def test_python_dash_m_dropcalc_bad_input_exits_2_with_one_stderr_line() -> None:
    done = subprocess.run(
        [sys.executable, "-m", "dropcalc", "fall", *_args(height="5 s"), "--json"],
        capture_output=True,
        text=True,
        timeout=60,
        check=False,
    )
    assert done.returncode == 2, done.stdout + done.stderr
    assert done.stdout == ""
    lines = [line for line in done.stderr.splitlines() if line.strip()]
    assert len(lines) == 1, done.stderr
    assert "--height" in lines[0], done.stderr
    assert "5 s" in lines[0], done.stderr
