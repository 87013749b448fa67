"""The terminal summary of a check: verdict first, then the numbers that support it."""

from __future__ import annotations

import math

from rich.console import Console
from rich.markup import escape
from rich.table import Table

from ..compare.check import CheckResult
from ..compare.edge_cut import EDGE_NORMAL
from ..compare.nominal import FASTENER_BEARING
from ..fem.convergence import FORMAL_ORDER
from ..geometry.errors import clipped
from ..geometry.registry import raiser_label
from .citation import short_source
from .display_units import label, point_text, quantity_text, shown, warning_text
from .loads_summary import bearing_rows, boundary_rows, nominal_rows, pin_rows, print_cases, print_sections, stress_rows
from .joint_summary import print_joints
from .signoff_summary import print_signoff


def signoff_verdicts(result: CheckResult) -> str:
    """The sign-off's verdicts in words to follow the verdict line where only that line is printed
    (--quiet): a failing design check or fatigue screen is never hidden behind the Kt line alone."""
    words = []
    if result.design is not None:
        words.append(f"design check {'passes' if result.design.check.passes else 'FAILS'}")
    if result.fatigue is not None:
        words.append(f"fatigue screen {'passes' if result.fatigue.screen.passes else 'FAILS'}")
    return "".join(f"; {w}" for w in words)


def verdict(result: CheckResult) -> str:
    """One line: Kt with its band and whether the peak converged (the peak in the part file's units, with
    what it is: which principal stress, extrapolated or the finest level's)."""
    kt = result.kt
    peak = quantity_text(result.peak.stress, "stress", result.spec.units)
    state = "converged" if kt.converged else "NOT converged"
    nominal = result.nominal
    basis = f" on the {nominal.net.label.split(',')[0]} nominal" if nominal and result.spec.load.kind != "axial" else ""
    bearing = on_fastener_bearing(result)
    if bearing:
        basis = f" on the {nominal.net.label}"
    elif on_edge_cut(result):
        basis = " on the cut normal to the edge at the peak"
    cases = result.every_case
    case = f" in load case {result.case!r} (governs {len(cases)} cases)" if len(cases) > 1 else ""
    pair = (f"Kt {kt.net:.3f} ± {kt.error:.2%}" if bearing
            else f"Kt(net) {kt.net:.3f} ± {kt.error:.2%}, Kt(gross) {kt.gross:.3f}")
    return (f"{pair}{basis} — peak {peak} "
            f"({peak_words(result)}) at {raiser_label(result.peak.feature)}{case}, {state} in {len(result.study.levels)} mesh levels")


def peak_words(result: CheckResult) -> str:
    """What the headline peak is: "max principal, extrapolated" or "min principal, finest level"."""
    return f"{result.peak.component}, {'extrapolated' if result.study.estimate.extrapolated else 'finest level'}"


def peak_state(result: CheckResult) -> str:
    """How the headline peak was obtained and whether it converged: "extrapolated, converged"."""
    how = "extrapolated" if result.study.estimate.extrapolated else "finest level"
    return f"{how}, {'converged' if result.kt.converged else 'NOT converged'}"


def on_fastener_bearing(result: CheckResult) -> bool:
    """Whether the result's Kt is on a fastener's own bearing F / (d t) (compare.check.bearing_led)."""
    return result.nominal is not None and result.nominal.net.key == FASTENER_BEARING


def on_edge_cut(result: CheckResult) -> bool:
    """Whether the result's Kt is on the cut normal to the edge at the peak (compare/edge_cut.py)."""
    return result.net_section.kind == EDGE_NORMAL


def print_summary(result: CheckResult, console: Console) -> None:
    """Print the full summary: the blocks of BLOCKS in order, each a function (result, console)."""
    for block in BLOCKS:
        block(result, console)


# --- blocks -----------------------------------------------------------------------------------------
# Each block prints one part of the summary. Rows of the key-numbers table come from the row functions
# of KEY_ROWS, each returning (label, value, note) triples; keep notes short so a row fits 80 columns.

