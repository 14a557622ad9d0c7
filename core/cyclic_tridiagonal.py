"""Batched solution of the reluctance network's Newton step: cyclic block tridiagonal linear systems.

A chain of segments closed on itself, three unknowns per segment (the network's three loop levels), each
coupled to the same level of its two neighbours and to the other levels of its own segment, gives a block
tridiagonal matrix with 3×3 blocks and two corner blocks; the off-diagonal blocks are diagonal. Over one
pole pitch with the next pole's values the negatives of this one's (anti-periodic), the corners carry a
sign. The matrix is symmetric positive definite (a Jacobian of monotone B(H) curves). Solved for many
systems at once, arranged segments first and systems last so that every per-segment quantity is one
contiguous array over the systems.
"""

from __future__ import annotations

import functools

import numpy as np
from scipy.linalg import lapack

#: Up to this many systems, :func:`solve_symmetric_cyclic_3x3` hands them to LAPACK as one banded
#: matrix; above it the elementwise recursion's few thousand array operations cost less.
BANDED_BATCH = 128
#: The band's half-width in the interleaved order of :func:`_interleaved`: a segment's neighbours sit at
#: most two blocks of three away, and couple level to level.
_HALF_BAND = 6


def solve_symmetric_cyclic_3x3(diagonal: np.ndarray, coupling: np.ndarray, rhs: np.ndarray,
                               corner_sign: float = -1.0) -> np.ndarray:
    """Solve many cyclic block tridiagonal systems with symmetric 3×3 diagonal blocks and diagonal
    off-diagonal blocks (a chain of three levels closed on itself), symmetric positive definite.

    Segments first, systems last, so that each segment's entries are contiguous over the systems:
    block (k, k) holds ``diagonal[:, k]``, blocks (k, k-1) and (k-1, k) are diag(``coupling[:, k]``), and the
    corner blocks (0, n-1) and (n-1, 0) are s·diag(``coupling[:, 0]``).

    Parameters
    ----------
    diagonal : ndarray
        Shape (6, n, m): the entries 00, 11, 22, 01, 12, 02 of each diagonal block.
    coupling : ndarray
        Shape (3, n, m): level j of segment k to level j of segment k-1.
    rhs : ndarray
        Shape (3, n, m).
    corner_sign : float
        s: -1 for an anti-periodic chain, +1 for a periodic one.

    Returns
    -------
    ndarray
        The solutions, shape (3, n, m).

    Notes
    -----
    Up to :data:`BANDED_BATCH` systems: the segments interleaved from both ends (0, n-1, 1, n-2, …) turn
    the cyclic matrix into a band of half-width 6, and the systems, stacked along the diagonal, are one
    banded Cholesky solve (LAPACK pbsv), falling back to LU with pivoting should the matrix not be
    positive definite. More systems: block Gaussian elimination from segment 0, the last segment kept as
    a border that every eliminated row fills in, then the border's own 3×3 system and back substitution,
    written out entry by entry on arrays over the systems (many small matrix products cost more).

    References
    ----------
    .. [1] G. H. Golub and C. F. Van Loan, "Matrix Computations", 4th ed., Johns Hopkins, 2013, §4.3.5
       (banded Cholesky), §4.5.1 (block tridiagonal elimination) and §3.2.11 (block elimination, the
       Schur complement of a bordered matrix).
    .. [2] E. Anderson et al., "LAPACK Users' Guide", 3rd ed., SIAM, 1999 (pbsv, gesv).
    """
    solve = _banded_symmetric_cyclic if rhs.shape[-1] <= BANDED_BATCH else _bordered_symmetric_cyclic
    solution: np.ndarray = solve(diagonal, coupling, rhs, corner_sign)
    return solution


#: A symmetric 3×3 matrix's entries (00, 11, 22, 01, 12, 02) read out as its nine, row by row.
_FULL = np.array([0, 3, 5, 3, 1, 4, 5, 4, 2])
#: The six entries' rows and columns.
_ROWS, _COLUMNS = np.array([0, 1, 2, 0, 1, 0]), np.array([0, 1, 2, 1, 2, 2])
#: The six cofactors of a symmetric matrix (a d f b e c) as m[P]·m[Q] - m[R]·m[S]: d·f - e², a·f - c²,
#: a·d - b², c·e - b·f, b·c - a·e, b·e - c·d; they are the adjugate's entries in the same order.
_P, _Q = np.array([1, 0, 0, 5, 3, 3]), np.array([2, 2, 1, 4, 5, 4])
_R, _S = np.array([4, 5, 3, 3, 0, 5]), np.array([4, 5, 3, 2, 4, 1])
#: The six entries' places among the nine of a 3×3 matrix flattened row by row.
_UPPER = [0, 4, 8, 1, 5, 2]


def _symmetric_inverse(m: np.ndarray) -> np.ndarray:
    """The inverses of symmetric 3×3 matrices given as their six entries (6, …), by the adjugate."""
    cofactors = m[_P] * m[_Q]
    cofactors -= m[_R] * m[_S]
    cofactors *= 1.0 / (m[0] * cofactors[0] + m[3] * cofactors[3] + m[5] * cofactors[5])
    inverse: np.ndarray = cofactors
    return inverse


def _full(m: np.ndarray) -> np.ndarray:
    """Symmetric 3×3 matrices from their six entries (6, …) to (3, 3, …)."""
    full: np.ndarray = m[_FULL].reshape(3, 3, *m.shape[1:])
    return full


