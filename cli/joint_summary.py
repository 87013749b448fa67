"""The fastener groups in the terminal summary: per fastener and per hole, the hand checks beside the FE
(compare/joint_result.py), in the part file's units."""

from __future__ import annotations

import math

from rich.console import Console
from rich.markup import escape
from rich.table import Table

from ..compare.check import CheckResult
from ..geometry.errors import clipped
from .display_units import label, quantity_text, shown


def stiffness_text(stiffness: float, source: str, units: str) -> str:
    """A fastener stiffness in words: "rigid", or "62.3 kN/mm (Huth ...)" in the part file's units."""
    if math.isinf(stiffness):
        return "rigid"
    return f"{quantity_text(stiffness, 'stiffness', units, '.4g')} ({source})"


def print_joints(result: CheckResult, console: Console) -> None:
    """One table per fastener group: each fastener's force, share, bearing, shear, bypass, its hole's peak
    and Kt, spacing, and the hand method's force; then the average-stress checks and how far each
    understates the FE."""
    joints = result.joints
    if joints is None:
        return
    units = result.spec.units
    force, stress = label("force", units, True), label("stress", units)
    for g in joints.groups:
        what = "holds the part" if g.holds else "loads the part"
        fit = "neat fit" if g.clearance == 0.0 else f"clearance {quantity_text(g.clearance, 'length', units)}"
        title = (f"Fastener group {clipped(g.name)!r} ({what}): d {quantity_text(g.diameter, 'length', units)}, "
                 f"{fit}, {g.shear_planes} shear plane{'s' if g.shear_planes > 1 else ''}, "
                 f"{stiffness_text(g.stiffness, g.stiffness_source, units)}")
        table = Table(title=escape(title), title_justify="left", box=None, pad_edge=False)
        for column in ("hole", f"F {force}", "dir °", "share", f"bearing {stress}", f"shear {stress}",
                       f"bypass {force}", f"peak {stress}", "Kt net", "Kt brg", "edge/d", "pitch/d", f"hand {force}"):
            table.add_column(column, justify="right")
        for f in g.fasteners:
            table.add_row(str(f.hole), shown(f.magnitude, "force", units, ".3f", True), f"{f.direction:.1f}",
                          f"{f.share:.1%}", shown(f.bearing, "stress", units), shown(f.shear, "stress", units),
                          "—" if f.bypass is None else shown(f.bypass, "force", units, ".3f", True),
                          "—" if f.peak is None else shown(f.peak, "stress", units),
                          "—" if f.kt_net is None else f"{f.kt_net:.3f}",
                          "—" if f.kt_bearing is None else f"{f.kt_bearing:.3f}",
                          f"{f.edge:.2f}", "—" if math.isinf(f.pitch) else f"{f.pitch:.2f}",
                          shown(math.hypot(*f.hand), "force", units, ".3f", True))
        console.print(table)
        fx, fy, mz = g.load
        console.print(f"  {'reaction' if g.holds else 'load'} {shown(math.hypot(fx, fy), 'force', units, '.3f', True)} "
                      f"{force}, moment {shown(mz, 'moment', units, '.4f', True)} {label('moment', units, True)}; "
                      f"fastener forces sum to it within {g.statics_error:.1e}; hand sharing: {g.hand_method}, "
                      f"{g.hand_source}", soft_wrap=False, markup=False)
        p = g.net_path
        if p is not None:
            through = ("holes " + ", ".join(str(h) for h in p.holes)) if p.holes else "no hole (the gross width)"
            fe = "" if p.fe_hole is None else (f"; the FE's largest tensile peak of the group is at hole {p.fe_hole} "
                                               f"({'on' if p.fe_on_path else 'off'} that path)")
            console.print(f"  critical net path by s^2/(4g) ({p.source}): through {through}, net width "
                          f"{quantity_text(p.width, 'length', units)} of {quantity_text(p.gross, 'length', units)}{fe}",
                          soft_wrap=False, markup=False)
        for a in g.averages:
            console.print(f"  {a.words(lambda v: quantity_text(v, 'stress', units))} ({a.check.source})",
                          soft_wrap=False, markup=False)
    passes = ", ".join("—" if p is None else str(p) for p in joints.passes)
    console.print(f"Contact passes per mesh level: {passes}. Bypass: the plate's load passing the hole; it and "
                  "Kt net (on N / A_net through the hole, across the group's load) are for a concentric group. "
                  "Kt brg: on the group's mean bearing F / (d t). Hand: the hand method's force on the fastener. "
                  f"{joints.cautions[0]}", soft_wrap=False, markup=False)
