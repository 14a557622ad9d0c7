"""What one evaluation returns: documented, frozen dataclasses, SI throughout, temperatures in °C.

Every figure a view, the datasheet, the comparison or the checks display is here, the input values they
echo included, so no reader has to go back to the project for a number. Each field's name carries its
unit (``flux_per_pole_Wb``); the comment beside it gives the meaning in one line.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from .magnets import DemagnetizationCurves


@dataclass(frozen=True)
class MagnetResult:
    """The magnet grade as used, with its properties at the nominal ambient."""

    name: str  #: grade name
    family: str  #: material family (decides which temperature is the worst case)
    temperature_C: float  #: the nominal ambient, at which the properties below are given [°C]
    remanence_T: float  #: Br at ``temperature_C`` [T]
    coercivity_HcB_A_per_m: float  #: normal coercivity HcB at ``temperature_C`` (magnitude) [A/m]
    coercivity_HcJ_A_per_m: float  #: intrinsic coercivity HcJ at ``temperature_C`` (magnitude) [A/m]
    knee_field_A_per_m: float  #: field where irreversible loss begins, at ``temperature_C`` (negative) [A/m]
    remanence_20C_T: float  #: Br at 20 °C, as the grade data give it [T]
    coercivity_HcJ_20C_A_per_m: float  #: HcJ at 20 °C, as the grade data give it [A/m]
    max_working_temperature_C: float  #: the supplier's maximum working temperature [°C]
    density_kg_per_m3: float  #: [kg/m³]
    source: str  #: where the grade's numbers come from


@dataclass(frozen=True)
class MagneticsResult:
    """The no-load magnetic circuit at one magnet temperature."""

    temperature_C: float  #: magnet temperature [°C]
    flux_per_pole_Wb: float  #: flux crossing the gap between the two neutral axes of one pole, stack length [Wb]
    #: mean air-gap flux density under the magnet's arc, the same value as ``airgap_flux_density_mean_T``
    #: (kept under its old name for the readers that show it) [T]
    airgap_flux_density_T: float
    magnet_flux_density_T: float  #: operating point's B in the magnet [T]
    magnet_field_A_per_m: float  #: operating point's H in the magnet (negative) [A/m]
    permeance_coefficient: float  #: -B/(μ0·H) at the operating point, iron drops included [1]
    housing_flux_density_T: float  #: peak, in the housing wall at the interpolar axis [T]
    tooth_flux_density_T: float  #: in the teeth under the pole [T]
    core_flux_density_T: float  #: peak, in the armature back iron [T]
    leakage_factor: float  #: magnet flux over useful gap flux [1]
    carter_factor: float  #: Carter's coefficient of the slotted armature [1]
    gap_mmf_A: float  #: MMF drop across the (effective) gap, one crossing [A]
    teeth_mmf_A: float  #: MMF drop along the teeth [A]
    core_mmf_A: float  #: MMF drop along the armature core, half a pole pitch [A]
    housing_mmf_A: float  #: MMF drop along the housing, half a pole pitch [A]
    airgap_flux_density_mean_T: float = 0.0  #: mean air-gap flux density under the magnet's arc [T]
    airgap_flux_density_centre_T: float = 0.0  #: air-gap flux density at the pole centre [T]
    outside_air_flux_Wb: float = 0.0  #: return flux in the air outside the housing at the interpolar axis [Wb]
    worst_magnet_field_A_per_m: float = 0.0  #: most negative field of any magnet segment at no load [A/m]


@dataclass(frozen=True)
class WindingResult:
    """The armature winding as built."""

    type: str  #: "lap" or "wave"
    parallel_paths: int  #: a [1]
    commutator_segments: int  #: one coil each [1]
    turns_per_coil: int  #: [1]
    conductors: int  #: total conductors Z = 2·segments·turns [1]
    conductors_per_slot: float  #: [1]
    coil_span_slots: int  #: coil pitch in slots [1]
    wire: str  #: wire size as given ("AWG 24", "0.50 mm")
    wire_bare_diameter_m: float  #: copper diameter [m]
    wire_overall_diameter_m: float  #: enamelled diameter (maximum per IEC 60317) [m]
    enamel_grade: int  #: IEC 60317 grade 1, 2 or 3
    mean_turn_length_m: float  #: one turn, end turns included [m]
    wire_length_m: float  #: all coils [m]
    slot_area_m2: float  #: one slot's cross-section [m²]
    slot_fill_bare: float  #: copper area over slot area [1]
    slot_fill_gross: float  #: enamelled round-wire area over slot area [1]
    resistance_20C_ohm: float  #: terminal resistance of the winding at 20 °C [Ω]
    rated_current_density_A_per_m2: float  #: in the hot case at the rated point [A/m²]


@dataclass(frozen=True)
class ConstantsResult:
    """Motor constants at the nominal case."""

    machine_constant: float  #: K = p·Z/(2π·a) [1]
    ke_V_s_per_rad: float  #: back-EMF constant K·Φ [V·s/rad]
    kt_N_m_per_A: float  #: torque constant, equal to Ke in SI [N·m/A]
    ke_V_per_krpm: float  #: Ke for the datasheet [V/krpm]
    kt_mN_m_per_A: float  #: Kt for the datasheet [mN·m/A]
    terminal_resistance_ohm: float  #: winding resistance at the nominal ambient [Ω]
    inductance_H_estimate: float  #: armature inductance, an estimate [H]
    electrical_time_constant_s_estimate: float  #: L/R [s]
    mechanical_time_constant_s: float  #: J·R/K² [s]
    rotor_inertia_kg_m2: float  #: armature, shaft and extra inertia [kg·m²]


@dataclass(frozen=True)
class PointResult:
    """The steady state at one shaft torque."""

    torque_N_m: float  #: shaft torque [N·m]
    speed_rad_per_s: float  #: [rad/s]
    current_A: float  #: armature current [A]
    input_power_W: float  #: V·I [W]
    output_power_W: float  #: T·ω [W]
    total_loss_W: float  #: input less output [W]
    efficiency: float  #: output over input [1]


@dataclass(frozen=True)
class CurveData:
    """The speed-torque table of one case (SI arrays, no load first, stall last)."""

    torque_N_m: np.ndarray  #: shaft torque [N·m]
    speed_rad_per_s: np.ndarray  #: [rad/s]
    current_A: np.ndarray  #: [A]
    input_power_W: np.ndarray  #: [W]
    output_power_W: np.ndarray  #: [W]
    efficiency: np.ndarray  #: [1]
    copper_loss_W: np.ndarray  #: I²·R [W]
    brush_loss_W: np.ndarray  #: Vb·I [W]
    friction_loss_W: np.ndarray  #: [W]
    viscous_loss_W: np.ndarray  #: [W]
    iron_loss_W: np.ndarray  #: [W]


@dataclass(frozen=True)
class CaseResult:
    """Performance at one temperature case."""

    name: str  #: "cold", "nominal" or "hot"
    temperature_C: float  #: winding temperature [°C]
    ambient_C: float  #: ambient of the case [°C]
    magnet_temperature_C: float  #: [°C]
    winding_temperature_C: float  #: [°C]
    flux_per_pole_Wb: float  #: at the magnet temperature, no load [Wb]
    ke_V_s_per_rad: float  #: K·Φ at this case, no load [V·s/rad]
    terminal_resistance_ohm: float  #: at the winding temperature [Ω]
    no_load_speed_rad_per_s: float  #: [rad/s]
    no_load_current_A: float  #: [A]
    stall_torque_N_m: float  #: at the supply voltage, no current limit [N·m]
    stall_current_A: float  #: (V - Vb)/R [A]
    speed_torque_gradient_rad_per_s_per_N_m: float  #: no-load speed over stall torque [rad/s per N·m]
    max_efficiency: float  #: [1]
    max_efficiency_point: PointResult  #: where the efficiency is highest
    max_output_power_W: float  #: [W]
    max_power_point: PointResult  #: where the output power is highest
    rated: PointResult  #: at the rated torque (at stall when the load is beyond it)
    rated_reached: bool  #: the rated torque is below the stall torque
    meets_load: bool  #: rated torque reached at or above the required speed
    curve: CurveData = field(repr=False)  #: the whole characteristic
    #: shaft torque at which the armature current reaches the drive's limit [N·m]; None without a limit
    #: or when the limit is above the stall current (the curve beyond it is not reachable with that drive)
    current_limit_torque_N_m: float | None = None
    envelope: EnvelopeResult | None = None  #: what this case reaches inside the drive's current limit
    #: the steady speed at each of load.further_points' torques, in their order; NaN where the torque is at
    #: or beyond stall [rad/s]; empty without further points
    further_point_speeds_rad_per_s: tuple[float, ...] = ()
    flux_per_pole_stall_Wb: float = 0.0  #: under the stall current (the armature's reaction lowers it) [Wb]
    ke_stall_V_s_per_rad: float = 0.0  #: K·Φ at the stall current [V·s/rad]
    #: the flux per pole against armature current that the curve uses (interpolated linearly in I²):
    #: currents [A] and the flux there [Wb]
    flux_current_A: np.ndarray = field(default_factory=lambda: np.zeros(0), repr=False, compare=False)
    flux_under_load_Wb: np.ndarray = field(default_factory=lambda: np.zeros(0), repr=False, compare=False)


@dataclass(frozen=True)
class DemagnetizationCase:
    """One demagnetization case: a current at a temperature, or the rotor removed."""

    name: str  #: e.g. "stall, cold"
    kind: str  #: "stall", "reversal", "current limit" or "rotor removed"
    temperature_C: float  #: magnet temperature of the case [°C]
    current_A: float  #: armature current [A] (0 for the rotor removed)
    #: mean field over the magnet's most-demagnetized 5 % of area (core.magnet_field_share) [A/m]
    magnet_field_A_per_m: float
    magnet_flux_density_T: float  #: normal-curve B there [T]
    knee_field_A_per_m: float  #: knee field at the case's temperature (negative) [A/m]
    margin_A_per_m: float  #: magnet field minus knee field; positive is safe [A/m]
    ok: bool  #: the field stays above the knee
    flux_per_pole_Wb: float = 0.0  #: flux per pole under the case's current (0 with the rotor removed) [Wb]
    #: the segment holding the magnet's most demagnetized cell, from the pole centre (positive: towards the
    #: direction of rotation) [rad]
    worst_angle_rad: float = 0.0
    magnet_area_past_knee_fraction: float = 0.0  #: share of the magnet's area whose field is past the knee [1]
    #: centres of the magnet's segments from the pole centre [rad]
    segment_angle_rad: np.ndarray = field(default_factory=lambda: np.zeros(0), repr=False, compare=False)
    #: the field at mid-thickness in each segment [A/m]
    segment_field_A_per_m: np.ndarray = field(default_factory=lambda: np.zeros(0), repr=False, compare=False)
    #: each segment's share of the magnet's area, summing to 1 [1]
    segment_area_fraction: np.ndarray = field(default_factory=lambda: np.zeros(0), repr=False, compare=False)
    #: the normal-curve B at each segment's field, at the case's temperature [T]
    segment_flux_density_T: np.ndarray = field(default_factory=lambda: np.zeros(0), repr=False, compare=False)
    #: least margin this case must keep to count as safe: the project's share of HcJ at its temperature [A/m]
    required_margin_A_per_m: float = 0.0
    status: str = ""  #: "safe" (margin ≥ required), "marginal" (0 < margin < required) or "past_knee"

    @property
    def mean_field_A_per_m(self) -> float:  # noqa: N802 - named with its unit, as the fields are
        """The magnet's mean field under the case's current, weighted by the segments' areas [A/m]
        (the verdict's worst-area field is ``magnet_field_A_per_m``); NaN without segments."""
        shares = self.segment_area_fraction
        return float(np.dot(shares, self.segment_field_A_per_m)) if shares.size else np.nan

    @property
    def mean_flux_density_T(self) -> float:  # noqa: N802 - named with its unit, as the fields are
        """The magnet's mean flux density under the case's current, weighted by the segments' areas [T];
        NaN without segments."""
        shares = self.segment_area_fraction
        return float(np.dot(shares, self.segment_flux_density_T)) if shares.size else np.nan


@dataclass(frozen=True)
class DemagnetizationResult:
    """Every demagnetization case and the worst of them."""

    ok: bool  #: every case stays above the knee
    worst_case: str  #: name of the case with the least margin
    worst_margin_A_per_m: float  #: its margin [A/m]
    cases: tuple[DemagnetizationCase, ...]  #: in the order they were computed
    required_margin_A_per_m: float = 0.0  #: the most any case requires (the share of HcJ where HcJ is highest) [A/m]
    required_margin_share: float = 0.0  #: the project's required margin, a share of HcJ at each case's temperature [1]
    status: str = ""  #: the worst case's status: "safe", "marginal" or "past_knee"


@dataclass(frozen=True)
class FaultsResult:
    """Stall and reversal with the supply applied directly (a failed drive, no limiter), cold and hot."""

    must_survive: bool  #: the project requires the magnets to survive these (else they are reported and warned)
    ok: bool  #: every fault case stays above the knee
    worst_case: str  #: name of the fault case with the least margin
    worst_margin_A_per_m: float  #: its margin [A/m]
    status: str  #: the worst fault case's status: "safe", "marginal" or "past_knee"
    cases: tuple[DemagnetizationCase, ...]  #: shaped like ``DemagnetizationResult.cases``


@dataclass(frozen=True)
class ThermalResult:
    """The hot case's temperatures at the rated point and the highest ambient."""

    ambient_C: float  #: the highest ambient [°C]
    duty: str  #: IEC 60034-1 duty type, "S1" or "S2"
    duty_minutes: float  #: length of an S2 run [min]
    housing_temperature_C: float  #: [°C]
    winding_temperature_C: float  #: steady state (S1) or at the end of the short-time run (S2) [°C]
    magnet_temperature_C: float  #: [°C]
    steady_winding_temperature_C: float  #: S1 steady state, also for S2/S3 (where S1's iteration ended, if none) [°C]
    insulation_class: str  #: IEC 60085 class
    insulation_limit_C: float  #: the class's temperature [°C]
    magnet_limit_C: float  #: the grade's maximum working temperature [°C]
    losses_W: float  #: total at the rated point, hot [W]
    rotor_losses_W: float  #: copper, brush and iron losses, which heat the winding [W]
    housing_to_ambient_K_per_W: float  #: given or estimated [K/W]
    winding_to_housing_K_per_W: float  #: [K/W]
    thermal_time_constant_s: float  #: [s]
    iterations: int  #: of the losses ⇄ temperatures fixed point
    converged: bool  #: False when no steady state exists; the hot case is then at the class limit
    ok: bool  #: converged, and winding and magnets inside their limits
    runaway_winding_temperature_C: float | None = None  #: where the iteration stopped, when it did not converge
    steady_state_exists: bool = True  #: the duty has a usable state; False: runaway, stall or magnets off their data
    steady_state_s1_exists: bool = True  #: continuous running (S1) at the rated load has a usable steady state
    time_to_limit_s: float | None = None  #: rated load from ambient to the class limit, when the duty passes it [s]
    winding_heat_capacity_J_per_K: float = 0.0  #: C_w of the network's winding node [J/K]
    housing_heat_capacity_J_per_K: float = 0.0  #: C_h of the housing node (housing and magnets) [J/K]
    winding_to_magnet_K_per_W: float = 0.0  #: across the air gap, given or estimated [K/W]
    magnet_to_housing_K_per_W: float = 0.0  #: through magnet and bond line, estimated [K/W]
    winding_time_constant_s: float = 0.0  #: the network's fast time constant (the winding's own) [s]
    cycle_duration_factor: float = 0.0  #: S3 share of each cycle under load [1]
    cycle_minutes: float = 0.0  #: S3 cycle duration [min]
    transient: ThermalTransient | None = None  #: temperatures against time over the duty


@dataclass(frozen=True)
class ThermalTransient:
    """Temperatures against time over the duty from ambient, at the highest ambient (plot data)."""

    duty: str  #: "S1", "S2" or "S3"
    time_s: tuple[float, ...]  #: since the start [s]
    winding_C: tuple[float, ...]  #: [°C]
    housing_C: tuple[float, ...]  #: [°C]
    magnet_C: tuple[float, ...]  #: [°C]
    insulation_limit_C: float  #: the class temperature, for the chart's limit line [°C]


@dataclass(frozen=True)
class RatingsResult:
    """The ratings at the highest ambient: continuous (S1) and the permitted stall times."""

    ambient_C: float  #: the highest ambient [°C]
    insulation_limit_C: float  #: the winding's class temperature the ratings run up to [°C]
    continuous_torque_N_m: float  #: shaft torque whose S1 steady state puts the winding at its limit [N·m]
    continuous_current_A: float  #: armature current there [A]
    continuous_speed_rad_per_s: float  #: speed there, winding at its limit [rad/s]
    continuous_output_power_W: float  #: torque times speed there [W]
    stall_current_A: float  #: at stall from cold, at the drive's limit if it has one [A]
    stall_time_cold_s: float | None  #: held at stall from ambient to the class limit; None if never [s]
    stall_time_hot_s: float | None  #: held at stall from the S1 hot state (rated load) to the limit; None if never [s]
    drive_limited: bool  #: the stall current is the drive's limit


@dataclass(frozen=True)
class EnvelopeResult:
    """What one temperature case reaches inside the drive's current limit (the whole curve without one)."""

    name: str  #: "cold", "nominal" or "hot"
    limited: bool  #: a drive limit below the stall current bounds the envelope
    torque_limit_N_m: float  #: torque at the current limit; the stall torque without one [N·m]
    max_output_power_W: float  #: highest output power with the current inside the limit [W]
    max_power_torque_N_m: float  #: where it is [N·m]
    max_power_speed_rad_per_s: float  #: [rad/s]
    chart_torque_max_N_m: float  #: the charts' default torque range ends here, a little past the limit [N·m]


@dataclass(frozen=True)
class CommutationResult:
    """Brushes and commutator at the hot rated point (surface speed at the highest no-load speed)."""

    brush_grade: str  #: brush material
    brush_count: int  #: brushes in all, half of each polarity [1]
    brush_width_m: float  #: along the commutator's circumference [m]
    brush_length_m: float  #: along the shaft [m]
    commutator_diameter_m: float  #: [m]
    estimated_inputs: tuple[str, ...]  #: the brush keys the project left out and the tool estimated
    brush_current_density_A_per_m2: float  #: armature current over the brushes of one polarity [A/m²]
    brush_density_low_A_per_m2: float  #: lower end of the grade's continuous range (0 for a project limit) [A/m²]
    brush_density_high_A_per_m2: float  #: upper end, or the project's own limit [A/m²]
    limit_from_project: bool  #: the upper end is the project's limit, not the grade's
    surface_speed_m_per_s: float  #: commutator peripheral speed at the highest no-load speed [m/s]
    reactance_voltage_V: float  #: average reactance voltage of the coil in commutation, an estimate [V]


@dataclass(frozen=True)
class MassResult:
    """Masses of the active parts and the shaft, and an estimate of the rest of the motor (core.mass)."""

    magnet_kg: float  #: [kg]
    copper_kg: float  #: [kg]
    housing_kg: float  #: [kg]
    lamination_kg: float  #: [kg]
    shaft_kg: float  #: within the housing length [kg]
    total_kg: float  #: sum of the above: the active mass, with the shaft [kg]
    #: the parts outside the magnetic circuit, estimated from the section's proportions (core.mass)
    shaft_extension_kg: float | None = None  #: the shaft beyond the drive end [kg]
    end_caps_kg: float | None = None  #: both end caps [kg]
    brush_gear_kg: float | None = None  #: brush holder, brushes, springs, terminals [kg]
    commutator_kg: float | None = None  #: [kg]
    bearings_kg: float | None = None  #: both bearings [kg]
    other_parts_kg: float | None = None  #: the five above [kg]
    estimated_total_kg: float | None = None  #: the whole motor: total_kg + other_parts_kg [kg]


@dataclass(frozen=True)
class CostResult:
    """Raw-material cost at the project's prices per kilogram."""

    currency: str  #: as the project gives it
    magnet: float  #: [currency]
    copper: float  #: [currency]
    housing: float  #: [currency]
    lamination: float  #: [currency]
    total: float  #: [currency]


@dataclass(frozen=True)
class GeometryResult:
    """The cross-section and lengths as evaluated, derived dimensions included."""

    poles: int  #: number of magnet poles [1]
    slots: int  #: armature slots [1]
    housing_outer_diameter_m: float  #: armature + 2·(gap + magnet + wall) [m]
    housing_inner_diameter_m: float  #: [m]
    housing_wall_m: float  #: [m]
    housing_length_m: float  #: axial [m]
    magnet_inner_diameter_m: float  #: [m]
    magnet_thickness_m: float  #: radial [m]
    magnet_arc_rad: float  #: mechanical arc of one magnet [rad]
    magnet_length_m: float  #: axial [m]
    magnet_embrace: float  #: arc over pole pitch [1]
    overhang_m: float  #: magnet beyond the stack at each end [m]
    airgap_m: float  #: radial clearance [m]
    armature_diameter_m: float  #: [m]
    stack_length_m: float  #: axial [m]
    shaft_diameter_m: float  #: [m]
    slot_pitch_m: float  #: at the armature surface [m]
    core_depth_m: float  #: armature back iron, slot bottom to shaft [m]
    max_outer_diameter_m: float | None = None  #: the envelope limit, if the project sets one [m]
    overall_length_m: float = 0.0  #: the motor body, the housing tube with the end caps inside it [m]
    max_length_m: float | None = None  #: the envelope limit on the overall length, if the project sets one [m]


@dataclass(frozen=True)
class SizingResult:
    """The classic sizing figures of the armature at the rated point, nominal case."""

    electric_loading_A_per_m: float  #: ampere-conductors per metre of armature circumference [A/m]
    magnetic_loading_T: float  #: mean gap flux density over the whole circumference [T]
    rotor_volume_m3: float  #: π/4·D²·L [m³]
    torque_per_rotor_volume_N_m_per_m3: float  #: electromagnetic torque over rotor volume (TRV) [N·m/m³]
    airgap_shear_stress_Pa: float  #: TRV/2 [Pa]


@dataclass(frozen=True)
class MagnetChartCase:
    """Plot data of the magnet operating chart for one temperature."""

    name: str  #: "cold", "nominal" or "hot"
    curves: DemagnetizationCurves  #: normal and intrinsic curves at the case's magnet temperature
    operating_field_A_per_m: float  #: no-load operating point's H [A/m]
    operating_flux_density_T: float  #: no-load operating point's B [T]
    permeance_coefficient: float  #: slope of the operating point, iron drops included [1]


@dataclass(frozen=True)
class QuotedValue:
    """A number a check's message quotes, kept with its unit so that a view can show it in its own units."""

    value: float  #: in SI; a temperature in °C
    unit: str  #: the ``core.units`` unit the message quotes it in, e.g. "mN·m", "°C", "mm"
    digits: int = 3  #: significant figures it is quoted to
    spec: str = ""  #: a format spec used instead of ``digits``, e.g. ".0f" for a temperature to the whole degree
    bare: bool = False  #: the number without its unit (the unit follows later: "8.0 × 10.0 mm")


@dataclass(frozen=True)
class Check:
    """One design check: what was tested, the finding, and what to change."""

    key: str  #: stable identifier, e.g. "demagnetization" or "housing_flux_density"
    title: str  #: a short label for the checks panel
    status: str  #: "pass", "warning" or "fail"
    message: str  #: the reason, in a sentence, with the numbers (in the units of ``quoted``)
    advice: str = ""  #: what to change, when it did not pass
    #: the message with ⟦i⟧ where ``quoted[i]`` stands, for a view that shows the numbers in other units
    template: str = ""
    quoted: tuple[QuotedValue, ...] = ()  #: the numbers of the message that carry a unit a view may change

    @property
    def sentence(self) -> str:
        """Title, finding and advice as one line."""
        return self.sentence_with(self.message)

    def sentence_with(self, message: str) -> str:
        """Title, a message and the advice as one line.

        Parameters
        ----------
        message : str
            This check's message, as a view writes it (its numbers perhaps in other units).

        Returns
        -------
        str
            "Title: message Advice."
        """
        text = f"{self.title}: {message}"
        return f"{text} {self.advice[0].upper() + self.advice[1:]}." if self.advice else text

    def filled(self, texts: tuple[str, ...] | list[str]) -> str:
        """The message with its quoted numbers as a view writes them.

        Parameters
        ----------
        texts : sequence of str
            One text per :attr:`quoted` value, in order, its unit included unless the value is ``bare``.

        Returns
        -------
        str
            :attr:`template` with ``texts[i]`` in place of ⟦i⟧.
        """
        message = self.template
        for index, text in enumerate(texts):
            message = message.replace(f"⟦{index}⟧", text)
        return message


@dataclass(frozen=True)
class Results:
    """Everything one evaluation computes. SI throughout; temperatures in °C."""

    name: str  #: the project's name
    supply_voltage_V: float  #: at the motor terminals [V]
    brush_drop_V: float  #: both brushes [V]
    load_torque_N_m: float  #: rated shaft torque [N·m]
    load_speed_rad_per_s: float  #: required speed at the rated torque [rad/s]
    magnet: MagnetResult  #: the grade as used, at the nominal ambient
    geometry: GeometryResult  #: the cross-section and lengths
    magnetics: MagneticsResult  #: no-load magnetic circuit, nominal case
    winding: WindingResult  #: the winding as built
    constants: ConstantsResult  #: Ke, Kt, resistance, inductance, time constants, inertia
    cold: CaseResult  #: performance at the coldest ambient
    nominal: CaseResult  #: performance at the nominal ambient
    hot: CaseResult  #: performance at the hottest ambient, winding and magnets at the hot state
    demagnetization: DemagnetizationResult  #: every case against the knee
    thermal: ThermalResult  #: the hot case's temperatures
    mass: MassResult  #: masses of the parts
    cost: CostResult  #: raw-material cost
    checks: tuple[Check, ...]  #: pass / warning / fail, with the reasons
    magnet_chart: tuple[MagnetChartCase, ...] = field(repr=False)  #: cold, nominal and hot curves and points
    sizing: SizingResult | None = None  #: loadings at the nominal rated point
    current_limit_A: float | None = None  #: the drive's current limit, if the project sets one [A]
    reversing: bool = False  #: the application reverses (plugs) the motor at speed
    ambient_min_C: float = 20.0  #: coldest ambient [°C]
    ambient_nominal_C: float = 20.0  #: nominal ambient [°C]
    ambient_max_C: float = 20.0  #: hottest ambient [°C]
    #: load.further_points: the torques [N·m] and the speeds required at them [rad/s], in order (the speeds
    #: reached are in each case)
    further_point_torques_N_m: tuple[float, ...] = ()
    further_point_required_speeds_rad_per_s: tuple[float, ...] = ()
    ratings: RatingsResult | None = None  #: continuous rating and permitted stall times
    commutation: CommutationResult | None = None  #: brush current density, surface speed, reactance voltage
    faults: FaultsResult | None = None  #: demagnetization with the supply applied directly, no limiter

    @property
    def cases(self) -> tuple[CaseResult, CaseResult, CaseResult]:
        """Cold, nominal and hot, in that order."""
        return (self.cold, self.nominal, self.hot)

    @property
    def warnings(self) -> list[str]:
        """Sentences for every check that did not pass."""
        return [c.sentence for c in self.checks if c.status != "pass"]
