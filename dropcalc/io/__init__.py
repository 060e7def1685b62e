"""io layer of dropcalc (see DEVELOPERS.md)."""
