"""The reluctance network of a chunk of designs as stacked arrays, laid out for Newton's method.

Every array segments first and designs last, so that each segment's values are one contiguous array over
the chunk; every steel path of the network becomes a term that one table look-up evaluates for all of
them (:func:`stack_network`). Speed, not physics: the network itself is :mod:`core.reluctance_network`'s,
its elements :mod:`core.network_elements`'.
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass

import numpy as np

from .network_elements import NetworkElements, TipPath
from .units import MU_0


@dataclass(frozen=True)
class StackedNetwork:
    """A chunk of the network as stacked arrays, segments first and designs last, so that each segment's
    values are contiguous over the chunk's designs.

    Every path of every parallel pair (the *sides*: the pairs' first paths, then their second ones) drops
    ``linear``·flux plus, for each steel term of the path, weight·H(scale·flux) (:func:`_path_terms`). The
    pairs run housing, core, the gap's, the teeth's; each carries the flux of the upper loop, the lower
    loop, the middle branch and the lower branch.
    """

    gap_pairs: int
    tooth_pairs: int
    column_area: np.ndarray  #: (segments, designs) [m²]
    column_height: np.ndarray  #: lm/(μ0·μrec) in the magnet, lm/μ0 in the air [m²/H]
    column_slope: np.ndarray  #: the column's reluctance [A/Wb]
    source: np.ndarray  #: Br where the branch holds magnet, else 0 [T]
    tangential: np.ndarray  #: along the magnets' inner face [A/Wb]
    surface: np.ndarray  #: along the armature surface [A/Wb]
    enclosed: np.ndarray  #: the armature current each lower loop encloses [A]
    linear: np.ndarray  #: (sides, segments, designs) [A/Wb]
    term_side: tuple[int, ...]  #: the side of each steel term
    term_position: np.ndarray  #: (terms, segments, designs): cells of the steel's table per weber
    term_weight: np.ndarray  #: (terms, segments, designs): the path length it multiplies H by [m]
    term_slope: np.ndarray  #: weight × cells per weber [m/Wb]
    term_last: np.ndarray  #: (terms, 1, 1) the last cell of its steel's table
    term_offset: np.ndarray  #: (terms, 1, 1) where its steel's table starts in ``nodes`` and ``rises``
    offset_from: int  #: the first term whose steel's table does not start at 0 (terms sorted by steel)
    nodes: np.ndarray  #: H at the nodes of every steel's table, one after the other [A/m]
    rises: np.ndarray  #: the rise of H over each cell [A/m]


#: The fields of :class:`StackedNetwork` with an axis over the designs (the last).
_PER_DESIGN = ("column_area", "column_height", "column_slope", "source", "tangential", "surface", "enclosed",
               "linear", "term_position", "term_weight", "term_slope")


def _path_terms(path, part) -> tuple[np.ndarray, list]:
    """A path's linear reluctance [A/Wb] and its steel terms (steel, weight [m], B per flux [1/m²]), for
    the designs ``part`` picks out of each array."""
    if isinstance(path, TipPath):
        # the gap over the overhangs, and Simpson's rule on the tip: (wo/6)·(4·H(Broot/2) + H(Broot))
        overhang, root_area = part(path.overhang), part(path.root_area)
        return part(path.gap_reluctance), [(path.steel, 4.0 / 6.0 * overhang, 0.5 / root_area),
                                           (path.steel, overhang / 6.0, 1.0 / root_area)]
    if path.steel is None:
        return part(path.path) / (MU_0 * part(path.area)), []
    return np.zeros(np.shape(part(path.area))), [(path.steel, part(path.path), 1.0 / part(path.area))]


def stack_network(e: NetworkElements, designs: slice, remanence, enclosed, rows: np.ndarray) -> StackedNetwork:
    """The chunk ``designs`` of the network, stacked (see :class:`StackedNetwork`).

    Parameters
    ----------
    e : NetworkElements
        The network's element values, batch shape (D,) [SI: m, m², A/Wb].
    designs : slice
        The entries of the batch in this chunk.
    remanence : ndarray
        Br of each entry of the batch at its temperature, shape (B,) [T].
    enclosed : ndarray
        Armature current each lower loop encloses, shape (B, segments) [A].
    rows : ndarray of int
        Shape (B,): entry i of the batch takes its elements from row ``rows[i]`` of ``e``.

    Returns
    -------
    StackedNetwork
        The chunk's arrays, segments first and designs last.

    References
    ----------
    .. [1] the network of :mod:`core.reluctance_network` (Ostović 1989; Derbas et al. 2009).
    """
    segments = e.column_area.shape[-1]
    count = len(range(*designs.indices(rows.shape[0])))
    picks = rows[designs]

    def part(value) -> np.ndarray:
        array = np.asarray(value, dtype=float)
        picked: np.ndarray = array[picks] if array.ndim == 2 else array
        return picked

    def per_segment(value) -> np.ndarray:
        return np.ascontiguousarray(np.broadcast_to(value, (count, segments)).T)

    pairs = (e.housing, e.core, *e.gap_series, *e.tooth_series)
    sides = [pair.first for pair in pairs] + [pair.second for pair in pairs]
    linear, terms = [], []
    for index, side in enumerate(sides):
        reluctance, side_terms = _path_terms(side, part)
        linear.append(per_segment(reluctance))
        terms += [(index, *term) for term in side_terms]
    steels: list = []
    for _, steel, _, _ in terms:
        if not any(steel is known for known in steels):
            steels.append(steel)
    which = [next(i for i, known in enumerate(steels) if known is steel) for _, steel, _, _ in terms]
    terms = [term for _, term in sorted(zip(which, terms, strict=True), key=lambda pair: pair[0])]
    which = sorted(which)  # the first steel's terms first: only the others' cells need an offset
    tables = [steel._cells for steel in steels]
    starts = np.cumsum([0] + [nodes.size for _, nodes, _ in tables])
    position = np.array([per_segment(scale) * tables[i][0] for (_, _, _, scale), i in zip(terms, which, strict=True)])
    weight = np.array([per_segment(w) for _, _, w, _ in terms])
    column_height = per_segment(part(e.column_height) / part(e.column_permeability))
    column_area = per_segment(part(e.column_area))
    empty = np.zeros((0, segments, count))
    return StackedNetwork(
        gap_pairs=len(e.gap_series), tooth_pairs=len(e.tooth_series),
        column_area=column_area, column_height=column_height, column_slope=column_height / column_area,
        source=e.magnet_mask[:, None] * remanence[designs][None, :],
        tangential=per_segment(part(e.tangential_reluctance)), surface=per_segment(part(e.surface_reluctance)),
        enclosed=per_segment(enclosed[designs]), linear=np.array(linear),
        term_side=tuple(side for side, *_ in terms),
        term_position=position if terms else empty, term_weight=weight if terms else empty,
        term_slope=weight * position if terms else empty,
        term_last=np.array([tables[i][1].size - 1.0 for i in which]).reshape(-1, 1, 1),
        term_offset=starts[which].reshape(-1, 1, 1).astype(np.intp),
        offset_from=which.index(1) if 1 in which else len(which),
        nodes=np.concatenate([nodes for _, nodes, _ in tables] or [np.zeros(1)]),
        rises=np.concatenate([rises for _, _, rises in tables] or [np.zeros(1)]),
    )


def designs_of(s: StackedNetwork, keep: np.ndarray) -> StackedNetwork:
    """The designs ``keep`` of a stacked chunk.

    Parameters
    ----------
    s : StackedNetwork
        A stacked chunk.
    keep : ndarray of bool or int
        Which of its designs to keep.

    Returns
    -------
    StackedNetwork
        The same network, only those designs.
    """
    return dataclasses.replace(s, **{name: getattr(s, name)[..., keep] for name in _PER_DESIGN})
