"""Cross-section and lengths of a radial-arc-magnet DC motor, in SI.

Radially from the shaft outwards: shaft, armature core (back iron), slots and teeth, air gap, arc
magnets glued to the housing bore, housing wall. The armature diameter, gap, magnet thickness and wall
fix the housing: D_housing = D_armature + 2·(gap + magnet + wall).

Fields may be floats or numpy arrays of the same shape (a sweep); every derived property broadcasts.

The areas and volumes are plane and solid geometry of that idealized section (parallel-sided teeth,
tooth tips ignored, magnets as annular sectors), not taken from a source.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

#: Radial height of the tooth tips that overhang the slot [m] (common practice, no source); a shallow
#: slot keeps at most a quarter of its depth for them (:attr:`Geometry.tooth_tip_height`).
TOOTH_TIP_HEIGHT = 0.5e-3


def tooth_tip_height(slot_depth):
    """Radial height of the tooth tips that overhang the slot: the one rule every model uses.

    Parameters
    ----------
    slot_depth : float or ndarray
        Radial depth of the slots [m].

    Returns
    -------
    float or ndarray
        Tip height [m]: :data:`TOOTH_TIP_HEIGHT`, at most a quarter of the slot depth.

    References
    ----------
    .. [1] common practice, no source (the height and the quarter-depth cap are our rule).
    """
    return np.minimum(TOOTH_TIP_HEIGHT, 0.25 * np.asarray(slot_depth, dtype=float))


@dataclass(frozen=True)
class Geometry:
    """The cross-section and axial lengths of one motor (or of a sweep: arrays of one shape), SI.

    The derived radii, pitches, areas and volumes are properties, so a changed field (a
    ``dataclasses.replace``) changes all that follows from it.
    """

    poles: int | np.ndarray  #: number of magnet poles [1]
    magnet_thickness: float | np.ndarray  #: radial thickness of a magnet [m]
    magnet_arc: float | np.ndarray  #: mechanical arc of one magnet [rad]
    magnet_length: float | np.ndarray  #: axial length of a magnet [m]
    airgap: float | np.ndarray  #: radial clearance armature to magnet [m]
    housing_wall: float | np.ndarray  #: radial thickness of the housing wall [m]
    housing_length: float | np.ndarray  #: axial length of the housing tube [m]
    armature_radius: float | np.ndarray  #: outer radius of the lamination stack [m]
    stack_length: float | np.ndarray  #: axial length of the lamination stack [m]
    stacking_factor: float | np.ndarray  #: steel fraction of the stack [1]
    slots: int | np.ndarray  #: number of armature slots [1]
    slot_opening: float | np.ndarray  #: width of the slot opening at the armature surface [m]
    tooth_width: float | np.ndarray  #: width of a parallel-sided tooth [m]
    slot_depth: float | np.ndarray  #: radial depth of a slot from the armature surface [m]
    shaft_radius: float | np.ndarray  #: radius of the shaft (the stack's bore) [m]

    # --- radii
    @property
    def magnet_inner_radius(self):
        """Radius of the magnets' inner (air-gap) face, armature radius plus gap [m]."""
        return self.armature_radius + self.airgap

    @property
    def housing_inner_radius(self):
        """Radius of the housing bore, where the magnets' outer faces sit [m]."""
        return self.magnet_inner_radius + self.magnet_thickness

    @property
    def housing_outer_radius(self):
        """Outer radius of the housing [m]: D_housing = D_armature + 2·(gap + magnet + wall)."""
        return self.housing_inner_radius + self.housing_wall

    @property
    def overall_length(self):
        """Overall length of the motor body [m]: the housing tube's length.

        The end caps sit inside the tube's ends (as :mod:`core.mass` draws them), so the body runs from
        end cap to end cap over the tube; the shaft's run-out beyond the drive end is not counted.
        """
        return self.housing_length

    @property
    def slot_bottom_radius(self):
        """Radius of the slot bottoms, armature radius less slot depth [m]."""
        return self.armature_radius - self.slot_depth

    @property
    def core_depth(self):
        """Radial depth of the armature back iron between slot bottoms and shaft [m]."""
        return self.slot_bottom_radius - self.shaft_radius

    @property
    def tooth_tip_height(self):
        """Radial height of the tooth tips [m]: :data:`TOOTH_TIP_HEIGHT`, at most a quarter of the slot
        depth (the areas and volumes here leave the tips out; the field solution meshes them)."""
        return tooth_tip_height(self.slot_depth)

    # --- angles and pitches
    @property
    def pole_pitch_angle(self):
        """Mechanical angle of one pole pitch, 2π/p [rad]."""
        return 2.0 * np.pi / self.poles

    @property
    def magnet_embrace(self):
        """Magnet arc as a fraction of the pole pitch [1]."""
        return self.magnet_arc / self.pole_pitch_angle

    @property
    def slot_pitch(self):
        """Slot pitch at the armature surface [m]."""
        return 2.0 * np.pi * self.armature_radius / self.slots

    @property
    def overhang(self):
        """Axial overhang of the magnet beyond the stack at each end [m]."""
        return (self.magnet_length - self.stack_length) / 2.0

    # --- areas
    @property
    def slot_area(self):
        """Cross-section of one slot between parallel-sided teeth, tooth tips ignored [m²]."""
        outer, inner = self.armature_radius, self.slot_bottom_radius
        return np.pi * (outer**2 - inner**2) / self.slots - self.tooth_width * self.slot_depth

    @property
    def magnet_volume(self):
        """Volume of all magnets [m³]."""
        ro, ri = self.housing_inner_radius, self.magnet_inner_radius
        return self.poles * 0.5 * self.magnet_arc * (ro**2 - ri**2) * self.magnet_length

    @property
    def housing_volume(self):
        """Volume of the housing tube over its length [m³]."""
        return np.pi * (self.housing_outer_radius**2 - self.housing_inner_radius**2) * self.housing_length

    @property
    def lamination_volume(self):
        """Steel volume of the stack: disc less shaft bore and slots, times stacking factor [m³]."""
        area = np.pi * (self.armature_radius**2 - self.shaft_radius**2) - self.slots * self.slot_area
        return area * self.stack_length * self.stacking_factor

    @property
    def teeth_volume(self):
        """Steel volume of the teeth: S parallel-sided teeth over the slot depth, times stacking factor [m³]."""
        return self.slots * self.tooth_width * self.slot_depth * self.stack_length * self.stacking_factor

    @property
    def core_volume(self):
        """Steel volume of the back iron between slot bottoms and shaft, times stacking factor [m³]."""
        return np.pi * (self.slot_bottom_radius**2 - self.shaft_radius**2) * self.stack_length * self.stacking_factor
