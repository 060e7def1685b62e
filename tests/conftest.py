"""Shared test configuration: hypothesis profiles; the README glossary of JSON keys.

The default profile ``repeatable`` draws the same examples on every run (``derandomize=True``),
so CI passes or fails on the code, not on the luck of the draw. Set
``HYPOTHESIS_PROFILE=explore`` to draw fresh random examples on each run when hunting for new
failures (run it in a loop); a failure found that way is added to the tests as a plain example.
"""

from __future__ import annotations

import os
import re
from collections.abc import Callable
from pathlib import Path
from typing import Any

import pytest
from hypothesis import settings

settings.register_profile("repeatable", derandomize=True, database=None)
settings.register_profile("explore", derandomize=False, database=None)
settings.load_profile(os.environ.get("HYPOTHESIS_PROFILE", "repeatable"))


def _glossary_names() -> tuple[set[str], list[re.Pattern[str]]]:
    """Every `name` in backticks in the README's glossary section; `x_<y>_z` as a pattern."""
    readme = (Path(__file__).resolve().parents[1] / "README.md").read_text(encoding="utf-8")
    section = readme.split("\n## Glossary", 1)[1].split("\n## ", 1)[0]
    names = set(re.findall(r"`([a-z0-9_<>]+)`", section))
    patterns = [
        re.compile("^" + re.sub(r"<[a-z]+>", "[a-z0-9_-]+", name) + "$")
        for name in names
        if "<" in name
    ]
    return {n for n in names if "<" not in n}, patterns


def _json_keys(value: Any, found: set[str]) -> set[str]:
    """All dict keys in a JSON value (the names inside ``dimensions_m`` are data, not keys)."""
    if isinstance(value, dict):
        for key, item in value.items():
            found.add(key)
            if key != "dimensions_m":
                _json_keys(item, found)
    elif isinstance(value, list):
        for item in value:
            _json_keys(item, found)
    return found


@pytest.fixture(scope="session")
def unlisted_keys() -> Callable[[Any], list[str]]:
    """A function giving the keys of a JSON value that the README glossary does not list."""
    names, patterns = _glossary_names()

    def unlisted(document: Any) -> list[str]:
        keys = _json_keys(document, set())
        return sorted(k for k in keys if k not in names and not any(p.match(k) for p in patterns))

    return unlisted
