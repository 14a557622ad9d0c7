"""The motor at one temperature case: its circuit constants, losses, and Ke against current.

Circuit: V = Vb + R·I + Ke·ω (constant brush drop Vb); torque balance: Kt·I = T + T_loss(ω) with Kt = Ke
(SI). Ke = K·Φ, constant, or K·Φ(I) from a table when the flux falls with armature current (see
core.performance, which computes the speed-torque characteristic on this model).

References
----------
.. [1] textbook DC-motor circuit and torque balance (S. J. Chapman, Electric Machinery Fundamentals, 5th
   ed., 2012, ch. 9, from memory); the quadratic in √ω is our derivation (core.performance).
"""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import dataclass
from typing import Protocol

import numpy as np

from .shared_docs import parameter_table, shared_parameters

#: The arguments the motor's functions share, described once (:mod:`core.shared_docs`).
MOTOR_PARAMETERS = parameter_table("""
model : MotorModel
    The motor at one case's temperatures.
current : float or ndarray
    Armature current [A].
speed : float or ndarray
    Rotor speed ω [rad/s].
torque : float or ndarray
    Shaft torque [N·m].
""")


class LossCoefficients(Protocol):
    """What the iron loss reads of a lamination steel (a :class:`~core.steel.Steel`, or arrays of them)."""

    @property
    def hysteresis_coeff(self) -> float | np.ndarray:
        """kh [W/kg at 1 Hz, 1 T]."""

    @property
    def hysteresis_exponent(self) -> float | np.ndarray:
        """α [1]."""

    @property
    def eddy_coeff(self) -> float | np.ndarray:
        """kc [W/kg per (Hz·T)²]."""

    @property
    def excess_coeff(self) -> float | np.ndarray:
        """ke [W/kg per (Hz·T)^1.5]."""


@dataclass(frozen=True)
class IronLossTerms:
    """Armature iron loss P = hysteresis·ω + eddy·ω² + excess·ω^1.5 [W], ω in rad/s."""

    hysteresis: float | np.ndarray  #: [N·m]
    eddy: float | np.ndarray  #: [N·m·s/rad]
    excess: float | np.ndarray  #: [N·m·(s/rad)^0.5]

    @shared_parameters(MOTOR_PARAMETERS)
    def power(self, speed: float | np.ndarray):
        """Iron loss at a speed.

        Returns
        -------
        float or ndarray
            P = hysteresis·ω + eddy·ω² + excess·ω^1.5 [W].
        """
        return self.hysteresis * speed + self.eddy * speed**2 + self.excess * speed**1.5


