"""Terminal text for results: plain, aligned tables with units (SI or imperial)."""

from __future__ import annotations

import math
import textwrap
from pathlib import Path
from typing import TYPE_CHECKING, Any

import numpy as np

from dropcalc.analysis.fall import FallCase, FallResult
from dropcalc.model.limits import CARRIED_AWAY_DISTANCE
from dropcalc.physics.impact import Impact
from dropcalc.physics.release import describe
from dropcalc.texts import CAUTION_SHORT, area_text, keep_clear_text
from dropcalc.units import format_quantity

if TYPE_CHECKING:  # the renderers load no zone, list or library code until asked to
    from dropcalc.analysis.batch import BatchSettings
    from dropcalc.analysis.zone import SiteZone, ZoneResult
    from dropcalc.io.library import DropObject
    from dropcalc.model.reference_levels import ReferenceLevel


def _v(array: np.ndarray | None) -> float:
    return float("nan") if array is None else float(np.asarray(array)[0])


def _fmt(value: float, kind: str, system: str, digits: int = 3) -> str:
    if not math.isfinite(value):
        return "—"
    if abs(value) < 1e-9:  # rounding residue of a vertical fall (3.8e-16 m/s) reads as zero
        value = 0.0
    return format_quantity(value, kind, system, digits)


def _bound_rows(imp: Impact | None, system: str, plate: bool = False) -> list[tuple[str, str]]:
    """Rows for the largest drag area (a tumbling object's longest drift).

    For a sheet flown by the plate model the bound is the attitude of the longest drift.
    """
    if imp is None:
        return []
    where = "Attitude of longest drift" if plate else "Largest drag area"
    if not bool(imp.landed[0]):
        return [(f"At {where.lower()}", "carried away by the wind")]
    return [
        (f"{where}: drift", _fmt(_v(imp.drift), "length", system)),
        ("  impact energy", _fmt(_v(imp.kinetic_energy), "energy", system)),
        ("  fall time", f"{_v(imp.fall_time):.2f} s"),
    ]


def _impact_rows(imp: Impact, system: str, edge_azimuth: float) -> list[tuple[str, str]]:
    if not bool(imp.landed[0]):
        return [("Landing", "none: carried away by the wind (see warning)")]
    drift = _v(imp.drift)
    azimuth = _v(imp.drift_azimuth)
    away = drift * math.cos(math.radians(azimuth - edge_azimuth))
    epa = _v(imp.energy_per_area)
    vt = _v(imp.terminal_speed)
    return [
        ("Impact speed", _fmt(_v(imp.impact_speed), "speed", system)),
        (
            "  vertical / horizontal",
            f"{_fmt(_v(imp.vertical_speed), 'speed', system)} / "
            f"{_fmt(_v(imp.horizontal_speed), 'speed', system)}",
        ),
        ("Impact angle from vertical", f"{_v(imp.impact_angle):.1f}°"),
        ("Impact energy", _fmt(_v(imp.kinetic_energy), "energy", system)),
        ("Momentum", _fmt(_v(imp.momentum), "momentum", system)),
        (
            "Energy per contact area",
            _fmt(epa, "energy_per_area", system) if math.isfinite(epa) else "— (no contact area)",
        ),
        ("Fall time", f"{_v(imp.fall_time):.2f} s"),
        (
            "Drift to first contact",
            f"{_fmt(drift, 'length', system)} to {azimuth:.0f}°"
            + (f", {_fmt(away, 'length', system)} out" if drift > 0 else ""),
        ),
        (
            "Terminal speed in air",
            f"{_fmt(vt, 'speed', system)} ({100 * _v(imp.terminal_fraction):.0f} % at impact)",
        ),
        ("Fall to reach 95 % of it", _fmt(_v(imp.height_to_95_percent), "length", system)),
    ]


