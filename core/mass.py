"""Masses, rotor inertia and material cost.

Volumes come from the cross-section (:mod:`core.geometry`); densities from the material library and
IEC 60028 for copper. Rotor inertia sums the parts as rigid bodies about the shaft axis: core and
shaft as annuli/cylinders (J = m·(r_o² + r_i²)/2), teeth and slot copper at their mid radius, end-turn
copper at half the square of the mid-slot radius (our estimate: the end turns sweep from the slot to
near the shaft), plus what the project adds for commutator and fan.

The parts outside the magnetic circuit (the shaft's drive-end extension, end caps, brush gear,
commutator and bearings) are not drawn in the project; :class:`Masses` estimates them from the section
with the named proportions below, all common practice, no source (bearing proportions from the ISO 15
boundary dimensions of the 60 series, from memory), so that a total motor mass can stand beside the
active mass as an estimate:

* the end caps sit inside the housing tube's ends (the body is as long as the tube): two discs of the
  tube's inner diameter, each half as thick as the housing wall, in the housing's steel, bored for the
  shaft;
* the brush gear (holder plate, brushes, springs, terminals) weighs half an end cap;
* the commutator is a cylinder of 0.6 armature diameters (as :mod:`core.commutation` estimates it) and
  0.7 of its own diameter long, on the shaft, of a mean density 0.6 times copper's (segments, mica and
  moulded hub);
* two deep-groove ball bearings of the shaft's bore d, 2.6·d outside and 0.8·d wide, two thirds of the
  ring's volume steel;
* the shaft runs out of the drive end by three shaft diameters.

Like :class:`~core.geometry.Geometry`, every figure is a float for one design or an array for a sweep.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING

import numpy as np

from .commutation import COMMUTATOR_PER_ARMATURE  # the commutator diameter the brush checks estimate
from .conductors import COPPER_DENSITY
from .geometry import Geometry
from .shared_docs import parameter_table, shared_parameters

if TYPE_CHECKING:
    from .design import Prices

STEEL_DENSITY_SHAFT = 7850.0  #: [kg/m³], carbon steel, common practice
BEARING_STEEL_DENSITY = 7850.0  #: [kg/m³], bearing steel (common practice, no source)

# The parts outside the magnetic circuit, in proportions of the section (common practice, no source).
END_CAP_THICKNESS_PER_WALL = 0.5  #: each end cap's thickness over the housing wall [1]
BRUSH_GEAR_PER_END_CAP = 0.5  #: brush holder, brushes, springs and terminals over one end cap's mass [1]
COMMUTATOR_LENGTH_PER_DIAMETER = 0.7  #: commutator length over its diameter [1]
COMMUTATOR_DENSITY_PER_COPPER = 0.6  #: segments, mica and hub together, over copper's density [1]
#: deep-groove ball bearing of bore d: outside diameter and width over d, and the share of its ring
#: volume that is steel (ISO 15 boundary dimensions of the 60 series and catalogue masses, from memory)
BEARING_OUTER_PER_BORE, BEARING_WIDTH_PER_BORE, BEARING_FILL = 2.6, 0.8, 2.0 / 3.0
BEARINGS = 2  #: one at each end [1]
SHAFT_EXTENSION_PER_DIAMETER = 3.0  #: the shaft's run-out beyond the drive end over its diameter [1]



#: The arguments the mass functions share, described once (:mod:`core.shared_docs`).
MASS_PARAMETERS = parameter_table("""
geometry : Geometry
    The cross-section and lengths.
housing_density : float
    Density of the housing steel, of which the end caps are taken to be [kg/m³].
commutator_diameter : float or ndarray, optional
    The project's commutator diameter [m]; None (or NaN, per design of a batch) for 0.6 armature
    diameters.
parts : Masses
    The masses of the parts [kg].
