"""Thermal ratings from the two-capacity network: the duty's hot state, continuous rating, stall times.

The losses depend on the temperatures (copper resistance per IEC 60028, magnet flux per its
coefficient), so each rating holds the losses at the temperatures it ends at and iterates to a fixed
point: the losses of the duty's hottest moment heat the motor over the whole duty, which errs toward
a hotter winding (the copper loss grows with temperature; our choice, conservative).

* **Duty state** (the hot case): S1 the steady state; S2 the state after the run from ambient; S3 the
  hottest moment of the periodic cycle (end of the on-time). Where S1 has no usable steady state
  (thermal runaway, the rated load stalls the hot motor, or the magnets pass the temperature their data
  reach), the time to the class limit under the rated load from ambient is reported, and the hot case
  is taken at that moment: winding at its class limit, magnets at their temperature then.
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

from collections.abc import Callable
from dataclasses import dataclass

import numpy as np
from scipy.optimize import brentq

from . import thermal_network as tn
from .performance import MotorModel, operating_points, stall_current, stall_torque

#: ``motor_at(winding_C, magnet_C)``: the motor model with its winding and magnets at those temperatures.
MotorAt = Callable[[float, float], MotorModel]

#: The fixed points stop when winding and magnets together move less than this [K] (our choice).
TOLERANCE = 1e-4
#: A winding past this is in runaway, whatever the network says [°C] (our choice).
RUNAWAY_C = 1000.0
#: Torques at which the continuous rating first looks for the winding's limit (our choice).
RATING_SCAN_POINTS = 33


@dataclass(frozen=True)
class Losses:
    """Where the losses of one operating point go in the network."""

    winding: float  #: copper, brush and iron losses, into the winding node [W]
    housing: float  #: friction and drag, into the housing node [W]
    current: float  #: armature current [A]
    reached: bool  #: the torque is below the stall torque at these temperatures


def point_losses(model: MotorModel, torque: float) -> Losses:
    """The losses at a shaft torque, split between the network's nodes (at stall beyond it).

    Parameters
    ----------
    model : MotorModel
        The motor at its temperatures.
    torque : float
        Shaft torque [N·m].

    Returns
    -------
    Losses
        Winding-node and housing-node losses [W], the current [A], and whether the torque is reached.

    References
    ----------
    .. [1] the losses of :func:`core.performance.operating_points` (summation of losses, IEC 60034-2-1).
    """
    stall = float(stall_torque(model))
    p = operating_points(model, min(torque, stall))
    winding = float(p.copper_loss + p.brush_loss + p.iron_loss)
    return Losses(winding=winding, housing=max(float(p.total_loss) - winding, 0.0), current=float(p.current),
                  reached=bool(torque < stall))


@dataclass(frozen=True)
class DutyState:
    """The temperatures at the duty's hottest moment, and how they were found."""

    winding_C: float  #: [°C]
    housing_C: float  #: [°C]
    magnet_C: float  #: [°C]
    losses: Losses  #: at those temperatures
    iterations: int  #: of the fixed point
    steady_state_exists: bool  #: False: runaway, stall at the rated load, or magnets beyond their data
    time_to_limit_s: float | None  #: from ambient under the rated load to the class limit; None if never
    iterated_winding_C: float  #: where the fixed point ended (the state itself, or where it gave up) [°C]


def _temperatures(network: tn.ThermalNetwork, ambient_C: float, rises) -> tuple[float, float, float]:
    winding, housing = float(rises[0]), float(rises[1])
    return (ambient_C + winding, ambient_C + housing,
            ambient_C + float(tn.magnet_rise(network, winding, housing)))


def duty_rises(network: tn.ThermalNetwork, losses: Losses, duty: str, run_time: float,
               cycle_factor: float, cycle_time: float) -> np.ndarray:
    """Rises (θ_w, θ_h) at the duty's hottest moment under constant losses.

    Parameters
    ----------
    network : ThermalNetwork
        The motor's network.
    losses : Losses
        While loaded [W].
    duty : str
        "S1", "S2" or "S3" (IEC 60034-1).
    run_time : float
        Length of the S2 run [s].
    cycle_factor : float
        S3 cycle duration factor, loaded time over cycle time [1].
    cycle_time : float
        S3 cycle duration [s].

    Returns
    -------
    ndarray
        θ_w and θ_h [K].

    References
    ----------
    .. [1] IEC 60034-1 duty types; :func:`thermal_network.steady_rise`, ``rise_at``, ``periodic_rise``.
    """
    if duty == "S1":
        return tn.steady_rise(network, losses.winding, losses.housing)
    if duty == "S2":
        return np.asarray(tn.rise_at(network, losses.winding, losses.housing, run_time)[0])
    on_time = cycle_factor * cycle_time
    return tn.periodic_rise(network, losses.winding, losses.housing, on_time, cycle_time - on_time)


