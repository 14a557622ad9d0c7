"""A design in SI, with its materials resolved: what the chain computes on.

:func:`design_from_project` is the one place where the file's engineering units become SI.
"""

from __future__ import annotations

from dataclasses import dataclass

from . import library
from .conductors import Wire, wire
from .errors import ProjectError
from .geometry import Geometry
from .magnet_grades import magnet_price_per_kg
from .magnets import MagnetGrade
from .schema import Project
from .steel import Steel
from .units import to_si

#: IEC 60085 thermal classes: the class is the limiting temperature in °C.
INSULATION_CLASS_LIMIT_C = {
    "105 (A)": 105.0, "120 (E)": 120.0, "130 (B)": 130.0, "155 (F)": 155.0,
    "180 (H)": 180.0, "200 (N)": 200.0, "220 (R)": 220.0,
}


@dataclass(frozen=True)
class WindingData:
    """The armature winding as the project states it, with its wire resolved."""

    kind: str  #: "lap" or "wave"
    multiplicity: int  #: simplex 1, duplex 2, triplex 3 [1]
    commutator_segments: int  #: one coil per segment [1]
    turns_per_coil: int  #: [1]
    wire: Wire  #: bare and overall diameters [m]
    insulation_class: str  #: IEC 60085 thermal class, e.g. "155 (F)"
    insulation_limit_C: float  #: IEC 60085 class temperature [°C]
    end_turn_factor: float  #: multiplier on the estimated end-turn length [1]
    #: the copper's resistivity relative to IEC 60028 annealed copper (production spread of the wire) [1]
    resistivity_factor: float = 1.0


@dataclass(frozen=True)
class LossData:
    """Mechanical and iron-loss inputs of a design, SI."""

    friction_torque: float  #: constant friction torque of bearings and brushes [N·m]
    viscous_coeff: float  #: torque per speed of the viscous drag [N·m·s/rad]
    iron_loss_build_factor: float  #: multiplies the catalogue core loss for punching and rotation [1]


@dataclass(frozen=True)
class ThermalData:
    """Thermal network and duty inputs of a design, SI."""

    winding_to_housing: float  #: thermal resistance winding to housing [K/W]
    housing_to_ambient: float | None  #: [K/W], None to estimate from the surface
    convection_coeff: float  #: heat transfer coefficient of the housing surface [W/(m²·K)]
    time_constant: float | None  #: measured slow time constant of the motor [s]; None to estimate
    duty: str  #: IEC 60034-1 duty type, "S1", "S2" or "S3"
    duty_time: float  #: length of the S2 short-time run [s]
    winding_capacity: float | None = None  #: heat capacity of the winding node [J/K]; None to estimate
    winding_to_magnet: float | None = None  #: across the gap [K/W]; None to estimate
    cycle_factor: float = 0.4  #: S3 cycle duration factor [1]
    cycle_time: float = 600.0  #: S3 cycle duration [s]


@dataclass(frozen=True)
class BrushData:
    """Brushes and commutator, SI; None where the project leaves the estimate to the tool."""

    grade: str = "electrographite"  #: brush material
    current_density_limit: float | None = None  #: continuous-service limit [A/m²]
    count: int | None = None  #: brushes, half of each polarity [1]
    width: float | None = None  #: along the commutator's circumference [m]
    length: float | None = None  #: along the shaft [m]
    commutator_diameter: float | None = None  #: [m]


@dataclass(frozen=True)
class Prices:
    """Material prices per kilogram that the user sets."""

    currency: str  #: e.g. "EUR"
    magnet: float  #: [currency/kg]
    copper: float  #: [currency/kg]
    housing_steel: float  #: [currency/kg]
    lamination: float  #: [currency/kg]