""")

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
    #: the parts outside the magnetic circuit, estimated (module docstring): all 0 unless given
    shaft_extension: float | np.ndarray = 0.0  #: the shaft beyond the drive end [kg]
    end_caps: float | np.ndarray = 0.0  #: both end caps [kg]
    brush_gear: float | np.ndarray = 0.0  #: brush holder, brushes, springs and terminals [kg]
    commutator: float | np.ndarray = 0.0  #: [kg]
    bearings: float | np.ndarray = 0.0  #: both bearings [kg]

    @property
    def total(self) -> float | np.ndarray:
        """Magnets, copper, housing, stack and shaft [kg]: the active mass with the shaft inside the housing."""
        return self.magnet + self.copper + self.housing + self.lamination + self.shaft

    @property
    def other_parts(self) -> float | np.ndarray:
        """The estimated parts outside the magnetic circuit [kg] (module docstring)."""
        return self.shaft_extension + self.end_caps + self.brush_gear + self.commutator + self.bearings

    @property
    def estimated_total(self) -> float | np.ndarray:
        """The whole motor, the active mass and the estimate of the other parts [kg]."""
        return self.total + self.other_parts


@shared_parameters(MASS_PARAMETERS)
def masses(geometry: Geometry, magnet_density: float, housing_density: float, lamination_density: float,
           wire_length: float | np.ndarray, copper_area: float | np.ndarray,
           commutator_diameter: float | np.ndarray | None = None) -> Masses:
    """The masses of the parts from their volumes and densities, with an estimate of the other parts.

    Parameters
    ----------
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
        practice, no source), the copper at the IEC 60028 density; the parts outside the magnetic
        circuit from :func:`other_parts`.

    References
    ----------
    .. [1] IEC 60028 (copper density 8890 kg/m³); the volumes are plane geometry of the section.
    """
    g = geometry
    return Masses(
        **other_parts(g, housing_density, commutator_diameter),
        magnet=magnet_density * g.magnet_volume,
        copper=COPPER_DENSITY * wire_length * copper_area,
        housing=housing_density * g.housing_volume,
        lamination=lamination_density * g.lamination_volume,
        teeth=lamination_density * g.teeth_volume,
        core=lamination_density * g.core_volume,
        shaft=STEEL_DENSITY_SHAFT * np.pi * g.shaft_radius**2 * g.housing_length,
    )


@shared_parameters(MASS_PARAMETERS)
def other_parts(geometry: Geometry, housing_density: float,
                commutator_diameter: float | np.ndarray | None = None) -> dict[str, float | np.ndarray]:
    """An estimate of the parts outside the magnetic circuit, from the section's proportions.

    Each part is a disc, cylinder or ring of plain geometry, sized by the named proportions of this
    module (its docstring lists them): end caps set into the tube's ends, brush gear as a share of a
    cap, a commutator on the shaft, two ball bearings of the shaft's bore, the shaft's drive-end run-out.

    Returns
    -------
    dict
        ``shaft_extension``, ``end_caps``, ``brush_gear``, ``commutator`` and ``bearings`` [kg], the
        :class:`Masses` fields of the same names.

    References
    ----------
    .. [1] the proportions are common practice, no source; the bearing proportions follow the ISO 15
       boundary dimensions of the 60 series and its catalogue masses, from memory.
    """
    g = geometry
    shaft_area = np.pi * g.shaft_radius**2
    cap_thickness = END_CAP_THICKNESS_PER_WALL * g.housing_wall
    end_cap = housing_density * (np.pi * g.housing_inner_radius**2 - shaft_area) * cap_thickness
    estimate = COMMUTATOR_PER_ARMATURE * 2.0 * g.armature_radius
    if commutator_diameter is None:
        commutator_diameter = estimate
    elif np.ndim(commutator_diameter):  # a batch: NaN where the project leaves the diameter to the estimate
        commutator_diameter = np.where(np.isnan(commutator_diameter), estimate, commutator_diameter)
    commutator_length = COMMUTATOR_LENGTH_PER_DIAMETER * commutator_diameter
    commutator_ring = np.pi * (commutator_diameter**2 / 4.0 - g.shaft_radius**2)
    bore = 2.0 * g.shaft_radius
    bearing_ring = np.pi / 4.0 * ((BEARING_OUTER_PER_BORE * bore) ** 2 - bore**2) * BEARING_WIDTH_PER_BORE * bore
    return {
        "shaft_extension": STEEL_DENSITY_SHAFT * shaft_area * SHAFT_EXTENSION_PER_DIAMETER * bore,
        "end_caps": 2.0 * end_cap,
        "brush_gear": BRUSH_GEAR_PER_END_CAP * end_cap,
        "commutator": COMMUTATOR_DENSITY_PER_COPPER * COPPER_DENSITY * commutator_ring * commutator_length,
        "bearings": BEARINGS * BEARING_FILL * BEARING_STEEL_DENSITY * bearing_ring,
    }


@shared_parameters(MASS_PARAMETERS)
def rotor_inertia(geometry: Geometry, parts: Masses, slot_copper_fraction: float | np.ndarray,
                  extra_inertia: float | np.ndarray):
    """Moment of inertia of the rotor about its axis.

    Core and shaft as annuli and cylinders, J = m·(r_o² + r_i²)/2; teeth and slot copper as thin rings
    at the mid-slot radius, J = m·r²; end-turn copper at half the square of the mid-slot radius (our
    estimate: the end turns sweep from the slot to near the shaft).

    Parameters
    ----------
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


@shared_parameters(MASS_PARAMETERS)
def material_cost(parts: Masses, prices: Prices) -> MaterialCost:
    """Cost of the active materials from prices per kilogram.

    Parameters
    ----------
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
