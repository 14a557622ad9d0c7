"""The operating envelope a drive's current limit leaves: torque at the limit, the most power inside it.

A motor on a current-limited drive never reaches its stall point: the drive holds the current at the
limit, so the largest torque it gives is the torque at the limit current and the most power it delivers
is the highest output power among the points whose current stays within the limit. These are the
figures to put on a datasheet's first page; the unlimited stall figures stay, named as such. The
charts end a little past the limit (:data:`CHART_MARGIN`) and shade what lies beyond.

References
----------
.. [1] the steady state of :func:`core.performance.operating_points`, read at the current limit; the
   chart margin is our choice, no source.
"""

from __future__ import annotations

import numpy as np

from .performance import MotorModel, operating_points
from .results import CaseResult, EnvelopeResult

#: The charts' torque axis ends this much past the torque at the limit (our choice).
CHART_MARGIN = 0.25


def operating_envelope(model: MotorModel, case: CaseResult, current_limit: float | None) -> EnvelopeResult:
    """The case's envelope under the drive's current limit (the whole curve without one).

    Parameters
    ----------
    model : MotorModel
        The motor at the case's temperatures.
    case : CaseResult
        The case's curve and named points.
    current_limit : float or None
        The drive's current limit [A].

    Returns
    -------
    EnvelopeResult
        Torque at the limit [N·m], the highest output power inside it and where it is [W, N·m, rad/s],
        and the torque at which the charts' default range ends [N·m].

    References
    ----------
    .. [1] module docstring.
    """
    limit_torque = case.current_limit_torque_N_m
    if current_limit is None or limit_torque is None:
        best = case.max_power_point
        return EnvelopeResult(name=case.name, limited=False, torque_limit_N_m=case.stall_torque_N_m,
                              max_output_power_W=best.output_power_W, max_power_torque_N_m=best.torque_N_m,
                              max_power_speed_rad_per_s=best.speed_rad_per_s,
                              chart_torque_max_N_m=case.stall_torque_N_m)
    limit_torque = max(float(limit_torque), 0.0)  # below zero: friction takes all the limit allows
    curve = case.curve
    inside = np.asarray(curve.current_A) <= current_limit
    torques = np.append(np.asarray(curve.torque_N_m)[inside], limit_torque)
    points = operating_points(model, torques)
    power = np.where(np.isfinite(points.output_power), points.output_power, -np.inf)
    index = int(np.argmax(power))
    found = bool(np.isfinite(power[index]))
    chart_end = max((1.0 + CHART_MARGIN) * limit_torque, 0.05 * case.stall_torque_N_m)
    return EnvelopeResult(name=case.name, limited=True, torque_limit_N_m=limit_torque,
                          max_output_power_W=float(power[index]) if found else 0.0,
                          max_power_torque_N_m=float(torques[index]) if found else 0.0,
                          max_power_speed_rad_per_s=float(points.speed[index]) if found else 0.0,
                          chart_torque_max_N_m=min(chart_end, case.stall_torque_N_m))
