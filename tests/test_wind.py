"""Tests of dropcalc.physics.wind against EN 1991-1-4, ASCE 7-16 and closed forms."""

from __future__ import annotations

import math

import numpy as np
import pytest

from dropcalc.errors import InputError, ModelValidityWarning, UnknownObjectError
from dropcalc.physics.wind import (
    TERRAIN_ALIASES,
    TERRAIN_CLASSES,
    WindSpec,
    peak_speed_ratio,
    peak_velocity_factor,
    roughness_factor,
    speed_ratio,
    terrain,
    terrain_factor,
    turbulence_intensity,
    wind_spec,
)

# EN 1991-1-4:2005, Table 4.1: category -> (z0 [m], z_min [m]). Typed here from the standard
# (as summarised in [EN1991-1-4]), not read from the module under test.
EN_TABLE_4_1 = {
    "en-0": (0.003, 1.0),
    "en-i": (0.01, 1.0),
    "en-ii": (0.05, 2.0),
    "en-iii": (0.3, 5.0),
    "en-iv": (1.0, 10.0),
}

# ASCE 7-16, Table 26.11-1: exposure -> (alpha, z_g [m]) [published];
# mean-hourly exponent alpha-bar [from memory].
ASCE_TABLE_26_11_1 = {
    "asce-b": (7.0, 365.76),
    "asce-c": (9.5, 274.32),
    "asce-d": (11.5, 213.36),
}
ASCE_MEAN_EXPONENT = {"asce-b": 1 / 4.0, "asce-c": 1 / 6.5, "asce-d": 1 / 9.0}  # from memory

HEIGHTS = [0.5, 1.0, 1.5, 3.0, 7.0, 10.0, 25.0, 60.0, 120.0, 200.0]


def en_roughness_factor(z: float, z0: float, z_min: float) -> float:
    """EN 1991-1-4:2005 eq. (4.4)-(4.5), written out independently of the module."""
    k_r = 0.19 * (z0 / 0.05) ** 0.07
    return k_r * math.log(max(z, z_min) / z0)


def en_turbulence_intensity(z: float, z0: float, z_min: float) -> float:
    """EN 1991-1-4:2005 eq. (4.7) with k_I = c_0 = 1."""
    return 1.0 / math.log(max(z, z_min) / z0)


def asce_kz(z: float, alpha: float, z_g: float) -> float:
    """ASCE 7-16 Table 26.10-1 note: K_z = 2.01 (z/z_g)^(2/alpha), z held at 15 ft below."""
    return 2.01 * (max(z, 15 * 0.3048) / z_g) ** (2.0 / alpha)


# --- terrain table --------------------------------------------------------------------------


@pytest.mark.parametrize(("key", "values"), EN_TABLE_4_1.items())
def test_en_terrain_classes_match_table_4_1(key: str, values: tuple[float, float]) -> None:
    # EN 1991-1-4:2005, Table 4.1.
    terrain_class = terrain(key)
    assert terrain_class.key == key
    assert (terrain_class.roughness_length, terrain_class.minimum_height) == values
    # No citable power-law exponent for EN categories: they use the log law.
    assert terrain_class.mean_exponent is None
    assert terrain_class.gust_exponent is None


@pytest.mark.parametrize(("key", "values"), ASCE_TABLE_26_11_1.items())
def test_asce_exposures_match_table_26_11_1(key: str, values: tuple[float, float]) -> None:
    alpha, z_g = values
    terrain_class = terrain(key)
    assert terrain_class.gust_exponent == pytest.approx(1 / alpha, rel=1e-12)  # published
    assert terrain_class.gradient_height == z_g  # published
    assert terrain_class.mean_exponent == pytest.approx(ASCE_MEAN_EXPONENT[key])  # from memory
    # 15 ft (Table 26.10-1 note) x 0.3048 m/ft (International Yard and Pound Agreement, 1959)
    assert terrain_class.minimum_height == pytest.approx(4.572, abs=1e-12)


