"""Read a part file (TOML) into a validated PartSpec.

Every problem raises PartError with one line naming the key, the value and what is allowed.
"""

from __future__ import annotations

import math
import tomllib
from pathlib import Path
from dataclasses import replace
from typing import TYPE_CHECKING, Any

from .errors import PartError
from .readers import DEFAULT_UNITS, integer, known, number, point, positive, shown, table
from .registry import TABLES, outline_named, outline_of, read_raisers
from .spec import STRESS_STATES, Load, Material, MeshControls, PartSpec, Plate
from .spec import DESIGN_BEHAVIOURS, NEUBER_STEEL_RANGE_MPA, Q_METHODS, DesignSpec, FatigueSpec
from .spec import HELD_MODES, NO_HELD_END, PIN_CONTACTS, SINGLE_CASE, SYMMETRY_PLANES, LoadCase, Pin, Remote
from .spec import SectionSpec, Support
from .spec import MESH_SOLVERS
from .validate import validate_geometry

if TYPE_CHECKING:
    from .materials import MaterialRow

TOP_KEYS = {"title", "units", "plate", "material", "load", "mesh", "design", "fatigue", "support", "section",
            "hold", "fasteners"} | TABLES  # hold: geometry/boundaryfile.py; fasteners: geometry/fastenerfile.py
MAX_PART_BYTES = 1_000_000  # longest part file read (a real one is a few kB)


def load_part(path: str | Path) -> PartSpec:
    """Read and validate the part file at `path` (a regular file, UTF-8 with or without a byte-order mark;
    geometry/textfile.py)."""
    from .textfile import read_input_text

    return parse_part(read_input_text(path, "part file", MAX_PART_BYTES), Path(path).parent)


def anchored(data: dict[str, Any], base: Path) -> dict[str, Any]:
    """The part-file dictionary with a relative cut-file path (outline.file) joined to `base`, the part
    file's folder: for commands that read the dictionary and check its variants away from the file (a
    sweep). Anything else is left as it is, for the reader to judge."""
    outline = data.get("outline")
    if not isinstance(outline, dict) or not isinstance(outline.get("file"), str) or Path(outline["file"]).is_absolute():
        return data
    return {**data, "outline": {**outline, "file": str(base / outline["file"])}}


def parse_part(text: str, base: Path | None = None) -> PartSpec:
    """Parse TOML text and validate it into a PartSpec (`base`: the folder a cut file's relative path
    starts from, else the working folder)."""
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise PartError(f"part file is not valid TOML: {exc}") from None
    except RecursionError:
        raise PartError("part file: arrays or inline tables are nested too deeply") from None
    return part_from_dict(data, base)


def part_from_dict(data: dict[str, Any], base: Path | None = None) -> PartSpec:
    """Validate a part-file dictionary (as read from TOML) into a PartSpec (`base`: as for parse_part)."""
    known(data, TOP_KEYS, "")
    title = data.get("title", "untitled part")
    if not isinstance(title, str):
        raise PartError(f"title: must be a text string; got {shown(title)}")
    units = _units(data.get("units", DEFAULT_UNITS))
    outline = outline_named(data)
    plate = _plate(table(data, "plate", required=outline == "bar"), units, drawn=outline != "bar")
    material = _material(table(data, "material"), units)
    cases = _load_cases(data, units)
    from .fastenerfile import check_fasteners, fitted, read_fasteners

    groups = read_fasteners(data["fasteners"], units) if "fasteners" in data else ()
    support = _support(table(data, "support", required=False), data.get("hold"), units,
                       any(g.holds for g in groups))
    spec = PartSpec(
        title=title,
        plate=plate,
        material=material,
        load=cases[0].load,
        raisers=read_raisers(data, units),
        mesh=_mesh(table(data, "mesh", required=False)),
        units=units,
        support=support,
        sections=_sections(data.get("section", []), units),
        cases=cases if isinstance(data.get("load"), list) else (),
        fasteners=groups,
        outline=outline,
    )
    spec = replace(spec, **outline_of(spec).read(data, spec, base))
    from .resolution import check_feature_count, check_resolution

    check_feature_count(spec)  # before the pairwise geometric checks, whose cost grows with the square
    validate_geometry(spec)
    check_resolution(spec)
    spec = replace(spec, fasteners=fitted(spec))
    check_fasteners(spec)
    from .loading import validate_loading

    validate_loading(spec)
    return replace(spec, design=_design(data, spec), fatigue=_fatigue(data, spec))


def _units(value: Any) -> str:
    if value == DEFAULT_UNITS:
        return DEFAULT_UNITS
    from .units import UNIT_SYSTEMS

    if not isinstance(value, str) or value not in UNIT_SYSTEMS:
        raise PartError(f"units: {value!r} is not a unit system; use one of {', '.join(UNIT_SYSTEMS)}")
    return value


