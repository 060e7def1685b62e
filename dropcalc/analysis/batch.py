"""Checks of a job's object list: every item's impact at both drag bounds, in one array call.

Input rows name a library object (``id``) or describe a custom one (``mass`` with ``drag_area``,
or with ``shape`` and its dimensions). Each good row is solved at the smallest drag area (the
highest impact energy) and at the largest (the longest drift) with the same engine and inputs
as ``dropcalc fall``; it is compared with the energy reference levels, given the greatest
release height at which it stays below each level (an inverse solve on the engine), and a
suggested control from the policy. A bad row gets its reason in the ``error`` column and the
others go on.
"""

from __future__ import annotations

import functools
import math
import re
from collections.abc import Callable, Sequence
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any

import numpy as np

from dropcalc.analysis.fall import wind_field

# The list reader lives in io/items.py (a scenario reads lists too); re-exported for callers.
from dropcalc.io.items import (  # noqa: F401 (re-exported for callers)
    ID_COLUMNS,
    KNOWN_COLUMNS,
    MAX_QUANTITY,
    QUANTITY_COLUMNS,
    TEXT_COLUMNS,
    Item,
    RowError,
    _column_name,
    check_columns,
    check_xlsx,
    parse_items,
    read_table,
)
from dropcalc.model.conditions import Conditions, WithConditions
from dropcalc.model.limits import (
    CARRIED_AWAY_DISTANCE,
    MAX_RELEASE_HEIGHT,
)
from dropcalc.model.policy import DEFAULT_RULES, ControlRule, suggest_control
from dropcalc.model.reference_levels import DEFAULT_LEVEL_KEYS, REFERENCE_LEVELS, ReferenceLevel
from dropcalc.physics.drag import drag_parameter
from dropcalc.physics.impact import impact_from_solution
from dropcalc.physics.release import initial_velocity
from dropcalc.physics.trajectory import FallSolution, solve_falls

if TYPE_CHECKING:
    import pandas as pd


#: Largest release height considered by the inverse solve [m]; above it a level is "never"
#: reached: the largest release height the model accepts.
MAX_INVERSE_HEIGHT = MAX_RELEASE_HEIGHT
#: Relative accuracy of the inverse height solve.
INVERSE_TOLERANCE = 1e-4
#: Iterations of the root solve at most.
MAX_INVERSE_ITERATIONS = 30
#: Rows solved per engine call (the progress bar advances per chunk).
CHUNK_ROWS = 4000


@dataclass(frozen=True)
class BatchSettings(WithConditions):
    """Inputs shared by every row of a batch (SI units).

    Attributes
    ----------
    height : float or None
        Release height for rows without their own ``height``. [m]
    conditions : Conditions
        Air, wind, gravity, release (drop or push for a list) and the edge's direction, read as
        ``settings.wind`` etc.
    levels : tuple of ReferenceLevel
        Levels to compare with and to solve safe heights for.
    rules : tuple of ControlRule
        Control policy, first match wins.
    """

    height: float | None = None
    conditions: Conditions = field(default_factory=Conditions)
    levels: tuple[ReferenceLevel, ...] = tuple(REFERENCE_LEVELS[k] for k in DEFAULT_LEVEL_KEYS)
    rules: tuple[ControlRule, ...] = DEFAULT_RULES


# --------------------------------------------------------------------------------------------
# Solving


def _solve(heights: np.ndarray, k: np.ndarray, settings: BatchSettings) -> FallSolution:
    """Solve the falls from ``heights`` with drag parameters ``k``, each distinct pair once.

    Every row of a batch shares the release, wind and air, so a fall is fixed by its (height,
    k): a list of thousands of rows names a few hundred objects, and the engine solves only the
    distinct pairs (each lane is integrated on its own, so the results are the same).
    """
    pairs, inverse = np.unique(np.stack([heights, k]), axis=1, return_inverse=True)
    inverse = inverse.reshape(-1)
    v0 = np.asarray(
        initial_velocity(settings.release, settings.edge_azimuth, settings.gravity), dtype=float
    )
    distinct = pairs.shape[1]
    solved = solve_falls(
        pairs[0],
        v0.reshape(3, 1) * np.ones((1, distinct)),
        pairs[1],
        max_distance=CARRIED_AWAY_DISTANCE,
        gravity=settings.gravity,
        wind=wind_field(settings.wind, np.full(distinct, settings.wind.speed_10m)),
    )
    return FallSolution(
        solved.time[inverse],
        solved.position[:, inverse],
        solved.velocity[:, inverse],
        solved.landed[inverse],
        solved.steps[inverse],
    )


