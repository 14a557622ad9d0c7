"""Masses, rotor inertia and material cost.

Volumes come from the cross-section (:mod:`core.geometry`); densities from the material library and
IEC 60028 for copper. Rotor inertia sums the parts as rigid bodies about the shaft axis: core and
shaft as annuli/cylinders (J = m·(r_o² + r_i²)/2), teeth and slot copper at their mid radius, end-turn
copper at half the square of the mid-slot radius (our estimate: the end turns sweep from the slot to
near the shaft), plus what the project adds for commutator and fan.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .conductors import COPPER_DENSITY
from .geometry import Geometry

STEEL_DENSITY_SHAFT = 7850.0  #: [kg/m³], carbon steel, common practice


@dataclass(frozen=True)
class Masses:
    magnet: float  #: all magnets [kg]
    copper: float  #: the armature winding [kg]
    housing: float  #: the housing tube [kg]
    lamination: float  #: the armature stack [kg]
    teeth: float  #: part of the stack [kg]
    core: float  #: part of the stack [kg]
    shaft: float  #: within the housing length [kg]

    @property
    def total(self):
        return self.magnet + self.copper + self.housing + self.lamination + self.shaft


def masses(geometry: Geometry, magnet_density, housing_density, lamination_density, wire_length, copper_area) -> Masses:
    g = geometry
    return Masses(
        magnet=magnet_density * g.magnet_volume,
        copper=COPPER_DENSITY * wire_length * copper_area,
        housing=housing_density * g.housing_volume,
        lamination=lamination_density * g.lamination_volume,
        teeth=lamination_density * g.teeth_volume,
        core=lamination_density * g.core_volume,
        shaft=STEEL_DENSITY_SHAFT * np.pi * g.shaft_radius**2 * g.housing_length,
    )


def rotor_inertia(geometry: Geometry, parts: Masses, slot_copper_fraction, extra_inertia):
    """Moment of inertia of the rotor about its axis [kg·m²]."""
    g = geometry
    core = 0.5 * parts.core * (g.slot_bottom_radius**2 + g.shaft_radius**2)
    mid_slot = g.armature_radius - 0.5 * g.slot_depth
    teeth = parts.teeth * mid_slot**2
    copper = parts.copper * mid_slot**2 * (slot_copper_fraction + 0.5 * (1.0 - slot_copper_fraction))
    shaft = 0.5 * parts.shaft * g.shaft_radius**2
    return core + teeth + copper + shaft + extra_inertia


@dataclass(frozen=True)
class MaterialCost:
    magnet: float
    copper: float
    housing: float
    lamination: float

    @property
    def total(self):
        return self.magnet + self.copper + self.housing + self.lamination


def material_cost(parts: Masses, prices) -> MaterialCost:
    """Cost of the active materials from prices per kg (shaft, commutator and brushes not included)."""
    return MaterialCost(
        magnet=parts.magnet * prices.magnet,
        copper=parts.copper * prices.copper,
        housing=parts.housing * prices.housing_steel,
        lamination=parts.lamination * prices.lamination,
    )