def test_aliases_and_spelling_variants() -> None:
    assert terrain("sea") is terrain("en-0")
    assert terrain("open") is terrain("en-i")
    assert terrain("country") is terrain("en-ii")
    assert terrain("suburban") is terrain("en-iii")
    assert terrain("urban") is terrain("en-iv")
    assert terrain(" EN_II ") is terrain("en-ii")
    assert terrain("ASCE C") is terrain("asce-c")
    assert set(TERRAIN_ALIASES.values()) <= set(TERRAIN_CLASSES)
    assert not set(TERRAIN_ALIASES) & set(TERRAIN_CLASSES)


def test_unknown_terrain_lists_valid_names() -> None:
    with pytest.raises(UnknownObjectError, match="terrain must be one of") as info:
        terrain("moon")
    message = str(info.value)
    assert "'moon'" in message
    for name in ("en-0", "en-iv", "asce-b", "asce-d", "suburban"):
        assert name in message
    with pytest.raises(UnknownObjectError, match="terrain"):
        wind_spec(10.0, terrain="tundra")


# --- EN 1991-1-4 functions ------------------------------------------------------------------


@pytest.mark.parametrize(
    ("key", "expected"),
    [
        # k_r per category: 0.19 is eq. (4.5) itself for category II; the others are the
        # derived values quoted alongside Table 4.1 (from memory), recomputed by hand from
        # eq. (4.5): 0.15604, 0.16976, 0.21539, 0.23433. Printed to 3 decimals.
        ("en-0", 0.156),
        ("en-i", 0.170),
        ("en-ii", 0.190),
        ("en-iii", 0.215),
        ("en-iv", 0.234),
    ],
)
def test_terrain_factor_spot_values(key: str, expected: float) -> None:
    z0 = EN_TABLE_4_1[key][0]
    assert float(terrain_factor(z0)) == pytest.approx(expected, abs=5e-4)


def test_terrain_factor_category_ii_is_exactly_0_19() -> None:
    # EN 1991-1-4:2005 eq. (4.5): k_r = 0.19 (z0/z0,II)^0.07 with z0,II = 0.05 m.
    assert float(terrain_factor(0.05)) == pytest.approx(0.19, rel=1e-12)


@pytest.mark.parametrize("key", EN_TABLE_4_1)
def test_roughness_factor_and_turbulence_intensity_against_formulas(key: str) -> None:
    # EN 1991-1-4:2005 eqs. (4.4), (4.5), (4.7), written independently above.
    z0, z_min = EN_TABLE_4_1[key]
    heights = np.array(HEIGHTS)
    c_r = roughness_factor(heights, z0, z_min)
    i_v = turbulence_intensity(heights, z0, z_min)
    peak = peak_velocity_factor(heights, z0, z_min)
    for z, c, i, p in zip(HEIGHTS, c_r, i_v, peak, strict=True):
        assert c == pytest.approx(en_roughness_factor(z, z0, z_min), rel=1e-12)
        assert i == pytest.approx(en_turbulence_intensity(z, z0, z_min), rel=1e-12)
        # eq. (4.8): q_p = (1 + 7 I_v) 1/2 rho v_m^2, so v_p / v_m = sqrt(1 + 7 I_v).
        assert p == pytest.approx(math.sqrt(1 + 7 * en_turbulence_intensity(z, z0, z_min)))


def test_en_values_held_constant_below_minimum_height() -> None:
    # EN 1991-1-4:2005 eq. (4.4) and (4.7): c_r(z) = c_r(z_min), I_v(z) = I_v(z_min), z < z_min.
    z0, z_min = EN_TABLE_4_1["en-iv"]
    below = np.array([0.0, 0.5, 4.0, 9.99])
    assert np.all(roughness_factor(below, z0, z_min) == roughness_factor(z_min, z0, z_min))
    assert np.all(turbulence_intensity(below, z0, z_min) == turbulence_intensity(z_min, z0, z_min))
    # At z_min = 10 m in category IV: c_r = k_r ln(10) = 0.23433 * 2.302585 (eq. 4.4-4.5).
    assert float(roughness_factor(3.0, z0, z_min)) == pytest.approx(0.5396, abs=1e-4)