def _energy_and_slope(
    heights: np.ndarray, masses: np.ndarray, k: np.ndarray, settings: BatchSettings
) -> tuple[np.ndarray, np.ndarray]:
    """Impact energy E [J] from each release height and dE/dH [J/m] there.

    dE/dH = m (v . a) / (-v_z) at impact, with a the acceleration at the ground: exact where the
    motion does not depend on absolute height (still air, uniform wind), a close slope
    otherwise. NaN where the object did not land.
    """
    from dropcalc.physics.wind import speed_ratio

    solution = _solve(heights, k, settings)
    v = solution.velocity
    wind = settings.wind
    ratio = float(
        speed_ratio(
            0.0, wind.profile, wind.exponent or 0.0, wind.roughness_length or 0.05,
            wind.minimum_height,
        )
    )  # fmt: skip
    east, north = wind.towards_unit_vector()
    u = v - np.array([[wind.speed_10m * ratio * east], [wind.speed_10m * ratio * north], [0.0]])
    drag = k * np.sqrt(np.sum(u * u, axis=0))
    a = -drag * u
    a[2] -= settings.gravity
    energy = np.where(solution.landed, 0.5 * masses * np.sum(v * v, axis=0), np.nan)
    with np.errstate(divide="ignore", invalid="ignore"):
        slope = masses * np.sum(v * a, axis=0) / (-v[2])
    return energy, np.where(solution.landed, slope, np.nan)


