"""Exclusion zones: how far from a work edge dropped objects come to rest.

Two answers, side by side:

- ``radius_m``: the distance from the release point within which a stated share (the confidence,
  default 0.99) of simulated drops came to rest, plus a margin. The inputs that are uncertain on
  the day (wind speed and direction, how the object leaves the edge, its orientation while it
  tumbles, its drag coefficient, the air density, the restitution, friction and rolling
  resistance after landing and the orientation at the first contact) are
  sampled from documented distributions (:class:`Uncertainty`), the trajectories solved in one
  array call, the bounce and slide added, and the quantile taken. Sampling goes on until the
  quantile's standard error is below a tolerance.
- ``worst_case_radius_m``: the deterministic envelope: every sampled input at the end of its
  range that carries the object furthest (the gust speed blowing straight out from the edge, the
  highest release speed, the drag area over its whole range, both ends of the restitution and
  friction, the lowest rolling resistance, the orientation at the first contact searched),
  plus the same margin. No Monte Carlo sample lies beyond it.

The radius is split as ``radius = drift + scatter + margin``: ``drift_m`` is the confidence
quantile of the air drift alone (release point to first ground contact), ``scatter_m`` the further
distance to the quantile of the rest positions. Deflection off the structure (scaffold, facade,
balconies) is not modelled.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass, field
from typing import TYPE_CHECKING

import numpy as np

from dropcalc.analysis.fall import wind_field
from dropcalc.errors import InputError, require_range
from dropcalc.model.conditions import Conditions, WithConditions, opposite_azimuth
from dropcalc.model.limits import (
    CARRIED_AWAY_DISTANCE,
    CONFIDENCE_RANGE,
    MARGIN_RANGE,
    RELATIVE_ERROR_RANGE,
    RELEASE_HEIGHT_RANGE,
    TURBULENCE_RANGE,
    UNCERTAINTY_RANGES,
)
from dropcalc.physics import contact
from dropcalc.physics.release import initial_velocity
from dropcalc.physics.scatter import SLOPE_RANGE, Surface, surface
from dropcalc.physics.trajectory import FallSolution, solve_falls
from dropcalc.physics.wind import turbulence_intensity

if TYPE_CHECKING:  # imported where used: a zone needs no plan geometry or library to load
    from dropcalc.analysis.plan import ExclusionArea, Site
    from dropcalc.io.items import Item
    from dropcalc.io.library import DropObject, Library

#: Integrator tolerance for zone samples: 1e-6 keeps positions to ~1e-5 relative, far inside the
#: Monte Carlo error, at a third of the steps of the default 1e-8.
ZONE_TOLERANCE = 1e-6
#: Turbulence intensity used when the terrain gives none [-] (EN 1991-1-4 category II at 10 m
#: gives 1/ln(10/0.05) = 0.19; rounded up, common practice, no source).
DEFAULT_TURBULENCE_INTENSITY = 0.2
#: Margin added to the zone radius [m] (common practice, no source; the user sets it).
DEFAULT_MARGIN = 2.0
#: Samples per object in the first full round, and the most per object.
INITIAL_SAMPLES = 20_000
#: Samples per object in the pilot round that screens out objects that cannot drive the zone,
#: and the fewest samples beyond the quantile it must hold (so 10 / (1 - p) at least).
PILOT_SAMPLES = 2_000
PILOT_TAIL_SAMPLES = 10
#: Samples beyond the quantile that a full round must hold: a driving object gets at least
#: 50 / (1 - p) samples, so that the quantile's interval lies among observed samples (common
#: practice, no source: 50 keeps the distribution-free interval of the quantile, +-1.96
#: sqrt(n p (1 - p)) ranks, within the sample at any p).
TAIL_SAMPLES = 50
#: Standard errors by which an object's pilot quantile must fall short of the leader's to be
#: screened out.
SCREEN_SIGMAS = 3.0
MAX_SAMPLES = 1_280_000
#: Standard error of the radius aimed at, relative to the radius.
DEFAULT_RELATIVE_ERROR = 0.01
#: Added to the envelope's grid-search maximum for the search's own error [m].
ENVELOPE_SEARCH_ALLOWANCE = 0.001
#: Horizontal distance after which a sample counts as carried away [m] (the same as ``fall``).
CARRIED_AWAY = CARRIED_AWAY_DISTANCE


@dataclass(frozen=True)
class ZoneObject:
    """An object for the zone, SI units.

    Attributes
    ----------
    name : str
        Name shown in the output.
    mass : float
        [kg]
    drag_area_min, drag_area_max : float
        Drag area bounds of the tumbling object. [m^2]
    quantity : int
        How many are in use (weights nothing: each object gets its own quantile).
    object_id : str
        Library id, or "" for a custom object.
    fragile : bool
        May break on impact: above its material's breaking speed it throws fragments instead
        of bouncing whole.
    rolls : bool
        Round item that rolls rather than slides after landing.
    glides : bool
        Sheet or plate that can glide in wind (the point-mass result is not conservative).
    plate : tuple of float or None
        (length, width, thickness) [m] of a sheet flown by the plate model
        (:mod:`dropcalc.analysis.plate_flight`); None for a point mass.
    shape : str
        Shape class for the contact geometry (``shapes.SHAPES``); "" for a custom object known
        only by its drag area (a cube, :func:`dropcalc.physics.contact.cube_body`).
    dimensions : tuple of (str, float)
        The shape's dimensions by name. [m]
    material : str
        Material class (:data:`dropcalc.physics.contact.MATERIALS`); "" takes
        :data:`~dropcalc.physics.contact.DEFAULT_MATERIAL`.
    """

    name: str
    mass: float
    drag_area_min: float
    drag_area_max: float
    quantity: int = 1
    object_id: str = ""
    fragile: bool = False
    rolls: bool = False
    glides: bool = False
    plate: tuple[float, float, float] | None = None
    shape: str = ""
    dimensions: tuple[tuple[str, float], ...] = ()
    material: str = ""

    def __post_init__(self) -> None:
        from dropcalc.analysis.fall import check_object

        check_object(self.mass, self.drag_area_min, 1.0, None, self.drag_area_max)
        contact.material(self.material or contact.DEFAULT_MATERIAL)  # names a bad class

    @property
    def body(self) -> contact.Body:
        """Contact geometry: the shape class, or a cube for a custom object."""
        if self.shape:
            return contact.body(self.shape, dict(self.dimensions))
        return contact.cube_body(self.drag_area_max)

    @property
    def material_class(self) -> contact.Material:
        """The material class (the default for a custom object)."""
        return contact.material(self.material or contact.DEFAULT_MATERIAL)

    @property
    def break_speed(self) -> float | None:
        """Impact speed above which the object breaks [m/s]; None if it does not."""
        return self.material_class.break_speed if self.fragile else None


@dataclass(frozen=True)
class Uncertainty:
    """Distributions of the inputs that vary from drop to drop (documented defaults).

    Attributes
    ----------
    turbulence_intensity : float or None
        Standard deviation of the wind speed over its mean; None takes I_v at 10 m from the EN
        terrain category (EN 1991-1-4 eq. 4.7), else :data:`DEFAULT_TURBULENCE_INTENSITY`. The
        sampled speed is mean (1 + I_v Z), Z standard normal truncated so that the speed stays
        between 0 and the gust speed.
    direction_spread : float
        Standard deviation of the wind direction about its mean, normal truncated at 3 sigma
        (common practice, no source). [deg]
    release_direction_spread : float
        Half-width of the uniform spread of a push or throw direction about the edge normal
        (common practice, no source). [deg]
    release_speed_low : float
        Push and throw speeds are uniform between this fraction of the given speed and the given
        speed (a given speed is the most a person would impart). [-]
    release_angle_spread : float
        Half-width of the uniform spread of a throw's elevation angle. [deg]
    friction_spread : float
        Relative half-width of the uniform spread of the roof friction (roof-slide). [-]
    drag_coefficient_spread : float
        Relative half-width of the uniform spread of C_d on top of the orientation spread
        ([WHITE-FM]: Cd tables are good to about +-10 % above Re 1e4, from memory). [-]
    density_spread : float
        Relative half-width of the uniform spread of air density during the work (a +-15 K
        day is +-5 %, from the ideal gas law). [-]
    The after-landing inputs are drawn uniformly within their ranges (the material's
    restitution, the ground's factor, friction and rolling resistance, the fragment launch
    speed and angle) and the orientation at the first contact uniformly over all rotations.
    """

    turbulence_intensity: float | None = None
    direction_spread: float = 15.0
    release_direction_spread: float = 30.0
    release_speed_low: float = 0.0
    release_angle_spread: float = 15.0
    friction_spread: float = 0.2
    drag_coefficient_spread: float = 0.10
    density_spread: float = 0.05

    def __post_init__(self) -> None:
        for name, (low, high) in UNCERTAINTY_RANGES.items():
            require_range(name, getattr(self, name), low, high)
        if self.turbulence_intensity is not None:
            require_range("turbulence_intensity", self.turbulence_intensity, *TURBULENCE_RANGE)


@dataclass(frozen=True)
class ZoneSettings(WithConditions):
    """Everything but the objects: conditions, ground, confidence and sampling.

    ``conditions`` (air, wind, gravity, release, edge direction) are read as ``settings.wind``
    etc.
    """

    height: float
    conditions: Conditions = field(default_factory=Conditions)
    ground: Surface = field(default_factory=lambda: surface("concrete"))
    ground_slope: float = 0.0
    confidence: float = 0.99
    margin: float = DEFAULT_MARGIN
    relative_error: float = DEFAULT_RELATIVE_ERROR
    seed: int = 1
    uncertainty: Uncertainty = field(default_factory=Uncertainty)
    max_samples: int = MAX_SAMPLES

    def __post_init__(self) -> None:
        require_range("height", self.height, *RELEASE_HEIGHT_RANGE, "m")
        require_range("confidence", self.confidence, *CONFIDENCE_RANGE)
        require_range("ground_slope", self.ground_slope, *SLOPE_RANGE, "deg")
        require_range("margin", self.margin, *MARGIN_RANGE, "m")
        if isinstance(self.seed, bool) or not isinstance(self.seed, int) or self.seed < 0:
            raise InputError(f"seed must be a whole number >= 0; got {self.seed!r}", field="seed")
        if not (isinstance(self.max_samples, int) and self.max_samples >= 1000):
            raise InputError(
                f"max_samples must be a whole number >= 1000; got {self.max_samples}",
                field="max_samples",
            )
        require_range("relative_error", self.relative_error, *RELATIVE_ERROR_RANGE)


@dataclass(frozen=True)
class ObjectZone:
    """Zone figures of one object."""

    obj: ZoneObject
    radius: float  # quantile of rest distance + margin [m]
    drift: float  # quantile of air drift [m]
    scatter: float  # radius - drift - margin [m]
    standard_error: float  # of the rest-distance quantile [m]
    samples: int
    max_sampled: float  # largest sampled rest distance [m]
    worst_case: float  # envelope rest distance + margin [m]
    carried_away: float  # share of samples still airborne at CARRIED_AWAY [-]
    offsets: np.ndarray  # (2, n) rest positions relative to the release point [m]
    rolled_away: float = 0.0  # share that slid or rolled away down the slope, never stopping
    sensitivity: tuple[Sensitivity, ...] = ()  # after-landing inputs at their ends


@dataclass(frozen=True)
class Sensitivity:
    """The radius with one after-landing input held at each end of its range.

    Attributes
    ----------
    parameter : str
        ``restitution``, ``friction``, ``rolling_resistance``, ``fragment_speed`` or ``all``
        (every input at its end that gives the shorter, then the longer, travel).
    low, high : float
        The input's two ends (``all``: NaN). [-]
    radius_low, radius_high : float
        Radius (quantile plus margin) with the input at its low and at its high end, the other
        inputs drawn as usual, over the same landings. [m]
    """

    parameter: str
    low: float
    high: float
    radius_low: float
    radius_high: float


#: Landings (of the first round) re-used for the sensitivity of the radius to the
#: after-landing inputs: 20 beyond the 99 % quantile, enough to show the trend, not to
#: quote the radius (an indication, say so where it is shown).
SENSITIVITY_SAMPLES = 2_000


@dataclass(frozen=True)
class ZoneResult:
    """The zone for a set of objects: the largest of the per-object figures."""

    settings: ZoneSettings
    objects: tuple[ObjectZone, ...]
    driver: ObjectZone
    worst_case_driver: ObjectZone
    gust_speed: float
    turbulence_intensity: float

    @property
    def radius(self) -> float:
        """Exclusion radius [m] at the confidence, margin included."""
        return self.driver.radius

    @property
    def worst_case(self) -> float:
        """Deterministic envelope radius [m], margin included."""
        return self.worst_case_driver.worst_case


# --------------------------------------------------------------------------------------------
# Sampling


def _turbulence(settings: ZoneSettings) -> float:
    if settings.uncertainty.turbulence_intensity is not None:
        return settings.uncertainty.turbulence_intensity
    wind = settings.wind
    if wind.profile == "log" and wind.roughness_length:
        return float(turbulence_intensity(10.0, wind.roughness_length, wind.minimum_height))
    return DEFAULT_TURBULENCE_INTENSITY


def _mean_and_gust(settings: ZoneSettings) -> tuple[float, float]:
    """Mean speed at 10 m and the gust that bounds the samples [m/s]."""
    wind = settings.wind
    if wind.speed_10m == 0:
        return 0.0, 0.0
    factor = wind.gust_factor()
    if wind.kind == "gust":
        return wind.speed_10m / factor, wind.speed_10m
    return wind.speed_10m, wind.speed_10m * factor


def _truncated_normal(rng: np.random.Generator, n: int, low: float, high: float) -> np.ndarray:
    """Standard normal samples restricted to [low, high] (rejection; the bounds are wide).

    Kept rather than ``scipy.stats.truncnorm.rvs``, about 20 times slower here (12 s for a
    million samples), or drawing by the inverse CDF (``scipy.special.ndtri``), which consumes
    the random stream differently and so changes every seeded zone.
    """
    out = np.empty(n)
    filled = 0
    while filled < n:
        draw = rng.standard_normal(max(2 * (n - filled), 64))
        keep = draw[(draw >= low) & (draw <= high)][: n - filled]
        out[filled : filled + keep.size] = keep
        filled += keep.size
    return out


def _release_velocities(settings: ZoneSettings, n: int, rng: np.random.Generator) -> np.ndarray:
    """Sampled release velocities (3, n) for the release mode."""
    release, unc = settings.release, settings.uncertainty
    azimuth = np.full(n, settings.edge_azimuth)
    sampled = release
    from dataclasses import replace

    if release.mode in ("push", "throw"):
        top = float(release.speed)
        speed = rng.uniform(unc.release_speed_low * top, top, n)
        azimuth = azimuth + rng.uniform(
            -unc.release_direction_spread, unc.release_direction_spread, n
        )
        sampled = replace(release, speed=speed)
        if release.mode == "throw":
            angle = float(release.angle) + rng.uniform(
                -unc.release_angle_spread, unc.release_angle_spread, n
            )
            sampled = replace(sampled, angle=np.clip(angle, -90.0, 90.0))
    elif release.mode == "roof-slide" and float(release.friction) > 0:
        mu = float(release.friction) * rng.uniform(
            1 - unc.friction_spread, 1 + unc.friction_spread, n
        )
        # Keep every sample able to slide (the given friction was checked to allow it).
        limit = math.tan(math.radians(float(release.roof_pitch))) * 0.999
        sampled = replace(release, friction=np.minimum(mu, limit))
    velocity = np.asarray(initial_velocity(sampled, azimuth, settings.gravity), dtype=float)
    return velocity.reshape(3, -1) * np.ones((1, n))


@dataclass(frozen=True)
class LandingDraw:
    """After-landing inputs of the samples (arrays (n,); rotation (n, 3, 3))."""

    restitution: np.ndarray  # normal restitution on this ground at the reference speed [-]
    friction: np.ndarray  # [-]
    rolling_resistance: np.ndarray  # [-]
    rotation: np.ndarray  # orientation at the first contact
    fragment_speed: np.ndarray  # fragment launch speed over impact speed [-]
    fragment_angle: np.ndarray  # fragment launch elevation [deg]
    fragment_azimuth: np.ndarray  # fragment compass direction [rad]

    def take(self, lanes: np.ndarray) -> LandingDraw:
        """The draw for the given sample indices."""
        return LandingDraw(*(getattr(self, name)[lanes] for name in self.__dataclass_fields__))


def draw_landing(obj: ZoneObject, ground: Surface, n: int, rng: np.random.Generator) -> LandingDraw:
    """Draw the after-landing inputs of n drops: each uniform within its range."""
    material = obj.material_class
    restitution = rng.uniform(*material.restitution, n) * rng.uniform(*ground.restitution_factor, n)
    return LandingDraw(
        restitution=restitution,
        friction=rng.uniform(*ground.friction, n),
        rolling_resistance=rng.uniform(*ground.rolling_resistance, n),
        rotation=contact.random_orientations(n, rng),
        fragment_speed=rng.uniform(*contact.FRAGMENT_SPEED_FRACTION, n),
        fragment_angle=rng.uniform(*contact.FRAGMENT_ANGLE, n),
        fragment_azimuth=rng.uniform(0.0, 2.0 * np.pi, n),
    )


def _rest_positions(
    obj_mass: np.ndarray,
    drag_area: np.ndarray,
    density: np.ndarray,
    wind_speed: np.ndarray,
    wind_toward: np.ndarray,
    velocity0: np.ndarray,
    draw: LandingDraw,
    obj: ZoneObject,
    settings: ZoneSettings,
) -> tuple[np.ndarray, np.ndarray, np.ndarray, float, FallSolution]:
    """Solve falls and add the travel after landing; also say how far the fall table may be off.

    Returns rest offsets (2, n), air drift (n), landed (n), the largest error of a rest
    distance read from the fall table (0 when solved directly) [m], and the landings.

    Straight drops of many samples read their landings from a table (:func:`_land_by_table`);
    the first :data:`FALL_TABLE_CHECKS` of them are also solved directly, those direct results
    are kept, and the largest difference of their rest distances from the table's is returned
    so that the caller can count it in the reported error.
    """
    table = None
    if obj_mass.size >= FALL_TABLE_MIN_SAMPLES and not np.any(velocity0):
        k = density * drag_area / (2.0 * obj_mass)
        table = _land_by_table(k, wind_speed, wind_toward, settings)
    if table is None:
        solution = _land(obj_mass, drag_area, density, wind_speed, wind_toward, velocity0, settings)
        return (*_rest_after_landing(solution, draw, obj, settings), 0.0, solution)
    tabled, direct = table
    check = np.arange(direct.time.size)
    rest, drift, landed = _rest_after_landing(tabled, draw, obj, settings)
    exact = _rest_after_landing(direct, draw.take(check), obj, settings)
    with np.errstate(invalid="ignore"):  # a body that rolls away is infinitely far both ways
        gap = np.abs(np.hypot(*exact[0]) - np.hypot(*rest[:, check]))
    gap = gap[np.isfinite(gap)]
    error = float(gap.max()) if gap.size else 0.0
    rest[:, check], drift[check], landed[check] = exact
    return rest, drift, landed, error, tabled


def _land(
    obj_mass: np.ndarray,
    drag_area: np.ndarray,
    density: np.ndarray,
    wind_speed: np.ndarray,
    wind_toward: np.ndarray,
    velocity0: np.ndarray,
    settings: ZoneSettings,
) -> FallSolution:
    """Solve the falls to their first ground contact."""
    from dataclasses import replace

    k = density * drag_area / (2.0 * obj_mass)
    toward = np.radians(wind_toward)
    base = wind_field(settings.wind, wind_speed)
    field_ = replace(base, toward_east=np.sin(toward), toward_north=np.cos(toward))
    return solve_falls(
        settings.height,
        velocity0,
        k,
        gravity=settings.gravity,
        wind=field_,
        tolerance=ZONE_TOLERANCE,
        max_distance=CARRIED_AWAY,
    )


#: Nodes of the fall table over log k and over the 10 m wind speed (Chebyshev points).
FALL_TABLE_NODES = (13, 13)
#: Samples below which the table is not worth building; the falls are solved directly.
FALL_TABLE_MIN_SAMPLES = 1_000
#: Samples solved directly as well in every tabled call, to measure the table's error.
FALL_TABLE_CHECKS = 32


def _chebyshev_weights(x: np.ndarray, low: float, high: float, count: int) -> np.ndarray:
    """Barycentric interpolation weights (len(x), count) on Chebyshev points of [low, high].

    Interpolation through Chebyshev points of the second kind, x_j = cos(j pi / (m - 1)),
    in the barycentric form p(x) = sum_j (w_j / (x - x_j)) f_j / sum_j (w_j / (x - x_j)) with
    w_j = (-1)^j, halved at the two ends ([BT-2004], eq. 5.1 and sec. 6). A single node (an
    interval of zero width) gives weight 1.
    """
    if count == 1 or not high > low:
        return np.ones((x.size, 1))
    nodes = _chebyshev_nodes(low, high, count)
    w = (-1.0) ** np.arange(count)
    w[0] *= 0.5
    w[-1] *= 0.5
    diff = x[:, None] - nodes[None, :]
    exact = diff == 0.0
    diff[exact] = 1.0
    terms = w / diff
    hit = exact.any(axis=1)
    terms[hit] = exact[hit]
    weights: np.ndarray = terms / terms.sum(axis=1, keepdims=True)
    return weights


def _chebyshev_nodes(low: float, high: float, count: int) -> np.ndarray:
    if count == 1 or not high > low:
        return np.array([low])
    return 0.5 * (low + high) + 0.5 * (high - low) * np.cos(np.pi * np.arange(count) / (count - 1))


def _land_by_table(
    k: np.ndarray, wind_speed: np.ndarray, wind_toward: np.ndarray, settings: ZoneSettings
) -> tuple[FallSolution, FallSolution] | None:
    """Landings of straight drops (no initial velocity) read from a table, or None.

    A drop from rest is fixed by its drag parameter k and the 10 m wind speed U; the wind
    direction only turns it about the vertical. So the falls are solved on a small grid of
    Chebyshev points in (log k, U) (:data:`FALL_TABLE_NODES`) in the wind's own frame, and
    the drift, fall time and the along-wind and vertical landing speeds of every sample are
    interpolated from it ([BT-2004]) and turned to the sample's wind direction. In the same
    engine call the first :data:`FALL_TABLE_CHECKS` samples are solved directly.

    Returns
    -------
    (FallSolution, FallSolution) or None
        The table's landings of all samples and the direct ones of the checked samples; None
        when a node or a checked sample was carried away (the caller then solves directly).
    """
    from dataclasses import replace

    log_k = np.log(k)
    span_k = float(log_k.min()), float(log_k.max())
    span_u = float(wind_speed.min()), float(wind_speed.max())
    nodes_k = _chebyshev_nodes(*span_k, FALL_TABLE_NODES[0])
    nodes_u = _chebyshev_nodes(*span_u, FALL_TABLE_NODES[1])
    grid_k, grid_u = np.meshgrid(nodes_k, nodes_u, indexing="ij")
    checks = min(FALL_TABLE_CHECKS, k.size)
    lanes_k = np.concatenate([np.exp(grid_k.ravel()), k[:checks]])
    lanes_u = np.concatenate([grid_u.ravel(), wind_speed[:checks]])
    base = wind_field(settings.wind, lanes_u)
    solved = solve_falls(
        settings.height, np.zeros(3), lanes_k, gravity=settings.gravity,
        wind=replace(base, toward_east=1.0, toward_north=0.0),
        tolerance=ZONE_TOLERANCE, max_distance=CARRIED_AWAY,
    )  # fmt: skip
    if not np.all(solved.landed):
        return None
    weights_k = _chebyshev_weights(log_k, *span_k, nodes_k.size)
    weights_u = _chebyshev_weights(wind_speed, *span_u, nodes_u.size)
    table = grid_k.size

    x, t, v = solved.position[0], solved.time, solved.velocity
    # Tensor-product interpolation of the four tabled quantities at once: (n, k nodes) @
    # (k nodes, 4 x U nodes), then summed against the U weights.
    tables = np.stack([q[:table].reshape(grid_k.shape) for q in (x, t, v[0], v[2])], axis=1)
    along_k = (weights_k @ tables.reshape(nodes_k.size, -1)).reshape(k.size, 4, nodes_u.size)
    drift, time, along, down = (along_k * weights_u[:, None, :]).sum(axis=2).T

    def turned(
        drift: np.ndarray,
        time: np.ndarray,
        along: np.ndarray,
        down: np.ndarray,
        toward_deg: np.ndarray,
    ) -> FallSolution:
        toward = np.radians(toward_deg)
        east, north = np.sin(toward), np.cos(toward)
        n = drift.size
        return FallSolution(
            time,
            np.vstack([drift * east, drift * north, np.zeros(n)]),
            np.vstack([along * east, along * north, down]),
            np.ones(n, dtype=bool),
            np.zeros(n, dtype=np.int64),
        )

    tabled = turned(drift, time, along, down, wind_toward)
    direct = turned(x[table:], t[table:], v[0, table:], v[2, table:], wind_toward[:checks])
    return tabled, direct


def _rest_after_landing(
    solution: FallSolution, draw: LandingDraw, obj: ZoneObject, settings: ZoneSettings
) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Add the travel after the first contact: rest offsets (2, n), air drift (n), landed (n).

    The first contact is a planar rigid-body impact at the drawn orientation, then hops, a
    slide or a roll, or fragments for an object that breaks
    (:func:`dropcalc.physics.contact.after_landing`). A body that slides or rolls away down a
    slope without stopping counts as carried away.
    """
    landing = solution.position[:2]
    drift = np.hypot(landing[0], landing[1])
    velocity = np.where(solution.landed, solution.velocity, 0.0)
    # A straight drop in still air has no horizontal direction: the planar impact then picks
    # its own (the lever arm's); the edge's outward direction stands in where none exists.
    out = math.radians(settings.edge_azimuth)
    still = np.hypot(velocity[0], velocity[1]) <= 1e-12
    velocity = velocity.copy()
    velocity[0] = np.where(still, 0.0, velocity[0])
    travel = contact.after_landing(
        velocity,
        obj.body,
        contact.Ground(
            draw.restitution, draw.friction, draw.rolling_resistance, settings.ground_slope
        ),
        draw.rotation,
        gravity=settings.gravity,
        break_speed=obj.break_speed,
        fragment_speed=draw.fragment_speed,
        fragment_angle=draw.fragment_angle,
        fragment_azimuth=draw.fragment_azimuth,
        heading=np.vstack([np.full(still.size, math.sin(out)), np.full(still.size, math.cos(out))]),
        rolls=obj.rolls,
    )
    rest = landing + travel.offset  # infinite where a body never stops on the slope
    rest[:, ~solution.landed] = np.nan
    drift = np.where(solution.landed, drift, np.nan)  # abandoned samples did not land
    return rest, drift, solution.landed


