"""Terminal rows and blocks for loads: the nominal stresses besides the Kt ones, the stress peaks, and
section cuts."""

from __future__ import annotations

from rich.console import Console
from rich.markup import escape
from rich.table import Table

import numpy as np

from ..compare.check import CheckResult, design_margin
from ..geometry.boundary import stretch
from ..geometry.registry import raiser_label
from .display_units import cut_label, label, point_text, quantity_text, shown, shown_point

Row = tuple[str, str, str]


def nominal_rows(result: CheckResult) -> list[Row]:
    """The load's other nominal stresses (those the Kt rows of cli/summary.py do not use), each with its
    value, the Kt it would give and its formula."""
    n = result.nominal
    if n is None:
        return []
    others = [nom for nom in n.all if nom.key not in (n.net.key, n.gross.key)]
    if not others:
        return []
    rows = [("Other nominals", "", "the Kt each would give")]
    for nom in others:
        kt = f"Kt {nom.kt:.3f}" if nom.kt is not None else "Kt —"
        rows.append((f"  {nom.label}", quantity_text(nom.stress, "stress", result.spec.units),
                     f"{kt}; {escape(nom.formula)}"))
    if any(nom.key == "bearing" for nom in others):
        rows.append(("", "", "bearing stress: the pin's force over its projected contact area"))
    return rows


def pin_rows(result: CheckResult) -> list[Row]:
    """Which pin model bore on the hole: the cosine pressure, or the rigid pin's contact arc, peak pressure
    and active-set passes on the finest mesh."""
    pin, units = result.spec.load.pin, result.spec.units
    if pin is None:
        return []
    contact = result.solution.contact
    if contact is None:
        return [("Pin model", "cosine", "p0 cos(a - direction) on the loaded half (common practice)")]
    fit = "neat fit" if pin.clearance == 0.0 else f"clearance {quantity_text(pin.clearance, 'length', units)}"
    return [("Pin model", "rigid", f"frictionless contact, {fit}"),
            ("  contact arc", f"{contact.arc[0]:+.1f}° … {contact.arc[1]:+.1f}°",
             f"from the pin's line; peak pressure {quantity_text(contact.peak_pressure, 'stress', units)}, "
             f"{contact.passes} active-set pass{'es' if contact.passes != 1 else ''}")]


def bearing_rows(result: CheckResult) -> list[Row]:
    """Where a pin bears: its peak contact pressure against the bearing stress P / (d t), converged or
    prescribed, or plainly not resolved (the contact arc's edge moves with the mesh)."""
    b, units = result.bearing, result.spec.units
    if b is None:
        return []
    if b.prescribed:
        state = "prescribed cosine law, 4/π × P / (d t)"
    elif b.resolved:
        state = f"converged ± {b.error:.2%}"
    else:
        state = f"not resolved: contact edge (band {b.error:.1%})"
    return [("Pin bearing pressure", quantity_text(b.pressure, "stress", units),
             f"{b.ratio:.2f} × P / (d t) = {quantity_text(b.bearing_stress, 'stress', units)}; {state}")]


def boundary_rows(result: CheckResult) -> list[Row]:
    """The supports and loads on the part's own boundary: each [[hold]] and [[load.edge]], what it picks
    and how long it is, and each pin hold's contact."""
    spec, units = result.spec, result.spec.units
    rows: list[Row] = []
    for hold in spec.support.holds:
        if hold.pin is not None:
            contact = next((c for c in result.solution.held_pins if c.hole == hold.pin), None)
            note = (f"contact {contact.arc[0]:+.1f}° … {contact.arc[1]:+.1f}° from {contact.seat:.0f}°, reaction "
                    f"{quantity_text(float(np.hypot(*contact.force)), 'force', units, resultant=True)}"
                    if contact is not None else "rigid, frictionless, neat fit")
            rows.append((f"{hold.key.capitalize()}", f"pin in hole {hold.pin}", note))
            continue
        picked = stretch(spec, hold.where)
        rows.append((f"{hold.key.capitalize()}", hold.mode, f"{_pieces(picked)}, "
                     f"{quantity_text(picked.length, 'length', units, '.4g')} long"))
    for edge in spec.load.edges:
        picked = stretch(spec, edge.where)
        value = (quantity_text(edge.pressure, "stress", units) if edge.pressure != 0.0
                 else quantity_text(edge.force, "force", units, resultant=True))
        how = "pressure" if edge.pressure != 0.0 else f"at {edge.direction:g}°"
        rows.append((edge.where.key, value, f"{how} on {_pieces(picked)}, {quantity_text(picked.length, 'length', units, '.4g')} long"))
    return rows