def _wind_text(case: FallCase, system: str) -> str:
    """The wind line in display units (WindSpec.describe() speaks SI only)."""
    wind = case.wind
    if wind.speed_10m == 0:
        return "still air"
    kind = "gust" if wind.kind == "gust" else "mean"
    text = (
        f"{_fmt(wind.speed_10m, 'speed', system)} {kind} at {_fmt(10.0, 'length', system, 2)}, "
        "from "
        f"{wind.from_direction_deg:.0f}°; "
    )
    if wind.profile == "uniform":
        text += "the same speed at every height"
    elif wind.profile == "power":
        text += f"power law, exponent {wind.exponent:.3g}"
    else:
        text += f"log law, roughness length {_fmt(wind.roughness_length or 0, 'length', system)}"
    if wind.profile != "uniform" and wind.minimum_height > 0:
        text += f", constant below {_fmt(wind.minimum_height, 'length', system)}"
    if wind.terrain_key:
        from dropcalc.physics.wind import terrain

        text += f" ({terrain(wind.terrain_key).label})"
    return text


def render_fall(result: FallResult, system: str = "si") -> str:
    """Readable multi-line summary of one fall, with units and the caution.

    Parameters
    ----------
    result : FallResult
        Output of :func:`dropcalc.analysis.fall.solve_fall`.
    system : {"si", "imperial"}
        Display units.
    """
    case = result.case
    contact = (
        _fmt(case.contact_area, "area", system) if case.contact_area is not None else "not given"
    )
    lines = ["dropcalc fall: one object, one release", ""]
    lines.extend(
        line for warning in result.warnings for line in textwrap.wrap("WARNING: " + warning, 90)
    )
    if result.warnings:
        lines.append("")
    if case.plate is not None:
        length, width, thickness = case.plate
        drag = (
            f"sheet {length * 1000:.0f} x {width * 1000:.0f} x {thickness * 1000:.0f} mm "
            "(impact at the attitude of the highest energy, drift bound at the attitude of the "
            "longest drift)"
        )
    elif case.drag_area_max is None:
        drag = f"drag area Cd·A {_fmt(case.drag_area, 'area', system)}"
    else:
        drag = (
            f"drag area Cd·A {_fmt(case.drag_area, 'area', system)} (smallest: highest energy) "
            f"to {_fmt(case.drag_area_max, 'area', system)} (largest: longest drift)"
        )
    what = f"{case.object_name} [{case.object_id}]: " if case.object_id else ""
    header = [
        ("Object", f"{what}mass {_fmt(case.mass, 'mass', system)}, {drag}, "
                   f"contact area {contact}"),
        ("Release", f"{describe(case.release, case.gravity)}, from "
                    f"{_fmt(case.height, 'length', system)} above the landing surface; "
                    f"the edge faces {case.edge_azimuth:.0f}°"),
        ("Air", f"{_fmt(case.air.density, 'density', system, 4)} ({case.air.basis}); "
                f"g = {_fmt(case.gravity, 'acceleration', system, 4)}"),
        ("Wind", _wind_text(case, system)),
    ]  # fmt: skip
    header.append(("Flight", result.flight_model))
    if result.lift_off_speed is not None:
        header.append((
            "Lift-off",
            f"lying flat on a roof it lifts off above about "
            f"{_fmt(result.lift_off_speed, 'speed', system)} at roof level (gust): weigh it "
            "down or store it flat",
        ))  # fmt: skip
    for label, text in header:
        wrapped = textwrap.wrap(text, 76)
        lines.append(f"  {label:<9}{wrapped[0]}")
        lines.extend(f"  {'':<9}{w}" for w in wrapped[1:])
    lines.append("")
    columns = []
    for wind_case in (result.given, result.gust):
        if wind_case is not None:
            heading = f"{wind_case.label} {_fmt(wind_case.speed_10m, 'speed', system)}"
            rows = _impact_rows(wind_case.impact, system, case.edge_azimuth)
            rows += _bound_rows(wind_case.impact_max_drag, system, case.plate is not None)
            columns.append((heading, rows))
    labels = [label for label, _ in columns[0][1]]
    width = max(len(label) for label in labels) + 2
    col_width = max(
        max(len(h) for h, _ in columns), *(len(v) for _, rows in columns for _, v in rows)
    )
    lines.append("  " + " " * width + "   ".join(f"{h:<{col_width}}" for h, _ in columns).rstrip())
    for i, label in enumerate(labels):
        cells = [rows[i][1] if i < len(rows) else "" for _, rows in columns]
        lines.append(
            f"  {label:<{width}}" + "   ".join(f"{c:<{col_width}}" for c in cells).rstrip()
        )
    lines.append("")
    reached, below = fall_levels(result)
    if reached or below:
        lines.extend(textwrap.wrap(
            "Reference levels (test energies and measurements, not safe limits), at the "
            "highest impact energy above: "
            + ("reached " + "; ".join(_level_text(lv, system) for lv in reached) if reached
               else "none reached")
            + ("" if not below else "; below " + "; ".join(_level_text(lv, system) for lv in below))
            + ".", 90))  # fmt: skip
        lines.append("")
    lines.extend(textwrap.wrap("Caution: " + CAUTION_SHORT, 90))
    return "\n".join(lines)


