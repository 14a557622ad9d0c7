"""Steady-state and short-time temperatures of the winding and magnets.

A two-node network (our model, common practice for small DC motors, no source): the rotor's losses
(copper, brush, iron) flow from the winding through R_wh to the housing; all losses flow from the
housing through R_ha to ambient. The magnets sit on the housing bore and take its temperature.

    T_housing = T_amb + P_total·R_ha,   T_winding = T_housing + P_rotor·R_wh,   T_magnet = T_housing

R_ha is given, or estimated from the housing surface (tube and both ends) and a convection
coefficient: R_ha = 1/(h·A). The losses depend on the temperatures (copper resistance per IEC 60028,
magnet remanence per its coefficient), so the network is iterated to a fixed point by the orchestrator.

Duty types per IEC 60034-1: S1 continuous (the steady state), S2 short-time (the winding's rise after
t minutes from ambient with one thermal time constant: ΔT(t) = ΔT_ss·(1 - exp(-t/τ))).
Thermal classes per IEC 60085: the class number is the limiting temperature in °C.

References
----------
.. [1] IEC 60034-1, rating and performance: duty types S1 (continuous) and S2 (short-time).
.. [2] IEC 60085, electrical insulation: thermal evaluation and designation.
.. [3] IEC 60028, international standard of resistance for copper (temperature coefficient).
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

import numpy as np

from .geometry import Geometry


def housing_surface_area(geometry: Geometry):
    """Outer surface of the housing tube with both end faces.

    Parameters
    ----------
    geometry : Geometry
        The cross-section and lengths (housing outer radius and length) [m].

    Returns
    -------
    float or ndarray
        2π·r·L + 2π·r² [m²].
    """
    r = geometry.housing_outer_radius
    return 2.0 * np.pi * r * geometry.housing_length + 2.0 * np.pi * r**2


def housing_to_ambient_resistance(geometry: Geometry, convection_coeff: float | np.ndarray):
    """Thermal resistance from the housing to ambient, estimated from its surface: R_ha = 1/(h·A).

    Parameters
    ----------
    geometry : Geometry
        The cross-section and lengths [m].
    convection_coeff : float or ndarray
        Heat-transfer coefficient h of the housing surface [W/(m²·K)].

    Returns
    -------
    float or ndarray
        R_ha [K/W].

    References
    ----------
    .. [1] Newton's law of cooling over the housing surface (:func:`housing_surface_area`); the
       coefficient is the user's (the schema's default, 12 W/(m²·K), is common practice, no source).
    """
    return 1.0 / (convection_coeff * housing_surface_area(geometry))


@dataclass(frozen=True)
class Temperatures:
    """The two-node network's temperatures [°C]."""

    housing_C: float  #: [°C]
    winding_C: float  #: [°C]
    magnet_C: float  #: taken as the housing's [°C]


def steady_temperatures(ambient_C: float, rotor_loss: float, total_loss: float, winding_to_housing: float,
                        housing_to_ambient: float) -> Temperatures:
    """The two-node network's steady state for given losses.

    Parameters
    ----------
    ambient_C : float
        Ambient temperature [°C].
    rotor_loss : float
        Copper, brush and iron losses, which flow from the winding to the housing [W].
    total_loss : float
        Every loss, all of which flows from the housing to ambient [W].
    winding_to_housing, housing_to_ambient : float
        Thermal resistances R_wh and R_ha [K/W].

    Returns
    -------
    Temperatures
        Housing, winding and magnet temperatures [°C].

    References
    ----------
    .. [1] the two-node network of the module docstring (our model, common practice, no source).
    """
    housing = ambient_C + total_loss * housing_to_ambient
    winding = housing + rotor_loss * winding_to_housing
    return Temperatures(housing_C=housing, winding_C=winding, magnet_C=housing)


def short_time_rise(steady_rise: float | np.ndarray, duration: float | np.ndarray,
                    time_constant: float | np.ndarray):
    """Temperature rise after a run of ``duration`` from cold, with one thermal time constant.

    Parameters
    ----------
    steady_rise : float or ndarray
        The steady-state rise ΔT_ss [K].
    duration : float or ndarray
        Length of the run t [s].
    time_constant : float or ndarray
        Thermal time constant τ of the motor [s].

    Returns
    -------
    float or ndarray
        ΔT(t) = ΔT_ss·(1 - exp(-t/τ)) [K].

    References
    ----------
    .. [1] IEC 60034-1, duty type S2; the single exponential is the first-order thermal model (common
       practice, no source).
    """
    return steady_rise * (1.0 - np.exp(-duration / time_constant))


def duty_rise_fraction(duty: str, duty_time: float, time_constant: float) -> float:
    """Share of the steady-state rise the winding reaches in the duty: 1 for S1, 1 - exp(-t/τ) for S2.

    Parameters
    ----------
    duty : str
        IEC 60034-1 duty type, "S1" or "S2".
    duty_time : float
        Length of the S2 run [s].
    time_constant : float
        Thermal time constant of the motor [s].

    Returns
    -------
    float
        The share of the steady rise [1].

    References
    ----------
    .. [1] IEC 60034-1, duty types S1 and S2.
    """
    return 1.0 if duty == "S1" else float(short_time_rise(1.0, duty_time, time_constant))


#: Temperatures at which the thermal loop reads the flux: this many from the coldest ambient up.
GRID_POINTS = 24


