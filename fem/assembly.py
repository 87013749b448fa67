"""Vectorised constant-strain-triangle (CST) kinematics, and global stiffness assembly for any element
whose shape-function gradients are given at integration points (CST here, 6-node triangles in
fem/quadratic.py).

DOF numbering: node i has DOFs 2i (u_x) and 2i+1 (u_y). No per-element Python loops.

The global matrix is assembled by 2 x 2 node blocks rather than by DOF entries: the sparsity pattern is
the node graph (each node and its mesh neighbours), found once from the element node pairs with one sort
of the undirected pairs (key and position packed in one integer: a value sort, several times faster than
an argsort); the diagonal and upper element blocks (symmetry: the lower ones are their transposes) are
summed into it with `np.bincount` (no COO matrix with 36 entries per triangle, no sort of DOF entries, no
`np.add.at`); the block rows are then expanded into CSR by scipy's compiled block-to-CSR conversion.
Element blocks are formed BLOCK elements at a time and summed CHUNK elements at a time, so the peak memory
of a large mesh stays a small multiple of the final matrix. Indices are int32.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

import numpy as np
import scipy.sparse as sp

CHUNK = 200_000  # elements summed into the global matrix at a time (bounds peak memory)
BLOCK = 4096  # elements whose matrices are formed at a time (keeps the temporaries in cache)


def triangle_areas(nodes: np.ndarray, tris: np.ndarray) -> np.ndarray:
    """Signed areas (mm^2) of triangles; positive when counter-clockwise."""
    p = nodes[tris[:, :3]]
    return 0.5 * ((p[:, 1, 0] - p[:, 0, 0]) * (p[:, 2, 1] - p[:, 0, 1]) - (p[:, 2, 0] - p[:, 0, 0]) * (p[:, 1, 1] - p[:, 0, 1]))


def shape_gradients(nodes: np.ndarray, tris: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Unscaled CST shape-function gradients: b = 2A dN/dx, c = 2A dN/dy, each (m, 3), and areas (m,)."""
    p = nodes[tris]
    x, y = p[:, :, 0], p[:, :, 1]
    b = np.stack([y[:, 1] - y[:, 2], y[:, 2] - y[:, 0], y[:, 0] - y[:, 1]], axis=1)
    c = np.stack([x[:, 2] - x[:, 1], x[:, 0] - x[:, 2], x[:, 1] - x[:, 0]], axis=1)
    area = 0.5 * (b[:, 0] * c[:, 1] - b[:, 1] * c[:, 0])
    return b, c, area


