"""Steady-state performance at the supply voltage, from no load to stall.

Circuit: V = Vb + R·I + K·ω (constant brush drop Vb). Torque balance: K·I = T + T_loss(ω) with

    T_loss(ω) = Tf + Th + (Bv + Be)·ω + Bx·√ω

where Tf is friction, Bv viscous drag, and Th, Be, Bx are the hysteresis, eddy and excess parts of the
armature's iron loss written as torques (P_iron = Th·ω + Be·ω² + Bx·ω^1.5, see :func:`iron_loss_terms`).
Substituting I gives a quadratic in s = √ω with a closed-form root, so speed at any torque needs no
iteration:

    (K²/R + Bv + Be)·s² + Bx·s - (K·(V - Vb)/R - Tf - Th - T) = 0.

Losses are summed per IEC 60034-2-1 (efficiency by summation of losses): input V·I equals output T·ω
plus copper, brush, friction, viscous and iron losses, exactly.

References
----------
.. [1] textbook DC-motor circuit and torque balance, E = K·ω and T = K·I (S. J. Chapman, Electric
   Machinery Fundamentals, 5th ed., 2012, ch. 9, from memory); the quadratic in √ω is our derivation.
.. [2] IEC 60034-2-1, determination of efficiency by summation of losses.
"""

from __future__ import annotations

from collections.abc import Callable, Iterable
from dataclasses import dataclass

import numpy as np

from .steel import Steel


@dataclass(frozen=True)
class IronLossTerms:
    """Armature iron loss P = hysteresis·ω + eddy·ω² + excess·ω^1.5 [W], ω in rad/s."""

    hysteresis: float | np.ndarray  #: [N·m]
    eddy: float | np.ndarray  #: [N·m·s/rad]
    excess: float | np.ndarray  #: [N·m·(s/rad)^0.5]

    def power(self, speed: float | np.ndarray):
        """Iron loss at a speed.

        Parameters
        ----------
        speed : float or ndarray
            Rotor speed ω [rad/s].

        Returns
        -------
        float or ndarray
            P = hysteresis·ω + eddy·ω² + excess·ω^1.5 [W].
        """
        return self.hysteresis * speed + self.eddy * speed**2 + self.excess * speed**1.5


def iron_loss_terms(steel: Steel, poles: int | np.ndarray,
                    parts: Iterable[tuple[float | np.ndarray, float | np.ndarray]],
                    build_factor: float) -> IronLossTerms:
    """Iron-loss coefficients of the armature, written as torques, from the steel's loss-separation law.

    The armature iron sees a magnetic frequency f = (p/2)·ω/(2π) as it turns past the p poles, so each
    term of the specific loss kh·f·B^α + kc·(f·B)² + ke·(f·B)^1.5 [W/kg] (:meth:`Steel.specific_loss`)
    times the part's mass becomes one coefficient of ω, ω² or ω^1.5.

    Parameters
    ----------
    steel : Steel
        The lamination steel, with its loss coefficients.
    poles : int or ndarray
        Number of poles p [1].
    parts : iterable of (float, float)
        (mass [kg], peak flux density [T]) of each part of the stack: the teeth and the core.
    build_factor : float
        Multiplies the catalogue loss for punching and rotation [1].

    Returns
    -------
    IronLossTerms
        Hysteresis [N·m], eddy [N·m·s/rad] and excess [N·m·(s/rad)^0.5] coefficients.

    References
    ----------
    .. [1] C. P. Steinmetz, Trans. AIEE 9 (1892) 3-64 (hysteresis term); G. Bertotti, IEEE Trans. Magn.
       24 (1988) 621-630 (eddy and excess terms).
    .. [2] f = p·n/2 for n revolutions per second: textbook rotating-machine relation.
    .. [3] build factor: common practice, no source.
    """
    hz_per_rad_s = poles / (4.0 * np.pi)
    hysteresis: float | np.ndarray = 0.0
    eddy: float | np.ndarray = 0.0
    excess: float | np.ndarray = 0.0
    for mass, flux_density in parts:
        b = np.abs(flux_density)
        hysteresis = hysteresis + mass * steel.hysteresis_coeff * b**steel.hysteresis_exponent * hz_per_rad_s
        eddy = eddy + mass * steel.eddy_coeff * b**2 * hz_per_rad_s**2
        excess = excess + mass * steel.excess_coeff * b**1.5 * hz_per_rad_s**1.5
    return IronLossTerms(build_factor * hysteresis, build_factor * eddy, build_factor * excess)


