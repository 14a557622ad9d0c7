"""Thermal inputs shared by the chain: the housing's convection resistance, the flux grid's temperatures.

The network itself (two heat capacities, S1, S2, S3) is :mod:`core.thermal_network`; the ratings built
on it (the duty's hot state, the continuous rating, stall times) are :mod:`core.ratings`. Thermal classes
per IEC 60085: the class number is the limiting temperature in °C.

References
----------
.. [1] IEC 60085, electrical insulation: thermal evaluation and designation.
.. [2] Newton's law of cooling over the housing surface (Incropera, from memory).
"""

from __future__ import annotations

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


#: Temperatures at which the thermal loop reads the flux: this many from the coldest ambient up.
GRID_POINTS = 24


def flux_grid_temperatures(ambient_min_C, ambient_nominal_C, ambient_max_C, max_working_C, model_high_C) -> np.ndarray:
    """Magnet temperatures at which the thermal loop needs the flux: cold, nominal, then a rising grid.

    The grid reaches 250 K above the hottest ambient or 50 K above the grade's working limit,
    whichever is higher, but never past ``model_high_C``, where the grade's coefficients end: far
    enough that any steady state the loop can find lies on it (our choice).

    Parameters
    ----------
    ambient_min_C, ambient_nominal_C, ambient_max_C : float or ndarray
        The ambient range [°C] (arrays for many designs at once).
    max_working_C : float or ndarray
        The grade's maximum working temperature [°C].
    model_high_C : float or ndarray
        Where the grade's temperature model ends [°C].

    Returns
    -------
    ndarray
        The coldest and nominal ambient, then ``GRID_POINTS`` rising temperatures [°C], along the last
        axis (shape (N, 2 + GRID_POINTS) for N designs).

    References
    ----------
    .. [1] our choice of range (see above), no source.
    """
    top = np.minimum(np.maximum(np.add(ambient_max_C, 250.0), np.add(max_working_C, 50.0)), model_high_C)
    rising = np.linspace(ambient_min_C, top, GRID_POINTS, axis=-1)
    ends = np.stack(np.broadcast_arrays(np.asarray(ambient_min_C, dtype=float),
                                        np.asarray(ambient_nominal_C, dtype=float)), axis=-1)
    return np.concatenate((ends, rising), axis=-1)
