"""Steady-state performance at the supply voltage, from no load to stall.

Circuit: V = Vb + R·I + K·ω (constant brush drop Vb). Torque balance: K·I = T + T_loss(ω) with

    T_loss(ω) = Tf + Th + (Bv + Be)·ω + Bx·√ω

where Tf is friction, Bv viscous drag, and Th, Be, Bx are the hysteresis, eddy and excess parts of the
armature's iron loss written as torques (P_iron = Th·ω + Be·ω² + Bx·ω^1.5, see :func:`iron_loss_terms`).
Substituting I gives a quadratic in s = √ω with a closed-form root, so speed at any torque needs no
iteration:

    (K²/R + Bv + Be)·s² + Bx·s - (K·(V - Vb)/R - Tf - Th - T) = 0.

Flux that falls with current. When the model carries a table of Ke against current (the armature's
reaction on saturating teeth and pole tips lowers the flux per pole, core.reluctance_network), the
constant is Ke(I) = K·Φ(I), interpolated linearly in I² between the table's currents, and Kt = Ke(I) at every
current. The speed at a torque is then no longer closed form: each point is found from its current, I
solving K·Φ(I)·I - T_loss(ω(I)) = T with ω(I) = (V - Vb - R·I)/(K·Φ(I)), by a bracketed root finder
between the no-load and the stall current (vectorised). Every figure follows from I, so the power
balance V·I = T·ω + losses still closes exactly.

Losses are summed per IEC 60034-2-1 (efficiency by summation of losses): input V·I equals output T·ω
plus copper, brush, friction, viscous and iron losses, exactly.

References
----------
.. [1] textbook DC-motor circuit and torque balance, E = K·ω and T = K·I (S. J. Chapman, Electric
   Machinery Fundamentals, 5th ed., 2012, ch. 9, from memory); the quadratic in √ω is our derivation.
.. [2] IEC 60034-2-1, determination of efficiency by summation of losses.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, fields

import numpy as np

from .motor_model import (  # noqa: F401 (re-exported: the callers import them from here)
    MOTOR_PARAMETERS,
    IronLossTerms,
    MotorModel,
    constant_at,
    current_at_torque,
    iron_loss_terms,
    loss_torque,
    shaft_torque_at_current,
    speed_at_current,
    speed_at_torque,
    stall_current,
    stall_torque,
)
from .shared_docs import parameter_table, shared_parameters


@dataclass(frozen=True)
class OperatingPoints:
    """Steady state at each given shaft torque (SI arrays)."""

    torque: np.ndarray  #: shaft torque [N·m]
    speed: np.ndarray  #: [rad/s]
    current: np.ndarray  #: [A]
    input_power: np.ndarray  #: V·I [W]
    output_power: np.ndarray  #: T·ω [W]
    copper_loss: np.ndarray  #: I²·R [W]
    brush_loss: np.ndarray  #: Vb·I [W]
    friction_loss: np.ndarray  #: Tf·ω [W]
    viscous_loss: np.ndarray  #: Bv·ω² [W]
    iron_loss: np.ndarray  #: [W]
    efficiency: np.ndarray  #: output/input [1]

    @property
    def total_loss(self):
        """Copper, brush, friction, viscous and iron losses [W]: input less output power."""
        return self.copper_loss + self.brush_loss + self.friction_loss + self.viscous_loss + self.iron_loss


@shared_parameters(MOTOR_PARAMETERS)
def operating_points(model: MotorModel, torque: float | np.ndarray) -> OperatingPoints:
    """The steady state at the given shaft torques (from no load to stall): speed, current, powers, losses.

    Parameters
    ----------
    torque : float or ndarray
        Shaft torque [N·m], at most the stall torque.

    Returns
    -------
    OperatingPoints
        Arrays of the shape of ``torque``, SI; the efficiency is 0 where the input power is not positive.

    References
    ----------
    .. [1] IEC 60034-2-1 (efficiency by summation of losses); the circuit of the module docstring.
    """
    m = model
    torque = np.asarray(torque, dtype=float)
    if m.constant_table is None:
        speed = speed_at_torque(m, torque)
        current = (m.voltage - m.brush_drop - m.constant * speed) / m.resistance
    else:
        current = current_at_torque(m, torque)
        speed = speed_at_current(m, current)
        # the torque this current gives, so that T·ω and the losses balance V·I to rounding
        torque = np.where(speed > 0.0, np.maximum(shaft_torque_at_current(m, current), 0.0), torque)
    input_power = m.voltage * current
    output_power = torque * speed
    with np.errstate(divide="ignore", invalid="ignore"):
        efficiency = np.where(input_power > 0.0, np.maximum(output_power / input_power, 0.0), 0.0)
    return OperatingPoints(
        torque=torque,
        speed=speed,
        current=current,
        input_power=input_power,
        output_power=output_power,
        copper_loss=current**2 * m.resistance,
        brush_loss=m.brush_drop * current,
        friction_loss=m.friction_torque * speed,
        viscous_loss=m.viscous_coeff * speed**2,
        iron_loss=m.iron.power(speed),
        efficiency=efficiency,
    )


def refined_maxima(model: MotorModel, stall, values_of: tuple[Callable[[OperatingPoints], np.ndarray], ...],
                   samples: int = 64, rounds: int = 3) -> np.ndarray:
    """Torques of the maxima of each ``values_of(points)`` by a grid search refined around the best cell.

    The grids of every maximum (and of every motor, for a model of arrays) are solved in one call of
    :func:`operating_points` per round (each point's root does not depend on the others', so this is the
    same as one search after the other).

    Parameters
    ----------
    model : MotorModel
        The motor at one case's temperatures, or many (array fields of shape (N,), tables (N, P)).
    stall : float or ndarray
        Stall torque [N·m], of the model's shape; where it is not positive the maxima are at 0.
    values_of : tuple of callable
        What to maximise, each read off the operating points (efficiency, output power, ...).
    samples : int, optional
        Torques of each grid [1].
    rounds : int, optional
        Refinements around the best cell [1].

    Returns
    -------
    ndarray
        Shape (len(values_of), *stall's shape): the torques of the maxima [N·m].

    References
    ----------
    .. [1] our numerical choice: a uniform grid from no load to stall, refined ``rounds`` times to the
       cells beside its best point (no source).
    """
    stall = np.asarray(stall, dtype=float)
    count = len(values_of)
    # the motors' values along a leading axis of maxima and a trailing axis of the grid's torques
    grid_model = model if stall.ndim == 0 else _with_grid_axis(model)
    low, high = np.zeros((count, *stall.shape)), np.broadcast_to(stall, (count, *stall.shape))
    best = np.zeros((count, *stall.shape))
    for _ in range(rounds + 1):
        torque = np.linspace(low, high, samples, axis=-1)
        points = operating_points(grid_model, torque)
        index = np.stack([np.argmax(values(points)[k], axis=-1) for k, values in enumerate(values_of)])
        best = np.take_along_axis(torque, index[..., None], axis=-1)[..., 0]
        step = (high - low) / (samples - 1)
        low, high = np.maximum(best - step, 0.0), np.minimum(best + step, stall)
    return np.where(stall > 0.0, best, 0.0)


def _with_grid_axis(model: MotorModel) -> MotorModel:
    """The motors of a model of arrays with a trailing axis on every array, to broadcast over a grid."""
    def lifted(value):
        return np.asarray(value)[..., None] if np.ndim(value) else value

    iron = IronLossTerms(*(lifted(getattr(model.iron, f.name)) for f in fields(model.iron)))
    table = model.constant_table
    return MotorModel(voltage=lifted(model.voltage), brush_drop=lifted(model.brush_drop),
                      resistance=lifted(model.resistance), constant=lifted(model.constant),
                      friction_torque=lifted(model.friction_torque), viscous_coeff=lifted(model.viscous_coeff),
                      iron=iron, constant_table=None if table is None else
                      (np.asarray(table[0])[..., None, :], np.asarray(table[1])[..., None, :]))


#: What the named maxima of a speed-torque curve maximise: the efficiency, then the output power.
MAXIMA = (lambda p: p.efficiency, lambda p: p.output_power)


def _point(points: OperatingPoints, index: int) -> OperatingPoints:
    """One point of a set of operating points (0-d fields)."""
    return OperatingPoints(**{f.name: np.asarray(getattr(points, f.name))[index] for f in fields(points)})


@dataclass(frozen=True)
class SpeedTorqueCurve:
    """A whole speed-torque characteristic at one temperature case, with its named points."""

    curve: OperatingPoints  #: from no load (first) to stall (last), denser toward no load (see below)
    no_load: OperatingPoints  #: T = 0
    stall: OperatingPoints  #: ω = 0
    max_efficiency: OperatingPoints
    max_power: OperatingPoints
    rated: OperatingPoints  #: at the load torque (at stall if the load is beyond it)
    rated_reached: bool  #: False when the load torque is at or beyond stall
    speed_torque_gradient: float  #: no-load speed over stall torque [rad/s per N·m], positive


@shared_parameters(MOTOR_PARAMETERS)
def speed_torque_curve(model: MotorModel, rated_torque: float, samples: int = 200) -> SpeedTorqueCurve:
    """The characteristic from no load to stall and its named points.

    The torques are spaced quadratically, T_i = T_stall·(i/(n-1))², so the working region near no load,
    where a small motor runs at a few per cent of its stall torque, gets most of the points. The maximum
    efficiency and maximum power points come from a grid search refined three times around the best
    cell (our numerical choice).

    Parameters
    ----------
    rated_torque : float
        The load's shaft torque [N·m].
    samples : int, optional
        Points of the curve, no load to stall [1].

    Returns
    -------
    SpeedTorqueCurve
        The curve, the no-load, stall, maximum-efficiency, maximum-power and rated points, and the
        speed-torque gradient [rad/s per N·m] (infinite when the stall torque is 0).
    """
    stall = float(stall_torque(model))
    curve = operating_points(model, stall * np.linspace(0.0, 1.0, samples) ** 2)
    eta_torque, power_torque = (float(t) for t in refined_maxima(model, stall, MAXIMA))
    # the named points in one call (each point's root is its own: the same as one call each)
    named = operating_points(model, np.array([0.0, stall, eta_torque, power_torque, min(rated_torque, stall)]))
    no_load = _point(named, 0)
    gradient = float(no_load.speed) / stall if stall > 0.0 else float("inf")
    rated_reached = rated_torque < stall
    return SpeedTorqueCurve(
        curve=curve,
        no_load=no_load,
        stall=_point(named, 1),
        max_efficiency=_point(named, 2),
        max_power=_point(named, 3),
        rated=_point(named, 4),
        rated_reached=bool(rated_reached),
        speed_torque_gradient=gradient,
    )


@shared_parameters(MOTOR_PARAMETERS)
def largest_current(model: MotorModel, current_limit: float | None = None) -> float:
    """The most current the armature can see at this case's temperatures [A]: plugging from at most
    the no-load speed, where the back-EMF is below V - Vb, so (V + E - Vb)/R < 2·(V - Vb)/R.

    Parameters
    ----------
    current_limit : float or None
        The drive's limit [A], included when given.

    Returns
    -------
    float
        2·(V - Vb)/R, or the limit if larger [A].
    """
    bound = 2.0 * float(stall_current(model))
    return max(bound, current_limit) if current_limit is not None else bound


def largest_currents(model: MotorModel, current_limit):
    """:func:`largest_current` for many motors at once [A].

    Parameters
    ----------
    model : MotorModel
        The motors at the case's temperatures (array fields).
    current_limit : ndarray
        The drives' limits [A]; NaN without one.

    Returns
    -------
    ndarray
        2·(V - Vb)/R, or the limit if larger [A].
    """
    bound = 2.0 * np.asarray(stall_current(model), dtype=float)
    limit = np.asarray(current_limit, dtype=float)
    return np.where(np.isnan(limit), bound, np.maximum(bound, np.where(np.isnan(limit), 0.0, limit)))


@shared_parameters(MOTOR_PARAMETERS)
def plugging_current(model: MotorModel, speed: float | np.ndarray):
    """Armature current when the supply is reversed while the motor turns at ``speed`` (plugging).

    Parameters
    ----------
    speed : float or ndarray
        Speed at the moment of reversal [rad/s].

    Returns
    -------
    float or ndarray
        (V + K·Φ(I)·ω - Vb)/R [A]: supply and back-EMF add (solved for I when Ke falls with current).

    References
    ----------
    .. [1] S. J. Chapman, Electric Machinery Fundamentals, 5th ed., 2012, ch. 9 (plugging a DC motor;
       from memory).
    """
    m = model
    if m.constant_table is None:
        return (m.voltage + m.constant * speed - m.brush_drop) / m.resistance
    from .solvers import find_root

    # I = (V + K·Φ(I)·ω - Vb)/R: the flux falls with current, so the root lies below the no-load bound
    # V + K·Φ(|I|)·ω - Vb - R·I changes sign between 0 and a little past the current with the table's
    # largest Ke (the flux may also rise a little with current), on whichever side of zero that lies
    speed = np.asarray(speed, dtype=float)
    bound = (m.voltage + np.max(m.constant_table[1], axis=-1) * speed - m.brush_drop) / m.resistance * 1.0001
    result = find_root(lambda i: m.voltage + constant_at(m, i) * speed - m.brush_drop - m.resistance * i,
                       np.minimum(bound, 0.0) - 1e-12, np.maximum(bound, 0.0) + 1e-12, xtol=1e-9, rtol=1e-12)
    return result.root if np.ndim(result.root) else float(result.root)


@shared_parameters(MOTOR_PARAMETERS)
def current_limit_torque(model: MotorModel, current_limit: float | None) -> float | None:
    """Shaft torque at which the armature current reaches the drive's limit.

    Parameters
    ----------
    current_limit : float or None
        The drive's current limit [A].

    Returns
    -------
    float or None
        K·I_lim less the loss torque at the speed where the current is I_lim [N·m]; None without a
        limit, or when the limit is at or above the stall current (the drive then never limits).

    References
    ----------
    .. [1] the circuit and torque balance of the module docstring, taken at I = I_lim.
    """
    if current_limit is None or current_limit >= float(stall_current(model)):
        return None
    return float(limit_torque(model, current_limit))


def limit_torque(model: MotorModel, current_limit):
    """Shaft torque at which the armature current reaches the drive's limit, for many motors at once.

    Parameters
    ----------
    model : MotorModel
        The motors at the case's temperatures (array fields, or floats).
    current_limit : float or ndarray
        The drive's current limit [A]; NaN without one.

    Returns
    -------
    float or ndarray
        K·I_lim less the loss torque at the speed where the current is I_lim [N·m]; NaN without a limit,
        or where the limit is at or above the stall current (the drive then never limits).

    References
    ----------
    .. [1] the circuit and torque balance of the module docstring, taken at I = I_lim.
    """
    m = model
    limit = np.asarray(current_limit, dtype=float)
    with np.errstate(invalid="ignore"):
        constant = constant_at(m, limit)
        limit_speed = (m.voltage - m.brush_drop - m.resistance * limit) / constant
        torque = constant * limit - loss_torque(m, limit_speed)
    return np.where(np.isnan(limit) | (limit >= stall_current(model)), np.nan, torque)


#: The resistance both time constants divide or multiply by, described once (:mod:`core.shared_docs`).
TIME_CONSTANT_PARAMETERS = parameter_table("""
resistance : float
    Terminal resistance R [Ω], at the temperature the constant is quoted for.
""")


@shared_parameters(TIME_CONSTANT_PARAMETERS)
def mechanical_time_constant(inertia: float, resistance: float, constant: float) -> float:
    """Mechanical time constant τm = J·R/K² [s].

    Parameters
    ----------
    inertia : float
        Rotor inertia J [kg·m²].
    constant : float
        Ke = Kt [V·s/rad].

    Returns
    -------
    float
        τm [s]: the speed's response to a step of voltage rises as 1 - exp(-t/τm).

    References
    ----------
    .. [1] first-order speed response of a DC motor with negligible inductance, e.g. Chapman,
       Electric Machinery Fundamentals, ch. 9 (from memory).
    """
    return inertia * resistance / constant**2


@shared_parameters(TIME_CONSTANT_PARAMETERS)
def electrical_time_constant(inductance: float, resistance: float) -> float:
    """Electrical time constant τe = L/R [s].

    Parameters
    ----------
    inductance : float
        Armature inductance L [H].

    Returns
    -------
    float
        τe [s]: the current's response to a step of voltage, rotor held, rises as 1 - exp(-t/τe).

    References
    ----------
    .. [1] first-order RL circuit of the armature (textbook circuit theory).
    """
    return inductance / resistance
