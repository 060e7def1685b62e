"""Writing result files so that an error never leaves a half-written file behind.

Every file is written to a temporary name in the target folder and renamed over the target
only when complete (``os.replace`` is atomic on one file system).
"""

from __future__ import annotations

import csv
import json
import os
import tempfile
from collections.abc import Callable, Sequence
from pathlib import Path
from typing import Any

from dropcalc.errors import InputError, require_suffix, shorten

OUTPUT_FORMATS = (".csv", ".xlsx", ".json")


def write_atomic(path: Path, write: Callable[[Path], None]) -> None:
    """Call ``write(temporary_path)`` and rename the result to ``path``.

    Raises
    ------
    InputError
        If the folder does not exist or cannot be written; the target is left untouched.
    """
    path = Path(path)
    shown = shorten(path, 120)
    folder = path.parent if str(path.parent) else Path(".")
    try:
        if not folder.is_dir():
            raise InputError(f"{shown}: the folder {shorten(folder, 120)} does not exist")
        fd, temporary = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=folder)
    except OSError as exc:  # a name too long for the file system, a folder we may not write in
        raise InputError(f"{shown}: cannot write ({exc.strerror})") from None
    os.close(fd)
    try:
        write(Path(temporary))
        # mkstemp makes the file private (0600); give it the mode a new file normally gets.
        umask = os.umask(0)
        os.umask(umask)
        os.chmod(temporary, 0o666 & ~umask)
        os.replace(temporary, path)
    except OSError as exc:
        raise InputError(f"{shown}: cannot write ({exc.strerror})") from None
    finally:
        if os.path.exists(temporary):
            os.unlink(temporary)


def write_rows(path: Path, rows: Sequence[dict[str, Any]]) -> None:
    """Write result rows as CSV, XLSX or JSON, chosen by the file suffix."""
    from dropcalc.analysis.batch import rows_frame

    suffix = require_suffix(path, OUTPUT_FORMATS, "--out")
    if suffix == ".json":
        text = json.dumps(list(rows), indent=2, allow_nan=False)
        write_atomic(path, lambda p: p.write_text(text + "\n", encoding="utf-8"))
        return
    frame = rows_frame(rows)
    if suffix == ".csv":

        def write_csv(target: Path) -> None:
            frame.head(0).to_csv(target, index=False, encoding="utf-8")  # the header, plain
            frame.to_csv(target, mode="a", index=False, header=False, encoding="utf-8",
                         quoting=csv.QUOTE_NONNUMERIC)  # every text cell quoted  # fmt: skip

        write_atomic(path, write_csv)
    else:
        write_atomic(path, lambda p: frame.to_excel(p, index=False, engine="openpyxl"))
