"""The thermal results of one evaluation: the duty's hot state, its transient, and the ratings.

Frozen dataclasses, SI throughout, temperatures in °C; each field's name carries its unit and the comment
beside it its meaning (:mod:`core.results` gathers them into :class:`core.results.Results`).
"""

from __future__ import annotations

from dataclasses import dataclass


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
