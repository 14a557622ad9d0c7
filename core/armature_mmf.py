"""The armature's current as the reluctance network sees it: the current each loop of the pole encloses.

With the brushes on the geometric neutral axes, the commutator keeps the current pattern fixed to the
stator: every conductor under a pole carries the path current I/a in the same direction, reversing from
pole to pole, and the coils being commutated near each neutral axis carry a current that changes linearly
from +I/a to -I/a across the commutation zone (one commutator segment pitch plus the coils'
short-pitching). This is the pattern the field solution puts in the slots (core.field.excitation, which
cites A. E. Clayton and N. N. Hancock, "The Performance and Design of Direct Current Machines", Pitman,
1959, ch. 10, from memory). Here it is smeared over the circumference as a current per radian,
J(θ) = Z·(I/a)/(2π)·pattern(θ), and integrated between neighbouring branch centres: the current that
loop encloses (the slots lie between the armature surface and the core, inside the lower loops).
"""

from __future__ import annotations

import numpy as np

from .network_elements import NetworkElements
from .winding import coil_span_slots

_SAMPLES = 24  #: points of the midpoint rule per loop [1]


def commutation_zone(poles: int, slots: int, commutator_segments: int) -> float:
    """Width of the commutation zone about each neutral axis [rad]: a segment pitch plus the chording.

    Parameters
    ----------
    poles, slots, commutator_segments : int
        Of the machine [1].

    Returns
    -------
    float
        [rad].

    References
    ----------
    .. [1] Clayton and Hancock 1959, ch. 10 (linear commutation; from memory); the brush about one segment
       wide (common practice, no source).
    """
    chording = abs(2.0 * np.pi / poles - float(coil_span_slots(slots, poles)) * 2.0 * np.pi / slots)
    return 2.0 * np.pi / commutator_segments + chording


def current_share(angle, poles: int, zone: float) -> np.ndarray:
    """Share of the path current, -1 to 1, at stator angle ``angle`` from the pole centre [rad].

    Parameters
    ----------
    angle : array_like
        [rad].
    poles : int
        [1].
    zone : float
        Commutation zone [rad].

    Returns
    -------
    ndarray
        -1 under the pole's magnet (positive current turning the rotor towards +θ, as the field solution
        takes it), alternating from pole to pole, through zero linearly across each commutation zone.
    """
    pitch = 2.0 * np.pi / poles
    k = np.rint(np.asarray(angle) / pitch)
    from_neutral = 0.5 * pitch - np.abs(np.asarray(angle) - k * pitch)
    ramp = np.clip(from_neutral / (0.5 * zone), 0.0, 1.0) if zone > 0.0 else np.ones_like(from_neutral)
    # -(-1)^k: -1 on this pole (k even), +1 on its neighbours (k odd)
    return np.where(np.fmod(k, 2.0) == 0.0, -ramp, ramp)


def enclosed_currents(elements: NetworkElements, current, poles: int, slots: int, commutator_segments: int,
                      conductors, paths, rows: np.ndarray | None = None) -> np.ndarray:
    """Armature current enclosed by each lower loop of the network [A], shape (batch, segments).

    Parameters
    ----------
    elements : NetworkElements
        The network (its branch centres and yoke angles), cross-sections (D,).
    current : float or ndarray
        Armature current I [A], broadcasting to (B,).
    poles, slots, commutator_segments : int
        Of the machine [1].
    conductors, paths : int or ndarray
        Of the winding [1], broadcasting to (B,).
    rows : ndarray of int, optional
        Shape (B,): the cross-section of each entry (the current pattern is integrated once per
        cross-section); by default entry i is cross-section i.

    Returns
    -------
    ndarray
        ∫J dθ from branch k to branch k+1 [A], with J(θ) = Z·(I/a)/(2π)·pattern(θ).

    References
    ----------
    .. [1] A. E. Fitzgerald, C. Kingsley Jr. and S. D. Umans, "Electric Machinery", 6th ed., 2003, ch. 7
       (conductors, paths and the armature's current sheet; from memory).
    """
    zone = commutation_zone(poles, slots, commutator_segments)
    fractions = (np.arange(_SAMPLES) + 0.5) / _SAMPLES
    angles = elements.centre_angle[..., None] + elements.yoke_angle[..., None] * fractions
    shares = current_share(angles, poles, zone).mean(axis=-1) * elements.yoke_angle
    if rows is not None:
        shares = shares[rows]
    density = conductors * np.asarray(current, dtype=float) / (paths * 2.0 * np.pi)
    return np.asarray(np.atleast_1d(density)[..., None] * shares)
