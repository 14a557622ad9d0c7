"""Masses, rotor inertia and material cost, against hand formulas of the same geometry."""

from __future__ import annotations

import math

from numpy.testing import assert_allclose

from pmdc_sizer.core import project as pf
from pmdc_sizer.core.conductors import COPPER_DENSITY
from pmdc_sizer.core.design import design_from_project
from pmdc_sizer.core.mass import STEEL_DENSITY_SHAFT, masses, material_cost, rotor_inertia


def test_masses_by_hand(ferrite_demo):
    design = design_from_project(pf.load(ferrite_demo))
    g = design.geometry
    m = masses(g, 4900.0, 7870.0, 7650.0, wire_length=40.0, copper_area=0.128e-6)
    # Arc magnets: p arcs of angle θ between radii ri and ro, length L: p·θ/2·(ro² - ri²)·L.
    ri, ro = 12.4e-3, 18.4e-3  # 24 mm armature, 0.4 mm gap, 6 mm magnets (the demo)
    assert_allclose(m.magnet, 4900.0 * 2 * math.radians(140.0) / 2.0 * (ro**2 - ri**2) * 28e-3, rtol=1e-12)
    # Housing tube, 40 mm long, with the demo's wall.
    wall = g.housing_wall
    assert_allclose(m.housing, 7870.0 * math.pi * ((ro + wall) ** 2 - ro**2) * 40e-3, rtol=1e-12)
    assert_allclose(m.copper, COPPER_DENSITY * 40.0 * 0.128e-6, rtol=1e-14)
    assert_allclose(m.shaft, STEEL_DENSITY_SHAFT * math.pi * 2e-3**2 * 40e-3, rtol=1e-12)
    # The stack: disc less bore and slots, times the stacking factor; teeth and core are parts of it.
    assert m.teeth + m.core < m.lamination
    assert_allclose(m.total, m.magnet + m.copper + m.housing + m.lamination + m.shaft, rtol=1e-15)


def test_inertia_of_a_bare_shaft_is_half_m_r_squared(ferrite_demo):
    design = design_from_project(pf.load(ferrite_demo))
    g = design.geometry
    m = masses(g, 4900.0, 7870.0, 0.0, wire_length=0.0, copper_area=0.0)  # no stack, no copper
    # Solid cylinder about its axis: J = m·r²/2 (any mechanics text).
    assert_allclose(rotor_inertia(g, m, 0.5, 0.0), 0.5 * m.shaft * g.shaft_radius**2, rtol=1e-14)
    assert_allclose(rotor_inertia(g, m, 0.5, 1e-6), 0.5 * m.shaft * g.shaft_radius**2 + 1e-6, rtol=1e-14)


def test_cost_is_mass_times_price(ferrite_demo):
    design = design_from_project(pf.load(ferrite_demo))
    m = masses(design.geometry, 4900.0, 7870.0, 7650.0, 40.0, 0.128e-6)
    cost = material_cost(m, design.prices)
    assert_allclose(cost.magnet, m.magnet * 4.0, rtol=1e-15)
    assert_allclose(cost.copper, m.copper * 11.0, rtol=1e-15)
    assert_allclose(cost.total, m.magnet * 4.0 + m.copper * 11.0 + m.housing * 1.4 + m.lamination * 2.2, rtol=1e-14)
