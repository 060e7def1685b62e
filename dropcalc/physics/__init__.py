"""The physics core: SI floats and numpy arrays in, SI floats and numpy arrays out."""
