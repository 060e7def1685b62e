"""Tests of the report figures: fall paths, energy curves and the files written.

Check values come from outside the code under test: the closed forms of a vertical fall with
quadratic drag (Timmerman, P. and van der Weele, J. P., "On the rise and fall of a ball with
linear or quadratic drag", Am. J. Phys. 67 (1999) 538-546), the PNG signature (ISO/IEC
15948:2004 / W3C PNG 2nd ed., sec. 5.2) and the SVG root element (W3C SVG 1.1, sec. 5.1). The
drawn paths are also checked against the trajectory engine's landing points: they are the
engine's own recorded paths (the engine is tested on its own against DOP853 and closed forms).
"""

from __future__ import annotations

import math
import xml.etree.ElementTree as ElementTree
from pathlib import Path

import numpy as np
import pytest

from dropcalc.analysis.fall import FallCase, solve_fall
from dropcalc.errors import InputError
from dropcalc.model.conditions import Conditions
from dropcalc.physics.release import Release
from dropcalc.physics.trajectory import WindField, solve_falls
from dropcalc.physics.wind import wind_spec
from dropcalc.present.json import fall_json
from dropcalc.report import figures
from dropcalc.report.figures import (
    EnergyCurve,
    SideViewCase,
    energy_curve,
    energy_height,
    fall_cases,
    fall_figure,
    side_view,
    trajectory_paths,
)

# Standard acceleration of gravity [m/s^2]. 3rd CGPM (1901), Comptes rendus p. 70.
G = 9.80665
# PNG file signature: W3C "Portable Network Graphics (PNG) Specification (Second Edition)"
# (ISO/IEC 15948:2004), sec. 5.2.
PNG_SIGNATURE = b"\x89PNG\r\n\x1a\n"
# SVG namespace: W3C "Scalable Vector Graphics (SVG) 1.1 (Second Edition)", sec. 5.1.2.
SVG_NAMESPACE = "http://www.w3.org/2000/svg"

SHEARED_WIND = WindField(
    speed_10m=9.0, toward_east=0.6, toward_north=0.8, profile="power", exponent=0.22,
    minimum_height=1.0,
)  # fmt: skip


def _terminal_speed(k: float) -> float:
    # v_t = sqrt(g / k): drag k v^2 balances gravity (Timmerman & van der Weele 1999, eq. 7).
    return math.sqrt(G / k)


# --------------------------------------------------------------------------------------------
# Paths
# --------------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("height", "velocity", "k"),
    [
        (30.0, (0.0, 0.0, 0.0), 0.004),  # compact tool, v_t ~ 50 m/s
        (30.0, (1.2, -0.5, 0.0), 0.08),  # pushed, v_t ~ 11 m/s
        (45.0, (0.0, 0.0, 4.0), 0.6),  # thrown up, light, v_t ~ 4 m/s
        (12.0, (-2.0, 0.0, -1.0), 0.02),  # thrown down against the wind
    ],
)
def test_path_end_point_matches_engine(
    height: float, velocity: tuple[float, float, float], k: float
) -> None:
    # The path is the engine's own recorded path: it ends at the landing point the engine
    # reports (the same numbers the report prints) to rounding, so the drawing agrees with them.
    (path,) = trajectory_paths(height, velocity, k, gravity=G, wind=SHEARED_WIND)
    engine = solve_falls(height, velocity, k, gravity=G, wind=SHEARED_WIND)
    assert engine.landed[0]
    assert path.shape == (4, 200)
    assert path[1:3, -1] == pytest.approx(engine.position[0:2, 0], rel=1e-12, abs=1e-12 * height)
    assert path[3, -1] == 0.0
    assert path[0, -1] == pytest.approx(engine.time[0], rel=1e-12)
    # Starts exactly at the release point.
    assert list(path[:, 0]) == [0.0, 0.0, 0.0, height]