@dataclass(frozen=True)
class MotorModel:
    """What the steady state needs at one temperature case (SI)."""

    voltage: float  #: [V]
    brush_drop: float  #: [V]
    resistance: float  #: terminal resistance at this case's winding temperature [Ω]
    constant: float  #: Ke = Kt [V·s/rad]
    friction_torque: float  #: [N·m]
    viscous_coeff: float  #: [N·m·s/rad]
    iron: IronLossTerms


def speed_at_torque(model: MotorModel, torque: float | np.ndarray):
    """Speed at a shaft torque: the closed-form root of the module docstring; 0 at and beyond stall.

    Parameters
    ----------
    model : MotorModel
        The motor at one case's temperatures.
    torque : float or ndarray
        Shaft torque [N·m].

    Returns
    -------
    float or ndarray
        Speed ω = s² [rad/s].

    References
    ----------
    .. [1] our derivation: the circuit and torque balance of the module docstring, solved for s = √ω.
    """
    m = model
    quadratic = m.constant**2 / m.resistance + m.viscous_coeff + m.iron.eddy
    # the same arithmetic as stall_torque, so that at the stall torque the speed is exactly zero
    available = (m.constant * stall_current(m) - m.friction_torque - m.iron.hysteresis) - torque
    linear = m.iron.excess
    root_s = (-linear + np.sqrt(linear**2 + 4.0 * quadratic * np.maximum(available, 0.0))) / (2.0 * quadratic)
    return root_s**2


def loss_torque(model: MotorModel, speed: float | np.ndarray):
    """Torque that friction, drag and iron loss take from the shaft, T_loss(ω) of the module docstring.

    Parameters
    ----------
    model : MotorModel
        The motor at one case's temperatures.
    speed : float or ndarray
        Rotor speed ω [rad/s].

    Returns
    -------
    float or ndarray
        Tf + Th + (Bv + Be)·ω + Bx·√ω [N·m].
    """
    m = model
    return (m.friction_torque + m.iron.hysteresis + (m.viscous_coeff + m.iron.eddy) * speed
            + m.iron.excess * np.sqrt(speed))


def stall_current(model: MotorModel) -> float:
    """Armature current at zero speed, with no back-EMF.

    Parameters
    ----------
    model : MotorModel
        The motor at one case's temperatures.

    Returns
    -------
    float
        (V - Vb)/R [A].
    """
    return (model.voltage - model.brush_drop) / model.resistance


def stall_torque(model: MotorModel):
    """Shaft torque at zero speed: K·I_stall less friction and hysteresis drag, never below 0.

    Parameters
    ----------
    model : MotorModel
        The motor at one case's temperatures.

    Returns
    -------
    float or ndarray
        Stall torque [N·m] (an array when the iron-loss terms are arrays).
    """
    return np.maximum(model.constant * stall_current(model) - model.friction_torque - model.iron.hysteresis, 0.0)


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


