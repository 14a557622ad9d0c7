"""The armature winding: paths, conductors, constants, resistance, fill, inductance estimate.

References for the DC-machine relations used here: A. E. Fitzgerald, C. Kingsley Jr. and S. D. Umans,
"Electric Machinery", 6th ed., McGraw-Hill, 2003, ch. 7 (E = K·Φ·ω with K = p·Z/(2π·a); lap winding
a = m·p, wave winding a = 2·m), from memory.
"""

from __future__ import annotations

import numpy as np

from .conductors import copper_resistivity
from .geometry import Geometry
from .shared_docs import parameter_table, shared_parameters
from .units import MU_0

#: The arguments the winding's functions share (here and in core.commutation), described once
#: (:mod:`core.shared_docs`).
WINDING_PARAMETERS = parameter_table("""
conductors : int or ndarray
    Total conductors Z [1].
turn_length : float or ndarray
    Mean turn length [m].
paths : int or ndarray
    Parallel paths a [1].
copper_area : float or ndarray
    Copper cross-section of the wire [m²].
slots : int or ndarray
    Number of slots S [1].
poles : int or ndarray
    Number of poles p [1].
current : float or ndarray
    Armature current I [A].
turns_per_coil : int or ndarray
    Turns N of each coil [1].
geometry : Geometry
    The cross-section and stack length.
""")


@shared_parameters(WINDING_PARAMETERS)
def parallel_paths(kind: str, poles: int | np.ndarray, multiplicity: int = 1):
    """Parallel paths between the brushes: lap a = m·p, wave a = 2·m.

    Parameters
    ----------
    kind : str
        ``"lap"`` or ``"wave"``.
    multiplicity : int, optional
        Multiplicity m of the winding [1] (1 for simplex).

    Returns
    -------
    ndarray
        Parallel paths a [1].

    Raises
    ------
    ValueError
        If ``kind`` is neither.

    References
    ----------
    .. [1] textbook relation (Fitzgerald, Kingsley and Umans, ch. 7, from memory)
    """
    if kind == "lap":
        return multiplicity * np.asarray(poles)
    if kind == "wave":
        return 2 * multiplicity * np.ones_like(np.asarray(poles))
    raise ValueError(f"winding type {kind!r} is not 'lap' or 'wave'")


@shared_parameters(WINDING_PARAMETERS)
def total_conductors(commutator_segments: int | np.ndarray, turns_per_coil: int | np.ndarray):
    """Total active conductors Z = 2·C·N: one coil per segment, two coil sides per turn.

    Parameters
    ----------
    commutator_segments : int or ndarray
        Commutator segments C [1], one coil each.

    Returns
    -------
    ndarray
        Conductors Z [1].

    References
    ----------
    .. [1] textbook relation for a winding with as many coils as segments (Fitzgerald et al., ch. 7,
       from memory)
    """
    return 2 * np.asarray(commutator_segments) * np.asarray(turns_per_coil)


@shared_parameters(WINDING_PARAMETERS)
def machine_constant(poles: int | np.ndarray, conductors: int | np.ndarray, paths: int | np.ndarray):
    """The winding's machine constant K = p·Z/(2π·a), so that E = K·Φ·ω and T = K·Φ·I.

    Returns
    -------
    ndarray
        K [1] (with Φ in Wb, K·Φ is in V·s/rad).

    References
    ----------
    .. [1] textbook DC-machine relation (Fitzgerald, Kingsley and Umans, "Electric Machinery", 6th ed.,
       2003, ch. 7, from memory)
    """
    return np.asarray(poles) * np.asarray(conductors) / (2.0 * np.pi * np.asarray(paths))


@shared_parameters(WINDING_PARAMETERS)
def coil_span_slots(slots: int | np.ndarray, poles: int | np.ndarray):
    """Coil pitch in slots: the nearest whole number at or below full pitch S/p, at least 1.

    Returns
    -------
    ndarray
        Coil span [slots].

    References
    ----------
    .. [1] common practice, no source (a short-pitched or full-pitched coil)
    """
    return np.maximum(np.floor(np.asarray(slots) / np.asarray(poles)), 1)