def _plate(t: dict[str, Any], units: str, drawn: bool = False) -> Plate:
    """[plate]; with a drawn outline only the thickness (which a STEP solid may give instead: 0 until the
    outline is read) and the condition, the extents coming from the drawing."""
    if drawn:
        for key in ("length", "width"):
            if key in t:
                raise PartError(f"plate.{key}: a drawn outline ([outline]) has its own size; remove plate.{key}")
    known(t, {"length", "width", "thickness", "condition"}, "plate")
    condition = t.get("condition", "plane-stress")
    if condition not in STRESS_STATES:
        raise PartError(f"plate.condition: {condition!r} is not allowed; use one of {', '.join(STRESS_STATES)}")
    if drawn:
        thickness = positive(t, "thickness", "plate", "length", units, required=False)
        return Plate(length=0.0, width=0.0, thickness=thickness or 0.0, condition=condition)
    return Plate(
        length=positive(t, "length", "plate", "length", units),
        width=positive(t, "width", "plate", "length", units),
        thickness=positive(t, "thickness", "plate", "length", units),
        condition=condition,
    )


MATERIAL_KEYS = {"grade", "E", "nu", "yield", "ultimate", "family", "ductile", "fatigue_strength", "fatigue_life"}


def _material(t: dict[str, Any], units: str) -> Material:
    """[material]: a built-in `grade` whose values any key may override, or every value given here."""
    known(t, MATERIAL_KEYS, "material")
    from .materials import DUCTILE_FAMILIES, FAMILIES, lookup_material

    row = lookup_material(t["grade"], "material.grade") if "grade" in t else None
    from_table = row is not None
    nu = number(t, "nu", "material", required=not from_table, default=row.poisson_ratio if from_table else None)
    if not -1.0 < nu < 0.5:
        raise PartError(f"material.nu: {nu} is outside the allowed range -1 < nu < 0.5")
    family = t.get("family", row.family if from_table else None)
    if family is not None and family not in FAMILIES:
        raise PartError(f"material.family: {family!r} is not allowed; use one of {', '.join(FAMILIES)}")
    ductile = t.get("ductile", row.ductile if from_table else (True if family in DUCTILE_FAMILIES else None))
    if not isinstance(ductile, bool | None):
        raise PartError(f"material.ductile: must be true or false; got {ductile!r}")
    strength, life = _fatigue_strength(t, row, units)
    material = Material(
        E=_or(positive(t, "E", "material", "stress", units, required=not from_table),
              row.youngs_modulus_mpa if from_table else None),
        nu=nu,
        yield_strength=_or(positive(t, "yield", "material", "stress", units, required=False),
                           row.yield_mpa if from_table else None),
        ultimate=_or(positive(t, "ultimate", "material", "stress", units, required=False),
                     row.ultimate_mpa if from_table else None),
        grade=row.key if from_table else None,
        family=family,
        ductile=ductile,
        fatigue_strength=strength,
        fatigue_life=life,
        source=_material_source(t, row),
        stated=() if row is None else tuple((key, value) for key, value in row.stated() if key not in t),
    )
    _strengths_in_order(material, units)
    return material


def _or(value: float | None, fallback: float | None) -> float | None:
    return fallback if value is None else value


def _fatigue_strength(t: dict[str, Any], row: MaterialRow | None, units: str) -> tuple[float | None, float | None]:
    """(strength MPa, life cycles): from the file as a pair, else the table row's pair."""
    if "fatigue_strength" not in t:
        if "fatigue_life" in t:
            raise PartError("material.fatigue_life: give material.fatigue_strength with it (they are a pair)")
        return (row.fatigue_strength_mpa, row.fatigue_life_cycles) if row is not None else (None, None)
    strength = positive(t, "fatigue_strength", "material", "stress", units)
    life = positive(t, "fatigue_life", "material", required=False)
    if life is not None and life < 1.0:
        raise PartError(f"material.fatigue_life: a number of cycles of at least 1 is needed; "
                        f"got {t['fatigue_life']!r}")
    return strength, life


def _material_source(t: dict[str, Any], row: MaterialRow | None) -> str:
    if row is None:
        return "values given in the part file"
    own = sorted(k for k in t if k != "grade")
    return row.source + (f"; set in the part file: {', '.join(own)}" if own else "")


def _strengths_in_order(m: Material, units: str) -> None:
    """Yield <= ultimate and a fatigue strength not above the ultimate, when both values are known."""
    from .units import format_quantity

    if m.yield_strength is not None and m.ultimate is not None and m.ultimate < m.yield_strength:
        raise PartError(f"material.ultimate: {format_quantity(m.ultimate, 'stress', units)} is below the yield "
                        f"strength {format_quantity(m.yield_strength, 'stress', units)}")
    if m.fatigue_strength is not None and m.ultimate is not None and m.fatigue_strength > m.ultimate:
        raise PartError(f"material.fatigue_strength: {format_quantity(m.fatigue_strength, 'stress', units)} is "
                        f"above the ultimate strength {format_quantity(m.ultimate, 'stress', units)}")