Row = tuple[str, str, str]


def print_heading(result: CheckResult, console: Console) -> None:
    """Title, the verdict line and any warnings."""
    console.print(f"[bold]{escape(clipped(result.spec.title))}[/bold]")  # the JSON record has it whole
    console.print(verdict(result), markup=False, soft_wrap=False)
    for warning in result.warnings:
        text = warning_text(warning, result.spec.units)
        console.print(f"[bold yellow]warning:[/bold yellow] {escape(text)}", soft_wrap=False)


def peak_rows(result: CheckResult) -> list[Row]:
    """The headline peak, labelled with its component, and the finest mesh's value with how the estimate
    was made from it and whether it converged."""
    peak, units = result.peak, result.spec.units
    how = "extrapolated from it" if result.study.estimate.extrapolated else "finest level kept (not extrapolated)"
    state = "converged" if result.kt.converged else "NOT converged"
    return [(f"Peak ({peak.component})", quantity_text(peak.stress, "stress", units),
             f"{raiser_label(peak.feature)} at {point_text(peak.location, units)}"),
            ("  on the finest mesh", quantity_text(peak.fe_stress, "stress", units), f"{how}; {state}")]


def net_section_rows(result: CheckResult) -> list[Row]:
    ns, units = result.net_section, result.spec.units
    if on_edge_cut(result):
        into = math.degrees(math.atan2(ns.normal[0], -ns.normal[1])) % 360.0
        return [("Average on the cut", quantity_text(ns.average, "stress", units),
                 f"N / {quantity_text(ns.area, 'area', units)} on the cut normal to the edge at the peak "
                 f"(into the part at {into:.1f}° from x)")]
    rows = [("Net-section average", quantity_text(ns.average, "stress", units),
             f"N / {quantity_text(ns.area, 'area', units)} at x = {quantity_text(ns.x, 'length', units, 'g')}")]
    under = result.understatement
    if result.spec.load.kind in ("axial", "pin") and under is not None:
        rows.append(("Average understates peak", f"{under:.1%}",
                     f"peak = {result.peak.stress / ns.average:.2f} × average"))
    return rows


def kt_rows(result: CheckResult) -> list[Row]:
    """The headline Kt, each on its own row naming the nominal stress it divides the peak by, e.g.
    "Kt on net section  2.437 ± 0.60%  nominal N / A_net = 10667 psi". No rich markup: the report reuses them."""
    kt, nominal, units = result.kt, result.nominal, result.spec.units
    net = f"{kt.net:.3f} ± {kt.error:.2%}"
    if on_fastener_bearing(result):
        return [("Kt on fastener bearing", net, nominal_note(nominal.net.formula, nominal.net.stress, units))]
    if nominal is not None and on_edge_cut(result):
        return [("Kt on the cut (net)", net, nominal_note(nominal.net.formula, nominal.net.stress, units)),
                ("Kt on the cut (gross)", f"{kt.gross:.3f}", nominal_note(nominal.gross.formula, nominal.gross.stress, units))]
    if nominal is None:
        return [("Kt on net section", net, f"gross {kt.gross:.3f} on the gross average "
                 f"{quantity_text(result.gross_average, 'stress', units)}")]
    if nominal.net.key == nominal.gross.key:  # one nominal for both (a remote stress state)
        return [(f"Kt on {nominal.net.label}", net, nominal_note(nominal.net.formula, nominal.net.stress, units))]
    gross = nominal_note(nominal.gross.formula, nominal.gross.stress, units)
    gross_section = result.gross
    if gross_section is not None and gross_section.symbol != "W":
        gross += f", {gross_section.definition}"
    return [("Kt on net section", net, nominal_note(nominal.net.formula, nominal.net.stress, units)),
            ("Kt on gross section", f"{kt.gross:.3f}", gross)]


