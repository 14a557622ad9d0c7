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

from collections.abc import Sequence
from dataclasses import dataclass, fields

import numpy as np

from . import thermal_network as tn
from .design import Design
from .geometry import Geometry
from .mass import Masses
from .ratings import (
    ContinuousRating,
    DutyState,
    MotorAt,
    continuous_rating,
    duty_state,
    duty_transient,
    stall_time,
    take,
)
from .results import RatingsResult, ThermalResult, ThermalTransient
from .thermal import housing_to_ambient_resistance
from .units import from_si


def _given(values) -> np.ndarray:
    """Per design the value given, NaN where the project leaves it to the estimate."""
    return np.array([np.nan if v is None else v for v in values], dtype=float)


def networks_of(designs: Sequence[Design], part_masses: Masses, geometry: Geometry) -> tn.ThermalNetwork:
    """The designs' two-capacity networks, from their inputs where given, else estimated (module docstring).

    Parameters
    ----------
    designs : sequence of Design
        The designs in SI.
    part_masses : Masses
        Their parts' masses, arrays over the designs [kg].
    geometry : Geometry
        Their cross-sections, stacked (core.batch.stack_geometries) [m, rad].

    Returns
    -------
    ThermalNetwork
        Capacities [J/K] and resistances [K/W], arrays over the designs.

    References
    ----------
    .. [1] module docstring; specific heats of :mod:`core.thermal_network` (from memory).
    """
    thermal = [d.thermal for d in designs]
    given_ha = _given(t.housing_to_ambient for t in thermal)
    convection = np.array([t.convection_coeff for t in thermal], dtype=float)
    housing_to_ambient = np.where(np.isnan(given_ha), housing_to_ambient_resistance(geometry, convection), given_ha)
    given_w = _given(t.winding_capacity for t in thermal)
    winding = np.where(np.isnan(given_w), tn.capacity([(part_masses.copper, tn.COPPER_SPECIFIC_HEAT)]), given_w)
    time_constant = _given(t.time_constant for t in thermal)
    whole = time_constant / housing_to_ambient
    magnet_heat = np.array([tn.MAGNET_SPECIFIC_HEAT[d.magnet.family] for d in designs])
    estimated = tn.capacity([(part_masses.housing, tn.STEEL_SPECIFIC_HEAT), (part_masses.magnet, magnet_heat)])
    housing = np.where(np.isnan(time_constant), estimated, np.maximum(whole - winding, 0.1 * whole))
    given_wm = _given(t.winding_to_magnet for t in thermal)
    coupling = np.where(np.isnan(given_wm), tn.gap_coupling_resistance(geometry), given_wm)
    return tn.ThermalNetwork(
        winding_capacity=winding, housing_capacity=housing,
        winding_to_housing=np.array([t.winding_to_housing for t in thermal], dtype=float),
        housing_to_ambient=housing_to_ambient, winding_to_magnet=coupling,
        magnet_to_housing=np.asarray(tn.magnet_to_housing_resistance(geometry, [d.magnet.family for d in designs]),
                                     dtype=float))


@dataclass(frozen=True)
class ThermalFigures:
    """The thermal state and ratings of a batch of designs at their highest ambients (arrays)."""

    network: tn.ThermalNetwork  #: each design's network
    s1: DutyState  #: continuous running at the rated load
    hot: DutyState  #: the duty's hottest moment (the S1 state where the duty is S1)
    rating: ContinuousRating  #: the S1 rating at the class limit
    stall_time_cold_s: np.ndarray  #: held at stall from ambient to the class limit; inf if never [s]
    stall_time_hot_s: np.ndarray  #: held at stall from the S1 state (capped at the limit); inf if never [s]
    stall_current_A: np.ndarray  #: at stall from cold, at the drive's limit if lower [A]