def sample_object(
    obj: ZoneObject, settings: ZoneSettings, n: int, rng: np.random.Generator
) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Draw ``n`` drops of one object: rest offsets (2, n), air drift (n), landed (n)."""
    return _sample_object(obj, settings, n, rng)[:3]


def _sample_object(
    obj: ZoneObject, settings: ZoneSettings, n: int, rng: np.random.Generator
) -> tuple[np.ndarray, np.ndarray, np.ndarray, float, FallSolution, LandingDraw]:
    """:func:`sample_object` with the fall table's error [m], the landings and the draw."""
    unc = settings.uncertainty
    mean, gust = _mean_and_gust(settings)
    i_v = _turbulence(settings)
    if mean > 0 and i_v > 0:
        z_high = (gust / mean - 1.0) / i_v
        z = _truncated_normal(rng, n, -1.0 / i_v, z_high)
        wind_speed = np.clip(mean * (1.0 + i_v * z), 0.0, gust)
    else:
        wind_speed = np.full(n, mean)
    base_toward = float(opposite_azimuth(settings.wind.from_direction_deg))
    spread = unc.direction_spread
    toward = (
        base_toward + spread * _truncated_normal(rng, n, -3.0, 3.0)
        if spread
        else np.full(n, base_toward)
    )
    drag_area = rng.uniform(obj.drag_area_min, obj.drag_area_max, n) * rng.uniform(
        1 - unc.drag_coefficient_spread, 1 + unc.drag_coefficient_spread, n
    )
    density = settings.air.density * rng.uniform(1 - unc.density_spread, 1 + unc.density_spread, n)
    velocity0 = _release_velocities(settings, n, rng)
    draw = draw_landing(obj, settings.ground, n, rng)
    if obj.plate is not None:  # a sheet: its attitude and spin are sampled too
        from dropcalc.analysis.plate_flight import land_plates, sample_attitudes

        spread = unc.drag_coefficient_spread
        cd_factor = rng.uniform(1 - spread, 1 + spread, n)  # scales every plate coefficient
        attitude = sample_attitudes(obj.plate, n, rng, settings.gravity)
        solution = land_plates(
            obj.plate, obj.mass, density * cd_factor, wind_speed, toward, velocity0, settings,
            *attitude,
        )  # fmt: skip
        return (*_rest_after_landing(solution, draw, obj, settings), 0.0, solution, draw)
    return (
        *_rest_positions(
            np.full(n, obj.mass), drag_area, density, wind_speed, toward, velocity0, draw, obj,
            settings,
        ),
        draw,
    )  # fmt: skip


