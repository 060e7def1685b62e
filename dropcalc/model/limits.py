"""Every allowed range of dropcalc's inputs, written once.

The model layer checks inputs against these values at the edge (CLI options, scenario, lists,
files); the physics kernels below trust what they are given. Each limit says its unit and why
it is where it is. Documented for users in ``docs/limits.md``.
"""

from __future__ import annotations

# --- the falling object and its release ------------------------------------------------------

#: Largest release height the model accepts [m]: the ISA troposphere and the point-mass model
#: are not meant for more (the site elevation is limited separately to 5000 m).
MAX_RELEASE_HEIGHT = 5000.0
#: Smallest release height accepted [m]: a drop from a hand's height, 1 cm.
MIN_RELEASE_HEIGHT = 0.01
#: Acceleration of gravity accepted [m/s^2]: anywhere on or near the Earth's surface (normal
#: gravity 9.780 at the equator to 9.832 at the poles, WGS84; less at altitude).
GRAVITY_RANGE = (9.7, 9.9)
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
