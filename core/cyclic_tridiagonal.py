"""Batched solution of cyclic tridiagonal linear systems (the reluctance network's Newton step).

A chain of elements closed on itself, each unknown coupled to its two neighbours, gives a tridiagonal
matrix with two corner entries. Over one pole pitch with the next pole's values the negatives of this
one's (anti-periodic), the corners carry a sign. The Thomas algorithm solves the tridiagonal part and
the Sherman-Morrison formula adds the corners: O(n) per system, vectorised over many systems at once.
"""

from __future__ import annotations

import numpy as np


def solve_tridiagonal(lower: np.ndarray, diagonal: np.ndarray, upper: np.ndarray, rhs: np.ndarray) -> np.ndarray:
    """Solve many tridiagonal systems at once (the Thomas algorithm, no pivoting).

    Parameters
    ----------
    lower, diagonal, upper : ndarray
        Shape (..., n): row i reads lower[i]·x[i-1] + diagonal[i]·x[i] + upper[i]·x[i+1]; lower[0] and
        upper[-1] are ignored. Stable for diagonally dominant or symmetric positive definite matrices.
    rhs : ndarray
        Right-hand sides, shape (..., n) or (..., n, m).

    Returns
    -------
    ndarray
        The solutions, the shape of ``rhs``.

    References
    ----------
    .. [1] W. H. Press et al., "Numerical Recipes", 3rd ed., Cambridge, 2007, §2.4 (tridiagonal systems).
    """
    columns = rhs.ndim > diagonal.ndim
    b = rhs if columns else rhs[..., None]
    n = diagonal.shape[-1]
    modified_upper = np.empty_like(diagonal)
    x = np.empty(b.shape)
    pivot = diagonal[..., 0]
    modified_upper[..., 0] = upper[..., 0] / pivot
    x[..., 0, :] = b[..., 0, :] / pivot[..., None]
    for i in range(1, n):
        pivot = diagonal[..., i] - lower[..., i] * modified_upper[..., i - 1]
        modified_upper[..., i] = upper[..., i] / pivot
        x[..., i, :] = (b[..., i, :] - lower[..., i, None] * x[..., i - 1, :]) / pivot[..., None]
    for i in range(n - 2, -1, -1):
        x[..., i, :] -= modified_upper[..., i, None] * x[..., i + 1, :]
    solution = x if columns else x[..., 0]
    return solution


def solve_cyclic_tridiagonal(lower: np.ndarray, diagonal: np.ndarray, upper: np.ndarray, rhs: np.ndarray,
                             corner_sign: float = -1.0) -> np.ndarray:
    """Solve many cyclic tridiagonal systems at once, x[-1] ≡ s·x[n-1] and x[n] ≡ s·x[0].

    Row 0 reads lower[0]·s·x[n-1] + diagonal[0]·x[0] + upper[0]·x[1]; row n-1 reads
    lower[n-1]·x[n-2] + diagonal[n-1]·x[n-1] + upper[n-1]·s·x[0].

    Parameters
    ----------
    lower, diagonal, upper, rhs : ndarray
        Shape (..., n), n ≥ 3.
    corner_sign : float
        s: -1 for an anti-periodic chain, +1 for a periodic one.

    Returns
    -------
    ndarray
        The solutions, shape (..., n).

    References
    ----------
    .. [1] W. H. Press et al., "Numerical Recipes", 3rd ed., Cambridge, 2007, §2.7.2 (cyclic tridiagonal
       systems by the Sherman-Morrison formula).
    """
    beta = corner_sign * lower[..., 0]  # the entry at row 0, column n-1
    alpha = corner_sign * upper[..., -1]  # the entry at row n-1, column 0
    gamma = -diagonal[..., 0]
    modified = diagonal.copy()
    modified[..., 0] = diagonal[..., 0] - gamma
    modified[..., -1] = diagonal[..., -1] - alpha * beta / gamma
    u = np.zeros_like(diagonal)
    u[..., 0], u[..., -1] = gamma, alpha
    both = solve_tridiagonal(lower, modified, upper, np.stack([rhs, u], axis=-1))
    y, z = both[..., 0], both[..., 1]
    factor = (y[..., 0] + beta / gamma * y[..., -1]) / (1.0 + z[..., 0] + beta / gamma * z[..., -1])
    return np.asarray(y - factor[..., None] * z)