def _first_lanes(solution: FallSolution, m: int) -> FallSolution:
    """The first m landings of a solution."""
    return FallSolution(
        solution.time[:m], solution.position[:, :m], solution.velocity[:, :m],
        solution.landed[:m], solution.steps[:m],
    )  # fmt: skip


def _sensitivity(
    obj: ZoneObject, settings: ZoneSettings, solution: FallSolution, draw: LandingDraw
) -> tuple[Sensitivity, ...]:
    """The radius with each after-landing input held at the ends of its range.

    The same landings and the same other draws are used for every row (common random
    numbers), so the rows differ only by the input held.
    """
    from dataclasses import replace

    ground, material = settings.ground, obj.material_class
    m = solution.time.size
    restitution = (
        material.restitution[0] * ground.restitution_factor[0],
        material.restitution[1] * ground.restitution_factor[1],
    )
    # (name, field of the draw, low end, high end)
    inputs = [
        ("restitution", "restitution", *restitution),
        ("friction", "friction", *ground.friction),
    ]
    if obj.rolls:
        inputs.append(("rolling_resistance", "rolling_resistance", *ground.rolling_resistance))
    if obj.break_speed is not None:
        inputs.append(("fragment_speed", "fragment_speed", *contact.FRAGMENT_SPEED_FRACTION))

    # Every variant of the draw, stacked into one call (one pass over the landings).
    variants = []
    for _name, field_name, low, high in inputs:
        for end in (low, high):
            variants.append(replace(draw, **{field_name: np.full(m, end)}))
    # Every input at the end that gives the shorter travel, then the longer: low restitution,
    # high friction and rolling resistance, slow fragments, and the other way round.
    ends = {
        "restitution": (restitution[0], restitution[1]),
        "friction": (ground.friction[1], ground.friction[0]),
        "rolling_resistance": (ground.rolling_resistance[1], ground.rolling_resistance[0]),
        "fragment_speed": contact.FRAGMENT_SPEED_FRACTION,
    }
    for k in (0, 1):
        variants.append(replace(draw, **{key: np.full(m, pair[k]) for key, pair in ends.items()}))
    fields = draw.__dataclass_fields__
    stacked = LandingDraw(*(np.concatenate([getattr(v, f) for v in variants]) for f in fields))
    lanes = np.tile(np.arange(m), len(variants))
    tiled = FallSolution(
        solution.time[lanes], solution.position[:, lanes], solution.velocity[:, lanes],
        solution.landed[lanes], solution.steps[lanes],
    )  # fmt: skip
    rest, _, _ = _rest_after_landing(tiled, stacked, obj, settings)
    distance = np.hypot(rest[0], rest[1]).reshape(len(variants), m)
    radii = [quantile_with_error(d, settings.confidence)[0] + settings.margin for d in distance]
    rows = [
        Sensitivity(name, float(low), float(high), radii[2 * i], radii[2 * i + 1])
        for i, (name, _field, low, high) in enumerate(inputs)
    ]
    rows.append(Sensitivity("all", math.nan, math.nan, radii[-2], radii[-1]))
    return tuple(rows)