def test_exposure_factor_category_ii_at_10m() -> None:
    # EN 1991-1-4:2005 Figure 4.2 (c_0 = k_I = 1): c_e(10 m) for category II is about 2.35,
    # read from the figure (from memory). c_e = (1 + 7 I_v) c_r^2.
    c_r = float(roughness_factor(10.0, 0.05, 2.0))
    peak = float(peak_velocity_factor(10.0, 0.05, 2.0))
    assert (peak * c_r) ** 2 == pytest.approx(2.35, abs=0.01)


def test_en_functions_broadcast_over_terrains() -> None:
    z0 = np.array([v[0] for v in EN_TABLE_4_1.values()])
    z_min = np.array([v[1] for v in EN_TABLE_4_1.values()])
    c_r = roughness_factor(30.0, z0, z_min)
    assert c_r.shape == (5,)
    for value, (z0_i, z_min_i) in zip(c_r, EN_TABLE_4_1.values(), strict=True):
        assert value == pytest.approx(en_roughness_factor(30.0, z0_i, z_min_i), rel=1e-12)
    # Rougher terrain, slower mean wind at 30 m (EN 1991-1-4 Figure 4.2 ordering).
    assert np.all(np.diff(c_r) < 0)


def test_en_functions_reject_bad_inputs() -> None:
    with pytest.raises(InputError, match="roughness_length"):
        terrain_factor(0.0)
    with pytest.raises(InputError, match="roughness_length"):
        roughness_factor(10.0, -0.05, 2.0)
    with pytest.raises(InputError, match="minimum_height"):
        turbulence_intensity(10.0, 0.3, 0.2)
    with pytest.raises(InputError, match="height"):
        peak_velocity_factor(np.nan, 0.05, 2.0)


def test_en_functions_warn_above_200m() -> None:
    # EN 1991-1-4:2005, 4.3.2: the profile formulas hold for z_min <= z <= z_max = 200 m.
    with pytest.warns(ModelValidityWarning, match="200"):
        roughness_factor(250.0, 0.05, 2.0)


# --- profile kernel -------------------------------------------------------------------------


@pytest.mark.parametrize("key", EN_TABLE_4_1)
def test_log_law_ratio_is_one_at_10m_and_equals_roughness_factor_ratio(key: str) -> None:
    z0, z_min = EN_TABLE_4_1[key]
    # Closed form: ln(10/z0)/ln(10/z0) = 1.
    assert float(speed_ratio(10.0, "log", roughness_length=z0, minimum_height=z_min)) == (
        pytest.approx(1.0, rel=1e-14)
    )
    # v_m(z)/v_m(10) = c_r(z)/c_r(10), EN 1991-1-4:2005 eq. (4.3) with c_o = 1.
    for z in HEIGHTS:
        expected = en_roughness_factor(z, z0, z_min) / en_roughness_factor(10.0, z0, z_min)
        ratio = float(speed_ratio(z, "log", roughness_length=z0, minimum_height=z_min))
        assert ratio == pytest.approx(expected, rel=1e-12)


def test_power_law_ratio_at_20m() -> None:
    # Closed form: (20/10)^(1/7) = 2^(1/7).
    assert float(speed_ratio(20.0, "power", exponent=1 / 7)) == pytest.approx(2 ** (1 / 7))
    heights = np.array([5.0, 40.0])
    expected = (heights / 10.0) ** 0.2
    np.testing.assert_allclose(speed_ratio(heights, "power", exponent=0.2), expected, rtol=1e-14)


def test_kernel_held_constant_below_minimum_height_and_uniform() -> None:
    below = speed_ratio([0.0, 1.0, 2.9], "power", exponent=0.2, minimum_height=3.0)
    np.testing.assert_allclose(below, 0.3**0.2, rtol=1e-14)  # (3/10)^0.2, closed form
    np.testing.assert_array_equal(speed_ratio([0.0, 5.0, 80.0], "uniform"), [1.0, 1.0, 1.0])
    with pytest.raises(InputError, match="profile"):
        speed_ratio(10.0, "cubic")  # type: ignore[arg-type]