def operating_points(model: MotorModel, torque: float | np.ndarray) -> OperatingPoints:
    """The steady state at the given shaft torques (from no load to stall): speed, current, powers, losses.

    Parameters
    ----------
    model : MotorModel
        The motor at one case's temperatures.
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
    speed = speed_at_torque(m, torque)
    current = (m.voltage - m.brush_drop - m.constant * speed) / m.resistance
    input_power = m.voltage * current
    output_power = torque * speed
    with np.errstate(divide="ignore", invalid="ignore"):
        efficiency = np.where(input_power > 0.0, output_power / input_power, 0.0)
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


def _refined_maximum(model: MotorModel, stall: float, values_of: Callable[[OperatingPoints], np.ndarray],
                     samples: int = 64, rounds: int = 3) -> float:
    """Torque of the maximum of ``values_of(points)`` by a grid search refined around the best cell."""
    low, high = 0.0, stall
    best = 0.0
    for _ in range(rounds + 1):
        torque = np.linspace(low, high, samples)
        values = values_of(operating_points(model, torque))
        index = int(np.argmax(values))
        best = float(torque[index])
        step = (high - low) / (samples - 1)
        low, high = max(best - step, 0.0), min(best + step, stall)
    return best


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


def speed_torque_curve(model: MotorModel, rated_torque: float, samples: int = 200) -> SpeedTorqueCurve:
    """The characteristic from no load to stall and its named points.

    The torques are spaced quadratically, T_i = T_stall·(i/(n-1))², so the working region near no load,
    where a small motor runs at a few per cent of its stall torque, gets most of the points. The maximum
    efficiency and maximum power points come from a grid search refined three times around the best
    cell (our numerical choice).

    Parameters
    ----------
    model : MotorModel
        The motor at one case's temperatures.
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
    no_load = operating_points(model, 0.0)
    if stall > 0.0:
        eta_torque = _refined_maximum(model, stall, lambda p: p.efficiency)
        power_torque = _refined_maximum(model, stall, lambda p: p.output_power)
        gradient = float(no_load.speed) / stall
    else:
        eta_torque = power_torque = 0.0
        gradient = float("inf")
    rated_reached = rated_torque < stall
    return SpeedTorqueCurve(
        curve=curve,
        no_load=no_load,
        stall=operating_points(model, stall),
        max_efficiency=operating_points(model, eta_torque),
        max_power=operating_points(model, power_torque),
        rated=operating_points(model, min(rated_torque, stall)),
        rated_reached=bool(rated_reached),
        speed_torque_gradient=gradient,
    )


def plugging_current(model: MotorModel, speed: float | np.ndarray):
    """Armature current when the supply is reversed while the motor turns at ``speed`` (plugging).

    Parameters
    ----------
    model : MotorModel
        The motor at the case's temperatures.
    speed : float or ndarray
        Speed at the moment of reversal [rad/s].

    Returns
    -------
    float or ndarray
        (V + K·ω - Vb)/R [A]: supply and back-EMF add.

    References
    ----------
    .. [1] S. J. Chapman, Electric Machinery Fundamentals, 5th ed., 2012, ch. 9 (plugging a DC motor;
       from memory).
    """
    m = model
    return (m.voltage + m.constant * speed - m.brush_drop) / m.resistance


def current_limit_torque(model: MotorModel, current_limit: float | None) -> float | None:
    """Shaft torque at which the armature current reaches the drive's limit.

    Parameters
    ----------
    model : MotorModel
        The motor at the case's temperatures.
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
    m = model
    limit_speed = (m.voltage - m.brush_drop - m.resistance * current_limit) / m.constant
    return float(m.constant * current_limit - loss_torque(m, limit_speed))


def mechanical_time_constant(inertia: float, resistance: float, constant: float) -> float:
    """Mechanical time constant τm = J·R/K² [s].

    Parameters
    ----------
    inertia : float
        Rotor inertia J [kg·m²].
    resistance : float
        Terminal resistance R [Ω].
    constant : float
        Ke = Kt [V·s/rad].

    Returns
    -------
    float
        [s]

    References
    ----------
    .. [1] first-order speed response of a DC motor with negligible inductance, e.g. Chapman,
       Electric Machinery Fundamentals, ch. 9 (from memory).
    """
    return inertia * resistance / constant**2


def electrical_time_constant(inductance: float, resistance: float) -> float:
    """Electrical time constant τe = L/R [s].

    Parameters
    ----------
    inductance : float
        Armature inductance [H].
    resistance : float
        Terminal resistance [Ω].

    Returns
    -------
    float
        [s]

    References
    ----------
    .. [1] first-order RL circuit of the armature (textbook circuit theory).
    """
    return inductance / resistance