def _level_text(level: ReferenceLevel, system: str) -> str:
    kind = "energy" if level.quantity == "energy" else "energy_per_area"
    return f"{level.label} ({_fmt(level.value, kind, system)})"


def fall_levels(result: FallResult) -> tuple[list[ReferenceLevel], list[ReferenceLevel]]:
    """The default reference levels reached and not reached by a fall's highest impact.

    The highest impact energy (and energy per contact area) over the given wind and its gust,
    at the attitude of the highest energy, compared with each level of
    :data:`dropcalc.model.reference_levels.DEFAULT_LEVEL_KEYS`, as ``batch`` does.
    """
    from dropcalc.model.reference_levels import DEFAULT_LEVEL_KEYS, reference_level

    energies, per_area = [], []
    for wind_case in (result.given, result.gust):
        if wind_case is None or not bool(wind_case.impact.landed[0]):
            continue
        energies.append(float(np.asarray(wind_case.impact.kinetic_energy).ravel()[0]))
        epa = wind_case.impact.energy_per_area
        if epa is not None:
            value = float(np.asarray(epa).ravel()[0])
            if math.isfinite(value):
                per_area.append(value)
    if not energies:
        return [], []
    reached: list[ReferenceLevel] = []
    below: list[ReferenceLevel] = []
    for key in DEFAULT_LEVEL_KEYS:
        level = reference_level(key)
        if level.quantity == "energy":
            (reached if max(energies) >= level.value else below).append(level)
        elif per_area:
            (reached if max(per_area) >= level.value else below).append(level)
    return reached, below


def item_name(row: dict[str, Any]) -> str:
    """An item's name in tables: its label, else its library id or name, else its row number."""
    return str(row.get("label") or row.get("id") or row.get("name") or f"row {row.get('row')}")


def _sig3(value: float) -> str:
    """Three significant figures without an exponent (1190.4 -> "1190", 0.0123 -> "0.0123")."""
    if not math.isfinite(value):
        return "—"
    if value == 0:
        return "0"
    places = 2 - math.floor(math.log10(abs(value)))
    return f"{round(value, places):.{max(places, 0)}f}"


def _short_control(text: str) -> str:
    """The first words of each control in a cell ("secure against wind + prevent the drop")."""
    from dropcalc.model.policy import CONTROL_SEPARATOR

    parts = [c.split(":")[0].split(";")[0].split(" (")[0] for c in text.split(CONTROL_SEPARATOR)]
    return " + ".join(dict.fromkeys(p for p in parts if p))


