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


def test_other_parts_by_hand(ferrite_demo):
    """The estimate of the parts outside the magnetic circuit, from its named proportions (core.mass)."""
    from pmdc_sizer.core import mass as m_

    design = design_from_project(pf.load(ferrite_demo))
    g = design.geometry
    m = masses(g, 4900.0, 7870.0, 7650.0, wire_length=40.0, copper_area=0.128e-6)
    shaft_r, bore, inner_r = 2e-3, 4e-3, 18.4e-3  # the demo's 4 mm shaft, housing bore at the magnets' back
    cap = 7870.0 * (math.pi * inner_r**2 - math.pi * shaft_r**2) * 0.5 * g.housing_wall
    assert_allclose(m.end_caps, 2 * cap, rtol=1e-12)
    assert_allclose(m.brush_gear, 0.5 * cap, rtol=1e-12)
    commutator_d = 0.6 * 24e-3
    assert_allclose(m.commutator, 0.6 * COPPER_DENSITY * math.pi * (commutator_d**2 / 4 - shaft_r**2)
                    * 0.7 * commutator_d, rtol=1e-12)
    # a 4 mm bore: 10.4 mm outside, 3.2 mm wide, two thirds steel, two of them
    assert_allclose(m.bearings, 2 * (2 / 3) * 7850.0 * math.pi / 4 * ((10.4e-3) ** 2 - bore**2) * 3.2e-3, rtol=1e-12)
    assert_allclose(m.shaft_extension, STEEL_DENSITY_SHAFT * math.pi * shaft_r**2 * 12e-3, rtol=1e-12)
    assert_allclose(m.estimated_total, m.total + m.end_caps + m.brush_gear + m.commutator + m.bearings
                    + m.shaft_extension, rtol=1e-15)
    # A project's commutator diameter replaces the estimate.
    given = masses(g, 4900.0, 7870.0, 7650.0, 40.0, 0.128e-6, commutator_diameter=20e-3)
    assert given.commutator > m.commutator and given.end_caps == m.end_caps
    # The other parts are a plausible share of a small motor: a tenth to a third of the active mass.
    assert 0.1 < m.other_parts / m.total < 0.33
    assert m_.BEARINGS == 2


def test_masses_take_arrays_for_a_sweep(ferrite_demo):
    """Every part, the estimate of the other parts included, takes arrays of the geometry as one design each."""
    import dataclasses

    import numpy as np

    design = design_from_project(pf.load(ferrite_demo))
    g = design.geometry
    walls = np.array([3e-3, 4.5e-3, 6e-3])
    swept = masses(dataclasses.replace(g, housing_wall=walls), 4900.0, 7870.0, 7650.0, 40.0, 0.128e-6)
    for index, wall in enumerate(walls):
        one = masses(dataclasses.replace(g, housing_wall=float(wall)), 4900.0, 7870.0, 7650.0, 40.0, 0.128e-6)
        assert_allclose(swept.estimated_total[index], one.estimated_total, rtol=1e-14)
        assert_allclose(swept.end_caps[index], one.end_caps, rtol=1e-14)
    assert np.all(np.diff(swept.estimated_total) > 0)  # a thicker wall: a heavier tube and heavier caps


def test_results_carry_the_estimated_total_beside_the_active_mass(ferrite_demo):
    from pmdc_sizer.core import evaluate

    r = evaluate(pf.load(ferrite_demo)).mass
    parts = (r.shaft_extension_kg, r.end_caps_kg, r.brush_gear_kg, r.commutator_kg, r.bearings_kg)
    assert_allclose(r.other_parts_kg, sum(parts), rtol=1e-14)
    assert_allclose(r.estimated_total_kg, r.total_kg + r.other_parts_kg, rtol=1e-14)
    assert r.estimated_total_kg > r.total_kg
