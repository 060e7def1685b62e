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
# Hostile or careless input (a pasted expression, a drawing export, a special file) is refused
# before any work, in one line naming the key, the line and the limit. Documented for users in
# docs/limits.md.

#: Longest quantity typed in a field or cell, number and unit together [characters]: the
#: longest sensible spelling ("101.325 kilopascal", "1.225 kilogram / meter ** 3") is 30.
MAX_QUANTITY_CHARACTERS = 80