def _load_cases(data: dict[str, Any], units: str) -> tuple[LoadCase, ...]:
    """One [load] table (one case, named "load" unless it says otherwise), or [[load]] entries: several
    named load cases on the part's one stiffness."""
    from .boundaryfile import case_name

    if "load" not in data:
        raise PartError("[load]: missing table")
    items = data["load"]
    if isinstance(items, dict):
        return (LoadCase(case_name(items, "load", SINGLE_CASE), _load(items, units, "load")),)
    if not isinstance(items, list) or not items or not all(isinstance(i, dict) for i in items):
        raise PartError("load: must be a table written [load], or load cases written [[load]] (one table each)")
    cases = []
    for n, item in enumerate(items, start=1):
        where = f"load {n}"
        name = case_name(item, where, f"load {n}")
        if any(c.name == name for c in cases):
            raise PartError(f"{where}.name: {name!r} names another load case too; each case needs its own name")
        cases.append(LoadCase(name, _load(item, units, where)))
    if len({c.load.remote is None for c in cases}) > 1:
        first = next(n for n, c in enumerate(cases, start=1) if c.load.remote is not None)
        raise PartError(f"load {first}.remote: a remote stress state is held only against rigid-body motion, so it "
                        "cannot share a part (one stiffness, one set of supports) with load cases that need the "
                        "held end; check them as separate parts")
    return tuple(cases)


def _load(t: dict[str, Any], units: str, where: str = "load") -> Load:
    """A [load] table: end loads (axial, bending, shear, any mix), or a [load.remote] stress state, or a
    [load.pin]; [[load.edge]] loads on the boundary, alone or with a pin. `where` names the table."""
    from .boundaryfile import read_edge_loads

    from .fastenerfile import read_group_loads

    known(t, {"axial", "bending", "shear", "remote", "pin", "edge", "fasteners", "name"}, where)
    ends = [k for k in ("axial", "bending", "shear") if k in t]
    load = Load(
        axial=number(t, "axial", where, "force", units, required=False, default=0.0),
        bending=number(t, "bending", where, "moment", units, required=False, default=0.0),
        shear=number(t, "shear", where, "force", units, required=False, default=0.0),
        remote=_remote(t["remote"], units, f"{where}.remote") if "remote" in t else None,
        pin=_pin(t["pin"], units, f"{where}.pin") if "pin" in t else None,
        edges=read_edge_loads(t["edge"], where, units) if "edge" in t else (),
        fasteners=read_group_loads(t["fasteners"], where, units) if "fasteners" in t else (),
    )
    if load.remote is not None and (ends or load.pin is not None or load.edges or load.fasteners):
        other = ends[0] if ends else "pin" if load.pin is not None else "edge" if load.edges else "fasteners"
        raise PartError(f"{where}.remote: cannot be combined with {where}.{other}; the remote state loads every "
                        "outer edge and needs no held end")
    if load.pin is not None and ends:
        raise PartError(f"{where}.pin: cannot be combined with {where}.{ends[0]}; check the pin load and the end "
                        "loads as separate load cases")
    if load.pin is not None and load.fasteners:
        raise PartError(f"{where}.pin: cannot be combined with {where}.fasteners; a pin is a one-fastener group: "
                        "give it as a [[fasteners]] group of one hole")
    if load.remote is None and load.pin is None and not load.has_end_loads and not load.edges and not load.fasteners:
        from .units import unit_label

        name = f"{where}.{ends[0]}" if ends else where
        force, moment = unit_label("force", units), unit_label("moment", units)
        raise PartError(f"{name}: every load is zero; give a non-zero {where}.axial ({force}, positive in tension), "
                        f"{where}.bending ({moment}) or {where}.shear ({force}), a [load.remote] or [load.pin] table, "
                        "or [[load.edge]] or [[load.fasteners]] loads")
    return load


# --- loads, supports and sections beyond axial tension ------------------------------------------------


def _remote(t: Any, units: str, where: str = "load.remote") -> Remote:
    """[load.remote]: the uniform stress state sx, sy, txy (stresses, default 0) on every outer edge."""
    if not isinstance(t, dict):
        raise PartError(f"{where}: must be a table written [load.remote] with sx, sy and txy (stresses)")
    known(t, {"sx", "sy", "txy"}, where)
    remote = Remote(*(number(t, k, where, "stress", units, required=False, default=0.0)
                      for k in ("sx", "sy", "txy")))
    if remote.sx == remote.sy == remote.txy == 0.0:
        raise PartError(f"{where}: sx, sy and txy are all zero; give at least one non-zero stress")
    return remote