def render_batch(
    rows: list[dict[str, Any]],
    settings: BatchSettings,
    system: str = "si",
    ignored_columns: list[str] | None = None,
    out: Path | None = None,
    limit: int = 40,
    total_good: int | None = None,
    total_bad: int | None = None,
) -> str:
    """A readable table of batch rows (highest energy first) with a summary and the caution.

    ``rows`` may be just the first rows of a long list; ``total_good`` and ``total_bad`` then
    give the counts of the whole list.
    """
    good = [r for r in rows if not r.get("error")]
    bad = [r for r in rows if r.get("error")]
    n_good = len(good) if total_good is None else total_good
    n_bad = len(bad) if total_bad is None else total_bad
    header = ("row", "item", "mass", "energy max", "speed max", "J/cm²", "drift max", "control")
    table = []
    for r in good[:limit]:
        epa = r.get("energy_per_contact_area_j_cm2")
        energy = r.get("impact_energy_max_j")
        table.append(
            (
                str(r["row"]),
                item_name(r)[:28],
                _fmt(r["mass_kg"], "mass", system),
                "—" if energy is None else _fmt(energy, "energy", system),
                "—"
                if r.get("impact_speed_max_m_s") is None
                else _fmt(r["impact_speed_max_m_s"], "speed", system),
                "—" if epa is None else _sig3(epa),
                "—" if r.get("drift_max_m") is None else _fmt(r["drift_max_m"], "length", system),
                _short_control(str(r.get("control", ""))),
            )
        )
    widths = [max(len(h), *(len(t[i]) for t in table)) if table else len(h) for i, h in
              enumerate(header)]  # fmt: skip
    lines = ["dropcalc batch: impact of each item (highest energy first)", ""]
    lines.append("  ".join(h.ljust(w) for h, w in zip(header, widths, strict=True)).rstrip())
    lines.extend(
        "  ".join(c.ljust(w) for c, w in zip(t, widths, strict=True)).rstrip() for t in table
    )
    if len(good) > limit:
        lines.append(
            f"... {len(good) - limit} more rows" + (f" in {out}" if out else " (use --out)")
        )
    lines.append("")
    if good:
        worst = good[0]
        lines.append(
            f"{n_good} item(s) solved; highest energy: {item_name(worst)} "
            f"(row {worst['row']}), {_fmt(worst['impact_energy_max_j'] or 0, 'energy', system)} "
            "at its smallest drag area."
        )
    if n_bad:
        lines.append(f"{n_bad} row(s) failed: see the error lines below and the error column.")
    if ignored_columns:
        lines.append(f"Ignored column(s): {', '.join(ignored_columns)}.")
    if any(r.get("glides") and r.get("flight_model") != "plate" for r in good):
        lines.append("Sheets and plates in the list can glide far in wind: drift not conservative.")
    sheets = [r for r in good if r.get("lift_off_speed_m_s") and r.get("glides")]
    for r in sheets[:limit]:
        lines.extend(textwrap.wrap(
            f"{r.get('label') or r.get('id')}: flown by the plate model; lying flat on a roof it "
            f"lifts off above about {_fmt(r['lift_off_speed_m_s'], 'speed', system)} at roof "
            "level: weigh it down or store it flat.", 90))  # fmt: skip
    if out:
        lines.append(f"All rows written to {out}.")
    lines.append("")
    lines.extend(textwrap.wrap("Caution: " + CAUTION_SHORT, 90))
    return "\n".join(lines)


def render_objects(objects: list[DropObject], system: str = "si") -> str:
    """A compact table of library objects."""
    header = ("id", "mass", "shape", "Cd·A min–max", "category")
    rows = [
        (
            o.id,
            _fmt(o.mass, "mass", system),
            o.shape,
            _fmt(o.drag_area_min, "area", system, 2)
            + "–"
            + _fmt(o.drag_area_max, "area", system, 2),
            o.category,
        )
        for o in objects
    ]
    if not rows:
        return "No object matches."
    widths = [max(len(h), *(len(r[i]) for r in rows)) for i, h in enumerate(header)]
    lines = ["  ".join(h.ljust(w) for h, w in zip(header, widths, strict=True)).rstrip()]
    lines += ["  ".join(c.ljust(w) for c, w in zip(r, widths, strict=True)).rstrip() for r in rows]
    lines.append(f"{len(rows)} object(s). `dropcalc objects show ID` gives every property.")
    return "\n".join(lines)


