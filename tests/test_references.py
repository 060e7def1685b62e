"""Every source the project cites resolves inside the project.

Sources are cited by a key in square brackets (``[ISA-1993]``, ``[EN1991-1-4]``) that names an
entry of ``docs/references.md``. These tests read the repository's own files: the key of every
citation in code, tests, object library, templates and documentation must be defined there,
each key is defined once, and nothing cites a reference file outside the repository.
"""

from __future__ import annotations

import re
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
REFERENCES = ROOT / "docs" / "references.md"

#: A citation key: capitals, digits and dots, two or more before the first hyphen
#: ("HOLMES-2004"; a regex class such as [A-Z] is not one).
KEY = re.compile(r"\[([A-Z][A-Z0-9.]+(?:-[A-Z0-9.]+)+)\]")
#: An entry of docs/references.md: a list item starting with the bold key.
ENTRY = re.compile(r"^- \*\*\[([^\]]+)\]\*\*", re.MULTILINE)

CITING = ("dropcalc", "object_library", "docs", "templates", "tests", "benchmarks")
SUFFIXES = {".py", ".toml", ".md", ".txt", ".yaml", ".yml", ".json"}


def _project_files() -> list[Path]:
    files = [ROOT / "README.md"]
    for folder in CITING:
        base = ROOT / folder
        if base.is_dir():
            files += [p for p in sorted(base.rglob("*")) if p.suffix in SUFFIXES and p.is_file()]
    return [p for p in files if p.is_file() and p not in (REFERENCES, Path(__file__).resolve())]


def _defined() -> list[str]:
    return ENTRY.findall(REFERENCES.read_text(encoding="utf-8"))


def test_reference_keys_are_unique_and_well_formed():
    keys = _defined()
    assert len(keys) >= 30
    assert len(keys) == len(set(keys)), sorted(k for k in keys if keys.count(k) > 1)
    for key in keys:
        assert KEY.fullmatch(f"[{key}]"), key


def test_every_cited_key_resolves():
    defined = set(_defined())
    missing = []
    for path in _project_files():
        for number, line in enumerate(path.read_text(encoding="utf-8").splitlines(), 1):
            for key in KEY.findall(line):
                if key not in defined:
                    missing.append(f"{path.relative_to(ROOT)}:{number}: [{key}]")
    assert not missing, "\n".join(missing)


def test_key_pattern_finds_citations():
    # The pattern must catch the citation forms in use and nothing that is a unit.
    assert KEY.findall("(from memory; [WHITE-FM], [HOERNER-1965]) [m/s] [-] [J]") == [
        "WHITE-FM",
        "HOERNER-1965",
    ]
    assert KEY.findall("k_r = 0.19 (z0/z0,II)^0.07 [EN1991-1-4]") == ["EN1991-1-4"]


def test_nothing_cites_a_reference_file_outside_the_repository():
    outside = "REFERENCES" + ".md"  # the design team's own notes, not shipped
    hits = [
        str(p.relative_to(ROOT))
        for p in _project_files()
        if outside in p.read_text(encoding="utf-8")
    ]
    assert not hits, hits
