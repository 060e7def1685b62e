"""The physics core stays free of unit, table, CLI, report and plotting libraries.

STYLE.md, "From poliastro: the boundary is enforced by a test": dropcalc/physics must not import
pint, pandas, typer, reportlab, matplotlib (or rich). Checked statically (every import statement
in every file, parsed with ``ast``) and dynamically (import every dropcalc.physics module in a
fresh interpreter, then look at sys.modules, which also catches indirect imports).

Above the core the package keeps one-way layers: physics, model, io, analysis, present, report,
web, cli, each importing only itself and the layers before it (the top-level errors, units,
texts and resources modules are shared by all). Checked statically over every import statement;
the known exceptions are listed with the reason and must still exist.
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


# ---------------------------------------------------------------------------------------------
# Layers: imports go one way (DEVELOPERS.md, "Architecture")
# ---------------------------------------------------------------------------------------------

PACKAGE_DIR = PHYSICS_DIR.parent
#: The layers, lowest first: a module may import its own layer and any layer before it.
LAYERS = ("physics", "model", "io", "analysis", "present", "report", "web", "cli")
#: Top-level modules the layers above physics may import. They import only each other, physics
#: (units reads the compass points from physics.wind) and model.limits (constants only); so
#: physics, below them, may import only errors (which imports nothing of dropcalc).
FOUNDATION = ("errors", "units", "texts", "resources")
#: Imports against the order that are known and not yet fixed: (importer, imported) -> why.
KNOWN_EXCEPTIONS: dict[tuple[str, str], str] = {
    # None left: the list reader a scenario needs moved from analysis/batch.py to io/items.py.
}


def layer_of(module: str) -> str | None:
    """The layer of a dropcalc module name; "foundation" for the shared top-level modules."""
    parts = module.split(".")
    if parts[0] != "dropcalc":
        return None
    if len(parts) == 1 or parts[1] in (*FOUNDATION, "__init__"):
        return "foundation"
    if parts[1] == "__main__":
        return "cli"
    return parts[1] if parts[1] in LAYERS else f"unknown:{parts[1]}"


def dropcalc_imports(source: str, module: str) -> set[str]:
    """dropcalc modules imported anywhere in ``source`` (in functions and TYPE_CHECKING too)."""
    package = module.split(".") if module.endswith("__init__") else module.split(".")[:-1]
    found: set[str] = set()
    for node in ast.walk(ast.parse(source)):
        if isinstance(node, ast.Import):
            found.update(alias.name for alias in node.names)
        elif isinstance(node, ast.ImportFrom):
            if node.level:  # relative: resolve against the importing module's package
                base = package[: len(package) - node.level + 1]
                name = ".".join([*base, node.module] if node.module else base)
            else:
                name = node.module or ""
            found.add(name)
    return {name for name in found if name.split(".")[0] == "dropcalc"}


def allowed(importer: str, imported: str) -> bool:
    """True if the layer order lets ``importer`` import ``imported``."""
    mine, theirs = layer_of(importer), layer_of(imported)
    if theirs == "foundation":
        return mine != "physics" or imported == "dropcalc.errors"
    if mine == "foundation":
        return theirs == "physics" or imported == "dropcalc.model.limits"
    if mine not in LAYERS or theirs not in LAYERS:
        return False
    return LAYERS.index(theirs) <= LAYERS.index(mine)


def module_name(path: Path) -> str:
    parts = path.relative_to(PACKAGE_DIR.parent).with_suffix("").parts
    return ".".join(parts[:-1] if parts[-1] == "__init__" else parts)


def layer_violations() -> set[tuple[str, str]]:
    found = set()
    for path in sorted(PACKAGE_DIR.rglob("*.py")):
        importer = module_name(path)
        for imported in dropcalc_imports(path.read_text(encoding="utf-8"), importer):
            if not allowed(importer, imported):
                found.add((importer, imported))
    return found


def test_the_layer_check_sees_a_wrong_way_import() -> None:
    # Guard against a check that cannot fail: the import forms a module may use, and the order.
    source = textwrap.dedent(
        """
        from dropcalc.analysis.zone import compute_zone
        def f():
            import dropcalc.report.pdf
            from ..present import text
        if TYPE_CHECKING:
            from dropcalc.web.app import App
        """
    )
    imported = dropcalc_imports(source, "dropcalc.io.scenario")
    assert imported == {
        "dropcalc.analysis.zone", "dropcalc.report.pdf", "dropcalc.present", "dropcalc.web.app",
    }  # fmt: skip
    assert not any(allowed("dropcalc.io.scenario", name) for name in imported)
    assert not allowed("dropcalc.physics.wind", "dropcalc.model.limits")
    assert not allowed("dropcalc.units", "dropcalc.analysis.fall")
    assert not allowed("dropcalc.analysis.job", "dropcalc.new_folder.thing")
    assert allowed("dropcalc.cli", "dropcalc.web.serve")
    assert allowed("dropcalc.report.build", "dropcalc.analysis.job")
    assert allowed("dropcalc.physics.drag", "dropcalc.errors")
    assert not allowed("dropcalc.physics.drag", "dropcalc.units")
    assert allowed("dropcalc.units", "dropcalc.model.limits")
    assert allowed("dropcalc.units", "dropcalc.physics.wind")
    assert not allowed("dropcalc.units", "dropcalc.model.policy")


def test_every_module_has_a_layer() -> None:
    modules = [module_name(path) for path in PACKAGE_DIR.rglob("*.py")]
    assert [m for m in modules if str(layer_of(m)).startswith("unknown")] == []
    assert {layer_of(m) for m in modules} >= {"physics", "model", "io", "analysis", "present"}


def test_imports_go_one_way_through_the_layers() -> None:
    """physics < model < io < analysis < present < report < web < cli; foundation anywhere."""
    unexpected = layer_violations() - set(KNOWN_EXCEPTIONS)
    assert unexpected == set(), sorted(unexpected)


def test_every_known_exception_still_exists() -> None:
    # A fixed exception must leave the list, so that it cannot come back unnoticed.
    assert set(KNOWN_EXCEPTIONS) <= layer_violations()


def test_model_limits_imports_nothing_of_dropcalc() -> None:
    # The foundation may read the limits table only because it depends on nothing.
    path = PACKAGE_DIR / "model" / "limits.py"
    assert dropcalc_imports(path.read_text(encoding="utf-8"), "dropcalc.model.limits") == set()