def render_object(obj: DropObject, system: str = "si") -> str:
    """Every property of one library object with its source."""
    o = obj
    dims = ", ".join(f"{k} {_fmt(v, 'length', system)}" for k, v in o.dimensions.items())
    contact = _fmt(o.contact_area, "area", system) if o.contact_area else "not given"
    rows = [
        ("Name", o.name),
        ("Category", o.category),
        ("Mass", f"{_fmt(o.mass, 'mass', system)} ({o.mass_basis})"),
        ("Mass source", o.mass_source),
        ("Shape", f"{o.shape}: {dims}"),
        ("Size source", o.size_source),
        ("Drag area", f"{_fmt(o.drag_area_min, 'area', system)} smallest (highest energy), "
                      f"{_fmt(o.drag_area_typical, 'area', system)} tumbling, "
                      f"{_fmt(o.drag_area_max, 'area', system)} largest (longest drift)"),
        ("Drag basis", o.drag_basis),
        ("Contact area", contact),
        ("Hazards", ", ".join(o.hazards) or "none listed"),
        ("Fragile", "yes: may break on impact" if o.fragile else "no"),
        ("Notes", o.notes or "—"),
    ]  # fmt: skip
    lines = [f"{o.id}"]
    for label, text in rows:
        wrapped = textwrap.wrap(str(text), 78) or [""]
        lines.append(f"  {label:<13}{wrapped[0]}")
        lines.extend(f"  {'':<13}{w}" for w in wrapped[1:])
    from dropcalc.physics.plate import plate_dimensions

    if plate_dimensions(o.shape, o.dimensions) is not None:
        lines.extend(textwrap.wrap(
            "Flight: a sheet, flown by the plate model in fall, batch and zone (it glides, "
            "tumbles and can rise in wind).", 90))  # fmt: skip
    elif o.glides:
        from dropcalc.physics.shapes import GLIDE_WARNING

        lines.extend(textwrap.wrap("WARNING: " + GLIDE_WARNING, 90))
    return "\n".join(lines)


def barricade_text(limits: dict[str, Any], system: str = "si") -> str:
    """What a barricade at a given distance holds, or that it is too close, in words.

    ``limits`` holds ``distance`` (the barricade), ``wind`` (highest mean wind at 10 m it
    holds), ``height`` (greatest work height it holds in the day's wind), ``needed`` (the zone
    radius in the day's wind) and ``still_air`` (the radius in still air, given only when even
    still air needs more than the barricade). [m], [m/s]
    """
    if limits["still_air"] is not None:
        return (
            f"too close even in still air: objects dropped from this height need "
            f"{keep_clear_text(limits['still_air'], system)} with no wind and "
            f"{keep_clear_text(limits['needed'], system)} in this wind. Move the barricade "
            f"to at least {keep_clear_text(limits['needed'], system)}"
            + (
                f", or work no higher than {_fmt(limits['height'], 'length', system)}."
                if limits["height"] > 0
                else "."
            )
        )
    holds = "holds" if limits["needed"] <= limits["distance"] else "is too close"
    return (
        f"{holds} in this wind (the zone needs {keep_clear_text(limits['needed'], system)}); "
        f"stop work above a mean wind of {_fmt(limits['wind'], 'speed', system)} at "
        f"{_fmt(10.0, 'length', system, 2)}. In this wind it holds up to a work height of "
        f"{_fmt(limits['height'], 'length', system)}."
    )


