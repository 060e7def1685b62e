"""analysis layer of dropcalc (see DEVELOPERS.md)."""