@pytest.mark.parametrize("key", ASCE_TABLE_26_11_1)
@pytest.mark.parametrize("height", [2.0, 4.6, 15.0, 30.0, 100.0])
def test_asce_gust_profile_reproduces_kz_ratio(key: str, height: float) -> None:
    # ASCE 7-16: velocity pressure q_z is proportional to K_z V^2, so for 3-s gusts
    # (V(z)/V(10))^2 = K_z(z)/K_z(10), K_z = 2.01 (z/z_g)^(2/alpha) (Table 26.10-1 note).
    alpha, z_g = ASCE_TABLE_26_11_1[key]
    spec = wind_spec(20.0, kind="gust", terrain=key)
    ratio = float(spec.speed_at(height)) / 20.0
    assert ratio**2 == pytest.approx(asce_kz(height, alpha, z_g) / asce_kz(10.0, alpha, z_g))


@pytest.mark.parametrize(
    ("key", "height_ft", "expected"),
    [
        # ASCE 7-16 Table 26.10-1, K_z printed to 2 decimals (from memory).
        ("asce-b", 15.0, 0.57),
        ("asce-c", 15.0, 0.85),
        ("asce-d", 15.0, 1.03),
        ("asce-b", 30.0, 0.70),
        ("asce-c", 30.0, 0.98),
        ("asce-d", 30.0, 1.16),
    ],
)
def test_asce_table_data_reproduce_kz_table(key: str, height_ft: float, expected: float) -> None:
    terrain_class = terrain(key)
    assert terrain_class.gust_exponent is not None
    assert terrain_class.gradient_height is not None
    z = height_ft * 0.3048  # exact ft -> m
    kz = 2.01 * (z / terrain_class.gradient_height) ** (2 * terrain_class.gust_exponent)
    assert kz == pytest.approx(expected, abs=0.0051)


def test_exposure_c_at_30m_gust_vs_mean() -> None:
    # Exposure C at 30 m: gust ratio (30/10)^(1/9.5) (ASCE 7-16 Table 26.11-1, published);
    # hourly-mean ratio (30/10)^(1/6.5) (alpha-bar, from memory).
    gust = wind_spec(10.0, kind="gust", terrain="asce-c")
    mean = wind_spec(10.0, kind="mean", terrain="asce-c")
    assert float(gust.speed_at(30.0)) == pytest.approx(10.0 * 3 ** (1 / 9.5))
    assert float(mean.speed_at(30.0)) == pytest.approx(10.0 * 3 ** (1 / 6.5))
    assert (float(gust.speed_at(30.0)) / 10.0) ** 2 == pytest.approx(
        asce_kz(30.0, 9.5, 274.32) / asce_kz(10.0, 9.5, 274.32)
    )


# --- wind specification ---------------------------------------------------------------------


@pytest.mark.parametrize(
    ("from_direction", "expected"),
    [
        # Meteorological convention: the wind blows from the given bearing, towards the
        # opposite one (common practice, no source; WMO-No. 8 from memory).
        (0.0, (0.0, -1.0)),  # northerly blows towards south
        (90.0, (-1.0, 0.0)),  # easterly blows towards west
        (180.0, (0.0, 1.0)),  # southerly blows towards north
        (270.0, (1.0, 0.0)),  # westerly blows towards east
        (-90.0, (1.0, 0.0)),  # normalised to 270
        (450.0, (-1.0, 0.0)),  # normalised to 90
    ],
)
def test_towards_unit_vector(from_direction: float, expected: tuple[float, float]) -> None:
    east, north = wind_spec(5.0, from_direction=from_direction).towards_unit_vector()
    assert east == pytest.approx(expected[0], abs=1e-15)
    assert north == pytest.approx(expected[1], abs=1e-15)


