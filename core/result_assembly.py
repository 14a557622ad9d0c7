"""Results groups assembled from what the topic modules return: copies and unit-named fields, no physics.

Split from :mod:`core.evaluate` so that the orchestrator stays a short hand calculation.
"""

from __future__ import annotations

from .design import Design
from .geometry import Geometry
from .mass import Masses
from .results import GeometryResult, MassResult, WindingResult
from .winding import coil_span_slots, conductors_per_slot, current_density, slot_fill


def geometry_result(geometry: Geometry, max_outer_diameter: float | None,
                    max_length: float | None = None) -> GeometryResult:
    """The cross-section as evaluated [m, rad], derived dimensions included; the envelope limits [m] echoed.

    Parameters
    ----------
    geometry : Geometry
        The design's cross-section and lengths, SI (one design: float fields) [m, rad].
    max_outer_diameter : float or None
        The envelope's largest housing outer diameter [m]; None when the project sets none.
    max_length : float or None, optional
        The envelope's largest overall length [m]; None when the project sets none.

    Returns
    -------
    GeometryResult
        Counts [1], diameters (twice the geometry's radii), lengths and the slot pitch [m], the magnet arc
        [rad] and embrace [1], each a plain float.
    """
    g = geometry
    return GeometryResult(
        poles=int(g.poles), slots=int(g.slots),
        housing_outer_diameter_m=2.0 * float(g.housing_outer_radius),
        housing_inner_diameter_m=2.0 * float(g.housing_inner_radius),
        housing_wall_m=float(g.housing_wall), housing_length_m=float(g.housing_length),
        magnet_inner_diameter_m=2.0 * float(g.magnet_inner_radius),
        magnet_thickness_m=float(g.magnet_thickness), magnet_arc_rad=float(g.magnet_arc),
        magnet_length_m=float(g.magnet_length), magnet_embrace=float(g.magnet_embrace),
        overhang_m=float(g.overhang), airgap_m=float(g.airgap),
        armature_diameter_m=2.0 * float(g.armature_radius), stack_length_m=float(g.stack_length),
        shaft_diameter_m=2.0 * float(g.shaft_radius), slot_pitch_m=float(g.slot_pitch),
        core_depth_m=float(g.core_depth), max_outer_diameter_m=max_outer_diameter,
        overall_length_m=float(g.overall_length), max_length_m=max_length,
    )


def winding_result(design: Design, paths: int, conductors: int, turn_length: float, wire_length: float,
                   resistance_20C: float, hot_rated_current: float) -> WindingResult:
    """The winding as built: counts [1], lengths [m], slot fill [1], R at 20 °C [Ω], hot rated density [A/m²].

    Parameters
    ----------
    design : Design
        The design, SI: its geometry (slots, poles, slot area) and winding (kind, segments, turns, wire).
    paths : int
        Parallel paths a [1] (:func:`core.winding.parallel_paths`).
    conductors : int
        Total conductors Z [1] (:func:`core.winding.total_conductors`).
    turn_length : float
        Mean turn length [m] (:func:`core.winding.mean_turn_length`).
    wire_length : float
        Wire in the winding [m] (:func:`core.winding.winding_length`).
    resistance_20C : float
        Armature resistance at 20 °C, brushes not included [Ω].
    hot_rated_current : float
        Armature current at the rated load in the hot case [A].

    Returns
    -------
    WindingResult
        The design's winding data with conductors per slot Z/S [1], the coil span [slots], the bare and
        gross slot fill [1] and the current density at the hot rated current [A/m²].

    References
    ----------
    .. [1] the relations of :mod:`core.winding`: Z/S, the slot fill of round wires, J = I/(a·A_cu).
    """
    g, w = design.geometry, design.winding
    slot_area = float(g.slot_area)
    return WindingResult(
        type=w.kind, parallel_paths=paths, commutator_segments=w.commutator_segments,
        turns_per_coil=w.turns_per_coil, conductors=conductors,
        conductors_per_slot=float(conductors_per_slot(conductors, g.slots)),
        coil_span_slots=int(coil_span_slots(g.slots, g.poles)), wire=w.wire.label,
        wire_bare_diameter_m=w.wire.bare_diameter, wire_overall_diameter_m=w.wire.overall_diameter,
        enamel_grade=w.wire.enamel_grade, mean_turn_length_m=turn_length, wire_length_m=wire_length,
        slot_area_m2=slot_area,
        slot_fill_bare=float(slot_fill(conductors, g.slots, w.wire.bare_diameter, slot_area)),
        slot_fill_gross=float(slot_fill(conductors, g.slots, w.wire.overall_diameter, slot_area)),
        resistance_20C_ohm=resistance_20C,
        rated_current_density_A_per_m2=float(current_density(hot_rated_current, paths, w.wire.copper_area)),
    )


def mass_result(masses: Masses) -> MassResult:
    """The parts' masses [kg] as plain floats, the estimated other parts and the whole motor included.

    Parameters
    ----------
    masses : Masses
        The masses of one design's parts [kg] (:func:`core.mass.masses`).

    Returns
    -------
    MassResult
        Each part [kg], the active total with the shaft, the estimated parts outside the magnetic circuit
        and the whole motor's estimate [kg].
    """
    m = masses
    return MassResult(
        magnet_kg=float(m.magnet), copper_kg=float(m.copper), housing_kg=float(m.housing),
        lamination_kg=float(m.lamination), shaft_kg=float(m.shaft), total_kg=float(m.total),
        shaft_extension_kg=float(m.shaft_extension), end_caps_kg=float(m.end_caps),
        brush_gear_kg=float(m.brush_gear), commutator_kg=float(m.commutator), bearings_kg=float(m.bearings),
        other_parts_kg=float(m.other_parts), estimated_total_kg=float(m.estimated_total),
    )
