"""The classic sizing figures of an armature: electric and magnetic loading, torque per rotor volume.

    A = Z·(I/a)/(π·D)            electric loading, ampere-conductors per metre of circumference
    B = p·Φ/(π·D·L)              magnetic loading, mean gap flux density over the circumference
    TRV = T_em/(π/4·D²·L)        torque per rotor volume; the air-gap shear stress is TRV/2

The output equation T = (π/2)·D²·L·A·B ties them together, which is why a designer compares them
with what similar machines achieve.

References
----------
.. [1] T. J. E. Miller, Brushless Permanent-Magnet and Reluctance Motor Drives, OUP 1989, ch. 1
   (TRV and shear stress; from memory).
.. [2] M. G. Say, The Performance and Design of Alternating Current Machines, ch. on main dimensions
   (electric and magnetic loading; from memory).
"""

from __future__ import annotations

import numpy as np

from .geometry import Geometry
from .results import SizingResult


def armature_loadings(geometry: Geometry, conductors: int, paths: int, current: float,
                      electromagnetic_torque: float, flux_per_pole: float) -> SizingResult:
    """Electric and magnetic loading, TRV and shear stress at one operating point.

    Parameters
    ----------
    geometry : Geometry
        The cross-section (armature radius, stack length, poles) [m].
    conductors, paths : int
        Total conductors Z and parallel paths a [1].
    current : float
        Armature current [A].
    electromagnetic_torque : float
        Shaft torque plus the loss torque at that point, K·I [N·m].
    flux_per_pole : float
        Flux crossing the gap per pole Φ [Wb].

    Returns
    -------
    SizingResult
        The figures in SI (A/m, T, m³, N·m/m³, Pa).

    References
    ----------
    .. [1] Miller 1989, ch. 1, and Say, ch. on main dimensions (both from memory); see the module
       docstring.
    """
    g = geometry
    rotor_volume = float(np.pi * g.armature_radius**2 * g.stack_length)
    electric_loading = conductors * (current / paths) / (2.0 * np.pi * float(g.armature_radius))
    torque_density = electromagnetic_torque / rotor_volume
    return SizingResult(
        electric_loading_A_per_m=float(electric_loading),
        magnetic_loading_T=float(g.poles * flux_per_pole / (2.0 * np.pi * g.armature_radius * g.stack_length)),
        rotor_volume_m3=rotor_volume,
        torque_per_rotor_volume_N_m_per_m3=float(torque_density),
        airgap_shear_stress_Pa=float(torque_density / 2.0),
    )
