"""model layer of dropcalc (see DEVELOPERS.md)."""
