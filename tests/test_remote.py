"""Remote stress states on a plate with a small central hole: the hole-edge peaks of Kirsch's solution
superposed for biaxial and shear states, full and symmetric models, and the compressive peak."""

from __future__ import annotations

import pytest

from stressraiser.compare.check import check_part
from stressraiser.geometry.partfile import part_from_dict

A = 5.0  # hole radius, mm
SIDE = 200.0  # square plate, mm: the hole spans 1/20 of it


def _plate(remote, symmetry=()):
    return part_from_dict({
        "plate": {"length": SIDE, "width": SIDE, "thickness": 2.0},
        "hole": [{"center": [0.0, 0.0], "diameter": 2 * A}],
        "material": {"E": 70000.0, "nu": 0.33},
        "load": {"remote": remote},
        "support": {"symmetry": list(symmetry)},
    })


# Kirsch superposed (G. Kirsch, Z. VDI 42, 1898; S. P. Timoshenko and J. N. Goodier, Theory of Elasticity,
# 3rd ed. (from memory); docs/references.md [Kirsch]): on the hole edge
# s_tt = (sx + sy) - 2 (sx - sy) cos 2t - 4 txy sin 2t, so the peak is 2 x remote for an equibiaxial
# state and 4 x for pure shear. The plate is 20 holes wide, so its finite size shifts these by well
# under the 2 % allowed.
@pytest.mark.parametrize("remote, symmetry, peak", [
    ({"sx": 100.0, "sy": 100.0}, (), 200.0),
    ({"sx": 100.0, "sy": 100.0}, ("x", "y"), 200.0),
    ({"txy": 100.0}, (), 400.0),
    ({"sx": 100.0, "sy": 50.0}, ("x", "y"), 250.0),
])
def test_hole_edge_peak_is_kirsch_superposed(remote, symmetry, peak):
    result = check_part(_plate(remote, symmetry))
    assert result.kt.converged
    assert result.peak.stress == pytest.approx(peak, rel=0.02)  # Kirsch superposed, see above
    assert result.nominal.net.key == "remote"
    assert result.kt.net == pytest.approx(peak / max(abs(v) for v in remote.values()), rel=0.02)
    # statics: the net section across the hole carries sx times the gross end area (common practice)
    sx = remote.get("sx", 0.0)
    if sx:
        assert result.net_section.fe_force == pytest.approx(sx * SIDE * 2.0, rel=0.005)


def test_pure_shear_peaks_of_both_signs_and_equivalent_stresses():
    result = check_part(_plate({"txy": 100.0}))
    s = result.stresses
    # Kirsch superposed (see above): s_tt = -4 txy sin 2t, so +400 and -400 MPa on the hole edge, where the
    # only stress is s_tt: von Mises and Tresca are |s_tt| there (common practice)
    assert s.max_principal.value == pytest.approx(400.0, rel=0.02)
    assert s.min_principal.value == pytest.approx(-400.0, rel=0.02)
    assert s.von_mises.value == pytest.approx(400.0, rel=0.02)
    assert s.tresca.value == pytest.approx(400.0, rel=0.02)


def test_compressive_peak_governs_under_remote_compression():
    result = check_part(_plate({"sx": -100.0}))
    # Kirsch: uniaxial compression -s gives -3 s at 90 degrees and +s at 0 degrees on the hole edge
    assert result.peak.stress == pytest.approx(-300.0, rel=0.02)
    assert abs(result.peak.location[1]) == pytest.approx(A, rel=1e-6)
    assert result.stresses.compressive_governs
    assert result.stresses.max_principal.value == pytest.approx(100.0, rel=0.02)
    assert result.kt.net == pytest.approx(3.0, rel=0.02)
