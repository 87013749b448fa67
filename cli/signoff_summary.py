"""The sign-off block of the terminal summary: design check and fatigue screen, in the part file's units.

Numbers are converted from mm, N, MPa to the part file's unit system (`spec.units`) only here, at the
edge; the sentences come from compare.design.design_statements and compare.fatigue.screen_statements.
"""

from __future__ import annotations

import math

from rich.console import Console
from rich.table import Table
from rich.text import Text

from ..compare.check import CheckResult
from ..compare.design import CheckLine, design_statements
from ..compare.fatigue import screen_statements
from ..compare.signoff import DesignSignOff, FatigueSignOff, cycle_words, material_basis
from ..geometry.units import format_quantity
from .display_units import label, point_text, shown


def _verdict(passes: bool) -> str:
    return "[bold green]PASSES[/bold green]" if passes else "[bold red]FAILS[/bold red]"


def _factor(value: float | None) -> str:
    return "—" if value is None else f"{value:.3g}"


def print_signoff(result: CheckResult, console: Console) -> None:
    """Print the design check and the fatigue screen, when the part file asked for them."""
    if result.design is None and result.fatigue is None:
        return
    units = result.spec.units
    console.print(f"[bold]Sign-off[/bold] (in {units})")
    for line in material_basis(result.spec):
        _item(console, "", line, "dim")
    if result.design is not None:
        _print_design(result.design, units, console)
    if result.fatigue is not None:
        _print_fatigue(result.fatigue, units, bool(result.spec.cases), console)


def check_rows(design: DesignSignOff, units: str) -> list[tuple[str, ...]]:
    """One row per check of the design: what, stress, allowable, margin, factor of safety achieved on yield
    (bearing strength for bearing) and ultimate, required thickness, verdict; in `units`, no markup."""
    c = design.check

    def stress(value: float) -> str:
        return shown(value, "stress", units, ".1f")

    governs = {c.hand.key: c.hand, "peak": c.peak}[c.governing_check]

    def row(line: CheckLine) -> tuple[str, ...]:
        thickness = "—" if line.required_thickness_mm is None else shown(line.required_thickness_mm, "length", units, ".2f")
        verdict = ("passes" if line.passes else "FAILS") + ("*" if line is governs else "")
        return (CHECK_NAMES.get(line.key, line.key), stress(line.actual_mpa), stress(line.allowable_mpa),
                f"{line.margin:+.3f}", _factor(line.achieved_fos_yield), _factor(line.achieved_fos_ultimate),
                thickness, verdict)

    return [row(line) for line in c.checks]


CHECK_NAMES = {"net-section": "hand check", "remote-stress": "hand check", "bearing": "pin bearing",
               "fastener-shear": "fastener shear",
               "peak-von-mises": "peak von Mises", "peak-principal": "peak principal"}
CHECK_HEADER = ("check", "stress", "allowable", "margin", "FoS y", "FoS u", "t req", "")


def check_caption(units: str) -> str:
    """What the columns of `check_rows` hold, in `units`."""
    return (f"* governs. Stresses in {label('stress', units)}, required thickness (t req) in {label('length', units)}; "
            "FoS y and FoS u: factor of safety achieved on yield (bearing: on the bearing strength) and on ultimate.")


def also_failing(c) -> str:
    """The words the design headline adds when a check that must pass as well as the governing one (a
    pin's or fastener's bearing, the fastener shear) fails while the governing check passes: the worst
    of them by name and margin, so that a FAILS verdict never stands beside a positive margin alone."""
    governing = c.hand if c.governing_check == c.hand.key else c.peak
    failing = [ln for ln in (c.bearing, c.fastener_shear) if ln is not None and not ln.passes]
    if not failing or not governing.passes:
        return ""
    worst = min(failing, key=lambda ln: ln.margin)
    return f"; {CHECK_NAMES.get(worst.key, worst.key)} FAILS, margin {worst.margin:+.3f}"


