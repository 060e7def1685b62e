"""dropcalc: dropped-object physics for work at height.

The public API for notebook users is built up in :mod:`dropcalc.api`; the physics core lives in
:mod:`dropcalc.physics` (SI floats and numpy arrays only).
"""

__version__ = "0.1.0"
