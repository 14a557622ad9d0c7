"""The further load points a motor must reach: the speed at each point's torque, and whether it is met.

A point (torque, speed) of ``load.further_points`` is met in a temperature case when its torque is below
the case's stall torque and the steady speed at that torque is at least the point's speed, the same
rule as the rated point (:mod:`core.checks`). :func:`core.evaluate.evaluate` (one design, the points
together) and :func:`core.batch.evaluate_many` (many designs, one point at a time) both read these two
functions, so the check and the batch status agree.

References
----------
.. [1] the steady state of :func:`core.performance.operating_points`.
"""

from __future__ import annotations

import numpy as np

from .performance import MotorModel, operating_points

#: A speed within this share below the required one still meets it (the rated point's rounding).
SPEED_TOLERANCE = 1e-9


def point_speeds(model: MotorModel, stall_torque: float | np.ndarray, torques: float | np.ndarray) -> np.ndarray:
    """The steady speed at each point's torque; NaN where the torque is at or beyond stall (not reached).

    Parameters
    ----------
    model : MotorModel
        The motor at one case's temperatures (floats, or arrays over designs).
    stall_torque : float or ndarray
        The case's stall torque [N·m].
    torques : float or ndarray
        The points' shaft torques [N·m]: several for one design, or one per design.

    Returns
    -------
    ndarray
        Speeds [rad/s], the shape of ``torques``.

    References
    ----------
    .. [1] module docstring.
    """
    torques = np.asarray(torques, dtype=float)
    reached = torques < stall_torque
    speed = operating_points(model, np.minimum(torques, stall_torque)).speed
    return np.asarray(np.where(reached, speed, np.nan), dtype=float)


def points_met(speeds: np.ndarray, required_speeds: float | np.ndarray) -> np.ndarray:
    """Whether each point is met: reached, and at least its required speed.

    Parameters
    ----------
    speeds : ndarray
        What :func:`point_speeds` gave [rad/s].
    required_speeds : float or ndarray
        The points' required speeds [rad/s].

    Returns
    -------
    ndarray of bool
        The shape of ``speeds``.

    References
    ----------
    .. [1] module docstring.
    """
    speeds = np.asarray(speeds, dtype=float)
    with np.errstate(invalid="ignore"):
        return np.asarray(np.isfinite(speeds) & (speeds >= np.asarray(required_speeds) * (1.0 - SPEED_TOLERANCE)),
                          dtype=bool)


__all__ = ["SPEED_TOLERANCE", "point_speeds", "points_met"]
