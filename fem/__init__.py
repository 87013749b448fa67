"""Finite elements: constant-strain triangles, assembly, loads, supports, solve, recovery, convergence."""