def iron_loss_terms(steel: LossCoefficients, poles: int | np.ndarray,
                    parts: Iterable[tuple[float | np.ndarray, float | np.ndarray]],
                    build_factor: float) -> IronLossTerms:
    """Iron-loss coefficients of the armature, written as torques, from the steel's loss-separation law.

    The armature iron sees a magnetic frequency f = (p/2)·ω/(2π) as it turns past the p poles, so each
    term of the specific loss kh·f·B^α + kc·(f·B)² + ke·(f·B)^1.5 [W/kg] (:meth:`Steel.specific_loss`)
    times the part's mass becomes one coefficient of ω, ω² or ω^1.5.

    Parameters
    ----------
    steel : Steel or LossCoefficients
        The lamination steel, with its loss coefficients (arrays of them for many designs).
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
    #: Ke against armature current: (currents [A] from 0, increasing; Ke there [V·s/rad]); None: Ke constant
    constant_table: tuple[np.ndarray, np.ndarray] | None = None


@shared_parameters(MOTOR_PARAMETERS)
def constant_at(model: MotorModel, current: float | np.ndarray):
    """Ke = Kt at an armature current [V·s/rad]: the table's linear interpolation, or the constant.

    Parameters
    ----------
    current : float or ndarray
        Armature current [A] (its sign does not matter: the flux falls alike either way).

    Returns
    -------
    float or ndarray
        K·Φ(|I|) [V·s/rad], interpolated linearly in I² between the table's currents; beyond its last
        current, its last value.
    """
    if model.constant_table is None:
        return model.constant + 0.0 * np.asarray(current, dtype=float)
    currents, constants = model.constant_table
    # the flux is even in the current (the cross field weakens one half of the pole as it strengthens
    # the other), Φ(I) = Φ0 - a·I² + …: interpolating in I² keeps dKe/dI = 0 at no load
    if np.ndim(currents) == 1:
        return np.interp(np.square(current), np.square(currents), constants)
    return interp_rows(np.square(current), np.square(currents), constants)


def interp_rows(x, xp, fp):
    """Linear interpolation with a table of its own for each element: ``np.interp`` over the last axis.

    Parameters
    ----------
    x : ndarray
        Where to interpolate, shape (...,) broadcasting with the tables' leading shape.
    xp, fp : ndarray
        Tables, shape (..., P), ``xp`` increasing along the last axis.

    Returns
    -------
    ndarray
        The interpolated values; beyond either end of a table, its end value. The arithmetic is that of
        ``np.interp`` (slope, then slope·(x - xp_j) + fp_j), so a row gives the same bits as ``np.interp``
        on that row alone.
    """
    x = np.asarray(x, dtype=float)
    xp, fp = np.asarray(xp, dtype=float), np.asarray(fp, dtype=float)
    shape = np.broadcast_shapes(x.shape, xp.shape[:-1], fp.shape[:-1])
    x = np.broadcast_to(x, shape)
    # the tables once each, flat, and each point's table: the lookups below index them directly
    tables = np.broadcast_shapes(xp.shape[:-1], fp.shape[:-1])
    size = xp.shape[-1]
    xp_flat = np.broadcast_to(xp, (*tables, size)).ravel()
    fp_flat = np.broadcast_to(fp, (*tables, size)).ravel()
    start = np.broadcast_to((np.arange(int(np.prod(tables)), dtype=np.intp) * size).reshape(tables), shape)
    last = size - 1
    # the last node at or below x (-1 if none), by bisection over the increasing nodes: the same index
    # as counting the nodes at or below x
    low, high = np.full(shape, -1, dtype=np.intp), np.full(shape, last, dtype=np.intp)
    for _ in range(int(np.ceil(np.log2(size + 1)))):
        middle = (low + high + 1) // 2
        below = xp_flat[start + middle] <= x
        low, high = np.where(below, middle, low), np.where(below, high, middle - 1)
    j = start + np.clip(low, 0, last - 1)
    x0, x1, f0, f1 = xp_flat[j], xp_flat[j + 1], fp_flat[j], fp_flat[j + 1]
    with np.errstate(divide="ignore", invalid="ignore"):
        inside = (f1 - f0) / (x1 - x0) * (x - x0) + f0
    return np.where(x >= xp_flat[start + last], fp_flat[start + last],
                    np.where(x <= xp_flat[start], fp_flat[start], inside))


@shared_parameters(MOTOR_PARAMETERS)
def speed_at_current(model: MotorModel, current):
    """Speed at an armature current from the voltage equation, ω = (V - Vb - R·I)/Ke(I), never below 0.

    Returns
    -------
    float or ndarray
        [rad/s].
    """
    return _speed_with_constant(model, current, constant_at(model, current))


def _speed_with_constant(model: MotorModel, current, constant):
    """ω = (V - Vb - R·I)/Ke, never below 0, with Ke at this current already looked up [rad/s]."""
    return np.maximum((model.voltage - model.brush_drop - model.resistance * current) / constant, 0.0)


@shared_parameters(MOTOR_PARAMETERS)
def shaft_torque_at_current(model: MotorModel, current):
    """Shaft torque at an armature current: Kt(I)·I less the loss torque at that current's speed.

    Returns
    -------
    float or ndarray
        [N·m].
    """
    constant = constant_at(model, current)
    speed = _speed_with_constant(model, current, constant)  # Ke looked up once for both
    return constant * current - loss_torque(model, speed)


@shared_parameters(MOTOR_PARAMETERS)
def current_at_torque(model: MotorModel, torque: float | np.ndarray):
    """Armature current at a shaft torque, between no load and stall (the stall current beyond stall).

    Returns
    -------
    float or ndarray
        I [A]: closed form with a constant Ke, a bracketed root with Ke(I).

    References
    ----------
    .. [1] the circuit and torque balance of the module docstring; Chandrupatla's bracketed root finder
       (core.solvers.find_root).
    """
    from .solvers import find_root

    torque = np.asarray(torque, dtype=float)
    stall = stall_current(model)
    if model.constant_table is None:
        speed = speed_at_torque(model, torque)
        return (model.voltage - model.brush_drop - model.constant * speed) / model.resistance
    target = np.minimum(torque, stall_torque(model))
    # a torque below that of zero current (the shaft driven, above no-load speed) needs a negative current
    bound = np.broadcast_to(stall, target.shape)
    result = find_root(lambda i: shaft_torque_at_current(model, i) - target, -bound, bound, xtol=1e-12, rtol=1e-12)
    return np.where(torque >= stall_torque(model), stall, result.root)


@shared_parameters(MOTOR_PARAMETERS)
def speed_at_torque(model: MotorModel, torque: float | np.ndarray):
    """Speed at a shaft torque: the closed-form root of the module docstring; 0 at and beyond stall.

    Returns
    -------
    float or ndarray
        Speed ω = s² [rad/s].

    References
    ----------
    .. [1] our derivation: the circuit and torque balance of the module docstring, solved for s = √ω.
    """
    m = model
    if m.constant_table is not None:
        return speed_at_current(m, current_at_torque(m, torque))
    quadratic = m.constant**2 / m.resistance + m.viscous_coeff + m.iron.eddy
    # the same arithmetic as stall_torque, so that at the stall torque the speed is exactly zero
    available = (m.constant * stall_current(m) - m.friction_torque - m.iron.hysteresis) - torque
    linear = m.iron.excess
    root_s = (-linear + np.sqrt(linear**2 + 4.0 * quadratic * np.maximum(available, 0.0))) / (2.0 * quadratic)
    return root_s**2


@shared_parameters(MOTOR_PARAMETERS)
def loss_torque(model: MotorModel, speed: float | np.ndarray):
    """Torque that friction, drag and iron loss take from the shaft, T_loss(ω) of the module docstring.

    Returns
    -------
    float or ndarray
        Tf + Th + (Bv + Be)·ω + Bx·√ω [N·m].
    """
    m = model
    return (m.friction_torque + m.iron.hysteresis + (m.viscous_coeff + m.iron.eddy) * speed
            + m.iron.excess * np.sqrt(speed))


@shared_parameters(MOTOR_PARAMETERS)
def stall_current(model: MotorModel) -> float:
    """Armature current at zero speed, with no back-EMF.

    Returns
    -------
    float
        (V - Vb)/R [A].
    """
    return (model.voltage - model.brush_drop) / model.resistance


@shared_parameters(MOTOR_PARAMETERS)
def stall_torque(model: MotorModel):
    """Shaft torque at zero speed: K·I_stall less friction and hysteresis drag, never below 0.

    Returns
    -------
    float or ndarray
        Stall torque [N·m] (an array when the iron-loss terms are arrays).
    """
    return np.maximum(constant_at(model, stall_current(model)) * stall_current(model) - model.friction_torque
                      - model.iron.hysteresis, 0.0)