def flux_grid_temperatures(ambient_min_C: float, ambient_nominal_C: float, ambient_max_C: float,
                           max_working_C: float, model_high_C: float) -> np.ndarray:
    """Magnet temperatures at which the thermal loop needs the flux: cold, nominal, then a rising grid.

    The grid reaches 250 K above the hottest ambient or 50 K above the grade's working limit,
    whichever is higher, but never past ``model_high_C``, where the grade's coefficients end: far
    enough that any steady state the loop can find lies on it (our choice).

    Parameters
    ----------
    ambient_min_C, ambient_nominal_C, ambient_max_C : float
        The ambient range [°C].
    max_working_C : float
        The grade's maximum working temperature [°C].
    model_high_C : float
        Where the grade's temperature model ends [°C].

    Returns
    -------
    ndarray
        The coldest and nominal ambient, then ``GRID_POINTS`` rising temperatures [°C].

    References
    ----------
    .. [1] our choice of range (see above), no source.
    """
    top = min(max(ambient_max_C + 250.0, max_working_C + 50.0), model_high_C)
    return np.concatenate(([ambient_min_C, ambient_nominal_C], np.linspace(ambient_min_C, top, GRID_POINTS)))


@dataclass(frozen=True)
class HotState:
    """The hot case's temperatures, from the losses ⇄ temperatures fixed point."""

    winding_C: float  #: at the end of the duty (steady state for S1) [°C]
    housing_C: float  #: [°C]
    magnet_C: float  #: taken as the housing's [°C]
    steady_winding_C: float  #: the S1 steady state, also for S2 [°C]
    rotor_loss_W: float  #: copper, brush and iron losses at the last iteration [W]
    total_loss_W: float  #: [W]
    iterations: int  #: of the fixed point
    converged: bool  #: a usable steady state exists
    runaway_winding_C: float | None  #: where the loop stopped, when no steady state exists [°C]


def hot_state(
    ambient_C: float,
    losses_at: Callable[[float, float], tuple[float, float, bool]],
    winding_to_housing: float,
    housing_to_ambient: float,
    rise_fraction: float,
    insulation_limit_C: float,
    model_high_C: float,
    max_iterations: int = 100,
    tolerance: float = 1e-4,
) -> HotState:
    """Iterate losses ⇄ temperatures at the hottest ambient to the hot case's steady state.

    Parameters
    ----------
    ambient_C : float
        The hottest ambient [°C].
    losses_at : callable
        ``losses_at(winding_C, magnet_C) -> (rotor_loss [W], total_loss [W], rated_reached)`` at the
        rated point with the winding and magnets at those temperatures.
    winding_to_housing, housing_to_ambient : float
        Thermal resistances of the two-node network [K/W].
    rise_fraction : float
        Share of the steady rise the duty reaches (:func:`duty_rise_fraction`) [1].
    insulation_limit_C : float
        The insulation class temperature [°C].
    model_high_C : float
        Where the magnet grade's temperature model ends [°C].
    max_iterations : int, optional
        Give up after this many iterations [1].
    tolerance : float, optional
        Converged when winding and housing together change less than this [K].

    Returns
    -------
    HotState
        Temperatures [°C], losses [W] and how the iteration ended. When no steady state exists
        (thermal runaway, the rated load stalls the hot motor, or the magnets would pass
        ``model_high_C``), the hot case is put at the insulation class limit, the hottest the winding
        may run, with the magnets at the matching share of the rise (capped at ``model_high_C``), and
        ``converged`` is False: the thermal check then fails and says so.

    References
    ----------
    .. [1] the two-node network of this module (our model, common practice, no source).
    """
    winding_C = housing_C = magnet_C = steady_winding_C = ambient_C
    converged = False
    iterations = 0
    rotor_loss = total_loss = 0.0
    while iterations < max_iterations:
        iterations += 1
        rotor_loss, total_loss, rated_reached = losses_at(winding_C, magnet_C)
        steady = steady_temperatures(ambient_C, rotor_loss, total_loss, winding_to_housing, housing_to_ambient)
        new_winding = ambient_C + rise_fraction * (steady.winding_C - ambient_C)
        new_housing = ambient_C + rise_fraction * (steady.housing_C - ambient_C)
        change = abs(new_winding - winding_C) + abs(new_housing - housing_C)
        winding_C, housing_C, magnet_C = new_winding, new_housing, new_housing
        steady_winding_C = steady.winding_C
        if change < tolerance:
            converged = rated_reached  # a stalled motor at the rated load has no steady state to speak of
            break
        if winding_C > 1000.0:
            break  # thermal runaway: losses grow faster than the heat can leave
    if magnet_C >= model_high_C:
        converged = False  # past the temperature up to which the magnet data mean anything
    runaway_winding_C = None
    if not converged:
        runaway_winding_C = winding_C
        rise = max(winding_C - ambient_C, 1e-9)
        share = min(max((housing_C - ambient_C) / rise, 0.0), 1.0)
        winding_C = max(insulation_limit_C, ambient_C)
        housing_C = magnet_C = ambient_C + share * (winding_C - ambient_C)
    magnet_C = min(magnet_C, model_high_C)
    return HotState(winding_C=winding_C, housing_C=housing_C, magnet_C=magnet_C,
                    steady_winding_C=steady_winding_C, rotor_loss_W=rotor_loss, total_loss_W=total_loss,
                    iterations=iterations, converged=converged, runaway_winding_C=runaway_winding_C)
