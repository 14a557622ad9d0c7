"""The project-file schema: every input quantity's key, engineering unit, limits, default and meaning.

This schema is the single source of truth for every input quantity: its key, engineering unit (in the
key's suffix and in ``unit``), limits, default and one-sentence description live here once. The file
validator, the GUI's editor, the key table in ``docs/project-file.md`` and the command line's ``--set``
all read it.

Rules: unknown keys are errors (a typo is never ignored), values are strictly typed (a number where a
number belongs), and every range names its key. How a key is declared lives in :mod:`schema_fields`, the
``[tolerances]`` table in :mod:`schema_tolerances` (both re-exported here), cross-field rules in
:mod:`fit_rules`, reading and writing files in :mod:`project`, what-if edits in :mod:`edits`.
"""

from __future__ import annotations

import datetime
from typing import Any, Literal

from pydantic import Field, field_validator

from .schema_fields import UNION_ORIGINS, Section, choice, quantity
from .schema_tolerances import Distribution, Tolerances, spread

FORMAT_VERSION = 1


class ProjectInfo(Section):
    """``[project]``: the design's name, revision and notes, as the datasheet shows them."""

    name: str = Field("Untitled motor", min_length=1, max_length=120,
                      description="Name of the design, shown on the datasheet.")
    description: str = Field("", max_length=2000, description="What the motor is for, in a sentence or two.")
    revision: str = Field("A", min_length=1, max_length=20, description="Design revision shown on the datasheet.")
    revision_date: str | None = Field(
        None, pattern=r"^\d{4}-\d{2}-\d{2}$",
        description="Date of this revision as YYYY-MM-DD, shown on the datasheet as its issue date; leave out to "
                    "use the export date.")
    notes: str = Field("", max_length=4000, description="Free notes printed on the internal edition of the datasheet.")
    part_number: str = Field("", max_length=60, description="Part number printed on the datasheet; leave out if none.")
    customer: str = Field("", max_length=120, description="Customer the datasheet is made for; leave out if none.")
    drawn_by: str = Field("", max_length=80, description="Who prepared the datasheet, printed beside the revision.")
    logo: str = Field("", max_length=500,
                      description="Path of a PNG or JPEG logo printed at the head of the datasheet, relative to the "
                                  "project file or absolute; leave out for none.")

    @field_validator("revision_date", mode="before")
    @classmethod
    def _toml_date_as_text(cls, value):
        # TOML has a date type (revision_date = 2024-05-17, unquoted); the file means the same date.
        if isinstance(value, datetime.datetime):
            raise ValueError("is a date and time; write the date alone, YYYY-MM-DD")
        return value.isoformat() if isinstance(value, datetime.date) else value

    @field_validator("revision_date")
    @classmethod
    def _is_a_calendar_date(cls, value):
        if value is not None:
            try:
                datetime.date.fromisoformat(value)
            except ValueError:
                raise ValueError("is not a calendar date (YYYY-MM-DD)") from None
        return value


class Supply(Section):
    """``[supply]``: the DC supply at the motor terminals, the brushes and the drive."""

    voltage_V: float = quantity(12.0, "V", 1.0, 600.0, "DC supply voltage at the motor terminals.")
    brush_drop_V: float = quantity(1.0, "V", 0.0, 10.0, "Total voltage drop across both brushes at rated current.")
    current_limit_A: float | None = quantity(
        None, "A", 0.01, 5000.0, "Current limit of the drive, if it has one; leave out for a plain supply.")
    reversing: bool = Field(
        True, description="Whether the application reverses the motor at speed (plugging); if so the reversal "
                          "current is checked.", json_schema_extra={"unit": ""})
    fault_cases: Literal["must survive if reversing", "must survive", "report"] = choice(
        "must survive if reversing",
        "Whether the magnets must survive stall and reversal with the supply applied directly (a failed drive, "
        "no limiter): a failing fault case fails the design, or is only reported with a warning.")


class LoadPoint(Section):
    """One further torque-speed point the motor must reach, an entry of ``load.further_points``."""

    torque_mNm: float = quantity(..., "mN·m", 0.0, 1.0e5, "Shaft torque of the point.")
    speed_rpm: float = quantity(..., "rpm", 0.0, 60000.0,
                                "Lowest acceptable speed at that torque, at every temperature.")


#: At most this many further load points (a duty's few corners, not a curve).
MAX_FURTHER_POINTS = 20