def quantile_with_error(distances: np.ndarray, p: float) -> tuple[float, float]:
    """The p-quantile of the distances and its standard error [m].

    The standard error comes from the distribution-free confidence interval of a quantile: the
    number of samples below the p-quantile is binomial (n, p), so the order statistics at the
    binomial's 2.5 % and 97.5 % points (lower rank l = B^-1(0.025), upper rank
    u = B^-1(0.975) + 1, counted from 1) bound a 95 % interval (Hahn and Meeker, *Statistical
    Intervals* (1991), sec. 5.2; the binomial quantiles from ``scipy.stats.binom``), and
    SE ~ (upper - lower) / (2 x 1.96), the normal interval's half-width over its z.
    Carried-away samples (NaN) count as infinitely far.
    """
    from scipy.stats import binom

    d = np.where(np.isnan(distances), np.inf, distances)
    n = d.size
    lower, upper = binom.ppf([0.025, 0.975], n, p)
    ranks = np.array([lower, round(n * p), upper + 1.0])  # 1-based order statistics
    idx = np.clip(ranks.astype(int) - 1, 0, n - 1)
    values = np.partition(d, np.unique(idx))[idx]
    if not np.all(np.isfinite(values)):  # the interval reaches carried-away samples
        return float(values[1]), math.inf
    return float(values[1]), float((values[2] - values[0]) / (2 * 1.96))


