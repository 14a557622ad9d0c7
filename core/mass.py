"""Masses, rotor inertia and material cost.

Volumes come from the cross-section (:mod:`core.geometry`); densities from the material library and
IEC 60028 for copper. Rotor inertia sums the parts as rigid bodies about the shaft axis: core and
shaft as annuli/cylinders (J = m·(r_o² + r_i²)/2), teeth and slot copper at their mid radius, end-turn
copper at half the square of the mid-slot radius (our estimate: the end turns sweep from the slot to
near the shaft), plus what the project adds for commutator and fan.

Like :class:`~core.geometry.Geometry`, every figure is a float for one design or an array for a sweep.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING

import numpy as np

from .conductors import COPPER_DENSITY
from .geometry import Geometry

if TYPE_CHECKING:
    from .design import Prices

STEEL_DENSITY_SHAFT = 7850.0  #: [kg/m³], carbon steel, common practice


@dataclass(frozen=True)
class Masses:
    """The masses of the motor's parts [kg]; ``teeth`` and ``core`` are parts of ``lamination``."""

    magnet: float | np.ndarray  #: all magnets [kg]
    copper: float | np.ndarray  #: the armature winding [kg]
    housing: float | np.ndarray  #: the housing tube [kg]
    lamination: float | np.ndarray  #: the armature stack [kg]
    teeth: float | np.ndarray  #: part of the stack [kg]
    core: float | np.ndarray  #: part of the stack [kg]
    shaft: float | np.ndarray  #: within the housing length [kg]

    @property
    def total(self) -> float | np.ndarray:
        """Magnets, copper, housing, stack and shaft [kg] (commutator, brushes and bearings not included)."""
        return self.magnet + self.copper + self.housing + self.lamination + self.shaft


def masses(geometry: Geometry, magnet_density: float, housing_density: float, lamination_density: float,
           wire_length: float | np.ndarray, copper_area: float | np.ndarray) -> Masses:
    """The masses of the parts from their volumes and densities.

    Parameters
    ----------
    geometry : Geometry
        The cross-section and lengths.
    magnet_density, housing_density, lamination_density : float
        Densities of the magnet grade, the housing steel and the lamination steel [kg/m³].
    wire_length : float or ndarray
        Total length of the winding wire [m].
    copper_area : float or ndarray
        Copper cross-section of the wire [m²].

    Returns
    -------
    Masses
        Each part's mass [kg]; the shaft in steel of 7850 kg/m³ over the housing length (common
        practice, no source), the copper at the IEC 60028 density.

    References
    ----------
    .. [1] IEC 60028 (copper density 8890 kg/m³); the volumes are plane geometry of the section.
    """
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


def rotor_inertia(geometry: Geometry, parts: Masses, slot_copper_fraction: float | np.ndarray,
                  extra_inertia: float | np.ndarray):
    """Moment of inertia of the rotor about its axis.

    Core and shaft as annuli and cylinders, J = m·(r_o² + r_i²)/2; teeth and slot copper as thin rings
    at the mid-slot radius, J = m·r²; end-turn copper at half the square of the mid-slot radius (our
    estimate: the end turns sweep from the slot to near the shaft).

    Parameters
    ----------
    geometry : Geometry
        The cross-section.
    parts : Masses
        The masses of core, teeth, copper and shaft [kg].
    slot_copper_fraction : float or ndarray
        Share of the copper that lies in the slots, the rest in the end turns [1].
    extra_inertia : float or ndarray
        What the commutator, fan and other parts add [kg·m²].

    Returns
    -------
    float or ndarray
        Rotor inertia [kg·m²].

    References
    ----------
    .. [1] rigid-body moments of inertia of rings and cylinders (any mechanics text); the split of the
       copper is our estimate, no source
    """
    g = geometry
    core = 0.5 * parts.core * (g.slot_bottom_radius**2 + g.shaft_radius**2)
    mid_slot = g.armature_radius - 0.5 * g.slot_depth
    teeth = parts.teeth * mid_slot**2
    copper = parts.copper * mid_slot**2 * (slot_copper_fraction + 0.5 * (1.0 - slot_copper_fraction))
    shaft = 0.5 * parts.shaft * g.shaft_radius**2
    return core + teeth + copper + shaft + extra_inertia


@dataclass(frozen=True)
class MaterialCost:
    """The cost of the active materials, in the currency of the prices."""

    magnet: float | np.ndarray  #: all magnets [currency]
    copper: float | np.ndarray  #: the winding [currency]
    housing: float | np.ndarray  #: the housing tube [currency]
    lamination: float | np.ndarray  #: the stack [currency]

    @property
    def total(self) -> float | np.ndarray:
        """Magnets, copper, housing and stack [currency]."""
        return self.magnet + self.copper + self.housing + self.lamination


def material_cost(parts: Masses, prices: Prices) -> MaterialCost:
    """Cost of the active materials from prices per kilogram.

    Parameters
    ----------
    parts : Masses
        The masses [kg].
    prices : Prices
        Prices of magnet, copper, housing steel and lamination [currency/kg].

    Returns
    -------
    MaterialCost
        Each material's cost [currency]; shaft, commutator and brushes not included.
    """
    return MaterialCost(
        magnet=parts.magnet * prices.magnet,
        copper=parts.copper * prices.copper,
        housing=parts.housing * prices.housing_steel,
        lamination=parts.lamination * prices.lamination,
    )