@dataclass(frozen=True)
class Design:
    """One motor design, SI throughout (temperatures in °C)."""

    project: Project  #: the file-unit source of this design
    supply_voltage: float  #: [V]
    brush_drop: float  #: [V]
    current_limit: float | None  #: [A]
    reversing: bool  #: the application plugs the motor at speed
    load_torque: float  #: rated shaft torque [N·m]
    load_speed: float  #: required speed at the rated torque [rad/s]
    ambient_min_C: float  #: lowest ambient [°C]
    ambient_nominal_C: float  #: nominal ambient [°C]
    ambient_max_C: float  #: highest ambient [°C]
    geometry: Geometry  #: cross-section and lengths [m, rad]
    magnet: MagnetGrade  #: the grade, resolved from the library or the project's own
    housing_steel: Steel  #: steel of the housing (the return yoke)
    lamination_steel: Steel  #: steel of the armature stack
    winding: WindingData  #: the armature winding
    losses: LossData  #: friction, drag and iron-loss inputs
    thermal: ThermalData  #: thermal network and duty
    extra_inertia: float  #: what the commutator, fan and other parts add to the rotor [kg·m²]
    prices: Prices  #: material prices per kg
    magnetization: str = "radial"  #: "radial" or "parallel", for the field solution
    shaft_magnetic: bool = True  #: a steel shaft (housing steel's B(H)) or a non-magnetic one
    max_outer_diameter: float | None = None  #: envelope limit on the housing diameter [m]
    max_length: float | None = None  #: envelope limit on the overall length (the housing tube) [m]
    brushes: BrushData = BrushData()  #: brushes and commutator
    fault_cases: str = "must survive if reversing"  #: whether the direct-supply faults must pass
    required_margin_share: float = 0.05  #: least margin to the knee, a share of HcJ at the case's temperature [1]
    #: further (torque [N·m], speed [rad/s]) points the motor must reach at every temperature
    load_points: tuple[tuple[float, float], ...] = ()

    @property
    def name(self) -> str:
        """The design's name, from the project file."""
        return self.project.project.name


def _si_or_none(value: float | None, unit: str) -> float | None:
    return None if value is None else to_si(value, unit)


def magnet_grade_of(project: Project) -> MagnetGrade:
    """The magnet grade a project names, or its own inline grade.

    Parameters
    ----------
    project : Project
        A validated project (it has exactly one of ``magnets.grade`` and ``magnets.custom_grade``).

    Returns
    -------
    MagnetGrade
        The grade in SI.

    Raises
    ------
    ProjectError
        Naming the key, if the named grade is not in the library or the inline grade's curve cannot be
        built.
    """
    if project.magnets.custom_grade is not None:
        try:
            return library.grade_from_spec(project.magnets.custom_grade, custom=True)
        except ValueError as error:
            # a GradeDataError names its key; the only other ValueError is HcB above HcJ
            key = getattr(error, "key", "coercivity_HcB_kA_per_m")
            raise ProjectError(f"magnets.custom_grade: {error}", key=f"magnets.custom_grade.{key}") from None
    if project.magnets.grade is None:
        raise ProjectError("magnets: give magnets.grade or magnets.custom_grade", key="magnets.grade")
    return library.magnet_grade(project.magnets.grade)


def geometry_of(project: Project) -> Geometry:
    """The cross-section and lengths of a project in SI: the one place where its dimensions become metres.

    Parameters
    ----------
    project : Project
        A project whose sections passed the schema (the fit rules use this before they pass).

    Returns
    -------
    Geometry
        Radii, lengths and angles in SI [m, rad].
    """
    p = project
    return Geometry(
        poles=p.motor.poles,
        magnet_thickness=to_si(p.magnets.thickness_mm, "mm"),
        magnet_arc=to_si(p.magnets.arc_deg, "deg"),
        magnet_length=to_si(p.magnets.length_mm, "mm"),
        airgap=to_si(p.airgap.length_mm, "mm"),
        housing_wall=to_si(p.housing.wall_mm, "mm"),
        housing_length=to_si(p.housing.length_mm, "mm"),
        armature_radius=to_si(p.armature.outer_diameter_mm, "mm") / 2.0,
        stack_length=to_si(p.armature.stack_length_mm, "mm"),
        stacking_factor=p.armature.stacking_factor,
        slots=p.armature.slots,
        slot_opening=to_si(p.armature.slot_opening_mm, "mm"),
        tooth_width=to_si(p.armature.tooth_width_mm, "mm"),
        slot_depth=to_si(p.armature.slot_depth_mm, "mm"),
        shaft_radius=to_si(p.armature.shaft_diameter_mm, "mm") / 2.0,
    )