def test_very_light_object_path_is_the_stiff_methods_and_lands_where_the_engine_says() -> None:
    # v_t = 0.6 m/s from 200 m in a 5 m/s wind: relaxation time ~ 60 ms against ~ 330 s of
    # fall, g H / v_t^2 ~ 5400, so the engine takes its implicit (stiff) method; the drawn path
    # is that method's recorded path and ends at the engine's landing point to rounding.
    k = G / 0.6**2
    wind = WindField(speed_10m=5.0, profile="log", roughness_length=0.3, minimum_height=5.0)
    (path,) = trajectory_paths(200.0, (0.0, 0.0, 0.0), k, gravity=G, wind=wind)
    engine = solve_falls(200.0, (0.0, 0.0, 0.0), k, gravity=G, wind=wind)
    assert engine.landed[0]
    assert path[1, -1] == pytest.approx(engine.position[0, 0], rel=1e-12)
    assert path[0, -1] == pytest.approx(engine.time[0], rel=1e-12)
    assert path[2, -1] == 0.0  # the wind blows east: nothing moves it north
    assert path[3, -1] == 0.0
    assert np.all(np.diff(path[3]) <= 0.0)


def test_still_air_path_is_vertical_and_follows_the_closed_form() -> None:
    height, k = 40.0, 0.01
    vt = _terminal_speed(k)
    (path,) = trajectory_paths(height, (0.0, 0.0, 0.0), k, gravity=G, samples=50)
    assert np.all(path[1] == 0.0)
    assert np.all(path[2] == 0.0)
    # t(h) = (v_t / g) arccosh(exp(g h / v_t^2)) (Timmerman & van der Weele 1999, eq. 9).
    # The path is the engine's integrated path (no closed form), so it is as accurate as the
    # engine: fall time to 2.8e-7 relative (trajectory.DEFAULT_TOLERANCE), asserted at 1e-6.
    duration = vt / G * math.acosh(math.exp(G * height / vt**2))
    assert path[0, -1] == pytest.approx(duration, rel=1e-6)
    # Distance fallen y(t) = (v_t^2 / g) ln cosh(g t / v_t) (same paper, eq. 8), at every
    # sample: cubic Hermite between the engine's steps, not only its end (observed 2e-6 H).
    fallen = vt**2 / G * np.log(np.cosh(G * path[0] / vt))
    assert path[3] == pytest.approx(height - fallen, abs=1e-5 * height)


def test_paths_come_one_per_lane() -> None:
    paths = trajectory_paths(
        np.array([5.0, 20.0, 60.0]), (0.0, 0.0, 0.0), 0.05, gravity=G, wind=SHEARED_WIND
    )
    assert len(paths) == 3
    assert [p[3, 0] for p in paths] == [5.0, 20.0, 60.0]
    # Higher release, longer fall, further drift (the wind blows the same way at every height).
    drifts = [math.hypot(p[1, -1], p[2, -1]) for p in paths]
    assert drifts == sorted(drifts)


# --------------------------------------------------------------------------------------------
# Energy curves
# --------------------------------------------------------------------------------------------


@pytest.mark.parametrize(("mass", "k"), [(1.2, 0.0025), (0.05, 0.02), (3.0, 0.05)])
def test_energy_curve_in_still_air_matches_closed_form(mass: float, k: float) -> None:
    heights = np.array([0.5, 2.0, 10.0, 35.0, 120.0])
    energy = energy_curve(EnergyCurve("object", mass, k, gravity=G), heights)
    vt = _terminal_speed(k)
    # E(h) = 1/2 m v_t^2 (1 - exp(-2 g h / v_t^2)), from v(h) (Timmerman & van der Weele
    # 1999, eq. 10).
    expected = 0.5 * mass * vt**2 * -np.expm1(-2.0 * G * heights / vt**2)
    assert not np.ma.is_masked(energy)
    assert np.asarray(energy) == pytest.approx(expected, rel=1e-6)


def test_energy_curve_masks_heights_where_the_object_is_carried_away() -> None:
    # A sheet with v_t = 1 m/s in a 10 m/s (at 10 m) sheared wind drifts more than 10 m per
    # metre of fall: from 3000 m it passes the engine's 20 km limit, from 5 m it lands.
    wind = WindField(speed_10m=10.0, profile="power", exponent=0.2, minimum_height=1.0)
    curve = EnergyCurve("sheet", 0.2, G / 1.0, gravity=G, wind=wind)
    energy = energy_curve(curve, np.array([5.0, 3000.0]))
    assert list(np.ma.getmaskarray(energy)) == [False, True]


def test_energy_curve_heights_span_the_range() -> None:
    heights = figures.energy_curve_heights(40.0)
    assert heights[0] == 0.5
    assert heights[-1] == pytest.approx(40.0)
    assert 55 <= heights.size <= 60
    assert np.all(np.diff(heights) > 0)