def _pin(t: Any, units: str, where: str = "load.pin") -> Pin:
    """[load.pin]: hole (1-based), force (> 0), direction (degrees from +x, default 0), contact ("cosine",
    default, or "rigid") and clearance (diametral, a length >= 0, default 0; "rigid" only)."""
    if not isinstance(t, dict):
        raise PartError(f"{where}: must be a table written [load.pin] with hole, force and direction")
    known(t, {"hole", "force", "direction", "contact", "clearance"}, where)
    hole = t.get("hole")
    if isinstance(hole, bool) or not isinstance(hole, int) or hole < 1:
        raise PartError(f"{where}.hole: must be the number of a [[hole]] entry (1 for the first); got {hole!r}")
    direction = number(t, "direction", where, required=False, default=0.0)
    if not -360.0 <= direction <= 360.0:
        raise PartError(f"{where}.direction: {direction} is outside the allowed range -360 to 360 degrees")
    contact = t.get("contact", Pin.contact)
    if contact not in PIN_CONTACTS:
        raise PartError(f"{where}.contact: {shown(contact)} is not allowed; use one of {', '.join(PIN_CONTACTS)}")
    clearance = number(t, "clearance", where, "length", units, required=False, default=0.0)
    if clearance < 0.0:
        raise PartError(f"{where}.clearance: must be zero or more (the pin's diametral clearance); got "
                        f"{shown(t['clearance'])}")
    if "clearance" in t and contact != "rigid":
        raise PartError(f"{where}.clearance: applies only with {where}.contact = \"rigid\" (the cosine pressure "
                        "has no pin to fit)")
    return Pin(hole=hole, force=positive(t, "force", where, "force", units), direction=direction,
               contact=contact, clearance=clearance)


def _support(t: dict[str, Any], hold_items: Any = None, units: str = DEFAULT_UNITS,
             holding_groups: bool = False) -> Support:
    """[support]: held = "x" | "clamped"; symmetry = a list of mirror planes, "x" and/or "y"; with
    [[hold]] entries (geometry/boundaryfile.py) or fastener groups that hold (geometry/fastenerfile.py) the
    part is held by them instead of the held end."""
    known(t, {"held", "symmetry"}, "support")
    held = t.get("held", Support.held)
    if held not in HELD_MODES:
        raise PartError(f"support.held: {held!r} is not allowed; use one of {', '.join(HELD_MODES)}")
    holds = ()
    if hold_items is not None:
        from .boundaryfile import read_holds

        holds = read_holds(hold_items, units)
        if "held" in t:
            raise PartError("support.held: the part is held by its [[hold]] entries instead of the held end; hold "
                            "that end with a [[hold]] too (mode \"fixed\" or \"roller\")")
        held = NO_HELD_END if holds else held
    if holding_groups:
        if "held" in t:
            raise PartError("support.held: the part is held by its fastener groups (holds = true) instead of the held "
                            "end; hold that end with a [[hold]] too (mode \"fixed\" or \"roller\")")
        held = NO_HELD_END
    planes = t.get("symmetry", [])
    if isinstance(planes, str):
        planes = [planes]
    if (not isinstance(planes, list) or any(p not in SYMMETRY_PLANES for p in planes)
            or len(set(planes)) != len(planes)):
        raise PartError(f"support.symmetry: must be a list of distinct planes from \"x\" (the plane x = 0) and "
                        f"\"y\" (the plane y = 0); got {t.get('symmetry')!r}")
    return Support(held=held, symmetry=tuple(sorted(planes)), holds=holds)


def _sections(items: Any, units: str) -> tuple[SectionSpec, ...]:
    """[[section]] entries: each gives x (a cut across at that x), y (a cut along at that y) or through (two
    points [[x1, y1], [x2, y2]] on the cut); name is an optional label."""
    if not isinstance(items, list) or not all(isinstance(i, dict) for i in items):
        raise PartError("section: must be an array of tables, each written [[section]]")
    out = []
    for n, item in enumerate(items, start=1):
        where = f"section {n}"
        known(item, {"x", "y", "through", "name"}, where)
        given = [k for k in ("x", "y", "through") if k in item]
        if len(given) != 1:
            raise PartError(f"{where}: give exactly one of x, y or through; got {', '.join(given) or 'none'}")
        name = item.get("name")
        if name is not None and not isinstance(name, str):
            raise PartError(f"{where}.name: must be a text string; got {name!r}")
        if given[0] == "through":
            pair = item["through"]
            if not isinstance(pair, list) or len(pair) != 2:
                raise PartError(f"{where}.through: must be two points [[x1, y1], [x2, y2]]; got {pair!r}")
            a = point({"a": pair[0]}, "a", f"{where}.through", units)
            b = point({"b": pair[1]}, "b", f"{where}.through", units)
            section = section_through(a, b, where)
        else:
            section = section_across(given[0], number(item, given[0], where, "length", units))
        out.append(section if name is None else SectionSpec(section.point, section.normal, name))
    return tuple(out)


def section_across(axis: str, value: float) -> SectionSpec:
    """The cut x = value (normal +x) or y = value (normal +y), in mm."""
    if axis == "x":
        return SectionSpec((value, 0.0), (1.0, 0.0), f"x = {value:g}")
    return SectionSpec((0.0, value), (0.0, 1.0), f"y = {value:g}")


def section_through(a: tuple[float, float], b: tuple[float, float], where: str) -> SectionSpec:
    """The cut along the line from a to b (mm); its normal is the direction a -> b turned 90 degrees
    clockwise, so a cut from (0, -1) to (0, 1) has normal +x."""
    dx, dy = b[0] - a[0], b[1] - a[1]
    length = math.hypot(dx, dy)
    if length == 0.0:
        raise PartError(f"{where}: the two points are the same; a cut needs two distinct points")
    return SectionSpec(a, (dy / length, -dx / length), f"through ({a[0]:g}, {a[1]:g}) and ({b[0]:g}, {b[1]:g})")


