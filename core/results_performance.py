"""The electrical and mechanical results of one evaluation: winding, constants, each case's curve and points.

Also the drive envelope of each case and the brushes and commutator. Frozen dataclasses, SI throughout,
temperatures in °C; each field's name carries its unit and the comment beside it its meaning
(:mod:`core.results` gathers them into :class:`core.results.Results`).
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np


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