def safe_heights(
    masses: np.ndarray,
    k: np.ndarray,
    energy_levels: np.ndarray,
    settings: BatchSettings,
) -> np.ndarray:
    """Greatest release height [m] at which the impact energy stays below each level.

    Solved on the engine itself (same wind, release and air as the batch) by Chandrupatla's
    bracketing method on E(H) = level (``scipy.optimize.elementwise.find_root``), vectorised
    over all (item, level) pairs, to a relative accuracy of :data:`INVERSE_TOLERANCE` in
    height. The bracket is grown by doubling from the closed form of a still-air drop,
    H = -(v_t^2 / 2g) ln(1 - v^2/v_t^2) with v^2 = 2E/m (Timmerman and van der Weele 1999).
    Returns ``inf`` where the level cannot be reached (above the highest impact energy
    possible, 1/2 m (v_t + |v_0| + w_ground)^2, or not reached from :data:`MAX_INVERSE_HEIGHT`)
    and 0 where the release alone already carries that energy.

    Parameters
    ----------
    masses, k, energy_levels : numpy.ndarray, shape (n,)
        Mass [kg], drag parameter [1/m] and the energy level [J] of each pair.
    settings : BatchSettings
        Wind, air, gravity and release.
    """
    g = settings.gravity
    n = masses.size
    result = np.full(n, np.nan)
    v0 = np.asarray(
        initial_velocity(settings.release, settings.edge_azimuth, settings.gravity), dtype=float
    ).reshape(-1)[:3]
    speed0 = float(np.linalg.norm(v0))
    with np.errstate(divide="ignore", over="ignore"):
        vt = np.sqrt(g / k)
    # Energy at release already above the level: any height exceeds it.
    result[0.5 * masses * speed0**2 >= energy_levels] = 0.0
    # The energy approaches that of the terminal state, falling at v_t relative to the air and
    # moving with the wind at the ground: 1/2 m (v_t^2 + w_0^2). A drop approaches it from
    # below, so a level at or above it (and above the release energy) is never reached.
    from dropcalc.physics.wind import speed_ratio

    wind = settings.wind
    w0 = wind.speed_10m * float(
        speed_ratio(
            0.0, wind.profile, wind.exponent or 0.0, wind.roughness_length or 0.05,
            wind.minimum_height,
        )
    )  # fmt: skip
    # A drop's vertical speed never exceeds v_t and its horizontal speed never exceeds the
    # fastest wind it passes through (the wind at the top of the range for a profile that grows
    # with height), so 1/2 m (v_t^2 + w_max^2) bounds its energy; a release speed is added to
    # both parts. A level at or above the bound is never reached.
    if wind.profile != "uniform":
        w0 = wind.speed_10m * float(
            speed_ratio(
                MAX_INVERSE_HEIGHT, wind.profile, wind.exponent or 0.0,
                wind.roughness_length or 0.05, wind.minimum_height,
            )
        )  # fmt: skip
    ceiling = 0.5 * masses * ((vt + speed0) ** 2 + (w0 + speed0) ** 2)
    result[np.isnan(result) & (ceiling <= energy_levels)] = np.inf
    # The terminal state in the wind at the ground: levels near or above its energy may
    # plateau out of reach (checked below); levels well under it are reached at some height.
    w_ground = wind.speed_10m * float(
        speed_ratio(
            0.0, wind.profile, wind.exponent or 0.0, wind.roughness_length or 0.05,
            wind.minimum_height,
        )
    )  # fmt: skip
    near_terminal = energy_levels >= 0.9 * 0.5 * masses * (vt**2 + w_ground**2)
    active = np.flatnonzero(np.isnan(result))
    if active.size == 0:
        return result
    m, kk, level = masses[active], k[active], energy_levels[active]
    v2 = 2.0 * level / m
    with np.errstate(divide="ignore", invalid="ignore"):
        vt2 = g / kk
        guess = np.where(v2 < vt2, -vt2 / (2.0 * g) * np.log1p(-v2 / vt2), v2 / (2.0 * g))
    h = np.clip(np.nan_to_num(guess, nan=1.0, posinf=MAX_INVERSE_HEIGHT), 0.01, MAX_INVERSE_HEIGHT)
    hi = np.full(active.size, np.inf)
    done = np.zeros(active.size, dtype=bool)
    # Past ten relaxation lengths v_t^2/g the impact state no longer depends on the height (the
    # object has forgotten its release): if the level is not reached there, it never is.
    plateau = np.minimum(10.0 * vt[active] ** 2 / g + 100.0, MAX_INVERSE_HEIGHT)
    far = np.flatnonzero((plateau > 2.0 * h) & near_terminal[active])
    if far.size:
        energy_far, _ = _energy_and_slope(plateau[far], m[far], kk[far], settings)
        unreached = ~(energy_far >= level[far])
        h[far[unreached]] = np.inf
        done[far[unreached]] = True
        hi[far[~unreached]] = plateau[far[~unreached]]
    # The rest by Chandrupatla's bracketing method on f(H) = E(H) - level (scipy's elementwise
    # root finders, vectorised over the pairs). The bracket's lower end is the edge itself
    # (H = 0: the release energy, below the level); its upper end is the plateau where that was
    # solved, else grown from the closed-form guess up to MAX_INVERSE_HEIGHT, above which the
    # level counts as never reached.
    from scipy.optimize.elementwise import find_root

    speed0_squared = speed0**2

    def excess(
        height: np.ndarray, mass: np.ndarray, drag: np.ndarray, target: np.ndarray
    ) -> np.ndarray:
        height, mass, drag, target = np.broadcast_arrays(np.atleast_1d(height), mass, drag, target)
        energy: np.ndarray = 0.5 * mass * speed0_squared  # at H = 0, the release itself
        falls = height > 0
        if np.any(falls):
            landed, _ = _energy_and_slope(height[falls], mass[falls], drag[falls], settings)
            energy[falls] = np.nan_to_num(landed, nan=0.0)  # not landed counts as below
        difference: np.ndarray = energy - target
        return difference

    todo = np.flatnonzero(~done)
    upper = hi[todo]
    # Grow the upper end from the closed-form guess, doubling, until the level is reached
    # (the guess is close: still air reaches it there exactly).
    trial = np.flatnonzero(~np.isfinite(upper))
    step = h[todo[trial]]
    while trial.size:
        pick = todo[trial]
        reached = excess(step, m[pick], kk[pick], level[pick]) >= 0
        upper[trial[reached]] = step[reached]
        top = ~reached & (step >= MAX_INVERSE_HEIGHT)
        h[pick[top]] = np.inf  # not reached from the highest release height considered
        keep = ~reached & ~top
        trial, step = trial[keep], np.minimum(2.0 * step[keep], MAX_INVERSE_HEIGHT)
    solve = np.isfinite(upper)
    if np.any(solve):
        pick = todo[solve]
        root = find_root(
            excess, (np.zeros(pick.size), upper[solve]),
            tolerances={"xrtol": INVERSE_TOLERANCE, "xatol": 0.0},
            maxiter=MAX_INVERSE_ITERATIONS, args=(m[pick], kk[pick], level[pick]),
        )  # fmt: skip
        h[pick] = root.x
    result[active] = h
    return result


