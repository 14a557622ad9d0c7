"""The duty's hot state at the highest ambient (S1, S2, S3), the time to the class limit, and the transient.

The losses depend on the temperatures, so the hot state holds the losses at the temperatures it ends at
and iterates to a fixed point: the losses of the duty's hottest moment heat the motor over the whole duty,
which errs toward a hotter winding (our choice, conservative). S1 is the steady state; S2 the state after
the run from ambient; S3 the hottest moment of the periodic cycle (end of the on-time). Where S1 has no
usable steady state (thermal runaway, the rated load stalls the hot motor, or the magnets pass the
temperature their data reach), the time to the class limit under the rated load from ambient is reported,
and the hot case is taken at that moment: winding at its class limit, magnets at their temperature then.

References
----------
.. [1] IEC 60034-1, duty types S1, S2, S3.
.. [2] IEC 60085, thermal classes (the class number is the limiting temperature in °C).
.. [3] the network of :mod:`core.thermal_network` (lumped capacities, Incropera, from memory).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from . import thermal_network as tn
from .performance import MotorModel
from .shared_docs import shared_parameters
from .thermal_losses import BATCH_PARAMETERS, TOLERANCE, Losses, MotorAt, point_losses, take

#: A winding past this is in runaway, whatever the network says [°C] (our choice).
RUNAWAY_C = 1000.0
#: Duty types by code, as the arrays carry them.
DUTY_CODES = {"S1": 1, "S2": 2, "S3": 3}


@dataclass(frozen=True)
class DutyState:
    """The temperatures at the duty's hottest moment, and how they were found (arrays over a batch)."""

    winding_C: np.ndarray  #: [°C]
    housing_C: np.ndarray  #: [°C]
    magnet_C: np.ndarray  #: [°C]
    losses: Losses  #: at those temperatures
    iterations: np.ndarray  #: of the fixed point
    steady_state_exists: np.ndarray  #: False: runaway, stall at the rated load, or magnets beyond their data
    time_to_limit_s: np.ndarray  #: from ambient under the rated load to the class limit; NaN if not reported
    iterated_winding_C: np.ndarray  #: where the fixed point ended (the state itself, or where it gave up) [°C]


def _temperatures(network: tn.ThermalNetwork, ambient_C, rises):
    winding, housing = rises[0], rises[1]
    return ambient_C + winding, ambient_C + housing, ambient_C + tn.magnet_rise(network, winding, housing)


@shared_parameters(BATCH_PARAMETERS)
def duty_rises(network: tn.ThermalNetwork, losses: Losses, duty, run_time, cycle_factor, cycle_time) -> np.ndarray:
    """Rises (θ_w, θ_h) at the duty's hottest moment under constant losses.

    Returns
    -------
    ndarray
        θ_w and θ_h [K], first axis of length 2.

    References
    ----------
    .. [1] IEC 60034-1 duty types; :func:`thermal_network.steady_rise`, ``rise_after``, ``periodic_rise``.
    """
    code = np.asarray(DUTY_CODES[duty] if isinstance(duty, str) else duty)
    rises = tn.steady_rise(network, losses.winding, losses.housing)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        if np.any(code == 2):
            rises = np.where(code == 2, tn.rise_after(network, losses.winding, losses.housing, run_time), rises)
        if np.any(code == 3):
            on_time = cycle_factor * cycle_time
            rises = np.where(code == 3, tn.periodic_rise(network, losses.winding, losses.housing, on_time,
                                                         cycle_time - on_time), rises)
    return rises


