"""Shared test configuration: hypothesis profiles.

The default profile ``repeatable`` draws the same examples on every run (``derandomize=True``),
so CI passes or fails on the code, not on the luck of the draw. Set
``HYPOTHESIS_PROFILE=explore`` to draw fresh random examples on each run when hunting for new
failures (run it in a loop); a failure found that way is added to the tests as a plain example.
"""

from __future__ import annotations

import os

from hypothesis import settings

settings.register_profile("repeatable", derandomize=True, database=None)
settings.register_profile("explore", derandomize=False, database=None)
settings.load_profile(os.environ.get("HYPOTHESIS_PROFILE", "repeatable"))
