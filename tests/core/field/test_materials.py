"""The reluctivity tables against the steels' own curves, and the magnet at temperature."""

from __future__ import annotations

import numpy as np
import pytest
from numpy.testing import assert_allclose

from pmdc_sizer.core.field.materials import AIR_RELUCTIVITY, magnet_at, sheet_flux_density, steel_reluctivity
from pmdc_sizer.core.magnets import knee_field_at, remanence_at
from pmdc_sizer.core.units import MU_0


@pytest.mark.parametrize("part", ["housing_steel", "lamination_steel"])
def test_solid_steel_table_reproduces_the_curve(ferrite, part):
    steel = getattr(ferrite, part)
    table = steel_reluctivity(steel)
    b = np.linspace(0.05, 1.3 * steel.saturation_flux_density, 400)
    nu, _ = table.at(b**2)
    # Both are straight between close nodes of the same monotone curve: 0.5 % (measured 0.1 %).
    assert_allclose(nu * b, steel.field_for(b), rtol=5e-3)


def test_the_derivative_is_exact_for_the_table(ferrite):
    # Newton is quadratic only with the derivative of the very function the residual uses.
    table = steel_reluctivity(ferrite.lamination_steel, 0.95)
    s = np.array([0.3, 1.0, 2.0, 2.9, 4.0, 9.0])
    step = 1e-7
    nu_plus, _ = table.at(s + step)
    nu_minus, _ = table.at(s - step)
    _, slope = table.at(s)
    assert_allclose(slope, (nu_plus - nu_minus) / (2.0 * step), rtol=1e-4)


def test_lamination_is_steel_and_air_side_by_side(ferrite):
    # Source: the laminated-core treatment (Salon 1995, ch. 3, from memory): B = kf·B_steel(H) + (1 - kf)·μ0·H.
    steel, kf = ferrite.lamination_steel, 0.9
    table = steel_reluctivity(steel, kf)
    sheet_b = np.array([0.5, 1.2, 1.6, 1.9])
    h = steel.field_for(sheet_b)
    section_b = kf * sheet_b + (1.0 - kf) * MU_0 * h
    nu, _ = table.at(section_b**2)
    assert_allclose(nu * section_b, h, rtol=5e-3)
    assert_allclose(sheet_flux_density(section_b, h, kf), sheet_b, rtol=1e-12)
    # far beyond saturation, the slope of free space
    far = np.array([5.0, 6.0])
    nu_far, _ = table.at(far**2)
    assert_allclose(np.diff(nu_far * far) * MU_0, 1.0, rtol=1e-9)
    assert pytest.approx(1.0 / MU_0) == AIR_RELUCTIVITY


def test_magnet_at_temperature(ferrite):
    magnet = magnet_at(ferrite.magnet, -20.0)
    assert magnet.remanence == pytest.approx(float(remanence_at(ferrite.magnet, -20.0)))
    assert magnet.knee_field == pytest.approx(float(knee_field_at(ferrite.magnet, -20.0)))
    assert magnet.reluctivity == pytest.approx(1.0 / (MU_0 * ferrite.magnet.recoil_permeability))