def _print_design(design: DesignSignOff, units: str, console: Console) -> None:
    c = design.check
    governing = c.hand if c.governing_check == c.hand.key else c.peak
    console.print(f"Design check: {_verdict(c.passes)} — {c.load_kind} load, {c.governing_check} check governs, "
                  f"margin {governing.margin:+.3f}{also_failing(c)}", soft_wrap=False)
    table = Table(box=None, pad_edge=False, padding=(0, 1), show_edge=False)
    for n, name in enumerate(CHECK_HEADER):
        table.add_column(name, justify="left" if n in (0, len(CHECK_HEADER) - 1) else "right", no_wrap=True)
    for row in check_rows(design, units):
        table.add_row(*row)
    console.print(table)
    _item(console, "", check_caption(units), "dim")
    for line in design_statements(c, units):
        _item(console, " • ", line)
    for line in design.basis:
        _item(console, "   ", line, "dim")


def notch_words(fatigue: FatigueSignOff, units: str) -> str:
    """Where the notch a cycle between load cases was screened at is, in `units`."""
    where = "at no raiser" if fatigue.feature is None else f"on {fatigue.feature}"
    return f"{where} at {point_text(fatigue.location, units)}, the peak of load case {fatigue.notch_case!r}"


def _print_fatigue(fatigue: FatigueSignOff, units: str, named: bool, console: Console) -> None:
    s = fatigue.screen

    def stress(value: float) -> str:
        return format_quantity(value, "stress", units)

    yield_flag = " — FIRST-CYCLE YIELD at the notch" if s.first_cycle_yield else ""
    wider_flag = " — a wider range elsewhere is NOT SCREENED" if fatigue.wider is not None else ""
    console.print(f"Fatigue screen: {_verdict(s.passes)} — n_f {s.n_f:.3g} against {s.required_factor:g} "
                  f"required (a screen, not a life prediction){yield_flag}{wider_flag}", soft_wrap=False)
    cycle = f"Load cycle {cycle_words(fatigue, named)}"
    if fatigue.forces is not None:
        low, high = (format_quantity(v, "force", units) for v in fatigue.forces)
        cycle += f" ({low} to {high})"
    if fatigue.between_cases:
        cycle += f"; the notch is {notch_words(fatigue, units)}"
    _item(console, " • ", f"{cycle}; at the notch the nominal stress runs {stress(s.cycle.low.nominal_mpa)} to "
          f"{stress(s.cycle.high.nominal_mpa)} (sa = {stress(s.sa_nominal_mpa)}, sm = {stress(s.sm_nominal_mpa)}) and "
          f"the elastic peak {stress(s.cycle.low.peak_mpa)} to {stress(s.cycle.high.peak_mpa)}.")
    for line in fatigue_statements(fatigue, units):
        _item(console, " • ", line)
    for line in fatigue.basis:
        _item(console, "   ", line, "dim")


def fatigue_statements(fatigue: FatigueSignOff, units: str) -> list[str]:
    """The screen's statements in `units`, after the caution on a wider range not screened, when there is one."""
    wider = fatigue.wider
    where = "" if wider is None else "at no raiser" if wider.feature is None else f"on {wider.feature}"
    caution = [] if wider is None else [
        f"NOT SCREENED: {where} at {point_text(wider.location, units)}, where neither load case has its peak, the "
        f"cycle's elastic stress range on the finest mesh is {_times(wider.ratio)} that at the notch screened; "
        "check that point's cycle (its Kt, nominal stresses and Goodman factor) before signing off."]
    return caution + list(screen_statements(fatigue.screen, units))


def _times(ratio: float) -> str:
    """A ratio of ranges in words: "2.71 times", or "wider than" when the other range is nil."""
    return f"{ratio:.3g} times" if math.isfinite(ratio) else "wider than"


def _item(console: Console, lead: str, text: str, style: str = "") -> None:
    """One statement wrapped at words to the console's width (80 columns when not a terminal), its
    continuation lines indented under its first word; the text is printed as it is (no markup)."""
    grid = Table.grid()
    if lead:
        grid.add_column(width=len(lead), no_wrap=True)
    grid.add_column()
    grid.add_row(*((lead,) if lead else ()), Text(text, style=style))
    console.print(grid)
