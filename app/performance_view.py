"""The performance chart's default view, the same on screen and on paper: which torques and how tall.

With a drive current limit the torque axis ends a little past the torque at the limit (the core's
``EnvelopeResult.chart_torque_max_N_m``), and each quantity's axis is as tall as its curves within that
torque range, not as tall as the unlimited stall current or power far outside it: the working range
fills the chart, and the region beyond the limit still shows, shaded. Without a limit the axis runs
to the stall. No Qt here.
"""

from __future__ import annotations

import numpy as np

from pmdc_sizer.core.results import Results

#: Head room above the highest value in view, per quantity (the power curve's peak needs a little more).
HEAD_ROOM = {"speed_rad_per_s": 1.02, "current_A": 1.02, "output_power_W": 1.08, "efficiency": 1.0}


def torque_end(results: Results) -> float:
    """Where the default torque axis ends [N·m]: a little past the drive's limit, else at the highest stall."""
    return max(c.envelope.chart_torque_max_N_m if c.envelope else c.stall_torque_N_m for c in results.cases)


def axis_top(results: Results, quantity: str, torque_to: float) -> float:
    """The top of ``quantity``'s default axis [SI]: its highest value over every case at torques up to
    ``torque_to`` [N·m], with :data:`HEAD_ROOM`; the speed's is the highest no-load speed; efficiency's 1."""
    if quantity == "efficiency":
        return 1.0
    if quantity == "speed_rad_per_s":
        return HEAD_ROOM[quantity] * max(c.no_load_speed_rad_per_s for c in results.cases)
    highest = 0.0
    for case in results.cases:
        torque = np.asarray(case.curve.torque_N_m)
        values = np.asarray(getattr(case.curve, quantity))
        inside = (torque <= torque_to * (1.0 + 1e-9)) & np.isfinite(values)
        if np.any(inside):
            highest = max(highest, float(np.max(values[inside])))
        if torque[-1] > torque_to and torque[0] < torque_to:  # the curve leaves the view: its value at the edge
            highest = max(highest, float(np.interp(torque_to, torque, values)))
    return HEAD_ROOM[quantity] * highest if highest > 0.0 else 1.0


__all__ = ["HEAD_ROOM", "axis_top", "torque_end"]