def parse_section_option(text: str, units: str = DEFAULT_UNITS) -> SectionSpec:
    """A cut from the command line: "x=40", "y=-5" or "x1,y1:x2,y2" (lengths in the part file's units, or
    with their own unit, e.g. "x=1.5in")."""
    where = f"--section {text}"
    spec = text.replace(" ", "")
    if "=" in spec:
        axis, _, value = spec.partition("=")
        if axis not in ("x", "y") or not value:
            raise PartError(f"{where}: use x=VALUE, y=VALUE or x1,y1:x2,y2")
        return section_across(axis, number({axis: _cli_value(value)}, axis, where, "length", units))
    ends = spec.split(":")
    if len(ends) != 2 or any(len(e.split(",")) != 2 for e in ends):
        raise PartError(f"{where}: use x=VALUE, y=VALUE or x1,y1:x2,y2")
    a, b = ({"x": _cli_value(e.split(",")[0]), "y": _cli_value(e.split(",")[1])} for e in ends)
    pa = (number(a, "x", where, "length", units), number(a, "y", where, "length", units))
    pb = (number(b, "x", where, "length", units), number(b, "y", where, "length", units))
    return section_through(pa, pb, where)


def _cli_value(text: str) -> float | str:
    """A bare number as a float, anything else as text for the unit parser."""
    try:
        return float(text)
    except ValueError:
        return text


# --- the sign-off tables: [design] and [fatigue] (both optional; absent means "not requested") ---------



def _design(data: dict[str, Any], spec: PartSpec) -> DesignSpec | None:
    """[design]: factors of safety, ductile/brittle behaviour and a pin's bearing strength; needs the yield
    strength. Every load kind is checked on its own nominal (compare.signoff)."""
    if "design" not in data:
        return None
    t = table(data, "design")
    known(t, {"yield_factor", "ultimate_factor", "behaviour", "bearing_strength", "fastener_shear_strength"}, "design")
    _no_compression(spec, "[design] check")
    m = spec.material
    if m.yield_strength is None:
        raise PartError("material.yield: missing; the [design] check needs the yield strength "
                        "(or a material.grade from `stressraiser materials`)")
    yield_factor = _safety_factor(t, "yield_factor", "design", DesignSpec.yield_factor)
    ultimate_factor = _safety_factor(t, "ultimate_factor", "design", None)
    if ultimate_factor is not None and m.ultimate is None:
        raise PartError("material.ultimate: missing; design.ultimate_factor needs the ultimate strength")
    bearing = positive(t, "bearing_strength", "design", "stress", spec.units, required=False)
    pinned = any(case.load.pin is not None for case in spec.load_cases) or bool(spec.fasteners)
    if bearing is not None and not pinned:
        raise PartError(f"design.bearing_strength: applies to a pin's hole ([load.pin]) or fastener groups' holes "
                        f"([[fasteners]]) only; this part's load is {spec.load.kind}")
    shear = positive(t, "fastener_shear_strength", "design", "stress", spec.units, required=False)
    if shear is not None and not spec.fasteners:
        raise PartError("design.fastener_shear_strength: applies to the fasteners of [[fasteners]] groups; this part "
                        "has none")
    behaviour, basis = _behaviour(t, m, "ductile" in data.get("material", {}))
    defaults = ("yield_factor", "behaviour") + (("bearing_strength",) if pinned else ())
    return DesignSpec(yield_factor=yield_factor, ultimate_factor=ultimate_factor, behaviour=behaviour,
                      behaviour_basis=basis, bearing_strength=bearing, defaults=_left_out(t, defaults),
                      fastener_shear_strength=shear)


def _behaviour(t: dict[str, Any], m: Material, ductile_given: bool) -> tuple[str, str]:
    """("ductile" | "brittle", where that came from)."""
    if "behaviour" in t:
        value = t["behaviour"]
        if value not in DESIGN_BEHAVIOURS:
            raise PartError(f"design.behaviour: {value!r} is not allowed; use one of {', '.join(DESIGN_BEHAVIOURS)}")
        return value, "stated in [design]"
    if m.ductile is None:
        raise PartError('design.behaviour: missing; the material has no family or ductile flag to decide it, '
                        'so state "ductile" or "brittle"')
    behaviour = "ductile" if m.ductile else "brittle"
    if ductile_given:
        return behaviour, "from material.ductile"
    if m.grade is not None:
        return behaviour, f"from the material grade {m.grade}"
    return behaviour, f"from the material family {m.family}"


FATIGUE_KEYS = {"min_fraction", "max_fraction", "min_force", "max_force", "alternating_force", "mean_force",
                "case", "min_case", "max_case", "notch_sensitivity", "q", "required_factor", "cyclic_strength",
                "cyclic_exponent"}
