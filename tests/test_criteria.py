"""The failure criteria of the peak check (von Mises for ductile metals, maximum principal stress for brittle
ones; docs/references.md [Criteria]) on Kirsch's field, against the closed form.

The design check's criteria are fem.recovery.von_mises and fem.recovery.principal_stresses applied to
Cartesian stresses. Kirsch's field (docs/references.md [Kirsch]; tests/analytic.py) is written here in polar
components, where the closed forms are: von Mises sqrt(s_rr^2 - s_rr s_tt + s_tt^2 + 3 s_rt^2) and the
largest principal stress (s_rr + s_tt)/2 + sqrt(((s_rr - s_tt)/2)^2 + s_rt^2) (both invariant under the
rotation to polar axes); on the hole's edge s_rr = s_rt = 0 and s_tt = s (1 - 2 cos 2t), so von Mises is
|s (1 - 2 cos 2t)|, 3 s at t = 90 degrees, and in plane strain (szz = nu s_tt) |s_tt| sqrt(1 - nu + nu^2).
Tolerance: 1e-12 relative (the same quantity in two frames).
"""

from __future__ import annotations

import numpy as np
import pytest

from stressraiser.fem.recovery import principal_stresses, von_mises

from analytic import kirsch_polar, kirsch_stress

A, S = 1.0, 100.0  # hole radius (mm) and remote stress (MPa)
REL = 1e-12


def _grid():
    r, t = np.meshgrid(np.linspace(A, 5 * A, 9), np.linspace(0.0, 2 * np.pi, 37))
    return r.ravel(), t.ravel()


def _polar():
    r, t = _grid()
    return np.array([kirsch_polar(ri, ti, A, S) for ri, ti in zip(r, t)])


def test_von_mises_on_the_kirsch_field_is_the_closed_form() -> None:
    r, t = _grid()
    cartesian = kirsch_stress(np.column_stack([r * np.cos(t), r * np.sin(t)]), A, S)
    srr, stt, srt = _polar().T
    closed = np.sqrt(srr**2 - srr * stt + stt**2 + 3 * srt**2)  # [Criteria], polar axes
    assert von_mises(cartesian) == pytest.approx(closed, rel=REL, abs=REL * S)


def test_maximum_principal_on_the_kirsch_field_is_the_closed_form() -> None:
    r, t = _grid()
    cartesian = kirsch_stress(np.column_stack([r * np.cos(t), r * np.sin(t)]), A, S)
    srr, stt, srt = _polar().T
    closed = 0.5 * (srr + stt) + np.hypot(0.5 * (srr - stt), srt)  # [Criteria], polar axes
    assert principal_stresses(cartesian)[:, 0] == pytest.approx(closed, rel=REL, abs=REL * S)


def test_on_the_hole_edge_both_criteria_give_the_tangential_stress() -> None:
    t = np.linspace(0.0, 2 * np.pi, 73)
    edge = kirsch_stress(np.column_stack([A * np.cos(t), A * np.sin(t)]), A, S)
    stt = S * (1 - 2 * np.cos(2 * t))  # [Kirsch] on the edge
    assert von_mises(edge) == pytest.approx(np.abs(stt), rel=REL, abs=REL * S)
    assert principal_stresses(edge)[:, 0] == pytest.approx(np.maximum(stt, 0.0), rel=REL, abs=1e-9 * S)
    assert von_mises(edge).max() == pytest.approx(3 * S, rel=REL)  # Kt = 3 by either criterion
    # plane strain: szz = nu s_tt on the edge, von Mises |s_tt| sqrt(1 - nu + nu^2) (the definition)
    nu = 0.3
    szz = nu * (edge[:, 0] + edge[:, 1])
    assert von_mises(edge, szz) == pytest.approx(np.abs(stt) * np.sqrt(1 - nu + nu**2), rel=1e-9, abs=1e-9 * S)