# --------------------------------------------------------------------------------------------
# Reference level labels
# --------------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    "wanted",
    [
        [0.50, 0.51, 0.52, 0.56, 0.70],
        [0.10, 0.90],
        [0.97, 0.98, 0.99],
        [0.00, 0.01, 0.02],
        [0.3],
    ],
)
def test_level_labels_are_spread_apart_in_order_and_inside(wanted: list[float]) -> None:
    # Geometric requirement of the brief (labels must not overlap); no external source needed.
    gap = 0.05
    placed = figures._spread(wanted, gap, 0.025, 0.975)
    assert len(placed) == len(wanted)
    assert all(b - a >= gap - 1e-12 for a, b in zip(placed, placed[1:], strict=False))
    assert min(placed) >= 0.025 - 1e-12
    assert max(placed) <= 0.975 + 1e-12
    # Labels far from any other stay on their line.
    if wanted == [0.10, 0.90]:
        assert placed == wanted


# --------------------------------------------------------------------------------------------
# Files
# --------------------------------------------------------------------------------------------


def _cases() -> list[SideViewCase]:
    cases = []
    for label, k_small, k_large in (("hand tool", 0.003, 0.012), ("board offcut", 0.01, 0.15)):
        for k, largest in ((k_small, False), (k_large, True)):
            for speed, gust in ((7.0, False), (11.0, True)):
                wind = WindField(speed_10m=speed, profile="power", exponent=0.2, minimum_height=1)
                cases.append(
                    SideViewCase(
                        label, 20.0, (0.0, 0.0, 0.0), k, G, wind, largest_drag=largest, gust=gust
                    )
                )
    return cases


def test_style_key_sets_object_drag_bound_and_wind() -> None:
    # The report builder names each path fully and groups them by style_key.
    wind = WindField(speed_10m=8.0)
    keyed = [
        SideViewCase(f"tool, Cd·A {b}, {w}", 20.0, np.zeros(3), 0.01, G, wind, ("tool", b, w))
        for b in ("min", "max")
        for w in ("mean", "gust")
    ]
    assert [(c.object_name, c.largest_drag, c.gust) for c in keyed] == [
        ("tool", False, False),
        ("tool", False, True),
        ("tool", True, False),
        ("tool", True, True),
    ]
    plain = SideViewCase("tool", 20.0, (0.0, 0.0, 0.0), 0.01, largest_drag=True)
    assert (plain.object_name, plain.largest_drag, plain.gust) == ("tool", True, False)
    with pytest.raises(ValueError, match="drag bound must be one of"):
        SideViewCase("tool", 20.0, (0.0, 0.0, 0.0), 0.01, style_key=("tool", "mid", "mean"))


def _levels() -> list[tuple[str, float]]:
    # EN 397:2012+A1 crown test 49 J (5 kg from 1 m); EN 14052 crown 100 J; ANSI/ISEA Z89.1
    # Type I top 54.5 J ([Z89.1-2014]) - close together, so their labels must stagger.
    return [
        ("industrial helmet crown test energy, EN 397", 49.0),
        ("industrial helmet top test energy, ANSI/ISEA Z89.1 Type I", 54.5),
        ("high-performance helmet crown test energy, EN 14052", 100.0),
    ]


def _curves() -> list[EnergyCurve]:
    return [
        EnergyCurve("hand tool, 1.2 kg", 1.2, 0.002, G, SHEARED_WIND),
        EnergyCurve("bolt, 0.05 kg", 0.05, 0.0036, G, None),
    ]


def _assert_png(path: Path) -> None:
    assert path.read_bytes()[:8] == PNG_SIGNATURE


def _assert_svg(path: Path) -> None:
    root = ElementTree.parse(path).getroot()
    assert root.tag == f"{{{SVG_NAMESPACE}}}svg"


def test_side_view_writes_png_and_svg(tmp_path: Path) -> None:
    png, svg = tmp_path / "side.png", tmp_path / "side.SVG"
    side_view(png, _cases(), 20.0, title="Work edge A")
    keyed = [
        SideViewCase(c.label, 20.0, c.initial_velocity, c.drag_parameter, G, c.wind,
                     (c.label, "max" if c.largest_drag else "min", "gust" if c.gust else "mean"))
        for c in _cases()[:2]
    ]  # fmt: skip
    side_view(svg, keyed, 20.0)
    _assert_png(png)
    _assert_svg(svg)
    assert sorted(p.name for p in tmp_path.iterdir()) == ["side.SVG", "side.png"]