CYCLE_KEYS = {"fractions": ("min_fraction", "max_fraction"), "forces": ("min_force", "max_force"),
              "amplitude": ("alternating_force", "mean_force"),
              "cases": ("min_case", "max_case")}  # FatigueSpec.cycle_form: the keys of each


def _fatigue(data: dict[str, Any], spec: PartSpec) -> FatigueSpec | None:
    """[fatigue]: the load cycle (as multiples of a load case, or in forces for a load of one force, or
    between two load cases), how to screen it, and the cyclic stress-strain curve for a yielding notch."""
    if "fatigue" not in data:
        return None
    t = table(data, "fatigue")
    known(t, FATIGUE_KEYS, "fatigue")
    cycle = _cycle(t, spec)
    m = spec.material
    _fatigue_material(m, spec.units)
    method = t.get("notch_sensitivity", FatigueSpec.notch_sensitivity)
    if method not in Q_METHODS:
        raise PartError(f"fatigue.notch_sensitivity: {method!r} is not allowed; use one of {', '.join(Q_METHODS)}")
    q = number(t, "q", "fatigue", required=False)
    if q is not None and not 0.0 <= q <= 1.0:
        raise PartError(f"fatigue.q: {q} is outside the allowed range 0 to 1")
    if q is not None and "notch_sensitivity" in t:
        raise PartError("fatigue.q: give either q or notch_sensitivity, not both")
    if q is None:
        _method_fits(t, method, m, spec.units)
    strength, exponent, source = _cyclic_curve(t, m, spec.units)
    return FatigueSpec(
        **cycle, notch_sensitivity=method, q=q,
        required_factor=_safety_factor(t, "required_factor", "fatigue", FatigueSpec.required_factor),
        cyclic_strength=strength, cyclic_exponent=exponent, cyclic_source=source,
        defaults=_left_out(t, ("notch_sensitivity", "required_factor") if q is None else ("required_factor",)),
    )


def _cycle(t: dict[str, Any], spec: PartSpec) -> dict[str, Any]:
    """The cycle's FatigueSpec fields: between two load cases (min_case, max_case), or as multiples of one
    case's load (`case`; the part's only load by default) from min_fraction/max_fraction, or for a load of
    one force from min_force/max_force or alternating_force/mean_force (divided by that force)."""
    given = [form for form, keys in CYCLE_KEYS.items() if set(keys) & t.keys()]
    if len(given) > 1:
        key = sorted(set(CYCLE_KEYS[given[1]]) & t.keys())[0]
        raise PartError(f"fatigue.{key}: give the cycle one way only: min_fraction and max_fraction, or "
                        "min_force and max_force, or alternating_force (and mean_force), or min_case and max_case")
    if not given:
        raise PartError("fatigue: give the load cycle as min_fraction and max_fraction (multiples of the [load]), "
                        "or for a load of one force as min_force and max_force, or alternating_force (and "
                        "mean_force, default 0), or between two load cases as min_case and max_case")
    form = given[0]
    if form == "cases":
        low_case, high_case = _cycle_cases(t, spec)
        return {"min_fraction": None, "max_fraction": None, "cycle_form": form, "case": high_case,
                "min_case": low_case, "max_case": high_case}
    first = sorted(set(CYCLE_KEYS[form]) & t.keys())[0]
    case = _scaled_case(t, spec, first)
    scaled = spec.for_case(next(c for c in spec.load_cases if c.name == case))
    _no_compression(spec, "[fatigue] screen (Kt comes from the load case the cycle scales; the cycle itself may "
                          "reach compression)", only=case)
    if form == "fractions":
        for key in CYCLE_KEYS[form]:
            if key not in t:
                raise PartError(f"fatigue.{key}: missing; give min_fraction and max_fraction together")
        low, high = (number(t, key, "fatigue") for key in CYCLE_KEYS[form])
        _cycle_order(low, high, "min_fraction", "max_fraction", t)
    else:
        force = _load_force(scaled, first)
        if form == "forces":
            low = number(t, "min_force", "fatigue", "force", spec.units)
            high = number(t, "max_force", "fatigue", "force", spec.units)
            _cycle_order(low, high, "min_force", "max_force", t)
        else:
            alternating = positive(t, "alternating_force", "fatigue", "force", spec.units)
            mean = number(t, "mean_force", "fatigue", "force", spec.units, required=False, default=0.0)
            low, high = mean - alternating, mean + alternating
        low, high = low / force, high / force
    _cycle_fits_load(scaled, low, high, CYCLE_KEYS[form][0] if form != "amplitude" else "alternating_force")
    return {"min_fraction": low, "max_fraction": high, "cycle_form": form, "case": case}


def _cycle_order(low: float, high: float, low_key: str, high_key: str, t: dict[str, Any]) -> None:
    if not low < high:
        raise PartError(f"fatigue.{low_key}: must be below fatigue.{high_key}; got {t[low_key]!r} and {t[high_key]!r}")


