"""Terminal rows and blocks for loads: the nominal stresses besides the Kt ones, the stress peaks, and
section cuts."""

from __future__ import annotations

from rich.console import Console
from rich.markup import escape
from rich.table import Table

from ..compare.check import CheckResult
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


def stress_rows(result: CheckResult) -> list[Row]:
    """von Mises and Tresca peaks, and the compressive peak when it is larger in magnitude."""
    s, units = result.stresses, result.spec.units
    if s is None:
        return []
    rows = [("von Mises / Tresca",
             f"{shown(s.von_mises.value, 'stress', units)} / {quantity_text(s.tresca.value, 'stress', units)}",
             f"finest mesh, at {shown_point(s.von_mises.location, units)} / "
             f"{point_text(s.tresca.location, units)}")]
    if s.compressive_governs:
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
