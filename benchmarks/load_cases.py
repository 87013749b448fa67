"""Several load cases on one stiffness against one check: the bundled strap under four load cases.

Four linear cases (a working pull with a side load, a proof pull with a side load, a side pull, in-plane
bending) are checked together, as one part with four [[load]] entries: one mesh and one assembled
stiffness per level, the four cases the columns of one factorised solve, one patch recovery for all. A
second set replaces the proof case by a rigid pin pulling across the hole: that case is nonlinear and
runs its own active-set passes (each a factorisation of the constrained system) on the same assembled
stiffness, so it costs what it costs alone. Figures printed for each set (best of --repeat, wall and CPU
seconds):

  together     the four-case check, converged at the part file's tolerance (1 %)
  one          a single-load check of the first case alone on the same mesh levels (same meshes: every
               case leaves a varying far field, so each alone is meshed like all four)
  four alone   the four single-load checks one after the other, on the same levels

and the ratios together / one (acceptance, linear set: under 1.5) and four alone / together (the
saving); and once, the bundled strap as shipped (one axial case, its own coarser far field) at 1 %. Each
level is meshed in a child process (geometry/mesh_process.py), whose CPU time the CPU column does not
count: read the wall times.
Run from the repository root with the package importable: `python benchmarks/load_cases.py`.
"""

from __future__ import annotations

import argparse
import copy
import tomllib
from pathlib import Path

from measure import best_of, machine

ROOT = Path(__file__).resolve().parents[1]
LINEAR = [{"name": "working", "axial": 120000.0, "shear": 4000.0},
          {"name": "proof", "axial": 180000.0, "shear": 6000.0},
          {"name": "side pull", "shear": 10000.0},
          {"name": "bending", "bending": 2.0e6}]
WITH_PIN = [LINEAR[0], {"name": "pinned", "pin": {"hole": 1, "force": 20000.0, "direction": 90.0, "contact": "rigid"}},
            LINEAR[2], LINEAR[3]]


def strap(cases: list[dict], levels: int | None = None) -> dict:
    """The bundled strap's part dictionary with `cases` ([[load]] entries, or one [load] table); with
    `levels`, run exactly that many mesh levels (a tolerance out of reach, mesh.max_levels = levels)."""
    part = tomllib.loads((ROOT / "examples" / "winch_strap.toml").read_text(encoding="utf-8"))
    part["load"] = copy.deepcopy(cases) if len(cases) > 1 else {k: v for k, v in cases[0].items() if k != "name"}
    if levels is not None:
        part["mesh"] = {**part.get("mesh", {}), "tolerance": 1e-4, "max_levels": levels}
    return part


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--repeat", type=int, default=3)
    args = parser.parse_args()
    print(machine())
    shipped = tomllib.loads((ROOT / "examples" / "winch_strap.toml").read_text(encoding="utf-8"))
    from stressraiser.compare.check import check_part
    from stressraiser.geometry.partfile import part_from_dict

    wall, cpu, result = best_of(lambda: check_part(part_from_dict(shipped)), args.repeat)
    print(f"shipped strap (one axial case, {len(result.study.levels)} levels): {wall:.2f} s wall, {cpu:.2f} s CPU")
    for title, cases in (("four linear load cases", LINEAR), ("with a rigid pin's case", WITH_PIN)):
        compare(title, cases, args.repeat, wall)


def compare(title: str, cases: list[dict], repeat: int, shipped_wall: float) -> None:
    """Time the cases together, the first alone and all four alone on the same levels; print the ratios."""
    from stressraiser.compare.check import check_part
    from stressraiser.geometry.partfile import part_from_dict
    from stressraiser.geometry.registry import raiser_label

    together_wall, together_cpu, result = best_of(lambda: check_part(part_from_dict(strap(cases))), repeat)
    levels = len(result.study.levels)
    one_wall, one_cpu, _ = best_of(lambda: check_part(part_from_dict(strap(cases[:1], levels))), repeat)

    def four_alone() -> None:
        for case in cases:
            check_part(part_from_dict(strap([case], levels)))

    alone_wall, alone_cpu, _ = best_of(four_alone, repeat)
    print(f"\n{title} on the bundled strap: {levels} mesh levels, finest {result.study.levels[-1].elements:,} "
          f"triangles; governing case {result.case!r}")
    for r in result.cases:
        print(f"  {r.case:10s} peak {r.peak.stress:8.1f} MPa at {raiser_label(r.peak.feature):7s} Kt net {r.kt.net:.3f} "
              f"± {r.kt.error:.2%} {'converged' if r.kt.converged else 'NOT converged'}")
    print(f"  {'run':34s} {'wall s':>8s} {'CPU s':>8s}")
    for name, wall, cpu in (("together (one stiffness)", together_wall, together_cpu),
                            ("one (first case alone, same levels)", one_wall, one_cpu),
                            ("four alone (same levels)", alone_wall, alone_cpu)):
        print(f"  {name:34s} {wall:8.2f} {cpu:8.2f}")
    print(f"  together / one: {together_wall / one_wall:.2f} wall, {together_cpu / one_cpu:.2f} CPU (acceptance for "
          f"the linear set: under 1.5)")
    print(f"  four alone / together: {alone_wall / together_wall:.2f} wall, {alone_cpu / together_cpu:.2f} CPU")
    print(f"  together / shipped strap: {together_wall / shipped_wall:.2f} wall")
    stages: dict[str, float] = {}
    for level in result.study.levels:
        for stage, seconds in level.seconds.items():
            stages[stage] = stages.get(stage, 0.0) + seconds
    print("  stages of the together run, summed over its levels (s; recover per case): "
          + ", ".join(f"{k} {v:.2f}" for k, v in stages.items()))


if __name__ == "__main__":
    main()
