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
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .geometry import Geometry


def housing_surface_area(geometry: Geometry):
    """Outer surface of the housing tube with both end faces [m²]."""
    r = geometry.housing_outer_radius
    return 2.0 * np.pi * r * geometry.housing_length + 2.0 * np.pi * r**2


def housing_to_ambient_resistance(geometry: Geometry, convection_coeff):
    """R_ha = 1/(h·A) [K/W]."""
    return 1.0 / (convection_coeff * housing_surface_area(geometry))


@dataclass(frozen=True)
class Temperatures:
    housing_C: float
    winding_C: float
    magnet_C: float


def steady_temperatures(ambient_C, rotor_loss, total_loss, winding_to_housing, housing_to_ambient) -> Temperatures:
    """The two-node network's steady state for given losses [W]."""
    housing = ambient_C + total_loss * housing_to_ambient
    winding = housing + rotor_loss * winding_to_housing
    return Temperatures(housing_C=housing, winding_C=winding, magnet_C=housing)


def short_time_rise(steady_rise, duration, time_constant):
    """Temperature rise after ``duration`` [s] from cold with one time constant [s] (IEC 60034-1 S2)."""
    return steady_rise * (1.0 - np.exp(-duration / time_constant))