def _inverse(m: np.ndarray) -> np.ndarray:
    """Inverses of many small matrices; 2×2 and 3×3 by their adjugates (much faster than LAPACK calls
    on tiny matrices), larger ones by numpy."""
    size = m.shape[-1]
    if size == 2:
        det = m[..., 0, 0] * m[..., 1, 1] - m[..., 0, 1] * m[..., 1, 0]
        inverse = np.empty_like(m)
        inverse[..., 0, 0], inverse[..., 1, 1] = m[..., 1, 1] / det, m[..., 0, 0] / det
        inverse[..., 0, 1], inverse[..., 1, 0] = -m[..., 0, 1] / det, -m[..., 1, 0] / det
        return inverse
    if size == 3:
        adjugate = np.empty_like(m)
        for i in range(3):
            for j in range(3):
                r0, r1 = [k for k in range(3) if k != j]
                c0, c1 = [k for k in range(3) if k != i]
                minor = m[..., r0, c0] * m[..., r1, c1] - m[..., r0, c1] * m[..., r1, c0]
                adjugate[..., i, j] = (-1.0) ** (i + j) * minor
        det = (m[..., 0, :] * adjugate[..., :, 0]).sum(axis=-1)
        return np.asarray(adjugate / det[..., None, None])
    return np.asarray(np.linalg.inv(m))


def solve_block_tridiagonal(lower: np.ndarray, diagonal: np.ndarray, upper: np.ndarray, rhs: np.ndarray) -> np.ndarray:
    """Solve many block tridiagonal systems with small square blocks at once (block Thomas algorithm).

    Parameters
    ----------
    lower, diagonal, upper : ndarray
        Blocks, shape (..., n, b, b); row i reads lower[i]·x[i-1] + diagonal[i]·x[i] + upper[i]·x[i+1].
    rhs : ndarray
        Shape (..., n, b, m).

    Returns
    -------
    ndarray
        Shape (..., n, b, m).

    References
    ----------
    .. [1] G. H. Golub and C. F. Van Loan, "Matrix Computations", 4th ed., Johns Hopkins, 2013, §4.5.1
       (block tridiagonal LU).
    """
    n = diagonal.shape[-3]
    gamma = np.empty_like(diagonal)
    x = np.empty(rhs.shape)
    inverse = _inverse(diagonal[..., 0, :, :])
    gamma[..., 0, :, :] = inverse @ upper[..., 0, :, :]
    x[..., 0, :, :] = inverse @ rhs[..., 0, :, :]
    for i in range(1, n):
        inverse = _inverse(diagonal[..., i, :, :] - lower[..., i, :, :] @ gamma[..., i - 1, :, :])
        gamma[..., i, :, :] = inverse @ upper[..., i, :, :]
        x[..., i, :, :] = inverse @ (rhs[..., i, :, :] - lower[..., i, :, :] @ x[..., i - 1, :, :])
    for i in range(n - 2, -1, -1):
        x[..., i, :, :] -= gamma[..., i, :, :] @ x[..., i + 1, :, :]
    return x


