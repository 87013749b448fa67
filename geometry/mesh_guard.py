"""Checks around gmsh: what must never reach it, and what must never leave it.

Before gmsh:
- `checked_expression`: a MathEval size expression gmsh would refuse. gmsh's expression parser does not
  raise a Python exception for a malformed expression: it throws a C++ exception that nothing catches
  and the process aborts ("terminate called ...", no exit code of ours, no message, partial output). So
  every expression is parsed here first, with a grammar a little stricter than gmsh's (checked against
  gmsh 4: unary minus only at the start of an expression, after "(" or ","; "x - -1", "x * -1", "x^-1",
  "nan" and "inf" abort).
- `check_finite`: every number of the part finite (OpenCASCADE's behaviour with NaN is undefined).

After gmsh (`check_mesh`), each failure raises MeshError with what was found and where:
- node indices out of range;
- inverted or overlapping triangles: with every triangle turned counter-clockwise, two triangles that
  traverse the same edge in the same direction overlap (in a valid mesh neighbours traverse a shared edge
  in opposite directions);
- degenerate triangles: shape quality 4*sqrt(3)*A / (l1^2 + l2^2 + l3^2) (1 for an equilateral triangle,
  0 for a collapsed one) below MIN_QUALITY; gmsh's meshes of the bundled examples stay above 0.4;
- a mesh in more than one piece (the stiffness of each piece would be singular);
- a meshed area that differs from the part's exact area by more than AREA_TOLERANCE (a missing or doubled
  region; curved edges are chords, which costs far less than this).
"""

from __future__ import annotations

import dataclasses
import math
import re

import numpy as np
import scipy.sparse as sp
from scipy.sparse.csgraph import connected_components

from .errors import MeshError
from .mesh import Mesh
from .spec import PartSpec

MIN_QUALITY = 0.02  # a triangle this flat (longest-to-height ratio of about 100) is degenerate
AREA_TOLERANCE = 0.01  # relative difference of meshed and exact area that means a region is missing

UNARY_FUNCTIONS = {"Sqrt", "Fabs", "Abs", "Exp", "Log", "Log10", "Sin", "Cos", "Tan", "Atan", "Asin", "Acos",
                   "Ceil", "Floor", "Step"}
BINARY_FUNCTIONS = {"Min", "Max"}
VARIABLES = {"x", "y", "z"}
_TOKEN = re.compile(r"\s*(?:(?P<number>(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)|(?P<name>[A-Za-z][A-Za-z0-9]*)"
                    r"|(?P<op>[-+*/^(),]))")


def checked_expression(text: str) -> str:
    """`text` unchanged if gmsh's MathEval parser accepts it; otherwise MeshError (never an abort)."""
    tokens = _tokens(text)
    parser = _Parser(tokens, text)
    parser.expression()
    if parser.at < len(tokens):
        parser.fail(f"unexpected {tokens[parser.at][1]!r}")
    return text


def _tokens(text: str) -> list[tuple[str, str]]:
    out, at = [], 0
    while at < len(text):
        if text[at:].strip() == "":
            break
        match = _TOKEN.match(text, at)
        if match is None:
            raise MeshError(f"internal size expression refused before meshing (gmsh would abort): "
                            f"unexpected text at {text[at:at + 20]!r}")
        kind = match.lastgroup
        out.append((kind, match.group(kind)))
        at = match.end()
    return out


class _Parser:
    """expression := [+-] term {(+|-) term}; term := factor {(*|/) factor}; factor := atom {^ atom};
    atom := number | x | y | z | Function(expression {, expression}) | (expression)."""

    def __init__(self, tokens: list[tuple[str, str]], text: str) -> None:
        self.tokens, self.text, self.at = tokens, text, 0

    def fail(self, why: str) -> None:
        shown = self.text if len(self.text) <= 80 else self.text[:80] + "..."
        raise MeshError(f"internal size expression refused before meshing (gmsh would abort): {why} in {shown!r}")

    def peek(self) -> str | None:
        return self.tokens[self.at][1] if self.at < len(self.tokens) else None

    def take(self, value: str | None = None) -> tuple[str, str]:
        if self.at >= len(self.tokens):
            self.fail("unexpected end")
        token = self.tokens[self.at]
        if value is not None and token[1] != value:
            self.fail(f"{value!r} expected, found {token[1]!r}")
        self.at += 1
        return token

    def expression(self) -> None:
        if self.peek() in ("-", "+"):
            self.take()
        self.term()
        while self.peek() in ("+", "-"):
            self.take()
            self.term()

    def term(self) -> None:
        self.factor()
        while self.peek() in ("*", "/"):
            self.take()
            self.factor()

    def factor(self) -> None:
        self.atom()
        while self.peek() == "^":
            self.take()
            self.atom()

    def atom(self) -> None:
        kind, value = self.take()
        if kind == "number":
            if not math.isfinite(float(value)):
                self.fail(f"number {value} out of range")
            return
        if kind == "name":
            if value in VARIABLES:
                return
            arity = 1 if value in UNARY_FUNCTIONS else 2 if value in BINARY_FUNCTIONS else 0
            if arity == 0:
                self.fail(f"unknown name {value!r}")
            self.take("(")
            self.expression()
            for _ in range(arity - 1):
                self.take(",")
                self.expression()
            self.take(")")
            return
        if value == "(":
            self.expression()
            self.take(")")
            return
        self.fail(f"unexpected {value!r}")


