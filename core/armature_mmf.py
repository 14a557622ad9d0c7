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

Smeared or in slots. The smeared sheet is the armature's current averaged over the rotor's turning. At
any one moment the current sits in the slots, Z/S conductors each, at angles that move with the rotor,
and the MMF steps from slot to slot. With few slots per pole a step can fall just inside a magnet's
trailing tip and load the whole trailing half at once, which the smeared sheet, rising steadily towards
the tip, does not show (the field solution, which has the slots, measured it: docs/network-calibration.md).
So the magnet's field under load is taken with the current in its slots (:func:`slot_enclosed_currents`)
at every rotor position the network can tell apart (:func:`distinct_rotor_positions`), and the worst of
them counts. The back-EMF sees the flux per pole averaged over the turning; where the iron saturates that
mean of the fluxes lies below the flux of the mean (smeared) current, so the flux per pole under load is
the mean over a few positions spread evenly over a slot pitch with the current in its slots
(:func:`turning_positions`).
"""

from __future__ import annotations

import numpy as np

from .network_elements import NetworkElements
from .shared_docs import parameter_table, shared_parameters
from .winding import coil_span_slots

_SAMPLES = 24  #: points of the midpoint rule per loop [1]

#: What the current each loop encloses is computed from, for the smeared sheet and for the slots.
LOOP_CURRENT_PARAMETERS = parameter_table("""
elements : NetworkElements
    The network (its branch centres and yoke angles), cross-sections (D,).
current : float or ndarray
    Armature current I [A], broadcasting to (B,).
poles, slots, commutator_segments : int
    Of the machine [1].
conductors, paths : int or ndarray
    Of the winding [1], broadcasting to (B,).
rows : ndarray of int, optional
    Shape (B,): the cross-section of each entry (the current pattern is taken once per cross-section);
    by default entry i is cross-section i.
""")


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


@shared_parameters(LOOP_CURRENT_PARAMETERS)
def enclosed_currents(elements: NetworkElements, current, poles: int, slots: int, commutator_segments: int,
                      conductors, paths, rows: np.ndarray | None = None) -> np.ndarray:
    """Armature current enclosed by each lower loop of the network [A], shape (batch, segments).

    Parameters
    ----------

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
    return _scaled(shares / (2.0 * np.pi), rows, conductors, current, paths)


def _scaled(shares: np.ndarray, rows, conductors, current, paths) -> np.ndarray:
    """Z·(I/a) times each loop's share of it [A], the shares taken per cross-section and spread to the
    entries by ``rows``."""
    if rows is not None:
        shares = shares[rows]
    ampere_conductors = conductors * np.asarray(current, dtype=float) / paths
    return np.asarray(np.atleast_1d(ampere_conductors)[..., None] * shares)


def slot_angles(rotor_position, slots: int, pole_pitch: float) -> np.ndarray:
    """Centres of the slots over two pole pitches either side of the pole centre [rad].

    Parameters
    ----------
    rotor_position : float or ndarray
        Mechanical angle of the rotor [rad], shape () or (B,); at 0 a slot centre faces the pole centre
        (as in core.field.mesh).
    slots : int
        [1].
    pole_pitch : float
        2π/p [rad].

    Returns
    -------
    ndarray
        rotor_position + j·2π/S for every j that lands within ±2 pole pitches, shape (..., J) [rad].
    """
    pitch = 2.0 * np.pi / slots
    reach = int(np.ceil(2.0 * pole_pitch / pitch)) + 1
    angles: np.ndarray = np.asarray(rotor_position, dtype=float)[..., None] + pitch * np.arange(-reach, reach + 1)
    return angles