def after_landing_lines(result: ZoneResult, system: str = "si") -> list[tuple[str, str]]:
    """Rows for the terminal: the driving object's after-landing inputs and their weight."""
    d = result.driver
    material = d.obj.material_class
    ground = result.settings.ground
    rows = [
        (
            "After landing",
            f"{material.label}: restitution {material.restitution[0]:g}-"
            f"{material.restitution[1]:g} on concrete (x {ground.restitution_factor[0]:g}-"
            f"{ground.restitution_factor[1]:g} on {ground.label}), falling with speed; "
            f"friction {ground.friction[0]:g}-{ground.friction[1]:g}"
            + (
                f"; rolling resistance {ground.rolling_resistance[0]:g}-"
                f"{ground.rolling_resistance[1]:g}"
                if d.obj.rolls
                else ""
            )
            + (
                f"; breaks above {d.obj.break_speed:g} m/s and throws fragments"
                if d.obj.break_speed is not None
                else ""
            ),
        )
    ]
    labels = {
        "restitution": "restitution",
        "friction": "friction",
        "rolling_resistance": "rolling resistance",
        "fragment_speed": "fragment speed",
    }
    for row in d.sensitivity:
        if row.parameter == "all":
            label = "  all at their ends"
        else:
            label = f"  {labels[row.parameter]} {row.low:.3g} / {row.high:.3g}"
        rows.append(
            (label, f"radius {_fmt(row.radius_low, 'length', system)} / "
                    f"{_fmt(row.radius_high, 'length', system)}")
        )  # fmt: skip
    return rows


def zone_statement(result: ZoneResult, system: str = "si") -> str:
    """The zone in words: what the radius means and which object drives it."""
    r = result
    d = r.driver
    s = r.settings
    pct = f"{100 * s.confidence:g} %"
    rest = d.radius - s.margin
    if not math.isfinite(d.radius) and d.rolled_away > d.carried_away:
        return (
            f"No distance can be given: more than {100 - 100 * s.confidence:g} % of simulated "
            f"drops of the {d.obj.name} slid or rolled away down the "
            f"{s.ground_slope:g}° slope without stopping: no model can promise where it stops "
            "on open ground. Keep it from rolling off (stops, a level landing area) or stop "
            "the work."
        )
    if not math.isfinite(d.radius):
        return (
            f"No distance can be given: more than {100 - 100 * s.confidence:g} % of simulated "
            f"drops of the {d.obj.name} were carried beyond "
            f"{CARRIED_AWAY_DISTANCE / 1000:g} km by the wind. Secure it against the wind or "
            "stop the work; a zone cannot protect against it."
        )
    text = (
        f"{pct} of simulated drops of the {d.obj.name} came to rest within "
        f"{keep_clear_text(rest, system)} of the release point at the edge, plus a "
        f"{_fmt(s.margin, 'length', system)} margin: keep "
        + keep_clear_text(d.radius, system)
        + " clear."
    )
    if len(r.objects) > 1:
        text += (
            " It is the object that needs the widest zone; every other listed object needs less."
        )
    return text


#: Said when a wind is given without a terrain (or profile): it is then uniform with height.
NO_TERRAIN_WARNING = (
    "WARNING: no --terrain given: the wind is taken as the same speed at every height, while "
    "over real ground it grows with height. Give --terrain (en-0 ... en-iv) and, for a forecast "
    "or airport value, --wind-measured open-country."
)