def test_towards_unit_vector_oblique() -> None:
    # From 225 deg (south-west) towards north-east: (sqrt(1/2), sqrt(1/2)), closed form.
    spec = wind_spec(5.0, from_direction=225.0)
    assert spec.from_direction_deg == 225.0
    east, north = spec.towards_unit_vector()
    assert (east, north) == pytest.approx((math.sqrt(0.5), math.sqrt(0.5)), rel=1e-14)
    assert wind_spec(5.0, from_direction=-10.0).from_direction_deg == pytest.approx(350.0)


def test_default_resolution() -> None:
    assert wind_spec(8.0).profile == "uniform"
    en = wind_spec(8.0, terrain="suburban")
    assert (en.profile, en.roughness_length, en.minimum_height, en.terrain_key) == (
        "log",
        0.3,
        5.0,
        "en-iii",
    )
    assert en.exponent is None
    asce_mean = wind_spec(8.0, terrain="asce-b")
    asce_gust = wind_spec(8.0, kind="gust", terrain="asce-b")
    assert asce_mean.profile == asce_gust.profile == "power"
    assert asce_mean.exponent == pytest.approx(1 / 4.0)  # alpha-bar, from memory
    assert asce_gust.exponent == pytest.approx(1 / 7.0)  # 1/alpha, published
    # Explicit values override the terrain's and imply the law.
    override = wind_spec(8.0, terrain="en-ii", exponent=0.2)
    assert (override.profile, override.exponent, override.minimum_height) == ("power", 0.2, 2.0)
    log_override = wind_spec(8.0, terrain="asce-c", roughness_length=0.02)
    assert (log_override.profile, log_override.roughness_length) == ("log", 0.02)
    assert wind_spec(8.0, roughness_length=0.3).minimum_height == 5.0  # nearest EN category


def test_speed_at_uniform_and_log() -> None:
    np.testing.assert_array_equal(wind_spec(6.0).speed_at([0.5, 10.0, 90.0]), [6.0, 6.0, 6.0])
    spec = wind_spec(10.0, terrain="en-ii")
    # Log law 10 ln(50/0.05)/ln(10/0.05), closed form.
    expected = 10.0 * math.log(50 / 0.05) / math.log(10 / 0.05)
    assert float(spec.speed_at(50.0)) == pytest.approx(expected, rel=1e-12)
    assert float(spec.speed_at(0.3)) == pytest.approx(float(spec.speed_at(2.0)), rel=1e-14)


def test_gust_speed_10m() -> None:
    # EN 1991-1-4:2005 eqs. (4.7)-(4.8): v_p(10)/v_m(10) = sqrt(1 + 7/ln(10/z0)); for category
    # II sqrt(1 + 7/ln 200) = 1.52354 (hand calculation).
    en = wind_spec(10.0, terrain="en-ii")
    assert en.gust_speed_10m() == pytest.approx(10.0 * math.sqrt(1 + 7 / math.log(200.0)))
    assert en.gust_speed_10m() == pytest.approx(15.2354, abs=1e-4)
    # A gust is returned as given.
    assert wind_spec(10.0, kind="gust", terrain="en-ii").gust_speed_10m() == 10.0
    # No EN terrain: default gust factor 1.5 (common practice, no source).
    assert wind_spec(10.0, terrain="asce-c").gust_speed_10m() == pytest.approx(15.0)
    assert wind_spec(10.0).gust_speed_10m() == pytest.approx(15.0)


def test_describe_says_mean_or_gust_and_profile() -> None:
    text = wind_spec(12.0, terrain="en-ii").describe()
    assert "10-min mean" in text
    assert "log-law" in text
    text = wind_spec(12.0, kind="gust", terrain="asce-c").describe()
    assert "3-s gust" in text
    assert "power-law" in text
    assert "same speed at every height" in wind_spec(12.0).describe()