def nominal_note(formula: str, stress: float, units: str) -> str:
    """ "nominal N / A_net = 10667 psi": which nominal stress a Kt uses, and its value in `units`."""
    return f"nominal {formula} = {quantity_text(stress, 'stress', units)}"


def handbook_rows(result: CheckResult) -> list[Row]:
    if not result.handbook:
        return [("Handbook Kt", "—", "no handbook case covers this geometry")]
    first = result.handbook[0]
    kt = fe_kt_for(result, first)
    params = ", ".join(f"{k} = {v:.3g}" for k, v in first.recognised.params.items())
    rows = [("Handbook Kt net", f"{first.kt_net:.3f}", f"FE {kt / first.kt_net - 1.0:+.2%}; "
             f"[dim]{escape(short_source(first.case.source))}[/dim]"),
            ("", "", f"{params}: {range_words(first, bold=True)}")]
    if first.recognised.raiser:
        rows.append(("", "", f"the case describes {first.recognised.raiser} (FE Kt net {kt:.3f})"))
    for alt in result.handbook[1:]:
        alt_kt = fe_kt_for(result, alt)
        rows.append(("Also published", f"{alt.kt_net:.3f}", f"FE {alt_kt / alt.kt_net - 1.0:+.2%}; "
                     f"[dim]{escape(short_source(alt.case.source))}[/dim]"))
    return rows


def range_words(match, bold: bool = False) -> str:
    """Where the part lies against a case's published range and the sub-range this project's FE was
    checked over ("inside its range; outside the FE-checked sub-range h/r 0.5-2.5")."""
    outside = "[bold]OUTSIDE[/bold]" if bold else "OUTSIDE"
    text = f"{'inside' if match.in_range else outside} its range"
    checked = match.case.checked
    if match.in_range and checked and not match.in_checked:
        spans = ", ".join(f"{k} {lo:.3g}-{hi:.3g}" for k, (lo, hi) in checked.items()
                          if not lo - 1e-12 <= match.recognised.params[k] <= hi + 1e-12)
        text += f"; outside the FE-checked sub-range {spans}"
    return text


def fe_kt_for(result: CheckResult, match) -> float:
    """The FE Kt net a handbook match compares with: the part's, or that of the raiser the case describes
    (e.g. the middle hole of a row; compare/case_kt.py), the part's when that raiser has no peak."""
    from ..compare.case_kt import case_kt

    kt = case_kt(result, match).kt_net
    return kt if kt is not None else result.kt.net


def competing_rows(result: CheckResult) -> list[Row]:
    """Each competing raiser's own peak, net section and Kt (when more than one raiser competes)."""
    if len(result.peaks) < 2:
        return []
    rows, units = [], result.spec.units
    for p in result.peaks:
        band = f"± {p.error:.1%}" if p.error < 1.0 else "band unknown"
        rows.append((f"  {p.feature}", quantity_text(p.stress, "stress", units),
                     f"Kt net {p.kt_net:.3f} {band}; average {quantity_text(p.section.average, 'stress', units)} "
                     f"at x = {quantity_text(p.section.x, 'length', units, 'g')}"))
    return [("Competing peaks", "", "each raiser's own peak and net section")] + rows


def equilibrium_rows(result: CheckResult) -> list[Row]:
    ns = result.net_section
    applied = ns.result.statics.normal_force if ns.result is not None else result.spec.load.axial
    units = result.spec.units
    return [("Equilibrium", f"{ns.equilibrium_error:+.3%}", f"FE {quantity_text(ns.fe_force, 'force', units)} "
             f"vs statics {quantity_text(applied, 'force', units)}")]


KEY_ROWS = (peak_rows, stress_rows, net_section_rows, kt_rows, nominal_rows, pin_rows, bearing_rows, boundary_rows, competing_rows,
            handbook_rows, equilibrium_rows)