def solve_cyclic_block_tridiagonal(lower: np.ndarray, diagonal: np.ndarray, upper: np.ndarray, rhs: np.ndarray,
                                   corner_sign: float = -1.0) -> np.ndarray:
    """Solve many cyclic block tridiagonal systems (small square blocks, diagonal off-diagonal blocks).

    x[-1] ≡ s·x[n-1] and x[n] ≡ s·x[0]; ``lower`` and ``upper`` must be diagonal blocks (each level of
    the chain couples only to the same level of its neighbours), which keeps the corners' correction
    of rank b.

    Parameters
    ----------
    lower, diagonal, upper : ndarray
        Blocks, shape (..., n, b, b).
    rhs : ndarray
        Shape (..., n, b).
    corner_sign : float
        s: -1 for an anti-periodic chain.

    Returns
    -------
    ndarray
        Shape (..., n, b).

    References
    ----------
    .. [1] Golub and Van Loan 2013, §2.1.4 (the Sherman-Morrison-Woodbury formula), applied to the
       corners as Press et al. 2007, §2.7.2, do for the scalar cyclic case.
    """
    beta = corner_sign * np.diagonal(lower[..., 0, :, :], axis1=-2, axis2=-1)  # block (0, n-1), diagonal
    alpha = corner_sign * np.diagonal(upper[..., -1, :, :], axis1=-2, axis2=-1)  # block (n-1, 0), diagonal
    gamma = -np.diagonal(diagonal[..., 0, :, :], axis1=-2, axis2=-1)
    modified = diagonal.copy()
    size = rhs.shape[-1]
    eye = np.eye(size)
    modified[..., 0, :, :] -= gamma[..., :, None] * eye
    modified[..., -1, :, :] -= (alpha * beta / gamma)[..., :, None] * eye
    columns = np.zeros((*rhs.shape, size + 1))
    columns[..., 0] = rhs
    columns[..., 0, :, 1:] = gamma[..., :, None] * eye
    columns[..., -1, :, 1:] = alpha[..., :, None] * eye
    solved = solve_block_tridiagonal(lower, modified, upper, columns)
    y, q = solved[..., 0], solved[..., 1:]
    ratio = beta / gamma
    # Zᵀ·v: the first block plus (β/γ)·the last block (for the two columns q and for y)
    capacitance = eye + q[..., 0, :, :] + ratio[..., :, None] * q[..., -1, :, :]
    projected = y[..., 0, :] + ratio * y[..., -1, :]
    correction = (_inverse(capacitance) @ projected[..., None])[..., 0]
    return np.asarray(y - (q @ correction[..., None, :, None])[..., 0])


def dense_cyclic_block_tridiagonal(lower: np.ndarray, diagonal: np.ndarray, upper: np.ndarray, rhs: np.ndarray,
                                   corner_sign: float = -1.0) -> np.ndarray:
    """The same systems as :func:`solve_cyclic_block_tridiagonal`, assembled dense and solved by LAPACK.

    For a few systems (one design's cases) one LAPACK call costs less than the block recursion's
    hundreds of small numpy operations; for many systems the recursion wins.

    Parameters
    ----------
    lower, diagonal, upper : ndarray
        Blocks, shape (..., n, b, b).
    rhs : ndarray
        Shape (..., n, b).
    corner_sign : float
        s: -1 for an anti-periodic chain.

    Returns
    -------
    ndarray
        Shape (..., n, b).

    References
    ----------
    .. [1] E. Anderson et al., "LAPACK Users' Guide", 3rd ed., SIAM, 1999 (LU with partial pivoting, gesv).
    """
    n, b = diagonal.shape[-3], diagonal.shape[-1]
    batch = diagonal.shape[:-3]
    matrix = np.zeros((*batch, n, b, n, b))
    index = np.arange(n)
    matrix[..., index, :, index, :] = np.moveaxis(diagonal, -3, 0)
    matrix[..., index[1:], :, index[:-1], :] = np.moveaxis(lower[..., 1:, :, :], -3, 0)
    matrix[..., index[:-1], :, index[1:], :] = np.moveaxis(upper[..., :-1, :, :], -3, 0)
    matrix[..., 0, :, n - 1, :] = corner_sign * lower[..., 0, :, :]
    matrix[..., n - 1, :, 0, :] = corner_sign * upper[..., n - 1, :, :]
    solution = np.linalg.solve(matrix.reshape(*batch, n * b, n * b), rhs.reshape(*batch, n * b, 1))
    return np.asarray(solution.reshape(*batch, n, b))