@pytest.mark.parametrize(
    ("kwargs", "field"),
    [
        ({"speed_10m": -1.0}, "speed_10m"),
        ({"speed_10m": math.nan}, "speed_10m"),
        ({"speed_10m": 80.0}, "storm"),
        ({"speed_10m": 10.0, "exponent": 0.7}, "exponent"),
        ({"speed_10m": 10.0, "exponent": -0.1}, "exponent"),
        ({"speed_10m": 10.0, "roughness_length": 5.0}, "roughness_length"),
        ({"speed_10m": 10.0, "roughness_length": 1e-5}, "roughness_length"),
        ({"speed_10m": 10.0, "from_direction": math.inf}, "from_direction"),
        ({"speed_10m": 10.0, "kind": "peak"}, "kind"),
        ({"speed_10m": 10.0, "profile": "cubic"}, "profile"),
        ({"speed_10m": 10.0, "profile": "power"}, "exponent"),
        ({"speed_10m": 10.0, "profile": "log"}, "roughness_length"),
        ({"speed_10m": 10.0, "profile": "power", "terrain": "en-ii"}, "exponent"),
        ({"speed_10m": 10.0, "profile": "uniform", "exponent": 0.1}, "exponent"),
        ({"speed_10m": 10.0, "exponent": 0.1, "roughness_length": 0.1}, "exponent"),
        ({"speed_10m": 10.0, "roughness_length": 2.0, "minimum_height": 1.0}, "minimum_height"),
    ],
)
def test_wind_spec_rejects_bad_values(kwargs: dict[str, object], field: str) -> None:
    with pytest.raises(InputError, match=field):
        wind_spec(**kwargs)  # type: ignore[arg-type]


def test_storm_message_names_field_value_and_limit() -> None:
    with pytest.raises(InputError) as info:
        wind_spec(80.0)
    message = str(info.value)
    assert "speed_10m" in message
    assert "80 m/s" in message
    assert "70" in message


def test_wind_spec_is_frozen() -> None:
    spec = wind_spec(10.0)
    assert isinstance(spec, WindSpec)
    with pytest.raises(AttributeError):
        spec.speed_10m = 20.0  # type: ignore[misc]


def test_gust_follows_en_peak_profile_not_mean_law() -> None:
    # EN 1991-1-4:2005 §4.5 eq. (4.8): v_p(z) = v_m(z) sqrt(1 + 7 I_v(z)); §4.4 eq. (4.7):
    # I_v(z) = k_I / (c_0 ln(z/z0)), k_I = c_0 = 1; v_m(z) ∝ ln(z/z0) (eq. 4.3-4.4), z held at
    # z_min below it. Table 4.1 category III: z0 = 0.3 m, z_min = 5 m.
    z0, z_min = 0.3, 5.0

    def v_p(z: float) -> float:
        log = math.log(max(z, z_min) / z0)
        return log * math.sqrt(1.0 + 7.0 / log)

    def v_m(z: float) -> float:
        return math.log(max(z, z_min) / z0)

    gust = wind_spec(20.0, kind="gust", terrain="en-iii")
    mean = wind_spec(20.0, kind="mean", terrain="en-iii")
    for height in (40.0, 3.0):
        expected = v_p(height) / v_p(10.0)
        assert float(peak_speed_ratio(height, z0, z_min)) == pytest.approx(expected, rel=1e-12)
        assert float(gust.speed_at(height)) / 20.0 == pytest.approx(expected, rel=1e-12)
        # The mean law is what a mean wind keeps, and it differs from the gust's by 8-11 %.
        assert float(mean.speed_at(height)) / 20.0 == pytest.approx(v_m(height) / v_m(10.0))
        assert abs(v_m(height) / v_m(10.0) / expected - 1.0) > 0.07
    # Worked by hand: v_p(40)/v_p(10) = 4.893 * 1.5590 / (3.507 * 1.7310) = 1.2567.
    assert float(gust.speed_at(40.0)) / 20.0 == pytest.approx(1.2567, abs=5e-4)
    assert float(gust.speed_at(10.0)) == pytest.approx(20.0, rel=1e-12)
