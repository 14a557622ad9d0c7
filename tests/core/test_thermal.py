"""Winding and magnet temperatures in the chain: convection resistance, IEC 60085 classes, duty types."""

from __future__ import annotations

import math

import numpy as np
import pytest
from numpy.testing import assert_allclose

from pmdc_sizer.core import project as pf
from pmdc_sizer.core import thermal
from pmdc_sizer.core.design import INSULATION_CLASS_LIMIT_C, design_from_project
from pmdc_sizer.core.evaluate import evaluate


def test_convection_resistance_from_the_housing_surface(ferrite_demo):
    g = design_from_project(pf.load(ferrite_demo)).geometry
    r = g.housing_outer_radius
    area = 2.0 * math.pi * r * g.housing_length + 2.0 * math.pi * r**2
    assert_allclose(thermal.housing_surface_area(g), area, rtol=1e-14)
    assert_allclose(thermal.housing_to_ambient_resistance(g, 20.0), 1.0 / (20.0 * area), rtol=1e-14)


def test_iec_60085_class_limits():
    # Source: IEC 60085 (thermal classes: the class number is the limiting temperature in °C, with the
    # letters A, E, B, F, H, N, R of the older designations).
    assert INSULATION_CLASS_LIMIT_C == {
        "105 (A)": 105.0, "120 (E)": 120.0, "130 (B)": 130.0, "155 (F)": 155.0,
        "180 (H)": 180.0, "200 (N)": 200.0, "220 (R)": 220.0,
    }
    choices = pf.key_spec("winding.insulation_class").choices
    assert set(choices) == set(INSULATION_CLASS_LIMIT_C)


def test_winding_temperature_rises_with_load(ferrite_demo):
    project = pf.load(ferrite_demo)
    temperatures = []
    for torque in (5.0, 20.0, 35.0, 50.0):
        r = evaluate(pf.with_values(project, {"load.torque_mNm": torque}))
        assert r.thermal.converged
        temperatures.append(r.thermal.winding_temperature_C)
        assert r.thermal.ambient_C < r.thermal.magnet_temperature_C < r.thermal.winding_temperature_C
    assert np.all(np.diff(temperatures) > 0.0)


def test_thermal_class_check_follows_the_class(ferrite_demo):
    # nine tenths of the continuous rating in class 130 (B): a winding a little below 130 °C
    rating = evaluate(pf.load(ferrite_demo)).ratings.continuous_torque_N_m
    project = pf.with_values(pf.load(ferrite_demo), {"load.torque_mNm": 0.9e3 * rating})
    base = evaluate(project)
    assert 105.0 < base.thermal.winding_temperature_C < 130.0
    winding_C = base.thermal.winding_temperature_C
    # a class below the winding temperature fails, one above passes
    below = next(c for c, limit in sorted(INSULATION_CLASS_LIMIT_C.items(), key=lambda kv: -kv[1]) if limit < winding_C)
    above = next(c for c, limit in sorted(INSULATION_CLASS_LIMIT_C.items(), key=lambda kv: kv[1]) if limit > winding_C)
    assert not evaluate(pf.with_values(project, {"winding.insulation_class": below})).thermal.ok
    assert evaluate(pf.with_values(project, {"winding.insulation_class": above})).thermal.ok


def test_s2_duty_runs_cooler_than_s1(ferrite_demo):
    project = pf.load(ferrite_demo)
    s1 = evaluate(project).thermal
    s2 = evaluate(pf.with_values(project, {"thermal.duty": "S2", "thermal.duty_minutes": 5.0})).thermal
    assert s2.winding_temperature_C < s1.winding_temperature_C
    assert s2.ambient_C < s2.winding_temperature_C <= s2.steady_winding_temperature_C


@pytest.mark.parametrize("resistance", [0.5, 5.0])
def test_given_housing_resistance_is_used(ferrite_demo, resistance):
    r = evaluate(pf.with_values(pf.load(ferrite_demo), {"thermal.housing_to_ambient_K_per_W": resistance})).thermal
    assert r.housing_to_ambient_K_per_W == resistance
    # the network's steady state at the converged losses
    assert_allclose(r.housing_temperature_C, r.ambient_C + r.losses_W * resistance, rtol=1e-9)
    assert_allclose(r.winding_temperature_C, r.housing_temperature_C + r.rotor_losses_W * r.winding_to_housing_K_per_W,
                    rtol=1e-6)