class Load(Section):
    """``[load]``: the rated point the motor must meet, and any further points."""

    torque_mNm: float = quantity(50.0, "mN·m", 0.0, 1.0e5, "Shaft torque at the rated point.")
    speed_rpm: float = quantity(3000.0, "rpm", 0.0, 60000.0,
                                "Lowest acceptable speed at the rated torque, at every temperature.")
    further_points: tuple[LoadPoint, ...] | None = Field(
        None, min_length=1, max_length=MAX_FURTHER_POINTS,
        description="Further torque-speed points the motor must also reach at every temperature, each "
                    "{ torque_mNm = …, speed_rpm = … } (e.g. a start-up torque at a low speed); leave out for none.",
        json_schema_extra={"unit": "mN·m, rpm"})

    @field_validator("further_points", mode="before")
    @classmethod
    def _toml_array_as_tuple(cls, value):
        # TOML gives an array as a list; the frozen project holds a tuple
        return tuple(value) if isinstance(value, list) else value


class Temperatures(Section):
    """``[temperatures]``: the ambient range, which sets the cold, nominal and hot cases."""

    ambient_min_C: float = quantity(-20.0, "°C", -70.0, 60.0, "Coldest ambient the motor must work and survive in.")
    ambient_nominal_C: float = quantity(25.0, "°C", -40.0, 80.0, "Ambient of the nominal case.")
    ambient_max_C: float = quantity(40.0, "°C", -20.0, 150.0, "Hottest ambient the motor must work in.")


class CustomGrade(Section):
    """``[magnets.custom_grade]``: a grade's data from a supplier's certificate, in the file's units."""

    name: str = Field(..., min_length=1, max_length=60, description="Grade name as the supplier gives it.")
    family: Literal[
        "sintered NdFeB", "bonded NdFeB", "SmCo 1:5", "SmCo 2:17",
        "hard ferrite, isotropic", "hard ferrite, anisotropic", "AlNiCo",
    ] = Field(..., description="Material family; decides which temperature is the worst case.")
    remanence_T: float = quantity(..., "T", 0.05, 1.6, "Br at 20 °C.")
    coercivity_HcB_kA_per_m: float = quantity(..., "kA/m", 10.0, 1200.0, "Normal coercivity HcB at 20 °C.")
    coercivity_HcJ_kA_per_m: float = quantity(..., "kA/m", 10.0, 3500.0, "Intrinsic coercivity HcJ at 20 °C.")
    energy_product_kJ_per_m3: float = quantity(..., "kJ/m3", 1.0, 480.0, "(BH)max at 20 °C.")
    recoil_permeability: float = quantity(1.05, "1", 1.0, 8.0, "Relative recoil permeability μrec.")
    squareness: float = quantity(0.9, "1", 0.3, 0.999, "Hk/HcJ, where Hk is the field at which J = 0.9·Br.")
    remanence_temp_coeff_pct_per_K: float = quantity(..., "%/K", -0.5, 0.1,
                                                     "Reversible temperature coefficient of Br.")
    coercivity_temp_coeff_pct_per_K: float = quantity(..., "%/K", -1.5, 1.0,
                                                      "Reversible temperature coefficient of HcJ.")
    max_working_temperature_C: float = quantity(..., "°C", 20.0, 550.0, "Supplier's maximum working temperature.")
    density_kg_per_m3: float = quantity(..., "kg/m3", 1000.0, 10000.0, "Density.")
    price_per_kg: float | None = quantity(
        None, "/kg", 0.0, 1.0e4, "Typical price of the finished magnet, in price_currency per kg; a project's "
        "prices.magnet_per_kg overrides it.")
    price_currency: str = Field("EUR", min_length=1, max_length=8, description="Currency of price_per_kg.",
                                json_schema_extra={"unit": ""})
    source: str = Field("user data", max_length=400,
                        description="Where the numbers come from (certificate, datasheet).")


