"""What drives the field: the magnets' remanence and the armature's slot currents.

Magnets. Magnet k of the sector is centred at θ = k·τp (τp = 2π/p) and has polarity (-1)^k; magnet 0 is
magnetized towards the axis, a north pole facing the armature. "radial" magnetization points along the
radius at every point, "parallel" along the magnet's centre line throughout (as a magnet pressed in a
field parallel to its axis of symmetry is).

Armature. With the brushes on the geometric neutral axes, the commutator keeps the current pattern fixed
to the stator: every conductor under a pole carries the path current I/a in the same direction, and the
direction changes from pole to pole. Each slot holds Z/S conductors. The coils being commutated sit
near the neutral axes; their current reverses while their commutator segments pass under the brush.
We treat them explicitly with linear commutation (the current of a commutated coil changes at a steady
rate from +I/a to -I/a; A. E. Clayton and N. N. Hancock, "The Performance and Design of Direct Current
Machines", Pitman, 1959, ch. 10, from memory): across a commutation zone centred on each neutral axis,
the slot's current follows a straight line through zero. The zone's width is the angle the armature
turns while one coil commutates, one commutator segment pitch (a brush about one segment wide, common
practice, no source), plus the short-pitching of the coils (their sides then lie that far apart about
the axis). Positive current drives the rotor counter-clockwise (towards +θ).
"""

from __future__ import annotations

import math

import numpy as np

from ..armature_mmf import commutation_zone as commutation_zone_angle
from ..armature_mmf import current_share as current_pattern
from ..winding import parallel_paths, total_conductors
from .mesh import Region, SectionMesh


def element_centroids(section: SectionMesh) -> np.ndarray:
    """Centroid of each element (2, elements) [m].

    Parameters
    ----------
    section : SectionMesh
        The mesh.

    Returns
    -------
    numpy.ndarray
        x and y of each element's centroid [m].
    """
    return np.asarray(section.mesh.p[:, section.mesh.t].mean(axis=1))


def magnetization_direction(section: SectionMesh, poles: int, kind: str) -> np.ndarray:
    """Unit vector of magnetization in each element (2, elements), zero outside the magnets.

    Parameters
    ----------
    section : SectionMesh
        The mesh.
    poles : int
        Poles of the machine [1].
    kind : str
        ``"radial"`` or ``"parallel"``.

    Returns
    -------
    numpy.ndarray
        The unit vectors [1].
    """
    if kind not in ("radial", "parallel"):
        raise ValueError(f"magnetization {kind!r} is not 'radial' or 'parallel' (key magnets.magnetization)")
    in_magnet = section.region == Region.MAGNET
    pitch = 2.0 * math.pi / poles
    k = np.where(in_magnet, section.part, 0)
    polarity = np.where(in_magnet, -((-1.0) ** k), 0.0)  # magnet 0 points inwards
    if kind == "radial":
        x = element_centroids(section)
        direction = x / np.hypot(x[0], x[1])
    else:
        direction = np.stack([np.cos(k * pitch), np.sin(k * pitch)])
    return np.asarray(direction * polarity)


def slot_currents(section: SectionMesh, current: float, kind: str, multiplicity: int, poles: int, slots: int,
                  commutator_segments: int, turns_per_coil: int) -> np.ndarray:
    """Current through each slot of the sector [A], for armature current ``current`` [A].

    Parameters
    ----------
    section : SectionMesh
        The mesh (its slots' angles).
    current : float
        Armature (terminal) current I [A].
    kind : str
        Winding type, ``"lap"`` or ``"wave"``.
    multiplicity : int
        Winding multiplicity [1].
    poles, slots, commutator_segments, turns_per_coil : int
        Of the machine and winding [1].

    Returns
    -------
    numpy.ndarray
        (Z/S)·(I/a)·pattern(θ_slot) per slot [A].

    References
    ----------
    .. [1] A. E. Fitzgerald, C. Kingsley Jr. and S. D. Umans, "Electric Machinery", 6th ed., 2003,
       ch. 7 (paths and conductors; from memory).
    """
    paths = int(parallel_paths(kind, poles, multiplicity))
    conductors = int(total_conductors(commutator_segments, turns_per_coil))
    zone = commutation_zone_angle(poles, slots, commutator_segments)
    return np.asarray(conductors / slots * (current / paths) * current_pattern(section.slot_angles, poles, zone))


def slot_current_density(section: SectionMesh, currents: np.ndarray, areas: np.ndarray) -> np.ndarray:
    """Current density in each element [A/m²]: each slot's current spread evenly over its winding area.

    Parameters
    ----------
    section : SectionMesh
        The mesh.
    currents : numpy.ndarray
        Current through each slot of the sector [A].
    areas : numpy.ndarray
        Area of each element [m²].

    Returns
    -------
    numpy.ndarray
        J_z per element [A/m²], zero outside the slots.
    """
    in_slot = section.region == Region.SLOT
    slot = np.where(in_slot, section.part, 0)
    slot_area = np.bincount(slot[in_slot], weights=areas[in_slot], minlength=currents.size)
    return np.where(in_slot, np.asarray(currents)[slot] / slot_area[slot], 0.0)