def render_zone(
    result: ZoneResult,
    system: str = "si",
    limits: dict[str, Any] | None = None,
    site_result: SiteZone | None = None,
) -> str:
    """Readable zone summary with its parts, per-object lines and the cautions."""
    r = result
    s = r.settings
    d = r.driver
    lines = ["dropcalc zone: exclusion distance from the work edge", ""]
    if s.wind.speed_10m > 0 and s.wind.profile == "uniform":
        lines.extend(textwrap.wrap(NO_TERRAIN_WARNING, 90))
    for z in r.objects:
        if z.obj.glides and z.obj.plate is None:
            lines.extend(textwrap.wrap(
                f"WARNING: {z.obj.name} is a sheet or plate: it can glide far downwind and the "
                "point-mass zone is not conservative for it.", 90))  # fmt: skip
        if z.carried_away > 0:
            lines.extend(textwrap.wrap(
                f"WARNING: {100 * z.carried_away:.3g} % of drops of {z.obj.name} were "
                f"carried beyond {CARRIED_AWAY_DISTANCE / 1000:g} km by the wind: it is "
                "windborne and no zone can bound it.",
                90))  # fmt: skip
        if z.rolled_away > 0:
            lines.extend(textwrap.wrap(
                f"WARNING: {100 * z.rolled_away:.3g} % of drops of {z.obj.name} slid or rolled "
                f"away down the {s.ground_slope:g}° slope without stopping: it rolls out of any "
                "area a zone can give.",
                90))  # fmt: skip
    lines.extend(textwrap.wrap(zone_statement(r, system), 90))
    lines.append("")
    rows = [
        ("Keep clear (rounded up)", keep_clear_text(r.radius, system)),
        ("Radius at confidence", keep_clear_text(r.radius, system)),
        ("  air drift", _fmt(d.drift, "length", system)),
        ("  scatter after landing", _fmt(d.scatter, "length", system)),
        ("  margin", _fmt(s.margin, "length", system)),
        ("  standard error", f"{_fmt(d.standard_error, 'length', system)} ({d.samples} samples)"),
        ("Worst case (envelope)", f"{keep_clear_text(r.worst_case, system)} "
                                  f"({r.worst_case_driver.obj.name})"),
        ("Work height", _fmt(s.height, "length", system)),
        ("Wind", f"{_fmt(s.wind.speed_10m, 'speed', system)} {s.wind.kind} at "
                 f"{_fmt(10.0, 'length', system, 2)}; gust "
                 f"{_fmt(r.gust_speed, 'speed', system)}, turbulence intensity "
                 f"{r.turbulence_intensity:.2f}"),
        ("Ground", f"{s.ground.label}, slope {s.ground_slope:g}°; first contact as a "
                   "rigid-body impact with friction at a random orientation"),
        *after_landing_lines(r, system),
    ]  # fmt: skip
    if limits is not None:
        rows.append(
            (f"Barricade at {_fmt(limits['distance'], 'length', system)}",
             barricade_text(limits, system))
        )  # fmt: skip
    width = max(len(label) for label, _ in rows) + 2
    for label, text in rows:
        wrapped = textwrap.wrap(text, 90 - width) or [""]
        lines.append(f"  {label:<{width}}{wrapped[0]}")
        lines.extend(f"  {'':<{width}}{w}" for w in wrapped[1:])
    if site_result is not None:
        lines.append("")
        area = site_result.area
        lines.extend(textwrap.wrap(
            f"  Site: exclusion area {area_text(area.area_m2, system)}, reaching "
            f"{keep_clear_text(area.max_distance_m, system)} from the nearest work edge; widest "
            f"zone at {site_result.driver[0]}.", 90, subsequent_indent="  "))  # fmt: skip
        for name, index, segment in site_result.segments:
            lines.append(
                f"    {name} (segment {index + 1}, "
                f"{_fmt(segment.settings.height, 'length', system)}, facing "
                f"{segment.settings.edge_azimuth:.0f}°): {keep_clear_text(segment.radius, system)}"
                f" / worst case {keep_clear_text(segment.worst_case, system)}"
            )
    if len(r.objects) > 1:
        lines.append("")
        lines.append("  Per object (radius at confidence / worst case):")
        for z in sorted(r.objects, key=lambda z: -z.radius):
            lines.append(
                f"    {z.obj.name[:48]:<48} {keep_clear_text(z.radius, system):>9} / "
                f"{keep_clear_text(z.worst_case, system)}"
            )
    lines.append("")
    lines.extend(textwrap.wrap(
        "Not modelled: deflection off the structure (scaffold, facade, balconies). "
        "Caution: " + CAUTION_SHORT, 90))  # fmt: skip
    return "\n".join(lines)
