"""Brushes and commutator: brush current density, commutator surface speed, reactance voltage.

* **Brush current density** J_b = I/(n_p·w_b·l_b): each polarity carries the armature current I, shared
  by its n_p = count/2 brushes, each of contact area w_b·l_b. Compared with the grade's range for
  continuous service (:data:`BRUSH_GRADES`), or with the project's own limit.
* **Commutator surface speed** v_c = ω·D_c/2 at the highest no-load speed of the temperature cases.
* **Reactance voltage** of the coil in commutation, the classical average estimate for linear
  commutation: the coil's current reverses from +I/a to -I/a while a brush of width w_b passes,
  T_c = w_b/v_c, so e_r = L_c·2·(I/a)/T_c, with the coil's leakage inductance
  L_c = 2·μ0·N_c²·L·λ (two coil sides of N_c turns and stack length L, λ the specific permeance per
  unit length of a coil side, slot, tooth tips and end winding together; Pichelmayer's range is 4 to 8
  in units of μ0, :data:`SPECIFIC_PERMEANCE` takes 5). The brush width's own time constant and the
  mica are left out: an estimate to rank designs, to be confirmed by a sparking test.

Estimates where the project leaves a brush value out (common practice, no source): two brushes for
a wave winding and one per pole for a lap winding, a width of 1.5 segment pitches, a length of 1.25
widths, a commutator of 0.6 times the armature diameter.

References
----------
.. [1] M. G. Say, E. O. Taylor, Direct Current Machines, 2nd ed., Pitman, 1986, ch. on commutation
   (the average reactance voltage and Pichelmayer's specific permeance; from memory).
.. [2] brush makers' grade tables for the current densities of :data:`BRUSH_GRADES` (from memory).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from scipy.constants import mu_0

from .design import Design
from .results import CommutationResult
from .shared_docs import shared_parameters
from .winding import WINDING_PARAMETERS

#: Continuous-service current density of each brush grade, (low, high) [A/m²]: from memory (brush
#: makers' tables give ranges like these; the grade's own datasheet governs).
BRUSH_GRADES = {
    "carbon-graphite": (6e4, 8e4),
    "electrographite": (8e4, 12e4),
    "resin-bonded graphite": (4e4, 8e4),
    "copper-graphite": (12e4, 20e4),
    "silver-graphite": (20e4, 30e4),
}
#: Pichelmayer's specific permeance per unit length of a coil side, in units of μ0 (from memory: 4-8).
SPECIFIC_PERMEANCE = 5.0
#: Estimates where the project is silent (common practice, no source).
BRUSH_WIDTH_SEGMENTS, BRUSH_LENGTH_PER_WIDTH, COMMUTATOR_PER_ARMATURE = 1.5, 1.25, 0.6


def brush_current_density(current: float, brushes: int, width: float, length: float) -> float:
    """Current density under one brush, J_b = I/((count/2)·w_b·l_b).

    Parameters
    ----------
    current : float
        Armature current [A].
    brushes : int
        Brushes in all, half of each polarity [1].
    width, length : float
        Brush width along the circumference and length along the shaft [m].

    Returns
    -------
    float
        [A/m²].

    References
    ----------
    .. [1] module docstring (Say and Taylor, from memory).
    """
    return abs(current) / (0.5 * brushes * width * length)


def surface_speed(speed: float, diameter: float) -> float:
    """Peripheral speed of the commutator, v = ω·D/2.

    Parameters
    ----------
    speed : float
        Rotor speed ω [rad/s].
    diameter : float
        Commutator diameter D [m].

    Returns
    -------
    float
        [m/s].
    """
    return abs(speed) * diameter / 2.0


@shared_parameters(WINDING_PARAMETERS)
def reactance_voltage(current, paths, turns_per_coil, stack_length, speed, commutator_diameter, brush_width,
                      specific_permeance: float = SPECIFIC_PERMEANCE):
    """Average reactance voltage of the coil in commutation, e_r = L_c·2·(I/a)/T_c.

    Parameters
    ----------
    turns_per_coil : int or ndarray
        N_c [1].
    stack_length : float or ndarray
        L [m].
    speed : float or ndarray
        Rotor speed [rad/s].
    commutator_diameter, brush_width : float or ndarray
        D_c and w_b [m] (arrays broadcast: many designs at once).
    specific_permeance : float, optional
        λ in units of μ0 per unit length of a coil side [1].

    Returns
    -------
    float or ndarray
        e_r [V], with L_c = 2·μ0·N_c²·L·λ and T_c = w_b/v_c.

    References
    ----------
    .. [1] Say and Taylor 1986, commutation (average reactance voltage, Pichelmayer's λ; from memory).
    """
    coil_inductance = 2.0 * mu_0 * turns_per_coil**2 * stack_length * specific_permeance
    commutation_time = brush_width / np.maximum(surface_speed(speed, commutator_diameter), 1e-12)
    voltage = coil_inductance * 2.0 * np.abs(current) / paths / commutation_time
    return float(voltage) if np.ndim(voltage) == 0 else voltage


@dataclass(frozen=True)
class BrushSet:
    """The brushes and commutator as evaluated, with the tool's estimates filled in."""

    grade: str  #: brush material
    count: int  #: brushes in all [1]
    width: float  #: [m]
    length: float  #: [m]
    commutator_diameter: float  #: [m]
    density_range: tuple[float, float]  #: the grade's (low, high), or (0, limit) when the project gives one [A/m²]
    estimated: tuple[str, ...]  #: which of count, width, length, commutator_diameter are the tool's estimates


def brush_set(design: Design) -> BrushSet:
    """The project's brushes, with the module docstring's estimates where it leaves a value out.

    Parameters
    ----------
    design : Design
        The design in SI: its ``[brushes]`` inputs, and the geometry and winding the estimates scale with.

    Returns
    -------
    BrushSet
        Dimensions [m], count and the density range [A/m²].

    References
    ----------
    .. [1] the estimates are common practice, no source (module docstring).
    """
    b, g, w = design.brushes, design.geometry, design.winding
    estimated = []
    commutator = b.commutator_diameter
    if commutator is None:
        commutator = COMMUTATOR_PER_ARMATURE * 2.0 * float(g.armature_radius)
        estimated.append("commutator_diameter")
    width = b.width
    if width is None:
        width = BRUSH_WIDTH_SEGMENTS * math.pi * commutator / w.commutator_segments
        estimated.append("width")
    length = b.length
    if length is None:
        length = BRUSH_LENGTH_PER_WIDTH * width
        estimated.append("length")
    count = b.count
    if count is None:
        count = 2 if w.kind == "wave" else int(g.poles)
        estimated.append("count")
    limits = BRUSH_GRADES[b.grade] if b.current_density_limit is None else (0.0, b.current_density_limit)
    return BrushSet(grade=b.grade, count=count, width=width, length=length, commutator_diameter=commutator,
                    density_range=limits, estimated=tuple(estimated))


def commutation_result(design: Design, paths: int, rated_current: float, rated_speed: float,
                       top_speed: float) -> CommutationResult:
    """The brushes' and commutator's figures at the hot rated point and the highest no-load speed.

    Parameters
    ----------
    design : Design
        The design in SI.
    paths : int
        Parallel paths a [1].
    rated_current, rated_speed : float
        At the rated point of the hot case [A, rad/s].
    top_speed : float
        The highest no-load speed of the temperature cases [rad/s].

    Returns
    -------
    CommutationResult
        Densities [A/m²], speeds [m/s], reactance voltage [V] and the dimensions used [m].

    References
    ----------
    .. [1] the formulas of this module (Say and Taylor 1986, from memory).
    """
    brushes = brush_set(design)
    low, high = brushes.density_range
    return CommutationResult(
        brush_grade=brushes.grade, brush_count=brushes.count, brush_width_m=brushes.width,
        brush_length_m=brushes.length, commutator_diameter_m=brushes.commutator_diameter,
        estimated_inputs=brushes.estimated,
        brush_current_density_A_per_m2=brush_current_density(rated_current, brushes.count, brushes.width,
                                                             brushes.length),
        brush_density_low_A_per_m2=low, brush_density_high_A_per_m2=high,
        limit_from_project=design.brushes.current_density_limit is not None,
        surface_speed_m_per_s=surface_speed(top_speed, brushes.commutator_diameter),
        reactance_voltage_V=reactance_voltage(rated_current, paths, design.winding.turns_per_coil,
                                              float(design.geometry.stack_length), rated_speed,
                                              brushes.commutator_diameter, brushes.width),
    )
