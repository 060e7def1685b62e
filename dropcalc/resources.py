"""Find the data folders shipped with dropcalc (object library, report templates).

In a checkout the folders live at the top of the repository (``<repo>/object_library``,
``<repo>/templates``); in an installed wheel the build copies them into the package as
``dropcalc/_data/<name>``. :func:`data_path` is the one place that knows both layouts.
"""

from __future__ import annotations

from pathlib import Path

#: Folder of the installed (or checked-out) ``dropcalc`` package.
_PACKAGE_DIR = Path(__file__).resolve().parent


def data_path(name: str) -> Path:
    """Return the folder of a data set shipped with dropcalc.

    Looks first inside the installed package (``dropcalc/_data/<name>``), then in the checkout
    that holds the package (``<repo>/<name>``).

    Parameters
    ----------
    name : str
        Name of the data folder, e.g. ``"object_library"`` or ``"templates"``.

    Returns
    -------
    pathlib.Path
        Absolute path of an existing folder.

    Raises
    ------
    ValueError
        If ``name`` is not a plain folder name (a programming error).
    FileNotFoundError
        If neither location holds the folder (a broken installation).
    """
    if not name or name in (".", "..") or "/" in name or "\\" in name:
        raise ValueError(f"name must be a plain folder name such as 'object_library'; got {name!r}")
    installed = _PACKAGE_DIR / "_data" / name
    if installed.is_dir():
        return installed
    checkout = _PACKAGE_DIR.parent / name
    if checkout.is_dir():
        return checkout
    raise FileNotFoundError(
        f"dropcalc data folder {name!r} not found in {installed} or {checkout}; "
        "the installation is incomplete (reinstall dropcalc)"
    )