@shared_parameters(BATCH_PARAMETERS)
def duty_state(network: tn.ThermalNetwork, rows: np.ndarray, ambient_C, motor_at: MotorAt, load_torque, duty,
               run_time, cycle_factor, cycle_time, limit_C, model_high_C, max_iterations: int = 100) -> DutyState:
    """The hot case: the duty's hottest moment at the highest ambient, losses ⇄ temperatures iterated.

    Parameters
    ----------
    network : ThermalNetwork
        The motors' network, fields of the shape of ``rows``.
    ambient_C : ndarray
        The highest ambient [°C].
    load_torque : ndarray
        The rated shaft torque [N·m].
    max_iterations : int, optional
        Give up after this many iterations [1].

    Returns
    -------
    DutyState
        The duty's temperatures; where none exists (module docstring) the moment the winding reaches
        its class limit under the rated load from ambient, with that time.

    References
    ----------
    .. [1] IEC 60034-1 duty types; the fixed point and its conservative choice of losses (module
       docstring).
    """
    ambient, torque, high, limit = (np.broadcast_to(np.asarray(v, dtype=float), rows.shape)
                                    for v in (ambient_C, load_torque, model_high_C, limit_C))
    code = np.broadcast_to(np.asarray(DUTY_CODES[duty] if isinstance(duty, str) else duty), rows.shape)
    run, factor, cycle = (np.broadcast_to(np.asarray(v, dtype=float), rows.shape)
                          for v in (run_time, cycle_factor, cycle_time))
    winding_C, housing_C, magnet_C = ambient.copy(), ambient.copy(), ambient.copy()
    exists = np.zeros(rows.shape, dtype=bool)
    iterations = np.zeros(rows.shape, dtype=int)
    losses = point_losses(motor_at(rows, winding_C, magnet_C), torque)
    active = np.ones(rows.shape, dtype=bool)
    for _ in range(max_iterations):
        index = np.flatnonzero(active)
        if index.size == 0:
            break
        iterations[index] += 1
        part = take(network, index)
        found = point_losses(motor_at(rows[index], winding_C[index], np.minimum(magnet_C[index], high[index])),
                             torque[index])
        new_w, new_h, new_m = _temperatures(part, ambient[index], duty_rises(
            part, found, code[index], run[index], factor[index], cycle[index]))
        change = np.abs(new_w - winding_C[index]) + np.abs(new_m - magnet_C[index])
        winding_C[index], housing_C[index], magnet_C[index] = new_w, new_h, new_m
        for name in ("winding", "housing", "current", "reached"):
            getattr(losses, name)[index] = getattr(found, name)
        settled = change < TOLERANCE
        exists[index[settled]] = found.reached[settled] & (new_m[settled] < high[index][settled])
        gone = ~settled & ((new_w > RUNAWAY_C) | (new_m > high[index] + 100.0))
        active[index[settled | gone]] = False
    continuous_time = time_to_limit(network, rows, ambient, motor_at, torque, limit, high)
    iterated_C = winding_C.copy()
    reported_time = np.where(exists & (winding_C > limit), continuous_time, np.nan)
    magnet_C = np.where(exists, magnet_C, np.minimum(magnet_C, high))
    limited = ~exists & np.isfinite(continuous_time)
    if limited.any():
        index = np.flatnonzero(limited)
        part = take(network, index)
        at_limit = point_losses(motor_at(rows[index], limit[index], np.minimum(magnet_C[index], high[index])),
                                torque[index])
        rises = tn.rise_after(part, at_limit.winding, at_limit.housing, continuous_time[index])
        _, limit_h, limit_m = _temperatures(part, ambient[index], rises)
        winding_C[index], housing_C[index] = limit[index], limit_h
        magnet_C[index] = np.minimum(limit_m, high[index])
        for name in ("winding", "housing", "current", "reached"):
            getattr(losses, name)[index] = getattr(at_limit, name)
        reported_time[index] = continuous_time[index]
    return DutyState(winding_C, housing_C, magnet_C, losses, iterations, exists, reported_time, iterated_C)


@shared_parameters(BATCH_PARAMETERS)
def time_to_limit(network: tn.ThermalNetwork, rows: np.ndarray, ambient_C, motor_at: MotorAt, torque, limit_C,
                  model_high_C, initial=(0.0, 0.0)) -> np.ndarray:
    """Time under a constant shaft torque until the winding reaches ``limit_C``; inf if never.

    Parameters
    ----------
    limit_C : ndarray
        The winding temperature to reach [°C].
    initial : array_like, optional
        Rises of winding and housing at the start [K].

    Returns
    -------
    ndarray
        [s]; the losses are those with the winding at ``limit_C`` and the magnets at their steady
        temperature (capped at ``model_high_C``), the most the run can meet before the limit.

    References
    ----------
    .. [1] :func:`thermal_network.time_to_rise`; the losses' choice errs short (module docstring).
    """
    losses = point_losses(motor_at_limit(network, rows, ambient_C, motor_at, torque, limit_C, model_high_C), torque)
    return np.asarray(tn.time_to_rise(network, losses.winding, losses.housing, limit_C - ambient_C, initial))