# --------------------------------------------------------------------------------------------
# Envelope


def envelope_distance(obj: ZoneObject, settings: ZoneSettings) -> float:
    """Rest distance [m] of the deterministic envelope (margin not included).

    Every sampled input is put at the end of its range that carries the object furthest: the
    gust speed blowing straight out from the edge, the highest release speed pointing straight
    out, the drag area over its whole range widened by the Cd spread and by the air density's
    spread (a fall depends on both only through their product), the throw angle over its
    range, both ends of the restitution and friction ranges, the lowest rolling resistance,
    the fastest fragments and the orientation at the first contact over a grid
    (:func:`_farthest_rest`). The drag area and throw angle are searched on a
    grid refined twice around the farthest point (the farthest landing need not be at either
    end of a range when a push and the wind compete); the search is good to well under a
    millimetre and :data:`ENVELOPE_SEARCH_ALLOWANCE` is added for it.
    """
    from dataclasses import replace

    if obj.plate is not None:  # a sheet: the attitude is searched too
        from dropcalc.analysis.plate_flight import plate_envelope_distance

        return plate_envelope_distance(obj, settings, _farthest_rest) + ENVELOPE_SEARCH_ALLOWANCE
    unc = settings.uncertainty
    _, gust = _mean_and_gust(settings)
    release = settings.release
    if release.mode == "roof-slide" and float(release.friction) > 0:
        release = replace(release, friction=float(release.friction) * (1 - unc.friction_spread))
    # A fall depends on the air density and the drag area only through k = rho C_d A / (2 m):
    # the density's range is folded into the drag area's, searched at the mean density.
    log_area = (
        math.log(obj.drag_area_min * (1 - unc.drag_coefficient_spread) * (1 - unc.density_spread)),
        math.log(obj.drag_area_max * (1 + unc.drag_coefficient_spread) * (1 + unc.density_spread)),
    )
    throw = release.mode == "throw"
    angle_range = (
        (
            max(float(release.angle) - unc.release_angle_spread, -90.0),
            min(float(release.angle) + unc.release_angle_spread, 90.0),
        )
        if throw
        else (0.0, 0.0)
    )
    densities = np.array([settings.air.density])

    def farthest(areas_log: np.ndarray, angles: np.ndarray) -> tuple[float, int, int]:
        a_grid, d_grid, t_grid = np.meshgrid(areas_log, densities, angles, indexing="ij")
        a_flat, d_flat, t_flat = a_grid.ravel(), d_grid.ravel(), t_grid.ravel()
        if throw:
            v0 = np.asarray(
                initial_velocity(replace(release, angle=t_flat), settings.edge_azimuth,
                                 settings.gravity), dtype=float,
            )  # fmt: skip
        else:
            v0 = np.asarray(
                initial_velocity(release, settings.edge_azimuth, settings.gravity), dtype=float
            ).reshape(3, 1) * np.ones((1, a_flat.size))
        m = a_flat.size
        solution = _land(
            np.full(m, obj.mass), np.exp(a_flat), d_flat, np.full(m, gust),
            np.full(m, settings.edge_azimuth), v0, settings,
        )  # fmt: skip
        if not np.all(solution.landed):
            return math.inf, 0, 0
        distance = _farthest_rest(solution, obj, settings)
        lane = int(np.argmax(distance))
        leaders.append(
            FallSolution(
                solution.time[[lane]], solution.position[:, [lane]],
                solution.velocity[:, [lane]], solution.landed[[lane]], solution.steps[[lane]],
            )
        )  # fmt: skip
        distance = distance.reshape(a_grid.shape)
        i, _, j = np.unravel_index(int(np.argmax(distance)), distance.shape)
        return float(distance.max()), int(i), int(j)

    # A grid over the drag area and throw angle ranges, then two finer grids around the
    # farthest point: the farthest landing need not be at either end of a range when a push or
    # throw and the wind compete.
    a_lo, a_hi = log_area
    t_lo, t_hi = angle_range
    best = -math.inf
    leaders: list[FallSolution] = []  # the farthest landing of each round
    points = 17
    for _ in range(3):
        areas_log = np.linspace(a_lo, a_hi, points)
        angles = np.linspace(t_lo, t_hi, points if throw else 1)
        found, i, j = farthest(areas_log, angles)
        if not math.isfinite(found):
            return math.inf
        best = max(best, found)
        area_step = (a_hi - a_lo) / (points - 1)
        angle_step = (t_hi - t_lo) / (points - 1) if throw else 0.0
        a_lo, a_hi = (
            max(log_area[0], areas_log[i] - area_step),
            min(log_area[1], areas_log[i] + area_step),
        )
        if throw:
            t_lo = max(angle_range[0], angles[j] - angle_step)
            t_hi = min(angle_range[1], angles[j] + angle_step)
    # The farthest landing of the last, finest round again with the fine orientation grid.
    best = max(best, float(_farthest_rest(leaders[-1], obj, settings, fine=True)[0]))
    return best + ENVELOPE_SEARCH_ALLOWANCE