@shared_parameters(WINDING_PARAMETERS)
def mean_turn_length(geometry: Geometry, end_turn_factor: float = 1.0):
    """Mean length of one turn: two stack lengths plus two end turns.

    Each end turn is taken as a half circle over the chord of the coil span at mid-slot radius
    (our estimate, common practice, no source), scaled by ``end_turn_factor`` for a measured coil.

    Parameters
    ----------
    end_turn_factor : float, optional
        Multiplier on the estimated end-turn length [1], to match a measured coil.

    Returns
    -------
    float or ndarray
        Mean turn length [m].

    References
    ----------
    .. [1] our estimate (common practice, no source)
    """
    g = geometry
    mid_slot_radius = g.armature_radius - 0.5 * g.slot_depth
    span_angle = coil_span_slots(g.slots, g.poles) * 2.0 * np.pi / g.slots
    chord = 2.0 * mid_slot_radius * np.sin(0.5 * span_angle)
    end_turn = 0.5 * np.pi * chord * end_turn_factor
    return 2.0 * g.stack_length + 2.0 * end_turn


@shared_parameters(WINDING_PARAMETERS)
def winding_length(conductors: int | np.ndarray, turn_length: float | np.ndarray):
    """Total length of wire in the winding: Z/2 turns of the mean turn length.

    Returns
    -------
    float or ndarray
        Wire length [m].
    """
    return 0.5 * np.asarray(conductors) * turn_length


@shared_parameters(WINDING_PARAMETERS)
def armature_resistance(conductors: int | np.ndarray, turn_length: float | np.ndarray,
                        paths: int | np.ndarray, copper_area: float | np.ndarray,
                        temperature_C: float | np.ndarray, resistivity_factor: float | np.ndarray = 1.0):
    """Resistance between the brushes: a paths in parallel, each of Z/(2a) turns.

    R = f·ρ(T)·(Z/2·l_turn)/(a²·A_cu), with ρ(T) of annealed copper per IEC 60028 and f the wire's
    resistivity relative to it (production spread; 1 for the standard's copper).

    Parameters
    ----------
    temperature_C : float or ndarray
        Winding temperature [°C].
    resistivity_factor : float or ndarray
        The copper's resistivity relative to IEC 60028 annealed copper [1].

    Returns
    -------
    float or ndarray
        Armature resistance [Ω], brushes not included.

    References
    ----------
    .. [1] IEC 60028 (resistivity of annealed copper and its temperature coefficient); the series and
       parallel combination of the paths is elementary circuit theory.
    """
    length = winding_length(conductors, turn_length)
    return resistivity_factor * copper_resistivity(temperature_C) * length / (np.asarray(paths) ** 2 * copper_area)


@shared_parameters(WINDING_PARAMETERS)
def conductors_per_slot(conductors: int | np.ndarray, slots: int | np.ndarray):
    """Conductors in each slot, Z/S.

    Returns
    -------
    ndarray
        Conductors per slot [1] (not rounded).
    """
    return np.asarray(conductors) / np.asarray(slots)


@shared_parameters(WINDING_PARAMETERS)
def slot_fill(conductors: int | np.ndarray, slots: int | np.ndarray, wire_diameter: float | np.ndarray,
              slot_area: float | np.ndarray):
    """Slot fill factor: the area of the round wires in a slot over the slot area.

    Parameters
    ----------
    wire_diameter : float or ndarray
        Wire diameter [m], bare (copper fill) or with enamel (gross fill).
    slot_area : float or ndarray
        Cross-section of one slot [m²].

    Returns
    -------
    ndarray
        Fill factor [1].
    """
    return conductors_per_slot(conductors, slots) * np.pi / 4.0 * wire_diameter**2 / slot_area


@shared_parameters(WINDING_PARAMETERS)
def current_density(current: float | np.ndarray, paths: int | np.ndarray, copper_area: float | np.ndarray):
    """Current density in the wire: each path carries I/a.

    Returns
    -------
    ndarray
        Current density [A/m²].
    """
    return np.asarray(current) / (np.asarray(paths) * copper_area)