class Magnets(Section):
    """``[magnets]``: the grade and the arc magnets' dimensions."""

    grade: str | None = Field(
        None, min_length=1, max_length=60,
        description="Magnet grade from the library (see `pmdc-sizer grades`); leave out when custom_grade is given.")
    custom_grade: CustomGrade | None = Field(
        None, description="Inline grade data from a supplier's certificate, used instead of a library grade.")
    thickness_mm: float = quantity(5.0, "mm", 0.5, 40.0, "Radial thickness of each arc magnet.")
    arc_deg: float = quantity(130.0, "deg", 15.0, 178.0,
                              "Mechanical arc of each magnet; at most the pole pitch, 360°/poles.")
    length_mm: float = quantity(30.0, "mm", 3.0, 300.0,
                                "Axial length of each magnet; at least the armature stack length.")
    magnetization: Literal["radial", "parallel"] = choice(
        "radial", "Direction of magnetization: radial (along every radius) or parallel (along the magnet's centre "
                  "line); used by the field solution.")
    required_margin_pct_of_HcJ: float = quantity(
        5.0, "%", 0.0, 50.0,
        "Least margin to the knee a demagnetization case must keep to count as safe, as a share of HcJ at the "
        "case's temperature (5 % covers a batch's usual HcJ spread; common practice, no source).")


class Motor(Section):
    """``[motor]``: the number of poles."""

    poles: Literal[2, 4, 6] = Field(2, description="Number of magnet poles: 2, 4 or 6.",
                                    json_schema_extra={"unit": ""})


class Housing(Section):
    """``[housing]``: the steel tube that holds the magnets and carries the return flux."""

    wall_mm: float = quantity(2.5, "mm", 0.3, 25.0,
                              "Wall thickness of the steel housing, which carries the return flux.")
    length_mm: float = quantity(45.0, "mm", 5.0, 400.0,
                                "Axial length of the housing tube; at least the magnet length.")
    steel: str = Field("low-carbon steel 1010", min_length=1, description="Housing steel from the library.")
    max_outer_diameter_mm: float | None = quantity(
        None, "mm", 5.0, 500.0, "Envelope limit on the housing diameter, if there is one.")
    max_length_mm: float | None = quantity(
        None, "mm", 5.0, 1000.0,
        "Envelope limit on the overall length of the motor body, if there is one: the housing tube's length, "
        "end cap to end cap (the end caps sit inside the tube), without the shaft's run-out at the drive end.")


class Airgap(Section):
    """``[airgap]``: the radial clearance between armature and magnets."""

    length_mm: float = quantity(0.5, "mm", 0.05, 5.0, "Radial clearance between armature and magnet faces.")


class Armature(Section):
    """``[armature]``: the slotted lamination stack and the shaft."""

    outer_diameter_mm: float = quantity(30.0, "mm", 5.0, 300.0, "Outer diameter of the armature lamination stack.")
    stack_length_mm: float = quantity(30.0, "mm", 3.0, 300.0, "Axial length of the lamination stack.")
    stacking_factor: float = quantity(0.95, "1", 0.8, 1.0, "Fraction of the stack length that is steel.")
    slots: int = quantity(12, "", 3, 72, "Number of armature slots.")
    slot_opening_mm: float = quantity(2.0, "mm", 0.2, 15.0, "Width of the slot opening at the armature surface.")
    tooth_width_mm: float = quantity(3.0, "mm", 0.3, 40.0, "Width of each tooth (parallel-sided teeth).")
    slot_depth_mm: float = quantity(7.0, "mm", 0.5, 100.0, "Radial depth of each slot from the armature surface.")
    shaft_diameter_mm: float = quantity(5.0, "mm", 1.0, 80.0, "Diameter of the steel shaft through the stack.")
    shaft_magnetic: bool = Field(
        True, description="True for a steel shaft that carries flux like the housing steel (the usual case); false "
                          "for a stainless or non-magnetic shaft. Used by the field solution.",
        json_schema_extra={"unit": ""})
    steel: str = Field("M400-50A", min_length=1, description="Lamination steel from the library.")


class Winding(Section):
    """``[winding]``: the armature winding, its wire and its insulation class."""

    type: Literal["lap", "wave"] = choice(
        "lap", "Lap (parallel paths = poles × multiplicity) or wave (parallel paths = 2 × multiplicity).")
    multiplicity: int = quantity(1, "", 1, 3, "Simplex 1, duplex 2, triplex 3.")
    commutator_segments: int = quantity(12, "", 3, 240, "Number of commutator segments, one coil each.")
    turns_per_coil: int = quantity(20, "", 1, 2000, "Turns in each armature coil.")
    wire: str = Field("AWG 24", min_length=2,
                      description="Wire size: 'AWG n' or a metric bare diameter such as '0.50 mm'.",
                      json_schema_extra={"unit": ""})
    enamel_grade: Literal[1, 2, 3] = Field(2, description="Enamel film grade per IEC 60317: 1 thin, 2 medium, 3 thick.",
                                           json_schema_extra={"unit": ""})
    insulation_class: Literal["105 (A)", "120 (E)", "130 (B)", "155 (F)", "180 (H)", "200 (N)", "220 (R)"] = choice(
        "155 (F)", "Thermal class of the insulation system per IEC 60085.")
    end_turn_factor: float = quantity(1.0, "1", 0.5, 2.0,
                                      "Scales the estimated end-turn length (1 is the estimate; measure and adjust).")


