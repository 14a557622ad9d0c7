"""Steady-state performance at the supply voltage: closed forms, torque and power balance."""

from __future__ import annotations

import math

import numpy as np
import pytest
from numpy.testing import assert_allclose

from pmdc_sizer.core import library
from pmdc_sizer.core import performance as pm

NO_IRON = pm.IronLossTerms(0.0, 0.0, 0.0)


def model(**changes) -> pm.MotorModel:
    values = {"voltage": 24.0, "brush_drop": 1.2, "resistance": 0.8, "constant": 0.05, "friction_torque": 4e-3,
              "viscous_coeff": 2e-6, "iron": pm.IronLossTerms(3e-3, 1e-7, 2e-5)}
    values.update(changes)
    return pm.MotorModel(**values)


def test_ideal_motor_closed_forms():
    # Textbook DC-motor relations (e.g. A. Hughes, "Electric Motors and Drives", 3rd ed., 2006, ch. 3,
    # from memory): with no losses but the copper, ω0 = V/K, Tstall = K·V/R, speed falls linearly, and
    # the output power peaks at half the stall torque with Pmax = Tstall·ω0/4.
    m = model(brush_drop=0.0, friction_torque=0.0, viscous_coeff=0.0, iron=NO_IRON)
    assert_allclose(pm.speed_at_torque(m, 0.0), 24.0 / 0.05, rtol=1e-14)
    stall = float(pm.stall_torque(m))
    assert_allclose(stall, 0.05 * 24.0 / 0.8, rtol=1e-14)
    torque = np.linspace(0.0, stall, 11)
    assert_allclose(pm.speed_at_torque(m, torque), 480.0 * (1.0 - torque / stall), rtol=1e-12, atol=1e-9)
    curve = pm.speed_torque_curve(m, rated_torque=0.5)
    # The grid search refined twice around the best of 200 cells pins the torque to stall/200³;
    # the maximum of a parabola is flat, so the power agrees far better than that.
    assert_allclose(curve.max_power.torque, stall / 2.0, rtol=1e-5)
    assert_allclose(curve.max_power.output_power, stall * 480.0 / 4.0, rtol=1e-9)
    assert_allclose(curve.speed_torque_gradient, 480.0 / stall, rtol=1e-14)


def test_maximum_efficiency_at_the_geometric_mean_current():
    # With a constant loss torque only (friction), efficiency peaks at I = √(I0·Istall)
    # (textbook result for the PM DC motor, e.g. Hughes 2006, from memory).
    m = model(brush_drop=0.0, viscous_coeff=0.0, iron=NO_IRON)
    curve = pm.speed_torque_curve(m, rated_torque=0.1)
    no_load_current = m.friction_torque / m.constant
    stall_current = m.voltage / m.resistance
    assert_allclose(curve.no_load.current, no_load_current, rtol=1e-12)
    assert_allclose(curve.max_efficiency.current, math.sqrt(no_load_current * stall_current), rtol=1e-4)
    best = (1.0 - math.sqrt(no_load_current / stall_current)) ** 2  # the same textbook's ηmax
    assert_allclose(curve.max_efficiency.efficiency, best, rtol=1e-9)


def test_torque_and_voltage_balance_at_every_point():
    m = model()
    stall = float(pm.stall_torque(m))
    points = pm.operating_points(m, np.linspace(0.0, stall, 400))
    # V = Vb + R·I + K·ω and K·I = T + T_loss(ω), to rounding
    assert_allclose(m.brush_drop + m.resistance * points.current + m.constant * points.speed, m.voltage, rtol=1e-12)
    assert_allclose(m.constant * points.current, points.torque + pm.loss_torque(m, points.speed), rtol=1e-9, atol=1e-12)


def test_power_balance_at_every_point():
    # IEC 60034-2-1: efficiency by summation of losses: input = output + Σ losses. The relations are
    # exact, so only rounding separates the two sides: 1e-9 relative (the bound).
    m = model()
    points = pm.operating_points(m, np.linspace(0.0, float(pm.stall_torque(m)), 400))
    assert_allclose(points.input_power, points.output_power + points.total_loss, rtol=1e-9)
    assert np.all(points.efficiency >= 0.0) and np.all(points.efficiency < 1.0)