def _case_named(t: dict[str, Any], key: str, spec: PartSpec) -> str:
    """The load case fatigue.`key` names: one of the part's cases, by its name."""
    names = [c.name for c in spec.load_cases]
    value = t[key]
    if not isinstance(value, str) or value.strip() not in names:
        known_names = ", ".join(repr(n) for n in names)
        raise PartError(f"fatigue.{key}: {value!r} names no load case of the part; its load cases are {known_names}")
    return value.strip()


def _scaled_case(t: dict[str, Any], spec: PartSpec, key: str) -> str:
    """The load case a cycle in fractions or forces scales: fatigue.case, which a part with several load
    cases must give (the cycle would not say which load it scales), else the part's one load."""
    if "case" in t:
        return _case_named(t, "case", spec)
    if len(spec.load_cases) > 1:
        names = ", ".join(repr(c.name) for c in spec.load_cases)
        raise PartError(f"fatigue.{key}: with several load cases say which load the cycle scales, fatigue.case = one "
                        f"of {names}; or give a cycle between two cases as fatigue.min_case and fatigue.max_case")
    return spec.load_cases[0].name


def _cycle_cases(t: dict[str, Any], spec: PartSpec) -> tuple[str, str]:
    """(min case, max case) of a cycle between two load cases: two different cases of the part."""
    if "case" in t:
        raise PartError("fatigue.case: names the load case a cycle of fractions or forces scales; a cycle between "
                        "fatigue.min_case and fatigue.max_case takes no case")
    for key in CYCLE_KEYS["cases"]:
        if key not in t:
            raise PartError(f"fatigue.{key}: missing; give min_case and max_case together")
    if len(spec.load_cases) < 2:
        raise PartError("fatigue.min_case: a cycle between load cases needs two of them ([[load]] entries, each "
                        "with a name); this part has one load: give min_fraction and max_fraction of it")
    low, high = _case_named(t, "min_case", spec), _case_named(t, "max_case", spec)
    if low == high:
        raise PartError(f"fatigue.max_case: {high!r} is fatigue.min_case too; a cycle between cases needs two "
                        "different ones (to cycle one case, give fatigue.case with min_fraction and max_fraction)")
    return low, high


def _load_force(spec: PartSpec, key: str) -> float:
    """The one force of the load a cycle in forces is divided by: axial alone, or the pin's force (`spec`
    under the load case the cycle scales)."""
    if spec.load.kind == "axial":
        return spec.load.axial
    if spec.load.kind == "pin":
        return spec.load.pin.force
    what = f"load case {spec.cases[0].name!r}" if spec.cases else "this part's load"
    raise PartError(f"fatigue.{key}: a cycle in forces needs a load of one force (axial alone, or a pin); "
                    f"{what} is {spec.load.kind}: give fatigue.min_fraction and fatigue.max_fraction, the "
                    "cycle's extremes as multiples of that load")


def _cycle_fits_load(spec: PartSpec, low: float, high: float, key: str) -> None:
    """A pin only pushes; a rigid pin with clearance does not scale with its load (in every load case); a
    part held by pins bears on them one way only."""
    for case in spec.load_cases:
        _pin_cycle(case.load.pin, low, high, key)
    if low < 0.0 and any(h.pin is not None for h in spec.support.holds):
        raise PartError(f"fatigue.{key}: the part bears on its holding pins one way only, so its cycle cannot go "
                        "below zero (a reversed load presses the other side of the holes, another load case)")
    if spec.fasteners and low < 0.0:
        raise PartError(f"fatigue.{key}: fasteners bear on their holes one way only, so the cycle cannot go below "
                        "zero (a reversed load presses the other side of the holes, another load case)")
    if any(g.clearance > 0.0 for g in spec.fasteners) and (low, high) != (0.0, 1.0):
        raise PartError(f"fatigue.{key}: with a clearance the fasteners' contact depends on the load level, so the "
                        "stresses do not scale with the load; give the cycle from 0 to 1 x the load case "
                        "(min_fraction = 0, max_fraction = 1), or a cycle between two load cases")


def _pin_cycle(pin: Pin | None, low: float, high: float, key: str) -> None:
    if pin is None:
        return
    if low < 0.0:
        raise PartError(f"fatigue.{key}: a pin only pushes, so its cycle cannot go below zero (that would put it "
                        "on the other side of the hole, another load case); give a minimum of 0 or more")
    if pin.contact == "rigid" and pin.clearance > 0.0 and (low, high) != (0.0, 1.0):
        raise PartError(f"fatigue.{key}: with a clearance the rigid pin's contact depends on the load level, so "
                        "its stresses do not scale with the load; give the cycle from 0 to 1 x the [load] "
                        "(min_fraction = 0, max_fraction = 1, the [load.pin] force being the cycle's maximum)")


