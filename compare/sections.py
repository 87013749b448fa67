"""Straight cuts through the part: ligaments from the exact outline, stress resultants from the FE.

A cut is a point p and a unit normal n (the direction whose traction is integrated); positions along
the cut are measured along d = (-n_y, n_x) from p. Forces in N, moments in N mm, stresses in MPa.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from shapely.geometry import LineString, MultiLineString, Polygon


@dataclass(frozen=True)
class Cut:
    """FE resultants and distribution on one straight cut.

    positions, normal_stress, shear_stress: samples of the recovered nodal field along the cut (mm, MPa),
    two per crossed triangle, sorted by position.
    normal_force, shear_force: integrals of the recovered tractions times thickness (N).
    moment: integral of normal traction times lever arm about `centroid` (N mm), positive when it
    stretches the material on the +d side.
    centroid: position (mm along the cut) of the centroid of the material on the cut.
    """

    point: tuple[float, float]
    normal: tuple[float, float]
    positions: np.ndarray
    normal_stress: np.ndarray
    shear_stress: np.ndarray
    normal_force: float
    shear_force: float
    moment: float
    centroid: float


def cut_resultants(nodes: np.ndarray, tris: np.ndarray, nodal_stress: np.ndarray,
                   thickness: float, point: tuple[float, float], normal: tuple[float, float],
                   span: tuple[float, float] | None = None) -> Cut:
    """Integrate the recovered nodal stresses (n, 3) across the straight cut through `point` with unit
    `normal`, interpolated linearly inside each crossed triangle; with `span` (lo, hi), only across the
    stretch of the line between those positions (mm)."""
    p0 = np.asarray(point, dtype=float)
    n = np.asarray(normal, dtype=float) / np.hypot(*normal)
    d = np.array([-n[1], n[0]])
    side = (nodes - p0) @ n  # signed distance of every node from the cut line
    s = side[tris]
    positive = s >= 0.0
    crossed = positive.any(axis=1) & ~positive.all(axis=1)
    tri, s = tris[crossed], s[crossed]
    pos = positive[crossed]
    # each crossed triangle has exactly one vertex alone on its side; the cut meets its two edges
    lone = np.where(pos.sum(axis=1) == 1, np.argmax(pos, axis=1), np.argmax(~pos, axis=1))
    rows = np.arange(tri.shape[0])
    a = lone
    b, c = (lone + 1) % 3, (lone + 2) % 3
    wb = s[rows, a] / (s[rows, a] - s[rows, b])  # fraction along a->b where side = 0
    wc = s[rows, a] / (s[rows, a] - s[rows, c])
    xa, xb, xc = nodes[tri[rows, a]], nodes[tri[rows, b]], nodes[tri[rows, c]]
    q1 = xa + wb[:, None] * (xb - xa)
    q2 = xa + wc[:, None] * (xc - xa)
    t1, t2 = (q1 - p0) @ d, (q2 - p0) @ d
    if span is not None:
        slack = 1e-9 * (abs(span[0]) + abs(span[1]) + 1.0)
        inside = (0.5 * (t1 + t2) >= span[0] - slack) & (0.5 * (t1 + t2) <= span[1] + slack)
        tri, rows, t1, t2, q1, q2 = tri[inside], np.arange(int(inside.sum())), t1[inside], t2[inside], q1[inside], q2[inside]
        a, b, c, wb, wc = a[inside], b[inside], c[inside], wb[inside], wc[inside]
    length = np.abs(t2 - t1)
    mid = 0.5 * (t1 + t2)
    # recovered nodal field, interpolated linearly to both ends of each segment
    na, nb, nc = nodal_stress[tri[rows, a]], nodal_stress[tri[rows, b]], nodal_stress[tri[rows, c]]
    s1 = na + wb[:, None] * (nb - na)
    s2 = na + wc[:, None] * (nc - na)
    centroid = float(np.sum(mid * length) / max(np.sum(length), 1e-300))
    # resultants by the trapezoidal rule on each segment (exact for the linear interpolant)
    tn1, tt1 = _tractions(s1, n, d)
    tn2, tt2 = _tractions(s2, n, d)
    N = float(thickness * np.sum(0.5 * (tn1 + tn2) * length))
    V = float(thickness * np.sum(0.5 * (tt1 + tt2) * length))
    lever1, lever2 = t1 - centroid, t2 - centroid
    M = float(thickness * np.sum(length * (tn1 * (2 * lever1 + lever2) + tn2 * (lever1 + 2 * lever2)) / 6.0))
    positions = np.concatenate([t1, t2])
    samples = np.concatenate([s1, s2])
    order = np.argsort(positions, kind="stable")
    sn, st = _tractions(samples[order], n, d)
    return Cut(tuple(p0), tuple(n), positions[order], sn, st, N, V, M, centroid)


def _tractions(stress: np.ndarray, n: np.ndarray, d: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Normal and in-cut shear components of the traction s.n for (k, 3) stresses."""
    sxx, syy, txy = stress.T
    tx = sxx * n[0] + txy * n[1]
    ty = txy * n[0] + syy * n[1]
    return tx * n[0] + ty * n[1], tx * d[0] + ty * d[1]


def ligaments(outline: Polygon, point: tuple[float, float], normal: tuple[float, float]) -> list[tuple[float, float]]:
    """Intervals (mm along the cut, sorted) where the straight cut passes through material."""
    p0 = np.asarray(point, dtype=float)
    n = np.asarray(normal, dtype=float) / np.hypot(*normal)
    d = np.array([-n[1], n[0]])
    minx, miny, maxx, maxy = outline.bounds
    reach = 2.0 * np.hypot(maxx - minx, maxy - miny) + np.abs(p0).sum()
    line = LineString([tuple(p0 - reach * d), tuple(p0 + reach * d)])
    hit = outline.intersection(line)
    pieces = hit.geoms if isinstance(hit, MultiLineString) else [hit] if isinstance(hit, LineString) else [
        g for g in getattr(hit, "geoms", []) if isinstance(g, LineString)]
    spans = []
    for piece in pieces:
        if piece.is_empty or piece.length == 0.0:
            continue
        ends = np.asarray(piece.coords)[[0, -1]]
        t = (ends - p0) @ d
        spans.append((float(t.min()), float(t.max())))
    return sorted(spans)