#: Orientation grid of the envelope's search at the first contact: down directions (a
#: Fibonacci lattice on the sphere) x turns about the vertical, coarse for every candidate
#: landing and fine for the farthest one.
ORIENTATION_GRID = ((12, 4), (240, 12))
#: Fragment launch angles searched by the envelope (over :data:`contact.FRAGMENT_ANGLE`).
FRAGMENT_ANGLE_POINTS = 31


def _orientation_grid(downs: int, turns: int) -> np.ndarray:
    """Rotation matrices (downs x turns, 3, 3) spread over all rotations."""
    k = np.arange(downs) + 0.5
    polar = np.arccos(1.0 - 2.0 * k / downs)
    azimuth = np.pi * (1.0 + math.sqrt(5.0)) * k
    down = np.vstack(
        [np.sin(polar) * np.cos(azimuth), np.sin(polar) * np.sin(azimuth), np.cos(polar)]
    )
    spin = np.linspace(0.0, 2.0 * np.pi, turns, endpoint=False)
    return contact.orientations(np.repeat(down, turns, axis=1), np.tile(spin, downs))


def _farthest_rest(
    solution: FallSolution, obj: ZoneObject, settings: ZoneSettings, *, fine: bool = False
) -> np.ndarray:
    """Farthest rest distance [m] of each landing over the after-landing inputs.

    The orientation at the first contact is searched over a grid of rotations
    (:data:`ORIENTATION_GRID`), the restitution and friction at both ends of their ranges (the
    impact is not monotone in them), the rolling resistance at its low end; an object that
    breaks throws its fragment at the top launch speed, at the farthest launch angle, straight
    away from the release point.
    """
    ground, material = settings.ground, obj.material_class
    n = solution.time.size
    downs, turns = ORIENTATION_GRID[1 if fine else 0]
    grid = _orientation_grid(downs, turns)
    corners = [
        (e, mu)
        for e in (
            material.restitution[0] * ground.restitution_factor[0],
            material.restitution[1] * ground.restitution_factor[1],
        )
        for mu in ground.friction
    ]
    g = grid.shape[0] * len(corners)
    lanes = np.repeat(np.arange(n), g)
    rotation = np.tile(grid, (n * len(corners), 1, 1))
    corner_e = np.tile(np.repeat([c[0] for c in corners], grid.shape[0]), n)
    corner_mu = np.tile(np.repeat([c[1] for c in corners], grid.shape[0]), n)
    landing = solution.position[:2]
    away = np.arctan2(landing[0], landing[1])  # compass direction of the landing point
    away = np.where(np.hypot(landing[0], landing[1]) > 0, away, math.radians(settings.edge_azimuth))
    sub = FallSolution(
        solution.time[lanes], solution.position[:, lanes], solution.velocity[:, lanes],
        solution.landed[lanes], solution.steps[lanes],
    )  # fmt: skip
    draw = LandingDraw(
        restitution=corner_e,
        friction=corner_mu,
        rolling_resistance=np.full(lanes.size, ground.rolling_resistance[0]),
        rotation=rotation,
        fragment_speed=np.full(lanes.size, contact.FRAGMENT_SPEED_FRACTION[1]),
        fragment_angle=np.full(lanes.size, 45.0),
        fragment_azimuth=away[lanes],
    )
    rest, _, _ = _rest_after_landing(sub, draw, obj, settings)
    distance = np.hypot(rest[0], rest[1])
    distance = np.where(np.isnan(distance) & solution.landed[lanes], np.inf, distance)
    best = np.max(distance.reshape(n, g), axis=1)
    if obj.break_speed is not None:
        # The fragment's throw at every launch angle, the farthest taken.
        v = solution.velocity
        impact = np.sqrt(np.sum(v * v, axis=0))
        angles = np.linspace(*contact.FRAGMENT_ANGLE, FRAGMENT_ANGLE_POINTS)[:, None]
        throws = np.max(
            contact.fragment_travel(
                impact[None, :], np.asarray(contact.FRAGMENT_SPEED_FRACTION[1]), angles,
                np.asarray(ground.friction[0]),
                np.asarray(material.restitution[0] * ground.restitution_factor[0]),
                math.radians(settings.ground_slope), gravity=settings.gravity,
            ),
            axis=0,
        )  # fmt: skip
        broke = impact > obj.break_speed
        best = np.where(broke, np.hypot(landing[0], landing[1]) + throws, best)
    return np.asarray(best, dtype=float)


# --------------------------------------------------------------------------------------------
# The zone