def _energy_equivalents(items: Sequence[Item], level: ReferenceLevel) -> np.ndarray:
    """The impact energy [J] at which each item reaches ``level`` (NaN if not applicable)."""
    if level.quantity == "energy":
        return np.full(len(items), level.value)
    return np.array([level.value * it.contact_area if it.contact_area else np.nan for it in items])


#: Safe heights remembered across chunks at most (a list of custom objects can have as many
#: distinct ones as rows; the memo is emptied when full).
SAFE_HEIGHT_MEMO_SIZE = 100_000


def solve_items(
    items: Sequence[Item],
    settings: BatchSettings,
    progress: Callable[[int, int], None] | None = None,
    memo: dict[tuple[float, float, float], float] | None = None,
) -> list[dict[str, Any]]:
    """Compute the output row of every item (dicts with unit-suffixed keys, unsorted).

    ``memo`` keeps the safe heights solved so far by (mass, k, energy level): a caller that
    solves a long list in parts passes the same dict to every part, so that an object met in
    every part is solved once (the settings must be the same throughout).
    """
    rows: list[dict[str, Any]] = []
    total = len(items)
    memo = {} if memo is None else memo
    for start in range(0, total, CHUNK_ROWS):
        chunk = list(items[start : start + CHUNK_ROWS])
        rows.extend(_solve_chunk(chunk, settings, memo))
        if progress is not None:
            progress(min(start + CHUNK_ROWS, total), total)
    return rows


