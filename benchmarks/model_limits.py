"""Where the model's limits lie: the measurements behind two thresholds of the checks.

1. Volumetric locking (geometry/resolution.py LOCKING_NU). Three bundled parts (a hole in a strap in
   tension, a hole in a clamped bracket under end shear and tension, U and V notches in tension) are
   checked in plane strain at Poisson's ratios from 0.3 to 0.499 with linear (order 1) and quadratic
   (order 2) triangles, at the parts' own tolerance (1 %). Reference: the same part in plane stress at
   nu = 0.3 with quadratic triangles. In a traction-loaded plane body the stresses depend neither on nu nor
   on plane stress against plane strain (docs/references.md [Michell]), so every row should match it; the
   table prints the converged Kt, its band, the error against the reference and whether the band covers it.
2. Small displacements (compare/plausibility.py DISPLACEMENT_LIMIT). The elastica of a cantilever under a
   dead transverse end load P (the exact large-deflection solution of an inextensible Euler-Bernoulli
   beam: EI theta'' = -P cos theta, theta(0) = 0, theta'(L) = 0), solved with scipy's solve_bvp, against
   the linear tip deflection P L^3 / (3 E I) and root moment P L.

Asserts nothing. Usage:

    python benchmarks/model_limits.py [--locking] [--elastica]
"""

from __future__ import annotations

import argparse
import dataclasses
import time
from pathlib import Path

import numpy as np

from measure import machine

EXAMPLES = Path(__file__).resolve().parents[1] / "examples"
PARTS = ("winch_strap.toml", "awning_bracket_arm.toml", "fence_tensioner_strap.toml")
POISSON = (0.3, 0.4, 0.45, 0.47, 0.49, 0.499)


def variant(spec, nu: float, order: int, condition: str = "plane-strain"):
    return dataclasses.replace(spec, plate=dataclasses.replace(spec.plate, condition=condition),
                               material=dataclasses.replace(spec.material, nu=nu),
                               mesh=dataclasses.replace(spec.mesh, order=order))


def locking() -> None:
    from stressraiser.compare.check import check_part
    from stressraiser.geometry.partfile import load_part

    print("\n1. Kt in plane strain against nu, linear and quadratic triangles (reference: plane stress, order 2)")
    print(f"{'part':28s} {'order':>5s} {'nu':>6s} {'Kt net':>8s} {'band':>7s} {'error':>8s} {'covered':>7s} "
          f"{'converged':>9s} {'seconds':>7s}")
    for name in PARTS:
        spec = load_part(EXAMPLES / name)  # read before the plane-strain variants, which the reader would refuse
        reference = check_part(variant(spec, 0.3, 2, "plane-stress")).kt.net
        print(f"{name:28s} {'ref':>5s} {0.3:6.3f} {reference:8.4f}")
        for order in (1, 2):
            for nu in POISSON:
                clock = time.perf_counter()
                result = check_part(variant(spec, nu, order))
                kt, band = result.kt.net, result.kt.error
                error = kt / reference - 1.0
                print(f"{'':28s} {order:5d} {nu:6.3f} {kt:8.4f} {band:7.2%} {error:+8.3%} {str(abs(error) <= band):>7s} "
                      f"{str(result.study.converged):>9s} {time.perf_counter() - clock:7.2f}", flush=True)


def elastica_tip(load: float) -> tuple[float, float]:
    """(tip deflection / L, root moment / (P L)) of the elastica at load = P L^2 / (E I)."""
    from scipy.integrate import solve_bvp

    s = np.linspace(0.0, 1.0, 401)

    def slope(_, y):
        return np.vstack([y[1], -load * np.cos(y[0])])

    def ends(a, b):
        return np.array([a[0], b[1]])

    solution = solve_bvp(slope, ends, s, np.zeros((2, s.size)), tol=1e-10, max_nodes=100_000)
    theta = solution.sol(s)[0]
    return float(np.trapezoid(np.sin(theta), s)), float(solution.sol(0.0)[1]) / load


def elastica() -> None:
    print("\n2. Cantilever under a dead end load: elastica against linear theory")
    print(f"{'linear tip / L':>14s} {'elastica tip / L':>16s} {'tip ratio':>9s} {'root moment ratio':>17s}")
    for linear in (0.01, 0.02, 0.05, 0.1, 0.15, 0.2):
        tip, moment = elastica_tip(3.0 * linear)  # linear tip / L = P L^2 / (3 E I)
        print(f"{linear:14.3f} {tip:16.4f} {tip / linear:9.4f} {moment:17.4f}")


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--locking", action="store_true", help="only the locking table")
    parser.add_argument("--elastica", action="store_true", help="only the elastica table")
    args = parser.parse_args()
    print(machine())
    if not args.elastica:
        locking()
    if not args.locking:
        elastica()


if __name__ == "__main__":
    main()