def _pieces(picked) -> str:
    return " + ".join(dict.fromkeys(picked.labels))


def print_cases(result: CheckResult, console: Console) -> None:
    """With several load cases: one row per case (its governing peak, nominal, Kt with band, the design
    margin when [design] is given) and which case governs."""
    cases = result.cases
    if len(cases) < 2:
        return
    units = result.spec.units
    design = all(r.design is not None for r in cases)
    table = Table(title="Load cases (one mesh and stiffness; each case converged on its own peak)",
                  title_justify="left", box=None, pad_edge=False)
    for column in ("case", f"peak {label('stress', units)}", "at", f"nominal {label('stress', units)}", "Kt net",
                   "band", *(("margin",) if design else ()), "state"):
        table.add_column(column, justify="left" if column in ("case", "at", "state") else "right")
    for r in cases:
        margin = ()
        if design:
            margin = (f"{design_margin(r.design):+.3f}",)
        state = ("converged" if r.kt.converged else "NOT converged") + (" · governs" if r.case == result.case else "")
        table.add_row(escape(r.case), shown(r.peak.stress, "stress", units), escape(raiser_label(r.peak.feature)),
                      shown(r.nominal.net.stress if r.nominal else r.net_section.average, "stress", units),
                      f"{r.kt.net:.3f}", f"± {r.kt.error:.2%}" if r.kt.error < 1.0 else "unknown", *margin, state)
    console.print(table)
    why = "the smallest design margin" if design else "the largest peak"
    console.print(f"Governing case: {result.case} ({why}); the numbers above are its own.", soft_wrap=False)


def stress_rows(result: CheckResult) -> list[Row]:
    """von Mises and Tresca peaks, and the compressive peak when it is larger in magnitude."""
    s, units = result.stresses, result.spec.units
    if s is None:
        return []
    where = (f"finest mesh, at {shown_point(s.von_mises.location, units)} / "
             f"{point_text(s.tresca.location, units)}")
    if result.solution.bearing[s.von_mises.node]:  # the contact's own stresses: not the sign-off's peak
        where += "; where a pin or fastener bears (the sign-off's von Mises peak leaves that out)"
    rows = [("von Mises / Tresca",
             f"{shown(s.von_mises.value, 'stress', units)} / {quantity_text(s.tresca.value, 'stress', units)}",
             where)]
    if s.compressive_governs and result.bearing is not None:
        rows.append(("Compressive peak", quantity_text(s.min_principal.value, "stress", units),
                     f"min principal at {point_text(s.min_principal.location, units)}, where the pin bears: "
                     "bearing, not the Kt"))
    elif s.compressive_governs and result.joints is not None and result.solution.bearing[s.min_principal.node]:
        rows.append(("Compressive peak", quantity_text(s.min_principal.value, "stress", units),
                     f"min principal at {point_text(s.min_principal.location, units)}, where a fastener bears: "
                     "bearing (the fastener rows), not the Kt"))
    elif s.compressive_governs:
        rows.append(("Compressive peak", quantity_text(s.min_principal.value, "stress", units),
                     f"min principal at {point_text(s.min_principal.location, units)} "
                     f"exceeds the tensile {quantity_text(s.max_principal.value, 'stress', units)}"))
    return rows


def print_sections(result: CheckResult, console: Console) -> None:
    """One row per requested cut: FE resultants, averages, peak, and the statics check."""
    if not result.sections:
        return
    table = Table(title="Sections (method of sections: FE resultants vs statics)", title_justify="left",
                  box=None, pad_edge=False)
    units = result.spec.units
    force, moment, stress = label("force", units, True), label("moment", units, True), label("stress", units)
    for column in ("cut", f"N {force}", f"V {force}", f"M {moment}", f"avg σ {stress}", f"avg τ {stress}",
                   f"peak σ {stress}", "statics err"):
        table.add_column(column, justify="left" if column == "cut" else "right")
    for r in result.sections:
        worst = r.worst_error
        table.add_row(escape(cut_label(r.label, r.point, units)), shown(r.fe_normal_force, "force", units, ".3f", True),
                      shown(r.fe_shear_force, "force", units, ".3f", True),
                      shown(r.fe_moment, "moment", units, ".4f", True), shown(r.average_normal, "stress", units, ".2f"),
                      shown(r.average_shear, "stress", units, ".2f"), shown(r.peak_normal, "stress", units),
                      "—" if worst is None else f"{worst:.3%}")
    console.print(table)
    console.print("M about the centroid of the cut's material, positive when it stretches the side to the left of "
                  "the cut's normal; errors relative to the cut's largest force scale (README)", soft_wrap=False)
