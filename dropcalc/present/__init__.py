"""present layer of dropcalc (see DEVELOPERS.md)."""