def design_from_project(project: Project) -> Design:
    """A project in SI with its materials resolved: what the chain computes on.

    Parameters
    ----------
    project : Project
        A validated project, in the file's engineering units.

    Returns
    -------
    Design
        Every quantity in SI (temperatures in °C), the grade, steels and wire resolved.

    Raises
    ------
    ProjectError
        Naming the key, if the wire size, the grade, a steel or the magnet's price cannot be resolved.
    """
    p = project
    try:
        winding_wire = wire(p.winding.wire, p.winding.enamel_grade)
    except ValueError as error:
        raise ProjectError(f"winding.wire: {error}", key="winding.wire") from None
    geometry = geometry_of(p)
    w = p.winding
    grade = magnet_grade_of(p)
    try:
        magnet_price = magnet_price_per_kg(p.prices.magnet_per_kg, p.prices.currency, grade)
    except ValueError as error:
        raise ProjectError(str(error), key="prices.magnet_per_kg") from None
    return Design(
        project=p,
        supply_voltage=p.supply.voltage_V,
        brush_drop=p.supply.brush_drop_V,
        current_limit=p.supply.current_limit_A,
        reversing=p.supply.reversing,
        load_torque=to_si(p.load.torque_mNm, "mN·m"),
        load_speed=to_si(p.load.speed_rpm, "rpm"),
        ambient_min_C=p.temperatures.ambient_min_C,
        ambient_nominal_C=p.temperatures.ambient_nominal_C,
        ambient_max_C=p.temperatures.ambient_max_C,
        geometry=geometry,
        magnet=grade,
        housing_steel=library.steel(p.housing.steel, "housing", "housing.steel"),
        lamination_steel=library.steel(p.armature.steel, "lamination", "armature.steel"),
        winding=WindingData(
            kind=w.type,
            multiplicity=w.multiplicity,
            commutator_segments=w.commutator_segments,
            turns_per_coil=w.turns_per_coil,
            wire=winding_wire,
            insulation_class=w.insulation_class,
            insulation_limit_C=INSULATION_CLASS_LIMIT_C[w.insulation_class],
            end_turn_factor=w.end_turn_factor,
        ),
        losses=LossData(
            friction_torque=to_si(p.losses.friction_torque_mNm, "mN·m"),
            viscous_coeff=to_si(p.losses.viscous_mNm_per_krpm, "mN·m/krpm"),
            iron_loss_build_factor=p.losses.iron_loss_build_factor,
        ),
        thermal=ThermalData(
            winding_to_housing=p.thermal.winding_to_housing_K_per_W,
            housing_to_ambient=p.thermal.housing_to_ambient_K_per_W,
            convection_coeff=p.thermal.convection_W_per_m2K,
            time_constant=(None if p.thermal.thermal_time_constant_min is None
                           else to_si(p.thermal.thermal_time_constant_min, "min")),
            duty=p.thermal.duty,
            duty_time=to_si(p.thermal.duty_minutes, "min"),
            winding_capacity=p.thermal.winding_heat_capacity_J_per_K,
            winding_to_magnet=p.thermal.winding_to_magnet_K_per_W,
            cycle_factor=to_si(p.thermal.cycle_duration_factor_pct, "%"),
            cycle_time=to_si(p.thermal.cycle_minutes, "min"),
        ),
        brushes=BrushData(
            grade=p.brushes.grade,
            current_density_limit=_si_or_none(p.brushes.current_density_limit_A_per_cm2, "A/cm2"),
            count=p.brushes.count,
            width=_si_or_none(p.brushes.width_mm, "mm"),
            length=_si_or_none(p.brushes.length_mm, "mm"),
            commutator_diameter=_si_or_none(p.brushes.commutator_diameter_mm, "mm"),
        ),
        fault_cases=p.supply.fault_cases,
        required_margin_share=to_si(p.magnets.required_margin_pct_of_HcJ, "%"),
        load_points=tuple((to_si(point.torque_mNm, "mN·m"), to_si(point.speed_rpm, "rpm"))
                          for point in p.load.further_points or ()),
        extra_inertia=to_si(p.rotor.extra_inertia_gcm2, "g·cm2"),
        magnetization=p.magnets.magnetization,
        shaft_magnetic=p.armature.shaft_magnetic,
        max_outer_diameter=(None if p.housing.max_outer_diameter_mm is None
                            else to_si(p.housing.max_outer_diameter_mm, "mm")),
        max_length=None if p.housing.max_length_mm is None else to_si(p.housing.max_length_mm, "mm"),
        prices=Prices(
            currency=p.prices.currency,
            magnet=magnet_price,  # the project's, else the grade's (core.magnet_grades.magnet_price_per_kg)
            copper=p.prices.copper_per_kg,
            housing_steel=p.prices.housing_steel_per_kg,
            lamination=p.prices.lamination_per_kg,
        ),
    )
