"""Part specification, validation, units, model building and meshing."""