def _solve_chunk(
    items: Sequence[Item], settings: BatchSettings, memo: dict[tuple[float, float, float], float]
) -> list[dict[str, Any]]:
    n = len(items)
    mass = np.array([it.mass for it in items])
    height = np.array([it.height for it in items])
    area_min = np.array([it.drag_area_min for it in items])
    area_max = np.array([it.drag_area_max for it in items])
    contact = np.array([it.contact_area or np.nan for it in items])
    rho = settings.air.density
    k_min = drag_parameter(rho, area_min, mass)  # highest energy
    k_max = drag_parameter(rho, area_max, mass)  # longest drift
    both_k = np.concatenate([k_min, k_max])
    solution = _solve(np.concatenate([height, height]), both_k, settings)
    wind = wind_field(settings.wind, np.full(2 * n, settings.wind.speed_10m))
    impact = impact_from_solution(
        solution, np.concatenate([mass, mass]), both_k, settings.gravity, wind
    )
    hi, lo = slice(0, n), slice(n, 2 * n)
    energy = impact.kinetic_energy[hi]
    per_area = energy / contact

    # Safe heights for every (item, level) pair, deduplicated on the physics that decides it.
    levels = settings.levels
    level_energy = (
        np.stack([_energy_equivalents(items, lv) for lv in levels]) if levels else np.empty((0, n))
    )
    pair_mass = np.tile(mass, len(levels))
    pair_k = np.tile(k_min, len(levels))
    pair_energy = level_energy.reshape(-1)
    valid = np.isfinite(pair_energy)
    keys = np.stack([pair_mass, pair_k, pair_energy]).T
    safe_pairs = np.full(pair_energy.size, np.nan)
    if np.any(valid):
        unique, inverse = np.unique(keys[valid], axis=0, return_inverse=True)
        pairs = [tuple(key) for key in unique.tolist()]
        missing = [i for i, key in enumerate(pairs) if key not in memo]
        if missing:
            if len(memo) + len(missing) > SAFE_HEIGHT_MEMO_SIZE:
                memo.clear()
            new = unique[missing]
            found = safe_heights(new[:, 0], new[:, 1], new[:, 2], settings)
            memo.update(zip((pairs[i] for i in missing), found.tolist(), strict=True))
        solved = np.array([memo[key] for key in pairs])
        safe_pairs[valid] = solved[inverse.reshape(-1)]
    safe = safe_pairs.reshape(len(levels), n)

    def num(value: float) -> float | None:
        value = float(value)
        return value if math.isfinite(value) else None

    out = []
    for i, item in enumerate(items):
        landed = bool(impact.landed[i])
        exceeded = [
            lv.key
            for j, lv in enumerate(levels)
            if np.isfinite(level_energy[j, i]) and landed and energy[i] >= level_energy[j, i]
        ]
        epa = None if item.contact_area is None else num(per_area[i])
        warnings = []
        if not landed:
            warnings.append(
                f"carried away by the wind: still airborne {CARRIED_AWAY_DISTANCE / 1000:g} km "
                "downwind, no landing can be given"
            )
        if item.glides and item.plate is None:
            warnings.append("sheet or plate: can glide far in wind; drift not conservative")
        if (
            settings.wind.speed_10m > 0
            and float(impact.terminal_speed[lo][i]) < settings.wind.speed_10m
        ):
            warnings.append("windborne: terminal speed below the wind speed")
        row: dict[str, Any] = {
            "row": item.row,
            "label": item.label,
            "id": item.object_id,
            "name": item.name,
            "quantity": item.quantity,
            "mass_kg": item.mass,
            "release_height_m": item.height,
            "drag_area_min_m2": item.drag_area_min,
            "drag_area_max_m2": item.drag_area_max,
            "contact_area_m2": item.contact_area,
            "terminal_speed_max_m_s": num(impact.terminal_speed[hi][i]),
            "terminal_speed_min_m_s": num(impact.terminal_speed[lo][i]),
            "impact_speed_max_m_s": num(impact.impact_speed[hi][i]),
            "impact_speed_min_m_s": num(impact.impact_speed[lo][i]),
            "impact_energy_max_j": num(energy[i]),
            "impact_energy_min_j": num(impact.kinetic_energy[lo][i]),
            "energy_per_contact_area_j_cm2": None if epa is None else epa / 1e4,
            "fall_time_s": num(impact.fall_time[hi][i]),
            "fall_time_max_s": num(impact.fall_time[lo][i]),
            "drift_min_m": num(impact.drift[hi][i]),
            "drift_max_m": num(impact.drift[lo][i]),
            "levels_exceeded": "; ".join(exceeded),
        }
        for j, lv in enumerate(levels):
            value = float(safe[j, i])
            row[f"safe_height_{lv.key.replace('-', '_')}_m"] = (
                None if math.isnan(value) else (value if math.isfinite(value) else "never")
            )
        row["control"] = suggest_control(
            settings.rules, float(energy[i]) if landed else 0.0, epa, item.mass, item.glides
        )
        row["fragile"] = item.fragile
        row["glides"] = item.glides
        row["flight_model"] = "plate" if item.plate is not None else "point mass"
        row["lift_off_speed_m_s"] = None
        row["warnings"] = "; ".join(warnings)
        row["error"] = ""
        out.append(row)
    _plate_rows(out, items, settings)
    return out