def test_energy_height_writes_png_and_svg(tmp_path: Path) -> None:
    png, svg = tmp_path / "energy.png", tmp_path / "energy.svg"
    energy_height(png, _curves(), _levels(), 40.0)
    energy_height(svg, _curves(), [], 40.0, title="Objects on level 3")
    _assert_png(png)
    _assert_svg(svg)


def _fall_result(**overrides: object) -> object:
    values: dict[str, object] = {
        "mass": 2.5,
        "drag_area": 0.01,
        "height": 24.0,
        "drag_area_max": 0.06,
        "object_name": "bag of scaffold clips",
    }
    conditions: dict[str, object] = {
        "release": Release("push", speed=1.5),
        "wind": wind_spec(9.0, terrain="suburban", from_direction=300.0),
        "edge_azimuth": 120.0,
    }
    for key, value in overrides.items():
        (conditions if key in conditions else values)[key] = value
    case = FallCase(**values, conditions=Conditions(**conditions))  # type: ignore[arg-type]
    return solve_fall(case)


def test_fall_figure_paths_land_where_the_fall_result_says(tmp_path: Path) -> None:
    result = _fall_result()
    cases = fall_cases(result)  # type: ignore[arg-type]
    # Two drag bounds times the given wind and its estimated gust.
    assert [(c.largest_drag, c.gust) for c in cases] == [
        (False, False),
        (False, True),
        (True, False),
        (True, True),
    ]
    report = fall_json(result)  # type: ignore[arg-type]
    (path,) = trajectory_paths(
        cases[0].release_height,
        np.asarray(cases[0].initial_velocity),
        cases[0].drag_parameter,
        gravity=cases[0].gravity,
        wind=cases[0].wind,
    )
    azimuth = math.radians(120.0)
    out = path[1, -1] * math.sin(azimuth) + path[2, -1] * math.cos(azimuth)
    # The drawn path is the engine's path of the same fall: it ends where the result says.
    assert out == pytest.approx(report["drift_away_from_edge_m"], rel=1e-12)
    assert path[0, -1] == pytest.approx(report["fall_time_s"], rel=1e-12)
    fall_figure(tmp_path / "fall.png", result)  # type: ignore[arg-type]
    _assert_png(tmp_path / "fall.png")


def test_fall_figure_in_still_air_has_one_path(tmp_path: Path) -> None:
    result = _fall_result(
        wind=wind_spec(0.0), drag_area_max=None, release=Release(), object_name=None
    )
    assert len(fall_cases(result)) == 1  # type: ignore[arg-type]
    fall_figure(tmp_path / "fall.svg", result)  # type: ignore[arg-type]
    _assert_svg(tmp_path / "fall.svg")


