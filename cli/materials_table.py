"""`stressraiser materials`: list the built-in material table with the source of every row."""

from __future__ import annotations

import argparse

NAME = "materials"


def add_parser(commands) -> None:
    from ..geometry.units import UNIT_SYSTEMS

    parser = commands.add_parser(NAME, help="list the built-in materials and their sources")
    parser.add_argument("--units", choices=tuple(UNIT_SYSTEMS), default="mm-N-MPa",
                        help="unit system for the strengths and moduli (default mm-N-MPa)")


def run(args: argparse.Namespace) -> int:
    from rich.markup import escape
    from rich.table import Table

    from ..geometry.materials import MATERIALS
    from ..geometry.units import format_stated, unit_label

    from .terminal import out_console

    out = out_console()
    stress = unit_label("stress", args.units)
    table = Table(title=f"Built-in materials (stresses in {stress}; name one with material.grade)",
                  title_justify="left", box=None)
    for column, justify in (("grade", "left"), ("family", "left"), ("E", "right"), ("nu", "right"),
                            ("yield", "right"), ("ultimate", "right"), ("fatigue strength", "right"),
                            ("at cycles", "right"), ("K'", "right"), ("n'", "right")):
        table.add_column(column, justify=justify)

    def number(value) -> str:
        """A value as its source states it, in the chosen system (the source's own number in its system)."""
        return "—" if value is None else format_stated(value, args.units).removesuffix(f" {stress}")

    for row in MATERIALS:
        life = "—" if row.fatigue_life_cycles is None else f"{row.fatigue_life_cycles:.0e}"
        exponent = "—" if row.cyclic_exponent is None else f"{row.cyclic_exponent:g}"
        table.add_row(row.key, row.family, number(row.youngs_modulus), f"{row.poisson_ratio:g}",
                      number(row.minimum_yield), number(row.minimum_ultimate), number(row.fatigue_strength), life,
                      number(row.cyclic_strength), exponent)
    out.print(table)
    out.print("[bold]Sources[/bold]")
    for row in MATERIALS:
        cyclic = f" {row.cyclic_source}." if row.cyclic_source else ""
        out.print(f" {row.key}: {escape(row.name)}. {escape(row.source)}.{escape(cyclic)}")
    out.print("Strengths are specified minimums recalled from the named standards (from memory); fatigue "
              "strengths are typical polished-specimen values, not design values. Check every value against "
              "the governing specification and the mill certificate. Steels without a listed fatigue strength "
              "get the common estimate Se' = 0.5 Su in the fatigue screen; aluminium and titanium need a "
              "fatigue strength at a stated life. K' and n' are the cyclic Ramberg-Osgood stress-strain curve "
              "where published (the local strain at a yielding notch); give fatigue.cyclic_strength and "
              "fatigue.cyclic_exponent for the others.")
    return 0
