"""Published estimates of a fastener's shear stiffness, for fem.fastener_groups.Fastener.stiffness (N/mm).

Huth's empirical flexibility of a bolted or riveted lap joint (docs/references.md [Huth], from memory):

    C = ((t1 + t2) / (2 d))^a (b / n) (1/(t1 E1) + 1/(n t2 E2) + 1/(2 t1 E3) + 1/(2 n t2 E3))   (mm/N)

t1, E1 and t2, E2 the two joined plates' thicknesses (mm) and moduli (MPa), E3 the fastener's modulus,
d its diameter (mm), n = 1 in single shear and 2 in double shear (t2, E2 then the middle plate, as
recalled), and (a, b) = (2/3, 3.0) for bolted metallic joints, (2/5, 2.2) for riveted metallic ones and
(2/3, 4.2) for bolted graphite/epoxy ones. The stiffness is 1 / C.

What the formula stands for: the relative displacement of the two plates at the fastener beyond their
own stretch, measured on joints, so it includes both plates' local bearing deformation. The plate that
fem.fastener_groups meshes deforms at its own hole already (about 1/(E t) of bearing compliance for a
neat pin: tests/test_fastener_groups.py measures it), so Huth's stiffness counts that part twice and is on
the soft side; the connecting member is rigid and adds none. Check the recalled constants against the
source before relying on them.
"""

from __future__ import annotations

HUTH_JOINTS = {  # joint kind: (a, b), docs/references.md [Huth] (from memory)
    "bolted metallic": (2.0 / 3.0, 3.0),
    "riveted metallic": (2.0 / 5.0, 2.2),
    "bolted graphite/epoxy": (2.0 / 3.0, 4.2),
}


def huth_flexibility(diameter: float, thickness_1: float, modulus_1: float, thickness_2: float, modulus_2: float,
                     fastener_modulus: float, shear_planes: int = 1, joint: str = "bolted metallic") -> float:
    """Huth's fastener flexibility C (mm/N) (module docstring); `joint` one of HUTH_JOINTS."""
    if joint not in HUTH_JOINTS:
        raise ValueError(f"unknown joint kind {joint!r}; use one of {', '.join(HUTH_JOINTS)}")
    if shear_planes not in (1, 2):
        raise ValueError("Huth's formula is for single shear (1) or double shear (2)")
    values = (diameter, thickness_1, modulus_1, thickness_2, modulus_2, fastener_modulus)
    if not all(v > 0.0 for v in values):
        raise ValueError("Huth's formula needs positive diameters, thicknesses and moduli")
    a, b = HUTH_JOINTS[joint]
    n = shear_planes
    t1, t2, E3 = thickness_1, thickness_2, fastener_modulus
    return (((t1 + t2) / (2.0 * diameter)) ** a * (b / n)
            * (1.0 / (t1 * modulus_1) + 1.0 / (n * t2 * modulus_2) + 1.0 / (2.0 * t1 * E3) + 1.0 / (2.0 * n * t2 * E3)))


def huth_stiffness(diameter: float, thickness_1: float, modulus_1: float, thickness_2: float, modulus_2: float,
                   fastener_modulus: float, shear_planes: int = 1, joint: str = "bolted metallic") -> tuple[float, str]:
    """(stiffness N/mm, source in words) of Huth's formula, for Fastener(stiffness=..., stiffness_source=...)."""
    c = huth_flexibility(diameter, thickness_1, modulus_1, thickness_2, modulus_2, fastener_modulus, shear_planes,
                         joint)
    return 1.0 / c, f"Huth (1986), {joint}, {'double' if shear_planes == 2 else 'single'} shear (from memory)"