@shared_parameters(BATCH_PARAMETERS)
def motor_at_limit(network: tn.ThermalNetwork, rows: np.ndarray, ambient_C, motor_at: MotorAt, torque, limit_C,
                   model_high_C) -> MotorModel:
    """The motors with their windings at ``limit_C`` and their magnets at the steady state of the losses there.

    Parameters
    ----------
    limit_C : ndarray
        The winding temperature [°C].
    model_high_C : ndarray
        Where the magnet grade's temperature model ends; the magnets are capped there [°C].

    Returns
    -------
    MotorModel
        The motors at those temperatures.

    References
    ----------
    .. [1] :func:`thermal_network.steady_rise` and ``magnet_rise``: the magnet's temperature T is the fixed
       point of T = g(T), the steady state of the losses at T, found to :data:`TOLERANCE` by the secant
       method on g(T) - T after a first plain step T = g(T). The plain iteration converges only
       linearly: the ferrite demo's magnets lose 0.2 % of their flux per kelvin, so each kelvin raises
       the current and the losses again. A secant step is taken only where it goes the plain step's way,
       between 0.05 and 20 times as far (the fixed point of a map of slope q lies 1/(1 - q) plain steps
       away, so this admits slopes from -19 to 0.95); elsewhere the plain step.
    """
    ambient, torque, limit, high = (np.broadcast_to(np.asarray(v, dtype=float), rows.shape)
                                    for v in (ambient_C, torque, limit_C, model_high_C))

    def steady_magnet(index, magnet_C):
        """g(T): the magnet's temperature at the steady state of the losses with the magnet at T."""
        part = take(network, index)
        losses = point_losses(motor_at(rows[index], limit[index], np.minimum(magnet_C, high[index])),
                              torque[index])
        housing = tn.steady_rise(part, losses.winding, losses.housing)[1]
        return ambient[index] + tn.magnet_rise(part, limit[index] - ambient[index], housing)

    magnet_C = ambient.copy()
    previous, previous_gap = np.full(rows.shape, np.nan), np.full(rows.shape, np.nan)
    active = np.ones(rows.shape, dtype=bool)
    for _ in range(50):
        index = np.flatnonzero(active)
        if index.size == 0:
            break
        now = magnet_C[index]
        gap = steady_magnet(index, now) - now
        settled = np.abs(gap) < TOLERANCE
        with np.errstate(divide="ignore", invalid="ignore"):
            secant = now - gap * (now - previous[index]) / (gap - previous_gap[index])
            reach = (secant - now) / gap  # in plain steps
        step = np.where(np.isfinite(reach) & (reach >= 0.05) & (reach <= 20.0), secant, now + gap)
        previous[index], previous_gap[index] = now, gap
        magnet_C[index[~settled]] = step[~settled]
        active[index[settled]] = False
    return motor_at(rows, limit, np.minimum(magnet_C, high))


@shared_parameters(BATCH_PARAMETERS)
def duty_transient(network: tn.ThermalNetwork, ambient_C: float, losses: Losses, duty: str, run_time: float,
                   cycle_factor: float, cycle_time: float, samples: int = 121):
    """Temperatures against time over the duty from ambient, under the duty state's losses (one design).

    Parameters
    ----------
    network : ThermalNetwork
        The motor's network (float fields).
    ambient_C : float
        Ambient [°C].
    losses : Losses
        While loaded [W] (0-d or one-element arrays).
    samples : int, optional
        Points of the time axis [1].

    Returns
    -------
    tuple of ndarray
        Time [s], winding, housing and magnet temperatures [°C]. S1 runs to four slow time constants;
        S2 the run and as long again de-energized; S3 as many cycles as fit in four slow time
        constants (at least three, at most forty).

    References
    ----------
    .. [1] :func:`thermal_network.rise_at`, piece by piece (IEC 60034-1 duty diagrams).
    """
    slow = tn.time_constants(network)[1]
    if duty == "S1":
        pieces = [(4.0 * slow, True)]
    elif duty == "S2":
        pieces = [(run_time, True), (run_time, False)]
    else:
        cycles = int(min(max(np.ceil(4.0 * slow / cycle_time), 3), 40))
        on_time = cycle_factor * cycle_time
        pieces = [(on_time, True), (cycle_time - on_time, False)] * cycles
    total = sum(length for length, _ in pieces)
    winding_loss, housing_loss = float(np.ravel(losses.winding)[0]), float(np.ravel(losses.housing)[0])
    times, rises, start, state = [np.zeros(1)], [np.zeros((1, 2))], 0.0, np.zeros(2)
    for length, on in pieces:
        if length <= 0.0:
            continue
        local = np.linspace(0.0, length, max(round(samples * length / total), 4))[1:]
        piece = tn.rise_at(network, winding_loss if on else 0.0, housing_loss if on else 0.0, local, state)
        times.append(start + local)
        rises.append(piece)
        start, state = start + length, piece[-1]
    time, rise = np.concatenate(times), np.concatenate(rises)
    magnet = tn.magnet_rise(network, rise[:, 0], rise[:, 1])
    return time, ambient_C + rise[:, 0], ambient_C + rise[:, 1], ambient_C + magnet


__all__ = ["DUTY_CODES", "RUNAWAY_C", "DutyState", "duty_rises", "duty_state", "duty_transient", "motor_at_limit",
           "time_to_limit"]