class Losses(Section):
    """``[losses]``: the mechanical losses and the iron loss's build factor."""

    friction_torque_mNm: float = quantity(2.0, "mN·m", 0.0, 1.0e4, "Constant friction torque of bearings and brushes.")
    viscous_mNm_per_krpm: float = quantity(0.5, "mN·m/krpm", 0.0, 1.0e4, "Viscous (windage) torque per 1000 rpm.")
    iron_loss_build_factor: float = quantity(
        1.5, "1", 1.0, 4.0, "Multiplies the catalogue core loss for punching and rotation (1.5 is common practice).")


class Thermal(Section):
    """``[thermal]``: the thermal network's resistances, the time constant and the duty type."""

    winding_to_housing_K_per_W: float = quantity(1.5, "K/W", 0.0, 100.0,
                                                 "Thermal resistance from the winding to the housing.")
    housing_to_ambient_K_per_W: float | None = quantity(
        None, "K/W", 0.01, 500.0,
        "Thermal resistance from the housing to ambient; leave out to estimate it from the surface.")
    convection_W_per_m2K: float = quantity(
        12.0, "W/(m2·K)", 1.0, 500.0,
        "Heat-transfer coefficient of the housing surface, used when no housing resistance is given.")
    thermal_time_constant_min: float | None = quantity(
        None, "min", 0.1, 600.0,
        "Measured thermal time constant of the motor as a whole (the slow one); sets the housing node's heat "
        "capacity; leave out to estimate it from the housing's and magnets' masses.")
    winding_heat_capacity_J_per_K: float | None = quantity(
        None, "J/K", 0.1, 1.0e6,
        "Heat capacity of the winding node; leave out to take the copper's mass times 385 J/(kg·K).")
    winding_to_magnet_K_per_W: float | None = quantity(
        None, "K/W", 0.01, 1000.0,
        "Thermal resistance across the air gap from the armature to the magnets; leave out to estimate it from "
        "the magnets' face and 50 W/(m2·K) (common practice, no source).")
    duty: Literal["S1", "S2", "S3"] = choice(
        "S1", "IEC 60034-1 duty type: S1 continuous, S2 short-time or S3 intermittent periodic.")
    duty_minutes: float = quantity(10.0, "min", 1.0, 600.0, "Length of the S2 short-time run.")
    cycle_duration_factor_pct: float = quantity(
        40.0, "%", 1.0, 100.0, "S3: share of each cycle run at the rated load (IEC 60034-1 prefers 15, 25, 40, 60 %).")
    cycle_minutes: float = quantity(10.0, "min", 0.1, 600.0,
                                    "S3: length of one cycle, loaded and at rest (IEC 60034-1 takes 10 min).")


class Brushes(Section):
    """``[brushes]``: the brushes and the commutator they run on."""

    grade: Literal["carbon-graphite", "electrographite", "resin-bonded graphite", "copper-graphite",
                   "silver-graphite"] = choice(
        "electrographite", "Brush material; sets the current density it carries in continuous service.")
    current_density_limit_A_per_cm2: float | None = quantity(
        None, "A/cm2", 1.0, 100.0,
        "Highest current density the brush maker allows in continuous service; leave out to use the grade's.")
    count: int | None = quantity(
        None, "", 2, 12, "Number of brushes, half of each polarity; leave out for 2 (wave) or one per pole (lap).")
    width_mm: float | None = quantity(
        None, "mm", 0.5, 50.0,
        "Brush width along the commutator's circumference; leave out for 1.5 segment pitches.")
    length_mm: float | None = quantity(
        None, "mm", 0.5, 80.0, "Brush length along the shaft; leave out for 1.25 times its width.")
    commutator_diameter_mm: float | None = quantity(
        None, "mm", 3.0, 300.0, "Commutator diameter; leave out for 0.6 times the armature diameter.")


class Rotor(Section):
    """``[rotor]``: what else turns with the armature."""

    extra_inertia_gcm2: float = quantity(0.0, "g·cm2", 0.0, 1.0e7,
                                         "Inertia of the commutator, fan and anything else on the shaft.")