def strain_displacement(nodes: np.ndarray, tris: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """B matrices (m, 3, 6) mapping element DOFs to (exx, eyy, gxy), and areas (m,)."""
    b, c, area = shape_gradients(nodes, tris)
    B = np.zeros((tris.shape[0], 3, 6))
    B[:, 0, 0::2] = b
    B[:, 1, 1::2] = c
    B[:, 2, 0::2] = c
    B[:, 2, 1::2] = b
    B /= (2.0 * area)[:, None, None]
    return B, area


def element_dofs(elements: np.ndarray) -> np.ndarray:
    """(m, 2k) global DOF indices of k-node elements, ordered (u1, v1, u2, v2, ...)."""
    t = elements.astype(np.int64)
    return np.stack([2 * t, 2 * t + 1], axis=2).reshape(t.shape[0], -1)


@dataclass(frozen=True)
class Gradients:
    """Shape-function gradients of m k-node elements at q integration points.

    gx, gy: (m, q, k) dN/dx, dN/dy (1/mm); weight: (m, q) quadrature weight x |J| x thickness (mm^3), so
    the element stiffness is sum over points of weight * B^T D B.
    """

    gx: np.ndarray
    gy: np.ndarray
    weight: np.ndarray


def block_terms(g: Gradients, D: np.ndarray, a: np.ndarray, b: np.ndarray) -> np.ndarray:
    """Entries (00, 01, 10, 11) of the node blocks K_ab = sum_q w B_a^T D B_b, as (m, r, 4) for the r
    local node pairs (a[r], b[r]) (N/mm).

    B_a = [[dNa/dx, 0], [0, dNa/dy], [dNa/dy, dNa/dx]] maps node a's displacement to (exx, eyy, gxy);
    the products are written out term by term for a general symmetric D (zero entries skipped): no
    (m, 3, 2k) B arrays and no einsum over them.
    """
    wx, wy = g.gx * g.weight[:, :, None], g.gy * g.weight[:, :, None]
    terms = {"xx": _point_sum(wx[:, :, a], g.gx[:, :, b]), "yy": _point_sum(wy[:, :, a], g.gy[:, :, b]),
             "xy": _point_sum(wx[:, :, a], g.gy[:, :, b]), "yx": _point_sum(wy[:, :, a], g.gx[:, :, b])}
    out = np.empty(terms["xx"].shape + (4,))
    for comp, combo in enumerate(_BLOCK_TERMS):
        out[..., comp] = sum(D[i, j] * terms[name] for (i, j), name in combo if D[i, j] != 0.0)
    return out


# entry (p, q) of B_a^T D B_b, in the order 00, 01, 10, 11, as a sum of D[i, j] * (dNa/d. dNb/d.) terms
_BLOCK_TERMS = (
    (((0, 0), "xx"), ((0, 2), "xy"), ((2, 0), "yx"), ((2, 2), "yy")),
    (((0, 1), "xy"), ((0, 2), "xx"), ((2, 1), "yy"), ((2, 2), "yx")),
    (((1, 0), "yx"), ((1, 2), "yy"), ((2, 0), "xx"), ((2, 2), "xy")),
    (((1, 1), "yy"), ((1, 2), "yx"), ((2, 1), "xy"), ((2, 2), "xx")),
)


def _point_sum(f: np.ndarray, g: np.ndarray) -> np.ndarray:
    """(m, r) sum over the q points of f * g for (m, q, r) arrays."""
    out = f[:, 0] * g[:, 0]
    for q in range(1, f.shape[1]):
        out += f[:, q] * g[:, q]
    return out


def cst_gradients(nodes: np.ndarray, tris: np.ndarray, thickness: float) -> Gradients:
    """CST gradients (constant over the triangle; one point with weight t A)."""
    b, c, area = shape_gradients(nodes, tris)
    scale = (1.0 / (2.0 * area))[:, None]
    return Gradients((b * scale)[:, None, :], (c * scale)[:, None, :], (thickness * area)[:, None])


def element_stiffness(nodes: np.ndarray, tris: np.ndarray, D: np.ndarray, thickness: float) -> np.ndarray:
    """(m, 6, 6) CST element stiffness matrices t A B^T D B (N/mm), DOFs ordered (u1, v1, u2, ...)."""
    a, b = np.divmod(np.arange(9), 3)
    blocks = block_terms(cst_gradients(nodes, tris, thickness), D, a, b).reshape(-1, 3, 3, 2, 2)
    return blocks.transpose(0, 1, 3, 2, 4).reshape(tris.shape[0], 6, 6)


@dataclass(frozen=True)
class NodeGraph:
    """Block sparsity of a stiffness matrix: node i couples with node j when they share an element.

    indptr, indices: CSR structure of the (n x n) node graph, diagonal included, columns sorted (int32).
    pair_slot: (m, p) index of the undirected node pair (i < j) of each element's p = k(k-1)/2 local
    pairs, in the order of `local_pairs(k)`; pairs are numbered by i * n + j.
    pair_flip: (m, p) True where the element lists the pair's larger node first (block transposed).
    source: for every block of the CSR structure, its row in the stack [diagonal blocks (n),
    upper blocks (i, j) (e), lower blocks (j, i) (e)].
    """

    n: int
    n_pairs: int
    indptr: np.ndarray
    indices: np.ndarray
    pair_slot: np.ndarray
    pair_flip: np.ndarray
    source: np.ndarray


def local_pairs(k: int) -> tuple[np.ndarray, np.ndarray]:
    """Local node pairs (a, b), a < b, of a k-node element."""
    a, b = np.triu_indices(k, 1)
    return a, b


def node_graph(elements: np.ndarray, n: int) -> NodeGraph:
    """The node graph of a mesh of k-node elements with n nodes (one sort of the undirected pairs)."""
    m, k = elements.shape
    la, lb = local_pairs(k)
    ga, gb = elements[:, la].astype(np.int64), elements[:, lb].astype(np.int64)
    flip = ga > gb
    keys, inverse = _unique_inverse((np.minimum(ga, gb) * n + np.maximum(ga, gb)).ravel(), n * n)
    e = keys.size
    up_row, up_col = keys // n, keys % n
    lower_order = _sort_order(up_col * n + up_row, n * n)[1]  # the pairs (j, i) in row-major order
    n_lower = np.bincount(up_col, minlength=n)
    n_upper = np.bincount(up_row, minlength=n)
    indptr = np.zeros(n + 1, dtype=np.int64)
    np.cumsum(n_lower + 1 + n_upper, out=indptr[1:])
    if indptr[-1] > np.iinfo(np.int32).max // 4:
        raise MemoryError("the stiffness matrix has more entries than int32 indices can address")
    diagonal = indptr[:-1] + n_lower
    low_row = up_col[lower_order]
    lower_pos = indptr[low_row] + np.arange(e) - (np.cumsum(n_lower) - n_lower)[low_row]
    upper_pos = diagonal[up_row] + 1 + np.arange(e) - (np.cumsum(n_upper) - n_upper)[up_row]
    indices = np.empty(int(indptr[-1]), dtype=np.int32)
    indices[diagonal] = np.arange(n)
    indices[lower_pos] = up_row[lower_order]
    indices[upper_pos] = up_col
    source = np.empty(int(indptr[-1]), dtype=np.int32)
    source[diagonal] = np.arange(n)
    source[upper_pos] = n + np.arange(e)
    source[lower_pos] = n + e + lower_order
    return NodeGraph(n, e, indptr.astype(np.int32), indices, inverse.reshape(m, -1).astype(np.int32), flip, source)


def _sort_order(keys: np.ndarray, bound: int) -> tuple[np.ndarray, np.ndarray]:
    """Sorted keys and the order that sorts them, for int64 keys in [0, bound).

    When key and position fit together in 63 bits they are packed into one integer and sorted by
    value, which numpy does several times faster than an argsort; otherwise an argsort is used.
    """
    shift = max(int(keys.size - 1).bit_length(), 1)
    if int(bound - 1).bit_length() + shift <= 63:
        packed = np.sort((keys << shift) | np.arange(keys.size, dtype=np.int64))
        return packed >> shift, packed & ((1 << shift) - 1)
    order = np.argsort(keys)
    return keys[order], order


def _unique_inverse(keys: np.ndarray, bound: int) -> tuple[np.ndarray, np.ndarray]:
    """Sorted unique values of int64 `keys` in [0, bound) and each key's index among them."""
    ordered, order = _sort_order(keys, bound)
    new = np.empty(ordered.size, dtype=bool)
    new[:1] = True
    np.not_equal(ordered[1:], ordered[:-1], out=new[1:])
    inverse = np.empty(keys.size, dtype=np.int64)
    inverse[order] = np.cumsum(new) - 1
    return ordered[new], inverse


ElementGradients = Callable[[np.ndarray], Gradients]  # element indices -> their Gradients
_FLIPPED = (0, 2, 1, 3)  # components (00, 01, 10, 11) of a transposed 2 x 2 block


def assemble(elements: np.ndarray, n: int, gradients_of: ElementGradients, D: np.ndarray,
             chunk: int = CHUNK, block: int = BLOCK) -> sp.csr_matrix:
    """Global symmetric stiffness (2n x 2n, CSR, int32 indices, N/mm) of k-node elements (m, k).

    `gradients_of(index)` gives the Gradients of the elements `index`. Element blocks are formed
    `block` elements at a time (small enough to stay in cache) and summed into the node graph with
    np.bincount every `chunk` elements (bounding memory): each element contributes its k diagonal
    blocks and its k(k-1)/2 upper blocks; the lower blocks are their transposes.
    """
    elements = np.asarray(elements)
    graph = node_graph(elements, n)
    m, k = elements.shape
    la, lb = local_pairs(k)
    own = np.arange(k)
    stack = np.zeros((n + 2 * graph.n_pairs, 4))  # diagonal, upper and lower blocks, as (00, 01, 10, 11)
    diag, upper = stack[:n], stack[n:n + graph.n_pairs]
    for start in range(0, m, chunk):
        stop = min(start + chunk, m)
        dterms = np.empty((stop - start, k, 4))
        pterms = np.empty((stop - start, la.size, 4))
        for first in range(start, stop, block):
            index = np.arange(first, min(first + block, stop))
            g = gradients_of(index)
            dterms[index - start] = block_terms(g, D, own, own)
            terms = block_terms(g, D, la, lb)
            flip = graph.pair_flip[index]
            terms[flip] = terms[flip][:, _FLIPPED]
            pterms[index - start] = terms
        nodes_c = elements[start:stop].ravel()
        slots = graph.pair_slot[start:stop].ravel()
        dterms, pterms = dterms.reshape(-1, 4), pterms.reshape(-1, 4)
        for comp in range(4):
            diag[:, comp] += np.bincount(nodes_c, weights=dterms[:, comp], minlength=n)
            upper[:, comp] += np.bincount(slots, weights=pterms[:, comp], minlength=graph.n_pairs)
    stack[n + graph.n_pairs:] = upper[:, _FLIPPED]
    data = np.take(stack, graph.source, axis=0).reshape(-1, 2, 2)
    K = sp.bsr_matrix((data, graph.indices, graph.indptr), shape=(2 * n, 2 * n)).tocsr()
    K.indices = K.indices.astype(np.int32, copy=False)
    K.indptr = K.indptr.astype(np.int32, copy=False)
    return K


def stiffness_matrix(nodes: np.ndarray, tris: np.ndarray, D: np.ndarray, thickness: float) -> sp.csr_matrix:
    """Global CST stiffness (2n x 2n, CSR with int32 indices, N/mm) of linear triangles (m, 3)."""
    tris = np.asarray(tris)
    return assemble(tris, nodes.shape[0], lambda index: cst_gradients(nodes, tris[index], thickness), D)


def element_stresses(nodes: np.ndarray, tris: np.ndarray, D: np.ndarray, u: np.ndarray) -> np.ndarray:
    """(m, 3) constant element stresses (sxx, syy, txy) in MPa from nodal displacements u (2n,) in mm."""
    b, c, area = shape_gradients(nodes, tris)
    U = u.reshape(-1, 2)[tris]  # (m, 3, 2)
    scale = 1.0 / (2.0 * area)
    exx = np.einsum("ma,ma->m", b, U[:, :, 0]) * scale
    eyy = np.einsum("ma,ma->m", c, U[:, :, 1]) * scale
    gxy = (np.einsum("ma,ma->m", c, U[:, :, 0]) + np.einsum("ma,ma->m", b, U[:, :, 1])) * scale
    return np.column_stack([exx, eyy, gxy]) @ D.T