def duty_state(network: tn.ThermalNetwork, ambient_C: float, motor_at: MotorAt, load_torque: float, duty: str,
               run_time: float, cycle_factor: float, cycle_time: float, limit_C: float,
               model_high_C: float, max_iterations: int = 100) -> DutyState:
    """The hot case: the duty's hottest moment at the highest ambient, losses ⇄ temperatures iterated.

    Parameters
    ----------
    network : ThermalNetwork
        The motor's network.
    ambient_C : float
        The highest ambient [°C].
    motor_at : callable
        ``motor_at(winding_C, magnet_C) -> MotorModel``.
    load_torque : float
        The rated shaft torque [N·m].
    duty, run_time, cycle_factor, cycle_time
        As in :func:`duty_rises` [s, 1].
    limit_C : float
        The insulation class temperature [°C].
    model_high_C : float
        Where the magnet grade's temperature model ends [°C].
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
    winding_C = magnet_C = ambient_C
    housing_C = ambient_C
    exists, iterations = False, 0
    losses = point_losses(motor_at(winding_C, magnet_C), load_torque)
    while iterations < max_iterations:
        iterations += 1
        losses = point_losses(motor_at(winding_C, min(magnet_C, model_high_C)), load_torque)
        new = _temperatures(network, ambient_C, duty_rises(network, losses, duty, run_time, cycle_factor,
                                                           cycle_time))
        change = abs(new[0] - winding_C) + abs(new[2] - magnet_C)
        winding_C, housing_C, magnet_C = new
        if change < TOLERANCE:
            exists = losses.reached and magnet_C < model_high_C
            break
        if winding_C > RUNAWAY_C or magnet_C > model_high_C + 100.0:
            break
    continuous_time = time_to_limit(network, ambient_C, motor_at, load_torque, limit_C, model_high_C)
    if exists:
        return DutyState(winding_C, housing_C, magnet_C, losses, iterations, True,
                         None if winding_C <= limit_C else continuous_time, winding_C)
    if not np.isfinite(continuous_time):  # no usable state, yet the winding stays below its limit
        return DutyState(winding_C, housing_C, min(magnet_C, model_high_C), losses, iterations, False, None,
                         winding_C)
    limit_losses = point_losses(motor_at(limit_C, min(magnet_C, model_high_C)), load_torque)
    rises = tn.rise_at(network, limit_losses.winding, limit_losses.housing, continuous_time)[0]
    iterated_C = winding_C
    _, housing_C, magnet_C = _temperatures(network, ambient_C, rises)
    return DutyState(limit_C, housing_C, min(magnet_C, model_high_C), limit_losses, iterations, False,
                     continuous_time, iterated_C)


def time_to_limit(network: tn.ThermalNetwork, ambient_C: float, motor_at: MotorAt, torque: float, limit_C: float,
                  model_high_C: float, initial=(0.0, 0.0)) -> float:
    """Time under a constant shaft torque until the winding reaches ``limit_C``; inf if never.

    Parameters
    ----------
    network : ThermalNetwork
        The motor's network.
    ambient_C : float
        Ambient [°C].
    motor_at : callable
        ``motor_at(winding_C, magnet_C) -> MotorModel``.
    torque : float
        Shaft torque [N·m].
    limit_C : float
        The winding temperature to reach [°C].
    model_high_C : float
        Where the magnet grade's temperature model ends [°C].
    initial : array_like, optional
        Rises of winding and housing at the start [K].

    Returns
    -------
    float
        [s]; the losses are those with the winding at ``limit_C`` and the magnets at their steady
        temperature (capped at ``model_high_C``), the most the run can meet before the limit.

    References
    ----------
    .. [1] :func:`thermal_network.time_to_rise`; the losses' choice errs short (module docstring).
    """
    losses = point_losses(_at_limit(network, ambient_C, motor_at, torque, limit_C, model_high_C), torque)
    return tn.time_to_rise(network, losses.winding, losses.housing, limit_C - ambient_C, initial)


def _at_limit(network: tn.ThermalNetwork, ambient_C: float, motor_at: MotorAt, torque: float, limit_C: float,
              model_high_C: float) -> MotorModel:
    """The motor with its winding at ``limit_C`` and its magnets at the steady state of the losses there."""
    magnet_C = ambient_C
    for _ in range(50):
        losses = point_losses(motor_at(limit_C, min(magnet_C, model_high_C)), torque)
        housing = tn.steady_rise(network, losses.winding, losses.housing)[1]
        new = ambient_C + float(tn.magnet_rise(network, limit_C - ambient_C, housing))
        if abs(new - magnet_C) < TOLERANCE:
            break
        magnet_C = new
    return motor_at(limit_C, min(magnet_C, model_high_C))


@dataclass(frozen=True)
class ContinuousRating:
    """The S1 rating at the highest ambient: the winding's steady state at its class limit."""

    torque: float  #: shaft torque [N·m]; 0 when even no load takes the winding past the limit
    current: float  #: armature current [A]
    speed: float  #: [rad/s]