def _plate_rows(rows: list[dict[str, Any]], items: Sequence[Item], settings: BatchSettings) -> None:
    """Replace the sheets' point-mass figures by the plate model's over their attitudes.

    One engine call for every sheet of the chunk (:func:`dropcalc.analysis.plate_flight.sweep_rows`,
    the list's wind): the highest and lowest impact energy and speed, the shortest and longest
    drift and fall time. Adds the lift-off wind of each sheet lying on a roof
    (:func:`dropcalc.physics.plate.lift_off_speed`). The safe heights stay the point mass's.
    """
    from dropcalc.analysis.plate_flight import sweep_rows
    from dropcalc.physics.plate import lift_off_speed

    chosen = [i for i, item in enumerate(items) if item.plate is not None]
    if not chosen:
        return
    v0 = np.asarray(
        initial_velocity(settings.release, settings.edge_azimuth, settings.gravity), dtype=float
    )
    sheets = [items[i] for i in chosen]
    # Each distinct sheet (dimensions, mass, height) is flown once: a long list repeats a few.
    keys = np.array(
        [(*it.plate, it.mass, it.height) for it in sheets if it.plate is not None], dtype=float
    )
    distinct, inverse = np.unique(keys, axis=0, return_inverse=True)
    found = sweep_rows(
        [tuple(key[:3]) for key in distinct], distinct[:, 3], distinct[:, 4],
        settings.air.density, settings.wind, settings.wind.speed_10m, settings.edge_azimuth, v0,
        settings.gravity,
    )  # fmt: skip
    for j_row, (i, item) in enumerate(zip(chosen, sheets, strict=True)):
        j = int(inverse.reshape(-1)[j_row])
        row = rows[i]
        length, width = float(distinct[j, 0]), float(distinct[j, 1])
        row["lift_off_speed_m_s"] = float(
            lift_off_speed(item.mass, length * width, settings.air.density, settings.gravity)
        )
        if not found.landed[j]:
            row["drift_max_m"] = None  # carried away at some attitude: no bound
            continue
        energy_max = 0.5 * item.mass * float(found.speed_max[j]) ** 2
        row["impact_speed_max_m_s"] = float(found.speed_max[j])
        row["impact_speed_min_m_s"] = float(found.speed_min[j])
        row["impact_energy_max_j"] = energy_max
        row["impact_energy_min_j"] = 0.5 * item.mass * float(found.speed_min[j]) ** 2
        if item.contact_area is not None:
            row["energy_per_contact_area_j_cm2"] = energy_max / item.contact_area / 1e4
        row["fall_time_s"] = float(found.time_min[j])
        row["fall_time_max_s"] = float(found.time_max[j])
        row["drift_min_m"] = float(found.drift_min[j])
        row["drift_max_m"] = float(found.drift_max[j])
        epa = None if item.contact_area is None else energy_max / item.contact_area
        row["control"] = suggest_control(settings.rules, energy_max, epa, item.mass, item.glides)


def error_rows(errors: Sequence[RowError]) -> list[dict[str, Any]]:
    """Output rows for the rows that failed (only identity and the error filled)."""
    return [
        {"row": e.row, "label": e.label, "id": e.object_id, "error": f"row {e.row}: {e.message}"}
        for e in errors
    ]


def sort_rows(rows: list[dict[str, Any]]) -> list[dict[str, Any]]:
    """Good rows by impact energy (highest first), then the failed rows in input order."""
    good = [r for r in rows if not r.get("error")]
    bad = [r for r in rows if r.get("error")]
    good.sort(key=lambda r: -(r.get("impact_energy_max_j") or 0.0))
    bad.sort(key=lambda r: r["row"])
    return good + bad


# --------------------------------------------------------------------------------------------
# Writing

_FORMULA_START = ("=", "+", "-", "@")
#: Characters XLSX cannot hold and a terminal or spreadsheet may act on (C0, DEL, C1).
_CONTROL_RE = re.compile(r"[\x00-\x1f\x7f-\x9f]")
#: A formula start right after a separator a spreadsheet may split the cell on (a European
#: locale splits CSV on ";"): "Tile;=cmd|' /C calc'!A0".
_SEPARATED_FORMULA_RE = re.compile(r"([,;\t|]\s*)(?=[=+\-@])")


def neutralise(value: Any) -> Any:
    """A text cell made safe for a spreadsheet; other values as they are.

    Control characters are removed (line breaks and tabs become spaces), and an apostrophe is
    put before every start that a spreadsheet would run as a formula: at the start of the cell
    (after any spaces) and after any separator within it. CSV writers also quote every text
    cell, so a separator inside one never splits it.
    """
    if not isinstance(value, str):
        return value
    return _neutral_text(value)


@functools.lru_cache(maxsize=4096)
def _neutral_text(value: str) -> str:
    """:func:`neutralise` of a text (remembered: a long list repeats its names and notes)."""
    text = _CONTROL_RE.sub(lambda match: " " if match.group() in "\t\n\r" else "", value)
    text = _SEPARATED_FORMULA_RE.sub(r"\1'", text)
    return "'" + text if text.lstrip().startswith(_FORMULA_START) else text


def rows_frame(rows: Sequence[dict[str, Any]]) -> pd.DataFrame:
    """The output rows as a DataFrame with a stable column order (text cells neutralised)."""
    import pandas as pd

    columns: list[str] = []
    for row in rows:
        for key in row:
            if key not in columns:
                columns.append(key)
    frame = pd.DataFrame(
        [{k: neutralise(r.get(k)) for k in columns} for r in rows], columns=columns
    )
    return frame