def thermal_figures(designs: Sequence[Design], network: tn.ThermalNetwork, motor_at: MotorAt,
                    model_high_C: np.ndarray) -> ThermalFigures:
    """The hot state of each design's duty, its continuous rating and its stall times at the highest ambient.

    Parameters
    ----------
    designs : sequence of Design
        The designs in SI.
    network : ThermalNetwork
        Their networks (:func:`networks_of`).
    motor_at : callable
        ``motor_at(rows, winding_C, magnet_C) -> MotorModel`` over the designs' indices.
    model_high_C : ndarray
        Where each grade's temperature model ends [°C].

    Returns
    -------
    ThermalFigures
        Arrays over the designs.

    References
    ----------
    .. [1] :mod:`core.ratings` (IEC 60034-1 S1, S2, S3; IEC 60085).
    """
    def per_design(read) -> np.ndarray:
        return np.array([read(d) for d in designs], dtype=float)

    rows = np.arange(len(designs))
    ambient, limit = per_design(lambda d: d.ambient_max_C), per_design(lambda d: d.winding.insulation_limit_C)
    torque = per_design(lambda d: d.load_torque)
    run_time, factor, cycle = (per_design(lambda d: d.thermal.duty_time), per_design(lambda d: d.thermal.cycle_factor),
                               per_design(lambda d: d.thermal.cycle_time))
    duty = np.array([d.thermal.duty for d in designs])
    current_limit = per_design(lambda d: np.nan if d.current_limit is None else d.current_limit)
    s1 = duty_state(network, rows, ambient, motor_at, torque, "S1", run_time, factor, cycle, limit, model_high_C)
    hot = s1
    other = np.flatnonzero(duty != "S1")
    if other.size:
        from .ratings import DUTY_CODES

        part = duty_state(take(network, other), rows[other], ambient[other], motor_at, torque[other],
                          np.array([DUTY_CODES[code] for code in duty[other]]), run_time[other], factor[other],
                          cycle[other], limit[other], model_high_C[other])
        hot = _merged(s1, part, other)
    rating = continuous_rating(network, rows, ambient, motor_at, limit, model_high_C)
    cold_time, stall_i = stall_time(network, rows, ambient, motor_at, current_limit, limit)
    rises = (np.minimum(s1.winding_C, limit) - ambient, np.minimum(s1.housing_C, limit) - ambient)
    hot_time, _ = stall_time(network, rows, ambient, motor_at, current_limit, limit, rises,
                             np.minimum(s1.magnet_C, model_high_C))
    return ThermalFigures(network=network, s1=s1, hot=hot, rating=rating, stall_time_cold_s=cold_time,
                          stall_time_hot_s=hot_time, stall_current_A=stall_i)


def _merged(whole: DutyState, part: DutyState, index: np.ndarray) -> DutyState:
    """``whole`` with the states of the designs ``index`` replaced by ``part``'s."""
    def put(a, b):
        out = np.array(a, copy=True)
        out[index] = b
        return out

    losses = type(whole.losses)(*(put(getattr(whole.losses, n), getattr(part.losses, n))
                                  for n in ("winding", "housing", "current", "reached")))
    return DutyState(put(whole.winding_C, part.winding_C), put(whole.housing_C, part.housing_C),
                     put(whole.magnet_C, part.magnet_C), losses, put(whole.iterations, part.iterations),
                     put(whole.steady_state_exists, part.steady_state_exists),
                     put(whole.time_to_limit_s, part.time_to_limit_s),
                     put(whole.iterated_winding_C, part.iterated_winding_C))


@dataclass(frozen=True)
class ThermalOutcome:
    """The hot case's temperatures, and the results' thermal and ratings groups."""

    hot: DutyState  #: the duty's hottest moment at the highest ambient (arrays of one)
    thermal: ThermalResult  #: for ``Results.thermal``
    ratings: RatingsResult  #: for ``Results.ratings``


def _first(values) -> float:
    return float(np.ravel(values)[0])


