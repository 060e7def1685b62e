"""Tests of dropcalc.physics.shapes: geometry, the drag-coefficient table and drag bounds.

Sources: Cauchy's mean projected area S/4 of a convex body (Vouk, Nature 162 (1948) 330),
checked both as a closed form and by a Monte Carlo over uniformly random rotations
(scipy.spatial.transform.Rotation.random); maxima and minima of projected areas by brute-force
search over orientations (scipy.optimize.minimize); C_d rows typed from [WHITE-FM] (from
memory of White, Fluid Mechanics, tables 7.2-7.3 and Hoerner, Fluid-Dynamic Drag (1965) ch. 3);
sphere C_d against fluids.drag.drag_sphere; masses per metre from [MASSES-DERIVED].
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from fluids.drag import drag_sphere
from scipy.optimize import minimize
from scipy.spatial.transform import Rotation

from dropcalc.errors import InputError, UnknownObjectError
from dropcalc.physics.shapes import (
    CD_TABLE,
    GLIDE_WARNING,
    SHAPE_ALIASES,
    SHAPE_DIMENSIONS,
    SHAPES,
    cylinder_end_on_drag_coefficient,
    cylinder_side_on_drag_coefficient,
    drag_bounds,
    normalise_shape,
    plate_normal_drag_coefficient,
    projected_areas,
    surface_area,
    volume,
)

RNG_SEED = 20240611


def block_area(direction: np.ndarray, a: float, b: float, c: float) -> np.ndarray:
    """Silhouette area of an a x b x c block seen along unit vectors ``direction`` (n, 3).

    Each pair of faces projects with |cos| of its normal: |n1| bc + |n2| ca + |n3| ab
    (projection of a convex polyhedron = half the sum of |n . normal| x face area).
    """
    n = np.abs(direction)
    return n[:, 0] * b * c + n[:, 1] * c * a + n[:, 2] * a * b


def cylinder_area(cos_theta: np.ndarray, length: float, diameter: float) -> np.ndarray:
    """Silhouette of a cylinder, axis at theta to the view: L D sin + pi D^2/4 |cos|."""
    cos_theta = np.abs(cos_theta)
    return length * diameter * np.sqrt(1.0 - cos_theta**2) + math.pi * diameter**2 / 4 * cos_theta


def random_directions(count: int) -> np.ndarray:
    """Body-frame view directions of uniformly random rotations (Rotation.random, scipy)."""
    rotations = Rotation.random(count, random_state=RNG_SEED)
    return rotations.apply([0.0, 0.0, 1.0])


# --- the API the object-library loader relies on ----------------------------------------------


def test_shape_names_dimensions_and_aliases() -> None:
    assert SHAPES == ("box", "cylinder", "tube", "sphere", "plate", "irregular")
    assert SHAPE_DIMENSIONS["tube"] == ("length", "outer_diameter", "wall_thickness")
    assert SHAPE_DIMENSIONS["plate"] == ("length", "width", "thickness")
    assert set(SHAPE_DIMENSIONS) == set(SHAPES)
    assert dict(SHAPE_ALIASES) == {
        "rod": "cylinder",
        "sheet": "plate",
        "pipe": "tube",
        "compact": "irregular",
    }


@pytest.mark.parametrize(
    ("given", "expected"),
    [
        ("box", "box"),
        (" Rod ", "cylinder"),
        ("SHEET", "plate"),
        ("pipe", "tube"),
        ("compact", "irregular"),
        ("sphere", "sphere"),
    ],
)
def test_normalise_shape(given: str, expected: str) -> None:
    assert normalise_shape(given) == expected


def test_unknown_shape_lists_valid_names() -> None:
    with pytest.raises(UnknownObjectError, match="box, cylinder, tube, sphere, plate") as info:
        drag_bounds("cone", length=1.0)
    assert "'cone'" in str(info.value)
    assert "rod" in str(info.value)


# --- geometry -----------------------------------------------------------------------------------


def test_cube_sphere_cylinder_hand_values() -> None:
    # Cube a = 0.1 m: faces 0.01 m^2; largest projection along the body diagonal sqrt(3) a^2;
    # S = 6 a^2 = 0.06, S/4 = 0.015 (Cauchy, Vouk 1948); V = 1e-3 m^3 (hand values).
    smallest, largest, mean = projected_areas("box", length=0.1, width=0.1, height=0.1)
    assert float(smallest) == pytest.approx(0.01, rel=1e-12)
    assert float(largest) == pytest.approx(math.sqrt(3) * 0.01, rel=1e-12)
    assert float(mean) == pytest.approx(0.015, rel=1e-12)
    assert float(surface_area("box", length=0.1, width=0.1, height=0.1)) == pytest.approx(0.06)
    assert float(volume("box", length=0.1, width=0.1, height=0.1)) == pytest.approx(1e-3)
    # Sphere D = 0.2 m: pi D^2/4 = 0.0314159 from every side, S = pi D^2 = 0.125664,
    # V = pi D^3/6 = 4.18879e-3 (hand values).
    areas = projected_areas("sphere", diameter=0.2)
    np.testing.assert_allclose([float(a) for a in areas], 0.0314159, rtol=1e-5)
    assert float(surface_area("sphere", diameter=0.2)) == pytest.approx(0.125664, rel=1e-5)
    assert float(volume("sphere", diameter=0.2)) == pytest.approx(4.18879e-3, rel=1e-5)
    # Cylinder L = 0.3, D = 0.02: end-on pi D^2/4 = 3.14159e-4, side-on L D = 6e-3, largest
    # hypot(6e-3, 3.14159e-4) = 6.008219e-3; S = pi D L + pi D^2/2 = 0.0194779,
    # S/4 = 4.86947e-3 (hand values).
    smallest, largest, mean = projected_areas("cylinder", length=0.3, diameter=0.02)
    assert float(smallest) == pytest.approx(3.14159e-4, rel=1e-5)
    assert float(largest) == pytest.approx(6.008219e-3, rel=1e-6)
    assert float(mean) == pytest.approx(4.86947e-3, rel=1e-5)
    assert float(surface_area("cylinder", length=0.3, diameter=0.02)) == pytest.approx(
        0.0194779, rel=1e-5
    )


def test_box_largest_projection_exceeds_largest_face() -> None:
    # A block seen along its body diagonal shows three faces at once: more than any one face.
    _, largest, _ = projected_areas("box", length=0.3, width=0.2, height=0.1)
    assert float(largest) > 0.3 * 0.2


def test_masses_per_metre_match_references() -> None:
    # [MASSES-DERIVED]: scaffold tube 48.3 x 4.0 mm steel (7850 kg/m^3) 4.37 kg/m;
    # aluminium tube 48.3 x 4.47 mm (2700 kg/m^3) 1.66 kg/m; rebar d^2/162 kg/m (d in mm);
    # float glass 2.5 kg/m^2 per mm. Printed to 3 significant figures.
    steel = 7850 * volume("tube", length=1.0, outer_diameter=0.0483, wall_thickness=0.004)
    assert float(steel) == pytest.approx(4.37, abs=0.005)
    alu = 2700 * volume("pipe", length=1.0, outer_diameter=0.0483, wall_thickness=0.00447)
    assert float(alu) == pytest.approx(1.66, abs=0.005)
    rebar = 7850 * volume("rod", length=1.0, diameter=np.array([0.012, 0.016, 0.025]))
    np.testing.assert_allclose(rebar, np.array([12.0, 16.0, 25.0]) ** 2 / 162, rtol=5e-3)
    glass = 2500 * volume("plate", length=1.0, width=1.0, thickness=0.001)
    assert float(glass) == pytest.approx(2.5)


@pytest.mark.parametrize("edges", [(0.1, 0.1, 0.1), (0.3, 0.11, 0.03), (2.44, 1.22, 0.018)])
def test_box_mean_projected_area_is_cauchy_and_monte_carlo(
    edges: tuple[float, float, float],
) -> None:
    a, b, c = edges
    # Closed form: box S/4 = (ab + bc + ca)/2 ([WHITE-FM], [HOERNER-1965]; Vouk 1948).
    expected = (a * b + b * c + c * a) / 2
    _, _, mean = projected_areas("box", length=a, width=b, height=c)
    assert float(mean) == pytest.approx(expected, rel=1e-12)
    assert float(surface_area("box", length=a, width=b, height=c)) / 4 == pytest.approx(expected)
    # Monte Carlo over uniformly random rotations, agreeing to 4 standard errors.
    samples = block_area(random_directions(40_000), a, b, c)
    standard_error = samples.std(ddof=1) / math.sqrt(samples.size)
    assert abs(samples.mean() - float(mean)) < 4 * standard_error


@pytest.mark.parametrize(("length", "diameter"), [(0.3, 0.02), (0.05, 0.05), (0.01, 0.2)])
def test_cylinder_mean_projected_area_is_cauchy_and_monte_carlo(
    length: float, diameter: float
) -> None:
    # Closed form S/4 = (pi D L + pi D^2/2)/4 (Cauchy, Vouk 1948).
    expected = (math.pi * diameter * length + math.pi * diameter**2 / 2) / 4
    _, _, mean = projected_areas("cylinder", length=length, diameter=diameter)
    assert float(mean) == pytest.approx(expected, rel=1e-12)
    # Monte Carlo: the axis (body z) seen from random directions; cos(theta) = n_z.
    cos_theta = random_directions(40_000)[:, 2]
    samples = cylinder_area(cos_theta, length, diameter)
    standard_error = samples.std(ddof=1) / math.sqrt(samples.size)
    assert abs(samples.mean() - float(mean)) < 4 * standard_error


def test_tube_is_its_convex_hull_and_irregular_its_scaled_box() -> None:
    # Tube: the solid cylinder of the outer diameter (convex hull); only the volume sees the bore.
    tube = projected_areas("tube", length=2.0, outer_diameter=0.0483, wall_thickness=0.004)
    hull = projected_areas("cylinder", length=2.0, diameter=0.0483)
    np.testing.assert_allclose(tube, hull, rtol=1e-15)
    # Irregular: bounding box, smallest and mean x 0.8 (IRREGULAR_COMPACTNESS_FACTOR), largest
    # unchanged (an upper bound). 0.8 is common practice, no source.
    box = projected_areas("box", length=0.3, width=0.11, height=0.03)
    irregular = projected_areas("compact", length=0.3, width=0.11, height=0.03)
    np.testing.assert_allclose(irregular, [0.8 * box[0], box[1], 0.8 * box[2]], rtol=1e-15)


@pytest.mark.parametrize("edges", [(0.1, 0.1, 0.1), (0.3, 0.11, 0.03), (1.0, 0.5, 0.01)])
def test_box_extreme_projections_by_brute_force(edges: tuple[float, float, float]) -> None:
    a, b, c = edges
    smallest, largest, _ = projected_areas("box", length=a, width=b, height=c)
    samples = block_area(random_directions(50_000), a, b, c)
    assert samples.max() <= float(largest) * (1 + 1e-12)
    assert samples.min() >= float(smallest) * (1 - 1e-12)

    # Refine the best sample with a local optimiser over spherical angles.
    def negative_area(angles: np.ndarray) -> float:
        polar, azimuth = angles
        n = np.array(
            [
                [
                    math.sin(polar) * math.cos(azimuth),
                    math.sin(polar) * math.sin(azimuth),
                    math.cos(polar),
                ]
            ]
        )
        return -float(block_area(n, a, b, c)[0])

    best = random_directions(50_000)[np.argmax(samples)]
    start = np.array([math.acos(best[2]), math.atan2(best[1], best[0])])
    result = minimize(
        negative_area, start, method="Nelder-Mead", options={"xatol": 1e-10, "fatol": 1e-14}
    )
    assert -result.fun == pytest.approx(float(largest), rel=1e-8)


@pytest.mark.parametrize(("length", "diameter"), [(0.3, 0.02), (0.05, 0.05), (0.01, 0.2)])
def test_cylinder_extreme_projections_by_brute_force(length: float, diameter: float) -> None:
    smallest, largest, _ = projected_areas("cylinder", length=length, diameter=diameter)
    theta = np.linspace(0.0, math.pi / 2, 200_001)
    samples = cylinder_area(np.cos(theta), length, diameter)
    assert samples.max() == pytest.approx(float(largest), rel=1e-9)
    assert samples.min() == pytest.approx(float(smallest), rel=1e-12)


# --- drag coefficients --------------------------------------------------------------------------

# [WHITE-FM], [HOERNER-1965] (from memory of White, Fluid Mechanics, tables 7.2-7.3; Hoerner,
# Fluid-Dynamic Drag (1965) ch. 3), typed row by row.
CD_PUBLISHED = {
    "sphere": 0.47,  # sphere, subcritical (1e3 < Re < ~2e5)
    "cube_face": 1.05,  # cube, face on
    "cube_edge": 0.80,  # cube, edge on
    "disk_normal": 1.17,  # thin disk, normal
    "plate_normal_1": 1.18,  # square plate, normal
    "plate_normal_5": 1.20,  # rectangular plate normal, aspect 5
    "plate_normal_10": 1.30,  # aspect 10
    "plate_normal_20": 1.50,  # aspect 20
    "cylinder_side_1": 0.64,  # circular cylinder side-on, L/D = 1
    "cylinder_side_2": 0.68,  # L/D = 2
    "cylinder_side_5": 0.74,  # L/D = 5
    "cylinder_side_10": 0.82,  # L/D = 10
    "cylinder_side_20": 0.91,  # L/D = 20
    "cylinder_side_40": 0.98,  # L/D = 40
    "cylinder_side_inf": 1.20,  # L/D = infinity
    "cylinder_end_0.5": 1.15,  # circular cylinder end-on, L/D = 0.5
    "cylinder_end_1": 0.90,  # L/D = 1
    "cylinder_end_2": 0.85,  # L/D = 2
    "cylinder_end_4": 0.87,  # L/D = 4
    "cylinder_end_8": 0.99,  # L/D = 8
    "hemisphere_cup_open": 1.42,  # hemisphere cup, open side facing the flow
    "hemisphere_cup_round": 0.38,  # round side facing the flow
}


def test_cd_table_holds_every_references_row() -> None:
    for key, cd in CD_PUBLISHED.items():
        assert CD_TABLE[key].cd == cd, key
        assert CD_TABLE[key].key == key
        assert CD_TABLE[key].source
    # The one extra row: a smooth sphere past the drag crisis, [WHITE-FM], [HOERNER-1965] "0.1-0.2",
    # low end.
    assert set(CD_TABLE) - set(CD_PUBLISHED) == {"sphere_supercritical"}
    assert CD_TABLE["sphere_supercritical"].cd == 0.10


def test_sphere_cd_agrees_with_fluids_in_the_subcritical_range() -> None:
    # fluids.drag.drag_sphere (Barati correlation, advised for fluids
    # 1.3.1) stays inside the quoted 0.4-0.5 band for 1e4 <= Re <= 1.5e5, and near 0.47.
    cds = [drag_sphere(re, Method="Barati") for re in (1e4, 3e4, 1e5, 1.5e5)]
    assert all(0.38 <= cd <= 0.52 for cd in cds), cds
    assert np.mean(cds) == pytest.approx(CD_TABLE["sphere"].cd, abs=0.05)


def test_cd_interpolation_reproduces_table_points() -> None:
    # The interpolators pass through the [WHITE-FM], [HOERNER-1965] rows.
    np.testing.assert_allclose(
        plate_normal_drag_coefficient([1.0, 5.0, 10.0, 20.0]), [1.18, 1.20, 1.30, 1.50]
    )
    np.testing.assert_allclose(
        cylinder_side_on_drag_coefficient([1.0, 2.0, 5.0, 10.0, 20.0, 40.0, math.inf]),
        [0.64, 0.68, 0.74, 0.82, 0.91, 0.98, 1.20],
    )
    np.testing.assert_allclose(
        cylinder_end_on_drag_coefficient([0.0, 0.5, 1.0, 2.0, 4.0, 8.0]),
        [1.17, 1.15, 0.90, 0.85, 0.87, 0.99],  # thin disk 1.17 at L/D = 0
    )


def test_cd_interpolation_is_monotone_and_clamped() -> None:
    aspect = np.geomspace(1.0, 100.0, 400)
    plate = plate_normal_drag_coefficient(aspect)
    assert np.all(np.diff(plate) >= 0)
    assert plate[-1] == pytest.approx(1.50)  # held beyond aspect 20
    # Aspect is long side over short side: 0.2 is the same plate as 5.
    assert float(plate_normal_drag_coefficient(0.2)) == pytest.approx(1.20)
    ratio = np.geomspace(0.1, 1e4, 400)
    side = cylinder_side_on_drag_coefficient(ratio)
    assert np.all(np.diff(side) >= 0)
    assert side[0] == pytest.approx(0.64)  # held below L/D = 1
    assert 0.98 < side[-1] < 1.20
    # End-on has a minimum near L/D = 2 (table); between table points it stays between the
    # neighbouring table values; held at 0.99 beyond L/D = 8.
    points = np.array([0.0, 0.5, 1.0, 2.0, 4.0, 8.0])
    values = np.array([1.17, 1.15, 0.90, 0.85, 0.87, 0.99])
    for low, high, cd_low, cd_high in zip(points, points[1:], values, values[1:], strict=False):
        middle = cylinder_end_on_drag_coefficient(np.linspace(low, high, 11))
        assert np.all(middle >= min(cd_low, cd_high) - 1e-12)
        assert np.all(middle <= max(cd_low, cd_high) + 1e-12)
    assert float(cylinder_end_on_drag_coefficient(50.0)) == pytest.approx(0.99)


# --- drag bounds ------------------------------------------------------------------------------


def test_bar_falls_end_on_for_the_smallest_drag_area() -> None:
    # L/D = 2 bar, D = 0.05: end-on 0.85 x pi D^2/4 = 1.66897e-3, side-on 0.68 x L D = 3.4e-3
    # ([WHITE-FM], [HOERNER-1965] rows; hand values).
    bounds = drag_bounds("cylinder", length=0.1, diameter=0.05)
    assert float(bounds.drag_area_min) == pytest.approx(1.66897e-3, rel=1e-5)
    assert float(bounds.drag_area_max) == pytest.approx(3.4e-3, rel=1e-12)
    assert "cylinder_end" in bounds.basis


def test_plate_face_on_gives_the_largest_drag_area_and_glides() -> None:
    # 1.0 x 0.1 x 0.005 m strip, aspect 10: face-on 1.30 x 0.1 = 0.130 m^2 ([WHITE-FM]).
    bounds = drag_bounds("plate", length=1.0, width=0.1, thickness=0.005)
    assert float(bounds.drag_area_max) == pytest.approx(0.130, rel=1e-12)
    assert bool(bounds.glides)
    assert "Holmes" in GLIDE_WARNING
    # Threshold thickness / width < 0.1 (GLIDE_THICKNESS_RATIO): 0.09 glides, 0.11 does not.
    assert bool(drag_bounds("plate", length=1.0, width=0.1, thickness=0.009).glides)
    assert not bool(drag_bounds("plate", length=1.0, width=0.1, thickness=0.011).glides)
    # The same rule flags a board described as a box.
    assert bool(drag_bounds("box", length=2.44, width=1.22, height=0.018).glides)
    # A thin disc glides too; a bar does not.
    assert bool(drag_bounds("cylinder", length=0.003, diameter=0.23).glides)
    assert not bool(drag_bounds("rod", length=0.3, diameter=0.02).glides)


def test_cube_bounds_bracket_a_tumbling_cube() -> None:
    a = 0.1
    bounds = drag_bounds("box", length=a, width=a, height=a)
    # Envelope: 0.80 (cube edge on) x a^2 and 1.05 (cube face on) x sqrt(3) a^2
    # ([WHITE-FM], [HOERNER-1965] rows; hand values 8.0e-3 and 1.818653e-2 m^2).
    assert float(bounds.drag_area_min) == pytest.approx(8.0e-3, rel=1e-12)
    assert float(bounds.drag_area_max) == pytest.approx(1.818653e-2, rel=1e-6)
    # Tumbling 1.05 S/4 = 1.05 x 1.5 a^2 = 1.575e-2 m^2 ([WHITE-FM], [HOERNER-1965], Cauchy).
    assert float(bounds.drag_area_typical) == pytest.approx(1.575e-2, rel=1e-12)
    # Ganser, Powder Technol. 77 (1993), Newton regime (from memory): C_d = 0.4305 K2 on the
    # equal-volume sphere's area, K2 = 10^(1.8148 (-log10 psi)^0.5743), psi = sphericity
    # (pi^(1/3) (6V)^(2/3) / S = 0.806 for a cube). A freely tumbling cube lies inside the
    # bounds and within 10 % of the typical value.
    psi = math.pi ** (1 / 3) * (6 * a**3) ** (2 / 3) / (6 * a**2)
    k2 = 10 ** (1.8148 * (-math.log10(psi)) ** 0.5743)
    d_volume = (6 * a**3 / math.pi) ** (1 / 3)
    ganser = 0.4305 * k2 * math.pi * d_volume**2 / 4
    assert float(bounds.drag_area_min) < ganser < float(bounds.drag_area_max)
    assert ganser == pytest.approx(float(bounds.drag_area_typical), rel=0.10)


def test_sphere_min_equals_max_unless_drag_crisis() -> None:
    # Cd 0.47 x pi (0.1)^2/4 = 3.69137e-3 m^2 ([WHITE-FM], [HOERNER-1965]; hand value).
    bounds = drag_bounds("sphere", diameter=0.1)
    assert float(bounds.drag_area_min) == float(bounds.drag_area_max)
    assert float(bounds.drag_area_min) == pytest.approx(3.69137e-3, rel=1e-5)
    assert float(bounds.drag_area_typical) == float(bounds.drag_area_max)
    crisis = drag_bounds("sphere", diameter=0.1, drag_crisis=True)
    # Post-crisis smooth sphere 0.1 ([WHITE-FM], [HOERNER-1965] "0.1-0.2", low end): 7.85398e-4 m^2.
    assert float(crisis.drag_area_min) == pytest.approx(7.85398e-4, rel=1e-5)
    assert float(crisis.drag_area_max) == float(bounds.drag_area_max)
    with pytest.raises(InputError, match="drag_crisis"):
        drag_bounds("box", length=1.0, width=1.0, height=1.0, drag_crisis=True)


CASES = {
    "box": {"length": [0.1, 0.3, 2.0], "width": [0.1, 0.05, 0.3], "height": [0.1, 0.02, 0.2]},
    "cylinder": {"length": [0.1, 3.0, 0.004], "diameter": [0.05, 0.016, 0.3]},
    "tube": {
        "length": [6.0, 0.5, 0.02],
        "outer_diameter": [0.0483, 0.1, 0.05],
        "wall_thickness": [0.004, 0.002, 0.01],
    },
    "sphere": {"diameter": [0.01, 0.1, 0.5]},
    "plate": {
        "length": [2.44, 0.6, 0.3],
        "width": [1.22, 0.6, 0.2],
        "thickness": [0.018, 0.006, 0.2],
    },
    "irregular": {
        "length": [0.3, 0.25, 0.15],
        "width": [0.11, 0.09, 0.07],
        "height": [0.03, 0.07, 0.05],
    },
}


@pytest.mark.parametrize("shape", SHAPES)
def test_bounds_are_ordered(shape: str) -> None:
    bounds = drag_bounds(shape, **{k: np.array(v) for k, v in CASES[shape].items()})
    assert np.all(bounds.drag_area_min > 0)
    assert np.all(bounds.drag_area_min <= bounds.drag_area_typical)
    assert np.all(bounds.drag_area_typical <= bounds.drag_area_max)
    assert np.all(bounds.projected_area_min <= bounds.projected_area_mean)
    assert np.all(bounds.projected_area_mean <= bounds.projected_area_max)
    assert bounds.basis.startswith(shape)


@pytest.mark.parametrize("shape", SHAPES)
def test_vectorised_equals_scalar_calls(shape: str) -> None:
    columns = CASES[shape]
    batch = drag_bounds(shape, **{k: np.array(v) for k, v in columns.items()})
    batch_surface = surface_area(shape, **{k: np.array(v) for k, v in columns.items()})
    batch_volume = volume(shape, **{k: np.array(v) for k, v in columns.items()})
    for row in range(3):
        scalar_dims = {k: v[row] for k, v in columns.items()}
        one = drag_bounds(shape, **scalar_dims)
        for field in (
            "projected_area_min",
            "projected_area_max",
            "projected_area_mean",
            "drag_area_min",
            "drag_area_max",
            "drag_area_typical",
            "glides",
        ):
            assert getattr(one, field).shape == ()
            assert getattr(batch, field)[row] == getattr(one, field), field
        assert batch_surface[row] == surface_area(shape, **scalar_dims)
        assert batch_volume[row] == volume(shape, **scalar_dims)
    # A float broadcasts against an array.
    mixed = drag_bounds("cylinder", length=np.array([0.1, 0.2]), diameter=0.05)
    assert mixed.drag_area_min.shape == (2,)


# --- bad input ----------------------------------------------------------------------------------


@pytest.mark.parametrize("shape", SHAPES)
@pytest.mark.parametrize("bad", [-0.02, 0.0, math.nan, math.inf])
def test_every_bad_dimension_is_named(shape: str, bad: float) -> None:
    for name in SHAPE_DIMENSIONS[shape]:
        dims = {k: v[0] for k, v in CASES[shape].items()}
        dims[name] = bad
        with pytest.raises(InputError, match=rf"^{name} must be a finite length > 0 m; got "):
            drag_bounds(shape, **dims)


def test_bad_value_message_and_batch_row() -> None:
    with pytest.raises(
        InputError, match=r"^diameter must be a finite length > 0 m; got -0.02 m \(allowed: "
    ):
        projected_areas("sphere", diameter=-0.02)
    with pytest.raises(InputError, match=r"diameter .* got nan m \(row 1\)"):
        volume("sphere", diameter=np.array([0.1, np.nan]))
    with pytest.raises(InputError, match="diameter must be a finite length"):
        volume("sphere", diameter="large")


def test_missing_unknown_and_inconsistent_dimensions() -> None:
    with pytest.raises(InputError, match="missing height"):
        drag_bounds("box", length=1.0, width=1.0)
    with pytest.raises(InputError, match="depth is not a dimension of shape box"):
        drag_bounds("box", length=1.0, width=1.0, height=1.0, depth=1.0)
    with pytest.raises(InputError, match="diameter is not a dimension of shape tube"):
        surface_area("pipe", length=1.0, outer_diameter=0.05, wall_thickness=0.01, diameter=0.1)
    with pytest.raises(InputError, match=r"^wall_thickness must be less than half the outer_diam"):
        volume("tube", length=1.0, outer_diameter=0.05, wall_thickness=0.025)
    with pytest.raises(InputError, match=r"^thickness must not exceed the smaller of length"):
        drag_bounds("plate", length=1.0, width=0.5, thickness=0.6)
    with pytest.raises(InputError, match=r"thickness .*\(row 1\)"):
        drag_bounds("sheet", length=1.0, width=np.array([0.5, 0.01]), thickness=0.02)
    with pytest.raises(InputError, match="1-D arrays of one length"):
        drag_bounds("box", length=[1.0, 2.0], width=[1.0, 2.0, 3.0], height=1.0)