def _bordered_symmetric_cyclic(diagonal, coupling, rhs, corner_sign):
    """:func:`solve_symmetric_cyclic_3x3` by block elimination with the last segment as the border.

    Row k after elimination reads M_k·x_k + diag(o_k+1)·x_k+1 + F_k·b = z_k, b the border's unknowns; with
    W_k = M_k⁻¹·F_k and w_k = M_k⁻¹·z_k the border's Schur complement is D_b - Σ F_kᵀ·W_k.
    """
    n = diagonal.shape[1]
    last = n - 1
    o = coupling
    products = o[_ROWS] * o[_COLUMNS]  # o_i·o_j for each of a block's six entries
    inverses: list[np.ndarray] = []  # M_k⁻¹, (3, 3, m)
    reduced: list[np.ndarray] = []  # w_k, (3, m)
    fills: list[np.ndarray] = []  # W_k, (3, 3, m)
    six = np.empty(0)  # M_k-1⁻¹ as its six entries
    border = diagonal[:, last].copy()
    border_rhs = rhs[:, last].copy()
    for k in range(last):
        if k == 0:
            six = _symmetric_inverse(diagonal[:, 0])
            inverse = _full(six)
            w = (inverse * rhs[:, 0]).sum(axis=1)
            corner = corner_sign * o[:, 0]  # row 0's coefficients on the border are diagonal
            fill = inverse * corner[None, :, :]
            border -= (fill * corner[:, None, :]).reshape(9, -1)[_UPPER]
            border_rhs -= corner * w
        else:
            six = _symmetric_inverse(diagonal[:, k] - products[:, k] * six)
            inverse = _full(six)
            w = (inverse * (rhs[:, k] - o[:, k] * reduced[-1])).sum(axis=1)
            f = -o[:, k, None, :] * fills[-1]
            if k == last - 1:  # the row's neighbour beyond is the border itself
                for level in range(3):
                    f[level, level] += o[level, last]
            fill = (inverse[:, :, None, :] * f[None, :, :, :]).sum(axis=1)
            border -= (f[:, :, None, :] * fill[:, None, :, :]).sum(axis=0).reshape(9, -1)[_UPPER]
            border_rhs -= (f * w[:, None, :]).sum(axis=0)
        inverses.append(inverse)
        reduced.append(w)
        fills.append(fill)
    solution = np.empty(rhs.shape)
    b = (_full(_symmetric_inverse(border)) * border_rhs).sum(axis=1)
    solution[:, last] = b
    following = None
    for k in range(last - 1, -1, -1):
        x = reduced[k] - (fills[k] * b).sum(axis=1)
        if following is not None:
            x -= (inverses[k] * (o[:, k + 1] * following)).sum(axis=1)
        solution[:, k] = x
        following = x
    return solution


@functools.lru_cache(maxsize=8)
def _interleaved(n: int) -> np.ndarray:
    """Each segment's place in the order 0, n-1, 1, n-2, …, which makes the cyclic chain banded."""
    order = np.empty(n, dtype=np.intp)
    order[0::2] = np.arange((n + 1) // 2)
    order[1::2] = np.arange(n - 1, (n + 1) // 2 - 1, -1)
    place = np.empty(n, dtype=np.intp)
    place[order] = np.arange(n)
    return place


@functools.lru_cache(maxsize=8)
def _band_entries(n: int):
    """Rows and columns, in the interleaved order, of each entry of one system: the six of each diagonal
    block, segment by segment, then each level's coupling to the segment before."""
    place = 3 * _interleaved(n)
    pairs = ((0, 0), (1, 1), (2, 2), (0, 1), (1, 2), (0, 2))
    rows = np.concatenate([place + i for i, _ in pairs] + [place + j for j in range(3)])
    columns = np.concatenate([place + j for _, j in pairs] + [np.roll(place, 1) + j for j in range(3)])
    upper, lower = np.maximum(rows, columns), np.minimum(rows, columns)
    # LAPACK's upper band storage: entry (i, j), i ≤ j, at row half-width + i - j of column j
    return rows, columns, (_HALF_BAND + lower - upper)[:, None], upper[:, None]


def _banded_symmetric_cyclic(diagonal, coupling, rhs, corner_sign):
    """:func:`solve_symmetric_cyclic_3x3` as one banded Cholesky solve of all the systems at once."""
    n, count = diagonal.shape[1], rhs.shape[-1]
    size = 3 * n
    rows, columns, band_rows, band_columns = _band_entries(n)
    values = np.concatenate([diagonal.reshape(6 * n, count), coupling.reshape(3 * n, count)])
    values[6 * n:9 * n:n] *= corner_sign  # the corner blocks: the couplings of segment 0
    band = np.zeros((_HALF_BAND + 1, size * count))
    band[band_rows, band_columns + size * np.arange(count)] = values
    place = _interleaved(n)
    ordered = np.empty((count, n, 3))
    ordered[:, place, :] = rhs.T
    _, solution, info = lapack.dpbsv(band, ordered.reshape(-1), lower=0, overwrite_ab=1, overwrite_b=1)
    if info != 0:  # not positive definite (a flat or falling B(H) somewhere): LU with pivoting
        matrix = np.zeros((count, size, size))
        systems = np.arange(count)[None, :]
        matrix[systems, rows[:, None], columns[:, None]] = values
        matrix[systems, columns[:, None], rows[:, None]] = values
        solution = np.linalg.solve(matrix, ordered.reshape(count, size, 1))
    return np.ascontiguousarray(solution.reshape(count, n, 3)[:, place, :].T)