@shared_parameters(WINDING_PARAMETERS)
def armature_inductance_estimate(geometry: Geometry, conductors: int | np.ndarray, paths: int | np.ndarray,
                                 recoil_permeability: float, effective_gap: float | np.ndarray,
                                 turn_length: float | np.ndarray):
    """Armature inductance between the brushes: an ESTIMATE (±50 %).

    Two parts, each from the stored magnetic energy W = L·I²/2 (our derivation, no source):

    * slot leakage: each slot holds n = Z/S conductors carrying I/a, with the permeance of a
      rectangular open slot per unit length μ0·(d/(3·w) + h0/w0) (the textbook slot-leakage form,
      e.g. Hendershot and Miller, 2010, from memory), taking a tooth-tip height of 0.5 mm; plus end
      winding leakage of 0.3·μ0 per metre of end turn (common practice, no source):
      L_slot = S·n²·λ/a²;
    * air gap: the triangular armature MMF F(θ) = A·R·θ under the magnet arc, over the magnetic gap
      g_e + lm/μrec: L_gap = 2·p·μ0·L·R³·(Z/(2π·a·R))²·(θm/2)³/(3·g_m).

    Parameters
    ----------
    recoil_permeability : float
        The magnet's relative recoil permeability μrec [1].
    effective_gap : float or ndarray
        Air gap with Carter's coefficient g_e [m].
    turn_length : float or ndarray
        Mean turn length [m], for the end-winding part.

    Returns
    -------
    float or ndarray
        Inductance [H].

    References
    ----------
    .. [1] our derivation from the stored energy, no source; slot-leakage permeance in the textbook
       form, e.g. Hendershot and Miller, "Design of Brushless Permanent-Magnet Machines", 2010 (from
       memory); the tooth-tip height (core.geometry.tooth_tip_height) and the end-winding 0.3·μ0 per metre are common
       practice, no source.
    """
    g = geometry
    z = np.asarray(conductors, dtype=float)
    a = np.asarray(paths, dtype=float)
    mean_slot_width = g.slot_area / g.slot_depth
    stack_permeance = MU_0 * g.stack_length * (g.slot_depth / (3.0 * mean_slot_width)
                                               + g.tooth_tip_height / g.slot_opening)
    end_length = np.maximum(turn_length - 2.0 * g.stack_length, 0.0)
    end_permeance = 0.3 * MU_0 * end_length
    per_slot = (z / g.slots) ** 2 * (stack_permeance + end_permeance)
    slot_part = g.slots * per_slot / a**2
    magnetic_gap = effective_gap + g.magnet_thickness / recoil_permeability
    radius = g.armature_radius
    gap_part = (
        2.0 * g.poles * MU_0 * g.stack_length * radius**3 * (z / (2.0 * np.pi * a * radius)) ** 2
        * (0.5 * g.magnet_arc) ** 3 / (3.0 * magnetic_gap)
    )
    return slot_part + gap_part


def slot_share_of_turn(stack_length, turn_length):
    """Share of a turn's length that lies in the slots: its two sides over the mean turn [1].

    Parameters
    ----------
    stack_length : float
        Axial length of the stack [m].
    turn_length : float
        Mean turn length, end turns included [m].

    Returns
    -------
    float
        2·L/l_turn [1]; the rest of the copper is in the end turns.
    """
    return 2.0 * stack_length / turn_length


def back_emf_constant(machine_constant, flux_per_pole):
    """Ke = Kt = K·Φ [V·s/rad], equal to the torque constant in SI units.

    Parameters
    ----------
    machine_constant : float
        K = p·Z/(2π·a) [1] (:func:`machine_constant`).
    flux_per_pole : float or ndarray
        Flux crossing the gap per pole Φ [Wb].

    Returns
    -------
    float or ndarray
        Ke [V·s/rad] = Kt [N·m/A].

    References
    ----------
    .. [1] textbook DC-machine relation E = K·Φ·ω, e.g. S. J. Chapman, Electric Machinery
       Fundamentals, ch. 8 (from memory).
    """
    return machine_constant * flux_per_pole
