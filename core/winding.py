"""The armature winding: paths, conductors, constants, resistance, fill, inductance estimate.

References for the DC-machine relations used here: A. E. Fitzgerald, C. Kingsley Jr. and S. D. Umans,
"Electric Machinery", 6th ed., McGraw-Hill, 2003, ch. 7 (E = K·Φ·ω with K = p·Z/(2π·a); lap winding
a = m·p, wave winding a = 2·m), from memory.
"""

from __future__ import annotations

import numpy as np

from .conductors import copper_resistivity
from .geometry import Geometry
from .units import MU_0


def parallel_paths(kind: str, poles, multiplicity=1):
    """Parallel paths a: lap a = m·p, wave a = 2·m (Fitzgerald et al., ch. 7)."""
    if kind == "lap":
        return multiplicity * np.asarray(poles)
    if kind == "wave":
        return 2 * multiplicity * np.ones_like(np.asarray(poles))
    raise ValueError(f"winding type {kind!r} is not 'lap' or 'wave'")


def total_conductors(commutator_segments, turns_per_coil):
    """Z = 2·C·N: one coil per segment, two coil sides per turn."""
    return 2 * np.asarray(commutator_segments) * np.asarray(turns_per_coil)


def machine_constant(poles, conductors, paths):
    """K = p·Z/(2π·a) [1]: E = K·Φ·ω and T = K·Φ·I (Fitzgerald et al., ch. 7)."""
    return np.asarray(poles) * np.asarray(conductors) / (2.0 * np.pi * np.asarray(paths))


def back_emf_constant(flux_per_pole, poles, conductors, paths):
    """Back-EMF constant Ke [V·s/rad], equal to the torque constant Kt [N·m/A] in SI.

    References
    ----------
    .. [1] textbook DC-machine relation E = K·Φ·ω, K = p·Z/(2π·a) (Fitzgerald et al., ch. 7)
    """
    return machine_constant(poles, conductors, paths) * flux_per_pole


def coil_span_slots(slots, poles):
    """Coil pitch in slots: the nearest whole number at or below full pitch S/p (common practice)."""
    return np.maximum(np.floor(np.asarray(slots) / np.asarray(poles)), 1)


def mean_turn_length(geometry: Geometry, end_turn_factor=1.0):
    """Mean length of one turn [m]: two stack lengths plus two end turns.

    Each end turn is taken as a half circle over the chord of the coil span at mid-slot radius
    (our estimate, common practice, no source), scaled by ``end_turn_factor`` for a measured coil.
    """
    g = geometry
    mid_slot_radius = g.armature_radius - 0.5 * g.slot_depth
    span_angle = coil_span_slots(g.slots, g.poles) * 2.0 * np.pi / g.slots
    chord = 2.0 * mid_slot_radius * np.sin(0.5 * span_angle)
    end_turn = 0.5 * np.pi * chord * end_turn_factor
    return 2.0 * g.stack_length + 2.0 * end_turn


def winding_length(conductors, turn_length):
    """Total length of wire [m]: Z/2 turns of the mean turn length."""
    return 0.5 * np.asarray(conductors) * turn_length


def armature_resistance(conductors, turn_length, paths, copper_area, temperature_C):
    """Resistance between the brushes [Ω]: a paths in parallel, each of Z/(2a) turns.

    R = ρ(T)·(Z/2·l_turn)/(a²·A_cu), with ρ(T) of annealed copper per IEC 60028.
    """
    length = winding_length(conductors, turn_length)
    return copper_resistivity(temperature_C) * length / (np.asarray(paths) ** 2 * copper_area)


def conductors_per_slot(conductors, slots):
    return np.asarray(conductors) / np.asarray(slots)


def slot_fill(conductors, slots, wire_diameter, slot_area):
    """Fill factor [1]: area of the round wires (bare or with enamel, as given) over the slot area."""
    return conductors_per_slot(conductors, slots) * np.pi / 4.0 * wire_diameter**2 / slot_area


def current_density(current, paths, copper_area):
    """Current density in the wire [A/m²]: each path carries I/a."""
    return np.asarray(current) / (np.asarray(paths) * copper_area)


def armature_inductance_estimate(geometry: Geometry, conductors, paths, recoil_permeability, effective_gap, turn_length):
    """Armature inductance between the brushes [H]: an ESTIMATE (±50 %).

    Two parts, each from the stored magnetic energy W = L·I²/2 (our derivation, no source):

    * slot leakage: each slot holds n = Z/S conductors carrying I/a, with the permeance of a
      rectangular open slot per unit length μ0·(d/(3·w) + h0/w0) (the textbook slot-leakage form,
      e.g. Hendershot and Miller, 2010, from memory), taking a tooth-tip height of 0.5 mm; plus end
      winding leakage of 0.3·μ0 per metre of end turn (common practice, no source):
      L_slot = S·n²·λ/a²;
    * air gap: the triangular armature MMF F(θ) = A·R·θ under the magnet arc, over the magnetic gap
      g_e + lm/μrec: L_gap = 2·p·μ0·L·R³·(Z/(2π·a·R))²·(θm/2)³/(3·g_m).
    """
    g = geometry
    z = np.asarray(conductors, dtype=float)
    a = np.asarray(paths, dtype=float)
    mean_slot_width = g.slot_area / g.slot_depth
    tip_height = 0.5e-3
    stack_permeance = MU_0 * g.stack_length * (g.slot_depth / (3.0 * mean_slot_width) + tip_height / g.slot_opening)
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
        [Wb]

    Returns
    -------
    float or ndarray
        [V·s/rad]

    References
    ----------
    .. [1] textbook DC-machine relation E = K·Φ·ω, e.g. S. J. Chapman, Electric Machinery
       Fundamentals, ch. 8 (from memory).
    """
    return machine_constant * flux_per_pole
