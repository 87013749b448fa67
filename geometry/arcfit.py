"""Smooth plane curves (ellipses, splines) as tangent-continuous chains of circular arcs.

A cut file may hold curves the mesher has no exact piece for. Flattening them into straight chords would
put a small corner at every vertex, and a corner whose material angle exceeds 180 degrees (a chord of a
hole's edge, seen from the material) is a weak singularity that keeps the peak stress growing under
refinement. Arcs keep the boundary smooth: each curve is replaced by biarcs — pairs of circular arcs
meeting with a common tangent that match the curve's end points and end tangents — each as long as two
tests allow at SAMPLES points along it (a greedy search from the curve's start):
- every point of the curve lies within `tolerance` (mm) of the arcs, and
- each arc's curvature is within BEND (2 %) of the curve's own curvature there, where the curve is at
  least half as curved as at its sharpest, and within 1 % of the sharpest curvature elsewhere. The peak
  stress at a smooth edge is set by its radius of curvature: arcs that only stay close (an 8 x 3.2 mm
  ellipse at 0.01 mm) misstate its tip radius by 5 %. The flatter stretches are held to an absolute
  mismatch rather than to their own curvature, which would about double the arcs.
The chain is tangent-continuous (G1) wherever the curve is, so the mesher grades each arc by its radius as
it does a drawn fillet.

Biarc construction with equal tangent lengths after K. M. Bolton, "Biarc curves", Computer-Aided Design 7
(1975) (docs/references.md [Bolton]). A curve that is itself a straight line or a circular arc (a
rational spline drawn as a circle, an ellipse with equal axes) is returned as that one exact piece.

Coordinates in mm. A curve is a function of an array of parameters returning its points (k, 2), first
derivatives (k, 2) and second derivatives (k, 2); the chain runs from t0 to t1. Curvature is signed,
positive where the curve turns counter-clockwise.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass

import numpy as np

from .errors import PartError
from .shapes import Arc, Line, Segment

Curve = Callable[[np.ndarray], tuple[np.ndarray, np.ndarray, np.ndarray]]

SAMPLES = 16  # points per fitted piece at which distance and curvature are compared with the curve
BEND = 0.02  # largest curvature mismatch, relative to the curve's curvature ...
HALF = 0.5  # ... or to this fraction of its largest curvature, whichever is larger (module docstring)
MARGIN = 0.95  # pieces are held to this share of the tolerance at the samples: between them the distance
#                may rise a little (by about 0.5 % of it with 16 samples), and must stay within the tolerance
BISECTIONS = 5  # steps of the search for the longest piece: its length to 1/32 of the last doubling
MOST_PIECES = 4000  # more arcs than this for one curve: the tolerance is unreasonably fine for its size
EXACT = 1e-9  # relative: a curve within this of a line or circle (of its size) is that line or circle


@dataclass(frozen=True)
class ArcChain:
    """The pieces replacing one curve, from its start to its end; the largest distance (mm) and curvature
    mismatch (relative) measured between the curve and them; exact when the curve was a line or an arc."""

    pieces: tuple[Segment, ...]
    deviation: float
    bend: float
    exact: bool


def fit_curve(curve: Curve, t0: float, t1: float, tolerance: float, breaks: Sequence[float] = (),
              where: str = "a curve") -> ArcChain:
    """Lines and arcs following `curve` from t0 to t1 (t0 < t1) within `tolerance` (mm) and BEND (module
    docstring). `breaks` are parameters where the curve may turn a corner (a tangent discontinuity): the
    chain has a vertex there. PartError naming `where` if more than MOST_PIECES pieces would be needed."""
    exact = _exact_piece(curve, t0, t1)
    if exact is not None:
        return ArcChain((exact,), 0.0, 0.0, True)
    cuts = np.unique(np.concatenate([[t0], [b for b in breaks if t0 < b < t1], [t1]]))
    points, d1, d2 = curve(np.linspace(t0, t1, 257))
    size = max(float(np.ptp(points, axis=0).max()), 1e-300)
    flat = max(HALF * float(np.abs(curvature(d1, d2)).max()), 1.0 / size)  # the floor of the relative mismatch
    pieces: list[Segment] = []
    worst, worst_bend = 0.0, 0.0
    for a, b in zip(cuts[:-1], cuts[1:]):
        delta = 1e-9 * (b - a)
        lo, step = float(a), float(b) - float(a)
        while lo < b:
            step, pair, deviation, bend = _longest(curve, lo, float(b), step, delta, flat, tolerance)
            pieces += pair
            worst, worst_bend = max(worst, deviation), max(worst_bend, bend)
            if len(pieces) > MOST_PIECES:
                raise PartError(f"{where}: more than {MOST_PIECES} arcs would be needed to follow it within "
                                f"{tolerance:g} mm; give a coarser tolerance")
            lo = lo + step if lo + step < b else float(b)
    return ArcChain(tuple(pieces), worst, worst_bend, False)


def _longest(curve: Curve, lo: float, end: float, guess: float, delta: float, flat: float, tolerance: float):
    """The longest parameter step from `lo` (to `end` at most) whose biarc passes both tests, found by
    doubling or halving `guess` and then BISECTIONS bisections (the pieces come out near the fewest the tests
    allow, rather than in powers of two). Returns (step, pieces, deviation, bend)."""
    def passes(step: float):
        pair, deviation, bend = _biarc_over(curve, lo, min(lo + step, end), delta, flat)
        return (deviation <= MARGIN * tolerance and bend <= BEND), (pair, deviation, bend)

    floor = 1e-12 * (end - lo + guess)
    step = min(guess, end - lo)
    ok, best = passes(step)
    if ok:
        while ok and lo + step < end:  # grow while it passes
            good, best_good = step, best
            step = min(2.0 * step, end - lo)
            ok, best = passes(step)
        if ok:
            return step, *best
        low, high = good, step
        best = best_good
    else:
        while not ok and step > floor:  # shrink until it passes
            high = step
            step *= 0.5
            ok, best = passes(step)
        if not ok:
            return step, *best  # a corner the breaks did not name: accept the tiny piece
        low = step
    for _ in range(BISECTIONS):
        mid = 0.5 * (low + high)
        ok, found = passes(mid)
        if ok:
            low, best = mid, found
        else:
            high = mid
    return low, *best


def _biarc_over(curve: Curve, lo: float, hi: float, delta: float, flat: float) -> tuple[list[Segment], float, float]:
    """The biarc over [lo, hi], the largest distance from the curve to it and the largest relative curvature
    mismatch, at SAMPLES interior points (one evaluation of the curve)."""
    ts = np.concatenate([[lo, hi, lo + delta, hi - delta], np.linspace(lo, hi, SAMPLES + 2)[1:-1]])
    pts, d1, d2 = curve(ts)
    pair = biarc(pts[0], _unit(curve, d1[2], lo, +delta), pts[1], _unit(curve, d1[3], hi, -delta))
    gaps = np.array([distance_to(s, pts[4:]) for s in pair])
    nearest = np.argmin(gaps, axis=0)
    kappa = curvature(d1[4:], d2[4:])
    piece_kappa = np.array([_curvature(s) for s in pair])[nearest]
    bend = np.abs(piece_kappa - kappa) / np.maximum(np.abs(kappa), flat)
    return pair, float(gaps.min(axis=0).max()), float(bend.max())


def curvature(d1: np.ndarray, d2: np.ndarray) -> np.ndarray:
    """Signed curvature (1/mm) of a curve from its first and second derivatives (k, 2)."""
    return (d1[:, 0] * d2[:, 1] - d1[:, 1] * d2[:, 0]) / np.maximum(np.hypot(*d1.T) ** 3, 1e-300)


def _curvature(seg: Segment) -> float:
    """Signed curvature (1/mm) of a piece: + for an arc turning counter-clockwise, 0 for a line."""
    if isinstance(seg, Line):
        return 0.0
    return math.copysign(1.0 / seg.radius, seg.end - seg.start)


def _unit(curve: Curve, d: np.ndarray, t: float, step: float) -> np.ndarray:
    """Unit tangent from the derivative d taken a tiny `step` inside the span at t (one-sided at a corner);
    where the derivative vanishes (a repeated control point), the direction of the chord over a small step."""
    norm = float(np.hypot(*d))
    if norm > 0.0:
        return d / norm
    q = curve(np.array([t + 1e3 * step, t]))[0]
    chord = (q[0] - q[1]) * math.copysign(1.0, step)
    return chord / float(np.hypot(*chord))


def biarc(p0: np.ndarray, t0: np.ndarray, p1: np.ndarray, t1: np.ndarray) -> list[Segment]:
    """Two arcs (or lines) from p0 with unit tangent t0 to p1 with unit tangent t1, meeting at one point with
    a common tangent; the two tangent lengths are equal ([Bolton])."""
    v = p1 - p0
    vv = float(v @ v)
    vs = float(v @ (t0 + t1))
    denom = 2.0 * (1.0 - float(t0 @ t1))
    if denom <= 1e-12:  # parallel end tangents
        vt = float(v @ t1)
        if abs(vt) <= 1e-12 * math.sqrt(vv):  # tangents across the chord: two half circles (an S)
            mid = p0 + 0.5 * v
            return [tangent_arc(p0, t0, mid), tangent_arc(p1, -t1, mid).reversed()]
        d = vv / (4.0 * vt)
    else:
        d = (-vs + math.sqrt(vs * vs + denom * vv)) / denom
    mid = 0.5 * (p0 + d * t0 + p1 - d * t1)
    pair = [tangent_arc(p0, t0, mid), tangent_arc(p1, -t1, mid).reversed()]
    if all(isinstance(s, Line) for s in pair):  # a straight stretch: one line
        return [Line(pair[0].start, pair[1].end)]
    return pair


def tangent_arc(p: np.ndarray, t: np.ndarray, q: np.ndarray) -> Segment:
    """The arc leaving p along the unit tangent t and ending at q (a line when q lies ahead on the
    tangent)."""
    w = q - p
    ww = float(w @ w)
    normal = np.array([-t[1], t[0]])
    across = 2.0 * float(normal @ w)
    # a sagitta below 1e-12 of the chord is a straight line for every purpose of the model
    if ww == 0.0 or abs(across) <= 4e-12 * math.sqrt(ww):
        return Line((float(p[0]), float(p[1])), (float(q[0]), float(q[1])))
    signed = ww / across  # > 0: the centre is to the left, the arc turns counter-clockwise
    centre = p + signed * normal
    a0 = math.atan2(p[1] - centre[1], p[0] - centre[0])
    a1 = math.atan2(q[1] - centre[1], q[0] - centre[0])
    turn = (a1 - a0) % (2.0 * math.pi) if signed > 0 else -((a0 - a1) % (2.0 * math.pi))
    return Arc((float(centre[0]), float(centre[1])), abs(signed), a0, a0 + turn)


def distance_to(seg: Segment, points: np.ndarray) -> np.ndarray:
    """Distance (mm) from each of `points` (k, 2) to a line segment or circular arc."""
    if isinstance(seg, Line):
        a, b = np.asarray(seg.start), np.asarray(seg.end)
        ab = b - a
        t = np.clip(((points - a) @ ab) / max(float(ab @ ab), 1e-300), 0.0, 1.0)
        return np.hypot(*(points - a - t[:, None] * ab).T)
    rel = points - np.asarray(seg.center)
    lo, hi = seg.ccw
    angle = lo + (np.arctan2(rel[:, 1], rel[:, 0]) - lo) % (2.0 * math.pi)
    on_span = np.abs(np.hypot(*rel.T) - seg.radius)
    ends = np.minimum(np.hypot(*(points - np.asarray(seg.first)).T), np.hypot(*(points - np.asarray(seg.last)).T))
    return np.where(angle <= hi, on_span, ends)


def _exact_piece(curve: Curve, t0: float, t1: float) -> Segment | None:
    """The curve as one Line or Arc if it is one (within EXACT of its size at 33 points), else None."""
    pts = curve(np.linspace(t0, t1, 33))[0]
    size = float(np.ptp(pts, axis=0).max())
    if size == 0.0:
        return None
    closed = float(np.hypot(*(pts[-1] - pts[0]))) <= 1e-6 * size
    if not closed:
        line = Line((float(pts[0, 0]), float(pts[0, 1])), (float(pts[-1, 0]), float(pts[-1, 1])))
        if float(distance_to(line, pts).max()) <= EXACT * size:
            return line
    centre = _circumcentre(pts[0], pts[16], pts[8] if closed else pts[-1])
    if centre is None:
        return None
    radii = np.hypot(*(pts - centre).T)
    radius = float(radii.mean())
    if float(np.abs(radii - radius).max()) > EXACT * max(radius, size):
        return None
    angles = np.unwrap(np.arctan2(pts[:, 1] - centre[1], pts[:, 0] - centre[0]))
    if np.any(np.diff(angles) * np.sign(angles[-1] - angles[0]) <= 0.0):
        return None  # doubles back: not a simple arc
    return Arc((float(centre[0]), float(centre[1])), radius, float(angles[0]), float(angles[-1]))


def _circumcentre(a: np.ndarray, b: np.ndarray, c: np.ndarray) -> np.ndarray | None:
    """Centre of the circle through three points, or None when they are (nearly) collinear."""
    ab, ac = b - a, c - a
    cross = 2.0 * (ab[0] * ac[1] - ab[1] * ac[0])
    if abs(cross) <= 1e-12 * float(ab @ ab + ac @ ac):
        return None
    ab2, ac2 = float(ab @ ab), float(ac @ ac)
    return a + np.array([ac[1] * ab2 - ab[1] * ac2, ab[0] * ac2 - ac[0] * ab2]) / cross
