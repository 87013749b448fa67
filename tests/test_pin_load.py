"""A pin load through a hole: the cosine bearing pressure, its nominal stresses, and a half model.

No published pin-loaded lug Kt is asserted here: no chart could be recalled reliably enough to cite, so
the checks are statics, the definitions, and the symmetry of the model.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from stressraiser.compare.check import check_part
from stressraiser.fem.loads import part_loads, pin_peak_pressure
from stressraiser.geometry.meshing import mesh_part
from stressraiser.geometry.partfile import part_from_dict
from stressraiser.geometry.registry import RaiserId

P, D, T = 24000.0, 20.0, 8.0


def _clevis(direction=0.0, symmetry=()):
    return part_from_dict({"plate": {"length": 150.0, "width": 50.0, "thickness": T},
                           "hole": [{"center": [50.0, 0.0], "diameter": D}], "lug": {"hole": 1},
                           "material": {"E": 205000.0, "nu": 0.29},
                           "load": {"pin": {"hole": 1, "force": P, "direction": direction}},
                           "support": {"symmetry": list(symmetry)}})


@pytest.mark.parametrize("direction", [0.0, 25.0])
def test_pin_pressure_sums_to_the_pin_force(direction):
    spec = _clevis(direction)
    mesh = mesh_part(spec, 0.7)
    f = part_loads(spec, mesh)
    hole = mesh.edge_nodes(RaiserId("hole", 1))
    fx, fy = f[0::2][hole].sum(), f[1::2][hole].sum()
    a = math.radians(direction)
    # the pressure's resultant is the pin force along its direction (statics); the cosine distribution
    # p0 cos(t - a) on the half facing a has resultant p0 r t pi / 2, so p0 = 4 P / (pi d t) (common practice)
    assert (fx, fy) == pytest.approx((P * math.cos(a), P * math.sin(a)), abs=1e-6 * P)
    assert pin_peak_pressure(P, D, T) == pytest.approx(4 * P / (math.pi * D * T))
    assert np.all(f[0::2][np.setdiff1d(np.arange(mesh.n_nodes), hole)] == 0.0)


def test_half_model_matches_the_full_model():
    full, half = check_part(_clevis()), check_part(_clevis(symmetry=("y",)))
    # a part, pin and load symmetric about y = 0: the half model with rollers on the plane is the same
    # problem (common practice), so the converged peaks agree within their error bands
    band = full.kt.error + half.kt.error
    assert half.peak.stress == pytest.approx(full.peak.stress, rel=max(band, 0.005))
    for result in (full, half):
        keys = {n.key: n for n in result.nominal.all}
        assert keys["bearing"].stress == pytest.approx(P / (D * T))  # bearing stress P / (d t) (definition)
        assert keys["pin-net"].stress == pytest.approx(P / ((50.0 - D) * T))  # net section through the hole
        assert result.net_section.fe_force == pytest.approx(P, rel=0.005)  # statics across the pin hole
        assert result.nominal.net.key == "pin-net"
