"""The further load points a motor must reach: the speed at each point's torque, and whether it is met.

A point (torque, speed) of ``load.further_points`` is met in a temperature case when its torque is below
the case's stall torque and the steady speed at that torque is at least the point's speed, the same
rule as the rated point (:mod:`core.checks`). :func:`core.evaluate.evaluate` (one design, the points
together) and :func:`core.batch.evaluate_many` (many designs, one point at a time) both read these two
functions, so the check and the batch status agree; :func:`points_met_many` runs them over a batch.

References
----------
.. [1] the steady state of :func:`core.performance.operating_points`.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence

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


def points_met_many(load_points: Sequence[Sequence[tuple[float, float]]], models: Mapping[str, MotorModel],
                    stall_torques: Mapping[str, np.ndarray]) -> tuple[np.ndarray, np.ndarray]:
    """Whether each design meets all its further points at every case, and the least share of a point's
    required speed it reaches: many designs, one point at a time.

    Parameters
    ----------
    load_points : sequence of sequences of (float, float)
        Each design's further points, (torque [N·m], required speed [rad/s]); any number per design.
    models : mapping of str to MotorModel
        Each temperature case's motor, arrays over the designs.
    stall_torques : mapping of str to ndarray
        Each case's stall torque per design [N·m] (the keys of ``models``).

    Returns
    -------
    met : ndarray of bool
        True where every point is met in every case (also without points).
    least_share : ndarray
        The least speed over required speed [1] over the points and cases; NaN without points, 0 where a
        torque is beyond stall.

    References
    ----------
    .. [1] module docstring.
    """
    n = len(load_points)
    met = np.ones(n, dtype=bool)
    least = np.full(n, np.nan)
    for j in range(max((len(points) for points in load_points), default=0)):
        has = np.array([len(points) > j for points in load_points])
        torque = np.array([points[j][0] if len(points) > j else 0.0 for points in load_points])
        required = np.array([points[j][1] if len(points) > j else 0.0 for points in load_points])
        for name, model in models.items():
            speed = point_speeds(model, stall_torques[name], torque)
            met &= ~has | points_met(speed, required)
            with np.errstate(invalid="ignore", divide="ignore"):
                share = np.where(np.isfinite(speed), speed / np.where(required > 0, required, np.inf), 0.0)
            share = np.where(required > 0, share, np.inf)
            least = np.where(has, np.fmin(least, share), least)
    least = np.where(np.isinf(least), np.nan, least)
    return met, least


__all__ = ["SPEED_TOLERANCE", "point_speeds", "points_met", "points_met_many"]