def print_key_numbers(result: CheckResult, console: Console) -> None:
    """The aligned table of key numbers: label, value (right-aligned), short note."""
    table = Table(show_header=False, box=None, pad_edge=False, padding=(0, 1))
    table.add_column(style="bold", no_wrap=True)
    table.add_column(justify="right", no_wrap=True)
    table.add_column(overflow="fold")
    for rows in KEY_ROWS:
        for row in rows(result):
            table.add_row(*row)
    console.print(table)


def print_levels(result: CheckResult, console: Console) -> None:
    """The mesh levels of the study and how the estimate was made."""
    levels = Table(title=f"Mesh levels ({raiser_label(result.peak.feature)}'s own peak on each)", title_justify="left", box=None,
                   pad_edge=False)
    units = result.spec.units
    for column in ("level", "nodes", "elements", f"peak {label('stress', units)}", "time s"):
        levels.add_column(column, justify="right")
    for i, lv in enumerate(result.study.levels, start=1):
        levels.add_row(str(i), str(lv.nodes), str(lv.elements), shown(lv.peak, "stress", units, ".2f"),
                       f"{sum(lv.seconds.values()):.2f}")
    console.print(levels)
    console.print(f"Estimate: {estimate_how(result.study.estimate)}{estimate_basis(result)}; target error "
                  f"{result.spec.mesh.tolerance:.2%}", soft_wrap=False)


def estimate_basis(result: CheckResult) -> str:
    """The observed and formal orders and Roache's factor of safety behind the band, for the terminal and
    the report: ", observed order 1.47 (formal 1.5), factor of safety 1.25"."""
    est = result.study.estimate
    if est.order is None:
        return f", factor of safety {est.safety:g}" if est.method != "single level" else ""
    formal = FORMAL_ORDER[result.spec.mesh.order]
    used = f", extrapolated with order {est.used_order:.2f}" if est.used_order and est.used_order != est.order else ""
    return f", observed order {est.order:.2f} (formal {formal:g}){used}, factor of safety {est.safety:g}"


def estimate_how(est) -> str:
    """How the converged peak was obtained (fem.convergence.Estimate.method), in words for the terminal,
    the report and its convergence figure."""
    return {"richardson": "extrapolated (Richardson)"}.get(est.method, f"finest level ({est.method})")


def print_cautions(result: CheckResult, console: Console) -> None:
    """The cautions, wrapped with a hanging indent."""
    console.print("[bold]Cautions[/bold]")
    grid = Table.grid(padding=(0, 1))
    grid.add_column(no_wrap=True)
    grid.add_column()
    for caution in result.cautions:
        grid.add_row(" •", escape(caution))
    console.print(grid)


def sharp_corner_line(sharp, units: str) -> str:
    """One sharp inside corner in words: where, its angle, the zone left out, its zone's peak on each level
    against the governing peak, and what to do."""
    c = sharp.corner
    levels = " → ".join(shown(p, "stress", units, ".0f") for p in sharp.peaks)
    verdict = "above" if sharp.exceeds else "below"
    return (f"sharp inside corner at {point_text(c.point, units)} on {c.on} ({c.angle:.0f}° of material): zone of "
            f"{quantity_text(c.zone, 'length', units)} left out of the peak search; its peak {levels} "
            f"{label('stress', units)} over the levels (×{sharp.growth:.2f}), {verdict} the governing "
            f"{quantity_text(sharp.governing, 'stress', units)}; it is unbounded, not a Kt: give it a radius to judge it")


def print_sharp_corners(result: CheckResult, console: Console) -> None:
    """Every sharp inside corner (compare.check.SharpCornerResult), when the part has any."""
    if not result.sharp_corners:
        return
    console.print("[bold]Sharp inside corners[/bold]")
    for sharp in result.sharp_corners:
        style = "bold red" if sharp.exceeds else "yellow"
        console.print(f" [{style}]•[/{style}] {escape(sharp_corner_line(sharp, result.spec.units))}", soft_wrap=False)


BLOCKS = (print_heading, print_key_numbers, print_cases, print_sections, print_joints, print_levels,
          print_sharp_corners, print_signoff, print_cautions)