def compute_zone(
    objects: Sequence[ZoneObject],
    settings: ZoneSettings,
    progress: Callable[[int, int], None] | None = None,
    *,
    envelope: bool = True,
) -> ZoneResult:
    """Exclusion zone for the objects: per-object quantiles, envelope, and the driving object.

    Each object is sampled on its own and its quantile of rest distance taken. With several
    objects a pilot round (:data:`PILOT_SAMPLES`, at least 10 / (1 - p)) screens out those whose
    quantile lies more than :data:`SCREEN_SIGMAS` standard errors short of the leader's: they keep
    their pilot figures (with the pilot's larger standard error). The others get a full round
    (``INITIAL_SAMPLES``, at least 50 / (1 - p)), and sampling doubles for the objects that
    could still drive the zone until the driving quantile's standard error is below
    ``relative_error`` of it (or ``max_samples``). The zone radius is the largest per-object
    radius: every object listed is covered at the confidence, not just the mixture. Straight
    drops read their landings from a fall table (:func:`_land_by_table`); the largest error of
    it measured against direct solves is added to the reported standard error.

    Parameters
    ----------
    objects : sequence of ZoneObject
        The objects in use at the edge.
    settings : ZoneSettings
        Release, wind, air, ground, confidence, margin and sampling.
    progress : callable, optional
        Called with (samples done, samples planned) after each round.
    envelope : bool
        Compute the deterministic envelope (``worst_case``); without it ``worst_case`` is NaN.
        The inverse questions (:func:`highest_wind`, :func:`greatest_height`) need only the
        radius.

    Returns
    -------
    ZoneResult
    """
    if not objects:
        raise InputError("the zone needs at least one object")
    rng = np.random.default_rng(settings.seed)
    p = settings.confidence
    offsets: list[list[np.ndarray]] = [[] for _ in objects]
    landings: list[tuple[FallSolution, LandingDraw] | None] = [None for _ in objects]
    drifts: list[list[np.ndarray]] = [[] for _ in objects]
    reuse = np.zeros(len(objects))  # largest fall-table error of each object [m]
    counts = np.zeros(len(objects), dtype=int)

    def sample(indices: list[int], target: int) -> None:
        for i in indices:
            need = target - counts[i]
            rest, drift, _, error, solution, draw = _sample_object(objects[i], settings, need, rng)
            if not offsets[i]:
                m = min(need, SENSITIVITY_SAMPLES)
                landings[i] = (_first_lanes(solution, m), draw.take(np.arange(m)))
            offsets[i].append(rest)
            drifts[i].append(drift)
            reuse[i] = max(reuse[i], error)
            counts[i] = target
        if progress is not None:
            progress(int(counts.sum()), int(counts.sum()))

    def statistics() -> tuple[np.ndarray, np.ndarray]:
        found = [
            quantile_with_error(np.hypot(*np.concatenate(offsets[i], axis=1)), p)
            for i in range(len(objects))
        ]
        return np.array([q for q, _ in found]), np.array([e for _, e in found]) + reuse

    def could_drive(q: np.ndarray, se: np.ndarray, sigmas: float) -> list[int]:
        lead = int(np.argmax(q))
        with np.errstate(invalid="ignore"):  # inf - inf where samples were carried away
            return [
                i
                for i in range(len(objects))
                if not q[i] + sigmas * se[i] < q[lead] - sigmas * se[lead]
            ]

    # Screen: a pilot round for every object; only those that could still drive the zone go on.
    full = min(max(INITIAL_SAMPLES, math.ceil(TAIL_SAMPLES / (1 - p))), settings.max_samples)
    pilot = min(max(PILOT_SAMPLES, math.ceil(PILOT_TAIL_SAMPLES / (1 - p))), full)
    active = list(range(len(objects)))
    if len(objects) > 1 and pilot < full:
        sample(active, pilot)
        active = could_drive(*statistics(), SCREEN_SIGMAS)
    # Refine: sampling doubles for the contenders until the driving quantile is settled.
    target = full
    while active:
        sample(active, target)
        q, se = statistics()
        unsure = [
            i for i in could_drive(q, se, 2.0)
            if math.isfinite(q[i])  # a quantile among carried-away samples is settled: no zone
            and se[i] > settings.relative_error * max(q[i], 1e-3)
            and counts[i] < settings.max_samples
        ]  # fmt: skip
        active = unsure
        target = min(target * 2, settings.max_samples)
    zones = []
    for i, obj in enumerate(objects):
        rest = np.concatenate(offsets[i], axis=1)
        distance = np.hypot(rest[0], rest[1])
        q_rest, se_rest = quantile_with_error(distance, p)
        q_drift, _ = quantile_with_error(np.concatenate(drifts[i]), p)
        carried = float(np.mean(np.isnan(distance)))
        rolled_away = float(np.mean(np.isinf(distance)))
        worst = envelope_distance(obj, settings) if envelope else math.nan
        finite = distance[np.isfinite(distance)]
        if obj.plate is not None and envelope and finite.size:  # a sheet's path is chaotic
            worst = max(worst, float(finite.max()))
        zones.append(
            ObjectZone(
                obj=obj,
                radius=q_rest + settings.margin,
                drift=min(q_drift, q_rest),
                scatter=(
                    max(q_rest - q_drift, 0.0)
                    if math.isfinite(q_rest) and math.isfinite(q_drift)
                    else math.inf
                ),
                standard_error=se_rest + reuse[i],
                samples=int(distance.size),
                max_sampled=float(finite.max()) if finite.size else math.inf,
                worst_case=worst + settings.margin,
                carried_away=carried,
                offsets=rest,
                rolled_away=rolled_away,
            )
        )
    lead = max(range(len(zones)), key=lambda k: zones[k].radius)
    stored = landings[lead]
    if envelope and stored is not None:  # the full zone, not an inverse question's trial
        from dataclasses import replace

        zones[lead] = replace(
            zones[lead], sensitivity=_sensitivity(objects[lead], settings, *stored)
        )
    driver = zones[lead]
    worst_zone = driver if not envelope else max(zones, key=lambda z: z.worst_case)
    mean, gust = _mean_and_gust(settings)
    return ZoneResult(settings, tuple(zones), driver, worst_zone, gust, _turbulence(settings))


def highest_wind(
    objects: Sequence[ZoneObject],
    settings: ZoneSettings,
    distance: float,
    low: float = 0.0,
    high: float = 60.0,
) -> float:
    """Highest mean wind at 10 m [m/s] for which the zone radius stays within ``distance``.

    Regula falsi (:func:`_shrink_bracket`) on the wind speed with the same random numbers at
    every trial (common random numbers keep the radius a smooth, increasing function of the
    speed), to 0.05 m/s; 0 when even still air needs more, ``high`` when even that fits.
    """
    from dataclasses import replace

    def radius_at(speed: float) -> float:
        wind = replace(settings.wind, speed_10m=speed, kind="mean")
        trial = replace(settings.with_conditions(wind=wind), max_samples=INITIAL_SAMPLES)
        return compute_zone(objects, trial, envelope=False).radius

    def excess(speed: float) -> float:
        # log(radius / distance): the radius stays near its still-air value and then grows
        # steeply with the speed; on the log the regula falsi needs fewer steps.
        return _log_excess(radius_at(speed), distance)

    at_low = excess(low)
    if at_low > 0:
        return low
    at_high = excess(high)
    if at_high <= 0:
        return high
    low, _ = _shrink_bracket(excess, (low, at_low), (high, at_high), lambda lo, hi: hi - lo < 0.05)
    return low


def _log_excess(radius: float, distance: float) -> float:
    """log(radius / distance), which has the sign of radius - distance (-inf for 0)."""
    if distance <= 0:
        return radius - distance
    with np.errstate(divide="ignore"):
        return float(np.log(radius) - np.log(distance))


def still_air_radius(objects: Sequence[ZoneObject], settings: ZoneSettings) -> float:
    """The zone radius [m] at the settings' height in still air (same samples as the limits).

    The distance a barricade needs when even still air needs more than it (where
    :func:`highest_wind` returns 0).
    """
    from dataclasses import replace

    wind = replace(settings.wind, speed_10m=0.0, kind="mean")
    return compute_zone(
        objects,
        replace(settings.with_conditions(wind=wind), max_samples=INITIAL_SAMPLES),
        envelope=False,
    ).radius


