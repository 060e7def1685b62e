"""Writing result files so that an error never leaves a half-written file behind.

Every file is written to a temporary name in the target folder and renamed over the target
only when complete (``os.replace`` is atomic on one file system).
"""

from __future__ import annotations

import os
import tempfile
from collections.abc import Callable
from pathlib import Path

from dropcalc.errors import InputError, shorten

OUTPUT_FORMATS = (".csv", ".xlsx", ".json")


def write_atomic(path: Path, write: Callable[[Path], object]) -> None:
    """Call ``write(temporary_path)`` and rename the result to ``path`` (what it returns is unused).

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
