"""The design's thermal network built from its masses and inputs, and the thermal results assembled.

This module holds no new physics: it takes the capacities and resistances a design gives or implies
(:mod:`core.thermal_network`), runs the ratings (:mod:`core.ratings`) and fills the results' thermal
and ratings groups, so that the orchestrator keeps one line for the whole thermal step.

Estimates where the project leaves a value out (each overridable by a key of ``[thermal]``):

* C_w: the copper's mass times its specific heat (the winding's own capacity; the lamination's is left
  out of both nodes, which errs toward a faster rise, our choice);
* C_h: the housing's and magnets' masses times their specific heats, or, where the project gives the
  motor's measured slow time constant τ, C_h = τ/R_ha - C_w (the slow mode of two nodes with
  R_wh ≪ R_ha), never below a tenth of τ/R_ha;
* R_wm, R_mh: :func:`thermal_network.gap_coupling_resistance`, :func:`thermal_network.magnet_to_housing_resistance`.

References
----------
.. [1] the two-capacity network of :mod:`core.thermal_network` (Incropera, lumped capacities, from
   memory); IEC 60034-1 duty types; IEC 60085 classes.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from . import thermal_network as tn
from .design import Design
from .mass import Masses
from .ratings import DutyState, MotorAt, continuous_rating, duty_state, duty_transient, stall_time
from .results import RatingsResult, ThermalResult, ThermalTransient
from .thermal import housing_to_ambient_resistance
from .units import from_si


def network_of(design: Design, part_masses: Masses) -> tn.ThermalNetwork:
    """The design's two-capacity network, from its inputs where given, else estimated (module docstring).

    Parameters
    ----------
    design : Design
        The design in SI.
    part_masses : Masses
        Its parts' masses [kg].

    Returns
    -------
    ThermalNetwork
        Capacities [J/K] and resistances [K/W].

    References
    ----------
    .. [1] module docstring; specific heats of :mod:`core.thermal_network` (from memory).
    """
    d, g = design, design.geometry
    housing_to_ambient = (d.thermal.housing_to_ambient if d.thermal.housing_to_ambient is not None
                          else float(housing_to_ambient_resistance(g, d.thermal.convection_coeff)))
    winding = (d.thermal.winding_capacity if d.thermal.winding_capacity is not None
               else tn.capacity([(float(part_masses.copper), tn.COPPER_SPECIFIC_HEAT)]))
    if d.thermal.time_constant is not None:
        whole = d.thermal.time_constant / housing_to_ambient
        housing = max(whole - winding, 0.1 * whole)
    else:
        housing = tn.capacity([(float(part_masses.housing), tn.STEEL_SPECIFIC_HEAT),
                               (float(part_masses.magnet), tn.MAGNET_SPECIFIC_HEAT[d.magnet.family])])
    coupling = (d.thermal.winding_to_magnet if d.thermal.winding_to_magnet is not None
                else tn.gap_coupling_resistance(g))
    return tn.ThermalNetwork(winding_capacity=winding, housing_capacity=housing,
                             winding_to_housing=d.thermal.winding_to_housing, housing_to_ambient=housing_to_ambient,
                             winding_to_magnet=coupling,
                             magnet_to_housing=tn.magnet_to_housing_resistance(g, d.magnet.family))


@dataclass(frozen=True)
class ThermalOutcome:
    """The hot case's temperatures, and the results' thermal and ratings groups."""

    hot: DutyState  #: the duty's hottest moment at the highest ambient
    thermal: ThermalResult  #: for ``Results.thermal``
    ratings: RatingsResult  #: for ``Results.ratings``


def thermal_outcome(design: Design, part_masses: Masses, motor_at: MotorAt, model_high_C: float) -> ThermalOutcome:
    """The hot state of the duty, the continuous rating and the stall times at the highest ambient.

    Parameters
    ----------
    design : Design
        The design in SI.
    part_masses : Masses
        Its parts' masses [kg].
    motor_at : callable
        ``motor_at(winding_C, magnet_C) -> MotorModel``.
    model_high_C : float
        Where the magnet grade's temperature model ends [°C].

    Returns
    -------
    ThermalOutcome
        The hot state and the results' groups.

    References
    ----------
    .. [1] :mod:`core.ratings` (IEC 60034-1 S1, S2, S3; IEC 60085).
    """
    d, t = design, design.thermal
    network = network_of(d, part_masses)
    ambient, limit = d.ambient_max_C, d.winding.insulation_limit_C
    high = model_high_C

    def state(duty: str) -> DutyState:
        return duty_state(network, ambient, motor_at, d.load_torque, duty, t.duty_time, t.cycle_factor,
                          t.cycle_time, limit, high)

    s1 = state("S1")
    hot = s1 if t.duty == "S1" else state(t.duty)
    time, winding, housing, magnet = duty_transient(network, ambient, hot.losses, t.duty, t.duty_time,
                                                    t.cycle_factor, t.cycle_time)
    fast, slow = tn.time_constants(network)
    magnet_limit = d.magnet.max_working_temperature_C
    thermal = ThermalResult(
        ambient_C=ambient, duty=t.duty, duty_minutes=from_si(t.duty_time, "min"),
        housing_temperature_C=hot.housing_C, winding_temperature_C=hot.winding_C, magnet_temperature_C=hot.magnet_C,
        steady_winding_temperature_C=s1.iterated_winding_C, insulation_class=d.winding.insulation_class,
        insulation_limit_C=limit, magnet_limit_C=magnet_limit,
        losses_W=hot.losses.winding + hot.losses.housing, rotor_losses_W=hot.losses.winding,
        housing_to_ambient_K_per_W=network.housing_to_ambient, winding_to_housing_K_per_W=network.winding_to_housing,
        thermal_time_constant_s=slow, iterations=hot.iterations, converged=hot.steady_state_exists,
        runaway_winding_temperature_C=None if hot.steady_state_exists else hot.iterated_winding_C,
        steady_state_s1_exists=s1.steady_state_exists,
        ok=bool(hot.steady_state_exists and hot.winding_C <= limit and hot.magnet_C <= magnet_limit),
        steady_state_exists=hot.steady_state_exists, time_to_limit_s=hot.time_to_limit_s,
        winding_heat_capacity_J_per_K=network.winding_capacity,
        housing_heat_capacity_J_per_K=network.housing_capacity,
        winding_to_magnet_K_per_W=network.winding_to_magnet, magnet_to_housing_K_per_W=network.magnet_to_housing,
        winding_time_constant_s=fast, cycle_duration_factor=t.cycle_factor,
        cycle_minutes=from_si(t.cycle_time, "min"),
        transient=ThermalTransient(duty=t.duty, time_s=_rounded(time), winding_C=_rounded(winding),
                                   housing_C=_rounded(housing), magnet_C=_rounded(magnet), insulation_limit_C=limit),
    )
    rating = continuous_rating(network, ambient, motor_at, limit, high)
    cold_time, stall_i = stall_time(network, ambient, motor_at, d.current_limit, limit)
    s1_rises = (min(s1.winding_C, limit) - ambient, min(s1.housing_C, limit) - ambient)
    hot_time, _ = stall_time(network, ambient, motor_at, d.current_limit, limit, s1_rises, min(s1.magnet_C, high))
    ratings = RatingsResult(
        ambient_C=ambient, insulation_limit_C=limit, continuous_torque_N_m=rating.torque,
        continuous_current_A=rating.current, continuous_speed_rad_per_s=rating.speed,
        continuous_output_power_W=rating.torque * rating.speed, stall_current_A=stall_i,
        stall_time_cold_s=_finite_or_none(cold_time), stall_time_hot_s=_finite_or_none(hot_time),
        drive_limited=bool(d.current_limit is not None and stall_i >= d.current_limit),
    )
    return ThermalOutcome(hot=hot, thermal=thermal, ratings=ratings)


def _finite_or_none(value: float) -> float | None:
    return float(value) if np.isfinite(value) else None


def _rounded(values: np.ndarray) -> tuple[float, ...]:
    # Plot and JSON data: a tenth of a kelvin or of a second is finer than the model.
    return tuple(round(float(v), 2) for v in values)
