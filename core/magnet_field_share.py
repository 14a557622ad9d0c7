"""The worst demagnetizing field of a magnet, taken over its most-demagnetized share of area.

The field in a magnet is not uniform: it is strongest against the magnetization at the trailing tip
under load and at the corners of the inner face, and at a sharp corner a field solution's value grows
without bound as the mesh is refined (the field of a corner of a magnetized body is singular). A single
point is therefore a figure of the mesh, not of the magnet, and a one-segment model cannot be compared
with it. Both the reluctance network and the field solution take instead the area-weighted mean field
over the :data:`WORST_AREA_SHARE` of the magnet's cross-section where the field is most negative: small
enough that a corner or a tip going past the knee shows, large enough that the figure settles as the
mesh (or the network's segments) is refined.
"""

from __future__ import annotations

import numpy as np

#: Share of a magnet's cross-section over which the worst field is averaged [1]. Common practice, no
#: source: demagnetization is judged on a small region of the magnet (a few per cent of its area or
#: volume) rather than on a single element, so that a mesh's singular corner does not decide the verdict.
WORST_AREA_SHARE = 0.05


def worst_share_field(field: np.ndarray, area: np.ndarray, share: float = WORST_AREA_SHARE) -> np.ndarray:
    """Area-weighted mean of the most negative ``share`` of a magnet's area, along the last axis.

    Parameters
    ----------
    field : ndarray
        H along the magnetization of each cell (element, segment) of the magnet, (..., cells) [A/m].
    area : ndarray
        The cells' areas, or shares of the area, broadcasting with ``field`` [m² or 1].
    share : float
        Share of the area averaged over, 0 < share <= 1 [1].

    Returns
    -------
    ndarray
        The mean field over that share, shape (...) [A/m]; a cell straddling the share's edge counts
        with the part of its area inside it.

    Raises
    ------
    ValueError
        When ``share`` is not in (0, 1] or the areas are not positive.

    References
    ----------
    .. [1] The mean over the worst share of the area (module docstring); common practice, no source.
    """
    if not 0.0 < share <= 1.0:
        raise ValueError(f"the worst-area share must lie in (0, 1]; got {share}")
    field = np.asarray(field, dtype=float)
    area = np.broadcast_to(np.asarray(area, dtype=float), field.shape)
    if np.any(area < 0.0) or np.any(area.sum(axis=-1) <= 0.0):
        raise ValueError("the magnet cells' areas must be positive to take the worst share of them")
    order = np.argsort(field, axis=-1)
    sorted_field = np.take_along_axis(field, order, axis=-1)
    weight = np.take_along_axis(area, order, axis=-1) / area.sum(axis=-1, keepdims=True)
    after = np.cumsum(weight, axis=-1)
    inside = np.clip(np.minimum(after, share) - (after - weight), 0.0, None)
    return np.asarray((sorted_field * inside).sum(axis=-1) / inside.sum(axis=-1))
