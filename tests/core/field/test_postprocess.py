"""Outputs of a solution: flux balances, the magnet's field, and the fields the edges read."""

from __future__ import annotations

import math

import numpy as np
import pytest
from numpy.testing import assert_allclose

from pmdc_sizer.core.design import design_from_project
from pmdc_sizer.core.edits import with_values
from pmdc_sizer.core.field import COARSE, FieldOptions, Region, no_load_case, solve_case
from pmdc_sizer.core.field.mesh import build_mesh
from pmdc_sizer.core.field.postprocess import PointLocator
from pmdc_sizer.core.field.solve import build_problem
from pmdc_sizer.core.magnet_field_share import WORST_AREA_SHARE
from pmdc_sizer.core.project import load

from .conftest import FERRITE, with_wall


@pytest.fixture(scope="module")
def saturated(ferrite):
    return solve_case(with_wall(ferrite, 2.5e-3), no_load_case(23.0))


def test_gap_flux_by_quadrature_of_the_waveform_equals_the_flux_per_pole(saturated):
    # Two computations: the potential's difference between the neutral axes, and B_r integrated
    # over the mid-gap arc element by element. Within the discretisation: 0.5 % (measured 0.1 %).
    s = saturated
    angles, b = s.airgap_angle_rad, s.airgap_flux_density_T
    one_pole = angles <= angles[0] + math.pi + 1e-12  # two poles: the first pole pitch is [-π/2, π/2]
    radius = 12e-3 + 0.2e-3
    assert_allclose(np.trapezoid(np.abs(b[one_pole]), angles[one_pole]) * radius, s.flux_per_pole_Wb_per_m, rtol=5e-3)


def test_flux_balance_of_the_housing(ferrite, saturated):
    # What enters the housing's bore over half a pole leaves along the wall at the interpolar axis or
    # through its outer surface into the outside air (div B = 0). The bore's flux is integrated from
    # the element B of the wall's first elements on the bore; the other two come from the potential:
    # within 1 % (the element-by-element quadrature).
    design = with_wall(ferrite, 2.5e-3)
    g = design.geometry
    section = build_mesh(g, 0.0, FieldOptions())
    problem = build_problem(design, no_load_case(23.0), section)
    locator = PointLocator(problem)
    radius = float(g.housing_inner_radius) * (1.0 + 1e-9)  # on the bore's arc: the wall's first elements
    angles = np.linspace(0.0, 0.5 * math.pi, 2001)
    b = saturated.flux_density_T
    entering = np.trapezoid(locator.radial_flux_density(b, angles, radius), angles) * radius
    assert saturated.outside_air_flux_Wb_per_m > 0.1 * saturated.housing_section_flux_Wb_per_m  # saturated
    assert_allclose(abs(entering), saturated.housing_section_flux_Wb_per_m + saturated.outside_air_flux_Wb_per_m,
                    rtol=1e-2)


def test_stack_basis_and_end_factor(saturated):
    s = saturated
    assert s.flux_per_pole_stack_Wb == pytest.approx(s.flux_per_pole_Wb_per_m * s.stack_length_m, rel=1e-12)
    assert s.flux_per_pole_Wb == pytest.approx(s.flux_per_pole_stack_Wb * s.end_factor, rel=1e-12)
    assert 1.0 < s.end_factor < 1.2  # the demo's magnets overhang the stack by 1.5 mm each side


def test_magnet_field_knee_fractions_and_worst_spot():
    # 3.5 mm magnets (the demo has 6 mm): the corners of Y40, whose knee lies near HcJ, then go past it
    thin = design_from_project(with_values(load(FERRITE), {"magnets.thickness_mm": 3.5}))
    s = solve_case(thin, no_load_case(-20.0).__class__("rotor-removed-cold", "rotor removed", -20.0), COARSE)
    assert s.magnet_field_A_per_m.size == s.magnet_elements.size
    assert np.all(s.region[s.magnet_elements] == Region.MAGNET)
    assert s.worst_magnet_field_A_per_m == s.magnet_field_A_per_m.min()
    # the worst 5 % of the magnet's area, by hand: its elements sorted by field, the last one in part
    corners = s.nodes_m[:, s.triangles[:, s.magnet_elements]]  # (2, 3, elements)
    (x1, y1), (x2, y2) = corners[:, 1] - corners[:, 0], corners[:, 2] - corners[:, 0]
    areas = 0.5 * np.abs(x1 * y2 - x2 * y1)
    assert s.sector_poles == 1  # one magnet: its worst share is the sector's
    order = np.argsort(s.magnet_field_A_per_m)
    need, total, weighted = WORST_AREA_SHARE * areas.sum(), 0.0, 0.0
    for k in order:
        take = min(areas[k], need - total)
        total, weighted = total + take, weighted + take * s.magnet_field_A_per_m[k]
        if total >= need:
            break
    assert s.worst_share_magnet_field_A_per_m == pytest.approx(weighted / total, rel=1e-9)
    assert s.worst_magnet_field_A_per_m < s.worst_share_magnet_field_A_per_m < np.mean(s.magnet_field_A_per_m)
    past = s.magnet_field_A_per_m < s.knee_field_A_per_m
    assert 0.0 < s.magnet_area_past_knee_fraction < 1.0 and past.any()  # the ferrite's corners go past
    assert s.magnet_past_knee_fractions[0] == pytest.approx(s.magnet_area_past_knee_fraction)
    margins = s.knee_margin_A_per_m[s.magnet_elements]
    assert_allclose(margins, s.magnet_field_A_per_m - s.knee_field_A_per_m)
    assert np.isnan(s.knee_margin_A_per_m[s.region != Region.MAGNET]).all()
    x, y = s.worst_magnet_position_m
    g = thin.geometry
    assert float(g.magnet_inner_radius) < math.hypot(x, y) < float(g.housing_inner_radius)
    assert abs(math.atan2(y, x)) < 0.5 * float(g.magnet_arc)


def test_plot_arrays_are_consistent(saturated):
    s = saturated
    assert s.nodes_m.shape[1] == s.potential_Wb_per_m.size
    assert s.triangles.shape == (3, s.elements) and s.flux_density_T.shape == (2, s.elements)
    assert s.region.size == s.elements and s.seconds > 0.0 and s.iterations >= 1