def test_failure_while_writing_leaves_no_file(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    from matplotlib.figure import Figure

    def broken_savefig(self: Figure, target: Path, **kwargs: object) -> None:
        Path(target).write_bytes(PNG_SIGNATURE + b"half a picture")
        raise RuntimeError("renderer failed")

    monkeypatch.setattr(Figure, "savefig", broken_savefig)
    with pytest.raises(RuntimeError, match="renderer failed"):
        energy_height(tmp_path / "energy.png", _curves(), _levels(), 30.0)
    with pytest.raises(RuntimeError, match="renderer failed"):
        side_view(tmp_path / "side.svg", _cases()[:1], 20.0)
    assert list(tmp_path.iterdir()) == []


def test_disk_error_is_reported_and_keeps_the_old_file(
    tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    from matplotlib.figure import Figure

    target = tmp_path / "side.png"
    target.write_bytes(b"old figure")

    def full_disk(self: Figure, destination: Path, **kwargs: object) -> None:
        Path(destination).write_bytes(b"\x89PN")
        raise OSError(28, "No space left on device")

    monkeypatch.setattr(Figure, "savefig", full_disk)
    with pytest.raises(InputError, match="cannot write"):
        side_view(target, _cases()[:1], 20.0)
    assert target.read_bytes() == b"old figure"
    assert [p.name for p in tmp_path.iterdir()] == ["side.png"]


@pytest.mark.parametrize(
    ("call", "message"),
    [
        (lambda d: side_view(d / "a.pdf", _cases()[:1], 20.0), r"\.png or \.svg; got a\.pdf"),
        (lambda d: side_view(d / "a.png", [], 20.0), "at least one fall"),
        (lambda d: side_view(d / "a.png", _cases()[:1], math.nan), "height must be"),
        (lambda d: energy_height(d / "a.jpg", _curves(), [], 30.0), "got a\\.jpg"),
        (lambda d: energy_height(d / "a.png", [], [], 30.0), "at least one object"),
        (lambda d: energy_height(d / "a.png", _curves(), [], 0.4), "max_height must be"),
        (
            lambda d: energy_height(d / "a.png", _curves(), [("helmet", -49.0)], 30.0),
            "'helmet' must be a finite energy > 0 J; got -49",
        ),
        (lambda d: side_view(d / "no" / "a.png", _cases()[:1], 20.0), "does not exist"),
    ],
)
def test_bad_input_is_refused_with_a_message(tmp_path: Path, call: object, message: str) -> None:
    with pytest.raises(InputError, match=message):
        call(tmp_path)  # type: ignore[operator]
    assert list(tmp_path.iterdir()) == []


# --- Issue 13: colours told apart, long names never clipped -----------------------------------


def _lab(hex_colour: str) -> tuple[float, float, float]:
    """CIE L*a*b* (D65) of an sRGB colour: IEC 61966-2-1 decoding, CIE 1976 formulas."""
    rgb = [int(hex_colour[i : i + 2], 16) / 255 for i in (1, 3, 5)]
    lin = [c / 12.92 if c <= 0.04045 else ((c + 0.055) / 1.055) ** 2.4 for c in rgb]
    x = (0.4124 * lin[0] + 0.3576 * lin[1] + 0.1805 * lin[2]) / 0.95047
    y = 0.2126 * lin[0] + 0.7152 * lin[1] + 0.0722 * lin[2]
    z = (0.0193 * lin[0] + 0.1192 * lin[1] + 0.9505 * lin[2]) / 1.08883

    def f(t: float) -> float:
        return t ** (1 / 3) if t > (6 / 29) ** 3 else t / (3 * (6 / 29) ** 2) + 4 / 29

    return 116 * f(y) - 16, 500 * (f(x) - f(y)), 200 * (f(y) - f(z))


def test_object_colours_are_far_apart() -> None:
    # The first four objects drawn (the side view's) differ by a CIE76 colour difference of at
    # least 30 (about 2.3 units is a just-noticeable difference, Sharma 2003, from memory).
    from dropcalc.report.figures import OBJECT_COLOURS

    first = [_lab(c) for c in OBJECT_COLOURS[:4]]
    for i in range(4):
        for j in range(i + 1, 4):
            assert math.dist(first[i], first[j]) > 30, (OBJECT_COLOURS[i], OBJECT_COLOURS[j])


def test_energy_legend_keeps_long_names_whole(tmp_path: Path) -> None:
    from dropcalc.report.figures import EnergyCurve, energy_height

    names = [
        "Steel scaffold tube 48.3 x 4.0 mm, 2.0 m (galvanised, from the site's own stock)",
        "Scaffold double (right-angle) coupler, drop-forged",
        "Radio",
    ]
    curves = [
        EnergyCurve(label=name, mass=1.0 + i, drag_parameter=0.01, gravity=9.80665,
                    wind=None, initial_velocity=np.zeros(3))
        for i, name in enumerate(names)
    ]  # fmt: skip
    out = tmp_path / "energy.svg"
    energy_height(out, curves, [("helmet", 49.0)], 30.0, title="t")
    svg = out.read_text(encoding="utf-8")
    assert "Radio" in svg
    # Every line of every legend label fits its column (never runs off the figure), and the
    # words are all kept (wrapped, not cut).
    from dropcalc.report.figures import LEGEND_COLUMN_CHARACTERS, legend_layout

    columns, wrapped = legend_layout(names)
    assert columns == 1
    for name, label in zip(names, wrapped, strict=True):
        assert label.split() == name.split()
        assert all(len(line) <= LEGEND_COLUMN_CHARACTERS[columns] for line in label.split("\n"))
    short = legend_layout(["Radio", "Claw hammer, 16 oz head", "Brick"])
    assert short == (3, ["Radio", "Claw hammer, 16 oz head", "Brick"])
