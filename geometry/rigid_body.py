"""Whether a part's supports hold it against every rigid-body motion, decided before anything is meshed.

A plane rigid-body motion is a translation (a, b) and a rotation w about the origin: the displacement at
(x, y) is (a - w y, b + w x). A support that holds the direction n at the point p stops it when
n . (a - w p_y, b + w p_x) = 0, one linear equation [n_x, n_y, n_y p_x - n_x p_y] . (a, b, w) = 0. The part
is held when the equations of all its supports leave only (0, 0, 0): their matrix has rank 3. This is
exact (rigid-body motions are exactly these) and cheap; the motions left free are its null space, named
in words in the refusal.

Supports counted: fixed stretches (both directions at every point), rollers (the edge normal at every
point), pin holds and each fastener of a group that holds the part (both directions at the hole's centre:
a frictionless pin cannot stop the part turning about it) and the rollers of symmetry planes.
"""

from __future__ import annotations

import math

import numpy as np

from .errors import PartError
from .registry import outline_size
from .spec import PartSpec
from .symmetry import modelled_box
from .units import format_point

RANK_TOLERANCE = 1e-9  # of the largest singular value (rotation column scaled by the part's size)


def support_rows(spec: PartSpec) -> np.ndarray:
    """(k, 3) rows [n_x, n_y, (n_y p_x - n_x p_y) / size]: one per held direction n at a point p."""
    from .boundary import outward_normals, segment_samples, stretch

    size = max(outline_size(spec))
    rows: list[np.ndarray] = []

    def hold(points: np.ndarray, normals: np.ndarray) -> None:
        moment = (normals[:, 1] * points[:, 0] - normals[:, 0] * points[:, 1]) / size
        rows.append(np.column_stack([normals, moment]))

    for h in spec.support.holds:
        if h.pin is not None:
            centre = np.array([spec.holes[h.pin - 1].center] * 2)
            hold(centre, np.eye(2))
            continue
        for seg in stretch(spec, h.where).pieces:
            points = segment_samples(seg, 5)
            if h.mode == "fixed":
                hold(points, np.tile([1.0, 0.0], (len(points), 1)))
                hold(points, np.tile([0.0, 1.0], (len(points), 1)))
            else:
                hold(points, outward_normals(seg, points))
    for g in spec.fasteners:
        if g.holds:
            for number in g.holes:
                hold(np.array([spec.holes[number - 1].center] * 2), np.eye(2))
    x0, y0, x1, y1 = modelled_box(spec)
    for plane in spec.support.symmetry:
        ends = np.array([[0.0, y0], [0.0, y1]]) if plane == "x" else np.array([[x0, 0.0], [x1, 0.0]])
        hold(ends, np.tile([1.0, 0.0] if plane == "x" else [0.0, 1.0], (2, 1)))
    return np.vstack(rows) if rows else np.zeros((0, 3))


def free_motions(spec: PartSpec) -> np.ndarray:
    """(3, m) basis of the rigid-body motions (a, b, w size) the supports leave free; m = 0 when held."""
    rows = support_rows(spec)
    if rows.shape[0] == 0:
        return np.eye(3)
    _, sv, vt = np.linalg.svd(rows)
    rank = int(np.sum(sv > RANK_TOLERANCE * sv[0]))
    return vt[rank:].T


def check_drawn(spec: PartSpec, cases: list) -> None:
    """A drawn outline has no held or loaded end: refuse one that is not held by [[hold]] entries or a holding
    fastener group, and a load
    case with end loads or a remote state, naming what is missing (a case with no load at all is refused
    as it is read). `cases`:
    (part-file key, LoadCase) of every case."""
    if spec.support.symmetry:
        raise PartError("support.symmetry: a drawn outline is modelled as drawn; draw the half or quarter and hold "
                        "its cut edges with roller [[hold]] entries")
    if not spec.support.holds and not any(group.holds for group in spec.fasteners):
        raise PartError("hold: a drawn outline has no held end; hold it with [[hold]] entries (a stretch of its edge "
                        "by at or from/to, mode \"fixed\" or \"roller\", or pin = a hole's number) or a fastener "
                        "group that holds (holds = true)")
    for where, case in cases:
        load = case.load
        if load.remote is not None:
            raise PartError(f"{where}.remote: a drawn outline is loaded on its own boundary; use [[load.edge]] "
                            f"entries, [load.pin] or [[load.fasteners]]")
        for key in ("axial", "bending", "shear"):
            if getattr(load, key) != 0.0:
                raise PartError(f"{where}.{key}: a drawn outline has no loaded end; load it with [[load.edge]] "
                                f"entries, [load.pin] or [[load.fasteners]]")


def check_held(spec: PartSpec) -> None:
    """Raise PartError naming the motion the supports leave free, if any."""
    free = free_motions(spec)
    if free.shape[1] == 0:
        return
    raise PartError(f"hold: the part is not held against rigid-body motion: nothing stops {_words(spec, free)}; "
                    "add a [[hold]] that does (mode \"fixed\" holds both directions, \"roller\" the direction "
                    "normal to its edge), or a fastener group that holds (holds = true) at a second hole")


def _words(spec: PartSpec, free: np.ndarray) -> str:
    """The free motions in words: translations by their direction, rotations by their centre."""
    size = max(outline_size(spec))
    if free.shape[1] == 3:
        return "any motion (the part has no support)"
    if free.shape[1] == 1:
        a, b, w = free[:, 0]
        if abs(w) <= RANK_TOLERANCE:
            return _translation(a, b)
        return f"a rotation about {format_point((-b * size / w, a * size / w), spec.units)}"
    # two free motions: the translation among them (w = 0), and the one orthogonal to it (a rotation)
    w = free[2]
    if np.allclose(w, 0.0, atol=RANK_TOLERANCE):
        return "a translation in any direction"
    t = free @ np.array([w[1], -w[0]])
    r = free @ np.array([w[0], w[1]])
    centre = (-r[1] * size / r[2], r[0] * size / r[2])
    return f"{_translation(t[0], t[1])} or a rotation about {format_point(centre, spec.units)}"


def _translation(a: float, b: float) -> str:
    angle = math.degrees(math.atan2(b, a)) % 180.0
    if min(angle, 180.0 - angle) < 1e-6:
        return "a translation along x"
    if abs(angle - 90.0) < 1e-6:
        return "a translation along y"
    return f"a translation at {angle:.1f} degrees to x"