def continuous_rating(network: tn.ThermalNetwork, ambient_C: float, motor_at: MotorAt, limit_C: float,
                      model_high_C: float) -> ContinuousRating:
    """The shaft torque whose S1 steady state puts the winding exactly at its class limit.

    Parameters
    ----------
    network : ThermalNetwork
        The motor's network.
    ambient_C : float
        The highest ambient [°C].
    motor_at : callable
        ``motor_at(winding_C, magnet_C) -> MotorModel``.
    limit_C : float
        The insulation class temperature [°C].
    model_high_C : float
        Where the magnet grade's temperature model ends [°C].

    Returns
    -------
    ContinuousRating
        Torque [N·m], current [A] and speed [rad/s] at the winding's class limit.

    References
    ----------
    .. [1] IEC 60034-1, rating for continuous duty S1; the winding at its IEC 60085 class limit.
    """

    def model_at(torque: float) -> MotorModel:
        return _at_limit(network, ambient_C, motor_at, torque, limit_C, model_high_C)

    def excess(torque: float) -> float:
        losses = point_losses(model_at(torque), torque)
        return float(tn.steady_rise(network, losses.winding, losses.housing)[0]) - (limit_C - ambient_C)

    top = float(stall_torque(motor_at(limit_C, ambient_C))) * (1.0 - 1e-6)
    torque = 0.0
    if limit_C > ambient_C and top > 0.0:
        # The mechanical losses fall as the speed does: scan for the highest torque still inside the limit.
        grid = np.linspace(0.0, top, RATING_SCAN_POINTS)
        inside = np.flatnonzero([excess(float(t)) <= 0.0 for t in grid])
        if inside.size and inside[-1] == grid.size - 1:
            torque = top
        elif inside.size:
            torque = float(brentq(excess, grid[inside[-1]], grid[inside[-1] + 1], xtol=1e-9))
    p = operating_points(model_at(torque), torque)
    return ContinuousRating(torque=torque, current=float(p.current), speed=float(p.speed))


def stall_time(network: tn.ThermalNetwork, ambient_C: float, motor_at: MotorAt, current_limit: float | None,
               limit_C: float, start_rises=(0.0, 0.0), magnet_C: float | None = None) -> tuple[float, float]:
    """Permitted stall time from a starting state until the winding reaches its class limit.

    Parameters
    ----------
    network : ThermalNetwork
        The motor's network.
    ambient_C : float
        Ambient [°C].
    motor_at : callable
        ``motor_at(winding_C, magnet_C) -> MotorModel`` (only the resistance matters at stall).
    current_limit : float or None
        The drive's limit, which caps the stall current [A].
    limit_C : float
        The insulation class temperature [°C].
    start_rises : array_like, optional
        Rises of winding and housing at the start [K]: zero from cold, the S1 state from hot.
    magnet_C : float, optional
        Magnet temperature for the model (the flux does not change the stall current) [°C].

    Returns
    -------
    tuple of float
        (time [s], stall current at the start [A]); time 0 when the start is at or past the limit.

    References
    ----------
    .. [1] :func:`thermal_network.time_to_rise`; at short times it tends to the adiabatic
       C_w·ΔT/(I²R + Vb·I).
    """
    magnet = ambient_C if magnet_C is None else magnet_C

    def winding_loss(winding_C: float) -> tuple[float, float]:
        model = motor_at(winding_C, magnet)
        current = float(stall_current(model))
        if current_limit is not None:
            current = min(current, current_limit)
        return current**2 * model.resistance + model.brush_drop * current, current

    start_C = ambient_C + float(start_rises[0])
    (loss_start, current), (loss_limit, _) = winding_loss(start_C), winding_loss(limit_C)
    return tn.time_to_rise(network, max(loss_start, loss_limit), 0.0, limit_C - ambient_C, start_rises), current


def duty_transient(network: tn.ThermalNetwork, ambient_C: float, losses: Losses, duty: str, run_time: float,
                   cycle_factor: float, cycle_time: float, samples: int = 121):
    """Temperatures against time over the duty from ambient, under the duty state's losses.

    Parameters
    ----------
    network : ThermalNetwork
        The motor's network.
    ambient_C : float
        Ambient [°C].
    losses : Losses
        While loaded [W].
    duty, run_time, cycle_factor, cycle_time
        As in :func:`duty_rises` [s, 1].
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
    times, rises, start, state = [np.zeros(1)], [np.zeros((1, 2))], 0.0, np.zeros(2)
    for length, on in pieces:
        if length <= 0.0:
            continue
        local = np.linspace(0.0, length, max(round(samples * length / total), 4))[1:]
        piece = tn.rise_at(network, losses.winding if on else 0.0, losses.housing if on else 0.0, local, state)
        times.append(start + local)
        rises.append(piece)
        start, state = start + length, piece[-1]
    time, rise = np.concatenate(times), np.concatenate(rises)
    magnet = tn.magnet_rise(network, rise[:, 0], rise[:, 1])
    return time, ambient_C + rise[:, 0], ambient_C + rise[:, 1], ambient_C + magnet
