"""The physics core stays free of unit, table, CLI, report and plotting libraries.

STYLE.md, "From poliastro: the boundary is enforced by a test": dropcalc/physics must not import
pint, pandas, typer, reportlab, matplotlib (or rich). Checked statically (every import statement
in every file, parsed with ``ast``) and dynamically (import every dropcalc.physics module in a
fresh interpreter, then look at sys.modules, which also catches indirect imports).
"""

from __future__ import annotations

import ast
import json
import subprocess
import sys
import textwrap
from pathlib import Path

import pytest

import dropcalc.physics

FORBIDDEN = ("pint", "pandas", "typer", "reportlab", "matplotlib", "rich")
PHYSICS_DIR = Path(dropcalc.physics.__file__).parent
PHYSICS_FILES = sorted(PHYSICS_DIR.rglob("*.py"))


def imported_top_level_names(source: str) -> set[str]:
    """Top-level package names imported by ``source``, incl. importlib/__import__ string calls."""
    names: set[str] = set()
    for node in ast.walk(ast.parse(source)):
        if isinstance(node, ast.Import):
            names.update(alias.name.split(".")[0] for alias in node.names)
        elif isinstance(node, ast.ImportFrom) and node.module and node.level == 0:
            names.add(node.module.split(".")[0])
        elif isinstance(node, ast.Call) and node.args:
            func = node.func
            called = func.attr if isinstance(func, ast.Attribute) else getattr(func, "id", "")
            first = node.args[0]
            if (
                called in ("import_module", "__import__")
                and isinstance(first, ast.Constant)
                and isinstance(first.value, str)
            ):
                names.add(first.value.split(".")[0])
    return names


def test_the_checker_sees_every_import_form() -> None:
    # Guard against a checker that cannot fail.
    source = textwrap.dedent(
        """
        import numpy as np, pint
        from pandas.core import frame
        def f():
            import typer.main
            return importlib.import_module("reportlab.pdfgen"), __import__("rich")
        from . import sibling
        """
    )
    found = imported_top_level_names(source)
    assert {"pint", "pandas", "typer", "reportlab", "rich", "numpy"} <= found
    assert "sibling" not in found


def test_physics_package_has_modules() -> None:
    names = {path.stem for path in PHYSICS_FILES}
    assert {"closed_form", "trajectory", "drag", "impact", "wind", "atmosphere"} <= names


@pytest.mark.parametrize("path", PHYSICS_FILES, ids=lambda path: path.name)
def test_no_forbidden_import_statement(path: Path) -> None:
    imported = imported_top_level_names(path.read_text(encoding="utf-8"))
    assert not imported & set(FORBIDDEN), f"{path.name} imports {sorted(imported & set(FORBIDDEN))}"


_PROBE = textwrap.dedent(
    """
    import importlib, json, pkgutil, sys
    extra = json.loads(sys.argv[1])
    forbidden = json.loads(sys.argv[2])
    import dropcalc.physics as physics
    modules = [
        info.name for info in pkgutil.walk_packages(physics.__path__, physics.__name__ + ".")
    ]
    for name in modules + extra:
        importlib.import_module(name)
    loaded = sorted({m.split(".")[0] for m in sys.modules} & set(forbidden))
    print(json.dumps({"modules": modules, "loaded": loaded}))
    """
)


def run_probe(extra: list[str]) -> dict[str, list[str]]:
    """Import every dropcalc.physics module (and ``extra``) in a fresh interpreter."""
    result = subprocess.run(
        [sys.executable, "-c", _PROBE, json.dumps(extra), json.dumps(FORBIDDEN)],
        capture_output=True,
        text=True,
        timeout=60,
        check=False,
        cwd=PHYSICS_DIR.parent.parent,
    )
    assert result.returncode == 0, result.stderr
    return json.loads(result.stdout.splitlines()[-1])


def test_importing_the_physics_core_loads_no_forbidden_package() -> None:
    report = run_probe([])
    expected = {
        f"dropcalc.physics.{path.stem}" for path in PHYSICS_FILES if path.stem != "__init__"
    }
    assert expected <= set(report["modules"])
    assert report["loaded"] == []


def test_the_probe_detects_a_forbidden_package() -> None:
    # Control: the same probe with pint imported on top must report it (pint is a dependency).
    assert run_probe(["pint"])["loaded"] == ["pint"]