def check_finite(spec: PartSpec) -> None:
    """MeshError naming the first non-finite number of the part (a PartSpec built in code can hold one;
    the part-file reader refuses them)."""
    for name, value in _numbers(spec, "part"):
        if not math.isfinite(value):
            raise MeshError(f"{name} is {value!r}; gmsh cannot build a part from a non-finite number")


def _numbers(node, name: str):
    if dataclasses.is_dataclass(node):
        for f in dataclasses.fields(node):
            yield from _numbers(getattr(node, f.name), f"{name}.{f.name}")
    elif isinstance(node, (tuple, list)):
        for i, item in enumerate(node):
            yield from _numbers(item, f"{name}[{i}]")
    elif isinstance(node, float):
        yield name, node


def triangle_quality(nodes: np.ndarray, triangles: np.ndarray) -> np.ndarray:
    """Shape quality of each triangle: 4 sqrt(3) |A| / (sum of squared edge lengths), in [0, 1]."""
    p = nodes[triangles]
    e = np.stack([p[:, 1] - p[:, 0], p[:, 2] - p[:, 1], p[:, 0] - p[:, 2]], axis=1)
    area = 0.5 * np.abs(e[:, 0, 0] * e[:, 2, 1] - e[:, 0, 1] * e[:, 2, 0])
    squares = (e ** 2).sum(axis=(1, 2))
    with np.errstate(invalid="ignore", divide="ignore"):
        q = 4.0 * math.sqrt(3.0) * area / squares
    return np.where(np.isfinite(q), q, 0.0)


def check_mesh(spec: PartSpec, mesh: Mesh) -> None:
    """MeshError if the mesh is malformed, degenerate, inverted, in pieces or missing a region."""
    nodes, tris = mesh.nodes, mesh.triangles
    n = nodes.shape[0]
    if tris.size == 0:
        raise MeshError("gmsh produced no triangles")
    if not np.all(np.isfinite(nodes)):
        raise MeshError("gmsh produced nodes with non-finite coordinates")
    if tris.min() < 0 or tris.max() >= n:
        raise MeshError("gmsh produced triangles that refer to nodes it did not return")
    for name, edges in mesh.edges.items():
        if edges.size and (edges.min() < 0 or edges.max() >= n):
            raise MeshError(f"gmsh produced boundary edges on {name} that refer to nodes it did not return")

    edges = np.concatenate([tris[:, [0, 1]], tris[:, [1, 2]], tris[:, [2, 0]]]).astype(np.int64)
    keys = edges[:, 0] * n + edges[:, 1]
    unique, counts = np.unique(keys, return_counts=True)
    if np.any(counts > 1):
        a, b = divmod(int(unique[np.argmax(counts)]), n)
        x, y = 0.5 * (nodes[a] + nodes[b])
        raise MeshError(f"the mesh has inverted or overlapping triangles (an edge near ({x:.4g}, {y:.4g}) mm "
                        "is traversed twice in the same direction)")

    quality = triangle_quality(nodes, tris)
    bad = int(np.argmin(quality))
    if quality[bad] < MIN_QUALITY:
        cx, cy = nodes[tris[bad]].mean(axis=0)
        count = int(np.count_nonzero(quality < MIN_QUALITY))
        raise MeshError(f"the mesh has {count} degenerate triangle(s) (shape quality {quality[bad]:.2g} < "
                        f"{MIN_QUALITY:g}) near ({cx:.4g}, {cy:.4g}) mm; the geometry may be too thin there")

    adjacency = sp.coo_matrix((np.ones(len(edges)), (edges[:, 0], edges[:, 1])), shape=(n, n))
    pieces, _ = connected_components(adjacency, directed=False)
    if pieces > 1:
        raise MeshError(f"the mesh is in {pieces} separate pieces; features must leave the part in one piece")

    expected = _meshed_region(spec).area
    p = nodes[tris]
    meshed = 0.5 * float(np.sum(np.abs((p[:, 1, 0] - p[:, 0, 0]) * (p[:, 2, 1] - p[:, 0, 1])
                                       - (p[:, 2, 0] - p[:, 0, 0]) * (p[:, 1, 1] - p[:, 0, 1]))))
    if expected > 0 and abs(meshed / expected - 1.0) > AREA_TOLERANCE:
        raise MeshError(f"the mesh covers {meshed:.6g} mm² but the part's area is {expected:.6g} mm² "
                        f"({meshed / expected - 1.0:+.2%}); a region is missing or meshed twice")


def _meshed_region(spec: PartSpec):
    """The part's exact outline (shapely), cut at its symmetry planes when the model uses them."""
    from shapely.geometry import box

    from .outline import part_polygon

    region = part_polygon(spec)
    if getattr(spec.support, "symmetry", ()):
        from .symmetry import modelled_box

        region = region.intersection(box(*modelled_box(spec)))
    return region