class Prices(Section):
    """``[prices]``: material prices per kilogram, for the material cost."""

    currency: str = Field("EUR", min_length=1, max_length=8, description="Currency of the prices below.",
                          json_schema_extra={"unit": ""})
    magnet_per_kg: float | None = quantity(
        None, "/kg", 0.0, 1.0e4, "Price of magnet material; leave out for the grade's typical price from the "
        "library (from memory), which needs the same currency. Given, it overrides the grade's price.")
    copper_per_kg: float = quantity(10.0, "/kg", 0.0, 1.0e4, "Price of enamelled copper wire.")
    housing_steel_per_kg: float = quantity(1.5, "/kg", 0.0, 1.0e4, "Price of the housing tube steel.")
    lamination_per_kg: float = quantity(2.5, "/kg", 0.0, 1.0e4,
                                        "Price of lamination steel (as punched, scrap included).")


class Project(Section):
    """A complete design as stored in a file, in the file's engineering units."""

    format_version: int = Field(FORMAT_VERSION, ge=1, le=FORMAT_VERSION,
                                description="Version of this file format.")
    project: ProjectInfo = ProjectInfo()
    supply: Supply = Supply()
    load: Load = Load()
    temperatures: Temperatures = Temperatures()
    motor: Motor = Motor()
    magnets: Magnets = Magnets(grade="Y30")
    airgap: Airgap = Airgap()
    housing: Housing = Housing()
    armature: Armature = Armature()
    winding: Winding = Winding()
    losses: Losses = Losses()
    thermal: Thermal = Thermal()
    brushes: Brushes = Brushes()
    rotor: Rotor = Rotor()
    prices: Prices = Prices()
    tolerances: Tolerances = Tolerances()


SECTIONS = tuple(name for name in Project.model_fields if name != "format_version")

#: Keys a file may leave out; they then take the schema's default. Every other key must be written:
#: a design quantity that is silently defaulted is a design quantity nobody chose.
MAY_BE_LEFT_OUT = frozenset({
    "project.description", "project.revision", "project.notes",
    "project.part_number", "project.customer", "project.drawn_by", "project.logo",
    "supply.reversing", "load.further_points", "winding.multiplicity", "winding.end_turn_factor",
    "losses.iron_loss_build_factor", "thermal.duty_minutes", "rotor.extra_inertia_gcm2",
    "magnets.magnetization", "armature.shaft_magnetic",
    "supply.fault_cases", "magnets.required_margin_pct_of_HcJ", "thermal.cycle_duration_factor_pct",
    "thermal.cycle_minutes", "brushes.grade",
    "magnets.grade",  # or magnets.custom_grade: exactly one of them, checked below
    # the whole [tolerances] table: a file without it takes the typical spreads documented there
    "tolerances.remanence_pct", "tolerances.remanence_distribution", "tolerances.coercivity_pct",
    "tolerances.coercivity_distribution", "tolerances.magnet_thickness_mm", "tolerances.magnet_thickness_distribution",
    "tolerances.airgap_mm", "tolerances.airgap_distribution", "tolerances.wire_diameter_distribution",
    "tolerances.copper_resistivity_pct", "tolerances.copper_resistivity_distribution", "tolerances.brush_drop_V",
    "tolerances.brush_drop_distribution", "tolerances.friction_torque_pct", "tolerances.friction_torque_distribution",
    "tolerances.supply_voltage_pct", "tolerances.supply_voltage_distribution", "tolerances.samples",
    "tolerances.seed",
})


def to_dict(project: Project) -> dict[str, Any]:
    """The project as plain TOML-ready data, in schema order, with absent optional keys left out.

    Parameters
    ----------
    project : Project
        A validated project.

    Returns
    -------
    dict
        Nested tables in the file's engineering units.
    """
    return project.model_dump(mode="python", exclude_none=True)


__all__ = [
    "FORMAT_VERSION", "MAX_FURTHER_POINTS", "MAY_BE_LEFT_OUT", "SECTIONS", "UNION_ORIGINS", "Airgap", "Armature",
    "Brushes", "CustomGrade", "Distribution", "Housing", "Load", "LoadPoint", "Losses", "Magnets", "Motor", "Prices",
    "Project", "ProjectInfo", "Rotor", "Section", "Supply", "Temperatures", "Thermal", "Tolerances", "Winding",
    "choice", "quantity", "spread", "to_dict",
]
