"""Joining the rotor's and the stator's rings in the gap, and the symmetry ties between nodes.

The rotor's grid turns with the rotor position, so the ring at the top of the rotor grid and the ring at
the bottom of the stator grid have different nodes. :func:`stitch` fills the band between them with
triangles: each edge of one ring joins the node of the other ring whose span (between its two edges'
midpoints) holds the edge's midpoint; consecutive triangles then share an edge, so the band is tiled
without gaps or overlaps (the merge of two sorted rings, as an advancing front would make it). Where the
node to join lies past the sector's end, a copy of it is made at the right angle and tied to it by the
symmetry (:class:`Ties`).
"""

from __future__ import annotations

import math

import numpy as np
import scipy.sparse as sp


class Ties:
    """Which node is which unknown, with what sign: grows as copies of nodes are added.

    Parameters
    ----------
    nodes : int
        Nodes of the mesh before any copy.
    sign : float
        The potential's factor across one sector: -1 (anti-periodic) or 1.
    """

    def __init__(self, nodes: int, sign: float):
        self.master = np.arange(nodes)
        self.sign = np.ones(nodes)
        self.period_sign = sign
        self.extra_x: list[np.ndarray] = []
        self._copies: dict[tuple[int, int], int] = {}

    def tie(self, nodes, masters) -> None:
        """Make ``nodes`` the images of ``masters`` one sector on.

        Parameters
        ----------
        nodes, masters : array_like
            Node numbers.
        """
        self.master[nodes] = masters
        self.sign[nodes] = self.period_sign

    def copy(self, node: int, radius: float, angle: float, shift: int, span: float) -> int:
        """A node at ``angle + shift·span`` that is ``period_sign**shift`` times ``node``.

        Parameters
        ----------
        node : int
            The node copied.
        radius, angle : float
            Its position [m], [rad].
        shift : int
            Whole sectors to turn by.
        span : float
            The sector's angle [rad].

        Returns
        -------
        int
            The copy's node number (made once per node and shift).
        """
        key = (node, shift)
        if key not in self._copies:
            new = self.master.size
            self.master = np.append(self.master, self.master[node])
            self.sign = np.append(self.sign, self.sign[node] * self.period_sign ** abs(shift))
            turned = angle + shift * span
            self.extra_x.append(np.array([radius * math.cos(turned), radius * math.sin(turned)]))
            self._copies[key] = new
        return self._copies[key]

    def matrix(self) -> tuple[sp.csr_matrix, np.ndarray]:
        """Nodes × unknowns with entries ±1, and each node's unknown.

        Returns
        -------
        tuple
            The sparse matrix and the unknown of every node.
        """
        masters, dof = np.unique(self.master, return_inverse=True)
        shape = (self.master.size, masters.size)
        return sp.csr_matrix((self.sign, (np.arange(self.master.size), dof)), shape=shape), dof


def stitch(inner: tuple[np.ndarray, np.ndarray, float], outer: tuple[np.ndarray, np.ndarray, float],
            span: float, ties: Ties) -> np.ndarray:
    """Triangles between two rings, each given as (node numbers, angles, radius), last node tied to the first.

    Parameters
    ----------
    inner, outer : tuple
        The two rings.
    span : float
        The sector's angle [rad].
    ties : Ties
        The symmetry ties, to which copies of nodes are added.

    Returns
    -------
    numpy.ndarray
        Triangles (3, n), node numbers.
    """
    triangles = []
    for (a_ids, a_angles, _), (b_ids, b_angles, b_radius) in ((inner, outer), (outer, inner)):
        edge_mids = 0.5 * (a_angles[:-1] + a_angles[1:])
        b_mids = 0.5 * (b_angles[:-1] + b_angles[1:])
        lower = b_mids[-1] - span
        wrapped = lower + np.mod(edge_mids - lower, span)
        index = np.searchsorted(b_mids, wrapped, side="left")
        shift = np.rint((edge_mids - b_angles[index]) / span).astype(int)
        third = np.empty(index.size, dtype=int)
        for k, (i, q) in enumerate(zip(index, shift, strict=True)):
            if q == 0:
                third[k] = b_ids[i]
            elif q == 1 and i == 0:
                third[k] = b_ids[-1]
            else:
                third[k] = ties.copy(int(b_ids[i]), b_radius, float(b_angles[i]), int(q), span)
        triangles.append(np.stack([a_ids[:-1], a_ids[1:], third]))
    return np.concatenate(triangles, axis=1)
