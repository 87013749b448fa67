"""The FE Kt a handbook case is compared with: that of the raiser the case describes.

Most cases describe the part's governing peak (a central hole, a notch pair, a shoulder). A few describe
one raiser of the part that need not govern it: the infinite row of holes describes the middle hole of a
finite row, while the part's peak sits at an outer hole beside a free side (compare/raiser_cases.py,
`Recognised.raiser`). Comparing such a case with the governing Kt compares unlike things; comparing it
with the middle hole's own converged peak (compare/check.py `raiser_peaks`) compares like with like.

The governing Kt stays the part's Kt for sign-off: the case's raiser Kt is for the handbook comparison only.
"""

from __future__ import annotations

from dataclasses import dataclass

from ..geometry.kinds.base import RaiserId
from .check import CheckResult
from .handbook import Match


@dataclass(frozen=True)
class CaseKt:
    """The FE Kt (dimensionless) of the raiser a handbook case describes.

    raiser: that raiser's name (hole 4), or the governing peak's raiser when the case describes the part's
    peak (or no case covers the part; None when that peak is at no raiser). governing: True in that second event, when kt_net, kt_gross,
    error and converged are the part's own. kt_net / kt_gross: converged peak of that raiser over the
    net / gross nominal stress of the net section through it; error: the relative error band of its peak
    (infinite when fewer than three levels gave it); converged: the study converged and that band is within
    the part's mesh.tolerance. kt_net and kt_gross are None when the check found no peak on that raiser.
    """

    raiser: RaiserId | None
    governing: bool
    kt_net: float | None
    kt_gross: float | None
    error: float | None
    converged: bool


def case_kt(result: CheckResult, match: Match | None = None) -> CaseKt:
    """The Kt `match` (default: the part's preferred handbook case) is to be compared with."""
    if match is None and result.handbook:
        match = result.handbook[0]
    raiser = match.recognised.raiser if match is not None else None
    # where a pin bears the governing peak is already the tensile one on the free edge (compare.check), so a
    # case that names the governing raiser compares with the part's own Kt
    if raiser is None or raiser == result.peak.feature:
        kt = result.kt
        return CaseKt(result.peak.feature, True, kt.net, kt.gross, kt.error, bool(kt.converged))
    peak = next((p for p in result.peaks if p.feature == raiser), None)
    if peak is None:
        return CaseKt(raiser, False, None, None, None, False)
    converged = bool(result.kt.converged) and peak.error <= result.spec.mesh.tolerance
    return CaseKt(raiser, False, peak.kt_net, peak.kt_gross, peak.error, converged)