def test_stall_and_no_load():
    m = model()
    assert_allclose(pm.stall_current(m), (24.0 - 1.2) / 0.8, rtol=1e-15)
    stall = pm.operating_points(m, pm.stall_torque(m))
    assert float(stall.speed) == 0.0
    assert_allclose(stall.current, (24.0 - 1.2) / 0.8, rtol=1e-12)
    # at stall only the constant drags (friction and hysteresis) remain
    assert_allclose(pm.stall_torque(m), 0.05 * (24.0 - 1.2) / 0.8 - 4e-3 - 3e-3, rtol=1e-14)
    no_load = pm.operating_points(m, 0.0)
    assert_allclose(m.constant * no_load.speed, m.voltage - m.brush_drop - m.resistance * no_load.current, rtol=1e-13)
    assert_allclose(m.constant * no_load.current, pm.loss_torque(m, no_load.speed), rtol=1e-9)


def test_speed_falls_with_torque_and_is_zero_beyond_stall():
    m = model()
    stall = float(pm.stall_torque(m))
    speed = pm.speed_at_torque(m, np.linspace(0.0, 1.5 * stall, 301))
    assert np.all(np.diff(speed[speed > 0.0]) < 0.0)
    assert np.all(speed[np.linspace(0.0, 1.5 * stall, 301) >= stall] == 0.0)


def test_a_motor_whose_drag_exceeds_its_stall_torque():
    m = model(friction_torque=10.0)
    curve = pm.speed_torque_curve(m, rated_torque=0.01)
    assert float(pm.stall_torque(m)) == 0.0
    assert not curve.rated_reached
    assert np.all(np.isfinite(curve.curve.efficiency))


def test_rated_point_and_flags():
    m = model()
    curve = pm.speed_torque_curve(m, rated_torque=0.3, samples=50)
    assert curve.rated_reached
    assert float(curve.rated.torque) == 0.3
    assert curve.curve.torque.shape == (50,)
    beyond = pm.speed_torque_curve(m, rated_torque=10.0)
    assert not beyond.rated_reached
    assert float(beyond.rated.torque) == pytest.approx(float(pm.stall_torque(m)))


def test_iron_loss_terms_follow_the_lamination_loss_law():
    # The armature's iron sees f = (p/2)·n = p·ω/(4π) (each point passes p poles per turn).
    steel = library.steels()["M400-50A"]
    parts = ((0.05, 1.6), (0.08, 1.2))
    terms = pm.iron_loss_terms(steel, 4, parts, 1.5)
    for speed in (50.0, 300.0, 1500.0):
        frequency = 4 * speed / (4.0 * math.pi)
        expected = 1.5 * sum(mass * steel.specific_loss(frequency, b) for mass, b in parts)
        assert_allclose(terms.power(speed), expected, rtol=1e-12)


def _falling_flux_model():
    # Ke falls by a third from no load to twice the stall current (a saturating armature reaction).
    base = model()
    stall = pm.stall_current(base)
    currents = np.linspace(0.0, 2.0 * stall, 12)
    constants = base.constant * (1.0 - currents / (6.0 * stall))
    return pm.MotorModel(**{**vars(base), "constant_table": (currents, constants)})


def test_falling_flux_keeps_the_balances_at_every_point():
    # V = Vb + R·I + Ke(I)·ω and Kt(I)·I = T + T_loss(ω) with Kt = Ke at each point's own current; input
    # power equals output plus every loss (IEC 60034-2-1 summation of losses).
    m = _falling_flux_model()
    curve = pm.speed_torque_curve(m, 0.0).curve
    ke = pm.constant_at(m, curve.current)
    assert_allclose(m.voltage, m.brush_drop + m.resistance * curve.current + ke * curve.speed, rtol=1e-9)
    assert_allclose(ke * curve.current, curve.torque + pm.loss_torque(m, curve.speed), rtol=1e-7, atol=1e-9)
    assert_allclose(curve.input_power, curve.output_power + curve.copper_loss + curve.brush_loss + curve.friction_loss
                    + curve.viscous_loss + curve.iron_loss, rtol=1e-9, atol=1e-9)


def test_falling_flux_lowers_the_stall_torque_not_the_stall_current():
    constant, falling = model(), _falling_flux_model()
    stall = pm.stall_current(falling)
    assert pm.stall_current(constant) == stall  # (V - Vb)/R: no back-EMF at zero speed
    expected = pm.constant_at(falling, stall) * stall - falling.friction_torque - falling.iron.hysteresis
    assert_allclose(pm.stall_torque(falling), expected, rtol=1e-12)
    assert pm.stall_torque(falling) < pm.stall_torque(constant)
    # plugging from the no-load speed: the current solves I = (V + Ke(I)·ω - Vb)/R
    speed = float(pm.speed_torque_curve(falling, 0.0).no_load.speed)
    current = pm.plugging_current(falling, speed)
    assert_allclose(current, (falling.voltage + pm.constant_at(falling, current) * speed - falling.brush_drop)
                    / falling.resistance, rtol=1e-9)