def greatest_height(
    objects: Sequence[ZoneObject],
    settings: ZoneSettings,
    distance: float,
    low: float = 0.5,
    high: float = 500.0,
) -> float:
    """Greatest work height [m] for which the zone radius stays within ``distance``.

    Regula falsi (:func:`_shrink_bracket`) on the logarithm of the height with common random
    numbers, to 0.2 %; 0 when even ``low`` needs more, ``high`` when even that fits.
    """
    from dataclasses import replace

    def radius_at(height: float) -> float:
        return compute_zone(
            objects,
            replace(settings, height=height, max_samples=INITIAL_SAMPLES),
            envelope=False,
        ).radius

    def excess(log_height: float) -> float:
        # log(radius / distance): nearly linear in log(height), as the radius grows about as a
        # power of the height; the regula falsi then needs few steps.
        return _log_excess(radius_at(math.exp(log_height)), distance)

    at_low = excess(math.log(low))
    if at_low > 0:
        return 0.0
    at_high = excess(math.log(high))
    if at_high <= 0:
        return high
    log_low, _ = _shrink_bracket(
        excess,
        (math.log(low), at_low), (math.log(high), at_high),
        lambda lo, hi: hi - lo < math.log(1.002),
    )  # fmt: skip
    return math.exp(log_low)


def _shrink_bracket(
    f: Callable[[float], float],
    low: tuple[float, float],
    high: tuple[float, float],
    close_enough: Callable[[float, float], bool],
) -> tuple[float, float]:
    """Shrink a bracket with f(low) <= 0 < f(high) until ``close_enough(low, high)``.

    Regula falsi, Illinois variant: the value kept at the end that did not move is halved, so
    both ends close in ([DJ-1971]); a bisection step wherever f is infinite (carried away).
    On a smooth monotone f it needs a handful of evaluations where bisection needs a dozen.
    """
    (lo, f_lo), (hi, f_hi) = low, high
    side = 0
    for _ in range(60):
        if close_enough(lo, hi):
            break
        width = hi - lo
        x = lo + 0.5 * width
        if math.isfinite(f_lo) and math.isfinite(f_hi) and f_hi > f_lo:
            # Keep a step off the ends, where a secant step gains least.
            x = min(max(hi - f_hi * width / (f_hi - f_lo), lo + 0.02 * width), hi - 0.02 * width)
        fx = f(x)
        if fx <= 0:
            lo, f_lo = x, fx
            f_hi = 0.5 * f_hi if side == -1 else f_hi
            side = -1
        else:
            hi, f_hi = x, fx
            f_lo = 0.5 * f_lo if side == 1 else f_lo
            side = 1
    return lo, hi


@dataclass(frozen=True)
class SiteZone:
    """The exclusion area around a site: per-segment zones and their union on the plan."""

    area: ExclusionArea
    segments: tuple[tuple[str, int, ZoneResult], ...]  # (edge name, segment index, zone)
    driver: tuple[str, int, ZoneResult]  # the segment with the widest radius

    @property
    def radius(self) -> float:
        """Widest exclusion radius over the segments [m], margin included."""
        return self.driver[2].radius

    @property
    def worst_case(self) -> float:
        """Widest envelope radius over the segments [m], margin included."""
        return max(z.worst_case for _, _, z in self.segments)


def site_zone(
    objects: Sequence[ZoneObject],
    settings: ZoneSettings,
    site: Site,
    progress: Callable[[int, int], None] | None = None,
    wind_outward: bool = False,
) -> SiteZone:
    """Exclusion area on the plan: a zone for every segment of every work edge, swept along it.

    Each segment gets its own Monte Carlo (its height and its outward direction, with the wind
    of the day); each object's rest positions give a footprint holding the confidence share of
    them (:func:`dropcalc.analysis.plan.footprint`), swept along the segment and joined with the
    others,
    plus the margin (:func:`dropcalc.analysis.plan.exclusion_area`). With ``wind_outward`` the wind
    blows straight out from each segment in turn (the conservative choice when the direction of
    the day is not known); otherwise it keeps the direction in ``settings``.
    """
    from dataclasses import replace

    from dropcalc.analysis.plan import exclusion_area, footprint, segment_normals

    segments = []
    footprints = []
    solved: dict[tuple[float, float], ZoneResult] = {}
    for e, edge in enumerate(site.edges):
        for i, (nx, ny) in enumerate(segment_normals(site, edge)):
            azimuth = math.degrees(math.atan2(nx, ny)) % 360.0
            local = replace(settings.with_conditions(edge_azimuth=azimuth), height=edge.height)
            if wind_outward:
                # No wind direction given: the conservative one for this segment, straight out.
                outward = float(opposite_azimuth(azimuth))
                wind = replace(settings.wind, from_direction_deg=outward)
                local = local.with_conditions(wind=wind)
            # A segment with the same height and the same wind relative to its edge as one
            # already solved gets that zone turned to its own azimuth (everything sampled is
            # either relative to the edge and the wind or uniform in direction).
            relative = (local.wind.from_direction_deg - azimuth) % 360.0
            key = (edge.height, round(relative, 9) if local.wind.speed_10m else 0.0)
            if key in solved:
                result = _turned(solved[key], local)
            else:
                result = solved[key] = compute_zone(objects, local, progress)
            segments.append((edge.name, i, result))
            for zone_ in result.objects:
                rest = zone_.offsets[:, np.all(np.isfinite(zone_.offsets), axis=0)]
                if rest.shape[1] >= 3:
                    footprints.append((e, i, footprint(rest.T, settings.confidence)))
    area = exclusion_area(site, footprints, settings.margin)
    driver = max(segments, key=lambda item: item[2].radius)
    return SiteZone(area, tuple(segments), driver)


def _turned(result: ZoneResult, settings: ZoneSettings) -> ZoneResult:
    """A zone turned about the release point to the edge azimuth of ``settings``."""
    from dataclasses import replace

    angle = math.radians(settings.edge_azimuth - result.settings.edge_azimuth)
    c, s = math.cos(angle), math.sin(angle)
    # Compass bearings turn clockwise: (east, north) -> (e cos + n sin, -e sin + n cos).
    turn = np.array([[c, s], [-s, c]])
    objects = tuple(replace(zone_, offsets=turn @ zone_.offsets) for zone_ in result.objects)
    by_name = {id(old): new for old, new in zip(result.objects, objects, strict=True)}
    return replace(
        result,
        settings=settings,
        objects=objects,
        driver=by_name[id(result.driver)],
        worst_case_driver=by_name.get(id(result.worst_case_driver), result.worst_case_driver),
    )


def zone_object(obj: DropObject) -> ZoneObject:
    """The zone's view of a library object (:class:`dropcalc.io.library.DropObject`)."""
    from dropcalc.physics.plate import plate_dimensions

    return ZoneObject(
        name=obj.name,
        mass=obj.mass,
        drag_area_min=obj.drag_area_min,
        drag_area_max=obj.drag_area_max,
        object_id=obj.id,
        fragile=obj.fragile,
        rolls="rolls" in obj.hazards,
        glides=obj.glides,
        plate=plate_dimensions(obj.shape, obj.dimensions),
        shape=obj.shape,
        dimensions=tuple(sorted(obj.dimensions.items())),
        material=obj.material,
    )


def zone_objects_from_items(items: Sequence[Item], library: Library) -> list[ZoneObject]:
    """Zone objects for batch items: library ones with their properties, custom ones as given."""
    objects = []
    for item in items:
        if item.object_id:
            found = zone_object(library.get(item.object_id))
            objects.append(
                ZoneObject(**{**found.__dict__, "quantity": item.quantity, "name": item.label})
            )
        else:
            objects.append(
                ZoneObject(
                    name=item.label or f"row {item.row}",
                    mass=item.mass,
                    drag_area_min=item.drag_area_min,
                    drag_area_max=item.drag_area_max,
                    quantity=item.quantity,
                    glides=item.glides,
                    fragile=item.fragile,
                    plate=item.plate,
                )
            )
    return objects