def _cyclic_curve(t: dict[str, Any], m: Material, units: str) -> tuple[float | None, float | None, str]:
    """(K' MPa, n', where they came from) of the cyclic stress-strain curve: from [fatigue], else from the
    material table's row where it publishes one, else (None, None, "")."""
    keys = ("cyclic_strength", "cyclic_exponent")
    given = [k for k in keys if k in t]
    if len(given) == 1:
        other = keys[1 - keys.index(given[0])]
        raise PartError(f"fatigue.{other}: missing; give cyclic_strength (K') and cyclic_exponent (n') together")
    if given:
        strength = positive(t, "cyclic_strength", "fatigue", "stress", units)
        exponent = number(t, "cyclic_exponent", "fatigue")
        if not 0.0 < exponent < 1.0:
            raise PartError(f"fatigue.cyclic_exponent: {exponent} is outside the allowed range 0 to 1 (exclusive); "
                            "metals have n' of about 0.05 to 0.3")
        return strength, exponent, "given in [fatigue]"
    if m.grade is not None:
        from .materials import lookup_material

        row = lookup_material(m.grade)
        if row.cyclic_strength_mpa is not None:
            return row.cyclic_strength_mpa, row.cyclic_exponent, f"material table {row.key}: {row.cyclic_source}"
    return None, None, ""


def _fatigue_material(m: Material, units: str) -> None:
    """The screen needs Su and the family; aluminium and titanium also a fatigue strength at a life."""
    if m.ultimate is None:
        raise PartError("material.ultimate: missing; the [fatigue] screen needs the ultimate strength")
    if m.family is None:
        raise PartError("material.family: missing; the [fatigue] screen needs the family "
                        "(steel, stainless, aluminium or titanium)")
    from .materials import STEEL_FAMILIES

    if m.family in STEEL_FAMILIES:
        return
    if m.fatigue_strength is None:
        raise PartError(f"material.fatigue_strength: missing; {m.family} has no endurance limit, so the [fatigue] "
                        "screen needs a fatigue strength and material.fatigue_life, the life in cycles it applies to")
    if m.fatigue_life is None:
        raise PartError(f"material.fatigue_life: missing; {m.family} has no endurance limit, so state the life in "
                        "cycles that material.fatigue_strength applies to")


def _method_fits(t: dict[str, Any], method: str, m: Material, units: str) -> None:
    """The Peterson and Neuber fits are for steels, Neuber's only for Su 340-1700 MPa."""
    from .materials import STEEL_FAMILIES

    if m.family not in STEEL_FAMILIES:
        if "notch_sensitivity" in t:
            raise PartError(f"fatigue.notch_sensitivity: the built-in fits are for steels; for {m.family} give "
                            "fatigue.q, or leave both out to take q = 1 (Kf = Kt, conservative)")
        return
    low, high = NEUBER_STEEL_RANGE_MPA
    if method == "neuber" and not low <= m.ultimate <= high:
        from .units import format_number, format_quantity, from_internal, unit_label

        span = "-".join(format_number(float(from_internal(v, "stress", units)), 3) for v in (low, high))
        raise PartError(f"fatigue.notch_sensitivity: Neuber's steel fit needs an ultimate strength of "
                        f"{span} {unit_label('stress', units)}; material.ultimate is "
                        f"{format_quantity(m.ultimate, 'stress', units)}; use \"peterson\" or give fatigue.q")


def _no_compression(spec: PartSpec, what: str, only: str | None = None) -> None:
    """The sign-off needs a tensile axial force where a load case (every one, or the case named `only`) has
    one: a compressed part also needs a buckling check this tool does not make."""
    from .loading import case_keys

    for where, case in case_keys(spec):
        if only is not None and case.name != only:
            continue
        if case.load.kind in ("axial", "combined") and case.load.axial < 0.0:
            raise PartError(f"{where}.axial: the {what} needs a tensile axial force ({where}.axial > 0); a "
                            "compressive part also needs a buckling check this tool does not make")


def _safety_factor(t: dict[str, Any], key: str, where: str, default: float | None) -> float | None:
    value = number(t, key, where, required=False, default=default)
    if value is not None and not 1.0 <= value <= 100.0:
        raise PartError(f"{where}.{key}: {value} is outside the allowed range 1 to 100")
    return value


def _left_out(t: dict[str, Any], keys: tuple[str, ...]) -> tuple[str, ...]:
    return tuple(k for k in keys if k not in t)


def _mesh(t: dict[str, Any]) -> MeshControls:
    known(t, {"tolerance", "max_levels", "max_elements", "order", "solver"}, "mesh")
    default = MeshControls()
    tol = number(t, "tolerance", "mesh", required=False, default=default.tolerance)
    if not 1e-4 <= tol <= 0.2:
        raise PartError(f"mesh.tolerance: {tol} is outside the allowed range 0.0001 to 0.2")
    levels = integer(t, "max_levels", "mesh", default.max_levels, 3, 12)
    elements = integer(t, "max_elements", "mesh", default.max_elements, 1_000, 20_000_000)
    order = integer(t, "order", "mesh", default.order, 1, 2)
    solver = t.get("solver", default.solver)
    if solver not in MESH_SOLVERS:
        raise PartError(f"mesh.solver: {solver!r} is not allowed; use one of {', '.join(MESH_SOLVERS)}")
    return MeshControls(tolerance=tol, max_levels=levels, max_elements=elements, order=order, solver=solver)