def thermal_outcome(design: Design, part_masses: Masses, motor_at: MotorAt, model_high_C: float) -> ThermalOutcome:
    """The hot state of the duty, the continuous rating and the stall times at the highest ambient.

    Parameters
    ----------
    design : Design
        The design in SI.
    part_masses : Masses
        Its parts' masses [kg].
    motor_at : callable
        ``motor_at(rows, winding_C, magnet_C) -> MotorModel`` (rows all 0: the one design).
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
    one = Masses(**{name: np.atleast_1d(np.asarray(getattr(part_masses, name), dtype=float))
                    for name in ("magnet", "copper", "housing", "lamination", "teeth", "core", "shaft")})
    geometry = Geometry(**{f.name: np.atleast_1d(getattr(d.geometry, f.name)) for f in fields(Geometry)})
    network = networks_of([d], one, geometry)
    figures = thermal_figures([d], network, motor_at, np.array([model_high_C]))
    single = tn.ThermalNetwork(**{name: _first(getattr(network, name)) for name in
                                  ("winding_capacity", "housing_capacity", "winding_to_housing", "housing_to_ambient",
                                   "winding_to_magnet", "magnet_to_housing")})
    ambient, limit = d.ambient_max_C, d.winding.insulation_limit_C
    s1, hot, rating = figures.s1, figures.hot, figures.rating
    exists = bool(hot.steady_state_exists[0])
    hot_w, hot_h, hot_m = _first(hot.winding_C), _first(hot.housing_C), _first(hot.magnet_C)
    time, winding, housing, magnet = duty_transient(single, ambient, hot.losses, t.duty, t.duty_time,
                                                    t.cycle_factor, t.cycle_time)
    fast, slow = tn.time_constants(single)
    magnet_limit = d.magnet.max_working_temperature_C
    to_limit = _first(hot.time_to_limit_s)
    thermal = ThermalResult(
        ambient_C=ambient, duty=t.duty, duty_minutes=from_si(t.duty_time, "min"),
        housing_temperature_C=hot_h, winding_temperature_C=hot_w, magnet_temperature_C=hot_m,
        steady_winding_temperature_C=_first(s1.iterated_winding_C), insulation_class=d.winding.insulation_class,
        insulation_limit_C=limit, magnet_limit_C=magnet_limit,
        losses_W=_first(hot.losses.winding + hot.losses.housing), rotor_losses_W=_first(hot.losses.winding),
        housing_to_ambient_K_per_W=float(single.housing_to_ambient),
        winding_to_housing_K_per_W=float(single.winding_to_housing),
        thermal_time_constant_s=slow, iterations=int(hot.iterations[0]), converged=exists,
        runaway_winding_temperature_C=None if exists else _first(hot.iterated_winding_C),
        steady_state_s1_exists=bool(s1.steady_state_exists[0]),
        ok=bool(exists and hot_w <= limit and hot_m <= magnet_limit),
        steady_state_exists=exists, time_to_limit_s=None if np.isnan(to_limit) else to_limit,
        winding_heat_capacity_J_per_K=float(single.winding_capacity),
        housing_heat_capacity_J_per_K=float(single.housing_capacity),
        winding_to_magnet_K_per_W=float(single.winding_to_magnet),
        magnet_to_housing_K_per_W=float(single.magnet_to_housing),
        winding_time_constant_s=fast, cycle_duration_factor=t.cycle_factor,
        cycle_minutes=from_si(t.cycle_time, "min"),
        transient=ThermalTransient(duty=t.duty, time_s=_rounded(time), winding_C=_rounded(winding),
                                   housing_C=_rounded(housing), magnet_C=_rounded(magnet), insulation_limit_C=limit),
    )
    stall_i = _first(figures.stall_current_A)
    ratings = RatingsResult(
        ambient_C=ambient, insulation_limit_C=limit, continuous_torque_N_m=_first(rating.torque),
        continuous_current_A=_first(rating.current), continuous_speed_rad_per_s=_first(rating.speed),
        continuous_output_power_W=_first(rating.torque * rating.speed), stall_current_A=stall_i,
        stall_time_cold_s=_finite_or_none(_first(figures.stall_time_cold_s)),
        stall_time_hot_s=_finite_or_none(_first(figures.stall_time_hot_s)),
        drive_limited=bool(d.current_limit is not None and stall_i >= d.current_limit),
    )
    return ThermalOutcome(hot=hot, thermal=thermal, ratings=ratings)


def _finite_or_none(value: float) -> float | None:
    return float(value) if np.isfinite(value) else None


def _rounded(values: np.ndarray) -> tuple[float, ...]:
    # Plot and JSON data: a tenth of a kelvin or of a second is finer than the model.
    return tuple(round(float(v), 2) for v in values)