@shared_parameters(LOOP_CURRENT_PARAMETERS)
def slot_enclosed_currents(elements: NetworkElements, current, poles: int, slots: int, commutator_segments: int,
                           conductors, paths, rotor_position, rows: np.ndarray | None = None) -> np.ndarray:
    """Armature current enclosed by each lower loop [A], (batch, segments), with the current in its slots.

    Parameters
    ----------
    rotor_position : float or ndarray
        Mechanical angle of the rotor [rad] (0: a slot centre on the pole centre), for all entries or per
        entry (B,).

    Returns
    -------
    ndarray
        The sum over the slots whose centre lies between branch k and branch k+1 of (Z/S)·(I/a)·pattern
        (a slot exactly on a branch centre counted half to each side), the same slot currents the field
        solution puts in its slots (core.field.excitation.slot_currents).

    References
    ----------
    .. [1] Fitzgerald, Kingsley and Umans 2003, ch. 7 (from memory); Clayton and Hancock 1959, ch. 10
       (linear commutation, from memory), as :func:`current_share`.
    """
    zone = commutation_zone(poles, slots, commutator_segments)
    start, width = elements.centre_angle, elements.yoke_angle
    if rows is not None:
        start, width = start[rows], width[rows]
    position = np.broadcast_to(np.asarray(rotor_position, dtype=float), start.shape[:1])
    slot_share = current_share(slot_angles(position, slots, 2.0 * np.pi / poles), poles, zone)  # (B, J)
    # The slots are evenly spaced, so the slots below an angle are found by arithmetic and their currents
    # summed from a running total: (B, segments) lookups where a slot-by-branch comparison took (B, segments,
    # slots) arrays (half a gigabyte for a tolerance study's slotted solves).
    below = np.concatenate([np.zeros_like(slot_share[:, :1]), np.cumsum(slot_share, axis=1)], axis=1)
    first = position - (slot_share.shape[1] // 2) * (2.0 * np.pi / slots)  # the first slot's angle, (B,)
    shares = (_share_below(start + width, first, slots, slot_share, below)
              - _share_below(start, first, slots, slot_share, below)) / slots
    return _scaled(shares, None, conductors, current, paths)


def _share_below(boundary: np.ndarray, first: np.ndarray, slots: int, slot_share: np.ndarray,
                 below: np.ndarray) -> np.ndarray:
    """The slot currents' shares summed over the slots below ``boundary`` (B, segments), a slot on it (to
    1e-9 rad) counted half: so that a slot on a branch centre counts half to each side."""
    pitch = 2.0 * np.pi / slots
    place = (boundary - first[:, None]) / pitch  # the boundary in slot pitches from the first slot
    nearest = np.rint(place)
    count = slot_share.shape[1]
    on = (np.abs(place - nearest) * pitch <= 1e-9) & (nearest >= 0) & (nearest < count)
    under = np.clip(np.where(on, nearest, np.ceil(place)), 0, count).astype(np.intp)
    total = np.take_along_axis(below, under, axis=1)
    on_slot = np.take_along_axis(slot_share, np.clip(nearest, 0, count - 1).astype(np.intp), axis=1)
    return total + np.where(on, 0.5 * on_slot, 0.0)


def turning_positions(slots, count: int) -> np.ndarray:
    """Rotor positions spread evenly over one slot pitch, for a mean over the rotor's turning.

    The pole's state repeats every slot pitch τs as the rotor turns, so its mean over the turning is the
    mean over one pitch of a periodic function; the midpoints of ``count`` equal parts of the pitch,
    equally weighted (the midpoint rule, which for a periodic function is the trapezoidal rule shifted),
    give it with an error that falls quickly with ``count``.

    Parameters
    ----------
    slots : int or ndarray
        Slots of each cross-section, () or (D,) [1].
    count : int
        Positions per slot pitch [1], at least 1.

    Returns
    -------
    ndarray
        (count,) or (D, count) positions in (0, τs) from a slot centre on the pole centre [rad].

    References
    ----------
    .. [1] P. J. Davis and P. Rabinowitz, "Methods of Numerical Integration", 2nd ed., Academic Press, 1984,
       section 3.4 (the rectangle and trapezoidal rules on periodic functions), from memory.
    """
    if count < 1:
        raise ValueError(f"positions per slot pitch must be at least 1, got {count}")
    pitch = 2.0 * np.pi / np.asarray(slots, dtype=float)
    parts = (np.arange(count) + 0.5) / count
    positions: np.ndarray = np.multiply.outer(pitch, parts)
    return positions


def distinct_rotor_positions(centre_angle: np.ndarray, slots) -> np.ndarray:
    """One rotor position [rad] for each arrangement of the slots the network can tell apart.

    A slot's current enters the loop between the two branch centres it lies between; the pattern repeats
    every slot pitch τs. So as the rotor turns through one slot pitch, the enclosed currents change only
    when a slot crosses a branch centre, at positions θk mod τs: between two such crossings the network
    sees one arrangement (the coils in the commutation zone aside, whose current changes steadily). The
    midpoints between consecutive crossings stand for every arrangement.

    Parameters
    ----------
    centre_angle : ndarray
        The network's branch centres θk, (D, segments) [rad] (core.network_elements.branch_centres).
    slots : int or ndarray
        Slots of each cross-section, () or (D,) [1].

    Returns
    -------
    ndarray
        (D, segments) positions in [0, τs) from a slot centre on the pole centre [rad].

    References
    ----------
    .. [1] The network's layout (core.network_elements); our construction.
    """
    pitch, crossings, following = _crossings(centre_angle, slots)
    midpoints: np.ndarray = np.mod(0.5 * (crossings + following), pitch)
    return midpoints


def _crossings(centre_angle: np.ndarray, slots) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """The slot pitch (D, 1), the positions in [0, τs) where a slot crosses a branch centre, sorted, and each
    one's next (the first again a pitch on): the bounds of the arrangements the network tells apart."""
    pitch = (2.0 * np.pi / np.asarray(slots, dtype=float))[..., None]
    crossings = np.sort(np.mod(centre_angle, pitch), axis=-1)
    following = np.concatenate([crossings[:, 1:], crossings[:, :1] + pitch], axis=1)
    return pitch, crossings, following


def rotor_position_shares(centre_angle: np.ndarray, slots) -> np.ndarray:
    """The share of a slot pitch over which each of :func:`distinct_rotor_positions` holds.

    The arrangement a position stands for lasts from one crossing of a slot over a branch centre to the
    next, so a mean over the rotor's turning weights each position by that interval.

    Parameters
    ----------
    centre_angle : ndarray
        The network's branch centres θk, (D, segments) [rad].
    slots : int or ndarray
        Slots of each cross-section, () or (D,) [1].

    Returns
    -------
    ndarray
        (D, segments), in the order of :func:`distinct_rotor_positions`, summing to 1 per design [1].

    References
    ----------
    .. [1] As :func:`distinct_rotor_positions`; our construction.
    """
    pitch, crossings, following = _crossings(centre_angle, slots)
    shares: np.ndarray = (following - crossings) / pitch
    return shares
