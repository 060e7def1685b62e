"""Every allowed range of dropcalc's inputs, written once.

The model layer checks inputs against these values at the edge (CLI options, scenario, lists,
files) with the one range check, :func:`dropcalc.errors.require_range`; the physics kernels
below trust what they are given. Each limit says its unit and why it is where it is.
Documented for users in ``docs/limits.md``.

This module imports nothing of dropcalc (the foundation modules may read it). The ranges of
the air, the wind, the release and the ground slope are checked by their builders in
:mod:`dropcalc.physics` (``air_state``, ``wind_spec``, ``gravity``, ``Release``), which may
import nothing above them, so they are defined there, beside the check (``SITE_ELEVATION_RANGE``,
``TEMPERATURE_RANGE``, ``MAXIMUM_WIND_SPEED``, ``SLOPE_RANGE`` ...).
"""

from __future__ import annotations

# --- the falling object and its release ------------------------------------------------------

#: Largest release height the model accepts [m]: the ISA troposphere and the point-mass model
#: are not meant for more (the site elevation is limited separately to 5000 m). The inverse
#: solves (safe heights) search up to it as well.
MAX_RELEASE_HEIGHT = 5000.0
#: Smallest release height accepted [m]: a drop from a hand's height, 1 cm.
MIN_RELEASE_HEIGHT = 0.01
#: Release heights accepted [m].
RELEASE_HEIGHT_RANGE = (MIN_RELEASE_HEIGHT, MAX_RELEASE_HEIGHT)
#: Mass range accepted [kg]: a 1 g fragment up to a 100 t lifted load.
MASS_RANGE = (1e-4, 1e5)
#: Drag area range accepted [m^2].
DRAG_AREA_RANGE = (1e-7, 200.0)
#: Contact area range accepted [m^2].
CONTACT_AREA_RANGE = (1e-8, 10.0)
#: Horizontal distance after which an object still airborne is reported as carried away [m]:
#: a site's drop zone is measured in metres to tens of metres; an object that the wind takes
#: beyond a kilometre is windborne debris, not a drop the zone can bound.
CARRIED_AWAY_DISTANCE = 1000.0
#: Acceleration of gravity accepted [m/s^2]: anywhere on or near the Earth's surface (normal
#: gravity 9.780 at the equator to 9.832 at the poles, WGS84; less at altitude). The physics
#: entries that take a gravity check the same range (``physics.checks.GRAVITY_RANGE``, which
#: may not import this table).
GRAVITY_RANGE = (9.7, 9.9)

# --- the zone: confidence, margin and sampling precision ------------------------------------

#: Largest distance a work area may be kept clear to (``work_area.clear_distance``) [m]: the
#: longest release height; a clear distance is asked for that height and the day's wind.
MAX_CLEAR_DISTANCE = 5000.0

#: Share of simulated drops the zone radius must hold [-]: at least an even chance, and short
#: of certainty (a quantile at 1 needs infinitely many samples).
CONFIDENCE_RANGE = (0.5, 0.9999)
#: Margin added to the zone radius [m]: none up to 100 m.
MARGIN_RANGE = (0.0, 100.0)
#: Target standard error of the zone radius relative to it (``--precision``,
#: ``policy.precision``, ``ZoneSettings.relative_error``) [-]: 0.1 % to 20 %.
RELATIVE_ERROR_RANGE = (0.001, 0.2)

# --- the spreads sampled by the zone's Monte Carlo (``Uncertainty``) ---------------------------

#: Allowed range of each spread of :class:`dropcalc.analysis.zone.Uncertainty` (units as
#: there: degrees for directions and angles, fractions otherwise). Wide enough for any
#: considered choice, narrow enough that a sampled value stays physical (a drag coefficient
#: spread of 100 % would reach zero drag). Common practice, no source.
UNCERTAINTY_RANGES: dict[str, tuple[float, float]] = {
    "direction_spread": (0.0, 90.0),
    "release_direction_spread": (0.0, 90.0),
    "release_speed_low": (0.0, 1.0),
    "release_angle_spread": (0.0, 45.0),
    "friction_spread": (0.0, 0.9),
    "drag_coefficient_spread": (0.0, 0.5),
    "density_spread": (0.0, 0.3),
}
#: Allowed turbulence intensity I_v of the sampled wind speed [-]. EN 1991-1-4 eq. 4.7 at 10 m,
#: I_v = 1 / ln(z / z0), gives 0.12 for category 0 (z0 = 0.003 m) to 0.43 for category IV
#: (z0 = 1 m); the upper end 0.6 is common practice, no source.
TURBULENCE_RANGE = (0.0, 0.6)


# --- file and text sizes ---------------------------------------------------------------------
# Hostile or careless input (a pasted expression, a drawing export, a special file, a runaway
# spreadsheet) is refused before any work, in one line naming the file or key, the line where
# there is one, and the limit. Documented for users in docs/limits.md.

#: Longest quantity typed in a field or cell, number and unit together [characters]: the
#: longest sensible spelling ("101.325 kilopascal", "1.225 kilogram / meter ** 3") is 30.
MAX_QUANTITY_CHARACTERS = 80

#: Largest scenario, site, rules or object file read [bytes]: 10 MB holds a site drawn with
#: hundreds of thousands of points; a text file larger than that is not a hand-made input.
MAX_TEXT_FILE_BYTES = 10_000_000
#: Largest item list (CSV or XLSX) read [bytes]: 100,000 rows of a dozen cells.
MAX_LIST_FILE_BYTES = 50_000_000
#: Largest uncompressed content of an XLSX list [bytes], summed over the archive's members as
#: the archive declares them, before any is unpacked: a 351 KB file expanded to 1,000,000 rows.
MAX_XLSX_UNCOMPRESSED_BYTES = 200_000_000

#: Most rows in an item list (batch) [rows below the header]: 100,000 rows take about a
#: minute and make about 130 MB of JSON.
MAX_LIST_ROWS = 100_000
#: Most columns in an item list or object file: the documented columns are about 20; room is
#: left for a user's own notes and prices.
MAX_LIST_COLUMNS = 100
#: Most objects in one zone or report (``[[object]]`` tables plus an objects_file, or
#: ``zone --items``): each is solved for every work area.
MAX_OBJECTS = 500
#: Most work areas in a scenario; each has its own zone, figure and table in the report.
MAX_WORK_AREAS = 50
#: Most work edges in a scenario (all work areas together) or a site file.
MAX_EDGES = 200
#: Most points in one work edge or outline, as given: a circle exported from a drawing has a
#: few thousand; the edge is then merged to ``EDGE_RESOLUTION`` before any work.
MAX_EDGE_POINTS = 100_000
#: Segments of a work edge are merged until the merged polyline departs from the given one by
#: at most this much [m]: well under the 0.1 m to which distances are shown, and far under
#: the scatter of landing points.
EDGE_RESOLUTION = 0.25
#: Most reference levels asked for in one run (there are fewer than 20 distinct ones).
MAX_REFERENCE_LEVELS = 50
#: Largest coordinate magnitude of a site point, |x| and |y| [m]: a site fits in a few km
#: around its origin.
MAX_COORDINATE = 10_000.0

#: Longest job field (title, client, reference...) [characters]: one or two lines on the cover.
MAX_TITLE_CHARACTERS = 200
#: Longest name or label (work area, edge, object label, library name) [characters].
MAX_NAME_CHARACTERS = 120
#: Longest cell of an item list or object file [characters] (names and labels: the above).
MAX_CELL_CHARACTERS = 1000
