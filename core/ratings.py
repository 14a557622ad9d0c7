"""Thermal ratings from the two-capacity network: the continuous rating and the permitted stall times.

The duty's hot state and transient are computed in :mod:`core.thermal_duty`, the losses of a point in
:mod:`core.thermal_losses`; both are re-exported here, the three together being the ratings the
results carry (:mod:`core.thermal_ratings`).

The losses depend on the temperatures (copper resistance per IEC 60028, magnet flux per its
coefficient), so each rating holds the losses at the temperatures it ends at and iterates to a fixed
point: the losses of the duty's hottest moment heat the motor over the whole duty, which errs toward
a hotter winding (the copper loss grows with temperature; our choice, conservative).

* **Continuous rating** (S1, highest ambient): the shaft torque at which the winding's steady state is
  its class limit, and its current.
* **Permitted stall time**: from ambient (cold) and from the S1 hot state, how long the rotor may be held
  at stall (at the drive's limit if it has one) before the winding reaches its class limit. The stall
  loss is taken as the larger of its values at the start and at the limit temperature (with a limiter
  I²R grows with R; without, V²/R falls), so the time errs short.

References
----------
.. [1] IEC 60034-1, rating and duty types S1, S2, S3.
.. [2] IEC 60085, thermal classes (the class number is the limiting temperature in °C).
.. [3] the network of :mod:`core.thermal_network` (lumped capacities, Incropera, from memory).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from . import thermal_network as tn
from .performance import MotorModel, operating_points, stall_current, stall_torque
from .shared_docs import shared_parameters
from .solvers import find_root
from .thermal_duty import (
    DUTY_CODES,
    RUNAWAY_C,
    DutyState,
    duty_rises,
    duty_state,
    duty_transient,
    motor_at_limit,
    time_to_limit,
)
from .thermal_losses import BATCH_PARAMETERS, TOLERANCE, Losses, MotorAt, point_losses, take

#: Torques at which the continuous rating first looks for the winding's limit (our choice).
RATING_SCAN_POINTS = 33


@dataclass(frozen=True)
class ContinuousRating:
    """The S1 rating at the highest ambient: the winding's steady state at its class limit (arrays)."""

    torque: np.ndarray  #: shaft torque [N·m]; 0 when even no load takes the winding past the limit
    current: np.ndarray  #: armature current [A]
    speed: np.ndarray  #: [rad/s]


@shared_parameters(BATCH_PARAMETERS)
def continuous_rating(network: tn.ThermalNetwork, rows: np.ndarray, ambient_C, motor_at: MotorAt, limit_C,
                      model_high_C) -> ContinuousRating:
    """The shaft torque whose S1 steady state puts the winding exactly at its class limit.

    Parameters
    ----------
    ambient_C : ndarray
        The highest ambient [°C].

    Returns
    -------
    ContinuousRating
        Torque [N·m], current [A] and speed [rad/s] at the winding's class limit.

    References
    ----------
    .. [1] IEC 60034-1, rating for continuous duty S1; the winding at its IEC 60085 class limit. The
       root between the scan's last torque inside the limit and the next by Chandrupatla's method
       (core.solvers).
    """
    ambient, limit, high = (np.broadcast_to(np.asarray(v, dtype=float), rows.shape)
                            for v in (ambient_C, limit_C, model_high_C))

    def model_at(index, torque) -> MotorModel:
        return motor_at_limit(take(network, index), rows[index], ambient[index], motor_at, torque, limit[index],
                         high[index])

    def excess(index, torque):
        losses = point_losses(model_at(index, torque), torque)
        return tn.steady_rise(take(network, index), losses.winding, losses.housing)[0] - (limit[index] - ambient[index])

    top = stall_torque(motor_at(rows, limit, ambient)) * (1.0 - 1e-6)
    torque = np.zeros(rows.shape)
    scanned = np.flatnonzero((limit > ambient) & (top > 0.0))
    if scanned.size:
        # The mechanical losses fall as the speed does: scan for the highest torque still inside the limit.
        grid = np.linspace(0.0, top[scanned], RATING_SCAN_POINTS, axis=-1)
        inside = (excess(np.repeat(scanned, RATING_SCAN_POINTS), grid.ravel()) <= 0.0).reshape(grid.shape)
        points = np.arange(RATING_SCAN_POINTS)
        last = np.where(inside, points, -1).max(axis=-1)
        torque[scanned[last == RATING_SCAN_POINTS - 1]] = top[scanned[last == RATING_SCAN_POINTS - 1]]
        between = np.flatnonzero((last >= 0) & (last < RATING_SCAN_POINTS - 1))
        if between.size:
            index = scanned[between]
            low = grid[between, last[between]]
            high_torque = grid[between, last[between] + 1]
            torque[index] = find_root(lambda t: excess(index, t), low, high_torque, xtol=1e-15, rtol=1e-12,
                                      max_iterations=100).root
    p = operating_points(model_at(np.arange(rows.size), torque), torque)
    return ContinuousRating(torque=torque, current=np.asarray(p.current, dtype=float),
                            speed=np.asarray(p.speed, dtype=float))


@shared_parameters(BATCH_PARAMETERS)
def stall_time(network: tn.ThermalNetwork, rows: np.ndarray, ambient_C, motor_at: MotorAt, current_limit, limit_C,
               start_rises=(0.0, 0.0), magnet_C=None) -> tuple[np.ndarray, np.ndarray]:
    """Permitted stall time from a starting state until the winding reaches its class limit.

    Parameters
    ----------
    motor_at : callable
        ``motor_at(rows, winding_C, magnet_C) -> MotorModel`` (only the resistance matters at stall).
    current_limit : ndarray
        The drive's limit, which caps the stall current [A]; NaN without one.
    start_rises : array_like, optional
        Rises of winding and housing at the start [K]: zero from cold, the S1 state from hot.
    magnet_C : ndarray, optional
        Magnet temperature for the model (the flux does not change the stall current) [°C].

    Returns
    -------
    tuple of ndarray
        (time [s], stall current at the start [A]); time 0 when the start is at or past the limit.

    References
    ----------
    .. [1] :func:`thermal_network.time_to_rise`; at short times it tends to the adiabatic
       C_w·ΔT/(I²R + Vb·I).
    """
    ambient = np.broadcast_to(np.asarray(ambient_C, dtype=float), rows.shape)
    magnet = ambient if magnet_C is None else magnet_C
    limit = np.broadcast_to(np.asarray(current_limit, dtype=float), rows.shape)

    def winding_loss(winding_C):
        model = motor_at(rows, np.broadcast_to(winding_C, rows.shape), magnet)
        current = np.asarray(stall_current(model), dtype=float)
        current = np.where(np.isnan(limit), current, np.minimum(current, limit))
        return current**2 * model.resistance + model.brush_drop * current, current

    start_w, start_h = (np.asarray(v, dtype=float) for v in start_rises)
    (loss_start, current), (loss_limit, _) = winding_loss(ambient + start_w), winding_loss(limit_C)
    time = tn.time_to_rise(network, np.maximum(loss_start, loss_limit), 0.0, limit_C - ambient, (start_w, start_h))
    return np.asarray(time), current


__all__ = ["DUTY_CODES", "RATING_SCAN_POINTS", "RUNAWAY_C", "TOLERANCE", "ContinuousRating", "DutyState", "Losses",
           "MotorAt", "continuous_rating", "duty_rises", "duty_state", "duty_transient", "point_losses",
           "stall_time", "take", "time_to_limit"]
